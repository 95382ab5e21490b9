//! Pipek–Mezey localization of occupied molecular orbitals (J. Pipek and P. G. Mezey,
//! J. Chem. Phys. 90, 4916 (1989)), with Mulliken populations, and the reading of each
//! localized orbital as a lone pair, a two-centre bond or a multi-centre orbital with
//! hybrids per atom (DESIGN §4.4 "from localized MOs", §4.5).
//!
//! **Function maximized.** P = Σ_i Σ_A (Q_A^i)², with the Mulliken gross population of
//! orbital i on atom A, Q_A^i = Σ_{μ∈A} C_μi (S C)_μi (the overlap split symmetrically
//! between the two centres). This is the quantity PySCF's `lo.PM(pop_method='mulliken')`
//! calls its cost function with the default exponent 2; tests/reference/pyscf_pm_* compare
//! the two on the same matrices.
//!
//! **Method.** Jacobi sweeps over pairs (i < j) in a fixed order; each pair is rotated
//! by the closed-form angle of Pipek and Mezey: with
//! A_ij = Σ_A [(Q_A^ij)² − ¼(Q_A^i − Q_A^j)²] and B_ij = Σ_A Q_A^ij (Q_A^i − Q_A^j), the
//! gain of the rotation (i, j) → (cos γ i + sin γ j, −sin γ i + cos γ j) is
//! A_ij (1 − cos 4γ) + B_ij sin 4γ, maximal at 4γ = atan2(B_ij, −A_ij) with gain
//! A_ij + √(A_ij² + B_ij²) (so dP/dγ = 4 B_ij at γ = 0). A flat pair (see [`FLAT_PAIR`]) is
//! left alone, so degenerate cases (the lone pairs of one atom, a single atom, symmetric
//! sets with many equivalent rotations) stop without wandering.
//!
//! - Start (deterministic): by default the Cholesky orbitals of the occupied density
//!   ([`Start::Cholesky`]), which depend on the density only, not on how an eigensolver
//!   happened to rotate a degenerate set; or the input orbitals ([`Start::Input`]).
//!   Optionally a few fixed rotated starts as well, keeping the best maximum.
//! - Speed-ups that leave the fixed point unchanged: in the slow linear phase of large
//!   conjugated systems the angles are over-relaxed by [`OVER_RELAXATION`] (every pair
//!   still gains for 0 < ω < 2); between full sweeps, a few partial sweeps visit only the
//!   pairs whose gradient was not negligible; before convergence, rotations far smaller
//!   than the previous sweep's largest are deferred.
//! - Convergence, decided on full sweeps only: P changes by less than the tolerance
//!   (default 1e-10) over a sweep; then up to [`POLISHING_SWEEPS`] more while every |B_ij|
//!   is not yet below [`GRADIENT_TOLERANCE`] and still falling fast. A sweep cap makes
//!   non-convergence a reported state (`converged: false`).
//!
//! **Reading.** Centres: the fewest atoms, by decreasing Mulliken population, whose
//! populations add to at least [`CENTRE_SHARE`] (our choice of value, no source).
//! One centre: lone pair n(X); two: bond; more: multi-centre. Atoms in labels are in file
//! order with hydrogen last. A two-centre orbital is π when
//! its parts on the two atoms are mostly p perpendicular to the bond axis (a node plane
//! containing the axis) and σ otherwise: see [`PI_PERPENDICULAR_SHARE`]. Each centre's part
//! C_μk (μ ∈ A), renormalized (one-centre s, p, d Slater functions are orthonormal), is read
//! as a hybrid: λ = p-weight / s-weight, %s, its direction (the p part, pointing where the
//! s and p lobes add) and, in a σ bond, its bending from the bond axis.

use nalgebra::{DMatrix, Vector3};
use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::ao::AngularKind;
use crate::chem::molecule::Molecule;
use crate::eht::Basis;

