//! Field reading plots: the form that matters vs pH (sample temperature and ±5 °C), and a day's log over row order.
//!
//! Pure data shaping ([`FractionView`], [`LogSeries`]) plus drawing generic
//! over the plotters backend, so native tests can render to SVG.

use super::data::nice_ceiling;
use super::draw::{
    axes, frame_of, legend, line, tick, Axes, DrawResult, Frame, Sc, Swatch, CAPACITY, INK,
};
use plotters::coord::Shift;
use plotters::prelude::*;

/// Colour of the user's limit line.
pub const LIMIT: RGBColor = RGBColor(0xb4, 0x23, 0x18);
/// Colour of the curve at the sample temperature.
pub const CURVE: RGBColor = CAPACITY;

/// The curve 5 °C below the sample: solid, cool blue.
pub const COLDER: RGBColor = RGBColor(0x2f, 0x5f, 0xb3);
/// The curve 5 °C above the sample: dashed, warm brown.
pub const WARMER: RGBColor = RGBColor(0xa8, 0x4b, 0x00);
/// Grid points per dash of the warmer curve.
const DASH: usize = 3;

/// Which of the fraction plot's curves a temperature is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CurveKind {
    /// The sample's own temperature.
    Sample,
    /// Below it.
    Colder,
    /// Above it.
    Warmer,
}

/// The kind of the curve at `t` for a sample at `sample` °C.
pub fn curve_kind(t: f64, sample: f64) -> CurveKind {
    if (t - sample).abs() < 1e-9 {
        CurveKind::Sample
    } else if t < sample {
        CurveKind::Colder
    } else {
        CurveKind::Warmer
    }
}

/// The fraction plot's data: curves at T−5, T, T+5 °C (those in range), the reading, the limit.
#[derive(Debug, Clone, PartialEq)]
pub struct FractionView {
    /// Species name.
    pub species: String,
    /// pH grid.
    pub ph: Vec<f64>,
    /// (temperature °C, fraction per grid point).
    pub curves: Vec<(f64, Vec<f64>)>,
    /// Sample temperature, °C.
    pub temperature_c: f64,
    /// The reading: (pH, fraction).
    pub reading: (f64, f64),
    /// Fraction of the total at which the user's limit is reached (at this total).
    pub limit_fraction: Option<f64>,
}

impl FractionView {
    /// Top of the y axis: a round number above the highest shown value (and the limit), at most 1.
    pub fn y_top(&self) -> f64 {
        let hi = self
            .curves
            .iter()
            .flat_map(|(_, f)| f.iter().copied())
            .chain(std::iter::once(self.reading.1))
            .chain(self.limit_fraction.filter(|l| *l <= 1.0).map(|l| l * 1.15))
            .filter(|v| v.is_finite())
            .fold(0.0_f64, f64::max);
        nice_ceiling(hi.max(1e-3)).min(1.0)
    }

    /// Rows of the data table: every `step`-th grid point: pH then % at each temperature.
    pub fn table_rows(&self, step: usize) -> Vec<Vec<String>> {
        let step = step.max(1);
        self.ph
            .iter()
            .enumerate()
            .filter(|(i, _)| i % step == 0 || *i + 1 == self.ph.len())
            .map(|(i, p)| {
                std::iter::once(format!("{p:.2}"))
                    .chain(self.curves.iter().map(|(_, f)| {
                        f.get(i)
                            .map_or_else(String::new, |v| format!("{:.3} %", v * 100.0))
                    }))
                    .collect()
            })
            .collect()
    }
}

