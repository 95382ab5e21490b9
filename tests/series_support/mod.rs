//! Shared by the series tests: the demo donors of DESIGN §7 and a few extra molecules.
#![allow(dead_code)]

use std::path::PathBuf;

use diptych::analysis::Settings;
use diptych::project::open_path;
use diptych::series::{DonorChoice, SeriesInput};

/// The eleven demo molecules of DESIGN §7 (the ligand-design group's set).
pub const DEMO_DONORS: [&str; 11] = [
    "ammonia",
    "phosphine",
    "nitrogen_trifluoride",
    "water",
    "methane",
    "boron_trifluoride",
    "formaldehyde",
    "ethylene",
    "hydrogen_cyanide",
    "cyclopropane",
    "chloromethane",
];

pub fn repository() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// A demo molecule's XYZ file as a series input with default settings.
pub fn demo_input(name: &str, donor: DonorChoice) -> SeriesInput {
    input_from(
        repository()
            .join("demo_molecules")
            .join(format!("{name}.xyz")),
        donor,
    )
}

/// Any molecule file as a series input with default settings.
pub fn input_from(path: PathBuf, donor: DonorChoice) -> SeriesInput {
    let opened = open_path(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    SeriesInput {
        molecule: opened.project.molecule,
        settings: Settings::default(),
        donor,
        label: None,
        measured: None,
    }
}

/// The eleven demo donors with automatic donors.
pub fn demo_inputs() -> Vec<SeriesInput> {
    DEMO_DONORS
        .iter()
        .map(|name| demo_input(name, DonorChoice::Auto))
        .collect()
}
