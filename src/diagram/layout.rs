//! Layout of a two-ladder energy-level diagram in abstract units (1000 wide, 700 high):
//! an energy axis on the left, the delocalized ladder, a gap for correlation lines, the
//! localized ladder. Degenerate levels are drawn side by side; labels that would collide
//! are spread apart with leader lines (a one-dimensional overlap-removal pass, common
//! practice, no source).

use serde::Serialize;

/// Width and height of the layout's coordinate space.
pub const WIDTH: f64 = 1000.0;
pub const HEIGHT: f64 = 700.0;
const MARGIN_TOP: f64 = 70.0;
const MARGIN_BOTTOM: f64 = 40.0;
const AXIS_X: f64 = 60.0;
/// Horizontal extent of the two ladders' bar areas; labels go outside them.
const LADDER_SPANS: [(f64, f64); 2] = [(240.0, 440.0), (580.0, 780.0)];
const BAR_WIDTH: f64 = 56.0;
const BAR_GAP: f64 = 10.0;
/// Extra space between two different sets drawn in one row.
const GROUP_GAP: f64 = 22.0;
/// Sets closer than this vertically (layout units) are drawn in one row: their electron
/// arrows (±10 units) would otherwise cross the other set's bar (diborane's σ(B–H) and
/// 3c(B–H–B), 0.26 eV or 9.6 units apart).
const ROW_MERGE: f64 = 12.0;
/// Smallest vertical distance between two labels of one ladder.
pub const LABEL_SPACING: f64 = 15.0;

/// Which ladder: the delocalized (canonical MOs) or the localized one.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
pub enum Side {
    Delocalized,
    Localized,
}

impl Side {
    pub fn index(self) -> usize {
        match self {
            Side::Delocalized => 0,
            Side::Localized => 1,
        }
    }
}

/// One energy level given to the layout.
#[derive(Clone, Debug, PartialEq)]
pub struct LevelInput {
    pub energy_ev: f64,
    pub occupancy: f64,
    pub label: String,
    /// Levels with the same group id form one degenerate set drawn side by side.
    pub group: usize,
    /// An identifier the caller uses to map a level back to its orbital.
    pub key: usize,
    /// Where the level moves when the lone-pair mixing switch is flipped (eV, 0 = stays).
    pub shift_ev: f64,
}

/// One ladder given to the layout.
#[derive(Clone, Debug, PartialEq)]
pub struct LadderInput {
    pub title: String,
    pub levels: Vec<LevelInput>,
}

/// A correlation line from a localized level to a delocalized degenerate set.
#[derive(Clone, Debug, PartialEq)]
pub struct LinkInput {
    /// Key of the localized level.
    pub localized_key: usize,
    /// Group id of the delocalized set.
    pub delocalized_group: usize,
    pub weight: f64,
}

/// A placed level bar.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Level {
    pub key: usize,
    pub group: usize,
    pub energy_ev: f64,
    pub occupancy: f64,
    pub label: String,
    pub x_left: f64,
    pub x_right: f64,
    pub y: f64,
    /// Where the label's baseline-left point sits (after spreading).
    pub label_x: f64,
    pub label_y: f64,
    pub is_homo: bool,
    pub is_lumo: bool,
    /// Vertical position of the level with the lone-pair switch flipped, when it moves
    /// by more than 0.01 eV.
    pub shifted_y: Option<f64>,
    /// How far it moves ("+0.32", eV), on the first member of a set only.
    pub shift_text: Option<String>,
}

/// A placed correlation line, between the inner ends of two bars.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Link {
    pub localized_key: usize,
    pub delocalized_group: usize,
    pub weight: f64,
    pub from: (f64, f64),
    pub to: (f64, f64),
}

/// A tick on the energy axis.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Tick {
    pub y: f64,
    pub energy_ev: f64,
}

/// A placed ladder.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Ladder {
    pub title: String,
    pub title_x: f64,
    pub title_y: f64,
    pub levels: Vec<Level>,
    /// Levels above the energy window, not drawn.
    pub hidden_above: usize,
    /// Levels below the energy window, not drawn.
    pub hidden_below: usize,
}

