//! How a centre's local (s, px, py, pz) orbitals are reported: each as a [`Hybrid`] (λ,
//! shares, direction, bending, energy, AO vector) and the centre as a [`CentreHybrids`]
//! with its interorbital angles. Public so that hybrids from another source (localized
//! MOs) are reported exactly like the built-in models.

use nalgebra::{Vector3, Vector4};

use super::{
    CentreHybrids, Hybrid, HybridKind, HybridModel, InterorbitalAngle, atom_orbital_indices,
    gap_fraction, hybrid_energy,
};
use crate::chem::ao::AngularKind;
use crate::chem::molecule::{Molecule, angle_between};
use crate::eht::EhtResult;

/// Describes one local (s, px, py, pz) orbital of `centre`: λ, shares, direction, bending
/// (when `axis` to the partner is given), energy, and the full AO vector. Public so that
/// other stages (hybrids from localized MOs) report their hybrids the same way.
#[allow(clippy::too_many_arguments)]
pub fn describe_hybrid(
    kind: HybridKind,
    partner: Option<usize>,
    local: &Vector4<f64>,
    axis: Option<&Vector3<f64>>,
    eps_s: f64,
    eps_p: f64,
    sp_indices: [usize; 4],
    basis_size: usize,
) -> Hybrid {
    let norm = local.norm();
    let v = if norm > 0.0 { local / norm } else { *local };
    let kinds = [
        AngularKind::S,
        AngularKind::Px,
        AngularKind::Py,
        AngularKind::Pz,
    ];
    let shape = crate::localized::read_shape(v.as_slice(), &kinds);
    let direction = Vector3::from(shape.direction);
    let bending = match (kind, axis) {
        (HybridKind::Bond, Some(u)) if direction.norm() > 0.0 => {
            Some(angle_between(&direction, u).to_degrees())
        }
        _ => None,
    };
    let mut coefficients = vec![0.0; basis_size];
    for (&i, &c) in sp_indices.iter().zip(v.iter()) {
        if let Some(slot) = coefficients.get_mut(i) {
            *slot = c;
        }
    }
    Hybrid {
        kind,
        partner,
        local: [v[0], v[1], v[2], v[3]],
        coefficients,
        lambda: shape.lambda,
        s_percent: 100.0 * shape.s_share,
        p_percent: 100.0 * shape.p_share,
        direction: shape.direction,
        bending_degrees: bending,
        energy_ev: hybrid_energy(eps_s, eps_p, shape.lambda),
        gap_fraction: gap_fraction(shape.lambda),
    }
}

/// Describes a centre from its orbitals given as (kind, partner, local (s, px, py, pz)
/// coefficients), in the order and with the signs given: each [`Hybrid`] (λ, shares,
/// direction, bending toward the partner, energy, AO vector) and the interorbital angles
/// between bond and lone-pair hybrids. The Lewis fields are counted from the kinds
/// (formal charge 0, no odd electron). `None` when `atom` has no valence s,p functions
/// in the basis. Public so that hybrids from another source (localized MOs) are reported
/// exactly like the built-in models.
pub fn describe_centre(
    molecule: &Molecule,
    eht: &EhtResult,
    atom: usize,
    orbitals: &[(HybridKind, Option<usize>, Vector4<f64>)],
    model: HybridModel,
) -> Option<CentreHybrids> {
    let n = eht.basis.len();
    if eht.hamiltonian.nrows() != n || eht.hamiltonian.ncols() != n {
        return None;
    }
    let (_, sp_index) = atom_orbital_indices(molecule, eht);
    let indices = sp_index.get(atom).copied().flatten()?;
    let (eps_s, eps_p) = centre_energies(eht, indices);
    let hybrids: Vec<Hybrid> = orbitals
        .iter()
        .map(|(kind, partner, v)| {
            let axis = bond_axis(molecule, atom, *partner);
            describe_hybrid(*kind, *partner, v, axis.as_ref(), eps_s, eps_p, indices, n)
        })
        .collect();
    let interorbital_angles = interorbital_angles(&hybrids);
    let count = |kind: HybridKind| hybrids.iter().filter(|h| h.kind == kind).count();
    let sigma_partners: Vec<usize> = hybrids
        .iter()
        .filter(|h| h.kind == HybridKind::Bond)
        .filter_map(|h| h.partner)
        .collect();
    Some(CentreHybrids {
        atom,
        element: molecule.atoms[atom].element.symbol().to_string(),
        model,
        steric_number: sigma_partners.len() + count(HybridKind::LonePair),
        sigma_partners,
        pi_bonds: count(HybridKind::Pi),
        lone_pairs: count(HybridKind::LonePair),
        single_electron: false,
        formal_charge: 0,
        eps_s,
        eps_p,
        hybrids,
        interorbital_angles,
        residual: None,
        notes: Vec::new(),
    })
}

/// H_ss and the mean of the three H_pp of the centre's (s, px, py, pz) `indices`, eV.
fn centre_energies(eht: &EhtResult, indices: [usize; 4]) -> (f64, f64) {
    let eps_s = eht.hamiltonian[(indices[0], indices[0])];
    let eps_p = (1..4)
        .map(|k| eht.hamiltonian[(indices[k], indices[k])])
        .sum::<f64>()
        / 3.0;
    (eps_s, eps_p)
}

/// Unit vector from `atom` to `partner`, the axis a bond hybrid's bending is measured
/// from; `None` without a partner, or when the partner is unknown or coincident.
fn bond_axis(molecule: &Molecule, atom: usize, partner: Option<usize>) -> Option<Vector3<f64>> {
    let centre_position = molecule.atoms[atom].position;
    partner
        .filter(|&p| p < molecule.atoms.len())
        .map(|p| molecule.atoms[p].position - centre_position)
        .filter(|d| d.norm() > 1e-8)
        .map(|d| d.normalize())
}

/// The angles between every two directed hybrids: bonds and lone pairs with some p
/// character (π and vacant orbitals, and pure s, have no direction worth an angle).
fn interorbital_angles(hybrids: &[Hybrid]) -> Vec<InterorbitalAngle> {
    let directed = |h: &Hybrid| {
        matches!(h.kind, HybridKind::Bond | HybridKind::LonePair) && h.p_percent > 1e-6
    };
    let mut angles = Vec::new();
    for i in 0..hybrids.len() {
        for j in i + 1..hybrids.len() {
            if directed(&hybrids[i]) && directed(&hybrids[j]) {
                let a = Vector3::from(hybrids[i].direction);
                let b = Vector3::from(hybrids[j].direction);
                angles.push(InterorbitalAngle {
                    first: i,
                    second: j,
                    degrees: angle_between(&a, &b).to_degrees(),
                });
            }
        }
    }
    angles
}
