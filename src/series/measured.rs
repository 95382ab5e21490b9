//! Measured vertical ionization energies: the record a project keeps for its molecule
//! (values in eV with one source string) and the bundled table of the demo molecules
//! (`assets/ionization_energies.ron`, each row with its source; values recalled from
//! memory say so in their source).

use std::sync::OnceLock;

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::molecule::Molecule;

/// Largest plausible molecular ionization energy (eV): above the 24.6 eV of helium, the
/// highest first ionization energy of any neutral species, with room for inner valence
/// bands.
pub const MAX_IONIZATION_EV: f64 = 100.0;
/// Most values one record holds (the bands of a photoelectron spectrum).
pub const MAX_VALUES: usize = 50;
/// Longest source string (characters).
pub const MAX_SOURCE_CHARS: usize = 500;

/// A project's measured vertical ionization energies of its molecule.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct IonizationRecord {
    /// Vertical ionization energies (eV), first band first.
    pub vertical_ev: Vec<f64>,
    /// Where the values come from (a reference, a database entry, "from memory").
    pub source: String,
}

/// A record that cannot be used.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum RecordError {
    #[error("measured ionization energies must be finite and between 0 and {MAX_IONIZATION_EV} eV")]
    OutOfRange,
    #[error("at most {MAX_VALUES} measured ionization energies per molecule")]
    TooMany,
    #[error("measured ionization energies need a source (at most {MAX_SOURCE_CHARS} characters)")]
    Source,
}

impl IonizationRecord {
    /// Checks the values and the source.
    pub fn check(&self) -> Result<(), RecordError> {
        if self.vertical_ev.len() > MAX_VALUES {
            return Err(RecordError::TooMany);
        }
        if self
            .vertical_ev
            .iter()
            .any(|e| !(e.is_finite() && *e > 0.0 && *e <= MAX_IONIZATION_EV))
        {
            return Err(RecordError::OutOfRange);
        }
        let length = self.source.chars().count();
        if !self.vertical_ev.is_empty()
            && (self.source.trim().is_empty() || length > MAX_SOURCE_CHARS)
        {
            return Err(RecordError::Source);
        }
        Ok(())
    }

    /// The first (lowest) value with the source, when there is one.
    pub fn first(&self) -> Option<MeasuredIonization> {
        let lowest = self
            .vertical_ev
            .iter()
            .copied()
            .filter(|e| e.is_finite())
            .min_by(f64::total_cmp)?;
        Some(MeasuredIonization {
            energy_ev: lowest,
            source: self.source.clone(),
        })
    }
}

/// The first vertical ionization energy a series row is compared with.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct MeasuredIonization {
    pub energy_ev: f64,
    pub source: String,
}

/// One row of the bundled table.
#[derive(Clone, Debug, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BundledIonization {
    pub names: Vec<String>,
    pub energy_ev: f64,
    pub source: String,
}

const TABLE_TEXT: &str = include_str!("../../assets/ionization_energies.ron");

/// The bundled table (empty if it could not be read, which a test rules out).
pub fn bundled_table() -> &'static [BundledIonization] {
    static TABLE: OnceLock<Vec<BundledIonization>> = OnceLock::new();
    TABLE.get_or_init(|| ron::from_str(TABLE_TEXT).unwrap_or_default())
}

/// Names compare case-insensitively with "_" read as a space.
fn normalized(name: &str) -> String {
    name.trim().replace('_', " ").to_lowercase()
}

/// The bundled value for a molecule, found by its name.
pub fn bundled_ionization(molecule: &Molecule) -> Option<MeasuredIonization> {
    let wanted = normalized(&molecule.name);
    if molecule.charge != 0 {
        return None;
    }
    bundled_table()
        .iter()
        .find(|row| row.names.iter().any(|n| normalized(n) == wanted))
        .map(|row| MeasuredIonization {
            energy_ev: row.energy_ev,
            source: row.source.clone(),
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_bundled_table_reads_and_every_value_has_a_source() {
        let table = bundled_table();
        assert!(table.len() >= 15, "{} rows", table.len());
        for row in table {
            assert!(row.source.contains("from memory") || row.source.contains("WebBook"));
            assert!(row.energy_ev > 5.0 && row.energy_ev < 25.0, "{row:?}");
        }
    }

    #[test]
    fn records_are_checked() {
        let good = IonizationRecord {
            vertical_ev: vec![12.6, 14.7],
            source: "a paper".into(),
        };
        assert_eq!(good.check(), Ok(()));
        assert_eq!(good.first().map(|m| m.energy_ev), Some(12.6));
        let unsourced = IonizationRecord {
            source: " ".into(),
            ..good.clone()
        };
        assert_eq!(unsourced.check(), Err(RecordError::Source));
        let negative = IonizationRecord {
            vertical_ev: vec![-1.0],
            ..good
        };
        assert_eq!(negative.check(), Err(RecordError::OutOfRange));
    }
}
