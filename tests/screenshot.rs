//! The real window under a virtual X display: `diptych --screenshot` must write a PNG in
//! which the molecule is visible. Needs `xvfb-run` (Debian `xvfb`, `xauth`); CI installs it
//! and sets DIPTYCH_REQUIRE_DISPLAY_TESTS=1 so that a missing display fails the run.
#![cfg(feature = "gui")]

use std::collections::HashSet;
use std::path::{Path, PathBuf};
use std::process::Command;

fn xvfb_run() -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|folder| folder.join("xvfb-run"))
            .find(|candidate| candidate.is_file())
    })
}

/// Runs the screenshot command; None when no virtual display is available here.
fn screenshot(molecule: &str, out: &Path) -> Option<()> {
    let Some(xvfb) = xvfb_run() else {
        assert!(
            std::env::var_os("DIPTYCH_REQUIRE_DISPLAY_TESTS").is_none(),
            "xvfb-run is required for the window tests"
        );
        eprintln!("xvfb-run not found: window screenshot test not run");
        return None;
    };
    let output = Command::new(xvfb)
        .args(["-a", "-s", "-screen 0 1600x1000x24"])
        .arg(env!("CARGO_BIN_EXE_diptych"))
        .arg("--screenshot")
        .arg(out)
        .arg(
            Path::new(env!("CARGO_MANIFEST_DIR"))
                .join("demo_molecules")
                .join(molecule),
        )
        .output()
        .expect("xvfb-run starts");
    assert!(
        output.status.success(),
        "screenshot of {molecule} failed: {}",
        String::from_utf8_lossy(&output.stderr)
    );
    Some(())
}

/// (width, height, RGBA pixels)
fn decode(path: &Path) -> (u32, u32, Vec<[u8; 4]>) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buffer = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buffer).unwrap();
    assert_eq!(info.color_type, png::ColorType::Rgba);
    let pixels = buffer[..info.buffer_size()]
        .chunks_exact(4)
        .map(|p| [p[0], p[1], p[2], p[3]])
        .collect();
    (info.width, info.height, pixels)
}

#[test]
fn ammonia_screenshot_shows_the_molecule() {
    let folder = tempfile::tempdir().unwrap();
    let out = folder.path().join("nh3.png");
    if screenshot("ammonia.xyz", &out).is_none() {
        return;
    }
    let (width, height, pixels) = decode(&out);
    assert!(width >= 800 && height >= 600, "{width}×{height}");
    let distinct: HashSet<[u8; 4]> = pixels.iter().copied().collect();
    assert!(
        distinct.len() > 50,
        "only {} colours: blank window?",
        distinct.len()
    );
    // Nitrogen's fill colour from src/app/theme.rs: the atom was drawn.
    let nitrogen = pixels.iter().filter(|p| p[..3] == [88, 118, 176]).count();
    assert!(nitrogen > 500, "nitrogen ball covers {nitrogen} pixels");
}

#[test]
fn screenshots_of_demo_molecules_are_not_blank() {
    let folder = tempfile::tempdir().unwrap();
    for molecule in ["water.xyz", "ethylene.xyz", "cyclopropane.xyz"] {
        let out = folder.path().join(molecule.replace(".xyz", ".png"));
        if screenshot(molecule, &out).is_none() {
            return;
        }
        let (width, height, pixels) = decode(&out);
        assert!(
            width >= 800 && height >= 600,
            "{molecule}: {width}×{height}"
        );
        let distinct: HashSet<[u8; 4]> = pixels.iter().copied().collect();
        assert!(
            distinct.len() > 50,
            "{molecule}: only {} colours",
            distinct.len()
        );
    }
}
