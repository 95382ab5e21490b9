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
