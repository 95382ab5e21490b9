//! Localization of a set of orthonormal orbitals in the orthonormal atomic basis: the
//! orbitals are rotated among themselves to maximize
//!
//!   F_p = Σ_i Σ_A q_A(φ_i)^p,   q_A(φ) = Σ_{μ∈A} φ̃_μ²  (Löwdin populations),
//!
//! with p = 4 for intrinsic bond orbitals (G. Knizia, J. Chem. Theory Comput. 9, 4834
//! (2013)) and p = 2 for Pipek–Mezey orbitals with Löwdin charges (J. Pipek and P. G.
//! Mezey, J. Chem. Phys. 90, 4916 (1989)).
//!
//! **Method.** Jacobi sweeps over the pairs (i < j) in a fixed order. Rotating the pair by
//! γ, (i, j) → (cos γ i + sin γ j, −sin γ i + cos γ j), turns each population into
//! q_i(γ) = m + d cos 2γ + x sin 2γ, q_j(γ) = m − d cos 2γ − x sin 2γ, with m = (q_i + q_j)/2,
//! d = (q_i − q_j)/2 and the transition population x = Σ_{μ∈A} φ̃_iμ φ̃_jμ, so the pair's
//! share of F_p is a trigonometric polynomial in θ = 4γ: a first harmonic for p = 2
//! (maximum in closed form, the classic Pipek–Mezey angle) and first and second
//! harmonics for p = 4 (coefficients below; the maximum found by sampling θ on a fixed
//! grid and refining with Newton steps). Each pair is rotated to the global maximum of
//! its own function, so F_p never decreases and saddle points are left.
//!
//! **Start and end.** Deterministic: the Cholesky orbitals of the set's projector
//! (pivoted Cholesky, then Gram–Schmidt in pivot order; F. Aquilante, T. Bondo Pedersen,
//! A. Sánchez de Merás and H. Koch, J. Chem. Phys. 125, 174101 (2006)), which depend on the
//! space only, not on how an eigensolver rotated a degenerate set. Converged when the
//! largest pair gradient |dF/dγ| of a sweep is below [`GRADIENT_TOLERANCE`]; the number of
//! sweeps is capped and reported.

use std::ops::Range;

use nalgebra::{DMatrix, DVector};
use serde::{Deserialize, Serialize};

use super::orthonormal::AtomLayout;

/// Converged when every pair's |dF/dγ| at γ = 0 in a sweep is below this. Our choice, no
/// source: populations then agree with a second-order optimizer to about 1e-9.
pub const GRADIENT_TOLERANCE: f64 = 1e-9;
/// Default cap on the Jacobi sweeps of one space.
pub const DEFAULT_MAX_SWEEPS: usize = 400;
/// Points of the fixed grid on which a pair's p = 4 function is sampled before refining.
const ANGLE_SAMPLES: usize = 24;
/// Pairs whose function is flat to this level (the lone pairs of one isolated atom, a
/// single atom) are left alone. Rounding level, no source.
const FLAT_PAIR: f64 = 1e-14;

/// Which function is maximized.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LocalizationMethod {
    /// p = 4: intrinsic bond orbitals (Knizia 2013).
    #[default]
    IntrinsicBond,
    /// p = 2: Pipek–Mezey with Löwdin populations.
    PipekMezey,
}

impl LocalizationMethod {
    /// The exponent p of F_p.
    pub fn exponent(self) -> u32 {
        match self {
            LocalizationMethod::IntrinsicBond => 4,
            LocalizationMethod::PipekMezey => 2,
        }
    }

    /// The name used in reports.
    pub fn description(self) -> &'static str {
        match self {
            LocalizationMethod::IntrinsicBond => "intrinsic bond orbitals (p = 4)",
            LocalizationMethod::PipekMezey => "Pipek–Mezey with Löwdin populations (p = 2)",
        }
    }
}

/// Options of [`localize`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LocalizationOptions {
    pub method: LocalizationMethod,
    pub max_sweeps: usize,
}

impl Default for LocalizationOptions {
    fn default() -> Self {
        LocalizationOptions {
            method: LocalizationMethod::default(),
            max_sweeps: DEFAULT_MAX_SWEEPS,
        }
    }
}

