//! The two-centre hybrid models on the Lewis structure read from the wavefunction, over
//! the RDKit reference geometries (tests/reference/rdkit_geometries/): every molecule
//! there is a closed shell, both models run without a stage error and converge, and every
//! heavy atom is either a centre of the model or named in a note (the atoms the
//! wavefunction puts into multicentre units are left to its own hybrids).

use std::path::PathBuf;

use diptych::analysis::{Analysis, Settings, Stage};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::hybrid::{HybridModel, HybridSettings};

fn reference_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/rdkit_geometries")
}

fn load(name: &str) -> Molecule {
    let text = std::fs::read_to_string(reference_dir().join(format!("{name}.xyz"))).unwrap();
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

#[test]
fn every_reference_molecule_is_described_or_noted() {
    let mut names: Vec<String> = std::fs::read_dir(reference_dir())
        .unwrap()
        .filter_map(|e| {
            let path = e.ok()?.path();
            (path.extension()? == "xyz").then(|| path.file_stem()?.to_str().map(String::from))?
        })
        .collect();
    names.sort();
    assert!(names.len() > 30);
    let mut centres = 0;
    for name in &names {
        let molecule = load(name);
        for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
            let settings = Settings {
                hybrid: HybridSettings {
                    model,
                    ..HybridSettings::default()
                },
                ..Settings::default()
            };
            let analysis = Analysis::run(&molecule, &settings).expect("analyses");
            assert!(analysis.errors.is_empty(), "{name}: {:?}", analysis.errors);
            let hybrids = analysis.hybrids.as_ref().expect("hybrid stage");
            assert!(hybrids.converged, "{name}");
            for (atom, a) in molecule.atoms.iter().enumerate() {
                if a.element.atomic_number() <= 2 {
                    continue;
                }
                let noted = analysis.notes.iter().any(|n| {
                    n.stage == Stage::Hybrids && n.message.starts_with(&format!("atom {atom} ("))
                });
                assert!(
                    hybrids.centre(atom).is_some() != noted,
                    "{name} {model:?}: atom {atom}"
                );
            }
            assert!(
                hybrids.centres.iter().all(|c| !c.single_electron),
                "{name}: closed-shell Lewis structure"
            );
            for centre in &hybrids.centres {
                assert_eq!(centre.hybrids.len(), 4, "{name}");
                let s: f64 = centre.hybrids.iter().map(|h| h.s_percent).sum();
                assert!((s - 100.0).abs() < 1e-8, "{name}: sum rule {s}");
            }
            centres += hybrids.centres.len();
        }
    }
    assert!(centres > 2 * names.len(), "{centres} centres described");
}
