//! Carbonate system of a field sample from its measured pH and alkalinity.
//!
//! The exact definition of carbonate alkalinity, other bases ignored:
//!
//! ```text
//! TA = [HCO₃⁻] + 2[CO₃²⁻] + [OH⁻] − [H⁺]                      (eq/L)
//! DIC = (TA − [OH⁻] + [H⁺]) / (α₁ + 2α₂)
//! [H⁺] = a_H/γ₁,  [OH⁻] = K_w/(a_H γ₁),  a_H = 10^−pH
//! α₀ : α₁ : α₂ = 1 : K₁/(a_H γ₁) : K₁K₂/(a_H² γ₁⁴)               (γ₂ = γ₁⁴)
//! ```
//!
//! K₁, K₂ are the library's carbonic acid constants at the sample
//! temperature (Plummer & Busenberg 1982, CO₂(aq) basis, so "free CO₂" is
//! CO₂(aq) + H₂CO₃), K_w is Bandura & Lvov (2006) and γ₁ the Davies value at
//! the sample's ionic strength. Borate, phosphate, silicate, ammonia,
//! organic bases and ion pairs are ignored: in waters where they carry a
//! noticeable share of the alkalinity the DIC is overestimated.
//!
//! An alkalinity in mg/L as CaCO₃ is converted on the equivalent basis,
//! 1 meq = 50.04 mg CaCO₃ (half the molar mass from CIAAW 2021 weights).

use super::sample::FieldSample;
use crate::error::{non_negative, Result, SolverError};
use crate::system::formula::molar_mass;
use serde::{Deserialize, Serialize};

/// Unit of a measured alkalinity.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum AlkalinityUnit {
    /// mg/L as CaCO₃ (equivalent basis, 50.04 mg per meq).
    MgPerLCaco3,
    /// meq/L.
    MeqPerL,
}

fn caco3() -> Result<f64> {
    match crate::system::formula::basis_mass("CaCO3") {
        Some(m) => Ok(m),
        None => molar_mass("CaCO3"),
    }
}

/// A measured (total) alkalinity.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Alkalinity {
    /// The value in `unit`.
    pub value: f64,
    /// Its unit.
    pub unit: AlkalinityUnit,
}

/// Highest alkalinity accepted, meq/L (far above natural waters).
pub const MAX_ALKALINITY_MEQ_L: f64 = 200.0;

impl Alkalinity {
    /// The alkalinity in eq/L.
    ///
    /// # Errors
    ///
    /// Negative, non-finite or absurd (> 200 meq/L) values, field
    /// `alkalinity.value`.
    pub fn to_eq_per_l(&self) -> Result<f64> {
        let v = non_negative("alkalinity.value", self.value)?;
        let meq = match self.unit {
            AlkalinityUnit::MeqPerL => v,
            AlkalinityUnit::MgPerLCaco3 => v / (caco3()? / 2.0),
        };
        if meq > MAX_ALKALINITY_MEQ_L {
            return Err(SolverError::OutOfRange {
                field: "alkalinity.value".into(),
                value: v,
                min: 0.0,
                max: match self.unit {
                    AlkalinityUnit::MeqPerL => MAX_ALKALINITY_MEQ_L,
                    AlkalinityUnit::MgPerLCaco3 => MAX_ALKALINITY_MEQ_L * caco3()? / 2.0,
                },
            });
        }
        crate::limits::ALKALINITY_VALUE.check(v)?;
        Ok(meq / 1000.0)
    }
}

/// The carbonate system computed from pH and alkalinity.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CarbonateResult {
    /// Dissolved inorganic carbon, mmol/L.
    pub dic_mmol_l: f64,
    /// Free CO₂ (CO₂(aq) + H₂CO₃), mg/L as CO₂.
    pub free_co2_mg_l: f64,
    /// Bicarbonate, mg/L as HCO₃⁻.
    pub hco3_mg_l: f64,
    /// Carbonate, mg/L as CO₃²⁻.
    pub co3_mg_l: f64,
    /// The alkalinity used, meq/L.
    pub alkalinity_meq_l: f64,
    /// Hydroxide minus hydrogen ion share of it, meq/L.
    pub water_meq_l: f64,
    /// What the calculation leaves out.
    pub ignored: String,
}

/// Text of what the alkalinity calculation ignores.
pub const IGNORED: &str = "Alkalinity taken as HCO₃⁻ + 2 CO₃²⁻ + OH⁻ − H⁺ only: borate, \
phosphate, silicate, ammonia, organic bases and ion pairs are ignored (where they matter \
the DIC comes out high).";

