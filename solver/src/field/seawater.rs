//! Ammonium in seawater: the Clegg & Whitfield (1995) stoichiometric constant.
//!
//! In salt water the Davies equation is past its range (S = 35 gives
//! I ≈ 0.72 mol/kg), so for ammonia a published seawater model is used when
//! the sample's ionic strength comes from its salinity: Clegg & Whitfield
//! (1995) Geochim. Cosmochim. Acta 59, 2403, equation (18), a fit to their
//! Pitzer model of seawater with dissolved NH₃ and NH₄⁺:
//!
//! ```text
//! pK* = 9.244605 − 2729.33 (1/298.15 − 1/T)
//!     + (0.04203362 − 11.24742/T) S^0.25
//!     + (−13.6416 + 1.176949 T^0.5 − 0.02860785 T + 545.4834/T) S^0.5
//!     + (−0.1462507 + 0.0090226468 T^0.5 − 0.0001471361 T + 10.5425/T) S^1.5
//!     + (0.004669309 − 0.0001691742 T^0.5 − 0.5677934/T) S²
//!     + (−2.354039×10⁻⁵ + 0.009698623/T) S^2.5
//! ```
//!
//! T in kelvin, S practical salinity; K* = m(NH₃)·m(H⁺)_T / m(NH₄⁺) in
//! mol/kg-H₂O on the **total** hydrogen-ion scale (H⁺ + HSO₄⁻), valid for
//! S = 0–40 and −2 to 40 °C (fit within ±0.00015 in pK to the model; the
//! model's own accuracy in K* is stated as better than 5 %). It is converted
//! to mol/kg of seawater by the factor (1 − 0.001005 S), the usual
//! convention for seawater constants, so that it pairs with a pH on the total
//! scale per kg of seawater. The coefficients have not been checked against the printed
//! paper (they are marked unverified in the tests' README); the paper's own tables were not read.
//!
//! The fraction of un-ionized ammonia is then `1 / (1 + 10^(pK* − pH_T))`:
//! no activity coefficient enters, the salt effect is in K*. The reading's
//! pH is taken as on the total scale; a glass electrode calibrated with
//! dilute (NBS/IUPAC) buffers reads differently in seawater, which the
//! result says in words.
//!
//! Outside S 0–40 or −2 to 40 °C the model is not used: the Davies equation
//! at the salinity's ionic strength is used instead while that ionic
//! strength is within the Davies range (the result says the value is
//! indicative), and the reading is refused past it (salinity above about
//! 24.5), where Davies would give 20–30 % less NH₃ than the model at its
//! edge. Readings here start at 0 °C (the field's temperature rule). No
//! other system has a seawater model here.

use super::ionic::IonicSource;
use serde::{Deserialize, Serialize};

/// Highest practical salinity of the seawater ammonia model.
pub const SEAWATER_S_MAX: f64 = 40.0;
/// Lowest temperature of the seawater ammonia model, °C.
pub const SEAWATER_T_MIN_C: f64 = -2.0;
/// Highest temperature of the seawater ammonia model, °C.
pub const SEAWATER_T_MAX_C: f64 = 40.0;

/// Which model gives the apparent constants of a field reading.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PkModel {
    /// Thermodynamic pK(T) with Davies activity coefficients at the
    /// sample's ionic strength (pH as −log a(H⁺)).
    #[default]
    Davies,
    /// Clegg & Whitfield (1995) stoichiometric constant of ammonium in
    /// seawater, total pH scale.
    CleggWhitfield1995,
}

impl PkModel {
    /// A short label for the page's facts list.
    pub fn short(self) -> &'static str {
        match self {
            PkModel::Davies => "Davies activity model",
            PkModel::CleggWhitfield1995 => "Seawater: Clegg & Whitfield (1995), total pH scale",
        }
    }

    /// One line naming the model and its pH scale, for the page and the CLI.
    pub fn describe(self) -> &'static str {
        match self {
            PkModel::Davies => {
                "thermodynamic pK(T) with Davies activity coefficients; pH as −log a(H⁺)"
            }
            PkModel::CleggWhitfield1995 => {
                "seawater ammonia model of Clegg & Whitfield (1995), salinity 0–40, −2 to 40 °C; \
                 pH on the total scale"
            }
        }
    }
}

