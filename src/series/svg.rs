//! The series plots as one standalone SVG 1.1 document (W3C, Scalable Vector Graphics 1.1,
//! 2nd ed., 2011), written with the diagram writer's helpers (`escape_xml`, `number`,
//! `colour`) and the Walsh writer's ticks: on the left the donor lone pair's energy against
//! its %s; on the right −ε(HOMO) and −ε(lone pair) against the measured first vertical
//! ionization energy, each with its least-squares line and the slope, offset and r² in the
//! legend. Each point is labelled with its formula. Fixed precision: the same series
//! always gives the same bytes.

use std::fmt::Write;

use super::fit::{LineFit, paired};
use super::table::fixed;
use super::{Series, SeriesRow};
use crate::chem::formula::subscript_runs;
use crate::diagram::svg::{PlotHeader, colour, escape_xml, number, write_plot_header};
use crate::scan::svg::{tick_text, ticks};

/// Export choices.
#[derive(Clone, Debug, PartialEq)]
pub struct SeriesSvgOptions {
    pub width: f64,
    pub height: f64,
    pub font_family: String,
    pub font_size: f64,
    pub greyscale: bool,
    /// Title above the plots; `None`: a default naming the series' size.
    pub title: Option<String>,
}

impl Default for SeriesSvgOptions {
    fn default() -> Self {
        SeriesSvgOptions {
            width: 1200.0,
            height: 560.0,
            font_family: "DejaVu Sans, Arial, Helvetica, sans-serif".into(),
            font_size: 14.0,
            greyscale: false,
            title: None,
        }
    }
}

const INK: [u8; 3] = [34, 34, 34];
const HOMO_RGB: [u8; 3] = [40, 90, 170];
const LONE_PAIR_RGB: [u8; 3] = [196, 100, 20];

/// One plot's box in document units and its data ranges.
struct Panel {
    left: f64,
    right: f64,
    top: f64,
    bottom: f64,
    x: (f64, f64),
    y: (f64, f64),
}

impl Panel {
    fn x_of(&self, x: f64) -> f64 {
        self.left + (x - self.x.0) / (self.x.1 - self.x.0) * (self.right - self.left)
    }
    fn y_of(&self, y: f64) -> f64 {
        self.bottom - (y - self.y.0) / (self.y.1 - self.y.0) * (self.bottom - self.top)
    }
}

/// The range of `values` widened by 8 % each side; (0, 1) when there are none.
fn padded(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (low, high) = values
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), v| {
            (l.min(v), h.max(v))
        });
    if !low.is_finite() {
        return (0.0, 1.0);
    }
    let span = (high - low).max(1.0);
    (low - 0.08 * span, high + 0.08 * span)
}

/// A label with its formula digits as subscripts ("NH3" → NH₃, see
/// `chem::formula::subscript_runs`), each shift undone after its run.
fn formula_markup(label: &str, font_size: f64) -> String {
    let shift = font_size * 0.25;
    let mut out = String::new();
    for (run, subscript) in subscript_runs(label) {
        let text = escape_xml(&run);
        if subscript {
            let _ = write!(
                out,
                "<tspan dy=\"{}\" font-size=\"{}\">{text}</tspan><tspan dy=\"{}\"></tspan>",
                number(shift),
                number(font_size * 0.75),
                number(-shift)
            );
        } else {
            let _ = write!(out, "<tspan>{text}</tspan>");
        }
    }
    out
}

/// The series plots as SVG text.
pub fn series_svg(series: &Series, options: &SeriesSvgOptions) -> String {
    let (w, h, fs) = (options.width, options.height, options.font_size);
    let ink = colour(INK, options.greyscale);
    let mut svg = String::new();
    let title = options.title.clone().unwrap_or_else(|| {
        format!(
            "Donor lone pairs of {} molecules (extended Hückel)",
            series.rows.len()
        )
    });
    write_plot_header(
        &mut svg,
        &PlotHeader {
            width: w,
            height: h,
            font_family: &options.font_family,
            font_size: fs,
            title: &title,
            title_at: (70.0, 30.0),
            ink: &ink,
        },
    );
    let half = w / 2.0;
    let (top, bottom) = (60.0, h - 120.0);
    energy_against_s(&mut svg, series, (75.0, half - 40.0, top, bottom), options);
    koopmans(
        &mut svg,
        series,
        (half + 75.0, w - 40.0, top, bottom),
        options,
    );
    let _ = writeln!(svg, "</svg>");
    svg
}

