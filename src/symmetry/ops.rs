//! Point-group operations as 3×3 orthogonal matrices and the ideal operation sets of every
//! molecular point group in its standard frame (principal axis z; C2′ axes along x; σv
//! containing x), following the conventions of Cotton, *Chemical Applications of Group
//! Theory* (3rd ed.), chapter 3 and appendix IIA. The cubic and icosahedral groups are built
//! by closure from generators: T from C2(z) and C3(1,1,1); O from C4(z) and C3(1,1,1); I from
//! T and a C5 about (0, 1, φ) (the icosahedron with vertices (0, ±1, ±φ) and cyclic
//! permutations, which has C2 axes along x, y and z).

use nalgebra::{Matrix3, Vector3};
use serde::{Deserialize, Serialize};

/// A molecular point group (Schoenflies symbol).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum PointGroup {
    C1,
    Cs,
    Ci,
    /// Cn, n ≥ 2.
    Cn(u32),
    /// Cnv, n ≥ 2.
    Cnv(u32),
    /// Cnh, n ≥ 2.
    Cnh(u32),
    /// Dn, n ≥ 2.
    Dn(u32),
    /// Dnh, n ≥ 2.
    Dnh(u32),
    /// Dnd, n ≥ 2.
    Dnd(u32),
    /// S_m with the group order m (even, ≥ 4): `S(4)` is S4, `S(6)` is S6.
    S(u32),
    T,
    Td,
    Th,
    O,
    Oh,
    I,
    Ih,
    /// C∞v (linear, no centre of inversion).
    CInfV,
    /// D∞h (linear, centrosymmetric).
    DInfH,
}

/// Order of the finite subgroup used for the linear groups (C8v, D8h): enough to separate
/// σ, π, δ and φ.
pub const LINEAR_SUBGROUP_ORDER: u32 = 8;

impl PointGroup {
    /// The finite group whose operations are used: itself, or C8v / D8h for linear groups.
    pub fn finite_model(self) -> PointGroup {
        match self {
            PointGroup::CInfV => PointGroup::Cnv(LINEAR_SUBGROUP_ORDER),
            PointGroup::DInfH => PointGroup::Dnh(LINEAR_SUBGROUP_ORDER),
            other => other,
        }
    }

    pub fn is_linear(self) -> bool {
        matches!(self, PointGroup::CInfV | PointGroup::DInfH)
    }

    /// Number of operations of the finite model.
    pub fn order(self) -> usize {
        use PointGroup::*;
        match self.finite_model() {
            C1 => 1,
            Cs | Ci => 2,
            Cn(n) | S(n) => n as usize,
            Cnv(n) | Cnh(n) | Dn(n) => 2 * n as usize,
            Dnh(n) | Dnd(n) => 4 * n as usize,
            T => 12,
            Td | Th | O => 24,
            Oh => 48,
            I => 60,
            Ih => 120,
            CInfV | DInfH => unreachable!("finite_model removes linear groups"),
        }
    }
}

impl std::fmt::Display for PointGroup {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        use PointGroup::*;
        match self {
            C1 => write!(f, "C1"),
            Cs => write!(f, "Cs"),
            Ci => write!(f, "Ci"),
            Cn(n) => write!(f, "C{n}"),
            Cnv(n) => write!(f, "C{n}v"),
            Cnh(n) => write!(f, "C{n}h"),
            Dn(n) => write!(f, "D{n}"),
            Dnh(n) => write!(f, "D{n}h"),
            Dnd(n) => write!(f, "D{n}d"),
            S(n) => write!(f, "S{n}"),
            T => write!(f, "T"),
            Td => write!(f, "Td"),
            Th => write!(f, "Th"),
            O => write!(f, "O"),
            Oh => write!(f, "Oh"),
            I => write!(f, "I"),
            Ih => write!(f, "Ih"),
            CInfV => write!(f, "C∞v"),
            DInfH => write!(f, "D∞h"),
        }
    }
}

