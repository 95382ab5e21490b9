//! File ▸ Export diagram (Ctrl+E): the export options of DESIGN §5.3 with a live preview.
//! The preview is the exported SVG itself rasterized by the library's resvg renderer (the
//! same path as a PNG export), so what is shown is what is written.

use diptych::diagram::Diagram;
use diptych::diagram::export::{export_png, export_svg, validate};
use diptych::diagram::png::{Resolution, rasterize};
use diptych::diagram::svg::{Ladders, SvgOptions};
use eframe::egui;

use super::menus::Dialogs;
use super::state::AppState;

/// Width of the preview image in pixels.
const PREVIEW_WIDTH: u32 = 520;

/// The file type written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ExportFormat {
    Svg,
    Png,
}

/// The options window's state.
pub struct ExportPanel {
    pub open: bool,
    pub options: SvgOptions,
    pub format: ExportFormat,
    pub dpi: f64,
    /// Export the zoomed energy window of the screen instead of the whole diagram.
    pub zoomed: bool,
    /// The preview for (options, diagram revision): the image, or why there is none.
    preview: Option<(SvgOptions, u64, Result<egui::TextureHandle, String>)>,
}

impl Default for ExportPanel {
    fn default() -> Self {
        ExportPanel {
            open: false,
            options: SvgOptions::default(),
            format: ExportFormat::Svg,
            dpi: 300.0,
            zoomed: false,
            preview: None,
        }
    }
}

impl ExportPanel {
    /// The options with the document's view choices (energies shown) folded in.
    pub fn options_for(&self, show_energies: bool) -> SvgOptions {
        SvgOptions {
            show_energies,
            ..self.options.clone()
        }
    }

    /// The file's bytes for `diagram` in `format` (the file name's, which the save dialog
    /// may have changed from the one chosen here).
    pub fn render(
        &self,
        diagram: &Diagram,
        show_energies: bool,
        format: ExportFormat,
    ) -> Result<Vec<u8>, String> {
        let options = self.options_for(show_energies);
        match format {
            ExportFormat::Svg => export_svg(diagram, &options).map(String::into_bytes),
            ExportFormat::Png => export_png(diagram, &options, Resolution::Dpi(self.dpi)),
        }
        .map_err(|error| error.to_string())
    }

    /// Redraws the preview when the options or the diagram changed (an error is kept
    /// the same way, so a refused option is not retried every frame).
    fn refresh_preview(
        &mut self,
        ctx: &egui::Context,
        diagram: &Diagram,
        revision: u64,
        show_energies: bool,
    ) {
        let options = self.options_for(show_energies);
        if self
            .preview
            .as_ref()
            .is_some_and(|(shown, shown_revision, _)| {
                *shown == options && *shown_revision == revision
            })
        {
            return;
        }
        let image = validate(diagram, &options)
            .map_err(|error| error.to_string())
            .map(|()| diptych::diagram::to_svg(diagram, &options))
            .and_then(|svg| {
                rasterize(&svg, Resolution::PixelWidth(PREVIEW_WIDTH))
                    .map_err(|error| error.to_string())
            })
            .map(|pixmap| {
                let size = [pixmap.width() as usize, pixmap.height() as usize];
                let colour = egui::ColorImage::from_rgba_premultiplied(size, pixmap.data());
                ctx.load_texture("export preview", colour, egui::TextureOptions::LINEAR)
            });
        self.preview = Some((options, revision, image));
    }

    /// Why the options cannot be exported, if they cannot.
    pub fn preview_error(&self) -> Option<&str> {
        match &self.preview {
            Some((_, _, Err(message))) => Some(message),
            _ => None,
        }
    }
}

