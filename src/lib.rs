//! Diptych: the delocalized (symmetry MOs) and localized (directed hybrids) pictures of a
//! molecule's bonding, computed from one geometry. This library is pure computation and
//! knows nothing of any GUI toolkit; `src/main.rs` and `src/app/` are thin shells over it.

pub mod analysis;
pub mod chem;
pub mod csv;
pub mod diagram;
pub mod eht;
pub mod hybrid;
pub mod localized;
pub mod message;
pub mod orbital_map;
pub mod project;
pub mod report;
pub mod scan;
pub mod series;
pub mod symmetry;
