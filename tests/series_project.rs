//! Series documents: the demo series of the eleven donors opens and gives the same numbers
//! as the files one by one; a series saves and reopens unchanged; embedded molecules,
//! per-member donors and measured values are honoured; bad documents are refused with a
//! message, by the library and by `diptych compare` (exit code 2, one line).

mod series_support;

use std::process::Command;

use diptych::project::{Project, open_path};
use diptych::series::measured::IonizationRecord;
use diptych::series::project::{MemberSource, SERIES_VERSION, SeriesMember, SeriesProject};
use diptych::series::{self, DonorChoice};
use series_support::{DEMO_DONORS, demo_inputs, repository};

#[test]
fn the_demo_series_gives_the_numbers_of_its_files() {
    let path = repository().join("demo_molecules/donors.diptych-series.ron");
    let document = SeriesProject::load(&path).expect("the demo series reads");
    assert_eq!(document.members.len(), DEMO_DONORS.len());
    let inputs = document
        .inputs(path.parent().expect("folder"))
        .expect("every member opens");
    let from_document = series::compare(&inputs).expect("analyses");
    let one_by_one = series::compare(&demo_inputs()).expect("analyses");
    for (a, b) in from_document.rows.iter().zip(&one_by_one.rows) {
        assert_eq!(a.homo, b.homo, "{}", a.name);
        assert_eq!(a.donor, b.donor, "{}", a.name);
        assert_eq!(a.measured, b.measured, "{}", a.name);
    }
    assert_eq!(from_document.homo_fit, one_by_one.homo_fit);
}

#[test]
fn a_series_with_embedded_molecules_round_trips_and_its_choices_are_used() {
    let water = open_path(&repository().join("demo_molecules/water.xyz"))
        .expect("opens")
        .project
        .molecule;
    let document = SeriesProject {
        version: SERIES_VERSION,
        title: "water <σ> & \"p\"".into(),
        members: vec![
            SeriesMember {
                source: MemberSource::Embedded(water.clone()),
                settings: None,
                donor: DonorChoice::RichestInS(0),
                label: Some("water (gas)".into()),
                ionization: Some(IonizationRecord {
                    vertical_ev: vec![14.7, 12.6],
                    source: "our own measurement".into(),
                }),
            },
            SeriesMember {
                source: MemberSource::File("ammonia.xyz".into()),
                settings: None,
                donor: DonorChoice::Auto,
                label: None,
                ionization: None,
            },
        ],
    };
    let folder = tempfile::tempdir().expect("temp folder");
    std::fs::copy(
        repository().join("demo_molecules/ammonia.xyz"),
        folder.path().join("ammonia.xyz"),
    )
    .expect("copied");
    let path = folder.path().join("pair.diptych-series.ron");
    document.save(&path).expect("saves");
    let again = SeriesProject::load(&path).expect("reopens");
    assert_eq!(again, document);
    let compared =
        series::compare(&again.inputs(folder.path()).expect("members open")).expect("analyses");
    let water_row = &compared.rows[0];
    // The member's own value (its lowest) and source, not the bundled table's.
    let measured = water_row.measured.as_ref().expect("measured");
    assert_eq!(
        (measured.energy_ev, measured.source.as_str()),
        (12.6, "our own measurement")
    );
    // RichestInS(0): the in-plane σ lone pair, not the higher p lone pair.
    let donor = water_row.donor.as_ref().expect("donor");
    assert!(donor.s_percent.unwrap_or(0.0) > 20.0);
    assert_eq!(compared.rows[1].formula, "H3N");
    // The member's label names the row; without one, the formula as chemists write it.
    assert_eq!(water_row.label, "water (gas)");
    assert_eq!(compared.rows[1].label, "NH3");
}

#[test]
fn a_project_keeps_its_measured_values() {
    let mut project = Project::new(
        open_path(&repository().join("demo_molecules/ammonia.xyz"))
            .expect("opens")
            .project
            .molecule,
    );
    project.ionization = Some(IonizationRecord {
        vertical_ev: vec![10.85, 16.4],
        source: "from memory".into(),
    });
    let text = project.to_ron().expect("writes");
    assert_eq!(Project::from_ron(&text).expect("reads"), project);
    let broken = text.replace("10.85", "-3.0");
    assert!(
        Project::from_ron(&broken).is_err(),
        "a negative energy is refused"
    );
}

