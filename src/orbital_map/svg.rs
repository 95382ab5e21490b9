//! An orbital map as a standalone SVG 1.1 document (DESIGN §5.3 rules: text as text,
//! every user string XML-escaped, deterministic output). Positive contours solid in a
//! blue, negative ones dashed in a rust red, the nodal line dotted grey; atoms as labelled
//! circles (dashed when off the plane), bonds as lines, a scale bar in Å. The palette is
//! our own choice (no source).

use std::fmt::Write;

use crate::diagram::style::format_energy;
use crate::diagram::svg::{escape_xml, label_markup};

use super::OrbitalMap;

const INK: &str = "#222222";
const FAINT: &str = "#8a8a8a";
const POSITIVE: &str = "#2a5fa0";
const NEGATIVE: &str = "#b9532a";
const NODE: &str = "#9a9a9a";

/// Size and font of the drawing.
#[derive(Clone, Debug, PartialEq)]
pub struct MapSvgOptions {
    /// Width of the drawing in pixels (the map square is this minus the padding).
    pub width: f64,
    pub font_family: String,
    pub font_size: f64,
}

impl Default for MapSvgOptions {
    fn default() -> Self {
        MapSvgOptions {
            width: 640.0,
            font_family: "DejaVu Sans, Arial, Helvetica, sans-serif".into(),
            font_size: 15.0,
        }
    }
}

fn number(value: f64) -> String {
    let text = format!("{value:.2}");
    let text = text.trim_end_matches('0').trim_end_matches('.');
    if text == "-0" {
        "0".into()
    } else {
        text.to_string()
    }
}

/// A round length (0.5, 1, 2, 5, 10 Å …) about a fifth of `side`.
fn scale_length(side: f64) -> f64 {
    let target = side / 5.0;
    let mut best = 0.5;
    for candidate in [0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0] {
        if candidate <= target {
            best = candidate;
        }
    }
    best
}

/// Maps plane coordinates (Å) to pixels.
struct Frame {
    left: f64,
    top: f64,
    size: f64,
    x0: f64,
    y0: f64,
    side: f64,
}

impl Frame {
    fn px(&self, x: f64) -> f64 {
        self.left + (x - self.x0) / self.side * self.size
    }
    fn py(&self, y: f64) -> f64 {
        self.top + self.size - (y - self.y0) / self.side * self.size
    }
    fn path(&self, points: &[[f64; 2]], closed: bool) -> String {
        let mut d = String::new();
        for (k, p) in points.iter().enumerate() {
            let _ = write!(
                d,
                "{}{},{}",
                if k == 0 { "M" } else { " L" },
                number(self.px(p[0])),
                number(self.py(p[1]))
            );
        }
        if closed {
            d.push_str(" Z");
        }
        d
    }
}

/// The map as an SVG document.
pub fn map_to_svg(map: &OrbitalMap, options: &MapSvgOptions) -> String {
    let font_size = if options.font_size.is_finite() && options.font_size > 0.0 {
        options.font_size
    } else {
        15.0
    };
    let width = if options.width.is_finite() && options.width >= 200.0 {
        options.width
    } else {
        640.0
    };
    let pad = 2.0 * font_size;
    let size = width - 2.0 * pad;
    let title_height = 3.2 * font_size;
    let footer_height = 4.6 * font_size;
    let height = title_height + size + footer_height;
    let frame = Frame {
        left: pad,
        top: title_height,
        size,
        x0: map.grid.spec.x0,
        y0: map.grid.spec.y0,
        side: map.grid.spec.side(),
    };
    let mut svg = String::new();
    let font = escape_xml(&options.font_family);
    let _ = writeln!(svg, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>");
    let _ = writeln!(
        svg,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"{font}\" font-size=\"{}\">",
        number(font_size),
        w = number(width),
        h = number(height),
    );
    let _ = writeln!(
        svg,
        "<title>Orbital map: {}</title>",
        escape_xml(&map.orbital.label)
    );
    let _ = writeln!(
        svg,
        "<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>",
        number(width),
        number(height)
    );
    write_title(&mut svg, map, pad, font_size);
    let _ = writeln!(
        svg,
        "<rect x=\"{}\" y=\"{}\" width=\"{s}\" height=\"{s}\" fill=\"none\" stroke=\"{FAINT}\" stroke-width=\"1\"/>",
        number(frame.left),
        number(frame.top),
        s = number(size)
    );
    write_contours(&mut svg, map, &frame);
    write_molecule(&mut svg, map, &frame, font_size);
    write_footer(&mut svg, map, &frame, font_size);
    let _ = writeln!(svg, "</svg>");
    svg
}

fn write_title(svg: &mut String, map: &OrbitalMap, pad: f64, font_size: f64) {
    let energy = map
        .orbital
        .energy_ev
        .map(|e| format!("  {} eV", format_energy(e, 2)))
        .unwrap_or_default();
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{INK}\" xml:space=\"preserve\">{}<tspan>{}</tspan></text>",
        number(pad),
        number(1.6 * font_size),
        number(1.15 * font_size),
        label_markup(&map.orbital.label, 1.15 * font_size),
        escape_xml(&energy)
    );
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{FAINT}\">{}</text>",
        number(pad),
        number(2.7 * font_size),
        number(0.8 * font_size),
        escape_xml(&map.plane.describe())
    );
}

