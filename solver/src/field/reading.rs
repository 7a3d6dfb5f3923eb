//! Field readings: from a measured pH and temperature to the share of each species.
//!
//! The water and aquaculture questions: how much of the total ammonia is the
//! toxic un-ionized NH₃, how much free chlorine is HOCl, how much sulfide is
//! H₂S gas-forming. The speciation uses the same engine as everything else,
//! at the measured pH and an ionic strength that is given, estimated from
//! conductivity or TDS, or taken as zero.
//!
//! Common practice rules of thumb for the ionic strength of natural waters:
//!
//! ```text
//! I ≈ 1.6×10⁻⁵ × specific conductance (µS/cm)     (Russell 1976)
//! I ≈ 2.5×10⁻⁵ × TDS (mg/L)                       (Langelier 1936)
//! ```
//!
//! From practical salinity S (Dickson, Sabine & Christian 2007, *Guide to
//! Best Practices for Ocean CO₂ Measurements*, PICES Special Publication 3,
//! chapter 5; mol/kg-H₂O, used here as mol/L, a difference of a few per cent
//! that is small beside the activity model's own error at these strengths):
//!
//! ```text
//! I = 19.924 S / (1000 − 1.005 S)
//! ```
//!
//! For ammonia with a salinity, the seawater model of Clegg & Whitfield
//! (1995) gives the constant ([`crate::field::seawater`], total pH scale, salinity
//! 0–40, −2 to 40 °C); the result names the model used ([`PkModel`]). Every
//! other system, and ammonia outside that range, uses the Davies equation at
//! the salinity's ionic strength; past the Davies range ([`DAVIES_LIMIT`])
//! the result carries a warning that the value is indicative.
//!
//! Optional parts of a reading: an alkalinity for the carbonate system
//! ([`crate::field::carbonate`]), and a user's limit for the form that
//! matters ([`crate::field::limit`]). No regulatory number is built in.

use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::{fractions_into, Acid};
use crate::error::{in_range, non_negative, Result, SolverError};
use crate::field::carbonate::{carbonate_from_alkalinity, Alkalinity, CarbonateResult};
use crate::field::limit::{evaluate_limit, validate_limit, Limit, LimitResult};
use crate::field::seawater::{
    outside_note, pk_ammonium_seawater, seawater_note, seawater_use, PkModel, SeawaterUse,
};
use crate::mixture::lookup;
use crate::system::formula::molar_mass;
use crate::system::thermo::system_pks;
use crate::system::{AcidSystem, Hazard, MAX_STEPS};
use crate::water::{debye_huckel_a, pkw};
use serde::{Deserialize, Serialize};

/// Where the ionic strength of a field sample comes from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case", deny_unknown_fields)]
pub enum IonicSource {
    /// Take I = 0 (infinite dilution).
    Zero,
    /// A known ionic strength, mol/L.
    Direct {
        /// Ionic strength, mol/L.
        ionic_strength: f64,
    },
    /// Specific conductance, µS/cm (Russell 1976 rule of thumb).
    Conductivity {
        /// µS/cm.
        us_cm: f64,
    },
    /// Total dissolved solids, mg/L (Langelier 1936 rule of thumb).
    Tds {
        /// mg/L.
        mg_l: f64,
    },
    /// Practical salinity (PSS-78, numerically ‰), Dickson, Sabine &
    /// Christian (2007): I = 19.924 S / (1000 − 1.005 S).
    Salinity {
        /// Practical salinity, 0–50.
        psu: f64,
    },
}

/// Unit of a field total.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum TotalUnit {
    /// mg/L expressed as the system's reporting basis (N for ammonia, Cl₂ for chlorine...).
    MgPerLAs,
    /// mmol/L.
    MmolPerL,
    /// µmol/L.
    UmolPerL,
    /// mg/L as NH₃ (ammonia only).
    MgPerLNh3,
    /// mg/L as H₂S (sulfide only).
    MgPerLH2s,
    /// mg/L as CaCO₃, one CaCO₃ per carbon (carbonate only; not an alkalinity).
    MgPerLCaco3,
    /// mg/L as CO₂, one CO₂ per carbon (carbonate only).
    MgPerLCo2,
}