/// Localized orbitals and how the sweeps went.
#[derive(Clone, Debug, PartialEq)]
pub struct Localization {
    /// The localized orbitals over the orthonormal basis (columns).
    pub orbitals: DMatrix<f64>,
    /// F_p of the result and of the input orbitals.
    pub function_value: f64,
    pub initial_value: f64,
    pub sweeps: usize,
    /// False when the sweep cap was reached first.
    pub converged: bool,
    /// The largest |dF/dγ| of the last sweep.
    pub gradient: f64,
}

/// F_p of the columns of `orbitals` (over the orthonormal basis).
pub fn localization_function(orbitals: &DMatrix<f64>, layout: &AtomLayout, exponent: u32) -> f64 {
    orbitals
        .column_iter()
        .map(|column| {
            layout
                .ranges
                .iter()
                .map(|range| {
                    let q: f64 = range.clone().map(|mu| column[mu] * column[mu]).sum();
                    q.powi(exponent as i32)
                })
                .sum::<f64>()
        })
        .sum()
}

/// Localizes the orthonormal columns of `orbitals` (over the orthonormal basis whose atoms
/// are `layout`). No columns or one column come back as given.
pub fn localize(
    orbitals: &DMatrix<f64>,
    layout: &AtomLayout,
    options: &LocalizationOptions,
) -> Localization {
    let exponent = options.method.exponent();
    let initial_value = localization_function(orbitals, layout, exponent);
    let mut state = Sweeper::new(
        orbitals * cholesky_start(orbitals),
        &layout.ranges,
        exponent,
    );
    let mut sweeps = 0;
    let mut converged = orbitals.ncols() < 2;
    let mut gradient = 0.0;
    let mut previous = f64::INFINITY;
    let mut since_full = 0;
    while !converged && sweeps < options.max_sweeps {
        sweeps += 1;
        // Full sweeps first and every PARTIAL_SWEEPS + 1; between them only the pairs
        // whose gradient mattered in the last full sweep. Convergence is decided on full
        // sweeps only.
        let full = sweeps <= FULL_SWEEPS_FIRST || since_full >= PARTIAL_SWEEPS;
        if !full {
            since_full += 1;
            state.sweep(false);
            continue;
        }
        since_full = 0;
        gradient = state.sweep(true);
        converged = gradient < GRADIENT_TOLERANCE;
        if converged && state.screen {
            // Screened sweeps skip pairs that share no atom of their supports; the sweep
            // that declares convergence visits every pair.
            state.screen = false;
            gradient = state.sweep(true);
            converged = gradient < GRADIENT_TOLERANCE;
            state.screen = true;
        }
        // A steady linear decrease is the slow phase: a ratio between ½⁴ and 1 over the
        // four sweeps since the last full one.
        let ratio = gradient / previous;
        state.omega = if ratio > 0.0625 && ratio < 1.0 {
            OVER_RELAXATION
        } else {
            1.0
        };
        previous = gradient;
    }
    let orbitals = state.into_orbitals();
    Localization {
        function_value: localization_function(&orbitals, layout, exponent),
        orbitals,
        initial_value,
        sweeps,
        converged,
        gradient,
    }
}

/// Working state of the sweeps: the orbitals (column-major, orbital k contiguous) and
/// their populations (orbital-major).
struct Sweeper<'a> {
    orbitals: DMatrix<f64>,
    ranges: &'a [Range<usize>],
    populations: Vec<f64>,
    transition: Vec<f64>,
    exponent: u32,
    /// Per orbital, the atoms where its population exceeds [`SUPPORT_POPULATION`]
    /// (all atoms when the set is small enough not to screen).
    supports: Vec<Vec<usize>>,
    /// Scratch: the atoms of the pair being visited, and a marker per atom.
    union: Vec<usize>,
    marks: Vec<bool>,
    /// Over-relaxation factor of the current sweep.
    omega: f64,
    screen: bool,
    /// Pairs visited by partial sweeps.
    active: Vec<(usize, usize)>,
}

/// Sweeps that visit every pair before partial sweeps begin.
const FULL_SWEEPS_FIRST: usize = 3;
/// Partial sweeps between two full ones.
const PARTIAL_SWEEPS: usize = 3;
/// A pair is active when its gradient in the last full sweep exceeded this fraction of
/// the largest. Our choice, no source: partial sweeps only speed the approach; a full
/// sweep decides convergence.
const ACTIVE_FRACTION: f64 = 1e-2;

