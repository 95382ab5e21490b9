//! Correlation weights and group theory (DESIGN §4.6, issue 6), on the demo geometries
//! through the extended Hückel stage. Canonical sets are identified by degeneracy of the
//! energies (1e-3 eV): in C3v ammonia (valence basis N s, p + 3 H 1s = 3a1 + 2e, no a2)
//! a single level is a1 and a pair is e; in Td methane (C s, p + 4 H 1s = 2a1 + 2t2)
//! a single level is a1 and a triple is t2 (Cotton, *Chemical Applications of Group
//! Theory*, C3v and Td tables).
//!
//! The localized orbitals are those of the localized picture (intrinsic bond orbitals of
//! the doubly occupied space, over Löwdin's orthonormal basis, `Metric::Orthonormal`) and
//! the levels of the localized ladder (AO coefficients, `Metric::Overlap`).

use std::path::PathBuf;

use diptych::analysis::{Analysis, Settings};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{DEGENERACY_TOLERANCE_EV, EhtResult, EhtSettings, run};
use diptych::localized::weights::{
    LINK_THRESHOLD, LevelSets, Links, Metric, constituents_text, feeds_text, link,
};
use diptych::localized::{
    self, LocalizationSettings, LocalizedKind, LocalizedPicture, OrbitalClass, OrbitalSpace,
};
use nalgebra::{DMatrix, DVector, Vector3};

fn demo(name: &str) -> (Molecule, EhtResult) {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("demo geometry");
    let molecule = parse_xyz(&text, name).expect("valid XYZ").molecule;
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    (molecule, eht)
}

fn sets_by_energy(eht: &EhtResult) -> LevelSets<'_> {
    LevelSets::ByEnergy {
        energies: &eht.energies,
        tolerance: DEGENERACY_TOLERANCE_EV,
    }
}

/// The doubly occupied localized orbitals of the picture (columns over the orthonormal
/// basis) and their indices in `picture.orbitals`.
fn doubly(picture: &LocalizedPicture) -> (DMatrix<f64>, Vec<usize>) {
    let members: Vec<usize> = (0..picture.orbitals.len())
        .filter(|&k| picture.orbitals[k].space == OrbitalSpace::Doubly)
        .collect();
    (picture.vectors.select_columns(&members), members)
}

/// Links of orbitals over the orthonormal basis.
fn orthonormal_links(eht: &EhtResult, orbitals: &DMatrix<f64>) -> Links {
    link(
        orbitals,
        &eht.orthonormal.coefficients,
        Metric::Orthonormal,
        &eht.occupations,
        sets_by_energy(eht),
        LINK_THRESHOLD,
    )
    .expect("links")
}

fn localize(molecule: &Molecule, eht: &EhtResult) -> LocalizedPicture {
    localized::analyze(molecule, eht, &LocalizationSettings::default()).expect("picture")
}

