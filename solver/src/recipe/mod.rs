//! Recipes, the inverse problem: what to weigh and pour to hit a target pH.
//!
//! Every method reduces to one unknown `x` that moves the spectator charge
//! linearly (the base-form share, or the titrant amount), found by
//! [`solve_addition`] with the ionic strength iterated to self-consistency.
//! The answer is then checked by a forward [`solve`] of the finished recipe.
//!
//! Beside the exact answer the Henderson–Hasselbalch estimate is returned,
//!
//! ```text
//! pH = pK_k + log10( [A_k] / [A_{k−1}] )      (thermodynamic pK, no activity, no water)
//! ```
//!
//! together with the pH that estimate would really give, so the difference is visible.
//!
//! Parts: [`spec`] (what the user asks for and what comes back), the solving
//! here, and [`steps`] (the bench steps in words and the number formats they use).

pub mod gas;
pub mod solubility;
pub mod spec;
pub mod steps;

use spec::{titrant_name, weigh};
pub use spec::{
    ConcentrateResult, Estimate, Ingredient, MeterReading, MeterSolution, Method, RecipeResult,
    RecipeSpec, RecipeWarning, CONCENTRATE_FACTOR_MAX, CONCENTRATE_MAX_M, METER_NOTE,
};
use steps::{bench_steps, steps_text};

use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::{solve, solve_addition};
use crate::error::{in_range, non_negative, Result, SolverError};
use crate::fmt::{clip, format_volume_ml, sig, sig_trim, QUOTE_MAX};
use crate::limits;
use crate::mixture::{
    lookup, prepare, tolerance, Additive, AdditiveSpec, ComponentSpec, MixtureSpec,
};
use crate::system::library::{counter_charge, find_form};
use crate::system::thermo::system_pks;
use crate::system::{AcidSystem, ReagentForm};

struct FormInfo<'a> {
    form: &'a ReagentForm,
    /// Counter charge per system unit.
    q: f64,
    /// Σ z² n per system unit.
    zz: f64,
    /// Formula units per system unit.
    per_unit: f64,
}

fn form_info<'a>(sys: &'a AcidSystem, id: &str, field: &str) -> Result<FormInfo<'a>> {
    let form = find_form(sys, id).ok_or_else(|| SolverError::UnknownChoice {
        field: field.to_string(),
        kind: "form".into(),
        name: id.into(),
    })?;
    if !(form.units.is_finite() && form.units > 0.0) {
        return Err(SolverError::OutOfRange {
            field: format!("{field}.units"),
            value: form.units,
            min: f64::MIN_POSITIVE,
            max: f64::MAX,
        });
    }
    let zz: f64 = form
        .counter_ions
        .iter()
        .map(|(ion, n)| f64::from(ion.charge() * ion.charge()) * n)
        .sum();
    Ok(FormInfo {
        q: counter_charge(form) / form.units,
        zz: zz / form.units,
        per_unit: 1.0 / form.units,
        form,
    })
}

/// Deprotonation level of a form per system unit: counter charge + z₀.
pub fn form_level(sys: &AcidSystem, form: &ReagentForm) -> f64 {
    if form.units > 0.0 {
        counter_charge(form) / form.units + f64::from(sys.z0)
    } else {
        f64::NAN
    }
}

/// The step (1-based) whose pK at `t_c` is nearest the target pH.
///
/// # Errors
///
/// Temperature outside the system's data.
pub fn nearest_step(sys: &AcidSystem, target_ph: f64, t_c: f64) -> Result<(usize, f64)> {
    nearest_of(sys, &system_pks(sys, t_c)?, target_ph)
}

/// [`nearest_step`] over pK values already computed.
fn nearest_of(sys: &AcidSystem, pks: &[f64], target_ph: f64) -> Result<(usize, f64)> {
    let mut best = (1usize, f64::NAN);
    let mut dist = f64::INFINITY;
    for (i, pk) in pks.iter().enumerate() {
        let d = (target_ph - pk).abs();
        if d < dist {
            dist = d;
            best = (i + 1, *pk);
        }
    }
    if best.1.is_nan() {
        return Err(SolverError::Unknown {
            kind: "dissociation step".into(),
            name: sys.id.clone(),
        });
    }
    Ok(best)
}

