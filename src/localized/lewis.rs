//! The Lewis structure read from the localized orbitals.
//!
//! - **Bond order** of a pair: Σ (occupancy/2) × (+1 bonding, −1 antibonding) over its
//!   two-centre orbitals, plus ½ per link of a three-centre four-electron bond
//!   (G. C. Pimentel, J. Chem. Phys. 19, 446 (1951)), less ¼ per electron a radical puts
//!   in that bond's antibonding level (3c–5e, as NO2's in-plane O–N–O). Beside it the Wiberg index in the
//!   orthonormal basis (K. B. Wiberg, Tetrahedron 24, 1083 (1968)) as the continuous
//!   measure. Pairs with a non-zero order, or a Wiberg index of at least
//!   [`LISTED_WIBERG_INDEX`], are listed.
//! - **Lone pairs**: doubly occupied one-centre orbitals; **unpaired electrons**: the
//!   partly occupied orbitals with their electrons; **multicentre bonds**: orbitals with
//!   three or more centres and the 3c–4e units.
//! - **Formal charges**: valence electrons minus the electrons an atom owns, where an atom
//!   owns all of a one-centre orbital's, half of a two-centre orbital's (the usual
//!   convention), a multicentre orbital's in proportion to its population there (our
//!   choice, no source: benzene's three-centre π orbitals then leave no alternating
//!   charges), and in a 3c–4e unit 1 (centre) and 3/2 (each terminal), the average of the
//!   two resonance structures X–A :X⁻ ↔ ⁻X: A–X.
//! - **Lewis share**: the fraction of the electrons in one- and two-centre orbitals outside
//!   3c–4e units and off over-complete atoms — how well one Lewis structure describes the
//!   molecule (1 for methane; lower for ozone, benzene's π system, diborane, SF6).

use nalgebra::DMatrix;
use serde::Serialize;

use super::classify::{LocalizedOrbital, OrbitalClass, OrbitalSpace, ThreeCentreUnit};

/// A pair without a two-centre orbital is still listed from this Wiberg index up (our
/// choice, no source): a strong interaction the Lewis structure leaves out stays visible.
pub const LISTED_WIBERG_INDEX: f64 = 0.5;

/// One atom pair of the Lewis structure.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LewisBond {
    pub atoms: [usize; 2],
    /// Net bond order (may be ½-integral, zero or negative).
    pub order: f64,
    /// Wiberg bond index.
    pub index: f64,
}

/// Doubly occupied one-centre orbitals of an atom.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LonePairs {
    pub atom: usize,
    pub count: usize,
}

/// What kind of multicentre bond.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum MulticentreKind {
    /// One doubly occupied orbital over three or more atoms (diborane's B–H–B, H3⁺).
    Delocalized,
    /// Two orbitals, four electrons, three atoms (Pimentel).
    ThreeCentreFourElectron,
}

/// A multicentre bond.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MulticentreBond {
    /// Its atoms; three in chain order (terminal, middle, terminal), more ascending.
    pub atoms: Vec<usize>,
    pub electrons: f64,
    pub kind: MulticentreKind,
}

/// Electrons of one partly occupied orbital.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Unpaired {
    pub atoms: Vec<usize>,
    pub electrons: f64,
}

/// The Lewis structure of the wavefunction.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct LewisStructure {
    pub bonds: Vec<LewisBond>,
    pub lone_pairs: Vec<LonePairs>,
    pub multicentre: Vec<MulticentreBond>,
    pub unpaired: Vec<Unpaired>,
    pub formal_charges: Vec<f64>,
    pub lewis_share: f64,
}

impl LewisStructure {
    /// The bond order of a pair (0 when not listed).
    pub fn order(&self, a: usize, b: usize) -> f64 {
        self.bond(a, b).map_or(0.0, |bond| bond.order)
    }

    /// The listed entry of a pair, if any.
    pub fn bond(&self, a: usize, b: usize) -> Option<&LewisBond> {
        let key = [a.min(b), a.max(b)];
        self.bonds.iter().find(|bond| bond.atoms == key)
    }

