//! What the Series window shows of a finished series: the table (the library's
//! `series::table` cells, so the same text as the CSV; a click on a heading sorts by it,
//! numbers as numbers) and two egui_plot plots: the donor lone pair's energy against its
//! %s, and −ε(HOMO) and −ε(lone pair) against the measured ionization energy with the
//! least-squares lines and their slope, offset and r².

use diptych::chem::formula::subscript_runs;
use diptych::series::choice::{describe, donor_options};
use diptych::series::table::{HEADINGS, cells};
use diptych::series::{DonorChoice, LineFit, Series, SeriesRow};
use eframe::egui;
use egui_plot::{Legend, Line, Plot, PlotPoints, Points, Text};

/// The table's columns (indices into `COLUMNS`): the label first; the Hill formula is
/// left out (the label is the formula as chemists write it); the source and notes are
/// hover texts.
const SHOWN: [usize; 18] = [
    1, 0, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18,
];
const LABEL: usize = 1;
const DONOR_ATOM: usize = 7;
const MEASURED: usize = 18;
const SOURCE: usize = 19;
const NOTES: usize = 20;

const HOMO_COLOUR: egui::Color32 = egui::Color32::from_rgb(40, 90, 170);
const LONE_PAIR_COLOUR: egui::Color32 = egui::Color32::from_rgb(196, 100, 20);

/// A donor chosen in the table: the row (= member) and its new choice.
pub type DonorChange = (usize, DonorChoice);

/// Table and plots; `sort` is (column, ascending); `choices` are the members' donor
/// choices (a menu per row when given). Returns the donor the user picked, if any.
pub fn show(
    ui: &mut egui::Ui,
    series: &Series,
    sort: &mut Option<(usize, bool)>,
    choices: Option<&[DonorChoice]>,
) -> Option<DonorChange> {
    let table_height = (ui.available_height() * 0.45).max(160.0);
    let change = egui::ScrollArea::both()
        .id_salt("series table")
        .max_height(table_height)
        .show(ui, |ui| table(ui, series, sort, choices))
        .inner;
    ui.separator();
    fit_summary(ui, series);
    let height = ui.available_height().max(200.0);
    ui.columns(2, |columns| {
        energy_against_s(&mut columns[0], series, height);
        koopmans(&mut columns[1], series, height);
    });
    change
}

/// Row order for a sort column: numbers compare as numbers, empty cells go last.
pub fn sorted_order(rows: &[Vec<String>], sort: Option<(usize, bool)>) -> Vec<usize> {
    let mut order: Vec<usize> = (0..rows.len()).collect();
    let Some((column, ascending)) = sort else {
        return order;
    };
    order.sort_by(|&a, &b| {
        let (x, y) = (&rows[a][column], &rows[b][column]);
        let by_value = match (x.parse::<f64>(), y.parse::<f64>()) {
            (Ok(p), Ok(q)) => p.total_cmp(&q),
            _ => x.cmp(y),
        };
        match (x.is_empty(), y.is_empty()) {
            (true, false) => std::cmp::Ordering::Greater,
            (false, true) => std::cmp::Ordering::Less,
            _ if ascending => by_value,
            _ => by_value.reverse(),
        }
    });
    order
}