impl TotalUnit {
    /// For the mg/L units tied to one basis: (system id, basis label, formula).
    pub fn fixed_basis(self) -> Option<(&'static str, &'static str, &'static str)> {
        match self {
            TotalUnit::MgPerLNh3 => Some(("ammonium", "NH₃", "NH3")),
            TotalUnit::MgPerLH2s => Some(("sulfide", "H₂S", "H2S")),
            TotalUnit::MgPerLCaco3 => Some(("carbonate", "CaCO₃", "CaCO3")),
            TotalUnit::MgPerLCo2 => Some(("carbonate", "CO₂", "CO2")),
            _ => None,
        }
    }
}

/// A field reading.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FieldSpec {
    /// System id.
    pub system: String,
    /// Measured pH.
    pub ph: f64,
    /// Sample temperature, °C.
    pub temperature_c: f64,
    /// Optional total concentration of the system.
    #[serde(default)]
    pub total: Option<f64>,
    /// Unit of `total`.
    pub total_unit: TotalUnit,
    /// Ionic strength source.
    pub ionic: IonicSource,
    /// Measured alkalinity (carbonate system only): replaces the total,
    /// which must then be absent.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub alkalinity: Option<Alkalinity>,
    /// The user's limit for the form that matters (un-ionized ammonia, H₂S,
    /// HOCl, free CO₂). No regulatory number is built in.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub limit: Option<Limit>,
}

/// A species amount in one reporting basis.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BasisAmount {
    /// Basis label (`N`, `NH₃`, `CaCO₃`...).
    pub basis: String,
    /// mg/L as that basis (one formula unit of the basis per unit of the system).
    pub mg_l: f64,
}

/// One species of a field reading.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldSpecies {
    /// Display name.
    pub name: String,
    /// Fraction of the total.
    pub fraction: f64,
    /// Concentration, mol/L, when a total was given.
    pub conc_m: Option<f64>,
    /// Concentration in mg/L as the reporting basis, when a total was given.
    pub mg_l_as: Option<f64>,
    /// The same concentration in every reporting basis of the system (see
    /// [`reporting_bases`]); empty when no total was given.
    #[serde(default)]
    pub amounts: Vec<BasisAmount>,
}

/// Result of a field reading.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldResult {
    /// System display name.
    pub system_name: String,
    /// pK values at the sample temperature, I = 0.
    pub pks: Vec<f64>,
    /// Apparent (concentration) pK values at the sample's ionic strength.
    pub apparent_pks: Vec<f64>,
    /// Ionic strength used, mol/L.
    pub ionic_strength: f64,
    /// Reporting basis label (`N`, `Cl₂`, `S`...).
    pub basis: String,
    /// Species, most protonated first.
    pub species: Vec<FieldSpecies>,
    /// Safety flags of the system.
    pub hazards: Vec<Hazard>,
    /// Index in `species` of the form that usually matters (toxic or
    /// reactive form), for the systems that have one.
    #[serde(default)]
    pub target: Option<usize>,
    /// Carbonate system from a measured alkalinity.
    #[serde(default)]
    pub carbonate: Option<CarbonateResult>,
    /// The user's limit against the form that matters.
    #[serde(default)]
    pub limit: Option<LimitResult>,
    /// Plain-language warnings (model range, indicative values).
    #[serde(default)]
    pub warnings: Vec<String>,
    /// The model that gave the apparent constants (Davies, or the seawater
    /// ammonia model for ammonia with a salinity in its range).
    #[serde(default)]
    pub model: PkModel,
}

/// Reporting basis for mg/L totals: (label, formula for the molar mass).
pub fn reporting_basis(system_id: &str) -> (&'static str, &'static str) {
    reporting_bases(system_id)
        .first()
        .copied()
        .unwrap_or(("mmol", ""))
}

/// Every basis a system's amounts are reported in: (label, formula).
///
/// One formula unit of the basis per unit of the system (1 mol N per mol
/// ammonia, 1 mol CaCO₃ or CO₂ per mol carbon, 1 mol Cl₂ per mol free
/// chlorine). The first entry is the basis of `total` in mg/L. Note that
/// "carbonate as CaCO₃" here is on this molar basis; an *alkalinity* as
/// CaCO₃ is on the equivalent basis (50.04 g/eq), see
/// [`crate::field::carbonate`].
pub fn reporting_bases(system_id: &str) -> &'static [(&'static str, &'static str)] {
    match system_id {
        "ammonium" => &[("N", "N"), ("NH₃", "NH3")],
        "hypochlorous" => &[("Cl₂", "Cl2")],
        "sulfide" => &[("S", "S"), ("H₂S", "H2S")],
        "carbonate" => &[("C", "C"), ("CaCO₃", "CaCO3"), ("CO₂", "CO2")],
        "phosphate" => &[("P", "P")],
        "borate" => &[("B", "B")],
        _ => &[],
    }
}

