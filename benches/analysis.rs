//! Criterion benchmark of the whole pipeline, `Analysis::run` (symmetry, extended Hückel,
//! hybrids, lone-pair switch, labels, localized ladder, links), on fixed geometries from
//! tests/reference/rdkit_geometries/ (C60 164 ms on the 2-core reference machine with the
//! localized picture read from the wavefunction; see the README's Speed section).

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::analysis::{Analysis, Settings};
use support::reference_molecule;

fn whole_analysis(c: &mut Criterion) {
    let settings = Settings::default();
    let mut group = c.benchmark_group("analysis_run");
    group.sample_size(20);
    for name in ["ammonia", "benzene", "c60"] {
        let molecule = reference_molecule(name);
        group.bench_function(name, |b| {
            b.iter(|| Analysis::run(black_box(&molecule), black_box(&settings)).expect("analyses"))
        });
    }
    group.finish();
}

criterion_group!(benches, whole_analysis);
criterion_main!(benches);
