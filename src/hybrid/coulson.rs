//! Geometric (Coulson) hybrids: orthonormal s,p hybrids pointing along the bonds.
//!
//! A hybrid h_i = (s + √λ_i p_i)/√(1+λ_i) toward bond i; two such hybrids are orthogonal
//! when 1 + √(λ_i λ_j) cos ω_ij = 0 (C. A. Coulson, *Valence*, Oxford 1952, ch. VIII).
//! Two equivalent bonds: λ = −1/cos ω. Three bonds: λ_i = −cos ω_jk/(cos ω_ij cos ω_ik).
//! Four or more: least squares on the orthogonality conditions, residual reported. Lone
//! pairs take the rest of the s character (sum rule Σ 1/(1+λ) = 1) and complete the
//! orthonormal set in the centre's s,p space.

use nalgebra::{DMatrix, DVector, Matrix4, Vector3, Vector4};
use serde::{Deserialize, Serialize};
use thiserror::Error;

/// How the lone pairs of a centre with two or more of them are drawn.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
pub enum LonePairConvention {
    /// One σ-type lone pair holding all the lone-pair s character, the rest pure p.
    #[default]
    SigmaAndPi,
    /// Equivalent lone-pair hybrids (the "rabbit ears" of water).
    Equivalent,
}

/// A normalized s,p hybrid on one centre, as coefficients of (s, px, py, pz).
#[derive(Clone, Debug, PartialEq)]
pub struct SpHybrid {
    pub coefficients: Vector4<f64>,
}

impl SpHybrid {
    /// Share of s character, 0 to 1.
    pub fn s_share(&self) -> f64 {
        self.coefficients[0].powi(2) / self.coefficients.norm_squared()
    }

    /// Hybridization index λ = p share / s share; `None` for a pure p orbital.
    pub fn lambda(&self) -> Option<f64> {
        let s = self.s_share();
        (s > 1e-12).then(|| (1.0 - s) / s)
    }

    /// Unit vector of the p part (the direction the hybrid points), zero for pure s.
    pub fn direction(&self) -> Vector3<f64> {
        let p = Vector3::new(
            self.coefficients[1],
            self.coefficients[2],
            self.coefficients[3],
        );
        let norm = p.norm();
        if norm < 1e-12 {
            Vector3::zeros()
        } else {
            p / norm
        }
    }

    fn from_lambda(lambda: f64, direction: &Vector3<f64>) -> SpHybrid {
        let s = 1.0 / (1.0 + lambda).sqrt();
        let p = (lambda / (1.0 + lambda)).sqrt();
        let d = direction.normalize();
        SpHybrid {
            coefficients: Vector4::new(s, p * d.x, p * d.y, p * d.z),
        }
    }
}

/// The hybrids of one centre in the geometric model.
#[derive(Clone, Debug, PartialEq)]
pub struct GeometricHybrids {
    /// One per σ bond, in the order the bond directions were given.
    pub bonds: Vec<SpHybrid>,
    /// The σ lone pairs.
    pub lone_pairs: Vec<SpHybrid>,
    /// Root-mean-square of 1 + √(λ_i λ_j) cos ω_ij over bond pairs (0 when exact).
    pub residual: f64,
}

/// Why the geometric model cannot describe a centre.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum CoulsonError {
    #[error("bonds at {angle:.1}° (≤ 90°) cannot both be reached by orthogonal s,p hybrids")]
    AngleTooSmall { angle: f64 },
    #[error("a single σ bond does not fix the hybridization from geometry alone")]
    Underdetermined,
    #[error("{wanted} hybrids and π orbitals exceed the 4 s,p orbitals of the centre")]
    TooManyOrbitals { wanted: usize },
    #[error(
        "the bonds leave the lone pairs a negative s share ({share:.3}); the angles are inconsistent"
    )]
    NegativeLonePairShare { share: f64 },
}

