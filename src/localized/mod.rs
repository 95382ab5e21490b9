//! The localized picture, read from the wavefunction (DESIGN §4.4–4.6).
//!
//! 1. [`orthonormal`]: Löwdin's orthonormal atomic basis (in extended Hückel's minimal
//!    valence basis, the intrinsic atomic orbitals of Knizia 2013) and atomic populations.
//! 2. [`localize`]: the doubly occupied, the partly occupied and the empty valence MOs are
//!    localized separately (intrinsic bond orbitals, p = 4, by default; Pipek–Mezey with
//!    Löwdin charges, p = 2, as an option), so no localized orbital mixes electrons of
//!    different occupation; each carries its true occupancy Σ_j n_j |⟨b|ψ_j⟩|².
//! 3. [`classify`] and [`lewis`]: lone pairs, two-centre bonds (σ/π, bonding/antibonding),
//!    multicentre orbitals and 3c–4e bonds, then the Lewis structure (bond orders, Wiberg
//!    indices, formal charges, the Lewis share).
//! 4. [`hybrids`]: the hybrids of each atom read from those orbitals (the default model),
//!    and the one reader of a hybrid's shape for every model.
//! 5. [`ladder`]: the levels of the localized ladder from the hybrids; [`weights`]: their
//!    weights in the canonical MOs; [`held`] and [`switch`]: the lone-pair mixing switch
//!    (what is held, and the levels with it held), [`pairing`]: levels of two states paired.
//!
//! [`analyze`] runs 1–4 for an extended Hückel result; the ladder is built by
//! `Analysis::run` after the hybrid model of the settings has been applied.

pub mod classify;
pub mod held;
pub mod hybrids;
pub mod ladder;
pub mod lewis;
pub mod localize;
mod notes;
pub mod orthonormal;
pub mod pairing;
pub mod switch;
pub mod weights;

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use classify::{BondCharacter, LocalizedOrbital, OrbitalClass, OrbitalSpace, ThreeCentreUnit};
pub use hybrids::{AtomHybrid, AtomHybrids, HybridKind, HybridModel, HybridShape, read_shape};
pub use ladder::{Ladder, LadderLevel, LocalizedKind};
pub use lewis::{LewisStructure, MulticentreKind};
pub use localize::{LocalizationMethod, LocalizationOptions};
pub use orthonormal::AtomLayout;

use crate::chem::molecule::Molecule;
use crate::eht::EhtResult;

/// Above this many valence MOs the spaces are localized in parallel threads.
const PARALLEL_ABOVE: usize = 64;
/// Occupations within this of 0 or 2 count as empty or full.
const OCCUPATION_TOLERANCE: f64 = 1e-9;
pub use notes::LOW_LEWIS_SHARE;

/// Settings of the localization.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct LocalizationSettings {
    pub method: LocalizationMethod,
    /// Cap on the Jacobi sweeps of each space.
    pub max_sweeps: usize,
}

impl Default for LocalizationSettings {
    fn default() -> Self {
        LocalizationSettings {
            method: LocalizationMethod::default(),
            max_sweeps: localize::DEFAULT_MAX_SWEEPS,
        }
    }
}

/// The localized picture cannot be read.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum LocalizedError {
    #[error(
        "the orbital basis covers {basis_atoms} atoms but the molecule has {atoms}; the localized picture needs the extended Hückel result of this molecule"
    )]
    BasisMismatch { atoms: usize, basis_atoms: usize },
    #[error("the orbitals contain a non-finite number")]
    NonFinite,
}

/// How the localization of one space went.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SpaceReport {
    pub space: OrbitalSpace,
    pub orbitals: usize,
    pub sweeps: usize,
    pub converged: bool,
    /// F_p of the localized orbitals.
    pub function_value: f64,
}

/// Everything the localized picture reads from one wavefunction.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LocalizedPicture {
    pub method: LocalizationMethod,
    /// Doubly occupied, then partly occupied, then empty; each block by energy.
    pub orbitals: Vec<LocalizedOrbital>,
    /// The localized orbitals over the orthonormal basis (columns, same order).
    #[serde(skip)]
    pub vectors: DMatrix<f64>,
    pub units: Vec<ThreeCentreUnit>,
    pub lewis: LewisStructure,
    /// The wavefunction hybrids of every atom.
    pub hybrids: Vec<AtomHybrids>,
    pub spaces: Vec<SpaceReport>,
    /// Remarks for the user (multicentre bonding, open shells, over-complete atoms…).
    pub notes: Vec<String>,
    #[serde(skip)]
    pub layout: AtomLayout,
}

