//! The Inspector's "Lewis structure" section: how well one Lewis structure describes the
//! molecule (the Lewis share read from the wavefunction, `picture.lewis`), its multicentre
//! bonds and unpaired electrons, and for a selected atom its formal charge, lone pairs and
//! bonds (net order and Wiberg index). Also the words for a localized level's kind. All
//! numbers come from `Analysis::run`.

use diptych::analysis::Analysis;
use diptych::diagram::style::format_energy;
use diptych::localized::{LOW_LEWIS_SHARE, LewisStructure, LocalizedKind, MulticentreKind};
use diptych::report::tables::atom_name;
use eframe::egui;

/// A localized level's kind in words.
pub fn kind_in_words(kind: LocalizedKind) -> &'static str {
    match kind {
        LocalizedKind::Bond => "σ bond",
        LocalizedKind::Antibond => "σ antibond",
        LocalizedKind::Pi => "π bond",
        LocalizedKind::PiStar => "π antibond",
        LocalizedKind::LonePair => "lone pair",
        LocalizedKind::SingleElectron => "singly occupied orbital on one atom",
        LocalizedKind::Vacant => "empty orbital on one atom",
        LocalizedKind::Multicentre => "multicentre bond (bonding level)",
        LocalizedKind::MulticentreNonbonding => "non-bonding level of a 3c–4e bond",
        LocalizedKind::MulticentreAntibond => "multicentre antibond",
    }
}

/// The sentence under the Lewis share.
pub fn share_sentence(share: f64) -> &'static str {
    if share >= LOW_LEWIS_SHARE {
        "One Lewis structure describes the molecule well."
    } else {
        "One Lewis structure describes the molecule only in part: see the multicentre bonds."
    }
}

/// The section; `selected_atom` adds that atom's part of the structure.
pub fn show(ui: &mut egui::Ui, analysis: &Analysis, selected_atom: Option<usize>) {
    ui.strong("Lewis structure");
    let Some(picture) = &analysis.picture else {
        ui.colored_label(
            ui.visuals().error_fg_color,
            "No Lewis structure: the localized picture could not be read (see the notes under the Diagram).",
        );
        return;
    };
    let lewis = &picture.lewis;
    let name = |atom: usize| atom_name(analysis, atom);
    ui.label(format!(
        "Lewis share {:.0} % of the electrons",
        100.0 * lewis.lewis_share
    ));
    ui.add(egui::Label::new(share_sentence(lewis.lewis_share)).wrap());
    for bond in &lewis.multicentre {
        let atoms: Vec<String> = bond.atoms.iter().map(|&a| name(a)).collect();
        let kind = match bond.kind {
            MulticentreKind::Delocalized => format!("{}-centre bond", bond.atoms.len()),
            MulticentreKind::ThreeCentreFourElectron => {
                "three-centre four-electron bond (½ per link)".to_string()
            }
        };
        ui.label(format!(
            "{kind} {} ({:.2} e)",
            atoms.join("–"),
            bond.electrons
        ));
    }
    ui.label(unpaired_text(lewis, &name));
    if let Some(atom) = selected_atom.filter(|&atom| atom < analysis.molecule.atoms.len()) {
        ui.add_space(4.0);
        atom_part(ui, analysis, lewis, atom);
    }
}

fn unpaired_text(lewis: &LewisStructure, name: &dyn Fn(usize) -> String) -> String {
    if lewis.unpaired.is_empty() {
        return "No unpaired electrons.".to_string();
    }
    // Orbitals over the same atoms are counted together (O2's two π*).
    let mut places: Vec<(&[usize], usize, f64)> = Vec::new();
    for unpaired in &lewis.unpaired {
        match places
            .iter_mut()
            .find(|(atoms, _, _)| *atoms == unpaired.atoms)
        {
            Some((_, orbitals, electrons)) => {
                *orbitals += 1;
                *electrons += unpaired.electrons;
            }
            None => places.push((&unpaired.atoms, 1, unpaired.electrons)),
        }
    }
    let places: Vec<String> = places
        .iter()
        .map(|(atoms, orbitals, electrons)| {
            let atoms: Vec<String> = atoms.iter().map(|&a| name(a)).collect();
            let orbitals = if *orbitals == 1 {
                "1 orbital".to_string()
            } else {
                format!("{orbitals} orbitals")
            };
            format!("{electrons:.2} in {orbitals} over {}", atoms.join("–"))
        })
        .collect();
    match places.as_slice() {
        [one] => format!("Unpaired electrons: {one}."),
        _ => format!(
            "Unpaired electrons: {:.2} in all; {}.",
            lewis.unpaired_electrons(),
            places.join("; ")
        ),
    }
}

/// Formal charge, lone pairs and bonds of one atom.
fn atom_part(ui: &mut egui::Ui, analysis: &Analysis, lewis: &LewisStructure, atom: usize) {
    let charge = lewis.formal_charges.get(atom).copied().unwrap_or(0.0);
    // A real minus sign, an explicit plus, and no "−0.00".
    let charge = if charge >= 0.005 {
        format!("+{charge:.2}")
    } else {
        format_energy(charge, 2)
    };
    let lone_pairs = match lewis.lone_pairs_on(atom) {
        0 => "no lone pairs".to_string(),
        1 => "1 lone pair".to_string(),
        n => format!("{n} lone pairs"),
    };
    ui.label(format!(
        "{}: formal charge {charge}, {lone_pairs}",
        atom_name(analysis, atom)
    ));
    let bonds: Vec<_> = lewis
        .bonds
        .iter()
        .filter(|bond| bond.atoms.contains(&atom))
        .collect();
    if bonds.is_empty() {
        ui.weak("No bonds in the Lewis structure.");
        return;
    }
    egui::Grid::new("lewis bonds of atom")
        .num_columns(3)
        .striped(true)
        .show(ui, |ui| {
            ui.weak("bond");
            ui.weak("order");
            ui.weak("Wiberg index");
            ui.end_row();
            for bond in bonds {
                let other = if bond.atoms[0] == atom {
                    bond.atoms[1]
                } else {
                    bond.atoms[0]
                };
                ui.label(format!(
                    "{}–{}",
                    atom_name(analysis, atom),
                    atom_name(analysis, other)
                ));
                ui.label(format!("{:.2}", bond.order));
                ui.label(format!("{:.3}", bond.index));
                ui.end_row();
            }
        });
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_share_sentence_changes_at_the_librarys_threshold() {
        assert!(share_sentence(1.0).contains("well"));
        assert!(share_sentence(LOW_LEWIS_SHARE).contains("well"));
        assert!(share_sentence(0.667).contains("only in part"));
    }
}
