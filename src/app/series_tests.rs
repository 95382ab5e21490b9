//! GUI tests of the Series window (issue 20): the demo series opens with its table and
//! the formulae as chemists write them, and a donor chosen in the table's menu changes
//! the document and the row after the series is analysed again.

use std::path::Path;
use std::time::{Duration, Instant};

use eframe::egui;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;

use super::DiptychApp;
use diptych::series::DonorChoice;

fn harness() -> Harness<'static, DiptychApp> {
    let app = DiptychApp::new(egui::Context::default(), None, None);
    Harness::builder()
        .with_size(egui::vec2(1600.0, 1000.0))
        .build_ui_state(|ui, app: &mut DiptychApp| app.frame_ui(ui), app)
}

/// Steps frames until the series thread has delivered, or fails after 60 s.
fn wait_for_series(harness: &mut Harness<'static, DiptychApp>) {
    let start = Instant::now();
    loop {
        harness.step();
        let window = &harness.state().series;
        if window.is_ready() && window.series.is_some() {
            harness.step();
            return;
        }
        assert!(start.elapsed() < Duration::from_secs(60), "no series");
        std::thread::sleep(Duration::from_millis(5));
    }
}

fn open_demo_series(harness: &mut Harness<'static, DiptychApp>) {
    let path =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/donors.diptych-series.ron");
    let context = harness.ctx.clone();
    harness.state_mut().series.open_path(&context, &path);
    wait_for_series(harness);
}

#[test]
fn the_demo_series_shows_every_molecule_by_its_usual_formula() {
    let mut harness = harness();
    open_demo_series(&mut harness);
    let rows = &harness.state().series.series.as_ref().unwrap().rows;
    assert_eq!(rows.len(), 11);
    // Table cells with subscript digits, one per molecule (IUPAC order for binary
    // compounds, the document's label for HCN, Hill order otherwise).
    for label in [
        "NH₃", "PH₃", "NF₃", "H₂O", "CH₄", "BF₃", "CH₂O", "C₂H₄", "HCN", "C₃H₆", "CH₃Cl",
    ] {
        assert!(
            harness.query_by_label(label).is_some(),
            "no table cell {label}"
        );
    }
    assert!(
        harness.query_by_label("H₃N").is_none(),
        "a Hill formula is shown"
    );
    assert!(harness.query_by_label_contains("ε(n) eV").is_some());
}

#[test]
fn a_donor_chosen_in_the_table_changes_the_row_and_marks_the_series_changed() {
    let mut harness = harness();
    open_demo_series(&mut harness);
    let water = |h: &Harness<'static, DiptychApp>| {
        let series = h.state().series.series.as_ref().unwrap();
        series
            .rows
            .iter()
            .find(|r| r.label == "H2O")
            .unwrap()
            .clone()
    };
    let before = water(&harness);
    let donor_before = before.donor.clone().expect("water has a donor");
    // Water's two oxygen lone pairs: the automatic donor is the higher one (the p lone
    // pair); "s-richest on O0" is the in-plane σ lone pair, richer in s and lower.
    harness.get_by_label_contains("Donor of H2O").click();
    harness.run_steps(2);
    harness.get_by_label("s-richest on O0").click();
    harness.run_steps(2);
    wait_for_series(&mut harness);
    let after = water(&harness);
    let donor_after = after.donor.expect("a donor after the change");
    assert!(
        donor_after.s_percent.unwrap() > donor_before.s_percent.unwrap_or(0.0) + 1.0,
        "s share {:?} → {:?}",
        donor_before.s_percent,
        donor_after.s_percent
    );
    assert!(donor_after.energy_ev < donor_before.energy_ev);
    let window = &harness.state().series;
    let (_, document) = window.document.as_ref().unwrap();
    assert_eq!(document.members[3].donor, DonorChoice::RichestInS(0));
    assert!(
        harness
            .query_by_label_contains("(changed, not saved)")
            .is_some()
    );
}
