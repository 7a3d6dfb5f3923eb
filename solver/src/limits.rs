//! The rulebook: every input limit in one table (field path, minimum, maximum, unit, message),
//! read by the solver's validation, the page's input checks and the docs.
//!
//! A path names the field in a design document (`recipe.target_ph`); `[]` stands for any
//! index of a list (`recipe.salts[].conc_m`). The solver's own errors name the field relative
//! to the part being solved ([`Limit::field`]: `target_ph` inside a recipe).

use crate::error::{in_range, Result};

/// One input limit: the accepted range `min..=max` of one field.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limit {
    /// The field's path in a design document (`recipe.volume_l`).
    pub path: &'static str,
    /// Lowest accepted value, in `unit`.
    pub min: f64,
    /// Highest accepted value, in `unit`.
    pub max: f64,
    /// The unit of `min` and `max` (the solver's base unit for the field).
    pub unit: &'static str,
    /// What to tell a person whose value is outside the range.
    pub message: &'static str,
}

impl Limit {
    const fn new(
        path: &'static str,
        min: f64,
        max: f64,
        unit: &'static str,
        message: &'static str,
    ) -> Self {
        Self {
            path,
            min,
            max,
            unit,
            message,
        }
    }

    /// The same range and message for another field.
    const fn for_path(self, path: &'static str) -> Self {
        Self { path, ..self }
    }

    /// The field relative to its part of the document (`recipe.method.titrant_m` →
    /// `method.titrant_m`), as the solver's errors for that part name it.
    pub fn field(&self) -> &'static str {
        match self.path.split_once('.') {
            Some((_, rest)) => rest,
            None => self.path,
        }
    }

    /// Whether `v` is accepted.
    pub fn admits(&self, v: f64) -> bool {
        v.is_finite() && v >= self.min && v <= self.max
    }

    /// `v` if accepted, else the error naming [`Limit::field`].
    ///
    /// # Errors
    ///
    /// `NotFinite` or `OutOfRange` naming the field.
    pub fn check(&self, v: f64) -> Result<f64> {
        in_range(self.field(), v, self.min, self.max)
    }

    /// [`Limit::check`] naming the whole document path (`uncertainty.balance_mg`).
    ///
    /// # Errors
    ///
    /// As [`Limit::check`].
    pub fn check_path(&self, v: f64) -> Result<f64> {
        in_range(self.path, v, self.min, self.max)
    }

    /// [`Limit::check`] naming `field` instead (a list entry: `salts[2].conc_m`).
    ///
    /// # Errors
    ///
    /// As [`Limit::check`].
    pub fn check_as(&self, field: &str, v: f64) -> Result<f64> {
        in_range(field, v, self.min, self.max)
    }
}

const PH_MESSAGE: &str = "pH must be between 0 and 14.";
const T_MESSAGE: &str = "Temperature must be between 0 and 60 °C.";
const AMOUNT_MESSAGE: &str = "At most 5 M: beyond the model's range.";
const STOCK_MESSAGE: &str = "Stock strength must be above zero and at most 20 M.";

/// Target pH of a recipe (activity scale).
pub const TARGET_PH: Limit = Limit::new("recipe.target_ph", 0.0, 14.0, "pH", PH_MESSAGE);
/// Working temperature of a recipe, °C: the water data cover 0–60 °C.
pub const TEMPERATURE_C: Limit = Limit::new("recipe.temperature_c", 0.0, 60.0, "°C", T_MESSAGE);
/// Temperature the recipe is made and checked at (also within the system's own data).
pub const PREPARE_TEMPERATURE_C: Limit = TEMPERATURE_C.for_path("recipe.prepare_temperature_c");
/// Temperature a stock or concentrate is kept at, °C.
pub const STORE_TEMPERATURE_C: Limit = TEMPERATURE_C.for_path("recipe.store_temperature_c");
/// Total buffer concentration, mol/L (above zero).
pub const TOTAL_CONC_M: Limit = Limit::new(
    "recipe.total_conc_m",
    1e-9,
    5.0,
    "mol/L",
    "Must be above zero and at most 5 M (the model's range).",
);
/// Final volume, L.
pub const VOLUME_L: Limit = Limit::new(
    "recipe.volume_l",
    1e-6,
    1000.0,
    "L",
    "The volume must be between 1 µL and 1000 L.",
);
/// Half-width of the tolerance window, pH.
pub const TOLERANCE_PH: Limit = Limit::new(
    "recipe.tolerance_ph",
    1e-4,
    2.0,
    "pH",
    "The window must be between 0.0001 and 2 pH units.",
);
/// Concentrate factor (1 = made at working strength).
pub const CONCENTRATE_FACTOR: Limit = Limit::new(
    "recipe.concentrate_factor",
    1.0,
    50.0,
    "×",
    "A concentrate is 1× (working strength) to 50×.",
);
/// A salt added to a recipe, mol/L.
pub const SALT_CONC_M: Limit =
    Limit::new("recipe.salts[].conc_m", 0.0, 5.0, "mol/L", AMOUNT_MESSAGE);
