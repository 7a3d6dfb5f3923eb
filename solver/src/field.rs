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

use crate::activity::ActivityModel;
use crate::error::{in_range, non_negative, Result};
use crate::formula::molar_mass;
use crate::mixture::{lookup, prepare, ComponentSpec, MixtureSpec};
use crate::system::{AcidSystem, Hazard};
use serde::{Deserialize, Serialize};

/// Where the ionic strength of a field sample comes from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[serde(deny_unknown_fields)]
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
}

/// Reporting basis for mg/L totals: (label, formula for the molar mass).
pub fn reporting_basis(system_id: &str) -> (&'static str, &'static str) {
    match system_id {
        "ammonium" => ("N", "N"),
        "hypochlorous" => ("Cl₂", "Cl2"),
        "sulfide" => ("S", "S"),
        "carbonate" => ("C", "C"),
        "phosphate" => ("P", "P"),
        "borate" => ("B", "B"),
        _ => ("mmol", ""),
    }
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
    })
}

/// Speciate a field sample at its measured pH.
///
/// # Errors
///
/// pH outside 0–14, temperature outside the system's data, negative totals or
/// readings, unknown system.
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
/// }, &[])?;
/// let pka = 0.09018 + 2729.92 / 293.15;
/// let f = 1.0 / (10f64.powf(pka - 8.0) + 1.0);
/// assert!((r.species[1].fraction - f).abs() < 1e-9);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn field_reading(spec: &FieldSpec, custom: &[AcidSystem]) -> Result<FieldResult> {
    let ph = in_range("ph", spec.ph, 0.0, 14.0)?;
    let ionic = ionic_from(&spec.ionic)?;
    let sys = lookup(&spec.system, custom)?;
    let (label, basis_formula) = reporting_basis(&sys.id);
    let total_m = match spec.total {
        None => None,
        Some(t) => {
            let t = non_negative("total", t)?;
            Some(match spec.total_unit {
                TotalUnit::MmolPerL => t / 1000.0,
                TotalUnit::UmolPerL => t / 1e6,
                TotalUnit::MgPerLAs => {
                    if basis_formula.is_empty() {
                        t / 1000.0
                    } else {
                        t / 1000.0 / molar_mass(basis_formula)?
                    }
                }
            })
        }
    };
    let mix = MixtureSpec {
        temperature_c: spec.temperature_c,
        activity: ActivityModel::Davies,
        components: vec![ComponentSpec {
            system: sys.id.clone(),
            form: None,
            conc_m: total_m.unwrap_or(1.0),
        }],
        additives: vec![],
    };
    let p = prepare(&mix, custom)?;
    let rows = p.speciate(ph, ionic);
    let basis_mm = if basis_formula.is_empty() {
        None
    } else {
        molar_mass(basis_formula).ok()
    };
    let mut species = Vec::new();
    let mut pks = Vec::new();
    if let Some(s) = rows.first() {
        pks.clone_from(&s.pks);
        for row in &s.species {
            let conc = total_m.map(|t| t * row.fraction);
            species.push(FieldSpecies {
                name: row.name.clone(),
                fraction: row.fraction,
                conc_m: conc,
                mg_l_as: conc.map(|c| match basis_mm {
                    Some(mm) => c * mm * 1000.0,
                    None => c * 1000.0,
                }),
            });
        }
    }
    // Apparent pK: pK − log10(γ_{z−1}/γ_z) with γ_z = γ₁^(z²), exponent 2z+1.
    let g1 = crate::activity::gamma1(ActivityModel::Davies, p.composition.a_dh, ionic);
    let apparent_pks = pks
        .iter()
        .enumerate()
        .map(|(i, pk)| {
            let zj = sys.z0 - (i as i32 + 1);
            pk - f64::from(2 * zj + 1) * g1.log10()
        })
        .collect();
    Ok(FieldResult {
        system_name: sys.name.clone(),
        pks,
        apparent_pks,
        ionic_strength: ionic,
        basis: label.into(),
        species,
        hazards: sys.hazards.clone(),
    })
}
