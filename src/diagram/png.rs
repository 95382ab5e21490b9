//! PNG output: our SVG parsed by usvg and rasterized by resvg (tiny-skia), with the
//! system's fonts. The resolution is given in dots per inch over CSS pixels, which are
//! 1/96 inch (W3C, CSS Values and Units Level 3, §5.2), or as a pixel width. The PNG
//! carries the resolution in a pHYs chunk (W3C, PNG Specification 2nd ed., §11.3.5.3),
//! encoded with the `png` crate.

use std::sync::{Arc, OnceLock};

use resvg::tiny_skia::{Pixmap, Transform};
use resvg::usvg::{self, fontdb};
use thiserror::Error;

pub use resvg::tiny_skia::Pixmap as RasterImage;

/// CSS pixels per inch (CSS Values and Units Level 3, §5.2).
pub const CSS_PIXELS_PER_INCH: f64 = 96.0;
/// Largest raster side in pixels; keeps a typo in --dpi from allocating gigabytes.
pub const MAX_RASTER_SIDE: u32 = 20_000;
/// Largest raster in pixels (100 megapixels, 400 MB of RGBA): a poster at 600 dpi fits;
/// the limit keeps an export within about 1 GB of memory.
pub const MAX_RASTER_PIXELS: u64 = 100_000_000;

/// How finely the SVG is rasterized.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Resolution {
    /// Dots per inch, with the SVG's width and height read as CSS pixels.
    Dpi(f64),
    /// The raster's width in pixels; the height follows the SVG's aspect.
    PixelWidth(u32),
}

/// Why a PNG could not be made.
#[derive(Debug, Error, PartialEq)]
pub enum PngError {
    #[error("the resolution {0} dpi is not usable (it must be above 0 and at most 2400)")]
    BadDpi(f64),
    #[error("a PNG width of {0} pixels is not usable (it must be 1 to {MAX_RASTER_SIDE})")]
    BadPixelWidth(u32),
    #[error("the image would be {width}×{height} pixels, more than {MAX_RASTER_SIDE} per side")]
    TooLarge { width: u64, height: u64 },
    #[error("the image would be {width}×{height} pixels, more than the limit of 100 megapixels")]
    TooManyPixels { width: u64, height: u64 },
    #[error("the SVG could not be read: {0}")]
    Svg(String),
    #[error("the PNG could not be encoded: {0}")]
    Encode(String),
}

/// DejaVu Sans (Bitstream Vera licence, assets/fonts/DejaVuSans-LICENSE.txt).
const EMBEDDED_SANS: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

/// Sans-serif families to stand in for the generic `sans-serif`, in order of preference;
/// the first is the one `.ci/run` installs.
const SANS_SERIF_CHOICES: [&str; 5] = [
    "DejaVu Sans",
    "Liberation Sans",
    "Arial",
    "Helvetica",
    "Noto Sans",
];

/// The system's fonts, loaded once per process (scanning takes tens of milliseconds).
pub fn system_fonts() -> Arc<fontdb::Database> {
    static FONTS: OnceLock<Arc<fontdb::Database>> = OnceLock::new();
    FONTS
        .get_or_init(|| {
            let mut database = fontdb::Database::new();
            database.load_system_fonts();
            // Our own copy of the first family the SVG asks for, so that a machine without
            // fonts still draws the text, and every machine draws it with the same glyphs.
            database.load_font_data(EMBEDDED_SANS.to_vec());
            // fontdb maps the generic families to Windows fonts by default; point them at
            // a font that is present so that the generic fallback really falls back.
            let present: Vec<String> = database
                .faces()
                .flat_map(|face| face.families.iter().map(|(name, _)| name.clone()))
                .collect();
            let fallback = SANS_SERIF_CHOICES
                .iter()
                .find(|choice| present.iter().any(|name| name == *choice))
                .map(|choice| choice.to_string())
                .or_else(|| {
                    let mut sorted = present.clone();
                    sorted.sort();
                    sorted.into_iter().next()
                });
            if let Some(family) = fallback {
                database.set_sans_serif_family(family.clone());
                database.set_serif_family(family);
            }
            Arc::new(database)
        })
        .clone()
}

/// The raster size (pixels) of a `width_css` × `height_css` drawing at `resolution`,
/// refused beyond [`MAX_RASTER_SIDE`] per side or [`MAX_RASTER_PIXELS`] in all. Callers
/// check it before any work; `rasterize` checks it again.
pub fn raster_size(
    width_css: f64,
    height_css: f64,
    resolution: Resolution,
) -> Result<(f64, f64), PngError> {
    let scale = match resolution {
        Resolution::Dpi(dpi) if dpi.is_finite() && dpi > 0.0 && dpi <= 2400.0 => {
            dpi / CSS_PIXELS_PER_INCH
        }
        Resolution::Dpi(dpi) => return Err(PngError::BadDpi(dpi)),
        Resolution::PixelWidth(px) if (1..=MAX_RASTER_SIDE).contains(&px) => px as f64 / width_css,
        Resolution::PixelWidth(px) => return Err(PngError::BadPixelWidth(px)),
    };
    let width = (width_css * scale).round().max(1.0);
    let height = (height_css * scale).round().max(1.0);
    let (w, h) = (width as u64, height as u64);
    if width > MAX_RASTER_SIDE as f64 || height > MAX_RASTER_SIDE as f64 {
        return Err(PngError::TooLarge {
            width: w,
            height: h,
        });
    }
    if w * h > MAX_RASTER_PIXELS {
        return Err(PngError::TooManyPixels {
            width: w,
            height: h,
        });
    }
    Ok((width, height))
}

