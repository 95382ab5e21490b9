//! Overlap integrals between real Slater-type orbitals (n ≤ 5, l ≤ 2) on two centres.
//!
//! Method: rotate to the bond frame (z along A→B), where the overlap is diagonal in the
//! real m functions (σ, π, δ); evaluate each σ/π/δ integral in prolate spheroidal
//! coordinates μ = (r_A + r_B)/R, ν = (r_A − r_B)/R, in which the integrand is a polynomial
//! in μ and ν times e^(−pμ − tν) (p = R(ζ_A + ζ_B)/2, t = R(ζ_A − ζ_B)/2), so that
//! S = Σ c_ij A_i(p) B_j(t) with the auxiliary integrals of R. S. Mulliken, C. A. Rieke,
//! D. Orloff and H. Orloff, J. Chem. Phys. 17, 1248 (1949):
//! A_k(p) = ∫₁^∞ μ^k e^(−pμ) dμ, B_k(t) = ∫₋₁¹ ν^k e^(−tν) dν.
//! The blocks are rotated back to the molecular frame with the real-harmonic rotation
//! matrices (p: the direction cosines; d: the transformation of quadratic forms).
//!
//! Numerics: A_k is carried as e^p A_k by the upward recursion (all terms positive);
//! B_k as e^(−p) B_k, by its power series when |t| is small (every term has the same
//! sign, so no cancellation, and B_k(0) = 2/(k+1) or 0 comes out exactly) and by upward
//! recursion when |t| exceeds the highest k (stable there). Neither overflows at long range;
//! coincident centres use the one-centre formula.

use std::sync::OnceLock;

use nalgebra::{DMatrix, Matrix3, Vector3};

use super::basis::{Basis, BasisShell};

/// Å per bohr used to turn the geometry into bohr for the Slater exponents: 0.5292, the
/// factor YAeHMOP uses (found from RDKit's H₂ overlap, which equals the closed form
/// e^(−ρ)(1 + ρ + ρ²/3) with ρ = ζR/0.5292 Å to 1e-10). It differs from the CODATA 2022
/// Bohr radius ([`CODATA_BOHR_IN_ANGSTROM`]) by 4e-5 relative, far below the accuracy of
/// the parameters, but enough to move high antibonding levels by up to 0.03 eV; using the
/// reference implementation's factor keeps the two in agreement to rounding.
pub const BOHR_IN_ANGSTROM: f64 = 0.5292;

/// The Bohr radius in Å, CODATA 2022 recommended value (for comparison; not used).
pub const CODATA_BOHR_IN_ANGSTROM: f64 = 0.529_177_210_544;

/// Centres closer than this (bohr) are treated as one centre.
const ONE_CENTRE_DISTANCE: f64 = 1e-8;

/// Largest power of μ or ν in any integrand: n_A + n_B ≤ 10.
const MAX_POWER: usize = 10;

/// Shells up to l = 2 have at most 5 functions.
type Block = [[f64; 5]; 5];

/// Polynomial in (μ, ν) stored densely, index [i][j] for μ^i ν^j.
#[derive(Clone)]
struct Poly {
    c: Vec<[f64; MAX_POWER + 1]>,
}

impl Poly {
    fn constant(value: f64) -> Poly {
        let mut row = [0.0; MAX_POWER + 1];
        row[0] = value;
        Poly { c: vec![row] }
    }

    /// a μ + b ν + c0 + d μν, as the four coefficients.
    fn linear(c0: f64, a: f64, b: f64, d: f64) -> Poly {
        let mut p = Poly {
            c: vec![[0.0; MAX_POWER + 1]; 2],
        };
        p.c[0][0] = c0;
        p.c[1][0] = a;
        p.c[0][1] = b;
        p.c[1][1] = d;
        p
    }

    fn mul(&self, other: &Poly) -> Poly {
        let rows = self.c.len() + other.c.len() - 1;
        let mut out = Poly {
            c: vec![[0.0; MAX_POWER + 1]; rows.min(MAX_POWER + 1)],
        };
        for (i, row_a) in self.c.iter().enumerate() {
            for (k, row_b) in other.c.iter().enumerate() {
                for (j, &a) in row_a.iter().enumerate() {
                    if a == 0.0 {
                        continue;
                    }
                    for (l, &b) in row_b.iter().enumerate() {
                        if b != 0.0 {
                            out.c[i + k][j + l] += a * b;
                        }
                    }
                }
            }
        }
        out
    }

