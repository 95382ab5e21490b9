//! SVG 1.1 writer for the `Diagram` layout (W3C, Scalable Vector Graphics 1.1, 2nd ed.,
//! 2011): text stays text (subscripts and superscripts as `tspan` with `dy` shifts, which
//! every renderer supports), user strings are XML-escaped, numbers are printed with fixed
//! precision so that the same diagram always gives the same bytes.

use std::fmt::Write;

use super::layout::{Caption, Diagram, Level, Link};
use super::style::{
    Script, electron_marks, format_energy, frontier_tag, label_runs, level_rgb, link_opacity,
    link_width, to_grey,
};

/// Export choices (DESIGN §5.3).
#[derive(Clone, Debug, PartialEq)]
pub struct SvgOptions {
    /// Size of the drawing in CSS pixels; the layout is scaled to fit.
    pub width: f64,
    pub height: f64,
    /// CSS font-family list; end with a generic family so any renderer finds a font.
    pub font_family: String,
    /// Font size of level labels, in layout units (the layout is 1000 wide).
    pub font_size: f64,
    pub greyscale: bool,
    pub show_energies: bool,
    /// White background (true) or transparent (false).
    pub white_background: bool,
    /// Which ladders are drawn; a single ladder gives a narrower figure (see `Ladders`).
    pub ladders: Ladders,
    /// Draw where each level moves with the lone-pair switch flipped (DESIGN §4.6).
    pub show_level_shifts: bool,
}

/// Which ladders an exported figure holds. With one ladder the correlation lines are left
/// out and the figure is cropped to that ladder and the energy axis; the layout itself (and
/// so every level's height) is the one on screen.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Ladders {
    #[default]
    Both,
    DelocalizedOnly,
    LocalizedOnly,
}

impl Ladders {
    /// Whether the ladder with this index (0 delocalized, 1 localized) is drawn.
    pub fn draws(self, ladder: usize) -> bool {
        match self {
            Ladders::Both => true,
            Ladders::DelocalizedOnly => ladder == 0,
            Ladders::LocalizedOnly => ladder == 1,
        }
    }
}

/// Layout units kept when only the delocalized ladder is drawn: the axis, the ladder and
/// its HOMO/LUMO tags (the ladder ends at 440).
const DELOCALIZED_CROP: f64 = 560.0;
/// When only the localized ladder is drawn it is moved left by this much, into the place
/// of the delocalized one, and the figure is cropped to `LOCALIZED_CROP`.
const LOCALIZED_SHIFT: f64 = 340.0;
const LOCALIZED_CROP: f64 = 680.0;

impl SvgOptions {
    /// Width of the visible part of the layout (layout units) for the chosen ladders.
    pub fn view_width(&self, diagram: &Diagram) -> f64 {
        match self.ladders {
            Ladders::Both => diagram.width,
            Ladders::DelocalizedOnly => DELOCALIZED_CROP.min(diagram.width),
            Ladders::LocalizedOnly => LOCALIZED_CROP.min(diagram.width),
        }
    }

    /// Width of the SVG document in CSS pixels: `width` for the full figure, in proportion
    /// for a single ladder so that both keep the same scale.
    pub fn document_width(&self, diagram: &Diagram) -> f64 {
        self.width * self.view_width(diagram) / diagram.width.max(1e-9)
    }

    /// CSS pixels per layout unit, vertically; the diagram's `y_of` times this is a
    /// level's height in the document.
    pub fn vertical_scale(&self, diagram: &Diagram) -> f64 {
        self.height / diagram.height.max(1e-9)
    }
}

impl Default for SvgOptions {
    fn default() -> Self {
        SvgOptions {
            width: 1000.0,
            height: 700.0,
            font_family: "DejaVu Sans, Arial, Helvetica, sans-serif".into(),
            font_size: 16.0,
            greyscale: false,
            show_energies: true,
            white_background: true,
            ladders: Ladders::Both,
            show_level_shifts: true,
        }
    }
}