/// Sets with more orbitals than this are screened: a pair is visited only when the two
/// orbitals share an atom of their supports, and only the atoms of either support enter
/// its function (atoms where both populations are below [`SUPPORT_POPULATION`] change the
/// function and its gradient by less than 2τ² = 2e-14 each, as |x| ≤ √(q_i q_j)). A pair
/// without a shared atom can still have a small gradient, so convergence is only declared
/// by a sweep over every pair. Our choice, no source.
const SCREEN_ABOVE: usize = 48;
/// An atom belongs to an orbital's support above this population.
const SUPPORT_POPULATION: f64 = 1e-7;
/// Over-relaxation of small rotations in the slow, linear phase of the sweeps (large
/// conjugated systems), where each sweep gains a nearly constant fraction of the last:
/// rotations by |θ| below [`RELAX_BELOW`] are multiplied by this. A pair's function is
/// then nearly quadratic in θ, so any factor in (0, 2) still raises it. Our choice,
/// tuned on C60 (no source).
const OVER_RELAXATION: f64 = 1.6;
const RELAX_BELOW: f64 = 0.02;

impl<'a> Sweeper<'a> {
    fn new(orbitals: DMatrix<f64>, ranges: &'a [Range<usize>], exponent: u32) -> Self {
        let atoms = ranges.len();
        let count = orbitals.ncols();
        let mut sweeper = Sweeper {
            populations: vec![0.0; count * atoms],
            orbitals,
            ranges,
            transition: vec![0.0; atoms],
            exponent,
            supports: vec![Vec::new(); count],
            union: Vec::with_capacity(atoms),
            marks: vec![false; atoms],
            omega: 1.0,
            screen: count > SCREEN_ABOVE,
            active: Vec::new(),
        };
        sweeper.refresh();
        sweeper
    }

    /// Populations from the orbitals, and the supports.
    fn refresh(&mut self) {
        let atoms = self.ranges.len();
        for (k, column) in self.orbitals.column_iter().enumerate() {
            let support = &mut self.supports[k];
            support.clear();
            for (atom, range) in self.ranges.iter().enumerate() {
                let q: f64 = range.clone().map(|mu| column[mu] * column[mu]).sum();
                self.populations[k * atoms + atom] = q;
                if !self.screen || q > SUPPORT_POPULATION {
                    support.push(atom);
                }
            }
        }
    }

    fn into_orbitals(self) -> DMatrix<f64> {
        self.orbitals
    }

    /// One sweep over all pairs (`full`) or over the active ones; returns the largest
    /// |dF/dγ| met. A full sweep also chooses the active pairs of the next partial ones.
    fn sweep(&mut self, full: bool) -> f64 {
        let mut largest: f64 = 0.0;
        if full {
            let mut gradients = Vec::new();
            for (i, partners) in self.partners().into_iter().enumerate() {
                for j in partners {
                    let g = self.visit(i, j);
                    largest = largest.max(g);
                    gradients.push((i, j, g));
                }
            }
            let floor = ACTIVE_FRACTION * largest;
            self.active = gradients
                .into_iter()
                .filter(|&(_, _, g)| g > floor)
                .map(|(i, j, _)| (i, j))
                .collect();
        } else {
            for k in 0..self.active.len() {
                let (i, j) = self.active[k];
                largest = largest.max(self.visit(i, j));
            }
        }
        self.refresh();
        largest
    }

    /// For each orbital i, the orbitals j > i that share an atom of its support (all
    /// j > i without screening).
    fn partners(&self) -> Vec<Vec<usize>> {
        let n = self.orbitals.ncols();
        if !self.screen {
            return (0..n).map(|i| (i + 1..n).collect()).collect();
        }
        let mut on_atom: Vec<Vec<usize>> = vec![Vec::new(); self.ranges.len()];
        for (k, support) in self.supports.iter().enumerate() {
            for &atom in support {
                on_atom[atom].push(k);
            }
        }
        let mut seen = vec![usize::MAX; n];
        (0..n)
            .map(|i| {
                let mut list = Vec::new();
                for &atom in &self.supports[i] {
                    for &j in &on_atom[atom] {
                        if j > i && seen[j] != i {
                            seen[j] = i;
                            list.push(j);
                        }
                    }
                }
                list.sort_unstable();
                list
            })
            .collect()
    }

