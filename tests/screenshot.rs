//! The real window under a virtual X display: `diptych --screenshot` must write a PNG in
//! which the molecule is visible. Needs `xvfb-run` (Debian `xvfb`, `xauth`); CI installs it
//! and sets DIPTYCH_REQUIRE_DISPLAY_TESTS=1 so that a missing display fails the run.
#![cfg(feature = "gui")]

use std::collections::HashSet;
use std::path::{Path, PathBuf};
use std::process::Command;

fn xvfb_run() -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|folder| folder.join("xvfb-run"))
            .find(|candidate| candidate.is_file())
    })
}

/// Runs the screenshot command; None when no virtual display is available here.
fn screenshot(molecule: &str, out: &Path) -> Option<()> {
    let Some(xvfb) = xvfb_run() else {
        assert!(
            std::env::var_os("DIPTYCH_REQUIRE_DISPLAY_TESTS").is_none(),
            "xvfb-run is required for the window tests"
        );
        eprintln!("xvfb-run not found: window screenshot test not run");
        return None;
    };
    let output = Command::new(xvfb)
        .args(["-a", "-s", "-screen 0 1600x1000x24"])
        .arg(env!("CARGO_BIN_EXE_diptych"))
        .arg("--screenshot")
        .arg(out)
        .arg(
            Path::new(env!("CARGO_MANIFEST_DIR"))
                .join("demo_molecules")
                .join(molecule),
        )
        .output()
        .expect("xvfb-run starts");
    assert!(
        output.status.success(),
        "screenshot of {molecule} failed: {}",
        String::from_utf8_lossy(&output.stderr)
    );
    Some(())
}

/// (width, height, RGBA pixels)
fn decode(path: &Path) -> (u32, u32, Vec<[u8; 4]>) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buffer = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buffer).unwrap();
    assert_eq!(info.color_type, png::ColorType::Rgba);
    let pixels = buffer[..info.buffer_size()]
        .chunks_exact(4)
        .map(|p| [p[0], p[1], p[2], p[3]])
        .collect();
    (info.width, info.height, pixels)
}

#[test]
fn ammonia_screenshot_shows_the_molecule() {
    let folder = tempfile::tempdir().unwrap();
    let out = folder.path().join("nh3.png");
    if screenshot("ammonia.xyz", &out).is_none() {
        return;
    }
    let (width, height, pixels) = decode(&out);
    assert!(width >= 800 && height >= 600, "{width}×{height}");
    let distinct: HashSet<[u8; 4]> = pixels.iter().copied().collect();
    assert!(
        distinct.len() > 50,
        "only {} colours: blank window?",
        distinct.len()
    );
    // Nitrogen's fill colour from src/app/theme.rs: the atom was drawn.
    let nitrogen = pixels.iter().filter(|p| p[..3] == [88, 118, 176]).count();
    assert!(nitrogen > 500, "nitrogen ball covers {nitrogen} pixels");
}

#[test]
fn screenshots_of_demo_molecules_are_not_blank() {
    let folder = tempfile::tempdir().unwrap();
    for molecule in ["water.xyz", "ethylene.xyz", "cyclopropane.xyz"] {
        let out = folder.path().join(molecule.replace(".xyz", ".png"));
        if screenshot(molecule, &out).is_none() {
            return;
        }
        let (width, height, pixels) = decode(&out);
        assert!(
            width >= 800 && height >= 600,
            "{molecule}: {width}×{height}"
        );
        let distinct: HashSet<[u8; 4]> = pixels.iter().copied().collect();
        assert!(
            distinct.len() > 50,
            "{molecule}: only {} colours",
            distinct.len()
        );
    }
}

/// Fill colours from src/app/theme.rs and bar colours from src/diagram/style.rs.
const BORON: [u8; 3] = [196, 156, 128];
const HYDROGEN: [u8; 3] = [226, 222, 212];
const SULFUR: [u8; 3] = [206, 172, 76];
const FLUORINE: [u8; 3] = [132, 170, 116];
const OXYGEN: [u8; 3] = [186, 84, 72];
const CARBON: [u8; 3] = [92, 96, 104];
const SIGMA_BAR: [u8; 3] = [46, 110, 140];
const PI_BAR: [u8; 3] = [60, 130, 80];
const LONE_PAIR_BAR: [u8; 3] = [170, 80, 60];
/// egui's error text colour in the light theme: any stage error would be written in it.
const ERROR_RED: [u8; 3] = [255, 0, 0];

