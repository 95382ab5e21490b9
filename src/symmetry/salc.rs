//! Representation matrices of real s, p and d functions under point-group operations,
//! reduction of representations, and symmetry-adapted linear combinations (SALCs) by the
//! projection operator P^Γ = (d_Γ / h) Σ_R χ^Γ(R) O_R (Cotton, *Chemical Applications of
//! Group Theory*, 3rd ed., §6.2 and §8.3), orthonormalized within each irrep by Gram–Schmidt.
//!
//! Convention: O_R f(r) = f(R⁻¹ r). For p functions the matrix is R itself; for the real d
//! functions (dxy, dyz, dz², dxz, dx²−y², as in `chem::ao`) each function is the quadratic
//! form rᵀQr with Q traceless symmetric, O_R maps Q to R Q Rᵀ, and the matrix elements are
//! Frobenius projections onto the basis forms (all of squared norm ½).

use nalgebra::{DMatrix, DVector, Matrix3};

use super::tables::IrrepLabel;
use super::{Symmetry, SymmetryError, SymmetryOperation};
use crate::chem::ao::{AngularKind, AtomicOrbital};

fn d_forms() -> [Matrix3<f64>; 5] {
    let h = 0.5;
    let c = 1.0 / (2.0 * 3f64.sqrt());
    [
        Matrix3::new(0.0, h, 0.0, h, 0.0, 0.0, 0.0, 0.0, 0.0),
        Matrix3::new(0.0, 0.0, 0.0, 0.0, 0.0, h, 0.0, h, 0.0),
        Matrix3::new(-c, 0.0, 0.0, 0.0, -c, 0.0, 0.0, 0.0, 2.0 * c),
        Matrix3::new(0.0, 0.0, h, 0.0, 0.0, 0.0, h, 0.0, 0.0),
        Matrix3::new(h, 0.0, 0.0, 0.0, -h, 0.0, 0.0, 0.0, 0.0),
    ]
}

/// The representation matrix of the real functions of angular momentum `l` (0, 1, 2) under
/// the orthogonal matrix `r`, in the order of `AngularKind::shell(l)`: column j holds the
/// expansion of O_R φ_j.
pub fn shell_matrix(l: u8, r: &Matrix3<f64>) -> DMatrix<f64> {
    match l {
        0 => DMatrix::from_element(1, 1, 1.0),
        1 => DMatrix::from_fn(3, 3, |i, j| r[(i, j)]),
        _ => {
            let forms = d_forms();
            let images: Vec<Matrix3<f64>> = forms.iter().map(|q| r * q * r.transpose()).collect();
            DMatrix::from_fn(5, 5, |k, j| 2.0 * forms[k].component_mul(&images[j]).sum())
        }
    }
}

fn kind_index(kind: AngularKind) -> usize {
    use AngularKind::*;
    match kind {
        S | Px | Dxy => 0,
        Py | Dyz => 1,
        Pz | Dz2 => 2,
        Dxz => 3,
        Dx2y2 => 4,
    }
}

/// Sparse action of one operation on a basis: column j of Γ(R) as (row, value) pairs.
#[derive(Clone, Debug)]
pub struct AoAction {
    pub columns: Vec<Vec<(usize, f64)>>,
}

impl AoAction {
    /// Γ(R) · v.
    pub fn apply(&self, v: &[f64], out: &mut [f64]) {
        out.iter_mut().for_each(|x| *x = 0.0);
        for (j, col) in self.columns.iter().enumerate() {
            let vj = v[j];
            if vj == 0.0 {
                continue;
            }
            for &(i, c) in col {
                out[i] += c * vj;
            }
        }
    }

    /// trace Γ(R).
    pub fn trace(&self) -> f64 {
        self.columns
            .iter()
            .enumerate()
            .map(|(j, col)| {
                col.iter()
                    .filter(|(i, _)| *i == j)
                    .map(|(_, c)| c)
                    .sum::<f64>()
            })
            .sum()
    }
}

/// The basis grouped into shells (atom, n, l) with the position of each real function.
struct ShellIndex {
    /// (atom, n, l, basis index of each function of the shell in `AngularKind::shell` order).
    shells: Vec<(usize, u8, u8, [Option<usize>; 5])>,
    lookup: std::collections::HashMap<(usize, u8, u8), usize>,
}

