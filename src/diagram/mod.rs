//! The correlation diagram: a layout model in abstract units (`layout`), filled from an
//! `Analysis` (`build`), rendered by the GUI's painter and by the SVG writer alike, so the
//! figure on screen and the exported one are the same layout.

pub mod build;
pub mod layout;
pub mod style;
pub mod svg;

pub use build::{DiagramOptions, diagram_for};
pub use layout::{Diagram, LadderInput, LevelInput, LinkInput, Side, layout, layout_in};
pub use svg::{SvgOptions, to_svg};
