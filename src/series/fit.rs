//! Ordinary least squares of a computed quantity y (here −ε, eV) on a measured one x (the
//! first vertical ionization energy, eV): y = slope·x + offset, with the coefficient of
//! determination r² = 1 − SS_res/SS_tot (any statistics text, e.g. Draper and Smith,
//! *Applied Regression Analysis*, 3rd ed., 1998, ch. 1). Also the pairwise comparison of
//! two orderings (which pairs a computed scale puts the other way round from the measured).

use serde::Serialize;

use super::row::SeriesRow;

/// A straight line fitted through at least two points with different x.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LineFit {
    pub slope: f64,
    /// y at x = 0 (eV).
    pub offset: f64,
    /// Coefficient of determination; 1 when every y equals the line (and when all y are
    /// equal, which a horizontal line fits exactly).
    pub r_squared: f64,
    /// Points used.
    pub points: usize,
}

/// Least squares of y on x; None with fewer than two points, non-finite values or all x
/// equal.
pub fn least_squares(points: &[(f64, f64)]) -> Option<LineFit> {
    if points.len() < 2 || points.iter().any(|(x, y)| !x.is_finite() || !y.is_finite()) {
        return None;
    }
    let n = points.len() as f64;
    let mean_x = points.iter().map(|p| p.0).sum::<f64>() / n;
    let mean_y = points.iter().map(|p| p.1).sum::<f64>() / n;
    let sxx: f64 = points.iter().map(|p| (p.0 - mean_x).powi(2)).sum();
    let sxy: f64 = points.iter().map(|p| (p.0 - mean_x) * (p.1 - mean_y)).sum();
    let syy: f64 = points.iter().map(|p| (p.1 - mean_y).powi(2)).sum();
    if sxx <= 1e-12 * n {
        return None;
    }
    let slope = sxy / sxx;
    let offset = mean_y - slope * mean_x;
    let residual: f64 = points
        .iter()
        .map(|p| (p.1 - slope * p.0 - offset).powi(2))
        .sum();
    let r_squared = if syy <= 1e-24 {
        1.0
    } else {
        1.0 - residual / syy
    };
    Some(LineFit {
        slope,
        offset,
        r_squared,
        points: points.len(),
    })
}

/// The fit of `computed(row)` on each row's measured energy, over rows that have both.
pub fn fit_rows(
    rows: &[SeriesRow],
    computed: impl Fn(&SeriesRow) -> Option<f64>,
) -> Option<LineFit> {
    least_squares(&paired(rows, computed))
}

/// (measured, computed) for every row that has both.
pub fn paired(rows: &[SeriesRow], computed: impl Fn(&SeriesRow) -> Option<f64>) -> Vec<(f64, f64)> {
    rows.iter()
        .filter_map(|row| Some((row.measured.as_ref()?.energy_ev, computed(row)?)))
        .collect()
}

/// Two rows that a computed scale orders the other way round from the measured one.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct OrderingPair {
    /// The row measured lower.
    pub lower_measured: String,
    /// The row measured higher, which the computed scale puts at or below the other.
    pub higher_measured: String,
}

/// Every pair of rows (by name) whose computed values are ordered differently from their
/// measured values; pairs measured within `tie_ev` of each other are not compared.
pub fn misordered_pairs(
    rows: &[SeriesRow],
    computed: impl Fn(&SeriesRow) -> Option<f64>,
    tie_ev: f64,
) -> Vec<OrderingPair> {
    let values: Vec<(&str, f64, f64)> = rows
        .iter()
        .filter_map(|row| {
            Some((
                row.name.as_str(),
                row.measured.as_ref()?.energy_ev,
                computed(row)?,
            ))
        })
        .collect();
    let mut out = Vec::new();
    for (i, a) in values.iter().enumerate() {
        for b in &values[i + 1..] {
            if (a.1 - b.1).abs() <= tie_ev {
                continue;
            }
            let (low, high) = if a.1 < b.1 { (a, b) } else { (b, a) };
            if high.2 <= low.2 {
                out.push(OrderingPair {
                    lower_measured: low.0.to_string(),
                    higher_measured: high.0.to_string(),
                });
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_line_through_points_is_exact() {
        let fit = least_squares(&[(1.0, 3.0), (2.0, 5.0), (4.0, 9.0)]);
        let fit = fit.expect("three points fit");
        assert!((fit.slope - 2.0).abs() < 1e-12);
        assert!((fit.offset - 1.0).abs() < 1e-12);
        assert!((fit.r_squared - 1.0).abs() < 1e-12);
    }

    #[test]
    fn scatter_gives_r_squared_below_one() {
        // y = x with one point off by 1: worked by hand, mean x = 2, Sxx = 2, Sxy = 2,
        // slope 1, offset 1/3, SS_res = 2/3, SS_tot = 2 + 2/3 → r² = 0.75.
        let fit = least_squares(&[(1.0, 1.0), (2.0, 3.0), (3.0, 3.0)]).expect("fit");
        assert!((fit.slope - 1.0).abs() < 1e-12);
        assert!((fit.offset - 1.0 / 3.0).abs() < 1e-12);
        assert!((fit.r_squared - 0.75).abs() < 1e-12, "{}", fit.r_squared);
    }

    #[test]
    fn degenerate_inputs_give_no_line() {
        assert_eq!(least_squares(&[(1.0, 2.0)]), None);
        assert_eq!(least_squares(&[(1.0, 2.0), (1.0, 3.0)]), None);
        assert_eq!(least_squares(&[(1.0, f64::NAN), (2.0, 3.0)]), None);
    }
}
