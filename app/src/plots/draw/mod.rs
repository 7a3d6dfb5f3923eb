//! Drawing the three plots, generic over the plotters backend (canvas in the page, SVG in tests).
//!
//! Each `draw_*` function paints a whole plot into the given area and returns
//! the [`Frame`] of its plotting rectangle, which the page uses to map a
//! pointer position back to a pH or an added amount. Sizes are in CSS pixels:
//! the page's canvas backend scales to device pixels underneath.

use super::data::{sig, PlotData, Quantity, PH_MAX, PH_MIN};
use plotters::coord::types::RangedCoordf64;
use plotters::coord::{CoordTranslate, Shift};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

mod marks;
mod style;
mod summary;
pub use marks::{recipe_summary, recipe_table, recipe_window, Marks, TableRow, BAND, METER};
pub(crate) use marks::{Panel, BAND_ALPHA};
pub(crate) use style::{font, line, DrawResult, Sc, Swatch, FONT_PX};
pub use style::{species_color, Frame, CAPACITY, CURSOR, GRID, INK, MUTED, PALETTE, TITRATION};
use style::{LEGEND_ROW, SMALL_PX};
use summary::pk_legend;
pub use summary::{capacity_summary, species_summary, titration_summary};

/// Short axis tick text: at most three decimals, trailing zeros dropped.
pub fn tick(v: f64) -> String {
    if v.abs() < 1e-9 {
        return "0".into();
    }
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    s.to_string()
}

/// Lay legend entries out in rows across `width`; returns (x, row) for each entry and the row count.
fn legend_layout<DB: DrawingBackend>(
    s: Sc,
    area: &DrawingArea<DB, Shift>,
    labels: &[String],
) -> (Vec<(i32, i32)>, i32) {
    let width = i32::try_from(area.dim_in_pixel().0).unwrap_or(i32::MAX);
    let style = font(s, FONT_PX);
    let mut x = s.i(8);
    let mut row = 0;
    let mut pos = Vec::with_capacity(labels.len());
    for label in labels {
        let tw = area
            .estimate_text_size(label, &style)
            .map_or(s.i(8) * label.chars().count() as i32, |(w, _)| {
                i32::try_from(w).unwrap_or(0)
            });
        let w = s.i(28) + tw + s.i(14);
        if x > s.i(8) && x + w > width - s.i(8) {
            row += 1;
            x = s.i(8);
        }
        pos.push((x, row));
        x += w;
    }
    (pos, row + 1)
}

/// Draw the legend at the top of `area`; returns the remaining area below it.
pub(crate) fn legend<DB: DrawingBackend>(
    s: Sc,
    area: &DrawingArea<DB, Shift>,
    entries: &[(Swatch, String)],
) -> DrawResult<DrawingArea<DB, Shift>, DB> {
    let labels: Vec<String> = entries.iter().map(|e| e.1.clone()).collect();
    let (pos, rows) = legend_layout(s, area, &labels);
    let row_h = s.i(LEGEND_ROW);
    let (top, rest) = area.split_vertically(rows * row_h + s.i(8));
    let style = font(s, FONT_PX).pos(Pos::new(HPos::Left, VPos::Center));
    for ((swatch, label), (x, row)) in entries.iter().zip(pos) {
        let y = s.i(6) + row * row_h + row_h / 2;
        match swatch {
            Swatch::Line(c) => {
                top.draw(&PathElement::new(
                    vec![(x, y), (x + s.i(22), y)],
                    line(s, *c, 3),
                ))?;
            }
            Swatch::Dashed(c) => {
                for k in 0..3 {
                    let x0 = x + s.i(k * 8);
                    top.draw(&PathElement::new(
                        vec![(x0, y), (x0 + s.i(5), y)],
                        line(s, *c, 2),
                    ))?;
                }
            }
            Swatch::Dot(c) => {
                top.draw(&Circle::new((x + s.i(11), y), s.u(4), c.filled()))?;
            }
            Swatch::Band(c) => {
                top.draw(&Rectangle::new(
                    [(x, y - s.i(6)), (x + s.i(22), y + s.i(6))],
                    c.mix(BAND_ALPHA).filled(),
                ))?;
            }
        }
        top.draw(&Text::new(label.clone(), (x + s.i(28), y), style.clone()))?;
    }
    Ok(rest)
}

