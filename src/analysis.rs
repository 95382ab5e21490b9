//! The one pipeline (DESIGN §3): `Analysis::run(&Molecule, &Settings)` validates the
//! molecule and runs each stage in order. A stage that fails records its error and the
//! stages that do not depend on it still run, so results are partial, never
//! all-or-nothing.

use serde::{Deserialize, Serialize};
use thiserror::Error;

mod stages;
mod switch;

pub use switch::{HeldLevel, LonePairChoice, SwitchSummary};

use crate::chem::molecule::{Molecule, MoleculeError};
use crate::eht::{self, EhtResult, EhtSettings};
use crate::hybrid::{HybridAnalysis, HybridKind, HybridModel, HybridSettings};
use crate::localized::held::{HeldLonePairs, HoldConvention};
use crate::localized::{LocalizationSettings, LocalizedKind, LocalizedPicture};
use crate::symmetry::{self, Symmetry, SymmetrySettings, SymmetrySummary};

/// Method options of the document. Every field has a default so that older project files
/// load; new options are added as new fields with `#[serde(default)]`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Settings {
    /// Lone-pair mixing switch (DESIGN §4.6): on = full solution.
    pub lone_pair_mixing: bool,
    /// Which lone pairs the switch holds when mixing is off.
    pub held_lone_pairs: HeldLonePairs,
    /// Whether the held orbital is the centre's p orbital or the lone-pair hybrid.
    pub hold_convention: HoldConvention,
    /// Point-group tolerance, axis and numbering conventions.
    pub symmetry: SymmetrySettings,
    /// Extended Hückel options (K, weighting, parameter overrides).
    pub eht: EhtSettings,
    /// Hybrid model and lone-pair convention.
    pub hybrid: HybridSettings,
    /// How the localized orbitals are found (intrinsic bond orbitals by default).
    pub localization: LocalizationSettings,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            lone_pair_mixing: true,
            held_lone_pairs: HeldLonePairs::default(),
            hold_convention: HoldConvention::default(),
            symmetry: SymmetrySettings::default(),
            eht: EhtSettings::default(),
            hybrid: HybridSettings::default(),
            localization: LocalizationSettings::default(),
        }
    }
}

/// The molecule cannot be analysed at all.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum AnalysisError {
    #[error("invalid molecule: {0}")]
    InvalidMolecule(#[from] MoleculeError),
}

/// The pipeline stages, in order.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Stage {
    Symmetry,
    Orbitals,
    Hybrids,
    Localization,
    Links,
}

/// A stage that failed, with a message for the user.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StageError {
    pub stage: Stage,
    pub message: String,
}

/// A remark of a stage that succeeded: what the user must know to read its result (a
/// multicentre bond, an open shell, a centre a model could not describe).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StageNote {
    pub stage: Stage,
    pub message: String,
}

/// One canonical molecular orbital as the reports and panels show it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OrbitalSummary {
    /// Index in the ascending list of orbitals.
    pub index: usize,
    pub energy_ev: f64,
    pub occupancy: f64,
    /// Irreducible representation (lower case, e.g. "a1"), when symmetry is known.
    pub irrep: Option<String>,
    /// Numbered label (e.g. "3a1"), when symmetry is known.
    pub label: Option<String>,
    /// Mulliken gross shares by atomic orbital, largest first, those ≥ 1 %.
    pub composition: Vec<AoShare>,
}

impl OrbitalSummary {
    /// Mulliken gross shares summed per atom, largest first (from `composition`, so
    /// shares under 1 % per AO are not included).
    pub fn atom_shares(&self) -> Vec<(usize, f64)> {
        let mut by_atom: Vec<(usize, f64)> = Vec::new();
        for part in &self.composition {
            match by_atom.iter_mut().find(|(atom, _)| *atom == part.atom) {
                Some((_, total)) => *total += part.share,
                None => by_atom.push((part.atom, part.share)),
            }
        }
        by_atom.sort_by(|a, b| b.1.abs().total_cmp(&a.1.abs()));
        by_atom
    }
}

/// One atomic orbital's Mulliken gross share of an MO: c_μ Σ_ν S_μν c_ν (Mulliken,
/// J. Chem. Phys. 23, 1833 (1955)); the shares of one MO add to 1.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct AoShare {
    pub atom: usize,
    /// e.g. "2pz".
    pub orbital: String,
    pub share: f64,
}

/// One level of the localized ladder as the reports and panels show it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LocalizedSummary {
    pub kind: LocalizedKind,
    pub atoms: Vec<usize>,
    pub energy_ev: f64,
    /// Electrons of this level in the canonical density, Σ_j n_j |⟨b|ψ_j⟩|².
    pub occupancy: f64,
    /// Electrons the Lewis structure puts here (2, 1, 0 or an open-shell share).
    pub lewis_occupancy: f64,
    /// e.g. "σ(N–H)", "n(N)".
    pub label: String,
    /// Σ over occupied canonical MOs of the link weights: how much of this orbital the
    /// occupied space holds.
    pub captured: f64,
    /// AO coefficients (normalized with S), for maps and links.
    #[serde(skip)]
    pub coefficients: Vec<f64>,
}

