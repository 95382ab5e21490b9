//! The lone-pair mixing switch (DESIGN §4.6). With mixing off, each lone pair's atomic
//! orbital — a combination of its centre's valence functions along the lone-pair
//! direction — is held non-bonding: the centre's one-centre block of the basis is rotated so
//! that the lone-pair orbital is a basis function (the rest of the block is completed by
//! Gram–Schmidt in the S metric; one-centre s, p, d Slater functions are orthonormal, so
//! the rotation is orthogonal), its elements of H and S to every other function are set to
//! zero (its diagonal ⟨l|H|l⟩ = the hybrid energy (ε_s + λ ε_p)/(1 + λ) is kept), the
//! generalized eigenproblem is solved again (`eht::solve`) and the coefficients are
//! transformed back to the original AO basis. This is the first-order diagram one draws by
//! hand; with mixing on, the ordinary solution. (The held MOs are orthonormal in the
//! modified overlap, with l's elements zeroed, not in the original S.) Levels of the two solutions are paired by
//! the largest total squared overlap |ψ_offᵀ S ψ_on|² (an optimal assignment, the
//! Hungarian method: H. W. Kuhn, Naval Res. Logist. Q. 2, 83 (1955)), so labels carry over.

use std::ops::Range;

use nalgebra::{DMatrix, DVector};
use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::eht::{EhtError, EhtResult, Solution, solve};

/// A lone-pair function whose remaining norm after Gram–Schmidt is below this is
/// linearly dependent on the earlier ones.
const DEPENDENCE_THRESHOLD: f64 = 1e-8;

/// Errors of the lone-pair switch.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum MixingError {
    #[error("lone pair {index} has {got} coefficients for a basis of {expected}")]
    Length {
        index: usize,
        got: usize,
        expected: usize,
    },
    #[error("lone pair {index} is zero or not finite")]
    Empty { index: usize },
    #[error("lone pair {index} has coefficients on more than one atom ({first} and {second})")]
    SeveralAtoms {
        index: usize,
        first: usize,
        second: usize,
    },
    #[error("lone pair {index} lies in the span of the earlier lone pairs of atom {atom}")]
    Dependent { index: usize, atom: usize },
    #[error("the atom ranges do not cover the basis of {basis} functions")]
    Ranges { basis: usize },
    #[error("re-solving with the lone pairs held non-bonding failed: {0}")]
    Solve(#[from] EhtError),
}

/// The solution with the lone pairs held non-bonding, in the original AO basis.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct HeldSolution {
    pub solution: Solution,
    /// Basis index (after the rotation) of each lone-pair function: the lone pair becomes
    /// basis function `lone_pair_functions[i]` of the rotated basis.
    pub lone_pair_functions: Vec<usize>,
    /// ⟨l|H|l⟩ of each (orthonormalized) lone-pair orbital, eV.
    pub lone_pair_energies: Vec<f64>,
    /// The orthonormalized lone-pair orbitals over the original basis (columns).
    pub lone_pair_orbitals: DMatrix<f64>,
}

/// Both level sets of the switch and how they pair up.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct MixingComparison {
    /// Mixing on: the ordinary solution.
    pub on: Solution,
    /// Mixing off: the lone pairs held non-bonding.
    pub off: HeldSolution,
    /// For each off level j, the on level it is paired with.
    pub off_to_on: Vec<usize>,
    /// |ψ_offᵀ S ψ_on| of each pair.
    pub pair_overlaps: Vec<f64>,
    /// Shift of each off level when mixing is switched on: ε_on(pair) − ε_off (eV).
    pub shifts: Vec<f64>,
}