/// Draw the fraction plot.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_fraction<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    v: &FractionView,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let lo = v.ph.first().copied().unwrap_or(0.0);
    let hi = v.ph.last().copied().unwrap_or(14.0).max(lo + 0.1);
    let mut entries = Vec::new();
    for (t, _) in &v.curves {
        let swatch = match curve_kind(*t, v.temperature_c) {
            CurveKind::Sample => Swatch::Line(CURVE),
            CurveKind::Colder => Swatch::Line(COLDER),
            CurveKind::Warmer => Swatch::Dashed(WARMER),
        };
        entries.push((swatch, format!("{} at {} °C", v.species, tick(*t))));
    }
    entries.push((
        Swatch::Dot(INK),
        format!(
            "reading pH {:.2}: {:.3} %",
            v.reading.0,
            v.reading.1 * 100.0
        ),
    ));
    if let Some(l) = v.limit_fraction {
        entries.push((
            Swatch::Dashed(LIMIT),
            format!("your limit ({:.3} %)", l * 100.0),
        ));
    }
    let plot_area = legend(s, area, &entries)?;
    let top = v.y_top();
    let x_fmt = |x: &f64| tick(*x);
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: lo..hi,
            y: 0.0..top,
            x_labels: 8,
            y_labels: 6,
            x_fmt: &x_fmt,
            x_desc: "pH",
            y_desc: "share of the total (1 = 100 %)",
            margin_top: 18,
        },
    )?;
    for (t, f) in &v.curves {
        let pts: Vec<(f64, f64)> =
            v.ph.iter()
                .zip(f.iter())
                .map(|(x, y)| (*x, y.min(top)))
                .collect();
        match curve_kind(*t, v.temperature_c) {
            CurveKind::Sample => {
                chart.draw_series(LineSeries::new(pts, line(s, CURVE, 3)))?;
            }
            CurveKind::Colder => {
                chart.draw_series(LineSeries::new(pts, line(s, COLDER, 2)))?;
            }
            CurveKind::Warmer => {
                // Dashed: every other run of grid points (the grid is dense).
                for dash in pts.windows(DASH + 1).step_by(2 * DASH) {
                    chart.draw_series(LineSeries::new(dash.to_vec(), line(s, WARMER, 2)))?;
                }
            }
        }
    }
    if let Some(l) = v.limit_fraction.filter(|l| *l <= top) {
        let n = 40;
        let w = (hi - lo) / f64::from(n);
        for k in (0..n).step_by(2) {
            let x0 = lo + w * f64::from(k);
            chart.draw_series(std::iter::once(PathElement::new(
                vec![(x0, l), (x0 + w, l)],
                line(s, LIMIT, 2),
            )))?;
        }
    }
    let (rx, ry) = v.reading;
    if rx >= lo && rx <= hi {
        chart.draw_series(std::iter::once(PathElement::new(
            vec![(rx, 0.0), (rx, top)],
            line(s, INK, 1),
        )))?;
        chart.draw_series(std::iter::once(Circle::new(
            (rx, ry.min(top)),
            s.u(5),
            INK.filled(),
        )))?;
    }
    Ok(frame_of(chart.plotting_area(), (lo, hi)))
}

/// One-line summary for the canvas's accessible name.
pub fn fraction_summary(v: &FractionView) -> String {
    let temps: Vec<String> = v.curves.iter().map(|(t, _)| tick(*t)).collect();
    let mut s = format!(
        "Share of {} against pH at {} °C. The reading, pH {:.2}, is {:.3} %.",
        v.species,
        temps.join(", "),
        v.reading.0,
        v.reading.1 * 100.0
    );
    if let Some(l) = v.limit_fraction {
        s.push_str(&format!(" Your limit is reached at {:.3} %.", l * 100.0));
    }
    s
}

/// A log's form that matters, by row order.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LogSeries {
    /// Quantity name for the axis (`NH₃, mg/L as NH₃`).
    pub label: String,
    /// (row index, value); rows without a value are left out.
    pub points: Vec<(f64, f64)>,
    /// Number of rows (x range).
    pub rows: usize,
    /// The limit, same unit.
    pub limit: Option<f64>,
}

/// At most this many points are drawn (evenly thinned, keeping each bucket's maximum).
pub const LOG_POINTS_MAX: usize = 4000;

/// Thin `points` to at most `max` by keeping the highest value of each bucket (peaks stay visible).
pub fn thin_max(points: &[(f64, f64)], max: usize) -> Vec<(f64, f64)> {
    if points.len() <= max || max == 0 {
        return points.to_vec();
    }
    let per = points.len().div_ceil(max);
    points
        .chunks(per)
        .filter_map(|c| {
            c.iter()
                .copied()
                .fold(None, |best: Option<(f64, f64)>, p| match best {
                    Some(b) if b.1 >= p.1 => Some(b),
                    _ => Some(p),
                })
        })
        .collect()
}