/// Default convergence tolerance on the change of the localization function in one sweep.
pub const DEFAULT_TOLERANCE: f64 = 1e-10;
/// Default cap on the number of Jacobi sweeps.
pub const DEFAULT_MAX_SWEEPS: usize = 500;
/// A pair whose function is flat (√(A² + B²) below this: every rotation gives the same P,
/// as for the lone pairs of an isolated atom) is left alone. Rounding level, no source.
pub const FLAT_PAIR: f64 = 1e-12;
/// Besides the change of P, convergence asks that every pair's gradient
/// dP/dγ at γ = 0, which is 4 B_ij, was below 4 × this in the last sweep: P is flat at its
/// maximum, so a change of P below 1e-10 alone may leave the orbitals ~1e-5 rad from it.
/// Our choice, no source (PySCF also tests a gradient norm beside the function change).
pub const GRADIENT_TOLERANCE: f64 = 1e-9;
/// Over-relaxation factor of the slow phase (see `relaxation_factor`): tuned on C60 with
/// full sweeps from the canonical start (ω = 1.0: 77 sweeps, 1.3: 46, 1.5: 30, 1.7: 45).
/// Our choice, no source.
pub const OVER_RELAXATION: f64 = 1.5;
/// Until the function criterion is met, rotations smaller than this fraction of the
/// previous sweep's largest angle are skipped; once it is met, every rotation is done.
const SKIP_ANGLE_FRACTION: f64 = 1e-4;
/// The first sweeps visit every pair.
const FULL_SWEEPS_FIRST: usize = 3;
/// Partial sweeps (active pairs only) between two full sweeps.
const PARTIAL_SWEEPS: usize = 3;
/// A pair is active when its |B_ij| in the last full sweep exceeded this fraction of the
/// largest |B| of that sweep.
const ACTIVE_FRACTION: f64 = 1e-3;
/// After the function criterion is met, at most this many further sweeps run while the
/// gradient criterion is not (a flat ridge, e.g. benzene's π system, lets the orbitals
/// drift without changing P; the drift is cut off here). Our choice, no source.
pub const POLISHING_SWEEPS: usize = 4;
/// Rotations by less than this angle (radians) are skipped (rounding level).
pub const MIN_ANGLE: f64 = 1e-12;
/// Centres of a localized orbital: the fewest atoms whose Mulliken populations add to this.
/// Our choice, no source: 0.9 keeps EHT lone pairs one-centre and polar bonds two-centre
/// for the demo molecules (tests/localize_demo.rs).
pub const CENTRE_SHARE: f64 = 0.9;
/// A two-centre orbital is labelled π when the norm-weighted mean, over its two atoms, of
/// the share of the atom's part that is p perpendicular to the bond axis exceeds this.
/// A pure π orbital has 1, a σ orbital 0; a bent ("banana") bond falls between and takes
/// the name of the larger part. Our rule, no source.
pub const PI_PERPENDICULAR_SHARE: f64 = 0.5;

/// Errors of the localization stage.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum LocalizeError {
    #[error(
        "orbital coefficients have {coefficient_rows} rows but the overlap matrix is {overlap:?}"
    )]
    DimensionMismatch {
        coefficient_rows: usize,
        overlap: (usize, usize),
    },
    #[error("the AO-to-atom map has {map} entries for {basis} basis functions")]
    AtomMapLength { map: usize, basis: usize },
    #[error("the orbitals or the overlap matrix contain a non-finite number")]
    NonFinite,
    #[error("the molecule has {atoms} atoms but the basis refers to atom {atom}")]
    AtomOutOfRange { atoms: usize, atom: usize },
    #[error("the Hamiltonian is {h:?}, the basis has {basis} functions")]
    HamiltonianSize { h: (usize, usize), basis: usize },
}

/// Options of [`pipek_mezey`].
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct LocalizeOptions {
    /// Converged when P changes by less than this over a sweep.
    pub tolerance: f64,
    /// Maximum number of sweeps per start.
    pub max_sweeps: usize,
    /// Extra deterministic starts (fixed rotations of the input orbitals); the best maximum
    /// of all starts is returned. 0: the input orbitals only.
    pub extra_starts: usize,
    /// The first start: the input orbitals or their Cholesky-localized rotation.
    pub start: Start,
}

/// The deterministic first start of [`pipek_mezey`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Start {
    /// The input (canonical) orbitals as given.
    Input,
    /// Cholesky orbitals: the pivoted Cholesky factor of the density C Cᵀ, Gram–Schmidt
    /// orthonormalized in pivot order (Aquilante, Bondo Pedersen, Sánchez de Merás and
    /// Koch, J. Chem. Phys. 125, 174101 (2006)). Already fairly local, so fewer sweeps.
    #[default]
    Cholesky,
}

impl Default for LocalizeOptions {
    fn default() -> Self {
        LocalizeOptions {
            tolerance: DEFAULT_TOLERANCE,
            max_sweeps: DEFAULT_MAX_SWEEPS,
            extra_starts: 0,
            start: Start::default(),
        }
    }
}

/// Localized orbitals and how the optimization went.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Localized {
    /// Localized orbitals over the basis; column k is orbital k.
    pub orbitals: DMatrix<f64>,
    /// The orthogonal matrix U with `orbitals = input · U`.
    pub rotation: DMatrix<f64>,
    /// P = Σ_i Σ_A (Q_A^i)² of the result.
    pub function_value: f64,
    /// P of the input orbitals.
    pub initial_value: f64,
    /// Sweeps done (for the start that won).
    pub sweeps: usize,
    /// False when the sweep cap was reached before the tolerance.
    pub converged: bool,
}

/// The Pipek–Mezey function P = Σ_i Σ_A (Q_A^i)² of `orbitals` (columns).
pub fn localization_function(
    orbitals: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    atom_of_ao: &[usize],
) -> Result<f64, LocalizeError> {
    check_inputs(orbitals, overlap, atom_of_ao)?;
    let atoms = atom_count(atom_of_ao);
    let sc = overlap * orbitals;
    let populations = gross_populations(orbitals, &sc, atom_of_ao, atoms);
    Ok(populations.iter().map(|q| q * q).sum())
}

/// Mulliken gross populations Q_A^k of each column of `orbitals` on each atom
/// (an orbitals × atoms matrix). For an S-normalized orbital the row sums to 1.
pub fn mulliken_populations(
    orbitals: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    atom_of_ao: &[usize],
) -> Result<DMatrix<f64>, LocalizeError> {
    check_inputs(orbitals, overlap, atom_of_ao)?;
    let atoms = atom_count(atom_of_ao);
    let sc = overlap * orbitals;
    Ok(gross_populations(orbitals, &sc, atom_of_ao, atoms))
}

