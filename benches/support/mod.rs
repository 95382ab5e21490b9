//! Shared by the benchmarks: the fixed geometries of tests/reference/rdkit_geometries/
//! (the same files the RDKit reference fixture was made from).

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;

/// The reference geometry `name` (e.g. "benzene", "c60").
pub fn reference_molecule(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("benchmark geometry");
    parse_xyz(&text, name).expect("valid XYZ").molecule
}
