//! First-order budget of a recipe's or mixture's pH: the inputs, their sensitivities through the full solver, and the warnings drawn from the result.

use super::inputs::{suggested_flask_ml, suggested_pour_ml, UncertaintyInputs};
use super::pk::{pk_uncertainty, DEFAULT_U_PK};
use super::terms::{
    BudgetRow, Distribution, Uncertainty, UncertaintyWarning, COVERAGE_FACTOR, SQRT3,
};
use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::solve;
use crate::error::{in_range, Result};
use crate::mixture::{lookup, prepare, MixtureSpec};
use crate::recipe::{RecipeResult, RecipeSpec};
use crate::system::library::find_form;
use crate::system::AcidSystem;

#[derive(Debug, Clone)]
enum Effect {
    /// pK of step `step` of acid `acid` (prepared order), delta in pK.
    Pk { acid: usize, step: usize },
    /// Temperature, delta in K.
    Temperature,
    /// Concentrations of these components and additives scale by 1 + δ/nominal.
    Scale {
        components: Vec<usize>,
        additives: Vec<usize>,
    },
    /// Final volume: every concentration scales by 1/(1 + δ/nominal).
    Volume,
    /// Added to the pH directly.
    Offset,
}

#[derive(Debug, Clone)]
pub(super) struct Input {
    name: String,
    unit: String,
    pub(super) u: f64,
    nominal: f64,
    pub(super) dist: Distribution,
    source: String,
    effect: Effect,
    /// Mass to weigh (g), for the small-mass warning.
    grams: Option<(String, f64)>,
}

pub(super) struct Model<'a> {
    base: MixtureSpec,
    custom: &'a [AcidSystem],
    pub(super) inputs: Vec<Input>,
    ph0: f64,
}

impl Model<'_> {
    pub(super) fn eval(&self, deltas: &[f64]) -> Result<f64> {
        let mut spec = self.base.clone();
        let mut offset = 0.0;
        let mut volume = 1.0;
        let mut pk_shift: Vec<(usize, usize, f64)> = Vec::new();
        for (inp, &d) in self.inputs.iter().zip(deltas) {
            if d == 0.0 {
                continue;
            }
            match &inp.effect {
                Effect::Temperature => spec.temperature_c += d,
                Effect::Offset => offset += d,
                Effect::Volume => volume *= 1.0 + d / inp.nominal,
                Effect::Pk { acid, step } => pk_shift.push((*acid, *step, d)),
                Effect::Scale {
                    components,
                    additives,
                } => {
                    let f = 1.0 + d / inp.nominal;
                    for i in components {
                        if let Some(c) = spec.components.get_mut(*i) {
                            c.conc_m *= f;
                        }
                    }
                    for i in additives {
                        if let Some(a) = spec.additives.get_mut(*i) {
                            a.conc_m *= f;
                        }
                    }
                }
            }
        }
        if volume != 1.0 {
            for c in &mut spec.components {
                c.conc_m /= volume;
            }
            for a in &mut spec.additives {
                a.conc_m /= volume;
            }
        }
        let mut p = prepare(&spec, self.custom)?;
        for (a, s, d) in pk_shift {
            if let Some(k) = p
                .composition
                .acids
                .get_mut(a)
                .and_then(|acid| acid.ka.get_mut(s))
            {
                *k *= 10f64.powf(-d);
            }
        }
        Ok(solve(&p.composition, self.ph0)?.ph + offset)
    }

    /// Central difference ∂pH/∂x_i; one-sided where a side leaves the
    /// data's range (temperature near its limit).
    fn sensitivity(&self, i: usize) -> Result<f64> {
        let Some(inp) = self.inputs.get(i) else {
            return Ok(0.0);
        };
        if matches!(inp.effect, Effect::Offset) {
            return Ok(1.0);
        }
        let h = match inp.effect {
            Effect::Pk { .. } => 1e-3,
            Effect::Temperature => 0.05,
            _ => 1e-4 * inp.nominal,
        };
        let at = |d: f64| {
            let mut v = vec![0.0; self.inputs.len()];
            if let Some(x) = v.get_mut(i) {
                *x = d;
            }
            self.eval(&v)
        };
        match (at(h), at(-h)) {
            (Ok(p), Ok(m)) => Ok((p - m) / (2.0 * h)),
            (Ok(p), Err(_)) => Ok((p - self.ph0) / h),
            (Err(_), Ok(m)) => Ok((self.ph0 - m) / h),
            (Err(e), Err(_)) => Err(e),
        }
    }

    fn budget(&self) -> Result<Vec<BudgetRow>> {
        let mut rows = Vec::with_capacity(self.inputs.len());
        for (i, inp) in self.inputs.iter().enumerate() {
            let c = self.sensitivity(i)?;
            rows.push(BudgetRow {
                input: inp.name.clone(),
                u_input: inp.u,
                unit: inp.unit.clone(),
                sensitivity: c,
                u_ph: (c * inp.u).abs(),
                share: 0.0,
                distribution: inp.dist,
                source: inp.source.clone(),
            });
        }
        Ok(rows)
    }
}