    /// Lone pairs on `atom`.
    pub fn lone_pairs_on(&self, atom: usize) -> usize {
        self.lone_pairs
            .iter()
            .find(|entry| entry.atom == atom)
            .map_or(0, |entry| entry.count)
    }

    /// Σ electrons of the partly occupied orbitals.
    pub fn unpaired_electrons(&self) -> f64 {
        self.unpaired.iter().map(|u| u.electrons).sum()
    }
}

/// What the structure is read from besides the orbitals: each atom's valence electrons,
/// the atoms whose orbitals share their valence functions (`over_complete`: their
/// two-centre orbitals are not one Lewis structure's bonds, so they leave the Lewis
/// share), and per 3c–4e unit the electrons of partly occupied orbitals in its centre's
/// shared orbital (`unit_antibonding`: NO2's unpaired electron sits in the antibonding
/// level of the in-plane O–N–O unit, a 3c–5e bond).
pub struct Context<'a> {
    pub valence: &'a [f64],
    pub over_complete: &'a [bool],
    pub unit_antibonding: &'a [f64],
}

/// Reads the structure.
pub fn read(
    orbitals: &[LocalizedOrbital],
    units: &[ThreeCentreUnit],
    wiberg: &DMatrix<f64>,
    context: &Context<'_>,
) -> LewisStructure {
    let mut tally = Tally::new(context.valence.len(), context.over_complete);
    for orbital in orbitals.iter().filter(|o| o.space != OrbitalSpace::Virtual) {
        tally.add_orbital(orbital);
    }
    for (k, unit) in units.iter().enumerate() {
        let antibonding = context.unit_antibonding.get(k).copied().unwrap_or(0.0);
        tally.add_unit(unit, orbitals, antibonding);
    }
    tally.finish(wiberg, context.valence)
}

/// What the orbitals add up to, atom by atom and pair by pair.
struct Tally<'a> {
    over_complete: &'a [bool],
    order: DMatrix<f64>,
    owned: Vec<f64>,
    lone: Vec<usize>,
    structure: LewisStructure,
    lewis_electrons: f64,
    total: f64,
}

