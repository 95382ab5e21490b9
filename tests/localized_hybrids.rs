//! Hybrids read from the wavefunction (the default model) and from the geometric model on
//! the wavefunction's Lewis structure, against the textbook.

mod localized_support;

use diptych::analysis::{Analysis, Settings};
use diptych::hybrid::{HybridKind, HybridModel};
use diptych::localized::{LocalizationSettings, Wavefunction, analyze_wavefunction};
use localized_support::*;
use nalgebra::{DMatrix, Vector3};

fn entries_of(
    analysis: &Analysis,
    atom: usize,
    kind: HybridKind,
) -> Vec<&diptych::analysis::HybridEntry> {
    analysis
        .hybrid_entries
        .iter()
        .filter(|h| h.center == atom && h.kind == kind)
        .collect()
}

fn max_s(analysis: &Analysis, atom: usize, kind: HybridKind) -> f64 {
    entries_of(analysis, atom, kind)
        .iter()
        .map(|h| h.s_percent)
        .fold(f64::NAN, f64::max)
}

#[test]
fn methane_carbon_is_sp3() {
    // Td symmetry: four equivalent hybrids, λ = 3 (Coulson, Valence, 1952).
    let analysis = analyse(&demo("methane"));
    let bonds = entries_of(&analysis, 0, HybridKind::Bond);
    assert_eq!(bonds.len(), 4);
    for hybrid in bonds {
        assert!(
            (hybrid.lambda.unwrap() - 3.0).abs() < 0.02,
            "λ = {:?}",
            hybrid.lambda
        );
        assert_eq!(hybrid.model, HybridModel::Localized);
    }
}

#[test]
fn cyclopropane_bonds_are_bent_by_coulson_and_moffitts_angle() {
    // Interorbital angle of the two C–C hybrids of one carbon about 104° (C. A. Coulson and
    // W. E. Moffitt, Phil. Mag. 40, 1 (1949)), against the 60° ring angle.
    let molecule = demo("cyclopropane");
    let analysis = analyse(&molecule);
    let carbons = atoms_of(&molecule, "C");
    for &carbon in &carbons {
        let ring: Vec<Vector3<f64>> = entries_of(&analysis, carbon, HybridKind::Bond)
            .into_iter()
            .filter(|h| h.partner.is_some_and(|p| carbons.contains(&p)))
            .map(|h| Vector3::from(h.direction))
            .collect();
        assert_eq!(ring.len(), 2);
        let angle = ring[0].angle(&ring[1]).to_degrees();
        assert!(
            (angle - 104.0).abs() <= 4.0,
            "interorbital angle {angle:.1}°"
        );
    }
}

#[test]
fn bents_rule_holds_for_phosphine_and_hydrogen_sulfide() {
    // H. A. Bent, Chem. Rev. 61, 275 (1961): the lone pair is the s-richest hybrid.
    for name in ["phosphine", "hydrogen_sulfide"] {
        let analysis = analyse(&hard(name));
        let lone = max_s(&analysis, 0, HybridKind::LonePair);
        let bond = max_s(&analysis, 0, HybridKind::Bond);
        assert!(
            lone > bond + 10.0,
            "{name}: lone pair {lone:.1} % s, bonds {bond:.1} % s"
        );
    }
}

#[test]
fn fluorine_makes_the_nitrogen_lone_pair_richer_in_s() {
    // Bent (1961): electronegative substituents draw p character into their bonds, so
    // NF3's lone pair has more s than NH3's.
    let nf3 = analyse(&demo("nitrogen_trifluoride"));
    let nh3 = analyse(&demo("ammonia"));
    let (f, h) = (
        max_s(&nf3, 0, HybridKind::LonePair),
        max_s(&nh3, 0, HybridKind::LonePair),
    );
    assert!(f > h + 10.0, "NF3 {f:.1} % s, NH3 {h:.1} % s");
}

