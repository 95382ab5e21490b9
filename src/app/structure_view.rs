//! The Structure panel's 3D view: an orthographic ball-and-stick drawing made with egui's
//! painter (painter's algorithm: far items first). Drag rotates, the wheel zooms, a click
//! selects the front-most atom under the pointer, shift-drag moves the selected atom in the
//! plane of the screen.

use diptych::chem::Molecule;
use eframe::egui::{self, Align2, Color32, FontId, Pos2, Rect, Sense, Stroke, Vec2};
use nalgebra::{Rotation3, Vector3};

use super::bond_sticks::{BondDrawing, StickStyle, paint_star, paint_stick};
use super::theme::{ACCENT, element_colour, mix};

/// Orientation and zoom of the view.
#[derive(Clone, Debug)]
pub struct Camera {
    pub rotation: Rotation3<f64>,
    /// Multiplies the fit-to-panel scale.
    pub zoom: f32,
    pub show_labels: bool,
}

impl Default for Camera {
    fn default() -> Self {
        // A slight tilt so that a molecule built along z does not look flat.
        Camera {
            rotation: Rotation3::from_euler_angles(-1.2, 0.0, 0.35),
            zoom: 1.0,
            show_labels: true,
        }
    }
}

impl Camera {
    /// A view looking along the molecule's axis of largest moment of inertia (so that a
    /// planar molecule shows its face), tilted a little to show depth.
    pub fn facing(molecule: &Molecule) -> Camera {
        let centre = geometric_centre(molecule);
        let mut inertia = nalgebra::Matrix3::<f64>::zeros();
        for atom in &molecule.atoms {
            let r = atom.position - centre;
            let m = atom.element.mass();
            inertia += (nalgebra::Matrix3::identity() * r.norm_squared() - r * r.transpose()) * m;
        }
        let eigen = inertia.symmetric_eigen();
        let mut order = [0usize, 1, 2];
        order.sort_by(|&a, &b| eigen.eigenvalues[a].total_cmp(&eigen.eigenvalues[b]));
        let x = eigen.eigenvectors.column(order[0]).into_owned();
        let y = eigen.eigenvectors.column(order[1]).into_owned();
        let z = x.cross(&y);
        let rows = nalgebra::Matrix3::from_rows(&[x.transpose(), y.transpose(), z.transpose()]);
        let base = Rotation3::from_matrix_unchecked(rows);
        Camera {
            rotation: Rotation3::from_euler_angles(-0.55, 0.25, 0.0) * base,
            ..Camera::default()
        }
    }
}

/// What the user did in the view this frame.
#[derive(Default)]
pub struct ViewEvents {
    pub clicked_atom: Option<usize>,
    pub clicked_background: bool,
    /// Shift-drag: the selected atom and its displacement in Å (molecule frame).
    pub moved_atom: Option<(usize, Vector3<f64>)>,
}

/// Radius of an atom's ball in Å: a fraction of its covalent radius.
fn ball_radius(covalent_radius: f64) -> f32 {
    (0.08 + 0.22 * covalent_radius) as f32
}

struct Projected {
    screen: Pos2,
    depth: f64,
    radius: f32,
}

enum Item {
    Atom(usize),
    Bond(usize),
    Star(usize),
}

