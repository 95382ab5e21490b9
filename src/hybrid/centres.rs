//! What the geometric and maximum-overlap models are told about each centre, read from
//! the wavefunction's hybrids (`crate::localized::hybrids`): its σ partners, its π
//! orbitals with their directions, its lone pairs and a singly occupied orbital — the
//! usual valence-bond bookkeeping (Coulson, *Valence*, 1952, ch. VIII) on the Lewis
//! structure of the localized orbitals instead of one guessed from distances.
//!
//! A multicentre part that is p perpendicular to every σ bond of its atom belongs to a
//! delocalized π system (benzene, C60) and is taken as a π orbital toward the nearest
//! other atom of its orbital. A centre with any other multicentre part, an over-complete
//! one, or one with more than one singly occupied orbital is outside these two-centre
//! models: it is skipped with a note and the wavefunction's hybrids stand for it.

use nalgebra::Vector3;

use crate::chem::molecule::{Molecule, any_perpendicular};
use crate::localized::{AtomHybrid, AtomHybrids, HybridKind, LocalizedPicture};

/// The Lewis-structure description of one centre.
#[derive(Clone, Debug, PartialEq)]
pub struct CentreSpec {
    pub atom: usize,
    /// σ partners (atom indices), ascending.
    pub sigma_partners: Vec<usize>,
    /// π orbitals: (partner, global p direction), one per π bond.
    pub pi: Vec<(usize, Vector3<f64>)>,
    /// Doubly occupied lone pairs.
    pub lone_pairs: usize,
    /// One more lone-pair orbital holds a single electron (a radical centre).
    pub single_electron: bool,
    /// Formal charge (rounded) of the wavefunction's Lewis structure.
    pub formal_charge: i32,
}

impl CentreSpec {
    /// σ partners + lone-pair orbitals (the singly occupied one included).
    pub fn steric_number(&self) -> usize {
        self.sigma_partners.len() + self.lone_pair_orbitals()
    }

    /// Lone-pair orbitals, the singly occupied one included.
    pub fn lone_pair_orbitals(&self) -> usize {
        self.lone_pairs + usize::from(self.single_electron)
    }
}

/// The centres the two-centre models can describe (atoms with valence s and p functions,
/// `has_sp`), and notes on those skipped.
pub fn from_picture(
    picture: &LocalizedPicture,
    molecule: &Molecule,
    has_sp: &dyn Fn(usize) -> bool,
) -> (Vec<CentreSpec>, Vec<String>) {
    let mut specs = Vec::new();
    let mut notes = Vec::new();
    for atom_hybrids in &picture.hybrids {
        let atom = atom_hybrids.atom;
        if !has_sp(atom) {
            continue;
        }
        match spec_of(atom_hybrids, picture, molecule) {
            Ok(spec) => specs.push(spec),
            Err(reason) => notes.push(format!(
                "atom {atom} ({}) {reason}: outside the two-centre hybrid models, its hybrids are read from the wavefunction",
                molecule.atoms[atom].element.symbol()
            )),
        }
    }
    (specs, notes)
}

/// A π orbital of a centre: (partner, global p direction), as in [`CentreSpec::pi`].
type PiOrbital = (usize, Vector3<f64>);

/// Why a centre with a multicentre part that is not a π orbital is skipped.
const MULTICENTRE: &str = "takes part in a multicentre bond";

/// The description of one centre, or why it is outside the two-centre models (the
/// reason completes "atom N (X) …").
fn spec_of(
    atom_hybrids: &AtomHybrids,
    picture: &LocalizedPicture,
    molecule: &Molecule,
) -> Result<CentreSpec, &'static str> {
    let atom = atom_hybrids.atom;
    if atom_hybrids.over_complete {
        return Err("has more bonding orbitals than valence functions");
    }
    let hybrids = &atom_hybrids.hybrids;
    let reader = PiReader::new(atom_hybrids, picture, molecule);
    if hybrids
        .iter()
        .any(|h| h.kind == HybridKind::Multicentre && reader.partner(h).is_none())
    {
        return Err(MULTICENTRE);
    }
    let single = hybrids
        .iter()
        .filter(|h| h.kind == HybridKind::SingleElectron)
        .count();
    if single > 1 {
        return Err("has more than one singly occupied orbital");
    }
    let (sigma_partners, pi) = sigma_and_pi(hybrids, &reader)?;
    let count = |kind: HybridKind| hybrids.iter().filter(|h| h.kind == kind).count();
    Ok(CentreSpec {
        atom,
        sigma_partners,
        pi,
        lone_pairs: count(HybridKind::LonePair),
        single_electron: single == 1,
        formal_charge: picture
            .lewis
            .formal_charges
            .get(atom)
            .map_or(0, |q| q.round() as i32),
    })
}