/// One wavefunction as the localized picture reads it: canonical MOs over an orthonormal
/// atomic basis, their occupations, and the Hamiltonian (or Fock matrix) in that basis.
#[derive(Clone, Copy, Debug)]
pub struct Wavefunction<'a> {
    pub layout: &'a AtomLayout,
    /// Columns: the canonical MOs over the orthonormal basis.
    pub coefficients: &'a DMatrix<f64>,
    pub occupations: &'a [f64],
    pub hamiltonian: &'a DMatrix<f64>,
}

/// Orbitals already localized (one occupation block), for [`read_localized`].
#[derive(Clone, Debug)]
pub struct LocalizedBlock {
    pub report: SpaceReport,
    /// Columns over the orthonormal basis.
    pub orbitals: DMatrix<f64>,
}

/// Localizes, classifies and reads the Lewis structure and hybrids of `eht`.
pub fn analyze(
    molecule: &Molecule,
    eht: &EhtResult,
    settings: &LocalizationSettings,
) -> Result<LocalizedPicture, LocalizedError> {
    let layout = AtomLayout::of(eht);
    if layout.atoms() != molecule.atoms.len() {
        return Err(LocalizedError::BasisMismatch {
            atoms: molecule.atoms.len(),
            basis_atoms: layout.atoms(),
        });
    }
    let form = &eht.orthonormal;
    if form
        .coefficients
        .iter()
        .chain(form.hamiltonian.iter())
        .any(|x| !x.is_finite())
    {
        return Err(LocalizedError::NonFinite);
    }
    let wavefunction = Wavefunction {
        layout: &layout,
        coefficients: &form.coefficients,
        occupations: &eht.occupations,
        hamiltonian: &form.hamiltonian,
    };
    Ok(analyze_wavefunction(molecule, wavefunction, settings))
}

/// [`analyze`] for any wavefunction in an orthonormal atomic basis (the reference tests
/// feed PySCF's orbitals through it).
pub fn analyze_wavefunction(
    molecule: &Molecule,
    wavefunction: Wavefunction<'_>,
    settings: &LocalizationSettings,
) -> LocalizedPicture {
    let options = LocalizationOptions {
        method: settings.method,
        max_sweeps: settings.max_sweeps,
    };
    let spaces: Vec<(OrbitalSpace, Vec<usize>)> = [
        OrbitalSpace::Doubly,
        OrbitalSpace::Partly,
        OrbitalSpace::Virtual,
    ]
    .into_iter()
    .map(|space| (space, space_members(wavefunction.occupations, space)))
    .filter(|(_, members)| !members.is_empty())
    .collect();
    let localize_space = |(space, members): &(OrbitalSpace, Vec<usize>)| {
        let columns = wavefunction.coefficients.select_columns(members);
        let result = localize::localize(&columns, wavefunction.layout, &options);
        LocalizedBlock {
            report: SpaceReport {
                space: *space,
                orbitals: members.len(),
                sweeps: result.sweeps,
                converged: result.converged,
                function_value: result.function_value,
            },
            orbitals: result.orbitals,
        }
    };
    // The spaces are independent: large ones are localized side by side on the cores
    // (a thread costs tens of µs, more than a small molecule's whole localization).
    let blocks: Vec<LocalizedBlock> = if wavefunction.coefficients.ncols() > PARALLEL_ABOVE {
        std::thread::scope(|scope| {
            let handles: Vec<_> = spaces
                .iter()
                .map(|space| scope.spawn(|| localize_space(space)))
                .collect();
            handles
                .into_iter()
                .map(|handle| {
                    handle
                        .join()
                        .unwrap_or_else(|panic| std::panic::resume_unwind(panic))
                })
                .collect()
        })
    } else {
        spaces.iter().map(localize_space).collect()
    };
    read_localized(molecule, wavefunction, settings.method, blocks)
}

