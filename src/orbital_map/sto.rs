//! Point values of the extended Hückel valence basis: real Slater-type orbitals
//! χ = N r^(n−1) e^(−ζr) Y_lm with N = (2ζ)^(n+½)/√((2n)!) (the radial normalization of
//! `crate::eht::overlap`) and the real spherical harmonics of `crate::chem::ao`, in the same
//! sign and order conventions as the overlap matrix (e.g. Szabo and Ostlund, *Modern
//! Quantum Chemistry*, for the real harmonics). Positions in Å are turned into bohr with
//! the basis's own factor `BOHR_IN_ANGSTROM`, so that an orbital with cᵀSc = 1 integrates
//! to 1 in bohr³.
//!
//! Speed: r^(n−1) Y_lm is written as r^(n−1−l) times a solid harmonic (a polynomial in
//! x, y, z), so nothing divides by r; the AO coefficients of one orbital are folded into
//! each shell's polynomial once ([`OrbitalEvaluator`]); shells whose coefficients are
//! all zero are dropped, and an atom is skipped where ζ_min r exceeds [`DECAY_CUTOFF`].

use nalgebra::Vector3;

use crate::eht::basis::Basis;
use crate::eht::overlap::{BOHR_IN_ANGSTROM, radial_normalization};

/// Beyond ζr = 46 a Slater function has decayed below e^(−46) ≈ 1e-20 of its scale:
/// negligible next to any contour level (common practice, no source).
pub const DECAY_CUTOFF: f64 = 46.0;

const FOUR_PI: f64 = 4.0 * std::f64::consts::PI;

/// Constants c of the real harmonics as c × (solid harmonic) / r^l, in the order of
/// `crate::chem::ao`: s; px, py, pz; dxy, dyz, dz², dxz, dx²−y².
fn harmonic_constants(l: u8) -> &'static [f64] {
    use std::sync::OnceLock;
    static S: OnceLock<[f64; 1]> = OnceLock::new();
    static P: OnceLock<[f64; 3]> = OnceLock::new();
    static D: OnceLock<[f64; 5]> = OnceLock::new();
    match l {
        0 => S.get_or_init(|| [(1.0 / FOUR_PI).sqrt()]),
        1 => P.get_or_init(|| [(3.0 / FOUR_PI).sqrt(); 3]),
        _ => D.get_or_init(|| {
            let c1 = (15.0 / FOUR_PI).sqrt();
            let c0 = (5.0 / (4.0 * FOUR_PI)).sqrt();
            let c2 = (15.0 / (4.0 * FOUR_PI)).sqrt();
            [c1, c1, c0, c1, c2]
        }),
    }
}

/// The solid harmonics (unnormalized polynomials) of angular momentum `l` at (x, y, z).
fn solid_harmonics(l: u8, d: &Vector3<f64>, out: &mut [f64; 5]) {
    let (x, y, z) = (d.x, d.y, d.z);
    match l {
        0 => out[0] = 1.0,
        1 => {
            out[0] = x;
            out[1] = y;
            out[2] = z;
        }
        _ => {
            out[0] = x * y;
            out[1] = y * z;
            out[2] = 2.0 * z * z - x * x - y * y;
            out[3] = x * z;
            out[4] = x * x - y * y;
        }
    }
}

/// Value of every basis function at `point` (bohr), in basis order, into `out`
/// (length = basis size). Used by checks that integrate products of functions.
pub fn basis_values_at(basis: &Basis, point: &Vector3<f64>, out: &mut [f64]) {
    let mut harmonics = [0.0; 5];
    for shell in &basis.shells {
        let d = point - shell.centre;
        let r = d.norm();
        let radial = radial_normalization(shell.n, shell.zeta)
            * r.powi(i32::from(shell.n) - 1 - i32::from(shell.l))
            * (-shell.zeta * r).exp();
        solid_harmonics(shell.l, &d, &mut harmonics);
        let constants = harmonic_constants(shell.l);
        for (k, &c) in constants.iter().enumerate() {
            out[shell.first + k] = radial * c * harmonics[k];
        }
    }
}