/// The σ partners (ascending) and the π orbitals (partner, direction) of a centre's
/// hybrids. Bond and π hybrids name their partner; a π hybrid of a 3c–4e unit without
/// one takes the unit's first atom; a multicentre part is a π orbital by the rule of
/// [`PiReader::partner`].
fn sigma_and_pi(
    hybrids: &[AtomHybrid],
    reader: &PiReader,
) -> Result<(Vec<usize>, Vec<PiOrbital>), &'static str> {
    let mut sigma_partners: Vec<usize> = Vec::new();
    let mut pi = Vec::new();
    for hybrid in hybrids {
        let partner = match (hybrid.kind, hybrid.partner) {
            (HybridKind::Bond, Some(partner)) if !sigma_partners.contains(&partner) => {
                sigma_partners.push(partner);
                continue;
            }
            // A second bond hybrid toward the same partner (a bent double bond) counts
            // as that bond's π orbital.
            (HybridKind::Bond, Some(partner)) | (HybridKind::Pi, Some(partner)) => partner,
            (HybridKind::Multicentre, _) => reader.partner(hybrid).ok_or(MULTICENTRE)?,
            (HybridKind::Pi, None) => hybrid
                .unit
                .map(|u| reader.picture.units[u].atoms[0])
                .ok_or("has a π orbital without a partner")?,
            _ => continue,
        };
        pi.push((partner, reader.direction(hybrid, partner)));
    }
    sigma_partners.sort_unstable();
    Ok((sigma_partners, pi))
}

/// Reads the π orbitals of one atom: their partners and directions, against the axes of
/// the atom's σ bonds.
struct PiReader<'a> {
    atom: usize,
    /// Unit vectors toward the partners of the atom's bond hybrids.
    bond_axes: Vec<Vector3<f64>>,
    picture: &'a LocalizedPicture,
    molecule: &'a Molecule,
}

impl<'a> PiReader<'a> {
    fn new(
        atom_hybrids: &AtomHybrids,
        picture: &'a LocalizedPicture,
        molecule: &'a Molecule,
    ) -> PiReader<'a> {
        let atom = atom_hybrids.atom;
        let position = |a: usize| molecule.atoms[a].position;
        let bond_axes = atom_hybrids
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Bond)
            .filter_map(|h| h.partner)
            .map(|p| (position(p) - position(atom)).normalize())
            .collect();
        PiReader {
            atom,
            bond_axes,
            picture,
            molecule,
        }
    }

    /// The π partner of a multicentre part, `None` when the part is not a π orbital. A
    /// part that is p perpendicular to every σ bond of the atom is a π orbital of a
    /// delocalized π system (benzene, C60): the two-centre models take it as a π orbital
    /// toward the nearest other atom of its orbital.
    fn partner(&self, h: &AtomHybrid) -> Option<usize> {
        let direction = Vector3::from(h.shape.direction);
        let perpendicular = h.shape.p_share > 0.95
            && self
                .bond_axes
                .iter()
                .all(|axis| direction.dot(axis).abs() < 0.3);
        if !perpendicular {
            return None;
        }
        let distance = |a: usize| (self.position(a) - self.position(self.atom)).norm();
        h.orbitals
            .iter()
            .flat_map(|&k| self.picture.orbitals[k].centres.iter().copied())
            .filter(|&a| a != self.atom)
            .min_by(|&a, &b| distance(a).total_cmp(&distance(b)))
    }

    /// The π orbital's direction: the hybrid's, made perpendicular to the bond axis.
    fn direction(&self, h: &AtomHybrid, partner: usize) -> Vector3<f64> {
        perpendicular(
            Vector3::from(h.shape.direction),
            self.position(partner) - self.position(self.atom),
        )
    }

    fn position(&self, a: usize) -> Vector3<f64> {
        self.molecule.atoms[a].position
    }
}

/// `direction` made perpendicular to `axis` and normalized (any perpendicular when it
/// lies along the axis).
fn perpendicular(direction: Vector3<f64>, axis: Vector3<f64>) -> Vector3<f64> {
    if axis.norm() < 1e-8 {
        return direction;
    }
    let axis = axis.normalize();
    let v = direction - axis * axis.dot(&direction);
    if v.norm() > 1e-6 {
        v.normalize()
    } else {
        any_perpendicular(&axis)
    }
}