fn basis_index(basis: &[AtomicOrbital]) -> ShellIndex {
    let mut index = ShellIndex {
        shells: Vec::new(),
        lookup: std::collections::HashMap::new(),
    };
    for (i, ao) in basis.iter().enumerate() {
        let l = ao.kind.l();
        let key = (ao.atom, ao.n, l);
        let s = *index.lookup.entry(key).or_insert_with(|| {
            index.shells.push((ao.atom, ao.n, l, [None; 5]));
            index.shells.len() - 1
        });
        index.shells[s].3[kind_index(ao.kind)] = Some(i);
    }
    index
}

fn action_with_index(
    operation: &SymmetryOperation,
    basis: &[AtomicOrbital],
    index: &ShellIndex,
) -> Result<AoAction, SymmetryError> {
    let mats: Vec<DMatrix<f64>> = (0..3).map(|l| shell_matrix(l, &operation.matrix)).collect();
    let mut columns = vec![Vec::new(); basis.len()];
    for &(atom, n, l, members) in &index.shells {
        let Some(&target_atom) = operation.permutation.get(atom) else {
            return Err(SymmetryError::BasisNotClosed(format!(
                "atom {atom} of a basis function is not in the molecule"
            )));
        };
        let target = index
            .lookup
            .get(&(target_atom, n, l))
            .map(|&t| index.shells[t].3);
        let m = &mats[l as usize];
        for (j, source) in members.iter().enumerate() {
            let Some(source) = *source else { continue };
            let mut col = Vec::new();
            for (k, kind) in AngularKind::shell(l).iter().enumerate() {
                let c = m[(k, j)];
                if c.abs() < 1e-10 {
                    continue;
                }
                match target.and_then(|t| t[k]) {
                    Some(i) => col.push((i, c)),
                    None if c.abs() < 1e-6 => {}
                    None => {
                        return Err(SymmetryError::BasisNotClosed(format!(
                            "the image of {} on atom {atom} needs {n}{} on atom {target_atom}",
                            basis[source].label(),
                            kind.label(),
                        )));
                    }
                }
            }
            columns[source] = col;
        }
    }
    Ok(AoAction { columns })
}

/// The action of `operation` on `basis`; an error if some image lies outside the basis.
pub fn ao_action(
    operation: &SymmetryOperation,
    basis: &[AtomicOrbital],
) -> Result<AoAction, SymmetryError> {
    action_with_index(operation, basis, &basis_index(basis))
}

/// The actions of every operation of `symmetry` on `basis`, in operation order.
pub fn ao_actions(
    symmetry: &Symmetry,
    basis: &[AtomicOrbital],
) -> Result<Vec<AoAction>, SymmetryError> {
    let index = basis_index(basis);
    symmetry
        .operations
        .iter()
        .map(|op| action_with_index(op, basis, &index))
        .collect()
}

/// The full representation matrix Γ(R) of `operation` on `basis` (column j = image of
/// basis function j).
pub fn ao_representation(
    operation: &SymmetryOperation,
    basis: &[AtomicOrbital],
) -> Result<DMatrix<f64>, SymmetryError> {
    let action = ao_action(operation, basis)?;
    let n = basis.len();
    let mut m = DMatrix::zeros(n, n);
    for (j, col) in action.columns.iter().enumerate() {
        for &(i, c) in col {
            m[(i, j)] += c;
        }
    }
    Ok(m)
}

/// Multiplicity of each irrep (index into `symmetry.table.irreps`) in a representation
/// whose character under `symmetry.operations[k]` is `characters[k]`. Errors if any
/// multiplicity is not a whole number within 0.05.
pub fn reduce(symmetry: &Symmetry, characters: &[f64]) -> Result<Vec<usize>, SymmetryError> {
    if characters.len() != symmetry.operations.len() {
        return Err(SymmetryError::DimensionMismatch(format!(
            "{} characters for {} operations",
            characters.len(),
            symmetry.operations.len()
        )));
    }
    let raw = reduce_by_class(symmetry, characters);
    let mut out = Vec::with_capacity(raw.len());
    for (k, x) in raw.iter().enumerate() {
        if (x - x.round()).abs() > 0.05 || *x < -0.05 {
            let text: Vec<String> = raw
                .iter()
                .zip(&symmetry.table.irreps)
                .map(|(v, ir)| format!("{} {:.3}", ir.label.upper(), v))
                .collect();
            let _ = k;
            return Err(SymmetryError::NonIntegerReduction(text.join(", ")));
        }
        out.push(x.round().max(0.0) as usize);
    }
    Ok(out)
}

