//! A user's limit for the form that matters in a field sample, and the pH at which it is crossed.
//!
//! The limit applies to the un-ionized ammonia (NH₃), hydrogen sulfide
//! (H₂S), hypochlorous acid (HOCl) or free CO₂ of a reading, in the units
//! technicians write them in. Which number is right for a water is the
//! user's business (permit, species, local code): none is built in.
//!
//! The crossing pH is the pH at which the same water (same total, same
//! temperature, same ionic strength) would hold exactly the limit. The
//! fraction of the form that matters is monotone in pH, so the crossing is
//! found by bisection on pH 0–14; when the limit is not reached anywhere in
//! 0–14 it is `None`.

use super::sample::{target_species, FieldSample};
use crate::error::{Result, SolverError};
use crate::system::formula::molar_mass;
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// Unit of a limit: mass per litre of the form that matters, as a basis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum LimitUnit {
    /// mg/L of un-ionized ammonia as NH₃.
    #[serde(rename = "mg_per_l_nh3")]
    MgPerLNh3,
    /// µg/L of un-ionized ammonia as NH₃.
    #[serde(rename = "ug_per_l_nh3")]
    UgPerLNh3,
    /// mg/L of un-ionized ammonia as N.
    #[serde(rename = "mg_per_l_n")]
    MgPerLN,
    /// µg/L of un-ionized ammonia as N.
    #[serde(rename = "ug_per_l_n")]
    UgPerLN,
    /// mg/L of H₂S as H₂S.
    #[serde(rename = "mg_per_l_h2s")]
    MgPerLH2s,
    /// µg/L of H₂S as H₂S.
    #[serde(rename = "ug_per_l_h2s")]
    UgPerLH2s,
    /// mg/L of H₂S as S.
    #[serde(rename = "mg_per_l_s")]
    MgPerLS,
    /// µg/L of H₂S as S.
    #[serde(rename = "ug_per_l_s")]
    UgPerLS,
    /// mg/L of HOCl as Cl₂.
    #[serde(rename = "mg_per_l_cl2")]
    MgPerLCl2,
    /// µg/L of HOCl as Cl₂.
    #[serde(rename = "ug_per_l_cl2")]
    UgPerLCl2,
    /// mg/L of HOCl as HOCl.
    #[serde(rename = "mg_per_l_hocl")]
    MgPerLHocl,
    /// µg/L of HOCl as HOCl.
    #[serde(rename = "ug_per_l_hocl")]
    UgPerLHocl,
    /// mg/L of free CO₂ as CO₂.
    #[serde(rename = "mg_per_l_co2")]
    MgPerLCo2,
    /// µg/L of free CO₂ as CO₂.
    #[serde(rename = "ug_per_l_co2")]
    UgPerLCo2,
}

impl LimitUnit {
    /// Every unit, in display order.
    pub const ALL: [LimitUnit; 14] = [
        LimitUnit::MgPerLNh3,
        LimitUnit::UgPerLNh3,
        LimitUnit::MgPerLN,
        LimitUnit::UgPerLN,
        LimitUnit::MgPerLH2s,
        LimitUnit::UgPerLH2s,
        LimitUnit::MgPerLS,
        LimitUnit::UgPerLS,
        LimitUnit::MgPerLCl2,
        LimitUnit::UgPerLCl2,
        LimitUnit::MgPerLHocl,
        LimitUnit::UgPerLHocl,
        LimitUnit::MgPerLCo2,
        LimitUnit::UgPerLCo2,
    ];

