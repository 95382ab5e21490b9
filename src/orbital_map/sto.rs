//! Point values of the extended Hückel valence basis: real Slater-type orbitals
//! χ = N r^(n−1) e^(−ζr) Y_lm with N = (2ζ)^(n+½)/√((2n)!) (the radial normalization of
//! `crate::eht::overlap`) and the real spherical harmonics of `crate::chem::ao`, in the same
//! sign and order conventions as the overlap matrix (e.g. Szabo and Ostlund, *Modern
//! Quantum Chemistry*, for the real harmonics). Positions in Å are turned into bohr with
//! the basis's own factor `BOHR_IN_ANGSTROM`, so that an orbital with cᵀSc = 1 integrates
//! to 1 in bohr³.
//!
//! Speed: r^(n−1) Y_lm is written as r^(n−1−l) times a solid harmonic (a polynomial in
//! x, y, z), so nothing divides by r; the AO coefficients of one orbital are folded, once,
//! into one constant + linear + quadratic form per atom, exponent and power of r
//! ([`OrbitalEvaluator`]), so a point costs one square root and one exponential per atom
//! and exponent; shells whose coefficients are all zero are dropped, and an atom is
//! skipped where ζ_min r exceeds [`DECAY_CUTOFF`]. Grids go line by line
//! ([`OrbitalEvaluator::add_line_bohr`]) in the plane's own frame.

use nalgebra::{Matrix3, Vector3};

use crate::eht::basis::Basis;
use crate::eht::overlap::{BOHR_IN_ANGSTROM, radial_normalization};

/// Beyond ζr = 46 a Slater function has decayed below e^(−46) ≈ 1e-20 of its scale:
/// negligible next to any contour level (common practice, no source).
pub const DECAY_CUTOFF: f64 = 46.0;

const FOUR_PI: f64 = 4.0 * std::f64::consts::PI;

/// Constants c of the real harmonics as c × (solid harmonic) / r^l, in the order of
/// `crate::chem::ao`: s; px, py, pz; dxy, dyz, dz², dxz, dx²−y².
fn harmonic_constants(l: u8) -> &'static [f64] {
    use std::sync::OnceLock;
    static S: OnceLock<[f64; 1]> = OnceLock::new();
    static P: OnceLock<[f64; 3]> = OnceLock::new();
    static D: OnceLock<[f64; 5]> = OnceLock::new();
    match l {
        0 => S.get_or_init(|| [(1.0 / FOUR_PI).sqrt()]),
        1 => P.get_or_init(|| [(3.0 / FOUR_PI).sqrt(); 3]),
        _ => D.get_or_init(|| {
            let c1 = (15.0 / FOUR_PI).sqrt();
            let c0 = (5.0 / (4.0 * FOUR_PI)).sqrt();
            let c2 = (15.0 / (4.0 * FOUR_PI)).sqrt();
            [c1, c1, c0, c1, c2]
        }),
    }
}

/// The solid harmonics (unnormalized polynomials) of angular momentum `l` at (x, y, z).
fn solid_harmonics(l: u8, d: &Vector3<f64>, out: &mut [f64; 5]) {
    let (x, y, z) = (d.x, d.y, d.z);
    match l {
        0 => out[0] = 1.0,
        1 => {
            out[0] = x;
            out[1] = y;
            out[2] = z;
        }
        _ => {
            out[0] = x * y;
            out[1] = y * z;
            out[2] = 2.0 * z * z - x * x - y * y;
            out[3] = x * z;
            out[4] = x * x - y * y;
        }
    }
}

/// Value of every basis function at `point` (bohr), in basis order, into `out`
/// (length = basis size). Used by checks that integrate products of functions.
pub fn basis_values_at(basis: &Basis, point: &Vector3<f64>, out: &mut [f64]) {
    let mut harmonics = [0.0; 5];
    for shell in &basis.shells {
        let d = point - shell.centre;
        let r = d.norm();
        let radial = radial_normalization(shell.n, shell.zeta)
            * r.powi(i32::from(shell.n) - 1 - i32::from(shell.l))
            * (-shell.zeta * r).exp();
        solid_harmonics(shell.l, &d, &mut harmonics);
        let constants = harmonic_constants(shell.l);
        for (k, &c) in constants.iter().enumerate() {
            out[shell.first + k] = radial * c * harmonics[k];
        }
    }
}

/// The angular part of all shells of one atom that share an exponent and a power of r:
/// constant (s) + linear (p) + quadratic (d) forms in the displacement d from the centre,
/// with normalization, harmonic constants and AO coefficients folded in.
#[derive(Clone, Debug)]
struct AngularForm {
    /// Power of r left after the solid harmonic: n − 1 − l.
    power: i32,
    constant: f64,
    linear: Vector3<f64>,
    quadratic: Matrix3<f64>,
    has_quadratic: bool,
}

