//! The lone-pair mixing switch as a stage of `Analysis::run` (DESIGN §4.6): which lone
//! pairs of the localized ladder are held (`localized::held`), the levels with them held
//! (`localized::switch`), and the swap of the canonical MOs when mixing is off.

use nalgebra::DMatrix;
use serde::Serialize;

use super::LocalizedSummary;
use crate::eht::EhtResult;
use crate::localized::held::{self, HeldLonePairs, HoldConvention, LonePairCandidate, LonePairRef};
use crate::localized::switch::{self, HeldState, MixedState};
use crate::localized::{LocalizedKind, LocalizedPicture};

/// Settings of the switch (DESIGN §4.6).
#[derive(Clone, Copy, Debug)]
pub(super) struct SwitchRequest<'a> {
    pub mixing: bool,
    pub selection: &'a HeldLonePairs,
    pub convention: HoldConvention,
}

/// A lone pair the switch could hold, as the window and reports list it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LonePairChoice {
    pub lone_pair: LonePairRef,
    /// Its ladder label, e.g. "n(N)".
    pub label: String,
    /// Its atom has two or more bonded partners (held by default).
    pub central: bool,
    pub held: bool,
}

/// One held level: its energy in both states.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct HeldLevel {
    /// The atoms of the held orbitals it is made of.
    pub atoms: Vec<usize>,
    /// With mixing off (the held orbital's atomic energy), eV.
    pub energy_off_ev: f64,
    /// The canonical MO it becomes with mixing on, and that MO's energy, eV.
    pub on_level: usize,
    pub energy_on_ev: f64,
    /// Its electrons with mixing off.
    pub occupancy: f64,
}

/// What the switch did, for the window and the reports.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SwitchSummary {
    pub mixing: bool,
    pub convention: HoldConvention,
    pub choices: Vec<LonePairChoice>,
    pub held: Vec<HeldLevel>,
    /// Why nothing can be held (the switch is then disabled).
    pub disabled: Option<String>,
}

/// The switch's result: the summary, the per-level shifts of the state shown (energy in
/// the other state minus energy shown) and the notes.
pub(super) struct SwitchOutcome {
    pub summary: SwitchSummary,
    pub shifts: Vec<f64>,
    pub notes: Vec<String>,
}

/// Number of bonded partners of each atom in the Lewis structure (bonds of positive
/// order and multicentre bonds).
fn bonded_partners(picture: &LocalizedPicture, atoms: usize) -> Vec<usize> {
    let mut partners: Vec<Vec<usize>> = vec![Vec::new(); atoms];
    let mut join = |a: usize, b: usize| {
        if a < atoms && b < atoms && a != b && !partners[a].contains(&b) {
            partners[a].push(b);
        }
    };
    for bond in picture.lewis.bonds.iter().filter(|b| b.order > 0.0) {
        join(bond.atoms[0], bond.atoms[1]);
        join(bond.atoms[1], bond.atoms[0]);
    }
    for bond in &picture.lewis.multicentre {
        for &a in &bond.atoms {
            for &b in &bond.atoms {
                join(a, b);
            }
        }
    }
    partners.iter().map(Vec::len).collect()
}

/// Runs the switch on `eht` (mixing on) with the ladder `localized`/`ladder_vectors`; with
/// mixing off, `eht`'s canonical MOs are replaced by the held state.
pub(super) fn apply(
    eht: &mut EhtResult,
    picture: &LocalizedPicture,
    localized: &[LocalizedSummary],
    ladder_vectors: &DMatrix<f64>,
    request: SwitchRequest<'_>,
) -> Result<SwitchOutcome, String> {
    let atoms = eht.basis.atom_ranges.len();
    let levels: Vec<(LocalizedKind, usize)> = localized
        .iter()
        .map(|l| (l.kind, l.atoms.first().copied().unwrap_or(usize::MAX)))
        .collect();
    let candidates = held::candidates(&levels, &bonded_partners(picture, atoms));
    let chosen: Vec<&LonePairCandidate> = candidates
        .iter()
        .filter(|c| request.selection.holds(c))
        .collect();
    let atomic = super::stages::atomic_energies(eht);
    let (held_orbitals, mut notes) = held::held_orbitals(
        &chosen,
        ladder_vectors,
        &picture.layout,
        &atomic,
        request.convention,
    );
    notes.extend(unmatched_choices(&candidates, request.selection));
    let mut summary = SwitchSummary {
        mixing: request.mixing,
        convention: request.convention,
        choices: choices(&candidates, localized, request.selection),
        held: Vec::new(),
        disabled: None,
    };
    if held_orbitals.is_empty() {
        summary.disabled = Some(disabled_reason(&candidates, request.selection));
        return Ok(SwitchOutcome {
            summary,
            shifts: Vec::new(),
            notes,
        });
    }
    let mixed = MixedState {
        hamiltonian: &eht.orthonormal.hamiltonian,
        coefficients: &eht.orthonormal.coefficients,
        energies: &eht.energies,
        occupations: &eht.occupations,
        electrons: eht.electrons,
    };
    let state = switch::hold(mixed, &held_orbitals, &atomic)
        .map_err(|e| format!("lone-pair switch: {e}"))?;
    notes.extend(state.notes.iter().cloned());
    summary.held = held_levels(&state, &held_orbitals, &eht.energies);
    let shifts = if request.mixing {
        shifts_on(&state, eht.energies.len())
    } else {
        let shifts = state.shifts.clone();
        show_held(eht, state);
        shifts
    };
    Ok(SwitchOutcome {
        summary,
        shifts,
        notes,
    })
}