/// The species that usually matters for a system (index, reason): the
/// toxic or reactive form a limit is set for.
pub fn target_species(system_id: &str) -> Option<(usize, &'static str)> {
    match system_id {
        "ammonium" => Some((1, "Un-ionized ammonia, the form toxic to fish")),
        "sulfide" => Some((0, "Hydrogen sulfide, the toxic form that escapes as gas")),
        "hypochlorous" => Some((0, "Hypochlorous acid, the stronger disinfectant")),
        "carbonate" => Some((0, "Dissolved (free) CO₂")),
        _ => None,
    }
}

/// Ionic strength from practical salinity, Dickson, Sabine & Christian
/// (2007) ch. 5: `I = 19.924 S / (1000 − 1.005 S)` (mol/kg-H₂O). No range
/// check (see [`ionic_from`]).
///
/// # Example
///
/// ```
/// # use solver::field::ionic_from_salinity;
/// assert!((ionic_from_salinity(35.0) - 0.7228).abs() < 1e-4);
/// ```
pub fn ionic_from_salinity(psu: f64) -> f64 {
    19.924 * psu / (1000.0 - 1.005 * psu)
}

/// Ionic strength from a field source (common-practice rules of thumb).
///
/// # Errors
///
/// Negative or non-finite readings.
pub fn ionic_from(source: &IonicSource) -> Result<f64> {
    Ok(match source {
        IonicSource::Zero => 0.0,
        IonicSource::Direct { ionic_strength } => {
            in_range("ionic.ionic_strength", *ionic_strength, 0.0, 5.0)?
        }
        IonicSource::Conductivity { us_cm } => {
            1.6e-5 * in_range("ionic.us_cm", *us_cm, 0.0, 200_000.0)?
        }
        IonicSource::Tds { mg_l } => 2.5e-5 * in_range("ionic.mg_l", *mg_l, 0.0, 100_000.0)?,
        IonicSource::Salinity { psu } => {
            ionic_from_salinity(in_range("ionic.psu", *psu, 0.0, 50.0)?)
        }
    })
}

/// Check the parts of a field reading that can be checked without solving:
/// pH, temperature bounds of the water model, total, ionic source,
/// alkalinity and limit, and that they fit the chosen system. Paths are
/// relative to the reading (`alkalinity.value`, `limit.unit`...).
///
/// # Errors
///
/// The first bad field, named.
pub fn validate_field(spec: &FieldSpec, custom: &[AcidSystem]) -> Result<()> {
    let sys = lookup(&spec.system, custom)?;
    in_range("ph", spec.ph, 0.0, 14.0)?;
    in_range("temperature_c", spec.temperature_c, 0.0, 60.0)?;
    if let Some(t) = spec.total {
        in_range("total", t, 0.0, 1e6)?;
    }
    if let Some((id, label, _)) = spec.total_unit.fixed_basis() {
        if id != sys.id {
            return Err(SolverError::Infeasible {
                field: "total_unit".into(),
                reason: format!("a total as {label} does not fit {}", sys.name),
            });
        }
    }
    ionic_from(&spec.ionic)?;
    if let Some(a) = &spec.alkalinity {
        a.to_eq_per_l()?;
        if sys.id != "carbonate" {
            return Err(SolverError::Infeasible {
                field: "alkalinity".into(),
                reason: format!(
                    "an alkalinity is used for the carbonate system only, not {}",
                    sys.name
                ),
            });
        }
        if spec.total.is_some() {
            return Err(SolverError::Infeasible {
                field: "alkalinity".into(),
                reason: "give either a total or an alkalinity, not both: the alkalinity \
                         replaces the total"
                    .into(),
            });
        }
    }
    if let Some(l) = &spec.limit {
        validate_limit(l, &sys.id)?;
    }
    Ok(())
}

