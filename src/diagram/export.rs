//! Checked export of the diagram (DESIGN §5.3): options are validated before anything is
//! drawn, so a caller (CLI or GUI dialog) gets one clear error instead of a broken file.
//! The SVG comes from `svg::to_svg`; PNG is that same SVG rendered by `png`.

use thiserror::Error;

use super::layout::Diagram;
use super::png::{PngError, Resolution, raster_size, render_png};
use super::svg::{SvgOptions, to_svg};
use crate::chem::molecule::MAX_NAME_CHARACTERS;

/// Largest accepted drawing size (CSS pixels per side); a sanity bound, no source.
pub const MAX_SIZE_PX: f64 = 100_000.0;

/// Why an export was refused.
#[derive(Debug, Error, PartialEq)]
pub enum ExportError {
    #[error(
        "the size {width}×{height} is not usable (width and height must be 1 to 100000 pixels)"
    )]
    BadSize { width: f64, height: f64 },
    #[error("the font size {0} is not usable (it must be above 0 and at most 200)")]
    BadFontSize(f64),
    #[error("the font family is empty")]
    EmptyFontFamily,
    #[error("the title of the {0} ladder is empty")]
    EmptyTitle(&'static str),
    #[error(
        "the title of the {ladder} ladder has {count} characters; the limit is {MAX_NAME_CHARACTERS}"
    )]
    TitleTooLong { ladder: &'static str, count: usize },
    #[error(transparent)]
    Png(#[from] PngError),
}

/// Checks the options that do not depend on the diagram (sizes, font); callers run it
/// before any analysis.
pub fn check_options(options: &SvgOptions) -> Result<(), ExportError> {
    let usable = |v: f64| v.is_finite() && (1.0..=MAX_SIZE_PX).contains(&v);
    if !usable(options.width) || !usable(options.height) {
        return Err(ExportError::BadSize {
            width: options.width,
            height: options.height,
        });
    }
    if !(options.font_size.is_finite() && options.font_size > 0.0 && options.font_size <= 200.0) {
        return Err(ExportError::BadFontSize(options.font_size));
    }
    if options.font_family.trim().is_empty() {
        return Err(ExportError::EmptyFontFamily);
    }
    Ok(())
}

/// [`check_options`], then the raster size of a PNG at `resolution` (at most the drawing's
/// full size: a one-ladder crop is smaller).
pub fn check_png_options(options: &SvgOptions, resolution: Resolution) -> Result<(), ExportError> {
    check_options(options)?;
    raster_size(options.width, options.height, resolution)?;
    Ok(())
}

/// A ladder title: not empty, at most [`MAX_NAME_CHARACTERS`].
pub fn check_title(title: &str, ladder: &'static str) -> Result<(), ExportError> {
    if title.trim().is_empty() {
        return Err(ExportError::EmptyTitle(ladder));
    }
    let count = title.chars().count();
    if count > MAX_NAME_CHARACTERS {
        return Err(ExportError::TitleTooLong { ladder, count });
    }
    Ok(())
}

/// Checks the options against the diagram they will draw.
pub fn validate(diagram: &Diagram, options: &SvgOptions) -> Result<(), ExportError> {
    check_options(options)?;
    for (index, ladder) in diagram.ladders.iter().enumerate() {
        let name = if index == 0 {
            "delocalized"
        } else {
            "localized"
        };
        if options.ladders.draws(index) {
            check_title(&ladder.title, name)?;
        }
    }
    Ok(())
}

/// The diagram as SVG text, after checking the options.
pub fn export_svg(diagram: &Diagram, options: &SvgOptions) -> Result<String, ExportError> {
    validate(diagram, options)?;
    Ok(to_svg(diagram, options))
}

/// The diagram as PNG bytes: the SVG of `export_svg` rendered at `resolution`.
pub fn export_png(
    diagram: &Diagram,
    options: &SvgOptions,
    resolution: Resolution,
) -> Result<Vec<u8>, ExportError> {
    let svg = export_svg(diagram, options)?;
    Ok(render_png(&svg, resolution)?)
}