impl std::str::FromStr for PointGroup {
    type Err = String;
    /// Parses Schoenflies text ("C3v", "D6h", "S4", "Td", "C∞v", "Dinfh").
    fn from_str(text: &str) -> Result<Self, Self::Err> {
        use PointGroup::*;
        let t = text.trim();
        let fixed = match t {
            "C1" => Some(C1),
            "Cs" => Some(Cs),
            "Ci" => Some(Ci),
            "T" => Some(T),
            "Td" => Some(Td),
            "Th" => Some(Th),
            "O" => Some(O),
            "Oh" => Some(Oh),
            "I" => Some(I),
            "Ih" => Some(Ih),
            "C∞v" | "Cinfv" | "C*v" => Some(CInfV),
            "D∞h" | "Dinfh" | "D*h" => Some(DInfH),
            _ => None,
        };
        if let Some(group) = fixed {
            return Ok(group);
        }
        let bad = || format!("'{t}' is not a Schoenflies symbol");
        let mut chars = t.chars();
        let head = chars.next().ok_or_else(bad)?;
        let rest: String = chars.collect();
        let digits: String = rest.chars().take_while(|c| c.is_ascii_digit()).collect();
        let tail = &rest[digits.len()..];
        let n: u32 = digits.parse().map_err(|_| bad())?;
        if n == 0 {
            return Err(bad());
        }
        match (head, tail, n) {
            ('C', "", 1) => Ok(C1),
            ('C', "", n) => Ok(Cn(n)),
            ('C', "v", n) if n >= 2 => Ok(Cnv(n)),
            ('C', "h", 1) => Ok(Cs),
            ('C', "h", n) => Ok(Cnh(n)),
            ('D', "", n) if n >= 2 => Ok(Dn(n)),
            ('D', "h", n) if n >= 2 => Ok(Dnh(n)),
            ('D', "d", n) if n >= 2 => Ok(Dnd(n)),
            ('S', "", 2) => Ok(Ci),
            ('S', "", n) if n >= 4 && n % 2 == 0 => Ok(S(n)),
            _ => Err(bad()),
        }
    }
}

/// Rotation by `angle` (radians, right-handed) about the unit vector `axis`.
pub fn rotation(axis: &Vector3<f64>, angle: f64) -> Matrix3<f64> {
    let u = axis.normalize();
    let (s, c) = angle.sin_cos();
    let k = Matrix3::new(0.0, -u.z, u.y, u.z, 0.0, -u.x, -u.y, u.x, 0.0);
    Matrix3::identity() * c + k * s + u * u.transpose() * (1.0 - c)
}

/// Reflection in the plane through the origin with normal `normal`.
pub fn reflection(normal: &Vector3<f64>) -> Matrix3<f64> {
    let u = normal.normalize();
    Matrix3::identity() - u * u.transpose() * 2.0
}

/// Rotation–reflection S: rotation by `angle` about `axis` followed by reflection in the
/// plane perpendicular to it.
pub fn improper(axis: &Vector3<f64>, angle: f64) -> Matrix3<f64> {
    reflection(axis) * rotation(axis, angle)
}

/// Largest absolute element of a − b.
pub fn matrix_distance(a: &Matrix3<f64>, b: &Matrix3<f64>) -> f64 {
    (a - b).abs().max()
}

/// Index of `m` in `list` (elementwise within 1e-6).
pub fn find_matrix(list: &[Matrix3<f64>], m: &Matrix3<f64>) -> Option<usize> {
    list.iter().position(|x| matrix_distance(x, m) < 1e-6)
}

/// All products of the generators (bounded at `limit` elements).
pub fn closure(generators: &[Matrix3<f64>], limit: usize) -> Vec<Matrix3<f64>> {
    let mut group = vec![Matrix3::identity()];
    for g in generators {
        if find_matrix(&group, g).is_none() {
            group.push(*g);
        }
    }
    let mut changed = true;
    while changed && group.len() <= limit {
        changed = false;
        let current = group.len();
        for i in 0..current {
            for j in 0..current {
                let p = group[i] * group[j];
                if find_matrix(&group, &p).is_none() {
                    group.push(p);
                    changed = true;
                    if group.len() > limit {
                        return group;
                    }
                }
            }
        }
    }
    group
}

