//! The Walsh SVG: well-formed standalone SVG 1.1 text (W3C SVG 1.1, 2nd ed., 2011), user
//! strings escaped, failed points marked, the optional λ and Σε panels, same bytes every time.

use std::path::Path;

use diptych::analysis::Settings;
use diptych::project::open_path;
use diptych::scan::point::{analyse_point, point_settings};
use diptych::scan::svg::{WalshSvgOptions, walsh_svg};
use diptych::scan::{Coordinate, ScanProgress, ScanRequest, run_scan_with};

type TestResult = Result<(), Box<dyn std::error::Error>>;

#[test]
fn walsh_svg_escapes_marks_failures_and_is_deterministic() -> TestResult {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/water.xyz");
    let water = open_path(&path)?.project.molecule;
    let request = ScanRequest {
        coordinate: Coordinate::SymmetricBend { centre: 0 },
        from: 100.0,
        to: 180.0,
        steps: 9,
    };
    let settings = point_settings(&Settings::default());
    let scan = run_scan_with(&water, &request, &ScanProgress::new(), 2, |geometry| {
        let angle = geometry.angle(1, 0, 2).map_err(|e| e.to_string())?;
        if (angle - 140.0).abs() < 1e-6 {
            return Err("injected".into());
        }
        analyse_point(geometry, &settings)
    })?;
    let options = WalshSvgOptions {
        title: Some("H₂O <bend> & \"more\"".into()),
        marker: Some(104.5),
        ..Default::default()
    };
    let svg = walsh_svg(&scan, &options);
    assert_eq!(svg, walsh_svg(&scan, &options), "same bytes");
    assert!(svg.starts_with("<?xml") && svg.trim_end().ends_with("</svg>"));
    assert!(svg.contains("H₂O &lt;bend&gt; &amp; &quot;more&quot;"));
    assert!(!svg.contains("<bend>"));
    assert!(
        svg.contains("id=\"failed-points\""),
        "the failed point is marked"
    );
    assert!(svg.contains("id=\"marker\""));
    assert!(svg.contains("id=\"panel-lambda\"") && svg.contains("id=\"panel-sum\""));
    // Every <g> and <text> is closed.
    assert_eq!(
        svg.matches("<g ").count() + svg.matches("<g>").count(),
        svg.matches("</g>").count()
    );
    assert_eq!(svg.matches("<text").count(), svg.matches("</text>").count());
    // Curves are broken at the failed point: two segments per curve.
    assert!(svg.matches("<polyline").count() >= 2 * scan.curves.len());
    let bare = walsh_svg(
        &scan,
        &WalshSvgOptions {
            lambda_panel: false,
            sum_panel: false,
            ..Default::default()
        },
    );
    assert!(!bare.contains("panel-lambda") && !bare.contains("panel-sum"));
    Ok(())
}

fn scan_of(
    file: &str,
    coordinate: Coordinate,
    from: f64,
    to: f64,
    steps: usize,
) -> diptych::scan::Scan {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(file);
    let molecule = open_path(&path).expect("demo file").project.molecule;
    let request = ScanRequest {
        coordinate,
        from,
        to,
        steps,
    };
    let settings = point_settings(&Settings::default());
    run_scan_with(&molecule, &request, &ScanProgress::new(), 2, |geometry| {
        analyse_point(geometry, &settings)
    })
    .expect("scan")
}

/// Ammonia from 90° (pure p bonds: Coulson's relations have no solution, so the geometric
/// model has no λ there) to 100°: the geometric λ is `NoSolution` at 90° only, drawn as a
/// gap with a × and explained in the caption — no jump to another model's value.
#[test]
fn points_without_a_geometric_solution_are_gaps_with_marks() {
    use diptych::scan::Lambda;
    let scan = scan_of(
        "ammonia.xyz",
        Coordinate::Pyramidalize { centre: 0 },
        90.0,
        100.0,
        5,
    );
    let geometric: Vec<_> = scan
        .lambdas
        .iter()
        .filter(|l| l.key.model == "geometric")
        .collect();
    assert_eq!(geometric.len(), 4, "three bonds and the lone pair");
    for series in &geometric {
        assert_eq!(
            series.values[0],
            Some(Lambda::NoSolution),
            "{:?}",
            series.key
        );
        assert!(
            series.values[1..]
                .iter()
                .all(|v| matches!(v, Some(Lambda::Finite(_)) | Some(Lambda::PureP)))
        );
    }
    // Just above 90° the lone pair is nearly pure s (Coulson: λ → 0 as the bonds become p).
    let lone_pair = geometric.iter().find(|l| l.key.partner.is_none()).unwrap();
    assert!(matches!(lone_pair.values[1], Some(Lambda::Finite(v)) if v < 0.2));
    let svg = walsh_svg(&scan, &WalshSvgOptions::default());
    assert!(svg.contains("relations have no solution here"));
    assert!(svg.contains("<path stroke="), "× marks drawn");
    assert!(svg.contains("J. Chem. Soc. 1953, 2260"), "the Σε caption");
}

/// Water's b1 and b2 levels (and every other pair of irreps in one scan) get different
/// colours; the first irrep of a family keeps the correlation diagram's colour.
#[test]
fn every_irrep_of_a_scan_has_its_own_colour() {
    use diptych::scan::palette::irrep_colours;
    let scan = scan_of(
        "water.xyz",
        Coordinate::SymmetricBend { centre: 0 },
        100.0,
        120.0,
        3,
    );
    let palette = irrep_colours(&scan);
    let irreps: Vec<&str> = palette.iter().map(|(i, _)| i.as_str()).collect();
    assert!(
        irreps.contains(&"b1") && irreps.contains(&"b2"),
        "{irreps:?}"
    );
    for (i, (a, x)) in palette.iter().enumerate() {
        for (b, y) in &palette[i + 1..] {
            assert_ne!(x, y, "{a} and {b} share a colour");
        }
    }
    let first_b = palette.iter().find(|(i, _)| i.starts_with('b')).unwrap();
    assert_eq!(first_b.1, diptych::diagram::style::level_rgb("b"));
}
