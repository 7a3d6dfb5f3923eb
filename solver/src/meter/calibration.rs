//! The calibration check: a least-squares line through 2–5 standards, slope against Nernst, offset, residuals, verdicts, and a sample's pH from its millivolts.
//!
//! The electrode's potential is fitted as E = E₀ + s·pH(S) (mV). The Nernst
//! slope at T is ln 10 · R T / F with the CODATA 2018 constants; a glass
//! electrode's slope is negative, so `slope_percent` = 100 · (−s) / (ln 10 RT/F).
//! A sample's pH is (E − E₀)/s; its expanded uncertainty (k = 2) combines
//! the scatter of the points about the line (the usual inverse-calibration
//! formula; none with two points) and the standards' own expanded uncertainty
//! carried through the fit.

use super::standards::find_standard;
use crate::error::{finite, in_range, Result, SolverError};
use crate::limits::{
    BUFFER_PH, BUFFER_TEMPERATURE_C, BUFFER_U95_PH, CAL_DISPLAYED_PH, CAL_MV, CAL_OFFSET_MAX,
    CAL_RESIDUAL_MAX, CAL_SAMPLE_MV, CAL_SLOPE_MAX, CAL_SLOPE_MIN, CAL_TEMPERATURE_C,
};
use serde::{Deserialize, Serialize};

/// Molar gas constant, J/(mol·K) (CODATA 2018, exact).
pub const GAS_CONSTANT: f64 = 8.314_462_618;
/// Faraday constant, C/mol (CODATA 2018, exact).
pub const FARADAY: f64 = 96_485.332_12;
/// 0 °C in kelvin.
const KELVIN: f64 = 273.15;
/// Largest |mV| accepted for a reading.
pub const MV_MAX: f64 = CAL_MV.max;
/// Fewest and most calibration points.
pub const POINTS_MIN: usize = 2;
/// Most calibration points.
pub const POINTS_MAX: usize = 5;
/// Two standards closer than this in pH leave the slope ill-defined.
pub const MIN_SPACING_PH: f64 = 1.0;
/// Slopes outside this share of Nernst are refused (a wrong standard or a broken electrode).
pub const SLOPE_REFUSED: (f64, f64) = (80.0, 110.0);

/// The Nernst slope ln 10 · RT/F at `t_c` °C, mV per pH.
///
/// ```
/// let s = solver::meter::nernst_mv_per_ph(25.0);
/// assert!((s - 59.16).abs() < 0.005);
/// ```
pub fn nernst_mv_per_ph(t_c: f64) -> f64 {
    std::f64::consts::LN_10 * GAS_CONSTANT * (t_c + KELVIN) / FARADAY * 1000.0
}

/// The mV an ideal unadjusted meter (0 mV at pH 7, Nernst slope) shows as `ph` at `t_c`.
pub fn displayed_to_mv(ph: f64, t_c: f64) -> f64 {
    (7.0 - ph) * nernst_mv_per_ph(t_c)
}

/// The pH an ideal unadjusted meter shows for `mv` at `t_c` (inverse of [`displayed_to_mv`]).
pub fn mv_to_displayed(mv: f64, t_c: f64) -> f64 {
    7.0 - mv / nernst_mv_per_ph(t_c)
}

/// `v` with its sign and `decimals` places, a value that rounds to zero as `+0.000` (never `-0.000`).
pub fn signed(v: f64, decimals: usize) -> String {
    let t = format!("{v:+.decimals$}");
    if t.trim_start_matches(['+', '-'])
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        t.replacen('-', "+", 1)
    } else {
        t
    }
}

/// The user's acceptance limits (defaults are common practice, not a rule).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Limits {
    /// Lowest accepted slope, % of Nernst.
    pub slope_min_percent: f64,
    /// Highest accepted slope, % of Nernst.
    pub slope_max_percent: f64,
    /// Largest accepted |mV at pH 7|.
    pub offset_max_mv: f64,
    /// Largest accepted |residual| of a point, pH.
    pub residual_max_ph: f64,
}