fn table(
    ui: &mut egui::Ui,
    series: &Series,
    sort: &mut Option<(usize, bool)>,
    choices: Option<&[DonorChoice]>,
) -> Option<DonorChange> {
    let rows: Vec<Vec<String>> = series.rows.iter().map(cells).collect();
    let mut change = None;
    egui::Grid::new("series grid")
        .striped(true)
        .spacing([14.0, 4.0])
        .show(ui, |ui| {
            for &column in &SHOWN {
                let mark = match *sort {
                    Some((c, true)) if c == column => " ▲",
                    Some((c, false)) if c == column => " ▼",
                    _ => "",
                };
                let heading = egui::RichText::new(format!("{}{mark}", HEADINGS[column])).strong();
                if ui
                    .button(heading)
                    .on_hover_text("Sort by this column")
                    .clicked()
                {
                    *sort = match *sort {
                        Some((c, ascending)) if c == column => Some((column, !ascending)),
                        _ => Some((column, true)),
                    };
                }
            }
            ui.end_row();
            for index in sorted_order(&rows, *sort) {
                let row = &rows[index];
                for &column in &SHOWN {
                    let choice = choices.and_then(|c| c.get(index));
                    let has_lone_pairs = !series.rows[index].lone_pairs.is_empty();
                    if let (DONOR_ATOM, Some(choice), true) = (column, choice, has_lone_pairs) {
                        let picked = donor_menu(ui, index, &series.rows[index], choice);
                        if change.is_none() {
                            change = picked.map(|c| (index, c));
                        }
                        continue;
                    }
                    let response = ui.label(subscript_digits(&row[column], column == LABEL));
                    if column == LABEL && !row[NOTES].is_empty() {
                        response.on_hover_text(&row[NOTES]);
                    } else if column == MEASURED && !row[SOURCE].is_empty() {
                        response.on_hover_text(&row[SOURCE]);
                    }
                }
                ui.end_row();
            }
        });
    change
}

/// The donor cell: the donor atom, with a menu of the row's other choices.
fn donor_menu(
    ui: &mut egui::Ui,
    index: usize,
    row: &SeriesRow,
    current: &DonorChoice,
) -> Option<DonorChoice> {
    let shown = row.donor.as_ref().map_or_else(
        || "none".to_string(),
        |d| format!("{}{}", d.element, d.atom),
    );
    let mut picked = None;
    let response = egui::ComboBox::from_id_salt(("donor choice", index))
        .selected_text(&shown)
        .show_ui(ui, |ui| {
            for option in donor_options(row) {
                let selected = option == *current;
                if ui
                    .selectable_label(selected, describe(&option, row))
                    .clicked()
                    && !selected
                {
                    picked = Some(option);
                }
            }
        })
        .response;
    // Named by its molecule for screen readers (and the tests).
    let name = format!("Donor of {}: {shown}", row.label);
    response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::ComboBox, true, &name));
    response.on_hover_text(format!("Donor: {}", describe(current, row)));
    picked
}

/// A label's formula digits as Unicode subscripts ("NH3" → "NH₃"); other text as given.
fn subscript_digits(text: &str, formula: bool) -> String {
    if !formula {
        return text.to_string();
    }
    subscript_runs(text)
        .into_iter()
        .flat_map(|(run, subscript)| {
            run.chars()
                .map(move |c| match (subscript, c.to_digit(10)) {
                    (true, Some(d)) => char::from_u32(0x2080 + d).unwrap_or(c),
                    _ => c,
                })
                .collect::<Vec<char>>()
        })
        .collect()
}

fn fit_text(what: &str, fit: Option<&LineFit>) -> String {
    match fit {
        Some(f) => format!(
            "{what} = {:.3}·IE {} {:.2} eV, r² = {:.3} ({} molecules)",
            f.slope,
            if f.offset < 0.0 { "−" } else { "+" },
            f.offset.abs(),
            f.r_squared,
            f.points
        ),
        None => format!("{what}: no fitted line (fewer than two measured values)"),
    }
}

fn fit_summary(ui: &mut egui::Ui, series: &Series) {
    ui.horizontal_wrapped(|ui| {
        ui.colored_label(HOMO_COLOUR, fit_text("−ε(HOMO)", series.homo_fit.as_ref()));
        ui.separator();
        ui.colored_label(
            LONE_PAIR_COLOUR,
            fit_text("−ε(lone pair)", series.lone_pair_fit.as_ref()),
        );
    });
}

