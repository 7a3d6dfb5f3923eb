//! Uncertainty of each species fraction of a field reading, from the pH meter, the temperature and the pK data.

use super::inputs::UncertaintyInputs;
use super::pk::{pk_uncertainty, DEFAULT_U_PK};
use super::terms::{COVERAGE_FACTOR, SQRT3};
use crate::equilibrium::activity::ActivityModel;
use crate::error::Result;
use crate::field::{field_reading, FieldResult, FieldSpec};
use crate::mixture::{lookup, prepare, MixtureSpec};
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// One line of a species fraction's budget.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FractionBudgetRow {
    /// Input.
    pub input: String,
    /// Standard uncertainty of the input, in `unit`.
    pub u_input: f64,
    /// Unit of the input.
    pub unit: String,
    /// ∂fraction/∂input, per `unit`.
    pub sensitivity: f64,
    /// Contribution to the standard uncertainty of the fraction.
    pub u_fraction: f64,
    /// Share of the combined variance (0–1).
    pub share: f64,
    /// Where the input's uncertainty comes from.
    pub source: String,
}

/// Uncertainty of one species fraction of a field reading.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesUncertainty {
    /// Species name.
    pub name: String,
    /// Fraction.
    pub fraction: f64,
    /// Expanded uncertainty of the fraction, k = 2.
    pub u95_fraction: f64,
    /// Budget, largest first.
    pub budget: Vec<FractionBudgetRow>,
}

/// Uncertainty of a field reading's fractions.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldUncertainty {
    /// One entry per species, most protonated first.
    pub species: Vec<SpeciesUncertainty>,
}

/// Uncertainty of each species fraction of a field reading, from the pH
/// meter, the temperature and the pK data (first order, k = 2).
///
/// pH and temperature sensitivities are central differences through
/// [`field_reading`] itself; pK sensitivities shift the constant in the
/// same engine at the reading's ionic strength.
///
/// # Errors
///
/// Bad inputs; the reading's own errors.
pub fn field_uncertainty(
    spec: &FieldSpec,
    result: &FieldResult,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
) -> Result<FieldUncertainty> {
    inputs.validate()?;
    let n = result.species.len();
    let fractions =
        |r: &FieldResult| -> Vec<f64> { r.species.iter().map(|s| s.fraction).collect() };
    let diff = |up: Result<FieldResult>, down: Result<FieldResult>, h: f64| -> Result<Vec<f64>> {
        let f0 = fractions(result);
        Ok(match (up, down) {
            (Ok(u), Ok(d)) => fractions(&u)
                .iter()
                .zip(fractions(&d))
                .map(|(a, b)| (a - b) / (2.0 * h))
                .collect(),
            (Ok(u), Err(_)) => fractions(&u)
                .iter()
                .zip(&f0)
                .map(|(a, b)| (a - b) / h)
                .collect(),
            (Err(_), Ok(d)) => f0
                .iter()
                .zip(fractions(&d))
                .map(|(a, b)| (a - b) / h)
                .collect(),
            (Err(e), Err(_)) => return Err(e),
        })
    };
    // (name, unit, u, source, d fraction / d input per species)
    let mut rows: Vec<(String, String, f64, String, Vec<f64>)> = Vec::new();
    if inputs.ph_meter > 0.0 {
        let h = 1e-3;
        let at = |d: f64| {
            let mut s = spec.clone();
            s.ph += d;
            field_reading(&s, custom)
        };
        rows.push((
            "measured pH".into(),
            "pH".into(),
            inputs.ph_meter / SQRT3,
            format!(
                "pH meter ±{} as entered (common practice 0.02)",
                inputs.ph_meter
            ),
            diff(at(h), at(-h), h)?,
        ));
    }
    if inputs.temperature_k > 0.0 {
        let h = 0.05;
        let at = |d: f64| {
            let mut s = spec.clone();
            s.temperature_c += d;
            field_reading(&s, custom)
        };
        rows.push((
            "temperature".into(),
            "K".into(),
            inputs.temperature_k / SQRT3,
            format!("±{} K as entered", inputs.temperature_k),
            diff(at(h), at(-h), h)?,
        ));
    }
    // pK: shift each constant in the engine at the reading's ionic strength.
    let sys = lookup(&spec.system, custom)?;
    let is_custom = custom.iter().any(|c| c.id == sys.id);
    let mix = MixtureSpec {
        temperature_c: spec.temperature_c,
        activity: ActivityModel::Davies,
        components: vec![crate::mixture::ComponentSpec {
            system: sys.id.clone(),
            form: None,
            conc_m: 1.0,
        }],
        additives: vec![],
    };
    let p = prepare(&mix, custom)?;
    let steps = p.composition.acids.first().map_or(0, |a| a.n);
    for s in 0..steps {
        let (u, src) = if is_custom {
            (DEFAULT_U_PK, "estimate for a user-defined constant")
        } else {
            pk_uncertainty(&sys.id, s + 1)
        };
        let h = 1e-3;
        let at = |d: f64| -> Vec<f64> {
            let mut q = p.clone();
            if let Some(k) = q
                .composition
                .acids
                .first_mut()
                .and_then(|a| a.ka.get_mut(s))
            {
                *k *= 10f64.powf(-d);
            }
            q.speciate(spec.ph, result.ionic_strength)
                .first()
                .map(|x| x.species.iter().map(|r| r.fraction).collect())
                .unwrap_or_default()
        };
        let (up, down) = (at(h), at(-h));
        let d: Vec<f64> = up
            .iter()
            .zip(&down)
            .map(|(a, b)| (a - b) / (2.0 * h))
            .collect();
        rows.push((
            format!("pK{} of {}", s + 1, sys.name),
            "pK".into(),
            u,
            src.to_string(),
            d,
        ));
    }
    let mut species = Vec::with_capacity(n);
    for (j, sp) in result.species.iter().enumerate() {
        let mut budget: Vec<FractionBudgetRow> = rows
            .iter()
            .map(|(name, unit, u, src, d)| {
                let c = d.get(j).copied().unwrap_or(0.0);
                FractionBudgetRow {
                    input: name.clone(),
                    u_input: *u,
                    unit: unit.clone(),
                    sensitivity: c,
                    u_fraction: (c * u).abs(),
                    share: 0.0,
                    source: src.clone(),
                }
            })
            .collect();
        let var: f64 = budget.iter().map(|r| r.u_fraction * r.u_fraction).sum();
        for r in &mut budget {
            r.share = if var > 0.0 {
                r.u_fraction * r.u_fraction / var
            } else {
                0.0
            };
        }
        crate::order::sort_by(&mut budget, |a, b| b.u_fraction.total_cmp(&a.u_fraction));
        species.push(SpeciesUncertainty {
            name: sp.name.clone(),
            fraction: sp.fraction,
            u95_fraction: COVERAGE_FACTOR * var.sqrt(),
            budget,
        });
    }
    Ok(FieldUncertainty { species })
}
