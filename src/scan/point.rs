//! What a scan keeps of one point's `Analysis`: the canonical levels (energy, occupation,
//! irrep, label) with the MO coefficients and AO overlap needed to follow them, λ of every
//! centre's bond and lone-pair hybrids in the geometric model (Coulson, *Valence*, 1952)
//! and the model read from the localized orbitals (intrinsic bond orbitals by default),
//! and Σ occupancy × ε.

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};

use crate::analysis::{Analysis, Settings};
use crate::chem::molecule::Molecule;
use crate::hybrid::{HybridKind, HybridModel};

/// A hybridization index: finite λ of sp^λ, a pure p orbital (λ → ∞), or none: the
/// model has no hybrids of its own at this point (Coulson's relations have no solution
/// for bonds at 90° or less; the analysis put another model's hybrids in its place, which
/// a scan must not draw as the same curve).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub enum Lambda {
    Finite(f64),
    PureP,
    NoSolution,
}

impl Lambda {
    fn from_option(lambda: Option<f64>) -> Lambda {
        match lambda {
            Some(value) if value.is_finite() => Lambda::Finite(value),
            _ => Lambda::PureP,
        }
    }

    /// λ as a number, with a pure p orbital as +∞ (for plotting on a clipped axis).
    pub fn value(self) -> f64 {
        match self {
            Lambda::Finite(value) => value,
            Lambda::PureP => f64::INFINITY,
            Lambda::NoSolution => f64::NAN,
        }
    }

    /// Percentage of s character, 100/(1 + λ).
    pub fn s_percent(self) -> f64 {
        match self {
            Lambda::Finite(value) => 100.0 / (1.0 + value),
            Lambda::PureP => 0.0,
            Lambda::NoSolution => f64::NAN,
        }
    }

    /// Text for tables: the number with 4 decimals, or "inf" for a pure p orbital.
    pub fn text(self) -> String {
        match self {
            Lambda::Finite(value) => format!("{value:.4}"),
            Lambda::PureP => "inf".into(),
            Lambda::NoSolution => "none".into(),
        }
    }
}

/// Which hybrid a λ belongs to, the same at every point.
#[derive(Clone, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
pub struct LambdaKey {
    /// "geometric" or "localized". The geometric model uses maximum overlap at a centre
    /// where Coulson's relations have no solution (bonds at 90°); the point's notes say so.
    pub model: String,
    pub centre: usize,
    /// The bonded partner, `None` for a lone pair.
    pub partner: Option<usize>,
    /// Counts hybrids of the same centre and partner (lone pairs: s-richest first).
    pub ordinal: usize,
}

impl LambdaKey {
    /// e.g. "λ geometric N0–H1 ", "λ localized n(N0)", with element symbols from `molecule`.
    pub fn name(&self, molecule: &Molecule) -> String {
        let symbol = |atom: usize| {
            molecule
                .atoms
                .get(atom)
                .map_or_else(String::new, |a| a.element.symbol().to_string())
        };
        let what = match self.partner {
            Some(partner) => format!(
                "{}{}–{}{}",
                symbol(self.centre),
                self.centre,
                symbol(partner),
                partner
            ),
            None => format!("n({}{})", symbol(self.centre), self.centre),
        };
        let extra = if self.ordinal > 0 {
            format!(" #{}", self.ordinal + 1)
        } else {
            String::new()
        };
        format!("λ {} {what}{extra}", self.model)
    }
}

/// One canonical level at one point.
#[derive(Clone, Debug, PartialEq)]
pub struct PointLevel {
    pub energy_ev: f64,
    pub occupancy: f64,
    pub irrep: Option<String>,
    pub label: Option<String>,
}

/// The results of one point that the scan keeps.
#[derive(Clone, Debug, PartialEq)]
pub struct PointData {
    pub point_group: Option<String>,
    pub levels: Vec<PointLevel>,
    /// MO coefficients (column k = level k) and the AO overlap matrix, for following.
    pub coefficients: DMatrix<f64>,
    pub overlap: DMatrix<f64>,
    pub lambdas: Vec<(LambdaKey, Lambda)>,
    pub sum_occupied_ev: f64,
    /// Stages that failed while the MOs were computed.
    pub notes: Vec<String>,
}

