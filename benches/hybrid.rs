//! Criterion benchmarks of the hybrid models on fixed geometries from
//! tests/reference/rdkit_geometries/: the geometric and maximum-overlap models (centres from
//! the localized picture, hybrids, their iteration), given the extended Hückel result and
//! the localized picture, which are computed once in the setup and not timed.
//! Targets (issue 5): benzene < 1 ms, C60 < 20 ms.

mod support;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::chem::Molecule;
use diptych::eht::{EhtResult, EhtSettings, run};
use diptych::hybrid::centres::from_picture;
use diptych::hybrid::{HybridAnalysis, HybridModel, HybridSettings, analyze};
use diptych::localized::{self, LocalizationSettings, LocalizedPicture};
use support::reference_molecule;

/// The model's hybrids on the wavefunction's Lewis structure, as `Analysis::run` does it.
fn model_hybrids(
    molecule: &Molecule,
    eht: &EhtResult,
    picture: &LocalizedPicture,
    settings: &HybridSettings,
) -> HybridAnalysis {
    let layout = &picture.layout;
    let has_sp = |atom: usize| {
        layout.kinds[layout.ranges[atom].clone()]
            .iter()
            .any(|k| k.l() == 1)
    };
    let (specs, _notes) = from_picture(picture, molecule, &has_sp);
    analyze(molecule, eht, settings, specs)
}

fn hybrids(c: &mut Criterion) {
    for name in ["benzene", "c60"] {
        let molecule = reference_molecule(name);
        let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
        let picture = localized::analyze(&molecule, &eht, &LocalizationSettings::default())
            .expect("localized picture");
        for (tag, model) in [
            ("geometric", HybridModel::Geometric),
            ("max_overlap", HybridModel::MaxOverlap),
        ] {
            let settings = HybridSettings {
                model,
                ..HybridSettings::default()
            };
            let check = model_hybrids(&molecule, &eht, &picture, &settings);
            assert!(check.errors.is_empty(), "{name}: {:?}", check.errors);
            assert!(!check.centres.is_empty(), "{name}: no centre described");
            c.bench_function(&format!("hybrids/{tag}/{name}"), |b| {
                b.iter(|| {
                    model_hybrids(
                        black_box(&molecule),
                        black_box(&eht),
                        black_box(&picture),
                        black_box(&settings),
                    )
                })
            });
        }
    }
}

criterion_group!(benches, hybrids);
criterion_main!(benches);
