//! The exported SVG (DESIGN §5.3) read back by independent readers: roxmltree as the XML
//! parser and usvg/resvg as the SVG renderer; level heights measured in the raster; user
//! text that needs escaping; a reviewed golden file.

use std::path::{Path, PathBuf};

use diptych::analysis::Analysis;
use diptych::diagram::png::RasterImage;
use diptych::diagram::{
    Diagram, DiagramOptions, Ladders, Resolution, SvgOptions, diagram_for, export_svg, rasterize,
    render_png,
};
use diptych::project::{LadderTitles, open_path};

fn repository() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn demo_xyz_files() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(repository().join("demo_molecules"))
        .expect("demo_molecules exists")
        .filter_map(|entry| entry.ok().map(|e| e.path()))
        .filter(|path| path.extension().is_some_and(|e| e == "xyz"))
        .collect();
    files.sort();
    files
}

fn diagram_of(path: &Path, titles: Option<LadderTitles>) -> Diagram {
    let opened = open_path(path).expect("demo file opens");
    let analysis = Analysis::run(&opened.project.molecule, &opened.project.settings)
        .expect("demo molecule analyses");
    let options = DiagramOptions {
        titles: titles.unwrap_or(opened.project.titles.clone()),
        link_threshold: opened.project.view.link_threshold,
        ..Default::default()
    };
    diagram_for(&analysis, &options)
}

fn ammonia() -> Diagram {
    diagram_of(&repository().join("demo_molecules/ammonia.xyz"), None)
}

/// Share of pixels that are neither white nor transparent.
fn inked_share(image: &RasterImage) -> f64 {
    let inked = image
        .pixels()
        .iter()
        .filter(|p| p.alpha() > 0 && (p.red() < 200 || p.green() < 200 || p.blue() < 200))
        .count();
    inked as f64 / image.pixels().len() as f64
}

#[test]
fn every_demo_svg_parses_as_xml_and_as_svg_and_renders_ink() {
    let variants = [
        SvgOptions::default(),
        SvgOptions {
            greyscale: true,
            white_background: false,
            show_energies: false,
            ..SvgOptions::default()
        },
        SvgOptions {
            ladders: Ladders::DelocalizedOnly,
            ..SvgOptions::default()
        },
        SvgOptions {
            ladders: Ladders::LocalizedOnly,
            show_level_shifts: false,
            ..SvgOptions::default()
        },
    ];
    let files = demo_xyz_files();
    assert!(files.len() >= 11, "the demo set of DESIGN §7");
    for file in files {
        let diagram = diagram_of(&file, None);
        for options in &variants {
            let svg = export_svg(&diagram, options).expect("valid options");
            // Attributes some renderers ignore (labels then pile up): paint-order is SVG 2
            // only; dominant-baseline is in SVG 1.1 but not honoured everywhere.
            for attribute in ["dominant-baseline", "paint-order"] {
                assert!(!svg.contains(attribute), "{}: {attribute}", file.display());
            }
            let document = roxmltree::Document::parse(&svg)
                .unwrap_or_else(|e| panic!("{}: not XML: {e}", file.display()));
            let root = document.root_element();
            assert_eq!(root.tag_name().name(), "svg");
            assert_eq!(
                root.tag_name().namespace(),
                Some("http://www.w3.org/2000/svg")
            );
            let png = render_png(&svg, Resolution::Dpi(48.0))
                .unwrap_or_else(|e| panic!("{}: usvg/resvg refused it: {e}", file.display()));
            let image = RasterImage::decode_png(&png).expect("a readable PNG");
            // CSS pixels are 1/96 inch (CSS Values and Units Level 3, §5.2).
            let expected_width = (options.document_width(&diagram) * 48.0 / 96.0).round();
            assert_eq!(image.width() as f64, expected_width);
            let corner = image.pixel(0, image.height() - 1).expect("inside");
            if options.white_background {
                assert_eq!((corner.red(), corner.alpha()), (255, 255), "white corner");
            } else {
                assert_eq!(corner.alpha(), 0, "transparent corner");
            }
            let share = inked_share(&image);
            // Bars, axis, labels and titles cover a few per cent of the figure; an empty
            // or white-on-white render would be ~0.
            assert!(
                share > 0.01,
                "{}: only {share:.4} of the pixels are inked",
                file.display()
            );
            // Every level drawn in a drawn ladder has its bar in the document.
            let bars = document
                .descendants()
                .filter(|n| n.has_tag_name("line") && n.attribute("stroke-width") == Some("3.5"))
                .count();
            let expected: usize = diagram
                .ladders
                .iter()
                .enumerate()
                .filter(|(index, _)| options.ladders.draws(*index))
                .map(|(_, ladder)| ladder.levels.len())
                .sum();
            assert_eq!(bars, expected, "{}", file.display());
        }
    }
}