/// Geometric hybrids for bonds along `bond_directions` (need not be unit vectors), with
/// `pi_orbitals` p directions reserved for π bonds and `lone_pairs` σ lone pairs.
pub fn geometric_hybrids(
    bond_directions: &[Vector3<f64>],
    pi_orbitals: &[Vector3<f64>],
    lone_pairs: usize,
    convention: LonePairConvention,
) -> Result<GeometricHybrids, CoulsonError> {
    let wanted = bond_directions.len() + pi_orbitals.len() + lone_pairs;
    if wanted > 4 {
        return Err(CoulsonError::TooManyOrbitals { wanted });
    }
    let bond_count = bond_directions.len();
    if bond_count < 2 && (lone_pairs > 0 || bond_count == 1) {
        return Err(CoulsonError::Underdetermined);
    }
    let units: Vec<Vector3<f64>> = bond_directions.iter().map(|d| d.normalize()).collect();
    check_angles(&units)?;
    let lambdas = bond_lambdas(&units);
    let residual = orthogonality_residual(&units, &lambdas);
    let bonds: Vec<SpHybrid> = lambdas
        .iter()
        .zip(&units)
        .map(|(&lambda, direction)| SpHybrid::from_lambda(lambda, direction))
        .collect();
    let share: f64 = 1.0 - bonds.iter().map(SpHybrid::s_share).sum::<f64>();
    if lone_pairs > 0 && share < -1e-9 {
        return Err(CoulsonError::NegativeLonePairShare { share });
    }
    let lone = lone_pairs_beside(&bonds, pi_orbitals, lone_pairs, &units, convention);
    Ok(GeometricHybrids {
        bonds,
        lone_pairs: lone,
        residual,
    })
}

/// cos ω_ij between the unit bond vectors i and j, clamped against rounding.
fn cosine(units: &[Vector3<f64>], i: usize, j: usize) -> f64 {
    units[i].dot(&units[j]).clamp(-1.0, 1.0)
}

/// Every two bonds must be more than 90° apart: 1 + √(λ_i λ_j) cos ω_ij = 0 needs
/// cos ω_ij < 0.
fn check_angles(units: &[Vector3<f64>]) -> Result<(), CoulsonError> {
    for i in 0..units.len() {
        for j in i + 1..units.len() {
            if cosine(units, i, j) >= -1e-9 {
                return Err(CoulsonError::AngleTooSmall {
                    angle: cosine(units, i, j).acos().to_degrees(),
                });
            }
        }
    }
    Ok(())
}

/// λ of each bond: closed forms for two and three bonds, least squares for more.
fn bond_lambdas(units: &[Vector3<f64>]) -> Vec<f64> {
    let cosine = |i: usize, j: usize| cosine(units, i, j);
    match units.len() {
        0 => Vec::new(),
        2 => vec![-1.0 / cosine(0, 1); 2],
        3 => (0..3)
            .map(|i| {
                let (j, k) = ((i + 1) % 3, (i + 2) % 3);
                -cosine(j, k) / (cosine(i, j) * cosine(i, k))
            })
            .collect(),
        count => least_squares_lambdas(count, &cosine),
    }
}

/// RMS of 1 + √(λ_i λ_j) cos ω_ij over the bond pairs; 0 with fewer than two bonds.
fn orthogonality_residual(units: &[Vector3<f64>], lambdas: &[f64]) -> f64 {
    let mut residual_sum = 0.0;
    let mut pairs = 0;
    for i in 0..units.len() {
        for j in i + 1..units.len() {
            residual_sum += (1.0 + (lambdas[i] * lambdas[j]).sqrt() * cosine(units, i, j)).powi(2);
            pairs += 1;
        }
    }
    if pairs > 0 {
        (residual_sum / pairs as f64).sqrt()
    } else {
        0.0
    }
}

/// The lone pairs in the s,p space left free by the bonds and the π orbitals.
fn lone_pairs_beside(
    bonds: &[SpHybrid],
    pi_orbitals: &[Vector3<f64>],
    lone_pairs: usize,
    units: &[Vector3<f64>],
    convention: LonePairConvention,
) -> Vec<SpHybrid> {
    let taken: Vec<Vector4<f64>> = bonds.iter().map(|h| h.coefficients).collect();
    // When the bonds are not exactly orthogonal (≥ 4 bonds), orthonormalize them first.
    let mut taken = gram_schmidt(&taken);
    for p in pi_orbitals {
        let d = p.normalize();
        taken.push(Vector4::new(0.0, d.x, d.y, d.z));
    }
    let taken = gram_schmidt(&taken);
    let complement = orthonormal_complement(&taken);
    lone_pair_hybrids(&complement, lone_pairs, units, convention)
}