/// Suggest the acid and base forms of the adjacent pair that buffers the target:
/// forms whose deprotonation level is `k−1` and `k` for the nearest step `k`.
///
/// # Errors
///
/// Unknown system, temperature out of range, or no shelf forms at those levels.
pub fn suggest_pair(
    system: &str,
    target_ph: f64,
    t_c: f64,
    custom: &[AcidSystem],
) -> Result<(String, String)> {
    let sys = lookup(system, custom)?;
    let (k, _) = nearest_step(sys, target_ph, t_c)?;
    let pick = |level: f64| {
        sys.forms
            .iter()
            .filter(|f| (form_level(sys, f) - level).abs() < 1e-9)
            .map(|f| f.id.clone())
            .next()
    };
    let acid = pick(k as f64 - 1.0);
    let base = pick(k as f64);
    match (acid, base) {
        (Some(a), Some(b)) => Ok((a, b)),
        _ => Err(SolverError::Infeasible {
            field: "method".into(),
            reason: format!(
                "no shelf forms for both sides of step {k} of {}; choose the forms by hand",
                clip(&sys.name, QUOTE_MAX)
            ),
        }),
    }
}

fn validate(spec: &RecipeSpec) -> Result<()> {
    limits::TARGET_PH.check(spec.target_ph)?;
    limits::TEMPERATURE_C.check(spec.temperature_c)?;
    let c = non_negative("total_conc_m", spec.total_conc_m)?;
    if c <= 0.0 {
        return Err(SolverError::OutOfRange {
            field: "total_conc_m".into(),
            value: c,
            min: limits::TOTAL_CONC_M.min,
            max: limits::TOTAL_CONC_M.max,
        });
    }
    limits::TOTAL_CONC_M.check(c)?;
    limits::VOLUME_L.check(spec.volume_l)?;
    limits::TOLERANCE_PH.check(spec.tolerance_ph)?;
    if let Some(t) = spec.prepare_temperature_c {
        limits::PREPARE_TEMPERATURE_C.check(t)?;
    }
    if let Some(t) = spec.store_temperature_c {
        limits::STORE_TEMPERATURE_C.check(t)?;
    }
    limits::CONCENTRATE_FACTOR.check(spec.concentrate_factor)?;
    validate_salts(&spec.salts)?;
    // What a concentrate holds without solving anything: the buffer total and
    // the salts (the forms and titrant are checked once the recipe is known).
    let n = spec.concentrate_factor;
    if spec.total_conc_m * n > CONCENTRATE_MAX_M {
        return Err(too_concentrated(
            n,
            "the buffer (all its forms together)",
            spec.total_conc_m * n,
        ));
    }
    for s in &spec.salts {
        if s.conc_m * n > CONCENTRATE_MAX_M {
            return Err(too_concentrated(n, s.additive.formula(), s.conc_m * n));
        }
    }
    match &spec.method {
        Method::TwoForms { .. } => {}
        Method::Titrate {
            titrant, titrant_m, ..
        } => {
            limits::TITRANT_M.check(*titrant_m)?;
            if titrant.charge() == 0.0 {
                return Err(SolverError::Infeasible {
                    field: "method.titrant".into(),
                    reason: "the titrant must be a strong acid or base (HCl, NaOH, KOH)".into(),
                });
            }
        }
        Method::TwoStocks {
            acid_stock_m,
            base_stock_m,
            ..
        } => {
            limits::ACID_STOCK_M.check(*acid_stock_m)?;
            limits::BASE_STOCK_M.check(*base_stock_m)?;
        }
    }
    Ok(())
}

/// Check a recipe's salts: amounts finite and not negative, each salt
/// neutral and listed once. Fields are named `salts[i]...`.
///
/// # Errors
///
/// The first bad salt, by its index.
pub fn validate_salts(salts: &[AdditiveSpec]) -> Result<()> {
    for (i, s) in salts.iter().enumerate() {
        non_negative(&format!("salts[{i}].conc_m"), s.conc_m)?;
        if s.additive.charge() != 0.0 {
            return Err(SolverError::Infeasible {
                field: format!("salts[{i}].additive"),
                reason: "an added salt must be neutral (NaCl or KCl); use the titration method for acids and bases".into(),
            });
        }
        if let Some(j) = salts.iter().take(i).position(|o| o.additive == s.additive) {
            return Err(SolverError::Infeasible {
                field: format!("salts[{i}]"),
                reason: format!(
                    "{} is listed twice (rows {} and {}): a salt listed twice is refused, \
                     not merged; change or remove one of the two rows",
                    s.additive.formula(),
                    j + 1,
                    i + 1
                ),
            });
        }
    }
    Ok(())
}

