//! The pH-against-CO₂ plot of a solution under a gas: the solver's curve, the target and the gas in use marked; backend-generic drawing.

use super::draw::{axes, frame_of, legend, line, tick, Axes, DrawResult, Frame, Sc, Swatch, INK};
use super::field::{CURVE, LIMIT};
use plotters::coord::Shift;
use plotters::prelude::*;
use solver::atmosphere::what_if::Co2Curve;

/// The curve with what to mark: the target pH (dashed) and the CO₂ % in use (a dot).
#[derive(Debug, Clone, PartialEq)]
pub struct Co2View {
    /// The solver's curve.
    pub curve: Co2Curve,
    /// The gas in use, (CO₂ %, pH), when it is given as a percentage.
    pub current: Option<(f64, f64)>,
}

/// The plot's one-line summary for assistive technology.
pub fn co2_summary(v: &Co2View) -> String {
    let c = &v.curve;
    let first = c.ph.first().copied().unwrap_or(f64::NAN);
    let last = c.ph.last().copied().unwrap_or(f64::NAN);
    let mut s = format!(
        "pH against CO₂ at {} °C: pH {first:.2} at {} % down to pH {last:.2} at {} %",
        tick(c.temperature_c),
        tick(c.co2_percent.first().copied().unwrap_or(0.0)),
        tick(c.co2_percent.last().copied().unwrap_or(0.0)),
    );
    if let (Some(t), Some(x)) = (c.target_ph, c.target_co2_percent) {
        s.push_str(&format!("; the target pH {t:.2} at {x:.2} % CO₂"));
    }
    s
}

/// Draw pH against CO₂ % with the target and the gas in use marked.
///
/// # Errors
///
/// Backend drawing errors.
pub fn draw_co2<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    v: &Co2View,
    scale: f64,
) -> DrawResult<Frame, DB> {
    let s = Sc::new(scale);
    area.fill(&WHITE)?;
    let c = &v.curve;
    let x0 = c.co2_percent.first().copied().unwrap_or(0.0);
    let x1 = c.co2_percent.last().copied().unwrap_or(20.0).max(x0 + 0.1);
    let mut entries = vec![(
        Swatch::Line(CURVE),
        format!("pH at {} °C", tick(c.temperature_c)),
    )];
    if let Some(t) = c.target_ph {
        entries.push((Swatch::Dashed(LIMIT), format!("target pH {t:.2}")));
    }
    if let Some((x, y)) = v.current {
        entries.push((Swatch::Dot(INK), format!("{} % CO₂: pH {y:.2}", tick(x))));
    }
    let plot_area = legend(s, area, &entries)?;
    let lo_ph = c.ph.iter().copied().fold(f64::INFINITY, f64::min);
    let hi_ph = c.ph.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let (y0, y1) = if lo_ph.is_finite() && hi_ph > lo_ph {
        ((lo_ph - 0.2).floor(), (hi_ph + 0.2).ceil())
    } else {
        (5.0, 9.0)
    };
    let x_fmt = |x: &f64| tick(*x);
    let mut chart = axes(
        s,
        &plot_area,
        &Axes {
            x: x0..x1,
            y: y0..y1,
            x_labels: 8,
            y_labels: 6,
            x_fmt: &x_fmt,
            x_desc: "CO₂, % of the gas",
            y_desc: "pH",
            margin_top: 18,
        },
    )?;
    let pts = c.co2_percent.iter().zip(&c.ph).map(|(x, y)| (*x, *y));
    chart.draw_series(LineSeries::new(pts, line(s, CURVE, 3)))?;
    if let Some(t) = c.target_ph.filter(|t| (y0..=y1).contains(t)) {
        chart.draw_series(DashedLineSeries::new(
            vec![(x0, t), (x1, t)],
            s.i(6),
            s.i(4),
            line(s, LIMIT, 2),
        ))?;
    }
    if let Some((x, y)) = v.current.filter(|(x, _)| (x0..=x1).contains(x)) {
        chart.draw_series(std::iter::once(Circle::new((x, y), s.u(5), INK.filled())))?;
    }
    Ok(frame_of(chart.plotting_area(), (x0, x1)))
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use plotters_svg::SVGBackend;
    use solver::atmosphere::what_if::co2_curve;
    use solver::atmosphere::Atmosphere;
    use solver::equilibrium::activity::ActivityModel;
    use solver::mixture::{ComponentSpec, MixtureSpec};

    #[test]
    fn draws_the_solver_curve_with_its_marks_to_svg() {
        let m = MixtureSpec {
            temperature_c: 37.0,
            activity: ActivityModel::Davies,
            components: vec![ComponentSpec {
                system: "carbonate".into(),
                form: Some("nahco3".into()),
                conc_m: 0.026,
            }],
            additives: vec![],
            atmosphere: Some(Atmosphere::percent(5.0)),
        };
        let curve = co2_curve(&m, &[], Some(7.4), 20.0, 41).unwrap();
        let v = Co2View {
            current: Some((5.0, 7.5)),
            curve,
        };
        let mut svg = String::new();
        {
            let area = SVGBackend::with_string(&mut svg, (640, 360)).into_drawing_area();
            let f = draw_co2(&area, &v, 1.0).unwrap();
            assert!(f.right > f.left);
        }
        assert!(
            svg.contains("target pH 7.40") && svg.contains("5 % CO₂"),
            "{svg}"
        );
        assert!(co2_summary(&v).contains("target pH 7.40"));
    }
}