    /// (system id, basis label, basis formula, mg per unit).
    pub fn parts(self) -> (&'static str, &'static str, &'static str, f64) {
        use LimitUnit as U;
        match self {
            U::MgPerLNh3 => ("ammonium", "NH₃", "NH3", 1.0),
            U::UgPerLNh3 => ("ammonium", "NH₃", "NH3", 1e-3),
            U::MgPerLN => ("ammonium", "N", "N", 1.0),
            U::UgPerLN => ("ammonium", "N", "N", 1e-3),
            U::MgPerLH2s => ("sulfide", "H₂S", "H2S", 1.0),
            U::UgPerLH2s => ("sulfide", "H₂S", "H2S", 1e-3),
            U::MgPerLS => ("sulfide", "S", "S", 1.0),
            U::UgPerLS => ("sulfide", "S", "S", 1e-3),
            U::MgPerLCl2 => ("hypochlorous", "Cl₂", "Cl2", 1.0),
            U::UgPerLCl2 => ("hypochlorous", "Cl₂", "Cl2", 1e-3),
            U::MgPerLHocl => ("hypochlorous", "HOCl", "HOCl", 1.0),
            U::UgPerLHocl => ("hypochlorous", "HOCl", "HOCl", 1e-3),
            U::MgPerLCo2 => ("carbonate", "CO₂", "CO2", 1.0),
            U::UgPerLCo2 => ("carbonate", "CO₂", "CO2", 1e-3),
        }
    }

    /// The serialised name (`mg_per_l_nh3`...).
    pub fn key(self) -> &'static str {
        use LimitUnit as U;
        match self {
            U::MgPerLNh3 => "mg_per_l_nh3",
            U::UgPerLNh3 => "ug_per_l_nh3",
            U::MgPerLN => "mg_per_l_n",
            U::UgPerLN => "ug_per_l_n",
            U::MgPerLH2s => "mg_per_l_h2s",
            U::UgPerLH2s => "ug_per_l_h2s",
            U::MgPerLS => "mg_per_l_s",
            U::UgPerLS => "ug_per_l_s",
            U::MgPerLCl2 => "mg_per_l_cl2",
            U::UgPerLCl2 => "ug_per_l_cl2",
            U::MgPerLHocl => "mg_per_l_hocl",
            U::UgPerLHocl => "ug_per_l_hocl",
            U::MgPerLCo2 => "mg_per_l_co2",
            U::UgPerLCo2 => "ug_per_l_co2",
        }
    }

    /// Parse a serialised name.
    pub fn from_key(key: &str) -> Option<LimitUnit> {
        LimitUnit::ALL.iter().copied().find(|u| u.key() == key)
    }

    /// Display text (`mg/L as NH₃`, `µg/L as S`).
    pub fn label(self) -> String {
        let (_, basis, _, scale) = self.parts();
        let mass = if scale < 1.0 { "µg/L" } else { "mg/L" };
        format!("{mass} as {basis}")
    }
}

/// A user's limit for the form that matters.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Limit {
    /// The limit in `unit` (> 0).
    pub value: f64,
    /// Its unit; it also names the form (NH₃, H₂S, HOCl, CO₂).
    pub unit: LimitUnit,
}

/// A reading against its limit.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LimitResult {
    /// Name of the form the limit is for.
    pub species: String,
    /// Basis of the mg/L figures (`NH₃`, `N`...).
    pub basis: String,
    /// The limit, mg/L as `basis`.
    pub limit_mg_l: f64,
    /// The sample's amount of the form, mg/L as `basis`.
    pub value_mg_l: f64,
    /// Whether the amount is over the limit.
    pub exceeded: bool,
    /// Limit minus amount, mg/L as `basis` (negative when over).
    pub margin: f64,
    /// Amount divided by limit.
    pub ratio: f64,
    /// pH at which the same water would hold exactly the limit; `None`
    /// when no pH in 0–14 reaches it.
    pub crossing_ph: Option<f64>,
    /// Whether the form grows with pH (NH₃) or shrinks (H₂S, HOCl, CO₂).
    pub rises_with_ph: bool,
}

/// Highest limit value accepted (in its own unit).
pub const MAX_LIMIT: f64 = crate::limits::LIMIT_VALUE.max;