    /// Rotates the pair (i, j) to the maximum of its function; returns |dF/dγ| before.
    fn visit(&mut self, i: usize, j: usize) -> f64 {
        let atoms = self.ranges.len();
        let rows = self.orbitals.nrows();
        self.collect_union(i, j);
        {
            let data = self.orbitals.as_slice();
            let (bi, bj) = (
                &data[i * rows..(i + 1) * rows],
                &data[j * rows..(j + 1) * rows],
            );
            for &atom in &self.union {
                let range = self.ranges[atom].clone();
                self.transition[atom] = bi[range.clone()]
                    .iter()
                    .zip(&bj[range])
                    .map(|(a, b)| a * b)
                    .sum();
            }
        }
        let harmonics = Harmonics::of_pair(
            &self.populations[i * atoms..(i + 1) * atoms],
            &self.populations[j * atoms..(j + 1) * atoms],
            &self.transition,
            &self.union,
            self.exponent,
        );
        let gradient = 4.0 * harmonics.slope_at_zero().abs();
        if harmonics.size() < FLAT_PAIR {
            return gradient;
        }
        let mut theta = harmonics.maximum();
        if theta.abs() < 1e-15 {
            return gradient;
        }
        if theta.abs() < RELAX_BELOW {
            theta *= self.omega;
        }
        self.rotate(i, j, 0.25 * theta);
        gradient
    }

    /// The atoms of either support, in `self.union`.
    fn collect_union(&mut self, i: usize, j: usize) {
        let atoms = self.ranges.len();
        if self.supports[i].len() == atoms || self.supports[j].len() == atoms {
            if self.union.len() != atoms {
                self.union.clear();
                self.union.extend(0..atoms);
            }
            return;
        }
        self.union.clear();
        for &atom in self.supports[i].iter().chain(&self.supports[j]) {
            if !self.marks[atom] {
                self.marks[atom] = true;
                self.union.push(atom);
            }
        }
        for &atom in &self.union {
            self.marks[atom] = false;
        }
    }

    fn rotate(&mut self, i: usize, j: usize, gamma: f64) {
        let (s, c) = gamma.sin_cos();
        let rows = self.orbitals.nrows();
        let data = self.orbitals.as_mut_slice();
        let (left, right) = data.split_at_mut(j * rows);
        let bi = &mut left[i * rows..(i + 1) * rows];
        let bj = &mut right[..rows];
        for (a, b) in bi.iter_mut().zip(bj.iter_mut()) {
            let (x, y) = (*a, *b);
            *a = c * x + s * y;
            *b = -s * x + c * y;
        }
        let atoms = self.ranges.len();
        let (s2, c2) = (2.0 * gamma).sin_cos();
        for &atom in &self.union {
            let (qi, qj) = (
                self.populations[i * atoms + atom],
                self.populations[j * atoms + atom],
            );
            let (m, d, x) = (0.5 * (qi + qj), 0.5 * (qi - qj), self.transition[atom]);
            let u = d * c2 + x * s2;
            self.populations[i * atoms + atom] = m + u;
            self.populations[j * atoms + atom] = m - u;
        }
    }
}

/// A pair's share of F_p as a function of θ = 4γ, up to a constant:
/// c1 cos θ + s1 sin θ + c2 cos 2θ + s2 sin 2θ.
#[derive(Clone, Copy, Debug, PartialEq)]
struct Harmonics {
    c1: f64,
    s1: f64,
    c2: f64,
    s2: f64,
}

impl Harmonics {
    /// With u = d cos 2γ + x sin 2γ, u² = a0 + a cos θ + b sin θ (a0 = (d² + x²)/2,
    /// a = (d² − x²)/2, b = d x), q_i^p + q_j^p = 2m² + 2u² for p = 2 and
    /// 2m⁴ + 12m²u² + 2u⁴ for p = 4, summed over the atoms.
    fn of_pair(qi: &[f64], qj: &[f64], x: &[f64], atoms: &[usize], exponent: u32) -> Harmonics {
        let mut h = Harmonics {
            c1: 0.0,
            s1: 0.0,
            c2: 0.0,
            s2: 0.0,
        };
        for &atom in atoms {
            let (pi, pj, t) = (qi[atom], qj[atom], x[atom]);
            let (m, d) = (0.5 * (pi + pj), 0.5 * (pi - pj));
            let (a0, a, b) = (0.5 * (d * d + t * t), 0.5 * (d * d - t * t), d * t);
            if exponent == 2 {
                h.c1 += 2.0 * a;
                h.s1 += 2.0 * b;
            } else {
                let first = 12.0 * m * m + 4.0 * a0;
                h.c1 += first * a;
                h.s1 += first * b;
                h.c2 += a * a - b * b;
                h.s2 += 2.0 * a * b;
            }
        }
        h
    }

