//! One row of a series, read from a finished `Analysis` (no chemistry is computed here):
//! frontier orbitals from the canonical MOs, lone pairs from the localized ladder
//! (`LocalizedKind::LonePair`) with their shapes from the lone-pair hybrids of the same
//! atom, the donor atom's Mulliken charge (R. S. Mulliken, J. Chem. Phys. 23, 1833 (1955))
//! from the extended Hückel populations, and the Lewis share of the localized picture.
//!
//! A ladder lone pair is a one-centre level at its hybrid's energy, and a hybrid's energy
//! ε(sp^λ) = (ε_s + λ ε_p)/(1 + λ) rises as its s share falls; so the lone pairs of one
//! atom are matched to that atom's lone-pair hybrids in order, the lowest level with the
//! hybrid richest in s. When the counts differ the shape is left empty.

use serde::Serialize;

use super::DonorChoice;
use super::measured::MeasuredIonization;
use crate::analysis::{Analysis, HybridEntry};
use crate::hybrid::HybridKind;
use crate::localized::LocalizedKind;
use crate::symmetry::PointGroup;

/// A canonical MO named by the series: its label and energy.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FrontierLevel {
    /// Index in the ascending list of MOs.
    pub index: usize,
    /// Symmetry label ("3a1"), when symmetry is known.
    pub label: Option<String>,
    pub energy_ev: f64,
    pub occupancy: f64,
}

/// One occupied lone pair of the localized ladder.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DonorLonePair {
    /// The atom (0-based, file order).
    pub atom: usize,
    pub element: String,
    /// The ladder's label, e.g. "n(N)".
    pub label: String,
    pub energy_ev: f64,
    /// s share of the lone-pair hybrid (%), when matched.
    pub s_percent: Option<f64>,
    /// λ of sp^λ; None for a pure p lone pair or an unmatched one.
    pub lambda: Option<f64>,
    /// Angle between the lone pair's axis and the principal axis, 0–90°; None when the
    /// group has no unique principal axis (C1, Cs, Ci and the cubic groups).
    pub axis_angle_degrees: Option<f64>,
    /// Mulliken charge of the atom (e).
    pub atom_charge: Option<f64>,
    /// The atom has two or more bonded partners in the Lewis structure.
    pub central: bool,
}

/// Everything the series shows for one molecule.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SeriesRow {
    pub name: String,
    /// Hill formula ("H3N"), as in the reports.
    pub formula: String,
    /// The name on the plots: the member's label, else the formula as chemists write it
    /// ("NH3").
    pub label: String,
    /// Schoenflies symbol, unless the symmetry stage failed.
    pub point_group: Option<String>,
    pub electrons: usize,
    /// The highest occupied MO (the singly occupied one of an open shell).
    pub homo: Option<FrontierLevel>,
    /// The lowest empty MO.
    pub lumo: Option<FrontierLevel>,
    /// ε(LUMO) − ε(HOMO), eV.
    pub gap_ev: Option<f64>,
    /// The donor lone pair chosen by the row's `DonorChoice`; None when there is none.
    pub donor: Option<DonorLonePair>,
    /// Every occupied lone pair of the ladder, ascending in energy.
    pub lone_pairs: Vec<DonorLonePair>,
    /// Fraction of electrons in one- and two-centre localized orbitals.
    pub lewis_share: Option<f64>,
    /// The measured first ionization energy used for the fits, with its source.
    pub measured: Option<MeasuredIonization>,
    /// Why a column is empty (the donor asked for is missing, a stage failed).
    pub notes: Vec<String>,
}

/// Reads the row of `analysis` with the donor chosen by `choice`.
pub fn read_row(
    analysis: &Analysis,
    choice: &DonorChoice,
    measured: Option<MeasuredIonization>,
) -> SeriesRow {
    let mut notes: Vec<String> = analysis
        .errors
        .iter()
        .map(|error| format!("{:?} stage failed: {}", error.stage, error.message))
        .collect();
    let lone_pairs = lone_pairs(analysis);
    let donor = pick_donor(&lone_pairs, choice, &mut notes);
    let homo = frontier(analysis, true);
    let lumo = frontier(analysis, false);
    let gap_ev = match (&homo, &lumo) {
        (Some(h), Some(l)) => Some(l.energy_ev - h.energy_ev),
        _ => None,
    };
    SeriesRow {
        name: analysis.molecule.name.clone(),
        formula: analysis.formula.clone(),
        label: analysis.molecule.conventional_formula(),
        point_group: analysis.symmetry.as_ref().map(|s| s.group.to_string()),
        electrons: analysis.electrons,
        homo,
        lumo,
        gap_ev,
        donor,
        lone_pairs,
        lewis_share: analysis.picture.as_ref().map(|p| p.lewis.lewis_share),
        measured,
        notes,
    }
}

/// The HOMO (`occupied`) or the lowest empty MO.
fn frontier(analysis: &Analysis, occupied: bool) -> Option<FrontierLevel> {
    let found = if occupied {
        analysis.orbitals.iter().rev().find(|o| o.occupancy > 0.0)
    } else {
        analysis.orbitals.iter().find(|o| o.occupancy <= 0.0)
    }?;
    Some(FrontierLevel {
        index: found.index,
        label: found.label.clone(),
        energy_ev: found.energy_ev,
        occupancy: found.occupancy,
    })
}

