//! The stages of `Analysis::run` after the extended Hückel solution and the localized
//! picture: the hybrid model of the settings (DESIGN §4.4), the localized ladder and the
//! canonical ↔ localized weights (§4.6). The lone-pair switch is in `switch`.

use nalgebra::DMatrix;

use super::{
    HybridEntry, LinkSummary, LocalizedSummary, OrbitalSummary, Stage, StageError, StageNote,
};
use crate::chem::molecule::Molecule;
use crate::eht::EhtResult;
use crate::hybrid::{self, HybridAnalysis, HybridModel, HybridSettings};
use crate::localized::weights::{LevelSets, Metric, link};
use crate::localized::{LocalizedPicture, ladder};

/// Weights below this are left out of the link list (DESIGN §4.6: entries above 1e-4).
const LINK_LIST_THRESHOLD: f64 = 1e-4;
/// Orbitals closer than this (eV) form one degenerate set when symmetry gives no label
/// (the solver's own tolerance for sharing electrons in a set).
const DEGENERACY_EV: f64 = crate::eht::DEGENERACY_TOLERANCE_EV;

/// The errors and notes of the stages, in order.
#[derive(Default)]
pub(super) struct Log {
    pub errors: Vec<StageError>,
    pub notes: Vec<StageNote>,
}

impl Log {
    /// The value, or None with the error recorded.
    pub fn keep<T, E: std::fmt::Display>(
        &mut self,
        stage: Stage,
        result: Result<T, E>,
    ) -> Option<T> {
        match result {
            Ok(value) => Some(value),
            Err(error) => {
                self.fail(stage, error.to_string());
                None
            }
        }
    }

    pub fn fail(&mut self, stage: Stage, message: impl Into<String>) {
        self.errors.push(StageError {
            stage,
            message: message.into(),
        });
    }

    pub fn note(&mut self, stage: Stage, message: impl Into<String>) {
        self.notes.push(StageNote {
            stage,
            message: message.into(),
        });
    }

    pub fn notes(&mut self, stage: Stage, messages: &[String]) {
        for message in messages {
            self.note(stage, message.clone());
        }
    }
}

/// The chosen two-centre model on the wavefunction's Lewis structure, or the geometric
/// model (kept quietly beside the wavefunction's hybrids) when the chosen model is the
/// wavefunction's own.
pub(super) fn model_hybrids(
    molecule: &Molecule,
    eht: &EhtResult,
    picture: &LocalizedPicture,
    settings: &HybridSettings,
    log: &mut Log,
) -> HybridAnalysis {
    let chosen = settings.model != HybridModel::Localized;
    let mut run = settings.clone();
    if !chosen {
        run.model = HybridModel::Geometric;
    }
    let (_, sp_index) = hybrid::atom_orbital_indices(molecule, eht);
    let (specs, notes) =
        hybrid::centres::from_picture(picture, molecule, &|atom| sp_index[atom].is_some());
    let found = hybrid::analyze(molecule, eht, &run, specs);
    if chosen {
        log.notes(Stage::Hybrids, &notes);
        log.notes(Stage::Hybrids, &found.notes);
        for error in &found.errors {
            log.fail(Stage::Hybrids, error.to_string());
        }
    }
    found
}

/// The flat hybrid list of the chosen model; atoms the two-centre models skip keep the
/// wavefunction's hybrids (their `model` says so). Atoms without p functions (hydrogen)
/// have no hybrid to report.
pub(super) fn hybrid_entries(
    molecule: &Molecule,
    picture: Option<&LocalizedPicture>,
    hybrids: Option<&HybridAnalysis>,
    model: HybridModel,
) -> Vec<HybridEntry> {
    let mut entries = Vec::new();
    let described = |atom: usize| {
        model != HybridModel::Localized && hybrids.is_some_and(|found| found.centre(atom).is_some())
    };
    for atom in 0..molecule.atoms.len() {
        if described(atom) {
            if let Some(centre) = hybrids.and_then(|found| found.centre(atom)) {
                entries.extend(centre.hybrids.iter().map(|h| HybridEntry {
                    center: atom,
                    partner: h.partner,
                    kind: h.kind,
                    lambda: h.lambda,
                    s_percent: h.s_percent,
                    p_percent: h.p_percent,
                    d_percent: 0.0,
                    share: 1.0,
                    energy_ev: Some(h.energy_ev),
                    bending_degrees: h.bending_degrees,
                    direction: h.direction,
                    model: centre.model,
                }));
            }
            continue;
        }
        let Some(atom_hybrids) = picture.and_then(|p| p.hybrids.get(atom)) else {
            continue;
        };
        let layout = picture.map(|p| &p.layout);
        let has_p =
            layout.is_some_and(|l| l.kinds[l.ranges[atom].clone()].iter().any(|k| k.l() == 1));
        if !has_p {
            continue;
        }
        entries.extend(atom_hybrids.hybrids.iter().map(|h| HybridEntry {
            center: atom,
            partner: h.partner,
            kind: h.kind,
            lambda: h.shape.lambda,
            s_percent: 100.0 * h.shape.s_share,
            p_percent: 100.0 * h.shape.p_share,
            d_percent: 100.0 * h.shape.d_share,
            share: h.share,
            energy_ev: None,
            bending_degrees: h.bending_degrees,
            direction: h.shape.direction,
            model: HybridModel::Localized,
        }));
    }
    entries
}