#[test]
fn bad_series_documents_are_refused() {
    let ammonia = "(source: File(\"ammonia.xyz\"))";
    let cases = [
        ("(version: 1, members: [])".to_string(), "at least one"),
        (
            format!("(version: 1, members: [{}])", vec![ammonia; 101].join(", ")),
            "at most 100",
        ),
        (format!("(version: 9, members: [{ammonia}])"), "newer"),
        (
            format!("(version: 1, members: [{ammonia}], colour: 3)"),
            "colour",
        ),
        (
            "(version: 1, members: [(source: File(\"a.xyz\"), ionization: Some((vertical_ev: [1e9], source: \"x\")))])"
                .to_string(),
            "between 0 and",
        ),
        (
            format!(
                "(version: 1, members: [(source: File(\"a.xyz\"), label: Some(\"{}\"))])",
                "x".repeat(41)
            ),
            "longer than 40",
        ),
    ];
    for (text, expected) in &cases {
        let error = SeriesProject::from_ron(text)
            .expect_err("refused")
            .to_string();
        assert!(error.contains(expected), "{error}");
        assert_eq!(error.lines().count(), 1, "{error}");
    }
    let folder = tempfile::tempdir().expect("temp folder");
    let path = folder.path().join("bad.diptych-series.ron");
    std::fs::write(&path, &cases[0].0).expect("written");
    let output = Command::new(env!("CARGO_BIN_EXE_diptych"))
        .arg("compare")
        .arg(&path)
        .output()
        .expect("runs");
    assert_eq!(output.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&output.stderr);
    assert_eq!(stderr.trim_end().lines().count(), 1, "{stderr}");
    // A member file that does not exist names the member.
    let missing = folder.path().join("missing.diptych-series.ron");
    std::fs::write(
        &missing,
        "(version: 1, members: [(source: File(\"nowhere.xyz\"))])",
    )
    .expect("written");
    let error = SeriesProject::load(&missing)
        .expect("reads")
        .inputs(folder.path())
        .expect_err("the member is missing")
        .to_string();
    assert!(error.starts_with("member 0:"), "{error}");
}

#[test]
fn the_command_line_gives_the_library_numbers_for_the_demo_series() {
    let path = repository().join("demo_molecules/donors.diptych-series.ron");
    let document = SeriesProject::load(&path).expect("reads");
    let inputs = document
        .inputs(path.parent().expect("folder"))
        .expect("members open");
    let library: serde_json::Value = serde_json::from_str(&series::to_json(
        &series::compare(&inputs).expect("analyses"),
    ))
    .expect("JSON");
    let output = Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(["compare", "--format", "json"])
        .arg(&path)
        .output()
        .expect("runs");
    assert!(output.status.success());
    let cli: serde_json::Value = serde_json::from_slice(&output.stdout).expect("JSON");
    assert_eq!(cli, library);
}

#[test]
fn donors_are_chosen_in_the_document_as_the_readme_spells_them() {
    let text = "(version: 1, members: [\
        (source: File(\"water.xyz\"), donor: RichestInS(0)),\
        (source: File(\"ammonia.xyz\"), donor: Atom(0)),\
        (source: File(\"nitrogen_trifluoride.xyz\"), donor: Highest),\
        (source: File(\"water.xyz\"), donor: RichestInSOnDonorAtom),\
        (source: File(\"water.xyz\"), donor: Auto)])";
    let document = SeriesProject::from_ron(text).expect("reads");
    let inputs = document
        .inputs(&repository().join("demo_molecules"))
        .expect("members open");
    let rows = series::compare(&inputs).expect("analyses").rows;
    let s = |k: usize| {
        rows[k]
            .donor
            .as_ref()
            .and_then(|d| d.s_percent)
            .unwrap_or(-1.0)
    };
    let element = |k: usize| rows[k].donor.as_ref().map(|d| d.element.clone());
    assert!(s(0) > 20.0, "water's σ lone pair");
    assert_eq!(element(1).as_deref(), Some("N"));
    assert_eq!(
        element(2).as_deref(),
        Some("F"),
        "NF3's literal highest lone pair"
    );
    assert_eq!(s(3), s(0), "σ lone pair on the auto donor's atom");
    assert!(s(4) < 1.0, "auto: water's highest lone pair is 1b1, pure p");
}
