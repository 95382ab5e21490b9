//! Overlap integrals between Slater orbitals, checked against sources outside the engine:
//! the closed-form 1s–1s overlap (textbook formula, e.g. I. N. Levine, *Quantum
//! Chemistry*), an independent numerical quadrature written here (prolate spheroidal
//! coordinates: Gauss–Laguerre in μ × Gauss–Legendre in ν × trapezoid in φ, nodes by the
//! Golub–Welsch method, G. H. Golub and J. H. Welsch, Math. Comp. 23, 221 (1969)), and the
//! rotation invariance of the overlap matrix (a symmetry of the physics).

use diptych::chem::{Atom, Element, Molecule};
use diptych::eht::overlap::{SlaterShell, bond_frame_overlaps, shell_pair_overlap};
use diptych::eht::{
    ElementParameters, ParameterSet, ShellParameters, build_basis, overlap_matrix,
    solve::symmetric_eigenvalues,
};
use nalgebra::{DMatrix, Rotation3, Unit, Vector3};
use std::f64::consts::PI;

// ---------------------------------------------------------------- independent STO values

fn factorial(k: u32) -> f64 {
    (1..=k).map(f64::from).product()
}

/// Value of the normalized real STO (n, l, component) with exponent ζ at displacement d
/// from its centre. Real harmonics in Cartesian form (Szabo and Ostlund), component order
/// s; px, py, pz; dxy, dyz, dz², dxz, dx²−y².
fn sto_value(n: u8, l: u8, component: usize, zeta: f64, d: &Vector3<f64>) -> f64 {
    let r = d.norm();
    let radial = (2.0 * zeta).powf(n as f64 + 0.5) / factorial(2 * n as u32).sqrt()
        * r.powi(n as i32 - 1)
        * (-zeta * r).exp();
    let (x, y, z) = (d.x / r, d.y / r, d.z / r);
    let angular = match (l, component) {
        (0, _) => (1.0 / (4.0 * PI)).sqrt(),
        (1, 0) => (3.0 / (4.0 * PI)).sqrt() * x,
        (1, 1) => (3.0 / (4.0 * PI)).sqrt() * y,
        (1, 2) => (3.0 / (4.0 * PI)).sqrt() * z,
        (2, 0) => (15.0 / (4.0 * PI)).sqrt() * x * y,
        (2, 1) => (15.0 / (4.0 * PI)).sqrt() * y * z,
        (2, 2) => (5.0 / (16.0 * PI)).sqrt() * (3.0 * z * z - 1.0),
        (2, 3) => (15.0 / (4.0 * PI)).sqrt() * x * z,
        (2, 4) => (15.0 / (16.0 * PI)).sqrt() * (x * x - y * y),
        _ => unreachable!(),
    };
    radial * angular
}

// ---------------------------------------------------------------- Golub–Welsch quadrature

/// Nodes and weights from a symmetric tridiagonal Jacobi matrix and the weight's total mass.
fn golub_welsch(diagonal: &[f64], off: &[f64], mass: f64) -> Vec<(f64, f64)> {
    let n = diagonal.len();
    let mut jacobi = DMatrix::zeros(n, n);
    for i in 0..n {
        jacobi[(i, i)] = diagonal[i];
        if i + 1 < n {
            jacobi[(i, i + 1)] = off[i];
            jacobi[(i + 1, i)] = off[i];
        }
    }
    let eigen = jacobi.symmetric_eigen();
    let mut rule: Vec<(f64, f64)> = (0..n)
        .map(|k| {
            (
                eigen.eigenvalues[k],
                mass * eigen.eigenvectors[(0, k)].powi(2),
            )
        })
        .collect();
    rule.sort_by(|a, b| a.0.total_cmp(&b.0));
    rule
}

/// Gauss–Laguerre (weight e^(−x) on [0, ∞)).
fn gauss_laguerre(n: usize) -> Vec<(f64, f64)> {
    let diagonal: Vec<f64> = (0..n).map(|k| 2.0 * k as f64 + 1.0).collect();
    let off: Vec<f64> = (1..n).map(|k| k as f64).collect();
    golub_welsch(&diagonal, &off, 1.0)
}

/// Gauss–Legendre on [−1, 1].
fn gauss_legendre(n: usize) -> Vec<(f64, f64)> {
    let diagonal = vec![0.0; n];
    let off: Vec<f64> = (1..n)
        .map(|k| {
            let k = k as f64;
            k / (4.0 * k * k - 1.0).sqrt()
        })
        .collect();
    golub_welsch(&diagonal, &off, 2.0)
}

#[derive(Clone, Copy)]
struct Shell {
    n: u8,
    l: u8,
    zeta: f64,
    centre: Vector3<f64>,
}

