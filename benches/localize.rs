//! Criterion benchmarks of Pipek–Mezey localization plus correlation weights (links to
//! every canonical MO, degenerate sets by energy) on fixed geometries from
//! tests/reference/rdkit_geometries/; the extended Hückel calculation is done in setup.
//! Targets (issue 6): benzene < 5 ms, C60 < 80 ms.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::eht::{DEGENERACY_TOLERANCE_EV, EhtResult, EhtSettings, run};
use diptych::link::{LINK_THRESHOLD, LevelSets, Links, link};
use diptych::localize::{LocalizeOptions, localize_occupied};
use support::reference_molecule;

fn localize_and_link(eht: &EhtResult) -> Links {
    let localized = localize_occupied(eht, &LocalizeOptions::default()).expect("localizes");
    link(
        &localized.orbitals,
        &eht.coefficients,
        &eht.overlap,
        &eht.occupations,
        LevelSets::ByEnergy {
            energies: &eht.energies,
            tolerance: DEGENERACY_TOLERANCE_EV,
        },
        LINK_THRESHOLD,
    )
    .expect("links")
}

fn localize(c: &mut Criterion) {
    let settings = EhtSettings::default();
    for name in ["ammonia_experimental", "benzene", "aspirin", "c60"] {
        let eht = run(&reference_molecule(name), &settings).expect("EHT runs");
        let mut group = c.benchmark_group("localize_and_link");
        if name == "c60" {
            group.sample_size(20);
        }
        group.bench_function(name, |b| b.iter(|| localize_and_link(black_box(&eht))));
        group.finish();
    }
}

criterion_group!(benches, localize);
criterion_main!(benches);