impl AngularForm {
    fn value(&self, d: &Vector3<f64>, r: f64) -> f64 {
        let mut angular = self.constant + self.linear.dot(d);
        if self.has_quadratic {
            angular += d.dot(&(self.quadratic * d));
        }
        match self.power {
            0 => angular,
            1 => r * angular,
            p => r.powi(p) * angular,
        }
    }
}

/// The shells of one atom with one exponent: e^(−ζr) is computed once for them all.
#[derive(Clone, Debug)]
struct ExponentGroup {
    zeta: f64,
    forms: Vec<AngularForm>,
}

/// The part of an orbital on one atom.
#[derive(Clone, Debug)]
struct AtomTerms {
    centre: Vector3<f64>,
    /// Distance (bohr) beyond which every shell of the atom is negligible.
    cutoff: f64,
    groups: Vec<ExponentGroup>,
}

/// Adds `weights` (one per real function of a shell of angular momentum l, already
/// multiplied by N and the harmonic constant) to a form.
fn add_shell(form: &mut AngularForm, l: u8, weights: &[f64; 5]) {
    match l {
        0 => form.constant += weights[0],
        1 => form.linear += Vector3::new(weights[0], weights[1], weights[2]),
        _ => {
            // xy, yz, 2z² − x² − y², xz, x² − y² as symmetric matrices.
            let m = &mut form.quadratic;
            let [xy, yz, z2, xz, x2y2] = *weights;
            m[(0, 1)] += 0.5 * xy;
            m[(1, 0)] += 0.5 * xy;
            m[(1, 2)] += 0.5 * yz;
            m[(2, 1)] += 0.5 * yz;
            m[(0, 2)] += 0.5 * xz;
            m[(2, 0)] += 0.5 * xz;
            m[(0, 0)] += x2y2 - z2;
            m[(1, 1)] += -x2y2 - z2;
            m[(2, 2)] += 2.0 * z2;
            form.has_quadratic = true;
        }
    }
}

/// Evaluates one orbital ψ = Σ c_μ χ_μ at points, with the coefficients folded in once.
#[derive(Clone, Debug)]
pub struct OrbitalEvaluator {
    atoms: Vec<AtomTerms>,
}

impl OrbitalEvaluator {
    /// The orbital with AO `coefficients` (basis order, length = basis size) in `basis`.
    /// Coefficients beyond the basis are ignored, missing ones count as zero.
    pub fn new(basis: &Basis, coefficients: &[f64]) -> OrbitalEvaluator {
        let mut atoms: Vec<AtomTerms> = Vec::new();
        for shell in &basis.shells {
            let size = shell.size();
            let mut weights = [0.0; 5];
            let norm = radial_normalization(shell.n, shell.zeta);
            let constants = harmonic_constants(shell.l);
            for (k, weight) in weights.iter_mut().enumerate().take(size) {
                let c = coefficients.get(shell.first + k).copied().unwrap_or(0.0);
                *weight = norm * constants[k] * c;
            }
            if weights.iter().all(|&w| w == 0.0) {
                continue;
            }
            let power = i32::from(shell.n) - 1 - i32::from(shell.l);
            let atom_index = match atoms.iter().position(|a| a.centre == shell.centre) {
                Some(index) => index,
                None => {
                    atoms.push(AtomTerms {
                        centre: shell.centre,
                        cutoff: 0.0,
                        groups: Vec::new(),
                    });
                    atoms.len() - 1
                }
            };
            let atom = &mut atoms[atom_index];
            atom.cutoff = atom.cutoff.max(DECAY_CUTOFF / shell.zeta);
            let group_index = match atom.groups.iter().position(|g| g.zeta == shell.zeta) {
                Some(index) => index,
                None => {
                    atom.groups.push(ExponentGroup {
                        zeta: shell.zeta,
                        forms: Vec::new(),
                    });
                    atom.groups.len() - 1
                }
            };
            let group = &mut atom.groups[group_index];
            let form_index = match group.forms.iter().position(|f| f.power == power) {
                Some(index) => index,
                None => {
                    group.forms.push(AngularForm {
                        power,
                        constant: 0.0,
                        linear: Vector3::zeros(),
                        quadratic: Matrix3::zeros(),
                        has_quadratic: false,
                    });
                    group.forms.len() - 1
                }
            };
            add_shell(&mut group.forms[form_index], shell.l, &weights);
        }
        OrbitalEvaluator { atoms }
    }