/// Localizes the columns of `occupied` (the occupied canonical MOs, S-orthonormal) by
/// Pipek–Mezey with Mulliken populations. `atom_of_ao[μ]` is the atom of basis function μ.
///
/// No columns or a single column is returned as given (converged, zero sweeps).
pub fn pipek_mezey(
    occupied: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    atom_of_ao: &[usize],
    options: &LocalizeOptions,
) -> Result<Localized, LocalizeError> {
    check_inputs(occupied, overlap, atom_of_ao)?;
    let atoms = atom_count(atom_of_ao);
    let n = occupied.ncols();
    let mut best: Option<Localized> = None;
    for start in 0..=options.extra_starts {
        let rotation = if start == 0 {
            match options.start {
                Start::Input => DMatrix::identity(n, n),
                Start::Cholesky => cholesky_start(occupied),
            }
        } else {
            deterministic_rotation(n, start)
        };
        let result = run_jacobi(occupied, overlap, atom_of_ao, atoms, rotation, options);
        // Keep the best maximum; on a tie (1e-12) keep the earlier start.
        if best
            .as_ref()
            .is_none_or(|b| result.function_value > b.function_value + 1e-12)
        {
            best = Some(result);
        }
    }
    // `extra_starts + 1 ≥ 1` starts ran, so `best` is set; fall back defensively anyway.
    Ok(best.unwrap_or_else(|| Localized {
        orbitals: occupied.clone(),
        rotation: DMatrix::identity(n, n),
        function_value: 0.0,
        initial_value: 0.0,
        sweeps: 0,
        converged: false,
    }))
}

fn check_inputs(
    orbitals: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    atom_of_ao: &[usize],
) -> Result<(), LocalizeError> {
    let n_ao = orbitals.nrows();
    if overlap.nrows() != n_ao || overlap.ncols() != n_ao {
        return Err(LocalizeError::DimensionMismatch {
            coefficient_rows: n_ao,
            overlap: (overlap.nrows(), overlap.ncols()),
        });
    }
    if atom_of_ao.len() != n_ao {
        return Err(LocalizeError::AtomMapLength {
            map: atom_of_ao.len(),
            basis: n_ao,
        });
    }
    if orbitals
        .iter()
        .chain(overlap.iter())
        .any(|x| !x.is_finite())
    {
        return Err(LocalizeError::NonFinite);
    }
    Ok(())
}

fn atom_count(atom_of_ao: &[usize]) -> usize {
    atom_of_ao.iter().map(|&a| a + 1).max().unwrap_or(0)
}

/// Q (orbitals × atoms) from C and SC.
fn gross_populations(
    c: &DMatrix<f64>,
    sc: &DMatrix<f64>,
    atom_of_ao: &[usize],
    atoms: usize,
) -> DMatrix<f64> {
    let mut q = DMatrix::zeros(c.ncols(), atoms);
    for k in 0..c.ncols() {
        let ck = c.column(k);
        let sck = sc.column(k);
        for (mu, &atom) in atom_of_ao.iter().enumerate() {
            q[(k, atom)] += ck[mu] * sck[mu];
        }
    }
    q
}

/// U such that C U are the Cholesky orbitals of the density C Cᵀ (pivots: the largest
/// remaining diagonal, first on ties), orthonormalized in pivot order. C is S-orthonormal,
/// so the Cholesky vector L_k = C r_k is represented by r_k = rows of C at the pivot.
fn cholesky_start(c: &DMatrix<f64>) -> DMatrix<f64> {
    if c.ncols() < 2 {
        return DMatrix::identity(c.ncols(), c.ncols());
    }
    let (n_ao, n) = (c.nrows(), c.ncols());
    // Work in the occupied-coefficient space: D = C Cᵀ, so D[:, p] = C c_pᵀ with c_p row p
    // of C; each Cholesky vector is C r with r = c_pᵀ − Σ_l r_l (L_l)_p, divided by √d_p.
    let mut r: Vec<nalgebra::DVector<f64>> = Vec::with_capacity(n);
    let mut l_rows = DMatrix::<f64>::zeros(n_ao, n); // L = C R, kept explicitly
    let mut diag: Vec<f64> = (0..n_ao).map(|mu| c.row(mu).norm_squared()).collect();
    for k in 0..n {
        let mut pivot = 0;
        for mu in 1..n_ao {
            if diag[mu] > diag[pivot] + 1e-14 {
                pivot = mu;
            }
        }
        let d = diag[pivot];
        if d.is_nan() || d <= 1e-12 {
            break;
        }
        let mut v = c.row(pivot).transpose();
        for (l, rl) in r.iter().enumerate() {
            v.axpy(-l_rows[(pivot, l)], rl, 1.0);
        }
        v /= d.sqrt();
        let column = c * &v;
        for mu in 0..n_ao {
            diag[mu] -= column[mu] * column[mu];
        }
        l_rows.set_column(k, &column);
        r.push(v);
    }
    // Gram–Schmidt of the r vectors (C is S-orthonormal, so plain dot products), then
    // complete with unit vectors if the factor stopped early.
    let mut u: Vec<nalgebra::DVector<f64>> = Vec::with_capacity(n);
    let candidates = r.into_iter().chain((0..n).map(|k| {
        let mut e = nalgebra::DVector::zeros(n);
        e[k] = 1.0;
        e
    }));
    for mut v in candidates {
        if u.len() == n {
            break;
        }
        for _ in 0..2 {
            for w in &u {
                let p = w.dot(&v);
                v.axpy(-p, w, 1.0);
            }
        }
        let norm = v.norm();
        if norm > 1e-8 {
            u.push(v / norm);
        }
    }
    if u.len() < n {
        return DMatrix::identity(n, n);
    }
    DMatrix::from_columns(&u)
}

