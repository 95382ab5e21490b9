//! The Diagram panel: paints the library's `Diagram` layout (the same model the SVG
//! writer uses) into the panel, uniformly scaled; hover highlights a level and its
//! correlation lines, a click selects it for the Inspector. Each level is also a node of
//! the accessibility tree, named by its label.

use diptych::diagram::layout::{Caption, Diagram, Level};
use diptych::diagram::style::{
    electron_marks, format_energy, frontier_tag, link_opacity, link_width,
};
use eframe::egui::{self, Align2, Color32, FontId, Pos2, Rect, Sense, Stroke, Vec2};

use super::theme::{ACCENT, level_colour};

/// A level picked by hover or click: ladder (0 delocalized, 1 localized) and key.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct LevelRef {
    pub ladder: usize,
    pub key: usize,
}

pub struct DiagramEvents {
    pub hovered: Option<LevelRef>,
    pub clicked: Option<LevelRef>,
    pub clicked_background: bool,
    /// A new energy window (eV) asked for by the wheel (zoom) or a drag (pan).
    pub new_window: Option<(f64, f64)>,
}

/// Maps the layout's abstract units into the panel, keeping the aspect ratio.
struct Mapping {
    origin: Pos2,
    scale: f32,
}

impl Mapping {
    fn new(rect: Rect, diagram: &Diagram) -> Mapping {
        let scale =
            (rect.width() / diagram.width as f32).min(rect.height() / diagram.height as f32);
        let used = Vec2::new(diagram.width as f32, diagram.height as f32) * scale;
        Mapping {
            origin: rect.center() - used / 2.0,
            scale,
        }
    }

    fn point(&self, x: f64, y: f64) -> Pos2 {
        self.origin + Vec2::new(x as f32, y as f32) * self.scale
    }
}

pub fn show(
    ui: &mut egui::Ui,
    diagram: &Diagram,
    selected: Option<LevelRef>,
    show_energies: bool,
) -> DiagramEvents {
    // The part of the panel that is really visible: a toolbar that overflowed must not
    // widen the drawing beyond the panel.
    let visible = ui.available_rect_before_wrap().intersect(ui.clip_rect());
    let size = visible.size().max(Vec2::new(200.0, 150.0));
    let (response, painter) = ui.allocate_painter(size, Sense::click_and_drag());
    let rect = response.rect;
    let map = Mapping::new(rect, diagram);
    let visuals = ui.visuals().clone();
    let ink = visuals.text_color();
    let faint = visuals.weak_text_color();
    painter.rect_filled(rect, 4.0, visuals.extreme_bg_color);

    let hovered = response
        .hover_pos()
        .and_then(|pointer| level_at(diagram, &map, pointer));
    let focus = hovered.or(selected);

    // Axis with ticks.
    let axis_top = map.point(diagram.axis_x, diagram.axis_top);
    let axis_bottom = map.point(diagram.axis_x, diagram.axis_bottom);
    painter.line_segment([axis_top, axis_bottom], Stroke::new(1.0, ink));
    for tick in &diagram.ticks {
        let p = map.point(diagram.axis_x, tick.y);
        painter.line_segment([p, p + Vec2::new(-5.0, 0.0)], Stroke::new(1.0, ink));
        painter.text(
            p + Vec2::new(-8.0, 0.0),
            Align2::RIGHT_CENTER,
            format_energy(tick.energy_ev, 0),
            FontId::proportional(11.0),
            ink,
        );
    }
    painter.text(
        axis_top + Vec2::new(0.0, -8.0),
        Align2::CENTER_BOTTOM,
        "E / eV",
        FontId::proportional(12.0),
        ink,
    );

    // Correlation lines first, under the bars.
    for link in &diagram.links {
        let lit = focus.is_some_and(|f| {
            (f.ladder == 1 && f.key == link.localized_key)
                || (f.ladder == 0
                    && group_of(diagram, f).is_some_and(|g| g == link.delocalized_group))
        });
        // The export's width and opacity (one style for screen and SVG).
        let alpha = (255.0 * link_opacity(link.weight)) as u8;
        let colour = if lit {
            ACCENT
        } else if focus.is_some() {
            Color32::from_rgba_unmultiplied(faint.r(), faint.g(), faint.b(), alpha / 3)
        } else {
            Color32::from_rgba_unmultiplied(faint.r(), faint.g(), faint.b(), alpha)
        };
        let width = link_width(link.weight) as f32 * map.scale;
        painter.line_segment(
            [
                map.point(link.from.0, link.from.1),
                map.point(link.to.0, link.to.1),
            ],
            Stroke::new(if lit { width + 0.8 } else { width }, colour),
        );
    }

    if let Some(line) = diagram.caption.line(true) {
        painter.text(
            map.point(diagram.axis_x, Caption::y(diagram)),
            Align2::LEFT_BOTTOM,
            line,
            FontId::proportional(11.0),
            faint,
        );
    }
    for (ladder_index, ladder) in diagram.ladders.iter().enumerate() {
        painter.text(
            map.point(ladder.title_x, ladder.title_y),
            Align2::CENTER_CENTER,
            &ladder.title,
            FontId::proportional(15.0),
            ink,
        );
        for (note, y) in ladder.hidden_notes().iter().zip(diagram.hidden_note_ys()) {
            if let Some(note) = note {
                painter.text(
                    map.point(ladder.title_x, y),
                    Align2::CENTER_CENTER,
                    note,
                    FontId::proportional(10.0),
                    faint,
                );
            }
        }
        for level in &ladder.levels {
            let this = LevelRef {
                ladder: ladder_index,
                key: level.key,
            };
            let emphasised = focus == Some(this);
            draw_level(
                &painter,
                &map,
                level,
                ladder_index,
                emphasised,
                show_energies,
                ink,
                faint,
            );
            describe_level(ui, &map, level, ladder_index);
        }
    }

    let clicked = if response.clicked() { hovered } else { None };
    DiagramEvents {
        hovered,
        clicked,
        clicked_background: response.clicked() && hovered.is_none(),
        new_window: zoom_or_pan(ui, &response, diagram, &map),
    }
}