    fn size(&self) -> f64 {
        self.c1.abs() + self.s1.abs() + self.c2.abs() + self.s2.abs()
    }

    /// dg/dθ at θ = 0.
    fn slope_at_zero(&self) -> f64 {
        self.s1 + 2.0 * self.s2
    }

    /// g(θ) − g(0).
    fn gain(&self, theta: f64) -> f64 {
        let (s, c) = theta.sin_cos();
        let (s2, c2) = (2.0 * theta).sin_cos();
        self.c1 * (c - 1.0) + self.s1 * s + self.c2 * (c2 - 1.0) + self.s2 * s2
    }

    /// The θ in (−π, π] of the global maximum (0 when θ = 0 is already the maximum).
    fn maximum(&self) -> f64 {
        if self.c2 == 0.0 && self.s2 == 0.0 {
            // First harmonic only: the closed form.
            return self.s1.atan2(self.c1);
        }
        // Near a maximum (negative curvature, a small Newton step): Newton from 0. The
        // pair function has at most two maxima; a step this small stays in the basin of
        // the one at hand, and sweeps that move far use the global search below.
        let curvature = -self.c1 - 4.0 * self.c2;
        if curvature < 0.0 {
            let step = -self.slope_at_zero() / curvature;
            // g(π) − g(0) = −2 c1 and g(±π/2) − g(0) = −c1 ± s1 − 2 c2: no rival there.
            let rival = (-2.0 * self.c1).max(-self.c1 + self.s1.abs() - 2.0 * self.c2);
            if step.abs() < 1e-3 && rival < 0.0 {
                return self.newton(step);
            }
        }
        let mut best = (0.0, 0.0);
        for &(theta, c, s, c2, s2) in sample_table() {
            let gain = self.c1 * (c - 1.0) + self.s1 * s + self.c2 * (c2 - 1.0) + self.s2 * s2;
            if gain > best.1 {
                best = (theta, gain);
            }
        }
        let refined = self.newton(best.0);
        if self.gain(refined) >= best.1 {
            refined
        } else {
            best.0
        }
    }

    /// Newton steps toward the nearby maximum, each at most one grid spacing (quadratic
    /// convergence: a handful of steps reach rounding level).
    fn newton(&self, start: f64) -> f64 {
        let limit = std::f64::consts::PI / ANGLE_SAMPLES as f64;
        let mut theta = start;
        for _ in 0..12 {
            let (s, c) = theta.sin_cos();
            let (s2, c2) = (2.0 * theta).sin_cos();
            let first = -self.c1 * s + self.s1 * c - 2.0 * self.c2 * s2 + 2.0 * self.s2 * c2;
            let second = -self.c1 * c - self.s1 * s - 4.0 * self.c2 * c2 - 4.0 * self.s2 * s2;
            let step = if second < 0.0 {
                (-first / second).clamp(-limit, limit)
            } else {
                0.5 * limit * first.signum()
            };
            theta += step;
            if step.abs() < 1e-13 {
                break;
            }
        }
        theta
    }
}

/// One grid point of a pair's function: (θ, cos θ, sin θ, cos 2θ, sin 2θ).
type Sample = (f64, f64, f64, f64, f64);

/// The samples on the fixed grid of [`ANGLE_SAMPLES`] points.
fn sample_table() -> &'static [Sample] {
    static TABLE: std::sync::OnceLock<Vec<Sample>> = std::sync::OnceLock::new();
    TABLE.get_or_init(|| {
        (0..ANGLE_SAMPLES)
            .map(|k| {
                let theta = -std::f64::consts::PI
                    + 2.0 * std::f64::consts::PI * k as f64 / ANGLE_SAMPLES as f64;
                let (s, c) = theta.sin_cos();
                let (s2, c2) = (2.0 * theta).sin_cos();
                (theta, c, s, c2, s2)
            })
            .collect()
    })
}

