//! SALCs and the irreps spanned by atomic orbitals, against textbook results: Cotton,
//! *Chemical Applications of Group Theory*, 3rd ed., ch. 8 (ammonia and methane hydrogen
//! 1s sets, the σ set of an octahedral AB6, the π system of benzene, and the central atom's
//! s, p, d functions from the basis-function column of the tables; from memory).

mod symmetry_support;

use diptych::chem::Molecule;
use diptych::chem::ao::{AngularKind, AtomicOrbital};
use diptych::symmetry::{
    Numbering, Symmetry, SymmetrySettings, ao_representation, detect, salcs, shell_matrix, span,
    span_text,
};
use nalgebra::{DMatrix, Matrix3, Vector3};
use symmetry_support::*;

fn ao(atom: usize, n: u8, kind: AngularKind) -> AtomicOrbital {
    AtomicOrbital { atom, n, kind }
}

fn atoms_of(m: &Molecule, symbol: &str) -> Vec<usize> {
    (0..m.atoms.len())
        .filter(|&i| m.atoms[i].element.symbol() == symbol)
        .collect()
}

fn span_of(sym: &Symmetry, basis: &[AtomicOrbital]) -> String {
    span_text(sym, &span(sym, basis).unwrap())
}

fn shell(atom: usize, n: u8, l: u8) -> Vec<AtomicOrbital> {
    AngularKind::shell(l)
        .iter()
        .map(|k| ao(atom, n, *k))
        .collect()
}

/// SALCs: right count per irrep, orthonormal, and each irrep's span invariant.
fn check_salcs(sym: &Symmetry, basis: &[AtomicOrbital]) {
    let list = salcs(sym, basis).unwrap();
    assert_eq!(list.len(), basis.len(), "as many SALCs as orbitals");
    let mult = span(sym, basis).unwrap();
    for (k, ir) in sym.table.irreps.iter().enumerate() {
        let vs: Vec<_> = list.iter().filter(|s| s.irrep == k).collect();
        assert_eq!(vs.len(), mult[k] * ir.dimension, "{}: count", ir.label);
        if vs.is_empty() {
            continue;
        }
        let v = DMatrix::from_columns(
            &vs.iter()
                .map(|s| s.coefficients.clone())
                .collect::<Vec<_>>(),
        );
        let gram = v.transpose() * &v;
        assert!((gram - DMatrix::identity(vs.len(), vs.len())).abs().max() < 1e-10);
        for op in &sym.operations {
            let g = ao_representation(op, basis).unwrap();
            let image = &g * &v;
            let residual = &image - &v * (v.transpose() * &image);
            assert!(
                residual.abs().max() < 1e-9,
                "{} span not invariant",
                ir.label
            );
        }
    }
    // SALCs of different irreps are orthogonal.
    for a in &list {
        for b in &list {
            if a.irrep != b.irrep {
                assert!(a.coefficients.dot(&b.coefficients).abs() < 1e-10);
            }
        }
    }
}

#[test]
fn ammonia_hydrogens_span_a1_plus_e() {
    let m = ammonia();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "C3v");
    let basis: Vec<_> = atoms_of(&m, "H")
        .into_iter()
        .map(|i| ao(i, 1, AngularKind::S))
        .collect();
    assert_eq!(span_of(&sym, &basis), "a1 + e");
    check_salcs(&sym, &basis);
    // The a1 SALC is the equal-weight sum (Cotton §8.3): (1, 1, 1)/√3 up to sign.
    let list = salcs(&sym, &basis).unwrap();
    let a1 = list.iter().find(|s| s.label.to_string() == "a1").unwrap();
    for c in a1.coefficients.iter() {
        assert!((c.abs() - 1.0 / 3f64.sqrt()).abs() < 1e-10);
    }
    // Nitrogen: s is a1, p is a1 + e (z; (x, y)).
    assert_eq!(span_of(&sym, &shell(0, 2, 0)), "a1");
    assert_eq!(span_of(&sym, &shell(0, 2, 1)), "a1 + e");
    assert_eq!(span_of(&sym, &shell(0, 3, 2)), "a1 + 2e");
}

#[test]
fn methane_hydrogens_span_a1_plus_t2() {
    let m = methane();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "Td");
    let basis: Vec<_> = atoms_of(&m, "H")
        .into_iter()
        .map(|i| ao(i, 1, AngularKind::S))
        .collect();
    assert_eq!(span_of(&sym, &basis), "a1 + t2");
    check_salcs(&sym, &basis);
    assert_eq!(span_of(&sym, &shell(0, 2, 0)), "a1");
    assert_eq!(span_of(&sym, &shell(0, 2, 1)), "t2");
    assert_eq!(span_of(&sym, &shell(0, 3, 2)), "e + t2");
}

#[test]
fn octahedral_sigma_set_spans_a1g_eg_t1u() {
    let m = sf6();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "Oh");
    let f = atoms_of(&m, "F");
    // s-type σ functions on F …
    let s_set: Vec<_> = f.iter().map(|&i| ao(i, 2, AngularKind::S)).collect();
    assert_eq!(span_of(&sym, &s_set), "a1g + eg + t1u");
    check_salcs(&sym, &s_set);
    // … and the F 2p orbitals pointing at S.
    let p_set: Vec<_> = f
        .iter()
        .map(|&i| {
            let p = m.atoms[i].position;
            let kind = if p.x.abs() > 0.5 {
                AngularKind::Px
            } else if p.y.abs() > 0.5 {
                AngularKind::Py
            } else {
                AngularKind::Pz
            };
            ao(i, 2, kind)
        })
        .collect();
    assert_eq!(span_of(&sym, &p_set), "a1g + eg + t1u");
    check_salcs(&sym, &p_set);
    // Central atom: s a1g, p t1u, d eg + t2g.
    assert_eq!(span_of(&sym, &shell(0, 3, 0)), "a1g");
    assert_eq!(span_of(&sym, &shell(0, 3, 1)), "t1u");
    assert_eq!(span_of(&sym, &shell(0, 3, 2)), "eg + t2g");
}

