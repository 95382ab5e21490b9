//! Criterion benchmark of one idle frame of the window (issue 7): C60 (60 atoms) loaded
//! and analysed, no input, the whole UI built by egui (our panels, the Diagram and the
//! Structure view, egui's layout and tessellation) without a GPU. Target: under 2 ms of
//! CPU time per frame.
//!
//! The app module belongs to the binary, so it is compiled into this benchmark from its
//! source file; egui_kittest runs the frames headlessly.

// The binary's own unit tests come along (benchmarks build with cfg(test)) but do not
// run here; their imports and the unused parts of the app are expected.
#[allow(dead_code, unused_imports)]
#[path = "../src/app/mod.rs"]
mod app;

use std::path::PathBuf;
use std::time::{Duration, Instant};

use criterion::{Criterion, criterion_group, criterion_main};
use eframe::egui;
use egui_kittest::Harness;

fn loaded_harness(name: &str) -> Harness<'static, app::DiptychApp> {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let opened = diptych::project::open_path(&path).expect("benchmark geometry opens");
    let app = app::DiptychApp::new(egui::Context::default(), Some((opened, path)), None);
    let mut harness = Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut app::DiptychApp| app.frame_ui(ui), app);
    let start = Instant::now();
    while !harness.state().is_analysed() {
        harness.step();
        assert!(
            start.elapsed() < Duration::from_secs(60),
            "analysis arrives"
        );
        std::thread::sleep(Duration::from_millis(5));
    }
    // Let the layout settle (first frames measure text).
    harness.run_steps(5);
    harness
}

fn idle_frame(c: &mut Criterion) {
    let mut group = c.benchmark_group("idle_frame");
    group.sample_size(30);
    for name in ["ammonia", "c60"] {
        let mut harness = loaded_harness(name);
        group.bench_function(name, |b| b.iter(|| harness.step()));
    }
    group.finish();
}

criterion_group!(benches, idle_frame);
criterion_main!(benches);
