//! The stages of `Analysis::run` after the extended Hückel solution: the lone-pair mixing
//! switch (DESIGN §4.6), the localized ladder from the chosen hybrid model (§4.4) or from
//! Pipek–Mezey orbitals (§4.5), and the canonical ↔ localized weights (§4.6).

use nalgebra::{DMatrix, DVector};

use super::{HybridEntry, LinkSummary, LocalizedSummary, OrbitalSummary};
use crate::chem::ao::AngularKind;
use crate::chem::molecule::Molecule;
use crate::eht::EhtResult;
use crate::hybrid::{HybridAnalysis, HybridKind, HybridModel, HybridSettings};
use crate::link::{LevelSets, link};
use crate::localize::{LocalizeOptions, describe, localize_occupied};
use crate::lone_pair_mixing::compare_mixing;

/// Weights below this are left out of the link list (DESIGN §4.6: entries above 1e-4).
const LINK_LIST_THRESHOLD: f64 = 1e-4;
/// Orbitals closer than this (eV) form one degenerate set when symmetry gives no label
/// (the solver's own tolerance for sharing electrons in a set).
const DEGENERACY_EV: f64 = crate::eht::DEGENERACY_TOLERANCE_EV;

/// Each lone pair's atomic orbital: the centre's p orbital along the lone-pair hybrid's
/// direction (issue text of the switch: "the centre's p orbital … along the lone-pair
/// direction"), as a vector over the whole basis.
fn lone_pair_orbitals(eht: &EhtResult, hybrids: &HybridAnalysis) -> Vec<DVector<f64>> {
    let mut vectors = Vec::new();
    for centre in &hybrids.centres {
        let Some(range) = eht.basis.atom_ranges.get(centre.atom) else {
            continue;
        };
        for hybrid in centre
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::LonePair)
        {
            let mut vector = DVector::zeros(eht.basis.len());
            for mu in range.clone() {
                vector[mu] = match eht.basis.orbitals[mu].kind {
                    AngularKind::Px => hybrid.direction[0],
                    AngularKind::Py => hybrid.direction[1],
                    AngularKind::Pz => hybrid.direction[2],
                    _ => 0.0,
                };
            }
            if vector.norm() > 1e-8 {
                vectors.push(vector.normalize());
            }
        }
    }
    vectors
}

/// Computes both states of the switch. With mixing off, `eht`'s orbitals are replaced by
/// the held-non-bonding solution (populations stay those of the full solution). Returns,
/// per orbital shown, the energy in the other state minus the energy shown.
pub(super) fn apply_lone_pair_switch(
    eht: &mut EhtResult,
    hybrids: &HybridAnalysis,
    mixing_on: bool,
) -> Result<Vec<f64>, String> {
    let lone_pairs = lone_pair_orbitals(eht, hybrids);
    if lone_pairs.is_empty() {
        return Ok(Vec::new());
    }
    let comparison =
        compare_mixing(eht, &lone_pairs).map_err(|e| format!("lone-pair switch: {e}"))?;
    let count = comparison.shifts.len();
    if mixing_on {
        let mut shifts = vec![0.0; count];
        for (off, &on) in comparison.off_to_on.iter().enumerate() {
            if let Some(slot) = shifts.get_mut(on) {
                *slot = -comparison.shifts[off];
            }
        }
        Ok(shifts)
    } else {
        let off = comparison.off.solution;
        eht.energies = off.energies;
        eht.coefficients = off.coefficients;
        eht.occupations = off.occupations;
        eht.open_shell = off.open_shell;
        eht.sum_occupied_energy = eht
            .energies
            .iter()
            .zip(&eht.occupations)
            .map(|(e, n)| e * n)
            .sum();
        Ok(comparison.shifts)
    }
}

/// The flat hybrid list of the geometric or maximum-overlap model.
pub(super) fn hybrid_entries(hybrids: &HybridAnalysis) -> Vec<HybridEntry> {
    hybrids
        .centres
        .iter()
        .flat_map(|centre| {
            centre.hybrids.iter().map(move |hybrid| HybridEntry {
                center: centre.atom,
                partner: hybrid.partner,
                kind: hybrid.kind.as_str().into(),
                lambda: hybrid.lambda,
                s_percent: hybrid.s_percent,
                p_percent: hybrid.p_percent,
                energy_ev: Some(hybrid.energy_ev),
                bending_degrees: hybrid.bending_degrees,
                direction: hybrid.direction,
                model: centre.model.as_str().into(),
            })
        })
        .collect()
}

