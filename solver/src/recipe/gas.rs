//! A carbonate recipe for a CO₂ atmosphere: the NaHCO₃ (or Na₂CO₃) that gives a target pH under the gas.
//!
//! Under the gas the dissolved CO₂ is fixed and the carbonate species follow
//! the pH, so weighing a carbonate form adds only its counter-ions to the
//! charge balance: the amount is the one unknown of [`solve_addition`]
//! (charge `q` and Σz² per formula unit of the form), with the recipe's
//! salts counted and the ionic strength iterated to self-consistency.
//!
//! Beside it, physiology's Henderson–Hasselbalch form (thermodynamic pK₁,
//! no activity, no water, every counter-ion paired with a bicarbonate):
//!
//! ```text
//! pH = pK₁ + log10( [HCO₃⁻] / (K₀ p(CO₂)) ),   amount = [HCO₃⁻] / q
//! ```

use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::gas::{gas_at, no_carbonate, Atmosphere, GasState, CARBONATE};
use crate::equilibrium::{solve, solve_addition};
use crate::error::{Result, SolverError};
use crate::fmt::{format_mass, sig, sig_fixed, sig_trim};
use crate::mixture::{lookup, prepare, tolerance, ComponentSpec, MixtureSpec};
use crate::recipe::spec::{
    titrant_name, weigh, Estimate, Ingredient, MeterReading, MeterSolution, Method, RecipeResult,
    RecipeSpec, RecipeWarning, CONCENTRATE_MAX_M, METER_NOTE,
};
use crate::system::library::{counter_charge, find_form};
use crate::system::thermo::system_pks;
use crate::system::AcidSystem;

fn infeasible(field: &str, reason: String) -> SolverError {
    SolverError::Infeasible {
        field: field.into(),
        reason,
    }
}

/// How the gas reads in a step: `5 % CO₂` or `420 µatm CO₂`, with a
/// pressure other than standard.
pub fn gas_words(g: &GasState, a: &Atmosphere) -> String {
    let co2 = match a.co2_percent {
        Some(x) => format!("{} % CO₂ (humidified)", sig_trim(x, 3)),
        None => format!("{} µatm CO₂", sig_trim(g.co2_uatm, 4)),
    };
    if a.pressure_kpa.is_some() {
        format!("{co2} at {} kPa", sig_trim(g.pressure_kpa, 4))
    } else {
        co2
    }
}

