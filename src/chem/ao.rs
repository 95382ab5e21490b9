//! Names for real atomic orbitals (s, p, d) shared by the extended Hückel basis and the
//! symmetry engine, so that both agree on what each basis function is.
//!
//! Real solid harmonics in the usual chemist's form (e.g. Szabo and Ostlund; common
//! practice, no source for the ordering): the order within a shell is
//! s; px, py, pz; dxy, dyz, dz², dxz, dx²−y².

use serde::{Deserialize, Serialize};

/// Angular part of a real atomic orbital.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum AngularKind {
    S,
    Px,
    Py,
    Pz,
    Dxy,
    Dyz,
    Dz2,
    Dxz,
    Dx2y2,
}

impl AngularKind {
    /// The real functions of angular momentum `l` in the documented order.
    pub fn shell(l: u8) -> &'static [AngularKind] {
        use AngularKind::*;
        match l {
            0 => &[S],
            1 => &[Px, Py, Pz],
            _ => &[Dxy, Dyz, Dz2, Dxz, Dx2y2],
        }
    }

    /// Angular momentum quantum number.
    pub fn l(self) -> u8 {
        use AngularKind::*;
        match self {
            S => 0,
            Px | Py | Pz => 1,
            _ => 2,
        }
    }

    /// Short label without the principal quantum number: "s", "px", "dz2".
    pub fn label(self) -> &'static str {
        use AngularKind::*;
        match self {
            S => "s",
            Px => "px",
            Py => "py",
            Pz => "pz",
            Dxy => "dxy",
            Dyz => "dyz",
            Dz2 => "dz2",
            Dxz => "dxz",
            Dx2y2 => "dx2-y2",
        }
    }
}

/// One basis function: which atom (0-based), principal quantum number and angular part.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct AtomicOrbital {
    pub atom: usize,
    pub n: u8,
    pub kind: AngularKind,
}

impl AtomicOrbital {
    /// "2px" style label.
    pub fn label(&self) -> String {
        format!("{}{}", self.n, self.kind.label())
    }
}
