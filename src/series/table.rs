//! The series as one table of text cells, shared by the CSV and Markdown writers and the
//! window's table so that all show the same numbers: fixed decimals, an ASCII minus (no
//! "-0.00"), λ as "inf" for a pure p lone pair, atoms as element and 0-based index ("N0").

use super::Series;
use super::row::{DonorLonePair, SeriesRow};

/// Machine names of the columns (the CSV header), in order.
pub const COLUMNS: [&str; 21] = [
    "name",
    "label",
    "formula",
    "point_group",
    "electrons",
    "homo_label",
    "homo_ev",
    "donor_atom",
    "donor_label",
    "donor_ev",
    "donor_s_percent",
    "donor_lambda",
    "donor_axis_angle_deg",
    "donor_charge",
    "lumo_label",
    "lumo_ev",
    "gap_ev",
    "lewis_share",
    "measured_ie_ev",
    "measured_source",
    "notes",
];

/// Column headings for people (Markdown, the window), in the order of [`COLUMNS`].
pub const HEADINGS: [&str; 21] = [
    "molecule",
    "label",
    "formula",
    "group",
    "electrons",
    "HOMO",
    "ε(HOMO) eV",
    "donor",
    "lone pair",
    "ε(n) eV",
    "%s",
    "λ",
    "∠ axis °",
    "q(donor)",
    "LUMO",
    "ε(LUMO) eV",
    "gap eV",
    "Lewis share",
    "IE eV",
    "IE source",
    "notes",
];

/// A number with fixed decimals, never "-0.00".
pub fn fixed(value: f64, decimals: usize) -> String {
    let text = format!("{value:.decimals$}");
    match text.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
        _ => text,
    }
}

fn optional(value: Option<f64>, decimals: usize) -> String {
    value.map_or_else(String::new, |v| fixed(v, decimals))
}

/// λ of a lone pair: empty when unknown, "inf" for a pure p lone pair.
fn lambda_cell(donor: &DonorLonePair) -> String {
    match (donor.lambda, donor.s_percent) {
        (Some(lambda), _) if lambda.is_finite() && lambda < 1e3 => fixed(lambda, 2),
        (_, Some(_)) => "inf".into(),
        _ => String::new(),
    }
}

/// The cells of one row, in the order of [`COLUMNS`].
pub fn cells(row: &SeriesRow) -> Vec<String> {
    let donor = row.donor.as_ref();
    let label = |level: Option<&super::FrontierLevel>| {
        level.and_then(|l| l.label.clone()).unwrap_or_default()
    };
    vec![
        row.name.clone(),
        row.label.clone(),
        row.formula.clone(),
        row.point_group.clone().unwrap_or_default(),
        row.electrons.to_string(),
        label(row.homo.as_ref()),
        optional(row.homo.as_ref().map(|h| h.energy_ev), 3),
        donor.map_or_else(String::new, |d| format!("{}{}", d.element, d.atom)),
        donor.map_or_else(String::new, |d| d.label.clone()),
        optional(donor.map(|d| d.energy_ev), 3),
        optional(donor.and_then(|d| d.s_percent), 1),
        donor.map_or_else(String::new, lambda_cell),
        optional(donor.and_then(|d| d.axis_angle_degrees), 1),
        optional(donor.and_then(|d| d.atom_charge), 3),
        label(row.lumo.as_ref()),
        optional(row.lumo.as_ref().map(|l| l.energy_ev), 3),
        optional(row.gap_ev, 3),
        optional(row.lewis_share, 3),
        optional(row.measured.as_ref().map(|m| m.energy_ev), 2),
        row.measured
            .as_ref()
            .map_or_else(String::new, |m| m.source.clone()),
        row.notes.join("; "),
    ]
}

/// Every row's cells.
pub fn rows(series: &Series) -> Vec<Vec<String>> {
    series.rows.iter().map(cells).collect()
}