/// The unknown's linear effect and the mixture at x = 0.
struct Setup {
    base: MixtureSpec,
    dcharge: f64,
    dz2: f64,
}

/// The method with its shelf forms looked up and checked, once per recipe.
enum Forms<'a> {
    /// Two forms of the system: weighed (`stocks: None`) or poured from
    /// stocks of the given molarities (acid, base).
    Pair {
        acid: FormInfo<'a>,
        base: FormInfo<'a>,
        stocks: Option<(f64, f64)>,
    },
    /// One form, titrated with a strong acid or base stock.
    Titrate {
        form: FormInfo<'a>,
        titrant: Additive,
        titrant_m: f64,
    },
}

fn resolve_forms<'a>(spec: &RecipeSpec, sys: &'a AcidSystem) -> Result<Forms<'a>> {
    let (acid_form, base_form, stocks) = match &spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        } => (acid_form, base_form, None),
        Method::TwoStocks {
            acid_form,
            acid_stock_m,
            base_form,
            base_stock_m,
        } => (acid_form, base_form, Some((*acid_stock_m, *base_stock_m))),
        Method::Titrate {
            form,
            titrant,
            titrant_m,
        } => {
            return Ok(Forms::Titrate {
                form: form_info(sys, form, "method.form")?,
                titrant: *titrant,
                titrant_m: *titrant_m,
            })
        }
    };
    let acid = form_info(sys, acid_form, "method.acid_form")?;
    let base = form_info(sys, base_form, "method.base_form")?;
    if (base.q - acid.q).abs() < 1e-12 {
        return Err(SolverError::Infeasible {
            field: "method.base_form".into(),
            reason:
                "the two forms carry the same protons; choose forms on either side of the target"
                    .into(),
        });
    }
    Ok(Forms::Pair { acid, base, stocks })
}

/// The recipe's solution before any buffer form goes in: temperature, model, salt.
fn empty_mixture(spec: &RecipeSpec) -> MixtureSpec {
    MixtureSpec {
        temperature_c: spec.temperature_c,
        activity: spec.activity,
        components: vec![],
        additives: spec.salts.clone(),
        atmosphere: None,
    }
}

fn component(sys: &AcidSystem, f: &FormInfo<'_>, conc_m: f64) -> ComponentSpec {
    ComponentSpec {
        system: sys.id.clone(),
        form: Some(f.form.id.clone()),
        conc_m,
    }
}

fn pour(formula: &str, name: &str, mol: f64, stock_m: f64) -> Ingredient {
    Ingredient {
        formula: formula.into(),
        name: name.into(),
        mol,
        molar_mass: None,
        grams: None,
        ml: Some(mol / stock_m * 1000.0),
        stock_m: Some(stock_m),
    }
}