/// Rows of the raster at column `x` whose colour is far from white, within `window` rows
/// of `around`.
fn dark_rows(image: &RasterImage, x: u32, around: f64, window: i64) -> Vec<u32> {
    let centre = around.round() as i64;
    (centre - window..=centre + window)
        .filter(|&y| y >= 0 && (y as u32) < image.height())
        .filter(|&y| {
            let pixel = image.pixel(x, y as u32).expect("inside");
            let distance = 255 - pixel.red().min(pixel.green()).min(pixel.blue());
            distance > 90
        })
        .map(|y| y as u32)
        .collect()
}

#[test]
fn ammonia_level_bars_sit_at_the_heights_of_their_energies() {
    let diagram = ammonia();
    let options = SvgOptions {
        show_level_shifts: false,
        ..SvgOptions::default()
    };
    let svg = export_svg(&diagram, &options).expect("valid options");
    let dpi = 192.0;
    let image = rasterize(&svg, Resolution::Dpi(dpi)).expect("renders");
    // CSS pixels are 1/96 inch (CSS Values and Units Level 3, §5.2).
    let pixels_per_unit_y = options.vertical_scale(&diagram) * dpi / 96.0;
    let pixels_per_unit_x =
        options.document_width(&diagram) / options.view_width(&diagram) * dpi / 96.0;
    assert_eq!(
        image.height() as f64,
        (diagram.height * pixels_per_unit_y).round()
    );
    let mut checked = 0;
    for ladder in &diagram.ladders {
        for level in &ladder.levels {
            // The axis mapping, not the stored y: the figure must show the energy.
            let expected = diagram.y_of(level.energy_ev) * pixels_per_unit_y;
            // Two layout units in from the left end: inside the first dash of a virtual
            // level, clear of the electron arrows at the centre.
            let x = ((level.x_left + 2.0) * pixels_per_unit_x).round() as u32;
            let rows = dark_rows(&image, x, expected, 12);
            assert!(
                !rows.is_empty(),
                "{}: no bar near row {expected:.1}",
                level.label
            );
            // The bar is 3.5 units thick; pixel row r covers [r, r + 1).
            let centre = rows.iter().map(|&r| r as f64 + 0.5).sum::<f64>() / rows.len() as f64;
            assert!(
                (centre - expected).abs() <= 1.0,
                "{} at {:.2} eV: bar centred on row {centre:.2}, axis says {expected:.2}",
                level.label,
                level.energy_ev
            );
            let thickness = rows.len() as f64 / pixels_per_unit_y;
            assert!(
                (2.0..=5.5).contains(&thickness),
                "{}: one bar expected, found {} dark rows",
                level.label,
                rows.len()
            );
            checked += 1;
        }
    }
    // Ammonia: 7 valence MOs (N 2s 2p + 3 × H 1s), of which 6 lie in the default window
    // (4a1 is beyond LUMO + 8 eV), and 7 localized orbitals.
    assert!(checked >= 12, "checked {checked} levels");
}

#[test]
fn titles_with_markup_characters_and_non_latin_text_survive_the_round_trip() {
    let titles = LadderTitles {
        delocalized: "a < b & \"c\" > 'd'".into(),
        localized: "σ/π ψ₁ — 分子軌道 Ελληνικά".into(),
    };
    let diagram = diagram_of(
        &repository().join("demo_molecules/water.xyz"),
        Some(titles.clone()),
    );
    let svg = export_svg(&diagram, &SvgOptions::default()).expect("valid options");
    let document = roxmltree::Document::parse(&svg).expect("well-formed XML");
    for (index, title) in [&titles.delocalized, &titles.localized].iter().enumerate() {
        let group = document
            .descendants()
            .find(|n| n.attribute("id") == Some(format!("ladder-{index}").as_str()))
            .expect("ladder group");
        let heading = group
            .children()
            .find(|n| n.has_tag_name("text"))
            .expect("title text");
        assert_eq!(heading.text(), Some(title.as_str()));
    }
    let document_title = document
        .descendants()
        .find(|n| n.has_tag_name("title"))
        .and_then(|n| n.text())
        .expect("<title>");
    assert_eq!(
        document_title,
        format!("{} | {}", titles.delocalized, titles.localized)
    );
    // usvg must accept it too (missing CJK glyphs are skipped, not an error).
    rasterize(&svg, Resolution::Dpi(24.0)).expect("usvg reads it");
}