/// Escapes the five XML special characters and drops characters XML 1.0 forbids.
pub fn escape_xml(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '&' => out.push_str("&amp;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            '\t' | '\n' | '\r' => out.push(' '),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => {}
            c => out.push(c),
        }
    }
    out
}

/// A coordinate with at most two decimals and no trailing zeros ("12.5", "-3", "0"),
/// written straight into the output (no allocation; the writer runs per level and link).
#[derive(Clone, Copy)]
pub(crate) struct Number(f64);

impl std::fmt::Display for Number {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        let hundredths = (self.0 * 100.0).round();
        if !hundredths.is_finite() || hundredths == 0.0 {
            return f.write_str("0");
        }
        let magnitude = hundredths.abs() as u64;
        if hundredths < 0.0 {
            f.write_str("-")?;
        }
        let (whole, fraction) = (magnitude / 100, magnitude % 100);
        match fraction {
            0 => write!(f, "{whole}"),
            f10 if f10 % 10 == 0 => write!(f, "{whole}.{}", f10 / 10),
            _ => write!(f, "{whole}.{fraction:02}"),
        }
    }
}

pub(crate) fn number(value: f64) -> Number {
    Number(value)
}

/// The opening of a standalone plot figure (Walsh diagrams, series plots): the XML
/// declaration, the root element of `width` × `height` CSS pixels with its font, the
/// document title, a white background and the title printed at (`x`, `y`).
pub(crate) struct PlotHeader<'a> {
    pub width: f64,
    pub height: f64,
    pub font_family: &'a str,
    pub font_size: f64,
    pub title: &'a str,
    pub title_at: (f64, f64),
    pub ink: &'a str,
}

pub(crate) fn write_plot_header(svg: &mut String, header: &PlotHeader<'_>) {
    let (w, h, fs) = (header.width, header.height, header.font_size);
    let title = escape_xml(header.title);
    let _ = writeln!(svg, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>");
    let _ = writeln!(
        svg,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" font-family=\"{2}\" font-size=\"{3}\">",
        number(w),
        number(h),
        escape_xml(header.font_family),
        number(fs)
    );
    let _ = writeln!(svg, "<title>{title}</title>");
    let _ = writeln!(
        svg,
        "<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>",
        number(w),
        number(h)
    );
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" fill=\"{}\" font-size=\"{}\">{title}</text>",
        number(header.title_at.0),
        number(header.title_at.1),
        header.ink,
        number(fs * 1.15)
    );
}

pub(crate) fn colour(rgb: [u8; 3], greyscale: bool) -> String {
    let [r, g, b] = if greyscale { to_grey(rgb) } else { rgb };
    format!("#{r:02x}{g:02x}{b:02x}")
}

/// Vertical shift that centres a line of text on its y (instead of
/// dominant-baseline="central", which several renderers ignore): 0.35 em is about half the cap height of common sans fonts, common
/// practice, no source).
const CENTRE_DY: &str = "0.35em";

const INK: [u8; 3] = [34, 34, 34];
const FAINT: [u8; 3] = [130, 130, 130];

/// One drawn correlation line.
struct LinkStroke {
    from: (f64, f64),
    to: (f64, f64),
    width: f64,
    opacity: f64,
}