/// The localized ladder on the hybrids of the chosen model, as summaries (AO
/// coefficients for maps) and as vectors over the orthonormal basis.
pub(super) fn ladder(
    molecule: &Molecule,
    eht: &EhtResult,
    picture: &LocalizedPicture,
    hybrids: Option<&HybridAnalysis>,
    model: HybridModel,
) -> (Vec<LocalizedSummary>, DMatrix<f64>) {
    let mut atom_hybrids = picture.hybrids.clone();
    if let (true, Some(found)) = (model != HybridModel::Localized, hybrids) {
        hybrid::substitute::substitute(&mut atom_hybrids, found, &picture.layout);
    }
    let built = ladder::build(
        &atom_hybrids,
        &picture.orbitals,
        &picture.units,
        &picture.layout,
        &eht.orthonormal.hamiltonian,
        &atomic_energies(eht),
        molecule,
    );
    let ao = &eht.orthonormal.orthogonalizer * &built.vectors;
    let summaries = built
        .levels
        .iter()
        .enumerate()
        .map(|(k, level)| LocalizedSummary {
            kind: level.kind,
            atoms: level.atoms.clone(),
            energy_ev: level.energy_ev,
            occupancy: level.lewis_occupancy,
            lewis_occupancy: level.lewis_occupancy,
            label: level.label.clone(),
            captured: 0.0,
            coefficients: ao.column(k).iter().copied().collect(),
        })
        .collect();
    (summaries, built.vectors)
}

/// The weights of the ladder in the canonical MOs shown (a failure is logged; the ladder
/// is kept).
pub(super) fn ladder_links(
    eht: &EhtResult,
    orbitals: &[OrbitalSummary],
    vectors: &DMatrix<f64>,
    localized: &mut [LocalizedSummary],
    log: &mut Log,
) -> Vec<LinkSummary> {
    match links(eht, orbitals, vectors, localized) {
        Ok(found) => found,
        Err(message) => {
            log.fail(Stage::Links, message);
            Vec::new()
        }
    }
}

/// α of each basis function: the diagonal of the extended Hückel H (the valence orbital
/// energies of the parameters).
pub(super) fn atomic_energies(eht: &EhtResult) -> Vec<f64> {
    (0..eht.hamiltonian.nrows())
        .map(|mu| eht.hamiltonian[(mu, mu)])
        .collect()
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

/// Weights of every canonical set in every ladder level (vectors over the orthonormal
/// basis); fills each level's true occupancy and captured share.
fn links(
    eht: &EhtResult,
    orbitals: &[OrbitalSummary],
    vectors: &DMatrix<f64>,
    localized: &mut [LocalizedSummary],
) -> Result<Vec<LinkSummary>, String> {
    if localized.is_empty() {
        return Ok(Vec::new());
    }
    let ids = set_ids(orbitals);
    let canonical = &eht.orthonormal.coefficients;
    let found = link(
        vectors,
        canonical,
        Metric::Orthonormal,
        &eht.occupations,
        LevelSets::Ids(&ids),
        LINK_LIST_THRESHOLD,
    )
    .map_err(|e| e.to_string())?;
    // Σ_j n_j w_kj: the true occupancy of each level, from the same weights.
    for ((orbital, captured), occupancy) in localized
        .iter_mut()
        .zip(&found.captured)
        .zip(&found.occupancy)
    {
        orbital.captured = *captured;
        orbital.occupancy = *occupancy;
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
