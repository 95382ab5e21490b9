//! The scan engine: bad input refused before any work, failed points marked, cancellation,
//! progress, parallel = serial, and the continuity of followed curves through an avoided
//! crossing, read back from the CSV export.

use std::path::Path;
use std::sync::atomic::{AtomicUsize, Ordering};

use diptych::analysis::Settings;
use diptych::chem::Molecule;
use diptych::project::open_path;
use diptych::scan::csv::to_csv;
use diptych::scan::point::{analyse_point, point_settings};
use diptych::scan::{
    Coordinate, MAX_POINTS, ScanError, ScanProgress, ScanRequest, run_scan, run_scan_with,
};

type TestResult = Result<(), Box<dyn std::error::Error>>;

fn demo(name: &str) -> Result<Molecule, Box<dyn std::error::Error>> {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    Ok(open_path(&path)?.project.molecule)
}

fn request(coordinate: Coordinate, from: f64, to: f64, points: usize) -> ScanRequest {
    ScanRequest {
        coordinate,
        from,
        to,
        steps: points,
    }
}

/// Every bad request is refused with its own error and no point is analysed
/// (common practice, no source: validate before work).
#[test]
fn bad_requests_fail_before_any_point_is_analysed() -> TestResult {
    let ammonia = demo("ammonia")?;
    let water = demo("water")?;
    let angle = Coordinate::Angle { i: 1, j: 0, k: 2 };
    let cases: Vec<(&Molecule, ScanRequest, &str)> = vec![
        (
            &ammonia,
            request(Coordinate::Angle { i: 1, j: 0, k: 9 }, 100.0, 110.0, 5),
            "out of range",
        ),
        (
            &ammonia,
            request(Coordinate::Angle { i: 1, j: 0, k: 1 }, 100.0, 110.0, 5),
            "named twice",
        ),
        (
            &ammonia,
            request(Coordinate::Angle { i: 1, j: 2, k: 3 }, 50.0, 60.0, 5),
            "not bonded",
        ),
        (
            &ammonia,
            request(Coordinate::Bond { i: 0, j: 1 }, 1.0, 0.1, 10),
            "at point 6",
        ),
        (&ammonia, request(angle, 100.0, 10.0, 10), "closer than"),
        (&ammonia, request(angle, 100.0, 110.0, 0), "at least 2"),
        (&ammonia, request(angle, 100.0, 110.0, 1), "at least 2"),
        (
            &ammonia,
            request(angle, 100.0, 110.0, MAX_POINTS + 1),
            "more than the limit",
        ),
        (&ammonia, request(angle, f64::NAN, 110.0, 5), "finite"),
        (
            &ammonia,
            request(Coordinate::Pyramidalize { centre: 0 }, 100.0, 130.0, 4),
            "not possible",
        ),
        (
            &water,
            request(Coordinate::Pyramidalize { centre: 0 }, 100.0, 110.0, 4),
            "needs at least 3",
        ),
        (
            &ammonia,
            request(Coordinate::SymmetricBend { centre: 0 }, 100.0, 110.0, 4),
            "needs exactly 2",
        ),
    ];
    for (molecule, bad, expected) in cases {
        let calls = AtomicUsize::new(0);
        let progress = ScanProgress::new();
        let result = run_scan_with(molecule, &bad, &progress, 2, |geometry| {
            calls.fetch_add(1, Ordering::Relaxed);
            analyse_point(geometry, &Settings::default())
        });
        let error = result.err().ok_or(format!("{bad:?} was accepted"))?;
        let message = error.to_string();
        assert!(
            message.contains(expected),
            "{bad:?}: '{message}' lacks '{expected}'"
        );
        assert_eq!(calls.load(Ordering::Relaxed), 0, "{bad:?} analysed points");
        assert_eq!(progress.total(), 0);
    }
    // The collision names the first point where atoms meet: closing H–N–H (N–H 1.012 Å)
    // from 100° to 10° in 10° steps brings the two H atoms within 0.5 Å at 20°
    // (2 × 1.012 × sin 10° = 0.35 Å; at 30° they are 0.52 Å apart), point 8.
    let collision = request(angle, 100.0, 10.0, 10).plan(&ammonia);
    assert!(
        matches!(
            collision,
            Err(ScanError::Collision {
                point: 8,
                a: 1,
                b: 2,
                ..
            })
        ),
        "{collision:?}"
    );
    Ok(())
}

