//! Solution of the generalized eigenproblem HC = SCE by Löwdin's symmetric
//! orthogonalization (P.-O. Löwdin, J. Chem. Phys. 18, 365 (1950)): S = U λ Uᵀ,
//! X = S^(−½) = U λ^(−½) Uᵀ, H' = X H X, H' C' = C' E, C = X C'. One symmetric
//! eigendecomposition of S and one of H' (nalgebra `SymmetricEigen`).
//!
//! Occupations follow the aufbau principle from the electron count; a degenerate set that
//! is only partly filled shares its electrons equally and the result is flagged as an open
//! shell (as is a singly occupied non-degenerate HOMO).

use nalgebra::{DMatrix, DVector, SymmetricEigen};
use serde::{Deserialize, Serialize};

use super::EhtError;

/// S with a smallest eigenvalue below this is treated as singular (two functions almost
/// identical, i.e. two atoms almost on top of each other). Common practice, no source;
/// with λ ≥ 1e-5, S^(−½) amplifies rounding errors by at most ~300.
pub const SINGULAR_OVERLAP_THRESHOLD: f64 = 1e-5;

/// Orbital energies closer than this (eV) are one degenerate set when filling levels.
/// Common practice, no source: above both rounding noise and the splitting that
/// coordinates rounded to 1e-3 Å cause in a degenerate set, well below real splittings.
pub const DEGENERACY_TOLERANCE_EV: f64 = 1e-3;

/// Relative deflation tolerance of the symmetric QR iteration: off-diagonal elements below
/// 1e-12 × the neighbouring diagonal are dropped (eigenvalue errors ~1e-12 relative, far
/// below anything reported; it halves the time against machine epsilon).
const EIGEN_EPS: f64 = 1e-12;
const EIGEN_MAX_ITERATIONS: usize = 10_000;

/// Orbitals and occupations of HC = SCE.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Solution {
    /// Orbital energies in eV, ascending.
    pub energies: Vec<f64>,
    /// MO coefficients over the basis; column k is orbital k (S-normalized).
    pub coefficients: DMatrix<f64>,
    /// Electrons in each orbital (0 to 2; equal shares within a partly filled set).
    pub occupations: Vec<f64>,
    /// True when some level is partly filled (odd electron count or a degenerate set
    /// that is not full).
    pub open_shell: bool,
    /// Number of electrons placed.
    pub electrons: usize,
    /// Smallest eigenvalue of S (a conditioning diagnostic).
    pub smallest_overlap_eigenvalue: f64,
}

/// One Koopmans ionization energy: minus the energy of an occupied orbital.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Ionization {
    /// Orbital index (ascending energy order).
    pub orbital: usize,
    /// Ionization energy in eV (positive for bound orbitals).
    pub energy_ev: f64,
}

impl Solution {
    /// Index of the highest orbital with any electrons.
    pub fn homo(&self) -> Option<usize> {
        self.occupations.iter().rposition(|&occ| occ > 0.0)
    }

    /// Index of the lowest orbital that is not full.
    pub fn lumo(&self) -> Option<usize> {
        self.occupations.iter().position(|&occ| occ < 2.0)
    }

    /// Σ occupation × energy over all orbitals (eV).
    pub fn sum_occupied_energy(&self) -> f64 {
        self.occupations
            .iter()
            .zip(&self.energies)
            .map(|(occ, e)| occ * e)
            .sum()
    }

    /// Koopmans' ionization energies of the occupied orbitals, the HOMO first.
    pub fn koopmans_ionization_energies(&self) -> Vec<Ionization> {
        koopmans(&self.energies, &self.occupations)
    }
}

/// Koopmans' theorem (T. Koopmans, Physica 1, 104 (1934)): the ionization energy from an
/// occupied orbital is minus its energy. Returns the occupied orbitals, the HOMO first.
pub fn koopmans(energies: &[f64], occupations: &[f64]) -> Vec<Ionization> {
    (0..energies.len())
        .rev()
        .filter(|&k| occupations[k] > 0.0)
        .map(|k| Ionization {
            orbital: k,
            energy_ev: -energies[k],
        })
        .collect()
}