fn finish(
    model: &Model<'_>,
    mut rows: Vec<BudgetRow>,
    tolerance_ph: Option<f64>,
    balance_g: f64,
) -> Uncertainty {
    let var: f64 = rows.iter().map(|r| r.u_ph * r.u_ph).sum();
    for r in &mut rows {
        r.share = if var > 0.0 {
            r.u_ph * r.u_ph / var
        } else {
            0.0
        };
    }
    let u = var.sqrt();
    let mut warnings = Vec::new();
    if let Some(tol) = tolerance_ph {
        let pk_var: f64 = model
            .inputs
            .iter()
            .zip(&rows)
            .filter(|(inp, _)| matches!(inp.effect, Effect::Pk { .. }))
            .map(|(_, r)| r.u_ph * r.u_ph)
            .sum();
        let u95_pk = COVERAGE_FACTOR * pk_var.sqrt();
        if u95_pk > tol {
            warnings.push(UncertaintyWarning::PkExceedsTolerance {
                u95_pk,
                tolerance_ph: tol,
            });
        } else if COVERAGE_FACTOR * u > tol {
            warnings.push(UncertaintyWarning::ExceedsTolerance {
                u95_ph: COVERAGE_FACTOR * u,
                tolerance_ph: tol,
            });
        }
    }
    for (inp, r) in model.inputs.iter().zip(&rows) {
        if let Some((formula, grams)) = &inp.grams {
            // Readability at least 1 % of the mass, or this weighing carries
            // half the pH variance or more.
            if balance_g > 0.0 && (balance_g >= 0.01 * grams || r.share >= 0.5) {
                warnings.push(UncertaintyWarning::SmallMass {
                    ingredient: formula.clone(),
                    grams: *grams,
                    readability_g: balance_g,
                    share: r.share,
                });
            }
        }
    }
    crate::order::sort_by(&mut rows, |a, b| b.u_ph.total_cmp(&a.u_ph));
    let notes = warnings.iter().map(UncertaintyWarning::text).collect();
    Uncertainty {
        u95_ph: COVERAGE_FACTOR * u,
        u_ph: u,
        coverage_factor: COVERAGE_FACTOR,
        budget: rows,
        warnings,
        notes,
    }
}

/// pK, activity and temperature inputs common to recipes and mixtures.
fn common_inputs(
    spec: &MixtureSpec,
    custom: &[AcidSystem],
    inputs: &UncertaintyInputs,
    ph0: f64,
    ionic: f64,
) -> Result<Vec<Input>> {
    let p = prepare(spec, custom)?;
    let mut out = Vec::new();
    for (a, (acid, sys)) in p.composition.acids.iter().zip(&p.systems).enumerate() {
        for s in 0..acid.n {
            let (u, source) = if custom.iter().any(|c| c.id == sys.id) {
                (
                    DEFAULT_U_PK,
                    "estimate for a user-defined constant".to_string(),
                )
            } else {
                let (u, src) = pk_uncertainty(&sys.id, s + 1);
                (u, src.to_string())
            };
            out.push(Input {
                name: format!("pK{} of {}", s + 1, sys.name),
                unit: "pK".into(),
                u,
                nominal: 0.0,
                dist: Distribution::Normal,
                source,
                effect: Effect::Pk { acid: a, step: s },
                grams: None,
            });
        }
    }
    if inputs.activity_allowance {
        let (u, source) = match spec.activity {
            ActivityModel::Davies if ionic > DAVIES_LIMIT => {
                // Past its range Davies turns over (its linear term takes
                // over) and can be wrong in sign: a 10× saline phosphate
                // reads well below its 1× buffer at the bench while Davies
                // puts it above. Allow the electrostatic correction itself,
                // A·|z_B² − z_HA²|·√I/(1+√I) for the step nearest the pH (the
                // Davies equation without its linear term), as a rectangular
                // half-width on top of the usual allowance.
                let half = electrostatic_shift(&p.composition, ph0, ionic);
                (
                    inputs.activity_base_ph + inputs.activity_per_ionic * ionic + half / SQRT3,
                    format!(
                        "estimate: past the Davies range (I {} > {DAVIES_LIMIT} mol/L) ±{} pH, \
                         the whole electrostatic correction A·Δz²·√I/(1+√I), is allowed on \
                         top of {} + {}·I pH",
                        crate::fmt::sig(ionic, 3),
                        crate::fmt::sig(half, 2),
                        inputs.activity_base_ph,
                        inputs.activity_per_ionic
                    ),
                )
            }
            ActivityModel::Davies => (
                inputs.activity_base_ph + inputs.activity_per_ionic * ionic,
                format!(
                    "estimate: {} + {}·I pH (Davies against pH(S) standards)",
                    inputs.activity_base_ph, inputs.activity_per_ionic
                ),
            ),
            ActivityModel::Ideal => {
                let mut d = spec.clone();
                d.activity = ActivityModel::Davies;
                let davies = prepare(&d, custom)?.solve()?.ph;
                (
                    inputs.activity_base_ph + (davies - ph0).abs(),
                    "estimate: the ideal model's whole activity correction (Davies − ideal) \
                     plus the base allowance"
                        .to_string(),
                )
            }
        };
        out.push(Input {
            name: "activity model".into(),
            unit: "pH".into(),
            u,
            nominal: 0.0,
            dist: Distribution::Normal,
            source,
            effect: Effect::Offset,
            grams: None,
        });
    }
    out.push(Input {
        name: "temperature".into(),
        unit: "K".into(),
        u: inputs.temperature_k / SQRT3,
        nominal: spec.temperature_c,
        dist: Distribution::Rectangular,
        source: format!("±{} K as entered", inputs.temperature_k),
        effect: Effect::Temperature,
        grams: None,
    });
    Ok(out)
}

