//! The series as CSV through the one CSV writer (`crate::csv`: RFC 4180 quoting, CRLF
//! record ends, spreadsheet formula starts neutralised in text cells, numbers kept as
//! numbers): one header record, then one record per molecule, every record with the same
//! fields. The fits are not rows of this table: they are in the Markdown, JSON and SVG.

use super::Series;
use super::table::{COLUMNS, rows};
use crate::csv::{CsvWriter, cell, text};

/// The series as CSV text.
pub fn to_csv(series: &Series) -> String {
    let mut writer = CsvWriter::new();
    let header: Vec<String> = COLUMNS.iter().map(|c| text(c)).collect();
    writer.record(&header);
    for row in rows(series) {
        let fields: Vec<String> = row.iter().map(|value| cell(value)).collect();
        writer.record(&fields);
    }
    writer.finish()
}