/// A limit is judged against a total (or an alkalinity): refused by the reading, not by
/// the document, so a limit left set while the total is "not measured" is kept with the
/// design and the reading says why it cannot be judged.
fn check_limit_has_total(spec: &FieldSpec) -> Result<()> {
    if spec.limit.is_some() && spec.total.is_none() && spec.alkalinity.is_none() {
        return Err(SolverError::Infeasible {
            field: "limit".into(),
            reason: "a limit needs a total (or, for carbonate, an alkalinity)".into(),
        });
    }
    Ok(())
}

/// Convert a field total to mol/L of the system.
///
/// # Errors
///
/// Negative or non-finite totals; a basis formula that does not parse.
pub fn total_to_molar(system_id: &str, total: f64, unit: TotalUnit) -> Result<f64> {
    let t = non_negative("total", total)?;
    Ok(match unit {
        TotalUnit::MmolPerL => t / 1000.0,
        TotalUnit::UmolPerL => t / 1e6,
        TotalUnit::MgPerLAs => match reporting_bases(system_id).first() {
            None => t / 1000.0,
            Some((_, f)) => {
                t / 1000.0
                    / match basis_mass(f) {
                        Some(m) => m,
                        None => molar_mass(f)?,
                    }
            }
        },
        TotalUnit::MgPerLNh3
        | TotalUnit::MgPerLH2s
        | TotalUnit::MgPerLCaco3
        | TotalUnit::MgPerLCo2 => match unit.fixed_basis() {
            Some((id, _, f)) if id == system_id => t / 1000.0 / molar_mass(f)?,
            _ => {
                return Err(SolverError::Infeasible {
                    field: "total_unit".into(),
                    reason: format!("that mg/L basis does not fit the system {system_id}"),
                })
            }
        },
    })
}

/// Molar mass of a reporting-basis or limit formula, computed once per
/// formula (CIAAW 2021 weights through [`molar_mass`]); `None` when the
/// formula does not parse.
pub fn basis_mass(formula: &str) -> Option<f64> {
    use std::sync::OnceLock;
    const FORMULAS: [&str; 13] = [
        "N", "NH3", "Cl2", "S", "H2S", "C", "CaCO3", "CO2", "P", "B", "HOCl", "HCO3", "CO3",
    ];
    static MASSES: OnceLock<Vec<Option<f64>>> = OnceLock::new();
    let masses = MASSES.get_or_init(|| FORMULAS.iter().map(|f| molar_mass(f).ok()).collect());
    match FORMULAS.iter().position(|f| *f == formula) {
        Some(i) => masses.get(i).copied().flatten(),
        None => molar_mass(formula).ok(),
    }
}

/// Warning text for an ionic strength past the Davies range.
pub fn beyond_davies_warning(ionic: f64) -> String {
    format!(
        "Ionic strength {ionic:.3} mol/L is beyond the range the Davies activity model is \
         trusted in (about {DAVIES_LIMIT} mol/L) and no seawater model is used: the fractions \
         are indicative only."
    )
}

/// What a [`FieldSample`] needs from the temperature alone: the system's
/// thermodynamic pK values, Kw and the Debye–Hückel A. Logs keep these per
/// distinct temperature ([`FieldCache`]) instead of redoing them per row;
/// the numbers are the same either way.
#[derive(Debug, Clone, PartialEq)]
pub struct AtTemperature {
    /// Temperature, °C (checked against 0–60 °C and the system's data).
    pub temperature_c: f64,
    /// Thermodynamic pK values at the temperature (I = 0).
    pub pks: Vec<f64>,
    acid: Acid,
    kw: f64,
    a_dh: f64,
}

impl AtTemperature {
    /// A system's constants at a temperature.
    ///
    /// # Errors
    ///
    /// Temperature outside 0–60 °C or the system's data (field `temperature_c`).
    pub fn new(sys: &AcidSystem, temperature_c: f64) -> Result<Self> {
        let t = in_range("temperature_c", temperature_c, 0.0, 60.0)?;
        let pks = system_pks(sys, t)?;
        let a_dh = debye_huckel_a(t)?;
        let acid = Acid::from_pks(sys.z0, &pks, 1.0);
        let kw = 10f64.powf(-pkw(t)?);
        Ok(Self {
            temperature_c: t,
            pks,
            acid,
            kw,
            a_dh,
        })
    }

