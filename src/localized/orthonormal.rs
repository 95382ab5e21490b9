//! The orthonormal atomic basis of the localized picture: Löwdin's symmetric
//! orthogonalization of the valence AOs, μ̃ = Σ_ν ν (S^(−½))_νμ (P.-O. Löwdin, J. Chem.
//! Phys. 18, 365 (1950)). In a minimal valence basis, as extended Hückel's, these are the
//! intrinsic atomic orbitals (G. Knizia, J. Chem. Theory Comput. 9, 4834 (2013)): each μ̃
//! belongs to the atom of μ, and an orbital φ with coefficients φ̃ over this basis has the
//! atomic populations q_A(φ) = Σ_{μ∈A} φ̃_μ², which are non-negative and add to 1.
//!
//! Also here: the Wiberg bond index in this basis, W_AB = Σ_{μ∈A, ν∈B} P̃_μν² with
//! P̃ = C̃ n C̃ᵀ (K. B. Wiberg, Tetrahedron 24, 1083 (1968); in an orthonormal basis, as
//! for Löwdin's or the natural atomic orbitals).

use std::ops::Range;

use nalgebra::{DMatrix, DVector, DVectorView, SymmetricEigen};

use crate::chem::ao::AngularKind;
use crate::eht::EhtResult;

/// Eigenvalues of S below this make S^(±½) meaningless (the extended Hückel solver
/// refuses such a basis before this point; external inputs are checked here).
const SINGULAR_OVERLAP: f64 = 1e-10;

/// Which functions of the orthonormal basis belong to which atom, and what they are.
#[derive(Clone, Debug, PartialEq)]
pub struct AtomLayout {
    /// For each atom, the range of its functions.
    pub ranges: Vec<Range<usize>>,
    /// Angular kind of each function.
    pub kinds: Vec<AngularKind>,
}

impl AtomLayout {
    /// The layout of an extended Hückel basis.
    pub fn of(eht: &EhtResult) -> AtomLayout {
        AtomLayout {
            ranges: eht.basis.atom_ranges.clone(),
            kinds: eht.basis.orbitals.iter().map(|o| o.kind).collect(),
        }
    }

    /// A layout from an AO → atom map (functions of one atom contiguous), every function
    /// of the given kinds.
    pub fn from_atom_map(atom_of_ao: &[usize], kinds: Vec<AngularKind>) -> Option<AtomLayout> {
        let atoms = atom_of_ao.iter().map(|&a| a + 1).max().unwrap_or(0);
        let mut ranges = Vec::with_capacity(atoms);
        for atom in 0..atoms {
            let first = atom_of_ao.iter().position(|&a| a == atom)?;
            let last = atom_of_ao.iter().rposition(|&a| a == atom)?;
            if atom_of_ao[first..=last].iter().any(|&a| a != atom) {
                return None;
            }
            ranges.push(first..last + 1);
        }
        (kinds.len() == atom_of_ao.len()).then_some(AtomLayout { ranges, kinds })
    }

    pub fn atoms(&self) -> usize {
        self.ranges.len()
    }

    pub fn functions(&self) -> usize {
        self.kinds.len()
    }
}

/// q_A of one orbital (a vector over the orthonormal basis) on every atom.
pub fn populations(orbital: DVectorView<'_, f64>, layout: &AtomLayout) -> Vec<f64> {
    layout
        .ranges
        .iter()
        .map(|range| range.clone().map(|mu| orbital[mu] * orbital[mu]).sum())
        .collect()
}

/// S^(−½) and S^(½) of a symmetric positive definite overlap matrix, or `None` when S is
/// not (an eigenvalue below 1e-10 or not finite).
pub fn overlap_roots(overlap: &DMatrix<f64>) -> Option<(DMatrix<f64>, DMatrix<f64>)> {
    if overlap.iter().any(|x| !x.is_finite()) || overlap.nrows() != overlap.ncols() {
        return None;
    }
    let eigen = SymmetricEigen::new(overlap.clone());
    if eigen
        .eigenvalues
        .iter()
        .any(|&l| l.is_nan() || l < SINGULAR_OVERLAP)
    {
        return None;
    }
    let scaled = |power: f64| {
        let mut u = eigen.eigenvectors.clone();
        for (mut column, &lambda) in u.column_iter_mut().zip(eigen.eigenvalues.iter()) {
            column *= lambda.powf(power);
        }
        u * eigen.eigenvectors.transpose()
    };
    Some((scaled(-0.5), scaled(0.5)))
}