/// The settings a scan point runs with: the document's settings with the hybrids read from
/// the localized orbitals, so that one `Analysis::run` gives both λ sets (the run keeps the
/// geometric model's hybrids quietly in `Analysis::hybrids` and puts the wavefunction's in
/// `hybrid_entries`).
pub fn point_settings(settings: &Settings) -> Settings {
    let mut settings = settings.clone();
    settings.hybrid.model = HybridModel::Localized;
    settings
}

/// Runs the analysis of one point and keeps what the scan needs. A point fails when the
/// molecule is rejected or no MOs could be computed.
pub fn analyse_point(molecule: &Molecule, settings: &Settings) -> Result<PointData, String> {
    let analysis = Analysis::run(molecule, settings).map_err(|e| e.to_string())?;
    PointData::from_analysis(&analysis)
}

impl PointData {
    /// Drops the MO coefficients and overlap matrix once the levels have been followed.
    pub fn release_matrices(&mut self) {
        self.coefficients = DMatrix::zeros(0, 0);
        self.overlap = DMatrix::zeros(0, 0);
    }

    /// Extracts the scan's data from a finished analysis.
    pub fn from_analysis(analysis: &Analysis) -> Result<PointData, String> {
        let notes: Vec<String> = analysis
            .errors
            .iter()
            .map(|e| format!("{:?}: {}", e.stage, e.message))
            .collect();
        let Some(eht) = &analysis.eht else {
            return Err(if notes.is_empty() {
                "no molecular orbitals".into()
            } else {
                notes.join("; ")
            });
        };
        let levels = analysis
            .orbitals
            .iter()
            .map(|o| PointLevel {
                energy_ev: o.energy_ev,
                occupancy: o.occupancy,
                irrep: o.irrep.clone(),
                label: o.label.clone(),
            })
            .collect();
        let mut raw: Vec<(String, usize, Option<usize>, Lambda)> = Vec::new();
        if let Some(hybrids) = &analysis.hybrids {
            for centre in &hybrids.centres {
                if centre.model == HybridModel::Localized {
                    continue;
                }
                // A centre the requested model could not treat was given another model's
                // hybrids: no value of this model there.
                let own = centre.model == hybrids.model;
                for hybrid in &centre.hybrids {
                    if matches!(hybrid.kind, HybridKind::Bond | HybridKind::LonePair) {
                        raw.push((
                            hybrids.model.as_str().to_string(),
                            centre.atom,
                            hybrid.partner,
                            if own {
                                Lambda::from_option(hybrid.lambda)
                            } else {
                                Lambda::NoSolution
                            },
                        ));
                    }
                }
            }
        }
        for entry in analysis.hybrid_entries.iter().filter(|e| {
            e.model == HybridModel::Localized
                && matches!(e.kind, HybridKind::Bond | HybridKind::LonePair)
        }) {
            raw.push((
                entry.model.as_str().to_string(),
                entry.center,
                entry.partner,
                Lambda::from_option(entry.lambda),
            ));
        }
        Ok(PointData {
            point_group: analysis.symmetry.as_ref().map(|s| s.group.to_string()),
            levels,
            coefficients: eht.coefficients.clone(),
            overlap: eht.overlap.clone(),
            lambdas: number_hybrids(raw),
            sum_occupied_ev: eht.sum_occupied_energy,
            notes,
        })
    }
}

/// Gives hybrids of the same model, centre and partner ordinals, s-richest first, so the
/// same hybrid gets the same key at every point whatever order a model lists them in.
fn number_hybrids(
    mut raw: Vec<(String, usize, Option<usize>, Lambda)>,
) -> Vec<(LambdaKey, Lambda)> {
    raw.sort_by(|a, b| {
        (&a.0, a.1, a.2)
            .cmp(&(&b.0, b.1, b.2))
            .then(a.3.value().total_cmp(&b.3.value()))
    });
    let mut out: Vec<(LambdaKey, Lambda)> = Vec::with_capacity(raw.len());
    for (model, centre, partner, lambda) in raw {
        let ordinal = match out.last() {
            Some((key, _))
                if key.model == model && key.centre == centre && key.partner == partner =>
            {
                key.ordinal + 1
            }
            _ => 0,
        };
        out.push((
            LambdaKey {
                model,
                centre,
                partner,
                ordinal,
            },
            lambda,
        ));
    }
    out
}