/// U such that `c · U` are the Cholesky orbitals of the projector c cᵀ of the orthonormal
/// columns c (pivots: the largest remaining diagonal, first on ties), orthonormalized in
/// pivot order.
pub fn cholesky_start(c: &DMatrix<f64>) -> DMatrix<f64> {
    let (rows, n) = (c.nrows(), c.ncols());
    if n < 2 {
        return DMatrix::identity(n, n);
    }
    // Each Cholesky vector is c r with r = c_pᵀ − Σ_l r_l (L_l)_p, divided by √d_p.
    let mut factors: Vec<DVector<f64>> = Vec::with_capacity(n);
    let mut vectors = DMatrix::<f64>::zeros(rows, n);
    let mut diagonal: Vec<f64> = (0..rows).map(|mu| c.row(mu).norm_squared()).collect();
    for k in 0..n {
        let mut pivot = 0;
        for mu in 1..rows {
            if diagonal[mu] > diagonal[pivot] + 1e-14 {
                pivot = mu;
            }
        }
        let d = diagonal[pivot];
        if d.is_nan() || d <= 1e-12 {
            break;
        }
        let mut r = c.row(pivot).transpose();
        for (l, earlier) in factors.iter().enumerate() {
            r.axpy(-vectors[(pivot, l)], earlier, 1.0);
        }
        r /= d.sqrt();
        let column = c * &r;
        for mu in 0..rows {
            diagonal[mu] -= column[mu] * column[mu];
        }
        vectors.set_column(k, &column);
        factors.push(r);
    }
    super::orthonormal::completed_basis(factors, n).unwrap_or_else(|| DMatrix::identity(n, n))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::ao::AngularKind;

    fn layout(map: &[usize]) -> AtomLayout {
        AtomLayout::from_atom_map(map, vec![AngularKind::S; map.len()]).unwrap()
    }

    /// The harmonic expansion equals F_p of the rotated pair at any angle, for both
    /// exponents (the algebra of the module doc, checked numerically).
    #[test]
    fn harmonics_reproduce_the_rotated_function() {
        let map = [0, 0, 1, 2, 2];
        let layout = layout(&map);
        let raw =
            DMatrix::from_row_slice(5, 2, &[0.5, 0.1, 0.2, -0.3, 0.6, 0.4, -0.1, 0.7, 0.3, 0.2]);
        let q = raw.clone().qr().q();
        for exponent in [2, 4] {
            let mut sweeper = Sweeper::new(q.clone(), &layout.ranges, exponent);
            let atoms = 3;
            for (atom, range) in layout.ranges.iter().enumerate() {
                sweeper.transition[atom] = range.clone().map(|mu| q[(mu, 0)] * q[(mu, 1)]).sum();
            }
            let h = Harmonics::of_pair(
                &sweeper.populations[0..atoms],
                &sweeper.populations[atoms..2 * atoms],
                &sweeper.transition,
                &[0, 1, 2],
                exponent,
            );
            let base = localization_function(&q, &layout, exponent);
            for gamma in [0.1, -0.4, 0.77] {
                let (s, c) = f64::sin_cos(gamma);
                let mut rotated = q.clone();
                rotated.set_column(0, &(q.column(0) * c + q.column(1) * s));
                rotated.set_column(1, &(q.column(0) * -s + q.column(1) * c));
                let value = localization_function(&rotated, &layout, exponent);
                assert!((value - base - h.gain(4.0 * gamma)).abs() < 1e-12);
            }
        }
    }

    #[test]
    fn localization_raises_the_function_and_keeps_the_span() {
        let map = [0, 1, 2, 3];
        let layout = layout(&map);
        // Two delocalized orthonormal orbitals over four one-function atoms.
        let c = DMatrix::from_row_slice(4, 2, &[0.5, 0.5, 0.5, -0.5, 0.5, 0.5, 0.5, -0.5]);
        for method in [
            LocalizationMethod::IntrinsicBond,
            LocalizationMethod::PipekMezey,
        ] {
            let options = LocalizationOptions {
                method,
                ..Default::default()
            };
            let result = localize(&c, &layout, &options);
            assert!(result.converged);
            assert!(result.function_value >= result.initial_value - 1e-12);
            let projector = &result.orbitals * result.orbitals.transpose();
            assert!((projector - &c * c.transpose()).amax() < 1e-12);
        }
    }
}