    /// The sample at an ionic strength (Davies).
    pub fn sample(&self, ionic_strength: f64) -> FieldSample {
        FieldSample {
            acid: self.acid,
            kw: self.kw,
            a_dh: self.a_dh,
            gamma1: crate::equilibrium::activity::gamma1(
                ActivityModel::Davies,
                self.a_dh,
                ionic_strength,
            ),
            ionic_strength,
            model: PkModel::Davies,
        }
    }

    /// The sample for an ionic-strength source whose ionic strength is
    /// `ionic` (= [`ionic_from`] of it): the seawater ammonia model when the
    /// source is a salinity in its range, Davies otherwise.
    pub fn sample_for_source(
        &self,
        sys: &AcidSystem,
        source: &IonicSource,
        ionic: f64,
    ) -> FieldSample {
        let mut sample = self.sample(ionic);
        if let SeawaterUse::Within(s) = seawater_use(&sys.id, source, self.temperature_c) {
            sample.acid =
                Acid::from_pks(sys.z0, &[pk_ammonium_seawater(self.temperature_c, s)], 1.0);
            sample.gamma1 = 1.0;
            sample.model = PkModel::CleggWhitfield1995;
        }
        sample
    }
}

/// Most temperatures a [`FieldCache`] keeps (it starts afresh when full).
const CACHE_TEMPERATURES: usize = 512;

/// Temperature constants of one system, kept per distinct temperature (by
/// its exact bits) across the readings of a log. Only successes are kept,
/// so a bad row gives the same error as a single reading.
#[derive(Debug, Clone, Default)]
pub struct FieldCache {
    system: String,
    temperatures: Vec<(u64, AtTemperature)>,
}

impl FieldCache {
    /// An empty cache.
    pub fn new() -> Self {
        Self::default()
    }

    fn at(&mut self, sys: &AcidSystem, temperature_c: f64) -> Result<&AtTemperature> {
        if self.system != sys.id {
            self.system.clone_from(&sys.id);
            self.temperatures.clear();
        }
        let bits = temperature_c.to_bits();
        let i = match self.temperatures.iter().position(|(b, _)| *b == bits) {
            Some(i) => i,
            None => {
                let at = AtTemperature::new(sys, temperature_c)?;
                if self.temperatures.len() >= CACHE_TEMPERATURES {
                    self.temperatures.clear();
                }
                self.temperatures.push((bits, at));
                self.temperatures.len() - 1
            }
        };
        self.temperatures
            .get(i)
            .map(|(_, a)| a)
            .ok_or_else(|| SolverError::Infeasible {
                field: "temperature_c".into(),
                reason: "internal: temperature cache".into(),
            })
    }
}

/// A field sample resolved at its temperature and ionic strength: what the
/// speciation, alkalinity, limit crossing, plots and grids reuse. Built
/// without the mixture machinery (no allocation beyond the pK list) because
/// logs build one per row.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldSample {
    /// The system's constants at the temperature (total 1 mol/L).
    pub acid: Acid,
    /// Ionic product of water at the temperature.
    pub kw: f64,
    /// Debye–Hückel A at the temperature.
    pub a_dh: f64,
    /// γ₁ at the sample's ionic strength (Davies).
    pub gamma1: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// The model of the constants in `acid`: with [`PkModel::Davies`] they
    /// are thermodynamic and `gamma1` applies; with the seawater model they
    /// are already the apparent (stoichiometric) constants and `gamma1` is 1.
    pub model: PkModel,
}

impl FieldSample {
    /// Resolve a system (by id) at a temperature and ionic strength.
    ///
    /// # Errors
    ///
    /// Unknown system, temperature outside 0–60 °C or the system's data.
    pub fn new(
        system: &str,
        temperature_c: f64,
        ionic_strength: f64,
        custom: &[AcidSystem],
    ) -> Result<Self> {
        Self::for_system(lookup(system, custom)?, temperature_c, ionic_strength)
    }

    /// Resolve a system at a temperature and ionic strength.
    ///
    /// # Errors
    ///
    /// Temperature outside 0–60 °C or the system's data (field `temperature_c`).
    pub fn for_system(sys: &AcidSystem, temperature_c: f64, ionic_strength: f64) -> Result<Self> {
        Ok(AtTemperature::new(sys, temperature_c)?.sample(ionic_strength))
    }

