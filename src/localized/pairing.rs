//! Pairing of two level sets by overlap: each level of one set with the level of the other
//! it overlaps most, as an optimal assignment maximizing the total squared overlap (the
//! Hungarian method: H. W. Kuhn, Naval Res. Logist. Q. 2, 83 (1955)). Used by the
//! lone-pair switch to carry each level from one state to the other.

use nalgebra::DMatrix;

/// Pairs rows with columns of a square matrix of overlaps |⟨a_i|b_j⟩| so that the total
/// squared overlap is largest (Hungarian method, O(n³)). Returns the column of each row.
/// A non-square matrix pairs the first min(rows, cols) rows; unpaired rows get `usize::MAX`.
pub fn match_levels(overlaps: &DMatrix<f64>) -> Vec<usize> {
    let (rows, cols) = (overlaps.nrows(), overlaps.ncols());
    let n = rows.max(cols);
    if n == 0 {
        return Vec::new();
    }
    // Cost: −|o|², padded with zeros.
    let cost = |i: usize, j: usize| -> f64 {
        if i < rows && j < cols {
            let o = overlaps[(i, j)];
            if o.is_finite() { -o * o } else { 0.0 }
        } else {
            0.0
        }
    };
    let mut state = Hungarian::new(n);
    for i in 1..=n {
        state.augment(i, &cost);
    }
    let mut assignment = vec![usize::MAX; rows];
    for (j, &i) in state.p.iter().enumerate().skip(1) {
        if i >= 1 && i <= rows && j <= cols {
            assignment[i - 1] = j - 1;
        }
    }
    assignment
}

/// The shortest augmenting path form of the Kuhn–Munkres algorithm with 1-based
/// potentials u, v; p[j] is the row assigned to column j.
struct Hungarian {
    n: usize,
    u: Vec<f64>,
    v: Vec<f64>,
    p: Vec<usize>,
    way: Vec<usize>,
}

impl Hungarian {
    fn new(n: usize) -> Self {
        Hungarian {
            n,
            u: vec![0.0; n + 1],
            v: vec![0.0; n + 1],
            p: vec![0; n + 1],
            way: vec![0; n + 1],
        }
    }

    /// Adds row i to the assignment along a shortest augmenting path.
    fn augment(&mut self, i: usize, cost: &dyn Fn(usize, usize) -> f64) {
        let n = self.n;
        self.p[0] = i;
        let mut j0 = 0;
        let mut minv = vec![f64::INFINITY; n + 1];
        let mut used = vec![false; n + 1];
        loop {
            used[j0] = true;
            let i0 = self.p[j0];
            let (mut delta, mut j1) = (f64::INFINITY, 0);
            for j in (1..=n).filter(|&j| !used[j]) {
                let cur = cost(i0 - 1, j - 1) - self.u[i0] - self.v[j];
                if cur < minv[j] {
                    minv[j] = cur;
                    self.way[j] = j0;
                }
                if minv[j] < delta {
                    delta = minv[j];
                    j1 = j;
                }
            }
            if j1 == 0 {
                break;
            }
            for j in 0..=n {
                if used[j] {
                    self.u[self.p[j]] += delta;
                    self.v[j] -= delta;
                } else {
                    minv[j] -= delta;
                }
            }
            j0 = j1;
            if self.p[j0] == 0 {
                break;
            }
        }
        loop {
            let j1 = self.way[j0];
            self.p[j0] = self.p[j1];
            j0 = j1;
            if j0 == 0 {
                break;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hungarian_beats_greedy() {
        // Greedy would take (0,0)=0.9 then (1,1)=0.1: total 0.82; optimum (0,1),(1,0).
        let o = DMatrix::from_row_slice(2, 2, &[0.9, 0.8, 0.85, 0.1]);
        assert_eq!(match_levels(&o), vec![1, 0]);
        let id = DMatrix::<f64>::identity(4, 4);
        assert_eq!(match_levels(&id), vec![0, 1, 2, 3]);
        assert!(match_levels(&DMatrix::zeros(0, 0)).is_empty());
    }
}