/// Points with their formula as a label beside each.
fn labelled(
    plot: &mut egui_plot::PlotUi,
    name: &str,
    points: &[([f64; 2], &SeriesRow)],
    colour: egui::Color32,
) {
    let xy: Vec<[f64; 2]> = points.iter().map(|(p, _)| *p).collect();
    plot.points(
        Points::new(name, PlotPoints::from(xy))
            .radius(4.5)
            .color(colour),
    );
    for (p, row) in points {
        plot.text(
            Text::new(
                "",
                (*p).into(),
                egui::RichText::new(subscript_digits(&row.label, true))
                    .color(colour)
                    .size(12.0),
            )
            .anchor(egui::Align2::LEFT_BOTTOM),
        );
    }
}

fn energy_against_s(ui: &mut egui::Ui, series: &Series, height: f32) {
    let points: Vec<([f64; 2], &SeriesRow)> = series
        .rows
        .iter()
        .filter_map(|row| {
            let donor = row.donor.as_ref()?;
            Some(([donor.s_percent?, donor.energy_ev], row))
        })
        .collect();
    Plot::new("series energy vs s")
        .height(height)
        .x_axis_label("%s of the donor lone pair")
        .y_axis_label("ε(lone pair) / eV")
        .allow_scroll(false)
        .show(ui, |plot| {
            labelled(plot, "donor lone pair", &points, LONE_PAIR_COLOUR)
        });
}

fn fit_points(fit: Option<&LineFit>, xs: &[f64]) -> Option<Vec<[f64; 2]>> {
    let fit = fit?;
    let low = xs.iter().copied().fold(f64::INFINITY, f64::min);
    let high = xs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    (low.is_finite() && high > low).then(|| {
        [low - 0.3, high + 0.3]
            .iter()
            .map(|&x| [x, fit.slope * x + fit.offset])
            .collect()
    })
}

fn koopmans(ui: &mut egui::Ui, series: &Series, height: f32) {
    let with = |computed: &dyn Fn(&SeriesRow) -> Option<f64>| -> Vec<([f64; 2], &SeriesRow)> {
        series
            .rows
            .iter()
            .filter_map(|row| Some(([row.measured.as_ref()?.energy_ev, computed(row)?], row)))
            .collect()
    };
    let homo = with(&|row| row.homo.as_ref().map(|h| -h.energy_ev));
    let lone_pair = with(&|row| row.donor.as_ref().map(|d| -d.energy_ev));
    let xs: Vec<f64> = homo.iter().map(|(p, _)| p[0]).collect();
    Plot::new("series koopmans")
        .height(height)
        .legend(Legend::default().position(egui_plot::Corner::LeftTop))
        .x_axis_label("measured first vertical ionization energy / eV")
        .y_axis_label("−ε / eV")
        .allow_scroll(false)
        .show(ui, |plot| {
            labelled(plot, "−ε(HOMO)", &homo, HOMO_COLOUR);
            labelled(plot, "−ε(lone pair)", &lone_pair, LONE_PAIR_COLOUR);
            if let Some(line) = fit_points(series.homo_fit.as_ref(), &xs) {
                plot.line(Line::new("HOMO fit", PlotPoints::from(line)).color(HOMO_COLOUR));
            }
            if let Some(line) = fit_points(series.lone_pair_fit.as_ref(), &xs) {
                plot.line(
                    Line::new("lone-pair fit", PlotPoints::from(line))
                        .color(LONE_PAIR_COLOUR)
                        .style(egui_plot::LineStyle::dashed_loose()),
                );
            }
        });
}

#[cfg(test)]
mod tests {
    use super::sorted_order;

    #[test]
    fn numbers_sort_as_numbers_and_empty_cells_last() {
        let rows: Vec<Vec<String>> = ["-13.7", "", "-9.5", "-14.9"]
            .iter()
            .map(|v| vec![v.to_string()])
            .collect();
        assert_eq!(sorted_order(&rows, Some((0, true))), vec![3, 0, 2, 1]);
        assert_eq!(sorted_order(&rows, Some((0, false))), vec![2, 0, 3, 1]);
        assert_eq!(sorted_order(&rows, None), vec![0, 1, 2, 3]);
    }
}
