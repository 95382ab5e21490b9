//! `diptych export`: the correlation diagram of DESIGN §5.3 written as a standalone file.

use std::path::Path;
use std::process::ExitCode;

use super::{MethodFlags, open_for_cli, run_analysis};

pub(super) struct ExportRequest {
    pub(super) flags: MethodFlags,
    pub(super) names: Option<Vec<String>>,
    pub(super) greyscale: bool,
    pub(super) width: f64,
    pub(super) height: f64,
    pub(super) force: bool,
}

pub(super) fn export(
    file: &Path,
    output: &Path,
    charge: Option<i32>,
    request: &ExportRequest,
) -> ExitCode {
    let valid_size = |v: f64| v.is_finite() && (1.0..=100_000.0).contains(&v);
    if !valid_size(request.width) || !valid_size(request.height) {
        eprintln!(
            "diptych: the size {}×{} is not usable (width and height must be 1 to 100000 pixels)",
            request.width, request.height
        );
        return ExitCode::from(2);
    }
    let extension = output
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    if extension.as_deref() != Some("svg") {
        eprintln!(
            "diptych: the output '{}' must end in .svg",
            output.display()
        );
        return ExitCode::from(2);
    }
    if output.exists() && !request.force {
        eprintln!(
            "diptych: '{}' exists; add --force to replace it",
            output.display()
        );
        return ExitCode::from(2);
    }
    let result = open_for_cli(file, charge).and_then(|opened| {
        let mut settings = opened.project.settings.clone();
        request.flags.apply(&mut settings);
        run_analysis(&opened, &settings).map(|analysis| (opened, analysis))
    });
    let (opened, analysis) = match result {
        Ok(pair) => pair,
        Err(code) => return code,
    };
    let mut titles = opened.project.titles.clone();
    if let Some([left, right]) = request.names.as_deref() {
        titles.delocalized = left.clone();
        titles.localized = right.clone();
    }
    let options = diptych::diagram::DiagramOptions {
        titles,
        link_threshold: opened.project.view.link_threshold,
        ..Default::default()
    };
    let diagram = diptych::diagram::diagram_for(&analysis, &options);
    let svg_options = diptych::diagram::SvgOptions {
        width: request.width,
        height: request.height,
        greyscale: request.greyscale,
        show_energies: opened.project.view.show_energies,
        ..Default::default()
    };
    let svg = diptych::diagram::to_svg(&diagram, &svg_options);
    match diptych::chem::io::write_atomically(output, svg.as_bytes()) {
        Ok(()) => ExitCode::SUCCESS,
        Err(error) => {
            eprintln!("diptych: cannot write '{}': {error}", output.display());
            ExitCode::from(2)
        }
    }
}