/// λ for four or more bonds: minimize Σ (1 + x_i x_j cos ω_ij)² over x_i = √λ_i by
/// Gauss–Newton from the tetrahedral start x = √3.
fn least_squares_lambdas(count: usize, cosine: &dyn Fn(usize, usize) -> f64) -> Vec<f64> {
    let pairs: Vec<(usize, usize)> = (0..count)
        .flat_map(|i| (i + 1..count).map(move |j| (i, j)))
        .collect();
    let mut x = DVector::from_element(count, 3f64.sqrt());
    for _ in 0..100 {
        let mut jacobian = DMatrix::zeros(pairs.len(), count);
        let mut residuals = DVector::zeros(pairs.len());
        for (row, &(i, j)) in pairs.iter().enumerate() {
            let c = cosine(i, j);
            residuals[row] = 1.0 + x[i] * x[j] * c;
            jacobian[(row, i)] = x[j] * c;
            jacobian[(row, j)] = x[i] * c;
        }
        let normal = jacobian.transpose() * &jacobian + DMatrix::identity(count, count) * 1e-12;
        let gradient = jacobian.transpose() * &residuals;
        let Some(step) = normal.lu().solve(&gradient) else {
            break;
        };
        x -= &step;
        x.apply(|v| *v = v.abs().max(1e-6));
        if step.norm() < 1e-14 {
            break;
        }
    }
    x.iter().map(|v| v * v).collect()
}

pub(crate) fn gram_schmidt(vectors: &[Vector4<f64>]) -> Vec<Vector4<f64>> {
    let mut basis: Vec<Vector4<f64>> = Vec::new();
    for v in vectors {
        let mut w = *v;
        for b in &basis {
            w -= b * b.dot(&w);
        }
        if w.norm() > 1e-10 {
            basis.push(w.normalize());
        }
    }
    basis
}

/// An orthonormal basis of the part of R⁴ orthogonal to `taken` (assumed orthonormal):
/// the eigenvectors of the projector I − Σ t tᵀ with eigenvalue 1. (Gram–Schmidt on the
/// unit axes is unstable here: an axis almost inside the taken space leaves a tiny,
/// noise-dominated remainder.)
pub(crate) fn orthonormal_complement(taken: &[Vector4<f64>]) -> Vec<Vector4<f64>> {
    let mut projector = Matrix4::identity();
    for t in taken {
        projector -= t * t.transpose();
    }
    let eigen = projector.symmetric_eigen();
    (0..4)
        .filter(|&k| eigen.eigenvalues[k] > 0.5)
        .map(|k| eigen.eigenvectors.column(k).into_owned())
        .collect()
}

/// Lone pairs from the free subspace: the σ-type one carries all of the subspace's s
/// character and points away from the bonds; the rest are pure p (or mixed equally).
pub(crate) fn lone_pair_hybrids(
    free: &[Vector4<f64>],
    count: usize,
    bond_units: &[Vector3<f64>],
    convention: LonePairConvention,
) -> Vec<SpHybrid> {
    if count == 0 || free.is_empty() {
        return Vec::new();
    }
    let s_axis = Vector4::new(1.0, 0.0, 0.0, 0.0);
    let mut sigma: Vector4<f64> = free.iter().map(|f| f * f.dot(&s_axis)).sum();
    if sigma.norm() < 1e-10 {
        // No s left (a planar AX3 centre): the lone pair is the pure p orbital left over,
        // pointing away from the bonds' side (either sign is the same orbital).
        sigma = free[0];
    }
    sigma = sigma.normalize();
    let away: Vector3<f64> = -bond_units.iter().sum::<Vector3<f64>>();
    let p_part = Vector3::new(sigma[1], sigma[2], sigma[3]);
    if sigma[0] < -1e-12 || (sigma[0].abs() <= 1e-12 && p_part.dot(&away) < 0.0) {
        sigma = -sigma;
    }
    // The rest of the free space, orthogonal to the σ-type lone pair: pure p.
    let mut projector: Matrix4<f64> = free.iter().map(|f| f * f.transpose()).sum();
    projector -= sigma * sigma.transpose();
    let eigen = projector.symmetric_eigen();
    let mut others: Vec<Vector4<f64>> = (0..4)
        .filter(|&k| eigen.eigenvalues[k] > 0.5)
        .map(|k| eigen.eigenvectors.column(k).into_owned())
        .collect();
    others.truncate(count - 1);
    let mut set: Vec<Vector4<f64>> = std::iter::once(sigma).chain(others).collect();
    if convention == LonePairConvention::Equivalent && set.len() >= 2 {
        set = equivalent_combinations(&set);
    }
    set.into_iter()
        .map(|coefficients| SpHybrid { coefficients })
        .collect()
}

