//! Property tests: arbitrary bytes and near-valid text fed to every parser never panic.

use diptych::chem::io::molfile::parse_molfile;
use diptych::chem::io::text_from_bytes;
use diptych::chem::io::xyz::parse_xyz;
use diptych::project::Project;
use proptest::prelude::*;

fn parse_everything(text: &str) {
    let _ = parse_xyz(text, "fuzz").map(|p| p.molecule.validate());
    let _ = parse_molfile(text, "fuzz").map(|p| p.molecule.validate());
    let _ = Project::from_ron(text);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    #[test]
    fn arbitrary_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..600)) {
        if let Ok(text) = text_from_bytes(&bytes) {
            parse_everything(&text);
        }
        parse_everything(&String::from_utf8_lossy(&bytes));
    }

    #[test]
    fn xyz_like_text_never_panics(
        count in 0usize..8,
        lines in proptest::collection::vec("[A-Za-z]{0,3}( +[-+0-9.eEnaif]{0,8}){0,5}", 0..10),
    ) {
        let text = format!("{count}\ncharge=0\n{}", lines.join("\n"));
        parse_everything(&text);
    }

    #[test]
    fn molfile_like_text_never_panics(
        counts in "[ 0-9]{0,8}",
        body in proptest::collection::vec("[ 0-9A-Za-z.+-]{0,40}", 0..12),
    ) {
        let text = format!("t\nprog\n\n{counts}  0  0  0  0  0  0999 V2000\n{}\nM  END\n", body.join("\n"));
        parse_everything(&text);
    }

    #[test]
    fn ron_like_text_never_panics(body in "[()\\[\\]a-z:,\" 0-9.]{0,200}") {
        parse_everything(&format!("(version: 1, molecule: {body}"));
    }
}