/// Renders an SVG document to an RGBA raster (premultiplied alpha, see tiny-skia).
pub fn rasterize(svg: &str, resolution: Resolution) -> Result<Pixmap, PngError> {
    let fonts = system_fonts();
    let options = usvg::Options {
        fontdb: fonts.clone(),
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_str(svg, &options).map_err(|e| PngError::Svg(e.to_string()))?;
    let size = tree.size();
    let (width_css, height_css) = (size.width() as f64, size.height() as f64);
    let (width, height) = raster_size(width_css, height_css, resolution)?;
    let mut pixmap = Pixmap::new(width as u32, height as u32).ok_or(PngError::TooLarge {
        width: width as u64,
        height: height as u64,
    })?;
    let transform = Transform::from_scale((width / width_css) as f32, (height / height_css) as f32);
    resvg::render(&tree, transform, &mut pixmap.as_mut());
    Ok(pixmap)
}

/// Renders an SVG document to PNG bytes, tagged with its resolution.
pub fn render_png(svg: &str, resolution: Resolution) -> Result<Vec<u8>, PngError> {
    let pixmap = rasterize(svg, resolution)?;
    let dpi = match resolution {
        Resolution::Dpi(dpi) => dpi,
        Resolution::PixelWidth(_) => CSS_PIXELS_PER_INCH,
    };
    encode_png(&pixmap, dpi)
}

/// 8-bit RGBA PNG with straight alpha, pHYs in pixels per metre, and the png crate's fast
/// DEFLATE (several times faster than the default level for a slightly larger file).
pub fn encode_png(pixmap: &Pixmap, dpi: f64) -> Result<Vec<u8>, PngError> {
    let mut rgba = Vec::with_capacity(pixmap.data().len());
    for pixel in pixmap.pixels() {
        let colour = pixel.demultiply();
        rgba.extend_from_slice(&[colour.red(), colour.green(), colour.blue(), colour.alpha()]);
    }
    let per_metre = (dpi / 0.0254).round() as u32;
    let mut out = Vec::new();
    let mut encoder = png::Encoder::new(&mut out, pixmap.width(), pixmap.height());
    encoder.set_color(png::ColorType::Rgba);
    encoder.set_depth(png::BitDepth::Eight);
    encoder.set_compression(png::Compression::Fast);
    encoder.set_pixel_dims(Some(png::PixelDimensions {
        xppu: per_metre,
        yppu: per_metre,
        unit: png::Unit::Meter,
    }));
    let encode = |encoder: png::Encoder<&mut Vec<u8>>| -> Result<(), png::EncodingError> {
        let mut writer = encoder.write_header()?;
        writer.write_image_data(&rgba)?;
        writer.finish()
    };
    encode(encoder).map_err(|e| PngError::Encode(e.to_string()))?;
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_embedded_font_is_always_there_and_draws_text() {
        let fonts = system_fonts();
        assert!(
            fonts
                .faces()
                .any(|face| face.families.iter().any(|(name, _)| name == "DejaVu Sans")),
            "embedded DejaVu Sans loaded"
        );
        let svg = r#"<svg xmlns="http://www.w3.org/2000/svg" width="80" height="30"><text x="5" y="22" font-family="DejaVu Sans" font-size="20">Hg</text></svg>"#;
        let pixmap = rasterize(svg, Resolution::Dpi(96.0)).expect("renders");
        let inked = pixmap.pixels().iter().filter(|p| p.alpha() > 0).count();
        assert!(inked > 30, "the text left ink ({inked} pixels)");
    }

    #[test]
    fn dpi_scales_the_raster_and_bad_values_are_refused() {
        let svg = r#"<svg xmlns="http://www.w3.org/2000/svg" width="96" height="48"><rect width="96" height="48" fill="red"/></svg>"#;
        let image = rasterize(svg, Resolution::Dpi(192.0)).expect("renders");
        assert_eq!((image.width(), image.height()), (192, 96));
        let image = rasterize(svg, Resolution::PixelWidth(48)).expect("renders");
        assert_eq!((image.width(), image.height()), (48, 24));
        assert_eq!(
            rasterize(svg, Resolution::Dpi(0.0)).err(),
            Some(PngError::BadDpi(0.0))
        );
        assert!(matches!(
            rasterize(svg, Resolution::Dpi(-5.0)),
            Err(PngError::BadDpi(_))
        ));
        assert!(matches!(
            rasterize("<svg", Resolution::Dpi(96.0)),
            Err(PngError::Svg(_))
        ));
    }

    #[test]
    fn png_carries_its_resolution() {
        let svg = r#"<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"/>"#;
        let png = render_png(svg, Resolution::Dpi(300.0)).expect("renders");
        let at = png
            .windows(4)
            .position(|w| w == b"pHYs")
            .expect("pHYs present");
        let per_metre = u32::from_be_bytes([png[at + 4], png[at + 5], png[at + 6], png[at + 7]]);
        // 300 dpi = 11811 px/m (300 / 0.0254).
        assert_eq!(per_metre, 11811);
        let decoded = Pixmap::decode_png(&png).expect("still a valid PNG");
        assert_eq!(decoded.width(), 31);
    }
}