/// Build the finished mixture and ingredient list for a value of the unknown.
fn finish(
    spec: &RecipeSpec,
    sys: &AcidSystem,
    forms: &Forms<'_>,
    x: f64,
    check: bool,
) -> Result<(MixtureSpec, Vec<Ingredient>)> {
    let c = spec.total_conc_m;
    let v = spec.volume_l;
    // Amounts are for the concentrate: N times the working buffer's, in the
    // same final volume (N = 1: the working buffer itself).
    let amt = v * spec.concentrate_factor;
    let mut mix = empty_mixture(spec);
    let mut ing = Vec::new();
    match forms {
        Forms::Pair {
            acid: a,
            base: b,
            stocks,
        } => {
            if check && !(-1e-9..=1.0 + 1e-9).contains(&x) {
                let side = if x < 0.0 {
                    "below what the acid form alone gives"
                } else {
                    "above what the base form alone gives"
                };
                return Err(SolverError::Infeasible {
                    field: "target_ph".into(),
                    reason: format!(
                        "the target pH is {side}; choose a more {} pair of forms",
                        if x < 0.0 { "acidic" } else { "basic" }
                    ),
                });
            }
            let x = x.clamp(0.0, 1.0);
            let na = (1.0 - x) * c * a.per_unit;
            let nb = x * c * b.per_unit;
            mix.components.push(component(sys, a, na));
            mix.components.push(component(sys, b, nb));
            if let Some((acid_stock_m, base_stock_m)) = *stocks {
                let ia = pour(&a.form.formula, &a.form.name, na * amt, acid_stock_m);
                let ib = pour(&b.form.formula, &b.form.name, nb * amt, base_stock_m);
                let total_ml = ia.ml.unwrap_or(0.0) + ib.ml.unwrap_or(0.0);
                if check && total_ml > v * 1000.0 * (1.0 + 1e-9) {
                    return Err(SolverError::Infeasible {
                        field: "method.acid_stock_m".into(),
                        reason: format!(
                            "the stocks are too dilute: they would need {total_ml:.1} mL for a {:.1} mL batch",
                            v * 1000.0
                        ),
                    });
                }
                ing.push(ia);
                ing.push(ib);
            } else {
                ing.push(weigh(&a.form.formula, &a.form.name, na * amt)?);
                ing.push(weigh(&b.form.formula, &b.form.name, nb * amt)?);
            }
        }
        Forms::Titrate {
            form: f,
            titrant,
            titrant_m,
        } => {
            let nf = c * f.per_unit;
            mix.components.push(component(sys, f, nf));
            if check && x < -1e-12 {
                let other = if titrant.charge() > 0.0 {
                    "a strong acid (HCl)"
                } else {
                    "a strong base (NaOH or KOH)"
                };
                return Err(SolverError::Infeasible {
                    field: "method.titrant".into(),
                    reason: format!(
                        "this form needs {other} to reach the target, not {}",
                        titrant.formula()
                    ),
                });
            }
            let x = x.max(0.0);
            mix.additives.push(AdditiveSpec {
                additive: *titrant,
                conc_m: x,
            });
            ing.push(weigh(&f.form.formula, &f.form.name, nf * amt)?);
            let t = pour(
                titrant.formula(),
                titrant_name(*titrant),
                x * amt,
                *titrant_m,
            );
            let t_ml = t.ml.unwrap_or(0.0);
            if check && steps::dissolving_ml(v * 1000.0, t_ml).is_none() {
                return Err(SolverError::Infeasible {
                    field: "method.titrant_m".into(),
                    reason: format!(
                        "the titrant is too dilute: {} of it leaves too little of the {} mL \
                         for dissolving the solids; use a stronger titrant (about {} M or \
                         more) or a smaller batch or concentrate",
                        format_volume_ml(t_ml),
                        sig(v * 1000.0, 4),
                        sig_trim(steps::titrant_that_fits(v * 1000.0, t_ml, *titrant_m), 2)
                    ),
                });
            }
            ing.push(t);
        }
    }
    for s in &spec.salts {
        if s.conc_m > 0.0 {
            ing.push(weigh(
                s.additive.formula(),
                titrant_name(s.additive),
                s.conc_m * amt,
            )?);
        }
    }
    Ok((mix, ing))
}

/// The refusal of a concentrate holding `c` mol/L of `what`.
fn too_concentrated(factor: f64, what: &str, c: f64) -> SolverError {
    SolverError::Infeasible {
        field: "concentrate_factor".into(),
        reason: format!(
            "the {}× concentrate would hold {} mol/L of {what}, above {CONCENTRATE_MAX_M} mol/L (a sanity bound for solubility); choose a smaller factor",
            sig_trim(factor, 3),
            sig(c, 3)
        ),
    }
}

