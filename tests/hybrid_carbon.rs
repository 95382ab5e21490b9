//! Conjugated carbon frameworks (geometries from tests/reference/rdkit_geometries/):
//! benzene's sp2 carbons and the pyramidalized carbons of C60 in the geometric model, run
//! on the Lewis structure read from the wavefunction (`hybrid::analyze` with the centres
//! of `hybrid::centres::from_picture`).

use std::path::PathBuf;

use diptych::analysis::{Analysis, Settings};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtResult, EhtSettings, run};
use diptych::hybrid::centres::from_picture;
use diptych::hybrid::{
    HybridAnalysis, HybridKind, HybridModel, HybridSettings, analyze, describe_centre,
};
use diptych::localized::{self, LocalizationSettings, LocalizedKind};

fn load(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("geometry");
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

/// The geometric model on the wavefunction's Lewis structure, and the notes on the atoms
/// it leaves to the wavefunction's hybrids.
fn geometric(m: &Molecule, eht: &EhtResult) -> (HybridAnalysis, Vec<String>) {
    let picture =
        localized::analyze(m, eht, &LocalizationSettings::default()).expect("localized picture");
    let has_sp = |atom: usize| {
        let kinds = &picture.layout.kinds[picture.layout.ranges[atom].clone()];
        kinds.iter().any(|k| k.l() == 0) && kinds.iter().filter(|k| k.l() == 1).count() == 3
    };
    let (specs, notes) = from_picture(&picture, m, &has_sp);
    let settings = HybridSettings {
        model: HybridModel::Geometric,
        ..HybridSettings::default()
    };
    (analyze(m, eht, &settings, specs), notes)
}

/// Every carbon is a centre of the model or named in a note.
fn every_carbon_accounted_for(m: &Molecule, analysis: &HybridAnalysis, notes: &[String]) {
    for (atom, a) in m.atoms.iter().enumerate() {
        if a.element.symbol() != "C" {
            continue;
        }
        let noted = notes
            .iter()
            .any(|n| n.starts_with(&format!("atom {atom} (C)")));
        assert!(
            analysis.centre(atom).is_some() != noted,
            "carbon {atom}: a centre or a note"
        );
    }
}

#[test]
fn benzene_sp2_carbons() {
    // sp2 carbons at 120° (Coulson, Valence, 1952: λ = 2) with one π orbital each, on every
    // carbon the model describes (those in a multicentre π unit of the wavefunction's
    // picture are left to its own hybrids, with a note). The ladder holds the 12 σ bonds
    // (6 C–C, 6 C–H) and three occupied π-electron pairs, whether they are read as
    // two-centre π bonds or as multicentre π levels.
    let m = load("benzene");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let (analysis, notes) = geometric(&m, &eht);
    assert!(analysis.errors.is_empty(), "{:?}", analysis.errors);
    every_carbon_accounted_for(&m, &analysis, &notes);
    assert!(!analysis.centres.is_empty());
    for centre in &analysis.centres {
        assert_eq!(centre.model, HybridModel::Geometric);
        assert_eq!(centre.sigma_partners.len(), 3);
        assert_eq!(centre.pi_bonds, 1);
        for h in centre.hybrids.iter().filter(|h| h.kind == HybridKind::Bond) {
            assert!((h.lambda.unwrap() - 2.0).abs() < 0.02, "{:?}", h.lambda);
        }
    }
    let settings = Settings {
        hybrid: HybridSettings {
            model: HybridModel::Geometric,
            ..HybridSettings::default()
        },
        ..Settings::default()
    };
    let full = Analysis::run(&m, &settings).unwrap();
    let count = |kind: LocalizedKind, label: &str| {
        full.localized
            .iter()
            .filter(|o| o.kind == kind && o.label == label)
            .count()
    };
    assert_eq!(count(LocalizedKind::Bond, "σ(C–C)"), 6);
    assert_eq!(count(LocalizedKind::Bond, "σ(C–H)"), 6);
    let pi_pairs = full
        .localized
        .iter()
        .filter(|o| o.lewis_occupancy > 1.0 && o.kind != LocalizedKind::Bond)
        .count();
    assert_eq!(pi_pairs, 3, "six π electrons");
}

#[test]
fn c60_pi_orbitals_carry_a_little_s() {
    // Pyramidalized carbons of C60: the π-orbital axis analysis gives a π orbital near
    // s^0.085 p, i.e. about 8 % s (R. C. Haddon, from memory). The geometric model puts the
    // s left over by the three σ bonds into the π orbital: checked on every carbon the model
    // describes (the others take part in multicentre units of the wavefunction's picture
    // and are named in notes).
    let m = load("c60");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let (analysis, notes) = geometric(&m, &eht);
    assert!(analysis.errors.is_empty(), "{:?}", analysis.errors);
    every_carbon_accounted_for(&m, &analysis, &notes);
    assert!(!analysis.centres.is_empty());
    for centre in &analysis.centres {
        assert_eq!(centre.model, HybridModel::Geometric);
        assert_eq!(centre.sigma_partners.len(), 3);
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
}

#[test]
fn describe_centre_reports_supplied_hybrids_like_the_built_in_models() {
    // The hook for hybrids from another source: feeding back the built-in set reproduces
    // its description.
    let m = load("ammonia");
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let (analysis, _) = geometric(&m, &eht);
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
    assert_eq!(again.interorbital_angles.len(), n.interorbital_angles.len());
    for (a, b) in again.interorbital_angles.iter().zip(&n.interorbital_angles) {
        assert_eq!((a.first, a.second), (b.first, b.second));
        assert!((a.degrees - b.degrees).abs() < 1e-8);
    }
    assert_eq!(again.model, HybridModel::Localized);
    assert!(describe_centre(&m, &eht, 1, &orbitals, HybridModel::Localized).is_none());
    assert!(describe_centre(&m, &eht, 99, &orbitals, HybridModel::Localized).is_none());
}
