//! Range checks of a project read from a file, run before anything uses it: every number
//! of the settings and view finite and inside the range the window offers, every text
//! within the name limit, the molecule valid (atoms, bonds, indices). Each refusal names
//! the setting by its path in the file and says the range (common practice, no source).

use crate::chem::molecule::MAX_NAME_CHARACTERS;
use crate::localized::held::HeldLonePairs;
use crate::symmetry::MAX_TOLERANCE;

use super::{Project, ProjectError};

/// Range of the Hückel constant K the settings window offers.
pub const K_RANGE: (f64, f64) = (1.0, 3.0);
/// Most Jacobi sweeps of one localization space a project may ask for.
pub const MAX_SWEEPS: usize = 10_000;

/// The first value of `project` that is out of range, if any.
pub(super) fn check(project: &Project) -> Result<(), ProjectError> {
    project
        .molecule
        .validate()
        .map_err(|error| ProjectError::InvalidMolecule(error.to_string()))?;
    check_texts(project)?;
    check_numbers(project)?;
    check_held_lone_pairs(project)?;
    check_overrides(project)?;
    check_ionization(project)
}

/// The measured ionization energies (series comparison): finite, in range, with a source.
fn check_ionization(project: &Project) -> Result<(), ProjectError> {
    match &project.ionization {
        Some(record) => record
            .check()
            .map_err(|error| ProjectError::OutOfRange(format!("ionization: {error}"))),
        None => Ok(()),
    }
}

/// Most lone pairs one atom can carry (an octet), so lone-pair indices are 0 to 3.
const MAX_LONE_PAIRS_PER_ATOM: usize = 4;

/// Atom indices of the held lone pairs name atoms of the molecule.
fn check_held_lone_pairs(project: &Project) -> Result<(), ProjectError> {
    let count = project.molecule.len();
    let last = count.saturating_sub(1);
    let field = "settings.held_lone_pairs";
    let (atoms, indices): (Vec<usize>, Vec<usize>) = match &project.settings.held_lone_pairs {
        HeldLonePairs::Atoms(atoms) => (atoms.clone(), Vec::new()),
        HeldLonePairs::Chosen(pairs) => pairs.iter().map(|p| (p.atom, p.index)).unzip(),
        HeldLonePairs::Central | HeldLonePairs::All => return Ok(()),
    };
    if let Some(atom) = atoms.iter().find(|&&atom| atom >= count) {
        let range = format!("an atom index 0 to {last}");
        return Err(out_of_range(
            &format!("{field} names atom {atom}, which"),
            "not in the molecule",
            &range,
        ));
    }
    if let Some(index) = indices.iter().find(|&&i| i >= MAX_LONE_PAIRS_PER_ATOM) {
        let range = format!("0 to {}", MAX_LONE_PAIRS_PER_ATOM - 1);
        return Err(out_of_range(
            &format!("a lone-pair index in {field}"),
            index,
            &range,
        ));
    }
    Ok(())
}

fn out_of_range(field: &str, value: impl std::fmt::Display, range: &str) -> ProjectError {
    ProjectError::OutOfRange(format!("{field} is {value}; it must be {range}"))
}

fn check_texts(project: &Project) -> Result<(), ProjectError> {
    let texts = [
        ("titles.delocalized", Some(&project.titles.delocalized)),
        ("titles.localized", Some(&project.titles.localized)),
        ("selected_orbital", project.selected_orbital.as_ref()),
    ];
    for (field, text) in texts {
        let count = text.map_or(0, |text| text.chars().count());
        if count > MAX_NAME_CHARACTERS {
            return Err(ProjectError::OutOfRange(format!(
                "{field} has {count} characters; the limit is {MAX_NAME_CHARACTERS}"
            )));
        }
    }
    Ok(())
}

fn check_numbers(project: &Project) -> Result<(), ProjectError> {
    let threshold = project.view.link_threshold;
    if !(threshold.is_finite() && (0.0..=1.0).contains(&threshold)) {
        return Err(out_of_range("view.link_threshold", threshold, "0 to 1"));
    }
    let settings = &project.settings;
    let tolerance = settings.symmetry.tolerance;
    if !(tolerance.is_finite() && tolerance > 0.0 && tolerance <= MAX_TOLERANCE) {
        let range = format!("more than 0 and at most {MAX_TOLERANCE} Å");
        return Err(out_of_range(
            "settings.symmetry.tolerance",
            tolerance,
            &range,
        ));
    }
    let k = settings.eht.k;
    if !(k.is_finite() && (K_RANGE.0..=K_RANGE.1).contains(&k)) {
        let range = format!("{} to {}", K_RANGE.0, K_RANGE.1);
        return Err(out_of_range("settings.eht.k", k, &range));
    }
    let sweeps = settings.localization.max_sweeps;
    if !(1..=MAX_SWEEPS).contains(&sweeps) {
        let range = format!("1 to {MAX_SWEEPS}");
        return Err(out_of_range(
            "settings.localization.max_sweeps",
            sweeps,
            &range,
        ));
    }
    Ok(())
}

fn check_overrides(project: &Project) -> Result<(), ProjectError> {
    let overrides = &project.settings.eht.overrides;
    for (index, row) in overrides.iter().enumerate() {
        row.validate().map_err(|error| {
            ProjectError::OutOfRange(format!("settings.eht.overrides: {error}"))
        })?;
        if overrides[..index].iter().any(|o| o.element == row.element) {
            return Err(ProjectError::OutOfRange(format!(
                "settings.eht.overrides has two rows for {}",
                row.element.symbol()
            )));
        }
    }
    Ok(())
}
