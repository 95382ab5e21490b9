//! A square n × n grid of orbital values on a plane. The extent is the bounding box of the
//! atoms' projections onto the plane plus a margin, made square so that grid cells are
//! square. Rows are filled on worker threads (std::thread::scope), one band per thread.

use nalgebra::Matrix3;

use super::plane::Plane;
use super::sto::OrbitalEvaluator;
use crate::eht::overlap::BOHR_IN_ANGSTROM;

/// Square window of plane coordinates (Å) with n points a side.
#[derive(Clone, Debug, PartialEq)]
pub struct GridSpec {
    /// Plane coordinates (Å) of the first point (the lower-left corner).
    pub x0: f64,
    pub y0: f64,
    /// Spacing between neighbouring points (Å).
    pub step: f64,
    /// Points per side.
    pub n: usize,
}

impl GridSpec {
    /// The square window covering `points` (plane coordinates, Å) plus `margin` on every
    /// side, with `n` points a side (n ≥ 2).
    pub fn covering(points: &[(f64, f64)], margin: f64, n: usize) -> GridSpec {
        let (mut min_x, mut max_x, mut min_y, mut max_y) = (0.0f64, 0.0f64, 0.0f64, 0.0f64);
        for (i, &(x, y)) in points.iter().enumerate() {
            if i == 0 {
                (min_x, max_x, min_y, max_y) = (x, x, y, y);
            } else {
                min_x = min_x.min(x);
                max_x = max_x.max(x);
                min_y = min_y.min(y);
                max_y = max_y.max(y);
            }
        }
        let side = (max_x - min_x).max(max_y - min_y) + 2.0 * margin.max(0.1);
        let (cx, cy) = (0.5 * (min_x + max_x), 0.5 * (min_y + max_y));
        let n = n.max(2);
        GridSpec {
            x0: cx - 0.5 * side,
            y0: cy - 0.5 * side,
            step: side / (n - 1) as f64,
            n,
        }
    }

    /// Side length of the window (Å).
    pub fn side(&self) -> f64 {
        self.step * (self.n - 1) as f64
    }

    /// Plane coordinates of grid point (i, j): i along u, j along v.
    pub fn coordinates(&self, i: usize, j: usize) -> (f64, f64) {
        (
            self.x0 + i as f64 * self.step,
            self.y0 + j as f64 * self.step,
        )
    }
}

/// Orbital values on a grid: `values[j * n + i]` at `spec.coordinates(i, j)`, in
/// bohr^(−3/2).
#[derive(Clone, Debug, PartialEq)]
pub struct Grid {
    pub spec: GridSpec,
    pub values: Vec<f64>,
}

impl Grid {
    /// Value at grid point (i, j).
    pub fn value(&self, i: usize, j: usize) -> f64 {
        self.values[j * self.spec.n + i]
    }

    /// Largest |value| on the grid.
    pub fn max_abs(&self) -> f64 {
        self.values.iter().fold(0.0, |m, v| m.max(v.abs()))
    }

    /// Evaluates `orbital` at every point of `spec` on `plane`.
    pub fn evaluate(orbital: &OrbitalEvaluator, plane: &Plane, spec: &GridSpec) -> Grid {
        let n = spec.n;
        // In the plane's own frame a grid point is (x, y, 0): no 3D point is built per value.
        let axes = Matrix3::from_columns(&[plane.u, plane.v, plane.normal()]);
        let orbital = orbital.in_frame(&(plane.origin / BOHR_IN_ANGSTROM), &axes);
        let mut values = vec![0.0; n * n];
        let threads = std::thread::available_parallelism()
            .map(|t| t.get())
            .unwrap_or(1)
            .min(n.div_ceil(16))
            .max(1);
        let rows_per_band = n.div_ceil(threads);
        let fill = |first_row: usize, band: &mut [f64]| {
            for (offset, row) in band.chunks_mut(n).enumerate() {
                let (x0, y) = spec.coordinates(0, first_row + offset);
                orbital.add_line_bohr(
                    x0 / BOHR_IN_ANGSTROM,
                    spec.step / BOHR_IN_ANGSTROM,
                    y / BOHR_IN_ANGSTROM,
                    0.0,
                    row,
                );
            }
        };
        if threads == 1 {
            fill(0, &mut values);
        } else {
            std::thread::scope(|scope| {
                for (band_index, band) in values.chunks_mut(rows_per_band * n).enumerate() {
                    let fill = &fill;
                    scope.spawn(move || fill(band_index * rows_per_band, band));
                }
            });
        }
        Grid {
            spec: spec.clone(),
            values,
        }
    }
}
