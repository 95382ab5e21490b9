//! The notes of the localized picture: what its Lewis structure cannot say plainly (an
//! unconverged localization, an open shell, three-centre four-electron and multicentre
//! bonds, a low Lewis share), in words for the window and the reports.

use super::SpaceReport;
use super::classify::{BondCharacter, LocalizedOrbital, OrbitalSpace, ThreeCentreUnit};
use super::lewis::{LewisStructure, MulticentreKind};
use crate::chem::molecule::Molecule;

/// Below this Lewis share a note says one Lewis structure describes the molecule poorly
/// (our choice, no source).
pub const LOW_LEWIS_SHARE: f64 = 0.9;

/// Every note, in order.
pub fn picture_notes(
    orbitals: &[LocalizedOrbital],
    units: &[ThreeCentreUnit],
    unit_antibonding: &[f64],
    lewis: &LewisStructure,
    spaces: &[SpaceReport],
    molecule: &Molecule,
) -> Vec<String> {
    let mut notes = Vec::new();
    for space in spaces.iter().filter(|s| !s.converged) {
        notes.push(format!(
            "the localization of the {} orbitals stopped after {} sweeps without converging; the orbitals shown are the last ones",
            format!("{:?}", space.space).to_lowercase(),
            space.sweeps
        ));
    }
    notes.extend(open_shell(orbitals, lewis));
    notes.extend(three_centre(units, unit_antibonding, molecule));
    notes.extend(multicentre(lewis, molecule));
    if lewis.lewis_share < LOW_LEWIS_SHARE {
        notes.push(format!(
            "Lewis share {:.0} %: one Lewis structure describes this molecule only in part",
            100.0 * lewis.lewis_share
        ));
    }
    notes
}

/// "O1–C0–O2": atoms with their indices, in the order given.
fn written(atoms: &[usize], molecule: &Molecule) -> String {
    atoms
        .iter()
        .map(|&a| format!("{}{a}", molecule.atoms[a].element.symbol()))
        .collect::<Vec<_>>()
        .join("–")
}

fn open_shell(orbitals: &[LocalizedOrbital], lewis: &LewisStructure) -> Option<String> {
    let unpaired = lewis.unpaired_electrons();
    let partly = orbitals
        .iter()
        .filter(|o| o.space == OrbitalSpace::Partly)
        .count();
    (unpaired > 1e-9).then(|| {
        format!(
            "open shell: {unpaired:.2} electrons sit in {partly} partly occupied orbitals (shown with their own occupancies); a closed-shell Lewis structure would contradict the canonical MOs"
        )
    })
}

/// One note per distinct 3c–4e bond (CO2's two π bonds in one note).
fn three_centre(
    units: &[ThreeCentreUnit],
    unit_antibonding: &[f64],
    molecule: &Molecule,
) -> Vec<String> {
    let mut counted: Vec<(String, usize)> = Vec::new();
    for (k, unit) in units.iter().enumerate() {
        let kind = if unit.character == BondCharacter::Pi {
            "π"
        } else {
            "σ"
        };
        let antibonding = unit_antibonding.get(k).copied().unwrap_or(0.0);
        let order = if antibonding > 1e-9 {
            format!(
                "with {antibonding:.2} unpaired electron in its antibonding level, bond order {:.2} per link",
                0.5 - antibonding / 4.0
            )
        } else {
            "bond order ½ per link".to_string()
        };
        let text = format!("{kind} {}; {order}", written(&unit.atoms, molecule));
        match counted.iter_mut().find(|(t, _)| *t == text) {
            Some((_, count)) => *count += 1,
            None => counted.push((text, 1)),
        }
    }
    counted
        .into_iter()
        .map(|(text, count)| {
            let what = if count == 1 {
                "a three-centre four-electron bond".to_string()
            } else {
                format!("{count} three-centre four-electron bonds")
            };
            format!("{what} ({text}): one Lewis structure cannot show it")
        })
        .collect()
}

/// One note listing every delocalized multicentre bond.
fn multicentre(lewis: &LewisStructure, molecule: &Molecule) -> Option<String> {
    let bonds: Vec<String> = lewis
        .multicentre
        .iter()
        .filter(|m| m.kind == MulticentreKind::Delocalized)
        .map(|bond| {
            format!(
                "{} ({:.2} e)",
                written(&bond.atoms, molecule),
                bond.electrons
            )
        })
        .collect();
    if bonds.is_empty() {
        return None;
    }
    let what = if bonds.len() == 1 {
        "a multicentre bond".to_string()
    } else {
        format!("{} multicentre bonds", bonds.len())
    };
    Some(format!(
        "{what} over {}: the two-centre picture does not fit here, the ladder shows the multicentre orbitals",
        bonds.join(", ")
    ))
}