/// Titrant strength, mol/L.
pub const TITRANT_M: Limit = Limit::new(
    "recipe.method.titrant_m",
    1e-6,
    20.0,
    "mol/L",
    STOCK_MESSAGE,
);
/// Acid stock strength, mol/L.
pub const ACID_STOCK_M: Limit = TITRANT_M.for_path("recipe.method.acid_stock_m");
/// Base stock strength, mol/L.
pub const BASE_STOCK_M: Limit = TITRANT_M.for_path("recipe.method.base_stock_m");
/// Temperature of a mixture, °C.
pub const MIXTURE_TEMPERATURE_C: Limit = TEMPERATURE_C.for_path("mixture.temperature_c");
/// A component of a mixture, mol/L.
pub const COMPONENT_CONC_M: Limit = SALT_CONC_M.for_path("mixture.components[].conc_m");
/// An additive of a mixture, mol/L.
pub const ADDITIVE_CONC_M: Limit = SALT_CONC_M.for_path("mixture.additives[].conc_m");
/// What-if dilution factor (1 = undiluted).
pub const DILUTION_FACTOR: Limit = Limit::new(
    "what_if.dilution_factor",
    1.0,
    1e9,
    "×",
    "The dilution factor must be 1 or more (1 = undiluted).",
);
/// What-if strong acid added, mol/L.
pub const ADD_ACID_M: Limit = SALT_CONC_M.for_path("what_if.add_acid_m");
/// What-if strong base added, mol/L.
pub const ADD_BASE_M: Limit = SALT_CONC_M.for_path("what_if.add_base_m");
/// What-if temperature, °C.
pub const WHAT_IF_TEMPERATURE_C: Limit = TEMPERATURE_C.for_path("what_if.temperature_c");
/// Measured pH of a field sample.
pub const FIELD_PH: Limit = TARGET_PH.for_path("field.ph");
/// Temperature of a field sample, °C.
pub const FIELD_TEMPERATURE_C: Limit = TEMPERATURE_C.for_path("field.temperature_c");
/// A field total (mg/L, mmol/L or µmol/L as chosen).
pub const FIELD_TOTAL: Limit = Limit::new(
    "field.total",
    0.0,
    1e6,
    "as chosen",
    "That total is beyond the model's range.",
);
/// Ionic strength typed directly, mol/L.
pub const IONIC_STRENGTH: Limit = Limit::new(
    "field.ionic.ionic_strength",
    0.0,
    5.0,
    "mol/L",
    "Ionic strength must be at most 5 mol/L.",
);
/// Specific conductance, µS/cm.
pub const CONDUCTIVITY_US_CM: Limit = Limit::new(
    "field.ionic.us_cm",
    0.0,
    200_000.0,
    "µS/cm",
    "At most 200 000 µS/cm.",
);
/// Total dissolved solids, mg/L.
pub const TDS_MG_L: Limit = Limit::new(
    "field.ionic.mg_l",
    0.0,
    100_000.0,
    "mg/L",
    "At most 100 000 mg/L.",
);
/// Practical salinity (PSS-78).
pub const SALINITY_PSU: Limit = Limit::new(
    "field.ionic.psu",
    0.0,
    50.0,
    "PSU",
    "Salinity must be between 0 and 50 (PSU).",
);

