//! Plot data for a field reading: the share of the form that matters against pH, at the sample temperature and 5 °C either side.

use super::ionic::ionic_from;
use super::reading::FieldSpec;
use super::sample::{target_species, FieldSample};
use crate::error::{in_range, Result, SolverError};
use crate::mixture::lookup;
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// Default number of points of a curve.
pub const DEFAULT_POINTS: usize = 200;
/// Most points a curve may have.
pub const MAX_POINTS: usize = 5000;
/// Temperature offset of the side curves, °C.
pub const SIDE_OFFSET_C: f64 = 5.0;

/// One curve: the fraction at each pH of [`FractionCurves::ph`].
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FractionCurve {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Fraction of the total in the plotted form, one per pH point.
    pub fraction: Vec<f64>,
}

/// Curves of one form's fraction vs pH at up to three temperatures.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FractionCurves {
    /// Name of the plotted form.
    pub species: String,
    /// Its index in the system's species.
    pub species_index: usize,
    /// pH points, evenly spaced.
    pub ph: Vec<f64>,
    /// Curves at T − 5, T and T + 5 °C (those inside the system's data).
    pub curves: Vec<FractionCurve>,
    /// Side temperatures left out because the system's data do not reach them.
    pub skipped_temperatures_c: Vec<f64>,
    /// Ionic strength used, mol/L.
    pub ionic_strength: f64,
}

/// Fraction of the form that matters (or of `species_index`) vs pH over
/// `ph_lo..=ph_hi` with `points` points, at the reading's temperature and at
/// ±5 °C, the reading's ionic strength held.
///
/// # Errors
///
/// Unknown system; temperature of the reading outside the system's data;
/// `points` outside 2–5000; pH bounds outside 0–14 or not increasing; no
/// species chosen for a system without a form that matters.
///
/// # Example
///
/// ```
/// use solver::field::{FieldSpec, IonicSource, TotalUnit};
/// use solver::field::plot::fraction_curves;
/// let spec = FieldSpec { system: "ammonium".into(), ph: 8.0, temperature_c: 20.0,
///     total: None, total_unit: TotalUnit::MgPerLAs, ionic: IonicSource::Zero,
///     alkalinity: None, limit: None };
/// let c = fraction_curves(&spec, &[], None, 0.0, 14.0, 200)?;
/// assert_eq!(c.curves.len(), 3);
/// // Warmer water holds more NH3 at the same pH.
/// assert!(c.curves[2].fraction[114] > c.curves[1].fraction[114]);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn fraction_curves(
    spec: &FieldSpec,
    custom: &[AcidSystem],
    species_index: Option<usize>,
    ph_lo: f64,
    ph_hi: f64,
    points: usize,
) -> Result<FractionCurves> {
    let sys = lookup(&spec.system, custom)?;
    let lo = in_range("ph_lo", ph_lo, 0.0, 14.0)?;
    let hi = in_range("ph_hi", ph_hi, 0.0, 14.0)?;
    if hi <= lo {
        return Err(SolverError::OutOfRange {
            field: "ph_hi".into(),
            value: hi,
            min: lo,
            max: 14.0,
        });
    }
    if !(2..=MAX_POINTS).contains(&points) {
        return Err(SolverError::OutOfRange {
            field: "points".into(),
            value: points as f64,
            min: 2.0,
            max: MAX_POINTS as f64,
        });
    }
    let index = match species_index.or_else(|| target_species(&sys.id).map(|t| t.0)) {
        Some(i) if i < sys.species.len() => i,
        Some(i) => {
            return Err(SolverError::OutOfRange {
                field: "species".into(),
                value: i as f64,
                min: 0.0,
                max: sys.species.len().saturating_sub(1) as f64,
            })
        }
        None => {
            return Err(SolverError::Infeasible {
                field: "species".into(),
                reason: format!("{} has no single form that matters: choose one", sys.name),
            })
        }
    };
    let ionic = ionic_from(&spec.ionic)?;
    let t = in_range(
        "temperature_c",
        spec.temperature_c,
        sys.t_min_c,
        sys.t_max_c,
    )?;
    let step = (hi - lo) / (points - 1) as f64;
    let ph: Vec<f64> = (0..points).map(|i| lo + step * i as f64).collect();
    let mut curves = Vec::with_capacity(3);
    let mut skipped = Vec::new();
    for temp in [t - SIDE_OFFSET_C, t, t + SIDE_OFFSET_C] {
        if temp < sys.t_min_c || temp > sys.t_max_c {
            skipped.push(temp);
            continue;
        }
        let sample = FieldSample::for_source(sys, temp, &spec.ionic)?;
        curves.push(FractionCurve {
            temperature_c: temp,
            fraction: ph.iter().map(|p| sample.fraction(index, *p)).collect(),
        });
    }
    Ok(FractionCurves {
        species: sys.species.get(index).cloned().unwrap_or_default(),
        species_index: index,
        ph,
        curves,
        skipped_temperatures_c: skipped,
        ionic_strength: ionic,
    })
}
