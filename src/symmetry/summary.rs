//! A short symmetry summary for text and JSON output: the point group, the irreps spanned by
//! the central atom's s, p and d functions and by one σ (s-type) function on each other atom
//! (the ligand SALCs), and the sets of symmetry-equivalent atoms. The reduction is the usual
//! one (Cotton, *Chemical Applications of Group Theory*, 3rd ed., ch. 8).

use serde::{Deserialize, Serialize};

use super::Symmetry;
use super::salc::{span, span_text};
use crate::chem::Molecule;
use crate::chem::ao::{AngularKind, AtomicOrbital};

/// What the text report prints about symmetry.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct SymmetrySummary {
    /// Schoenflies text ("C3v", "D∞h").
    pub point_group: String,
    /// Number of operations used (for linear molecules, of the finite model C8v / D8h).
    pub order: usize,
    pub tolerance: f64,
    /// The atom on every symmetry element (nearest the centre, heavy atoms first), if any.
    pub central_atom: Option<usize>,
    /// ("s", "a1"), ("p", "a1 + e"), ("d", "a1 + 2e") for the central atom.
    pub central_orbitals: Vec<(String, String)>,
    /// Irreps of the SALCs of one σ function on each other atom ("a1 + e" for ammonia).
    pub ligand_sigma: Option<String>,
    /// Sets of symmetry-equivalent atoms (0-based).
    pub equivalent_atoms: Vec<Vec<usize>>,
    pub notes: Vec<String>,
}

/// The atom fixed by every operation: heavy atoms before hydrogen, then nearest the centre.
pub fn central_atom(symmetry: &Symmetry, molecule: &Molecule) -> Option<usize> {
    (0..molecule.atoms.len())
        .filter(|&i| {
            symmetry
                .operations
                .iter()
                .all(|op| op.permutation.get(i) == Some(&i))
        })
        .min_by(|&a, &b| {
            let key = |i: usize| {
                let atom = &molecule.atoms[i];
                (
                    atom.element.atomic_number() == 1,
                    (atom.position - symmetry.origin).norm(),
                )
            };
            let (ha, da) = key(a);
            let (hb, db) = key(b);
            ha.cmp(&hb).then(da.total_cmp(&db))
        })
}

/// Builds the summary; reductions that fail are left out (they cannot fail for a symmetry
/// found by `detect`).
pub fn summarize(symmetry: &Symmetry, molecule: &Molecule) -> SymmetrySummary {
    let centre = central_atom(symmetry, molecule);
    let mut central_orbitals = Vec::new();
    if let Some(c) = centre {
        for (l, name) in [(0u8, "s"), (1, "p"), (2, "d")] {
            let basis: Vec<AtomicOrbital> = AngularKind::shell(l)
                .iter()
                .map(|k| AtomicOrbital {
                    atom: c,
                    n: 3,
                    kind: *k,
                })
                .collect();
            if let Ok(m) = span(symmetry, &basis) {
                central_orbitals.push((name.to_string(), span_text(symmetry, &m)));
            }
        }
    }
    let ligands: Vec<AtomicOrbital> = (0..molecule.atoms.len())
        .filter(|&i| Some(i) != centre)
        .map(|i| AtomicOrbital {
            atom: i,
            n: 1,
            kind: AngularKind::S,
        })
        .collect();
    let ligand_sigma = if ligands.is_empty() {
        None
    } else {
        span(symmetry, &ligands)
            .ok()
            .map(|m| span_text(symmetry, &m))
    };
    SymmetrySummary {
        point_group: symmetry.group.to_string(),
        order: symmetry.operations.len(),
        tolerance: symmetry.tolerance,
        central_atom: centre,
        central_orbitals,
        ligand_sigma,
        equivalent_atoms: symmetry.equivalent_atoms(),
        notes: symmetry.notes.clone(),
    }
}
