//! A scan as CSV, written by the one CSV writer (`crate::csv`: RFC 4180 quoting, CRLF
//! record ends, spreadsheet formula starts neutralised in text cells): one header row,
//! then one row per point. Columns: the coordinate value, one column per followed curve
//! (energy in eV, headed by the curve's name), one per λ series ("inf" for a pure p
//! orbital), Σ occupancy × ε (eV), the point group, and the status ("ok" or "failed: …";
//! a failed point's numbers are empty).

use super::Scan;
use crate::csv::{CsvWriter, cell, number, text};

/// The scan as CSV text, rows in point order, ending with a line break.
pub fn to_csv(scan: &Scan) -> String {
    let mut writer = CsvWriter::new();
    let mut header = vec![text(&scan.request.coordinate.describe())];
    header.extend(
        scan.curves
            .iter()
            .map(|c| text(&format!("{} (eV)", c.name))),
    );
    header.extend(scan.lambdas.iter().map(|l| text(&l.name)));
    header.push(text("sum occupied ε (eV)"));
    header.push(text("point group"));
    header.push(text("status"));
    writer.record(&header);
    for (p, point) in scan.points.iter().enumerate() {
        let mut row = vec![number(Some(point.value), 6)];
        row.extend(scan.curves.iter().map(|c| number(c.energies[p], 6)));
        row.extend(
            scan.lambdas
                .iter()
                .map(|l| l.values[p].map_or_else(String::new, |lambda| cell(&lambda.text()))),
        );
        row.push(number(point.sum_occupied_ev, 6));
        row.push(text(point.point_group.as_deref().unwrap_or("")));
        row.push(match &point.failure {
            Some(message) => text(&format!("failed: {message}")),
            None => "ok".into(),
        });
        writer.record(&row);
    }
    writer.finish()
}
