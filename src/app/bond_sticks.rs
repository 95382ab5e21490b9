//! Which bonds the Structure view draws, and how. With an analysis of the molecule on
//! screen: the Lewis structure read from the wavefunction (`picture.lewis`), one line per
//! unit of bond order, a half order as a dashed line, and each delocalized multicentre
//! bond (diborane's B–H–B, H3⁺) as dashed spokes from its atoms to a dot at their centroid.
//! Three-centre four-electron bonds are already in the bond orders (½ per link), so they
//! show as dashed half bonds. Without an analysis: the distance-based bonds of the
//! molecule. Drawing choices are ours (no source).

use diptych::analysis::Analysis;
use diptych::chem::Molecule;
use diptych::localized::MulticentreKind;
use eframe::egui::{self, Color32, Pos2, Stroke, Vec2};

/// One atom pair to draw: `lines` solid lines and, for a half-integral order, one
/// dashed line more.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stick {
    pub a: usize,
    pub b: usize,
    pub lines: u32,
    pub half: bool,
}

/// Everything drawn between the atoms.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct BondDrawing {
    pub sticks: Vec<Stick>,
    /// Atoms of each delocalized multicentre bond.
    pub stars: Vec<Vec<usize>>,
}

impl BondDrawing {
    /// The wavefunction's bonds when `analysis` is of this molecule (same elements in the
    /// same order) and has a Lewis structure; otherwise the distance-based bonds.
    pub fn for_view(molecule: &Molecule, analysis: Option<&Analysis>) -> BondDrawing {
        analysis
            .filter(|analysis| same_atoms(&analysis.molecule, molecule))
            .and_then(|analysis| analysis.picture.as_ref())
            .map_or_else(
                || BondDrawing::perceived(molecule),
                |picture| BondDrawing::lewis(&picture.lewis, molecule.atoms.len()),
            )
    }

    /// The molecule's own bond list (perceived from distances or edited).
    pub fn perceived(molecule: &Molecule) -> BondDrawing {
        let atoms = molecule.atoms.len();
        BondDrawing {
            sticks: molecule
                .bonds
                .iter()
                .filter(|bond| bond.a < atoms && bond.b < atoms)
                // An aromatic bond is drawn as one and a half: a line and a dashed line.
                .map(|bond| Stick {
                    a: bond.a,
                    b: bond.b,
                    lines: if bond.aromatic {
                        1
                    } else {
                        u32::from(bond.order.max(1))
                    },
                    half: bond.aromatic,
                })
                .collect(),
            stars: Vec::new(),
        }
    }

    /// Bonds of positive order, rounded to the nearest half, and the delocalized
    /// multicentre bonds; indices beyond `atoms` are skipped.
    pub fn lewis(lewis: &diptych::localized::LewisStructure, atoms: usize) -> BondDrawing {
        let sticks = lewis
            .bonds
            .iter()
            .filter(|bond| bond.order > 0.0 && bond.atoms.iter().all(|&atom| atom < atoms))
            .filter_map(|bond| {
                let halves = (2.0 * bond.order).round() as u32;
                (halves > 0).then_some(Stick {
                    a: bond.atoms[0],
                    b: bond.atoms[1],
                    lines: halves / 2,
                    half: halves % 2 == 1,
                })
            })
            .collect();
        let stars = lewis
            .multicentre
            .iter()
            .filter(|bond| bond.kind == MulticentreKind::Delocalized)
            .filter(|bond| bond.atoms.len() >= 3 && bond.atoms.iter().all(|&atom| atom < atoms))
            .map(|bond| bond.atoms.clone())
            .collect();
        BondDrawing { sticks, stars }
    }
}

fn same_atoms(a: &Molecule, b: &Molecule) -> bool {
    a.atoms.len() == b.atoms.len()
        && a.atoms
            .iter()
            .zip(&b.atoms)
            .all(|(x, y)| x.element == y.element)
}

/// Colours and sizes of the sticks.
pub struct StickStyle {
    /// Width of a single bond's stick in pixels.
    pub width: f32,
    pub outline: Color32,
    /// Dashed half bonds and multicentre spokes.
    pub ink: Color32,
}