/// C̃ = S^(½) C for AO coefficients `coefficients` (columns), with S^(½) = S X where X is
/// the orthogonalizer S^(−½) already at hand.
pub fn to_orthonormal(
    overlap: &DMatrix<f64>,
    orthogonalizer: &DMatrix<f64>,
    coefficients: &DMatrix<f64>,
) -> DMatrix<f64> {
    overlap * (orthogonalizer * coefficients)
}

/// Gram–Schmidt (twice, for numerical orthogonality) of `v` against the orthonormal
/// `basis`; `v` is appended, normalized, when its norm stays above `floor` times its
/// starting norm. Returns whether it was appended.
pub fn push_orthonormal(basis: &mut Vec<DVector<f64>>, mut v: DVector<f64>, floor: f64) -> bool {
    let start = v.norm();
    if start <= 1e-12 {
        return false;
    }
    for _ in 0..2 {
        for w in basis.iter() {
            let p = w.dot(&v);
            v.axpy(-p, w, 1.0);
        }
    }
    let norm = v.norm();
    let kept = norm > floor * start;
    if kept {
        basis.push(v / norm);
    }
    kept
}

/// The orthonormal `vectors` completed with unit vectors to an n × n orthonormal matrix.
pub fn completed_basis(vectors: Vec<DVector<f64>>, n: usize) -> Option<DMatrix<f64>> {
    let mut basis: Vec<DVector<f64>> = Vec::with_capacity(n);
    let units = (0..n).map(|k| DVector::from_fn(n, |r, _| f64::from(u8::from(r == k))));
    for v in vectors.into_iter().chain(units) {
        if basis.len() == n {
            break;
        }
        push_orthonormal(&mut basis, v, 1e-8);
    }
    (basis.len() == n).then(|| DMatrix::from_columns(&basis))
}

/// Wiberg bond indices W_AB (atoms × atoms, zero diagonal) from the MOs over the
/// orthonormal basis and their occupations.
pub fn wiberg_indices(
    coefficients: &DMatrix<f64>,
    occupations: &[f64],
    layout: &AtomLayout,
) -> DMatrix<f64> {
    let occupied: Vec<usize> = (0..occupations.len().min(coefficients.ncols()))
        .filter(|&k| occupations[k] > 0.0)
        .collect();
    let n = coefficients.nrows();
    let weighted = DMatrix::from_fn(n, occupied.len(), |mu, k| {
        coefficients[(mu, occupied[k])] * occupations[occupied[k]].sqrt()
    });
    let density = &weighted * weighted.transpose();
    let atoms = layout.atoms();
    let mut indices = DMatrix::zeros(atoms, atoms);
    for a in 0..atoms {
        for b in a + 1..atoms {
            let mut total = 0.0;
            for mu in layout.ranges[a].clone() {
                for nu in layout.ranges[b].clone() {
                    total += density[(mu, nu)] * density[(mu, nu)];
                }
            }
            indices[(a, b)] = total;
            indices[(b, a)] = total;
        }
    }
    indices
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn roots_multiply_to_the_identity_and_to_s() {
        let s = DMatrix::from_row_slice(3, 3, &[1.0, 0.4, 0.1, 0.4, 1.0, 0.3, 0.1, 0.3, 1.0]);
        let (x, half) = overlap_roots(&s).unwrap();
        assert!((&x * &s * &x - DMatrix::identity(3, 3)).amax() < 1e-12);
        assert!((&half * &half - &s).amax() < 1e-12);
        assert!((to_orthonormal(&s, &x, &x) - DMatrix::identity(3, 3)).amax() < 1e-12);
        let singular = DMatrix::from_row_slice(2, 2, &[1.0, 1.0, 1.0, 1.0]);
        assert!(overlap_roots(&singular).is_none());
    }

    #[test]
    fn h2_bond_has_wiberg_index_one() {
        // Two functions, one doubly occupied bonding MO (1, 1)/√2: P̃ = [[1, 1], [1, 1]],
        // W = 1 (a single bond; Wiberg 1968).
        let c = DMatrix::from_row_slice(
            2,
            2,
            &[
                0.5f64.sqrt(),
                0.5f64.sqrt(),
                0.5f64.sqrt(),
                -(0.5f64.sqrt()),
            ],
        );
        let layout = AtomLayout::from_atom_map(&[0, 1], vec![AngularKind::S; 2]).unwrap();
        let w = wiberg_indices(&c, &[2.0, 0.0], &layout);
        assert!((w[(0, 1)] - 1.0).abs() < 1e-12);
        assert_eq!(w[(0, 0)], 0.0);
    }
}