#[allow(clippy::too_many_arguments)]
fn draw_level(
    painter: &egui::Painter,
    map: &Mapping,
    level: &Level,
    ladder: usize,
    emphasised: bool,
    show_energies: bool,
    ink: Color32,
    faint: Color32,
) {
    let left = map.point(level.x_left, level.y);
    let right = map.point(level.x_right, level.y);
    let colour = if emphasised {
        ACCENT
    } else {
        level_colour(&level.label, ink)
    };
    let thickness = if emphasised { 4.0 } else { 2.5 };
    if level.occupancy > 0.0 {
        painter.line_segment([left, right], Stroke::new(thickness, colour));
    } else {
        // Virtual levels: dashed bars.
        painter.extend(egui::Shape::dashed_line(
            &[left, right],
            Stroke::new(thickness * 0.8, colour),
            5.0,
            3.0,
        ));
    }
    if let Some(shifted) = level.shifted_y {
        // Where this level goes with the lone-pair switch flipped.
        let a = map.point(level.x_left, shifted);
        let b = map.point(level.x_right, shifted);
        painter.extend(egui::Shape::dashed_line(
            &[a, b],
            Stroke::new(1.2, faint),
            2.0,
            3.0,
        ));
        painter.line_segment(
            [left - Vec2::new(4.0, 0.0), a - Vec2::new(4.0, 0.0)],
            Stroke::new(1.0, faint),
        );
        if let Some(text) = &level.shift_text {
            painter.text(
                a - Vec2::new(8.0, 0.0),
                Align2::RIGHT_CENTER,
                text,
                FontId::proportional(9.5),
                faint,
            );
        }
    }
    draw_electrons(painter, left, right, level.occupancy, ink, map.scale);
    if level.label_x.is_finite() {
        let anchor = map.point(level.label_x, level.label_y);
        if (level.label_y - level.y).abs() > 0.5 {
            // Leader line from the bar's outer end to the spread label.
            let bar_end = if ladder == 0 { left } else { right };
            painter.line_segment([bar_end, anchor], Stroke::new(0.7, faint));
        }
        let galley = painter.layout_job(label_job(level, ladder, show_energies, ink, faint));
        let size = galley.size();
        let top_left = if ladder == 0 {
            anchor - Vec2::new(size.x, size.y / 2.0)
        } else {
            anchor - Vec2::new(0.0, size.y / 2.0)
        };
        painter.galley(top_left, galley, ink);
    }
    if level.is_homo || level.is_lumo {
        let inner = if ladder == 0 {
            right + Vec2::new(4.0, 0.0)
        } else {
            left - Vec2::new(4.0, 0.0)
        };
        let align = if ladder == 0 {
            Align2::LEFT_BOTTOM
        } else {
            Align2::RIGHT_BOTTOM
        };
        // Correlation lines leave from the bar's inner end: the tag sits on a patch of the
        // panel's background so that the lines pass behind it.
        let tag = painter.layout_no_wrap(
            frontier_tag(level.is_homo, level.is_lumo, level.occupancy)
                .unwrap_or_default()
                .to_string(),
            FontId::proportional(9.0),
            faint,
        );
        let rect = align.anchor_size(inner, tag.size());
        let background = painter.ctx().global_style().visuals.extreme_bg_color;
        painter.rect_filled(rect.expand(1.0), 2.0, background);
        painter.galley(rect.min, tag, faint);
    }
}