/// A user's limit for the form that matters (above zero).
pub const LIMIT_VALUE: Limit = Limit::new(
    "field.limit.value",
    f64::MIN_POSITIVE,
    1e6,
    "as chosen",
    "A limit must be above zero and at most 1 000 000.",
);
/// An alkalinity as typed (mg/L as CaCO₃ or meq/L; the solver also refuses more than
/// 200 meq/L).
pub const ALKALINITY_VALUE: Limit = Limit::new(
    "field.alkalinity.value",
    0.0,
    10_000.0,
    "as chosen",
    "That alkalinity is beyond the model's range.",
);
/// CO₂ of an atmosphere as a percentage of the dry gas (the mixture's; the same range for
/// the recipe's and the field's, [`RECIPE_CO2_PERCENT`], [`FIELD_CO2_PERCENT`]). The gas
/// limits are listed in [`GAS`].
pub const CO2_PERCENT: Limit = Limit::new(
    "mixture.atmosphere.co2_percent",
    0.0,
    100.0,
    "%",
    "CO₂ must be between 0 and 100 %.",
);
/// CO₂ of an atmosphere as a partial pressure (also at most the total pressure).
pub const CO2_UATM: Limit = Limit::new(
    "mixture.atmosphere.co2_uatm",
    0.0,
    1.0e6,
    "µatm",
    "At most 1 000 000 µatm (1 atm), and not above the total pressure.",
);
/// Total pressure of an atmosphere.
pub const PRESSURE_KPA: Limit = Limit::new(
    "mixture.atmosphere.pressure_kpa",
    20.0,
    300.0,
    "kPa",
    "The pressure must be between 20 and 300 kPa.",
);
/// The recipe's atmosphere, CO₂ %.
pub const RECIPE_CO2_PERCENT: Limit = CO2_PERCENT.for_path("recipe.atmosphere.co2_percent");
/// The recipe's atmosphere, CO₂ µatm.
pub const RECIPE_CO2_UATM: Limit = CO2_UATM.for_path("recipe.atmosphere.co2_uatm");
/// The recipe's atmosphere, total pressure.
pub const RECIPE_PRESSURE_KPA: Limit = PRESSURE_KPA.for_path("recipe.atmosphere.pressure_kpa");
/// The field sample's atmosphere, CO₂ %.
pub const FIELD_CO2_PERCENT: Limit = CO2_PERCENT.for_path("field.atmosphere.co2_percent");
/// The field sample's atmosphere, CO₂ µatm.
pub const FIELD_CO2_UATM: Limit = CO2_UATM.for_path("field.atmosphere.co2_uatm");
/// The field sample's atmosphere, total pressure.
pub const FIELD_PRESSURE_KPA: Limit = PRESSURE_KPA.for_path("field.atmosphere.pressure_kpa");
/// Temperature range of the gas constants (Weiss 1974, Weiss & Price 1980): a second bound
/// on a workspace's temperature when it has an atmosphere, so not in [`GAS`] (its path is
/// the mixture temperature's, whose own limit is [`MIXTURE_TEMPERATURE_C`]).
pub const GAS_TEMPERATURE_C: Limit = Limit::new(
    "mixture.temperature_c",
    0.0,
    40.0,
    "°C",
    "Under a CO₂ atmosphere the temperature must be between 0 and 40 °C (the gas constants' range).",
);
/// Room air for the gas what-ifs.
pub const ROOM_CO2_UATM: Limit = CO2_UATM.for_path("what_if.room_co2_uatm");
/// Another CO₂ percentage for the gas what-ifs.
pub const WHAT_IF_CO2_PERCENT: Limit = CO2_PERCENT.for_path("what_if.co2_percent");

/// ± temperature figure, K.
pub const U_TEMPERATURE_K: Limit = Limit::new(
    "uncertainty.temperature_k",
    0.0,
    10.0,
    "K",
    "The temperature figure must be between 0 and 10 K.",
);
/// Balance readability, mg.
pub const U_BALANCE_MG: Limit = Limit::new(
    "uncertainty.balance_mg",
    0.0,
    10_000.0,
    "mg",
    "Balance readability must be between 0 and 10 000 mg.",
);
/// ± flask tolerance, mL.
pub const U_FLASK_ML: Limit = Limit::new(
    "uncertainty.flask_ml",
    0.0,
    100.0,
    "mL",
    "The flask tolerance must be between 0 and 100 mL.",
);
const PERCENT_MESSAGE: &str = "Between 0 and 50 %.";
/// ± poured volume, per cent.
pub const U_POUR_PERCENT: Limit =
    Limit::new("uncertainty.pour_percent", 0.0, 50.0, "%", PERCENT_MESSAGE);
