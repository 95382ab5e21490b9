//! The Series window in the real window under a virtual X display: `diptych --screenshot
//! OUT.png demo_molecules/donors.diptych-series.ron` opens the demo series of the eleven
//! donors and the PNG shows its plots. Needs `xvfb-run` (Debian `xvfb`, `xauth`); with
//! DIPTYCH_REQUIRE_DISPLAY_TESTS=1 a missing display fails the run, as in screenshot.rs.
#![cfg(feature = "gui")]

use std::path::{Path, PathBuf};
use std::process::Command;

fn xvfb_run() -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|folder| folder.join("xvfb-run"))
            .find(|candidate| candidate.is_file())
    })
}

/// RGBA pixels of a PNG.
fn pixels(path: &Path) -> Vec<[u8; 4]> {
    let decoder = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(path).expect("the screenshot exists"),
    ));
    let mut reader = decoder.read_info().expect("a PNG");
    let mut buffer = vec![0; reader.output_buffer_size().expect("a size")];
    let info = reader.next_frame(&mut buffer).expect("a frame");
    assert_eq!(info.color_type, png::ColorType::Rgba);
    buffer[..info.buffer_size()]
        .chunks_exact(4)
        .map(|p| [p[0], p[1], p[2], p[3]])
        .collect()
}

#[test]
fn the_demo_series_opens_with_its_table_and_plots() {
    let Some(xvfb) = xvfb_run() else {
        assert!(
            std::env::var_os("DIPTYCH_REQUIRE_DISPLAY_TESTS").is_none(),
            "xvfb-run is required for the window tests"
        );
        eprintln!("xvfb-run not found: series screenshot test not run");
        return;
    };
    let folder = tempfile::tempdir().expect("temp folder");
    let out = folder.path().join("series.png");
    let series =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/donors.diptych-series.ron");
    let output = Command::new(xvfb)
        .args(["-a", "-s", "-screen 0 1600x1000x24"])
        .arg(env!("CARGO_BIN_EXE_diptych"))
        .arg("--screenshot")
        .arg(&out)
        .arg(&series)
        .output()
        .expect("xvfb-run starts");
    assert!(
        output.status.success(),
        "screenshot failed: {}",
        String::from_utf8_lossy(&output.stderr)
    );
    let pixels = pixels(&out);
    // The plots' colours from src/app/series_view.rs: the HOMO points (and their labels)
    // and the lone-pair points were drawn.
    let homo = pixels.iter().filter(|p| p[..3] == [40, 90, 170]).count();
    let lone_pair = pixels.iter().filter(|p| p[..3] == [196, 100, 20]).count();
    assert!(homo > 200, "HOMO points cover {homo} pixels");
    assert!(lone_pair > 200, "lone-pair points cover {lone_pair} pixels");
}
