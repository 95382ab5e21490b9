//! The one CSV writer of the reports and the Walsh scans. Format: RFC 4180 (comma
//! separated; a field with a comma, quote or line break is quoted, quotes doubled; every
//! record ends in CRLF, §2 rule 1). Text cells are also made safe for spreadsheets, after
//! the OWASP "CSV Injection" guidance: a text cell that starts with `=`, `+`, `-`, `@`, a
//! tab or a carriage return gets a leading `'` and is quoted, so no spreadsheet runs it as
//! a formula. Numbers are written as numbers: a cell that reads as a number (`-12.5`,
//! `1e-3`, `inf`) is never changed.

/// Characters that make a spreadsheet read a cell as a formula (OWASP CSV Injection).
const FORMULA_STARTS: [char; 6] = ['=', '+', '-', '@', '\t', '\r'];

/// A CSV document built record by record.
#[derive(Debug, Default)]
pub struct CsvWriter {
    out: String,
}

impl CsvWriter {
    pub fn new() -> CsvWriter {
        CsvWriter::default()
    }

    /// Appends one record of already-made fields ([`text`], [`number`], [`cell`]).
    pub fn record<S: AsRef<str>>(&mut self, fields: &[S]) {
        for (n, field) in fields.iter().enumerate() {
            if n > 0 {
                self.out.push(',');
            }
            self.out.push_str(field.as_ref());
        }
        self.out.push_str("\r\n");
    }

    /// The document.
    pub fn finish(self) -> String {
        self.out
    }
}

/// A text field: formula starts neutralised, quoted when RFC 4180 §2 rules 6–7 require.
pub fn text(value: &str) -> String {
    if value.starts_with(FORMULA_STARTS) {
        return quoted(&format!("'{value}"));
    }
    if value.contains([',', '"', '\r', '\n']) {
        quoted(value)
    } else {
        value.to_string()
    }
}

/// A number with `decimals` places; an absent number is an empty field.
pub fn number(value: Option<f64>, decimals: usize) -> String {
    value.map_or_else(String::new, |v| format!("{v:.decimals$}"))
}

/// A cell of unknown kind: kept as it is when it reads as a number, else a [`text`] field.
pub fn cell(value: &str) -> String {
    if is_number(value) {
        value.to_string()
    } else {
        text(value)
    }
}

/// Whether the whole of `value` is one number as Rust (and any spreadsheet) reads it.
fn is_number(value: &str) -> bool {
    !value.is_empty() && value.trim() == value && value.parse::<f64>().is_ok()
}

fn quoted(value: &str) -> String {
    format!("\"{}\"", value.replace('"', "\"\""))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fields_are_quoted_only_when_needed() {
        assert_eq!(text("3a1"), "3a1");
        assert_eq!(text("a,b"), "\"a,b\"");
        assert_eq!(text("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(text("two\nlines"), "\"two\nlines\"");
    }

    #[test]
    fn formula_starts_are_neutralised_in_text() {
        assert_eq!(text("=HYPERLINK(\"x\")"), "\"'=HYPERLINK(\"\"x\"\")\"");
        assert_eq!(text("+1+2"), "\"'+1+2\"");
        assert_eq!(text("-2+3"), "\"'-2+3\"");
        assert_eq!(text("@SUM(A1)"), "\"'@SUM(A1)\"");
        assert_eq!(text("\tx"), "\"'\tx\"");
        assert_eq!(text("\rx"), "\"'\rx\"");
    }

    #[test]
    fn numbers_stay_numbers() {
        for value in ["-12.500", "1e-3", "-0", "+4", "inf"] {
            assert_eq!(cell(value), value);
        }
        assert_eq!(cell("-1+1"), "\"'-1+1\"");
        assert_eq!(cell(" -1"), " -1", "a leading space is no formula start");
        assert_eq!(number(Some(-1.25), 3), "-1.250");
        assert_eq!(number(None, 3), "");
    }

    #[test]
    fn records_end_in_crlf() {
        let mut writer = CsvWriter::new();
        writer.record(&["a", "b"]);
        writer.record(&[text("=x"), number(Some(1.0), 1)]);
        assert_eq!(writer.finish(), "a,b\r\n\"'=x\",1.0\r\n");
    }
}