/// The whole diagram.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Diagram {
    pub width: f64,
    pub height: f64,
    pub axis_x: f64,
    pub axis_top: f64,
    pub axis_bottom: f64,
    pub energy_min: f64,
    pub energy_max: f64,
    pub ticks: Vec<Tick>,
    pub ladders: Vec<Ladder>,
    pub links: Vec<Link>,
    /// The caption under the axis: the lone-pair switch's state, and the legend of the
    /// dotted marks (where levels go with the switch flipped) when there are any.
    pub caption: Caption,
}

/// The caption line of a diagram (DESIGN §4.6).
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct Caption {
    pub switch_state: Option<String>,
    pub shift_legend: Option<String>,
}

impl Caption {
    /// The caption's parts joined into one line (the legend only with `with_legend`).
    pub fn line(&self, with_legend: bool) -> Option<String> {
        let parts: Vec<&str> = self
            .switch_state
            .iter()
            .chain(self.shift_legend.iter().filter(|_| with_legend))
            .map(String::as_str)
            .collect();
        (!parts.is_empty()).then(|| parts.join(" · "))
    }

    /// Vertical position of the caption in the diagram's coordinates.
    pub fn y(diagram: &Diagram) -> f64 {
        diagram.height - 8.0
    }
}

impl Ladder {
    /// The notes on levels outside the energy window ("+2 higher level(s) not shown"),
    /// above and below the axis; drawn by the window and the SVG alike.
    pub fn hidden_notes(&self) -> [Option<String>; 2] {
        [
            (self.hidden_above > 0)
                .then(|| format!("+{} higher level(s) not shown", self.hidden_above)),
            (self.hidden_below > 0)
                .then(|| format!("+{} lower level(s) not shown", self.hidden_below)),
        ]
    }
}

impl Diagram {
    /// Where a ladder's hidden-level notes go: above the axis top and below its bottom.
    pub fn hidden_note_ys(&self) -> [f64; 2] {
        [self.axis_top - 16.0, self.axis_bottom + 16.0]
    }

    /// Vertical position of an energy (higher energy, smaller y).
    pub fn y_of(&self, energy_ev: f64) -> f64 {
        y_of(energy_ev, self.energy_min, self.energy_max)
    }
}

fn y_of(energy: f64, min: f64, max: f64) -> f64 {
    let span = (max - min).max(1e-9);
    MARGIN_TOP + (max - energy) / span * (HEIGHT - MARGIN_TOP - MARGIN_BOTTOM)
}

/// A "nice" tick step (1, 2 or 5 × 10^k) giving about `target` ticks over `span`.
fn tick_step(span: f64, target: f64) -> f64 {
    let raw = (span / target).max(1e-9);
    let magnitude = 10f64.powf(raw.log10().floor());
    let fraction = raw / magnitude;
    let nice = if fraction < 1.5 {
        1.0
    } else if fraction < 3.5 {
        2.0
    } else if fraction < 7.5 {
        5.0
    } else {
        10.0
    };
    nice * magnitude
}

/// The energy window: every occupied level and the virtual levels up to `virtual_span`
/// eV above the LUMO, padded by 1 eV.
fn energy_window(ladders: &[LadderInput], virtual_span: f64) -> (f64, f64) {
    let all = ladders.iter().flat_map(|l| &l.levels);
    let lowest = all
        .clone()
        .map(|l| l.energy_ev)
        .fold(f64::INFINITY, f64::min);
    let highest_occupied = all
        .clone()
        .filter(|l| l.occupancy > 0.0)
        .map(|l| l.energy_ev)
        .fold(f64::NEG_INFINITY, f64::max);
    let lowest_virtual = all
        .clone()
        .filter(|l| l.occupancy <= 0.0)
        .map(|l| l.energy_ev)
        .fold(f64::INFINITY, f64::min);
    let top_anchor = if lowest_virtual.is_finite() {
        lowest_virtual + virtual_span
    } else {
        highest_occupied
    };
    let highest = all
        .map(|l| l.energy_ev)
        .filter(|&e| e <= top_anchor)
        .fold(f64::NEG_INFINITY, f64::max);
    if !lowest.is_finite() || !highest.is_finite() {
        return (-20.0, 0.0);
    }
    (lowest - 1.0, highest.max(lowest + 1.0) + 1.0)
}