/// Solve a carbonate recipe under its `atmosphere` (see the module text).
///
/// The recipe's system must be `carbonate` and its method `titrate`, whose
/// form is the one weighed (the gas takes the titrant's place: no titrant is
/// poured). A concentrate is not computed under a gas.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `atmosphere` (no carbonate), `method`,
/// `method.form`, `concentrate_factor` or `target_ph` (a target the gas
/// cannot give with a positive amount); the atmosphere's own errors.
pub fn solve_gas_recipe(spec: &RecipeSpec, custom: &[AcidSystem]) -> Result<RecipeResult> {
    let Some(atm) = spec.atmosphere else {
        return Err(infeasible("atmosphere", "no atmosphere given".into()));
    };
    let sys = lookup(&spec.system, custom)?;
    if sys.id != CARBONATE {
        return Err(no_carbonate("atmosphere"));
    }
    let Method::Titrate { form: form_id, .. } = &spec.method else {
        return Err(infeasible(
            "method",
            "under a CO₂ atmosphere the recipe weighs one carbonate form (NaHCO₃ or Na₂CO₃) and \
             the gas sets the rest: choose the method that weighs one form"
                .into(),
        ));
    };
    let form = find_form(sys, form_id).ok_or_else(|| SolverError::Unknown {
        kind: "form (method.form)".into(),
        name: form_id.clone(),
    })?;
    let q = counter_charge(form);
    let zz: f64 = form
        .counter_ions
        .iter()
        .map(|(ion, n)| f64::from(ion.charge() * ion.charge()) * n)
        .sum();
    if q <= 0.0 {
        return Err(infeasible(
            "method.form",
            "this form brings no sodium or potassium, so under the gas it cannot set the pH: \
             weigh NaHCO₃, Na₂CO₃ or a potassium salt"
                .into(),
        ));
    }
    if spec.concentrate_factor != 1.0 {
        return Err(infeasible(
            "concentrate_factor",
            "a concentrate under a CO₂ atmosphere is not computed: make the working solution"
                .into(),
        ));
    }
    let t = spec.temperature_c;
    let gas = gas_at(&atm, t, 0.0)?;
    let mixture_at = |conc_m: f64| MixtureSpec {
        temperature_c: t,
        activity: spec.activity,
        components: vec![ComponentSpec {
            system: sys.id.clone(),
            form: Some(form.id.clone()),
            conc_m,
        }],
        additives: spec.salts.clone(),
        atmosphere: Some(atm),
    };
    let base = prepare(&mixture_at(0.0), custom)?;
    let (x, _) = solve_addition(&base.composition, spec.target_ph, q, zz)?;
    if x < 0.0 {
        let ph0 = base.solve()?.ph;
        return Err(infeasible(
            "target_ph",
            format!(
                "with no carbonate weighed in, this solution already settles at pH {} under {}: \
                 the target is below that; raise the CO₂ or the target",
                sig_fixed(ph0, 2),
                gas_words(&gas, &atm)
            ),
        ));
    }
    if x > CONCENTRATE_MAX_M {
        return Err(infeasible(
            "target_ph",
            format!(
                "the target would need {} mol/L of {} under {}: lower the target or the CO₂",
                sig(x, 3),
                form.formula,
                gas_words(&gas, &atm)
            ),
        ));
    }
    let mixture = mixture_at(x);
    let p = prepare(&mixture, custom)?;
    let eq = solve(&p.composition, spec.target_ph)?;
    let tol = tolerance(&p, &eq, spec.tolerance_ph)?;
    let ingredients = weighed(spec, &form.formula, &form.name, x)?;
    let pks = system_pks(sys, t)?;
    let pk1 = pks.first().copied().unwrap_or(f64::NAN);

    // Physiology's Henderson–Hasselbalch form.
    let hco3 = gas.co2_aq_m * 10f64.powf(spec.target_ph - pk1);
    let x_hh = hco3 / q;
    let actual = prepare(&mixture_at(x_hh), custom)
        .and_then(|p| p.solve())
        .ok()
        .map(|e| e.ph);
    let r = 10f64.powf(spec.target_ph - pk1);
    let estimate = Estimate {
        pk: pk1,
        base_fraction: r / (1.0 + r),
        ingredients: weighed(spec, &form.formula, &form.name, x_hh)?,
        actual_ph: actual,
    };

    let mut warnings = Vec::new();
    if spec.activity == ActivityModel::Davies && eq.ionic_strength > DAVIES_LIMIT {
        warnings.push(RecipeWarning::IonicStrengthBeyondModel {
            ionic_strength: eq.ionic_strength,
        });
    }
    if let Some(a) = actual {
        let d = a - spec.target_ph;
        if d.abs() > 0.05 {
            warnings.push(RecipeWarning::EstimateOff { difference: d });
        }
    }
    // The meter: in the same gas, equilibrated, at the preparation temperature.
    let t_prep = spec.prepare_temperature_c.unwrap_or(t);
    let meter_ph = if t_prep == t {
        eq.ph
    } else {
        let mut m = mixture.clone();
        m.temperature_c = t_prep;
        solve(&prepare(&m, custom)?.composition, eq.ph)?.ph
    };
    let meter = MeterReading {
        temperature_c: t_prep,
        ph: meter_ph,
        solution: MeterSolution::WorkingBuffer,
    };
    warnings.extend(super::solubility::recipe_warnings(
        spec,
        &ingredients,
        t_prep,
    )?);
    let steps = gas_steps(spec, &ingredients, &gas, &atm, &meter);
    Ok(RecipeResult {
        ingredients,
        steps,
        equilibrium: eq,
        tolerance: tol,
        pks,
        step: 1,
        estimate,
        warnings,
        mixture,
        meter,
        concentrate: None,
    })
}

/// The form at `x` mol/L and the recipe's salts, for the final volume.
fn weighed(spec: &RecipeSpec, formula: &str, name: &str, x: f64) -> Result<Vec<Ingredient>> {
    let v = spec.volume_l;
    let mut out = vec![weigh(formula, name, x * v)?];
    for s in &spec.salts {
        if s.conc_m > 0.0 {
            out.push(weigh(
                s.additive.formula(),
                titrant_name(s.additive),
                s.conc_m * v,
            )?);
        }
    }
    Ok(out)
}

/// Bench steps under a gas: weigh, dissolve, equilibrate (time not computed), check.
fn gas_steps(
    spec: &RecipeSpec,
    ing: &[Ingredient],
    gas: &GasState,
    atm: &Atmosphere,
    meter: &MeterReading,
) -> Vec<String> {
    let v_ml = spec.volume_l * 1000.0;
    let t = sig(spec.temperature_c, 3);
    let words = gas_words(gas, atm);
    let target = sig_fixed(spec.target_ph, 2);
    let mut steps: Vec<String> = ing
        .iter()
        .filter_map(|i| {
            i.grams
                .map(|g| format!("Weigh {} of {} — {}.", format_mass(g), i.formula, i.name))
        })
        .collect();
    steps.push(format!(
        "Dissolve in about {} mL of water and make up to {} mL; no acid or base is added: the gas sets the rest.",
        sig(v_ml * 0.8, 3),
        sig(v_ml, 4)
    ));
    steps.push(format!(
        "Equilibrate with {words} at {t} °C (loosened cap or vented vessel). The solution reaches pH {target} only after it has equilibrated with the gas; how long that takes (volume, surface, stirring, the vessel) is not computed."
    ));
    steps.push(
        "Before it has equilibrated, and on the bench in room air, it reads higher: CO₂ leaves it. Read the pH quickly, in a closed cell or in the gas."
            .into(),
    );
    if meter.temperature_c == spec.temperature_c {
        steps.push(format!("Check: pH {target} at {t} °C under {words}."));
    } else {
        steps.push(format!(
            "Check: equilibrated under {words} at {} °C it reads pH {} (pH {target} at {t} °C). {METER_NOTE}",
            sig(meter.temperature_c, 3),
            sig_fixed(meter.ph, 2)
        ));
    }
    steps
}
