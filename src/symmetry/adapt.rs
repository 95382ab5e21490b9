//! Symmetry adaptation of accidentally degenerate orbitals: a set of orbitals at one
//! energy that carries several irreps (water's 3a1 and 1b1 when both lone-pair orbitals
//! are held at the O 2p energy) may come out of the eigensolver as any rotation of its
//! span, with no irrep each. Within such a set the projection operators
//! P_Γ = d_Γ/(|G| r_Γ) Σ_R χ_Γ(R) D(R), with D(R)_ab = c_aᵀ S Γ(R) c_b the representation on
//! the set (Cotton, *Chemical Applications of Group Theory*, 3rd ed., §5.1; r_Γ = 2 for a
//! complex-conjugate pair combined into one real irrep), are diagonalized together as
//! Σ_Γ (Γ + 1) P_Γ, whose eigenvectors each lie in one irrep's component.

use nalgebra::{DMatrix, SymmetricEigen};

use super::Symmetry;
use super::salc::ao_actions;
use crate::chem::ao::AtomicOrbital;

/// Orbitals whose energies differ by less than this (eV) form one set, as for the labels:
/// held orbitals on symmetry-equivalent atoms differ by the localization's rounding (1e-5
/// eV in PF3). A rotation within such a set leaves each orbital's energy expectation
/// within this window of its listed energy.
pub const SET_WINDOW_EV: f64 = super::label::DEGENERACY_EV;
/// A set whose members each have at least this share in one irrep is left as it is.
const PURE_SHARE: f64 = 0.999;

/// One rotation within a degenerate set: the orbitals (columns) and the orthogonal U with
/// C_set ← C_set U.
#[derive(Clone, Debug, PartialEq)]
pub struct SetRotation {
    pub members: Vec<usize>,
    pub rotation: DMatrix<f64>,
}

/// The rotations that make every exactly degenerate set of orbitals symmetry-adapted
/// (`coefficients`: S-normalized columns over `basis`; `energies` ascending). Sets that are
/// already pure, and every set when the operations cannot act on the basis, are left out.
pub fn degenerate_set_rotations(
    symmetry: &Symmetry,
    basis: &[AtomicOrbital],
    overlap: &DMatrix<f64>,
    coefficients: &DMatrix<f64>,
    energies: &[f64],
) -> Vec<SetRotation> {
    let Ok(actions) = ao_actions(symmetry, basis) else {
        return Vec::new();
    };
    if symmetry.operations.len() < 2 || coefficients.ncols() != energies.len() {
        return Vec::new();
    }
    let sc = overlap * coefficients;
    let mut rotations = Vec::new();
    let mut start = 0;
    while start < energies.len() {
        let mut end = start + 1;
        while end < energies.len() && energies[end] - energies[end - 1] < SET_WINDOW_EV {
            end += 1;
        }
        let members: Vec<usize> = (start..end).collect();
        if end - start > 1 && !carries_one_irrep(symmetry, &actions, coefficients, &sc, &members) {
            let representation = set_representation(&actions, coefficients, &sc, &members);
            if let Some(rotation) = adapting_rotation(symmetry, &representation) {
                rotations.push(SetRotation { members, rotation });
            }
        }
        start = end;
    }
    rotations
}

/// Whether the set's characters, taken at one operation per class (a cheap test: C60's
/// sets would otherwise each cost a k × k representation for all 120 operations), reduce
/// to one irrep of the set's dimension: the common case, with nothing to rotate.
fn carries_one_irrep(
    symmetry: &Symmetry,
    actions: &[super::salc::AoAction],
    coefficients: &DMatrix<f64>,
    sc: &DMatrix<f64>,
    members: &[usize],
) -> bool {
    let table = &symmetry.table;
    let n = coefficients.nrows();
    let mut image = vec![0.0; n];
    let mut characters = vec![0.0; table.classes.len()];
    let mut seen = vec![false; table.classes.len()];
    for (op, action) in symmetry.operations.iter().zip(actions) {
        if op.class >= seen.len() || seen[op.class] {
            continue;
        }
        seen[op.class] = true;
        for &m in members {
            let column: Vec<f64> = coefficients.column(m).iter().copied().collect();
            action.apply(&column, &mut image);
            characters[op.class] += sc
                .column(m)
                .iter()
                .zip(&image)
                .map(|(x, y)| x * y)
                .sum::<f64>();
        }
    }
    let order: f64 = table.classes.iter().map(|c| c.size as f64).sum();
    let multiplicities: Vec<f64> = table
        .irreps
        .iter()
        .map(|irrep| {
            let overlap: f64 = (0..table.classes.len())
                .map(|c| table.classes[c].size as f64 * irrep.characters[c] * characters[c])
                .sum();
            overlap / (order * f64::from(irrep.reality))
        })
        .collect();
    let one = multiplicities
        .iter()
        .enumerate()
        .filter(|(_, m)| m.abs() > 0.05)
        .collect::<Vec<_>>();
    matches!(one[..], [(g, m)] if (m - 1.0).abs() < 0.05 && table.irreps[g].dimension == members.len())
}

/// D(R) on the set, one k × k matrix per operation.
fn set_representation(
    actions: &[super::salc::AoAction],
    coefficients: &DMatrix<f64>,
    sc: &DMatrix<f64>,
    members: &[usize],
) -> Vec<DMatrix<f64>> {
    let n = coefficients.nrows();
    let k = members.len();
    let mut image = vec![0.0; n];
    actions
        .iter()
        .map(|action| {
            let mut d = DMatrix::zeros(k, k);
            for (b, &mb) in members.iter().enumerate() {
                let column: Vec<f64> = coefficients.column(mb).iter().copied().collect();
                action.apply(&column, &mut image);
                for (a, &ma) in members.iter().enumerate() {
                    d[(a, b)] = sc.column(ma).iter().zip(&image).map(|(x, y)| x * y).sum();
                }
            }
            d
        })
        .collect()
}

/// The rotation diagonalizing Σ_Γ (Γ + 1) P_Γ, or None when every member already lies in
/// one irrep.
fn adapting_rotation(symmetry: &Symmetry, representation: &[DMatrix<f64>]) -> Option<DMatrix<f64>> {
    let k = representation.first()?.nrows();
    let table = &symmetry.table;
    let order = representation.len() as f64;
    let mut combined = DMatrix::zeros(k, k);
    let mut shares = DMatrix::zeros(table.irreps.len(), k);
    for (g, irrep) in table.irreps.iter().enumerate() {
        let mut projector = DMatrix::zeros(k, k);
        for (op, d) in symmetry.operations.iter().zip(representation) {
            let chi = irrep.characters.get(op.class).copied().unwrap_or(0.0);
            projector += d * chi;
        }
        projector *= irrep.dimension as f64 / (order * f64::from(irrep.reality));
        let symmetric = 0.5 * (&projector + projector.transpose());
        for m in 0..k {
            shares[(g, m)] = symmetric[(m, m)];
        }
        combined += symmetric * (g as f64 + 1.0);
    }
    let pure = (0..k).all(|m| shares.column(m).iter().any(|&s| s >= PURE_SHARE));
    if pure {
        return None;
    }
    let eigen = SymmetricEigen::new(combined);
    let mut columns: Vec<usize> = (0..k).collect();
    columns.sort_by(|&a, &b| eigen.eigenvalues[a].total_cmp(&eigen.eigenvalues[b]));
    Some(DMatrix::from_fn(k, k, |r, c| {
        eigen.eigenvectors[(r, columns[c])]
    }))
}
