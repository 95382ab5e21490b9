//! The one pipeline (DESIGN §3): `Analysis::run(&Molecule, &Settings)` validates the
//! molecule and runs each stage in order. A stage that fails records its error and the
//! stages that do not depend on it still run, so results are partial, never
//! all-or-nothing.

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::molecule::{Molecule, MoleculeError};

/// Method options of the document. Every field has a default so that older project files
/// load; new options are added as new fields with `#[serde(default)]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    /// Lone-pair mixing switch (DESIGN §4.6): on = full solution.
    pub lone_pair_mixing: bool,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            lone_pair_mixing: true,
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

/// Everything computed for one molecule and one set of settings.
#[derive(Clone, Debug)]
pub struct Analysis {
    pub molecule: Molecule,
    pub settings: Settings,
    /// Σ valence electrons − charge.
    pub electrons: usize,
    pub formula: String,
    pub errors: Vec<StageError>,
}

impl Analysis {
    /// Runs every stage for `molecule` under `settings`.
    pub fn run(molecule: &Molecule, settings: &Settings) -> Result<Analysis, AnalysisError> {
        molecule.validate()?;
        let electrons = usize::try_from(molecule.electron_count()).unwrap_or(0);
        Ok(Analysis {
            molecule: molecule.clone(),
            settings: settings.clone(),
            electrons,
            formula: molecule.formula(),
            errors: Vec::new(),
        })
    }
}