impl Default for Limits {
    /// Common practice: slope 95–102 %, offset within ±30 mV, each point within 0.02 pH.
    fn default() -> Self {
        Self {
            slope_min_percent: 95.0,
            slope_max_percent: 102.0,
            offset_max_mv: 30.0,
            residual_max_ph: 0.02,
        }
    }
}

impl Limits {
    /// True when these are the common-practice defaults (left out of documents).
    pub fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// A buffer of the user's own, with the values printed on its bottle.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TechnicalBuffer {
    /// Id used by calibration points (not one of the standards' ids).
    pub id: String,
    /// Name in words.
    #[serde(default)]
    pub name: String,
    /// (temperature °C, pH) pairs from the bottle, at two or more temperatures.
    pub values: Vec<BottleValue>,
    /// The bottle's stated ± (taken as U95); absent = 0.02 (common practice).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub u95_ph: Option<f64>,
}

/// One value printed on a bottle.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BottleValue {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// pH at that temperature.
    pub ph: f64,
}

/// A technical buffer's ± when its bottle states none (common practice).
pub const TECHNICAL_U95: f64 = 0.02;

/// One calibration point: which buffer, and what the meter showed in it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CalPoint {
    /// A standard's id (`phosphate_1_1`) or a technical buffer's id.
    pub standard: String,
    /// Electrode potential, mV.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub mv: Option<f64>,
    /// Or: the pH the meter displayed before adjustment (read as the ideal
    /// unadjusted meter: 0 mV at pH 7 and the Nernst slope at the temperature).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub displayed_ph: Option<f64>,
    /// Lot number of the buffer, for the record.
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub lot: String,
}

/// The calibration inputs (the document's `calibration` key, without the fit).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub struct CalibrationSpec {
    /// Temperature of the standards and the sample, °C.
    pub temperature_c: f64,
    /// Two to five points.
    pub points: Vec<CalPoint>,
    /// A sample's reading, mV.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sample_mv: Option<f64>,
    /// Acceptance limits (absent = common practice).
    #[serde(default, skip_serializing_if = "Limits::is_default")]
    pub limits: Limits,
    /// The user's technical buffers.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub buffers: Vec<TechnicalBuffer>,
    /// The fit of these inputs, as a record (recomputed whenever the document
    /// is read or saved; absent when the inputs do not fit).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub fit: Option<CalibrationFit>,
}

impl CalibrationSpec {
    /// These inputs with `fit` recomputed (None when they do not fit).
    #[must_use]
    pub fn with_fit(mut self) -> Self {
        self.fit = fit_calibration(&self).ok();
        self
    }
}

/// One fitted point.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FitPoint {
    /// Buffer id.
    pub standard: String,
    /// The buffer's name as the bench reads it ("equimolal phosphate", or the user's own
    /// buffer's name); absent in fits saved before it was recorded.
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub name: String,
    /// pH(S) at the temperature.
    pub ph: f64,
    /// Reading, mV (converted from the displayed pH when given so).
    pub mv: f64,
    /// pH the fitted line gives for this reading minus pH(S).
    pub residual_ph: f64,
}

/// A sample read through the calibration.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SampleReading {
    /// Reading, mV.
    pub mv: f64,
    /// pH.
    pub ph: f64,
    /// Expanded uncertainty (k = 2), pH.
    pub u95_ph: f64,
}

/// One plain verdict against the user's limits.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Verdict {
    /// `slope`, `offset` or `point`.
    pub check: String,
    /// The point's buffer, for `point`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub standard: Option<String>,
    /// The value judged.
    pub value: f64,
    /// Within the limit.
    pub pass: bool,
    /// In words, with the limit.
    pub text: String,
}

