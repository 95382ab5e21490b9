//! The one pipeline (DESIGN §3): `Analysis::run(&Molecule, &Settings)` validates the
//! molecule and runs each stage in order. A stage that fails records its error and the
//! stages that do not depend on it still run, so results are partial, never
//! all-or-nothing.

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::molecule::{Molecule, MoleculeError};
use crate::eht::{self, EhtResult, EhtSettings};

/// Method options of the document. Every field has a default so that older project files
/// load; new options are added as new fields with `#[serde(default)]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    /// Lone-pair mixing switch (DESIGN §4.6): on = full solution.
    pub lone_pair_mixing: bool,
    /// Extended Hückel options (K, weighting, parameter overrides).
    pub eht: EhtSettings,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            lone_pair_mixing: true,
            eht: EhtSettings::default(),
        }
    }
}

/// The molecule cannot be analysed at all.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum AnalysisError {
    #[error("invalid molecule: {0}")]
    InvalidMolecule(#[from] MoleculeError),
}

/// The pipeline stages, in order.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Stage {
    Symmetry,
    Orbitals,
    Hybrids,
    Localization,
    Links,
}

/// A stage that failed, with a message for the user.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StageError {
    pub stage: Stage,
    pub message: String,
}

/// One canonical molecular orbital as the reports and panels show it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OrbitalSummary {
    /// Index in the ascending list of orbitals.
    pub index: usize,
    pub energy_ev: f64,
    pub occupancy: f64,
    /// Irreducible representation (lower case, e.g. "a1"), when symmetry is known.
    pub irrep: Option<String>,
    /// Numbered label (e.g. "3a1"), when symmetry is known.
    pub label: Option<String>,
}

/// Everything computed for one molecule and one set of settings.
#[derive(Clone, Debug)]
pub struct Analysis {
    pub molecule: Molecule,
    pub settings: Settings,
    /// Σ valence electrons − charge.
    pub electrons: usize,
    pub formula: String,
    /// The extended Hückel solution, unless that stage failed.
    pub eht: Option<EhtResult>,
    /// The canonical MOs in ascending energy (empty if the MO stage failed).
    pub orbitals: Vec<OrbitalSummary>,
    pub errors: Vec<StageError>,
}

impl Analysis {
    /// Runs every stage for `molecule` under `settings`.
    pub fn run(molecule: &Molecule, settings: &Settings) -> Result<Analysis, AnalysisError> {
        molecule.validate()?;
        let electrons = usize::try_from(molecule.electron_count()).unwrap_or(0);
        let mut errors = Vec::new();
        let eht = match eht::run(molecule, &settings.eht) {
            Ok(result) => Some(result),
            Err(error) => {
                errors.push(StageError {
                    stage: Stage::Orbitals,
                    message: error.to_string(),
                });
                None
            }
        };
        let orbitals = eht.as_ref().map(orbital_summaries).unwrap_or_default();
        Ok(Analysis {
            molecule: molecule.clone(),
            settings: settings.clone(),
            electrons,
            formula: molecule.formula(),
            eht,
            orbitals,
            errors,
        })
    }
}

fn orbital_summaries(eht: &EhtResult) -> Vec<OrbitalSummary> {
    eht.energies
        .iter()
        .zip(&eht.occupations)
        .enumerate()
        .map(|(index, (&energy_ev, &occupancy))| OrbitalSummary {
            index,
            energy_ev,
            occupancy,
            irrep: None,
            label: None,
        })
        .collect()
}