/// Draws the molecule into the available space and handles the mouse.
pub fn show(
    ui: &mut egui::Ui,
    molecule: &Molecule,
    bonds: &BondDrawing,
    camera: &mut Camera,
    selected: Option<usize>,
    halo_weights: &[(usize, f64)],
) -> ViewEvents {
    let visible = ui.available_rect_before_wrap().intersect(ui.clip_rect());
    let size = visible.size().max(Vec2::splat(80.0));
    let (response, painter) = ui.allocate_painter(size, Sense::click_and_drag());
    let rect = response.rect;
    let mut events = ViewEvents::default();

    let shift_held = ui.input(|input| input.modifiers.shift);
    let movable = selected.filter(|&atom| atom < molecule.atoms.len());
    if response.dragged_by(egui::PointerButton::Primary)
        && shift_held
        && let Some(atom) = movable
    {
        let shift = view_plane_shift(camera, response.drag_delta(), scale(molecule, camera, rect));
        if shift.norm() > 0.0 {
            events.moved_atom = Some((atom, shift));
        }
    } else if response.dragged_by(egui::PointerButton::Primary) {
        let delta = response.drag_delta();
        let turn = Rotation3::from_euler_angles(delta.y as f64 * 0.01, delta.x as f64 * 0.01, 0.0);
        camera.rotation = turn * camera.rotation;
    }
    if response.hovered() {
        let scroll = ui.input(|input| input.smooth_scroll_delta.y);
        if scroll != 0.0 {
            camera.zoom = (camera.zoom * (scroll * 0.002).exp()).clamp(0.1, 20.0);
        }
    }

    let background = ui.visuals().extreme_bg_color;
    painter.rect_filled(rect, 4.0, background);
    if molecule.atoms.is_empty() {
        return events;
    }
    let projected = project(molecule, camera, rect);

    if response.clicked()
        && let Some(pointer) = response.interact_pointer_pos()
    {
        {
            events.clicked_atom = projected
                .iter()
                .enumerate()
                .filter(|(_, p)| p.screen.distance(pointer) <= p.radius.max(6.0))
                .max_by(|a, b| a.1.depth.total_cmp(&b.1.depth))
                .map(|(index, _)| index);
            events.clicked_background = events.clicked_atom.is_none();
        }
    }

    let mut items: Vec<(f64, Item)> = Vec::new();
    for (index, p) in projected.iter().enumerate() {
        items.push((p.depth, Item::Atom(index)));
    }
    for (index, stick) in bonds.sticks.iter().enumerate() {
        // A bond is drawn just behind the nearer of its two atoms.
        let depth = projected[stick.a].depth.min(projected[stick.b].depth) - 1e-3;
        items.push((depth, Item::Bond(index)));
    }
    for (index, atoms) in bonds.stars.iter().enumerate() {
        let depth = atoms
            .iter()
            .map(|&atom| projected[atom].depth)
            .fold(f64::INFINITY, f64::min)
            - 1e-3;
        items.push((depth, Item::Star(index)));
    }
    items.sort_by(|a, b| a.0.total_cmp(&b.0));

    let dark = ui.visuals().dark_mode;
    let outline = if dark {
        Color32::from_gray(20)
    } else {
        Color32::from_gray(60)
    };
    let pixels_per_angstrom = scale(molecule, camera, rect);
    let style = StickStyle {
        width: (0.14 * pixels_per_angstrom).clamp(2.0, 14.0),
        outline,
        ink: if dark {
            Color32::from_gray(200)
        } else {
            Color32::from_gray(60)
        },
    };
    for (_, item) in &items {
        match *item {
            Item::Bond(index) => {
                let stick = &bonds.sticks[index];
                paint_stick(
                    &painter,
                    stick,
                    [projected[stick.a].screen, projected[stick.b].screen],
                    [
                        element_colour(molecule.atoms[stick.a].element),
                        element_colour(molecule.atoms[stick.b].element),
                    ],
                    &style,
                );
            }
            Item::Star(index) => {
                let ends: Vec<Pos2> = bonds.stars[index]
                    .iter()
                    .map(|&atom| projected[atom].screen)
                    .collect();
                paint_star(&painter, &ends, &style);
            }
            Item::Atom(index) => {
                let p = &projected[index];
                let element = molecule.atoms[index].element;
                let colour = element_colour(element);
                painter.circle_filled(p.screen, p.radius, colour);
                let highlight = mix(colour, Color32::WHITE, 0.45);
                painter.circle_filled(
                    p.screen + Vec2::new(-0.3, -0.3) * p.radius,
                    p.radius * 0.35,
                    highlight,
                );
                painter.circle_stroke(p.screen, p.radius, Stroke::new(1.2, outline));
                if let Some(&(_, weight)) = halo_weights.iter().find(|(atom, _)| *atom == index) {
                    // The hovered orbital's share on this atom: a translucent halo.
                    let alpha = (40.0 + 180.0 * weight.clamp(0.0, 1.0)) as u8;
                    painter.circle_filled(
                        p.screen,
                        p.radius * (1.0 + 0.6 * weight.clamp(0.0, 1.0) as f32),
                        Color32::from_rgba_unmultiplied(
                            ACCENT.r(),
                            ACCENT.g(),
                            ACCENT.b(),
                            alpha / 2,
                        ),
                    );
                    painter.circle_stroke(p.screen, p.radius + 2.0, Stroke::new(2.0, ACCENT));
                }
                if selected == Some(index) {
                    painter.circle_stroke(p.screen, p.radius + 4.0, Stroke::new(2.5, ACCENT));
                }
                if camera.show_labels {
                    let text_colour = if dark {
                        Color32::from_gray(230)
                    } else {
                        Color32::from_gray(25)
                    };
                    painter.text(
                        p.screen + Vec2::new(p.radius * 0.75, -p.radius * 0.75),
                        Align2::LEFT_BOTTOM,
                        format!("{}{}", element.symbol(), index),
                        FontId::proportional(12.0),
                        text_colour,
                    );
                }
            }
        }
    }
    events
}