/// The fit.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CalibrationFit {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Nernst slope at the temperature, mV/pH (positive).
    pub nernst_mv_per_ph: f64,
    /// Fitted slope dE/dpH, mV/pH (negative for a glass electrode).
    pub slope_mv_per_ph: f64,
    /// 100 · (−slope) / Nernst.
    pub slope_percent: f64,
    /// Potential at pH 7, mV (the offset).
    pub mv_at_ph7: f64,
    /// pH at 0 mV.
    pub ph_at_0mv: f64,
    /// The points with their residuals.
    pub points: Vec<FitPoint>,
    /// The sample, when its mV was given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sample: Option<SampleReading>,
    /// Verdicts against the limits.
    pub verdicts: Vec<Verdict>,
    /// The limits used.
    pub limits: Limits,
    /// Standard deviation of the points about the line, mV (None with two points).
    pub residual_sd_mv: Option<f64>,
}

fn refuse(field: String, reason: String) -> SolverError {
    SolverError::Infeasible { field, reason }
}

/// pH and U95 of buffer `id` at `t_c`: a standard's published value, or a
/// technical buffer's bottle values interpolated.
///
/// # Errors
///
/// Unknown id, or a temperature outside the buffer's values (`field` names it).
pub fn buffer_ph(
    id: &str,
    t_c: f64,
    buffers: &[TechnicalBuffer],
    field: &str,
    t_field: &str,
) -> Result<(f64, f64)> {
    if let Some(s) = find_standard(id) {
        return s.ph_at(t_c, t_field).map(|(p, _, _)| (p, s.u95));
    }
    let Some(b) = buffers.iter().find(|b| b.id == id) else {
        return Err(refuse(
            field.into(),
            format!(
                "unknown standard {} (a standard's id such as phosphate_1_1, or one of your buffers)",
                crate::fmt::quote(id)
            ),
        ));
    };
    let mut v = b.values.clone();
    crate::order::sort_by(&mut v, |a, b| a.temperature_c.total_cmp(&b.temperature_c));
    let (Some(lo), Some(hi)) = (v.first(), v.last()) else {
        return Err(refuse(field.into(), "the buffer has no values".into()));
    };
    if t_c < lo.temperature_c || t_c > hi.temperature_c {
        return Err(refuse(
            t_field.into(),
            format!(
                "{t_c} °C is outside the bottle values of {} ({} to {} °C)",
                b.id, lo.temperature_c, hi.temperature_c
            ),
        ));
    }
    let u = b.u95_ph.unwrap_or(TECHNICAL_U95);
    for w in v.windows(2) {
        if let [a, c] = w {
            if t_c >= a.temperature_c && t_c <= c.temperature_c {
                let span = c.temperature_c - a.temperature_c;
                let f = if span > 0.0 {
                    (t_c - a.temperature_c) / span
                } else {
                    0.0
                };
                return Ok((a.ph + f * (c.ph - a.ph), u));
            }
        }
    }
    Ok((lo.ph, u))
}

/// The name a person reads for buffer `id`: a standard's name, the user's own buffer's name,
/// or the id itself when it names neither.
#[must_use]
pub fn buffer_name(id: &str, buffers: &[TechnicalBuffer]) -> String {
    if let Some(s) = find_standard(id) {
        return s.name.to_string();
    }
    buffers
        .iter()
        .find(|b| b.id == id && !b.name.trim().is_empty())
        .map_or_else(|| id.to_string(), |b| b.name.clone())
}

