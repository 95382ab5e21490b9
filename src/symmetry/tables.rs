//! Character tables in real form with Mulliken labels.
//!
//! Axial groups (Cn, Cnv, Cnh, Dn, Dnh, Dnd, S2n and the finite models C8v/D8h of the
//! linear groups) are generated: every operation of an axial group in its standard frame
//! keeps the z axis, so it acts on the functions cos mφ, sin mφ (times 1 or z) as an element
//! of O(2)×Z2, and the irreducible characters are the distinct, mutually orthogonal ones
//! among those functions' characters (complex-conjugate pairs of the cyclic groups stay
//! combined as one real two-dimensional E irrep). The cubic and icosahedral groups are
//! tabulated as functions of the rotation angle (with the signed-permutation rule for O's
//! A2, and Td ≅ O through R ↦ det(R)·R). Labels follow Mulliken's rules as applied in Cotton,
//! *Chemical Applications of Group Theory*, 3rd ed., ch. 4 and appendix IIA: A/B by the
//! principal rotation (S2n where the group has no inversion), subscripts 1/2 by C2′ (or σv),
//! g/u by i, ′/″ by σh, E indices by the character of the principal rotation. Classes are
//! the sets of operations with equal real characters (a class merged with its inverse class
//! where complex characters would separate them).

use std::collections::HashMap;
use std::sync::{Arc, Mutex, OnceLock};

use nalgebra::{Matrix3, Vector3};
use serde::{Deserialize, Serialize};

use super::axial::{axial_characters, axial_labels};
use super::ops::{
    OperationKind, PointGroup, classify, closure, decompose, find_matrix, reflection, rotation,
    rotation_angle, standard_operations,
};

/// Sign of a Σ irrep of a linear group.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum LinearSign {
    Plus,
    Minus,
}

/// A Mulliken label split so that a renderer can set subscripts and primes.
#[derive(Clone, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct IrrepLabel {
    /// Lower-case letter: "a", "b", "e", "t", "g", "h", or "σ", "π", "δ", "φ".
    pub letter: String,
    /// Subscript: "1g", "2u", "g", "1", "" …
    pub subscript: String,
    /// Number of primes (0, 1 or 2).
    pub primes: u8,
    /// Σ+ / Σ− of the linear groups.
    pub sign: Option<LinearSign>,
}

impl IrrepLabel {
    pub(super) fn new(letter: &str, subscript: &str, primes: u8) -> IrrepLabel {
        IrrepLabel {
            letter: letter.to_string(),
            subscript: subscript.to_string(),
            primes,
            sign: None,
        }
    }

    fn tail(&self) -> String {
        let mut text = self.subscript.clone();
        text.push_str(&"'".repeat(self.primes as usize));
        match self.sign {
            Some(LinearSign::Plus) => text.push('+'),
            Some(LinearSign::Minus) => text.push('-'),
            None => {}
        }
        text
    }

    /// Upper-case irrep symbol: "A1g", "E'", "T2", "Σg+", "Πu".
    pub fn upper(&self) -> String {
        let letter: String = match self.letter.as_str() {
            "σ" => "Σ".into(),
            "π" => "Π".into(),
            "δ" => "Δ".into(),
            "φ" => "Φ".into(),
            other => other.to_uppercase(),
        };
        format!("{letter}{}", self.tail())
    }
}

impl std::fmt::Display for IrrepLabel {
    /// Lower-case plain text: "a1g", "e'", "σg+".
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}{}", self.letter, self.tail())
    }
}

/// A class of operations (real form: a class and its inverse class together).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct ClassInfo {
    /// "E", "2C3", "3σv", "i", "2S6" …
    pub name: String,
    pub size: usize,
}

/// One real irreducible representation.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Irrep {
    pub label: IrrepLabel,
    /// Real dimension (2 for the real E of a complex-conjugate pair).
    pub dimension: usize,
    /// ⟨χ, χ⟩ / h: 1 for an absolutely irreducible representation, 2 for a
    /// complex-conjugate pair combined into one real irrep.
    pub reality: u8,
    /// Character per class.
    pub characters: Vec<f64>,
}