#[test]
fn ammonia_bonds_draw_on_a1_and_e_lone_pair_on_the_homo() {
    let (molecule, eht) = demo("ammonia");
    let picture = localize(&molecule, &eht);
    let (orbitals, members) = doubly(&picture);
    let links = orthonormal_links(&eht, &orbitals);
    // Only singles (a1) and pairs (e): no other irrep exists in this basis.
    assert!(links.sets.iter().all(|s| s.len() == 1 || s.len() == 2));
    let homo = eht.homo().expect("occupied");
    let occupied_sets: Vec<usize> = (0..links.sets.len())
        .filter(|&s| eht.occupations[links.sets[s][0]] > 0.0)
        .collect();
    // Valence ordering 1a1 < 1e < 2a1 (HOMO).
    let sizes: Vec<usize> = occupied_sets.iter().map(|&s| links.sets[s].len()).collect();
    assert_eq!(sizes, vec![1, 2, 1]);
    let e_set = occupied_sets[1];
    let mut bonds = 0;
    let mut labels = Vec::new();
    for (k, &index) in members.iter().enumerate() {
        let orbital = &picture.orbitals[index];
        match orbital.class {
            OrbitalClass::TwoCentre => {
                labels.push("σ(N–H)".to_string());
                bonds += 1;
                let e_weight = links.set_weights[(k, e_set)];
                for &s in &occupied_sets {
                    if links.sets[s].len() == 1 {
                        let a1 = links.set_weights[(k, s)];
                        assert!(e_weight > a1, "bond {k}: e {e_weight} vs a1 {a1}");
                    }
                }
                // Three equivalent bonds: the e pair holds 2/3 of each (the occupied a1
                // levels share the remaining 1/3; unitary within the occupied space).
                assert!((e_weight - 2.0 / 3.0).abs() < 1e-8, "e weight {e_weight}");
            }
            OrbitalClass::OneCentre => {
                labels.push("n(N)".to_string());
                // The lone pair is a1: no weight at all on e levels (symmetry), and most on
                // the HOMO.
                for set in links.sets.iter().filter(|s| s.len() == 2) {
                    let w: f64 = set.iter().map(|&j| links.weights[(k, j)]).sum();
                    assert!(w < 1e-10, "lone pair on e: {w}");
                }
                let on_homo = links.weights[(k, homo)];
                assert!(on_homo > 0.5, "lone pair on the HOMO: {on_homo}");
                for j in 0..eht.energies.len() {
                    if j != homo {
                        assert!(links.weights[(k, j)] < on_homo);
                    }
                }
            }
            OrbitalClass::MultiCentre => panic!("ammonia has no multi-centre orbital"),
        }
    }
    assert_eq!(bonds, 3);
    let can_labels: Vec<String> = ["1a1", "1e", "1e", "2a1", "3a1", "2e", "2e"]
        .iter()
        .map(|s| s.to_string())
        .collect();
    let text = constituents_text(&links, &labels, &can_labels);
    eprintln!("{text}");
    assert!(text.contains("σ(N–H)") && text.contains("1e 0.6667"));
    let feeds = feeds_text(&links, &labels, &can_labels);
    eprintln!("{feeds}");
    assert!(feeds.lines().any(|l| l.starts_with("2a1: n(N)")));
}

#[test]
fn ammonia_ladder_levels_follow_the_irreps() {
    // The same reading on the localized ladder (σ(N–H) from the 2×2 problem of an N
    // hybrid and an H 1s, n(N) the N hybrid): the bonds draw mostly on e, the lone pair
    // (a1 by symmetry) not at all, and most of it is the HOMO. The ladder levels are not
    // exactly in the occupied space, so the e share is close to, not exactly, 2/3
    // (0.66666 found).
    let (molecule, _) = demo("ammonia");
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analyses");
    let eht = analysis.eht.as_ref().unwrap();
    let ladder = DMatrix::from_columns(
        &analysis
            .localized
            .iter()
            .map(|o| DVector::from_column_slice(&o.coefficients))
            .collect::<Vec<_>>(),
    );
    let links = link(
        &ladder,
        &eht.coefficients,
        Metric::Overlap(&eht.overlap),
        &eht.occupations,
        sets_by_energy(eht),
        LINK_THRESHOLD,
    )
    .expect("links");
    let homo = eht.homo().unwrap();
    let e_occupied = links
        .sets
        .iter()
        .position(|s| s.len() == 2 && eht.occupations[s[0]] > 0.0)
        .expect("occupied e pair");
    let mut bonds = 0;
    for (k, level) in analysis.localized.iter().enumerate() {
        match level.kind {
            LocalizedKind::Bond => {
                bonds += 1;
                let e = links.set_weights[(k, e_occupied)];
                eprintln!("{}: 1e {e:.6}", level.label);
                assert!((e - 2.0 / 3.0).abs() < 1e-3, "e weight {e}");
                for (s, set) in links.sets.iter().enumerate() {
                    if set.len() == 1 {
                        assert!(links.set_weights[(k, s)] < e);
                    }
                }
            }
            LocalizedKind::LonePair => {
                for set in links.sets.iter().filter(|s| s.len() == 2) {
                    let w: f64 = set.iter().map(|&j| links.weights[(k, j)]).sum();
                    assert!(w < 1e-10, "lone pair on e: {w}");
                }
                assert!(links.weights[(k, homo)] > 0.5);
            }
            _ => {}
        }
    }
    assert_eq!(bonds, 3);
}

