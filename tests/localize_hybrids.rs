//! The wavefunction's hybrids (the default hybrid model, DESIGN §4.4 "from localized
//! MOs"): the parts of the occupied localized orbitals on an atom, orthonormalized, give
//! λ, %s, a direction and, for σ bonds, the bending from the bond axis. Checks by symmetry
//! and by textbook facts:
//! - methane: each C–H bond is symmetric about its axis (C3v), so the carbon hybrid points
//!   exactly along the bond (bending 0), and four equivalent orthonormal s,p hybrids are
//!   exactly sp³ (the sum rule Σ 1/(1+λ) = 1 with four equal terms) — Coulson, *Valence*;
//! - ethylene: the π orbital is pure p on both carbons (λ = ∞, no s), perpendicular to the
//!   molecular plane (node plane = molecular plane);
//! - cyclopropane: the C–C bonds are bent (ring angle 60°, while hybrids of s and p cannot
//!   make an interorbital angle below 90°), so the carbon hybrids deviate markedly from
//!   the C–C axes (Coulson and Moffitt 1949: about 22°; we check 10–40°);
//! - water and ammonia: lone pairs are one-centre, almost wholly on the centre, with shares
//!   s + p + d = 1. (Found, EHT + intrinsic bond orbitals: ammonia n(N) λ ≈ 6.8, 13 % s;
//!   water has one pure-p π-type and one λ ≈ 2.7 σ-type lone pair; cyclopropane C–C
//!   bending ≈ 23°.)

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::localized::{
    self, AtomHybrids, HybridKind, LocalizationSettings, LocalizedPicture, OrbitalClass,
    OrbitalSpace,
};

fn picture(name: &str) -> (Molecule, LocalizedPicture) {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("demo geometry");
    let molecule = parse_xyz(&text, name).expect("valid XYZ").molecule;
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    let picture =
        localized::analyze(&molecule, &eht, &LocalizationSettings::default()).expect("picture");
    (molecule, picture)
}

fn on(picture: &LocalizedPicture, atom: usize) -> &AtomHybrids {
    picture
        .hybrids
        .iter()
        .find(|h| h.atom == atom)
        .expect("hybrids of every atom")
}

#[test]
fn methane_hybrids_point_along_the_bonds() {
    let (molecule, picture) = picture("methane");
    let carbon = on(&picture, 0);
    assert!(!carbon.over_complete);
    let bonds: Vec<_> = carbon
        .hybrids
        .iter()
        .filter(|h| h.kind == HybridKind::Bond)
        .collect();
    assert_eq!(bonds.len(), 4);
    for h in bonds {
        let bending = h.bending_degrees.expect("σ bond bending");
        let lambda = h.shape.lambda.expect("has s");
        eprintln!(
            "C–H{}: C hybrid λ = {lambda:.3}, %s = {:.1}, bending {bending:.2e}°",
            h.partner.unwrap(),
            100.0 * h.shape.s_share
        );
        assert!(bending < 1e-3, "bending {bending}");
        assert!((lambda - 3.0).abs() < 1e-6, "sp^λ of carbon, λ = {lambda}");
        assert!((h.share - 1.0).abs() < 1e-12);
    }
    for atom in 1..molecule.atoms.len() {
        let hydrogen = on(&picture, atom);
        let bond = hydrogen
            .hybrids
            .iter()
            .find(|h| h.kind == HybridKind::Bond)
            .expect("H part of its bond");
        assert_eq!(bond.partner, Some(0));
        assert_eq!(bond.shape.lambda, Some(0.0));
    }
}

#[test]
fn ethylene_pi_is_pure_p_perpendicular_to_the_plane() {
    let (molecule, picture) = picture("ethylene");
    // Plane normal from three atoms.
    let p = |i: usize| molecule.atoms[i].position;
    let normal = (p(1) - p(0)).cross(&(p(2) - p(0))).normalize();
    for carbon in [0, 1] {
        let pi: Vec<_> = on(&picture, carbon)
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Pi)
            .collect();
        assert_eq!(pi.len(), 1, "one π orbital on C{carbon}");
        let h = pi[0];
        assert_eq!(h.partner, Some(1 - carbon));
        assert!(h.shape.lambda.is_none(), "pure p: λ = ∞");
        assert!(h.shape.s_share < 1e-10);
        let direction = nalgebra::Vector3::from(h.shape.direction);
        assert!((direction.dot(&normal).abs() - 1.0).abs() < 1e-8);
        assert!(h.bending_degrees.is_none(), "bending is for σ bonds");
    }
}

#[test]
fn cyclopropane_bonds_are_bent() {
    let (molecule, picture) = picture("cyclopropane");
    let mut cc = 0;
    for carbon in 0..3 {
        for h in on(&picture, carbon).hybrids.iter().filter(|h| {
            h.kind == HybridKind::Bond
                && h.partner
                    .is_some_and(|p| molecule.atoms[p].element.symbol() == "C")
        }) {
            let bending = h.bending_degrees.expect("bending");
            eprintln!(
                "cyclopropane C–C: λ = {:?}, bending {bending:.1}°",
                h.shape.lambda
            );
            assert!(bending > 10.0 && bending < 40.0, "bent bond: {bending}°");
            cc += 1;
        }
    }
    assert_eq!(cc, 6, "two C–C bond hybrids on each carbon");
}

#[test]
fn lone_pairs_carry_one_centre_hybrids() {
    for (name, centre, count) in [("ammonia", 0usize, 1), ("water", 0, 2)] {
        let (_, picture) = picture(name);
        let lone_pairs: Vec<_> = picture
            .orbitals
            .iter()
            .filter(|o| o.space == OrbitalSpace::Doubly && o.class == OrbitalClass::OneCentre)
            .collect();
        assert_eq!(lone_pairs.len(), count, "{name}");
        for lp in lone_pairs {
            assert_eq!(lp.centres, vec![centre]);
            assert!(
                lp.centre_populations[0] > 0.9,
                "{name}: lone pair population {}",
                lp.centre_populations[0]
            );
        }
        let hybrids: Vec<_> = on(&picture, centre)
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::LonePair)
            .collect();
        assert_eq!(hybrids.len(), count, "{name}");
        for h in hybrids {
            let s = &h.shape;
            assert!((s.s_share + s.p_share + s.d_share - 1.0).abs() < 1e-12);
            eprintln!(
                "{name} n: λ = {:?}, %s = {:.1}",
                s.lambda,
                100.0 * s.s_share
            );
        }
    }
}
