//! Marks on the species and capacity plots (target pH, tolerance window, meter reading) and the recipe's compact plot.
//!
//! The compact plot beside the recipe ([`super::draw_recipe_chemistry`]) is the Species
//! tab's two plots drawn by the same panel code ([`super::species_panel`],
//! [`super::capacity_panel`]) over a narrower pH range, with these marks instead of the
//! working-pH line.

use super::style::{font, line, DrawResult, Sc, Swatch, INK, SMALL_PX};
use crate::plots::data::{nearest, PlotData, Quantity, PH_MAX, PH_MIN};
use plotters::coord::types::RangedCoordf64;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// The tolerance window's fill colour (drawn light, at [`BAND_ALPHA`]).
pub const BAND: RGBColor = RGBColor(0x8a, 0x6a, 0x00);
/// Opacity of the tolerance window.
pub(crate) const BAND_ALPHA: f64 = 0.16;
/// The meter reading at the preparation temperature (dashed).
pub const METER: RGBColor = RGBColor(0xa3, 0x1f, 0x5a);
/// Width of the compact plot's pH range.
const WINDOW_PH: f64 = 4.0;

/// What a plot marks besides its curves.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Marks {
    /// Target pH at the working temperature.
    pub target: f64,
    /// Half-width of the tolerance window, pH.
    pub tolerance: f64,
    /// The meter reading where the buffer is made: (pH, °C); `None` when it
    /// is the working temperature's pH.
    pub meter: Option<(f64, f64)>,
}

impl Marks {
    /// Legend entries of the marks.
    pub(crate) fn legend(&self) -> Vec<(Swatch, String)> {
        let mut v = vec![
            (Swatch::Line(INK), format!("target pH {:.2}", self.target)),
            (
                Swatch::Band(BAND),
                format!(
                    "tolerance ±{} ({:.2}–{:.2})",
                    crate::plots::data::short(self.tolerance, 2),
                    self.target - self.tolerance,
                    self.target + self.tolerance
                ),
            ),
        ];
        if let Some((ph, t)) = self.meter {
            v.push((
                Swatch::Dashed(METER),
                format!(
                    "meter reads {ph:.2} at {} °C",
                    crate::plots::data::short(t, 3)
                ),
            ));
        }
        v
    }

    /// The tolerance window, under the curves.
    pub(crate) fn draw_band<DB: DrawingBackend>(
        &self,
        _s: Sc,
        chart: &mut ChartContext<'_, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
        y_top: f64,
        x: (f64, f64),
    ) -> DrawResult<(), DB> {
        let lo = (self.target - self.tolerance).max(x.0);
        let hi = (self.target + self.tolerance).min(x.1);
        if hi > lo {
            chart.draw_series(std::iter::once(Rectangle::new(
                [(lo, 0.0), (hi, y_top)],
                BAND.mix(BAND_ALPHA).filled(),
            )))?;
        }
        Ok(())
    }

    /// The target (solid) and the meter reading (dashed, labelled), over the curves.
    pub(crate) fn draw_lines<DB: DrawingBackend>(
        &self,
        s: Sc,
        chart: &mut ChartContext<'_, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
        y_top: f64,
        x: (f64, f64),
    ) -> DrawResult<(), DB> {
        let inside = |v: f64| (x.0..=x.1).contains(&v);
        if inside(self.target) {
            chart.draw_series(std::iter::once(PathElement::new(
                vec![(self.target, 0.0), (self.target, y_top)],
                line(s, INK, 2),
            )))?;
        }
        if let Some((ph, _)) = self.meter.filter(|m| inside(m.0)) {
            chart.draw_series(DashedLineSeries::new(
                vec![(ph, 0.0), (ph, y_top)],
                s.i(6),
                s.i(4),
                line(s, METER, 2),
            ))?;
            // "meter" beside the line, on the side away from the target.
            let right = ph >= self.target;
            let anchor = if right { HPos::Left } else { HPos::Right };
            let style = font(s, SMALL_PX)
                .color(&METER)
                .pos(Pos::new(anchor, VPos::Top));
            let (px, py) = chart.backend_coord(&(ph, y_top));
            let root = chart.plotting_area().strip_coord_spec();
            let (ox, oy) = {
                let (xr, yr) = root.get_pixel_range();
                (xr.start, yr.start)
            };
            let dx = if right { s.i(4) } else { -s.i(4) };
            root.draw(&Text::new(
                "meter".to_string(),
                (px - ox + dx, py - oy + s.i(2)),
                style,
            ))?;
        }
        Ok(())
    }
}

/// How a species or capacity panel is drawn: its pH range and its marks.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Panel<'m> {
    /// pH at the left and right edges.
    pub(crate) x: (f64, f64),
    /// Target, tolerance and meter marks (the recipe's compact plot); `None`:
    /// the Species tab's working-pH line and pK legend.
    pub(crate) marks: Option<&'m Marks>,
}