/// A fixed orthogonal matrix for extra start `seed`: a product of Givens rotations with
/// angles from a small linear congruential sequence (deterministic, platform independent).
fn deterministic_rotation(n: usize, seed: usize) -> DMatrix<f64> {
    let mut u = DMatrix::identity(n, n);
    let mut state: u64 = 0x9E37_79B9_7F4A_7C15_u64.wrapping_mul(seed as u64 + 1);
    for i in 0..n {
        for j in i + 1..n {
            state = state
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            let angle = ((state >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * std::f64::consts::PI;
            let (s, c) = angle.sin_cos();
            for r in 0..n {
                let a = u[(r, i)];
                let b = u[(r, j)];
                u[(r, i)] = c * a + s * b;
                u[(r, j)] = -s * a + c * b;
            }
        }
    }
    u
}

fn run_jacobi(
    occupied: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    atom_of_ao: &[usize],
    atoms: usize,
    start: DMatrix<f64>,
    options: &LocalizeOptions,
) -> Localized {
    let n = occupied.ncols();
    let n_ao = occupied.nrows();
    // Column-major: orbital k is the contiguous slice k·n_ao..(k+1)·n_ao.
    let mut c = if start.is_identity(0.0) {
        occupied.clone()
    } else {
        occupied * &start
    };
    let mut sc = overlap * &c;
    // Runs of consecutive AOs on one atom (the usual basis order gives one run per atom).
    let runs = ao_runs(atom_of_ao);
    // Diagonal populations Q_A^i, orbital-major.
    let mut q = vec![0.0; n * atoms];
    let diag = |c: &[f64], sc: &[f64], out: &mut [f64]| {
        out.iter_mut().for_each(|x| *x = 0.0);
        for &(atom, lo, hi) in &runs {
            out[atom] += dot(&c[lo..hi], &sc[lo..hi]);
        }
    };
    let refresh = |c: &DMatrix<f64>, sc: &DMatrix<f64>, q: &mut [f64]| {
        let (cs, scs) = (c.as_slice(), sc.as_slice());
        for i in 0..n {
            diag(
                &cs[i * n_ao..(i + 1) * n_ao],
                &scs[i * n_ao..(i + 1) * n_ao],
                &mut q[i * atoms..(i + 1) * atoms],
            );
        }
    };
    refresh(&c, &sc, &mut q);
    let value = |q: &[f64]| q.iter().map(|x| x * x).sum::<f64>();
    let initial_value = value(&q);
    let mut current = initial_value;
    let mut qij = vec![0.0; atoms];
    let mut scratch = vec![0.0; n_ao];
    let mut sweeps = 0;
    let mut converged = n < 2;
    let mut polishing = 0;
    let mut done = n < 2;
    // Over-relaxation factor ω (rotate by ω γ; every pair still gains for 0 < ω < 2), set
    // once from the gains of the last three sweeps.
    let mut omega = 1.0;
    let mut gains: [f64; 2] = [0.0, 0.0];
    // Full sweeps visit every pair; in between, up to PARTIAL_SWEEPS sweeps visit only the
    // pairs whose gradient was not negligible in the last full sweep. Convergence is only
    // ever decided on a full sweep.
    let all_pairs: Vec<(usize, usize)> = (0..n)
        .flat_map(|i| (i + 1..n).map(move |j| (i, j)))
        .collect();
    let mut active: Vec<(usize, usize)> = Vec::new();
    let mut partial_run = 0;
    let mut last_full_gradient = f64::INFINITY;
    let mut previous_full_gradient;
    let mut previous_largest_angle: f64 = 0.0;
    while !done && sweeps < options.max_sweeps {
        sweeps += 1;
        let full =
            sweeps <= FULL_SWEEPS_FIRST || partial_run >= PARTIAL_SWEEPS || active.is_empty();
        let before = current;
        let mut largest_gradient: f64 = 0.0;
        let mut largest_angle: f64 = 0.0;
        let threshold = ACTIVE_FRACTION * last_full_gradient;
        let mut next_active = Vec::new();
        let angle_floor = SKIP_ANGLE_FRACTION * previous_largest_angle;
        let list = if full { &all_pairs } else { &active };
        for &(i, j) in list {
            {
                let (cs, scs) = (c.as_slice(), sc.as_slice());
                let (ci, cj) = (&cs[i * n_ao..(i + 1) * n_ao], &cs[j * n_ao..(j + 1) * n_ao]);
                let (si, sj) = (
                    &scs[i * n_ao..(i + 1) * n_ao],
                    &scs[j * n_ao..(j + 1) * n_ao],
                );
                for (t, (((a, b), c), d)) in
                    scratch.iter_mut().zip(ci.iter().zip(sj).zip(cj).zip(si))
                {
                    *t = a * b + c * d;
                }
                qij.iter_mut().for_each(|x| *x = 0.0);
                for &(atom, lo, hi) in &runs {
                    qij[atom] += 0.5 * scratch[lo..hi].iter().sum::<f64>();
                }
            }
            let (a, b) = pair_terms(
                &qij,
                &q[i * atoms..(i + 1) * atoms],
                &q[j * atoms..(j + 1) * atoms],
            );
            largest_gradient = largest_gradient.max(b.abs());
            if full && b.abs() > threshold.max(GRADIENT_TOLERANCE) {
                next_active.push((i, j));
            }
            let norm = a.hypot(b);
            if norm < FLAT_PAIR {
                continue;
            }
            let gamma = 0.25 * b.atan2(-a);
            largest_angle = largest_angle.max(gamma.abs());
            if gamma.abs() < MIN_ANGLE || (!converged && gamma.abs() < angle_floor) {
                continue;
            }
            let gamma = gamma * omega;
            let (s, co) = gamma.sin_cos();
            rotate_pair(c.as_mut_slice(), sc.as_mut_slice(), n_ao, i, j, co, s);
            // New diagonal populations in closed form.
            let (c2, s2, cs) = (co * co, s * s, co * s);
            for atom in 0..atoms {
                let (qi, qj, x) = (q[i * atoms + atom], q[j * atoms + atom], qij[atom]);
                q[i * atoms + atom] = c2 * qi + s2 * qj + 2.0 * cs * x;
                q[j * atoms + atom] = s2 * qi + c2 * qj - 2.0 * cs * x;
            }
        }
        previous_largest_angle = largest_angle;
        // Refresh the populations from the orbitals once per sweep (no accumulated drift).
        refresh(&c, &sc, &mut q);
        current = value(&q);
        let gain = current - before;
        if omega == 1.0 && sweeps > FULL_SWEEPS_FIRST {
            omega = relaxation_factor(gains[0], gains[1], gain);
        }
        gains = [gains[1], gain];
        if converged {
            polishing += 1;
        }
        if full {
            partial_run = 0;
            active = next_active;
            previous_full_gradient = last_full_gradient;
            last_full_gradient = largest_gradient;
            let small_change = gain.abs() < options.tolerance;
            if !converged {
                if small_change {
                    converged = true;
                    done = largest_gradient < GRADIENT_TOLERANCE;
                }
            } else {
                // Polish only while the gradient falls fast (the quadratic end of Jacobi
                // convergence); on a slow, linear tail it would take many sweeps.
                done = largest_gradient < GRADIENT_TOLERANCE
                    || polishing >= POLISHING_SWEEPS
                    || largest_gradient > 0.1 * previous_full_gradient;
            }
        } else {
            partial_run += 1;
            // Nothing left to gain among the active pairs: check all pairs next.
            if gain.abs() < options.tolerance {
                partial_run = PARTIAL_SWEEPS;
            }
        }
    }
    // U = C_occᵀ S B (the input orbitals are S-orthonormal).
    let rotation = occupied.transpose() * &sc;
    Localized {
        orbitals: c,
        rotation,
        function_value: current,
        initial_value,
        sweeps,
        converged,
    }
}

/// Successive over-relaxation for the slow, linear phase of the sweeps (large conjugated
/// systems such as C60, where plain Jacobi sweeps gain ~0.8× the previous sweep's gain):
/// once two successive gain ratios both lie in (0.5, 1), the rotation angles are multiplied
/// by [`OVER_RELAXATION`]. Every pair still gains for 0 < ω < 2, so P keeps rising.
fn relaxation_factor(g1: f64, g2: f64, g3: f64) -> f64 {
    if !(g1 > 0.0 && g2 > 0.0 && g3 > 0.0) {
        return 1.0;
    }
    let (r1, r2) = (g2 / g1, g3 / g2);
    if r1 > 0.5 && r1 < 1.0 && r2 > 0.5 && r2 < 1.0 {
        OVER_RELAXATION
    } else {
        1.0
    }
}

/// (atom, start, end) of each run of consecutive basis functions on one atom.
fn ao_runs(atom_of_ao: &[usize]) -> Vec<(usize, usize, usize)> {
    let mut runs: Vec<(usize, usize, usize)> = Vec::new();
    for (mu, &atom) in atom_of_ao.iter().enumerate() {
        match runs.last_mut() {
            Some(run) if run.0 == atom && run.2 == mu => run.2 = mu + 1,
            _ => runs.push((atom, mu, mu + 1)),
        }
    }
    runs
}

#[inline]
fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// A_ij = Σ_A [x_A² − ¼ d_A²] and B_ij = Σ_A x_A d_A with x = Q^ij, d = Q^i − Q^j, summed
/// with four independent accumulators (no serial dependency chain).
#[inline]
fn pair_terms(qij: &[f64], qi: &[f64], qj: &[f64]) -> (f64, f64) {
    let mut xx = [0.0; 4];
    let mut dd = [0.0; 4];
    let mut xd = [0.0; 4];
    let chunks = qij.len() / 4;
    for k in 0..chunks {
        for l in 0..4 {
            let m = 4 * k + l;
            let x = qij[m];
            let d = qi[m] - qj[m];
            xx[l] += x * x;
            dd[l] += d * d;
            xd[l] += x * d;
        }
    }
    for m in 4 * chunks..qij.len() {
        let x = qij[m];
        let d = qi[m] - qj[m];
        xx[0] += x * x;
        dd[0] += d * d;
        xd[0] += x * d;
    }
    let sum = |v: [f64; 4]| (v[0] + v[1]) + (v[2] + v[3]);
    (sum(xx) - 0.25 * sum(dd), sum(xd))
}

/// Columns i < j of two column-major matrices with `rows` rows:
/// (i, j) → (c i + s j, −s i + c j).
#[inline]
fn rotate_pair(x: &mut [f64], y: &mut [f64], rows: usize, i: usize, j: usize, co: f64, s: f64) {
    let (xl, xr) = x.split_at_mut(j * rows);
    let (yl, yr) = y.split_at_mut(j * rows);
    let xi = &mut xl[i * rows..(i + 1) * rows];
    let xj = &mut xr[..rows];
    let yi = &mut yl[i * rows..(i + 1) * rows];
    let yj = &mut yr[..rows];
    for (((a, b), c), d) in xi
        .iter_mut()
        .zip(xj.iter_mut())
        .zip(yi.iter_mut())
        .zip(yj.iter_mut())
    {
        let (p, q, r, t) = (*a, *b, *c, *d);
        *a = co * p + s * q;
        *b = -s * p + co * q;
        *c = co * r + s * t;
        *d = -s * r + co * t;
    }
}

/// Kind of a localized orbital by its number of centres.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LocalizedKind {
    /// One centre: a lone pair.
    LonePair,
    /// Two centres: a bond.
    Bond,
    /// Three or more centres.
    MultiCentre,
}

/// σ or π character of a two-centre orbital (see [`PI_PERPENDICULAR_SHARE`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BondCharacter {
    Sigma,
    Pi,
}