    /// The same orbital in the frame with origin `origin` (bohr) and orthonormal axes the
    /// columns of `axes`: the new evaluator takes points as coordinates along those axes.
    pub fn in_frame(&self, origin: &Vector3<f64>, axes: &Matrix3<f64>) -> OrbitalEvaluator {
        let transpose = axes.transpose();
        let atoms = self
            .atoms
            .iter()
            .map(|atom| AtomTerms {
                centre: transpose * (atom.centre - origin),
                cutoff: atom.cutoff,
                groups: atom
                    .groups
                    .iter()
                    .map(|group| ExponentGroup {
                        zeta: group.zeta,
                        forms: group
                            .forms
                            .iter()
                            .map(|form| AngularForm {
                                linear: transpose * form.linear,
                                quadratic: transpose * form.quadratic * axes,
                                ..form.clone()
                            })
                            .collect(),
                    })
                    .collect(),
            })
            .collect();
        OrbitalEvaluator { atoms }
    }

    /// Adds ψ along a line of points (x0 + i·step, y, z), i = 0 … out.len() − 1 (bohr), to
    /// `out`; equal to [`Self::value_at_bohr`] at each point. Atom by atom: along the line
    /// each angular form is a quadratic a + b dx + c dx² in dx = x − x_atom, set up once per
    /// atom, so the inner loop is one square root and one exponential per exponent.
    pub fn add_line_bohr(&self, x0: f64, step: f64, y: f64, z: f64, out: &mut [f64]) {
        // (ζ, power of r, a, b, c), grouped by ζ.
        let mut terms: Vec<(f64, i32, f64, f64, f64)> = Vec::with_capacity(9);
        for atom in &self.atoms {
            let dy = y - atom.centre.y;
            let dz = z - atom.centre.z;
            let across = dy * dy + dz * dz;
            let cutoff2 = atom.cutoff * atom.cutoff;
            if across > cutoff2 {
                continue;
            }
            terms.clear();
            for group in &atom.groups {
                for form in &group.forms {
                    let (l, m) = (&form.linear, &form.quadratic);
                    let mut a = form.constant + l.y * dy + l.z * dz;
                    let mut b = l.x;
                    let mut c = 0.0;
                    if form.has_quadratic {
                        a += m[(1, 1)] * dy * dy + m[(2, 2)] * dz * dz + 2.0 * m[(1, 2)] * dy * dz;
                        b += 2.0 * (m[(0, 1)] * dy + m[(0, 2)] * dz);
                        c = m[(0, 0)];
                    }
                    terms.push((group.zeta, form.power, a, b, c));
                }
            }
            for (i, slot) in out.iter_mut().enumerate() {
                let dx = x0 + i as f64 * step - atom.centre.x;
                let r2 = dx * dx + across;
                if r2 > cutoff2 {
                    continue;
                }
                let r = r2.sqrt();
                let mut sum = 0.0;
                let mut zeta = f64::NAN;
                let mut radial = 0.0;
                for &(term_zeta, power, a, b, c) in &terms {
                    if term_zeta != zeta {
                        zeta = term_zeta;
                        radial = (-zeta * r).exp();
                    }
                    let angular = a + dx * (b + c * dx);
                    let r_power = match power {
                        0 => 1.0,
                        1 => r,
                        p => r.powi(p),
                    };
                    sum += radial * r_power * angular;
                }
                *slot += sum;
            }
        }
    }

    /// ψ at `point` given in bohr.
    pub fn value_at_bohr(&self, point: &Vector3<f64>) -> f64 {
        let mut sum = 0.0;
        for atom in &self.atoms {
            let d = point - atom.centre;
            let r2 = d.norm_squared();
            if r2 > atom.cutoff * atom.cutoff {
                continue;
            }
            let r = r2.sqrt();
            for group in &atom.groups {
                let radial = (-group.zeta * r).exp();
                let angular: f64 = group.forms.iter().map(|form| form.value(&d, r)).sum();
                sum += radial * angular;
            }
        }
        sum
    }

    /// ψ at `point` given in Å (the molecule's unit).
    pub fn value_at(&self, point: &Vector3<f64>) -> f64 {
        self.value_at_bohr(&(point / BOHR_IN_ANGSTROM))
    }

