//! The donor choices a row offers (the Series window's menu) and their names in words.
//! No chemistry: the choices are read from the row's lone pairs.

use super::DonorChoice;
use super::row::SeriesRow;

/// Every choice that names a lone pair of `row`, in menu order: automatic, highest, then
/// per atom with lone pairs its highest one and, with two or more, its s-richest one.
pub fn donor_options(row: &SeriesRow) -> Vec<DonorChoice> {
    let mut options = vec![
        DonorChoice::Auto,
        DonorChoice::Highest,
        DonorChoice::RichestInSOnDonorAtom,
    ];
    let mut atoms: Vec<usize> = row.lone_pairs.iter().map(|lp| lp.atom).collect();
    atoms.sort_unstable();
    atoms.dedup();
    for atom in atoms {
        options.push(DonorChoice::Atom(atom));
        if row.lone_pairs.iter().filter(|lp| lp.atom == atom).count() > 1 {
            options.push(DonorChoice::RichestInS(atom));
        }
    }
    options
}

/// The choice in words, atoms as element and 0-based index ("N0") as in the table.
pub fn describe(choice: &DonorChoice, row: &SeriesRow) -> String {
    let atom_name = |atom: usize| {
        row.lone_pairs
            .iter()
            .find(|lp| lp.atom == atom)
            .map_or_else(
                || format!("atom {atom}"),
                |lp| format!("{}{atom}", lp.element),
            )
    };
    match choice {
        DonorChoice::Auto => "automatic".into(),
        DonorChoice::Highest => "highest lone pair".into(),
        DonorChoice::RichestInSOnDonorAtom => "s-richest on the automatic atom".into(),
        DonorChoice::Atom(atom) => format!("highest on {}", atom_name(*atom)),
        DonorChoice::RichestInS(atom) => format!("s-richest on {}", atom_name(*atom)),
    }
}