/// The localized ladder of the chosen model, and for the localized-MO model the hybrids
/// read from the Pipek–Mezey orbitals.
pub(super) fn localized_ladder(
    molecule: &Molecule,
    eht: &EhtResult,
    hybrids: Option<&HybridAnalysis>,
    settings: &HybridSettings,
) -> Result<(Vec<LocalizedSummary>, Vec<HybridEntry>), String> {
    if settings.model == HybridModel::Localized {
        let localized =
            localize_occupied(eht, &LocalizeOptions::default()).map_err(|e| e.to_string())?;
        let described = describe(
            &localized.orbitals,
            &eht.overlap,
            &eht.hamiltonian,
            &eht.basis,
            molecule,
        )
        .map_err(|e| e.to_string())?;
        // Hydrogen's part of a bond is its 1s: no hybrid to report.
        let has_p = |atom: usize| {
            molecule
                .atoms
                .get(atom)
                .is_some_and(|a| a.element.period() > 1)
        };
        let entries = described
            .iter()
            .flat_map(|orbital| {
                orbital
                    .hybrids
                    .iter()
                    .filter(|h| has_p(h.atom))
                    .map(|hybrid| HybridEntry {
                        center: hybrid.atom,
                        partner: hybrid.partner,
                        kind: if hybrid.partner.is_some() {
                            "bond"
                        } else {
                            "lone_pair"
                        }
                        .into(),
                        lambda: hybrid.lambda,
                        s_percent: 100.0 * hybrid.s_share,
                        p_percent: 100.0 * hybrid.p_share,
                        energy_ev: None,
                        bending_degrees: hybrid.bending_deg,
                        direction: hybrid.direction.map_or([0.0; 3], |d| [d.x, d.y, d.z]),
                        model: "localized".into(),
                    })
            })
            .collect();
        let ladder = described
            .into_iter()
            .enumerate()
            .map(|(k, orbital)| LocalizedSummary {
                kind: match orbital.kind {
                    crate::localize::LocalizedKind::LonePair => "lone_pair".into(),
                    crate::localize::LocalizedKind::Bond => "bond".into(),
                    crate::localize::LocalizedKind::MultiCentre => "multicentre".into(),
                },
                atoms: orbital.atoms,
                energy_ev: orbital.energy_ev,
                occupancy: 2.0,
                label: orbital.label,
                captured: 0.0,
                coefficients: localized.orbitals.column(k).iter().copied().collect(),
            })
            .collect();
        return Ok((ladder, entries));
    }
    let Some(found) = hybrids else {
        return Ok((Vec::new(), Vec::new()));
    };
    let ladder = found
        .localized
        .iter()
        .map(|orbital| LocalizedSummary {
            kind: orbital.kind.as_str().into(),
            atoms: orbital.atoms.clone(),
            energy_ev: orbital.energy_ev,
            occupancy: orbital.occupancy,
            label: orbital.label.clone(),
            captured: 0.0,
            coefficients: orbital.coefficients.clone(),
        })
        .collect();
    Ok((ladder, Vec::new()))
}

/// Degenerate-set ids of the canonical orbitals: same label (same irrep level) or, with
/// no labels, energies within 1e-3 eV.
fn set_ids(orbitals: &[OrbitalSummary]) -> Vec<usize> {
    let mut ids = Vec::with_capacity(orbitals.len());
    let mut current = 0;
    for (n, orbital) in orbitals.iter().enumerate() {
        if n > 0 {
            let previous = &orbitals[n - 1];
            let same_label = orbital.label.is_some()
                && orbital.label == previous.label
                && orbital.label.as_deref() != Some("?");
            let same_energy = (orbital.energy_ev - previous.energy_ev).abs() < DEGENERACY_EV;
            if !(same_label || (orbital.label.is_none() && same_energy)) {
                current += 1;
            }
        }
        ids.push(current);
    }
    ids
}

/// Weights of every canonical set in every localized orbital; fills each localized
/// orbital's captured share.
pub(super) fn links(
    eht: &EhtResult,
    orbitals: &[OrbitalSummary],
    localized: &mut [LocalizedSummary],
) -> Result<Vec<LinkSummary>, String> {
    if localized.is_empty() {
        return Ok(Vec::new());
    }
    let n = eht.basis.len();
    let mut matrix = DMatrix::zeros(n, localized.len());
    for (k, orbital) in localized.iter().enumerate() {
        if orbital.coefficients.len() != n {
            return Err(format!(
                "localized orbital {} has the wrong length",
                orbital.label
            ));
        }
        matrix.set_column(k, &DVector::from_column_slice(&orbital.coefficients));
    }
    let ids = set_ids(orbitals);
    let found = link(
        &matrix,
        &eht.coefficients,
        &eht.overlap,
        &eht.occupations,
        LevelSets::Ids(&ids),
        LINK_LIST_THRESHOLD,
    )
    .map_err(|e| e.to_string())?;
    for (orbital, captured) in localized.iter_mut().zip(&found.captured) {
        orbital.captured = *captured;
    }
    Ok(found
        .entries
        .iter()
        .map(|entry| LinkSummary {
            localized: entry.localized,
            canonical: entry.canonical,
            members: entry.members.clone(),
            weight: entry.weight,
        })
        .collect())
}
