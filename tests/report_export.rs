//! Markdown, CSV and JSON reports of an analysis read back: Markdown table rows counted,
//! CSV parsed by an independent RFC 4180 reader written here, JSON keys of DESIGN §5.5.

use std::path::PathBuf;

use diptych::analysis::Analysis;
use diptych::project::open_path;
use diptych::report::{to_csv, to_json, to_markdown};

fn ammonia_analysis(name: Option<&str>) -> Analysis {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz");
    let mut opened = open_path(&path).expect("opens");
    if let Some(name) = name {
        opened.project.molecule.name = name.into();
    }
    Analysis::run(&opened.project.molecule, &opened.project.settings).expect("analyses")
}

/// Body rows of each `## heading` table of a Markdown document (header and rule excluded).
fn markdown_tables(markdown: &str) -> Vec<(String, Vec<Vec<String>>)> {
    let mut tables: Vec<(String, Vec<Vec<String>>)> = Vec::new();
    let mut lines_in_table = 0;
    for line in markdown.lines() {
        if let Some(heading) = line.strip_prefix("## ") {
            tables.push((heading.to_string(), Vec::new()));
            lines_in_table = 0;
        } else if line.starts_with('|') {
            lines_in_table += 1;
            if lines_in_table > 2
                && let Some((_, rows)) = tables.last_mut()
            {
                let inner = line.trim().trim_start_matches('|').trim_end_matches('|');
                rows.push(inner.split(" | ").map(|c| c.trim().to_string()).collect());
            }
        }
    }
    tables
}

#[test]
fn markdown_tables_have_one_row_per_orbital_hybrid_and_weight() {
    let analysis = ammonia_analysis(None);
    let markdown = to_markdown(&analysis);
    let tables = markdown_tables(&markdown);
    let rows = |prefix: &str| {
        tables
            .iter()
            .find(|(title, _)| title.starts_with(prefix))
            .map(|(_, rows)| rows.clone())
            .unwrap_or_else(|| panic!("no table '{prefix}' in\n{markdown}"))
    };
    let orbitals = rows("Canonical molecular orbitals");
    // Minimal valence basis: N 2s 2p and three H 1s give 7 MOs (any EHT text, e.g.
    // Hoffmann, J. Chem. Phys. 39, 1397 (1963)).
    assert_eq!(orbitals.len(), 7);
    assert_eq!(orbitals.len(), analysis.orbitals.len());
    for (row, orbital) in orbitals.iter().zip(&analysis.orbitals) {
        assert_eq!(row.len(), 6);
        let energy: f64 = row[1].parse().expect("energy is a number");
        assert!((energy - orbital.energy_ev).abs() < 5e-4);
        assert_eq!(Some(&row[4]), orbital.label.as_ref());
        assert!(row[5].contains("N0"), "composition names atoms: {}", row[5]);
    }
    let hybrids = rows("Hybrids per centre");
    // Three N–H bond hybrids and one lone-pair hybrid on N.
    assert_eq!(hybrids.len(), 4);
    assert_eq!(hybrids.len(), analysis.hybrid_entries.len());
    assert_eq!(
        hybrids.iter().filter(|r| r[1] == "lone_pair").count(),
        1,
        "one lone pair"
    );
    assert!(hybrids.iter().all(|r| r[0] == "N0"));
    assert_eq!(rows("Localized orbitals").len(), analysis.localized.len());
    let weights = rows("Correlation weights");
    assert_eq!(weights.len(), analysis.links.len());
    assert!(weights.len() > 7);
}