/// The links as strokes, with lines that share both ends (the members of an equivalent
/// set all leave from the set's inner end) drawn once: as wide as the widest and as opaque
/// as the stack, 1 − Π(1 − αᵢ), which is what n strokes of one colour composite to
/// (Porter and Duff, Computer Graphics 18(3), 253 (1984), "over"). Same look, far fewer
/// elements for large symmetric molecules (C60: about ten times fewer).
fn merged_links(links: &[Link]) -> Vec<LinkStroke> {
    let key = |link: &Link| {
        [link.from.0, link.from.1, link.to.0, link.to.1].map(|v| (v * 100.0).round() as i64)
    };
    let mut strokes: Vec<LinkStroke> = Vec::new();
    let mut index_of: std::collections::HashMap<[i64; 4], usize> =
        std::collections::HashMap::with_capacity(links.len());
    for link in links {
        let (width, opacity) = (link_width(link.weight), link_opacity(link.weight));
        match index_of.get(&key(link)) {
            Some(&n) => {
                let stroke = &mut strokes[n];
                stroke.width = stroke.width.max(width);
                stroke.opacity = 1.0 - (1.0 - stroke.opacity) * (1.0 - opacity);
            }
            None => {
                index_of.insert(key(link), strokes.len());
                strokes.push(LinkStroke {
                    from: link.from,
                    to: link.to,
                    width,
                    opacity,
                });
            }
        }
    }
    strokes
}

/// Label text as `tspan` runs with baseline shifts that are undone after each run.
pub(crate) fn label_markup(label: &str, font_size: f64) -> String {
    let mut out = String::new();
    let shift = font_size * 0.3;
    for (text, script) in label_runs(label) {
        let text = escape_xml(&text);
        match script {
            Script::Normal => out.push_str(&format!("<tspan>{text}</tspan>")),
            Script::Sub => out.push_str(&format!(
                "<tspan dy=\"{}\" font-size=\"{}\">{text}</tspan><tspan dy=\"{}\"></tspan>",
                number(shift),
                number(font_size * 0.72),
                number(-shift)
            )),
            Script::Super => out.push_str(&format!(
                "<tspan dy=\"{}\" font-size=\"{}\">{text}</tspan><tspan dy=\"{}\"></tspan>",
                number(-shift * 1.3),
                number(font_size * 0.72),
                number(shift * 1.3)
            )),
        }
    }
    out
}

