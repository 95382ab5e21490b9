//! The correlation diagram: a layout model in abstract units (`layout`), filled from an
//! `Analysis` (`build`), rendered by the GUI's painter and by the SVG writer alike, so the
//! figure on screen and the exported one are the same layout.

pub mod build;
pub mod export;
pub mod layout;
pub mod png;
pub mod style;
pub mod svg;

pub use build::{DiagramOptions, diagram_for};
pub use export::{
    ExportError, check_options, check_png_options, check_title, export_png, export_svg,
};
pub use layout::{Diagram, LadderInput, LevelInput, LinkInput, Side, layout, layout_in};
pub use png::{Resolution, rasterize, render_png};
pub use svg::{Ladders, SvgOptions, to_svg};