/// A character table together with the group's operations in the standard frame.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct CharacterTable {
    pub group: PointGroup,
    pub order: usize,
    pub classes: Vec<ClassInfo>,
    pub irreps: Vec<Irrep>,
    /// Operations in the standard frame (principal axis z, C2′ along x, σv ∋ x).
    pub standard_operations: Vec<Matrix3<f64>>,
    /// Class index of each standard operation.
    pub operation_class: Vec<usize>,
    /// Indices of standard operations that generate the group.
    pub generators: Vec<usize>,
}

impl CharacterTable {
    /// Class of a standard-frame matrix, if it belongs to the group.
    pub fn class_of(&self, matrix: &Matrix3<f64>) -> Option<usize> {
        find_matrix(&self.standard_operations, matrix).map(|i| self.operation_class[i])
    }

    /// Index of the irrep whose upper-case symbol is `symbol` ("A1", "E'", "T2g").
    pub fn irrep_index(&self, symbol: &str) -> Option<usize> {
        self.irreps.iter().position(|ir| ir.label.upper() == symbol)
    }

    /// Character of irrep `irrep` for standard operation `op`.
    pub fn character(&self, irrep: usize, op: usize) -> f64 {
        self.irreps[irrep].characters[self.operation_class[op]]
    }

    /// Multiplicities of the irreps in a representation with characters `chi` per
    /// operation (standard-operation order). Not rounded.
    pub fn reduce_raw(&self, chi: &[f64]) -> Vec<f64> {
        let h = self.order as f64;
        self.irreps
            .iter()
            .map(|ir| {
                let s: f64 = chi
                    .iter()
                    .enumerate()
                    .map(|(op, c)| ir.characters[self.operation_class[op]] * c)
                    .sum();
                s / (h * ir.reality as f64)
            })
            .collect()
    }
}

fn near(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-6
}

/// Signed-permutation product: the character of O's A2 (x y z ↦ ± x y z).
fn a2_octahedral(q: &Matrix3<f64>) -> f64 {
    let mut p = 1.0;
    for v in q.iter() {
        if v.abs() > 0.5 {
            p *= v.signum();
        }
    }
    p
}

fn cubic_characters(group: PointGroup, ops: &[Matrix3<f64>]) -> Vec<(IrrepLabel, Vec<f64>, u8)> {
    use std::f64::consts::PI;
    let sqrt5 = 5f64.sqrt();
    // (label, function of proper part, reality).
    type F = fn(&Matrix3<f64>, f64) -> f64;
    let t1: F = |_, th| 1.0 + 2.0 * th.cos();
    let list: Vec<(&str, F, u8)> = match group {
        PointGroup::T | PointGroup::Th => vec![
            ("A", |_, _| 1.0, 1),
            (
                "E",
                |_, th| {
                    if near(th, 2.0 * PI / 3.0) { -1.0 } else { 2.0 }
                },
                2,
            ),
            ("T", t1, 1),
        ],
        PointGroup::O | PointGroup::Oh | PointGroup::Td => vec![
            ("A1", |_, _| 1.0, 1),
            ("A2", |q, _| a2_octahedral(q), 1),
            (
                "E",
                |q, th| {
                    if near(th, 0.0) {
                        2.0
                    } else if near(th, 2.0 * PI / 3.0) {
                        -1.0
                    } else if near(th, PI / 2.0) {
                        0.0
                    } else {
                        1.0 + a2_octahedral(q)
                    }
                },
                1,
            ),
            ("T1", t1, 1),
            ("T2", |q, th| a2_octahedral(q) * (1.0 + 2.0 * th.cos()), 1),
        ],
        _ => vec![
            ("A", |_, _| 1.0, 1),
            ("T1", t1, 1),
            (
                "T2",
                |_, th| {
                    let s5 = 5f64.sqrt();
                    if near(th, 0.0) {
                        3.0
                    } else if near(th, 2.0 * PI / 5.0) {
                        (1.0 - s5) / 2.0
                    } else if near(th, 4.0 * PI / 5.0) {
                        (1.0 + s5) / 2.0
                    } else if near(th, 2.0 * PI / 3.0) {
                        0.0
                    } else {
                        -1.0
                    }
                },
                1,
            ),
            (
                "G",
                |_, th| {
                    if near(th, 0.0) {
                        4.0
                    } else if near(th, 2.0 * PI / 3.0) {
                        1.0
                    } else if near(th, PI) {
                        0.0
                    } else {
                        -1.0
                    }
                },
                1,
            ),
            (
                "H",
                |_, th| {
                    if near(th, 0.0) {
                        5.0
                    } else if near(th, 2.0 * PI / 3.0) {
                        -1.0
                    } else if near(th, PI) {
                        1.0
                    } else {
                        0.0
                    }
                },
                1,
            ),
        ],
    };
    let _ = sqrt5;
    let parity = matches!(group, PointGroup::Th | PointGroup::Oh | PointGroup::Ih);
    let mut out = Vec::new();
    for u in 0..(if parity { 2 } else { 1 }) {
        for (name, f, reality) in &list {
            let chi: Vec<f64> = ops
                .iter()
                .map(|r| {
                    let d = r.determinant().signum();
                    let q = r * d;
                    let th = rotation_angle(&q);
                    let base = f(&q, th);
                    if u == 1 { base * d } else { base }
                })
                .collect();
            let letter = name[..1].to_lowercase();
            let mut sub = name[1..].to_string();
            if parity {
                sub.push(if u == 0 { 'g' } else { 'u' });
            }
            out.push((IrrepLabel::new(&letter, &sub, 0), chi, *reality));
        }
    }
    out
}