/// The problem in Löwdin's orthonormal basis, a by-product of [`solve_orthonormal`]: the
/// localized picture works in this basis (its atomic orbitals are the orthonormalized AOs).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct OrthonormalForm {
    /// X = S^(−½): column μ holds the orthonormalized AO μ̃ over the original AOs, so a
    /// vector c̃ over the orthonormal basis is X c̃ over the AOs.
    pub orthogonalizer: DMatrix<f64>,
    /// H̃ = X H X (eV).
    pub hamiltonian: DMatrix<f64>,
    /// C̃ = S^(½) C: the MOs over the orthonormal basis (orthonormal columns, same order
    /// and signs as `Solution::coefficients`).
    pub coefficients: DMatrix<f64>,
}

/// Solves HC = SCE for `electrons` electrons. Errors: mismatched or non-finite matrices,
/// near-singular S (`SingularOverlap`), no electrons, more electrons than 2 × orbitals.
pub fn solve(h: &DMatrix<f64>, s: &DMatrix<f64>, electrons: usize) -> Result<Solution, EhtError> {
    solve_orthonormal(h, s, electrons).map(|(solution, _)| solution)
}

/// [`solve`], also returning the problem in the orthonormal basis (no extra cost: X, H̃ and
/// C̃ are intermediate results of Löwdin's method).
pub fn solve_orthonormal(
    h: &DMatrix<f64>,
    s: &DMatrix<f64>,
    electrons: usize,
) -> Result<(Solution, OrthonormalForm), EhtError> {
    let n = h.nrows();
    if n == 0 || h.ncols() != n || s.nrows() != n || s.ncols() != n {
        return Err(EhtError::DimensionMismatch {
            h: (h.nrows(), h.ncols()),
            s: (s.nrows(), s.ncols()),
        });
    }
    if h.iter().chain(s.iter()).any(|x| !x.is_finite()) {
        return Err(EhtError::NonFiniteMatrix);
    }
    if electrons == 0 {
        return Err(EhtError::NoElectrons { electrons: 0 });
    }
    if electrons > 2 * n {
        return Err(EhtError::TooManyElectrons {
            electrons,
            capacity: 2 * n,
        });
    }
    let s_eigen = SymmetricEigen::try_new(s.clone(), EIGEN_EPS, EIGEN_MAX_ITERATIONS)
        .ok_or(EhtError::EigenFailure { matrix: "S" })?;
    let smallest = s_eigen
        .eigenvalues
        .iter()
        .copied()
        .fold(f64::INFINITY, f64::min);
    if smallest.is_nan() || smallest < SINGULAR_OVERLAP_THRESHOLD {
        return Err(EhtError::SingularOverlap {
            smallest_eigenvalue: smallest,
            closest_atoms: None,
        });
    }
    // X = U λ^(−½) Uᵀ
    let u = &s_eigen.eigenvectors;
    let mut u_scaled = u.clone();
    for (mut column, &lambda) in u_scaled.column_iter_mut().zip(s_eigen.eigenvalues.iter()) {
        column *= 1.0 / lambda.sqrt();
    }
    let x = &u_scaled * u.transpose();
    let mut h_prime = &x * h * &x;
    // Symmetrize away rounding asymmetry.
    for i in 0..n {
        for j in i + 1..n {
            let mean = 0.5 * (h_prime[(i, j)] + h_prime[(j, i)]);
            h_prime[(i, j)] = mean;
            h_prime[(j, i)] = mean;
        }
    }
    let h_eigen = SymmetricEigen::try_new(h_prime.clone(), EIGEN_EPS, EIGEN_MAX_ITERATIONS)
        .ok_or(EhtError::EigenFailure { matrix: "H'" })?;
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by(|&a, &b| h_eigen.eigenvalues[a].total_cmp(&h_eigen.eigenvalues[b]));
    let energies: Vec<f64> = order.iter().map(|&k| h_eigen.eigenvalues[k]).collect();
    let mut sorted = DMatrix::from_fn(n, n, |i, j| h_eigen.eigenvectors[(i, order[j])]);
    let mut coefficients = &x * &sorted;
    for (mut column, mut orthonormal) in
        coefficients.column_iter_mut().zip(sorted.column_iter_mut())
    {
        // Sign convention: the largest coefficient (first on ties) is positive.
        let mut best = 0;
        for (i, value) in column.iter().enumerate() {
            if value.abs() > column[best].abs() + 1e-12 {
                best = i;
            }
        }
        if column[best] < 0.0 {
            column.neg_mut();
            orthonormal.neg_mut();
        }
    }
    let (occupations, open_shell) = aufbau(&energies, electrons);
    let solution = Solution {
        energies,
        coefficients,
        occupations,
        open_shell,
        electrons,
        smallest_overlap_eigenvalue: smallest,
    };
    let form = OrthonormalForm {
        orthogonalizer: x,
        hamiltonian: h_prime,
        coefficients: sorted,
    };
    Ok((solution, form))
}

