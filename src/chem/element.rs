//! Periodic-table data for hydrogen to krypton.
//!
//! Sources, one per column:
//! - atomic number and symbol: IUPAC periodic table;
//! - standard atomic weight: CIAAW abridged/conventional values (Prohaska et al.,
//!   Pure Appl. Chem. 94, 573 (2022)), in g/mol;
//! - covalent radius: Cordero et al., Dalton Trans. 2008, 2832 (Table 2; sp3 carbon,
//!   low-spin values for Mn, Fe, Co), in Å;
//! - valence electron count: common practice, no source (group number for main-group
//!   atoms; for Ga–Kr the filled 3d shell counts as core; s + d electrons for Sc–Zn).

use serde::{Deserialize, Serialize};
use thiserror::Error;

/// One row of the table.
struct ElementData {
    symbol: &'static str,
    name: &'static str,
    mass: f64,
    covalent_radius: f64,
    valence_electrons: u8,
}

const fn row(
    symbol: &'static str,
    name: &'static str,
    mass: f64,
    covalent_radius: f64,
    valence_electrons: u8,
) -> ElementData {
    ElementData {
        symbol,
        name,
        mass,
        covalent_radius,
        valence_electrons,
    }
}

/// Index = Z − 1.
const TABLE: [ElementData; 36] = [
    row("H", "hydrogen", 1.008, 0.31, 1),
    row("He", "helium", 4.0026, 0.28, 2),
    row("Li", "lithium", 6.94, 1.28, 1),
    row("Be", "beryllium", 9.0122, 0.96, 2),
    row("B", "boron", 10.81, 0.84, 3),
    row("C", "carbon", 12.011, 0.76, 4),
    row("N", "nitrogen", 14.007, 0.71, 5),
    row("O", "oxygen", 15.999, 0.66, 6),
    row("F", "fluorine", 18.998, 0.57, 7),
    row("Ne", "neon", 20.180, 0.58, 8),
    row("Na", "sodium", 22.990, 1.66, 1),
    row("Mg", "magnesium", 24.305, 1.41, 2),
    row("Al", "aluminium", 26.982, 1.21, 3),
    row("Si", "silicon", 28.085, 1.11, 4),
    row("P", "phosphorus", 30.974, 1.07, 5),
    row("S", "sulfur", 32.06, 1.05, 6),
    row("Cl", "chlorine", 35.45, 1.02, 7),
    row("Ar", "argon", 39.95, 1.06, 8),
    row("K", "potassium", 39.098, 2.03, 1),
    row("Ca", "calcium", 40.078, 1.76, 2),
    row("Sc", "scandium", 44.956, 1.70, 3),
    row("Ti", "titanium", 47.867, 1.60, 4),
    row("V", "vanadium", 50.942, 1.53, 5),
    row("Cr", "chromium", 51.996, 1.39, 6),
    row("Mn", "manganese", 54.938, 1.39, 7),
    row("Fe", "iron", 55.845, 1.32, 8),
    row("Co", "cobalt", 58.933, 1.26, 9),
    row("Ni", "nickel", 58.693, 1.24, 10),
    row("Cu", "copper", 63.546, 1.32, 11),
    row("Zn", "zinc", 65.38, 1.22, 12),
    row("Ga", "gallium", 69.723, 1.22, 3),
    row("Ge", "germanium", 72.630, 1.20, 4),
    row("As", "arsenic", 74.922, 1.19, 5),
    row("Se", "selenium", 78.971, 1.20, 6),
    row("Br", "bromine", 79.904, 1.20, 7),
    row("Kr", "krypton", 83.798, 1.16, 8),
];

/// Highest atomic number the table covers.
pub const MAX_ATOMIC_NUMBER: u8 = TABLE.len() as u8;

/// A chemical element from H (Z = 1) to Kr (Z = 36).
///
/// Serialized as its symbol ("N", "Cl").
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(try_from = "String", into = "String")]
pub struct Element(u8);

/// An element symbol or number the table does not know.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum ElementError {
    #[error("unknown element symbol '{0}' (Diptych knows H to Kr)")]
    UnknownSymbol(String),
    #[error("atomic number {0} is outside H (1) to Kr (36)")]
    UnknownNumber(u32),
}

impl Element {
    pub const H: Element = Element(1);
    pub const B: Element = Element(5);
    pub const C: Element = Element(6);
    pub const N: Element = Element(7);
    pub const O: Element = Element(8);
    pub const F: Element = Element(9);
    pub const P: Element = Element(15);
    pub const S: Element = Element(16);
    pub const CL: Element = Element(17);