/// Classifies localized orbitals and reads the Lewis structure and hybrids from them.
pub fn read_localized(
    molecule: &Molecule,
    wavefunction: Wavefunction<'_>,
    method: LocalizationMethod,
    blocks: Vec<LocalizedBlock>,
) -> LocalizedPicture {
    let layout = wavefunction.layout;
    let (mut orbitals, mut vectors, spaces) = classify_blocks(molecule, wavefunction, blocks);
    for k in classify::align_shared_centres(&orbitals, &mut vectors, layout) {
        let (space, occupancy) = (orbitals[k].space, orbitals[k].occupancy);
        let energy = vectors
            .column(k)
            .dot(&(wavefunction.hamiltonian * vectors.column(k)));
        orbitals[k] = classify::classify_orbital(
            vectors.column(k),
            space,
            occupancy,
            energy,
            layout,
            wavefunction.hamiltonian,
            molecule,
        );
    }
    let units = classify::three_centre_units(&mut orbitals, &vectors, layout, molecule);
    let wiberg =
        orthonormal::wiberg_indices(wavefunction.coefficients, wavefunction.occupations, layout);
    let valence: Vec<f64> = molecule
        .atoms
        .iter()
        .map(|a| f64::from(a.element.valence_electrons()))
        .collect();
    let (hybrids, hybrid_notes) =
        hybrids::read_hybrids(&orbitals, &vectors, &units, layout, molecule);
    let over_complete: Vec<bool> = hybrids.iter().map(|h| h.over_complete).collect();
    let unit_antibonding = hybrids::unit_antibonding(&hybrids, &orbitals, &units);
    let context = lewis::Context {
        valence: &valence,
        over_complete: &over_complete,
        unit_antibonding: &unit_antibonding,
    };
    let mut lewis = lewis::read(&orbitals, &units, &wiberg, &context);
    // Three atoms in chain order (B–H–B with the bridge in the middle), for every reader.
    for bond in &mut lewis.multicentre {
        bond.atoms = ladder::chain_order(&bond.atoms, molecule);
    }
    let mut notes = notes::picture_notes(
        &orbitals,
        &units,
        &unit_antibonding,
        &lewis,
        &spaces,
        molecule,
    );
    notes.extend(hybrid_notes);
    notes.extend(hybrids::bent_notes(&hybrids, molecule));
    LocalizedPicture {
        method,
        orbitals,
        vectors,
        units,
        lewis,
        hybrids,
        spaces,
        notes,
        layout: layout.clone(),
    }
}

/// Each block's orbitals classified with their true occupancies and energies, signed and
/// sorted by energy within the block; the vectors in the same order.
fn classify_blocks(
    molecule: &Molecule,
    wavefunction: Wavefunction<'_>,
    blocks: Vec<LocalizedBlock>,
) -> (Vec<LocalizedOrbital>, DMatrix<f64>, Vec<SpaceReport>) {
    let mut orbitals = Vec::new();
    let mut columns = Vec::new();
    let mut spaces = Vec::new();
    for block in blocks {
        let occupancies = true_occupancies(
            &block.orbitals,
            wavefunction.coefficients,
            wavefunction.occupations,
        );
        let applied = wavefunction.hamiltonian * &block.orbitals;
        let mut classified: Vec<(LocalizedOrbital, nalgebra::DVector<f64>)> = block
            .orbitals
            .column_iter()
            .zip(applied.column_iter())
            .zip(occupancies)
            .map(|((column, hb), occupancy)| {
                let vector = signed(column.into_owned());
                let orbital = classify::classify_orbital(
                    vector.as_view(),
                    block.report.space,
                    occupancy,
                    column.dot(&hb),
                    wavefunction.layout,
                    wavefunction.hamiltonian,
                    molecule,
                );
                (orbital, vector)
            })
            .collect();
        classified.sort_by(|a, b| a.0.energy_ev.total_cmp(&b.0.energy_ev));
        for (orbital, vector) in classified {
            orbitals.push(orbital);
            columns.push(vector);
        }
        spaces.push(block.report);
    }
    let vectors = if columns.is_empty() {
        DMatrix::zeros(wavefunction.layout.functions(), 0)
    } else {
        DMatrix::from_columns(&columns)
    };
    (orbitals, vectors, spaces)
}

/// Indices of the canonical MOs of one space.
fn space_members(occupations: &[f64], space: OrbitalSpace) -> Vec<usize> {
    (0..occupations.len())
        .filter(|&k| {
            let n = occupations[k];
            match space {
                OrbitalSpace::Doubly => n >= 2.0 - OCCUPATION_TOLERANCE,
                OrbitalSpace::Virtual => n <= OCCUPATION_TOLERANCE,
                OrbitalSpace::Partly => n > OCCUPATION_TOLERANCE && n < 2.0 - OCCUPATION_TOLERANCE,
            }
        })
        .collect()
}

/// Σ_j n_j ⟨b|ψ_j⟩² for each column b (all over the orthonormal basis).
pub fn true_occupancies(
    vectors: &DMatrix<f64>,
    canonical: &DMatrix<f64>,
    occupations: &[f64],
) -> Vec<f64> {
    let projections = vectors.transpose() * canonical;
    projections
        .row_iter()
        .map(|row| row.iter().zip(occupations).map(|(p, n)| n * p * p).sum())
        .collect()
}

/// The vector with its largest component positive.
fn signed(v: nalgebra::DVector<f64>) -> nalgebra::DVector<f64> {
    if v.is_empty() || v[v.iamax()] >= 0.0 {
        v
    } else {
        -v
    }
}
