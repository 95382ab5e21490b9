//! Criterion benchmarks of the full extended Hückel calculation (basis, S, H, solve,
//! populations) on fixed geometries from tests/reference/rdkit_geometries/.
//! Targets (issue 4): ammonia < 0.1 ms, benzene < 2 ms, C60 (240 functions) < 30 ms.

use std::hint::black_box;
use std::path::PathBuf;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, ParameterSet, build_basis, overlap_matrix, run};

fn load(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("benchmark geometry");
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

fn full_eht(c: &mut Criterion) {
    let settings = EhtSettings::default();
    for name in ["ammonia_experimental", "benzene", "aspirin", "c60"] {
        let molecule = load(name);
        c.bench_function(&format!("eht_full/{name}"), |b| {
            b.iter(|| run(black_box(&molecule), black_box(&settings)).expect("EHT runs"))
        });
    }
    let c60 = load("c60");
    let params = ParameterSet::builtin().expect("parameters");
    let basis = build_basis(&c60, params, &[]).expect("basis");
    c.bench_function("eht_overlap_only/c60", |b| {
        b.iter(|| overlap_matrix(black_box(&basis)))
    });
}

criterion_group!(benches, full_eht);
criterion_main!(benches);
