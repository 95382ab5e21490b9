//! Point-group detection by the standard route: translate to the centre of mass, group the
//! atoms into candidate symmetry-equivalent sets (same element, same distance from the centre
//! within the tolerance), propose axes from the inertia tensor and from the atoms (atom
//! directions, midpoints and normals of pairs, normals of isosceles triples from the
//! smallest set), test each axis for its highest rotation order, test mirror planes, the
//! inversion centre and S2n axes, and classify the elements found with the usual flow chart
//! (Cotton, *Chemical Applications of Group Theory*, 3rd ed., §3.14). The group's ideal
//! operations are then placed in a standard frame fitted to the molecule (refined by a
//! Kabsch fit of the averaged geometry, Kabsch 1976) and each is matched to an atom
//! permutation. Every search is bounded by the number of atoms.

use nalgebra::{Matrix3, SymmetricEigen, Vector3};

use super::frame::{
    any_perpendicular, axial_elements, classify_elements, orthonormal_frame,
    polyhedral_alternatives, subgroup_chain, x_from_atoms,
};
use super::ops::{PointGroup, classify, reflection, rotation};
use super::tables::character_table;
use super::{MAX_TOLERANCE, Symmetry, SymmetryError, SymmetryOperation, SymmetrySettings};
use crate::chem::Molecule;
use crate::chem::molecule::MAX_ATOMS;

/// Atoms prepared for operation tests.
pub(super) struct Prepared {
    pub(super) pos: Vec<Vector3<f64>>,
    pub(super) mass: Vec<f64>,
    pub(super) set_of: Vec<usize>,
    pub(super) sets: Vec<Vec<usize>>,
    pub(super) tol: f64,
    /// Directions closer than this angle (radians) count as one axis: the angle through
    /// which the outermost atom moves by twice the tolerance (at least 0.02, at most 0.3).
    pub(super) angle: f64,
}

impl Prepared {
    /// The atom permutation of `r` if every atom maps within `tol` of a partner.
    pub(super) fn matches(&self, r: &Matrix3<f64>, tol: f64) -> Option<Vec<usize>> {
        let n = self.pos.len();
        let mut perm = vec![usize::MAX; n];
        let mut used = vec![false; n];
        let tol2 = tol * tol;
        for (i, slot) in perm.iter_mut().enumerate() {
            let y = r * self.pos[i];
            let mut best = None;
            let mut best_d = tol2;
            for &j in &self.sets[self.set_of[i]] {
                if used[j] {
                    continue;
                }
                let d = (y - self.pos[j]).norm_squared();
                if d < best_d {
                    best_d = d;
                    best = Some(j);
                }
            }
            let j = best?;
            used[j] = true;
            *slot = j;
        }
        Some(perm)
    }

    pub(super) fn is_symmetry(&self, r: &Matrix3<f64>) -> bool {
        self.matches(r, self.tol).is_some()
    }

    /// Number of atoms within `tol` of the line through the origin along `axis`.
    pub(super) fn atoms_on_axis(&self, axis: &Vector3<f64>) -> usize {
        self.pos
            .iter()
            .filter(|p| p.cross(axis).norm() < self.tol)
            .count()
    }

    pub(super) fn mass_on_axis(&self, axis: &Vector3<f64>) -> f64 {
        self.pos
            .iter()
            .zip(&self.mass)
            .filter(|(p, _)| p.cross(axis).norm() < self.tol)
            .map(|(_, m)| m)
            .sum()
    }

    pub(super) fn atoms_in_plane(&self, normal: &Vector3<f64>) -> (usize, f64) {
        let mut count = 0;
        let mut mass = 0.0;
        for (p, m) in self.pos.iter().zip(&self.mass) {
            if p.dot(normal).abs() < self.tol {
                count += 1;
                mass += m;
            }
        }
        (count, mass)
    }
}

fn gcd(a: usize, b: usize) -> usize {
    if b == 0 { a } else { gcd(b, a % b) }
}

/// Two directions closer than `angle` (radians) are the same axis.
pub(super) fn parallel(a: &Vector3<f64>, b: &Vector3<f64>, angle: f64) -> bool {
    a.cross(b).norm() < angle
}

pub(super) fn perpendicular(a: &Vector3<f64>, b: &Vector3<f64>, angle: f64) -> bool {
    a.dot(b).abs() < angle
}

/// Found elements.
pub(super) struct Elements {
    /// Proper axes with their highest order.
    pub(super) axes: Vec<(Vector3<f64>, u32)>,
    pub(super) mirrors: Vec<Vector3<f64>>,
    pub(super) inversion: bool,
}