fn write_contours(svg: &mut String, map: &OrbitalMap, frame: &Frame) {
    let _ = writeln!(
        svg,
        "<g id=\"contours\" fill=\"none\" stroke-width=\"1.3\" stroke-linejoin=\"round\">"
    );
    for line in &map.contours {
        let style = if line.level > 0.0 {
            format!("stroke=\"{POSITIVE}\"")
        } else {
            format!("stroke=\"{NEGATIVE}\" stroke-dasharray=\"5 3\"")
        };
        let _ = writeln!(
            svg,
            "<path {style} d=\"{}\"/>",
            frame.path(&line.points, line.closed)
        );
    }
    for line in &map.nodal {
        let _ = writeln!(
            svg,
            "<path stroke=\"{NODE}\" stroke-width=\"0.9\" stroke-dasharray=\"1.5 3\" d=\"{}\"/>",
            frame.path(&line.points, line.closed)
        );
    }
    let _ = writeln!(svg, "</g>");
}

fn write_molecule(svg: &mut String, map: &OrbitalMap, frame: &Frame, font_size: f64) {
    let _ = writeln!(svg, "<g id=\"bonds\" stroke-width=\"2\">");
    for &(a, b) in &map.bonds {
        let (Some(first), Some(second)) = (map.atoms.get(a), map.atoms.get(b)) else {
            continue;
        };
        let colour = if first.in_plane() && second.in_plane() {
            INK
        } else {
            FAINT
        };
        let _ = writeln!(
            svg,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"{colour}\"/>",
            number(frame.px(first.x)),
            number(frame.py(first.y)),
            number(frame.px(second.x)),
            number(frame.py(second.y))
        );
    }
    let _ = writeln!(svg, "</g>");
    let radius = 0.75 * font_size;
    let _ = writeln!(
        svg,
        "<g id=\"atoms\" text-anchor=\"middle\" font-size=\"{}\">",
        number(0.8 * font_size)
    );
    // Far atoms first so that those nearer the viewer (above the plane) are drawn on top.
    let mut order: Vec<usize> = (0..map.atoms.len()).collect();
    order.sort_by(|&a, &b| map.atoms[a].height.total_cmp(&map.atoms[b].height));
    for index in order {
        let atom = &map.atoms[index];
        let (x, y) = (frame.px(atom.x), frame.py(atom.y));
        let (stroke, dash) = if atom.in_plane() {
            (INK, "")
        } else {
            (FAINT, " stroke-dasharray=\"3 2\"")
        };
        let _ = writeln!(
            svg,
            "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" fill=\"#ffffff\" stroke=\"{stroke}\" stroke-width=\"1.4\"{dash}/>",
            number(x),
            number(y),
            number(radius)
        );
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" fill=\"{stroke}\">{}{}</text>",
            number(x),
            number(y + 0.3 * font_size),
            escape_xml(&atom.symbol),
            atom.index
        );
    }
    let _ = writeln!(svg, "</g>");
}

fn write_footer(svg: &mut String, map: &OrbitalMap, frame: &Frame, font_size: f64) {
    let length = scale_length(frame.side);
    let bar = length / frame.side * frame.size;
    let y = frame.top + frame.size + 1.4 * font_size;
    let x = frame.left;
    let _ = writeln!(
        svg,
        "<g id=\"scale\" stroke=\"{INK}\" stroke-width=\"1.5\"><line x1=\"{}\" y1=\"{y1}\" x2=\"{}\" y2=\"{y1}\"/><line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/><line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/></g>",
        number(x),
        number(x + bar),
        number(x),
        number(y - 4.0),
        number(x),
        number(y + 4.0),
        number(x + bar),
        number(y - 4.0),
        number(x + bar),
        number(y + 4.0),
        y1 = number(y),
    );
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{INK}\">{} Å</text>",
        number(x + bar + 0.5 * font_size),
        number(y + 0.3 * font_size),
        number(0.8 * font_size),
        number(length)
    );
    let levels: Vec<String> = map.levels.iter().map(|l| format!("±{l}")).collect();
    let shift = 0.3 * font_size;
    let unit = format!(
        "bohr<tspan dy=\"{}\" font-size=\"{}\">−3/2</tspan><tspan dy=\"{}\"></tspan>",
        number(-shift),
        number(0.6 * font_size),
        number(shift)
    );
    let caption = if map.vanishes() {
        escape_xml("the orbital vanishes on this plane (a nodal plane)")
    } else {
        format!(
            "contours {} {unit}; max |ψ| {:.3} {unit}",
            escape_xml(&levels.join(", ")),
            map.grid.max_abs()
        )
    };
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{INK}\" xml:space=\"preserve\">{caption}</text>",
        number(x),
        number(y + 1.7 * font_size),
        number(0.8 * font_size),
    );
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" font-size=\"{}\" xml:space=\"preserve\"><tspan fill=\"{POSITIVE}\">— positive</tspan><tspan fill=\"{INK}\">   </tspan><tspan fill=\"{NEGATIVE}\">- - negative</tspan><tspan fill=\"{INK}\">   </tspan><tspan fill=\"{NODE}\">··· node</tspan></text>",
        number(x),
        number(y + 2.9 * font_size),
        number(0.8 * font_size)
    );
}