/// The diagram as a standalone SVG document.
pub fn to_svg(diagram: &Diagram, options: &SvgOptions) -> String {
    // About 600 bytes per level and 130 per link; one allocation for most figures.
    let levels: usize = diagram.ladders.iter().map(|l| l.levels.len()).sum();
    let mut svg = String::with_capacity(4096 + 600 * levels + 130 * diagram.links.len());
    let font = escape_xml(&options.font_family);
    let ink = colour(INK, options.greyscale);
    let faint = colour(FAINT, options.greyscale);
    let _ = writeln!(svg, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>");
    let _ = writeln!(
        svg,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{}\" height=\"{}\" viewBox=\"0 0 {} {}\" font-family=\"{font}\">",
        number(options.document_width(diagram)),
        number(options.height),
        number(options.view_width(diagram)),
        number(diagram.height)
    );
    let titles: Vec<String> = diagram
        .ladders
        .iter()
        .enumerate()
        .filter(|(index, _)| options.ladders.draws(*index))
        .map(|(_, l)| escape_xml(&l.title))
        .collect();
    let _ = writeln!(svg, "<title>{}</title>", titles.join(" | "));
    if options.white_background {
        let _ = writeln!(
            svg,
            "<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>",
            number(options.view_width(diagram)),
            number(diagram.height)
        );
    }
    // Energy axis.
    let _ = writeln!(
        svg,
        "<g id=\"axis\" stroke=\"{ink}\" stroke-width=\"1.2\" fill=\"{ink}\">"
    );
    let _ = writeln!(
        svg,
        "<line x1=\"{x}\" y1=\"{}\" x2=\"{x}\" y2=\"{}\"/>",
        number(diagram.axis_top),
        number(diagram.axis_bottom),
        x = number(diagram.axis_x)
    );
    for tick in &diagram.ticks {
        let _ = writeln!(
            svg,
            "<line x1=\"{}\" y1=\"{y}\" x2=\"{}\" y2=\"{y}\"/><text x=\"{}\" y=\"{y}\" stroke=\"none\" font-size=\"{}\" text-anchor=\"end\" dy=\"{CENTRE_DY}\">{}</text>",
            number(diagram.axis_x - 6.0),
            number(diagram.axis_x),
            number(diagram.axis_x - 10.0),
            number(options.font_size * 0.85),
            format_energy(tick.energy_ev, 0),
            y = number(tick.y)
        );
    }
    let _ = writeln!(
        svg,
        "<text x=\"{}\" y=\"{}\" stroke=\"none\" font-size=\"{}\" text-anchor=\"middle\">E / eV</text>",
        number(diagram.axis_x),
        number(diagram.axis_top - 12.0),
        number(options.font_size * 0.9)
    );
    let _ = writeln!(svg, "</g>");
    // Correlation lines, only between two drawn ladders.
    let links: &[Link] = if options.ladders == Ladders::Both {
        &diagram.links
    } else {
        &[]
    };
    let _ = writeln!(
        svg,
        "<g id=\"links\" stroke=\"{faint}\" stroke-linecap=\"round\">"
    );
    for stroke in merged_links(links) {
        let _ = writeln!(
            svg,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke-width=\"{}\" stroke-opacity=\"{}\"/>",
            number(stroke.from.0),
            number(stroke.from.1),
            number(stroke.to.0),
            number(stroke.to.1),
            number(stroke.width),
            number(stroke.opacity)
        );
    }
    let _ = writeln!(svg, "</g>");
    for (index, ladder) in diagram.ladders.iter().enumerate() {
        if !options.ladders.draws(index) {
            continue;
        }
        if index == 1 && options.ladders == Ladders::LocalizedOnly {
            let _ = writeln!(
                svg,
                "<g id=\"ladder-{index}\" transform=\"translate({} 0)\">",
                number(-LOCALIZED_SHIFT)
            );
        } else {
            let _ = writeln!(svg, "<g id=\"ladder-{index}\">");
        }
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"middle\" fill=\"{ink}\">{}</text>",
            number(ladder.title_x),
            number(ladder.title_y),
            number(options.font_size * 1.3),
            escape_xml(&ladder.title)
        );
        // Levels outside the energy window are said, never dropped silently.
        for (note, y) in ladder.hidden_notes().iter().zip(diagram.hidden_note_ys()) {
            if let Some(note) = note {
                let _ = writeln!(
                    svg,
                    "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"middle\" dy=\"{CENTRE_DY}\" fill=\"{faint}\">{}</text>",
                    number(ladder.title_x),
                    number(y),
                    number(options.font_size * 0.65),
                    escape_xml(note)
                );
            }
        }
        for level in &ladder.levels {
            write_level(&mut svg, level, index, options, &ink, &faint);
        }
        let _ = writeln!(svg, "</g>");
    }
    if let Some(line) = diagram.caption.line(options.show_level_shifts) {
        let _ = writeln!(
            svg,
            "<text id=\"caption\" x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{faint}\">{}</text>",
            number(diagram.axis_x),
            number(Caption::y(diagram)),
            number(options.font_size * 0.8),
            escape_xml(&line)
        );
    }
    let _ = writeln!(svg, "</svg>");
    svg
}