/// How a salinity relates to the seawater ammonia model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SeawaterUse {
    /// Not ammonia, or the ionic strength does not come from a salinity.
    NotApplicable,
    /// Within the model's range: use it (the salinity).
    Within(f64),
    /// Ammonia with a salinity, but salinity or temperature is outside the
    /// model's range: Davies is used and the value is indicative.
    Outside(f64),
}

/// Whether the seawater ammonia model applies to a reading.
pub fn seawater_use(system_id: &str, source: &IonicSource, temperature_c: f64) -> SeawaterUse {
    match source {
        IonicSource::Salinity { psu } if system_id == "ammonium" => {
            let s = *psu;
            if (0.0..=SEAWATER_S_MAX).contains(&s)
                && (SEAWATER_T_MIN_C..=SEAWATER_T_MAX_C).contains(&temperature_c)
            {
                SeawaterUse::Within(s)
            } else {
                SeawaterUse::Outside(s)
            }
        }
        _ => SeawaterUse::NotApplicable,
    }
}

/// pK* of ammonium in seawater, Clegg & Whitfield (1995) eq. (18), total pH
/// scale, K* in mol/kg of seawater (see the module notes). No range check:
/// see [`seawater_use`].
///
/// # Example
///
/// At S = 0 it is the thermodynamic pK of the fit (9.2446 at 25 °C):
///
/// ```
/// # use solver::field::seawater::pk_ammonium_seawater;
/// assert!((pk_ammonium_seawater(25.0, 0.0) - 9.244605).abs() < 1e-9);
/// ```
pub fn pk_ammonium_seawater(temperature_c: f64, salinity: f64) -> f64 {
    let t = temperature_c + 273.15;
    let s = salinity.max(0.0);
    let st = t.sqrt();
    let pk = 9.244605 - 2729.33 * (1.0 / 298.15 - 1.0 / t)
        + (0.04203362 - 11.24742 / t) * s.powf(0.25)
        + (-13.6416 + 1.176949 * st - 0.02860785 * t + 545.4834 / t) * s.sqrt()
        + (-0.1462507 + 0.0090226468 * st - 0.0001471361 * t + 10.5425 / t) * s.powf(1.5)
        + (0.004669309 - 0.0001691742 * st - 0.5677934 / t) * s * s
        + (-2.354039e-05 + 0.009698623 / t) * s.powf(2.5);
    // mol/kg-H2O → mol/kg-seawater: K* × (1 − 0.001005 S).
    pk - (1.0 - 0.001005 * s).log10()
}

/// The warning a reading carries when the seawater model is used.
pub fn seawater_note(salinity: f64) -> String {
    format!(
        "Un-ionized ammonia from the seawater model of Clegg & Whitfield (1995) at salinity \
         {salinity} (valid 0–40, −2 to 40 °C), which takes the pH on the total scale \
         (electrodes calibrated with seawater buffers such as Tris in synthetic seawater). A \
         glass electrode calibrated with dilute NBS/IUPAC buffers reads roughly 0.1–0.15 \
         higher in full-strength seawater, which would overstate NH₃ by about 25–40 %."
    )
}

/// The warning a reading carries when ammonia has a salinity outside the
/// seawater model's range.
pub fn outside_note(salinity: f64, temperature_c: f64) -> String {
    format!(
        "Salinity {salinity} at {temperature_c} °C is outside the range of the seawater \
         ammonia model (Clegg & Whitfield 1995: salinity 0–40, −2 to 40 °C): the Davies \
         equation at the salinity's ionic strength is used instead and the fractions are \
         indicative only."
    )
}
