//! Criterion benchmarks of the full extended Hückel calculation (basis, S, H, solve,
//! populations) on fixed geometries from tests/reference/rdkit_geometries/.
//! Targets (issue 4): ammonia < 0.1 ms, benzene < 2 ms, C60 (240 functions) < 30 ms.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::eht::{EhtSettings, ParameterSet, build_basis, overlap_matrix, run};
use support::reference_molecule;

fn full_eht(c: &mut Criterion) {
    let settings = EhtSettings::default();
    for name in ["ammonia_experimental", "benzene", "aspirin", "c60"] {
        let molecule = reference_molecule(name);
        c.bench_function(&format!("eht_full/{name}"), |b| {
            b.iter(|| run(black_box(&molecule), black_box(&settings)).expect("EHT runs"))
        });
    }
    let c60 = reference_molecule("c60");
    let params = ParameterSet::builtin().expect("parameters");
    let basis = build_basis(&c60, params, &[]).expect("basis");
    c.bench_function("eht_overlap_only/c60", |b| {
        b.iter(|| overlap_matrix(black_box(&basis)))
    });
}

criterion_group!(benches, full_eht);
criterion_main!(benches);