/// ± stock strength, per cent.
pub const U_STOCK_PERCENT: Limit = U_POUR_PERCENT.for_path("uncertainty.stock_percent");
/// ± concentration of a mixture's components, per cent.
pub const U_CONCENTRATION_PERCENT: Limit =
    U_POUR_PERCENT.for_path("uncertainty.concentration_percent");
/// ± pH meter, pH.
pub const U_PH_METER: Limit = Limit::new(
    "uncertainty.ph_meter",
    0.0,
    2.0,
    "pH",
    "The meter figure must be between 0 and 2 pH.",
);
/// Activity-model allowance at I = 0, pH.
pub const U_ACTIVITY_BASE_PH: Limit = Limit::new(
    "uncertainty.activity_base_ph",
    0.0,
    1.0,
    "pH",
    "The activity allowance must be between 0 and 1 pH.",
);
/// Activity-model allowance per mol/L of ionic strength, pH.
pub const U_ACTIVITY_PER_IONIC: Limit =
    U_ACTIVITY_BASE_PH.for_path("uncertainty.activity_per_ionic");

/// Every limit, in document order.
pub const ALL: &[Limit] = &[
    TARGET_PH,
    TEMPERATURE_C,
    PREPARE_TEMPERATURE_C,
    STORE_TEMPERATURE_C,
    TOTAL_CONC_M,
    VOLUME_L,
    TOLERANCE_PH,
    CONCENTRATE_FACTOR,
    SALT_CONC_M,
    TITRANT_M,
    ACID_STOCK_M,
    BASE_STOCK_M,
    MIXTURE_TEMPERATURE_C,
    COMPONENT_CONC_M,
    ADDITIVE_CONC_M,
    DILUTION_FACTOR,
    ADD_ACID_M,
    ADD_BASE_M,
    WHAT_IF_TEMPERATURE_C,
    FIELD_PH,
    FIELD_TEMPERATURE_C,
    FIELD_TOTAL,
    IONIC_STRENGTH,
    CONDUCTIVITY_US_CM,
    TDS_MG_L,
    SALINITY_PSU,
    LIMIT_VALUE,
    ALKALINITY_VALUE,
    U_TEMPERATURE_K,
    U_BALANCE_MG,
    U_FLASK_ML,
    U_POUR_PERCENT,
    U_STOCK_PERCENT,
    U_CONCENTRATION_PERCENT,
    U_PH_METER,
    U_ACTIVITY_BASE_PH,
    U_ACTIVITY_PER_IONIC,
];

/// Temperature of the meter's standards and sample, °C (the standards' tables run 0–95 °C;
/// a user's own buffer may list values up to 100 °C).
pub const CAL_TEMPERATURE_C: Limit = Limit::new(
    "calibration.temperature_c",
    0.0,
    100.0,
    "°C",
    "The temperature must be between 0 and 100 °C.",
);
/// One standard's reading, mV.
pub const CAL_MV: Limit = Limit::new(
    "calibration.points[].mv",
    -2000.0,
    2000.0,
    "mV",
    "A reading must be between −2000 and 2000 mV.",
);
/// The sample's reading, mV.
pub const CAL_SAMPLE_MV: Limit = CAL_MV.for_path("calibration.sample_mv");
/// The pH a meter shows before it is adjusted (a badly drifted meter may show a little
/// outside 0–14).
pub const CAL_DISPLAYED_PH: Limit = Limit::new(
    "calibration.points[].displayed_ph",
    -2.0,
    16.0,
    "pH",
    "A displayed pH must be between −2 and 16.",
);
/// The lowest acceptable slope, % of the Nernst slope.
pub const CAL_SLOPE_MIN: Limit = Limit::new(
    "calibration.limits.slope_min_percent",
    50.0,
    150.0,
    "%",
    "Between 50 and 150 %.",
);
/// The highest acceptable slope (also at least the lowest, checked with the document).
pub const CAL_SLOPE_MAX: Limit = CAL_SLOPE_MIN.for_path("calibration.limits.slope_max_percent");
/// The largest acceptable offset at pH 7, mV.
pub const CAL_OFFSET_MAX: Limit = Limit::new(
    "calibration.limits.offset_max_mv",
    0.0,
    500.0,
    "mV",
    "Between 0 and 500 mV.",
);
/// The largest acceptable residual, pH.
pub const CAL_RESIDUAL_MAX: Limit = Limit::new(
    "calibration.limits.residual_max_ph",
    0.0,
    2.0,
    "pH",
    "Between 0 and 2 pH.",
);
/// A temperature of a user's buffer bottle table, °C.
pub const BUFFER_TEMPERATURE_C: Limit =
    CAL_TEMPERATURE_C.for_path("calibration.buffers[].values[].temperature_c");