/// Check the user's technical buffers.
///
/// # Errors
///
/// The first bad field, as `calibration.buffers[i]...`.
pub fn validate_buffers(buffers: &[TechnicalBuffer]) -> Result<()> {
    for (i, b) in buffers.iter().enumerate() {
        let p = format!("calibration.buffers[{i}]");
        if b.id.trim().is_empty() || b.id.chars().count() > 40 {
            return Err(refuse(
                format!("{p}.id"),
                "give an id of 1 to 40 characters".into(),
            ));
        }
        if find_standard(&b.id).is_some() {
            return Err(refuse(
                format!("{p}.id"),
                "is a standard's id; give your buffer another".into(),
            ));
        }
        if buffers.iter().take(i).any(|o| o.id == b.id) {
            return Err(refuse(format!("{p}.id"), "used by another buffer".into()));
        }
        if b.name.chars().count() > 120 {
            return Err(refuse(
                format!("{p}.name"),
                "longer than 120 characters".into(),
            ));
        }
        if b.values.len() < 2 || b.values.len() > 20 {
            return Err(refuse(
                format!("{p}.values"),
                "give the bottle's values at 2 to 20 temperatures".into(),
            ));
        }
        for (j, v) in b.values.iter().enumerate() {
            BUFFER_TEMPERATURE_C
                .check_as(&format!("{p}.values[{j}].temperature_c"), v.temperature_c)?;
            BUFFER_PH.check_as(&format!("{p}.values[{j}].ph"), v.ph)?;
            if b.values
                .iter()
                .take(j)
                .any(|o| (o.temperature_c - v.temperature_c).abs() < 1e-9)
            {
                return Err(refuse(
                    format!("{p}.values[{j}].temperature_c"),
                    "this temperature is listed twice".into(),
                ));
            }
        }
        if let Some(u) = b.u95_ph {
            BUFFER_U95_PH.check_as(&format!("{p}.u95_ph"), u)?;
        }
    }
    Ok(())
}

/// Check the inputs a document carries (ranges and names), without fitting.
///
/// # Errors
///
/// The first bad field, as `calibration.…`.
pub fn validate_spec(spec: &CalibrationSpec) -> Result<()> {
    CAL_TEMPERATURE_C.check_path(spec.temperature_c)?;
    if spec.points.len() > POINTS_MAX {
        return Err(refuse(
            "calibration.points".into(),
            format!("{} points: use two to five standards", spec.points.len()),
        ));
    }
    validate_buffers(&spec.buffers)?;
    for (i, p) in spec.points.iter().enumerate() {
        let f = format!("calibration.points[{i}]");
        if p.standard.chars().count() > 40 {
            return Err(refuse(
                format!("{f}.standard"),
                "longer than 40 characters".into(),
            ));
        }
        if p.lot.chars().count() > 60 {
            return Err(refuse(
                format!("{f}.lot"),
                "longer than 60 characters".into(),
            ));
        }
        if let Some(mv) = p.mv {
            CAL_MV.check_as(&format!("{f}.mv"), mv)?;
        }
        if let Some(d) = p.displayed_ph {
            CAL_DISPLAYED_PH.check_as(&format!("{f}.displayed_ph"), d)?;
        }
    }
    if let Some(mv) = spec.sample_mv {
        CAL_SAMPLE_MV.check_path(mv)?;
    }
    let l = &spec.limits;
    CAL_SLOPE_MIN.check_path(l.slope_min_percent)?;
    CAL_SLOPE_MAX.check_path(l.slope_max_percent)?;
    in_range(
        CAL_SLOPE_MAX.path,
        l.slope_max_percent,
        l.slope_min_percent,
        CAL_SLOPE_MAX.max,
    )?;
    in_range(
        "calibration.limits.slope_max_percent",
        l.slope_max_percent,
        l.slope_min_percent,
        150.0,
    )?;
    CAL_OFFSET_MAX.check_path(l.offset_max_mv)?;
    CAL_RESIDUAL_MAX.check_path(l.residual_max_ph)?;
    Ok(())
}

/// Least-squares line E = a + b·x: (a, b, x̄, ȳ, Sxx).
fn line(x: &[f64], y: &[f64]) -> (f64, f64, f64, f64, f64) {
    let n = x.len().max(1) as f64;
    let xm = x.iter().sum::<f64>() / n;
    let ym = y.iter().sum::<f64>() / n;
    let sxx: f64 = x.iter().map(|v| (v - xm) * (v - xm)).sum();
    let sxy: f64 = x.iter().zip(y).map(|(a, b)| (a - xm) * (b - ym)).sum();
    let b = if sxx > 0.0 { sxy / sxx } else { f64::NAN };
    (ym - b * xm, b, xm, ym, sxx)
}