/// Extended Hückel puts little 2s into the lone pairs of NH3 and H2O (ammonia's HOMO is
/// 96 % N 2p, 1.3 % N 2s by Mulliken shares), so their wavefunction hybrids do not follow Bent's rule; the analysis says so
/// in a note, and the same reader on an ab initio wavefunction (PySCF STO-3G RHF water,
/// valence MOs of tests/reference/pyscf_localized.json) does find the σ lone pair the
/// s-richest hybrid.
#[test]
fn first_row_lone_pairs_follow_the_wavefunction_and_say_so() {
    for name in ["ammonia", "water"] {
        let analysis = analyse(&demo(name));
        let lone = max_s(&analysis, 0, HybridKind::LonePair);
        let bond = max_s(&analysis, 0, HybridKind::Bond);
        if lone < bond {
            assert!(
                analysis
                    .notes
                    .iter()
                    .any(|n| n.message.contains("Bent's rule")),
                "{name}: a lone pair poorer in s than the bonds needs a note"
            );
        }
    }
    let fixture = pyscf_fixture();
    let water = pyscf_molecule(&fixture, "pm_lowdin", "water");
    let core = water.entry["n_core"].as_u64().unwrap() as usize;
    let occupied = matrix(&water.entry["occupied_coefficients"]);
    let valence = occupied.columns(core, occupied.ncols() - core).into_owned();
    let (_, half) = diptych::localized::orthonormal::overlap_roots(&water.overlap).unwrap();
    let coefficients = half * valence;
    let occupations = vec![2.0; coefficients.ncols()];
    let hamiltonian = DMatrix::zeros(water.layout.functions(), water.layout.functions());
    let picture = analyze_wavefunction(
        &water.molecule,
        Wavefunction {
            layout: &water.layout,
            coefficients: &coefficients,
            occupations: &occupations,
            hamiltonian: &hamiltonian,
        },
        &LocalizationSettings::default(),
    );
    let oxygen = &picture.hybrids[0].hybrids;
    let best = |kind: HybridKind| {
        oxygen
            .iter()
            .filter(|h| h.kind == kind)
            .map(|h| h.shape.s_share)
            .fold(f64::NAN, f64::max)
    };
    let (lone, bond) = (best(HybridKind::LonePair), best(HybridKind::Bond));
    assert!(
        lone > bond + 0.1,
        "STO-3G water: lone pair {lone:.3} s, bonds {bond:.3} s"
    );
}

#[test]
fn geometric_model_on_ammonia_is_unchanged() {
    // Coulson's relations at H–N–H 106.7°: bonds sp^3.48, lone pair sp^2.03.
    let settings = Settings {
        hybrid: diptych::hybrid::HybridSettings {
            model: HybridModel::Geometric,
            ..Default::default()
        },
        ..Default::default()
    };
    let analysis = Analysis::run(&demo("ammonia"), &settings).unwrap();
    for bond in entries_of(&analysis, 0, HybridKind::Bond) {
        assert!(
            (bond.lambda.unwrap() - 3.48).abs() < 0.01,
            "{:?}",
            bond.lambda
        );
        assert_eq!(bond.model, HybridModel::Geometric);
    }
    let lone = entries_of(&analysis, 0, HybridKind::LonePair);
    assert_eq!(lone.len(), 1);
    assert!((lone[0].lambda.unwrap() - 2.03).abs() < 0.01);
}

#[test]
fn the_s_character_of_an_atom_adds_to_at_most_one() {
    let mut molecules: Vec<_> = xyz_files("demo_molecules")
        .iter()
        .map(|p| load(p))
        .collect();
    molecules.extend(xyz_files("tests/hard_molecules").iter().map(|p| load(p)));
    for molecule in molecules {
        let analysis = analyse(&molecule);
        let Some(picture) = &analysis.picture else {
            continue;
        };
        for atom in &picture.hybrids {
            let s: f64 = atom.hybrids.iter().map(|h| h.share * h.shape.s_share).sum();
            assert!(
                s <= 1.0 + 1e-9,
                "{} atom {}: Σ s = {s}",
                molecule.name,
                atom.atom
            );
            let total: f64 = atom.hybrids.iter().map(|h| h.share).sum();
            let functions = picture.layout.ranges[atom.atom].len() as f64;
            assert!(
                (total - functions).abs() < 1e-6,
                "{}: shares add to {total}",
                molecule.name
            );
        }
    }
}
