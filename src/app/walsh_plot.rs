//! What the Walsh scan window draws, derived once from a finished `Scan` (not every
//! frame): each followed level as unbroken runs of (coordinate, energy) with its legend
//! entry (the irrep) and end label, λ of the hybrids of each model with symmetry-equivalent
//! hybrids merged into one curve, the sum of occupied orbital energies, and the windows.

use std::sync::Arc;

use diptych::scan::palette::{curve_rgb, irrep_colours};
use diptych::scan::{Curve, Lambda, Scan};

/// The top of the λ plot; pure p orbitals (λ = ∞) are marked there.
pub const LAMBDA_TOP: f64 = 8.0;

/// One followed level, ready to draw.
pub struct CurvePlot {
    /// Its irrep's colour in this scan (`scan::palette`, as in the SVG); `None`: ink.
    pub rgb: Option<[u8; 3]>,
    /// Legend entry: the irrep, so that one entry stands for all its levels.
    pub legend: String,
    pub segments: Vec<Vec<[f64; 2]>>,
    /// Where the curve ends and what it is called there.
    pub end: Option<([f64; 2], String)>,
}

/// Hybrids of one model whose λ agree at every point (symmetry-equivalent bonds), drawn as
/// one curve named after all of them.
pub struct LambdaPlot {
    pub name: String,
    /// Lone-pair hybrids (bonds otherwise): the colour of the curve.
    pub lone_pair: bool,
    pub segments: Vec<Vec<[f64; 2]>>,
    /// Points where the hybrid is a pure p orbital, placed at `LAMBDA_TOP`.
    pub pure_p: Vec<[f64; 2]>,
    /// Points where the model has no value (Coulson's relations unsolvable), at λ = 0.
    pub unsolved: Vec<[f64; 2]>,
}

pub struct WalshPlot {
    pub scan: Arc<Scan>,
    /// Energy window (eV): just below the lowest level to 6 eV above the highest occupied.
    pub energy_window: (f64, f64),
    /// Coordinate window, with room on the right for the end labels.
    pub x_bounds: (f64, f64),
    pub curves: Vec<CurvePlot>,
    geometric: Vec<LambdaPlot>,
    localized: Vec<LambdaPlot>,
    pub sums: Vec<Vec<[f64; 2]>>,
}

impl WalshPlot {
    pub fn new(scan: Arc<Scan>) -> WalshPlot {
        let palette = irrep_colours(&scan);
        let curves = scan
            .curves
            .iter()
            .map(|curve| CurvePlot {
                rgb: curve_rgb(&palette, curve),
                legend: curve.irrep.clone().unwrap_or_else(|| curve.label.clone()),
                segments: segments(&scan, &curve.energies),
                end: scan
                    .points
                    .last()
                    .zip(curve.energies.last().copied().flatten())
                    .map(|(point, energy)| ([point.value, energy], end_label(curve))),
            })
            .collect();
        let sums: Vec<Option<f64>> = scan.points.iter().map(|p| p.sum_occupied_ev).collect();
        let (first, last) = (
            scan.request.from.min(scan.request.to),
            scan.request.from.max(scan.request.to),
        );
        WalshPlot {
            energy_window: energy_window(&scan),
            x_bounds: (first, last + 0.22 * (last - first).max(1e-6)),
            curves,
            geometric: lambda_plots(&scan, "geometric"),
            localized: lambda_plots(&scan, "localized"),
            sums: segments(&scan, &sums),
            scan,
        }
    }

    /// The λ curves of the localized-MO model, or of the geometric one.
    pub fn lambdas(&self, localized: bool) -> &[LambdaPlot] {
        if localized {
            &self.localized
        } else {
            &self.geometric
        }
    }
}