/// Draws the window when it is open.
pub fn show(ctx: &egui::Context, state: &mut AppState, dialogs: &Dialogs) {
    if !state.export.open {
        return;
    }
    let mut open = true;
    egui::Window::new("Export diagram")
        .open(&mut open)
        .default_width(560.0)
        .show(ctx, |ui| {
            options_form(ui, state);
            ui.separator();
            let show_energies = state.project.view.show_energies;
            if let Some(diagram) = state.diagram_to_export().map(std::borrow::Cow::into_owned) {
                // The whole and the zoomed diagram are different previews.
                let revision = 2 * state.diagram_revision + u64::from(state.export.zoomed);
                state
                    .export
                    .refresh_preview(ui.ctx(), &diagram, revision, show_energies);
            }
            match &state.export.preview {
                Some((_, _, Err(error))) => {
                    ui.colored_label(ui.visuals().error_fg_color, error);
                }
                Some((_, _, Ok(texture))) => {
                    let width = ui.available_width().min(PREVIEW_WIDTH as f32);
                    let size = texture.size_vec2() * (width / texture.size_vec2().x);
                    ui.add(egui::Image::new((texture.id(), size)).alt_text("Export preview"));
                }
                None => {
                    ui.weak("No diagram yet.");
                }
            }
            ui.separator();
            ui.horizontal(|ui| {
                let ready = state.diagram.is_some() && state.export.preview_error().is_none();
                let (label, extension) = match state.export.format {
                    ExportFormat::Svg => ("Export SVG…", "svg"),
                    ExportFormat::Png => ("Export PNG…", "png"),
                };
                if ui.add_enabled(ready, egui::Button::new(label)).clicked() {
                    dialogs.ask_export_diagram(state.project.molecule.name.clone(), extension);
                }
                ui.weak("The system's save dialog asks before replacing a file.");
            });
        });
    state.export.open = open;
}

fn options_form(ui: &mut egui::Ui, state: &mut AppState) {
    if state.energy_window.is_some() {
        ui.checkbox(
            &mut state.export.zoomed,
            "Export the zoomed energy window (otherwise the whole diagram)",
        )
        .on_hover_text("A zoomed figure says how many levels it leaves out above and below.");
    }
    let panel = &mut state.export;
    egui::Grid::new("export options")
        .num_columns(2)
        .show(ui, |ui| {
            ui.label("Format");
            ui.horizontal(|ui| {
                ui.radio_value(&mut panel.format, ExportFormat::Svg, "SVG (vector)");
                ui.radio_value(&mut panel.format, ExportFormat::Png, "PNG (image)");
            });
            ui.end_row();
            let label = ui.label("Width (px)");
            ui.add(
                egui::DragValue::new(&mut panel.options.width)
                    .range(100.0..=20_000.0)
                    .speed(5.0),
            )
            .labelled_by(label.id);
            ui.end_row();
            let label = ui.label("Height (px)");
            ui.add(
                egui::DragValue::new(&mut panel.options.height)
                    .range(100.0..=20_000.0)
                    .speed(5.0),
            )
            .labelled_by(label.id);
            ui.end_row();
            if panel.format == ExportFormat::Png {
                let label = ui.label("Resolution (dpi)");
                ui.add(
                    egui::DragValue::new(&mut panel.dpi)
                        .range(24.0..=1200.0)
                        .speed(1.0),
                )
                .labelled_by(label.id);
                ui.end_row();
            }
            let label = ui.label("Font size");
            ui.add(
                egui::DragValue::new(&mut panel.options.font_size)
                    .range(6.0..=48.0)
                    .speed(0.2),
            )
            .labelled_by(label.id);
            ui.end_row();
            let label = ui.label("Font family");
            ui.add(egui::TextEdit::singleline(&mut panel.options.font_family).desired_width(260.0))
                .labelled_by(label.id);
            ui.end_row();
            ui.label("Ladders");
            ui.horizontal(|ui| {
                ui.radio_value(&mut panel.options.ladders, Ladders::Both, "both");
                ui.radio_value(
                    &mut panel.options.ladders,
                    Ladders::DelocalizedOnly,
                    "delocalized",
                );
                ui.radio_value(
                    &mut panel.options.ladders,
                    Ladders::LocalizedOnly,
                    "localized",
                );
            });
            ui.end_row();
            ui.label("Look");
            ui.horizontal_wrapped(|ui| {
                ui.checkbox(&mut panel.options.greyscale, "greyscale");
                ui.checkbox(&mut panel.options.white_background, "white background");
                ui.checkbox(
                    &mut panel.options.show_level_shifts,
                    "lone-pair shift marks",
                );
            });
            ui.end_row();
        });
    ui.horizontal(|ui| {
        ui.checkbox(&mut state.project.view.show_energies, "Energies");
        ui.weak("Titles and the line threshold are those of the Diagram panel.");
    });
}
