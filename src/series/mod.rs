//! A series of molecules compared side by side (DESIGN §4.10): one row per molecule with its
//! point group, electron count, frontier orbitals, donor lone pair (energy, %s, λ, angle to
//! the principal axis, the donor atom's Mulliken charge), Lewis share and measured first
//! ionization energy, plus least-squares lines of −ε against the measured energies
//! (Koopmans' theorem: T. Koopmans, Physica 1, 104 (1934); −ε of an occupied orbital
//! approximates a vertical ionization energy, with no relaxation or correlation).
//!
//! Everything chemical comes from `Analysis::run`; this module only reads its results
//! (`row.rs`), fits lines (`fit.rs`), looks up measured values (`measured.rs`) and writes
//! the series (`csv.rs`, `markdown.rs`, `svg.rs`, JSON through serde). Series files are in
//! `project.rs`.

pub mod choice;
pub mod csv;
pub mod fit;
pub mod markdown;
pub mod measured;
pub mod project;
pub mod row;
pub mod svg;
pub mod table;

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::analysis::{Analysis, Settings};
use crate::chem::molecule::Molecule;

pub use fit::{LineFit, OrderingPair};
pub use measured::{MeasuredIonization, bundled_ionization};
pub use row::{DonorLonePair, FrontierLevel, SeriesRow};

/// The most molecules one series holds (each is a full analysis; the table and the plots
/// stay readable well below this).
pub const MAX_MOLECULES: usize = 100;

/// Which lone pair of a molecule is its donor.
/// In series documents: `Auto`, `Highest`, `Atom(2)`, `RichestInS(0)`,
/// `RichestInSOnDonorAtom`.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
pub enum DonorChoice {
    /// The highest occupied lone pair on an atom with two or more bonded partners (the
    /// lone-pair switch's central atoms) when the molecule has one, else the highest
    /// occupied lone pair: NF3's donor is its nitrogen, whose lone pair extended Hückel
    /// puts below the fluorines' p lone pairs in the localized ladder.
    #[default]
    Auto,
    /// The highest occupied lone pair of the molecule's localized ladder.
    Highest,
    /// The highest occupied lone pair on this atom (0-based, file order).
    Atom(usize),
    /// The lone pair richest in s on this atom: the σ donor of an atom with two lone
    /// pairs (water's in-plane lone pair rather than its out-of-plane p lone pair).
    RichestInS(usize),
    /// On the atom of the `Auto` donor, the lone pair richest in s (the σ donor).
    RichestInSOnDonorAtom,
}

/// One molecule of a series, as it is analysed.
#[derive(Clone, Debug, PartialEq)]
pub struct SeriesInput {
    pub molecule: Molecule,
    pub settings: Settings,
    pub donor: DonorChoice,
    /// How the molecule is named in the table and on the plots; `None`: its formula as
    /// chemists write it (`Molecule::conventional_formula`).
    pub label: Option<String>,
    /// The molecule's own measured value (a project field); when `None` the bundled table
    /// is consulted.
    pub measured: Option<MeasuredIonization>,
}

/// The series could not be built.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SeriesError {
    #[error("a series needs at least one molecule")]
    Empty,
    #[error("a series holds at most {MAX_MOLECULES} molecules ({0} given)")]
    TooMany(usize),
    #[error("molecule {index} ('{name}'): {message}")]
    Molecule {
        index: usize,
        name: String,
        message: String,
    },
}

/// The compared series: rows in input order and the Koopmans fits.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Series {
    pub rows: Vec<SeriesRow>,
    /// −ε(HOMO) against the measured first ionization energy (rows with both).
    pub homo_fit: Option<LineFit>,
    /// −ε(donor lone pair) against the measured first ionization energy.
    pub lone_pair_fit: Option<LineFit>,
}

/// Analyses every molecule (`Analysis::run`) and reads one row from each.
pub fn compare(inputs: &[SeriesInput]) -> Result<Series, SeriesError> {
    check_size(inputs.len())?;
    let mut rows = Vec::with_capacity(inputs.len());
    for (index, input) in inputs.iter().enumerate() {
        let analysis = Analysis::run(&input.molecule, &input.settings).map_err(|error| {
            SeriesError::Molecule {
                index,
                name: input.molecule.name.clone(),
                message: error.to_string(),
            }
        })?;
        rows.push(row_of(&analysis, input));
    }
    Ok(from_rows(rows))
}

/// The row of one analysed molecule (the GUI analyses on its own thread and calls this).
pub fn row_of(analysis: &Analysis, input: &SeriesInput) -> SeriesRow {
    let measured = input
        .measured
        .clone()
        .or_else(|| bundled_ionization(&analysis.molecule));
    let mut row = row::read_row(analysis, &input.donor, measured);
    if let Some(label) = input.label.as_ref().filter(|l| !l.trim().is_empty()) {
        row.label = label.trim().to_string();
    }
    row
}

/// The series of finished rows, with its fits.
pub fn from_rows(rows: Vec<SeriesRow>) -> Series {
    let homo_fit = fit::fit_rows(&rows, |row| row.homo.as_ref().map(|h| -h.energy_ev));
    let lone_pair_fit = fit::fit_rows(&rows, |row| row.donor.as_ref().map(|d| -d.energy_ev));
    Series {
        rows,
        homo_fit,
        lone_pair_fit,
    }
}

/// Refuses an empty series and one over [`MAX_MOLECULES`].
pub fn check_size(count: usize) -> Result<(), SeriesError> {
    match count {
        0 => Err(SeriesError::Empty),
        n if n > MAX_MOLECULES => Err(SeriesError::TooMany(n)),
        _ => Ok(()),
    }
}

/// The series as pretty JSON (stable field names; atom indices 0-based).
pub fn to_json(series: &Series) -> String {
    // Every field is a plain number, string, option or list: serialising cannot fail, and
    // non-finite numbers become null.
    serde_json::to_string_pretty(series).unwrap_or_else(|_| "{}".into())
}
