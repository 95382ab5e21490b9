//! The report as one CSV file in long form: every cell of every table is one record
//! `table,row,column,value` (row counted from 1 within its table). Every record has the
//! same four fields, as RFC 4180 §2 asks, so any CSV reader takes the whole report at
//! once; a pivot by `table` and `column` gives the tables back. Written by the one CSV
//! writer (`crate::csv`: RFC 4180 quoting, CRLF, spreadsheet formula starts neutralised in
//! text, numbers kept as numbers).

use crate::analysis::Analysis;
use crate::csv::{CsvWriter, cell, text};

use super::tables::tables;

/// The analysis as a CSV document (header `table,row,column,value`).
pub fn to_csv(analysis: &Analysis) -> String {
    let mut writer = CsvWriter::new();
    writer.record(&["table", "row", "column", "value"]);
    for table in tables(analysis) {
        for (n, row) in table.rows.iter().enumerate() {
            for (column, value) in table.columns.iter().zip(row) {
                writer.record(&[
                    text(table.id),
                    (n + 1).to_string(),
                    text(column),
                    cell(value),
                ]);
            }
        }
    }
    writer.finish()
}