/// Gives a level a node in the accessibility tree (screen readers; the GUI tests find
/// levels this way): its label as the name; ladder, energy and electrons as description.
fn describe_level(ui: &egui::Ui, map: &Mapping, level: &Level, ladder: usize) {
    use egui::accesskit;
    let left = map.point(level.x_left, level.y);
    let right = map.point(level.x_right, level.y);
    let side = if ladder == 0 {
        "delocalized"
    } else {
        "localized"
    };
    ui.ctx()
        .accesskit_node_builder(ui.scope_id().with(("level", ladder, level.key)), |node| {
            node.set_role(accesskit::Role::ListItem);
            node.set_label(level.label.clone());
            node.set_description(format!(
                "{side} level, {} eV, {:.2} electrons",
                format_energy(level.energy_ev, 2),
                level.occupancy
            ));
            node.set_bounds(accesskit::Rect {
                x0: f64::from(left.x),
                y0: f64::from(left.y - 4.0),
                x1: f64::from(right.x),
                y1: f64::from(right.y + 4.0),
            });
        });
}

/// The label as rich text: Mulliken subscripts and superscripts set small and shifted
/// (the same runs the SVG writer uses), the energy in a fainter colour.
fn label_job(
    level: &Level,
    ladder: usize,
    show_energies: bool,
    ink: Color32,
    faint: Color32,
) -> egui::text::LayoutJob {
    use diptych::diagram::style::{Script, label_runs};
    use egui::text::{LayoutJob, TextFormat};
    let normal = TextFormat::simple(FontId::proportional(12.0), ink);
    let small = |valign| TextFormat {
        font_id: FontId::proportional(9.0),
        color: ink,
        valign,
        ..Default::default()
    };
    let energy = TextFormat::simple(FontId::proportional(11.0), faint);
    let mut job = LayoutJob::default();
    if show_energies && ladder == 0 {
        job.append(&format_energy(level.energy_ev, 2), 0.0, energy.clone());
        job.append("  ", 0.0, normal.clone());
    }
    for (text, script) in label_runs(&level.label) {
        let format = match script {
            Script::Normal => normal.clone(),
            Script::Sub => small(egui::Align::BOTTOM),
            Script::Super => small(egui::Align::TOP),
        };
        job.append(&text, 0.0, format);
    }
    if show_energies && ladder == 1 {
        job.append("  ", 0.0, normal.clone());
        job.append(&format_energy(level.energy_ev, 2), 0.0, energy);
    }
    job
}

