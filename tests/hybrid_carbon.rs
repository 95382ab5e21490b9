//! Conjugated carbon frameworks (geometries from tests/reference/rdkit_geometries/):
//! benzene's Kekulé structure and the pyramidalized carbons of C60.

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::{
    HybridKind, HybridModel, HybridSettings, LocalizedKind, analyze, describe_centre,
};

fn load(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("geometry");
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

#[test]
fn benzene_kekule_structure() {
    // One Kekulé structure: 6 σ(C–C), 6 σ(C–H), 3 π(C–C); sp2 carbons at 120° (Coulson,
    // Valence, 1952: λ = 2).
    let m = load("benzene");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    assert!(analysis.errors.is_empty(), "{:?}", analysis.errors);
    let count = |kind: LocalizedKind| analysis.localized.iter().filter(|o| o.kind == kind).count();
    assert_eq!(count(LocalizedKind::Bond), 12);
    assert_eq!(count(LocalizedKind::Pi), 3);
    assert_eq!(count(LocalizedKind::PiStar), 3);
    for centre in &analysis.centres {
        for h in centre.hybrids.iter().filter(|h| h.kind == HybridKind::Bond) {
            assert!((h.lambda.unwrap() - 2.0).abs() < 0.02, "{:?}", h.lambda);
        }
    }
}

#[test]
fn c60_pi_orbitals_carry_a_little_s() {
    // Pyramidalized carbons of C60: the π-orbital axis analysis gives a π orbital near
    // s^0.085 p, i.e. about 8 % s (R. C. Haddon, from memory). The geometric model puts the
    // s left over by the three σ bonds into the π orbital.
    let m = load("c60");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    assert!(analysis.errors.is_empty(), "{:?}", analysis.errors);
    assert_eq!(analysis.centres.len(), 60);
    for centre in &analysis.centres {
        assert_eq!(centre.model, HybridModel::Geometric);
        let pi = centre
            .hybrids
            .iter()
            .find(|h| h.kind == HybridKind::Pi)
            .unwrap();
        assert!(
            pi.s_percent > 6.0 && pi.s_percent < 10.0,
            "{}",
            pi.s_percent
        );
    }
    let pi_bonds = analysis
        .localized
        .iter()
        .filter(|o| o.kind == LocalizedKind::Pi)
        .count();
    assert_eq!(pi_bonds, 30, "a Kekulé structure of C60");
}

#[test]
fn describe_centre_reports_supplied_hybrids_like_the_built_in_models() {
    // The hook for hybrids from another source: feeding back the built-in set reproduces
    // its description.
    let m = load("ammonia");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    let n = analysis.centre(0).unwrap();
    let orbitals: Vec<_> = n
        .hybrids
        .iter()
        .map(|h| (h.kind, h.partner, nalgebra::Vector4::from(h.local)))
        .collect();
    let again = describe_centre(&m, &eht, 0, &orbitals, HybridModel::Localized).unwrap();
    assert_eq!(again.hybrids.len(), n.hybrids.len());
    for (a, b) in again.hybrids.iter().zip(&n.hybrids) {
        assert_eq!(a.kind, b.kind);
        assert_eq!(a.partner, b.partner);
        assert!((a.s_percent - b.s_percent).abs() < 1e-10);
        assert!((a.energy_ev - b.energy_ev).abs() < 1e-10);
        assert_eq!(a.bending_degrees.is_some(), b.bending_degrees.is_some());
    }
    for (a, b) in again.interorbital_angles.iter().zip(&n.interorbital_angles) {
        assert_eq!((a.first, a.second), (b.first, b.second));
        assert!((a.degrees - b.degrees).abs() < 1e-8);
    }
    assert_eq!(again.model, HybridModel::Localized);
    assert!(describe_centre(&m, &eht, 1, &orbitals, HybridModel::Localized).is_none());
    assert!(describe_centre(&m, &eht, 99, &orbitals, HybridModel::Localized).is_none());
}