impl Panel<'_> {
    /// The Species tab's panels: pH 0–14, working-pH line.
    pub(crate) const FULL: Panel<'static> = Panel {
        x: (PH_MIN, PH_MAX),
        marks: None,
    };

    /// Whether grid pH `v` is drawn.
    pub(crate) fn contains(&self, v: f64) -> bool {
        v >= self.x.0 - 1e-9 && v <= self.x.1 + 1e-9
    }

    /// x tick count: every pH on the full range, every half pH on a narrow one.
    pub(crate) fn x_labels(&self) -> usize {
        let w = self.x.1 - self.x.0;
        if w > 6.0 {
            15
        } else {
            ((w * 2.0).round() as usize + 1).max(2)
        }
    }
}

/// The compact plot's pH range: [`WINDOW_PH`] wide, centred on the target,
/// moved inside pH 0–14.
pub fn recipe_window(target: f64) -> (f64, f64) {
    let t = if target.is_finite() { target } else { 7.0 };
    let lo = (t - WINDOW_PH / 2.0).clamp(PH_MIN, PH_MAX - WINDOW_PH);
    (lo, lo + WINDOW_PH)
}

/// Text for the compact plot's `aria-label`.
pub fn recipe_summary(data: &PlotData, marks: &Marks) -> String {
    let (lo, hi) = recipe_window(marks.target);
    let at = data
        .species_at(marks.target)
        .map(|(_, v, b)| {
            let sp = v
                .iter()
                .filter(|s| s.fraction >= 0.005)
                .map(|s| format!("{} {:.0} %", s.label, s.fraction * 100.0))
                .collect::<Vec<_>>()
                .join(", ");
            format!(
                "{sp}; buffer capacity {} mmol/(L·pH)",
                crate::plots::data::sig(b, 3)
            )
        })
        .unwrap_or_default();
    let meter = marks.meter.map_or(String::new(), |(ph, t)| {
        format!(
            " The meter reads {ph:.2} at {} °C while it is made.",
            crate::plots::data::short(t, 3)
        )
    });
    format!(
        "Species fractions and buffer capacity from pH {lo:.1} to {hi:.1} at {} °C. At the target pH {:.2} (tolerance ±{}): {at}.{meter}",
        crate::plots::data::short(data.temperature_c, 3),
        marks.target,
        crate::plots::data::short(marks.tolerance, 2),
    )
}

/// One row of the compact plot's data table.
#[derive(Debug, Clone, PartialEq)]
pub struct TableRow {
    /// Grid pH of the row.
    pub ph: f64,
    /// What is marked there ("target", "tolerance edge", "meter reading"), or empty.
    pub note: String,
    /// Fraction of each series (in [`PlotData::series`] order).
    pub fractions: Vec<f64>,
    /// β, mmol/(L·pH).
    pub beta_mm: f64,
}

/// The data table behind the compact plot: every half pH over the window,
/// plus the grid points nearest the marks, in pH order.
pub fn recipe_table(data: &PlotData, marks: &Marks) -> Vec<TableRow> {
    let (lo, hi) = recipe_window(marks.target);
    let mut picks: Vec<(usize, String)> = Vec::new();
    let mut mark = |ph: f64, note: &str| {
        if let Some(i) = nearest(&data.grid, ph).filter(|_| (lo..=hi).contains(&ph)) {
            picks.push((i, note.to_string()));
        }
    };
    mark(marks.target, "target");
    mark(marks.target - marks.tolerance, "tolerance, low edge");
    mark(marks.target + marks.tolerance, "tolerance, high edge");
    if let Some((ph, _)) = marks.meter {
        mark(ph, "meter reading");
    }
    let steps = ((hi - lo) * 2.0).round() as usize;
    for k in 0..=steps {
        if let Some(i) = nearest(&data.grid, lo + 0.5 * k as f64) {
            if !picks.iter().any(|(j, _)| *j == i) {
                picks.push((i, String::new()));
            }
        }
    }
    solver::order::sort_by(&mut picks, |a, b| a.0.cmp(&b.0));
    // Two marks on one grid point share a row.
    let mut rows: Vec<TableRow> = Vec::new();
    for (i, note) in picks {
        let Some(ph) = data.grid.get(i).copied() else {
            continue;
        };
        if let Some(last) = rows.last_mut().filter(|r| r.ph == ph) {
            if !note.is_empty() {
                last.note = if last.note.is_empty() {
                    note
                } else {
                    format!("{}; {note}", last.note)
                };
            }
            continue;
        }
        rows.push(TableRow {
            ph,
            note,
            fractions: data
                .series
                .iter()
                .map(|s| data.value(s, i, Quantity::Fraction))
                .collect(),
            beta_mm: data.capacity_mm.get(i).copied().unwrap_or(f64::NAN),
        });
    }
    rows
}