/// Solves HC = SCE with each lone-pair orbital held non-bonding (see the module doc).
/// `lone_pairs` are vectors over the full basis, non-zero on one atom only; several on the
/// same atom are orthonormalized in the given order.
pub fn hold_non_bonding(
    h: &DMatrix<f64>,
    s: &DMatrix<f64>,
    atom_ranges: &[Range<usize>],
    lone_pairs: &[DVector<f64>],
    electrons: usize,
) -> Result<HeldSolution, MixingError> {
    let n = check_shapes(h, s, atom_ranges)?;
    let atoms = lone_pair_atoms(lone_pairs, atom_ranges, n)?;
    let rotation = Rotation::build(s, atom_ranges, lone_pairs, &atoms)?;
    let functions = rotation.functions();
    let mut h_t = rotation.t.transpose() * h * &rotation.t;
    let mut s_t = rotation.t.transpose() * s * &rotation.t;
    for &p in &functions {
        for q in (0..n).filter(|&q| q != p) {
            h_t[(p, q)] = 0.0;
            h_t[(q, p)] = 0.0;
            s_t[(p, q)] = 0.0;
            s_t[(q, p)] = 0.0;
        }
    }
    let lone_pair_energies = functions
        .iter()
        .map(|&p| h_t[(p, p)] / s_t[(p, p)])
        .collect();
    let mut solution = solve(&h_t, &s_t, electrons)?;
    solution.coefficients = &rotation.t * &solution.coefficients;
    Ok(HeldSolution {
        solution,
        lone_pair_functions: functions,
        lone_pair_energies,
        lone_pair_orbitals: rotation.orbitals,
    })
}

/// The basis size, when H, S and the atom ranges agree.
fn check_shapes(
    h: &DMatrix<f64>,
    s: &DMatrix<f64>,
    atom_ranges: &[Range<usize>],
) -> Result<usize, MixingError> {
    let n = s.nrows();
    if n == 0 || s.ncols() != n || h.nrows() != n || h.ncols() != n {
        return Err(MixingError::Solve(EhtError::DimensionMismatch {
            h: (h.nrows(), h.ncols()),
            s: (s.nrows(), s.ncols()),
        }));
    }
    if atom_ranges.iter().map(|r| r.len()).sum::<usize>() != n
        || atom_ranges.iter().any(|r| r.end > n)
    {
        return Err(MixingError::Ranges { basis: n });
    }
    Ok(n)
}

/// The atom of each lone pair (its only atom with coefficients).
fn lone_pair_atoms(
    lone_pairs: &[DVector<f64>],
    atom_ranges: &[Range<usize>],
    n: usize,
) -> Result<Vec<usize>, MixingError> {
    let mut atoms = Vec::with_capacity(lone_pairs.len());
    for (index, lp) in lone_pairs.iter().enumerate() {
        if lp.len() != n {
            return Err(MixingError::Length {
                index,
                got: lp.len(),
                expected: n,
            });
        }
        if lp.iter().any(|x| !x.is_finite()) || lp.amax() == 0.0 {
            return Err(MixingError::Empty { index });
        }
        let scale = lp.amax();
        let mut found: Option<usize> = None;
        for (atom, range) in atom_ranges.iter().enumerate() {
            if range.clone().any(|mu| lp[mu].abs() > 1e-12 * scale) {
                if let Some(first) = found {
                    return Err(MixingError::SeveralAtoms {
                        index,
                        first,
                        second: atom,
                    });
                }
                found = Some(atom);
            }
        }
        atoms.push(found.ok_or(MixingError::Empty { index })?);
    }
    Ok(atoms)
}

/// The basis rotation T: identity except in the blocks of atoms with lone pairs, where the
/// lone pairs come first and Gram–Schmidt (S metric) completes the block.
struct Rotation {
    t: DMatrix<f64>,
    /// (lone pair, its function in the rotated basis).
    held: Vec<(usize, usize)>,
    /// The orthonormalized lone pairs over the original basis (columns).
    orbitals: DMatrix<f64>,
}