/// Draw the log plot.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_log<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    v: &LogSeries,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let mut entries = vec![(Swatch::Line(CURVE), v.label.clone())];
    if let Some(l) = v.limit {
        entries.push((Swatch::Dashed(LIMIT), format!("your limit {}", tick(l))));
    }
    let plot_area = legend(s, area, &entries)?;
    let hi_v = v
        .points
        .iter()
        .map(|p| p.1)
        .chain(v.limit.map(|l| l * 1.15))
        .filter(|x| x.is_finite())
        .fold(0.0_f64, f64::max);
    let top = nice_ceiling(hi_v.max(1e-3));
    let x_hi = (v.rows.max(2) - 1) as f64;
    let x_fmt = |x: &f64| format!("{}", x.round() as i64 + 1);
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: 0.0..x_hi,
            y: 0.0..top,
            x_labels: 6,
            y_labels: 6,
            x_fmt: &x_fmt,
            x_desc: "row",
            y_desc: "mg/L",
            margin_top: 18,
        },
    )?;
    let pts = thin_max(&v.points, LOG_POINTS_MAX);
    chart.draw_series(LineSeries::new(pts, line(s, CURVE, 2)))?;
    if let Some(l) = v.limit.filter(|l| *l <= top) {
        chart.draw_series(std::iter::once(PathElement::new(
            vec![(0.0, l), (x_hi, l)],
            line(s, LIMIT, 2),
        )))?;
    }
    Ok(frame_of(chart.plotting_area(), (0.0, x_hi)))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn view() -> FractionView {
        FractionView {
            species: "NH₃".into(),
            ph: vec![7.0, 7.5, 8.0],
            curves: vec![
                (15.0, vec![0.003, 0.01, 0.03]),
                (20.0, vec![0.004, 0.012, 0.04]),
            ],
            temperature_c: 20.0,
            reading: (7.5, 0.012),
            limit_fraction: Some(0.02),
        }
    }

    #[test]
    fn y_top_covers_curves_and_limit_and_stays_at_most_one() {
        let v = view();
        assert!(v.y_top() >= 0.04 && v.y_top() <= 0.06);
        let mut w = v.clone();
        w.limit_fraction = Some(5.0);
        assert!(w.y_top() <= 1.0);
    }

    #[test]
    fn table_rows_keep_the_last_point() {
        let rows = view().table_rows(2);
        assert_eq!(rows.len(), 2);
        assert_eq!(rows[1][0], "8.00");
        assert_eq!(rows[1][2], "4.000 %");
    }

    #[test]
    fn colder_and_warmer_curves_are_drawn_differently() {
        assert_eq!(curve_kind(20.0, 20.0), CurveKind::Sample);
        assert_eq!(curve_kind(15.0, 20.0), CurveKind::Colder);
        assert_eq!(curve_kind(25.0, 20.0), CurveKind::Warmer);
        let mut v = view();
        v.ph = (0..60).map(|i| 6.0 + f64::from(i) * 0.05).collect();
        v.curves = [15.0, 20.0, 25.0]
            .iter()
            .map(|t| {
                (
                    *t,
                    v.ph.iter().map(|p| (p - 6.0) / 4.0 * t / 25.0).collect(),
                )
            })
            .collect();
        let mut buf = String::new();
        {
            let root =
                plotters_svg::SVGBackend::with_string(&mut buf, (600, 400)).into_drawing_area();
            draw_fraction(&root, &v, 1.0).unwrap();
        }
        let colour = |c: RGBColor| format!("#{:02X}{:02X}{:02X}", c.0, c.1, c.2);
        let count = |c: RGBColor| buf.matches(&colour(c)).count();
        assert!(count(COLDER) >= 2, "the colder curve and its legend swatch");
        // The warmer curve is drawn as many dashes, the colder as one line.
        assert!(
            count(WARMER) > count(COLDER) + 3,
            "{} vs {}",
            count(WARMER),
            count(COLDER)
        );
    }

    #[test]
    fn thinning_keeps_peaks() {
        let pts: Vec<(f64, f64)> = (0..1000)
            .map(|i| (i as f64, if i == 537 { 9.0 } else { 1.0 }))
            .collect();
        let t = thin_max(&pts, 100);
        assert!(t.len() <= 100);
        assert!(t.iter().any(|p| p.1 == 9.0));
    }

    #[test]
    fn both_plots_draw_to_svg() {
        let mut buf = String::new();
        {
            let root =
                plotters_svg::SVGBackend::with_string(&mut buf, (600, 400)).into_drawing_area();
            assert!(draw_fraction(&root, &view(), 1.0).is_ok());
        }
        assert!(buf.contains("<svg"));
        let mut buf2 = String::new();
        {
            let root =
                plotters_svg::SVGBackend::with_string(&mut buf2, (600, 400)).into_drawing_area();
            let s = LogSeries {
                label: "NH₃".into(),
                points: vec![(0.0, 0.01), (1.0, 0.03)],
                rows: 2,
                limit: Some(0.02),
            };
            assert!(draw_log(&root, &s, 2.0).is_ok());
        }
        assert!(buf2.contains("<svg"));
    }
}