/// A decoded screenshot with the panels' columns (default panel widths of a 1400 px
/// window: Structure on the left quarter, the Diagram in the middle half).
struct Shot {
    width: usize,
    pixels: Vec<[u8; 4]>,
}

impl Shot {
    fn take(molecule: &str, folder: &Path) -> Option<Shot> {
        let out = folder.join(molecule.replace(".xyz", ".png"));
        screenshot(molecule, &out)?;
        let (width, height, pixels) = decode(&out);
        assert!(
            width >= 800 && height >= 600,
            "{molecule}: {width}×{height}"
        );
        Some(Shot {
            width: width as usize,
            pixels,
        })
    }

    /// Pixels of exactly `rgb` whose column lies in the fraction `from..to` of the width.
    fn count(&self, rgb: [u8; 3], from: f64, to: f64) -> usize {
        let (low, high) = (
            (from * self.width as f64) as usize,
            (to * self.width as f64) as usize,
        );
        self.pixels
            .iter()
            .enumerate()
            .filter(|(i, p)| (low..high).contains(&(i % self.width)) && p[..3] == rgb)
            .count()
    }

    fn in_structure(&self, rgb: [u8; 3]) -> usize {
        self.count(rgb, 0.0, 0.26)
    }

    fn in_diagram(&self, rgb: [u8; 3]) -> usize {
        self.count(rgb, 0.28, 0.76)
    }

    /// Nothing in the window is written in the error colour.
    fn assert_no_error_text(&self, molecule: &str) {
        let red = self.count(ERROR_RED, 0.0, 1.0);
        assert!(red < 5, "{molecule}: {red} pixels of error text");
    }
}

#[test]
fn diborane_screenshot_shows_borons_hydrogens_and_its_ladders() {
    let folder = tempfile::tempdir().unwrap();
    let Some(shot) = Shot::take("diborane.xyz", folder.path()) else {
        return;
    };
    // Two boron and six hydrogen balls (about 2600 px each colour at the default size).
    assert!(
        shot.in_structure(BORON) > 1000,
        "{}",
        shot.in_structure(BORON)
    );
    assert!(shot.in_structure(HYDROGEN) > 1000);
    // σ(B–H) and the ag levels are drawn in the σ colour, above the notes strip.
    assert!(
        shot.in_diagram(SIGMA_BAR) > 120,
        "{}",
        shot.in_diagram(SIGMA_BAR)
    );
    shot.assert_no_error_text("diborane");
}

#[test]
fn sulfur_hexafluoride_screenshot_shows_six_fluorines_and_lone_pair_levels() {
    let folder = tempfile::tempdir().unwrap();
    let Some(shot) = Shot::take("sulfur_hexafluoride.xyz", folder.path()) else {
        return;
    };
    let (sulfur, fluorine) = (shot.in_structure(SULFUR), shot.in_structure(FLUORINE));
    assert!(sulfur > 1000, "{sulfur}");
    // Six fluorine balls and their halves of the sticks cover more than one sulfur.
    assert!(fluorine > sulfur, "fluorine {fluorine}, sulfur {sulfur}");
    // Eighteen n(F) levels.
    assert!(shot.in_diagram(LONE_PAIR_BAR) > 100);
    shot.assert_no_error_text("sulfur_hexafluoride");
}

#[test]
fn dioxygen_screenshot_shows_its_pi_levels() {
    let folder = tempfile::tempdir().unwrap();
    let Some(shot) = Shot::take("dioxygen.xyz", folder.path()) else {
        return;
    };
    assert!(shot.in_structure(OXYGEN) > 2000);
    // 1πu, 1πg on the left; π and π* on the right.
    assert!(shot.in_diagram(PI_BAR) > 150, "{}", shot.in_diagram(PI_BAR));
    assert!(shot.in_diagram(LONE_PAIR_BAR) > 40);
    shot.assert_no_error_text("dioxygen");
}

#[test]
fn carbon_monoxide_screenshot_shows_both_atoms_and_sigma_pi_and_lone_pair_levels() {
    let folder = tempfile::tempdir().unwrap();
    let Some(shot) = Shot::take("carbon_monoxide.xyz", folder.path()) else {
        return;
    };
    assert!(shot.in_structure(CARBON) > 1500);
    assert!(shot.in_structure(OXYGEN) > 1500);
    for (name, rgb, least) in [
        ("σ", SIGMA_BAR, 100),
        ("π", PI_BAR, 150),
        ("n", LONE_PAIR_BAR, 40),
    ] {
        let found = shot.in_diagram(rgb);
        assert!(found > least, "{name} bars: {found} pixels");
    }
    shot.assert_no_error_text("carbon_monoxide");
}
