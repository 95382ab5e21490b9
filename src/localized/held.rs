//! What the lone-pair switch holds (DESIGN §4.6): the lone pairs it may hold, the user's
//! choice among them, and the orbital each held lone pair becomes in the orthonormal
//! atomic basis under the chosen convention.
//!
//! By default the lone pairs of centres with two or more bonded partners are held: the
//! central atoms a first-order diagram is drawn for (common practice, no source). A
//! terminal atom's lone pair is held only when chosen: holding the p orbital along a
//! terminal atom's lone-pair axis removes the orbital that atom bonds with.
//!
//! Conventions: *first-order* holds the centre's valence p orbital along the lone pair's
//! direction (the p part of the lone-pair hybrid, normalized), the orbital left
//! non-bonding in the hand-drawn diagram; *hybrid* holds the lone-pair hybrid itself.
//! Either way the held orbital keeps its atomic energy Σ_μ c_μ² α_μ (α the valence
//! orbital energies of the extended Hückel parameters): α_p for the first-order orbital,
//! (α_s + λ α_p)/(1 + λ) for an sp^λ hybrid — the value the localized ladder gives its
//! lone pairs, so both ladders agree in the off state.

use nalgebra::{DMatrix, DVector};
use serde::{Deserialize, Serialize};

use super::ladder::LocalizedKind;
use super::orthonormal::{AtomLayout, push_orthonormal};

/// A held orbital whose norm falls below this fraction in Gram–Schmidt against the
/// same centre's earlier ones adds nothing new (our choice, no source).
const INDEPENDENT_FRACTION: f64 = 0.3;

/// One lone pair: the `index`-th lone-pair level of `atom` in the localized ladder
/// (ascending energy), both 0-based.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LonePairRef {
    pub atom: usize,
    pub index: usize,
}

/// Which lone pairs the switch holds.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HeldLonePairs {
    /// The lone pairs of atoms with two or more bonded partners.
    #[default]
    Central,
    /// Every lone pair.
    All,
    /// Every lone pair of these atoms (0-based).
    Atoms(Vec<usize>),
    /// These lone pairs, one by one.
    Chosen(Vec<LonePairRef>),
}

/// Which orbital of a held lone pair is held.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HoldConvention {
    /// The centre's valence p orbital along the lone pair (the hand-drawn diagram).
    #[default]
    FirstOrder,
    /// The lone-pair hybrid itself.
    Hybrid,
}

impl HoldConvention {
    /// The JSON and command-line name.
    pub fn as_str(self) -> &'static str {
        match self {
            HoldConvention::FirstOrder => "first-order",
            HoldConvention::Hybrid => "hybrid",
        }
    }

    /// One line for captions and the window.
    pub fn description(self) -> &'static str {
        match self {
            HoldConvention::FirstOrder => {
                "first-order: the centre's p orbital along each held lone pair is non-bonding"
            }
            HoldConvention::Hybrid => "hybrid: each held lone-pair hybrid is non-bonding",
        }
    }
}

/// A lone pair of the localized ladder that the switch could hold.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LonePairCandidate {
    pub lone_pair: LonePairRef,
    /// Its level in the localized ladder.
    pub level: usize,
    /// Its atom has two or more bonded partners.
    pub central: bool,
}

/// The lone pairs of the ladder (levels of kind lone pair, in ladder order), with
/// `partners[atom]` the number of bonded partners of each atom.
pub fn candidates(levels: &[(LocalizedKind, usize)], partners: &[usize]) -> Vec<LonePairCandidate> {
    let mut seen = vec![0usize; partners.len()];
    let mut found = Vec::new();
    for (level, &(kind, atom)) in levels.iter().enumerate() {
        if kind != LocalizedKind::LonePair || atom >= partners.len() {
            continue;
        }
        found.push(LonePairCandidate {
            lone_pair: LonePairRef {
                atom,
                index: seen[atom],
            },
            level,
            central: partners[atom] >= 2,
        });
        seen[atom] += 1;
    }
    found
}

impl HeldLonePairs {
    /// Whether this selection holds `candidate`.
    pub fn holds(&self, candidate: &LonePairCandidate) -> bool {
        match self {
            HeldLonePairs::Central => candidate.central,
            HeldLonePairs::All => true,
            HeldLonePairs::Atoms(atoms) => atoms.contains(&candidate.lone_pair.atom),
            HeldLonePairs::Chosen(pairs) => pairs.contains(&candidate.lone_pair),
        }
    }