/// ⟨a_i | b_j⟩ for all components, by quadrature in prolate spheroidal coordinates about
/// the two centres.
fn quadrature_block(a: Shell, b: Shell) -> DMatrix<f64> {
    let axis = b.centre - a.centre;
    let r = axis.norm();
    let e = axis / r;
    let helper = if e.x.abs() < 0.8 {
        Vector3::x()
    } else {
        Vector3::y()
    };
    let u = (helper - e * e.dot(&helper)).normalize();
    let v = e.cross(&u);
    let mid = 0.5 * (a.centre + b.centre);
    let p = 0.5 * r * (a.zeta + b.zeta);
    let laguerre = gauss_laguerre(40);
    let legendre = gauss_legendre(48);
    let n_phi = 16;
    let (sa, sb) = (2 * a.l as usize + 1, 2 * b.l as usize + 1);
    let mut block = DMatrix::zeros(sa, sb);
    for &(x, wx) in &laguerre {
        let mu = 1.0 + x / p;
        for &(nu, wnu) in &legendre {
            let rho = 0.5 * r * ((mu * mu - 1.0) * (1.0 - nu * nu)).max(0.0).sqrt();
            let along = 0.5 * r * mu * nu;
            let volume = (0.5 * r).powi(3) * (mu * mu - nu * nu);
            for k in 0..n_phi {
                let phi = 2.0 * PI * k as f64 / n_phi as f64;
                let point = mid + e * along + (u * phi.cos() + v * phi.sin()) * rho;
                let (da, db) = (point - a.centre, point - b.centre);
                // dμ = dx/p; the e^(−x) of the rule is put back with e^(+x).
                let weight = wx * x.exp() / p * wnu * (2.0 * PI / n_phi as f64) * volume;
                for i in 0..sa {
                    let fa = sto_value(a.n, a.l, i, a.zeta, &da);
                    for j in 0..sb {
                        block[(i, j)] += weight * fa * sto_value(b.n, b.l, j, b.zeta, &db);
                    }
                }
            }
        }
    }
    block
}

fn engine_block(a: Shell, b: Shell) -> DMatrix<f64> {
    let convert = |s: Shell| SlaterShell {
        n: s.n,
        l: s.l,
        zeta: s.zeta,
        centre: s.centre,
    };
    shell_pair_overlap(&convert(a), &convert(b))
}

// ---------------------------------------------------------------- tests

/// Levine, *Quantum Chemistry* (H₂⁺ treatment): 1s–1s overlap S = e^(−ρ)(1 + ρ + ρ²/3),
/// ρ = ζR with R in bohr.
#[test]
fn one_s_one_s_matches_closed_form() {
    for zeta in [1.0f64, 1.3, 2.7] {
        for r in [0.05, 0.5, 1.0, 1.4, 2.0, 4.0, 8.0, 20.0] {
            let rho = zeta * r;
            let expected = (-rho).exp() * (1.0 + rho + rho * rho / 3.0);
            let got = bond_frame_overlaps(1, 0, zeta, 1, 0, zeta, r)[0];
            assert!(
                (got - expected).abs() < 1e-13,
                "ζ = {zeta}, R = {r}: {got} vs {expected}"
            );
        }
    }
}