#[test]
fn benzene_pi_system_spans_a2u_b2g_e1g_e2u() {
    let m = benzene();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "D6h");
    let basis: Vec<_> = atoms_of(&m, "C")
        .into_iter()
        .map(|i| ao(i, 2, AngularKind::Pz))
        .collect();
    assert_eq!(span_of(&sym, &basis), "b2g + e1g + a2u + e2u");
    let mult = span(&sym, &basis).unwrap();
    for name in ["A2u", "B2g", "E1g", "E2u"] {
        assert_eq!(mult[sym.table.irrep_index(name).unwrap()], 1, "{name}");
    }
    check_salcs(&sym, &basis);
    // The a2u SALC is the all-in-phase combination (Hückel's lowest π orbital).
    let list = salcs(&sym, &basis).unwrap();
    let a2u = list.iter().find(|s| s.label.to_string() == "a2u").unwrap();
    let first = a2u.coefficients[0];
    assert!(a2u.coefficients.iter().all(|c| (c - first).abs() < 1e-10));
}

#[test]
fn water_axes_follow_the_chosen_convention() {
    let m = water();
    let o2p = shell(0, 2, 1);
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(span_of(&sym, &o2p), "a1 + b1 + b2");
    // x is perpendicular to the plane (Mulliken 1955): frame row 0 ∥ plane normal z_mol.
    let x: Vector3<f64> = sym.frame.row(0).transpose();
    assert!(x.cross(&Vector3::z()).norm() < 1e-9);
    let other = SymmetrySettings {
        axis_convention: diptych::symmetry::AxisConvention::InPlaneX,
        ..SymmetrySettings::default()
    };
    let sym2 = detect(&m, &other).unwrap();
    let y: Vector3<f64> = sym2.frame.row(1).transpose();
    assert!(y.cross(&Vector3::z()).norm() < 1e-9);
    let _ = Numbering::default();
}

#[test]
fn shell_matrices_are_orthogonal_representations() {
    use diptych::symmetry::ops::{improper, rotation};
    let a = rotation(&Vector3::new(0.3, -0.5, 0.8), 0.7);
    let b = improper(&Vector3::new(-0.2, 0.9, 0.1), 1.9);
    for l in 0..3u8 {
        let da = shell_matrix(l, &a);
        let db = shell_matrix(l, &b);
        let dab = shell_matrix(l, &(a * b));
        assert!((&da * &db - &dab).abs().max() < 1e-12, "homomorphism l={l}");
        let n = da.nrows();
        assert!((da.transpose() * &da - DMatrix::identity(n, n)).abs().max() < 1e-12);
        // Characters: 1 + 2cos θ (+ 2cos 2θ) for proper rotations (Cotton §4.3).
        let t = da.trace();
        let want = match l {
            0 => 1.0,
            1 => 1.0 + 2.0 * 0.7f64.cos(),
            _ => 1.0 + 2.0 * 0.7f64.cos() + 2.0 * 1.4f64.cos(),
        };
        assert!((t - want).abs() < 1e-12);
    }
    // d functions are even: D(−R) = D(R).
    let d1 = shell_matrix(2, &a);
    let d2 = shell_matrix(2, &(-a));
    assert!((d1 - d2).abs().max() < 1e-12);
    let _ = Matrix3::<f64>::identity();
}

#[test]
fn an_incomplete_basis_is_a_typed_error() {
    let m = ammonia();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    // N 2px alone is not closed under C3.
    let basis = vec![ao(0, 2, AngularKind::Px)];
    assert!(span(&sym, &basis).is_err());
    assert!(salcs(&sym, &basis).is_err());
}

#[test]
fn summaries_name_the_central_atom_and_ligand_salcs() {
    use diptych::symmetry::summarize;
    let m = ammonia();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    let s = summarize(&sym, &m);
    assert_eq!(s.point_group, "C3v");
    assert_eq!(s.central_atom, Some(0));
    assert_eq!(s.ligand_sigma.as_deref(), Some("a1 + e"));
    assert_eq!(
        s.central_orbitals,
        vec![
            ("s".into(), "a1".into()),
            ("p".into(), "a1 + e".into()),
            ("d".into(), "a1 + 2e".into())
        ]
    );
    assert_eq!(s.equivalent_atoms, vec![vec![0], vec![1, 2, 3]]);
    let m = sf6();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    let s = summarize(&sym, &m);
    assert_eq!(s.ligand_sigma.as_deref(), Some("a1g + eg + t1u"));
    assert_eq!(s.central_orbitals[2].1, "eg + t2g");
    let m = ethylene();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(summarize(&sym, &m).central_atom, None);
    let json = serde_json::to_string(&summarize(&sym, &m)).unwrap();
    assert!(json.contains("\"point_group\":\"D2h\""));
}
