//! Mulliken population analysis (R. S. Mulliken, J. Chem. Phys. 23, 1833 (1955)):
//! with the density matrix P = Σ_k n_k c_k c_kᵀ, the gross population of basis function μ is
//! q_μ = Σ_ν P_μν S_μν, the gross population of an atom is the sum over its functions, its
//! charge is (valence electrons − gross population), and the overlap population of atoms
//! A ≠ B is Σ_(μ∈A, ν∈B) 2 P_μν S_μν (a bond-order-like index; the diagonal holds the
//! net atomic populations Σ_(μ,ν∈A) P_μν S_μν).

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};

use super::basis::Basis;
use super::solve::density_matrix;

/// Mulliken populations of one solution.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Populations {
    /// Density matrix P (basis × basis).
    pub density: DMatrix<f64>,
    /// Gross population of each basis function.
    pub orbital_populations: Vec<f64>,
    /// Gross population of each atom.
    pub atom_populations: Vec<f64>,
    /// Mulliken charge of each atom (e).
    pub charges: Vec<f64>,
    /// Atom × atom overlap populations (off-diagonal: 2 Σ P S over the pair; diagonal: net
    /// population of the atom).
    pub overlap_populations: DMatrix<f64>,
}

impl Populations {
    /// The overlap population (bond index) between atoms `a` and `b`.
    pub fn bond_index(&self, a: usize, b: usize) -> f64 {
        self.overlap_populations[(a, b)]
    }
}

/// Mulliken analysis; `valence[atom]` is the electron count each neutral atom brings.
pub fn mulliken(
    basis: &Basis,
    s: &DMatrix<f64>,
    coefficients: &DMatrix<f64>,
    occupations: &[f64],
    valence: &[f64],
) -> Populations {
    let density = density_matrix(coefficients, occupations);
    let n = basis.len();
    let atoms = basis.atom_ranges.len();
    let mut orbital_populations = vec![0.0; n];
    let mut overlap_populations = DMatrix::zeros(atoms, atoms);
    for j in 0..n {
        let atom_j = basis.orbitals[j].atom;
        for i in 0..n {
            let ps = density[(i, j)] * s[(i, j)];
            orbital_populations[i] += ps;
            overlap_populations[(basis.orbitals[i].atom, atom_j)] += ps;
        }
    }
    // Off the diagonal, (i, j) and (j, i) each collected P S once: double to 2 Σ P S.
    for a in 0..atoms {
        for b in 0..atoms {
            if a != b {
                overlap_populations[(a, b)] *= 2.0;
            }
        }
    }
    let atom_populations: Vec<f64> = basis
        .atom_ranges
        .iter()
        .map(|range| orbital_populations[range.clone()].iter().sum())
        .collect();
    let charges = atom_populations
        .iter()
        .zip(valence)
        .map(|(population, valence)| valence - population)
        .collect();
    Populations {
        density,
        orbital_populations,
        atom_populations,
        charges,
        overlap_populations,
    }
}
