//! Contour lines of a grid by marching squares (W. E. Lorensen and H. E. Cline, Computer
//! Graphics 21, 163 (1987), in its two-dimensional form; from memory): each cell's corners
//! are classified as above or below the level, the crossing points on its edges are placed
//! by linear interpolation, and the ambiguous saddle cells (opposite corners above) are
//! resolved by the cell-centre value (the mean of the corners). Segments are then joined
//! into polylines through the grid edges they share, so the joining is exact (no
//! floating-point matching); a polyline that comes back to its start is closed.

use std::collections::HashMap;

use super::grid::Grid;

/// One contour line at one level, in plane coordinates (Å).
#[derive(Clone, Debug, PartialEq)]
pub struct ContourLine {
    pub level: f64,
    pub points: Vec<[f64; 2]>,
    /// The last point joins the first (not repeated in `points`).
    pub closed: bool,
}

/// Cell edges: 0 bottom, 1 right, 2 top, 3 left. Segments of each corner case, corners
/// numbered 0 (i, j), 1 (i+1, j), 2 (i+1, j+1), 3 (i, j+1), bit k set when corner k is
/// above the level. Saddles (5 and 10) are resolved separately.
const SEGMENTS: [&[(u8, u8)]; 16] = [
    &[],
    &[(3, 0)],
    &[(0, 1)],
    &[(3, 1)],
    &[(1, 2)],
    &[],
    &[(0, 2)],
    &[(3, 2)],
    &[(2, 3)],
    &[(0, 2)],
    &[],
    &[(1, 2)],
    &[(3, 1)],
    &[(0, 1)],
    &[(3, 0)],
    &[],
];

/// Grid-edge identifier: 2 (j n + i) for the edge (i, j)–(i+1, j), plus 1 for the edge
/// (i, j)–(i, j+1).
fn edge_id(n: usize, i: usize, j: usize, cell_edge: u8) -> usize {
    match cell_edge {
        0 => 2 * (j * n + i),
        1 => 2 * (j * n + i + 1) + 1,
        2 => 2 * ((j + 1) * n + i),
        _ => 2 * (j * n + i) + 1,
    }
}

/// The crossing point of `level` on grid edge `id`, in plane coordinates.
fn edge_point(grid: &Grid, id: usize, level: f64) -> [f64; 2] {
    let n = grid.spec.n;
    let vertical = id % 2 == 1;
    let node = id / 2;
    let (i, j) = (node % n, node / n);
    let (i2, j2) = if vertical { (i, j + 1) } else { (i + 1, j) };
    let (a, b) = (grid.value(i, j), grid.value(i2, j2));
    let t = if b == a {
        0.5
    } else {
        ((level - a) / (b - a)).clamp(0.0, 1.0)
    };
    let (x, y) = grid.spec.coordinates(i, j);
    let step = grid.spec.step;
    if vertical {
        [x, y + t * step]
    } else {
        [x + t * step, y]
    }
}

/// Marching-squares segments of one level, as pairs of grid-edge ids.
fn segments(grid: &Grid, level: f64) -> Vec<(usize, usize)> {
    let n = grid.spec.n;
    let mut out = Vec::new();
    if n < 2 {
        return out;
    }
    for j in 0..n - 1 {
        for i in 0..n - 1 {
            let corners = [
                grid.value(i, j),
                grid.value(i + 1, j),
                grid.value(i + 1, j + 1),
                grid.value(i, j + 1),
            ];
            let case = corners
                .iter()
                .enumerate()
                .fold(0usize, |acc, (k, &v)| acc | (usize::from(v > level) << k));
            let saddle: &[(u8, u8)] = match case {
                5 | 10 => {
                    let centre_above = corners.iter().sum::<f64>() / 4.0 > level;
                    // Above-centre joins the above corners: the lines cut off the others.
                    match (case == 5, centre_above) {
                        (true, true) | (false, false) => &[(0, 1), (2, 3)],
                        (true, false) | (false, true) => &[(3, 0), (1, 2)],
                    }
                }
                _ => SEGMENTS[case],
            };
            for &(a, b) in saddle {
                out.push((edge_id(n, i, j, a), edge_id(n, i, j, b)));
            }
        }
    }
    out
}

/// The contour lines of `grid` at `level`, joined into polylines.
pub fn contour_lines(grid: &Grid, level: f64) -> Vec<ContourLine> {
    let segments = segments(grid, level);
    // Each grid edge lies on at most two cells, so on at most two segments.
    let mut at_edge: HashMap<usize, [usize; 2]> = HashMap::with_capacity(segments.len() * 2);
    for (index, &(a, b)) in segments.iter().enumerate() {
        for edge in [a, b] {
            at_edge
                .entry(edge)
                .and_modify(|slot| slot[1] = index)
                .or_insert([index, usize::MAX]);
        }
    }
    let mut used = vec![false; segments.len()];
    let mut lines = Vec::new();
    // The unused segment at `edge` other than `from`, and its far end.
    let next = |edge: usize, used: &[bool]| -> Option<(usize, usize)> {
        let slot = at_edge.get(&edge)?;
        slot.iter()
            .copied()
            .find(|&s| s != usize::MAX && !used[s])
            .map(|s| {
                let (a, b) = segments[s];
                (s, if a == edge { b } else { a })
            })
    };
    for start in 0..segments.len() {
        if used[start] {
            continue;
        }
        used[start] = true;
        let (first, second) = segments[start];
        let mut forward = vec![first, second];
        let mut closed = false;
        while let Some((segment, far)) = next(*forward.last().unwrap_or(&first), &used) {
            used[segment] = true;
            if far == first {
                closed = true;
                break;
            }
            forward.push(far);
        }
        if !closed {
            let mut backward = Vec::new();
            let mut end = first;
            while let Some((segment, far)) = next(end, &used) {
                used[segment] = true;
                backward.push(far);
                end = far;
            }
            backward.reverse();
            backward.extend(forward);
            forward = backward;
        }
        lines.push(ContourLine {
            level,
            points: forward
                .iter()
                .map(|&edge| edge_point(grid, edge, level))
                .collect(),
            closed,
        });
    }
    lines
}

/// The contour lines of `grid` at every level of `levels`, in that order; the levels are
/// shared among worker threads (std::thread::scope), the result does not depend on how.
pub fn contour_set(grid: &Grid, levels: &[f64]) -> Vec<ContourLine> {
    let threads = std::thread::available_parallelism()
        .map(|t| t.get())
        .unwrap_or(1)
        .min(levels.len())
        .max(1);
    if threads == 1 || grid.spec.n < 64 {
        return levels
            .iter()
            .flat_map(|&level| contour_lines(grid, level))
            .collect();
    }
    let mut per_level: Vec<Vec<ContourLine>> = vec![Vec::new(); levels.len()];
    let chunk = levels.len().div_ceil(threads);
    std::thread::scope(|scope| {
        for (slots, chunk_levels) in per_level.chunks_mut(chunk).zip(levels.chunks(chunk)) {
            scope.spawn(move || {
                for (slot, &level) in slots.iter_mut().zip(chunk_levels) {
                    *slot = contour_lines(grid, level);
                }
            });
        }
    });
    per_level.into_iter().flatten().collect()
}