    /// Resolve a system at a temperature for an ionic-strength source: the
    /// seawater ammonia model when the source is a salinity in its range
    /// ([`seawater_use`]), Davies at the source's ionic strength otherwise.
    ///
    /// # Errors
    ///
    /// A bad source reading; temperature outside 0–60 °C or the system's data.
    pub fn for_source(sys: &AcidSystem, temperature_c: f64, source: &IonicSource) -> Result<Self> {
        let ionic = ionic_from(source)?;
        let at = AtTemperature::new(sys, temperature_c)?;
        Ok(at.sample_for_source(sys, source, ionic))
    }

    /// Apparent (concentration-scale) pK values at the sample's ionic
    /// strength: pK − (2z+1)·log γ₁ with Davies (z the charge of the base
    /// form), or the seawater model's own constants.
    pub fn apparent_pks(&self, thermodynamic: &[f64]) -> Vec<f64> {
        match self.model {
            PkModel::CleggWhitfield1995 => self.pks(),
            PkModel::Davies => {
                let lg = self.gamma1.log10();
                thermodynamic
                    .iter()
                    .enumerate()
                    .map(|(i, pk)| {
                        let zj = self.acid.z0 - (i as i32 + 1);
                        pk - f64::from(2 * zj + 1) * lg
                    })
                    .collect()
            }
        }
    }

    /// Fractions of every species at `ph` (most protonated first) and their number.
    pub fn fractions(&self, ph: f64) -> ([f64; MAX_STEPS + 1], usize) {
        let mut out = [0.0; MAX_STEPS + 1];
        let n = fractions_into(&self.acid, ph, self.gamma1, &mut out);
        (out, n)
    }

    /// Fraction of species `index` at `ph` (0 when there is no such species).
    pub fn fraction(&self, index: usize, ph: f64) -> f64 {
        let (f, n) = self.fractions(ph);
        if index < n {
            f.get(index).copied().unwrap_or(0.0)
        } else {
            0.0
        }
    }

    /// Thermodynamic pK values at the temperature (I = 0).
    pub fn pks(&self) -> Vec<f64> {
        self.acid
            .ka
            .iter()
            .take(self.acid.n)
            .map(|k| -k.log10())
            .collect()
    }
}

/// Speciate a field sample at its measured pH.
///
/// With an alkalinity (carbonate only) the total is computed from it
/// ([`carbonate_from_alkalinity`]); with a limit the result says whether the
/// form that matters is within it and at which pH the same water would cross
/// it ([`evaluate_limit`]).
///
/// # Errors
///
/// pH outside 0–14, temperature outside the system's data, negative totals or
/// readings, unknown system, an alkalinity or limit that does not fit the
/// system, an alkalinity the pH cannot support.
///
/// # Example
///
/// Un-ionized ammonia at pH 8.0 and 20 °C, I = 0, from Emerson et al. (1975):
/// pKa = 0.09018 + 2729.92/T, fraction = 1/(10^(pKa − pH) + 1) ≈ 0.0396.
///
/// ```
/// use solver::field::{field_reading, FieldSpec, IonicSource, TotalUnit};
/// let r = field_reading(&FieldSpec {
///     system: "ammonium".into(), ph: 8.0, temperature_c: 20.0,
///     total: Some(1.0), total_unit: TotalUnit::MgPerLAs, ionic: IonicSource::Zero,
///     alkalinity: None, limit: None,
/// }, &[])?;
/// let pka = 0.09018 + 2729.92 / 293.15;
/// let f = 1.0 / (10f64.powf(pka - 8.0) + 1.0);
/// assert!((r.species[1].fraction - f).abs() < 1e-9);
/// // 1 mg/L as N is 1.216 mg/L as NH3; the NH3 share of it:
/// assert_eq!(r.species[1].amounts[1].basis, "NH₃");
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn field_reading(spec: &FieldSpec, custom: &[AcidSystem]) -> Result<FieldResult> {
    reading(spec, custom, None)
}