/// A message in the middle of an otherwise empty plot (no data to show).
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_message<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    message: &str,
    scale: f64,
) -> DrawResult<(), DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let (w, h) = area.dim_in_pixel();
    let center = (
        i32::try_from(w / 2).unwrap_or(0),
        i32::try_from(h / 2).unwrap_or(0),
    );
    let style = font(s, FONT_PX)
        .color(&MUTED)
        .pos(Pos::new(HPos::Center, VPos::Center));
    area.draw(&Text::new(message.to_string(), center, style))?;
    Ok(())
}

pub(crate) fn frame_of<DB: DrawingBackend, CT: CoordTranslate>(
    area: &DrawingArea<DB, CT>,
    x: (f64, f64),
) -> Frame {
    let (xr, yr) = area.get_pixel_range();
    Frame {
        left: xr.start,
        right: xr.end,
        top: yr.start,
        bottom: yr.end,
        x,
    }
}

/// Draw the dashed pK lines (vertical, on a pH x-axis) with their values in the top margin.
fn pk_lines_vertical<DB: DrawingBackend>(
    s: Sc,
    chart: &mut ChartContext<'_, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
    data: &PlotData,
    y_top: f64,
    x: (f64, f64),
) -> DrawResult<(), DB> {
    let mut last_right = i32::MIN;
    let label_style = font(s, SMALL_PX)
        .color(&MUTED)
        .pos(Pos::new(HPos::Center, VPos::Bottom));
    for (_, step, pk) in data.pk_marks() {
        if !(x.0..=x.1).contains(&pk) {
            continue;
        }
        chart.draw_series(DashedLineSeries::new(
            vec![(pk, 0.0), (pk, y_top)],
            s.i(5),
            s.i(4),
            line(s, MUTED, 1),
        ))?;
        let (px, py) = chart.backend_coord(&(pk, y_top));
        let text = format!("pK{} {pk:.2}", subscript(step));
        let half = s.i(4) * text.chars().count() as i32;
        if px - half > last_right {
            let root = chart.plotting_area().strip_coord_spec();
            let (ox, oy) = {
                let (xr, yr) = root.get_pixel_range();
                (xr.start, yr.start)
            };
            root.draw(&Text::new(
                text,
                (px - ox, py - oy - s.i(3)),
                label_style.clone(),
            ))?;
            last_right = px + half;
        }
    }
    Ok(())
}

fn subscript(n: usize) -> String {
    n.to_string()
        .chars()
        .map(|c| match c {
            '0' => '₀',
            '1' => '₁',
            '2' => '₂',
            '3' => '₃',
            '4' => '₄',
            '5' => '₅',
            '6' => '₆',
            '7' => '₇',
            '8' => '₈',
            '9' => '₉',
            other => other,
        })
        .collect()
}

/// What differs between the plots' axes; everything else (margins, grid,
/// tick marks, fonts) is the same for all of them and set in [`axes`].
pub(crate) struct Axes<'f> {
    pub(crate) x: std::ops::Range<f64>,
    pub(crate) y: std::ops::Range<f64>,
    pub(crate) x_labels: usize,
    pub(crate) y_labels: usize,
    pub(crate) x_fmt: &'f dyn Fn(&f64) -> String,
    pub(crate) x_desc: &'f str,
    pub(crate) y_desc: &'f str,
    pub(crate) margin_top: i32,
}

/// A chart on `area` with the house axes: one set-up for every plot.
pub(crate) fn axes<'a, DB: DrawingBackend>(
    s: Sc,
    area: &'a DrawingArea<DB, Shift>,
    a: &Axes<'_>,
) -> DrawResult<ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>, DB> {
    let mut chart = ChartBuilder::on(area)
        .margin_top(s.i(a.margin_top))
        .margin_right(s.i(16))
        .margin_left(s.i(6))
        .x_label_area_size(s.i(42))
        .y_label_area_size(s.i(60))
        .build_cartesian_2d(a.x.clone(), a.y.clone())?;
    let y_fmt = |v: &f64| tick(*v);
    chart
        .configure_mesh()
        .x_labels(a.x_labels)
        .y_labels(a.y_labels)
        .max_light_lines(0)
        .set_all_tick_mark_size(s.i(5))
        .bold_line_style(GRID)
        .axis_style(MUTED)
        .x_label_formatter(a.x_fmt)
        .y_label_formatter(&y_fmt)
        .label_style(font(s, SMALL_PX))
        .axis_desc_style(font(s, FONT_PX))
        .x_desc(a.x_desc)
        .y_desc(a.y_desc)
        .draw()?;
    Ok(chart)
}

