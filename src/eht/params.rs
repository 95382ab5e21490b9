//! Extended Hückel parameters: for each element its valence Slater shells, each with a
//! valence-state ionization potential (VSIP, the diagonal H_ii in eV) and a Slater exponent
//! ζ (1/bohr).
//!
//! The default set is the standard published extended Hückel tabulation (R. Hoffmann,
//! J. Chem. Phys. 39, 1397 (1963) for H, C, N, O; later tabulations for the other
//! elements) as tabulated in the YAeHMOP parameter file distributed with RDKit, kept in
//! `assets/eht_parameters.ron` with a source on every row. The file is embedded in the
//! binary with `include_str!` and parsed on first use; a damaged file is a typed error,
//! never a panic. Any element can be overridden (see `EhtSettings::overrides`).

use std::path::Path;
use std::sync::OnceLock;

use serde::{Deserialize, Serialize};

use super::EhtError;
use crate::chem::element::Element;

/// The parameter file shipped with the program.
pub const BUILTIN_PARAMETERS: &str = include_str!("../../assets/eht_parameters.ron");

/// Highest principal quantum number the overlap integrals support.
pub const MAX_N: u8 = 5;
/// Highest angular momentum the overlap integrals support (d).
pub const MAX_L: u8 = 2;

/// One valence shell of an element: all 2l + 1 real functions share n, ζ and the VSIP.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ShellParameters {
    /// Principal quantum number (1 to 5).
    pub n: u8,
    /// Angular momentum: 0 = s, 1 = p, 2 = d.
    pub l: u8,
    /// Valence-state ionization potential, H_ii in eV (negative).
    pub vsip: f64,
    /// Slater exponent ζ in 1/bohr.
    pub zeta: f64,
}

/// The parameters of one element: its shells (s before p before d) and where they come from.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ElementParameters {
    pub element: Element,
    pub shells: Vec<ShellParameters>,
    /// Literature source of the row.
    pub source: String,
}

/// A whole parameter table.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct ParameterSet {
    /// Format version of the file (currently 1).
    pub version: u32,
    /// What the table is.
    pub description: String,
    pub elements: Vec<ElementParameters>,
}

static BUILTIN: OnceLock<Result<ParameterSet, EhtError>> = OnceLock::new();

impl ParameterSet {
    /// The embedded default table, parsed once. A damaged embedded file gives
    /// `EhtError::ParameterFile` on every call.
    pub fn builtin() -> Result<&'static ParameterSet, EhtError> {
        BUILTIN
            .get_or_init(|| ParameterSet::parse(BUILTIN_PARAMETERS, "built-in eht_parameters.ron"))
            .as_ref()
            .map_err(Clone::clone)
    }

    /// Parses and checks RON text; `origin` names the text in error messages.
    pub fn parse(text: &str, origin: &str) -> Result<ParameterSet, EhtError> {
        let set: ParameterSet = ron::from_str(text).map_err(|error| EhtError::ParameterFile {
            origin: origin.to_string(),
            message: error.to_string(),
        })?;
        if set.version != 1 {
            return Err(EhtError::ParameterFile {
                origin: origin.to_string(),
                message: format!("unsupported version {} (expected 1)", set.version),
            });
        }
        for (index, row) in set.elements.iter().enumerate() {
            row.validate()?;
            if set.elements[..index]
                .iter()
                .any(|other| other.element == row.element)
            {
                return Err(EhtError::InvalidParameters {
                    element: row.element,
                    message: "the element appears twice in the table".to_string(),
                });
            }
        }
        Ok(set)
    }

    /// Reads and checks a parameter file in the same RON format as the built-in one.
    pub fn from_path(path: &Path) -> Result<ParameterSet, EhtError> {
        let text = std::fs::read_to_string(path).map_err(|error| EhtError::ParameterFile {
            origin: path.display().to_string(),
            message: error.to_string(),
        })?;
        ParameterSet::parse(&text, &path.display().to_string())
    }

    /// The row of `element`, if the table has one.
    pub fn get(&self, element: Element) -> Option<&ElementParameters> {
        self.elements.iter().find(|row| row.element == element)
    }

    /// The row of `element` with `overrides` taking precedence over the table.
    pub fn lookup<'a>(
        &'a self,
        element: Element,
        overrides: &'a [ElementParameters],
    ) -> Result<&'a ElementParameters, EhtError> {
        overrides
            .iter()
            .rev()
            .find(|row| row.element == element)
            .or_else(|| self.get(element))
            .ok_or(EhtError::MissingParameters { element })
    }
}

impl ElementParameters {
    /// Checks that the shells can be integrated: 1 ≤ n ≤ 5, l < n, l ≤ 2, one shell per l,
    /// finite positive ζ, finite negative VSIP, at least one shell.
    pub fn validate(&self) -> Result<(), EhtError> {
        let fail = |message: String| EhtError::InvalidParameters {
            element: self.element,
            message,
        };
        if self.shells.is_empty() {
            return Err(fail("no shells".to_string()));
        }
        for (index, shell) in self.shells.iter().enumerate() {
            if shell.n == 0 || shell.n > MAX_N {
                return Err(fail(format!("n = {} is outside 1 to {MAX_N}", shell.n)));
            }
            if shell.l > MAX_L || shell.l >= shell.n {
                return Err(fail(format!(
                    "l = {} is not possible for n = {} (l < n and l ≤ {MAX_L})",
                    shell.l, shell.n
                )));
            }
            if !(shell.zeta.is_finite() && shell.zeta > 0.0) {
                return Err(fail(format!(
                    "the Slater exponent {} of the l = {} shell must be finite and positive",
                    shell.zeta, shell.l
                )));
            }
            if !(shell.vsip.is_finite() && shell.vsip < 0.0) {
                return Err(fail(format!(
                    "the VSIP {} eV of the l = {} shell must be finite and negative",
                    shell.vsip, shell.l
                )));
            }
            if self.shells[..index].iter().any(|other| other.l == shell.l) {
                return Err(fail(format!("two shells with l = {}", shell.l)));
            }
        }
        Ok(())
    }
}
