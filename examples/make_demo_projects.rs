//! Writes `demo_molecules/*.diptych.ron` from the demo XYZ files with the demo group's
//! own column titles (DESIGN §7; invented
//! demo data). Run: `cargo run --release --example make_demo_projects`.

use std::path::Path;

use diptych::project::{Project, open_path};

/// (file stem, delocalized title, localized title)
const DEMO: &[(&str, &str, &str)] = &[
    (
        "ammonia",
        "NH3 canonical MOs",
        "NH3 donor pair and N–H bonds",
    ),
    (
        "phosphine",
        "PH3 canonical MOs",
        "PH3 donor pair and P–H bonds",
    ),
    (
        "nitrogen_trifluoride",
        "NF3 canonical MOs",
        "NF3 donor pair and N–F bonds",
    ),
    ("water", "H2O canonical MOs", "H2O lone pairs and O–H bonds"),
    ("methane", "CH4 canonical MOs", "CH4 C–H bonds"),
    (
        "boron_trifluoride",
        "BF3 canonical MOs",
        "BF3 acceptor and B–F bonds",
    ),
    (
        "formaldehyde",
        "H2CO canonical MOs",
        "H2CO oxygen donor pairs",
    ),
    ("ethylene", "C2H4 canonical MOs", "C2H4 σ frame and π donor"),
    (
        "hydrogen_cyanide",
        "HCN canonical MOs",
        "HCN nitrogen donor pair",
    ),
    ("cyclopropane", "C3H6 canonical MOs", "C3H6 bent C–C bonds"),
    (
        "chloromethane",
        "CH3Cl canonical MOs",
        "CH3Cl chlorine lone pairs",
    ),
    (
        "sulfur_hexafluoride",
        "SF6 canonical MOs",
        "SF6 seven-centre bonds and F lone pairs",
    ),
    (
        "diborane",
        "B2H6 canonical MOs",
        "B2H6 terminal and B–H–B bridge bonds",
    ),
    (
        "dioxygen",
        "O2 canonical MOs",
        "O2 σ, π and singly filled π*",
    ),
    (
        "carbon_monoxide",
        "CO canonical MOs",
        "CO triple bond and lone pairs",
    ),
];

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let folder = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules");
    for (stem, delocalized, localized) in DEMO {
        // Bond orders come from the XYZ reader's valence-based perception.
        let opened = open_path(&folder.join(format!("{stem}.xyz")))?;
        let mut project: Project = opened.project;
        project.titles.delocalized = (*delocalized).into();
        project.titles.localized = (*localized).into();
        project.save(&folder.join(format!("{stem}.diptych.ron")))?;
    }
    Ok(())
}