/// A point whose analysis fails is marked with its message; the others are computed
/// and the curves are followed across the gap (common practice, no source).
#[test]
fn a_failed_point_is_marked_and_the_scan_goes_on() -> TestResult {
    let ammonia = demo("ammonia")?;
    let settings = point_settings(&Settings::default());
    let plan = request(Coordinate::Pyramidalize { centre: 0 }, 100.0, 120.0, 11);
    let scan = run_scan_with(&ammonia, &plan, &ScanProgress::new(), 2, |geometry| {
        let value = Coordinate::Pyramidalize { centre: 0 }
            .measure(geometry)
            .map_err(|e| e.to_string())?;
        if (value - 110.0).abs() < 1e-6 {
            return Err("injected failure".into());
        }
        analyse_point(geometry, &settings)
    })?;
    assert_eq!(scan.failed_points(), vec![5]);
    assert_eq!(scan.points[5].failure.as_deref(), Some("injected failure"));
    for (p, point) in scan.points.iter().enumerate() {
        let has_results = point.sum_occupied_ev.is_some();
        assert_eq!(has_results, p != 5, "point {p}");
        for curve in &scan.curves {
            assert_eq!(curve.energies[p].is_some(), p != 5);
        }
    }
    let csv = to_csv(&scan);
    let rows: Vec<&str> = csv.lines().skip(1).collect();
    assert_eq!(rows.len(), 11);
    assert!(rows[5].ends_with("failed: injected failure"), "{}", rows[5]);
    assert_eq!(rows.iter().filter(|r| r.ends_with(",ok")).count(), 10);
    Ok(())
}

/// Cancelling stops the scan early: no new point starts after the flag is set.
#[test]
fn cancellation_stops_early() -> TestResult {
    let ammonia = demo("ammonia")?;
    let settings = point_settings(&Settings::default());
    let plan = request(Coordinate::Pyramidalize { centre: 0 }, 90.0, 120.0, 200);
    let progress = ScanProgress::new();
    let calls = AtomicUsize::new(0);
    let result = run_scan_with(&ammonia, &plan, &progress, 2, |geometry| {
        if calls.fetch_add(1, Ordering::Relaxed) == 4 {
            progress.cancel();
        }
        analyse_point(geometry, &settings)
    });
    match result {
        Err(ScanError::Cancelled { done, total }) => {
            assert_eq!(total, 200);
            assert!(done < 10, "{done} points after cancelling at the 5th");
        }
        other => panic!("expected a cancelled scan, got {other:?}"),
    }
    assert!(calls.load(Ordering::Relaxed) < 10);
    assert!(progress.is_cancelled());
    Ok(())
}

/// The same scan on one thread and on four gives identical results; progress ends at 1.
#[test]
fn parallel_and_serial_scans_are_identical() -> TestResult {
    let ammonia = demo("ammonia")?;
    let settings = point_settings(&Settings::default());
    let plan = request(Coordinate::Pyramidalize { centre: 0 }, 95.0, 120.0, 26);
    let serial_progress = ScanProgress::new();
    let serial = run_scan_with(&ammonia, &plan, &serial_progress, 1, |g| {
        analyse_point(g, &settings)
    })?;
    let parallel = run_scan_with(&ammonia, &plan, &ScanProgress::new(), 4, |g| {
        analyse_point(g, &settings)
    })?;
    assert_eq!(serial, parallel);
    assert_eq!(to_csv(&serial), to_csv(&parallel));
    assert_eq!(serial_progress.done(), 26);
    assert_eq!(serial_progress.fraction(), 1.0);
    // The default entry point gives the same numbers too.
    let default = run_scan(&ammonia, &Settings::default(), &plan, &ScanProgress::new())?;
    assert_eq!(to_csv(&default), to_csv(&serial));
    Ok(())
}

fn parse_rows(csv: &str) -> Vec<Vec<String>> {
    csv.lines()
        .map(|line| line.split(',').map(str::to_string).collect())
        .collect()
}