/// A small RFC 4180 reader: records of fields, quoted fields may hold commas, doubled
/// quotes and line breaks; records end in CRLF (a bare LF is accepted too).
fn parse_csv(text: &str) -> Result<Vec<Vec<String>>, String> {
    let mut records = Vec::new();
    let mut record = Vec::new();
    let mut field = String::new();
    let mut chars = text.chars().peekable();
    let mut quoted = false;
    let mut was_quoted = false;
    while let Some(c) = chars.next() {
        if quoted {
            match c {
                '"' if chars.peek() == Some(&'"') => {
                    chars.next();
                    field.push('"');
                }
                '"' => quoted = false,
                c => field.push(c),
            }
            continue;
        }
        match c {
            '"' if field.is_empty() && !was_quoted => {
                quoted = true;
                was_quoted = true;
            }
            '"' => return Err(format!("stray quote after '{field}'")),
            ',' => {
                record.push(std::mem::take(&mut field));
                was_quoted = false;
            }
            '\r' if chars.peek() == Some(&'\n') => {}
            '\n' => {
                record.push(std::mem::take(&mut field));
                records.push(std::mem::take(&mut record));
                was_quoted = false;
            }
            c if was_quoted => return Err(format!("text '{c}' after a closing quote")),
            c => field.push(c),
        }
    }
    if quoted {
        return Err("unterminated quote".into());
    }
    if !field.is_empty() || !record.is_empty() {
        record.push(field);
        records.push(record);
    }
    Ok(records)
}

#[test]
fn csv_is_one_long_table_and_round_trips_awkward_text() {
    let awkward = "NH3, \"pyramidal\"\nsecond line | σ/π";
    let analysis = ammonia_analysis(Some(awkward));
    let csv = to_csv(&analysis);
    assert!(csv.contains("\r\n"), "RFC 4180 line ends");
    let records = parse_csv(&csv).expect("valid RFC 4180");
    assert_eq!(records[0], ["table", "row", "column", "value"]);
    assert!(
        records.iter().all(|r| r.len() == 4),
        "every record has four fields"
    );
    let value = |table: &str, row: &str, column: &str| {
        records
            .iter()
            .find(|r| r[0] == table && r[1] == row && r[2] == column)
            .map(|r| r[3].clone())
    };
    // The molecule table holds property/value pairs; find the name's row.
    let name_row = records
        .iter()
        .find(|r| r[0] == "molecule" && r[2] == "property" && r[3] == "name")
        .map(|r| r[1].clone())
        .expect("name row");
    assert_eq!(
        value("molecule", &name_row, "value").as_deref(),
        Some(awkward)
    );
    let mo_rows: std::collections::BTreeSet<&str> = records
        .iter()
        .filter(|r| r[0] == "canonical_mos")
        .map(|r| r[1].as_str())
        .collect();
    assert_eq!(mo_rows.len(), analysis.orbitals.len());
    for (n, orbital) in analysis.orbitals.iter().enumerate() {
        let energy: f64 = value("canonical_mos", &(n + 1).to_string(), "energy_ev")
            .and_then(|e| e.parse().ok())
            .expect("energy cell");
        assert!((energy - orbital.energy_ev).abs() < 5e-4);
    }
    // λ of a lone pair or bond is finite here; a pure p orbital would read ∞.
    let lambdas: Vec<String> = records
        .iter()
        .filter(|r| r[0] == "hybrids" && r[2] == "lambda")
        .map(|r| r[3].clone())
        .collect();
    assert_eq!(lambdas.len(), analysis.hybrid_entries.len());
    for (text, entry) in lambdas.iter().zip(&analysis.hybrid_entries) {
        match entry.lambda {
            Some(l) if l < 1e3 => assert!((text.parse::<f64>().unwrap() - l).abs() < 1e-3),
            _ => assert_eq!(text, "∞"),
        }
    }
}

#[test]
fn markdown_keeps_a_table_row_on_one_line_whatever_the_name() {
    let markdown = to_markdown(&ammonia_analysis(Some("a | b\nc")));
    let tables = markdown_tables(&markdown);
    let molecule = &tables
        .iter()
        .find(|(t, _)| t == "Molecule")
        .expect("molecule table")
        .1;
    assert_eq!(
        molecule[0].len(),
        2,
        "the pipe is escaped: {:?}",
        molecule[0]
    );
    assert_eq!(molecule[0][1], "a \\| b c");
}

