//! Diptych's own palette: print-like neutrals, muted element colours chosen for contrast
//! on both light and dark backgrounds, one accent for selection (design choice, no source).

use diptych::chem::Element;
use eframe::egui::{self, Color32};

/// Fill colour of an atom of `element` in the Structure panel.
pub fn element_colour(element: Element) -> Color32 {
    match element.symbol() {
        "H" => Color32::from_rgb(226, 222, 212),
        "C" => Color32::from_rgb(92, 96, 104),
        "N" => Color32::from_rgb(88, 118, 176),
        "O" => Color32::from_rgb(186, 84, 72),
        "F" => Color32::from_rgb(132, 170, 116),
        "Cl" => Color32::from_rgb(104, 150, 92),
        "Br" => Color32::from_rgb(140, 84, 66),
        "S" => Color32::from_rgb(206, 172, 76),
        "P" => Color32::from_rgb(204, 128, 70),
        "B" => Color32::from_rgb(196, 156, 128),
        "Si" => Color32::from_rgb(170, 150, 120),
        _ => by_period(element),
    }
}

/// A stable fallback: hue from the group position, lightness from the period.
fn by_period(element: Element) -> Color32 {
    let z = element.atomic_number() as f32;
    let hue = (z * 47.0) % 360.0;
    let (r, g, b) = hsl_to_rgb(hue, 0.28, 0.62 - 0.05 * element.period() as f32);
    Color32::from_rgb(r, g, b)
}

fn hsl_to_rgb(hue: f32, saturation: f32, lightness: f32) -> (u8, u8, u8) {
    let c = (1.0 - (2.0 * lightness - 1.0).abs()) * saturation;
    let h = hue / 60.0;
    let x = c * (1.0 - (h % 2.0 - 1.0).abs());
    let (r, g, b) = match h as u32 {
        0 => (c, x, 0.0),
        1 => (x, c, 0.0),
        2 => (0.0, c, x),
        3 => (0.0, x, c),
        4 => (x, 0.0, c),
        _ => (c, 0.0, x),
    };
    let m = lightness - c / 2.0;
    let to_byte = |v: f32| ((v + m).clamp(0.0, 1.0) * 255.0).round() as u8;
    (to_byte(r), to_byte(g), to_byte(b))
}

/// Mixes `colour` toward `other` by `amount` (0 = colour, 1 = other).
pub fn mix(colour: Color32, other: Color32, amount: f32) -> Color32 {
    let blend = |a: u8, b: u8| (a as f32 + (b as f32 - a as f32) * amount).round() as u8;
    Color32::from_rgb(
        blend(colour.r(), other.r()),
        blend(colour.g(), other.g()),
        blend(colour.b(), other.b()),
    )
}

/// Selection and hover accent (a deep teal).
pub const ACCENT: Color32 = Color32::from_rgb(0, 128, 128);

/// Bar colour of a level: the library's diagram palette, or `ink`.
pub fn level_colour(label: &str, ink: Color32) -> Color32 {
    diptych::diagram::style::level_rgb(label).map_or(ink, |[r, g, b]| Color32::from_rgb(r, g, b))
}

/// DejaVu Sans (Bitstream Vera licence, assets/fonts/DejaVuSans-LICENSE.txt), the font the
/// SVG and PNG exports use, as egui's fallback: its own font has no typographic primes
/// (1a₂″), arrows or many symbols, and labels must read the same on screen and in print.
const FALLBACK_FONT: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

/// Adds the fallback font behind egui's own fonts.
pub fn install_fonts(context: &egui::Context) {
    use egui::epaint::text::{FontInsert, FontPriority, InsertFontFamily};
    let families = [egui::FontFamily::Proportional, egui::FontFamily::Monospace]
        .into_iter()
        .map(|family| InsertFontFamily {
            family,
            priority: FontPriority::Lowest,
        })
        .collect();
    context.add_font(FontInsert::new(
        "DejaVu Sans",
        egui::FontData::from_static(FALLBACK_FONT),
        families,
    ));
}