/// Paints one stick from `a` to `b`, coloured by its two atoms' colours.
pub fn paint_stick(
    painter: &egui::Painter,
    stick: &Stick,
    ends: [Pos2; 2],
    colours: [Color32; 2],
    style: &StickStyle,
) {
    let [a, b] = ends;
    let count = stick.lines + u32::from(stick.half);
    if count == 0 || (b - a).length() < 1.0 {
        return;
    }
    let direction = (b - a).normalized();
    let normal = Vec2::new(-direction.y, direction.x);
    let width = match count {
        1 => style.width,
        2 => (style.width * 0.5).max(2.0),
        _ => (style.width * 0.36).max(1.6),
    };
    let spacing = width * 1.7;
    for line in 0..count {
        let offset = normal * spacing * (line as f32 - (count - 1) as f32 / 2.0);
        let (from, to) = (a + offset, b + offset);
        if line < stick.lines {
            let middle = from + (to - from) * 0.5;
            painter.line_segment([from, to], Stroke::new(width + 2.0, style.outline));
            painter.line_segment([from, middle], Stroke::new(width, colours[0]));
            painter.line_segment([middle, to], Stroke::new(width, colours[1]));
        } else {
            let dash = (width * 1.6).max(4.0);
            painter.extend(egui::Shape::dashed_line(
                &[from, to],
                Stroke::new((width * 0.7).max(1.6), style.ink),
                dash,
                dash * 0.7,
            ));
        }
    }
}

/// Paints a multicentre bond: dashed spokes from each atom to the centroid, a dot there.
pub fn paint_star(painter: &egui::Painter, atoms: &[Pos2], style: &StickStyle) {
    if atoms.is_empty() {
        return;
    }
    let centroid = atoms.iter().fold(Vec2::ZERO, |sum, p| sum + p.to_vec2()) / atoms.len() as f32;
    let centroid = centroid.to_pos2();
    let width = (style.width * 0.3).max(1.6);
    for &atom in atoms {
        painter.extend(egui::Shape::dashed_line(
            &[atom, centroid],
            Stroke::new(width, style.ink),
            5.0,
            3.5,
        ));
    }
    painter.circle_filled(centroid, (width * 1.8).max(3.5), style.ink);
}

#[cfg(test)]
mod tests {
    use super::*;
    use diptych::localized::LewisStructure;
    use diptych::localized::lewis::{LewisBond, MulticentreBond};

    fn bond(a: usize, b: usize, order: f64) -> LewisBond {
        LewisBond {
            atoms: [a, b],
            order,
            index: order,
        }
    }

    #[test]
    fn aromatic_bonds_of_a_file_are_drawn_as_one_and_a_half() {
        let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("tests/meaning_inputs/benzene_aromatic.mol");
        let molecule = diptych::chem::io::read_molecule_file(&path)
            .expect("benzene reads")
            .molecule;
        let drawing = BondDrawing::perceived(&molecule);
        let ring: Vec<&Stick> = drawing.sticks.iter().filter(|s| s.b < 6).collect();
        assert_eq!(ring.len(), 6);
        assert!(ring.iter().all(|s| s.lines == 1 && s.half), "{ring:?}");
        assert!(drawing.sticks.iter().filter(|s| s.b >= 6).all(|s| !s.half));
    }

    #[test]
    fn orders_become_lines_and_dashed_halves() {
        let lewis = LewisStructure {
            bonds: vec![
                bond(0, 1, 1.0),
                bond(0, 2, 1.5),
                bond(0, 3, 3.0),
                bond(0, 4, 0.5),
                bond(1, 2, 0.0),
                bond(1, 3, -0.5),
            ],
            ..LewisStructure::default()
        };
        let drawing = BondDrawing::lewis(&lewis, 5);
        let got: Vec<(usize, u32, bool)> = drawing
            .sticks
            .iter()
            .map(|s| (s.b, s.lines, s.half))
            .collect();
        // Zero and negative orders are not drawn.
        assert_eq!(
            got,
            vec![(1, 1, false), (2, 1, true), (3, 3, false), (4, 0, true)]
        );
    }

    #[test]
    fn only_delocalized_multicentre_bonds_are_stars() {
        let lewis = LewisStructure {
            multicentre: vec![
                MulticentreBond {
                    atoms: vec![0, 1, 2],
                    electrons: 2.0,
                    kind: MulticentreKind::Delocalized,
                },
                MulticentreBond {
                    atoms: vec![1, 0, 3],
                    electrons: 4.0,
                    kind: MulticentreKind::ThreeCentreFourElectron,
                },
                MulticentreBond {
                    atoms: vec![0, 1, 9],
                    electrons: 2.0,
                    kind: MulticentreKind::Delocalized,
                },
            ],
            ..LewisStructure::default()
        };
        assert_eq!(BondDrawing::lewis(&lewis, 4).stars, vec![vec![0, 1, 2]]);
    }
}
