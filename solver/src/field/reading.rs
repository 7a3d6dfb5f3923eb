//! Field readings: from a measured pH and temperature to the share of each species.
//!
//! The water and aquaculture questions: how much of the total ammonia is the
//! toxic un-ionized NH₃, how much free chlorine is HOCl, how much sulfide is
//! H₂S gas-forming. The speciation uses the same engine as everything else,
//! at the measured pH and an ionic strength that is given, estimated from
//! conductivity or TDS, or taken as zero.
//!
//! The ionic strength comes from [`super::ionic`] (rules of thumb for
//! conductivity and TDS, the salinity formula).
//!
//! For ammonia with a salinity, the seawater model of Clegg & Whitfield
//! (1995) gives the constant ([`crate::field::seawater`], total pH scale, salinity
//! 0–40, −2 to 40 °C); the result names the model used ([`PkModel`]). Every
//! other system, and ammonia outside that range, uses the Davies equation at
//! the salinity's ionic strength; past the Davies range
//! ([`crate::equilibrium::activity::DAVIES_LIMIT`]) the reading is refused
//! on the ionic source's field rather than given biased.
//!
//! Optional parts of a reading: an alkalinity for the carbonate system
//! ([`crate::field::carbonate`]), and a user's limit for the form that
//! matters ([`crate::field::limit`]). No regulatory number is built in.

use super::carbonate::{carbonate_from_alkalinity, Alkalinity, CarbonateResult};
use super::ionic::{ionic_from, IonicSource};
use super::limit::{evaluate_limit, validate_limit, Limit, LimitResult};
use super::sample::{target_species, AtTemperature, FieldCache};
use super::seawater::{outside_note, seawater_note, seawater_use, PkModel, SeawaterUse};
use crate::error::{non_negative, Result, SolverError};
use crate::limits;
use crate::mixture::lookup;
use crate::system::formula::{basis_mass, molar_mass};
use crate::system::{AcidSystem, Hazard};
use serde::{Deserialize, Serialize};

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
    /// A gas to report the sample's equilibrium with (carbonate system with
    /// an alkalinity): its pH there and the CO₂ it would lose or gain.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub atmosphere: Option<crate::equilibrium::gas::Atmosphere>,
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
/// chlorine). The first entry is the basis of `total` in mg/L. A *total*
/// "carbonate as CaCO₃" is on this molar basis; an *alkalinity* as CaCO₃ is
/// on the equivalent basis (50.04 g/eq), see [`crate::field::carbonate`],
/// and so is each species' own amount "as CaCO₃" (HCO₃⁻ counts half a CaCO₃).
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

/// How many CaCO₃ one mole of carbonate species `j` counts as when a species
/// is reported "as CaCO₃": on the equivalent basis of the alkalinity and
/// free-CO₂ methods (common practice, the usual conversion factors: CO₂ × 2.27,
/// HCO₃⁻ × 0.82, CO₃²⁻ × 1.67 mg per mg), that is one for CO₂ and CO₃²⁻ (two
/// equivalents, like CaCO₃) and one half for HCO₃⁻ (one equivalent). Every
/// other basis and system: one (the molar basis of the total).
fn caco3_share(system_id: &str, basis: &str, j: usize) -> f64 {
    if system_id == "carbonate" && basis == "CaCO₃" && j == 1 {
        0.5
    } else {
        1.0
    }
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
    limits::FIELD_PH.check(spec.ph)?;
    limits::FIELD_TEMPERATURE_C.check(spec.temperature_c)?;
    if let Some(t) = spec.total {
        limits::FIELD_TOTAL.check(t)?;
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
///     atmosphere: None,
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
    let sample = at.sample_for_source(sys, &spec.ionic, ionic)?;
    let mut warnings = Vec::new();
    let sea = seawater_use(&sys.id, &spec.ionic, spec.temperature_c);
    if let SeawaterUse::Within(s) = sea {
        warnings.push(seawater_note(s));
    } else if let SeawaterUse::Outside(s) = sea {
        warnings.push(outside_note(s, spec.temperature_c));
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
                        mg_l: c * m * 1000.0 * caco3_share(&sys.id, l, j),
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
