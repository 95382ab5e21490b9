//! The extended Hückel Hamiltonian (R. Hoffmann, J. Chem. Phys. 39, 1397 (1963)):
//! H_ii = VSIP_i and H_ij = K S_ij (H_ii + H_jj)/2 with K = 1.75, by default in the
//! weighted form of J. H. Ammeter, H.-B. Bürgi, J. C. Thibeault and R. Hoffmann,
//! J. Am. Chem. Soc. 100, 3686 (1978): K' = K + Δ² + Δ⁴(1 − K),
//! Δ = (H_ii − H_jj)/(H_ii + H_jj).

use nalgebra::DMatrix;

use super::basis::Basis;

/// Hoffmann's constant K.
pub const DEFAULT_K: f64 = 1.75;

/// The effective K for a pair of diagonal elements.
pub fn effective_k(k: f64, h_ii: f64, h_jj: f64, weighted: bool) -> f64 {
    let sum = h_ii + h_jj;
    if !weighted || sum == 0.0 {
        return k;
    }
    let delta = (h_ii - h_jj) / sum;
    let d2 = delta * delta;
    k + d2 + d2 * d2 * (1.0 - k)
}

/// H from the basis VSIPs and the overlap matrix `s`.
pub fn hamiltonian_matrix(basis: &Basis, s: &DMatrix<f64>, k: f64, weighted: bool) -> DMatrix<f64> {
    let n = basis.len();
    let diagonal = &basis.vsip;
    DMatrix::from_fn(n, n, |i, j| {
        if i == j {
            diagonal[i]
        } else {
            let (hi, hj) = (diagonal[i], diagonal[j]);
            effective_k(k, hi, hj, weighted) * s[(i, j)] * 0.5 * (hi + hj)
        }
    })
}