/// Aufbau occupations for ascending `energies`; returns the occupations and whether a level
/// is partly filled. Requires electrons ≤ 2 × energies.len().
pub fn aufbau(energies: &[f64], electrons: usize) -> (Vec<f64>, bool) {
    let mut occupations = vec![0.0; energies.len()];
    let mut remaining = electrons as f64;
    let mut open_shell = false;
    let mut start = 0;
    while start < energies.len() && remaining > 0.0 {
        let mut end = start + 1;
        while end < energies.len() && energies[end] - energies[end - 1] < DEGENERACY_TOLERANCE_EV {
            end += 1;
        }
        let capacity = 2.0 * (end - start) as f64;
        let placed = remaining.min(capacity);
        if placed < capacity {
            open_shell = true;
        }
        for occ in &mut occupations[start..end] {
            *occ = placed / (end - start) as f64;
        }
        remaining -= placed;
        start = end;
    }
    (occupations, open_shell)
}

/// Density matrix P = Σ_k occ_k c_k c_kᵀ.
pub fn density_matrix(coefficients: &DMatrix<f64>, occupations: &[f64]) -> DMatrix<f64> {
    let occupied: Vec<usize> = (0..occupations.len())
        .filter(|&k| occupations[k] > 0.0)
        .collect();
    let n = coefficients.nrows();
    let weighted = DMatrix::from_fn(n, occupied.len(), |i, j| {
        coefficients[(i, occupied[j])] * occupations[occupied[j]].sqrt()
    });
    &weighted * weighted.transpose()
}

/// The eigenvalues of a symmetric matrix, ascending (a helper for invariance checks).
pub fn symmetric_eigenvalues(m: &DMatrix<f64>) -> Option<DVector<f64>> {
    let eigen = SymmetricEigen::try_new(m.clone(), EIGEN_EPS, EIGEN_MAX_ITERATIONS)?;
    let mut values: Vec<f64> = eigen.eigenvalues.iter().copied().collect();
    values.sort_by(f64::total_cmp);
    Some(DVector::from_vec(values))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn aufbau_fills_pairs_and_shares_partly_filled_degenerate_sets() {
        // Levels: one, then a threefold set, then one (aufbau principle, textbook).
        let energies = [-20.0, -10.0, -10.0 + 1e-6, -10.0 + 2e-6, -5.0];
        let (occ, open) = aufbau(&energies, 4);
        assert_eq!(occ[0], 2.0);
        for value in &occ[1..4] {
            assert!((value - 2.0 / 3.0).abs() < 1e-15);
        }
        assert_eq!(occ[4], 0.0);
        assert!(open);
        let (occ, open) = aufbau(&energies, 8);
        assert_eq!(occ, vec![2.0, 2.0, 2.0, 2.0, 0.0]);
        assert!(!open);
        let (occ, open) = aufbau(&energies, 9);
        assert_eq!(occ, vec![2.0, 2.0, 2.0, 2.0, 1.0]);
        assert!(open);
    }

    #[test]
    fn two_level_problem_matches_the_closed_form() {
        // Homonuclear two-level problem: E± = (α ± β)/(1 ± s) (Hückel with overlap,
        // textbook closed form).
        let (alpha, beta, s) = (-13.6, -8.0, 0.45);
        let h = DMatrix::from_row_slice(2, 2, &[alpha, beta, beta, alpha]);
        let overlap = DMatrix::from_row_slice(2, 2, &[1.0, s, s, 1.0]);
        let solution = solve(&h, &overlap, 2).unwrap();
        assert!((solution.energies[0] - (alpha + beta) / (1.0 + s)).abs() < 1e-12);
        assert!((solution.energies[1] - (alpha - beta) / (1.0 - s)).abs() < 1e-12);
        let c = (2.0 * (1.0 + s)).sqrt().recip();
        assert!((solution.coefficients[(0, 0)] - c).abs() < 1e-12);
        assert!((solution.coefficients[(1, 0)] - c).abs() < 1e-12);
    }
}
