//! Diptych's diagram palette, shared by the screen and the SVG writer: one muted accent
//! per irrep family (a, b, e, t, g/h) and per kind of localized orbital (σ, π, n); our
//! own choice, no source. Label text is split into normal, subscript and superscript
//! runs following Mulliken's notation (R. S. Mulliken, J. Chem. Phys. 23, 1997 (1955)).

/// RGB of a level bar, from its label; `None` means "use the ink colour".
pub fn level_rgb(label: &str) -> Option<[u8; 3]> {
    let first = label.chars().find(|c| c.is_alphabetic())?;
    Some(match first {
        'a' | 'σ' => [46, 110, 140],
        'b' => [170, 110, 40],
        'e' | 'δ' | 'φ' => [120, 80, 150],
        't' | 'π' => [60, 130, 80],
        'g' | 'h' => [150, 70, 90],
        'n' => [170, 80, 60],
        _ => return None,
    })
}

/// An energy with a real minus sign ("−13.72"); "−0.00" is printed as "0.00".
pub fn format_energy(value: f64, decimals: usize) -> String {
    let text = format!("{value:.decimals$}");
    match text.strip_prefix('-') {
        Some(rest) if rest.chars().any(|c| c != '0' && c != '.') => format!("−{rest}"),
        Some(rest) => rest.to_string(),
        None => text,
    }
}

/// sp^λ as text, with a pure p orbital (λ → ∞, given as None or huge) written "p".
pub fn lambda_text(lambda: Option<f64>) -> String {
    match lambda {
        Some(value) if value < 1e3 => format!("sp^{value:.2}"),
        _ => "p".into(),
    }
}

/// The grey with the same luminance (Rec. 709 weights), for greyscale output.
pub fn to_grey(rgb: [u8; 3]) -> [u8; 3] {
    let y = 0.2126 * rgb[0] as f64 + 0.7152 * rgb[1] as f64 + 0.0722 * rgb[2] as f64;
    let v = y.round().clamp(0.0, 255.0) as u8;
    [v, v, v]
}

/// How a run of label text is set.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Script {
    Normal,
    Sub,
    Super,
}

/// Splits an orbital label into runs: "3a1" → 3a, ₁; "1b3u" → 1b, ₃ᵤ; "2a1'" → 2a, ₁,
/// ′; "1σg+" → 1σ, g, ⁺. Bond labels such as "σ*(N–H)" are one normal run.
pub fn label_runs(label: &str) -> Vec<(String, Script)> {
    if label.contains('(') || label.is_empty() {
        return vec![(label.to_string(), Script::Normal)];
    }
    let chars: Vec<char> = label.chars().collect();
    let mut position = 0;
    while position < chars.len() && chars[position].is_ascii_digit() {
        position += 1;
    }
    let irrep_letters = [
        'a', 'b', 'e', 't', 'g', 'h', 'σ', 'π', 'δ', 'φ', 'A', 'B', 'E', 'T', 'G', 'H',
    ];
    if position >= chars.len() || !irrep_letters.contains(&chars[position]) {
        return vec![(label.to_string(), Script::Normal)];
    }
    position += 1;
    let head: String = chars[..position].iter().collect();
    let mut runs = vec![(head, Script::Normal)];
    let mut sub = String::new();
    while position < chars.len()
        && (chars[position].is_ascii_digit() || matches!(chars[position], 'g' | 'u'))
    {
        sub.push(chars[position]);
        position += 1;
    }
    if !sub.is_empty() {
        runs.push((sub, Script::Sub));
    }
    let rest: String = chars[position..].iter().collect();
    let primes = rest.replace("''", "″").replace('\'', "′");
    let (normal, superscript): (String, String) =
        primes.chars().partition(|c| !matches!(c, '+' | '-' | '−'));
    if !normal.is_empty() {
        runs.push((normal, Script::Normal));
    }
    if !superscript.is_empty() {
        runs.push((superscript.replace('-', "−"), Script::Super));
    }
    runs
}