/// The part of a localized orbital on one atom, renormalized and read as a hybrid.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct AtomHybrid {
    pub atom: usize,
    /// Mulliken gross population of the orbital on this atom.
    pub population: f64,
    /// Σ_{μ∈A} C_μ² (the squared norm of the part before renormalization).
    pub weight: f64,
    /// Shares of s, p and d in the renormalized part (add to 1).
    pub s_share: f64,
    pub p_share: f64,
    pub d_share: f64,
    /// λ = p-weight / s-weight; None when there is no s part (pure p: λ = ∞).
    pub lambda: Option<f64>,
    /// Unit vector of the p part, signed to point along the larger lobe (where s and p
    /// add); for a part without s, towards the partner (or the sign making its largest
    /// component positive). None without p part.
    pub direction: Option<Vector3<f64>>,
    /// The other centre of a two-centre orbital.
    pub partner: Option<usize>,
    /// Angle in degrees between the direction and the axis towards the partner, for σ
    /// bonds (a bent bond's deviation).
    pub bending_deg: Option<f64>,
}

/// One localized orbital, classified and read as hybrids.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LocalizedOrbital {
    pub kind: LocalizedKind,
    /// σ or π for two-centre orbitals.
    pub character: Option<BondCharacter>,
    /// Centres, by decreasing population.
    pub atoms: Vec<usize>,
    /// Mulliken gross population on every atom.
    pub populations: Vec<f64>,
    /// ⟨b|H|b⟩ / ⟨b|S|b⟩ in eV.
    pub energy_ev: f64,
    /// "n(N)", "σ(N–H)", "π(C–O)", "3c(B–H–B)".
    pub label: String,
    /// One hybrid per centre, in the order of `atoms`.
    pub hybrids: Vec<AtomHybrid>,
}