    /// The same choice as an explicit list of lone pairs, with `toggled` flipped (for a
    /// choice made lone pair by lone pair in the window).
    pub fn toggled(&self, candidates: &[LonePairCandidate], toggled: LonePairRef) -> Self {
        let mut pairs: Vec<LonePairRef> = candidates
            .iter()
            .filter(|c| self.holds(c) != (c.lone_pair == toggled))
            .map(|c| c.lone_pair)
            .collect();
        pairs.sort_unstable();
        HeldLonePairs::Chosen(pairs)
    }
}

/// One held orbital over the orthonormal basis, on one atom.
#[derive(Clone, Debug, PartialEq)]
pub struct HeldOrbital {
    pub lone_pair: LonePairRef,
    pub vector: DVector<f64>,
    /// Its atomic energy Σ_μ c_μ² α_μ, eV.
    pub energy_ev: f64,
}

/// The held orbitals of the chosen candidates: `ladder` holds the ladder's level vectors
/// (columns over the orthonormal basis), `atomic` the α of each basis function. A lone
/// pair that adds no new direction on its centre (a fourth lone pair on an atom with
/// three p orbitals, say) is left out with a note.
pub fn held_orbitals(
    chosen: &[&LonePairCandidate],
    ladder: &DMatrix<f64>,
    layout: &AtomLayout,
    atomic: &[f64],
    convention: HoldConvention,
) -> (Vec<HeldOrbital>, Vec<String>) {
    let mut held: Vec<HeldOrbital> = Vec::new();
    let mut notes = Vec::new();
    for candidate in chosen {
        let atom = candidate.lone_pair.atom;
        let (Some(range), true) = (layout.ranges.get(atom), candidate.level < ladder.ncols())
        else {
            continue;
        };
        let column = ladder.column(candidate.level);
        let vector = DVector::from_fn(column.len(), |mu, _| {
            let kept = range.contains(&mu)
                && (convention == HoldConvention::Hybrid || layout.kinds[mu].l() == 1);
            if kept { column[mu] } else { 0.0 }
        });
        let mut same_atom: Vec<DVector<f64>> = held
            .iter()
            .filter(|h| h.lone_pair.atom == atom)
            .map(|h| h.vector.clone())
            .collect();
        if vector.norm() <= INDEPENDENT_FRACTION * column.norm() {
            notes.push(format!(
                "lone pair {} of atom {} is not held: it has almost no p part (an s lone pair)",
                candidate.lone_pair.index + 1,
                atom
            ));
            continue;
        }
        if !push_orthonormal(&mut same_atom, vector, INDEPENDENT_FRACTION) {
            notes.push(dependent_note(candidate.lone_pair, convention));
            continue;
        }
        let vector = same_atom.pop().unwrap_or_default();
        let energy_ev = atomic_energy(&vector, atomic);
        held.push(HeldOrbital {
            lone_pair: candidate.lone_pair,
            vector,
            energy_ev,
        });
    }
    (held, notes)
}

/// Why a lone pair adds nothing to its centre's held orbitals.
fn dependent_note(lone_pair: LonePairRef, convention: HoldConvention) -> String {
    let what = match convention {
        HoldConvention::FirstOrder => "p orbital",
        HoldConvention::Hybrid => "hybrid",
    };
    format!(
        "lone pair {} of atom {} is not held: its {what} adds no direction its centre's earlier held orbitals lack",
        lone_pair.index + 1,
        lone_pair.atom
    )
}

/// Σ_μ c_μ² α_μ: the energy of a one-centre orbital in its free atom.
pub fn atomic_energy(vector: &DVector<f64>, atomic: &[f64]) -> f64 {
    vector
        .iter()
        .zip(atomic)
        .map(|(c, alpha)| c * c * alpha)
        .sum()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn candidate(atom: usize, index: usize, central: bool) -> LonePairCandidate {
        LonePairCandidate {
            lone_pair: LonePairRef { atom, index },
            level: 0,
            central,
        }
    }

    #[test]
    fn selections_hold_what_they_name() {
        let terminal = candidate(1, 0, false);
        let central = candidate(0, 0, true);
        assert!(HeldLonePairs::Central.holds(&central));
        assert!(!HeldLonePairs::Central.holds(&terminal));
        assert!(HeldLonePairs::All.holds(&terminal));
        assert!(HeldLonePairs::Atoms(vec![1]).holds(&terminal));
        assert!(!HeldLonePairs::Atoms(vec![1]).holds(&central));
        let list = [central.clone(), terminal.clone()];
        let toggled = HeldLonePairs::Central.toggled(&list, terminal.lone_pair);
        assert!(toggled.holds(&terminal) && toggled.holds(&central));
        let back = toggled.toggled(&list, central.lone_pair);
        assert!(back.holds(&terminal) && !back.holds(&central));
    }
}