/// The concentrate of a finished working buffer: every amount times the
/// factor; `None` for factor 1.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `concentrate_factor` when anything in the
/// concentrate (a form, the buffer's total, a salt or titrant) would pass
/// [`CONCENTRATE_MAX_M`].
fn concentrate_of(
    spec: &RecipeSpec,
    sys: &AcidSystem,
    working: &MixtureSpec,
) -> Result<Option<MixtureSpec>> {
    let factor = spec.concentrate_factor;
    if factor == 1.0 {
        return Ok(None);
    }
    let mut m = working.clone();
    let too_much = |what: &str, c: f64| too_concentrated(factor, what, c);
    let total = spec.total_conc_m * factor;
    if total > CONCENTRATE_MAX_M {
        let what = format!("{} (all its forms together)", clip(&sys.name, QUOTE_MAX));
        return Err(too_much(&what, total));
    }
    for c in &mut m.components {
        c.conc_m *= factor;
        if c.conc_m > CONCENTRATE_MAX_M {
            let what = c
                .form
                .as_deref()
                .and_then(|f| find_form(sys, f))
                .map_or(sys.name.as_str(), |f| f.name.as_str());
            return Err(too_much(&clip(what, QUOTE_MAX), c.conc_m));
        }
    }
    for a in &mut m.additives {
        a.conc_m *= factor;
        if a.conc_m > CONCENTRATE_MAX_M {
            return Err(too_much(a.additive.formula(), a.conc_m));
        }
    }
    Ok(Some(m))
}

fn setup(spec: &RecipeSpec, sys: &AcidSystem, forms: &Forms<'_>) -> Setup {
    let c = spec.total_conc_m;
    let mut base = empty_mixture(spec);
    let (dcharge, dz2) = match forms {
        Forms::Pair { acid, base: b, .. } => {
            base.components
                .push(component(sys, acid, c * acid.per_unit));
            (c * (b.q - acid.q), c * (b.zz - acid.zz))
        }
        Forms::Titrate { form, titrant, .. } => {
            base.components
                .push(component(sys, form, c * form.per_unit));
            (titrant.charge(), 1.0)
        }
    };
    Setup { base, dcharge, dz2 }
}