fn validate(molecule: &Molecule, settings: &SymmetrySettings) -> Result<(), SymmetryError> {
    let tol = settings.tolerance;
    if !(tol.is_finite() && tol > 0.0 && tol <= MAX_TOLERANCE) {
        return Err(SymmetryError::InvalidTolerance(tol));
    }
    let n = molecule.atoms.len();
    if n == 0 {
        return Err(SymmetryError::NoAtoms);
    }
    if n > MAX_ATOMS {
        return Err(SymmetryError::TooManyAtoms(n));
    }
    for (i, atom) in molecule.atoms.iter().enumerate() {
        if atom.position.iter().any(|x| !x.is_finite()) {
            return Err(SymmetryError::NonFiniteCoordinate(i));
        }
    }
    if n == 1 {
        return Err(SymmetryError::SingleAtom);
    }
    Ok(())
}

fn prepare(molecule: &Molecule, origin: &Vector3<f64>, tol: f64) -> Prepared {
    let pos: Vec<Vector3<f64>> = molecule.atoms.iter().map(|a| a.position - origin).collect();
    let mass: Vec<f64> = molecule.atoms.iter().map(|a| a.element.mass()).collect();
    let n = pos.len();
    let mut order: Vec<usize> = (0..n).collect();
    let key = |i: usize| (molecule.atoms[i].element.atomic_number(), pos[i].norm());
    order.sort_by(|&a, &b| {
        let (ea, ra) = key(a);
        let (eb, rb) = key(b);
        ea.cmp(&eb).then(ra.total_cmp(&rb))
    });
    let mut sets: Vec<Vec<usize>> = Vec::new();
    let mut set_of = vec![0; n];
    let mut last: Option<(u8, f64)> = None;
    for &i in &order {
        let (e, r) = key(i);
        let new_set = match last {
            Some((le, lr)) => le != e || r - lr > tol,
            None => true,
        };
        if new_set {
            sets.push(Vec::new());
        }
        let s = sets.len() - 1;
        sets[s].push(i);
        set_of[i] = s;
        last = Some((e, r));
    }
    let r_max = pos.iter().map(|x| x.norm()).fold(0.0, f64::max).max(1e-9);
    Prepared {
        pos,
        mass,
        set_of,
        sets,
        tol,
        angle: (2.0 * tol / r_max).clamp(0.02, 0.3),
    }
}

fn inertia_axes(p: &Prepared) -> (Vec<Vector3<f64>>, [f64; 3]) {
    let mut t = Matrix3::zeros();
    for (x, m) in p.pos.iter().zip(&p.mass) {
        t += (Matrix3::identity() * x.norm_squared() - x * x.transpose()) * *m;
    }
    let eig = SymmetricEigen::new(t);
    let mut idx = [0usize, 1, 2];
    idx.sort_by(|&a, &b| eig.eigenvalues[a].total_cmp(&eig.eigenvalues[b]));
    let axes = idx
        .iter()
        .map(|&i| eig.eigenvectors.column(i).into_owned())
        .collect();
    let moments = [
        eig.eigenvalues[idx[0]],
        eig.eigenvalues[idx[1]],
        eig.eigenvalues[idx[2]],
    ];
    (axes, moments)
}

