//! The series as Markdown: the table (GitHub Flavored Markdown tables, GFM spec 0.29
//! §4.10, cells with `|` escaped and line breaks removed), the Koopmans fits with slope,
//! offset and r², and what the numbers can and cannot promise.

use super::table::{HEADINGS, fixed, rows};
use super::{LineFit, Series};

fn cell(text: &str) -> String {
    text.replace('\\', "\\\\")
        .replace('|', "\\|")
        .replace(['\r', '\n'], " ")
}

fn fit_line(out: &mut String, what: &str, fit: Option<&LineFit>) {
    match fit {
        Some(f) => out.push_str(&format!(
            "- {what} = {} × IE {} {} eV; r² = {} ({} molecules)\n",
            fixed(f.slope, 3),
            if f.offset < 0.0 { "−" } else { "+" },
            fixed(f.offset.abs(), 2),
            fixed(f.r_squared, 3),
            f.points
        )),
        None => out.push_str(&format!(
            "- {what}: no line (fewer than two molecules with a measured value)\n"
        )),
    }
}

/// The series as a Markdown document.
pub fn to_markdown(series: &Series) -> String {
    let mut out = String::from(
        "# Series: donor lone pairs and frontier orbitals\n\n\
         Extended Hückel orbitals and the localized picture computed by Diptych, one row per \
         molecule. Energies in eV; atom indices 0-based in file order; %s, λ and the angle to \
         the principal axis belong to the donor lone pair's hybrid; q is the donor atom's \
         Mulliken charge.\n\n",
    );
    out.push_str(&format!("| {} |\n", HEADINGS.join(" | ")));
    let rule: Vec<&str> = HEADINGS.iter().map(|_| "---").collect();
    out.push_str(&format!("| {} |\n", rule.join(" | ")));
    for row in rows(series) {
        let cells: Vec<String> = row.iter().map(|c| cell(c)).collect();
        out.push_str(&format!("| {} |\n", cells.join(" | ")));
    }
    out.push_str("\n## Against the measured first ionization energy (IE)\n\n");
    fit_line(&mut out, "−ε(HOMO)", series.homo_fit.as_ref());
    fit_line(&mut out, "−ε(lone pair)", series.lone_pair_fit.as_ref());
    out.push_str(
        "\nKoopmans' theorem reads −ε of an occupied orbital as a vertical ionization energy \
         with no relaxation or correlation. Extended Hückel energies are qualitative: an \
         offset and a slope far from 1 are expected; the ordering within a family is what \
         the comparison can show.\n",
    );
    out
}
