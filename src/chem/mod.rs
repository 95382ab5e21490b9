//! Chemistry data: elements, the molecule model and file formats.

pub mod ao;
mod edit;
pub mod element;
pub mod formula;
pub mod io;
pub mod molecule;
pub mod templates;

pub use element::{Element, ElementError};
pub use molecule::{Atom, Bond, Molecule, MoleculeError};
