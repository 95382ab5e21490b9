//! A scan as CSV (RFC 4180: comma-separated, fields with commas, quotes or line breaks
//! quoted, quotes doubled): one header row, then one row per point. Columns: the
//! coordinate value, one column per followed curve (energy in eV, headed by the curve's
//! name), one per λ series ("inf" for a pure p orbital), Σ occupancy × ε (eV), the point
//! group, and the status ("ok" or "failed: …"; a failed point's numbers are empty).

use super::Scan;

fn field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_string()
    }
}

fn number(value: Option<f64>) -> String {
    value.map_or_else(String::new, |v| format!("{v:.6}"))
}

/// The scan as CSV text, rows in point order, ending with a line break.
pub fn to_csv(scan: &Scan) -> String {
    let mut header = vec![field(&scan.request.coordinate.describe())];
    header.extend(
        scan.curves
            .iter()
            .map(|c| field(&format!("{} (eV)", c.name))),
    );
    header.extend(scan.lambdas.iter().map(|l| field(&l.name)));
    header.push("sum occupied ε (eV)".into());
    header.push("point group".into());
    header.push("status".into());
    let mut out = header.join(",");
    out.push('\n');
    for (p, point) in scan.points.iter().enumerate() {
        let mut row = vec![format!("{:.6}", point.value)];
        row.extend(scan.curves.iter().map(|c| number(c.energies[p])));
        row.extend(
            scan.lambdas
                .iter()
                .map(|l| l.values[p].map_or_else(String::new, |lambda| lambda.text())),
        );
        row.push(number(point.sum_occupied_ev));
        row.push(field(point.point_group.as_deref().unwrap_or("")));
        row.push(match &point.failure {
            Some(message) => field(&format!("failed: {message}")),
            None => "ok".into(),
        });
        out.push_str(&row.join(","));
        out.push('\n');
    }
    out
}