/// The bond orbital of the two-centre model: C sp³ hybrid towards the H (λ = 3, Coulson)
/// and the H 1s, bonding root of the 2×2 problem with the same EHT elements.
fn methane_model_bond(molecule: &Molecule, eht: &EhtResult, h_atom: usize) -> DVector<f64> {
    let n = eht.overlap.nrows();
    let carbon = eht.basis.atom_ranges[0].clone();
    let axis: Vector3<f64> =
        (molecule.atoms[h_atom].position - molecule.atoms[0].position).normalize();
    let mut hybrid = DVector::zeros(n);
    hybrid[carbon.start] = 0.5;
    for (i, mu) in (carbon.start + 1..carbon.start + 4).enumerate() {
        hybrid[mu] = 3f64.sqrt() / 2.0 * axis[i];
    }
    let mut hs = DVector::zeros(n);
    hs[eht.basis.atom_ranges[h_atom].start] = 1.0;
    let basis = [hybrid, hs];
    let m = |a: &DMatrix<f64>, i: usize, j: usize| basis[i].dot(&(a * &basis[j]));
    let (h11, h12, h22) = (
        m(&eht.hamiltonian, 0, 0),
        m(&eht.hamiltonian, 0, 1),
        m(&eht.hamiltonian, 1, 1),
    );
    let s12 = m(&eht.overlap, 0, 1);
    // det(H − εS) = 0 for the 2×2 pencil; lower root.
    let a = 1.0 - s12 * s12;
    let b = -(h11 + h22 - 2.0 * h12 * s12);
    let c = h11 * h22 - h12 * h12;
    let e = (-b - (b * b - 4.0 * a * c).sqrt()) / (2.0 * a);
    // (h11 − e) x + (h12 − e s12) y = 0
    let (x, y) = (-(h12 - e * s12), h11 - e);
    &basis[0] * x + &basis[1] * y
}