/// The largest pH shift the Debye–Hückel charge term makes at `ionic` for
/// the dissociation step nearest `ph` of any acid in the composition:
/// `A·|z_B² − z_HA²|·√I/(1+√I)`, with z_HA = z0 − s and z_B = z0 − s − 1
/// (so |z_B² − z_HA²| = |2(z0 − s) − 1|: 3 for phosphate's second step, 1
/// for Tris). Zero without acids.
fn electrostatic_shift(c: &crate::equilibrium::Composition, ph: f64, ionic: f64) -> f64 {
    let s = ionic.max(0.0).sqrt();
    let b = s / (1.0 + s);
    c.acids
        .iter()
        .filter_map(|a| {
            (0..a.n.min(a.ka.len()))
                .filter_map(|k| {
                    let ka = *a.ka.get(k)?;
                    (ka > 0.0).then(|| ((-ka.log10() - ph).abs(), k))
                })
                .min_by(|x, y| x.0.total_cmp(&y.0))
                .map(|(_, k)| {
                    let z_ha = a.z0 - k as i32;
                    f64::from((2 * z_ha - 1).abs()) * c.a_dh * b
                })
        })
        .fold(0.0, f64::max)
}

fn keep_nonzero(v: Vec<Input>) -> Vec<Input> {
    v.into_iter()
        .filter(|i| i.u > 0.0 && i.u.is_finite())
        .collect()
}

/// Formula of each component's form (`None` for a bare system).
fn component_formulas(spec: &MixtureSpec, custom: &[AcidSystem]) -> Result<Vec<Option<String>>> {
    spec.components
        .iter()
        .map(|c| {
            let sys = lookup(&c.system, custom)?;
            Ok(c.form
                .as_ref()
                .and_then(|f| find_form(sys, f))
                .map(|f| f.formula.clone()))
        })
        .collect()
}

