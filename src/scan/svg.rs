//! The Walsh diagram of a scan as a standalone SVG 1.1 document (W3C, Scalable Vector
//! Graphics 1.1, 2nd ed., 2011), written with the diagram writer's helpers: MO energy
//! against the coordinate, one polyline per followed curve coloured by its irrep family
//! (occupied solid, empty dashed), the curve's label at its right end, a legend of the
//! irreps, axes with ticks and units, failed points marked on the axis. Numbers have
//! fixed precision, so the same scan always gives the same bytes.

use std::fmt::Write;

use super::palette::{curve_rgb, irrep_colours};
use super::{Lambda, Scan};
use crate::diagram::style::{format_energy, level_rgb};
use crate::diagram::svg::{
    PlotHeader, colour, escape_xml, label_markup, number, write_plot_header,
};

/// Export choices.
#[derive(Clone, Debug, PartialEq)]
pub struct WalshSvgOptions {
    pub width: f64,
    pub height: f64,
    pub font_family: String,
    pub font_size: f64,
    pub greyscale: bool,
    /// Energy window (eV, low, high); `None`: from the lowest level to 6 eV above the
    /// highest occupied one or just above the LUMO (the empty levels far above carry
    /// little of a Walsh argument).
    pub energy_window: Option<(f64, f64)>,
    /// A vertical marker at this coordinate value (the current geometry).
    pub marker: Option<f64>,
    /// Title above the plot; `None`: "Walsh diagram: " and the coordinate.
    pub title: Option<String>,
    /// A panel of λ (bonds and lone pairs, both models) under the energies.
    pub lambda_panel: bool,
    /// A panel of Σ occupancy × ε under the energies.
    pub sum_panel: bool,
}

impl Default for WalshSvgOptions {
    fn default() -> Self {
        WalshSvgOptions {
            width: 900.0,
            height: 900.0,
            font_family: "DejaVu Sans, Arial, Helvetica, sans-serif".into(),
            font_size: 14.0,
            greyscale: false,
            energy_window: None,
            marker: None,
            title: None,
            lambda_panel: true,
            sum_panel: true,
        }
    }
}

/// What the Σε panel can and cannot say, printed under the figure when it is drawn.
const SUM_CAPTION: [&str; 3] = [
    "Σε: the sum of occupied orbital energies, from which Walsh's rule reads shape trends",
    "(A. D. Walsh, J. Chem. Soc. 1953, 2260). Extended Hückel leaves out the repulsions that also change",
    "with shape, so its Σε can favour the wrong geometry (it falls toward planar NH₃ and linear H₂O).",
];
/// What a × on the λ panel means.
const UNSOLVED_CAPTION: &str = "×: Coulson's relations have no solution here (bonds at 90° or less); the geometric λ has a gap.";
/// Caption text size relative to the figure's font.
const CAPTION_SCALE: f64 = 0.85;

const INK: [u8; 3] = [34, 34, 34];
const FAINT: [u8; 3] = [150, 150, 150];

/// Tick positions at 1, 2 or 5 × 10ᵏ covering [low, high] with about `count` steps.
pub(crate) fn ticks(low: f64, high: f64, count: f64) -> (Vec<f64>, f64) {
    let span = (high - low).abs().max(1e-9);
    let raw = span / count;
    let power = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * power)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * power);
    let start = (low / step).ceil() as i64;
    let end = (high / step).floor() as i64;
    ((start..=end).map(|k| k as f64 * step).collect(), step)
}

pub(crate) fn tick_text(value: f64, step: f64) -> String {
    let decimals = if step >= 1.0 {
        0
    } else {
        (-step.log10().floor()) as usize
    };
    format_energy(value, decimals)
}

