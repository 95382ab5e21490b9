//! Times the stages of `Analysis::run` on one geometry (a development aid for the speed
//! targets; the targets themselves live in benches/).
//! Run: cargo run --release --no-default-features --example stage_timing -- FILE [REPEATS]

use std::time::Instant;

use diptych::analysis::{Analysis, Settings};

fn median_ms(repeats: usize, mut work: impl FnMut()) -> f64 {
    let mut times: Vec<f64> = (0..repeats)
        .map(|_| {
            let start = Instant::now();
            work();
            start.elapsed().as_secs_f64() * 1e3
        })
        .collect();
    times.sort_by(f64::total_cmp);
    times[times.len() / 2]
}

fn main() {
    let mut args = std::env::args().skip(1);
    let Some(path) = args.next() else {
        eprintln!("usage: stage_timing FILE [REPEATS]");
        return;
    };
    let repeats: usize = args.next().and_then(|r| r.parse().ok()).unwrap_or(5);
    let project = match diptych::project::open_path(std::path::Path::new(&path)) {
        Ok(opened) => opened.project,
        Err(error) => {
            eprintln!("{path}: {error}");
            return;
        }
    };
    let molecule = &project.molecule;
    let settings = Settings::default();
    let eht = diptych::eht::run(molecule, &settings.eht).expect("orbitals");
    let rows = [
        (
            "symmetry::detect",
            median_ms(repeats, || {
                let _ = diptych::symmetry::detect(molecule, &settings.symmetry);
            }),
        ),
        (
            "eht::run",
            median_ms(repeats, || {
                let _ = diptych::eht::run(molecule, &settings.eht);
            }),
        ),
        (
            "localized::analyze",
            median_ms(repeats, || {
                let _ = diptych::localized::analyze(molecule, &eht, &settings.localization);
            }),
        ),
        (
            "Analysis::run",
            median_ms(repeats, || {
                let _ = Analysis::run(molecule, &settings);
            }),
        ),
    ];
    for (stage, ms) in rows {
        println!("{stage:<22} {ms:9.2} ms");
    }
}
