//! Criterion benchmarks of publication output (issue 8): the SVG of a 60-atom molecule's
//! diagram (C60 from tests/reference/rdkit_geometries/; target under 2 ms) and a PNG at
//! 300 dpi of a figure 16 cm wide (≈ 1890 px; target under 200 ms), both from an analysis
//! computed once outside the timing.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::analysis::{Analysis, Settings};
use diptych::diagram::{
    Diagram, DiagramOptions, Resolution, SvgOptions, diagram_for, render_png, to_svg,
};
use support::reference_molecule;

fn analysis_of(name: &str) -> Analysis {
    let molecule = reference_molecule(name);
    Analysis::run(&molecule, &Settings::default()).expect("analyses")
}

/// 16 cm in CSS pixels (96 per inch, 2.54 cm per inch), height in the layout's 10:7.
fn sixteen_cm_options(diagram: &Diagram) -> SvgOptions {
    let width = 16.0 / 2.54 * 96.0;
    SvgOptions {
        width,
        height: width * diagram.height / diagram.width,
        ..SvgOptions::default()
    }
}

fn svg_export(c: &mut Criterion) {
    let analysis = analysis_of("c60");
    assert_eq!(analysis.molecule.atoms.len(), 60);
    let options = DiagramOptions::default();
    let diagram = diagram_for(&analysis, &options);
    let svg_options = SvgOptions::default();
    let mut group = c.benchmark_group("export_svg");
    group.bench_function("c60_to_svg", |b| {
        b.iter(|| to_svg(black_box(&diagram), black_box(&svg_options)))
    });
    group.bench_function("c60_diagram_and_svg", |b| {
        b.iter(|| {
            let diagram = diagram_for(black_box(&analysis), black_box(&options));
            to_svg(&diagram, &svg_options)
        })
    });
    group.finish();
}

fn png_export(c: &mut Criterion) {
    let mut group = c.benchmark_group("export_png_300dpi_16cm");
    group.sample_size(20);
    for name in ["ammonia", "c60"] {
        let analysis = analysis_of(name);
        let diagram = diagram_for(&analysis, &DiagramOptions::default());
        let svg = to_svg(&diagram, &sixteen_cm_options(&diagram));
        // Fonts are loaded once per process; do it before timing.
        let png = render_png(&svg, Resolution::Dpi(300.0)).expect("renders");
        assert!(!png.is_empty());
        group.bench_function(name, |b| {
            b.iter(|| render_png(black_box(&svg), Resolution::Dpi(300.0)).expect("renders"))
        });
    }
    group.finish();
}

criterion_group!(benches, svg_export, png_export);
criterion_main!(benches);