/// The default energy window: lowest level − 1 eV up to 6 eV above the highest occupied
/// level or 1 eV above the highest LUMO, whichever is higher.
fn default_window(scan: &Scan) -> (f64, f64) {
    let mut low = f64::INFINITY;
    let mut high_occupied = f64::NEG_INFINITY;
    let mut high_lumo = f64::NEG_INFINITY;
    for p in 0..scan.points.len() {
        let mut lumo = f64::INFINITY;
        for curve in &scan.curves {
            let Some(e) = curve.energies[p] else { continue };
            low = low.min(e);
            if curve.occupancies[p].is_some_and(|n| n > 0.0) {
                high_occupied = high_occupied.max(e);
            } else {
                lumo = lumo.min(e);
            }
        }
        if lumo.is_finite() {
            high_lumo = high_lumo.max(lumo);
        }
    }
    if !low.is_finite() {
        return (-1.0, 1.0);
    }
    if !high_occupied.is_finite() {
        high_occupied = low;
    }
    (low - 1.0, (high_occupied + 6.0).max(high_lumo + 1.0))
}

/// The Walsh diagram as SVG text.
pub fn walsh_svg(scan: &Scan, options: &WalshSvgOptions) -> String {
    let (w, h, fs) = (options.width, options.height, options.font_size);
    let mut caption: Vec<&str> = Vec::new();
    if options.lambda_panel && unsolved_anywhere(scan) {
        caption.push(UNSOLVED_CAPTION);
    }
    if options.sum_panel {
        caption.extend(SUM_CAPTION);
    }
    let caption_line = CAPTION_SCALE * fs * 1.25;
    let caption_height = caption_line * caption.len() as f64;
    let (left, right, top, axis_bottom) = (92.0, w - 160.0, 50.0, h - 95.0 - caption_height);
    // Extra panels share the x axis below the energies.
    let extra = usize::from(options.lambda_panel) + usize::from(options.sum_panel);
    let gap = 24.0;
    let panel_height = (axis_bottom - top) * 0.2;
    let bottom = axis_bottom - extra as f64 * (panel_height + gap);
    let values = scan.values();
    let x_low = values.iter().copied().fold(f64::INFINITY, f64::min);
    let x_high = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let (x_low, x_high) = if x_high > x_low {
        (x_low, x_high)
    } else {
        (x_low - 1.0, x_low + 1.0)
    };
    let (e_low, e_high) = options
        .energy_window
        .unwrap_or_else(|| default_window(scan));
    let (e_low, e_high) = if e_high > e_low {
        (e_low, e_high)
    } else {
        (e_low - 1.0, e_low + 1.0)
    };
    let x_of = |x: f64| left + (x - x_low) / (x_high - x_low) * (right - left);
    let y_of = |e: f64| bottom - (e - e_low) / (e_high - e_low) * (bottom - top);
    let ink = colour(INK, options.greyscale);
    let faint = colour(FAINT, options.greyscale);
    let palette = irrep_colours(scan);
    let rgb_colour = |rgb: Option<[u8; 3]>| colour(rgb.unwrap_or(INK), options.greyscale);

    let mut svg = String::new();
    let title = options
        .title
        .clone()
        .unwrap_or_else(|| format!("Walsh diagram: {}", scan.request.coordinate.describe()));
    write_plot_header(
        &mut svg,
        &PlotHeader {
            width: w,
            height: h,
            font_family: &options.font_family,
            font_size: fs,
            title: &title,
            title_at: (left, top - 20.0),
            ink: &ink,
        },
    );
    let _ = writeln!(
        svg,
        "<clipPath id=\"plot\"><rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/></clipPath>",
        number(left),
        number(top),
        number(right - left),
        number(bottom - top)
    );

    // Axes, ticks, units.
    let _ = writeln!(
        svg,
        "<g id=\"axes\" stroke=\"{ink}\" stroke-width=\"1\" fill=\"none\">"
    );
    let _ = writeln!(
        svg,
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/>",
        number(left),
        number(top),
        number(right - left),
        number(bottom - top)
    );
    let (x_ticks, x_step) = ticks(x_low, x_high, 6.0);
    for &x in &x_ticks {
        let _ = writeln!(
            svg,
            "<line x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\"/>",
            number(x_of(x)),
            number(bottom),
            number(bottom + 5.0)
        );
    }
    let (e_ticks, e_step) = ticks(e_low, e_high, 8.0);
    for &e in &e_ticks {
        let _ = writeln!(
            svg,
            "<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\"/>",
            number(left - 5.0),
            number(y_of(e)),
            number(left)
        );
    }
    let _ = writeln!(svg, "</g>");
    let _ = writeln!(svg, "<g id=\"tick-labels\" fill=\"{ink}\">");
    for &x in &x_ticks {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
            number(x_of(x)),
            number(axis_bottom + 8.0 + fs),
            escape_xml(&tick_text(x, x_step))
        );
    }
    for &e in &e_ticks {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" text-anchor=\"end\">{}</text>",
            number(left - 8.0),
            number(y_of(e) + fs * 0.35),
            escape_xml(&tick_text(e, e_step))
        );
    }
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
        number((left + right) / 2.0),
        number(axis_bottom + 12.0 + 2.0 * fs),
        escape_xml(&scan.request.coordinate.describe())
    );
    let _ = writeln!(
        svg,
        "<text transform=\"translate({},{}) rotate(-90)\" text-anchor=\"middle\">orbital energy (eV)</text>",
        number(title_x(
            left,
            e_ticks
                .iter()
                .map(|&e| tick_text(e, e_step).chars().count())
                .max()
                .unwrap_or(0),
            fs
        )),
        number((top + bottom) / 2.0)
    );
    let _ = writeln!(svg, "</g>");

    // Curves, broken at failed points.
    let _ = writeln!(
        svg,
        "<g id=\"curves\" clip-path=\"url(#plot)\" fill=\"none\" stroke-width=\"1.6\">"
    );
    for curve in &scan.curves {
        let occupied = curve.occupancies.iter().flatten().any(|&n| n > 0.0);
        let dash = if occupied {
            ""
        } else {
            " stroke-dasharray=\"5 3\""
        };
        let stroke = rgb_colour(curve_rgb(&palette, curve));
        let mut segment: Vec<String> = Vec::new();
        let flush = |segment: &mut Vec<String>, svg: &mut String| {
            if segment.len() > 1 {
                let _ = writeln!(
                    svg,
                    "<polyline stroke=\"{stroke}\"{dash} points=\"{}\"><title>{}</title></polyline>",
                    segment.join(" "),
                    escape_xml(&curve.name)
                );
            }
            segment.clear();
        };
        for (value, energy) in values.iter().zip(&curve.energies) {
            match energy {
                Some(e) => segment.push(format!("{},{}", number(x_of(*value)), number(y_of(*e)))),
                None => flush(&mut segment, &mut svg),
            }
        }
        flush(&mut segment, &mut svg);
    }
    let _ = writeln!(svg, "</g>");

    // Failed points: crosses on the lower axis.
    let failed = scan.failed_points();
    if !failed.is_empty() {
        let _ = writeln!(
            svg,
            "<g id=\"failed-points\" stroke=\"{faint}\" stroke-width=\"1.5\">"
        );
        for p in failed {
            let (x, y) = (x_of(values[p]), bottom - 6.0);
            let _ = writeln!(
                svg,
                "<path d=\"M{} {}L{} {}M{} {}L{} {}\"/>",
                number(x - 4.0),
                number(y - 4.0),
                number(x + 4.0),
                number(y + 4.0),
                number(x - 4.0),
                number(y + 4.0),
                number(x + 4.0),
                number(y - 4.0)
            );
        }
        let _ = writeln!(svg, "</g>");
    }

    if let Some(marker) = options.marker.filter(|m| m.is_finite()) {
        let x = x_of(marker.clamp(x_low, x_high));
        let _ = writeln!(
            svg,
            "<line id=\"marker\" x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\" stroke=\"{faint}\" stroke-dasharray=\"2 3\"/>",
            number(x),
            number(top),
            number(bottom)
        );
    }

    // End labels at each curve's last energy inside the window, spread to avoid overlap. A
    // curve whose label at its last point differs (the point group changed) shows both:
    // "3a₁ → 1a₂″".
    let mut ends: Vec<(f64, String, String)> = Vec::new();
    for curve in &scan.curves {
        let Some(p) = (0..curve.energies.len())
            .rev()
            .find(|&p| curve.energies[p].is_some())
        else {
            continue;
        };
        let last = curve.energies[p].unwrap_or(f64::NAN);
        if !(e_low..=e_high).contains(&last) {
            continue;
        }
        // Two text elements: a subscript's baseline shift is undone by an empty tspan,
        // which some renderers skip, so nothing may follow it in the same element.
        let x = right + 6.0;
        let mut text = format!(
            "<text x=\"{}\" y=\"{{y}}\">{}</text>",
            number(x),
            label_markup(&curve.label, fs)
        );
        if let Some(end) = curve.labels[p].as_ref().filter(|l| **l != curve.label) {
            let width = fs * 0.6 * curve.label.chars().count() as f64;
            text.push_str(&format!(
                "<text x=\"{}\" y=\"{{y}}\">→ {}</text>",
                number(x + width + 4.0),
                label_markup(end, fs)
            ));
        }
        if ends
            .iter()
            .any(|(e, t, _)| *t == text && (e - last).abs() < 1e-6)
        {
            continue;
        }
        ends.push((last, text, rgb_colour(curve_rgb(&palette, curve))));
    }
    ends.sort_by(|a, b| b.0.total_cmp(&a.0));
    let mut y_prev = f64::NEG_INFINITY;
    let _ = writeln!(svg, "<g id=\"end-labels\">");
    for (energy, text, fill) in &ends {
        let y = (y_of(*energy) + fs * 0.35).max(y_prev + fs * 1.05);
        y_prev = y;
        let _ = writeln!(
            svg,
            "<g fill=\"{fill}\">{}</g>",
            text.replace("{y}", &number(y).to_string())
        );
    }
    let _ = writeln!(svg, "</g>");

    let frame = Frame {
        left,
        right,
        x_of: &x_of,
        x_values: &values,
        x_ticks: &x_ticks,
        ink: &ink,
        font_size: fs,
        marker: options
            .marker
            .filter(|m| m.is_finite())
            .map(|m| x_of(m.clamp(x_low, x_high))),
        faint: &faint,
    };
    let mut panel_top = bottom + gap;
    if options.lambda_panel {
        let series = lambda_panel_series(scan, options.greyscale);
        frame.panel(
            &mut svg,
            "lambda",
            (panel_top, panel_top + panel_height),
            "λ",
            &series,
            Some(10.0),
        );
        panel_top += panel_height + gap;
    }
    if options.sum_panel {
        let series = vec![Series {
            values: scan.points.iter().map(|p| p.sum_occupied_ev).collect(),
            stroke: ink.clone(),
            dashed: false,
            end_label: "Σ occ. ε (eV)".into(),
            unsolved: Vec::new(),
        }];
        frame.panel(
            &mut svg,
            "sum",
            (panel_top, panel_top + panel_height),
            "Σε (eV)",
            &series,
            None,
        );
    }

    // Legend: one swatch per irrep present, in order of first appearance.
    let _ = writeln!(svg, "<g id=\"legend\" fill=\"{ink}\">");
    let legend_y = h - 22.0 - caption_height;
    let mut x = left;
    for (irrep, rgb) in &palette {
        let _ = writeln!(
            svg,
            "<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\" stroke=\"{3}\" stroke-width=\"3\"/>",
            number(x),
            number(legend_y - fs * 0.35),
            number(x + 18.0),
            rgb_colour(*rgb)
        );
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\">{}</text>",
            number(x + 22.0),
            number(legend_y),
            label_markup(irrep, fs)
        );
        x += 34.0 + fs * 0.7 * irrep.chars().count() as f64;
    }
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" fill=\"{faint}\">{}</text>",
        number(x + 10.0),
        number(legend_y),
        if options.lambda_panel {
            "levels: solid occupied, dashed empty; λ: solid geometric, dashed localized"
        } else {
            "solid: occupied, dashed: empty"
        }
    );
    for (k, line) in caption.iter().enumerate() {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\">{}</text>",
            number(left),
            number(h - 22.0 - caption_height + caption_line * (k + 1) as f64),
            number(CAPTION_SCALE * fs),
            escape_xml(line)
        );
    }
    let _ = writeln!(svg, "</g>");
    let _ = writeln!(svg, "</svg>");
    svg
}

