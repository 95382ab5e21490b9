//! `diptych export` (SVG and PNG) and `diptych report` end to end: the acceptance command
//! of the publication-output issue, and bad input — existing files, unwritable places,
//! unusable sizes and resolutions, empty titles — refused with exit code 2 (DESIGN §5.4)
//! and nothing written.

use std::path::{Path, PathBuf};
use std::process::Output;

use diptych::diagram::png::RasterImage;

mod cli_support;
use cli_support::diptych;

fn path_arg(path: &Path) -> String {
    path.to_string_lossy().into_owned()
}

fn listing(folder: &Path) -> Vec<PathBuf> {
    let mut entries: Vec<PathBuf> = std::fs::read_dir(folder)
        .expect("folder")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .collect();
    entries.sort();
    entries
}

fn assert_bad_input(output: &Output, message: &str) {
    let stderr = String::from_utf8_lossy(&output.stderr);
    assert_eq!(output.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains(message),
        "expected '{message}' in '{stderr}'"
    );
    assert!(!stderr.contains("panicked"), "{stderr}");
}

#[test]
fn acceptance_ammonia_svg_has_both_titles_every_level_electrons_and_links() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("nh3.svg");
    let output = diptych(&[
        "export",
        "demo_molecules/ammonia.xyz",
        "-o",
        &path_arg(&out),
        "--names",
        "Symmetry orbitals",
        "Bonds and lone pairs",
    ]);
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    let svg = std::fs::read_to_string(&out).expect("written");
    let document = roxmltree::Document::parse(&svg).expect("XML");
    let text: Vec<String> = document
        .descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| {
            n.descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .collect::<String>()
        })
        .collect();
    for title in ["Symmetry orbitals", "Bonds and lone pairs"] {
        assert!(text.iter().any(|t| t == title), "title {title} missing");
    }
    // Labels of ammonia's levels in the default window (Mulliken labels, core-inclusive
    // numbering; Cotton, Chemical Applications of Group Theory, from memory) and its
    // localized orbitals; subscripts are separate tspans, so "2a1" reads "2a1" as text.
    for label in ["2a1", "1e", "3a1", "2e", "σ(N–H)", "n(N)", "σ*(N–H)"] {
        assert!(
            text.iter().any(|t| t.contains(label)),
            "label {label} missing from {text:?}"
        );
    }
    // Four electron pairs on the left and four on the right: 16 arrows.
    let arrows = document
        .descendants()
        .filter(|n| n.has_tag_name("path") && n.attribute("stroke-width") == Some("1.6"))
        .count();
    assert_eq!(arrows, 16);
    let links = document
        .descendants()
        .find(|n| n.attribute("id") == Some("links"))
        .map(|g| g.children().filter(|c| c.is_element()).count())
        .unwrap_or(0);
    assert!(links >= 4, "correlation lines: {links}");
}

#[test]
fn png_export_has_the_size_the_resolution_asks_for() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("nh3.png");
    let output = diptych(&[
        "export",
        "demo_molecules/ammonia.xyz",
        "-o",
        &path_arg(&out),
        "--dpi",
        "192",
    ]);
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    let image = RasterImage::decode_png(&std::fs::read(&out).expect("written")).expect("a PNG");
    // 1000×700 CSS pixels at 192 dpi: twice as many pixels (CSS px = 1/96 in).
    assert_eq!((image.width(), image.height()), (2000, 1400));
    let inked = image
        .pixels()
        .iter()
        .filter(|p| p.red() < 128 && p.alpha() == 255)
        .count();
    assert!(inked > 1000, "the PNG is not blank ({inked} dark pixels)");
}

#[test]
fn existing_output_is_kept_without_force_and_replaced_with_it() {
    let folder = tempfile::tempdir().expect("temp");
    for name in ["out.svg", "out.png", "out.md", "out.csv", "out.json"] {
        let out = folder.path().join(name);
        std::fs::write(&out, b"keep me").expect("written");
        let command = if name.ends_with(".svg") || name.ends_with(".png") {
            "export"
        } else {
            "report"
        };
        let output = diptych(&[command, "demo_molecules/water.xyz", "-o", &path_arg(&out)]);
        assert_bad_input(&output, "--force");
        assert_eq!(std::fs::read(&out).expect("still there"), b"keep me");
        let output = diptych(&[
            command,
            "demo_molecules/water.xyz",
            "-o",
            &path_arg(&out),
            "--force",
        ]);
        assert!(output.status.success(), "{name} with --force");
        assert_ne!(std::fs::read(&out).expect("replaced"), b"keep me");
    }
    // Only the outputs: no temporary files left over.
    assert_eq!(listing(folder.path()).len(), 5);
}