/// One hybrid of one centre, in any model (DESIGN §5.5 `hybrids`).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct HybridEntry {
    pub center: usize,
    /// The bonded partner, or None for a lone pair.
    pub partner: Option<usize>,
    pub kind: HybridKind,
    /// Hybridization index λ of sp^λ; None for a pure p orbital (λ → ∞).
    pub lambda: Option<f64>,
    pub s_percent: f64,
    pub p_percent: f64,
    pub d_percent: f64,
    /// The fraction of an orbital this hybrid is (below 1 on an over-complete atom).
    pub share: f64,
    /// ε(sp^λ) = (ε_s + λ ε_p)/(1 + λ), eV (hybrid models only).
    pub energy_ev: Option<f64>,
    /// Angle between the hybrid and the internuclear axis, degrees.
    pub bending_degrees: Option<f64>,
    /// Unit vector the hybrid points along (molecule frame).
    pub direction: [f64; 3],
    pub model: HybridModel,
}

/// Weight of canonical MO `canonical` in localized orbital `localized` (DESIGN §4.6);
/// for a degenerate set, the summed weight, listed under the set's first member.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LinkSummary {
    pub localized: usize,
    pub canonical: usize,
    /// All members of the canonical degenerate set.
    pub members: Vec<usize>,
    pub weight: f64,
}

/// Everything computed for one molecule and one set of settings.
#[derive(Clone, Debug)]
pub struct Analysis {
    pub molecule: Molecule,
    pub settings: Settings,
    /// Σ valence electrons − charge.
    pub electrons: usize,
    pub formula: String,
    /// Point group, operations and frame, unless that stage failed.
    pub symmetry: Option<Symmetry>,
    /// Irreps of the central atom's orbitals and of the ligand SALCs.
    pub symmetry_summary: Option<SymmetrySummary>,
    /// The geometry averaged over the point group (exactly symmetric), for Symmetrize.
    pub symmetrized: Option<Molecule>,
    /// The extended Hückel solution, unless that stage failed.
    pub eht: Option<EhtResult>,
    /// The canonical MOs in ascending energy (empty if the MO stage failed).
    pub orbitals: Vec<OrbitalSummary>,
    /// The localized picture read from the wavefunction: localized orbitals, Lewis
    /// structure, the wavefunction's hybrids.
    pub picture: Option<LocalizedPicture>,
    /// Hybrids of the chosen two-centre model (the geometric model when the chosen model
    /// is the wavefunction's own, so that both are at hand).
    pub hybrids: Option<HybridAnalysis>,
    /// The hybrids of the chosen model as a flat list (for reports and JSON).
    pub hybrid_entries: Vec<HybridEntry>,
    /// The localized ladder, ascending in energy.
    pub localized: Vec<LocalizedSummary>,
    /// Canonical ↔ localized weights above 1e-4 (degenerate sets summed).
    pub links: Vec<LinkSummary>,
    /// Per canonical orbital: energy in the other state of the lone-pair mixing switch
    /// minus its energy here (eV); empty when there is no lone pair.
    pub level_shifts: Vec<f64>,
    /// What the lone-pair switch holds and how its levels move (None when the localized
    /// picture is missing).
    pub lone_pair_switch: Option<SwitchSummary>,
    pub errors: Vec<StageError>,
    /// Remarks of the stages, shown beside their results.
    pub notes: Vec<StageNote>,
}