/// Every overlap type (s–s, s–p, p–p σ and π, d with s, p, d; n = 1…5; equal and unequal
/// ζ; bonds along arbitrary directions, so the rotation to the bond frame is exercised)
/// against the independent quadrature, to 1e-8.
#[test]
fn all_overlap_types_match_quadrature() {
    let directions = [
        Vector3::new(0.0, 0.0, 1.0),
        Vector3::new(-1.0, 0.0, 0.0),
        Vector3::new(0.3, -0.5, 0.81),
        Vector3::new(-0.62, 0.44, -0.65),
    ];
    // (n_a, l_a, ζ_a, n_b, l_b, ζ_b, R in bohr)
    let cases: &[(u8, u8, f64, u8, u8, f64, f64)] = &[
        (1, 0, 1.3, 1, 0, 1.3, 1.4),
        (1, 0, 1.3, 2, 0, 1.625, 2.05),
        (1, 0, 1.3, 2, 1, 1.625, 2.05),
        (2, 0, 1.625, 2, 1, 1.95, 2.2),
        (2, 1, 1.625, 2, 1, 1.95, 2.3),
        (2, 1, 1.95, 2, 1, 1.95, 2.1),
        (2, 0, 2.275, 2, 0, 2.275, 2.3),
        (3, 0, 1.75, 3, 1, 1.3, 3.8),
        (3, 1, 1.827, 2, 1, 2.275, 3.0),
        (3, 1, 1.3, 3, 1, 1.3, 4.0),
        (4, 0, 2.588, 4, 1, 2.131, 4.3),
        (4, 1, 2.131, 1, 0, 1.3, 2.7),
        (4, 1, 0.874, 4, 1, 0.874, 6.0),
        (4, 1, 2.131, 3, 1, 1.733, 4.1),
        (3, 2, 1.5, 2, 1, 1.625, 3.2),
        (3, 2, 2.0, 3, 2, 2.0, 4.0),
        (3, 2, 2.0, 3, 2, 1.4, 3.5),
        (4, 2, 1.8, 1, 0, 1.3, 3.0),
        (3, 2, 1.5, 4, 0, 1.2, 3.3),
        (5, 0, 1.0, 5, 1, 1.2, 5.0),
        (5, 2, 1.5, 4, 2, 2.0, 4.5),
    ];
    for (index, &(na, la, za, nb, lb, zb, r)) in cases.iter().enumerate() {
        let direction = directions[index % directions.len()].normalize();
        let a = Shell {
            n: na,
            l: la,
            zeta: za,
            centre: Vector3::new(0.2, -0.1, 0.3),
        };
        let b = Shell {
            n: nb,
            l: lb,
            zeta: zb,
            centre: a.centre + direction * r,
        };
        let engine = engine_block(a, b);
        let numeric = quadrature_block(a, b);
        let error = (&engine - &numeric).abs().max();
        assert!(
            error < 1e-8,
            "({na},{la},{za}) – ({nb},{lb},{zb}) at R = {r}: max error {error:e}\nengine {engine}\nquadrature {numeric}"
        );
        // The block is not trivially zero: some element is of a useful size.
        assert!(engine.abs().max() > 1e-3, "case {index} is degenerate");
    }
}

/// Stability: as R → 0 the overlap tends continuously to the one-centre value
/// N_a N_b (n_a+n_b)!/(ζ_a+ζ_b)^(n_a+n_b+1) (equal l and m) or 0, within O(R) (the
/// derivative of an overlap of normalized STOs is of order ζ); at long range it is tiny
/// and finite; equal and almost equal exponents agree (no division by ζ_a − ζ_b).
#[test]
fn overlaps_are_stable_at_short_and_long_range_and_equal_exponents() {
    let one_centre = |na: u8, za: f64, nb: u8, zb: f64| {
        let norm = |n: u8, z: f64| (2.0 * z).powf(n as f64 + 0.5) / factorial(2 * n as u32).sqrt();
        norm(na, za) * norm(nb, zb) * factorial((na + nb) as u32)
            / (za + zb).powi((na + nb) as i32 + 1)
    };
    for &(na, la, za, nb, lb, zb) in &[
        (2u8, 1u8, 1.625, 3u8, 1u8, 1.3),
        (2, 0, 1.625, 4, 0, 2.588),
        (3, 2, 2.0, 4, 2, 1.5),
        (1, 0, 1.3, 2, 1, 1.625),
    ] {
        let limit = if la == lb {
            one_centre(na, za, nb, zb)
        } else {
            0.0
        };
        for r in [1e-12, 1e-6, 1e-4] {
            let values = bond_frame_overlaps(na, la, za, nb, lb, zb, r);
            assert!(values.iter().all(|v| v.is_finite()));
            for (m, value) in values.iter().enumerate().take(la.min(lb) as usize + 1) {
                assert!(
                    (value - limit).abs() < 5.0 * r + 1e-11,
                    "({na},{la})–({nb},{lb}) m = {m} at R = {r}: {value} vs one-centre {limit}"
                );
            }
        }
        for r in [60.0, 300.0, 2000.0] {
            let values = bond_frame_overlaps(na, la, za, nb, lb, zb, r);
            assert!(
                values.iter().all(|v| v.is_finite() && v.abs() < 1e-20),
                "R = {r}: {values:?}"
            );
        }
        for r in [0.3, 2.0, 7.0] {
            let equal = bond_frame_overlaps(na, la, za, nb, lb, za, r);
            let near = bond_frame_overlaps(na, la, za, nb, lb, za * (1.0 + 1e-9), r);
            for m in 0..3 {
                assert!((equal[m] - near[m]).abs() < 1e-8, "R = {r}, m = {m}");
            }
        }
    }
}

fn cluster() -> Molecule {
    let atoms = vec![
        Atom::new(Element::S, [0.0, 0.0, 0.0]),
        Atom::new(Element::C, [1.2, 0.9, 0.4]),
        Atom::new(Element::O, [-0.8, 1.1, -0.7]),
        Atom::new(Element::H, [0.3, -1.3, 0.2]),
        Atom::new(Element::CL, [-1.0, -0.6, 1.5]),
    ];
    Molecule::new("cluster", atoms, 0)
}