    /// True when the orbital has no non-zero coefficient.
    pub fn is_zero(&self) -> bool {
        self.atoms.is_empty()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::ao::{AngularKind, AtomicOrbital};
    use crate::eht::basis::BasisShell;

    /// Two atoms with s, p and d shells (d is only reachable through parameter overrides).
    fn spd_basis() -> Basis {
        let mut basis = Basis {
            orbitals: Vec::new(),
            exponents: Vec::new(),
            vsip: Vec::new(),
            shells: Vec::new(),
            atom_ranges: Vec::new(),
        };
        let centres = [Vector3::new(0.1, -0.2, 0.3), Vector3::new(1.9, 0.7, -1.1)];
        for (atom, centre) in centres.iter().enumerate() {
            let start = basis.orbitals.len();
            for (n, l, zeta) in [(3u8, 0u8, 1.8), (3, 1, 1.6), (3, 2, 2.1)] {
                basis.shells.push(BasisShell {
                    atom,
                    n,
                    l,
                    zeta,
                    vsip: -10.0,
                    centre: *centre,
                    first: basis.orbitals.len(),
                });
                for &kind in AngularKind::shell(l) {
                    basis.orbitals.push(AtomicOrbital { atom, n, kind });
                    basis.exponents.push(zeta);
                    basis.vsip.push(-10.0);
                }
            }
            basis.atom_ranges.push(start..basis.orbitals.len());
        }
        basis
    }

    #[test]
    fn folded_evaluator_equals_the_sum_over_basis_functions() {
        // ψ = Σ c_μ χ_μ (definition of an LCAO orbital): the folded forms, also after a
        // change of frame, must give the same number as summing the functions one by one.
        let basis = spd_basis();
        let coefficients: Vec<f64> = (0..basis.len())
            .map(|k| ((k * 37 % 11) as f64 - 5.0) / 7.0)
            .collect();
        let evaluator = OrbitalEvaluator::new(&basis, &coefficients);
        let axes = nalgebra::Rotation3::from_euler_angles(0.3, -1.1, 2.0).into_inner();
        let origin = Vector3::new(0.4, 0.2, -0.9);
        let framed = evaluator.in_frame(&origin, &axes);
        let mut values = vec![0.0; basis.len()];
        for point in [
            Vector3::new(0.5, 0.5, 0.5),
            Vector3::new(-1.0, 2.0, 0.3),
            Vector3::new(1.9, 0.7, -1.1),
            Vector3::new(3.0, -2.5, 1.0),
        ] {
            basis_values_at(&basis, &point, &mut values);
            let expected: f64 = values.iter().zip(&coefficients).map(|(v, c)| v * c).sum();
            let direct = evaluator.value_at_bohr(&point);
            let in_frame = framed.value_at_bohr(&(axes.transpose() * (point - origin)));
            assert!((direct - expected).abs() < 1e-12, "{direct} vs {expected}");
            assert!(
                (in_frame - expected).abs() < 1e-12,
                "{in_frame} vs {expected}"
            );
        }
    }

    #[test]
    fn line_evaluation_equals_point_evaluation() {
        // The per-line quadratic forms are an algebraic rearrangement of the point formula.
        let basis = spd_basis();
        let coefficients: Vec<f64> = (0..basis.len())
            .map(|k| ((k * 29 % 13) as f64 - 6.0) / 9.0)
            .collect();
        let evaluator = OrbitalEvaluator::new(&basis, &coefficients);
        let (x0, step, y, z) = (-4.0, 0.37, 0.45, -0.8);
        let mut line = vec![0.0; 30];
        evaluator.add_line_bohr(x0, step, y, z, &mut line);
        for (i, value) in line.iter().enumerate() {
            let point = Vector3::new(x0 + i as f64 * step, y, z);
            let expected = evaluator.value_at_bohr(&point);
            assert!(
                (value - expected).abs() < 1e-12,
                "{i}: {value} vs {expected}"
            );
        }
    }

    #[test]
    fn d_functions_are_orthonormal() {
        // The real d harmonics are orthonormal on the sphere (e.g. Szabo and Ostlund): with
        // a normalized radial factor, ∫ χ_i χ_j dV = δ_ij. Midpoint sum on a 3D grid.
        let basis = spd_basis();
        let shell = &basis.shells[2];
        let (half, h) = (9.0, 0.15);
        let n = (2.0 * half / h) as usize;
        let mut values = vec![0.0; basis.len()];
        let mut sums = [[0.0; 5]; 5];
        for a in 0..n {
            for b in 0..n {
                for c in 0..n {
                    let offset = Vector3::new(a as f64, b as f64, c as f64) * h
                        - Vector3::repeat(half - 0.5 * h);
                    basis_values_at(&basis, &(shell.centre + offset), &mut values);
                    for i in 0..5 {
                        for j in 0..5 {
                            sums[i][j] += values[shell.first + i] * values[shell.first + j];
                        }
                    }
                }
            }
        }
        for (i, row) in sums.iter().enumerate() {
            for (j, sum) in row.iter().enumerate() {
                let expected = if i == j { 1.0 } else { 0.0 };
                assert!(
                    (sum * h * h * h - expected).abs() < 2e-3,
                    "({i}, {j}): {sum}"
                );
            }
        }
    }
}