/// pH of the alkalinity titration end point (common practice: routine
/// titrations stop near pH 4.5). A positive measured alkalinity with a
/// sample pH below it is contradictory and refused.
pub const END_POINT_PH: f64 = 4.5;

/// Largest DIC accepted from an alkalinity, mol/L: beyond it the pH and
/// alkalinity cannot both be right for a natural water.
pub const MAX_DIC_M: f64 = 1.0;

/// DIC and carbonate species from pH and alkalinity (eq/L) in a carbonate
/// sample ([`FieldSample`] of the `carbonate` system).
///
/// # Errors
///
/// [`SolverError::Infeasible`] (field `alkalinity`) when the pH cannot
/// support the alkalinity: a positive alkalinity below the titration end
/// point ([`END_POINT_PH`]); hydroxide alone exceeding it (negative DIC); or
/// a DIC beyond [`MAX_DIC_M`].
///
/// # Example
///
/// ```
/// use solver::field::FieldSample;
/// use solver::field::carbonate::carbonate_from_alkalinity;
/// let s = FieldSample::new("carbonate", 25.0, 0.0, &[])?;
/// // 2 meq/L at pH 8.3: nearly all bicarbonate, DIC close to 2 mmol/L.
/// let c = carbonate_from_alkalinity(&s, 8.3, 0.002)?;
/// assert!((c.dic_mmol_l - 2.0).abs() < 0.05);
/// assert!(c.hco3_mg_l > 115.0 && c.hco3_mg_l < 125.0);
/// // pH 4.0 is below the titration end point: no alkalinity can be measured there.
/// assert!(carbonate_from_alkalinity(&s, 4.0, 0.001).is_err());
/// // At pH 11 hydroxide alone is 1 meq/L, more than a 0.2 meq/L alkalinity.
/// assert!(carbonate_from_alkalinity(&s, 11.0, 0.0002).is_err());
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn carbonate_from_alkalinity(
    sample: &FieldSample,
    ph: f64,
    alk_eq_l: f64,
) -> Result<CarbonateResult> {
    let g1 = sample.gamma1;
    let a_h = 10f64.powf(-ph);
    let h = a_h / g1;
    let oh = sample.kw / (a_h * g1);
    let a0 = sample.fraction(0, ph);
    let a1 = sample.fraction(1, ph);
    let a2 = sample.fraction(2, ph);
    let carb = alk_eq_l - oh + h;
    let per_c = a1 + 2.0 * a2;
    let infeasible = |reason: String| SolverError::Infeasible {
        field: "alkalinity".into(),
        reason,
    };
    if alk_eq_l > 0.0 && ph < END_POINT_PH {
        return Err(infeasible(format!(
            "pH {ph} is below the alkalinity titration end point (about pH {END_POINT_PH}): a \
             water this acid has no alkalinity left to measure, so {:.4} meq/L and this pH \
             cannot both be right; check both",
            alk_eq_l * 1000.0
        )));
    }
    if carb < 0.0 {
        return Err(infeasible(format!(
            "at pH {ph} hydroxide less hydrogen ion alone ({:.4} meq/L) exceeds the alkalinity \
             ({:.4} meq/L), which would mean negative carbon: the pH is too high for this \
             alkalinity, check both",
            (oh - h) * 1000.0,
            alk_eq_l * 1000.0
        )));
    }
    if per_c <= 0.0 || per_c.is_nan() || carb / per_c > MAX_DIC_M {
        return Err(infeasible(format!(
            "at pH {ph} an alkalinity of {:.4} meq/L would need more than {MAX_DIC_M} mol/L of \
             dissolved carbon: the pH is too low for this alkalinity, check both",
            alk_eq_l * 1000.0
        )));
    }
    let dic = carb / per_c;
    let mg = |f: &str, c: f64| -> Result<f64> {
        let m = match crate::system::formula::basis_mass(f) {
            Some(m) => m,
            None => molar_mass(f)?,
        };
        Ok(c * m * 1000.0)
    };
    Ok(CarbonateResult {
        dic_mmol_l: dic * 1000.0,
        free_co2_mg_l: mg("CO2", dic * a0)?,
        hco3_mg_l: mg("HCO3", dic * a1)?,
        co3_mg_l: mg("CO3", dic * a2)?,
        alkalinity_meq_l: alk_eq_l * 1000.0,
        water_meq_l: (oh - h) * 1000.0,
        ignored: IGNORED.into(),
    })
}
