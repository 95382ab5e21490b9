//! Inputs mean what the chemist meant (issue 18, item 1): a 2D molfile is refused with a
//! message asking for 3D coordinates; H₂ at 0.741 Å is bonded; a molfile's aromatic bonds
//! stay aromatic (with one Kekulé structure as their orders) through reading, projects and
//! reports; and an export, report, map or scan with nothing to draw exits 2 and writes no
//! file. Inputs are in `tests/meaning_inputs/`.

use std::path::{Path, PathBuf};

use diptych::chem::io::read_molecule_file;
use diptych::chem::{Atom, Element, Molecule};
use diptych::project::Project;

mod cli_support;
use cli_support::diptych;

fn input(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/meaning_inputs")
        .join(name)
}

#[test]
fn a_2d_molfile_is_refused_asking_for_3d_coordinates() {
    let error = read_molecule_file(&input("methane_2d.mol"))
        .expect_err("refused")
        .to_string();
    assert!(error.starts_with("line 2:"), "{error}");
    assert!(error.contains("needs 3D coordinates"), "{error}");
    let output = diptych(&["analyze", &input("methane_2d.mol").to_string_lossy()]);
    assert_eq!(output.status.code(), Some(2));
}

#[test]
fn hydrogen_molecule_is_bonded_at_its_real_length() {
    let parsed = read_molecule_file(&input("hydrogen.xyz")).expect("reads");
    assert_eq!(parsed.molecule.bonds.len(), 1, "H–H at 0.741 Å is a bond");
    // H₃⁺ (0.87 Å sides) is bonded too; methane's hydrogens (1.78 Å apart) are not.
    let side = 0.87;
    let h3 = Molecule::new(
        "H3+",
        vec![
            Atom::new(Element::H, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [side, 0.0, 0.0]),
            Atom::new(Element::H, [side / 2.0, side * 0.75f64.sqrt(), 0.0]),
        ],
        1,
    );
    assert_eq!(h3.bonds.len(), 3);
    let methane = read_molecule_file(
        &Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/methane.xyz"),
    )
    .expect("reads")
    .molecule;
    assert_eq!(methane.bonds.len(), 4, "no H–H bonds in methane");
}

#[test]
fn aromatic_bonds_stay_aromatic_with_one_kekule_structure() -> Result<(), Box<dyn std::error::Error>>
{
    let molecule = read_molecule_file(&input("benzene_aromatic.mol"))?.molecule;
    let ring: Vec<_> = molecule.bonds.iter().filter(|b| b.aromatic).collect();
    assert_eq!(ring.len(), 6, "the six ring bonds keep their aromatic flag");
    assert_eq!(ring.iter().filter(|b| b.order == 2).count(), 3, "Kekulé");
    for carbon in 0..6 {
        let doubles = ring
            .iter()
            .filter(|b| b.order == 2 && b.other(carbon).is_some())
            .count();
        assert_eq!(doubles, 1, "carbon {carbon} has one double bond");
    }
    assert!(
        molecule
            .bonds
            .iter()
            .filter(|b| !b.aromatic)
            .all(|b| b.order == 1)
    );
    // Through a project file and the JSON report.
    let project = Project::new(molecule);
    let again = Project::from_ron(&project.to_ron()?)?;
    assert_eq!(again.molecule.bonds, project.molecule.bonds);
    let output = diptych(&[
        "analyze",
        &input("benzene_aromatic.mol").to_string_lossy(),
        "--format",
        "json",
    ]);
    assert!(output.status.success());
    let json: serde_json::Value = serde_json::from_slice(&output.stdout)?;
    let aromatic = json["molecule"]["bonds"].as_array().map_or(0, |bonds| {
        bonds.iter().filter(|b| b["aromatic"] == true).count()
    });
    assert_eq!(aromatic, 6);
    Ok(())
}

#[test]
fn nothing_to_draw_exits_2_and_writes_no_file() {
    let folder = tempfile::tempdir().expect("temp");
    let argon = input("argon_hydride.xyz");
    let argon = argon.to_string_lossy();
    let water = "demo_molecules/water.xyz";
    let path = |name: &str| folder.path().join(name).to_string_lossy().into_owned();
    let (svg, md, csv, map) = (path("a.svg"), path("a.md"), path("a.csv"), path("m.svg"));
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (
            vec!["export", &argon, "-o", &svg],
            "no extended Hückel parameters for Ar",
        ),
        (vec!["report", &argon, "-o", &md], "no molecular orbitals"),
        (
            vec!["map", &argon, "--orbital", "HOMO", "-o", &map],
            "no molecular orbitals",
        ),
        (
            vec!["export", water, "--charge", "-50", "-o", &svg],
            "do not fit into 12 spin orbitals",
        ),
        (
            vec![
                "scan",
                water,
                "--charge",
                "-50",
                "--symmetric-bend",
                "0",
                "--from",
                "100",
                "--to",
                "110",
                "--steps",
                "3",
                "-o",
                &csv,
            ],
            "all 3 points of the scan failed",
        ),
    ];
    for (args, message) in cases {
        let output = diptych(&args);
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(output.status.code(), Some(2), "{args:?}: {stderr}");
        assert!(
            stderr.contains(message),
            "expected '{message}' in '{stderr}'"
        );
        let last = stderr.trim().lines().last().unwrap_or_default();
        assert!(last.contains("no file was written"), "{last}");
    }
    assert_eq!(
        std::fs::read_dir(folder.path()).map(|d| d.count()).ok(),
        Some(0)
    );
}
