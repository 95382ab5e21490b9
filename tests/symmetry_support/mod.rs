//! Shared builders for the symmetry tests: idealized textbook geometries (typical bond
//! lengths, from memory) and helpers for invariant test Hamiltonians.
#![allow(dead_code)]

use diptych::chem::ao::{AngularKind, AtomicOrbital};
use diptych::chem::{Atom, Element, Molecule};
use diptych::symmetry::{Symmetry, average_over_group};
use nalgebra::{DMatrix, Rotation3, Vector3};

pub fn el(s: &str) -> Element {
    Element::from_symbol(s).unwrap()
}

pub fn mol(name: &str, atoms: &[(&str, [f64; 3])]) -> Molecule {
    Molecule::new(
        name,
        atoms.iter().map(|(s, p)| Atom::new(el(s), *p)).collect(),
        0,
    )
}

pub fn ring(
    sym: &'static str,
    n: usize,
    r: f64,
    z: f64,
    phase: f64,
) -> Vec<(&'static str, [f64; 3])> {
    (0..n)
        .map(|k| {
            let a = phase + 2.0 * std::f64::consts::PI * k as f64 / n as f64;
            (sym, [r * a.cos(), r * a.sin(), z])
        })
        .collect()
}

pub fn ammonia() -> Molecule {
    // N–H 1.012 Å, H–N–H 106.7° (NIST CCCBDB experimental values, from memory).
    let mut atoms = vec![("N", [0.0, 0.0, 0.0])];
    let t = 68.0f64.to_radians();
    atoms.extend(ring("H", 3, 1.012 * t.sin(), -1.012 * t.cos(), 0.0));
    mol("ammonia", &atoms)
}

pub fn water() -> Molecule {
    mol(
        "water",
        &[
            ("O", [0.0, 0.0, 0.0]),
            ("H", [0.757, 0.586, 0.0]),
            ("H", [-0.757, 0.586, 0.0]),
        ],
    )
}

pub fn methane() -> Molecule {
    let d = 1.09 / 3f64.sqrt();
    mol(
        "methane",
        &[
            ("C", [0.0, 0.0, 0.0]),
            ("H", [d, d, d]),
            ("H", [d, -d, -d]),
            ("H", [-d, d, -d]),
            ("H", [-d, -d, d]),
        ],
    )
}

pub fn sf6() -> Molecule {
    let r = 1.56;
    mol(
        "sulfur hexafluoride",
        &[
            ("S", [0.0, 0.0, 0.0]),
            ("F", [r, 0.0, 0.0]),
            ("F", [-r, 0.0, 0.0]),
            ("F", [0.0, r, 0.0]),
            ("F", [0.0, -r, 0.0]),
            ("F", [0.0, 0.0, r]),
            ("F", [0.0, 0.0, -r]),
        ],
    )
}

pub fn benzene() -> Molecule {
    let mut atoms = ring("C", 6, 1.39, 0.0, 0.0);
    atoms.extend(ring("H", 6, 2.48, 0.0, 0.0));
    mol("benzene", &atoms)
}

pub fn ethylene() -> Molecule {
    let a = (117.0f64 / 2.0).to_radians();
    let (c, h) = (0.667, 1.09);
    mol(
        "ethylene",
        &[
            ("C", [c, 0.0, 0.0]),
            ("C", [-c, 0.0, 0.0]),
            ("H", [c + h * a.cos(), h * a.sin(), 0.0]),
            ("H", [c + h * a.cos(), -h * a.sin(), 0.0]),
            ("H", [-c - h * a.cos(), h * a.sin(), 0.0]),
            ("H", [-c - h * a.cos(), -h * a.sin(), 0.0]),
        ],
    )
}

pub fn dinitrogen() -> Molecule {
    mol(
        "dinitrogen",
        &[("N", [0.0, 0.0, 0.55]), ("N", [0.0, 0.0, -0.55])],
    )
}