impl<'a> Tally<'a> {
    fn new(atoms: usize, over_complete: &'a [bool]) -> Tally<'a> {
        Tally {
            over_complete,
            order: DMatrix::zeros(atoms, atoms),
            owned: vec![0.0; atoms],
            lone: vec![0; atoms],
            structure: LewisStructure::default(),
            lewis_electrons: 0.0,
            total: 0.0,
        }
    }

    /// An occupied orbital outside 3c–4e units: its electrons, lone pair or bond order.
    fn add_orbital(&mut self, orbital: &LocalizedOrbital) {
        self.total += orbital.occupancy;
        if orbital.unit.is_some() {
            return;
        }
        for (&atom, share) in orbital.centres.iter().zip(ownership(orbital)) {
            self.owned[atom] += share;
        }
        let shared = orbital
            .centres
            .iter()
            .any(|&a| self.over_complete.get(a).copied().unwrap_or(false));
        if orbital.space == OrbitalSpace::Partly {
            self.structure.unpaired.push(Unpaired {
                atoms: sorted(&orbital.centres),
                electrons: orbital.occupancy,
            });
        }
        match orbital.class {
            OrbitalClass::OneCentre => {
                if !shared {
                    self.lewis_electrons += orbital.occupancy;
                }
                if orbital.space == OrbitalSpace::Doubly {
                    self.lone[orbital.centres[0]] += 1;
                }
            }
            OrbitalClass::TwoCentre => {
                if !shared {
                    self.lewis_electrons += orbital.occupancy;
                }
                let sign = if orbital.antibonding { -1.0 } else { 1.0 };
                self.add_order(
                    orbital.centres[0],
                    orbital.centres[1],
                    sign * orbital.occupancy / 2.0,
                );
            }
            OrbitalClass::MultiCentre if orbital.space == OrbitalSpace::Doubly => {
                self.structure.multicentre.push(MulticentreBond {
                    atoms: sorted(&orbital.centres),
                    electrons: orbital.occupancy,
                    kind: MulticentreKind::Delocalized,
                });
            }
            OrbitalClass::MultiCentre => {}
        }
    }

    /// A 3c–4e unit: ½ per link, less ¼ per electron in its antibonding level (a 3c–5e
    /// bond has ¼ per link); the centre owns a quarter of its four electrons, each
    /// terminal three eighths.
    fn add_unit(
        &mut self,
        unit: &ThreeCentreUnit,
        orbitals: &[LocalizedOrbital],
        antibonding: f64,
    ) {
        let [first, centre, second] = unit.atoms;
        let electrons: f64 = unit.orbitals.iter().map(|&k| orbitals[k].occupancy).sum();
        self.owned[centre] += electrons / 4.0;
        self.owned[first] += 3.0 * electrons / 8.0;
        self.owned[second] += 3.0 * electrons / 8.0;
        let order = 0.5 - antibonding / 4.0;
        self.add_order(first, centre, order);
        self.add_order(second, centre, order);
        self.structure.multicentre.push(MulticentreBond {
            atoms: unit.atoms.to_vec(),
            electrons,
            kind: MulticentreKind::ThreeCentreFourElectron,
        });
    }

    fn add_order(&mut self, a: usize, b: usize, order: f64) {
        self.order[(a, b)] += order;
        self.order[(b, a)] = self.order[(a, b)];
    }

    fn finish(mut self, wiberg: &DMatrix<f64>, valence: &[f64]) -> LewisStructure {
        let atoms = valence.len();
        for a in 0..atoms {
            for b in a + 1..atoms {
                let index = wiberg.get((a, b)).copied().unwrap_or(0.0);
                if self.order[(a, b)].abs() > 1e-9 || index >= LISTED_WIBERG_INDEX {
                    self.structure.bonds.push(LewisBond {
                        atoms: [a, b],
                        order: rounded(self.order[(a, b)]),
                        index,
                    });
                }
            }
        }
        let lone = &self.lone;
        self.structure.lone_pairs = (0..atoms)
            .filter(|&a| lone[a] > 0)
            .map(|atom| LonePairs {
                atom,
                count: lone[atom],
            })
            .collect();
        self.structure.formal_charges = valence
            .iter()
            .zip(&self.owned)
            .map(|(v, e)| rounded(v - e))
            .collect();
        let share = if self.total > 0.0 {
            self.lewis_electrons / self.total
        } else {
            1.0
        };
        self.structure.lewis_share = rounded(share);
        self.structure
    }
}

/// The electrons each centre owns: all of a one-centre orbital's, half of a two-centre
/// orbital's, and of a multicentre orbital's in proportion to the centres' populations.
fn ownership(orbital: &LocalizedOrbital) -> Vec<f64> {
    match orbital.class {
        OrbitalClass::OneCentre | OrbitalClass::TwoCentre => {
            let share = orbital.occupancy / orbital.centres.len().max(1) as f64;
            vec![share; orbital.centres.len()]
        }
        OrbitalClass::MultiCentre => {
            let total: f64 = orbital.centre_populations.iter().sum();
            orbital
                .centre_populations
                .iter()
                .map(|q| orbital.occupancy * q / total.max(1e-300))
                .collect()
        }
    }
}

/// Counts of electrons and halves are exact in the Lewis structure; rounding noise
/// (2.0000000000000027) is cut at 1e-9 so the reports read cleanly.
pub(crate) fn rounded(value: f64) -> f64 {
    let clean = (value * 1e9).round() / 1e9;
    if clean == 0.0 { 0.0 } else { clean }
}

fn sorted(atoms: &[usize]) -> Vec<usize> {
    let mut list = atoms.to_vec();
    list.sort_unstable();
    list
}