/// Left panel: ε(donor lone pair) against its %s.
fn energy_against_s(
    svg: &mut String,
    series: &Series,
    frame: (f64, f64, f64, f64),
    options: &SeriesSvgOptions,
) {
    let points: Vec<(f64, f64, &SeriesRow)> = series
        .rows
        .iter()
        .filter_map(|row| {
            let donor = row.donor.as_ref()?;
            Some((donor.s_percent?, donor.energy_ev, row))
        })
        .collect();
    let panel = Panel {
        left: frame.0,
        right: frame.1,
        top: frame.2,
        bottom: frame.3,
        x: padded(points.iter().map(|p| p.0)),
        y: padded(points.iter().map(|p| p.1)),
    };
    let _ = writeln!(svg, "<g id=\"lone-pair-energy-vs-s\">");
    axes(
        svg,
        &panel,
        "%s of the donor lone pair",
        "ε(lone pair) (eV)",
        options,
    );
    let marks = Marks {
        marker: Marker::Diamond,
        rgb: LONE_PAIR_RGB,
    };
    markers(svg, &panel, &points, marks, &mut Vec::new(), options);
    if points.is_empty() {
        no_data(
            svg,
            &panel,
            "no donor lone pair with a hybrid shape",
            options,
        );
    }
    let _ = writeln!(svg, "</g>");
}

/// Right panel: −ε(HOMO) and −ε(lone pair) against the measured ionization energy.
fn koopmans(
    svg: &mut String,
    series: &Series,
    frame: (f64, f64, f64, f64),
    options: &SeriesSvgOptions,
) {
    let homo = |row: &SeriesRow| row.homo.as_ref().map(|h| -h.energy_ev);
    let lone_pair = |row: &SeriesRow| row.donor.as_ref().map(|d| -d.energy_ev);
    let with_rows = |computed: &dyn Fn(&SeriesRow) -> Option<f64>| -> Vec<(f64, f64, &SeriesRow)> {
        series
            .rows
            .iter()
            .filter_map(|row| Some((row.measured.as_ref()?.energy_ev, computed(row)?, row)))
            .collect()
    };
    let homo_points = with_rows(&homo);
    let lone_pair_points = with_rows(&lone_pair);
    let all = paired(&series.rows, homo)
        .into_iter()
        .chain(paired(&series.rows, lone_pair));
    let (xs, ys): (Vec<f64>, Vec<f64>) = all.unzip();
    // One scale for both axes' spans would hide EHT's slope; each axis keeps its own.
    let panel = Panel {
        left: frame.0,
        right: frame.1,
        top: frame.2,
        bottom: frame.3,
        x: padded(xs.into_iter()),
        y: padded(ys.into_iter()),
    };
    let _ = writeln!(svg, "<g id=\"koopmans\">");
    axes(
        svg,
        &panel,
        "measured first vertical ionization energy (eV)",
        "−ε (eV)",
        options,
    );
    fit_line(svg, &panel, series.homo_fit.as_ref(), HOMO_RGB, "", options);
    fit_line(
        svg,
        &panel,
        series.lone_pair_fit.as_ref(),
        LONE_PAIR_RGB,
        " stroke-dasharray=\"6 4\"",
        options,
    );
    let mut placed = Vec::new();
    let homo_marks = Marks {
        marker: Marker::Circle,
        rgb: HOMO_RGB,
    };
    let lone_pair_marks = Marks {
        marker: Marker::Diamond,
        rgb: LONE_PAIR_RGB,
    };
    markers(svg, &panel, &homo_points, homo_marks, &mut placed, options);
    markers(
        svg,
        &panel,
        &lone_pair_points,
        lone_pair_marks,
        &mut placed,
        options,
    );
    if homo_points.is_empty() {
        no_data(
            svg,
            &panel,
            "no molecule has a measured ionization energy",
            options,
        );
    }
    legend(svg, &panel, series, options);
    let _ = writeln!(svg, "</g>");
}