/// Species plot: the fraction (or concentration) of every species over pH 0–14,
/// with pK markers, the working pH and an optional pointer cursor.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_species<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    quantity: Quantity,
    cursor: Option<f64>,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    species_panel(s, area, data, quantity, cursor, &Panel::FULL)
}

/// The species plot on `area` over the panel's pH range, with its marks
/// (target, tolerance window, meter reading) when it has them.
pub(crate) fn species_panel<DB: DrawingBackend>(
    s: Sc,
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    quantity: Quantity,
    cursor: Option<f64>,
    p: &Panel<'_>,
) -> DrawResult<Frame, DB> {
    let mut entries: Vec<(Swatch, String)> = data
        .series
        .iter()
        .enumerate()
        .map(|(i, ser)| {
            let c = species_color(i);
            let swatch = if ser.system == 0 {
                Swatch::Line(c)
            } else {
                Swatch::Dashed(c)
            };
            (swatch, data.label(ser))
        })
        .collect();
    match p.marks {
        None => {
            entries.push((Swatch::Line(INK), format!("working pH {:.2}", data.ph)));
            entries.extend(pk_legend(data));
        }
        Some(m) => entries.extend(m.legend()),
    }
    let plot_area = legend(s, area, &entries)?;

    let (y_top, y_desc) = match quantity {
        Quantity::Fraction => (1.0, "fraction of system total"),
        Quantity::Concentration => (
            super::data::nice_ceiling(data.max_total_mm() * 1.02),
            "concentration, mmol/L",
        ),
    };
    let x_fmt = |v: &f64| tick(*v);
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: p.x.0..p.x.1,
            y: 0.0..y_top,
            x_labels: p.x_labels(),
            y_labels: 6,
            x_fmt: &x_fmt,
            x_desc: "pH",
            y_desc,
            margin_top: 18,
        },
    )?;
    pk_lines_vertical(s, &mut chart, data, y_top, p.x)?;
    if let Some(m) = p.marks {
        m.draw_band(s, &mut chart, y_top, p.x)?;
    }

    for (i, ser) in data.series.iter().enumerate() {
        let pts = data
            .grid
            .iter()
            .enumerate()
            .filter(|(_, x)| p.contains(**x))
            .map(|(j, x)| (*x, data.value(ser, j, quantity)));
        let style = line(s, species_color(i), 2);
        if ser.system == 0 {
            chart.draw_series(LineSeries::new(pts, style))?;
        } else {
            chart.draw_series(DashedLineSeries::new(pts, s.i(9), s.i(4), style))?;
        }
    }
    match p.marks {
        None => working_line(s, &mut chart, data.ph, y_top)?,
        Some(m) => m.draw_lines(s, &mut chart, y_top, p.x)?,
    }
    if let Some(c) = cursor.and_then(|c| super::data::nearest(&data.grid, c)) {
        if let Some(x) = data.grid.get(c).copied() {
            chart.draw_series(std::iter::once(PathElement::new(
                vec![(x, 0.0), (x, y_top)],
                line(s, CURSOR, 1),
            )))?;
            for (i, ser) in data.series.iter().enumerate() {
                let y = data.value(ser, c, quantity);
                chart.draw_series(std::iter::once(Circle::new(
                    (x, y),
                    s.u(4),
                    species_color(i).filled(),
                )))?;
            }
        }
    }
    Ok(frame_of(chart.plotting_area(), p.x))
}