fn write_level(
    svg: &mut String,
    level: &Level,
    ladder: usize,
    options: &SvgOptions,
    ink: &str,
    faint: &str,
) {
    let bar = level_rgb(&level.label)
        .map_or_else(|| ink.to_string(), |rgb| colour(rgb, options.greyscale));
    let dash = if level.occupancy > 0.0 {
        ""
    } else {
        " stroke-dasharray=\"7 4\""
    };
    let _ = writeln!(
        svg,
        "<line x1=\"{}\" y1=\"{y}\" x2=\"{}\" y2=\"{y}\" stroke=\"{bar}\" stroke-width=\"3.5\"{dash}/>",
        number(level.x_left),
        number(level.x_right),
        y = number(level.y)
    );
    // Where the level goes with the lone-pair switch flipped: a faint dotted bar and an
    // arrow from here to there.
    if let Some(shifted) = level.shifted_y.filter(|_| options.show_level_shifts) {
        let _ = writeln!(
            svg,
            "<line x1=\"{}\" y1=\"{s}\" x2=\"{}\" y2=\"{s}\" stroke=\"{faint}\" stroke-width=\"1.5\" stroke-dasharray=\"2 3\"/><line x1=\"{x}\" y1=\"{}\" x2=\"{x}\" y2=\"{s}\" stroke=\"{faint}\" stroke-width=\"1\"/>",
            number(level.x_left),
            number(level.x_right),
            number(level.y),
            s = number(shifted),
            x = number(level.x_left - 4.0)
        );
        if let Some(text) = &level.shift_text {
            let _ = writeln!(
                svg,
                "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"end\" fill=\"{faint}\">{}</text>",
                number(level.x_left - 8.0),
                number(shifted + options.font_size * 0.25),
                number(options.font_size * 0.65),
                escape_xml(text)
            );
        }
    }
    // Electrons: up and down arrows, and a shared occupancy written beside them.
    let marks = electron_marks(level.occupancy);
    let centre = (level.x_left + level.x_right) / 2.0;
    if let Some(text) = &marks.fraction {
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"end\" fill=\"{ink}\">{}</text>",
            number(level.x_right - 1.0),
            number(level.y - 4.0),
            number(options.font_size * 0.6),
            escape_xml(text)
        );
    }
    let offsets: &[f64] = if marks.arrows.len() == 2 {
        &[-6.0, 6.0]
    } else {
        &[0.0]
    };
    for (&offset, &up) in offsets.iter().zip(&marks.arrows) {
        let x = centre + offset;
        let (tail, head, back) = if up {
            (level.y + 10.0, level.y - 10.0, 5.0)
        } else {
            (level.y - 10.0, level.y + 10.0, -5.0)
        };
        let _ = writeln!(
            svg,
            "<path d=\"M {x} {t} L {x} {h} M {l} {b} L {x} {h} L {r} {b}\" fill=\"none\" stroke=\"{ink}\" stroke-width=\"1.6\"/>",
            x = number(x),
            t = number(tail),
            h = number(head),
            l = number(x - 3.5),
            r = number(x + 3.5),
            b = number(head + back)
        );
    }
    if level.label_x.is_finite() {
        let bar_end = if ladder == 0 {
            level.x_left
        } else {
            level.x_right
        };
        if (level.label_y - level.y).abs() > 0.5 {
            let _ = writeln!(
                svg,
                "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"{faint}\" stroke-width=\"0.8\"/>",
                number(bar_end),
                number(level.y),
                number(level.label_x),
                number(level.label_y)
            );
        }
        let anchor = if ladder == 0 { "end" } else { "start" };
        let label = label_markup(&level.label, options.font_size);
        let energy = if options.show_energies {
            format!(
                "<tspan fill=\"{faint}\">{}</tspan>",
                format_energy(level.energy_ev, 2)
            )
        } else {
            String::new()
        };
        let content = match (ladder, energy.is_empty()) {
            (_, true) => label,
            (0, false) => format!("{energy}<tspan>  </tspan>{label}"),
            _ => format!("{label}<tspan>  </tspan>{energy}"),
        };
        let _ = writeln!(
            svg,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{anchor}\" dy=\"{CENTRE_DY}\" fill=\"{ink}\" xml:space=\"preserve\">{content}</text>",
            number(level.label_x),
            number(level.label_y),
            number(options.font_size)
        );
    }
    if level.is_homo || level.is_lumo {
        // Correlation lines leave from here: a white halo under the glyphs keeps the tag
        // legible where they pass.
        let (x, anchor) = if ladder == 0 {
            (level.x_right + 5.0, "start")
        } else {
            (level.x_left - 5.0, "end")
        };
        let tag = frontier_tag(level.is_homo, level.is_lumo, level.occupancy).unwrap_or_default();
        // SVG 1.1 has no paint-order: the halo is a white-stroked copy drawn first.
        for paint in [
            "fill=\"#ffffff\" stroke=\"#ffffff\" stroke-width=\"3\" stroke-linejoin=\"round\""
                .to_string(),
            format!("fill=\"{faint}\""),
        ] {
            let _ = writeln!(
                svg,
                "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{anchor}\" {paint}>{tag}</text>",
                number(x),
                number(level.y - 4.0),
                number(options.font_size * 0.6),
            );
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagram::layout::{LadderInput, LevelInput, layout};

    fn sample(title: &str) -> Diagram {
        let level = |energy_ev: f64, occupancy: f64, label: &str, key: usize| LevelInput {
            energy_ev,
            occupancy,
            label: label.into(),
            group: key,
            key,
            shift_ev: 0.0,
        };
        layout(
            &[
                LadderInput {
                    title: title.into(),
                    levels: vec![
                        level(-20.0, 2.0, "2a1", 0),
                        level(-12.0, 2.0, "3a1", 1),
                        level(2.0, 0.0, "4a1", 2),
                    ],
                },
                LadderInput {
                    title: "right".into(),
                    levels: vec![level(-14.0, 2.0, "n(N)", 10)],
                },
            ],
            &[],
            8.0,
        )
    }

    #[test]
    fn user_text_is_escaped() {
        let svg = to_svg(&sample("a < b & \"c\" — σ/π 軌道"), &SvgOptions::default());
        assert!(svg.contains("a &lt; b &amp; &quot;c&quot; — σ/π 軌道"));
        assert!(!svg.contains("a < b"));
    }

    #[test]
    fn output_is_deterministic_and_has_subscripts() {
        let a = to_svg(&sample("t"), &SvgOptions::default());
        let b = to_svg(&sample("t"), &SvgOptions::default());
        assert_eq!(a, b);
        assert!(a.contains("<tspan>3a</tspan><tspan dy="));
        assert!(a.contains("stroke-dasharray"), "virtual level dashed");
    }

    #[test]
    fn coincident_links_are_drawn_once_as_opaque_as_their_stack() {
        let link = |from_y: f64, weight: f64| Link {
            localized_key: 0,
            delocalized_group: 0,
            weight,
            from: (580.0, from_y),
            to: (440.0, 300.0),
        };
        let strokes = merged_links(&[link(200.0, 0.4), link(200.0, 0.4), link(250.0, 0.4)]);
        assert_eq!(strokes.len(), 2);
        let single = link_opacity(0.4);
        assert!((strokes[0].opacity - (1.0 - (1.0 - single).powi(2))).abs() < 1e-12);
        assert!((strokes[1].opacity - single).abs() < 1e-12);
        assert_eq!(strokes[0].width, link_width(0.4));
    }

    #[test]
    fn numbers_have_two_decimals_at_most_and_no_negative_zero() {
        let cases = [
            (12.5, "12.5"),
            (-3.0, "-3"),
            (-0.001, "0"),
            (0.126, "0.13"),
            (588.0349, "588.03"),
            (-16.457, "-16.46"),
            (f64::NAN, "0"),
        ];
        for (value, text) in cases {
            assert_eq!(number(value).to_string(), text, "{value}");
        }
    }

    #[test]
    fn greyscale_has_no_hue() {
        let options = SvgOptions {
            greyscale: true,
            ..SvgOptions::default()
        };
        let svg = to_svg(&sample("t"), &options);
        for hex in svg.split('#').skip(1).map(|s| &s[..6]) {
            let bytes: Vec<u8> = (0..3)
                .map(|i| u8::from_str_radix(&hex[2 * i..2 * i + 2], 16).unwrap())
                .collect();
            assert!(
                bytes[0] == bytes[1] && bytes[1] == bytes[2],
                "#{hex} is not grey"
            );
        }
    }
}