fn lambda_plots(scan: &Scan, model: &str) -> Vec<LambdaPlot> {
    let same = |a: &[Option<Lambda>], b: &[Option<Lambda>]| {
        a.len() == b.len()
            && a.iter().zip(b).all(|pair| match pair {
                (Some(Lambda::Finite(x)), Some(Lambda::Finite(y))) => (x - y).abs() < 1e-4,
                (x, y) => x == y,
            })
    };
    let mut groups: Vec<(String, &[Option<Lambda>], bool)> = Vec::new();
    for series in scan.lambdas.iter().filter(|s| s.key.model == model) {
        let lone_pair = series.key.partner.is_none();
        let short = series
            .name
            .trim_start_matches("λ ")
            .trim_start_matches(model)
            .trim();
        match groups
            .iter_mut()
            .find(|(_, values, kind)| *kind == lone_pair && same(values, &series.values))
        {
            Some((name, _, _)) => {
                name.push_str(", ");
                name.push_str(short);
            }
            None => groups.push((short.to_string(), &series.values, lone_pair)),
        }
    }
    groups
        .into_iter()
        .map(|(name, values, lone_pair)| {
            let finite: Vec<Option<f64>> = values
                .iter()
                .map(|value| match value {
                    Some(Lambda::Finite(lambda)) => Some(*lambda),
                    _ => None,
                })
                .collect();
            let at = |kind: Lambda, y: f64| -> Vec<[f64; 2]> {
                values
                    .iter()
                    .zip(&scan.points)
                    .filter(|(value, _)| **value == Some(kind))
                    .map(|(_, point)| [point.value, y])
                    .collect()
            };
            LambdaPlot {
                name,
                lone_pair,
                segments: segments(scan, &finite),
                pure_p: at(Lambda::PureP, LAMBDA_TOP),
                unsolved: at(Lambda::NoSolution, 0.0),
            }
        })
        .collect()
}

/// The curve's name, and its label at the last point when the symmetry there renames it
/// (ammonia's 3a1 becomes 1a2″ when planar).
fn end_label(curve: &Curve) -> String {
    match curve.labels.last().cloned().flatten() {
        Some(last) if last != curve.label => format!("{} → {last}", curve.label),
        _ => curve.label.clone(),
    }
}

/// Unbroken runs of (coordinate, value) where the value exists.
fn segments(scan: &Scan, values: &[Option<f64>]) -> Vec<Vec<[f64; 2]>> {
    let mut runs = Vec::new();
    let mut current = Vec::new();
    for (point, value) in scan.points.iter().zip(values) {
        match value {
            Some(y) if y.is_finite() => current.push([point.value, *y]),
            _ => {
                if !current.is_empty() {
                    runs.push(std::mem::take(&mut current));
                }
            }
        }
    }
    if !current.is_empty() {
        runs.push(current);
    }
    runs
}

/// From just below the lowest level to 6 eV above the highest occupied one along the
/// scan (the empty levels far above say little in a Walsh argument).
fn energy_window(scan: &Scan) -> (f64, f64) {
    let levels = scan
        .curves
        .iter()
        .flat_map(|curve| curve.energies.iter().zip(&curve.occupancies));
    let mut low = f64::INFINITY;
    let mut homo_high = f64::NEG_INFINITY;
    for (energy, occupancy) in levels {
        let Some(energy) = energy else {
            continue;
        };
        low = low.min(*energy);
        if occupancy.is_some_and(|o| o > 1e-6) {
            homo_high = homo_high.max(*energy);
        }
    }
    if !low.is_finite() || !homo_high.is_finite() {
        return (-30.0, 5.0);
    }
    (low - 1.0, homo_high + 6.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use diptych::analysis::Settings;
    use diptych::scan::{Coordinate, ScanProgress, ScanRequest, run_scan};

    #[test]
    fn ammonia_flattening_gives_one_bond_curve_and_a_pure_p_lone_pair_at_the_end() {
        let molecule = crate::app::state::default_molecule();
        let request = ScanRequest {
            coordinate: Coordinate::Pyramidalize { centre: 0 },
            from: 100.0,
            to: 120.0,
            steps: 5,
        };
        let scan = run_scan(
            &molecule,
            &Settings::default(),
            &request,
            &ScanProgress::new(),
        )
        .expect("scan runs");
        let plot = WalshPlot::new(Arc::new(scan));
        let geometric = plot.lambdas(false);
        // The three N–H bonds are equivalent by C3v symmetry: one curve.
        assert_eq!(geometric.len(), 2, "bonds and lone pair");
        assert!(
            geometric[0].name.contains("N0–H1, N0–H2, N0–H3")
                || geometric[1].name.contains("N0–H1, N0–H2, N0–H3")
        );
        // At the planar end (120°) the lone pair is pure p (Coulson, Valence, from memory).
        let lone_pair = geometric
            .iter()
            .find(|g| g.name.starts_with("n("))
            .expect("lone pair");
        assert_eq!(lone_pair.pure_p, vec![[120.0, LAMBDA_TOP]]);
        // The lone-pair level ends relabelled in D3h.
        assert!(
            plot.curves
                .iter()
                .any(|c| c.end.as_ref().is_some_and(|(_, text)| text.contains('→')))
        );
        assert!(plot.energy_window.0 < plot.energy_window.1);
    }
}
