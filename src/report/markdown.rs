//! The report as Markdown: a heading and one pipe table per section (the GitHub
//! Flavored Markdown table extension, GFM spec 0.29 §4.10). Cell text escapes `|` and
//! puts line breaks on one line, so every table row is one line; `&`, `<` and `>` become
//! character references (GFM §6.6 raw HTML is then impossible), so a name can never put
//! markup into a rendered report.

use crate::analysis::Analysis;

use super::tables::{Table, tables};

fn cell(text: &str) -> String {
    text.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('\\', "\\\\")
        .replace('|', "\\|")
        .replace(['\r', '\n'], " ")
}

fn write_table(out: &mut String, table: &Table) {
    out.push_str(&format!("\n## {}\n\n", table.title));
    if table.rows.is_empty() {
        out.push_str("(none)\n");
        return;
    }
    out.push_str(&format!("| {} |\n", table.columns.join(" | ")));
    let rule: Vec<&str> = table.columns.iter().map(|_| "---").collect();
    out.push_str(&format!("| {} |\n", rule.join(" | ")));
    for row in &table.rows {
        let cells: Vec<String> = row.iter().map(|c| cell(c)).collect();
        out.push_str(&format!("| {} |\n", cells.join(" | ")));
    }
}

/// The analysis as a Markdown document.
pub fn to_markdown(analysis: &Analysis) -> String {
    let mut out = format!(
        "# {} ({})\n\nExtended Hückel orbitals and localized hybrids computed by Diptych. \
         Energies in eV; atom indices are 0-based in file order.\n",
        cell(&analysis.molecule.name),
        cell(&analysis.formula)
    );
    for table in tables(analysis) {
        write_table(&mut out, &table);
    }
    out
}