impl Rotation {
    fn build(
        s: &DMatrix<f64>,
        atom_ranges: &[Range<usize>],
        lone_pairs: &[DVector<f64>],
        atoms: &[usize],
    ) -> Result<Rotation, MixingError> {
        let n = s.nrows();
        let mut rotation = Rotation {
            t: DMatrix::identity(n, n),
            held: Vec::new(),
            orbitals: DMatrix::zeros(n, lone_pairs.len()),
        };
        for (atom, range) in atom_ranges.iter().enumerate() {
            let mine: Vec<usize> = (0..lone_pairs.len())
                .filter(|&i| atoms[i] == atom)
                .collect();
            if mine.is_empty() {
                continue;
            }
            let block = s.view((range.start, range.start), (range.len(), range.len()));
            let columns = block_basis(block, lone_pairs, &mine, range, atom)?;
            for (c, column) in columns.iter().enumerate() {
                for (r, &value) in column.iter().enumerate() {
                    rotation.t[(range.start + r, range.start + c)] = value;
                }
            }
            for (column, &i) in columns.iter().zip(&mine) {
                let c = rotation
                    .held
                    .iter()
                    .filter(|(_, f)| range.contains(f))
                    .count();
                rotation.held.push((i, range.start + c));
                for (r, &value) in column.iter().enumerate() {
                    rotation.orbitals[(range.start + r, i)] = value;
                }
            }
        }
        rotation.held.sort_unstable();
        Ok(rotation)
    }

    /// The held functions, in lone-pair order.
    fn functions(&self) -> Vec<usize> {
        self.held.iter().map(|&(_, f)| f).collect()
    }
}

/// An S-orthonormal basis of one atom's block: its lone pairs first (in order), then the
/// atom's functions to complete it.
fn block_basis(
    block: nalgebra::DMatrixView<'_, f64>,
    lone_pairs: &[DVector<f64>],
    mine: &[usize],
    range: &Range<usize>,
    atom: usize,
) -> Result<Vec<DVector<f64>>, MixingError> {
    let s_dot = |a: &DVector<f64>, b: &DVector<f64>| a.dot(&(block * b));
    let push = |mut v: DVector<f64>, columns: &mut Vec<DVector<f64>>| -> bool {
        // Twice, for numerical orthogonality.
        for _ in 0..2 {
            for c in columns.iter() {
                let proj = s_dot(c, &v);
                v.axpy(-proj, c, 1.0);
            }
        }
        let norm2 = s_dot(&v, &v);
        let independent = norm2 > DEPENDENCE_THRESHOLD;
        if independent {
            columns.push(v / norm2.sqrt());
        }
        independent
    };
    let mut columns: Vec<DVector<f64>> = Vec::new();
    for &i in mine {
        let restricted = lone_pairs[i].rows(range.start, range.len()).clone_owned();
        if !push(restricted, &mut columns) {
            return Err(MixingError::Dependent { index: i, atom });
        }
    }
    for mu in 0..range.len() {
        if columns.len() == range.len() {
            break;
        }
        let mut e = DVector::zeros(range.len());
        e[mu] = 1.0;
        push(e, &mut columns);
    }
    Ok(columns)
}

/// The part of `orbital` (a vector over the full basis) on the atom whose functions are
/// `range`, other entries zero: e.g. a localized lone-pair orbital restricted to its centre,
/// the lone pair's atomic orbital for [`hold_non_bonding`] (which normalizes it).
pub fn restrict_to_atom(orbital: &DVector<f64>, range: Range<usize>) -> DVector<f64> {
    DVector::from_fn(orbital.len(), |mu, _| {
        if range.contains(&mu) {
            orbital[mu]
        } else {
            0.0
        }
    })
}

/// Both sides of the switch for an extended Hückel result.
pub fn compare_mixing(
    eht: &EhtResult,
    lone_pairs: &[DVector<f64>],
) -> Result<MixingComparison, MixingError> {
    let off = hold_non_bonding(
        &eht.hamiltonian,
        &eht.overlap,
        &eht.basis.atom_ranges,
        lone_pairs,
        eht.electrons,
    )?;
    let on = Solution {
        energies: eht.energies.clone(),
        coefficients: eht.coefficients.clone(),
        occupations: eht.occupations.clone(),
        open_shell: eht.open_shell,
        electrons: eht.electrons,
        smallest_overlap_eigenvalue: eht.smallest_overlap_eigenvalue,
    };
    let overlaps =
        (off.solution.coefficients.transpose() * &eht.overlap * &on.coefficients).map(|x| x.abs());
    let off_to_on = match_levels(&overlaps);
    let pair_overlaps = off_to_on
        .iter()
        .enumerate()
        .map(|(j, &k)| overlaps[(j, k)])
        .collect();
    let shifts = off_to_on
        .iter()
        .enumerate()
        .map(|(j, &k)| on.energies[k] - off.solution.energies[j])
        .collect();
    Ok(MixingComparison {
        on,
        off,
        off_to_on,
        pair_overlaps,
        shifts,
    })
}