/// Solve a recipe exactly, with the Henderson–Hasselbalch estimate beside it.
///
/// # Errors
///
/// Field-named validation errors; [`SolverError::Infeasible`] when the chosen
/// reagents cannot reach the target (wrong side of the pair, wrong titrant,
/// stocks too dilute).
///
/// # Example
///
/// ```
/// use solver::recipe::{solve_recipe, RecipeSpec, Method};
/// use solver::equilibrium::activity::ActivityModel;
/// let spec = RecipeSpec {
///     system: "phosphate".into(),
///     target_ph: 7.4,
///     temperature_c: 37.0,
///     total_conc_m: 0.05,
///     volume_l: 0.5,
///     salts: vec![],
///     activity: ActivityModel::Davies,
///     method: Method::TwoForms {
///         acid_form: "nah2po4_h2o".into(),
///         base_form: "na2hpo4_7h2o".into(),
///     },
///     tolerance_ph: 0.05,
///     prepare_temperature_c: None,
///     concentrate_factor: 1.0,
///     atmosphere: None,
///     store_temperature_c: None,
/// };
/// let r = solve_recipe(&spec, &[])?;
/// assert!((r.equilibrium.ph - 7.4).abs() < 1e-6);
/// let grams: f64 = r.ingredients.iter().filter_map(|i| i.grams).sum();
/// assert!(grams > 1.0 && grams < 10.0);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn solve_recipe(spec: &RecipeSpec, custom: &[AcidSystem]) -> Result<RecipeResult> {
    validate(spec)?;
    if spec.atmosphere.is_some() {
        return gas::solve_gas_recipe(spec, custom);
    }
    let sys = lookup(&spec.system, custom)?;
    if let Some(t) = spec.prepare_temperature_c {
        in_range("prepare_temperature_c", t, sys.t_min_c, sys.t_max_c)?;
    }
    let pks = system_pks(sys, spec.temperature_c)?;
    let (k, pk) = nearest_of(sys, &pks, spec.target_ph)?;
    let forms = resolve_forms(spec, sys)?;
    let st = setup(spec, sys, &forms);
    let prepared = prepare(&st.base, custom)?;
    let (x, _) = solve_addition(&prepared.composition, spec.target_ph, st.dcharge, st.dz2)?;
    let (mixture, ingredients) = finish(spec, sys, &forms, x, true)?;
    let concentrated = concentrate_of(spec, sys, &mixture)?;
    let p = prepare(&mixture, custom)?;
    let eq = solve(&p.composition, spec.target_ph)?;
    let tol = tolerance(&p, &eq, spec.tolerance_ph)?;
    // Past the activity model's range the concentrate's own pH is not
    // predicted (a wrong number is worse than none): the meter check moves
    // to a portion diluted to working strength, which is the working buffer.
    let concentrate = match &concentrated {
        Some(m) => {
            let e = prepare(m, custom)?.solve()?;
            let beyond = spec.activity == ActivityModel::Davies && e.ionic_strength > DAVIES_LIMIT;
            Some(ConcentrateResult {
                factor: spec.concentrate_factor,
                ph: (!beyond).then_some(e.ph),
                ionic_strength: e.ionic_strength,
            })
        }
        None => None,
    };
    // The meter reads the solution being made (the concentrate, if any) at
    // the preparation temperature.
    let t_prep = spec.prepare_temperature_c.unwrap_or(spec.temperature_c);
    let (read, solution, vessel_ph) = match (concentrated, concentrate.and_then(|c| c.ph)) {
        (Some(m), Some(ph)) => (m, MeterSolution::Concentrate, ph),
        (Some(_), None) => (mixture.clone(), MeterSolution::DilutedPortion, eq.ph),
        (None, _) => (mixture.clone(), MeterSolution::WorkingBuffer, eq.ph),
    };
    let meter_ph = if t_prep == spec.temperature_c {
        vessel_ph
    } else {
        let mut m = read;
        m.temperature_c = t_prep;
        solve(&prepare(&m, custom)?.composition, vessel_ph)?.ph
    };
    let meter = MeterReading {
        temperature_c: t_prep,
        ph: meter_ph,
        solution,
    };

    // Henderson–Hasselbalch: share f of level k, rest at k−1, spectator
    // charge S = C (k − 1 + f − z₀); ideal, no water terms.
    let r = 10f64.powf(spec.target_ph - pk);
    let f = r / (1.0 + r);
    let s_hh = spec.total_conc_m * (k as f64 - 1.0 + f - f64::from(sys.z0));
    let x_hh = (s_hh - prepared.composition.spectator_charge) / st.dcharge;
    let estimate = match finish(spec, sys, &forms, x_hh, true) {
        Ok((mix_hh, ing_hh)) => {
            let actual = prepare(&mix_hh, custom)
                .and_then(|p| p.solve())
                .ok()
                .map(|e| e.ph);
            Estimate {
                pk,
                base_fraction: f,
                ingredients: ing_hh,
                actual_ph: actual,
            }
        }
        Err(_) => Estimate {
            pk,
            base_fraction: f,
            ingredients: vec![],
            actual_ph: None,
        },
    };

    let mut warnings = Vec::new();
    let nearest = (spec.target_ph - pk).abs();
    if nearest > 1.0 {
        warnings.push(RecipeWarning::FarFromPk {
            distance: nearest,
            pk,
        });
    }
    if spec.activity == ActivityModel::Davies && eq.ionic_strength > DAVIES_LIMIT {
        warnings.push(RecipeWarning::IonicStrengthBeyondModel {
            ionic_strength: eq.ionic_strength,
        });
    }
    if let Some(a) = estimate.actual_ph {
        let d = a - spec.target_ph;
        if d.abs() > 0.05 {
            warnings.push(RecipeWarning::EstimateOff { difference: d });
        }
    }
    if let Some(c) = concentrate.filter(|c| c.ph.is_none()) {
        warnings.push(RecipeWarning::ConcentrateBeyondModel {
            factor: c.factor,
            ionic_strength: c.ionic_strength,
        });
    }
    let undissolved = solubility::recipe_warnings(spec, &ingredients, t_prep)?;
    warnings.extend(undissolved);
    let steps = if concentrate.is_none() && t_prep == spec.temperature_c {
        steps_text(spec, &ingredients)
    } else {
        bench_steps(
            spec,
            &ingredients,
            &meter,
            concentrate.map(|c| c.ionic_strength),
        )
    };
    Ok(RecipeResult {
        ingredients,
        steps,
        equilibrium: eq,
        tolerance: tol,
        pks,
        step: k,
        estimate,
        warnings,
        mixture,
        meter,
        concentrate,
    })
}