/// The frontier tag of a level: "SOMO" for a highest occupied level that is partly filled
/// (an open shell), "HOMO" or "LUMO" otherwise; None for other levels.
pub fn frontier_tag(is_homo: bool, is_lumo: bool, occupancy: f64) -> Option<&'static str> {
    if is_homo {
        Some(if occupancy < 2.0 - WHOLE_ELECTRON {
            "SOMO"
        } else {
            "HOMO"
        })
    } else if is_lumo {
        Some("LUMO")
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn an_open_shell_is_tagged_somo() {
        assert_eq!(frontier_tag(true, false, 2.0), Some("HOMO"));
        assert_eq!(frontier_tag(true, false, 0.5), Some("SOMO"));
        assert_eq!(frontier_tag(false, true, 0.0), Some("LUMO"));
        assert_eq!(frontier_tag(false, false, 2.0), None);
    }

    #[test]
    fn electrons_are_drawn_as_the_level_holds_them() {
        assert!(electron_marks(0.0).arrows.is_empty());
        assert_eq!(electron_marks(2.0).arrows, vec![true, false]);
        assert_eq!(electron_marks(1.0).arrows, vec![true]);
        assert_eq!(electron_marks(1.0).fraction, None);
        // NO's 2π: one electron over two orbitals, half each, written as such.
        let half = electron_marks(0.5);
        assert_eq!(half.arrows, vec![true]);
        assert_eq!(half.fraction.as_deref(), Some("0.5 e"));
        // A 4/3 share (four electrons over a threefold set).
        let share = electron_marks(4.0 / 3.0);
        assert_eq!(share.arrows, vec![true, false]);
        assert_eq!(share.fraction.as_deref(), Some("1.33 e"));
    }

    #[test]
    fn correlation_lines_grow_with_their_weight() {
        assert!(link_width(1.0) > link_width(0.1));
        assert!(link_opacity(1.0) > link_opacity(0.1));
        assert_eq!(link_opacity(1.0), 1.0);
        assert_eq!(link_width(2.0), link_width(1.0));
    }

    use super::*;

    #[test]
    fn mulliken_labels_split_into_runs() {
        use Script::*;
        assert_eq!(
            label_runs("3a1"),
            vec![("3a".into(), Normal), ("1".into(), Sub)]
        );
        assert_eq!(
            label_runs("1b3u"),
            vec![("1b".into(), Normal), ("3u".into(), Sub)]
        );
        assert_eq!(label_runs("1e"), vec![("1e".into(), Normal)]);
        assert_eq!(
            label_runs("2a1''"),
            vec![
                ("2a".into(), Normal),
                ("1".into(), Sub),
                ("″".into(), Normal)
            ]
        );
        assert_eq!(
            label_runs("1σg+"),
            vec![
                ("1σ".into(), Normal),
                ("g".into(), Sub),
                ("+".into(), Super)
            ]
        );
        assert_eq!(label_runs("σ*(N–H)"), vec![("σ*(N–H)".into(), Normal)]);
        assert_eq!(label_runs("ψ3"), vec![("ψ3".into(), Normal)]);
    }

    #[test]
    fn greyscale_keeps_luminance_order() {
        let dark = to_grey([46, 110, 140]);
        let light = to_grey([226, 222, 212]);
        assert!(dark[0] < light[0]);
        assert_eq!(dark[0], dark[1]);
    }
}

/// Width of a correlation line, in the diagram's units (the view box of the SVG; the
/// window scales it like every other length): it grows with the weight (our own scale).
pub fn link_width(weight: f64) -> f64 {
    0.8 + 4.0 * weight.clamp(0.0, 1.0)
}

/// Opacity of a correlation line: faint for small weights, full at weight 1.
pub fn link_opacity(weight: f64) -> f64 {
    0.25 + 0.75 * weight.clamp(0.0, 1.0)
}

/// How a level's electrons are drawn: its arrows (true for spin up) and, when the level
/// holds a share of a partly filled degenerate set (not 0, 1 or 2 electrons), that share
/// written beside them, so a set's marks add up to its true electron count.
#[derive(Clone, Debug, PartialEq)]
pub struct ElectronMarks {
    pub arrows: Vec<bool>,
    pub fraction: Option<String>,
}

/// Occupancies within this of a whole number are drawn as that number of arrows.
const WHOLE_ELECTRON: f64 = 0.02;

/// The marks of a level with `occupancy` electrons (0 to 2).
pub fn electron_marks(occupancy: f64) -> ElectronMarks {
    let nearest = occupancy.round();
    let whole = (occupancy - nearest).abs() < WHOLE_ELECTRON;
    let count = if whole { nearest } else { occupancy.ceil() };
    let arrows = match count as i64 {
        i64::MIN..=0 => Vec::new(),
        1 => vec![true],
        _ => vec![true, false],
    };
    let fraction = (!whole && occupancy > WHOLE_ELECTRON).then(|| {
        let text = format!("{occupancy:.2}");
        format!("{} e", text.trim_end_matches('0').trim_end_matches('.'))
    });
    ElectronMarks { arrows, fraction }
}