    fn pow(&self, e: usize) -> Poly {
        let mut out = Poly::constant(1.0);
        for _ in 0..e {
            out = out.mul(self);
        }
        out
    }

    fn add_scaled(&mut self, other: &Poly, scale: f64) {
        if other.c.len() > self.c.len() {
            self.c.resize(other.c.len(), [0.0; MAX_POWER + 1]);
        }
        for (row, other_row) in self.c.iter_mut().zip(&other.c) {
            for (x, y) in row.iter_mut().zip(other_row) {
                *x += scale * y;
            }
        }
    }

    fn terms(&self) -> Vec<(usize, usize, f64)> {
        let mut out = Vec::new();
        for (i, row) in self.c.iter().enumerate() {
            for (j, &value) in row.iter().enumerate() {
                if value != 0.0 {
                    out.push((i, j, value));
                }
            }
        }
        out
    }
}

/// Coefficients of q_lm(cos θ) in Y_lm ∝ sin^|m|θ q_lm(cos θ), lowest power first.
fn angular_polynomial(l: u8, m: u8) -> &'static [f64] {
    match (l, m) {
        (1, 0) | (2, 1) => &[0.0, 1.0],
        (2, 0) => &[-1.0, 0.0, 3.0],
        _ => &[1.0],
    }
}

/// Normalization constant of the real harmonic in the form c sin^|m|θ q(cos θ) Φ_m(φ).
fn angular_constant(l: u8, m: u8) -> f64 {
    let pi = std::f64::consts::PI;
    match (l, m) {
        (0, _) => (1.0 / (4.0 * pi)).sqrt(),
        (1, _) => (3.0 / (4.0 * pi)).sqrt(),
        (2, 0) => (5.0 / (16.0 * pi)).sqrt(),
        (2, 1) => (15.0 / (4.0 * pi)).sqrt(),
        _ => (15.0 / (16.0 * pi)).sqrt(),
    }
}

/// Radial normalization of a Slater function: (2ζ)^(n+½) / √((2n)!).
pub fn radial_normalization(n: u8, zeta: f64) -> f64 {
    (2.0 * zeta).powf(n as f64 + 0.5) / factorial(2 * n as usize).sqrt()
}

fn factorial(k: usize) -> f64 {
    (1..=k).map(|x| x as f64).product()
}

/// r^(n−1) Y (without constants, ρ^m and Φ) on one centre, in units of R/2:
/// Σ_k q_k r^(n−1−m−k) z^k with r = μ ± ν and z = ±(1 + μν) style linear forms.
fn centre_polynomial(n: u8, l: u8, m: u8, on_a: bool) -> Poly {
    // A at the origin: r_A = (R/2)(μ + ν), z_A = (R/2)(1 + μν).
    // B at z = R:      r_B = (R/2)(μ − ν), z_B = (R/2)(μν − 1).
    let (r, z) = if on_a {
        (
            Poly::linear(0.0, 1.0, 1.0, 0.0),
            Poly::linear(1.0, 0.0, 0.0, 1.0),
        )
    } else {
        (
            Poly::linear(0.0, 1.0, -1.0, 0.0),
            Poly::linear(-1.0, 0.0, 0.0, 1.0),
        )
    };
    let mut out = Poly::constant(0.0);
    for (k, &q) in angular_polynomial(l, m).iter().enumerate() {
        if q != 0.0 {
            let power = (n - 1 - m) as usize - k;
            out.add_scaled(&r.pow(power).mul(&z.pow(k)), q);
        }
    }
    out
}