/// Split a curve into the runs that stay within `y ≤ top`, cutting each run
/// where it crosses `top` (linear between grid points).
pub fn clip_top(xs: &[f64], ys: &[f64], top: f64) -> Vec<Vec<(f64, f64)>> {
    let mut runs: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut cur: Vec<(f64, f64)> = Vec::new();
    let mut prev: Option<(f64, f64)> = None;
    for (&x, &y) in xs.iter().zip(ys.iter()) {
        if !y.is_finite() {
            continue;
        }
        if let Some((px, py)) = prev {
            let crossing = (py <= top) != (y <= top);
            if crossing && (y - py).abs() > 0.0 {
                let t = (top - py) / (y - py);
                cur.push((px + t * (x - px), top));
                if y > top {
                    runs.push(std::mem::take(&mut cur));
                }
            }
        }
        if y <= top {
            cur.push((x, y));
        }
        prev = Some((x, y));
    }
    if !cur.is_empty() {
        runs.push(cur);
    }
    runs.retain(|r| r.len() > 1);
    runs
}

/// Buffer capacity plot: β (mmol/(L·pH)) over pH 0–14, clipped where water's
/// own capacity runs off the scale.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_capacity<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    cursor: Option<f64>,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    capacity_panel(s, area, data, cursor, &Panel::FULL)
}

/// The capacity plot on `area` over the panel's pH range; a marked panel
/// (beside the recipe) keeps only the curve's legend entry and shares the
/// species panel's marks.
pub(crate) fn capacity_panel<DB: DrawingBackend>(
    s: Sc,
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    cursor: Option<f64>,
    p: &Panel<'_>,
) -> DrawResult<Frame, DB> {
    let entries = vec![
        (Swatch::Line(CAPACITY), "buffer capacity β".to_string()),
        (
            Swatch::Line(INK),
            format!(
                "working pH {:.2} (β = {} mM/pH)",
                data.ph,
                sig(data.capacity_at_ph * 1000.0, 3)
            ),
        ),
    ];
    let entries: Vec<(Swatch, String)> = match p.marks {
        None => entries.into_iter().chain(pk_legend(data)).collect(),
        Some(_) => entries.into_iter().take(1).collect(),
    };
    let plot_area = legend(s, area, &entries)?;
    let top = if p.marks.is_some() {
        data.capacity_ceiling_between(p.x.0, p.x.1)
    } else {
        data.capacity_ceiling()
    };
    let x_fmt = |v: &f64| tick(*v);
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: p.x.0..p.x.1,
            y: 0.0..top,
            x_labels: p.x_labels(),
            y_labels: 6,
            x_fmt: &x_fmt,
            x_desc: "pH",
            y_desc: "β, mmol/(L·pH)",
            margin_top: 18,
        },
    )?;
    pk_lines_vertical(s, &mut chart, data, top, p.x)?;
    if let Some(m) = p.marks {
        m.draw_band(s, &mut chart, top, p.x)?;
    }
    let (xs, ys): (Vec<f64>, Vec<f64>) = data
        .grid
        .iter()
        .zip(data.capacity_mm.iter())
        .filter(|(x, _)| p.contains(**x))
        .map(|(x, b)| (*x, *b))
        .unzip();
    let filled: Vec<(f64, f64)> = xs
        .iter()
        .zip(ys.iter())
        .map(|(x, b)| (*x, b.min(top)))
        .collect();
    chart.draw_series(AreaSeries::new(filled, 0.0, CAPACITY.mix(0.12)))?;
    for run in clip_top(&xs, &ys, top) {
        chart.draw_series(LineSeries::new(run, line(s, CAPACITY, 2)))?;
    }
    match p.marks {
        None => working_line(s, &mut chart, data.ph, top)?,
        Some(m) => m.draw_lines(s, &mut chart, top, p.x)?,
    }
    if let Some(c) = cursor.and_then(|c| super::data::nearest(&data.grid, c)) {
        if let (Some(x), Some(b)) = (data.grid.get(c), data.capacity_mm.get(c)) {
            chart.draw_series(std::iter::once(PathElement::new(
                vec![(*x, 0.0), (*x, top)],
                line(s, CURSOR, 1),
            )))?;
            if *b <= top {
                chart.draw_series(std::iter::once(Circle::new(
                    (*x, *b),
                    s.u(4),
                    CAPACITY.filled(),
                )))?;
            }
        }
    }
    Ok(frame_of(chart.plotting_area(), p.x))
}