pub(super) fn recipe_model<'a>(
    spec: &RecipeSpec,
    result: &RecipeResult,
    inputs: &UncertaintyInputs,
    custom: &'a [AcidSystem],
) -> Result<Model<'a>> {
    inputs.validate()?;
    in_range("volume_l", spec.volume_l, 1e-6, 1000.0)?;
    let mix = &result.mixture;
    let ph0 = result.equilibrium.ph;
    let mut list = common_inputs(mix, custom, inputs, ph0, result.equilibrium.ionic_strength)?;
    let formulas = component_formulas(mix, custom)?;
    let balance_g = inputs.balance_mg / 1000.0;
    for ing in &result.ingredients {
        let components: Vec<usize> = formulas
            .iter()
            .enumerate()
            .filter(|(_, f)| f.as_deref() == Some(ing.formula.as_str()))
            .map(|(i, _)| i)
            .collect();
        let additives: Vec<usize> = mix
            .additives
            .iter()
            .enumerate()
            .filter(|(_, a)| a.additive.formula() == ing.formula)
            .map(|(i, _)| i)
            .collect();
        let scale = || Effect::Scale {
            components: components.clone(),
            additives: additives.clone(),
        };
        if let Some(g) = ing.grams.filter(|g| *g > 0.0) {
            list.push(Input {
                name: format!("mass of {}", ing.formula),
                unit: "g".into(),
                u: balance_g / SQRT3,
                nominal: g,
                dist: Distribution::Rectangular,
                source: format!("balance readability ±{} mg as entered", inputs.balance_mg),
                effect: scale(),
                grams: Some((ing.formula.clone(), g)),
            });
        } else if let Some(ml) = ing.ml.filter(|m| *m > 0.0) {
            let (tol, src) = match inputs.pour_percent {
                Some(p) => (p / 100.0 * ml, format!("±{p} % as entered")),
                None => (
                    suggested_pour_ml(ml),
                    "class A pipette (ISO 648, from memory), suggested".to_string(),
                ),
            };
            list.push(Input {
                name: format!("volume of {} stock", ing.formula),
                unit: "mL".into(),
                u: tol / SQRT3,
                nominal: ml,
                dist: Distribution::Rectangular,
                source: src,
                effect: scale(),
                grams: None,
            });
            if let Some(m) = ing.stock_m.filter(|m| *m > 0.0) {
                list.push(Input {
                    name: format!("molarity of {} stock", ing.formula),
                    unit: "mol/L".into(),
                    u: inputs.stock_percent / 100.0 * m / SQRT3,
                    nominal: m,
                    dist: Distribution::Rectangular,
                    source: format!("±{} % as entered (estimate)", inputs.stock_percent),
                    effect: scale(),
                    grams: None,
                });
            }
        }
    }
    let v_ml = spec.volume_l * 1000.0;
    let (tol, src) = match inputs.flask_ml {
        Some(t) => (t, format!("±{t} mL as entered")),
        None => (
            suggested_flask_ml(v_ml),
            "class A volumetric flask (ISO 1042, from memory), suggested".to_string(),
        ),
    };
    list.push(Input {
        name: "final volume (flask)".into(),
        unit: "mL".into(),
        u: tol / SQRT3,
        nominal: v_ml,
        dist: Distribution::Rectangular,
        source: src,
        effect: Effect::Volume,
        grams: None,
    });
    Ok(Model {
        base: mix.clone(),
        custom,
        inputs: keep_nonzero(list),
        ph0,
    })
}

/// Uncertainty of a recipe's predicted pH: pK data, activity model,
/// temperature, each weighing, each poured volume and stock molarity, and
/// the flask. Warnings compare it with the recipe's tolerance window.
///
/// # Errors
///
/// Field-named errors for bad [`UncertaintyInputs`]; solver failures.
pub fn recipe_uncertainty(
    spec: &RecipeSpec,
    result: &RecipeResult,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
) -> Result<Uncertainty> {
    let model = recipe_model(spec, result, inputs, custom)?;
    let rows = model.budget()?;
    Ok(finish(
        &model,
        rows,
        Some(spec.tolerance_ph),
        inputs.balance_mg / 1000.0,
    ))
}

pub(super) fn mixture_model<'a>(
    spec: &MixtureSpec,
    inputs: &UncertaintyInputs,
    custom: &'a [AcidSystem],
) -> Result<Model<'a>> {
    inputs.validate()?;
    let eq = prepare(spec, custom)?.solve()?;
    let mut list = common_inputs(spec, custom, inputs, eq.ph, eq.ionic_strength)?;
    let rel = inputs.concentration_percent / 100.0 / SQRT3;
    for (i, c) in spec.components.iter().enumerate() {
        if c.conc_m > 0.0 {
            list.push(Input {
                name: format!(
                    "concentration of {} ({})",
                    c.form.as_deref().unwrap_or(&c.system),
                    c.system
                ),
                unit: "mol/L".into(),
                u: rel * c.conc_m,
                nominal: c.conc_m,
                dist: Distribution::Rectangular,
                source: format!("±{} % as entered", inputs.concentration_percent),
                effect: Effect::Scale {
                    components: vec![i],
                    additives: vec![],
                },
                grams: None,
            });
        }
    }
    for (i, a) in spec.additives.iter().enumerate() {
        if a.conc_m > 0.0 {
            list.push(Input {
                name: format!("concentration of {}", a.additive.formula()),
                unit: "mol/L".into(),
                u: rel * a.conc_m,
                nominal: a.conc_m,
                dist: Distribution::Rectangular,
                source: format!("±{} % as entered", inputs.concentration_percent),
                effect: Effect::Scale {
                    components: vec![],
                    additives: vec![i],
                },
                grams: None,
            });
        }
    }
    Ok(Model {
        base: spec.clone(),
        custom,
        inputs: keep_nonzero(list),
        ph0: eq.ph,
    })
}

/// Uncertainty of a mixture's (flask's) pH: pK data, activity model,
/// temperature and each entered concentration. With a `tolerance_ph` the
/// same warnings as a recipe's are drawn.
///
/// # Errors
///
/// Field-named errors for bad inputs; solver failures.
pub fn mixture_uncertainty(
    spec: &MixtureSpec,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
    tolerance_ph: Option<f64>,
) -> Result<Uncertainty> {
    let model = mixture_model(spec, inputs, custom)?;
    let rows = model.budget()?;
    Ok(finish(&model, rows, tolerance_ph, 0.0))
}