/// The default energy window: every occupied level and the virtual levels up to
/// `virtual_span` eV above the LUMO, padded by 1 eV.
pub fn default_window(ladders: &[LadderInput; 2], virtual_span: f64) -> (f64, f64) {
    energy_window(ladders, virtual_span)
}

/// Places both ladders, the axis and the links in the default energy window.
pub fn layout(ladders: &[LadderInput; 2], links: &[LinkInput], virtual_span: f64) -> Diagram {
    layout_in(ladders, links, energy_window(ladders, virtual_span))
}

/// Places both ladders, the axis and the links with the energy axis spanning `window`
/// (eV, low to high); levels outside it are counted, not drawn.
pub fn layout_in(ladders: &[LadderInput; 2], links: &[LinkInput], window: (f64, f64)) -> Diagram {
    let (energy_min, energy_max) =
        if window.0.is_finite() && window.1.is_finite() && window.1 - window.0 > 1e-3 {
            window
        } else {
            (-20.0, 0.0)
        };
    let step = tick_step(energy_max - energy_min, 8.0);
    let mut ticks = Vec::new();
    let mut tick = (energy_min / step).ceil() * step;
    while tick <= energy_max + 1e-9 {
        ticks.push(Tick {
            y: y_of(tick, energy_min, energy_max),
            energy_ev: if tick.abs() < step * 1e-6 { 0.0 } else { tick },
        });
        tick += step;
    }
    let placed: Vec<Ladder> = ladders
        .iter()
        .zip(LADDER_SPANS)
        .enumerate()
        .map(|(side, (input, span))| place_ladder(input, span, side, energy_min, energy_max))
        .collect();
    let links = place_links(&placed, links);
    Diagram {
        width: WIDTH,
        height: HEIGHT,
        axis_x: AXIS_X,
        axis_top: MARGIN_TOP,
        axis_bottom: HEIGHT - MARGIN_BOTTOM,
        energy_min,
        energy_max,
        ticks,
        ladders: placed,
        links,
        caption: Caption::default(),
    }
}