/// Polynomial part of the bond-frame integral for (n_A l_A | n_B l_B) with |m| = m:
/// centre parts × ρ^(2m) × the volume element (μ² − ν²), all in units of R/2.
fn integrand(na: u8, la: u8, nb: u8, lb: u8, m: u8) -> Vec<(usize, usize, f64)> {
    let a = centre_polynomial(na, la, m, true);
    let b = centre_polynomial(nb, lb, m, false);
    // ρ² = (R/2)² (μ² − 1)(1 − ν²); volume element (R/2)³ (μ² − ν²) dμ dν dφ.
    let mut mu2_minus_1 = Poly::constant(-1.0);
    mu2_minus_1.c.resize(3, [0.0; MAX_POWER + 1]);
    mu2_minus_1.c[2][0] = 1.0;
    let mut one_minus_nu2 = Poly::constant(1.0);
    one_minus_nu2.c[0][2] = -1.0;
    let mut volume = Poly::constant(0.0);
    volume.c.resize(3, [0.0; MAX_POWER + 1]);
    volume.c[2][0] = 1.0;
    volume.c[0][2] = -1.0;
    a.mul(&b)
        .mul(&mu2_minus_1.pow(m as usize))
        .mul(&one_minus_nu2.pow(m as usize))
        .mul(&volume)
        .terms()
}

/// Index of (n, l) among the shells the integrals support: n in 1..=5, l < min(n, 3).
fn shell_index(n: u8, l: u8) -> usize {
    (n as usize - 1) * 3 + l as usize
}

/// All bond-frame integrand polynomials, built once: [shell A][shell B][m].
struct IntegrandTable {
    entries: Vec<Vec<(usize, usize, f64)>>,
}

impl IntegrandTable {
    const SHELLS: usize = 15;

    fn build() -> IntegrandTable {
        let mut entries = vec![Vec::new(); Self::SHELLS * Self::SHELLS * 3];
        for na in 1..=5u8 {
            for la in 0..na.min(3) {
                for nb in 1..=5u8 {
                    for lb in 0..nb.min(3) {
                        for m in 0..=la.min(lb) {
                            entries[Self::key(na, la, nb, lb, m)] = integrand(na, la, nb, lb, m);
                        }
                    }
                }
            }
        }
        IntegrandTable { entries }
    }

    fn key(na: u8, la: u8, nb: u8, lb: u8, m: u8) -> usize {
        (shell_index(na, la) * Self::SHELLS + shell_index(nb, lb)) * 3 + m as usize
    }

    fn get(na: u8, la: u8, nb: u8, lb: u8, m: u8) -> &'static [(usize, usize, f64)] {
        static TABLE: OnceLock<IntegrandTable> = OnceLock::new();
        &TABLE.get_or_init(IntegrandTable::build).entries[Self::key(na, la, nb, lb, m)]
    }
}

/// e^p A_k(p) for k = 0..=kmax (p > 0), by upward recursion.
fn scaled_a(p: f64, kmax: usize, out: &mut [f64; MAX_POWER + 1]) {
    out[0] = 1.0 / p;
    for k in 1..=kmax {
        out[k] = (1.0 + k as f64 * out[k - 1]) / p;
    }
}

/// e^(−p) B_k(t) for k = 0..=kmax, with |t| ≤ p.
fn scaled_b(t: f64, p: f64, kmax: usize, out: &mut [f64; MAX_POWER + 1]) {
    if t.abs() > series_limit(kmax) {
        b_by_recursion(t, p, kmax, out);
    } else {
        b_by_series(t, p, kmax, out);
    }
}

/// Above this |t| the upward recursion is used (it is stable for |t| > k).
fn series_limit(kmax: usize) -> f64 {
    (kmax as f64 + 1.0).max(2.0)
}

/// Upward recursion B_k = ((−1)^k e^t − e^(−t) + k B_(k−1)) / t, stable for |t| > k.
fn b_by_recursion(t: f64, p: f64, kmax: usize, out: &mut [f64; MAX_POWER + 1]) {
    let ep = (t - p).exp();
    let em = (-t - p).exp();
    out[0] = (ep - em) / t;
    for k in 1..=kmax {
        let sign = if k % 2 == 0 { 1.0 } else { -1.0 };
        out[k] = (sign * ep - em + k as f64 * out[k - 1]) / t;
    }
}

