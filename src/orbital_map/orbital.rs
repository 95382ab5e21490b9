//! Which orbital a map shows, and its AO coefficients from an [`Analysis`].
//!
//! Canonical MOs are the columns of the extended Hückel coefficient matrix and localized
//! orbitals carry their own AO coefficients, both normalized with S (cᵀSc = 1). Hybrids
//! are listed by λ and direction only, so a hybrid's map is built on its centre as the
//! normalized sp^λ orbital h = (s + √λ p_d)/√(1 + λ), with p_d the centre's p function
//! along `direction` (Coulson, *Valence*, 1952); a pure p hybrid (λ = None, "λ → ∞") is
//! p_d itself. A centre without p functions (H) gives its s function. One-centre s and p
//! functions are orthonormal, so h is normalized.
//!
//! Labels (for the command line): a canonical MO by its symmetry label ("3a1", "1e"), the
//! k-th member of a set sharing a label by "#k" (1-based: "1e#2"), "HOMO", "LUMO"; a
//! localized orbital by its label ("n(N)", "σ(N–H)#3"), with ASCII spellings accepted
//! ("sigma(N-H)", "pi*(C-C)"); or by 0-based index: "mo:K", "loc:K", "hyb:K".

use crate::analysis::Analysis;
use crate::chem::ao::AngularKind;

use super::MapError;

/// An orbital of an analysis.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum OrbitalRef {
    /// Index into `analysis.orbitals` (ascending energy).
    Canonical(usize),
    /// Index into `analysis.localized`.
    Localized(usize),
    /// Index into `analysis.hybrid_entries`.
    Hybrid(usize),
}

/// The orbital resolved: AO coefficients and what to call it.
#[derive(Clone, Debug, PartialEq)]
pub struct ResolvedOrbital {
    /// Where it came from; None for an orbital given directly by coefficients.
    pub reference: Option<OrbitalRef>,
    /// AO coefficients in basis order (length = basis size).
    pub coefficients: Vec<f64>,
    /// Name for titles ("3a1", "n(N)", "N0 sp^2.03 → lone pair").
    pub label: String,
    pub energy_ev: Option<f64>,
    /// Atoms carrying most of the orbital (for choosing a default plane).
    pub atoms: Vec<usize>,
}

/// Looks `reference` up in `analysis` and returns its AO coefficients.
pub fn resolve(analysis: &Analysis, reference: OrbitalRef) -> Result<ResolvedOrbital, MapError> {
    let eht = analysis.eht.as_ref().ok_or(MapError::NoOrbitals)?;
    let size = eht.basis.len();
    match reference {
        OrbitalRef::Canonical(index) => {
            let summary = analysis
                .orbitals
                .get(index)
                .filter(|_| index < eht.coefficients.ncols())
                .ok_or(MapError::OrbitalOutOfRange {
                    kind: "canonical MO",
                    index,
                    count: analysis.orbitals.len().min(eht.coefficients.ncols()),
                })?;
            let coefficients = eht.coefficients.column(index).iter().copied().collect();
            let atoms = summary
                .atom_shares()
                .into_iter()
                .filter(|(_, share)| *share >= 0.1)
                .map(|(atom, _)| atom)
                .collect();
            Ok(ResolvedOrbital {
                reference: Some(reference),
                coefficients,
                label: summary
                    .label
                    .clone()
                    .unwrap_or_else(|| format!("ψ{}", index + 1)),
                energy_ev: Some(summary.energy_ev),
                atoms,
            })
        }
        OrbitalRef::Localized(index) => {
            let summary = analysis
                .localized
                .get(index)
                .ok_or(MapError::OrbitalOutOfRange {
                    kind: "localized orbital",
                    index,
                    count: analysis.localized.len(),
                })?;
            if summary.coefficients.len() != size {
                return Err(MapError::NoCoefficients {
                    label: summary.label.clone(),
                });
            }
            Ok(ResolvedOrbital {
                reference: Some(reference),
                coefficients: summary.coefficients.clone(),
                label: summary.label.clone(),
                energy_ev: Some(summary.energy_ev),
                atoms: summary.atoms.clone(),
            })
        }
        OrbitalRef::Hybrid(index) => {
            let entry = analysis
                .hybrid_entries
                .get(index)
                .ok_or(MapError::OrbitalOutOfRange {
                    kind: "hybrid",
                    index,
                    count: analysis.hybrid_entries.len(),
                })?;
            let coefficients =
                hybrid_coefficients(analysis, entry.center, entry.lambda, entry.direction, size)?;
            let symbol = analysis
                .molecule
                .atoms
                .get(entry.center)
                .map(|atom| atom.element.symbol())
                .unwrap_or("?");
            let target = match entry.partner {
                Some(partner) => {
                    format!("{} → atom {partner}", entry.kind.as_str().replace('_', " "))
                }
                None => entry.kind.as_str().replace('_', " "),
            };
            let mut atoms = vec![entry.center];
            atoms.extend(entry.partner);
            Ok(ResolvedOrbital {
                reference: Some(reference),
                coefficients,
                label: format!(
                    "{symbol}{} {} ({target})",
                    entry.center,
                    crate::diagram::style::lambda_text(entry.lambda)
                ),
                energy_ev: entry.energy_ev,
                atoms,
            })
        }
    }
}