fn place_ladder(input: &LadderInput, span: (f64, f64), side: usize, min: f64, max: f64) -> Ladder {
    // Group degenerate members, keeping the caller's order within a group.
    let mut groups: Vec<(usize, Vec<&LevelInput>)> = Vec::new();
    let mut hidden_above = 0;
    let mut hidden_below = 0;
    for level in &input.levels {
        if level.energy_ev > max || level.energy_ev < min {
            hidden_above += usize::from(level.energy_ev > max);
            hidden_below += usize::from(level.energy_ev < min);
            continue;
        }
        match groups.iter_mut().find(|(group, _)| *group == level.group) {
            Some((_, members)) => members.push(level),
            None => groups.push((level.group, vec![level])),
        }
    }
    let homo_energy = input
        .levels
        .iter()
        .filter(|l| l.occupancy > 0.0)
        .map(|l| l.energy_ev)
        .fold(f64::NEG_INFINITY, f64::max);
    let lumo_energy = input
        .levels
        .iter()
        .filter(|l| l.occupancy <= 0.0)
        .map(|l| l.energy_ev)
        .fold(f64::INFINITY, f64::min);
    let centre = (span.0 + span.1) / 2.0;
    // Sets whose bars would touch vertically share a row and are placed side by side; a
    // row wider than the ladder gets narrower bars.
    let mut order: Vec<usize> = (0..groups.len()).collect();
    order.sort_by(|&a, &b| {
        groups[a].1[0]
            .energy_ev
            .total_cmp(&groups[b].1[0].energy_ev)
    });
    let mut rows: Vec<Vec<usize>> = Vec::new();
    for index in order {
        let y = y_of(groups[index].1[0].energy_ev, min, max);
        match rows.last_mut() {
            Some(row) if (y_of(groups[row[0]].1[0].energy_ev, min, max) - y).abs() < ROW_MERGE => {
                row.push(index)
            }
            _ => rows.push(vec![index]),
        }
    }
    let mut x_of_member: Vec<Vec<f64>> = groups.iter().map(|(_, m)| vec![0.0; m.len()]).collect();
    let mut bar_of_group = vec![BAR_WIDTH; groups.len()];
    for row in &rows {
        let bars: usize = row.iter().map(|&g| groups[g].1.len()).sum();
        let base_gaps = bars.saturating_sub(1) as f64 * BAR_GAP
            + row.len().saturating_sub(1) as f64 * GROUP_GAP;
        // Bars and gaps shrink together so that the row fits the ladder's width.
        let fitted = (span.1 - span.0) / (bars as f64 + base_gaps / BAR_WIDTH);
        let bar = BAR_WIDTH.min(fitted);
        let scale = bar / BAR_WIDTH;
        let total = bars as f64 * bar + base_gaps * scale;
        let mut x = centre - total / 2.0;
        for &g in row {
            bar_of_group[g] = bar;
            for slot in x_of_member[g].iter_mut() {
                *slot = x;
                x += bar + BAR_GAP * scale;
            }
            x += (GROUP_GAP - BAR_GAP) * scale;
        }
    }
    let mut levels = Vec::new();
    for (g, (_, members)) in groups.iter().enumerate() {
        for (n, member) in members.iter().enumerate() {
            let x_left = x_of_member[g][n];
            let y = y_of(member.energy_ev, min, max);
            levels.push(Level {
                key: member.key,
                group: member.group,
                energy_ev: member.energy_ev,
                occupancy: member.occupancy,
                label: member.label.clone(),
                x_left,
                x_right: x_left + bar_of_group[g],
                y,
                label_x: 0.0,
                label_y: y,
                // Tagged once per set, on its last member, in the canonical ladder only (a
                // Lewis ladder has no frontier orbitals of its own).
                is_homo: side == 0
                    && n + 1 == members.len()
                    && (member.energy_ev - homo_energy).abs() < 1e-6,
                is_lumo: side == 0
                    && n + 1 == members.len()
                    && (member.energy_ev - lumo_energy).abs() < 1e-6,
                shifted_y: (member.shift_ev.abs() > 0.01)
                    .then(|| y_of(member.energy_ev + member.shift_ev, min, max)),
                shift_text: (n == 0 && member.shift_ev.abs() > 0.01).then(|| {
                    let sign = if member.shift_ev > 0.0 { "+" } else { "" };
                    format!("{sign}{}", super::style::format_energy(member.shift_ev, 2))
                }),
            });
        }
    }
    // Two sets at one energy (an accidental degeneracy) are both frontier sets; the tag
    // goes on the outer one only.
    fn homo(level: &mut Level) -> &mut bool {
        &mut level.is_homo
    }
    fn lumo(level: &mut Level) -> &mut bool {
        &mut level.is_lumo
    }
    for tag in [homo, lumo] {
        let mut tagged: Vec<usize> = (0..levels.len())
            .filter(|&k| *tag(&mut levels[k]))
            .collect();
        tagged.sort_by(|&a, &b| levels[a].x_right.total_cmp(&levels[b].x_right));
        tagged.pop();
        for k in tagged {
            *tag(&mut levels[k]) = false;
        }
    }
    spread_labels(&mut levels, side, span);
    Ladder {
        title: input.title.clone(),
        title_x: centre,
        title_y: 32.0,
        levels,
        hidden_above,
        hidden_below,
    }
}