/// Series B_k(t) = Σ_j (−t)^j / j! · 2/(k+j+1) over k + j even; its terms all have one
/// sign, so it has no cancellation for any t (used for |t| ≤ series_limit).
fn b_by_series(t: f64, p: f64, kmax: usize, out: &mut [f64; MAX_POWER + 1]) {
    let scale = (-p).exp();
    let minimum_terms = 2 * series_limit(kmax) as usize;
    for (k, slot) in out.iter_mut().enumerate().take(kmax + 1) {
        let mut sum = 0.0;
        let mut term = 1.0; // (−t)^j / j!
        let mut j = 0usize;
        loop {
            if (k + j).is_multiple_of(2) {
                let contribution = term * 2.0 / (k + j + 1) as f64;
                sum += contribution;
                if j > minimum_terms && contribution.abs() <= 1e-17 * sum.abs() {
                    break;
                }
            }
            j += 1;
            term *= -t / j as f64;
            if j > 400 || (term == 0.0 && j > 1) {
                break;
            }
        }
        *slot = sum * scale;
    }
}

/// Bond-frame overlaps S_m (m = 0 σ, 1 π, 2 δ) between shell (na, la, ζa) at the origin and
/// (nb, lb, ζb) at distance `r` (bohr) along +z; both functions use the same axes.
/// Entries with m > min(la, lb) are 0. Requires 1 ≤ n ≤ 5 and l ≤ min(n − 1, 2) for both
/// shells (unsupported shells give zeros).
pub fn bond_frame_overlaps(
    na: u8,
    la: u8,
    zeta_a: f64,
    nb: u8,
    lb: u8,
    zeta_b: f64,
    r: f64,
) -> [f64; 3] {
    let mut out = [0.0; 3];
    let supported = |n: u8, l: u8| (1..=5).contains(&n) && l < n && l <= 2;
    if !supported(na, la) || !supported(nb, lb) {
        // Parameters are validated before they get here (`ElementParameters::validate`).
        debug_assert!(false, "unsupported shells ({na}, {la}) / ({nb}, {lb})");
        return out;
    }
    let mmax = la.min(lb);
    if r < ONE_CENTRE_DISTANCE {
        if la == lb {
            let value = radial_normalization(na, zeta_a)
                * radial_normalization(nb, zeta_b)
                * factorial((na + nb) as usize)
                / (zeta_a + zeta_b).powi((na + nb) as i32 + 1);
            for slot in out.iter_mut().take(mmax as usize + 1) {
                *slot = value;
            }
        }
        return out;
    }
    let p = 0.5 * r * (zeta_a + zeta_b);
    let t = 0.5 * r * (zeta_a - zeta_b);
    let kmax = (na + nb) as usize;
    let mut a = [0.0; MAX_POWER + 1];
    let mut b = [0.0; MAX_POWER + 1];
    scaled_a(p, kmax, &mut a);
    scaled_b(t, p, kmax, &mut b);
    let radial = radial_normalization(na, zeta_a)
        * radial_normalization(nb, zeta_b)
        * (0.5 * r).powi((na + nb) as i32 + 1);
    for m in 0..=mmax {
        let phi = if m == 0 {
            2.0 * std::f64::consts::PI
        } else {
            std::f64::consts::PI
        };
        let sum: f64 = IntegrandTable::get(na, la, nb, lb, m)
            .iter()
            .map(|&(i, j, c)| c * a[i] * b[j])
            .sum();
        out[m as usize] = radial * angular_constant(la, m) * angular_constant(lb, m) * phi * sum;
    }
    out
}

/// |m| and cos/sin type of each bond-frame function of a shell, in basis order.
fn bond_keys(l: u8) -> &'static [(u8, bool)] {
    // (|m|, is_cosine)
    match l {
        0 => &[(0, true)],
        1 => &[(1, true), (1, false), (0, true)],
        _ => &[(2, false), (1, false), (0, true), (1, true), (2, true)],
    }
}