#[test]
fn json_has_the_keys_of_design_5_5() {
    let json: serde_json::Value =
        serde_json::from_str(&to_json(&ammonia_analysis(None))).expect("valid JSON");
    for key in [
        "point_group",
        "electrons",
        "orbitals",
        "hybrids",
        "localized",
        "links",
    ] {
        assert!(json.get(key).is_some(), "missing {key}");
    }
    assert_eq!(json["point_group"], "C3v");
    let orbital = &json["orbitals"][0];
    for key in ["energy_ev", "occupancy", "irrep", "label"] {
        assert!(orbital.get(key).is_some(), "orbital lacks {key}");
    }
    let hybrid = &json["hybrids"][0];
    for key in ["center", "partner", "kind", "lambda", "model"] {
        assert!(hybrid.get(key).is_some(), "hybrid lacks {key}");
    }
    let localized = &json["localized"][0];
    for key in ["kind", "atoms", "energy_ev", "occupancy"] {
        assert!(localized.get(key).is_some(), "localized lacks {key}");
    }
    let link = &json["links"][0];
    for key in ["localized", "canonical", "weight"] {
        assert!(link.get(key).is_some(), "link lacks {key}");
    }
}

#[test]
fn the_csv_reader_of_these_tests_rejects_broken_quoting() {
    assert_eq!(
        parse_csv("a,\"b,c\"\r\n\"d\"\"e\",f\r\n").unwrap(),
        vec![vec!["a", "b,c"], vec!["d\"e", "f"]]
    );
    assert!(parse_csv("a,\"b\r\n").is_err());
    assert!(parse_csv("a,\"b\"c\r\n").is_err());
}

/// The value cell of the molecule table's `name` row.
fn csv_name_cell(records: &[Vec<String>]) -> String {
    let row = records
        .iter()
        .find(|r| r[0] == "molecule" && r[2] == "property" && r[3] == "name")
        .map(|r| r[1].clone())
        .expect("name row");
    records
        .iter()
        .find(|r| r[0] == "molecule" && r[1] == row && r[2] == "value")
        .map(|r| r[3].clone())
        .expect("name value")
}

#[test]
fn csv_text_cells_never_start_a_spreadsheet_formula_and_numbers_stay_numbers() {
    // The failing input of issue 18: a name that a spreadsheet would run as a formula.
    for name in [
        "=HYPERLINK(\"http://x\",\"NH3\")",
        "+1+2",
        "-2+3",
        "@SUM(A1)",
        "\tx",
    ] {
        let csv = to_csv(&ammonia_analysis(Some(name)));
        let records = parse_csv(&csv).expect("valid RFC 4180");
        assert_eq!(csv_name_cell(&records), format!("'{name}"), "{name:?}");
        let negative_energies = records
            .iter()
            .filter(|r| r[0] == "canonical_mos" && r[2] == "energy_ev")
            .filter(|r| r[3].starts_with('-') && r[3].parse::<f64>().is_ok())
            .count();
        assert!(negative_energies > 0, "negative energies are still numbers");
    }
}

#[test]
fn the_scan_csv_and_the_report_csv_share_line_ends() {
    use diptych::scan::{Coordinate, ScanProgress, ScanRequest, csv::to_csv as scan_csv};
    let analysis = ammonia_analysis(None);
    let request = ScanRequest {
        coordinate: Coordinate::Pyramidalize { centre: 0 },
        from: 100.0,
        to: 110.0,
        steps: 2,
    };
    let scan = diptych::scan::run_scan(
        &analysis.molecule,
        &analysis.settings,
        &request,
        &ScanProgress::new(),
    )
    .expect("scan");
    for csv in [scan_csv(&scan), to_csv(&analysis)] {
        let bare_line_feeds = csv.matches('\n').count() - csv.matches("\r\n").count();
        assert_eq!(bare_line_feeds, 0, "CRLF only");
        assert!(parse_csv(&csv).is_ok());
    }
}

#[test]
fn markdown_shows_html_in_a_name_as_text() {
    let markdown = to_markdown(&ammonia_analysis(Some("<img src=x onerror=alert(1)> & co")));
    assert!(!markdown.contains("<img"), "{markdown}");
    assert!(markdown.contains("&lt;img src=x onerror=alert(1)&gt; &amp; co"));
}
