//! Colours of a Walsh diagram's irreps: every irrep met in one scan gets a colour of its
//! own, so b1 and b2 (or a1′ and a2″) are told apart. The first irrep of a family keeps
//! the family colour of the correlation diagram (`diagram::style::level_rgb`), so a level
//! looks the same in both figures; later members of the family get darker and lighter
//! shades of it, in order of first appearance (our choice, no source). One table for the
//! SVG writer and the window.

use super::{Curve, Scan};
use crate::diagram::style::level_rgb;

/// Shades of a family colour for its 2nd, 3rd, … irrep: (mix with black or white, amount).
const SHADES: [(bool, f64); 4] = [(false, 0.45), (true, 0.45), (false, 0.7), (true, 0.7)];

/// The irreps of the scan's curves in order of first appearance, each with its colour
/// (`None`: a label with no family colour, drawn in ink).
pub fn irrep_colours(scan: &Scan) -> Vec<(String, Option<[u8; 3]>)> {
    let mut irreps: Vec<String> = Vec::new();
    for curve in &scan.curves {
        let key = curve_key(curve);
        if !irreps.contains(&key) {
            irreps.push(key);
        }
    }
    let mut seen_in_family: Vec<([u8; 3], usize)> = Vec::new();
    irreps
        .into_iter()
        .map(|irrep| {
            let rgb = level_rgb(&irrep).map(|family| {
                let rank = match seen_in_family.iter_mut().find(|(f, _)| *f == family) {
                    Some((_, count)) => {
                        *count += 1;
                        *count
                    }
                    None => {
                        seen_in_family.push((family, 0));
                        0
                    }
                };
                shade(family, rank)
            });
            (irrep, rgb)
        })
        .collect()
}

/// The colour of one curve in a scan's palette.
pub fn curve_rgb(palette: &[(String, Option<[u8; 3]>)], curve: &Curve) -> Option<[u8; 3]> {
    let key = curve_key(curve);
    palette.iter().find(|(irrep, _)| *irrep == key)?.1
}

/// The irrep a curve is coloured by: its irrep at the reference point, else its label.
fn curve_key(curve: &Curve) -> String {
    curve.irrep.clone().unwrap_or_else(|| curve.label.clone())
}

fn shade(rgb: [u8; 3], rank: usize) -> [u8; 3] {
    if rank == 0 {
        return rgb;
    }
    let (lighter, amount) = SHADES[(rank - 1) % SHADES.len()];
    let target = if lighter { 255.0 } else { 0.0 };
    rgb.map(|c| (c as f64 + (target - c as f64) * amount).round() as u8)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn irreps_of_one_family_get_distinct_shades_and_the_first_keeps_the_family_colour() {
        let family = level_rgb("b1").unwrap();
        assert_eq!(shade(family, 0), family);
        let shades: Vec<[u8; 3]> = (0..5).map(|k| shade(family, k)).collect();
        for i in 0..shades.len() {
            for j in i + 1..shades.len() {
                let distance: i32 = (0..3)
                    .map(|c| (shades[i][c] as i32 - shades[j][c] as i32).abs())
                    .sum();
                assert!(distance > 40, "shades {i} and {j} too close: {shades:?}");
            }
        }
    }
}
