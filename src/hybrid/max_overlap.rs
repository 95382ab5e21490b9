//! Maximum-overlap hybrids: on each centre, the orthonormal set of s,p hybrids closest in
//! the least-squares sense to the normalized projections of the partner orbitals onto the
//! centre's s,p functions, by Löwdin's symmetric orthogonalization T (TᵀT)^(−1/2)
//! (P.-O. Löwdin, J. Chem. Phys. 18, 365 (1950)). The partner orbital is the partner's own
//! hybrid toward this centre (or a hydrogen 1s), so the centres are iterated to
//! self-consistency (the iteration over centres is in `hybrid::iterate`). Where the
//! bonds are strained the hybrids leave the internuclear axes: the bent bonds of
//! cyclopropane (C. A. Coulson and W. E. Moffitt, Phil. Mag. 40, 1 (1949)).
//!
//! π orbitals are fixed first (pure p along the directions from `centres`), the σ hybrids
//! are sought in the space orthogonal to them, and the lone pairs and vacant orbitals
//! complete the orthonormal set as in the geometric model.

use nalgebra::{DMatrix, Vector3, Vector4};

use super::coulson::gram_schmidt;

/// Smallest eigenvalue of TᵀT accepted by the Löwdin step.
pub const DEPENDENT_THRESHOLD: f64 = 1e-10;
/// Convergence of the iteration: largest change of any hybrid coefficient vector.
pub const CONVERGENCE: f64 = 1e-10;
/// Bound on the iterations over centres.
pub const MAX_ITERATIONS: usize = 500;

/// The orthonormal set closest to the columns `targets` (Löwdin); `None` when the targets
/// are linearly dependent.
pub fn lowdin(targets: &[Vector4<f64>]) -> Option<Vec<Vector4<f64>>> {
    let m = targets.len();
    if m == 0 {
        return Some(Vec::new());
    }
    if m > 4 {
        return None;
    }
    let mut gram = DMatrix::<f64>::zeros(m, m);
    for i in 0..m {
        for j in 0..m {
            gram[(i, j)] = targets[i].dot(&targets[j]);
        }
    }
    let eigen = gram.symmetric_eigen();
    if eigen
        .eigenvalues
        .iter()
        .any(|&e| e.is_nan() || e <= DEPENDENT_THRESHOLD)
    {
        return None;
    }
    let mut inverse_root = DMatrix::<f64>::zeros(m, m);
    for k in 0..m {
        let v = eigen.eigenvectors.column(k);
        inverse_root += v * v.transpose() / eigen.eigenvalues[k].sqrt();
    }
    Some(
        (0..m)
            .map(|j| (0..m).map(|i| targets[i] * inverse_root[(i, j)]).sum())
            .collect(),
    )
}

/// An sp^3-like guess (s + √3 p_u)/2 along the unit vector `u`.
pub fn guess(u: &Vector3<f64>) -> Vector4<f64> {
    let p = 3f64.sqrt() / 2.0;
    Vector4::new(0.5, p * u.x, p * u.y, p * u.z)
}

/// Removes the components along the orthonormal `pi` vectors.
pub fn project_out(v: &Vector4<f64>, pi: &[Vector4<f64>]) -> Vector4<f64> {
    let mut w = *v;
    for p in pi {
        w -= p * p.dot(&w);
    }
    w
}

/// π orbitals as local (s, px, py, pz) vectors, orthonormalized among themselves and, when
/// `against` is given, against those vectors first (e.g. fixed σ hybrids).
pub fn pi_vectors(directions: &[Vector3<f64>], against: &[Vector4<f64>]) -> Vec<Vector4<f64>> {
    let mut all: Vec<Vector4<f64>> = against.to_vec();
    all.extend(directions.iter().map(|d| Vector4::new(0.0, d.x, d.y, d.z)));
    let orthonormal = gram_schmidt(&all);
    orthonormal.into_iter().skip(against.len()).collect()
}

/// The best orthonormal σ hybrids for one centre given its (unnormalized) target vectors:
/// targets are projected out of the π space, normalized and Löwdin-orthonormalized.
/// `fallback[i]` replaces target i when its projection vanishes.
pub fn centre_step(
    targets: &[Vector4<f64>],
    fallback: &[Vector4<f64>],
    pi: &[Vector4<f64>],
) -> Option<Vec<Vector4<f64>>> {
    let normalized: Vec<Vector4<f64>> = targets
        .iter()
        .zip(fallback)
        .map(|(t, f)| {
            let w = project_out(t, pi);
            if w.norm() > 1e-8 {
                w.normalize()
            } else {
                let g = project_out(f, pi);
                if g.norm() > 1e-8 { g.normalize() } else { g }
            }
        })
        .collect();
    lowdin(&normalized)
}

/// Symmetric orthonormalization of a full local set (it leaves an orthonormal set
/// unchanged up to rounding and makes a nearly orthonormal one exact).
pub fn orthonormalize_set(set: &[Vector4<f64>]) -> Option<Vec<Vector4<f64>>> {
    lowdin(set)
}

/// Largest deviation of the local set from orthonormality, max |hᵢ·hⱼ − δᵢⱼ|.
pub fn orthonormality_error(set: &[Vector4<f64>]) -> f64 {
    let mut worst: f64 = 0.0;
    for (i, a) in set.iter().enumerate() {
        for (j, b) in set.iter().enumerate() {
            let expected = if i == j { 1.0 } else { 0.0 };
            worst = worst.max((a.dot(b) - expected).abs());
        }
    }
    worst
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lowdin_keeps_an_orthonormal_set_and_fixes_a_skewed_one() {
        let set = vec![
            Vector4::new(1.0, 0.0, 0.0, 0.0),
            Vector4::new(0.0, 1.0, 0.0, 0.0),
        ];
        let out = lowdin(&set).unwrap();
        assert!((out[0] - set[0]).norm() < 1e-14);
        let skewed = vec![
            Vector4::new(1.0, 0.2, 0.0, 0.0).normalize(),
            Vector4::new(0.2, 1.0, 0.0, 0.0).normalize(),
        ];
        let out = lowdin(&skewed).unwrap();
        assert!(orthonormality_error(&out) < 1e-14);
        // Symmetric: both rotated by the same amount.
        assert!((out[0].dot(&skewed[0]) - out[1].dot(&skewed[1])).abs() < 1e-14);
        let dependent = vec![skewed[0], skewed[0]];
        assert!(lowdin(&dependent).is_none());
    }
}