/// Fit the calibration and read the sample.
///
/// # Errors
///
/// Fewer than two or more than five points; an unknown standard; the
/// temperature outside a standard's range; a reading missing, doubled or
/// outside ±2000 mV; two standards within 1 pH of each other; a slope under
/// 80 % or over 110 % of Nernst (naming the point most likely at fault). Each
/// error names its field (`calibration.points[1].mv`).
///
/// # Example
///
/// ```
/// use solver::meter::{fit_calibration, CalPoint, CalibrationSpec};
/// let p = |s: &str, mv: f64| CalPoint { standard: s.into(), mv: Some(mv), displayed_ph: None, lot: String::new() };
/// let spec = CalibrationSpec {
///     temperature_c: 25.0,
///     points: vec![p("phosphate_1_1", 7.8), p("phthalate", 175.1)],
///     sample_mv: Some(60.0),
///     ..Default::default()
/// };
/// let fit = fit_calibration(&spec)?;
/// assert!((fit.slope_percent - 98.9).abs() < 0.1);
/// assert!(fit.verdicts.iter().all(|v| v.pass));
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn fit_calibration(spec: &CalibrationSpec) -> Result<CalibrationFit> {
    validate_spec(spec)?;
    let t = spec.temperature_c;
    if spec.points.len() < POINTS_MIN {
        return Err(refuse(
            "calibration.points".into(),
            "give readings in at least two standards".into(),
        ));
    }
    let nernst = nernst_mv_per_ph(t);
    let mut xs = Vec::new();
    let mut us = Vec::new();
    let mut ys = Vec::new();
    for (i, p) in spec.points.iter().enumerate() {
        let f = format!("calibration.points[{i}]");
        let (ph, u) = buffer_ph(
            &p.standard,
            t,
            &spec.buffers,
            &format!("{f}.standard"),
            "calibration.temperature_c",
        )?;
        let mv = match (p.mv, p.displayed_ph) {
            (Some(mv), None) => mv,
            (None, Some(d)) => displayed_to_mv(d, t),
            (Some(_), Some(_)) => {
                return Err(refuse(
                    format!("{f}.displayed_ph"),
                    "give either the mV or the displayed pH, not both".into(),
                ))
            }
            (None, None) => return Err(refuse(format!("{f}.mv"), "no reading given".into())),
        };
        finite(&format!("{f}.mv"), mv)?;
        if let Some(j) = xs
            .iter()
            .position(|x: &f64| (x - ph).abs() < MIN_SPACING_PH)
        {
            let other = spec
                .points
                .get(j)
                .map_or_else(String::new, |o| buffer_name(&o.standard, &spec.buffers));
            return Err(refuse(
                format!("{f}.standard"),
                format!(
                    "pH {ph:.3} is within {MIN_SPACING_PH} pH of points[{j}] ({other}): the slope is \
                     ill-defined between standards so close; use standards at least 1 pH apart"
                ),
            ));
        }
        xs.push(ph);
        us.push(u);
        ys.push(mv);
    }
    let (a, b, _, ym, sxx) = line(&xs, &ys);
    let percent = -b / nernst * 100.0;
    if !(SLOPE_REFUSED.0..=SLOPE_REFUSED.1).contains(&percent) || !percent.is_finite() {
        let k = culprit(&xs, &ys, nernst);
        let who = spec
            .points
            .get(k)
            .map_or_else(String::new, |p| buffer_name(&p.standard, &spec.buffers));
        return Err(refuse(
            format!("calibration.points[{k}].mv"),
            format!(
                "the readings imply a slope of {percent:.1} % of Nernst (accepted {} to {} %): \
                 check this point ({who}): a wrong standard, a swapped reading or a broken electrode",
                SLOPE_REFUSED.0, SLOPE_REFUSED.1
            ),
        ));
    }
    let n = xs.len();
    let points: Vec<FitPoint> = spec
        .points
        .iter()
        .zip(xs.iter().zip(&ys))
        .map(|(p, (x, y))| FitPoint {
            standard: p.standard.clone(),
            name: buffer_name(&p.standard, &spec.buffers),
            ph: *x,
            mv: *y,
            residual_ph: (y - a) / b - x,
        })
        .collect();
    let residual_sd_mv = (n > 2).then(|| {
        let ss: f64 = xs
            .iter()
            .zip(&ys)
            .map(|(x, y)| (y - a - b * x).powi(2))
            .sum();
        (ss / (n as f64 - 2.0)).sqrt()
    });
    let sample = match spec.sample_mv {
        None => None,
        Some(e) => {
            let ph = (e - a) / b;
            let u_fit = residual_sd_mv.map_or(0.0, |sd| {
                sd / b.abs() * (1.0 + 1.0 / n as f64 + (e - ym).powi(2) / (b * b * sxx)).sqrt()
            });
            let u_std2: f64 = (0..n)
                .map(|j| {
                    let h = 1e-4;
                    let mut x2 = xs.clone();
                    if let Some(v) = x2.get_mut(j) {
                        *v += h;
                    }
                    let (a2, b2, ..) = line(&x2, &ys);
                    let d = ((e - a2) / b2 - ph) / h;
                    let u = us.get(j).copied().unwrap_or(0.0) / 2.0;
                    (d * u).powi(2)
                })
                .sum();
            Some(SampleReading {
                mv: e,
                ph,
                u95_ph: 2.0 * (u_fit * u_fit + u_std2).sqrt(),
            })
        }
    };
    let l = spec.limits;
    let mv7 = a + 7.0 * b;
    let mut verdicts = vec![
        Verdict {
            check: "slope".into(),
            standard: None,
            value: percent,
            pass: percent >= l.slope_min_percent && percent <= l.slope_max_percent,
            text: format!(
                "slope {percent:.1} % of Nernst (accepted {} to {} %)",
                l.slope_min_percent, l.slope_max_percent
            ),
        },
        Verdict {
            check: "offset".into(),
            standard: None,
            value: mv7,
            pass: mv7.abs() <= l.offset_max_mv,
            text: format!(
                "{} mV at pH 7 (accepted within ±{} mV)",
                signed(mv7, 1),
                l.offset_max_mv
            ),
        },
    ];
    for p in &points {
        verdicts.push(Verdict {
            check: "point".into(),
            standard: Some(p.standard.clone()),
            value: p.residual_ph,
            pass: p.residual_ph.abs() <= l.residual_max_ph,
            text: format!(
                "{}: {} pH off the line (accepted within ±{} pH)",
                p.name,
                signed(p.residual_ph, 3),
                l.residual_max_ph
            ),
        });
    }
    Ok(CalibrationFit {
        temperature_c: t,
        nernst_mv_per_ph: nernst,
        slope_mv_per_ph: b,
        slope_percent: percent,
        mv_at_ph7: mv7,
        ph_at_0mv: -a / b,
        points,
        sample,
        verdicts,
        limits: l,
        residual_sd_mv,
    })
}

/// The point most likely at fault when the slope is out of bounds: with three
/// or more, the one whose removal brings the slope nearest 100 % of Nernst;
/// with two, the one farther from pH 7 (the zero point usually survives).
fn culprit(xs: &[f64], ys: &[f64], nernst: f64) -> usize {
    let n = xs.len();
    if n < 3 {
        return (0..n)
            .max_by(|&i, &j| {
                let d = |k: usize| xs.get(k).map_or(0.0, |x| (x - 7.0).abs());
                d(i).total_cmp(&d(j))
            })
            .unwrap_or(0);
    }
    (0..n)
        .min_by(|&i, &j| {
            let off = |k: usize| {
                let x: Vec<f64> = (0..n)
                    .filter(|&m| m != k)
                    .filter_map(|m| xs.get(m).copied())
                    .collect();
                let y: Vec<f64> = (0..n)
                    .filter(|&m| m != k)
                    .filter_map(|m| ys.get(m).copied())
                    .collect();
                let (_, b, ..) = line(&x, &y);
                let d = (-b / nernst * 100.0 - 100.0).abs();
                if d.is_finite() {
                    d
                } else {
                    f64::MAX
                }
            };
            off(i).total_cmp(&off(j))
        })
        .unwrap_or(0)
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests;
