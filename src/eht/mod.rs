//! Extended Hückel molecular orbitals (R. Hoffmann, J. Chem. Phys. 39, 1397 (1963)).
//!
//! The pipeline, each stage public so that callers can modify a matrix and re-solve
//! (e.g. hold a lone-pair orbital non-bonding by zeroing its rows of H and S):
//!
//! 1. [`build_basis`]: valence Slater orbitals from the parameter table ([`params`]);
//! 2. [`overlap_matrix`]: analytic STO overlaps (Mulliken, Rieke, Orloff and Orloff 1949);
//! 3. [`hamiltonian_matrix`]: H_ii = VSIP, H_ij = K S_ij (H_ii + H_jj)/2, weighted by
//!    default (Ammeter, Bürgi, Thibeault and Hoffmann 1978);
//! 4. [`solve()`]: HC = SCE by Löwdin orthogonalization, aufbau occupations;
//! 5. [`mulliken`]: Mulliken populations, charges and overlap populations.
//!
//! [`run`] does all five for a molecule. Energies are in eV, distances in the molecule in
//! Å (converted to bohr with [`BOHR_IN_ANGSTROM`]).

pub mod basis;
pub mod hamiltonian;
pub mod overlap;
pub mod params;
pub mod population;
pub mod solve;

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::element::Element;
use crate::chem::molecule::Molecule;

pub use basis::{Basis, BasisShell, build_basis};
pub use hamiltonian::{DEFAULT_K, effective_k, hamiltonian_matrix};
pub use overlap::{BOHR_IN_ANGSTROM, overlap_matrix};
pub use params::{ElementParameters, ParameterSet, ShellParameters};
pub use population::{Populations, mulliken};
pub use solve::{
    DEGENERACY_TOLERANCE_EV, Ionization, OrthonormalForm, SINGULAR_OVERLAP_THRESHOLD, Solution,
    aufbau, density_matrix, koopmans, solve, solve_orthonormal,
};

/// Everything that can go wrong in an extended Hückel calculation.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum EhtError {
    #[error("no extended Hückel parameters for {element}")]
    MissingParameters { element: Element },
    #[error("the extended Hückel parameter file {origin} is damaged: {message}")]
    ParameterFile { origin: String, message: String },
    #[error("invalid extended Hückel parameters for {element}: {message}")]
    InvalidParameters { element: Element, message: String },
    #[error("the molecule has no atoms")]
    EmptyMolecule,
    #[error("atom {atom} has a non-finite coordinate")]
    NonFiniteCoordinate { atom: usize },
    #[error("K = {k} is not a usable Hückel constant (it must be finite and positive)")]
    InvalidK { k: f64 },
    #[error("{electrons} valence electrons: at least one is needed")]
    NoElectrons { electrons: i64 },
    #[error("{electrons} valence electrons do not fit into {capacity} spin orbitals")]
    TooManyElectrons { electrons: usize, capacity: usize },
    #[error(
        "the overlap matrix is nearly singular (smallest eigenvalue {smallest_eigenvalue:.3e} < {threshold:e}){}",
        closest_atoms.map(|(a, b, d)| format!(": atoms {a} and {b} are only {d:.4} Å apart")).unwrap_or_default(),
        threshold = SINGULAR_OVERLAP_THRESHOLD
    )]
    SingularOverlap {
        smallest_eigenvalue: f64,
        /// The closest pair of atoms and their distance in Å, when known.
        closest_atoms: Option<(usize, usize, f64)>,
    },
    #[error("H is {h:?} and S is {s:?}: they must be square, non-empty and of the same size")]
    DimensionMismatch {
        h: (usize, usize),
        s: (usize, usize),
    },
    #[error("H or S contains a non-finite number")]
    NonFiniteMatrix,
    #[error("the eigensolver did not converge for {matrix}")]
    EigenFailure { matrix: &'static str },
}

/// User settings of the extended Hückel stage.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct EhtSettings {
    /// Hückel constant K (default 1.75).
    pub k: f64,
    /// Weighted H_ij formula (Ammeter et al. 1978); false gives the plain Wolfsberg–Helmholz
    /// form with constant K.
    pub weighted: bool,
    /// Per-element parameter rows that replace the built-in ones.
    pub overrides: Vec<ElementParameters>,
}

impl Default for EhtSettings {
    fn default() -> Self {
        EhtSettings {
            k: DEFAULT_K,
            weighted: true,
            overrides: Vec::new(),
        }
    }
}

