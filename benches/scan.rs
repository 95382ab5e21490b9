//! Criterion benchmark of Walsh scans (issue 9 targets): 181 points of ammonia's
//! pyramidalization under 50 ms and of benzene under 1 s, each point a whole
//! `Analysis::run`, on all available threads.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::analysis::Settings;
use diptych::chem::{Atom, Element, Molecule};
use diptych::scan::{Coordinate, ScanProgress, ScanRequest, run_scan};

/// Ammonia, N–H 1.012 Å, H–N–H 106.7° (NIST CCCBDB, from memory), built in code.
fn ammonia() -> Molecule {
    let (r, angle) = (1.012_f64, 106.7_f64.to_radians());
    // Angle α of each N–H to the C3 axis: cos θ = (3cos²α − 1)/2.
    let cos_alpha = ((2.0 * angle.cos() + 1.0) / 3.0).sqrt();
    let sin_alpha = (1.0 - cos_alpha * cos_alpha).sqrt();
    let mut atoms = vec![Atom::new(Element::from_symbol("N").expect("N"), [0.0; 3])];
    for k in 0..3 {
        let phi = k as f64 * 2.0 * std::f64::consts::PI / 3.0;
        atoms.push(Atom::new(
            Element::from_symbol("H").expect("H"),
            [
                r * sin_alpha * phi.cos(),
                r * sin_alpha * phi.sin(),
                -r * cos_alpha,
            ],
        ));
    }
    Molecule::new("ammonia", atoms, 0)
}

/// Benzene, C–C 1.397 Å and C–H 1.084 Å (common textbook values, from memory), D6h.
fn benzene() -> Molecule {
    let mut atoms = Vec::new();
    for (symbol, radius) in [("C", 1.397_f64), ("H", 1.397 + 1.084)] {
        for k in 0..6 {
            let phi = k as f64 * std::f64::consts::PI / 3.0;
            atoms.push(Atom::new(
                Element::from_symbol(symbol).expect("element"),
                [radius * phi.cos(), radius * phi.sin(), 0.0],
            ));
        }
    }
    let mut molecule = Molecule::new("benzene", atoms, 0);
    molecule.perceive_bond_orders();
    molecule
}

fn scans(c: &mut Criterion) {
    let settings = Settings::default();
    let mut group = c.benchmark_group("walsh_scan_181_points");
    group.sample_size(10);
    let ammonia = ammonia();
    let pyramidalize = ScanRequest {
        coordinate: Coordinate::Pyramidalize { centre: 0 },
        from: 90.0,
        to: 120.0,
        steps: 181,
    };
    group.bench_function("ammonia_pyramidalize", |b| {
        b.iter(|| {
            run_scan(
                black_box(&ammonia),
                &settings,
                &pyramidalize,
                &ScanProgress::new(),
            )
            .expect("scan runs")
        })
    });
    let benzene = benzene();
    // Bend one C–H out of the ring plane: H6 on C0, about the C1–C0 bond.
    let bend = ScanRequest {
        coordinate: Coordinate::Angle { i: 1, j: 0, k: 6 },
        from: 100.0,
        to: 140.0,
        steps: 181,
    };
    group.bench_function("benzene_ch_bend", |b| {
        b.iter(|| {
            run_scan(black_box(&benzene), &settings, &bend, &ScanProgress::new())
                .expect("scan runs")
        })
    });
    group.finish();
}

criterion_group!(benches, scans);
criterion_main!(benches);