#[test]
fn bad_options_are_refused_before_drawing() {
    let diagram = ammonia();
    for (width, height) in [(0.0, 700.0), (-5.0, 700.0), (1000.0, f64::NAN), (1e9, 10.0)] {
        let options = SvgOptions {
            width,
            height,
            ..SvgOptions::default()
        };
        assert!(export_svg(&diagram, &options).is_err(), "{width}×{height}");
    }
    let no_font = SvgOptions {
        font_family: "  ".into(),
        ..SvgOptions::default()
    };
    assert!(export_svg(&diagram, &no_font).is_err());
    let mut untitled = diagram.clone();
    untitled.ladders[1].title = " ".into();
    assert!(export_svg(&untitled, &SvgOptions::default()).is_err());
    // With only the delocalized ladder drawn, the localized title does not matter.
    let left_only = SvgOptions {
        ladders: Ladders::DelocalizedOnly,
        ..SvgOptions::default()
    };
    assert!(export_svg(&untitled, &left_only).is_ok());
}

/// Lines of `expected` and `actual` that differ, as a short readable diff.
fn line_diff(expected: &str, actual: &str) -> String {
    let (old, new): (Vec<&str>, Vec<&str>) = (expected.lines().collect(), actual.lines().collect());
    let mut out = String::new();
    let mut shown = 0;
    for n in 0..old.len().max(new.len()) {
        let (a, b) = (old.get(n), new.get(n));
        if a != b {
            if let Some(a) = a {
                out.push_str(&format!("{:>4} - {a}\n", n + 1));
            }
            if let Some(b) = b {
                out.push_str(&format!("{:>4} + {b}\n", n + 1));
            }
            shown += 1;
            if shown == 25 {
                out.push_str("… (more differences)\n");
                break;
            }
        }
    }
    out.push_str(&format!(
        "({} lines expected, {} lines now)\n",
        old.len(),
        new.len()
    ));
    out
}

#[test]
fn ammonia_svg_matches_the_reviewed_golden_file() {
    let svg = export_svg(&ammonia(), &SvgOptions::default()).expect("valid options");
    let golden = repository().join("tests/golden/ammonia.svg");
    if std::env::var("DIPTYCH_UPDATE_GOLDEN").is_ok_and(|v| v == "1") {
        std::fs::write(&golden, &svg).expect("golden file writable");
        eprintln!("updated {}", golden.display());
        return;
    }
    let expected = std::fs::read_to_string(&golden).unwrap_or_else(|e| {
        panic!(
            "{}: {e}; run with DIPTYCH_UPDATE_GOLDEN=1 to create it, then review it",
            golden.display()
        )
    });
    assert!(
        svg == expected,
        "the ammonia SVG differs from {} (review the change; DIPTYCH_UPDATE_GOLDEN=1 accepts it):\n{}",
        golden.display(),
        line_diff(&expected, &svg)
    );
}

#[test]
fn export_is_deterministic_and_single_ladders_keep_the_scale() {
    let diagram = ammonia();
    let a = export_svg(&diagram, &SvgOptions::default()).expect("valid");
    let b = export_svg(&ammonia(), &SvgOptions::default()).expect("valid");
    assert_eq!(a, b, "same input, same bytes");
    for ladders in [Ladders::DelocalizedOnly, Ladders::LocalizedOnly] {
        let options = SvgOptions {
            ladders,
            ..SvgOptions::default()
        };
        let svg = export_svg(&diagram, &options).expect("valid");
        let document = roxmltree::Document::parse(&svg).expect("XML");
        let root = document.root_element();
        let width: f64 = root
            .attribute("width")
            .and_then(|w| w.parse().ok())
            .unwrap();
        let view: Vec<f64> = root
            .attribute("viewBox")
            .unwrap()
            .split(' ')
            .filter_map(|v| v.parse().ok())
            .collect();
        // Pixels per layout unit as in the full figure (1000 px for 1000 units).
        assert!((width / view[2] - 1.0).abs() < 1e-9, "{ladders:?}");
        assert_eq!(
            document
                .descendants()
                .find(|n| n.attribute("id") == Some("links"))
                .map(|g| g.children().filter(|c| c.is_element()).count()),
            Some(0),
            "no correlation lines without both ladders"
        );
    }
}
