//! The lone-pair mixing switch (DESIGN §4.6), in the orthonormal atomic basis.
//!
//! With mixing off, the held orbitals (see [`super::held`]) span a space with projector
//! P = Σ |l⟩⟨l|, Q = 1 − P, and the Hamiltonian is P A P + Q H̃ Q: the held space keeps
//! the free atoms' Hamiltonian A (each held orbital its atomic energy, held orbitals on
//! different atoms uncoupled), the rest mixes freely under H̃. The two blocks are solved
//! apart, so each held level is an exact eigenvector even when it is degenerate with
//! another level. We use A rather than P H̃ P because Löwdin's H̃ does not keep atomic
//! energies in extended Hückel's strongly overlapping basis: in ammonia its diagonal is
//! −8.98 eV for N 2s and −11.67 eV for N 2p along the axis (the parameters: −26.0 and
//! −13.4 eV), and a non-bonding orbital of the hand-drawn diagram sits at its atomic
//! level. Occupations: the held levels occupied with mixing on (⟨l|P_on|l⟩ > 1) keep two
//! electrons; the others are filled by aufbau; a note says when plain aufbau would fill
//! differently. Levels of the two states are paired by the largest total squared overlap
//! ([`super::pairing`]).

use nalgebra::{DMatrix, DVector, SymmetricEigen};
use thiserror::Error;

use super::held::HeldOrbital;
use super::orthonormal::completed_basis;
use super::pairing::match_levels;
use crate::eht::aufbau;

/// Errors of the lone-pair switch.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum MixingError {
    #[error("the Hamiltonian is {rows}×{cols} but the canonical MOs have {basis} rows")]
    Shape {
        rows: usize,
        cols: usize,
        basis: usize,
    },
    #[error("the held orbitals are not orthonormal (largest deviation {deviation:.1e})")]
    NotOrthonormal { deviation: f64 },
    #[error("{electrons} electrons do not fit in {levels} levels")]
    Electrons { electrons: usize, levels: usize },
    #[error("the Hamiltonian contains a non-finite number")]
    NonFinite,
}

/// The canonical state with mixing on, over the orthonormal basis.
#[derive(Clone, Copy, Debug)]
pub struct MixedState<'a> {
    pub hamiltonian: &'a DMatrix<f64>,
    /// Columns: the canonical MOs.
    pub coefficients: &'a DMatrix<f64>,
    pub energies: &'a [f64],
    pub occupations: &'a [f64],
    pub electrons: usize,
}

/// The levels with the held orbitals non-bonding, and how they pair with the mixed ones.
#[derive(Clone, Debug, PartialEq)]
pub struct HeldState {
    /// Ascending, eV.
    pub energies: Vec<f64>,
    /// Columns over the orthonormal basis.
    pub coefficients: DMatrix<f64>,
    pub occupations: Vec<f64>,
    pub open_shell: bool,
    /// The held levels (indices into `energies`).
    pub held_levels: Vec<usize>,
    /// For each level here, the mixed level it pairs with.
    pub paired: Vec<usize>,
    /// ε(mixed partner) − ε(here), eV.
    pub shifts: Vec<f64>,
    pub notes: Vec<String>,
}

/// Solves P A P + Q H̃ Q (see the module doc); `atomic` is α of each basis function.
pub fn hold(
    mixed: MixedState<'_>,
    held: &[HeldOrbital],
    atomic: &[f64],
) -> Result<HeldState, MixingError> {
    let n = check(mixed, held)?;
    if atomic.len() != n {
        return Err(MixingError::Shape {
            rows: atomic.len(),
            cols: 1,
            basis: n,
        });
    }
    let held_basis = if held.is_empty() {
        DMatrix::zeros(n, 0)
    } else {
        DMatrix::from_columns(&held.iter().map(|h| h.vector.clone()).collect::<Vec<_>>())
    };
    let free_basis = complement(&held_basis, n)?;
    // ⟨l_i|A|l_j⟩ = Σ_μ l_iμ l_jμ α_μ: zero between atoms, the atomic energies on the
    // diagonal.
    let alpha = DMatrix::from_diagonal(&DVector::from_column_slice(atomic));
    let held_block = held_basis.transpose() * alpha * &held_basis;
    let free_block = free_basis.transpose() * mixed.hamiltonian * &free_basis;
    let held_levels = solve_block(&held_block, &held_basis);
    let free_levels = solve_block(&free_block, &free_basis);
    let (energies, coefficients, held_levels) = merged(held_levels, free_levels);
    let (occupations, open_shell, notes) = occupy(mixed, &energies, &coefficients, &held_levels);
    let overlaps = (coefficients.transpose() * mixed.coefficients).map(f64::abs);
    let paired = match_levels(&overlaps);
    let shifts = paired
        .iter()
        .enumerate()
        .map(|(k, &on)| mixed.energies.get(on).map_or(0.0, |e| e - energies[k]))
        .collect();
    Ok(HeldState {
        energies,
        coefficients,
        occupations,
        open_shell,
        held_levels,
        paired,
        shifts,
        notes,
    })
}

