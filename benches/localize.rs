//! Criterion benchmarks of the localization (intrinsic bond orbitals, the default, with
//! `localized::localize::localize`) of the doubly occupied and of the empty valence space,
//! each in Löwdin's orthonormal basis, plus the correlation weights of the localized
//! orbitals to every canonical MO (degenerate sets by energy), on fixed geometries from
//! tests/reference/rdkit_geometries/; the extended Hückel calculation is done in setup.
//! Targets (issue 6): benzene < 5 ms, C60 < 80 ms.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::eht::{DEGENERACY_TOLERANCE_EV, EhtResult, EhtSettings, run};
use diptych::localized::AtomLayout;
use diptych::localized::localize::{LocalizationOptions, localize};
use diptych::localized::weights::{LINK_THRESHOLD, LevelSets, Links, Metric, link};
use nalgebra::DMatrix;
use support::reference_molecule;

/// The canonical MOs (over the orthonormal basis) of the doubly occupied and of the
/// empty space.
fn spaces(eht: &EhtResult) -> [DMatrix<f64>; 2] {
    let pick = |keep: &dyn Fn(f64) -> bool| {
        let members: Vec<usize> = (0..eht.occupations.len())
            .filter(|&k| keep(eht.occupations[k]))
            .collect();
        eht.orthonormal.coefficients.select_columns(&members)
    };
    [pick(&|n| n >= 2.0 - 1e-9), pick(&|n| n <= 1e-9)]
}

fn localize_space(space: &DMatrix<f64>, layout: &AtomLayout) -> DMatrix<f64> {
    let result = localize(space, layout, &LocalizationOptions::default());
    assert!(result.converged, "localization did not converge");
    result.orbitals
}

fn link_all(eht: &EhtResult, orbitals: &DMatrix<f64>) -> Links {
    link(
        orbitals,
        &eht.orthonormal.coefficients,
        Metric::Orthonormal,
        &eht.occupations,
        LevelSets::ByEnergy {
            energies: &eht.energies,
            tolerance: DEGENERACY_TOLERANCE_EV,
        },
        LINK_THRESHOLD,
    )
    .expect("links")
}

fn localize_and_link(
    eht: &EhtResult,
    layout: &AtomLayout,
    [occupied, empty]: &[DMatrix<f64>; 2],
) -> Links {
    let occupied = localize_space(occupied, layout);
    let empty = localize_space(empty, layout);
    let mut all = DMatrix::zeros(occupied.nrows(), occupied.ncols() + empty.ncols());
    all.columns_mut(0, occupied.ncols()).copy_from(&occupied);
    all.columns_mut(occupied.ncols(), empty.ncols())
        .copy_from(&empty);
    link_all(eht, &all)
}

fn bench(c: &mut Criterion) {
    let settings = EhtSettings::default();
    for name in ["ammonia_experimental", "benzene", "aspirin", "c60"] {
        let eht = run(&reference_molecule(name), &settings).expect("EHT runs");
        let layout = AtomLayout::of(&eht);
        let spaces = spaces(&eht);
        let mut group = c.benchmark_group("localize");
        if name == "c60" {
            group.sample_size(20);
        }
        group.bench_function(format!("occupied/{name}"), |b| {
            b.iter(|| localize_space(black_box(&spaces[0]), black_box(&layout)))
        });
        group.bench_function(format!("virtual/{name}"), |b| {
            b.iter(|| localize_space(black_box(&spaces[1]), black_box(&layout)))
        });
        group.finish();
        let mut group = c.benchmark_group("localize_and_link");
        if name == "c60" {
            group.sample_size(20);
        }
        group.bench_function(name, |b| {
            b.iter(|| localize_and_link(black_box(&eht), black_box(&layout), black_box(&spaces)))
        });
        group.finish();
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