/// Pairs rows with columns of a square matrix of overlaps |⟨a_i|b_j⟩| so that the total
/// squared overlap is largest (Hungarian method, O(n³)). Returns the column of each row.
/// A non-square matrix pairs the first min(rows, cols) rows; unpaired rows get `usize::MAX`.
pub fn match_levels(overlaps: &DMatrix<f64>) -> Vec<usize> {
    let (rows, cols) = (overlaps.nrows(), overlaps.ncols());
    let n = rows.max(cols);
    if n == 0 {
        return Vec::new();
    }
    // Cost: −|o|², padded with zeros.
    let cost = |i: usize, j: usize| -> f64 {
        if i < rows && j < cols {
            let o = overlaps[(i, j)];
            if o.is_finite() { -o * o } else { 0.0 }
        } else {
            0.0
        }
    };
    let mut state = Hungarian::new(n);
    for i in 1..=n {
        state.augment(i, &cost);
    }
    let mut assignment = vec![usize::MAX; rows];
    for (j, &i) in state.p.iter().enumerate().skip(1) {
        if i >= 1 && i <= rows && j <= cols {
            assignment[i - 1] = j - 1;
        }
    }
    assignment
}

/// The shortest augmenting path form of the Kuhn–Munkres algorithm with 1-based
/// potentials u, v; p[j] is the row assigned to column j.
struct Hungarian {
    n: usize,
    u: Vec<f64>,
    v: Vec<f64>,
    p: Vec<usize>,
    way: Vec<usize>,
}

impl Hungarian {
    fn new(n: usize) -> Self {
        Hungarian {
            n,
            u: vec![0.0; n + 1],
            v: vec![0.0; n + 1],
            p: vec![0; n + 1],
            way: vec![0; n + 1],
        }
    }

    /// Adds row i to the assignment along a shortest augmenting path.
    fn augment(&mut self, i: usize, cost: &dyn Fn(usize, usize) -> f64) {
        let n = self.n;
        self.p[0] = i;
        let mut j0 = 0;
        let mut minv = vec![f64::INFINITY; n + 1];
        let mut used = vec![false; n + 1];
        loop {
            used[j0] = true;
            let i0 = self.p[j0];
            let (mut delta, mut j1) = (f64::INFINITY, 0);
            for j in (1..=n).filter(|&j| !used[j]) {
                let cur = cost(i0 - 1, j - 1) - self.u[i0] - self.v[j];
                if cur < minv[j] {
                    minv[j] = cur;
                    self.way[j] = j0;
                }
                if minv[j] < delta {
                    delta = minv[j];
                    j1 = j;
                }
            }
            if j1 == 0 {
                break;
            }
            for j in 0..=n {
                if used[j] {
                    self.u[self.p[j]] += delta;
                    self.v[j] -= delta;
                } else {
                    minv[j] -= delta;
                }
            }
            j0 = j1;
            if self.p[j0] == 0 {
                break;
            }
        }
        loop {
            let j1 = self.way[j0];
            self.p[j0] = self.p[j1];
            j0 = j1;
            if j0 == 0 {
                break;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hungarian_beats_greedy() {
        // Greedy would take (0,0)=0.9 then (1,1)=0.1: total 0.82; optimum (0,1),(1,0).
        let o = DMatrix::from_row_slice(2, 2, &[0.9, 0.8, 0.85, 0.1]);
        assert_eq!(match_levels(&o), vec![1, 0]);
        let id = DMatrix::<f64>::identity(4, 4);
        assert_eq!(match_levels(&id), vec![0, 1, 2, 3]);
        assert!(match_levels(&DMatrix::zeros(0, 0)).is_empty());
    }
}