/// The basis size, once the shapes agree and the held orbitals are orthonormal.
fn check(mixed: MixedState<'_>, held: &[HeldOrbital]) -> Result<usize, MixingError> {
    let h = mixed.hamiltonian;
    let n = mixed.coefficients.nrows();
    if h.nrows() != n || h.ncols() != n || mixed.energies.len() != mixed.coefficients.ncols() {
        return Err(MixingError::Shape {
            rows: h.nrows(),
            cols: h.ncols(),
            basis: n,
        });
    }
    if h.iter().any(|x| !x.is_finite()) {
        return Err(MixingError::NonFinite);
    }
    if mixed.electrons > 2 * n {
        return Err(MixingError::Electrons {
            electrons: mixed.electrons,
            levels: n,
        });
    }
    let mut deviation: f64 = 0.0;
    for (i, a) in held.iter().enumerate() {
        if a.vector.len() != n {
            return Err(MixingError::Shape {
                rows: a.vector.len(),
                cols: 1,
                basis: n,
            });
        }
        for b in &held[i..] {
            let expected = if std::ptr::eq(a, b) { 1.0 } else { 0.0 };
            deviation = deviation.max((a.vector.dot(&b.vector) - expected).abs());
        }
    }
    if deviation > 1e-8 || !deviation.is_finite() {
        return Err(MixingError::NotOrthonormal { deviation });
    }
    Ok(n)
}

/// An orthonormal basis of the complement of the held columns (n × (n − k)).
fn complement(held_basis: &DMatrix<f64>, n: usize) -> Result<DMatrix<f64>, MixingError> {
    let vectors: Vec<DVector<f64>> = held_basis.column_iter().map(|c| c.into_owned()).collect();
    let k = vectors.len();
    let full = completed_basis(vectors, n).ok_or(MixingError::NotOrthonormal { deviation: 1.0 })?;
    Ok(full.columns(k, n - k).into_owned())
}

/// The levels of both blocks in one ascending list (a held level first on a tie): their
/// energies, their vectors as columns, and which of them are held.
fn merged(
    held: (Vec<f64>, Vec<DVector<f64>>),
    free: (Vec<f64>, Vec<DVector<f64>>),
) -> (Vec<f64>, DMatrix<f64>, Vec<usize>) {
    let tagged = |(energies, vectors): (Vec<f64>, Vec<DVector<f64>>), is_held: bool| {
        energies
            .into_iter()
            .zip(vectors)
            .map(move |(e, v)| (e, is_held, v))
    };
    let mut levels: Vec<(f64, bool, DVector<f64>)> =
        tagged(held, true).chain(tagged(free, false)).collect();
    levels.sort_by(|a, b| a.0.total_cmp(&b.0).then(b.1.cmp(&a.1)));
    let energies = levels.iter().map(|l| l.0).collect();
    let held_levels = (0..levels.len()).filter(|&k| levels[k].1).collect();
    let columns: Vec<DVector<f64>> = levels.into_iter().map(|l| l.2).collect();
    (energies, DMatrix::from_columns(&columns), held_levels)
}

/// Eigenvalues (ascending) and eigenvectors, mapped back by `basis`, of one block.
fn solve_block(block: &DMatrix<f64>, basis: &DMatrix<f64>) -> (Vec<f64>, Vec<DVector<f64>>) {
    if block.nrows() == 0 {
        return (Vec::new(), Vec::new());
    }
    let eigen = SymmetricEigen::new(block.clone());
    let mut order: Vec<usize> = (0..block.nrows()).collect();
    order.sort_by(|&a, &b| eigen.eigenvalues[a].total_cmp(&eigen.eigenvalues[b]));
    let energies = order.iter().map(|&k| eigen.eigenvalues[k]).collect();
    let vectors = order
        .iter()
        .map(|&k| {
            let mut v = basis * eigen.eigenvectors.column(k);
            // Sign convention: the largest coefficient is positive.
            if v.iter()
                .copied()
                .fold(0.0_f64, |m, x| if x.abs() > m.abs() { x } else { m })
                < 0.0
            {
                v.neg_mut();
            }
            v
        })
        .collect();
    (energies, vectors)
}

/// Occupations: held levels occupied with mixing on keep two electrons, the rest by aufbau.
fn occupy(
    mixed: MixedState<'_>,
    energies: &[f64],
    coefficients: &DMatrix<f64>,
    held_levels: &[usize],
) -> (Vec<f64>, bool, Vec<String>) {
    let held = coefficients.select_columns(held_levels);
    let with_mixing = super::true_occupancies(&held, mixed.coefficients, mixed.occupations);
    let kept: Vec<usize> = held_levels
        .iter()
        .zip(&with_mixing)
        .filter(|&(_, &n)| n > 1.0)
        .map(|(&k, _)| k)
        .collect();
    let rest: Vec<usize> = (0..energies.len()).filter(|k| !kept.contains(k)).collect();
    let remaining = mixed.electrons.saturating_sub(2 * kept.len());
    let rest_energies: Vec<f64> = rest.iter().map(|&k| energies[k]).collect();
    let (rest_occupations, open_shell) = aufbau(&rest_energies, remaining);
    let mut occupations = vec![0.0; energies.len()];
    for &k in &kept {
        occupations[k] = 2.0;
    }
    for (&k, &n) in rest.iter().zip(&rest_occupations) {
        occupations[k] = n;
    }
    let (plain, _) = aufbau(energies, mixed.electrons);
    let mut notes = Vec::new();
    if plain
        .iter()
        .zip(&occupations)
        .any(|(a, b)| (a - b).abs() > 1e-9)
    {
        notes.push(
            "with the lone pairs held, aufbau would empty a held lone pair; it is kept doubly occupied as with mixing on".to_string(),
        );
    }
    (occupations, open_shell, notes)
}
