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

/// A small two-centre (Slater–Koster form) model Hamiltonian over an s, p basis: rotation
/// covariant, so it commutes with every symmetry operation of an exactly symmetric geometry
/// and only approximately with a distorted one (a stand-in for extended Hückel matrices).
pub fn two_centre_matrix(
    m: &Molecule,
    basis: &[AtomicOrbital],
    scale: f64,
    diagonal: bool,
) -> DMatrix<f64> {
    let n = basis.len();
    let dir = |k: AngularKind| -> Option<usize> {
        match k {
            AngularKind::Px => Some(0),
            AngularKind::Py => Some(1),
            AngularKind::Pz => Some(2),
            _ => None,
        }
    };
    DMatrix::from_fn(n, n, |a, b| {
        let (fa, fb) = (&basis[a], &basis[b]);
        if fa.atom == fb.atom {
            if a != b || !diagonal {
                return if a == b { 1.0 } else { 0.0 };
            }
            let z = m.atoms[fa.atom].element.atomic_number() as f64;
            return -(5.0 + z) - if dir(fa.kind).is_some() { 0.0 } else { 6.0 };
        }
        let d = m.atoms[fb.atom].position - m.atoms[fa.atom].position;
        let r = d.norm();
        let l = d / r;
        let w = (-r).exp() * scale;
        match (dir(fa.kind), dir(fb.kind)) {
            (None, None) => -1.4 * w,
            (Some(i), None) => 1.8 * w * l[i],
            (None, Some(j)) => -1.8 * w * l[j],
            (Some(i), Some(j)) => {
                let delta = if i == j { 1.0 } else { 0.0 };
                w * (2.2 * l[i] * l[j] - 0.6 * (delta - l[i] * l[j]))
            }
        }
    })
}

/// Solves H C = S C E by Löwdin orthogonalization; columns sorted by energy.
pub fn solve(h: &DMatrix<f64>, s: &DMatrix<f64>) -> (DMatrix<f64>, Vec<f64>) {
    let n = h.nrows();
    let es = s.clone().symmetric_eigen();
    assert!(
        es.eigenvalues.iter().all(|v| *v > 1e-6),
        "overlap not positive definite"
    );
    let x = &es.eigenvectors
        * DMatrix::from_diagonal(&es.eigenvalues.map(|v| 1.0 / v.sqrt()))
        * es.eigenvectors.transpose();
    let eig = (&x * h * &x).symmetric_eigen();
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by(|&a, &b| eig.eigenvalues[a].total_cmp(&eig.eigenvalues[b]));
    let full = &x * &eig.eigenvectors;
    let c = DMatrix::from_fn(n, n, |r, k| full[(r, order[k])]);
    (c, order.iter().map(|&k| eig.eigenvalues[k]).collect())
}
