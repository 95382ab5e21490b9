//! The report as one CSV file in long form: every cell of every table is one record
//! `table,row,column,value` (row counted from 1 within its table). Every record has the
//! same four fields, as RFC 4180 §2 asks, so any CSV reader takes the whole report at
//! once; a pivot by `table` and `column` gives the tables back. Fields are quoted per
//! RFC 4180 (commas, quotes, line breaks) and records end in CRLF.

use crate::analysis::Analysis;

use super::tables::tables;

/// One field, quoted when RFC 4180 §2 rules 6–7 require it.
pub(super) fn field(text: &str) -> String {
    if text.contains([',', '"', '\r', '\n']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_string()
    }
}

/// The analysis as a CSV document (header `table,row,column,value`).
pub fn to_csv(analysis: &Analysis) -> String {
    let mut out = String::from("table,row,column,value\r\n");
    for table in tables(analysis) {
        for (n, row) in table.rows.iter().enumerate() {
            for (column, value) in table.columns.iter().zip(row) {
                out.push_str(&format!(
                    "{},{},{},{}\r\n",
                    table.id,
                    n + 1,
                    column,
                    field(value)
                ));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::field;

    #[test]
    fn fields_are_quoted_only_when_needed() {
        assert_eq!(field("3a1"), "3a1");
        assert_eq!(field("a,b"), "\"a,b\"");
        assert_eq!(field("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(field("two\nlines"), "\"two\nlines\"");
    }
}