/// One shell of an orbital: its radial data and the orbital's coefficients folded into
/// the harmonic constants.
#[derive(Clone, Debug)]
struct ShellTerm {
    /// Power of r left after the solid harmonic: n − 1 − l.
    power: i32,
    zeta: f64,
    l: u8,
    /// N × (harmonic constant) × (AO coefficient) per function of the shell.
    weights: [f64; 5],
}

/// The shells of one atom that carry part of the orbital.
#[derive(Clone, Debug)]
struct AtomTerms {
    centre: Vector3<f64>,
    /// Distance (bohr) beyond which every shell of the atom is negligible.
    cutoff: f64,
    shells: Vec<ShellTerm>,
}

/// Evaluates one orbital ψ = Σ c_μ χ_μ at points, with the coefficients folded in once.
#[derive(Clone, Debug)]
pub struct OrbitalEvaluator {
    atoms: Vec<AtomTerms>,
}

impl OrbitalEvaluator {
    /// The orbital with AO `coefficients` (basis order, length = basis size) in `basis`.
    /// Coefficients beyond the basis are ignored, missing ones count as zero.
    pub fn new(basis: &Basis, coefficients: &[f64]) -> OrbitalEvaluator {
        let mut atoms: Vec<AtomTerms> = Vec::new();
        for shell in &basis.shells {
            let size = shell.size();
            let mut weights = [0.0; 5];
            let norm = radial_normalization(shell.n, shell.zeta);
            let constants = harmonic_constants(shell.l);
            for (k, weight) in weights.iter_mut().enumerate().take(size) {
                let c = coefficients.get(shell.first + k).copied().unwrap_or(0.0);
                *weight = norm * constants[k] * c;
            }
            if weights.iter().all(|&w| w == 0.0) {
                continue;
            }
            let term = ShellTerm {
                power: i32::from(shell.n) - 1 - i32::from(shell.l),
                zeta: shell.zeta,
                l: shell.l,
                weights,
            };
            let cutoff = DECAY_CUTOFF / shell.zeta;
            match atoms.iter_mut().find(|a| a.centre == shell.centre) {
                Some(atom) => {
                    atom.cutoff = atom.cutoff.max(cutoff);
                    atom.shells.push(term);
                }
                None => atoms.push(AtomTerms {
                    centre: shell.centre,
                    cutoff,
                    shells: vec![term],
                }),
            }
        }
        OrbitalEvaluator { atoms }
    }

    /// ψ at `point` given in bohr.
    pub fn value_at_bohr(&self, point: &Vector3<f64>) -> f64 {
        let mut sum = 0.0;
        let mut harmonics = [0.0; 5];
        for atom in &self.atoms {
            let d = point - atom.centre;
            let r2 = d.norm_squared();
            if r2 > atom.cutoff * atom.cutoff {
                continue;
            }
            let r = r2.sqrt();
            for shell in &atom.shells {
                let radial = r.powi(shell.power) * (-shell.zeta * r).exp();
                solid_harmonics(shell.l, &d, &mut harmonics);
                let angular: f64 = shell
                    .weights
                    .iter()
                    .zip(&harmonics)
                    .take(2 * shell.l as usize + 1)
                    .map(|(w, h)| w * h)
                    .sum();
                sum += radial * angular;
            }
        }
        sum
    }

    /// ψ at `point` given in Å (the molecule's unit).
    pub fn value_at(&self, point: &Vector3<f64>) -> f64 {
        self.value_at_bohr(&(point / BOHR_IN_ANGSTROM))
    }

    /// True when the orbital has no non-zero coefficient.
    pub fn is_zero(&self) -> bool {
        self.atoms.is_empty()
    }
}