/// The displacement in Å (molecule frame) of a drag by `delta` screen pixels, in the
/// plane of the screen: the depth of the dragged atom does not change.
pub fn view_plane_shift(camera: &Camera, delta: Vec2, pixels_per_angstrom: f32) -> Vector3<f64> {
    let pixels = f64::from(pixels_per_angstrom.max(1e-3));
    // Screen y grows downwards; the view frame's y grows upwards.
    let in_view = Vector3::new(
        f64::from(delta.x) / pixels,
        -f64::from(delta.y) / pixels,
        0.0,
    );
    camera.rotation.inverse() * in_view
}

/// Pixels per Å so that the molecule fills about 80 % of the smaller panel side.
fn scale(molecule: &Molecule, camera: &Camera, rect: Rect) -> f32 {
    let centre = geometric_centre(molecule);
    let extent = molecule
        .atoms
        .iter()
        .map(|atom| {
            (atom.position - centre).norm() + ball_radius(atom.element.covalent_radius()) as f64
        })
        .fold(0.5, f64::max);
    (0.4 * rect.width().min(rect.height()) / extent as f32) * camera.zoom
}

fn geometric_centre(molecule: &Molecule) -> Vector3<f64> {
    molecule
        .atoms
        .iter()
        .map(|a| a.position)
        .sum::<Vector3<f64>>()
        / molecule.atoms.len().max(1) as f64
}

fn project(molecule: &Molecule, camera: &Camera, rect: Rect) -> Vec<Projected> {
    let centre = geometric_centre(molecule);
    let pixels = scale(molecule, camera, rect);
    molecule
        .atoms
        .iter()
        .map(|atom| {
            let p = camera.rotation * (atom.position - centre);
            Projected {
                screen: rect.center() + Vec2::new(p.x as f32, -p.y as f32) * pixels,
                depth: p.z,
                radius: ball_radius(atom.element.covalent_radius()) * pixels,
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_shift_drag_moves_parallel_to_the_screen_by_the_dragged_distance() {
        let camera = Camera::default();
        let shift = view_plane_shift(&camera, Vec2::new(30.0, -40.0), 50.0);
        // 50 px per Å: a 50-pixel drag is 1 Å.
        assert!((shift.norm() - 1.0).abs() < 1e-6, "{shift}");
        let towards_viewer = camera.rotation.inverse() * Vector3::z();
        assert!(
            shift.dot(&towards_viewer).abs() < 1e-9,
            "no change of depth"
        );
        // Dragging up the screen moves the atom up in the view frame.
        let in_view = camera.rotation * shift;
        assert!(in_view.y > 0.0 && in_view.x > 0.0, "{in_view}");
    }
}