/// Classifies and labels each column of `orbitals` (a localized set) with the molecule's
/// geometry, the EHT basis, its overlap and Hamiltonian.
pub fn describe(
    orbitals: &DMatrix<f64>,
    overlap: &DMatrix<f64>,
    hamiltonian: &DMatrix<f64>,
    basis: &Basis,
    molecule: &Molecule,
) -> Result<Vec<LocalizedOrbital>, LocalizeError> {
    let atom_of_ao: Vec<usize> = basis.orbitals.iter().map(|o| o.atom).collect();
    check_inputs(orbitals, overlap, &atom_of_ao)?;
    let n_ao = orbitals.nrows();
    if hamiltonian.nrows() != n_ao || hamiltonian.ncols() != n_ao {
        return Err(LocalizeError::HamiltonianSize {
            h: (hamiltonian.nrows(), hamiltonian.ncols()),
            basis: n_ao,
        });
    }
    let atoms = molecule.atoms.len();
    if let Some(&atom) = atom_of_ao.iter().find(|&&a| a >= atoms) {
        return Err(LocalizeError::AtomOutOfRange { atoms, atom });
    }
    let sc = overlap * orbitals;
    let hc = hamiltonian * orbitals;
    let q = gross_populations(orbitals, &sc, &atom_of_ao, atoms);
    let mut out = Vec::with_capacity(orbitals.ncols());
    for k in 0..orbitals.ncols() {
        let b = orbitals.column(k);
        let norm = b.dot(&sc.column(k));
        let energy_ev = if norm > 0.0 {
            b.dot(&hc.column(k)) / norm
        } else {
            0.0
        };
        let populations: Vec<f64> = (0..atoms).map(|a| q[(k, a)]).collect();
        let centres = centres_of(&populations);
        let kind = match centres.len() {
            0 | 1 => LocalizedKind::LonePair,
            2 => LocalizedKind::Bond,
            _ => LocalizedKind::MultiCentre,
        };
        let mut hybrids: Vec<AtomHybrid> = centres
            .iter()
            .map(|&atom| {
                let partner = if centres.len() == 2 {
                    centres.iter().copied().find(|&a| a != atom)
                } else {
                    None
                };
                atom_hybrid(
                    &b.clone_owned(),
                    basis,
                    molecule,
                    atom,
                    partner,
                    populations[atom],
                )
            })
            .collect();
        let character = if kind == LocalizedKind::Bond {
            Some(bond_character(&b.clone_owned(), basis, molecule, &centres))
        } else {
            None
        };
        if character == Some(BondCharacter::Sigma) {
            for h in &mut hybrids {
                h.bending_deg = bending(h, molecule);
            }
        }
        let label = label_for(kind, character, &centres, molecule);
        out.push(LocalizedOrbital {
            kind,
            character,
            atoms: centres,
            populations,
            energy_ev,
            label,
            hybrids,
        });
    }
    Ok(out)
}