/// h = (s + √λ p_d)/√(1 + λ) on `centre`; p_d alone when λ is None.
fn hybrid_coefficients(
    analysis: &Analysis,
    centre: usize,
    lambda: Option<f64>,
    direction: [f64; 3],
    size: usize,
) -> Result<Vec<f64>, MapError> {
    let eht = analysis.eht.as_ref().ok_or(MapError::NoOrbitals)?;
    let range = eht
        .basis
        .atom_ranges
        .get(centre)
        .cloned()
        .ok_or(MapError::AtomOutOfRange {
            atom: centre,
            atoms: eht.basis.atom_ranges.len(),
        })?;
    let find = |kind: AngularKind| {
        range
            .clone()
            .find(|&mu| eht.basis.orbitals[mu].kind == kind)
    };
    let s = find(AngularKind::S);
    let p = [
        find(AngularKind::Px),
        find(AngularKind::Py),
        find(AngularKind::Pz),
    ];
    let norm = direction.iter().map(|x| x * x).sum::<f64>().sqrt();
    let has_p = p.iter().all(Option::is_some) && norm > 1e-12;
    let (s_weight, p_weight) = match (lambda, has_p) {
        (_, false) => (1.0, 0.0),
        (None, true) => (0.0, 1.0),
        (Some(lambda), true) => {
            let lambda = lambda.max(0.0);
            (
                (1.0 / (1.0 + lambda)).sqrt(),
                (lambda / (1.0 + lambda)).sqrt(),
            )
        }
    };
    let mut coefficients = vec![0.0; size];
    let mut any = false;
    if s_weight > 0.0
        && let Some(mu) = s
    {
        coefficients[mu] = s_weight;
        any = true;
    }
    if p_weight > 0.0 {
        for (component, mu) in p.iter().enumerate() {
            if let Some(mu) = mu {
                coefficients[*mu] = p_weight * direction[component] / norm;
                any = true;
            }
        }
    }
    if !any {
        return Err(MapError::NoCoefficients {
            label: format!("hybrid of atom {centre}"),
        });
    }
    Ok(coefficients)
}

/// ASCII, lower-case form of a label so that "σ(N–H)" and "sigma(n-h)" match.
fn fold(label: &str) -> String {
    let mut out = String::with_capacity(label.len());
    for c in label.chars() {
        match c {
            'σ' => out.push_str("sigma"),
            'π' => out.push_str("pi"),
            'δ' => out.push_str("delta"),
            'φ' => out.push_str("phi"),
            'ψ' => out.push_str("psi"),
            '–' | '—' | '−' => out.push('-'),
            '′' => out.push('\''),
            '″' => out.push_str("''"),
            c if c.is_whitespace() => {}
            c => out.extend(c.to_lowercase()),
        }
    }
    out
}

/// Parses an orbital name given on the command line (see the module comment).
pub fn find_orbital(analysis: &Analysis, text: &str) -> Result<OrbitalRef, MapError> {
    let trimmed = text.trim();
    let unknown = || MapError::UnknownOrbital {
        label: trimmed.to_string(),
        examples: example_labels(analysis),
    };
    let lower = trimmed.to_ascii_lowercase();
    for (prefix, make) in [
        ("mo:", OrbitalRef::Canonical as fn(usize) -> OrbitalRef),
        ("loc:", OrbitalRef::Localized),
        ("hyb:", OrbitalRef::Hybrid),
    ] {
        if let Some(rest) = lower.strip_prefix(prefix) {
            let index: usize = rest.trim().parse().map_err(|_| unknown())?;
            let reference = make(index);
            resolve(analysis, reference)?;
            return Ok(reference);
        }
    }
    let eht = analysis.eht.as_ref().ok_or(MapError::NoOrbitals)?;
    match lower.as_str() {
        "homo" => return eht.homo().map(OrbitalRef::Canonical).ok_or_else(unknown),
        "lumo" => return eht.lumo().map(OrbitalRef::Canonical).ok_or_else(unknown),
        _ => {}
    }
    let (name, member) = match trimmed.rsplit_once('#') {
        Some((name, k)) => {
            let k: usize = k.trim().parse().map_err(|_| unknown())?;
            if k == 0 {
                return Err(unknown());
            }
            (name, k - 1)
        }
        None => (trimmed, 0),
    };
    let wanted = fold(name);
    let canonical = analysis
        .orbitals
        .iter()
        .filter(|o| o.label.as_deref().map(fold).as_deref() == Some(wanted.as_str()))
        .map(|o| OrbitalRef::Canonical(o.index));
    let localized = analysis
        .localized
        .iter()
        .enumerate()
        .filter(|(_, o)| fold(&o.label) == wanted)
        .map(|(index, _)| OrbitalRef::Localized(index));
    let matches: Vec<OrbitalRef> = canonical.chain(localized).collect();
    matches.get(member).copied().ok_or_else(unknown)
}

/// A few valid names, for error messages.
fn example_labels(analysis: &Analysis) -> Vec<String> {
    let mut out: Vec<String> = vec!["HOMO".into(), "LUMO".into()];
    for label in analysis
        .orbitals
        .iter()
        .filter_map(|o| o.label.clone())
        .chain(analysis.localized.iter().map(|o| o.label.clone()))
    {
        if !out.contains(&label) && out.len() < 10 {
            out.push(label);
        }
    }
    if !analysis.orbitals.is_empty() {
        out.push(format!("mo:0..{}", analysis.orbitals.len() - 1));
    }
    if !analysis.localized.is_empty() {
        out.push(format!("loc:0..{}", analysis.localized.len() - 1));
    }
    if !analysis.hybrid_entries.is_empty() {
        out.push(format!("hyb:0..{}", analysis.hybrid_entries.len() - 1));
    }
    out
}