/// Candidate axis directions, best-determined first.
fn axis_candidates(
    p: &Prepared,
    inertia: &[Vector3<f64>],
    moments: &[f64; 3],
) -> Vec<Vector3<f64>> {
    let tol = p.tol;
    let mut c: Vec<(f64, Vector3<f64>)> = Vec::new();
    let scale = moments[2].abs().max(1e-12);
    for (k, ax) in inertia.iter().enumerate() {
        let gap = (0..3)
            .filter(|&j| j != k)
            .map(|j| (moments[j] - moments[k]).abs())
            .fold(f64::INFINITY, f64::min);
        let quality = if gap / scale > 1e-3 { 1e6 } else { tol * 1.01 };
        c.push((quality, *ax));
    }
    const PAIR_SET_LIMIT: usize = 240;
    for set in &p.sets {
        let members: Vec<usize> = set
            .iter()
            .copied()
            .filter(|&i| p.pos[i].norm() > tol)
            .collect();
        for &a in &members {
            c.push((p.pos[a].norm(), p.pos[a]));
        }
        if members.len() > PAIR_SET_LIMIT {
            continue;
        }
        for (ia, &a) in members.iter().enumerate() {
            for &b in &members[ia + 1..] {
                let (pa, pb) = (p.pos[a], p.pos[b]);
                let mid = pa + pb;
                c.push((mid.norm() / 2.0, mid));
                let cr = pa.cross(&pb);
                c.push((cr.norm() / pa.norm().max(pb.norm()), cr));
            }
        }
    }
    // Isosceles triples (a, b, c) with |ab| = |bc| from the smallest set of ≥ 3 atoms off
    // the centre: consecutive vertices of the polygon that any Cn (n ≥ 3) makes of a.
    let smallest = p
        .sets
        .iter()
        .map(|s| {
            s.iter()
                .copied()
                .filter(|&i| p.pos[i].norm() > tol)
                .collect::<Vec<_>>()
        })
        .filter(|s| s.len() >= 3)
        .min_by_key(|s| s.len());
    if let Some(s) = smallest
        && s.len() <= 600
    {
        let a = p.pos[s[0]];
        for &bi in &s[1..] {
            let b = p.pos[bi];
            let ab = (b - a).norm();
            for &ci in &s[1..] {
                if ci == bi {
                    continue;
                }
                let cc = p.pos[ci];
                if ((cc - b).norm() - ab).abs() > 2.0 * tol {
                    continue;
                }
                let nrm = (b - a).cross(&(cc - b));
                c.push((nrm.norm() / ab.max(1e-12), nrm));
            }
        }
    }
    c.retain(|(q, v)| *q > tol && v.norm() > 1e-12);
    c.sort_by(|a, b| b.0.total_cmp(&a.0));
    c.into_iter().map(|(_, v)| v.normalize()).collect()
}

fn divisors_desc(g: usize) -> Vec<u32> {
    let mut d: Vec<u32> = (2..=g as u32)
        .filter(|k| g.is_multiple_of(*k as usize))
        .collect();
    d.reverse();
    d
}

/// Rotation orders about `axis` compatible with the first off-axis atom of the smallest
/// set: None if that atom has no partner at its height and radius.
fn orders_from_reference(
    p: &Prepared,
    by_size: &[&Vec<usize>],
    axis: &Vector3<f64>,
) -> Option<Vec<u32>> {
    let tol = p.tol;
    for set in by_size {
        for &a in set.iter() {
            let pa = p.pos[a];
            let ha = pa.dot(axis);
            let ra = pa - axis * ha;
            let rho = ra.norm();
            if rho < tol {
                continue;
            }
            let mut orders = Vec::new();
            for &b in set.iter() {
                if b == a {
                    continue;
                }
                let pb = p.pos[b];
                let hb = pb.dot(axis);
                if (hb - ha).abs() > 2.0 * tol {
                    continue;
                }
                let rb = pb - axis * hb;
                if (rb.norm() - rho).abs() > 2.0 * tol {
                    continue;
                }
                let phi = ra.cross(&rb).norm().atan2(ra.dot(&rb));
                if phi < 1e-9 {
                    continue;
                }
                let n = (2.0 * std::f64::consts::PI / phi).round();
                if n < 2.0 {
                    continue;
                }
                let chord = (phi - 2.0 * std::f64::consts::PI / n).abs() * rho;
                if chord < 3.0 * tol && !orders.contains(&(n as u32)) {
                    orders.push(n as u32);
                }
            }
            return if orders.is_empty() {
                None
            } else {
                Some(orders)
            };
        }
    }
    None
}