/// A pH of a user's buffer bottle table.
pub const BUFFER_PH: Limit = Limit::new(
    "calibration.buffers[].values[].ph",
    0.0,
    14.0,
    "pH",
    PH_MESSAGE,
);
/// The ± (95 %) a bottle states, pH.
pub const BUFFER_U95_PH: Limit = Limit::new(
    "calibration.buffers[].u95_ph",
    0.0,
    1.0,
    "pH",
    "Between 0 and 1 pH.",
);

/// The meter bench's limits (the optional `calibration` part of a design).
pub const METER: &[Limit] = &[
    CAL_TEMPERATURE_C,
    CAL_MV,
    CAL_SAMPLE_MV,
    CAL_DISPLAYED_PH,
    CAL_SLOPE_MIN,
    CAL_SLOPE_MAX,
    CAL_OFFSET_MAX,
    CAL_RESIDUAL_MAX,
    BUFFER_TEMPERATURE_C,
    BUFFER_PH,
    BUFFER_U95_PH,
];

/// The CO₂ atmosphere's limits (the optional `atmosphere` of the recipe, mixture and field,
/// and the gas what-ifs), in document order.
pub const GAS: &[Limit] = &[
    RECIPE_CO2_PERCENT,
    RECIPE_CO2_UATM,
    RECIPE_PRESSURE_KPA,
    CO2_PERCENT,
    CO2_UATM,
    PRESSURE_KPA,
    ROOM_CO2_UATM,
    WHAT_IF_CO2_PERCENT,
    FIELD_CO2_PERCENT,
    FIELD_CO2_UATM,
    FIELD_PRESSURE_KPA,
];

/// The limit of a field by its document path (`recipe.volume_l`; list entries by `[]`
/// or by their index, `recipe.salts[3].conc_m`).
///
/// # Example
///
/// ```
/// use solver::limits::{find, VOLUME_L};
/// assert_eq!(find("recipe.volume_l"), Some(VOLUME_L));
/// assert_eq!(find("recipe.salts[3].conc_m").map(|l| l.max), Some(5.0));
/// assert_eq!(find("recipe.colour"), None);
/// ```
pub fn find(path: &str) -> Option<Limit> {
    let mut general = String::with_capacity(path.len());
    let mut in_index = false;
    for c in path.chars() {
        match c {
            '[' => {
                in_index = true;
                general.push('[');
            }
            ']' => {
                in_index = false;
                general.push(']');
            }
            _ if in_index => {}
            _ => general.push(c),
        }
    }
    ALL.iter()
        .chain(METER)
        .chain(GAS)
        .copied()
        .find(|l| l.path == general)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn paths_are_unique_and_ranges_ordered() {
        let every: Vec<Limit> = ALL.iter().chain(METER).chain(GAS).copied().collect();
        for (i, l) in every.iter().enumerate() {
            assert!(l.min <= l.max, "{}", l.path);
            assert!(!l.message.is_empty() && !l.unit.is_empty(), "{}", l.path);
            assert!(
                every.iter().skip(i + 1).all(|m| m.path != l.path),
                "{}",
                l.path
            );
            assert_eq!(find(l.path), Some(*l));
        }
    }

    #[test]
    fn a_check_names_the_field_within_its_part() {
        let e = VOLUME_L.check(0.0).unwrap_err();
        assert_eq!(e.field(), Some("volume_l"));
        assert_eq!(TITRANT_M.field(), "method.titrant_m");
        assert!(TARGET_PH.check(14.0).is_ok() && TARGET_PH.check(f64::NAN).is_err());
    }
}