    /// The element with atomic number `z`.
    pub fn from_atomic_number(z: u32) -> Result<Element, ElementError> {
        if (1..=MAX_ATOMIC_NUMBER as u32).contains(&z) {
            Ok(Element(z as u8))
        } else {
            Err(ElementError::UnknownNumber(z))
        }
    }

    /// Parses a symbol, ignoring case and surrounding white space ("cl", "CL", "Cl").
    pub fn from_symbol(text: &str) -> Result<Element, ElementError> {
        let trimmed = text.trim();
        TABLE
            .iter()
            .position(|row| row.symbol.eq_ignore_ascii_case(trimmed))
            .map(|index| Element(index as u8 + 1))
            .ok_or_else(|| ElementError::UnknownSymbol(crate::message::shown(trimmed)))
    }

    /// All elements of the table, in order of atomic number.
    pub fn all() -> impl Iterator<Item = Element> {
        (1..=MAX_ATOMIC_NUMBER).map(Element)
    }

    fn data(self) -> &'static ElementData {
        &TABLE[self.0 as usize - 1]
    }

    pub fn atomic_number(self) -> u8 {
        self.0
    }

    pub fn symbol(self) -> &'static str {
        self.data().symbol
    }

    pub fn name(self) -> &'static str {
        self.data().name
    }

    /// Standard atomic weight in g/mol (CIAAW).
    pub fn mass(self) -> f64 {
        self.data().mass
    }

    /// Single-bond covalent radius in Å (Cordero et al. 2008).
    pub fn covalent_radius(self) -> f64 {
        self.data().covalent_radius
    }

    pub fn valence_electrons(self) -> u8 {
        self.data().valence_electrons
    }

    /// Period (row) of the periodic table, 1 to 4.
    pub fn period(self) -> u8 {
        match self.0 {
            1..=2 => 1,
            3..=10 => 2,
            11..=18 => 3,
            _ => 4,
        }
    }

    /// Electrons in closed inner shells (not counted as valence).
    pub fn core_electrons(self) -> u8 {
        self.0 - self.valence_electrons()
    }
}

impl std::fmt::Display for Element {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.symbol())
    }
}

impl TryFrom<String> for Element {
    type Error = ElementError;
    fn try_from(value: String) -> Result<Self, Self::Error> {
        Element::from_symbol(&value)
    }
}

impl From<Element> for String {
    fn from(value: Element) -> Self {
        value.symbol().to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn symbols_round_trip_and_ignore_case() {
        for element in Element::all() {
            assert_eq!(Element::from_symbol(element.symbol()), Ok(element));
        }
        assert_eq!(Element::from_symbol(" cl "), Ok(Element::CL));
        assert_eq!(
            Element::from_symbol("NA").map(|e| e.atomic_number()),
            Ok(11)
        );
    }

    #[test]
    fn unknown_symbols_are_named_in_the_error() {
        let error = Element::from_symbol("Xx").unwrap_err();
        assert!(error.to_string().contains("'Xx'"), "{error}");
        assert!(Element::from_symbol("Rb").is_err(), "Rb is beyond Kr");
        assert!(Element::from_atomic_number(0).is_err());
        assert!(Element::from_atomic_number(37).is_err());
    }

    #[test]
    fn table_values_match_sources() {
        // CIAAW conventional weights and Cordero 2008 radii, spot checks.
        assert_eq!(Element::C.mass(), 12.011);
        assert_eq!(Element::CL.mass(), 35.45);
        assert_eq!(Element::N.covalent_radius(), 0.71);
        assert_eq!(Element::H.covalent_radius(), 0.31);
        assert_eq!(Element::from_symbol("Br").unwrap().covalent_radius(), 1.20);
        // Masses increase with Z except the known Ar/K, Co/Ni inversions.
        let inversions: Vec<_> = Element::all()
            .zip(Element::all().skip(1))
            .filter(|(a, b)| a.mass() > b.mass())
            .map(|(a, _)| a.symbol())
            .collect();
        assert_eq!(inversions, vec!["Ar", "Co"]);
    }

    #[test]
    fn valence_counts_follow_groups() {
        let counts: Vec<u8> = [
            "H", "B", "C", "N", "O", "F", "Si", "P", "S", "Cl", "Ga", "Br",
        ]
        .iter()
        .map(|s| Element::from_symbol(s).unwrap().valence_electrons())
        .collect();
        assert_eq!(counts, vec![1, 3, 4, 5, 6, 7, 4, 5, 6, 7, 3, 7]);
        assert_eq!(Element::N.core_electrons(), 2);
    }
}