/// The frame, ticks, tick labels and axis titles of a panel.
fn axes(svg: &mut String, panel: &Panel, x_title: &str, y_title: &str, options: &SeriesSvgOptions) {
    let ink = colour(INK, options.greyscale);
    let fs = options.font_size;
    let _ = writeln!(svg, "<g stroke=\"{ink}\" stroke-width=\"1\" fill=\"none\">");
    let _ = writeln!(
        svg,
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/>",
        number(panel.left),
        number(panel.top),
        number(panel.right - panel.left),
        number(panel.bottom - panel.top)
    );
    let (x_ticks, x_step) = ticks(panel.x.0, panel.x.1, 6.0);
    let (y_ticks, y_step) = ticks(panel.y.0, panel.y.1, 6.0);
    for &x in &x_ticks {
        let _ = writeln!(
            svg,
            "<line x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\"/>",
            number(panel.x_of(x)),
            number(panel.bottom),
            number(panel.bottom + 5.0)
        );
    }
    for &y in &y_ticks {
        let _ = writeln!(
            svg,
            "<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\"/>",
            number(panel.left - 5.0),
            number(panel.y_of(y)),
            number(panel.left)
        );
    }
    let _ = writeln!(svg, "</g>");
    let _ = writeln!(svg, "<g fill=\"{ink}\">");
    for &x in &x_ticks {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
            number(panel.x_of(x)),
            number(panel.bottom + 8.0 + fs),
            escape_xml(&tick_text(x, x_step))
        );
    }
    for &y in &y_ticks {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" text-anchor=\"end\">{}</text>",
            number(panel.left - 8.0),
            number(panel.y_of(y) + fs * 0.35),
            escape_xml(&tick_text(y, y_step))
        );
    }
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
        number((panel.left + panel.right) / 2.0),
        number(panel.bottom + 12.0 + 2.0 * fs),
        escape_xml(x_title)
    );
    let _ = writeln!(
        svg,
        "<text transform=\"translate({},{}) rotate(-90)\" text-anchor=\"middle\">{}</text>",
        number(panel.left - 50.0),
        number((panel.top + panel.bottom) / 2.0),
        escape_xml(y_title)
    );
    let _ = writeln!(svg, "</g>");
}

#[derive(Clone, Copy)]
enum Marker {
    Circle,
    Diamond,
}

/// How one set of points is drawn.
#[derive(Clone, Copy)]
struct Marks {
    marker: Marker,
    rgb: [u8; 3],
}

/// A label's box: left, top, right, bottom.
type LabelBox = [f64; 4];

/// Where a label of `width` × `height` goes beside the point (px, py): the first of a few
/// positions stepping down and up by a line that overlaps no label placed before.
fn place_label(
    placed: &mut Vec<LabelBox>,
    px: f64,
    py: f64,
    width: f64,
    height: f64,
) -> (f64, f64) {
    let overlaps =
        |b: &LabelBox, c: &LabelBox| b[0] < c[2] && c[0] < b[2] && b[1] < c[3] && c[1] < b[3];
    let x = px + 7.0;
    let base = py - 5.0;
    let steps = [0.0, 1.0, -1.0, 2.0, -2.0, 3.0, -3.0];
    let y = steps
        .iter()
        .map(|k| base + k * height)
        .find(|y| {
            let candidate = [x, y - height, x + width, *y];
            !placed.iter().any(|b| overlaps(b, &candidate))
        })
        .unwrap_or(base);
    placed.push([x, y - height, x + width, y]);
    (x, y)
}

/// Points with their formula beside them; each point is a group titled by the molecule.
fn markers(
    svg: &mut String,
    panel: &Panel,
    points: &[(f64, f64, &SeriesRow)],
    marks: Marks,
    placed: &mut Vec<LabelBox>,
    options: &SeriesSvgOptions,
) {
    let fill = colour(marks.rgb, options.greyscale);
    let fs = options.font_size * 0.8;
    for (x, y, row) in points {
        let (px, py) = (panel.x_of(*x), panel.y_of(*y));
        let width = fs * 0.62 * row.label.chars().count() as f64;
        let (label_x, label_y) = place_label(placed, px, py, width, fs * 1.05);
        let shape = match marks.marker {
            Marker::Circle => format!(
                "<circle cx=\"{}\" cy=\"{}\" r=\"4.5\" fill=\"{fill}\"/>",
                number(px),
                number(py)
            ),
            Marker::Diamond => format!(
                "<path d=\"M{} {}L{} {}L{} {}L{} {}Z\" fill=\"#ffffff\" stroke=\"{fill}\" stroke-width=\"1.6\"/>",
                number(px),
                number(py - 5.5),
                number(px + 5.5),
                number(py),
                number(px),
                number(py + 5.5),
                number(px - 5.5),
                number(py)
            ),
        };
        let _ = writeln!(
            svg,
            "<g><title>{}</title>{shape}<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{fill}\">{}</text></g>",
            escape_xml(&row.name),
            number(label_x),
            number(label_y),
            number(fs),
            formula_markup(&row.label, fs)
        );
    }
}