/// The full result of [`run`].
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct EhtResult {
    pub basis: Basis,
    /// Overlap matrix S.
    pub overlap: DMatrix<f64>,
    /// Hamiltonian H (eV).
    pub hamiltonian: DMatrix<f64>,
    /// Valence electron count (Σ valence electrons − charge).
    pub electrons: usize,
    /// Orbital energies (eV), ascending.
    pub energies: Vec<f64>,
    /// MO coefficients; column k is orbital k.
    pub coefficients: DMatrix<f64>,
    /// Occupation of each orbital.
    pub occupations: Vec<f64>,
    /// A level is partly filled.
    pub open_shell: bool,
    /// Mulliken populations, charges and overlap populations.
    pub populations: Populations,
    /// Σ occupation × orbital energy (eV).
    pub sum_occupied_energy: f64,
    /// Smallest eigenvalue of S.
    pub smallest_overlap_eigenvalue: f64,
    /// S^(−½), H̃ and C̃ of Löwdin's orthonormal basis (the localized picture's basis).
    pub orthonormal: OrthonormalForm,
}

impl EhtResult {
    /// Koopmans ionization energies of the occupied orbitals, HOMO first.
    pub fn koopmans_ionization_energies(&self) -> Vec<Ionization> {
        solve::koopmans(&self.energies, &self.occupations)
    }

    /// Index of the highest occupied orbital.
    pub fn homo(&self) -> Option<usize> {
        self.occupations.iter().rposition(|&occ| occ > 0.0)
    }

    /// Index of the lowest orbital that is not full.
    pub fn lumo(&self) -> Option<usize> {
        self.occupations.iter().position(|&occ| occ < 2.0)
    }

    /// Mulliken charges (e), one per atom.
    pub fn charges(&self) -> &[f64] {
        &self.populations.charges
    }
}

/// Runs the extended Hückel calculation with the built-in parameters (plus the overrides in
/// `settings`).
///
/// It checks what it needs itself (atoms present, finite coordinates, parameters, electron
/// count, a non-singular S) but does not apply `Molecule::validate`'s policy limits (e.g.
/// the 0.5 Å minimum separation); the analysis pipeline does that.
pub fn run(molecule: &Molecule, settings: &EhtSettings) -> Result<EhtResult, EhtError> {
    run_with_parameters(molecule, settings, ParameterSet::builtin()?)
}

/// Runs the calculation with a given parameter table (plus the overrides in `settings`).
pub fn run_with_parameters(
    molecule: &Molecule,
    settings: &EhtSettings,
    parameters: &ParameterSet,
) -> Result<EhtResult, EhtError> {
    if molecule.atoms.is_empty() {
        return Err(EhtError::EmptyMolecule);
    }
    if !(settings.k.is_finite() && settings.k > 0.0) {
        return Err(EhtError::InvalidK { k: settings.k });
    }
    let basis = build_basis(molecule, parameters, &settings.overrides)?;
    let electrons = molecule.electron_count();
    if electrons <= 0 {
        return Err(EhtError::NoElectrons { electrons });
    }
    let electrons = electrons as usize;
    let overlap = overlap_matrix(&basis);
    let hamiltonian = hamiltonian_matrix(&basis, &overlap, settings.k, settings.weighted);
    let (solution, orthonormal) = match solve_orthonormal(&hamiltonian, &overlap, electrons) {
        Err(EhtError::SingularOverlap {
            smallest_eigenvalue,
            ..
        }) => {
            return Err(EhtError::SingularOverlap {
                smallest_eigenvalue,
                closest_atoms: closest_pair(molecule),
            });
        }
        other => other?,
    };
    let valence: Vec<f64> = molecule
        .atoms
        .iter()
        .map(|atom| atom.element.valence_electrons() as f64)
        .collect();
    let populations = mulliken(
        &basis,
        &overlap,
        &solution.coefficients,
        &solution.occupations,
        &valence,
    );
    let sum_occupied_energy = solution.sum_occupied_energy();
    Ok(EhtResult {
        basis,
        overlap,
        hamiltonian,
        electrons,
        energies: solution.energies,
        coefficients: solution.coefficients,
        occupations: solution.occupations,
        open_shell: solution.open_shell,
        populations,
        sum_occupied_energy,
        smallest_overlap_eigenvalue: solution.smallest_overlap_eigenvalue,
        orthonormal,
    })
}

/// The closest pair of atoms (indices and distance in Å).
fn closest_pair(molecule: &Molecule) -> Option<(usize, usize, f64)> {
    let mut best: Option<(usize, usize, f64)> = None;
    for a in 0..molecule.atoms.len() {
        for b in a + 1..molecule.atoms.len() {
            let d = (molecule.atoms[a].position - molecule.atoms[b].position).norm();
            if best.is_none_or(|(_, _, current)| d < current) {
                best = Some((a, b, d));
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn builtin_parameters_parse() {
        let set = ParameterSet::builtin().expect("the embedded parameter file parses");
        for symbol in [
            "H", "B", "C", "N", "O", "F", "Si", "P", "S", "Cl", "Br", "K", "Ga",
        ] {
            let element = Element::from_symbol(symbol).unwrap();
            let row = set.get(element).expect(symbol);
            assert!(!row.source.is_empty());
            assert!(row.source.contains("YAeHMOP"));
        }
    }
}