/// A 91-point scan gives 91 CSV rows and continuous curves. Stretching one O–H bond of
/// water (Cs) brings two a′ levels (the stretched σ bond rising toward the O 2p and H 1s
/// levels, and the in-plane lone pair) close; levels of one irrep may not cross
/// (von Neumann and Wigner, Phys. Z. 30, 467 (1929)), so their gap must shrink to a
/// minimum inside the range and grow again, with the two curves keeping their order.
#[test]
fn ninety_one_points_give_continuous_curves_through_an_avoided_crossing() -> TestResult {
    let water = demo("water")?;
    let plan = request(Coordinate::Bond { i: 0, j: 1 }, 0.8, 3.0, 91);
    let scan = run_scan(&water, &Settings::default(), &plan, &ScanProgress::new())?;
    let csv = to_csv(&scan);
    let rows = parse_rows(&csv);
    assert_eq!(rows.len(), 92, "header and 91 rows");
    let header = &rows[0];
    let data = &rows[1..];
    assert!(
        data.iter()
            .all(|r| r.last().map(String::as_str) == Some("ok"))
    );
    // Continuity: no step of any curve is much larger than both neighbouring steps (a label
    // jump shows as one isolated step the size of a level gap).
    for (column, name) in header
        .iter()
        .enumerate()
        .filter(|(_, h)| h.ends_with("(eV)"))
    {
        let values: Vec<f64> = data
            .iter()
            .map(|r| r[column].parse::<f64>())
            .collect::<Result<_, _>>()?;
        let steps: Vec<f64> = values.windows(2).map(|w| (w[1] - w[0]).abs()).collect();
        for k in 1..steps.len() - 1 {
            let neighbours = steps[k - 1].max(steps[k + 1]);
            assert!(
                steps[k] <= 3.0 * neighbours + 0.02,
                "{name}: step {k} of {} eV between steps of {} and {} eV",
                steps[k],
                steps[k - 1],
                steps[k + 1]
            );
        }
    }
    // The avoided crossing: the two highest occupied a′ levels at the start.
    let a_prime: Vec<_> = scan
        .curves
        .iter()
        .filter(|c| c.irrep.as_deref().is_some_and(|i| i == "a'" || i == "a′"))
        .filter(|c| c.occupancies[0].is_some_and(|n| n > 0.0))
        .collect();
    assert!(a_prime.len() >= 2);
    let (lower, upper) = (a_prime[a_prime.len() - 2], a_prime[a_prime.len() - 1]);
    let gaps: Vec<f64> = (0..91)
        .map(|p| upper.energies[p].unwrap_or(f64::NAN) - lower.energies[p].unwrap_or(f64::NAN))
        .collect();
    assert!(
        gaps.iter().all(|g| *g > 0.0),
        "same-irrep curves keep their order"
    );
    let (closest, smallest) = gaps
        .iter()
        .enumerate()
        .min_by(|a, b| a.1.total_cmp(b.1))
        .ok_or("gaps")?;
    assert!(
        closest > 5 && closest < 85,
        "minimum gap inside the range, at {closest}"
    );
    assert!(
        gaps[0] > smallest + 0.3 && gaps[90] > smallest + 0.1,
        "{gaps:?}"
    );
    // Labels stay with the curves: each keeps its irrep at every point.
    for curve in [lower, upper] {
        assert!(curve.labels.iter().all(|l| {
            l.as_deref()
                .is_some_and(|l| l.contains("a'") || l.contains("a′"))
        }));
    }
    Ok(())
}

/// Bending one C–H of benzene in the ring plane through the D6h geometry (120°) splits
/// each degenerate e level linearly in the bend (first-order perturbation of a degenerate
/// level; e.g. Atkins and Friedman, Molecular Quantum Mechanics, from memory), and the bends
/// to either side are mirror images: the component that is lower on one side is higher on
/// the other, so the two followed curves cross at 120°, where they are degenerate.
#[test]
fn degenerate_levels_that_split_linearly_cross_at_the_symmetric_point() -> TestResult {
    let path =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/reference/rdkit_geometries/benzene.xyz");
    let benzene = open_path(&path)?.project.molecule;
    let plan = request(Coordinate::Angle { i: 1, j: 0, k: 6 }, 100.0, 140.0, 81);
    let scan = run_scan(&benzene, &Settings::default(), &plan, &ScanProgress::new())?;
    assert_eq!(scan.points[40].point_group.as_deref(), Some("D6h"));
    let energy = |k: usize, p: usize| scan.curves[k].energies[p].unwrap_or(f64::NAN);
    let mut crossings = 0;
    for a in 0..scan.curves.len() {
        for b in a + 1..scan.curves.len() {
            // The file geometry is D6h to about 1e-5 eV in these levels.
            let degenerate = (energy(a, 40) - energy(b, 40)).abs() < 1e-3;
            let split = (energy(a, 0) - energy(b, 0)).abs() > 0.01;
            if degenerate && split {
                // Mirror images: the spectrum at 100° equals the one at 140°, swapped.
                assert!(
                    (energy(a, 0) - energy(b, 80)).abs() < 1e-4,
                    "curves {a}, {b}"
                );
                assert!(
                    (energy(b, 0) - energy(a, 80)).abs() < 1e-4,
                    "curves {a}, {b}"
                );
                crossings += 1;
            }
        }
    }
    assert!(crossings >= 2, "{crossings} crossing pairs");
    Ok(())
}