pub fn carbon_monoxide() -> Molecule {
    mol(
        "carbon monoxide",
        &[("C", [0.0, 0.0, 0.0]), ("O", [0.0, 0.0, 1.128])],
    )
}

/// C60: the even permutations of (0, ±1, ±3φ), (±1, ±(2+φ), ±2φ), (±φ, ±2, ±φ³), scaled.
pub fn c60() -> Molecule {
    let p = (1.0 + 5f64.sqrt()) / 2.0;
    let base = [
        [0.0, 1.0, 3.0 * p],
        [1.0, 2.0 + p, 2.0 * p],
        [p, 2.0, p * p * p],
    ];
    let mut pts: Vec<[f64; 3]> = Vec::new();
    for b in base {
        for cyc in [[b[0], b[1], b[2]], [b[1], b[2], b[0]], [b[2], b[0], b[1]]] {
            for sx in [1.0, -1.0] {
                for sy in [1.0, -1.0] {
                    for sz in [1.0, -1.0] {
                        let q = [sx * cyc[0] * 0.7, sy * cyc[1] * 0.7, sz * cyc[2] * 0.7];
                        if !pts
                            .iter()
                            .any(|r| (0..3).all(|i| (r[i] - q[i]).abs() < 1e-9))
                        {
                            pts.push(q);
                        }
                    }
                }
            }
        }
    }
    assert_eq!(pts.len(), 60);
    Molecule::new(
        "C60",
        pts.into_iter().map(|q| Atom::new(el("C"), q)).collect(),
        0,
    )
}

/// Valence basis: s for H; s, p for the other atoms (n = period).
pub fn valence_basis(m: &Molecule) -> Vec<AtomicOrbital> {
    let mut basis = Vec::new();
    for (i, a) in m.atoms.iter().enumerate() {
        let n = a.element.period();
        basis.push(AtomicOrbital {
            atom: i,
            n,
            kind: AngularKind::S,
        });
        if a.element.atomic_number() > 2 {
            for k in AngularKind::shell(1) {
                basis.push(AtomicOrbital {
                    atom: i,
                    n,
                    kind: *k,
                });
            }
        }
    }
    basis
}

/// A deterministic pseudo-random symmetric matrix.
pub fn pseudo_random_symmetric(n: usize, seed: u64) -> DMatrix<f64> {
    let mut state = seed
        .wrapping_mul(6364136223846793005)
        .wrapping_add(1442695040888963407);
    let mut next = || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((state >> 11) as f64 / (1u64 << 53) as f64) * 2.0 - 1.0
    };
    let mut m = DMatrix::zeros(n, n);
    for i in 0..n {
        for j in 0..=i {
            let v = next();
            m[(i, j)] = v;
            m[(j, i)] = v;
        }
    }
    m
}

/// Orbitals of a random Hamiltonian that commutes with the group: (coefficients as columns,
/// ascending energies in "eV").
pub fn invariant_orbitals(
    sym: &Symmetry,
    basis: &[AtomicOrbital],
    seed: u64,
) -> (DMatrix<f64>, Vec<f64>) {
    let a = pseudo_random_symmetric(basis.len(), seed) * 10.0;
    let h = average_over_group(sym, basis, &a).unwrap();
    let eig = h.symmetric_eigen();
    let mut order: Vec<usize> = (0..basis.len()).collect();
    order.sort_by(|&x, &y| eig.eigenvalues[x].total_cmp(&eig.eigenvalues[y]));
    let c = DMatrix::from_fn(basis.len(), basis.len(), |r, k| {
        eig.eigenvectors[(r, order[k])]
    });
    let e = order.iter().map(|&k| eig.eigenvalues[k]).collect();
    (c, e)
}

pub fn rotated(m: &Molecule, axis: [f64; 3], angle: f64, shift: [f64; 3]) -> Molecule {
    let r = Rotation3::from_axis_angle(&nalgebra::Unit::new_normalize(Vector3::from(axis)), angle);
    let mut out = m.clone();
    for a in &mut out.atoms {
        a.position = r * a.position + Vector3::from(shift);
    }
    out
}