fn find_elements(p: &Prepared, inertia: &[Vector3<f64>], moments: &[f64; 3]) -> Elements {
    let candidates = axis_candidates(p, inertia, moments);
    let mut axes: Vec<(Vector3<f64>, u32)> = Vec::new();
    let mut by_size: Vec<&Vec<usize>> = p.sets.iter().collect();
    by_size.sort_by_key(|s| s.len());
    for v in &candidates {
        if axes.iter().any(|(a, _)| parallel(a, v, p.angle)) {
            continue;
        }
        // Orders allowed by one off-axis reference atom: its image under C_n lies at the
        // same height and radius, 2π/n away.
        let Some(orders) = orders_from_reference(p, &by_size, v) else {
            continue;
        };
        // The order divides the number of off-axis atoms of every set.
        let mut g = 0usize;
        for set in &p.sets {
            let off = set
                .iter()
                .filter(|&&i| p.pos[i].cross(v).norm() >= p.tol)
                .count();
            g = gcd(g, off);
        }
        if g < 2 {
            continue;
        }
        for n in divisors_desc(g) {
            if !orders.contains(&n) {
                continue;
            }
            if p.is_symmetry(&rotation(v, 2.0 * std::f64::consts::PI / n as f64)) {
                axes.push((*v, n));
                break;
            }
        }
    }
    // Mirror planes: normals from the axes, inertia axes, pair differences and normals.
    let mut normals: Vec<(f64, Vector3<f64>)> = Vec::new();
    for (a, _) in &axes {
        normals.push((1e6, *a));
    }
    for a in inertia {
        normals.push((1e5, *a));
    }
    for set in &p.sets {
        if set.len() > 240 {
            continue;
        }
        for (ia, &a) in set.iter().enumerate() {
            for &b in &set[ia + 1..] {
                let d = p.pos[a] - p.pos[b];
                normals.push((d.norm(), d));
                let cr = p.pos[a].cross(&p.pos[b]);
                normals.push((cr.norm() / p.pos[a].norm().max(p.pos[b].norm()), cr));
            }
        }
    }
    normals.retain(|(q, v)| *q > p.tol && v.norm() > 1e-12);
    normals.sort_by(|a, b| b.0.total_cmp(&a.0));
    let mut mirrors: Vec<Vector3<f64>> = Vec::new();
    for (_, v) in normals {
        let v = v.normalize();
        if mirrors.iter().any(|m| parallel(m, &v, p.angle)) {
            continue;
        }
        if p.is_symmetry(&reflection(&v)) {
            mirrors.push(v);
        }
    }
    let inversion = p.is_symmetry(&(-Matrix3::identity()));
    Elements {
        axes,
        mirrors,
        inversion,
    }
}

/// Operations of `group` in the molecule frame given by `frame`.
fn frame_operations(standard: &[Matrix3<f64>], frame: &Matrix3<f64>) -> Vec<Matrix3<f64>> {
    standard
        .iter()
        .map(|s| frame.transpose() * s * frame)
        .collect()
}

/// Kabsch refinement: the frame in which the group-averaged geometry best matches.
fn refine_frame(
    p: &Prepared,
    standard: &[Matrix3<f64>],
    perms: &[Vec<usize>],
    frame: &Matrix3<f64>,
) -> Matrix3<f64> {
    let y: Vec<Vector3<f64>> = p.pos.iter().map(|x| frame * x).collect();
    let h = standard.len() as f64;
    let mut cov = Matrix3::zeros();
    for i in 0..y.len() {
        let mut avg = Vector3::zeros();
        for (s, perm) in standard.iter().zip(perms) {
            avg += s.transpose() * y[perm[i]];
        }
        avg /= h;
        cov += avg * y[i].transpose();
    }
    let svd = cov.svd(true, true);
    let (Some(u), Some(vt)) = (svd.u, svd.v_t) else {
        return *frame;
    };
    let v = vt.transpose();
    let d = (v * u.transpose()).determinant().signum();
    let q = v * Matrix3::from_diagonal(&Vector3::new(1.0, 1.0, d)) * u.transpose();
    // y ≈ Q ȳ, so the refined frame is Qᵀ F.
    let f = q.transpose() * frame;
    // Re-orthonormalize against rounding.
    let z: Vector3<f64> = f.row(2).transpose();
    let x: Vector3<f64> = f.row(0).transpose();
    orthonormal_frame(x, z)
}