/// The recipe's compact plot: species fractions above, buffer capacity
/// below, both over [`recipe_window`] with the marks. Returns the species
/// panel's frame.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_recipe_chemistry<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    marks: &Marks,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let h = area.dim_in_pixel().1;
    let split = i32::try_from(h).unwrap_or(0) * 3 / 5;
    let (top, bottom) = area.split_vertically(split);
    let p = Panel {
        x: recipe_window(marks.target),
        marks: Some(marks),
    };
    let frame = species_panel(s, &top, data, Quantity::Fraction, None, &p)?;
    capacity_panel(s, &bottom, data, None, &p)?;
    Ok(frame)
}

/// Titration plot: pH against strong acid (left, HCl) or base (right, NaOH)
/// added, mmol/L, with the starting point and pK levels marked.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_titration<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    data: &PlotData,
    cursor: Option<f64>,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let x0 = data.added_mm.first().copied().unwrap_or(-1.0);
    let x1 = data.added_mm.last().copied().unwrap_or(1.0);
    let (x0, x1) = if x1 > x0 { (x0, x1) } else { (-1.0, 1.0) };
    let entries = vec![
        (Swatch::Line(TITRATION), "pH after adding".to_string()),
        (
            Swatch::Dot(INK),
            format!("start: nothing added, pH {:.2}", data.ph),
        ),
    ];
    let entries: Vec<(Swatch, String)> = entries.into_iter().chain(pk_legend(data)).collect();
    let plot_area = legend(s, area, &entries)?;
    let x_fmt = |v: &f64| tick(v.abs());
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: x0..x1,
            y: PH_MIN..PH_MAX,
            x_labels: 9,
            y_labels: 8,
            x_fmt: &x_fmt,
            x_desc: "← HCl added   mmol/L   NaOH added →",
            y_desc: "pH",
            margin_top: 10,
        },
    )?;
    let pk_label = font(s, SMALL_PX)
        .color(&MUTED)
        .pos(Pos::new(HPos::Right, VPos::Bottom));
    let mut last_label_y = i32::MAX;
    for (_, step, pk) in data.pk_marks() {
        if !(PH_MIN..=PH_MAX).contains(&pk) {
            continue;
        }
        chart.draw_series(DashedLineSeries::new(
            vec![(x0, pk), (x1, pk)],
            s.i(5),
            s.i(4),
            line(s, MUTED, 1),
        ))?;
        // pK values rise, so labels move up the plot; skip one that would overlap the last.
        let y = chart.backend_coord(&(x1, pk)).1;
        if last_label_y - y >= s.i(14) {
            chart.draw_series(std::iter::once(Text::new(
                format!("pK{} {pk:.2}", subscript(step)),
                (x1, pk),
                pk_label.clone(),
            )))?;
            last_label_y = y;
        }
    }
    chart.draw_series(std::iter::once(PathElement::new(
        vec![(0.0, PH_MIN), (0.0, PH_MAX)],
        line(s, GRID, 1),
    )))?;
    let pts = data
        .added_mm
        .iter()
        .zip(data.titration_ph.iter())
        .map(|(x, y)| (*x, *y));
    chart.draw_series(LineSeries::new(pts, line(s, TITRATION, 2)))?;
    chart.draw_series(std::iter::once(Circle::new(
        (0.0, data.ph),
        s.u(5),
        INK.filled(),
    )))?;
    if let Some((x, y)) = cursor.and_then(|c| data.titration_at(c)) {
        chart.draw_series(std::iter::once(PathElement::new(
            vec![(x, PH_MIN), (x, PH_MAX)],
            line(s, CURSOR, 1),
        )))?;
        chart.draw_series(std::iter::once(Circle::new(
            (x, y),
            s.u(4),
            TITRATION.filled(),
        )))?;
    }
    Ok(frame_of(chart.plotting_area(), (x0, x1)))
}

/// The working pH as a solid vertical line.
fn working_line<DB: DrawingBackend>(
    s: Sc,
    chart: &mut ChartContext<'_, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
    ph: f64,
    y_top: f64,
) -> DrawResult<(), DB> {
    chart.draw_series(std::iter::once(PathElement::new(
        vec![(ph, 0.0), (ph, y_top)],
        line(s, INK, 2),
    )))?;
    Ok(())
}

#[cfg(test)]
mod tests;