impl Analysis {
    /// Runs every stage for `molecule` under `settings`.
    pub fn run(molecule: &Molecule, settings: &Settings) -> Result<Analysis, AnalysisError> {
        molecule.validate()?;
        let electrons = usize::try_from(molecule.electron_count()).unwrap_or(0);
        let mut log = stages::Log::default();
        let symmetry = log.keep(
            Stage::Symmetry,
            symmetry::detect(molecule, &settings.symmetry),
        );
        let mut eht = log.keep(Stage::Orbitals, eht::run(molecule, &settings.eht));
        let picture = eht.as_ref().and_then(|solution| {
            log.keep(
                Stage::Localization,
                crate::localized::analyze(molecule, solution, &settings.localization),
            )
        });
        if let Some(found) = &picture {
            log.notes(Stage::Localization, &found.notes);
        }
        let hybrids = match (&eht, &picture) {
            (Some(solution), Some(found)) => Some(stages::model_hybrids(
                molecule,
                solution,
                found,
                &settings.hybrid,
                &mut log,
            )),
            _ => None,
        };
        let model = settings.hybrid.model;
        let hybrid_entries =
            stages::hybrid_entries(molecule, picture.as_ref(), hybrids.as_ref(), model);
        let (mut localized, ladder_vectors) = match (&eht, &picture) {
            (Some(solution), Some(found)) => {
                stages::ladder(molecule, solution, found, hybrids.as_ref(), model)
            }
            _ => (Vec::new(), nalgebra::DMatrix::zeros(0, 0)),
        };
        let mut level_shifts = Vec::new();
        let mut lone_pair_switch = None;
        if let (Some(solution), Some(found)) = (eht.as_mut(), &picture) {
            let request = switch::SwitchRequest {
                mixing: settings.lone_pair_mixing,
                selection: &settings.held_lone_pairs,
                convention: settings.hold_convention,
            };
            match switch::apply(solution, found, &localized, &ladder_vectors, request) {
                Ok(outcome) => {
                    level_shifts = outcome.shifts;
                    log.notes(Stage::Orbitals, &outcome.notes);
                    lone_pair_switch = Some(outcome.summary);
                }
                Err(message) => log.fail(Stage::Orbitals, message),
            }
        }
        if let (Some(found), Some(solution)) = (&symmetry, eht.as_mut()) {
            adapt_degenerate_sets(found, solution);
        }
        let mut orbitals = eht.as_ref().map(orbital_summaries).unwrap_or_default();
        if let (Some(found), Some(solution)) = (&symmetry, &eht) {
            label_summaries(&mut orbitals, found, molecule, solution, settings);
        }
        let links = match &eht {
            Some(solution) => stages::ladder_links(
                solution,
                &orbitals,
                &ladder_vectors,
                &mut localized,
                &mut log,
            ),
            None => Vec::new(),
        };
        Ok(Analysis {
            molecule: molecule.clone(),
            settings: settings.clone(),
            electrons,
            formula: molecule.formula(),
            symmetry_summary: symmetry
                .as_ref()
                .map(|found| symmetry::summarize(found, molecule)),
            symmetrized: symmetry
                .as_ref()
                .map(|found| symmetry::symmetrize(molecule, found)),
            symmetry,
            eht,
            orbitals,
            picture,
            hybrids,
            hybrid_entries,
            localized,
            links,
            level_shifts,
            lone_pair_switch,
            errors: log.errors,
            notes: log.notes,
        })
    }
}

/// Rotates exactly degenerate sets of MOs that carry several irreps so each MO carries one
/// (held lone pairs at one atomic energy, say), in both coefficient matrices.
fn adapt_degenerate_sets(found: &Symmetry, solution: &mut EhtResult) {
    let rotations = symmetry::degenerate_set_rotations(
        found,
        &solution.basis.orbitals,
        &solution.overlap,
        &solution.coefficients,
        &solution.energies,
    );
    for set in rotations {
        for matrix in [
            &mut solution.coefficients,
            &mut solution.orthonormal.coefficients,
        ] {
            let block = matrix.select_columns(&set.members) * &set.rotation;
            for (c, &member) in set.members.iter().enumerate() {
                matrix.set_column(member, &block.column(c));
            }
        }
    }
}

/// Puts the irrep labels on the orbital summaries.
fn label_summaries(
    orbitals: &mut [OrbitalSummary],
    found: &Symmetry,
    molecule: &Molecule,
    solution: &EhtResult,
    settings: &Settings,
) {
    let labels = symmetry::label_orbitals(
        found,
        molecule,
        &solution.basis.orbitals,
        &solution.coefficients,
        &solution.energies,
        &solution.overlap,
        settings.symmetry.numbering,
    );
    for (orbital, label) in orbitals.iter_mut().zip(labels) {
        orbital.irrep = label.irrep.map(|irrep| irrep.to_string());
        orbital.label = Some(label.text);
    }
}

fn orbital_summaries(eht: &EhtResult) -> Vec<OrbitalSummary> {
    let sc = &eht.overlap * &eht.coefficients;
    eht.energies
        .iter()
        .zip(&eht.occupations)
        .enumerate()
        .map(|(index, (&energy_ev, &occupancy))| {
            let mut composition: Vec<AoShare> = eht
                .basis
                .orbitals
                .iter()
                .enumerate()
                .map(|(mu, ao)| (ao, eht.coefficients[(mu, index)] * sc[(mu, index)]))
                // Filter before naming: a label is a string, and large molecules have
                // basis × MOs shares.
                .filter(|(_, share)| share.abs() >= 0.01)
                .map(|(ao, share)| AoShare {
                    atom: ao.atom,
                    orbital: ao.label(),
                    share,
                })
                .collect();
            composition.sort_by(|a, b| b.share.abs().total_cmp(&a.share.abs()));
            OrbitalSummary {
                index,
                energy_ev,
                occupancy,
                irrep: None,
                label: None,
                composition,
            }
        })
        .collect()
}