/// One label per degenerate set, placed outside the ladder (left of the delocalized one,
/// right of the localized one), pushed apart to at least `LABEL_SPACING`.
fn spread_labels(levels: &mut [Level], side: usize, span: (f64, f64)) {
    let mut order: Vec<usize> = (0..levels.len()).collect();
    order.sort_by(|&a, &b| levels[a].y.total_cmp(&levels[b].y));
    // First member of each group carries the label.
    let mut seen = Vec::new();
    let mut carriers: Vec<usize> = Vec::new();
    for index in order {
        if !seen.contains(&levels[index].group) {
            seen.push(levels[index].group);
            carriers.push(index);
        }
    }
    let mut positions: Vec<f64> = carriers.iter().map(|&i| levels[i].y).collect();
    // Push down overlapping labels, then pull the block back up around its centre.
    for n in 1..positions.len() {
        if positions[n] - positions[n - 1] < LABEL_SPACING {
            positions[n] = positions[n - 1] + LABEL_SPACING;
        }
    }
    let shift: f64 = carriers
        .iter()
        .zip(&positions)
        .map(|(&i, &p)| p - levels[i].y)
        .sum::<f64>()
        / positions.len().max(1) as f64;
    for p in positions.iter_mut() {
        *p -= shift / 2.0;
    }
    for n in 1..positions.len() {
        if positions[n] - positions[n - 1] < LABEL_SPACING {
            positions[n] = positions[n - 1] + LABEL_SPACING;
        }
    }
    for (&index, &y) in carriers.iter().zip(&positions) {
        levels[index].label_y = y;
        levels[index].label_x = if side == 0 {
            span.0 - 8.0
        } else {
            span.1 + 8.0
        };
    }
    for level in levels.iter_mut() {
        if level.label_x == 0.0 {
            // Non-carrier members share the carrier's label; mark them as unlabelled.
            level.label_x = f64::NAN;
        }
    }
}

fn place_links(ladders: &[Ladder], links: &[LinkInput]) -> Vec<Link> {
    let mut placed = Vec::new();
    let (Some(delocalized), Some(localized)) = (ladders.first(), ladders.get(1)) else {
        return placed;
    };
    for link in links {
        let Some(from) = localized
            .levels
            .iter()
            .find(|l| l.key == link.localized_key)
        else {
            continue;
        };
        // Lines of an equivalent set leave from the set's inner (left) end.
        let inner_x = localized
            .levels
            .iter()
            .filter(|l| l.group == from.group)
            .map(|l| l.x_left)
            .fold(f64::INFINITY, f64::min);
        let targets: Vec<&Level> = delocalized
            .levels
            .iter()
            .filter(|l| l.group == link.delocalized_group)
            .collect();
        let Some(right_most) = targets
            .iter()
            .max_by(|a, b| a.x_right.total_cmp(&b.x_right))
        else {
            continue;
        };
        placed.push(Link {
            localized_key: link.localized_key,
            delocalized_group: link.delocalized_group,
            weight: link.weight,
            from: (inner_x, from.y),
            to: (right_most.x_right, right_most.y),
        });
    }
    placed
}

#[cfg(test)]
mod tests {
    use super::*;

    fn level(energy_ev: f64, occupancy: f64, group: usize, key: usize) -> LevelInput {
        LevelInput {
            energy_ev,
            occupancy,
            label: format!("L{key}"),
            group,
            key,
            shift_ev: 0.0,
        }
    }

    fn ammonia_like() -> [LadderInput; 2] {
        [
            LadderInput {
                title: "left".into(),
                levels: vec![
                    level(-28.6, 2.0, 0, 0),
                    level(-16.5, 2.0, 1, 1),
                    level(-16.5, 2.0, 1, 2),
                    level(-13.7, 2.0, 2, 3),
                    level(2.2, 0.0, 3, 4),
                    level(2.2, 0.0, 3, 5),
                    level(24.5, 0.0, 4, 6),
                ],
            },
            LadderInput {
                title: "right".into(),
                levels: vec![level(-18.0, 2.0, 10, 10), level(-14.0, 2.0, 11, 11)],
            },
        ]
    }

    #[test]
    fn energies_map_monotonically_and_degenerate_levels_sit_side_by_side() {
        let diagram = layout(&ammonia_like(), &[], 8.0);
        let left = &diagram.ladders[0];
        let e: Vec<&Level> = left.levels.iter().filter(|l| l.group == 1).collect();
        assert_eq!(e.len(), 2);
        assert_eq!(e[0].y, e[1].y);
        assert!(e[0].x_right <= e[1].x_left, "side by side, not overlapping");
        let y_low = diagram.y_of(-28.6);
        let y_high = diagram.y_of(-13.7);
        assert!(y_low > y_high, "higher energy is drawn higher (smaller y)");
        // The 24.5 eV level is beyond LUMO + 8 eV and is hidden, not squeezed in.
        assert_eq!(left.hidden_above, 1);
        assert!(left.levels.iter().any(|l| l.is_homo && l.key == 3));
        assert_eq!(
            left.levels.iter().filter(|l| l.is_lumo).count(),
            1,
            "one tag per set"
        );
    }