fn rotated(molecule: &Molecule, rotation: &Rotation3<f64>) -> Molecule {
    let mut out = molecule.clone();
    for atom in &mut out.atoms {
        atom.position = rotation * atom.position;
    }
    out
}

fn rotation() -> Rotation3<f64> {
    Rotation3::from_axis_angle(&Unit::new_normalize(Vector3::new(0.4, -1.1, 0.7)), 1.234)
}

/// Rotating the molecule rotates the p functions like vectors: S' = D S Dᵀ with D the
/// rotation matrix on every p block and 1 on s (s and p basis).
#[test]
fn overlap_matrix_transforms_under_rotation() {
    let params = ParameterSet::builtin().unwrap();
    let molecule = cluster();
    let q = rotation();
    let basis = build_basis(&molecule, params, &[]).unwrap();
    let s = overlap_matrix(&basis);
    let s_rot = overlap_matrix(&build_basis(&rotated(&molecule, &q), params, &[]).unwrap());
    let mut d = DMatrix::identity(basis.len(), basis.len());
    for shell in &basis.shells {
        if shell.l == 1 {
            for i in 0..3 {
                for j in 0..3 {
                    d[(shell.first + i, shell.first + j)] = q.matrix()[(i, j)];
                }
            }
        }
    }
    let expected = &d * &s * d.transpose();
    let error = (&expected - &s_rot).abs().max();
    assert!(error < 1e-12, "max deviation {error:e}");
}

/// With d shells as well (an override adds 3d to S and Cl), the spectrum of S is invariant
/// under rotation.
#[test]
fn overlap_spectrum_is_rotation_invariant_with_d_shells() {
    let params = ParameterSet::builtin().unwrap();
    let with_d = |element: Element, n: u8, zs: f64, zp: f64| ElementParameters {
        element,
        shells: vec![
            ShellParameters {
                n,
                l: 0,
                vsip: -20.0,
                zeta: zs,
            },
            ShellParameters {
                n,
                l: 1,
                vsip: -11.0,
                zeta: zp,
            },
            ShellParameters {
                n,
                l: 2,
                vsip: -5.0,
                zeta: 1.5,
            },
        ],
        source: "test override".into(),
    };
    let overrides = vec![
        with_d(Element::S, 3, 2.122, 1.827),
        with_d(Element::CL, 3, 2.183, 1.733),
    ];
    let molecule = cluster();
    let basis = build_basis(&molecule, params, &overrides).unwrap();
    assert_eq!(basis.len(), 9 + 4 + 4 + 1 + 9);
    let s = overlap_matrix(&basis);
    let s_rot =
        overlap_matrix(&build_basis(&rotated(&molecule, &rotation()), params, &overrides).unwrap());
    let a = symmetric_eigenvalues(&s).unwrap();
    let b = symmetric_eigenvalues(&s_rot).unwrap();
    let error = (&a - &b).abs().max();
    assert!(error < 1e-12, "eigenvalues moved by {error:e}");
    assert!(s.iter().all(|x| x.is_finite()));
    // S of a real basis is positive definite.
    assert!(a[0] > 0.0);
}

mod properties {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(64))]
        /// For random placements of two atoms (C and Cl) and a random rotation: S is
        /// symmetric with unit diagonal, |S_ij| ≤ 1 (Cauchy–Schwarz for normalized
        /// functions), and its spectrum does not change under rotation.
        #[test]
        fn overlap_is_bounded_and_rotation_invariant(
            x in -2.0f64..2.0, y in -2.0f64..2.0, z in 0.6f64..3.0,
            ax in -1.0f64..1.0, ay in -1.0f64..1.0, az in 0.1f64..1.0, angle in 0.0f64..6.3,
        ) {
            let params = ParameterSet::builtin().unwrap();
            let molecule = Molecule::new("pair", vec![
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::CL, [x, y, z]),
                Atom::new(Element::H, [-x, 0.5 * y, -z]),
            ], 0);
            let s = overlap_matrix(&build_basis(&molecule, params, &[]).unwrap());
            prop_assert!((&s - s.transpose()).abs().max() == 0.0);
            for i in 0..s.nrows() {
                prop_assert!((s[(i, i)] - 1.0).abs() < 1e-15);
                for j in 0..s.ncols() {
                    prop_assert!(s[(i, j)].abs() <= 1.0 + 1e-12);
                }
            }
            let q = Rotation3::from_axis_angle(&Unit::new_normalize(Vector3::new(ax, ay, az)), angle);
            let s_rot = overlap_matrix(&build_basis(&rotated(&molecule, &q), params, &[]).unwrap());
            let a = symmetric_eigenvalues(&s).unwrap();
            let b = symmetric_eigenvalues(&s_rot).unwrap();
            prop_assert!((&a - &b).abs().max() < 1e-11);
        }
    }
}