/// [`field_reading`] with the temperature constants kept in `cache` across
/// calls (a log's rows): the same result, number for number.
///
/// # Errors
///
/// As [`field_reading`].
pub fn field_reading_cached(
    spec: &FieldSpec,
    custom: &[AcidSystem],
    cache: &mut FieldCache,
) -> Result<FieldResult> {
    reading(spec, custom, Some(cache))
}

fn reading(
    spec: &FieldSpec,
    custom: &[AcidSystem],
    cache: Option<&mut FieldCache>,
) -> Result<FieldResult> {
    validate_field(spec, custom)?;
    check_limit_has_total(spec)?;
    let ph = spec.ph;
    let ionic = ionic_from(&spec.ionic)?;
    let sys = lookup(&spec.system, custom)?;
    let (label, _) = reporting_basis(&sys.id);
    let fresh;
    let at = match cache {
        Some(c) => c.at(sys, spec.temperature_c)?,
        None => {
            fresh = AtTemperature::new(sys, spec.temperature_c)?;
            &fresh
        }
    };
    let sample = at.sample_for_source(sys, &spec.ionic, ionic);
    let mut warnings = Vec::new();
    let sea = seawater_use(&sys.id, &spec.ionic, spec.temperature_c);
    if let SeawaterUse::Within(s) = sea {
        warnings.push(seawater_note(s));
    } else if let SeawaterUse::Outside(s) = sea {
        warnings.push(outside_note(s, spec.temperature_c));
    }
    if ionic > DAVIES_LIMIT && sample.model == PkModel::Davies {
        warnings.push(beyond_davies_warning(ionic));
    }
    if matches!(spec.ionic, IonicSource::Salinity { .. }) && sample.model == PkModel::Davies {
        warnings.push(
            "pH is taken as −log a(H⁺) (a glass electrode calibrated with dilute IUPAC/NBS \
             buffers); seawater pH scales (total, free, seawater) differ from it, by about a \
             tenth of a unit (from memory)."
                .into(),
        );
    }
    let mut carbonate = None;
    let total_m = match (&spec.alkalinity, spec.total) {
        (Some(a), _) => {
            let c = carbonate_from_alkalinity(&sample, ph, a.to_eq_per_l()?)?;
            let dic = c.dic_mmol_l / 1000.0;
            carbonate = Some(c);
            Some(dic)
        }
        (None, Some(t)) => Some(total_to_molar(&sys.id, t, spec.total_unit)?),
        (None, None) => None,
    };
    let bases: Vec<(&str, f64)> = reporting_bases(&sys.id)
        .iter()
        .filter_map(|(l, f)| basis_mass(f).map(|m| (*l, m)))
        .collect();
    let basis_mm = bases.first().map(|b| b.1);
    let pks = at.pks.clone();
    let (fractions, n) = sample.fractions(ph);
    let species = fractions
        .iter()
        .take(n)
        .enumerate()
        .map(|(j, f)| {
            let conc = total_m.map(|t| t * f);
            let amounts = match conc {
                Some(c) => bases
                    .iter()
                    .map(|(l, m)| BasisAmount {
                        basis: (*l).to_string(),
                        mg_l: c * m * 1000.0,
                    })
                    .collect(),
                None => Vec::new(),
            };
            FieldSpecies {
                name: sys
                    .species
                    .get(j)
                    .cloned()
                    .unwrap_or_else(|| format!("species {j}")),
                fraction: *f,
                conc_m: conc,
                mg_l_as: conc.map(|c| match basis_mm {
                    Some(mm) => c * mm * 1000.0,
                    None => c * 1000.0,
                }),
                amounts,
            }
        })
        .collect();
    // Apparent pK: pK − log10(γ_{z−1}/γ_z) with γ_z = γ₁^(z²), exponent 2z+1,
    // or the seawater model's stoichiometric constant.
    let apparent_pks = sample.apparent_pks(&pks);
    let limit = match (&spec.limit, total_m) {
        (Some(l), Some(t)) => Some(evaluate_limit(l, &sample, sys, ph, t)?),
        _ => None,
    };
    Ok(FieldResult {
        system_name: sys.name.clone(),
        pks,
        apparent_pks,
        ionic_strength: ionic,
        basis: label.into(),
        species,
        hazards: sys.hazards.clone(),
        target: target_species(&sys.id).map(|t| t.0),
        carbonate,
        limit,
        warnings,
        model: sample.model,
    })
}