/// One line of a side panel.
struct Series {
    values: Vec<Option<f64>>,
    stroke: String,
    dashed: bool,
    end_label: String,
    /// Points where the model has no value (drawn as a gap and a × on the panel's floor).
    unsolved: Vec<usize>,
}

/// λ series: bonds in the σ colour, lone pairs in the n colour; geometric model solid,
/// localized-MO model dashed. A pure p orbital (λ → ∞) leaves a gap in its line and is
/// labelled "p" at the end.
fn lambda_panel_series(scan: &Scan, greyscale: bool) -> Vec<Series> {
    scan.lambdas
        .iter()
        .map(|series| {
            let lone_pair = series.key.partner.is_none();
            let rgb = level_rgb(if lone_pair { "n" } else { "σ" }).unwrap_or(INK);
            let last = series.values.iter().rev().flatten().next();
            let kind = if lone_pair { "n" } else { "σ" };
            let pure_p = if matches!(last, Some(Lambda::PureP)) {
                " (p)"
            } else {
                ""
            };
            Series {
                values: series
                    .values
                    .iter()
                    .map(|v| match v {
                        Some(Lambda::Finite(value)) => Some(*value),
                        _ => None,
                    })
                    .collect(),
                stroke: colour(rgb, greyscale),
                dashed: series.key.model == "localized",
                end_label: format!("{kind} {}{pure_p}", series.key.model),
                unsolved: series
                    .values
                    .iter()
                    .enumerate()
                    .filter(|(_, v)| matches!(v, Some(Lambda::NoSolution)))
                    .map(|(k, _)| k)
                    .collect(),
            }
        })
        .collect()
}

