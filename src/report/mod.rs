//! Reports of an `Analysis`: plain text for the terminal, the JSON of DESIGN §5.5, and
//! Markdown and CSV tables (messages, canonical MOs, the Lewis structure, hybrids,
//! localized orbitals, correlation weights) built from one table model so that both
//! formats hold the same numbers. Every stage error and note is in every format.

mod csv;
mod json;
mod lewis;
mod markdown;
pub mod switch;
pub mod tables;
mod text;

pub use csv::to_csv;
pub use json::to_json;
pub use markdown::to_markdown;
pub use text::to_text;

/// The report formats a file can be written in, chosen by its extension.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ReportFormat {
    Markdown,
    Csv,
    Json,
    Text,
}

impl ReportFormat {
    /// The format for a file extension (case-insensitive): md/markdown, csv, json, txt.
    pub fn from_extension(extension: &str) -> Option<Self> {
        match extension.to_ascii_lowercase().as_str() {
            "md" | "markdown" => Some(ReportFormat::Markdown),
            "csv" => Some(ReportFormat::Csv),
            "json" => Some(ReportFormat::Json),
            "txt" => Some(ReportFormat::Text),
            _ => None,
        }
    }
}

/// The report in the chosen format.
pub fn render(analysis: &crate::analysis::Analysis, format: ReportFormat) -> String {
    match format {
        ReportFormat::Markdown => to_markdown(analysis),
        ReportFormat::Csv => to_csv(analysis),
        ReportFormat::Json => to_json(analysis) + "\n",
        ReportFormat::Text => to_text(analysis),
    }
}