/// The donor of `choice` among the lone pairs (ascending in energy).
fn pick_donor(
    lone_pairs: &[DonorLonePair],
    choice: &DonorChoice,
    notes: &mut Vec<String>,
) -> Option<DonorLonePair> {
    let richest_on = |atom: usize| {
        lone_pairs
            .iter()
            .filter(|lp| lp.atom == atom)
            .max_by(|a, b| {
                let s = |lp: &DonorLonePair| lp.s_percent.unwrap_or(-1.0);
                s(a).total_cmp(&s(b))
            })
    };
    let auto = || {
        lone_pairs
            .iter()
            .rev()
            .find(|lp| lp.central)
            .or(lone_pairs.last())
    };
    let picked = match choice {
        DonorChoice::Auto => auto(),
        DonorChoice::Highest => lone_pairs.last(),
        DonorChoice::Atom(atom) => lone_pairs.iter().rev().find(|lp| lp.atom == *atom),
        DonorChoice::RichestInS(atom) => richest_on(*atom),
        DonorChoice::RichestInSOnDonorAtom => auto().and_then(|lp| richest_on(lp.atom)),
    };
    if picked.is_none() {
        notes.push(match choice {
            DonorChoice::Atom(atom) | DonorChoice::RichestInS(atom) => {
                format!("atom {atom} has no occupied lone pair")
            }
            _ => "no occupied lone pair".to_string(),
        });
    }
    picked.cloned()
}

/// Every occupied lone pair of the ladder with its shape, ascending in energy.
fn lone_pairs(analysis: &Analysis) -> Vec<DonorLonePair> {
    let levels: Vec<(usize, &str, f64)> = analysis
        .localized
        .iter()
        .filter(|level| level.kind == LocalizedKind::LonePair && level.atoms.len() == 1)
        .map(|level| (level.atoms[0], level.label.as_str(), level.energy_ev))
        .collect();
    let axis = principal_axis(analysis);
    let charges = analysis.eht.as_ref().map(|eht| eht.charges());
    let central: Vec<usize> = analysis
        .lone_pair_switch
        .as_ref()
        .map(|switch| {
            switch
                .choices
                .iter()
                .filter(|choice| choice.central)
                .map(|choice| choice.lone_pair.atom)
                .collect()
        })
        .unwrap_or_default();
    let mut out: Vec<DonorLonePair> = levels
        .iter()
        .map(|&(atom, label, energy_ev)| {
            let hybrid = matched_hybrid(analysis, &levels, atom, energy_ev);
            DonorLonePair {
                atom,
                element: analysis
                    .molecule
                    .atoms
                    .get(atom)
                    .map_or_else(String::new, |a| a.element.to_string()),
                label: label.to_string(),
                energy_ev,
                s_percent: hybrid.map(|h| h.s_percent),
                lambda: hybrid.and_then(|h| h.lambda),
                axis_angle_degrees: match (hybrid, axis) {
                    (Some(h), Some(z)) => axis_angle(h.direction, z),
                    _ => None,
                },
                atom_charge: charges.and_then(|c| c.get(atom).copied()),
                central: central.contains(&atom),
            }
        })
        .collect();
    out.sort_by(|a, b| a.energy_ev.total_cmp(&b.energy_ev));
    out
}

/// The lone-pair hybrid of `atom` matched to the level at `energy_ev` (see the module
/// comment), or None when the atom's level and hybrid counts differ.
fn matched_hybrid<'a>(
    analysis: &'a Analysis,
    levels: &[(usize, &str, f64)],
    atom: usize,
    energy_ev: f64,
) -> Option<&'a HybridEntry> {
    let mut hybrids: Vec<&HybridEntry> = analysis
        .hybrid_entries
        .iter()
        .filter(|h| h.center == atom && h.kind == HybridKind::LonePair)
        .collect();
    let below = levels
        .iter()
        .filter(|&&(a, _, e)| a == atom && e < energy_ev)
        .count();
    let same_atom = levels.iter().filter(|&&(a, _, _)| a == atom).count();
    if hybrids.len() != same_atom {
        return None;
    }
    hybrids.sort_by(|a, b| b.s_percent.total_cmp(&a.s_percent));
    hybrids.get(below).copied()
}

/// The principal axis (the standard frame's z) in molecule coordinates, for groups that
/// have a unique one.
fn principal_axis(analysis: &Analysis) -> Option<[f64; 3]> {
    let symmetry = analysis.symmetry.as_ref()?;
    use PointGroup::*;
    match symmetry.group {
        C1 | Cs | Ci | T | Td | Th | O | Oh | I | Ih => None,
        _ => {
            let z = symmetry.frame.row(2);
            Some([z[0], z[1], z[2]])
        }
    }
}

/// The acute angle (degrees) between a direction and an axis; None for a zero vector.
pub fn axis_angle(direction: [f64; 3], axis: [f64; 3]) -> Option<f64> {
    let dot: f64 = direction.iter().zip(&axis).map(|(a, b)| a * b).sum();
    let norms = direction.iter().map(|v| v * v).sum::<f64>().sqrt()
        * axis.iter().map(|v| v * v).sum::<f64>().sqrt();
    if norms.is_nan() || norms <= 1e-12 {
        return None;
    }
    let cosine = (dot / norms).abs().min(1.0);
    Some(cosine.acos().to_degrees())
}

#[cfg(test)]
mod tests {
    use super::axis_angle;

    #[test]
    fn axis_angles_are_acute() {
        let z = [0.0, 0.0, 1.0];
        assert!((axis_angle([0.0, 0.0, -2.0], z).unwrap_or(f64::NAN)).abs() < 1e-9);
        let right = axis_angle([1.0, 0.0, 0.0], z).unwrap_or(f64::NAN);
        assert!((right - 90.0).abs() < 1e-9);
        let diagonal = axis_angle([1.0, 0.0, -1.0], z).unwrap_or(f64::NAN);
        assert!((diagonal - 45.0).abs() < 1e-9);
        assert_eq!(axis_angle([0.0; 3], z), None);
    }
}
