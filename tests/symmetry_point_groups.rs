//! Point groups of textbook molecules against the fixture made by
//! tests/reference/pymatgen_point_groups.py: the textbook assignment (Cotton, *Chemical
//! Applications of Group Theory*, 3rd ed., ch. 3 examples; from memory) is required; where
//! pymatgen's `PointGroupAnalyzer` (PyPI `pymatgen`) disagrees, the test prints a note.

use diptych::chem::{Atom, Element, Molecule};
use diptych::symmetry::{SymmetrySettings, detect, symmetrize};
use serde_json::Value;

fn fixture() -> Value {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/pymatgen_point_groups.json"
    );
    let text = std::fs::read_to_string(path).expect("fixture present");
    serde_json::from_str(&text).expect("fixture is JSON")
}

fn molecule(name: &str, symbols: &[Value], coords: &[Value]) -> Molecule {
    let atoms = symbols
        .iter()
        .zip(coords)
        .map(|(s, c)| {
            let element = Element::from_symbol(s.as_str().unwrap()).unwrap();
            let c: Vec<f64> = c
                .as_array()
                .unwrap()
                .iter()
                .map(|x| x.as_f64().unwrap())
                .collect();
            Atom::new(element, [c[0], c[1], c[2]])
        })
        .collect();
    Molecule::new(name, atoms, 0)
}

fn pymatgen_text(ours: &str) -> String {
    ours.replace('∞', "*")
}

#[test]
fn textbook_point_groups_in_random_orientations() {
    let data = fixture();
    let molecules = data["molecules"].as_array().unwrap();
    assert!(molecules.len() >= 40, "at least 40 molecules");
    let settings = SymmetrySettings::default();
    let mut failures = Vec::new();
    let mut families = std::collections::BTreeSet::new();
    let mut checked = 0;
    for m in molecules {
        let name = m["name"].as_str().unwrap();
        let textbook = m["textbook"].as_str().unwrap();
        families.insert(textbook.to_string());
        let symbols = m["symbols"].as_array().unwrap();
        let mut geometries = vec![("ideal", m["ideal"].as_array().unwrap().clone(), None, None)];
        for v in m["variants"].as_array().unwrap() {
            geometries.push((
                "rotated+noise",
                v["coords"].as_array().unwrap().clone(),
                v["pymatgen"].as_str().map(String::from),
                v["pymatgen_tolerance_0.01"].as_str().map(String::from),
            ));
        }
        assert!(geometries.len() >= 3, "{name}: two random orientations");
        for (kind, coords, pmg, pmg_tight) in geometries {
            let mol = molecule(name, symbols, &coords);
            checked += 1;
            match detect(&mol, &settings) {
                Ok(sym) => {
                    let ours = sym.group.to_string();
                    if ours != textbook {
                        failures.push(format!("{name} ({kind}): got {ours}, textbook {textbook}"));
                    }
                    // The symmetrized geometry is close to the input and exactly symmetric.
                    let sym_mol = symmetrize(&mol, &sym);
                    for (a, b) in mol.atoms.iter().zip(&sym_mol.atoms) {
                        assert!((a.position - b.position).norm() <= settings.tolerance + 1e-12);
                    }
                    for op in &sym.operations {
                        for (i, &j) in op.permutation.iter().enumerate() {
                            let image =
                                op.matrix * (sym_mol.atoms[i].position - sym.origin) + sym.origin;
                            assert!(
                                (image - sym_mol.atoms[j].position).norm() < 1e-9,
                                "{name}: symmetrized geometry not exact"
                            );
                        }
                    }
                }
                Err(e) => failures.push(format!("{name} ({kind}): error {e}")),
            }
            for (which, p) in [("default", pmg), ("tolerance 0.01", pmg_tight)] {
                if let Some(p) = p
                    && p != pymatgen_text(textbook)
                {
                    println!("note: pymatgen ({which}) gives {p} for {name}; textbook {textbook}");
                }
            }
        }
    }
    for family in [
        "C1", "Cs", "Ci", "C2", "C3", "C2v", "C3v", "C4v", "C2h", "C3h", "D2", "D3", "D2h", "D3h",
        "D4h", "D6h", "D2d", "D3d", "D4d", "S4", "S6", "S8", "T", "Td", "Th", "O", "Oh", "I", "Ih",
        "C∞v", "D∞h",
    ] {
        assert!(families.contains(family), "family {family} covered");
    }
    assert!(
        failures.is_empty(),
        "{} of {checked} failed:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

fn lcg(seed: &mut u64) -> f64 {
    *seed = seed
        .wrapping_mul(6364136223846793005)
        .wrapping_add(1442695040888963407);
    (*seed >> 11) as f64 / (1u64 << 53) as f64 - 0.5
}

/// The same molecules with more noise and other tolerances: the textbook group while the
/// noise stays well inside the tolerance; with very large tolerances an answer (never an
/// error or a panic), possibly a different group with a note.
#[test]
fn tolerance_sweep() {
    let data = fixture();
    let mut seed = 99u64;
    for (tol, noise, exact) in [
        (0.001, 0.0, true),
        (0.01, 0.003, true),
        (0.05, 0.01, true),
        (0.1, 0.02, true),
        (0.3, 0.05, false),
        (0.5, 0.0, false),
    ] {
        let settings = SymmetrySettings {
            tolerance: tol,
            ..SymmetrySettings::default()
        };
        for m in data["molecules"].as_array().unwrap() {
            let name = m["name"].as_str().unwrap();
            let textbook = m["textbook"].as_str().unwrap();
            let symbols = m["symbols"].as_array().unwrap();
            let coords = m["variants"][0]["coords"].as_array().unwrap();
            let mut mol = molecule(name, symbols, coords);
            for a in &mut mol.atoms {
                for k in 0..3 {
                    a.position[k] += noise * lcg(&mut seed);
                }
            }
            let sym = detect(&mol, &settings).unwrap_or_else(|e| panic!("{name} at {tol} Å: {e}"));
            if exact {
                assert_eq!(
                    sym.group.to_string(),
                    textbook,
                    "{name} at {tol} Å, noise {noise}"
                );
            } else if sym.group.to_string() != textbook {
                println!("{name} at {tol} Å: {} ({:?})", sym.group, sym.notes);
            }
        }
    }
}