fn z() -> Vector3<f64> {
    Vector3::z()
}

fn rotations_z(n: u32) -> Vec<Matrix3<f64>> {
    (0..n)
        .map(|k| rotation(&z(), 2.0 * std::f64::consts::PI * k as f64 / n as f64))
        .collect()
}

fn times(ops: &[Matrix3<f64>], g: &Matrix3<f64>) -> Vec<Matrix3<f64>> {
    ops.iter().map(|x| g * x).collect()
}

fn golden() -> f64 {
    (1.0 + 5f64.sqrt()) / 2.0
}

/// Proper rotations of T in the standard frame.
fn group_t() -> Vec<Matrix3<f64>> {
    closure(
        &[
            rotation(&z(), std::f64::consts::PI),
            rotation(
                &Vector3::new(1.0, 1.0, 1.0),
                2.0 * std::f64::consts::PI / 3.0,
            ),
        ],
        12,
    )
}

fn group_o() -> Vec<Matrix3<f64>> {
    closure(
        &[
            rotation(&z(), std::f64::consts::FRAC_PI_2),
            rotation(
                &Vector3::new(1.0, 1.0, 1.0),
                2.0 * std::f64::consts::PI / 3.0,
            ),
        ],
        24,
    )
}

fn group_i() -> Vec<Matrix3<f64>> {
    closure(
        &[
            rotation(&z(), std::f64::consts::PI),
            rotation(
                &Vector3::new(1.0, 1.0, 1.0),
                2.0 * std::f64::consts::PI / 3.0,
            ),
            rotation(&icosahedral_c5_axis(), 2.0 * std::f64::consts::PI / 5.0),
        ],
        60,
    )
}

/// A C5 axis of the standard icosahedral frame, (0, 1, φ) normalized.
pub fn icosahedral_c5_axis() -> Vector3<f64> {
    Vector3::new(0.0, 1.0, golden()).normalize()
}

fn with_inversion(ops: Vec<Matrix3<f64>>) -> Vec<Matrix3<f64>> {
    let mut all = ops.clone();
    all.extend(ops.iter().map(|m| -m));
    all
}

/// The operations of `group` (its finite model for linear groups) in the standard frame,
/// identity first.
pub fn standard_operations(group: PointGroup) -> Vec<Matrix3<f64>> {
    use PointGroup::*;
    use std::f64::consts::PI;
    let sigma_h = reflection(&z());
    match group.finite_model() {
        C1 => vec![Matrix3::identity()],
        Cs => vec![Matrix3::identity(), sigma_h],
        Ci => vec![Matrix3::identity(), -Matrix3::identity()],
        Cn(n) => rotations_z(n),
        Cnv(n) => {
            let mut ops = rotations_z(n);
            for j in 0..n {
                let a = PI * j as f64 / n as f64;
                ops.push(reflection(&Vector3::new(-a.sin(), a.cos(), 0.0)));
            }
            ops
        }
        Cnh(n) => {
            let mut ops = rotations_z(n);
            let extra = times(&ops, &sigma_h);
            ops.extend(extra);
            ops
        }
        Dn(n) => dihedral(n),
        Dnh(n) => {
            let mut ops = dihedral(n);
            let extra = times(&ops, &sigma_h);
            ops.extend(extra);
            ops
        }
        Dnd(n) => {
            let mut ops = dihedral(n);
            let s = improper(&z(), PI / n as f64);
            let extra = times(&ops, &s);
            ops.extend(extra);
            ops
        }
        S(m) => (0..m)
            .map(|k| {
                let r = rotation(&z(), 2.0 * PI * k as f64 / m as f64);
                if k % 2 == 1 { sigma_h * r } else { r }
            })
            .collect(),
        T => group_t(),
        Th => with_inversion(group_t()),
        Td => {
            let t = group_t();
            let mut ops = t.clone();
            for g in group_o() {
                if find_matrix(&t, &g).is_none() {
                    ops.push(-g);
                }
            }
            ops
        }
        O => group_o(),
        Oh => with_inversion(group_o()),
        I => group_i(),
        Ih => with_inversion(group_i()),
        CInfV | DInfH => unreachable!("finite_model removes linear groups"),
    }
}