    #[test]
    fn sets_at_nearly_the_same_energy_share_a_row_without_overlap() {
        let mut ladders = ammonia_like();
        // Six equivalent bonds and three others 0.005 eV away (cyclopropane's C–H and C–C).
        ladders[1].levels = (0..9)
            .map(|k| {
                level(
                    if k < 6 { -18.645 } else { -18.650 },
                    2.0,
                    if k < 6 { 30 } else { 31 },
                    30 + k,
                )
            })
            .collect();
        let diagram = layout(&ladders, &[], 8.0);
        let mut bars: Vec<(f64, f64)> = diagram.ladders[1]
            .levels
            .iter()
            .map(|l| (l.x_left, l.x_right))
            .collect();
        bars.sort_by(|a, b| a.0.total_cmp(&b.0));
        for pair in bars.windows(2) {
            assert!(pair[0].1 <= pair[1].0 + 1e-9, "bars overlap: {pair:?}");
        }
        let (span_left, span_right) = LADDER_SPANS[1];
        assert!(
            bars[0].0 >= span_left - 1e-9 && bars[8].1 <= span_right + 1e-9,
            "inside the ladder"
        );
    }

    #[test]
    fn labels_never_overlap() {
        let mut ladders = ammonia_like();
        ladders[1].levels = (0..8)
            .map(|k| level(-15.0 + 0.05 * k as f64, 2.0, 20 + k, 20 + k))
            .collect();
        let diagram = layout(&ladders, &[], 8.0);
        let mut ys: Vec<f64> = diagram.ladders[1]
            .levels
            .iter()
            .filter(|l| l.label_x.is_finite())
            .map(|l| l.label_y)
            .collect();
        ys.sort_by(f64::total_cmp);
        assert_eq!(ys.len(), 8);
        for pair in ys.windows(2) {
            assert!(pair[1] - pair[0] >= LABEL_SPACING - 1e-9);
        }
    }

    #[test]
    fn links_join_the_inner_ends_of_bars() {
        let links = vec![LinkInput {
            localized_key: 11,
            delocalized_group: 1,
            weight: 0.6,
        }];
        let diagram = layout(&ammonia_like(), &links, 8.0);
        assert_eq!(diagram.links.len(), 1);
        let link = &diagram.links[0];
        assert!(
            link.to.0 < link.from.0,
            "from the right ladder to the left one"
        );
        assert!((link.to.1 - diagram.y_of(-16.5)).abs() < 1e-9);
    }

    #[test]
    fn a_chosen_window_zooms_the_axis_and_hides_the_rest() {
        let diagram = layout_in(&ammonia_like(), &[], (-18.0, -12.0));
        assert_eq!((diagram.energy_min, diagram.energy_max), (-18.0, -12.0));
        let left = &diagram.ladders[0];
        assert_eq!(left.levels.len(), 3, "1e pair and 3a1 remain");
        assert_eq!((left.hidden_below, left.hidden_above), (1, 3));
        assert!((diagram.y_of(-12.0) - diagram.axis_top).abs() < 1e-9);
        // An empty or inverted window falls back to a usable one instead of dividing by 0.
        let fallback = layout_in(&ammonia_like(), &[], (5.0, 5.0));
        assert!(fallback.energy_max > fallback.energy_min);
    }

    #[test]
    fn ticks_are_round_numbers_inside_the_window() {
        let diagram = layout(&ammonia_like(), &[], 8.0);
        assert!(diagram.ticks.len() >= 4);
        for tick in &diagram.ticks {
            assert!(
                tick.energy_ev >= diagram.energy_min - 1e-9
                    && tick.energy_ev <= diagram.energy_max + 1e-9
            );
            assert!(
                (tick.energy_ev / 5.0).fract().abs() < 1e-9
                    || (tick.energy_ev / 2.0).fract().abs() < 1e-9
            );
        }
    }
}
