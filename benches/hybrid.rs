//! Criterion benchmarks of the hybrid stage (centres, hybrids, localized ladder) on fixed
//! geometries from tests/reference/rdkit_geometries/; the extended Hückel result is
//! computed once in the setup and not timed.
//! Targets (issue 5): benzene < 1 ms, C60 < 20 ms.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::{HybridModel, HybridSettings, analyze};
use support::reference_molecule;

fn hybrids(c: &mut Criterion) {
    for name in ["benzene", "c60"] {
        let molecule = reference_molecule(name);
        let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
        for (tag, model) in [
            ("geometric", HybridModel::Geometric),
            ("max_overlap", HybridModel::MaxOverlap),
        ] {
            let settings = HybridSettings {
                model,
                ..HybridSettings::default()
            };
            let check = analyze(&molecule, &eht, &settings);
            assert!(check.errors.is_empty(), "{name}: {:?}", check.errors);
            c.bench_function(&format!("hybrids/{tag}/{name}"), |b| {
                b.iter(|| analyze(black_box(&molecule), black_box(&eht), black_box(&settings)))
            });
        }
    }
}

criterion_group!(benches, hybrids);
criterion_main!(benches);