fn dihedral(n: u32) -> Vec<Matrix3<f64>> {
    use std::f64::consts::PI;
    let mut ops = rotations_z(n);
    for j in 0..n {
        let a = PI * j as f64 / n as f64;
        ops.push(rotation(&Vector3::new(a.cos(), a.sin(), 0.0), PI));
    }
    ops
}

/// Geometric description of an orthogonal matrix.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub enum OperationKind {
    Identity,
    Inversion,
    /// Proper rotation C_n^k.
    Rotation {
        n: u32,
        k: u32,
    },
    Reflection,
    /// Improper rotation S_n^k.
    Improper {
        n: u32,
        k: u32,
    },
}

impl std::fmt::Display for OperationKind {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            OperationKind::Identity => write!(f, "E"),
            OperationKind::Inversion => write!(f, "i"),
            OperationKind::Reflection => write!(f, "σ"),
            OperationKind::Rotation { n, k } if *k == 1 => write!(f, "C{n}"),
            OperationKind::Rotation { n, k } => write!(f, "C{n}^{k}"),
            OperationKind::Improper { n, k } if *k == 1 => write!(f, "S{n}"),
            OperationKind::Improper { n, k } => write!(f, "S{n}^{k}"),
        }
    }
}

/// Rotation angle in [0, π] of a proper orthogonal matrix.
pub fn rotation_angle(q: &Matrix3<f64>) -> f64 {
    ((q.trace() - 1.0) / 2.0).clamp(-1.0, 1.0).acos()
}

/// Unit axis of a proper rotation (arbitrary for the identity).
pub fn rotation_axis(q: &Matrix3<f64>) -> Vector3<f64> {
    let v = Vector3::new(
        q[(2, 1)] - q[(1, 2)],
        q[(0, 2)] - q[(2, 0)],
        q[(1, 0)] - q[(0, 1)],
    );
    if v.norm() > 1e-6 {
        return v.normalize();
    }
    // Angle 0 or π: the axis is a column of (Q + I) (for π), any for the identity.
    let b = q + Matrix3::identity();
    let mut best = Vector3::z();
    let mut best_norm = 0.0;
    for c in 0..3 {
        let col: Vector3<f64> = b.column(c).into();
        if col.norm() > best_norm {
            best_norm = col.norm();
            best = col;
        }
    }
    if best_norm < 1e-9 {
        Vector3::z()
    } else {
        best.normalize()
    }
}

/// Proper part Q (= R or −R), axis, and whether R is improper.
pub fn decompose(r: &Matrix3<f64>) -> (Matrix3<f64>, Vector3<f64>, bool) {
    let improper = r.determinant() < 0.0;
    let q = if improper { -r } else { *r };
    (q, rotation_axis(&q), improper)
}

/// Smallest n ≤ 120 and k with angle ≈ 2πk/n.
fn rational_angle(angle: f64) -> (u32, u32) {
    let turn = angle / (2.0 * std::f64::consts::PI);
    for n in 1..=120u32 {
        let k = (turn * n as f64).round();
        if (turn * n as f64 - k).abs() < 1e-5 {
            return (n, k as u32);
        }
    }
    (0, 0)
}

/// Classifies a matrix as E, i, C_n^k, σ or S_n^k.
pub fn classify(r: &Matrix3<f64>) -> OperationKind {
    let (q, _, improper_op) = decompose(r);
    let angle = rotation_angle(&q);
    if !improper_op {
        if angle < 1e-6 {
            return OperationKind::Identity;
        }
        let (n, k) = rational_angle(angle);
        return OperationKind::Rotation { n, k };
    }
    // R = −Q; as S(φ) = σ·C(φ) about the same axis, −Q has φ = ψ + π.
    let phi = std::f64::consts::PI - angle;
    if phi < 1e-6 {
        return OperationKind::Reflection;
    }
    if (phi - std::f64::consts::PI).abs() < 1e-6 {
        return OperationKind::Inversion;
    }
    let (n, k) = rational_angle(phi);
    OperationKind::Improper { n, k }
}