/// Equal mixtures of one σ-type hybrid and n − 1 pure p orbitals (n = 2 or 3): an
/// orthogonal transformation giving n equivalent hybrids.
fn equivalent_combinations(set: &[Vector4<f64>]) -> Vec<Vector4<f64>> {
    let n = set.len();
    let a = 1.0 / (n as f64).sqrt();
    let b = ((n as f64 - 1.0) / n as f64).sqrt();
    (0..n)
        .map(|k| {
            let phase = 2.0 * std::f64::consts::PI * k as f64 / n as f64;
            match n {
                2 => set[0] * a + set[1] * if k == 0 { a } else { -a },
                _ => set[0] * a + (set[1] * phase.cos() + set[2] * phase.sin()) * b,
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pyramid(angle_degrees: f64) -> Vec<Vector3<f64>> {
        let t = angle_degrees.to_radians();
        let cos_b = -((2.0 * t.cos() + 1.0) / 3.0).max(0.0).sqrt();
        let sin_b = (1.0 - cos_b * cos_b).sqrt();
        (0..3)
            .map(|k| {
                let phi = 2.0 * std::f64::consts::PI * k as f64 / 3.0;
                Vector3::new(sin_b * phi.cos(), sin_b * phi.sin(), cos_b)
            })
            .collect()
    }

    fn bent(angle_degrees: f64) -> Vec<Vector3<f64>> {
        let h = angle_degrees.to_radians() / 2.0;
        vec![
            Vector3::new(0.0, h.sin(), -h.cos()),
            Vector3::new(0.0, -h.sin(), -h.cos()),
        ]
    }

    fn assert_orthonormal(h: &GeometricHybrids) {
        let all: Vec<&SpHybrid> = h.bonds.iter().chain(&h.lone_pairs).collect();
        for (i, a) in all.iter().enumerate() {
            for (j, b) in all.iter().enumerate() {
                let expected = if i == j { 1.0 } else { 0.0 };
                assert!((a.coefficients.dot(&b.coefficients) - expected).abs() < 1e-10);
            }
        }
    }

    #[test]
    fn coulson_equivalent_bond_values() {
        // Coulson, Valence (1952): tetrahedral → sp3, 120° → sp2, 180° → sp.
        let tetrahedral = 109.471_220_634_490_7;
        let h = geometric_hybrids(
            &pyramid(tetrahedral),
            &[],
            1,
            LonePairConvention::SigmaAndPi,
        )
        .unwrap();
        for bond in &h.bonds {
            assert!((bond.lambda().unwrap() - 3.0).abs() < 1e-9);
        }
        assert!((h.lone_pairs[0].lambda().unwrap() - 3.0).abs() < 1e-8);
        let h = geometric_hybrids(&pyramid(120.0), &[], 0, LonePairConvention::SigmaAndPi).unwrap();
        assert!((h.bonds[0].lambda().unwrap() - 2.0).abs() < 1e-9);
        let linear = [Vector3::z(), -Vector3::z()];
        let h = geometric_hybrids(
            &linear,
            &[Vector3::x(), Vector3::y()],
            0,
            LonePairConvention::SigmaAndPi,
        )
        .unwrap();
        assert!((h.bonds[0].lambda().unwrap() - 1.0).abs() < 1e-12);
    }

    #[test]
    fn pyramidal_ax3e_worked_example() {
        // Textbook worked example for pyramidal AX3 (common practice, no source): 107°
        // bonds are sp^3.4, the lone pair near sp^2.1, with energies 0.77 and 0.68 of the
        // s–p gap above ε_s.
        let h = geometric_hybrids(&pyramid(107.0), &[], 1, LonePairConvention::SigmaAndPi).unwrap();
        let bond = h.bonds[0].lambda().unwrap();
        let lone = h.lone_pairs[0].lambda().unwrap();
        assert!((bond - 3.42).abs() < 0.01, "{bond}");
        assert!((lone - 2.11).abs() < 0.01, "{lone}");
        assert!((bond / (1.0 + bond) - 0.77).abs() < 0.005);
        assert!((lone / (1.0 + lone) - 0.68).abs() < 0.005);
        assert_orthonormal(&h);
        // The lone pair points away from the three bonds (along +z here).
        assert!(h.lone_pairs[0].direction().z > 0.999);
    }

    #[test]
    fn water_bonds_and_lone_pair_conventions() {
        // Water at 104.5°: bonds sp^4.0 (Coulson's relation; common textbook value).
        for convention in [
            LonePairConvention::SigmaAndPi,
            LonePairConvention::Equivalent,
        ] {
            let h = geometric_hybrids(&bent(104.5), &[], 2, convention).unwrap();
            assert!((h.bonds[0].lambda().unwrap() - 3.99).abs() < 0.01);
            assert_orthonormal(&h);
            let s_total: f64 = h
                .bonds
                .iter()
                .chain(&h.lone_pairs)
                .map(SpHybrid::s_share)
                .sum();
            assert!((s_total - 1.0).abs() < 1e-10, "sum rule");
            match convention {
                LonePairConvention::SigmaAndPi => {
                    assert!(h.lone_pairs[1].lambda().is_none(), "one pure p lone pair");
                    assert!(
                        h.lone_pairs[1].direction().x.abs() > 0.999,
                        "perpendicular to the plane"
                    );
                }
                LonePairConvention::Equivalent => {
                    let (a, b) = (
                        h.lone_pairs[0].lambda().unwrap(),
                        h.lone_pairs[1].lambda().unwrap(),
                    );
                    assert!((a - b).abs() < 1e-9, "equivalent lone pairs");
                }
            }
        }
    }

    #[test]
    fn three_unequal_bonds_satisfy_every_orthogonality_condition() {
        let directions = vec![
            Vector3::new(1.0, 0.0, -0.3),
            Vector3::new(-0.4, 0.9, -0.35),
            Vector3::new(-0.5, -0.8, -0.25),
        ];
        let h = geometric_hybrids(&directions, &[], 1, LonePairConvention::SigmaAndPi).unwrap();
        assert!(h.residual < 1e-10);
        assert_orthonormal(&h);
    }

    #[test]
    fn four_bonds_use_least_squares() {
        // A slightly distorted tetrahedron: λ near 3, small residual reported.
        let mut directions = pyramid(109.47);
        directions.push(Vector3::new(0.02, -0.01, 1.0));
        let h = geometric_hybrids(&directions, &[], 0, LonePairConvention::SigmaAndPi).unwrap();
        for bond in &h.bonds {
            assert!((bond.lambda().unwrap() - 3.0).abs() < 0.2);
        }
        assert!(h.residual < 0.05);
    }

    #[test]
    fn impossible_geometries_are_reported() {
        let ring = bent(60.0);
        assert!(matches!(
            geometric_hybrids(&ring, &[], 0, LonePairConvention::SigmaAndPi),
            Err(CoulsonError::AngleTooSmall { .. })
        ));
        assert_eq!(
            geometric_hybrids(&[Vector3::z()], &[], 3, LonePairConvention::SigmaAndPi),
            Err(CoulsonError::Underdetermined)
        );
        assert!(matches!(
            geometric_hybrids(&pyramid(107.0), &[], 2, LonePairConvention::SigmaAndPi),
            Err(CoulsonError::TooManyOrbitals { wanted: 5 })
        ));
    }

    #[test]
    fn planar_ax3_lone_pair_is_pure_p() {
        let h = geometric_hybrids(&pyramid(120.0), &[], 1, LonePairConvention::SigmaAndPi).unwrap();
        assert!(
            h.lone_pairs[0].lambda().is_none(),
            "λ → ∞ is reported as pure p: {:?}",
            h
        );
        assert!(h.lone_pairs[0].direction().z.abs() > 0.999);
    }
}