/// The lone pairs as the window and reports list them: by atom, then by the lone pair's
/// rank on it (the ladder lists them by energy).
fn choices(
    candidates: &[LonePairCandidate],
    localized: &[LocalizedSummary],
    selection: &HeldLonePairs,
) -> Vec<LonePairChoice> {
    let mut choices: Vec<LonePairChoice> = candidates
        .iter()
        .map(|c| LonePairChoice {
            lone_pair: c.lone_pair,
            label: localized[c.level].label.clone(),
            central: c.central,
            held: selection.holds(c),
        })
        .collect();
    choices.sort_by_key(|c| c.lone_pair);
    choices
}

/// The one-line reason nothing is held.
fn disabled_reason(candidates: &[LonePairCandidate], selection: &HeldLonePairs) -> String {
    if candidates.is_empty() {
        "no lone pair to hold: the localized picture has none".to_string()
    } else if *selection == HeldLonePairs::Central {
        "no lone pair on an atom with two or more bonded partners (terminal lone pairs are held only when chosen)".to_string()
    } else {
        "none of the chosen lone pairs can be held".to_string()
    }
}

/// A note for each chosen atom or lone pair the ladder does not have (a typo on the
/// command line, a project written for another geometry), so no choice is lost silently.
fn unmatched_choices(candidates: &[LonePairCandidate], selection: &HeldLonePairs) -> Vec<String> {
    let has_atom = |atom: usize| candidates.iter().any(|c| c.lone_pair.atom == atom);
    match selection {
        HeldLonePairs::Atoms(atoms) => atoms
            .iter()
            .filter(|&&atom| !has_atom(atom))
            .map(|atom| format!("atom {atom} has no lone pair to hold (atoms are numbered from 0)"))
            .collect(),
        HeldLonePairs::Chosen(pairs) => pairs
            .iter()
            .filter(|pair| !candidates.iter().any(|c| c.lone_pair == **pair))
            .map(|pair| {
                format!(
                    "atom {} has no lone pair #{} to hold (atoms are numbered from 0)",
                    pair.atom,
                    pair.index + 1
                )
            })
            .collect(),
        HeldLonePairs::Central | HeldLonePairs::All => Vec::new(),
    }
}

/// The held levels with their atoms and both energies.
fn held_levels(
    state: &HeldState,
    held: &[held::HeldOrbital],
    on_energies: &[f64],
) -> Vec<HeldLevel> {
    state
        .held_levels
        .iter()
        .map(|&k| {
            let column = state.coefficients.column(k);
            let mut atoms: Vec<usize> = held
                .iter()
                .filter(|h| h.vector.dot(&column).abs() > 1e-6)
                .map(|h| h.lone_pair.atom)
                .collect();
            atoms.dedup();
            let on_level = state.paired.get(k).copied().unwrap_or(usize::MAX);
            HeldLevel {
                atoms,
                energy_off_ev: state.energies[k],
                on_level,
                energy_on_ev: on_energies.get(on_level).copied().unwrap_or(f64::NAN),
                occupancy: state.occupations[k],
            }
        })
        .collect()
}

/// Per mixed level: its held partner's energy minus its own.
fn shifts_on(state: &HeldState, count: usize) -> Vec<f64> {
    let mut shifts = vec![0.0; count];
    for (off, &on) in state.paired.iter().enumerate() {
        if let Some(slot) = shifts.get_mut(on) {
            *slot = -state.shifts[off];
        }
    }
    shifts
}

/// Puts the held state in place of the canonical MOs (populations stay those of the full
/// solution).
fn show_held(eht: &mut EhtResult, state: HeldState) {
    eht.coefficients = &eht.orthonormal.orthogonalizer * &state.coefficients;
    eht.orthonormal.coefficients = state.coefficients;
    eht.energies = state.energies;
    eht.occupations = state.occupations;
    eht.open_shell = state.open_shell;
    eht.sum_occupied_energy = eht
        .energies
        .iter()
        .zip(&eht.occupations)
        .map(|(e, n)| e * n)
        .sum();
}
