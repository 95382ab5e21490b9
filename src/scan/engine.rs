//! Runs a scan: the plan is validated first (no analysis before every geometry is
//! known to be usable), then the points are analysed in parallel on scoped std threads
//! that take the next point from a shared counter, checking a cancel flag before each
//! point and counting finished points for a progress bar. A point that fails is kept with
//! its message and the others go on. Points run in blocks; after each block its levels are
//! followed in order ([`super::follow`]) and the MO matrices dropped.

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

use super::follow::{Follower, follow_levels, lambda_series};
use super::point::{PointData, analyse_point, point_settings};
use super::{Scan, ScanError, ScanPoint, ScanRequest};
use crate::analysis::Settings;
use crate::chem::molecule::Molecule;

/// Shared between the scan and whoever watches it (a GUI worker keeps it in an `Arc`).
#[derive(Debug, Default)]
pub struct ScanProgress {
    cancel: AtomicBool,
    done: AtomicUsize,
    total: AtomicUsize,
}

impl ScanProgress {
    pub fn new() -> ScanProgress {
        ScanProgress::default()
    }

    /// Asks the scan to stop; points under way finish, no new point starts.
    pub fn cancel(&self) {
        self.cancel.store(true, Ordering::Relaxed);
    }

    pub fn is_cancelled(&self) -> bool {
        self.cancel.load(Ordering::Relaxed)
    }

    /// Points analysed so far.
    pub fn done(&self) -> usize {
        self.done.load(Ordering::Relaxed)
    }

    /// Points in the scan (0 until the plan is made).
    pub fn total(&self) -> usize {
        self.total.load(Ordering::Relaxed)
    }

    /// Fraction done, 0 to 1.
    pub fn fraction(&self) -> f64 {
        let total = self.total();
        if total == 0 {
            0.0
        } else {
            self.done() as f64 / total as f64
        }
    }
}

/// Runs `request` on `molecule` with the document's `settings`, on as many threads as the
/// machine offers.
pub fn run_scan(
    molecule: &Molecule,
    settings: &Settings,
    request: &ScanRequest,
    progress: &ScanProgress,
) -> Result<Scan, ScanError> {
    let threads = std::thread::available_parallelism().map_or(1, |n| n.get());
    let settings = point_settings(settings);
    run_scan_with(molecule, request, progress, threads, |geometry| {
        analyse_point(geometry, &settings)
    })
}

/// Runs `request` with `threads` workers (1 = serial) and `analyse` for each point
/// (normally [`analyse_point`]; tests may substitute a failing one).
pub fn run_scan_with<F>(
    molecule: &Molecule,
    request: &ScanRequest,
    progress: &ScanProgress,
    threads: usize,
    analyse: F,
) -> Result<Scan, ScanError>
where
    F: Fn(&Molecule) -> Result<PointData, String> + Sync,
{
    let plan = request.plan(molecule)?;
    let total = plan.len();
    progress.total.store(total, Ordering::Relaxed);
    progress.done.store(0, Ordering::Relaxed);
    let workers = threads.clamp(1, total);
    // Points are analysed in blocks so that the follower can drop each point's matrices
    // soon after it is computed.
    let block = (workers * 16).max(32);
    let mut follower = Follower::default();
    let mut data: Vec<Result<PointData, String>> = Vec::with_capacity(total);
    for start in (0..total).step_by(block) {
        let end = (start + block).min(total);
        let results = analyse_block(&plan[start..end], progress, workers, &analyse)?;
        if progress.is_cancelled() {
            return Err(ScanError::Cancelled {
                done: progress.done(),
                total,
            });
        }
        for (offset, result) in results.into_iter().enumerate() {
            let mut result = result.unwrap_or_else(|| Err("not analysed".into()));
            if let Ok(point) = &mut result {
                follower.push(start + offset, point);
                point.release_matrices();
            }
            data.push(result);
        }
    }
    let (curves, reference_point) = follow_levels(&data, follower);
    let lambdas = lambda_series(&data, molecule);
    let points = plan
        .into_iter()
        .zip(&data)
        .map(|((value, geometry), result)| match result {
            Ok(point) => ScanPoint {
                value,
                geometry,
                point_group: point.point_group.clone(),
                sum_occupied_ev: Some(point.sum_occupied_ev),
                failure: None,
                notes: point.notes.clone(),
            },
            Err(message) => ScanPoint {
                value,
                geometry,
                point_group: None,
                sum_occupied_ev: None,
                failure: Some(message.clone()),
                notes: Vec::new(),
            },
        })
        .collect();
    Ok(Scan {
        request: *request,
        points,
        curves,
        lambdas,
        reference_point,
    })
}

/// Analyses `points` on `workers` scoped threads that take the next point from a shared
/// counter; a point not started because of cancellation is `None`.
fn analyse_block<F>(
    points: &[(f64, Molecule)],
    progress: &ScanProgress,
    workers: usize,
    analyse: &F,
) -> Result<Vec<Option<Result<PointData, String>>>, ScanError>
where
    F: Fn(&Molecule) -> Result<PointData, String> + Sync,
{
    let next = AtomicUsize::new(0);
    let finished: Vec<Vec<(usize, Result<PointData, String>)>> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..workers.min(points.len()))
            .map(|_| {
                scope.spawn(|| {
                    let mut mine = Vec::new();
                    while !progress.is_cancelled() {
                        let index = next.fetch_add(1, Ordering::Relaxed);
                        let Some((_, geometry)) = points.get(index) else {
                            break;
                        };
                        mine.push((index, analyse(geometry)));
                        progress.done.fetch_add(1, Ordering::Relaxed);
                    }
                    mine
                })
            })
            .collect();
        handles
            .into_iter()
            .map(|h| {
                h.join()
                    .map_err(|_| ScanError::Worker("a point's analysis panicked".into()))
            })
            .collect::<Result<Vec<_>, _>>()
    })?;
    let mut results: Vec<Option<Result<PointData, String>>> = vec![None; points.len()];
    for (index, result) in finished.into_iter().flatten() {
        results[index] = Some(result);
    }
    Ok(results)
}