/// The fewest atoms, by decreasing population, whose populations reach [`CENTRE_SHARE`]
/// of the total (ties by atom index).
fn centres_of(populations: &[f64]) -> Vec<usize> {
    let total: f64 = populations.iter().sum();
    let mut order: Vec<usize> = (0..populations.len()).collect();
    order.sort_by(|&a, &b| populations[b].total_cmp(&populations[a]).then(a.cmp(&b)));
    let mut sum = 0.0;
    let mut centres = Vec::new();
    for atom in order {
        centres.push(atom);
        sum += populations[atom];
        if sum >= CENTRE_SHARE * total {
            break;
        }
    }
    centres
}

/// (s, p vector, d weight, total) of the part of `b` on `atom`.
fn atom_part(b: &nalgebra::DVector<f64>, basis: &Basis, atom: usize) -> (f64, Vector3<f64>, f64) {
    let mut s = 0.0;
    let mut s_weight = 0.0;
    let mut p = Vector3::zeros();
    let mut d = 0.0;
    if let Some(range) = basis.atom_ranges.get(atom) {
        for mu in range
            .clone()
            .filter(|&mu| mu < b.len() && mu < basis.orbitals.len())
        {
            let c = b[mu];
            match basis.orbitals[mu].kind {
                AngularKind::S => {
                    // One valence s shell per atom in EHT; several would add in quadrature.
                    s_weight += c * c;
                    s += c;
                }
                AngularKind::Px => p.x += c,
                AngularKind::Py => p.y += c,
                AngularKind::Pz => p.z += c,
                _ => d += c * c,
            }
        }
    }
    let s_signed = s.signum() * s_weight.sqrt();
    (s_signed, p, d)
}

fn atom_hybrid(
    b: &nalgebra::DVector<f64>,
    basis: &Basis,
    molecule: &Molecule,
    atom: usize,
    partner: Option<usize>,
    population: f64,
) -> AtomHybrid {
    let (s, p, d) = atom_part(b, basis, atom);
    let s2 = s * s;
    let p2 = p.norm_squared();
    let total = s2 + p2 + d;
    let (s_share, p_share, d_share) = if total > 0.0 {
        (s2 / total, p2 / total, d / total)
    } else {
        (0.0, 0.0, 0.0)
    };
    let lambda = if total > 0.0 && s2 > 1e-12 * total {
        Some(p2 / s2)
    } else {
        None
    };
    let direction = if total > 0.0 && p2 > 1e-12 * total {
        let unit = p / p2.sqrt();
        let sign =
            if s2 > 1e-12 * total {
                s.signum()
            } else if let Some(axis) = partner.and_then(|other| bond_axis(molecule, atom, other)) {
                if unit.dot(&axis) < 0.0 { -1.0 } else { 1.0 }
            } else {
                let largest = unit.iter().copied().fold(0.0_f64, |m, x| {
                    if x.abs() > m.abs() + 1e-12 { x } else { m }
                });
                if largest < 0.0 { -1.0 } else { 1.0 }
            };
        Some(unit * sign)
    } else {
        None
    };
    AtomHybrid {
        atom,
        population,
        weight: total,
        s_share,
        p_share,
        d_share,
        lambda,
        direction,
        partner,
        bending_deg: None,
    }
}