fn label_sort_key(label: &IrrepLabel) -> (u8, u8, String) {
    let parity = if label.subscript.ends_with('u') || label.primes == 2 {
        1
    } else {
        0
    };
    let letter = match label.letter.as_str() {
        "a" | "σ" => 0,
        "b" => 1,
        "e" | "π" => 2,
        "δ" => 3,
        "φ" => 4,
        "t" => 5,
        "g" => 6,
        _ => 7,
    };
    (parity, letter, label.subscript.clone())
}

/// Name of a class from a representative standard-frame operation.
fn class_name(group: PointGroup, members: &[Matrix3<f64>]) -> String {
    let r = &members[0];
    let size = members.len();
    let kind = classify(r);
    let (_, axis, _) = decompose(r);
    let on_z = axis.z.abs() > 1.0 - 1e-6;
    let axial = !matches!(
        group,
        PointGroup::T
            | PointGroup::Td
            | PointGroup::Th
            | PointGroup::O
            | PointGroup::Oh
            | PointGroup::I
            | PointGroup::Ih
    );
    let contains = |m: &Matrix3<f64>| find_matrix(members, m).is_some();
    let base = match kind {
        OperationKind::Identity => "E".to_string(),
        OperationKind::Inversion => "i".to_string(),
        OperationKind::Reflection => {
            if axial {
                if on_z {
                    "σh".to_string()
                } else if contains(&reflection(&Vector3::y())) {
                    "σv".to_string()
                } else if matches!(group, PointGroup::Cnv(_) | PointGroup::Dnh(_)) {
                    if matches!(group, PointGroup::Cnv(2) | PointGroup::Dnh(2)) {
                        "σv'".to_string()
                    } else {
                        "σd".to_string()
                    }
                } else {
                    "σd".to_string()
                }
            } else if matches!(group, PointGroup::Ih) {
                "σ".to_string()
            } else if axis.iter().filter(|v| v.abs() > 1e-6).count() == 1 {
                "σh".to_string()
            } else {
                "σd".to_string()
            }
        }
        OperationKind::Rotation { n, k } => {
            let mut s = if k == 1 {
                format!("C{n}")
            } else {
                format!("C{n}^{k}")
            };
            if axial && !on_z && n == 2 {
                if contains(&rotation(&Vector3::x(), std::f64::consts::PI)) {
                    s.push('\'');
                } else {
                    s.push_str("''");
                }
            }
            s
        }
        OperationKind::Improper { n, k } => {
            if k == 1 {
                format!("S{n}")
            } else {
                format!("S{n}^{k}")
            }
        }
    };
    if size > 1 {
        format!("{size}{base}")
    } else {
        base
    }
}