#[test]
fn unwritable_places_fail_cleanly_and_leave_nothing_behind() {
    let folder = tempfile::tempdir().expect("temp");
    // A path below a regular file cannot be created, even by root.
    let blocker = folder.path().join("not-a-folder");
    std::fs::write(&blocker, b"x").expect("written");
    for name in ["out.svg", "out.png", "out.md", "out.csv"] {
        let out = blocker.join(name);
        let command = if name.ends_with(".svg") || name.ends_with(".png") {
            "export"
        } else {
            "report"
        };
        let output = diptych(&[command, "demo_molecules/water.xyz", "-o", &path_arg(&out)]);
        assert_bad_input(&output, "cannot write");
    }
    let missing = folder.path().join("no/such/folder/out.svg");
    let output = diptych(&[
        "export",
        "demo_molecules/water.xyz",
        "-o",
        &path_arg(&missing),
    ]);
    assert_bad_input(&output, "cannot write");
    assert_eq!(listing(folder.path()), vec![blocker]);
}

#[test]
fn unusable_sizes_resolutions_and_titles_are_refused() {
    let folder = tempfile::tempdir().expect("temp");
    let svg = path_arg(&folder.path().join("out.svg"));
    let png = path_arg(&folder.path().join("out.png"));
    let pdf = path_arg(&folder.path().join("out.pdf"));
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (vec!["-o", &svg, "--width", "0"], "not usable"),
        (vec!["-o", &svg, "--height", "-300"], "not usable"),
        (vec!["-o", &png, "--width", "-1"], "not usable"),
        (vec!["-o", &png, "--dpi", "0"], "dpi"),
        (vec!["-o", &png, "--dpi", "-72"], "dpi"),
        (
            vec!["-o", &png, "--dpi", "2400", "--width", "90000"],
            "per side",
        ),
        (vec!["-o", &svg, "--names", "", "Localized"], "empty"),
        (vec!["-o", &svg, "--names", "Delocalized", "  "], "empty"),
        (vec!["-o", &svg, "--font-size", "0"], "font size"),
        (vec!["-o", &svg, "--link-threshold", "2"], "link threshold"),
        (vec!["-o", &pdf], ".svg, .png"),
    ];
    for (extra, message) in cases {
        let mut args = vec!["export", "demo_molecules/ammonia.xyz"];
        args.extend(extra.iter().copied());
        let output = diptych(&args);
        assert_bad_input(&output, message);
    }
    let output = diptych(&[
        "report",
        "demo_molecules/ammonia.xyz",
        "-o",
        &path_arg(&folder.path().join("out.xlsx")),
    ]);
    assert_bad_input(&output, ".md");
    assert!(listing(folder.path()).is_empty(), "nothing written");
}

#[test]
fn report_writes_each_format_by_extension() {
    let folder = tempfile::tempdir().expect("temp");
    for name in ["nh3.md", "nh3.csv", "nh3.json"] {
        let out = folder.path().join(name);
        let output = diptych(&[
            "report",
            "demo_molecules/ammonia.xyz",
            "-o",
            &path_arg(&out),
            "--no-lone-pair-mixing",
        ]);
        assert!(
            output.status.success(),
            "{name}: {}",
            String::from_utf8_lossy(&output.stderr)
        );
        let text = std::fs::read_to_string(&out).expect("written");
        match name {
            "nh3.md" => assert!(text.starts_with("# ") && text.contains("| 3a1 |")),
            "nh3.csv" => assert!(text.starts_with("table,row,column,value\r\n")),
            _ => {
                let json: serde_json::Value = serde_json::from_str(&text).expect("JSON");
                assert_eq!(
                    json["lone_pair_mixing"], false,
                    "the flag reached the analysis"
                );
            }
        }
    }
}