/// Check a limit and that it fits the system.
///
/// # Errors
///
/// `limit.value` not finite, not above zero or beyond [`MAX_LIMIT`];
/// `limit.unit` for another system than `system_id`.
pub fn validate_limit(limit: &Limit, system_id: &str) -> Result<()> {
    crate::limits::LIMIT_VALUE.check(limit.value)?;
    let (sys, ..) = limit.unit.parts();
    if sys != system_id {
        return Err(SolverError::Infeasible {
            field: "limit.unit".into(),
            reason: format!(
                "{} is a limit for the {sys} system, but the reading is for {system_id}",
                limit.unit.label()
            ),
        });
    }
    if target_species(system_id).is_none() {
        return Err(SolverError::Infeasible {
            field: "limit".into(),
            reason: "limits are for ammonia, sulfide, free chlorine and carbonate".into(),
        });
    }
    Ok(())
}

/// Compare a sample of `system` (total `total_m` mol/L at `ph`) with a
/// limit and find the crossing pH.
///
/// # Errors
///
/// As [`validate_limit`], for the sample's system.
pub fn evaluate_limit(
    limit: &Limit,
    sample: &FieldSample,
    system: &AcidSystem,
    ph: f64,
    total_m: f64,
) -> Result<LimitResult> {
    let system_id = system.id.as_str();
    validate_limit(limit, system_id)?;
    let (index, _) = target_species(system_id).unwrap_or((0, ""));
    let (_, basis, formula, scale) = limit.unit.parts();
    let mm = match crate::system::formula::basis_mass(formula) {
        Some(m) => m,
        None => molar_mass(formula)?,
    };
    let limit_mg_l = limit.value * scale;
    let to_mg = |fraction: f64| total_m * fraction * mm * 1000.0;
    let value_mg_l = to_mg(sample.fraction(index, ph));
    let species = system.species.get(index).cloned().unwrap_or_default();
    // The fraction at both ends of the range, worked out once (direction and crossing).
    let (f0, f14) = (sample.fraction(index, 0.0), sample.fraction(index, 14.0));
    let rises = f14 > f0;
    // Bisection on fraction − wanted over pH 0–14 (monotone).
    let wanted = if total_m > 0.0 {
        limit_mg_l / (total_m * mm * 1000.0)
    } else {
        f64::INFINITY
    };
    let crossing_ph = if wanted.is_finite() && wanted > 0.0 && wanted < 1.0 {
        crossing(sample, index, wanted, (f0, f14))
    } else {
        None
    };
    Ok(LimitResult {
        species,
        basis: basis.into(),
        limit_mg_l,
        value_mg_l,
        exceeded: value_mg_l > limit_mg_l,
        margin: limit_mg_l - value_mg_l,
        ratio: value_mg_l / limit_mg_l,
        crossing_ph,
        rises_with_ph: rises,
    })
}

/// pH in 0–14 at which species `index` of `sample` is the fraction `wanted`
/// (0 < wanted < 1), or `None`.
///
/// Monoprotic systems have the closed form `pH = pK' ± log10(f/(1 − f))`
/// with the same apparent constant the speciation uses; others are solved
/// by bisection (52 halvings of 0–14, below 1e−14 pH).
/// `ends` are the fractions at pH 0 and 14.
fn crossing(sample: &FieldSample, index: usize, wanted: f64, ends: (f64, f64)) -> Option<f64> {
    let g = |p: f64| sample.fraction(index, p) - wanted;
    let (g0, g14) = (ends.0 - wanted, ends.1 - wanted);
    if g0 * g14 >= 0.0 {
        return None;
    }
    let acid = &sample.acid;
    if acid.n == 1 {
        // K' = K γ₁^(2 z₁ + 1), z₁ = z0 − 1 (as in the engine's fractions).
        let z1 = acid.z0 - 1;
        let k = acid.ka.first()? * sample.gamma1.powi(2 * z1 + 1);
        let pk = -k.log10();
        let r = (wanted / (1.0 - wanted)).log10();
        // index 1 (base form) rises: f/(1−f) = 10^(pH − pK'); index 0 falls.
        let ph = if index == 1 { pk + r } else { pk - r };
        return (0.0..=14.0).contains(&ph).then_some(ph);
    }
    let (mut lo, mut hi) = (0.0_f64, 14.0_f64);
    for _ in 0..52 {
        let mid = 0.5 * (lo + hi);
        if (g(mid) < 0.0) == (g0 < 0.0) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Some(0.5 * (lo + hi))
}