fn build_table(group: PointGroup) -> CharacterTable {
    let finite = group.finite_model();
    let ops = standard_operations(finite);
    let h = ops.len();
    let cubic = matches!(
        finite,
        PointGroup::T
            | PointGroup::Td
            | PointGroup::Th
            | PointGroup::O
            | PointGroup::Oh
            | PointGroup::I
            | PointGroup::Ih
    );
    let per_op: Vec<(IrrepLabel, Vec<f64>, u8)> = if cubic {
        cubic_characters(finite, &ops)
    } else {
        let chars = axial_characters(&ops);
        let mut labels = axial_labels(finite, &ops, &chars);
        if group.is_linear() {
            let sigma_v = find_matrix(&ops, &reflection(&Vector3::y()));
            for (label, (chi, _)) in labels.iter_mut().zip(&chars) {
                let g = label
                    .subscript
                    .chars()
                    .filter(|c| *c == 'g' || *c == 'u')
                    .collect::<String>();
                if label.letter == "a" {
                    let plus = sigma_v.is_some_and(|i| chi[i] > 0.0);
                    *label = IrrepLabel {
                        letter: "σ".into(),
                        subscript: g,
                        primes: 0,
                        sign: Some(if plus {
                            LinearSign::Plus
                        } else {
                            LinearSign::Minus
                        }),
                    };
                } else if label.letter == "e" {
                    let k: u32 = label
                        .subscript
                        .chars()
                        .filter(|c| c.is_ascii_digit())
                        .collect::<String>()
                        .parse()
                        .unwrap_or(1);
                    let letter = match k {
                        1 => "π",
                        2 => "δ",
                        3 => "φ",
                        _ => "e",
                    };
                    *label = IrrepLabel::new(letter, &g, 0);
                    if letter == "e" {
                        label.subscript = format!("{k}{g}");
                    }
                }
            }
        }
        labels
            .into_iter()
            .zip(chars)
            .map(|(l, (chi, re))| (l, chi, re))
            .collect()
    };
    // Classes: operations with identical character vectors.
    let mut operation_class = vec![usize::MAX; h];
    let mut reps: Vec<usize> = Vec::new();
    for op in 0..h {
        let same = reps.iter().position(|&r| {
            per_op
                .iter()
                .all(|(_, chi, _)| (chi[r] - chi[op]).abs() < 1e-6)
        });
        match same {
            Some(c) => operation_class[op] = c,
            None => {
                operation_class[op] = reps.len();
                reps.push(op);
            }
        }
    }
    let classes: Vec<ClassInfo> = (0..reps.len())
        .map(|c| {
            let members: Vec<Matrix3<f64>> = (0..h)
                .filter(|&op| operation_class[op] == c)
                .map(|op| ops[op])
                .collect();
            ClassInfo {
                name: class_name(finite, &members),
                size: members.len(),
            }
        })
        .collect();
    let mut irreps: Vec<Irrep> = per_op
        .into_iter()
        .map(|(label, chi, reality)| Irrep {
            dimension: chi[0].round() as usize,
            characters: reps.iter().map(|&r| chi[r]).collect(),
            label,
            reality,
        })
        .collect();
    if !cubic {
        irreps.sort_by_key(|ir| label_sort_key(&ir.label));
    }
    let mut generators = Vec::new();
    let mut generated = vec![Matrix3::identity()];
    for (k, op) in ops.iter().enumerate() {
        if find_matrix(&generated, op).is_none() {
            generators.push(k);
            let mats: Vec<Matrix3<f64>> = generators.iter().map(|&g| ops[g]).collect();
            generated = closure(&mats, h);
        }
    }
    CharacterTable {
        generators,
        group,
        order: h,
        classes,
        irreps,
        standard_operations: ops,
        operation_class,
    }
}

/// The character table of `group` (cached; linear groups through C8v / D8h).
pub fn character_table(group: PointGroup) -> Arc<CharacterTable> {
    static CACHE: OnceLock<Mutex<HashMap<PointGroup, Arc<CharacterTable>>>> = OnceLock::new();
    let cache = CACHE.get_or_init(|| Mutex::new(HashMap::new()));
    if let Ok(map) = cache.lock()
        && let Some(table) = map.get(&group)
    {
        return table.clone();
    }
    let table = Arc::new(build_table(group));
    if let Ok(mut map) = cache.lock() {
        map.insert(group, table.clone());
    }
    table
}