/// Whether a λ series has a point without a value of its model.
fn unsolved_anywhere(scan: &Scan) -> bool {
    scan.lambdas.iter().any(|s| {
        s.values
            .iter()
            .any(|v| matches!(v, Some(Lambda::NoSolution)))
    })
}

/// Where a rotated y-axis title goes: clear of tick labels `widest` characters wide
/// (DejaVu Sans digits advance 0.64 em and the minus sign 0.84 em, so 0.7 em a character
/// is safe; the title's descenders reach 0.25 em to its right, its ascenders 0.75 em to
/// its left).
fn title_x(left: f64, widest: usize, font_size: f64) -> f64 {
    let labels = 8.0 + 0.7 * font_size * widest as f64;
    (left - labels - 0.45 * font_size).max(0.8 * font_size)
}

/// What every panel shares: the x axis.
struct Frame<'a> {
    left: f64,
    right: f64,
    x_of: &'a dyn Fn(f64) -> f64,
    x_values: &'a [f64],
    x_ticks: &'a [f64],
    ink: &'a str,
    faint: &'a str,
    font_size: f64,
    marker: Option<f64>,
}

impl Frame<'_> {
    /// A panel between `top` and `bottom` with its own y range (clipped to `cap` above).
    fn panel(
        &self,
        svg: &mut String,
        id: &str,
        (top, bottom): (f64, f64),
        y_title: &str,
        series: &[Series],
        cap: Option<f64>,
    ) {
        let fs = self.font_size;
        let finite = series
            .iter()
            .flat_map(|s| s.values.iter().flatten().copied());
        let (mut low, mut high) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(v), b.max(v))
        });
        if let Some(cap) = cap {
            high = high.min(cap);
            low = 0.0;
        }
        if !(low.is_finite() && high.is_finite()) {
            (low, high) = (0.0, 1.0);
        }
        let pad = ((high - low) * 0.08).max(1e-3);
        let (low, high) = (low - pad, high + pad);
        let y_of = |v: f64| bottom - (v - low) / (high - low) * (bottom - top);
        let (ink, faint) = (self.ink, self.faint);
        let _ = writeln!(
            svg,
            "<clipPath id=\"clip-{id}\"><rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/></clipPath>",
            number(self.left),
            number(top),
            number(self.right - self.left),
            number(bottom - top)
        );
        let _ = writeln!(svg, "<g id=\"panel-{id}\" fill=\"none\" stroke=\"{ink}\">");
        let _ = writeln!(
            svg,
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/>",
            number(self.left),
            number(top),
            number(self.right - self.left),
            number(bottom - top)
        );
        for &x in self.x_ticks {
            let _ = writeln!(
                svg,
                "<line x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\"/>",
                number((self.x_of)(x)),
                number(bottom),
                number(bottom + 5.0)
            );
        }
        let (y_ticks, y_step) = ticks(low, high, 3.0);
        for &v in &y_ticks {
            let _ = writeln!(
                svg,
                "<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\"/>",
                number(self.left - 5.0),
                number(y_of(v)),
                number(self.left)
            );
        }
        if let Some(x) = self.marker {
            let _ = writeln!(
                svg,
                "<line x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\" stroke=\"{faint}\" stroke-dasharray=\"2 3\"/>",
                number(x),
                number(top),
                number(bottom)
            );
        }
        let _ = writeln!(
            svg,
            "<g clip-path=\"url(#clip-{id})\" stroke-width=\"1.6\">"
        );
        // × marks of points without a value, drawn unclipped (they may sit on the frame).
        let mut marks = String::new();
        for line in series {
            let dash = if line.dashed {
                " stroke-dasharray=\"5 3\""
            } else {
                ""
            };
            let mut segment: Vec<String> = Vec::new();
            let mut segments: Vec<String> = Vec::new();
            for (x, v) in self.x_values.iter().zip(&line.values) {
                match v {
                    Some(v) => {
                        segment.push(format!("{},{}", number((self.x_of)(*x)), number(y_of(*v))))
                    }
                    None => {
                        if segment.len() > 1 {
                            segments.push(segment.join(" "));
                        }
                        segment.clear();
                    }
                }
            }
            if segment.len() > 1 {
                segments.push(segment.join(" "));
            }
            for points in segments {
                let _ = writeln!(
                    svg,
                    "<polyline stroke=\"{}\"{dash} points=\"{points}\"/>",
                    line.stroke
                );
            }
            for &k in &line.unsolved {
                let (x, y) = ((self.x_of)(self.x_values[k]), bottom - 5.0);
                let _ = writeln!(
                    marks,
                    "<path stroke=\"{}\" d=\"M{} {}L{} {}M{} {}L{} {}\"/>",
                    line.stroke,
                    number(x - 3.0),
                    number(y - 3.0),
                    number(x + 3.0),
                    number(y + 3.0),
                    number(x - 3.0),
                    number(y + 3.0),
                    number(x + 3.0),
                    number(y - 3.0)
                );
            }
        }
        let _ = writeln!(svg, "</g>");
        svg.push_str(&marks);
        let _ = writeln!(svg, "</g>");
        let _ = writeln!(svg, "<g id=\"panel-{id}-labels\" fill=\"{ink}\">");
        for &v in &y_ticks {
            let _ = writeln!(
                svg,
                "<text x=\"{}\" y=\"{}\" text-anchor=\"end\">{}</text>",
                number(self.left - 8.0),
                number(y_of(v) + fs * 0.35),
                escape_xml(&tick_text(v, y_step))
            );
        }
        let widest = y_ticks
            .iter()
            .map(|&v| tick_text(v, y_step).chars().count())
            .max()
            .unwrap_or(0);
        let _ = writeln!(
            svg,
            "<text transform=\"translate({},{}) rotate(-90)\" text-anchor=\"middle\">{}</text>",
            number(title_x(self.left, widest, fs)),
            number((top + bottom) / 2.0),
            escape_xml(y_title)
        );
        // End labels, one per distinct text and height (symmetric bonds coincide).
        let mut placed: Vec<(String, f64)> = Vec::new();
        for line in series {
            let Some(last) = line.values.iter().rev().flatten().next() else {
                continue;
            };
            let y = y_of(last.clamp(low, high)) + fs * 0.35;
            if placed
                .iter()
                .any(|(text, at)| *text == line.end_label && (at - y).abs() < fs)
            {
                continue;
            }
            placed.push((line.end_label.clone(), y));
        }
        placed.sort_by(|a, b| a.1.total_cmp(&b.1));
        let mut y_prev = f64::NEG_INFINITY;
        for (text, y) in placed {
            let y = y.max(y_prev + fs * 1.05);
            y_prev = y;
            let _ = writeln!(
                svg,
                "<text x=\"{}\" y=\"{}\">{}</text>",
                number(self.right + 6.0),
                number(y),
                escape_xml(&text)
            );
        }
        let _ = writeln!(svg, "</g>");
    }
}
