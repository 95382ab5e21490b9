//! Runs a scan: the plan is validated first (no analysis before every geometry is
//! known to be usable), then the points are analysed in parallel on scoped std threads
//! that take the next point from a shared counter, checking a cancel flag before each
//! point and counting finished points for a progress bar. A point that fails is kept with
//! its message and the others go on. The levels are followed afterwards ([`super::follow`]).

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

use super::follow::{follow_levels, lambda_series};
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
    let next = AtomicUsize::new(0);
    let workers = threads.clamp(1, total);
    let mut results: Vec<Option<Result<PointData, String>>> = vec![None; total];
    let finished: Vec<Vec<(usize, Result<PointData, String>)>> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..workers)
            .map(|_| {
                scope.spawn(|| {
                    let mut mine = Vec::new();
                    while !progress.is_cancelled() {
                        let index = next.fetch_add(1, Ordering::Relaxed);
                        let Some((_, geometry)) = plan.get(index) else {
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
    for (index, result) in finished.into_iter().flatten() {
        results[index] = Some(result);
    }
    if progress.is_cancelled() {
        return Err(ScanError::Cancelled {
            done: results.iter().filter(|r| r.is_some()).count(),
            total,
        });
    }
    let data: Vec<Result<PointData, String>> = results
        .into_iter()
        .map(|r| r.unwrap_or_else(|| Err("not analysed".into())))
        .collect();
    let (curves, reference_point) = follow_levels(&data);
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