/// Unnormalized quadratic forms of the d functions (dxy, dyz, dz², dxz, dx²−y²) and the
/// constants c with d = c · rᵀMr / r².
fn d_forms() -> &'static [(Matrix3<f64>, f64); 5] {
    static FORMS: OnceLock<[(Matrix3<f64>, f64); 5]> = OnceLock::new();
    FORMS.get_or_init(|| {
        let pi = std::f64::consts::PI;
        let c1 = (15.0 / (4.0 * pi)).sqrt();
        let off = |i: usize, j: usize| {
            let mut m = Matrix3::zeros();
            m[(i, j)] = 0.5;
            m[(j, i)] = 0.5;
            m
        };
        [
            (off(0, 1), c1),
            (off(1, 2), c1),
            (
                Matrix3::from_diagonal(&Vector3::new(-1.0, -1.0, 2.0)),
                (5.0 / (16.0 * pi)).sqrt(),
            ),
            (off(0, 2), c1),
            (
                Matrix3::from_diagonal(&Vector3::new(1.0, -1.0, 0.0)),
                (15.0 / (16.0 * pi)).sqrt(),
            ),
        ]
    })
}

/// Rotation matrices D_l (rows: molecular-frame functions, columns: bond-frame functions)
/// for the frame whose axes (columns of `t`) are u, v, e with e along the bond.
struct FrameRotations {
    p: Block,
    d: Block,
}

impl FrameRotations {
    fn new(t: &Matrix3<f64>, need_d: bool) -> FrameRotations {
        let mut p = [[0.0; 5]; 5];
        for (i, row) in p.iter_mut().enumerate().take(3) {
            for (k, slot) in row.iter_mut().enumerate().take(3) {
                *slot = t[(i, k)];
            }
        }
        let mut d = [[0.0; 5]; 5];
        if need_d {
            let forms = d_forms();
            for (a, (ma, ca)) in forms.iter().enumerate() {
                let rotated = t.transpose() * ma * t;
                for (b, (mb, cb)) in forms.iter().enumerate() {
                    d[a][b] = ca * mb.dot(&rotated) / (cb * mb.dot(mb));
                }
            }
        }
        FrameRotations { p, d }
    }

    fn for_l(&self, l: u8) -> Block {
        match l {
            0 => {
                let mut s = [[0.0; 5]; 5];
                s[0][0] = 1.0;
                s
            }
            1 => self.p,
            _ => self.d,
        }
    }
}

/// An orthonormal frame (columns u, v, e) with e = `axis` (unit).
fn bond_frame(axis: &Vector3<f64>) -> Matrix3<f64> {
    let helper = if axis.z.abs() < 0.9 {
        Vector3::z()
    } else {
        Vector3::x()
    };
    let u = helper.cross(axis).normalize();
    let v = axis.cross(&u);
    Matrix3::from_columns(&[u, v, *axis])
}

/// A Slater shell placed in space: all 2l + 1 real functions of (n, l) with exponent ζ.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SlaterShell {
    pub n: u8,
    pub l: u8,
    /// Exponent in 1/bohr.
    pub zeta: f64,
    /// Centre in bohr.
    pub centre: Vector3<f64>,
}

/// The overlap block between two shells: rows the functions of `a`, columns those of `b`,
/// each in the order of `crate::chem::ao`. Requires 1 ≤ n ≤ 5 and l ≤ min(n − 1, 2)
/// (unsupported shells give zeros).
pub fn shell_pair_overlap(a: &SlaterShell, b: &SlaterShell) -> DMatrix<f64> {
    if a.l > 2 || b.l > 2 {
        debug_assert!(false, "l > 2 is not supported");
        return DMatrix::zeros(2 * a.l as usize + 1, 2 * b.l as usize + 1);
    }
    let diff = b.centre - a.centre;
    let r = diff.norm();
    let (frame, r) = if r < ONE_CENTRE_DISTANCE {
        (Matrix3::identity(), 0.0)
    } else {
        (bond_frame(&(diff / r)), r)
    };
    let rotations = FrameRotations::new(&frame, a.l == 2 || b.l == 2);
    let values = bond_frame_overlaps(a.n, a.l, a.zeta, b.n, b.l, b.zeta, r);
    let block = rotate_block(a.l, b.l, &values, &rotations);
    let (sa, sb) = (2 * a.l as usize + 1, 2 * b.l as usize + 1);
    DMatrix::from_fn(sa, sb, |i, j| block[i][j])
}