fn build_symmetry(
    p: &Prepared,
    group: PointGroup,
    frame: Matrix3<f64>,
    origin: Vector3<f64>,
) -> Result<Symmetry, SymmetryError> {
    let table = character_table(group);
    let standard = &table.standard_operations;
    let loose = 3.0 * p.tol;
    let first: Option<Vec<Vec<usize>>> = frame_operations(standard, &frame)
        .iter()
        .map(|m| p.matches(m, loose))
        .collect();
    let Some(first) = first else {
        return Err(SymmetryError::Inconsistent(group.to_string()));
    };
    let mut frame = frame;
    let mut perms = first;
    let deviation = |frame: &Matrix3<f64>, perms: &[Vec<usize>]| {
        let mut dev: f64 = 0.0;
        for (m, perm) in frame_operations(standard, frame).iter().zip(perms) {
            for (i, &j) in perm.iter().enumerate() {
                dev = dev.max((m * p.pos[i] - p.pos[j]).norm());
            }
        }
        dev
    };
    let rounds = if deviation(&frame, &perms) < 0.1 * p.tol {
        0
    } else {
        2
    };
    for _ in 0..rounds {
        let refined = refine_frame(p, standard, &perms, &frame);
        let next: Option<Vec<Vec<usize>>> = frame_operations(standard, &refined)
            .iter()
            .map(|m| p.matches(m, loose))
            .collect();
        match next {
            Some(next) => {
                frame = refined;
                perms = next;
            }
            None => break,
        }
    }
    let matrices = frame_operations(standard, &frame);
    let mut max_dev: f64 = 0.0;
    for (m, perm) in matrices.iter().zip(&perms) {
        for (i, &j) in perm.iter().enumerate() {
            max_dev = max_dev.max((m * p.pos[i] - p.pos[j]).norm());
        }
    }
    if max_dev > p.tol {
        return Err(SymmetryError::Inconsistent(group.to_string()));
    }
    let operations = matrices
        .into_iter()
        .zip(perms)
        .enumerate()
        .map(|(k, (matrix, permutation))| SymmetryOperation {
            matrix,
            standard: standard[k],
            kind: classify(&standard[k]),
            class: table.operation_class[k],
            permutation,
        })
        .collect();
    Ok(Symmetry {
        group,
        operations,
        origin,
        frame,
        table: (*table).clone(),
        tolerance: p.tol,
        max_deviation: max_dev,
        notes: Vec::new(),
    })
}

/// Detects the point group of `molecule` within `settings.tolerance` (Å).
///
/// The elements found are classified and the group's ideal operations are verified against
/// the atoms. If they do not all fit (possible with a large tolerance, where spurious
/// elements pass), the largest fitting subgroup in the same frame is reported, with a note.
pub fn detect(molecule: &Molecule, settings: &SymmetrySettings) -> Result<Symmetry, SymmetryError> {
    validate(molecule, settings)?;
    let tol = settings.tolerance;
    let origin = molecule.centre_of_mass();
    let p = prepare(molecule, &origin, tol);
    for (i, a) in p.pos.iter().enumerate() {
        for (j, b) in p.pos.iter().enumerate().skip(i + 1) {
            if (a - b).norm() < 1e-3 {
                return Err(SymmetryError::CoincidentAtoms(i, j));
            }
        }
    }
    let mut attempts: Vec<(PointGroup, Matrix3<f64>)> = Vec::new();
    // Linear molecules.
    let far = p
        .pos
        .iter()
        .copied()
        .max_by(|a, b| a.norm().total_cmp(&b.norm()))
        .unwrap_or_else(Vector3::z);
    if far.norm() > tol {
        let u = far.normalize();
        if p.pos.iter().all(|x| x.cross(&u).norm() < tol) {
            let frame = orthonormal_frame(any_perpendicular(&u), u);
            if p.is_symmetry(&(-Matrix3::identity())) {
                attempts.push((PointGroup::DInfH, frame));
            }
            attempts.push((PointGroup::CInfV, frame));
        }
    }
    let (inertia, moments) = inertia_axes(&p);
    let elements = find_elements(&p, &inertia, &moments);
    let primary = classify_elements(&p, &elements, settings.axis_convention);
    let mut options = vec![primary];
    let reduced = axial_elements(&p, &elements);
    let axial = classify_elements(&p, &reduced, settings.axis_convention);
    if axial.0 != primary.0 {
        options.push(axial);
    }
    for (k, (group, frame)) in options.into_iter().enumerate() {
        attempts.push((group, frame));
        if k == 0 {
            for alt in polyhedral_alternatives(&p, &elements, group) {
                attempts.push((group, alt));
            }
        }
        for sub in subgroup_chain(group) {
            attempts.push((sub, frame));
        }
    }
    if elements.inversion {
        attempts.push((PointGroup::Ci, Matrix3::identity()));
    }
    if let Some(m) = elements.mirrors.first() {
        attempts.push((PointGroup::Cs, orthonormal_frame(x_from_atoms(&p, m), *m)));
    }
    attempts.push((PointGroup::C1, Matrix3::identity()));
    let first = attempts.first().map(|a| a.0);
    for (group, frame) in attempts {
        if let Ok(mut symmetry) = build_symmetry(&p, group, frame, origin) {
            if let Some(first) = first
                && first != group
            {
                symmetry.notes.push(format!(
                    "the elements found within {tol} Å suggested {first}, whose operations do not \
                     all fit; {group} is the largest group that fits"
                ));
            }
            return Ok(symmetry);
        }
    }
    Err(SymmetryError::Inconsistent(
        first.map_or_else(|| "C1".to_string(), |g| g.to_string()),
    ))
}
