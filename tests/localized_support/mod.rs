//! Shared loaders for the localized-picture tests: the molecule files of the repository
//! (demo molecules, the hard-molecule set, the RDKit reference geometries) and the
//! pymatgen point-group set's geometries.
#![allow(dead_code)]

use std::path::{Path, PathBuf};

use diptych::analysis::{Analysis, Settings};
use diptych::chem::{Atom, Element, Molecule};
use serde_json::Value;

pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Every `.xyz` file of a folder, sorted.
pub fn xyz_files(folder: &str) -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join(folder))
        .unwrap_or_else(|e| panic!("{folder}: {e}"))
        .map(|entry| entry.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "xyz"))
        .collect();
    files.sort();
    files
}

pub fn load(path: &Path) -> Molecule {
    diptych::project::open_path(path)
        .unwrap_or_else(|e| panic!("{}: {e}", path.display()))
        .project
        .molecule
}

/// A file of `tests/hard_molecules/` by name.
pub fn hard(name: &str) -> Molecule {
    load(
        &root()
            .join("tests/hard_molecules")
            .join(format!("{name}.xyz")),
    )
}

/// A file of `demo_molecules/` by name.
pub fn demo(name: &str) -> Molecule {
    load(&root().join("demo_molecules").join(format!("{name}.xyz")))
}

pub fn analyse(molecule: &Molecule) -> Analysis {
    Analysis::run(molecule, &Settings::default())
        .unwrap_or_else(|e| panic!("{}: {e}", molecule.name))
}

/// The ideal geometries of the pymatgen point-group fixture (textbook shapes, typical
/// bond lengths from memory).
pub fn pymatgen_molecules() -> Vec<Molecule> {
    let text = std::fs::read_to_string(root().join("tests/reference/pymatgen_point_groups.json"))
        .expect("pymatgen fixture");
    let value: Value = serde_json::from_str(&text).expect("pymatgen fixture is JSON");
    value["molecules"]
        .as_array()
        .expect("molecules")
        .iter()
        .map(|entry| {
            let atoms = atoms_from_json(&entry["symbols"], &entry["ideal"]);
            Molecule::new(entry["name"].as_str().unwrap(), atoms, 0)
        })
        .collect()
}

/// Atoms from a JSON list of element symbols and one of [x, y, z] positions (Å).
fn atoms_from_json(symbols: &Value, coordinates: &Value) -> Vec<Atom> {
    let symbols = symbols.as_array().expect("symbols");
    let coordinates = coordinates.as_array().expect("coordinates");
    symbols
        .iter()
        .zip(coordinates)
        .map(|(s, c)| {
            let c: Vec<f64> = c
                .as_array()
                .expect("x, y, z")
                .iter()
                .map(|x| x.as_f64().unwrap())
                .collect();
            Atom::new(
                Element::from_symbol(s.as_str().unwrap()).unwrap(),
                [c[0], c[1], c[2]],
            )
        })
        .collect()
}

/// Atom indices of an element.
pub fn atoms_of(molecule: &Molecule, symbol: &str) -> Vec<usize> {
    (0..molecule.atoms.len())
        .filter(|&a| molecule.atoms[a].element.symbol() == symbol)
        .collect()
}

/// One molecule of tests/reference/pyscf_localized.json (STO-3G RHF from PySCF).
pub struct PyscfMolecule {
    pub molecule: Molecule,
    pub layout: diptych::localized::AtomLayout,
    pub overlap: nalgebra::DMatrix<f64>,
    pub entry: Value,
}

pub fn pyscf_fixture() -> Value {
    let text = std::fs::read_to_string(root().join("tests/reference/pyscf_localized.json"))
        .expect("pyscf_localized.json (made by tests/reference/pyscf_localized_reference.py)");
    serde_json::from_str(&text).expect("fixture is JSON")
}

/// A JSON array of arrays as a matrix (rows as listed).
pub fn matrix(value: &Value) -> nalgebra::DMatrix<f64> {
    let rows: Vec<Vec<f64>> = value
        .as_array()
        .expect("rows")
        .iter()
        .map(|row| {
            row.as_array()
                .expect("row")
                .iter()
                .map(|x| x.as_f64().unwrap())
                .collect()
        })
        .collect();
    let (r, c) = (rows.len(), rows.first().map_or(0, Vec::len));
    nalgebra::DMatrix::from_fn(r, c, |i, j| rows[i][j])
}

/// The molecule `name` of a section ("pm_lowdin" or "ibo") with its AO layout (kinds from
/// PySCF's AO labels, e.g. "0 O 2px").
pub fn pyscf_molecule(fixture: &Value, section: &str, name: &str) -> PyscfMolecule {
    use diptych::chem::ao::AngularKind;
    let entry = fixture[section]["molecules"][name].clone();
    let atoms = atoms_from_json(&entry["symbols"], &entry["geometry_angstrom"]);
    let kinds = entry["ao_labels"]
        .as_array()
        .unwrap()
        .iter()
        .map(|label| {
            let label = label.as_str().unwrap().trim();
            let orbital = label.split_whitespace().nth(2).unwrap();
            match orbital.trim_start_matches(char::is_numeric) {
                "s" => AngularKind::S,
                "px" => AngularKind::Px,
                "py" => AngularKind::Py,
                "pz" => AngularKind::Pz,
                other => panic!("unexpected AO {other}"),
            }
        })
        .collect();
    let atom_of_ao: Vec<usize> = entry["atom_of_ao"]
        .as_array()
        .unwrap()
        .iter()
        .map(|a| a.as_u64().unwrap() as usize)
        .collect();
    PyscfMolecule {
        molecule: Molecule::new(name, atoms, 0),
        layout: diptych::localized::AtomLayout::from_atom_map(&atom_of_ao, kinds).unwrap(),
        overlap: matrix(&entry["overlap"]),
        entry,
    }
}