/// Up/down arrows for the electrons of a level (a half-filled level shows one arrow).
fn draw_electrons(
    painter: &egui::Painter,
    left: Pos2,
    right: Pos2,
    occupancy: f64,
    ink: Color32,
    scale: f32,
) {
    let centre = left + (right - left) * 0.5;
    let length = (16.0 * scale).clamp(7.0, 14.0);
    let arrow = |x: f32, up: bool| {
        let (tail, head) = if up {
            (
                Pos2::new(x, centre.y + length / 2.0),
                Pos2::new(x, centre.y - length / 2.0),
            )
        } else {
            (
                Pos2::new(x, centre.y - length / 2.0),
                Pos2::new(x, centre.y + length / 2.0),
            )
        };
        let stroke = Stroke::new(1.4, ink);
        painter.line_segment([tail, head], stroke);
        let back = if up { 3.5 } else { -3.5 };
        painter.line_segment([head, head + Vec2::new(-2.8, back)], stroke);
        painter.line_segment([head, head + Vec2::new(2.8, back)], stroke);
    };
    let marks = electron_marks(occupancy);
    let offsets: &[f32] = if marks.arrows.len() == 2 {
        &[-4.0, 4.0]
    } else {
        &[0.0]
    };
    for (&offset, &up) in offsets.iter().zip(&marks.arrows) {
        arrow(centre.x + offset, up);
    }
    if let Some(text) = marks.fraction {
        painter.text(
            Pos2::new(right.x - 1.0, centre.y - 2.0),
            Align2::RIGHT_BOTTOM,
            text,
            FontId::proportional(9.0),
            ink,
        );
    }
}

/// Wheel over the diagram zooms the energy axis about the pointer; a vertical drag pans it.
fn zoom_or_pan(
    ui: &egui::Ui,
    response: &egui::Response,
    diagram: &Diagram,
    map: &Mapping,
) -> Option<(f64, f64)> {
    let (min, max) = (diagram.energy_min, diagram.energy_max);
    let axis_pixels = ((diagram.axis_bottom - diagram.axis_top) as f32 * map.scale).max(1.0) as f64;
    let per_pixel = (max - min) / axis_pixels;
    if response.dragged_by(egui::PointerButton::Primary) {
        let dy = response.drag_delta().y as f64;
        if dy != 0.0 {
            return Some((min + dy * per_pixel, max + dy * per_pixel));
        }
    }
    if response.hovered() {
        let scroll = ui.input(|input| input.smooth_scroll_delta.y) as f64;
        if scroll != 0.0
            && let Some(pointer) = response.hover_pos()
        {
            let top = map.point(0.0, diagram.axis_top).y as f64;
            let at = max - (pointer.y as f64 - top) * per_pixel;
            let factor = (-scroll * 0.002).exp().clamp(0.2, 5.0);
            let (low, high) = (at - (at - min) * factor, at + (max - at) * factor);
            if high - low > 0.05 && high - low < 500.0 {
                return Some((low, high));
            }
        }
    }
    None
}

fn group_of(diagram: &Diagram, level: LevelRef) -> Option<usize> {
    diagram
        .ladders
        .get(level.ladder)?
        .levels
        .iter()
        .find(|l| l.key == level.key)
        .map(|l| l.group)
}

fn level_at(diagram: &Diagram, map: &Mapping, pointer: Pos2) -> Option<LevelRef> {
    for (ladder_index, ladder) in diagram.ladders.iter().enumerate() {
        for level in &ladder.levels {
            let left = map.point(level.x_left, level.y);
            let right = map.point(level.x_right, level.y);
            if pointer.x >= left.x - 2.0
                && pointer.x <= right.x + 2.0
                && (pointer.y - left.y).abs() <= 6.0
            {
                return Some(LevelRef {
                    ladder: ladder_index,
                    key: level.key,
                });
            }
        }
    }
    None
}