/// Molecular-frame block from the bond-frame σ/π/δ values.
fn rotate_block(la: u8, lb: u8, values: &[f64; 3], rotations: &FrameRotations) -> Block {
    let da = rotations.for_l(la);
    let db = rotations.for_l(lb);
    let keys_a = bond_keys(la);
    let keys_b = bond_keys(lb);
    let (sa, sb) = (keys_a.len(), keys_b.len());
    let mut block = [[0.0; 5]; 5];
    for (ka, key_a) in keys_a.iter().enumerate() {
        let Some(kb) = keys_b.iter().position(|key_b| key_b == key_a) else {
            continue;
        };
        let value = values[key_a.0 as usize];
        if value == 0.0 {
            continue;
        }
        for (i, row) in block.iter_mut().enumerate().take(sa) {
            let left = da[i][ka] * value;
            if left == 0.0 {
                continue;
            }
            for (j, slot) in row.iter_mut().enumerate().take(sb) {
                *slot += left * db[j][kb];
            }
        }
    }
    block
}

/// The overlap matrix S of a basis (symmetric, unit diagonal). Functions on the same atom
/// are orthogonal (different l or m); every pair of atoms is integrated, however far apart.
pub fn overlap_matrix(basis: &Basis) -> DMatrix<f64> {
    let size = basis.len();
    let mut s = DMatrix::identity(size, size);
    let atoms = basis.atom_ranges.len();
    // Shells grouped by atom.
    let mut by_atom: Vec<Vec<&BasisShell>> = vec![Vec::new(); atoms];
    for shell in &basis.shells {
        by_atom[shell.atom].push(shell);
    }
    for a in 0..atoms {
        for b in a + 1..atoms {
            let (Some(first_a), Some(first_b)) = (by_atom[a].first(), by_atom[b].first()) else {
                continue;
            };
            let diff = first_b.centre - first_a.centre;
            let r = diff.norm();
            let (frame, r) = if r < ONE_CENTRE_DISTANCE {
                (Matrix3::identity(), 0.0)
            } else {
                (bond_frame(&(diff / r)), r)
            };
            let need_d = by_atom[a].iter().chain(&by_atom[b]).any(|sh| sh.l == 2);
            let rotations = FrameRotations::new(&frame, need_d);
            for sa in &by_atom[a] {
                for sb in &by_atom[b] {
                    let values = bond_frame_overlaps(sa.n, sa.l, sa.zeta, sb.n, sb.l, sb.zeta, r);
                    let block = rotate_block(sa.l, sb.l, &values, &rotations);
                    for (i, row) in block.iter().enumerate().take(sa.size()) {
                        for (j, &value) in row.iter().enumerate().take(sb.size()) {
                            s[(sa.first + i, sb.first + j)] = value;
                            s[(sb.first + j, sa.first + i)] = value;
                        }
                    }
                }
            }
        }
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn b_at_zero_is_exact() {
        // B_k(0) = ∫ ν^k dν over [−1, 1] = 2/(k+1) for even k, 0 for odd k (elementary).
        let mut b = [0.0; MAX_POWER + 1];
        scaled_b(0.0, 0.0, MAX_POWER, &mut b);
        for (k, value) in b.iter().enumerate() {
            let expected = if k % 2 == 0 {
                2.0 / (k + 1) as f64
            } else {
                0.0
            };
            assert_eq!(*value, expected, "k = {k}");
        }
    }

    #[test]
    fn series_and_recursion_agree_where_both_apply() {
        // The series is valid for every t; the recursion for |t| > k. Where both apply they
        // must agree, and B_0(t) = 2 sinh(t)/t (elementary integral).
        for t in [11.5f64, -11.5, 14.0, -20.0] {
            let p = t.abs() + 1.0;
            let (mut series, mut recursion) = ([0.0; MAX_POWER + 1], [0.0; MAX_POWER + 1]);
            b_by_series(t, p, MAX_POWER, &mut series);
            b_by_recursion(t, p, MAX_POWER, &mut recursion);
            for k in 0..=MAX_POWER {
                let relative = ((series[k] - recursion[k]) / series[k]).abs();
                assert!(relative < 1e-12, "t = {t}, k = {k}: {relative:e}");
            }
            let closed = 2.0 * t.sinh() / t * (-p).exp();
            assert!(((series[0] - closed) / closed).abs() < 1e-13);
        }
    }
}
