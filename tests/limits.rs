//! Limits on every size (issue 18, item 2), each refused before any work with exit code 2
//! and one line naming the limit, and the memory a refusal takes: every refused input here
//! and in `tests/bad_inputs/` is run as a child process and the children's peak resident
//! set (getrusage RUSAGE_CHILDREN, ru_maxrss, Linux) must stay under 1 GB. Every test in
//! this file runs refusals only, so that peak belongs to refused inputs.

use std::path::{Path, PathBuf};

mod cli_support;
use cli_support::{assert_refused, diptych};

type TestResult = Result<(), Box<dyn std::error::Error>>;

fn demo_project() -> String {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.diptych.ron");
    std::fs::read_to_string(path).expect("demo project")
}

/// The failing inputs of issue 18 that are too large to keep as files.
fn huge_projects(folder: &Path) -> Result<Vec<(PathBuf, &'static str)>, std::io::Error> {
    let text = demo_project();
    let start = text.find("delocalized: \"").expect("a title") + "delocalized: \"".len();
    let end = start + text[start..].find('"').expect("closing quote");
    let long_title = format!(
        "{}{}{}",
        &text[..start],
        "T".repeat(10_000_000),
        &text[end..]
    );
    let bond = "(a: 0, b: 1, order: 1), ";
    let many_bonds = text.replacen("bonds: [", &format!("bonds: [{}", bond.repeat(100_000)), 1);
    let cases = [
        (
            "title.diptych.ron",
            long_title,
            "has 10000000 characters; the limit is 200",
        ),
        ("bonds.diptych.ron", many_bonds, "is listed twice"),
    ];
    let mut paths = Vec::new();
    for (name, text, message) in cases {
        let path = folder.join(name);
        std::fs::write(&path, text)?;
        paths.push((path, message));
    }
    Ok(paths)
}

#[test]
fn long_ladder_titles_are_refused_before_work() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("out.svg");
    let out = out.to_string_lossy();
    let long = "T".repeat(100_000);
    let args = [
        "export",
        "demo_molecules/water.xyz",
        "-o",
        &out,
        "--names",
        &long,
        "x",
    ];
    assert_refused(&diptych(&args), "has 100000 characters; the limit is 200");
    let just_over = "T".repeat(201);
    let args = [
        "export",
        "demo_molecules/water.xyz",
        "-o",
        &out,
        "--names",
        "x",
        &just_over,
    ];
    assert_refused(&diptych(&args), "localized ladder has 201 characters");
    assert!(!folder.path().join("out.svg").exists());
}

#[test]
fn a_png_over_100_megapixels_is_refused_before_work() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("out.png");
    let out = out.to_string_lossy();
    // The failing input: 20 000 × 20 000 px took 2.6 GB.
    let args = [
        "export",
        "demo_molecules/water.xyz",
        "-o",
        &out,
        "--width",
        "20000",
        "--height",
        "20000",
    ];
    assert_refused(&diptych(&args), "more than the limit of 100 megapixels");
    // 10 000 × 10 000 is exactly 100 megapixels; one more row is over.
    let args = [
        "export",
        "no-such-file.xyz",
        "-o",
        &out,
        "--width",
        "10000",
        "--height",
        "10001",
    ];
    assert_refused(&diptych(&args), "100 megapixels");
    assert!(!folder.path().join("out.png").exists());
}

#[test]
fn huge_projects_are_refused_with_the_limit() -> TestResult {
    let folder = tempfile::tempdir()?;
    for (path, message) in huge_projects(folder.path())? {
        assert_refused(&diptych(&["analyze", &path.to_string_lossy()]), message);
    }
    Ok(())
}

/// Peak resident set of all waited-for children, in bytes (Linux reports kB).
#[cfg(target_os = "linux")]
fn children_peak_rss() -> u64 {
    // SAFETY: getrusage writes one rusage struct, which we own and zero first.
    let mut usage: libc::rusage = unsafe { std::mem::zeroed() };
    let status = unsafe { libc::getrusage(libc::RUSAGE_CHILDREN, &mut usage) };
    assert_eq!(status, 0, "getrusage works");
    u64::try_from(usage.ru_maxrss).unwrap_or(0) * 1024
}

#[cfg(target_os = "linux")]
#[test]
fn every_refused_input_stays_under_one_gigabyte() -> TestResult {
    let folder = tempfile::tempdir()?;
    let mut files: Vec<PathBuf> = huge_projects(folder.path())?
        .into_iter()
        .map(|(path, _)| path)
        .collect();
    let bad = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad_inputs");
    for entry in std::fs::read_dir(bad)? {
        let path = entry?.path();
        if path.extension().is_some_and(|e| e != "tsv") {
            files.push(path);
        }
    }
    for file in &files {
        let output = diptych(&["analyze", &file.to_string_lossy()]);
        assert_eq!(
            output.status.code(),
            Some(2),
            "{} is refused",
            file.display()
        );
    }
    let peak = children_peak_rss();
    eprintln!(
        "peak RSS of the refused inputs: {:.1} MB",
        peak as f64 / 1e6
    );
    assert!(peak > 0, "the measurement saw the children");
    assert!(peak < 1 << 30, "peak RSS {peak} bytes is over 1 GB");
    Ok(())
}