/// Unit vector from `atom` to `other`.
fn bond_axis(molecule: &Molecule, atom: usize, other: usize) -> Option<Vector3<f64>> {
    let v = molecule.atoms.get(other)?.position - molecule.atoms.get(atom)?.position;
    let n = v.norm();
    (n > 0.0).then(|| v / n)
}

fn bending(h: &AtomHybrid, molecule: &Molecule) -> Option<f64> {
    let axis = bond_axis(molecule, h.atom, h.partner?)?;
    let direction = h.direction?;
    Some(direction.dot(&axis).clamp(-1.0, 1.0).acos().to_degrees())
}

fn bond_character(
    b: &nalgebra::DVector<f64>,
    basis: &Basis,
    molecule: &Molecule,
    centres: &[usize],
) -> BondCharacter {
    let (first, second) = (centres[0], centres[1]);
    let Some(axis) = bond_axis(molecule, first, second) else {
        return BondCharacter::Sigma;
    };
    let mut weighted = 0.0;
    let mut weights = 0.0;
    for &atom in &[first, second] {
        let (s, p, d) = atom_part(b, basis, atom);
        let total = s * s + p.norm_squared() + d;
        if total <= 0.0 {
            continue;
        }
        let perpendicular = p - axis * p.dot(&axis);
        weighted += perpendicular.norm_squared();
        weights += total;
    }
    if weights > 0.0 && weighted / weights > PI_PERPENDICULAR_SHARE {
        BondCharacter::Pi
    } else {
        BondCharacter::Sigma
    }
}

fn label_for(
    kind: LocalizedKind,
    character: Option<BondCharacter>,
    centres: &[usize],
    molecule: &Molecule,
) -> String {
    let symbol = |a: usize| {
        molecule
            .atoms
            .get(a)
            .map(|atom| atom.element.symbol())
            .unwrap_or("?")
    };
    // Atom order: file order, hydrogen last (σ(C–H), σ(C–N) in H–C≡N).
    let mut by_index = centres.to_vec();
    let is_hydrogen = |a: usize| {
        molecule
            .atoms
            .get(a)
            .is_some_and(|atom| atom.element.atomic_number() == 1)
    };
    by_index.sort_by_key(|&a| (is_hydrogen(a), a));
    let joined = by_index
        .iter()
        .map(|&a| symbol(a))
        .collect::<Vec<_>>()
        .join("–");
    match kind {
        LocalizedKind::LonePair => format!("n({})", centres.first().map_or("?", |&a| symbol(a))),
        LocalizedKind::Bond => match character {
            Some(BondCharacter::Pi) => format!("π({joined})"),
            _ => format!("σ({joined})"),
        },
        LocalizedKind::MultiCentre => format!("{}c({joined})", centres.len()),
    }
}

/// Localizes the occupied orbitals (occupation > 0) of an extended Hückel result. For an
/// open shell the partly filled orbitals are included, so the localized set spans the
/// occupied space; each localized orbital's electron count is then `Links::occupancy`.
pub fn localize_occupied(
    eht: &crate::eht::EhtResult,
    options: &LocalizeOptions,
) -> Result<Localized, LocalizeError> {
    let occupied: Vec<usize> = (0..eht.occupations.len())
        .filter(|&k| eht.occupations[k] > 0.0)
        .collect();
    let c = eht.coefficients.select_columns(&occupied);
    let atom_of_ao: Vec<usize> = eht.basis.orbitals.iter().map(|o| o.atom).collect();
    pipek_mezey(&c, &eht.overlap, &atom_of_ao, options)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The closed-form pair gain equals the change of P after the rotation.
    #[test]
    fn pair_gain_matches_rotation() {
        // Three AOs on two atoms, orthonormal basis (S = I), two orbitals.
        let s = DMatrix::identity(3, 3);
        let c = DMatrix::from_row_slice(3, 2, &[0.8, 0.1, 0.36, -0.7, 0.48, 0.6]);
        let c = {
            // Orthonormalize the columns (Gram–Schmidt).
            let mut c = c;
            let n0 = c.column(0).norm();
            c.column_mut(0).unscale_mut(n0);
            let proj = c.column(0).dot(&c.column(1));
            let col0 = c.column(0).clone_owned();
            c.column_mut(1).axpy(-proj, &col0, 1.0);
            let n1 = c.column(1).norm();
            c.column_mut(1).unscale_mut(n1);
            c
        };
        let map = [0, 0, 1];
        let before = localization_function(&c, &s, &map).unwrap();
        let options = LocalizeOptions {
            max_sweeps: 1,
            ..Default::default()
        };
        let result = pipek_mezey(&c, &s, &map, &options).unwrap();
        let after = localization_function(&result.orbitals, &s, &map).unwrap();
        assert!((after - result.function_value).abs() < 1e-12);
        assert!(after >= before - 1e-12);
        // One pair: a single Jacobi rotation reaches the maximum; a second sweep gains 0.
        let again = pipek_mezey(&result.orbitals, &s, &map, &options).unwrap();
        assert!((again.function_value - after).abs() < 1e-12);
    }

    #[test]
    fn deterministic_rotation_is_orthogonal() {
        let u = deterministic_rotation(5, 2);
        let e = u.transpose() * &u - DMatrix::identity(5, 5);
        assert!(e.amax() < 1e-12);
    }
}