/// Unrounded multiplicities.
pub(crate) fn reduce_by_class(symmetry: &Symmetry, characters: &[f64]) -> Vec<f64> {
    let h = symmetry.operations.len() as f64;
    symmetry
        .table
        .irreps
        .iter()
        .map(|ir| {
            let s: f64 = symmetry
                .operations
                .iter()
                .zip(characters)
                .map(|(op, c)| ir.characters[op.class] * c)
                .sum();
            s / (h * ir.reality as f64)
        })
        .collect()
}

/// The irreps spanned by a set of orbitals: multiplicity per irrep.
pub fn span(symmetry: &Symmetry, basis: &[AtomicOrbital]) -> Result<Vec<usize>, SymmetryError> {
    let chars: Vec<f64> = ao_actions(symmetry, basis)?
        .iter()
        .map(AoAction::trace)
        .collect();
    reduce(symmetry, &chars)
}

/// Text such as "a1 + e" or "a1g + eg + t1u" (lower case, multiplicities as "2a1").
pub fn span_text(symmetry: &Symmetry, multiplicities: &[usize]) -> String {
    let parts: Vec<String> = multiplicities
        .iter()
        .zip(&symmetry.table.irreps)
        .filter(|(m, _)| **m > 0)
        .map(|(m, ir)| {
            if *m == 1 {
                ir.label.to_string()
            } else {
                format!("{m}{}", ir.label)
            }
        })
        .collect();
    if parts.is_empty() {
        "0".to_string()
    } else {
        parts.join(" + ")
    }
}

/// One symmetry-adapted linear combination.
#[derive(Clone, Debug, PartialEq)]
pub struct Salc {
    /// Index into `symmetry.table.irreps`.
    pub irrep: usize,
    pub label: IrrepLabel,
    /// Coefficients over the chosen basis (orthonormal in the plain metric).
    pub coefficients: DVector<f64>,
}

/// SALCs of `basis` for every irrep: the projections of each basis function, orthonormalized
/// within each irrep (Gram–Schmidt in basis order). Their number per irrep equals the
/// multiplicity times the dimension.
pub fn salcs(symmetry: &Symmetry, basis: &[AtomicOrbital]) -> Result<Vec<Salc>, SymmetryError> {
    let n = basis.len();
    let actions = ao_actions(symmetry, basis)?;
    let h = symmetry.operations.len() as f64;
    let mut out = Vec::new();
    let mut tmp = vec![0.0; n];
    for (k, ir) in symmetry.table.irreps.iter().enumerate() {
        let factor = ir.dimension as f64 / (h * ir.reality as f64);
        let mut kept: Vec<DVector<f64>> = Vec::new();
        for j in 0..n {
            let mut e = vec![0.0; n];
            e[j] = 1.0;
            let mut v = DVector::zeros(n);
            for (op, act) in symmetry.operations.iter().zip(&actions) {
                let chi = ir.characters[op.class];
                if chi == 0.0 {
                    continue;
                }
                act.apply(&e, &mut tmp);
                for i in 0..n {
                    v[i] += factor * chi * tmp[i];
                }
            }
            for q in &kept {
                let d = q.dot(&v);
                v -= q * d;
            }
            let norm = v.norm();
            if norm > 1e-6 {
                kept.push(v / norm);
            }
        }
        for coefficients in kept {
            out.push(Salc {
                irrep: k,
                label: ir.label.clone(),
                coefficients,
            });
        }
    }
    Ok(out)
}

/// The group average (1/h) Σ_R Γ(R) A Γ(R)ᵀ of a matrix over `basis`: the nearest
/// matrix that commutes with every operation (used to build invariant test Hamiltonians
/// and to clean matrices computed from a geometry that is symmetric only within tolerance).
pub fn average_over_group(
    symmetry: &Symmetry,
    basis: &[AtomicOrbital],
    matrix: &DMatrix<f64>,
) -> Result<DMatrix<f64>, SymmetryError> {
    let n = basis.len();
    if matrix.nrows() != n || matrix.ncols() != n {
        return Err(SymmetryError::DimensionMismatch(format!(
            "a {}×{} matrix for {n} basis functions",
            matrix.nrows(),
            matrix.ncols()
        )));
    }
    let mut sum = DMatrix::zeros(n, n);
    for op in &symmetry.operations {
        let g = ao_representation(op, basis)?;
        sum += &g * matrix * g.transpose();
    }
    Ok(sum / symmetry.operations.len().max(1) as f64)
}
