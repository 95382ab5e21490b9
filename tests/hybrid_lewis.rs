//! The Lewis bookkeeping on the RDKit reference geometries (tests/reference/
//! rdkit_geometries/): every molecule there has an ordinary Lewis structure, so every heavy
//! atom must be a centre and the localized ladder must hold exactly the valence electrons.

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::{HybridModel, HybridSettings, LocalizedKind, analyze};

fn reference_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/rdkit_geometries")
}

fn load(name: &str) -> Molecule {
    let text = std::fs::read_to_string(reference_dir().join(format!("{name}.xyz"))).unwrap();
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

#[test]
fn every_reference_molecule_gets_a_complete_lewis_ladder() {
    let mut names: Vec<String> = std::fs::read_dir(reference_dir())
        .unwrap()
        .filter_map(|e| {
            let path = e.ok()?.path();
            (path.extension()? == "xyz").then(|| path.file_stem()?.to_str().map(String::from))?
        })
        .collect();
    names.sort();
    assert!(names.len() > 30);
    for name in &names {
        let molecule = load(name);
        let eht = run(&molecule, &EhtSettings::default()).unwrap();
        for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
            let settings = HybridSettings {
                model,
                ..HybridSettings::default()
            };
            let analysis = analyze(&molecule, &eht, &settings);
            assert!(analysis.errors.is_empty(), "{name}: {:?}", analysis.errors);
            assert!(analysis.converged, "{name}");
            let heavy = molecule
                .atoms
                .iter()
                .filter(|a| a.element.atomic_number() > 2)
                .count();
            assert_eq!(analysis.centres.len(), heavy, "{name}");
            assert!(
                analysis.centres.iter().all(|c| !c.single_electron),
                "{name}: closed-shell Lewis structure"
            );
            let electrons: f64 = analysis.localized.iter().map(|o| o.occupancy).sum();
            assert_eq!(electrons, eht.electrons as f64, "{name}");
            let bonds = analysis
                .localized
                .iter()
                .filter(|o| o.kind == LocalizedKind::Bond)
                .count();
            assert_eq!(bonds, molecule.bonds.len(), "{name}: one σ per bond");
        }
    }
}

#[test]
fn charge_separated_structures() {
    // DMSO as S+–O−, ammonia borane as N+–B− (the usual Lewis structures with formal
    // charges; common practice, no source).
    for (name, plus, minus) in [
        ("dimethyl_sulfoxide", "S", "O"),
        ("ammonia_borane", "N", "B"),
    ] {
        let molecule = load(name);
        let eht = run(&molecule, &EhtSettings::default()).unwrap();
        let analysis = analyze(&molecule, &eht, &HybridSettings::default());
        let charge = |symbol: &str| {
            analysis
                .centres
                .iter()
                .find(|c| c.element == symbol)
                .unwrap()
                .formal_charge
        };
        assert_eq!(charge(plus), 1, "{name}");
        assert_eq!(charge(minus), -1, "{name}");
    }
    // A user override wins over the automatic assignment: DMSO's S with two lone pairs
    // needs five orbitals and is reported as hypervalent instead.
    let molecule = load("dimethyl_sulfoxide");
    let eht = run(&molecule, &EhtSettings::default()).unwrap();
    let s = (0..molecule.atoms.len())
        .find(|&a| molecule.atoms[a].element.symbol() == "S")
        .unwrap();
    let mut settings = HybridSettings::default();
    settings.lone_pair_overrides.insert(s, 2);
    let analysis = analyze(&molecule, &eht, &settings);
    assert!(analysis.errors.iter().any(
        |e| matches!(e, diptych::hybrid::HybridError::Hypervalent { atom, .. } if *atom == s)
    ));
    assert!(analysis.centre(s).is_none());
    assert_eq!(
        analysis.centres.len(),
        3,
        "the other heavy atoms are still described"
    );
}
