//! The series exports read back by readers we did not write: the CSV by the `csv` crate
//! (an RFC 4180 reader), the SVG by roxmltree (XML) and usvg/resvg (SVG, rendered), the
//! JSON by serde_json; and the `compare` subcommand's exit codes for bad input.

mod series_support;

use std::process::Command;

use diptych::diagram::png::RasterImage;
use diptych::diagram::{Resolution, render_png};
use diptych::series::svg::{SeriesSvgOptions, series_svg};
use diptych::series::table::COLUMNS;
use diptych::series::{self, Series};
use series_support::{demo_inputs, repository};

fn demo_series() -> Series {
    series::compare(&demo_inputs()).expect("the demo set analyses")
}

#[test]
fn csv_reads_back_with_an_rfc_4180_reader() {
    let mut compared = demo_series();
    // A name that needs quoting: comma, quote and a line break.
    compared.rows[0].name = "ammonia, \"dry\"\nsample".into();
    let text = series::csv::to_csv(&compared);
    assert!(text.ends_with("\r\n"), "records end in CRLF");
    let mut reader = csv::ReaderBuilder::new().from_reader(text.as_bytes());
    let header: Vec<String> = reader
        .headers()
        .expect("a header")
        .iter()
        .map(String::from)
        .collect();
    assert_eq!(header, COLUMNS);
    let records: Vec<csv::StringRecord> = reader
        .records()
        .collect::<Result<_, _>>()
        .expect("every record reads");
    assert_eq!(records.len(), 11);
    assert_eq!(&records[0][0], "ammonia, \"dry\"\nsample");
    let column = |name: &str| COLUMNS.iter().position(|c| *c == name).expect("column");
    for (record, row) in records.iter().zip(&compared.rows) {
        assert_eq!(record.len(), COLUMNS.len());
        let homo: f64 = record[column("homo_ev")].parse().expect("a number");
        let expected = row.homo.as_ref().expect("HOMO").energy_ev;
        assert!((homo - expected).abs() < 6e-4, "{homo} vs {expected}");
        assert!(!record[column("measured_source")].is_empty());
    }
    // Ammonia's donor is its nitrogen.
    assert_eq!(&records[0][column("donor_atom")], "N0");
}

#[test]
fn svg_parses_as_xml_and_renders() {
    let mut compared = demo_series();
    compared.rows[1].name = "<phosphine> & \"friends\"".into();
    let options = SeriesSvgOptions::default();
    let svg = series_svg(&compared, &options);
    assert_eq!(
        svg,
        series_svg(&compared, &options),
        "same bytes every time"
    );
    let document = roxmltree::Document::parse(&svg).expect("well-formed XML");
    let root = document.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(
        root.tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    assert!(svg.contains("&lt;phosphine&gt; &amp; &quot;friends&quot;"));
    for id in ["lone-pair-energy-vs-s", "koopmans", "legend"] {
        assert!(
            document
                .descendants()
                .any(|n| n.attribute("id") == Some(id)),
            "group {id}"
        );
    }
    // One circle per molecule with a measured value (all eleven) and a line per fit.
    assert_eq!(svg.matches("<circle").count(), 11);
    assert!(svg.contains("r² = "));
    let png = render_png(&svg, Resolution::Dpi(48.0)).expect("usvg/resvg render it");
    let image = RasterImage::decode_png(&png).expect("a PNG");
    // CSS pixels are 1/96 inch (CSS Values and Units Level 3, §5.2).
    assert_eq!(image.width() as f64, (options.width * 48.0 / 96.0).round());
    let inked = image
        .pixels()
        .iter()
        .filter(|p| p.red() < 200 || p.green() < 200 || p.blue() < 200)
        .count();
    assert!(inked > 500, "{inked} inked pixels: blank plot?");
}

#[test]
fn json_has_stable_field_names() {
    let compared = demo_series();
    let value: serde_json::Value = serde_json::from_str(&series::to_json(&compared)).expect("JSON");
    let rows = value["rows"].as_array().expect("rows");
    assert_eq!(rows.len(), 11);
    let ammonia = &rows[0];
    for key in [
        "name",
        "formula",
        "label",
        "point_group",
        "electrons",
        "homo",
        "lumo",
        "gap_ev",
        "donor",
        "lone_pairs",
        "lewis_share",
        "measured",
        "notes",
    ] {
        assert!(ammonia.get(key).is_some(), "row field {key}");
    }
    for key in [
        "atom",
        "element",
        "label",
        "energy_ev",
        "s_percent",
        "lambda",
        "axis_angle_degrees",
        "atom_charge",
        "central",
    ] {
        assert!(ammonia["donor"].get(key).is_some(), "donor field {key}");
    }
    for key in ["slope", "offset", "r_squared", "points"] {
        assert!(value["homo_fit"].get(key).is_some(), "fit field {key}");
    }
    assert_eq!(ammonia["point_group"], "C3v");
}

fn diptych(args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(args)
        .current_dir(repository())
        .output()
        .expect("the binary runs")
}

#[test]
fn compare_writes_each_format_and_refuses_bad_input_with_one_line() {
    let folder = tempfile::tempdir().expect("temp folder");
    let files = ["demo_molecules/ammonia.xyz", "demo_molecules/phosphine.xyz"];
    for extension in ["csv", "md", "svg", "json"] {
        let out = folder.path().join(format!("out.{extension}"));
        let out_text = out.to_string_lossy().to_string();
        let output = diptych(&["compare", files[0], files[1], "-o", &out_text]);
        assert!(
            output.status.success(),
            "{}",
            String::from_utf8_lossy(&output.stderr)
        );
        let written = std::fs::read_to_string(&out).expect("written");
        assert!(written.contains("phosphine"), "{extension}");
    }
    let json = diptych(&["compare", files[0], "--format", "json"]);
    assert!(json.status.success());
    let value: serde_json::Value = serde_json::from_slice(&json.stdout).expect("JSON on stdout");
    assert_eq!(value["rows"][0]["donor"]["element"], "N");

    let missing = diptych(&["compare", "demo_molecules/no_such_file.xyz"]);
    let wrong_extension = diptych(&["compare", files[0], "-o", "out.png"]);
    let many: Vec<&str> = std::iter::once("compare")
        .chain(std::iter::repeat_n(files[0], 101))
        .collect();
    let too_many = diptych(&many);
    for (what, output) in [
        ("missing file", missing),
        ("wrong extension", wrong_extension),
        ("101 molecules", too_many),
    ] {
        assert_eq!(output.status.code(), Some(2), "{what}");
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(stderr.trim_end().lines().count(), 1, "{what}: {stderr}");
        assert!(stderr.starts_with("diptych: "), "{what}: {stderr}");
    }
}