#[test]
fn methane_bonds_split_a_quarter_a1_three_quarters_t2() {
    let (molecule, eht) = demo("methane");
    let picture = localize(&molecule, &eht);
    let (orbitals, _) = doubly(&picture);
    assert_eq!(orbitals.ncols(), 4);
    let links = orthonormal_links(&eht, &orbitals);
    let occupied_sets: Vec<usize> = (0..links.sets.len())
        .filter(|&s| eht.occupations[links.sets[s][0]] > 0.0)
        .collect();
    let sizes: Vec<usize> = occupied_sets.iter().map(|&s| links.sets[s].len()).collect();
    assert_eq!(sizes, vec![1, 3], "valence 1a1 < 1t2");
    let (a1, t2) = (occupied_sets[0], occupied_sets[1]);
    // The localized bonds are an orthogonal rotation of the occupied a1 + t2: by Td
    // symmetry each equivalent bond has exactly 1/4 on a1 and 3/4 on t2.
    for k in 0..4 {
        eprintln!(
            "localized C–H bond {k}: a1 {:.10}, t2 {:.10}",
            links.set_weights[(k, a1)],
            links.set_weights[(k, t2)]
        );
        assert!((links.set_weights[(k, a1)] - 0.25).abs() < 1e-8);
        assert!((links.set_weights[(k, t2)] - 0.75).abs() < 1e-8);
    }
    // The non-orthogonal two-centre model bonds (sp³ hybrid + H 1s): not in the occupied
    // space, and mutually overlapping.
    let h_atoms: Vec<usize> = (1..5).collect();
    let bonds = DMatrix::from_columns(
        &h_atoms
            .iter()
            .map(|&h| methane_model_bond(&molecule, &eht, h))
            .collect::<Vec<_>>(),
    );
    let model = link(
        &bonds,
        &eht.coefficients,
        Metric::Overlap(&eht.overlap),
        &eht.occupations,
        sets_by_energy(&eht),
        LINK_THRESHOLD,
    )
    .expect("links");
    let gram = bonds.transpose() * &eht.overlap * &bonds;
    let sigma = gram[(0, 1)] / gram[(0, 0)];
    for k in 0..4 {
        let wa1 = model.set_weights[(k, a1)];
        let wt2 = model.set_weights[(k, t2)];
        let captured = model.captured[k];
        let total: f64 = model.weights.row(k).sum();
        assert!((total - 1.0).abs() < 1e-8, "completeness");
        // Draws on a1 and t2 only (all levels are a1 or t2 here; the weights to the
        // occupied ones carry almost all of the bond).
        assert!(captured > 0.95 && captured < 1.0, "captured {captured}");
        let a1_fraction = wa1 / captured;
        eprintln!(
            "model C–H bond {k}: a1 {wa1:.4}, t2 {wt2:.4}, captured {captured:.4}, \
             a1 share of the captured part {a1_fraction:.4}, inter-bond overlap {sigma:.4}"
        );
        // Mutually overlapping equivalent orbitals with overlap σ: the a1 combination has
        // norm² 4(1 + 3σ), each t2 one 4(1 − σ), so the a1 share of the span is
        // (1 + 3σ)/4 instead of 1/4 (σ > 0 here).
        let predicted = (1.0 + 3.0 * sigma) / 4.0;
        assert!(a1_fraction > 0.25, "a1 share above 1/4 for positive σ");
        assert!(
            (a1_fraction - predicted).abs() < 0.05,
            "{a1_fraction} vs (1+3σ)/4 = {predicted}"
        );
    }
}

/// Ammonia built with exact C3v symmetry (N–H 1.012 Å, H–N–H 106.7°, from the demo file):
/// each localized bond has exactly 2/3 on the e pair and the lone pair nothing.
#[test]
fn exactly_symmetric_ammonia_gives_two_thirds() {
    use diptych::chem::{Atom, Element};
    let (r, angle) = (1.012_f64, 106.7_f64.to_radians());
    // Angle θ of each N–H bond from the −z axis: cos(HNH) = 1 − (3/2) sin²θ.
    let sin_theta = ((1.0 - angle.cos()) * 2.0 / 3.0).sqrt();
    let theta = sin_theta.asin();
    let mut atoms = vec![Atom::new(Element::from_symbol("N").unwrap(), [0.0; 3])];
    for k in 0..3 {
        let phi = 2.0 * std::f64::consts::PI * k as f64 / 3.0;
        atoms.push(Atom::new(
            Element::from_symbol("H").unwrap(),
            [
                r * theta.sin() * phi.cos(),
                r * theta.sin() * phi.sin(),
                -r * theta.cos(),
            ],
        ));
    }
    let molecule = Molecule::new("ammonia", atoms, 0);
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    let picture = localize(&molecule, &eht);
    let (orbitals, _) = doubly(&picture);
    assert_eq!(orbitals.ncols(), 4);
    let links = orthonormal_links(&eht, &orbitals);
    let e_set = links
        .sets
        .iter()
        .position(|s| s.len() == 2)
        .expect("e pair");
    let mut e_weights: Vec<f64> = (0..4).map(|k| links.set_weights[(k, e_set)]).collect();
    e_weights.sort_by(f64::total_cmp);
    eprintln!("exact C3v: e weights {e_weights:?}");
    assert!(e_weights[0] < 1e-9, "lone pair on e: {}", e_weights[0]);
    for w in &e_weights[1..] {
        assert!((w - 2.0 / 3.0).abs() < 1e-9, "bond on e: {w}");
    }
}