/// The fitted line across the panel's x range, clipped to its box.
fn fit_line(
    svg: &mut String,
    panel: &Panel,
    fit: Option<&LineFit>,
    rgb: [u8; 3],
    dash: &str,
    options: &SeriesSvgOptions,
) {
    let Some(fit) = fit else { return };
    let clamp = |y: f64| y.clamp(panel.y.0, panel.y.1);
    // Walk the line to where it leaves the box on either side.
    let x_at = |y: f64| {
        if fit.slope.abs() > 1e-12 {
            (y - fit.offset) / fit.slope
        } else {
            f64::NAN
        }
    };
    let ends = [panel.x.0, panel.x.1].map(|x| {
        let y = fit.slope * x + fit.offset;
        if (panel.y.0..=panel.y.1).contains(&y) {
            (x, y)
        } else {
            let y = clamp(y);
            (x_at(y), y)
        }
    });
    if ends.iter().any(|(x, y)| !x.is_finite() || !y.is_finite()) {
        return;
    }
    let _ = writeln!(
        svg,
        "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"{}\" stroke-width=\"1.4\"{dash}/>",
        number(panel.x_of(ends[0].0)),
        number(panel.y_of(ends[0].1)),
        number(panel.x_of(ends[1].0)),
        number(panel.y_of(ends[1].1)),
        colour(rgb, options.greyscale)
    );
}

fn fit_text(what: &str, fit: Option<&LineFit>) -> String {
    match fit {
        Some(f) => format!(
            "{what} = {}·IE {} {} eV, r² = {}",
            fixed(f.slope, 3),
            if f.offset < 0.0 { "−" } else { "+" },
            fixed(f.offset.abs(), 2),
            fixed(f.r_squared, 3)
        ),
        None => format!("{what}: no fitted line"),
    }
}

/// The legend under the right panel: one line per series with its fit.
fn legend(svg: &mut String, panel: &Panel, series: &Series, options: &SeriesSvgOptions) {
    let fs = options.font_size;
    let y0 = panel.bottom + 3.5 * fs + 14.0;
    let lines = [
        (HOMO_RGB, fit_text("−ε(HOMO)", series.homo_fit.as_ref())),
        (
            LONE_PAIR_RGB,
            fit_text("−ε(lone pair)", series.lone_pair_fit.as_ref()),
        ),
    ];
    let _ = writeln!(svg, "<g id=\"legend\">");
    for (k, (rgb, text)) in lines.iter().enumerate() {
        let y = y0 + k as f64 * fs * 1.4;
        let fill = colour(*rgb, options.greyscale);
        let _ = writeln!(
            svg,
            "<rect x=\"{}\" y=\"{}\" width=\"14\" height=\"3\" fill=\"{fill}\"/><text x=\"{}\" y=\"{}\" fill=\"{fill}\">{}</text>",
            number(panel.left),
            number(y - fs * 0.4),
            number(panel.left + 20.0),
            number(y),
            escape_xml(text)
        );
    }
    let _ = writeln!(svg, "</g>");
}

fn no_data(svg: &mut String, panel: &Panel, text: &str, options: &SeriesSvgOptions) {
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\" fill=\"{}\">{}</text>",
        number((panel.left + panel.right) / 2.0),
        number((panel.top + panel.bottom) / 2.0),
        colour(INK, options.greyscale),
        escape_xml(text)
    );
}

#[cfg(test)]
mod tests {
    use super::place_label;

    #[test]
    fn labels_of_coincident_points_do_not_overlap() {
        let mut placed = Vec::new();
        let first = place_label(&mut placed, 100.0, 100.0, 40.0, 12.0);
        let second = place_label(&mut placed, 100.0, 100.0, 40.0, 12.0);
        assert_eq!(first, (107.0, 95.0));
        assert_eq!(second, (107.0, 107.0), "one line lower");
        let apart = place_label(&mut placed, 300.0, 100.0, 40.0, 12.0);
        assert_eq!(apart, (307.0, 95.0), "a label far away keeps its place");
    }
}
