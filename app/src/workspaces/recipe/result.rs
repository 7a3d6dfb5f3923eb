//! The recipe card: amounts and steps from the solver, the headline, the
//! plain-text copy, bench plausibility checks, cautions and the print sheet.

use super::sheet::meter_of;
use crate::state::use_app;
use crate::widgets::cautions::{cautions_for, corrosive_only_if, Caution};
use crate::widgets::format::{
    error_message, fmt_capacity, fmt_conc, fmt_dph, fmt_input, fmt_ph, fmt_sig, pretty_formula,
};
use leptos::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::equilibrium::Warning;
use solver::fmt::{format_mass, format_volume_ml};
use solver::mixture::{lookup, Additive};
use solver::recipe::{Ingredient, Method, RecipeResult, RecipeSpec, RecipeWarning};
use solver::system::AcidSystem;
use solver::SolverError;
use wasm_bindgen::{closure::Closure, JsValue};

/// The amount column of an ingredient: mass to weigh or volume to pour.
pub fn amount_text(i: &Ingredient) -> String {
    match (i.grams, i.ml) {
        (Some(g), _) => format_mass(g),
        (None, Some(ml)) => format_volume_ml(ml),
        _ => "—".into(),
    }
}

/// The recipe's answer in one line: the amounts, the pH at the working
/// temperature and, when it differs, what the meter reads where it is made.
pub fn answer_line(spec: &RecipeSpec, r: &RecipeResult) -> String {
    let amounts: Vec<String> = r
        .ingredients
        .iter()
        .map(|i| format!("{} {}", amount_text(i), pretty_formula(&i.formula)))
        .collect();
    let mut line = format!(
        "{} · pH {} at {} °C",
        amounts.join(" + "),
        fmt_ph(r.equilibrium.ph),
        fmt_input(spec.temperature_c)
    );
    if (r.meter.temperature_c - spec.temperature_c).abs() > 1e-9 || r.concentrate.is_some() {
        let of = meter_of(spec, r);
        line.push_str(&format!(
            " · meter {} at {} °C{}",
            fmt_ph(r.meter.ph),
            fmt_input(r.meter.temperature_c),
            if of.is_empty() {
                String::new()
            } else {
                format!(" ({of})")
            }
        ));
    }
    line
}

/// The solubility warnings of one weighed formula, shown in its own row
/// (beside the amount, not only among the notes).
fn undissolved(warnings: &[RecipeWarning], formula: &str) -> Option<String> {
    let t: Vec<String> = warnings
        .iter()
        .filter(|w| matches!(w, RecipeWarning::Solubility { formula: f, .. } if f == formula))
        .map(RecipeWarning::message)
        .collect();
    (!t.is_empty()).then(|| t.join(" "))
}

/// The concentrate's own figures: its pH where the activity model holds,
/// and its ionic strength.
pub(crate) fn concentrate_text(c: &solver::recipe::ConcentrateResult) -> String {
    let ph = c.ph.map_or_else(
        || "pH not predicted (past the activity model's range)".to_string(),
        |p| format!("pH {}", fmt_ph(p)),
    );
    format!("{ph} · I {}", fmt_conc(c.ionic_strength))
}

/// Above these a bench recipe is probably a unit slip (common practice of
/// the page, not chemistry): 20 L of final volume, 1 kg of one reagent, 2 M
/// of buffer.
pub const BENCH_VOLUME_L: f64 = 20.0;
/// See [`BENCH_VOLUME_L`].
pub const BENCH_MASS_G: f64 = 1000.0;
/// See [`BENCH_VOLUME_L`].
pub const BENCH_CONC_M: f64 = 2.0;

/// "Check the unit" warnings for amounts that are implausible at a bench.
pub fn bench_checks(spec: &RecipeSpec, ingredients: &[Ingredient]) -> Vec<String> {
    let mut out = Vec::new();
    if spec.volume_l > BENCH_VOLUME_L {
        out.push(format!(
            "Check the unit: a final volume of {} is more than a bench batch (over {} L).",
            format_volume_ml(spec.volume_l * 1000.0),
            fmt_input(BENCH_VOLUME_L)
        ));
    }
    if spec.total_conc_m > BENCH_CONC_M {
        out.push(format!(
            "Check the unit: {} of buffer is unusually strong (over {} M).",
            fmt_conc(spec.total_conc_m),
            fmt_input(BENCH_CONC_M)
        ));
    }
    for i in ingredients {
        if i.grams.is_some_and(|g| g > BENCH_MASS_G) {
            out.push(format!(
                "Check the unit: {} of {} is more than 1 kg.",
                amount_text(i),
                pretty_formula(&i.formula)
            ));
        }
    }
    out
}

/// Plain-language text of a recipe warning.
pub fn warning_text(w: &RecipeWarning) -> String {
    match w {
        RecipeWarning::FarFromPk { distance, pk } => format!(
            "The target is {} pH units from the nearest pK ({}): this buffer has little capacity there. Consider another system.",
            fmt_sig(*distance, 2),
            fmt_ph(*pk)
        ),
        RecipeWarning::IonicStrengthBeyondModel { ionic_strength } => format!(
            "Ionic strength {} is beyond the range the Davies equation is trusted in (about 0.5 M): treat the predicted pH as approximate and check with a meter.",
            fmt_conc(*ionic_strength)
        ),
        RecipeWarning::EstimateOff { difference } => format!(
            "The Henderson–Hasselbalch estimate would miss the target by {} pH: weigh the exact amounts above.",
            fmt_dph(*difference)
        ),
        RecipeWarning::ConcentrateBeyondModel { .. } | RecipeWarning::Solubility { .. } => {
            w.message()
        }
    }
}

pub(crate) fn additive_name(a: Additive) -> &'static str {
    match a {
        Additive::Hcl => "HCl",
        Additive::Naoh => "NaOH",
        Additive::Koh => "KOH",
        Additive::Nacl => "NaCl",
        Additive::Kcl => "KCl",
    }
}

/// The recipe as plain text (for the clipboard).
pub fn recipe_text(
    name: &str,
    date: &str,
    spec: &RecipeSpec,
    r: &RecipeResult,
    system: &str,
) -> String {
    let mut out = String::new();
    out.push_str(&format!("{name}\n"));
    if !date.is_empty() {
        out.push_str(&format!("Date: {date}\n"));
    }
    out.push_str(&format!(
        "{system} buffer, {} total, pH {} at {} °C, {} final volume\n\n",
        fmt_conc(spec.total_conc_m),
        fmt_ph(spec.target_ph),
        fmt_input(spec.temperature_c),
        format_volume_ml(spec.volume_l * 1000.0)
    ));
    out.push_str("Reagents:\n");
    for i in &r.ingredients {
        out.push_str(&format!(
            "- {}  {} ({})\n",
            amount_text(i),
            i.formula,
            i.name
        ));
    }
    out.push_str("\nSteps:\n");
    for (n, s) in r.steps.iter().enumerate() {
        out.push_str(&format!("{}. {s}\n", n + 1));
    }
    out.push_str(&format!(
        "\nPredicted pH {} (ionic strength {}, buffer capacity {}).\n",
        fmt_ph(r.equilibrium.ph),
        fmt_conc(r.equilibrium.ionic_strength),
        fmt_capacity(r.equilibrium.capacity)
    ));
    out.push_str(&format!(
        "Stays within ±{} pH until about {} mmol/L strong acid or {} mmol/L strong base is added.\n",
        fmt_sig(r.tolerance.window, 2),
        fmt_sig(r.tolerance.acid_mmol_per_l, 3),
        fmt_sig(r.tolerance.base_mmol_per_l, 3)
    ));
    for w in &r.warnings {
        out.push_str(&format!("Note: {}\n", warning_text(w)));
    }
    out
}

pub(crate) fn recipe_cautions(spec: &RecipeSpec, custom: &[AcidSystem]) -> Vec<Caution> {
    let sys = lookup(&spec.system, custom).ok();
    let form_ids: Vec<&str> = match &spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => vec![acid_form, base_form],
        Method::Titrate { form, .. } => vec![form],
    };
    let formulas: Vec<&str> = sys
        .map(|s| {
            s.forms
                .iter()
                .filter(|f| form_ids.contains(&f.id.as_str()))
                .map(|f| f.formula.as_str())
                .collect()
        })
        .unwrap_or_default();
    let additives: Vec<Additive> = match &spec.method {
        Method::Titrate { titrant, .. } => vec![*titrant],
        _ => vec![],
    };
    let free_form = sys.is_some_and(|s| {
        s.forms
            .iter()
            .any(|f| form_ids.contains(&f.id.as_str()) && f.counter_ions.is_empty())
    });
    corrosive_only_if(cautions_for(sys, &formulas, &additives), free_form)
}

pub(crate) fn today() -> String {
    let d = js_sys::Date::new_0();
    let iso: String = d.to_iso_string().into();
    iso.get(..10).unwrap_or_default().to_string()
}

/// Copy `text` to the clipboard; `done` receives whether it worked.
pub(crate) fn copy_to_clipboard(text: &str, done: impl Fn(bool) + 'static) {
    let nav = window().navigator();
    let has = js_sys::Reflect::get(&nav, &JsValue::from_str("clipboard"))
        .map(|c| !c.is_undefined() && !c.is_null())
        .unwrap_or(false);
    if !has {
        done(false);
        return;
    }
    let promise = nav.clipboard().write_text(text);
    let done = std::rc::Rc::new(done);
    let d1 = done.clone();
    let ok = Closure::<dyn FnMut(JsValue)>::new(move |_: JsValue| d1(true));
    let fail = Closure::<dyn FnMut(JsValue)>::new(move |_: JsValue| done(false));
    let _ = promise.then2(&ok, &fail);
    // The promise settles later; the two small closures live for the page's life.
    ok.forget();
    fail.forget();
}

/// The solved recipe (or why there is none).
#[component]
pub(crate) fn RecipeResultView(
    spec: Memo<RecipeSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
) -> impl IntoView {
    let app = use_app();
    let copy_state: RwSignal<Option<bool>> = RwSignal::new(None);
    let link = super::sheet::share_link();
    let no_cautions =
        Signal::derive(move || spec.with(|s| custom.with(|c| recipe_cautions(s, c).is_empty())));
    let system_name = Memo::new(move |_| {
        spec.with(|s| {
            custom.with(|c| {
                lookup(&s.system, c)
                    .map(|x| x.name.clone())
                    .unwrap_or_default()
            })
        })
    });
    let text = move || {
        result.with(|r| {
            r.as_ref().ok().map(|r| {
                let name = app.design.with(|d| d.name.clone());
                spec.with(|s| recipe_text(&name, &today(), s, r, &system_name.get()))
            })
        })
    };
    let on_copy = move |_| {
        if let Some(t) = text() {
            copy_to_clipboard(&t, move |ok| copy_state.set(Some(ok)));
        }
    };
    let on_print = move |_| {
        let _ = window().print();
    };

    let body = move || {
        if pending.get() {
            return view! {
                <p class="stale" data-testid="recipe-stale" role="status">
                    "Correct the marked fields to see the recipe."
                </p>
            }
            .into_any();
        }
        match result.get() {
            Err(e) => view! {
                <p class="result-error" data-testid="recipe-error" role="alert">
                    <strong>"No recipe: "</strong>
                    {error_message(&e)}
                </p>
            }
            .into_any(),
            Ok(r) => {
                let s = spec.get();
                view! { <RecipeDetails spec=s result=r /> }.into_any()
            }
        }
    };

    view! {
        <section class="card result-card" aria-labelledby="recipe-result-title">
            <div class="print-only print-head">
                <p class="print-title">{move || app.design.with(|d| d.name.clone())}</p>
                <p>"Printed " {today} " · Bufferwright recipe sheet"</p>
            </div>
            <h2 class="card-title" id="recipe-result-title" data-testid="recipe-headline">
                {move || {
                    spec.with(|s| {
                        // Say plainly what is made: a concentrate is N times
                        // the working buffer, at its pH only once diluted.
                        let (made, once) = if s.concentrate_factor > 1.0 {
                            (format!("{}× concentrate of ", fmt_input(s.concentrate_factor)), " once diluted")
                        } else {
                            (String::new(), "")
                        };
                        format!(
                            "{made}{} {} · pH {} at {} °C{once} · {}",
                            fmt_conc(s.total_conc_m),
                            system_name.get(),
                            fmt_ph(s.target_ph),
                            fmt_input(s.temperature_c),
                            format_volume_ml(s.volume_l * 1000.0)
                        )
                    })
                }}
            </h2>
            <super::sheet::SheetTop spec=spec result=result pending=pending link=link />
            // On paper the cautions come before the reagents and steps (the panel beside the
            // result is for the screen; print.css hides it there).
            {move || {
                let list = spec.with(|s| custom.with(|c| recipe_cautions(s, c)));
                (!list.is_empty()).then(|| view! {
                    <aside class="print-only cautions sheet-cautions-first" data-testid="sheet-cautions" aria-hidden="true">
                        <h3>"Cautions"</h3>
                        <ul>
                            {list.into_iter().map(|c| view! {
                                <li><strong>{c.title()}": "</strong>{c.text()}</li>
                            }).collect_view()}
                        </ul>
                        <p class="defer">{crate::widgets::cautions::DEFER}</p>
                    </aside>
                })
            }}
            <div aria-live="polite">{body}</div>
            <super::sheet::SheetFill spec=spec result=result pending=pending link=link no_cautions=no_cautions />
            <p class="print-only print-model">
                {move || {
                    let act = if spec.with(|s| s.activity == ActivityModel::Ideal) {
                        "ideal (all activity coefficients 1)"
                    } else {
                        "Davies activity coefficients"
                    };
                    format!(
                        "Model: {act}; dilute aqueous solution, ideal mixing, no complexation or precipitation; pH on the activity scale; constants valid only within the system's temperature range. Confirm the final pH with a calibrated meter."
                    )
                }}
            </p>
            <super::chemistry::RecipeChemistry spec=spec custom=custom result=result pending=pending />
            <div class="actions no-print">
                <button type="button" class="btn" data-testid="recipe-copy" on:click=on_copy
                    disabled=move || pending.get() || result.with(Result::is_err)>
                    "Copy as text"
                </button>
                <button type="button" class="btn" data-testid="recipe-print" on:click=on_print
                    disabled=move || pending.get() || result.with(Result::is_err)>
                    "Print recipe sheet"
                </button>
            </div>
            {move || match copy_state.get() {
                Some(true) => Some(view! { <p class="copied" role="status">"Copied to the clipboard."</p> }.into_any()),
                Some(false) => Some(
                    view! {
                        <div class="copy-fallback" role="status">
                            <p>"This browser did not allow copying. Select the text below and copy it by hand."</p>
                            <label for="recipe-copy-text" class="visually-hidden">"Recipe as text"</label>
                            <textarea id="recipe-copy-text" readonly rows="10">{text().unwrap_or_default()}</textarea>
                        </div>
                    }
                        .into_any(),
                ),
                None => None,
            }}
        </section>
    }
}

/// Headline numbers, reagents, steps, estimate comparison, tolerance and warnings.
#[component]
pub(crate) fn RecipeDetails(spec: RecipeSpec, result: RecipeResult) -> impl IntoView {
    let r = result;
    let eq = &r.equilibrium;
    let checks = bench_checks(&spec, &r.ingredients);
    let meter_shown =
        (r.meter.temperature_c - spec.temperature_c).abs() > 1e-9 || r.concentrate.is_some();
    let mut notes: Vec<String> = r.warnings.iter().map(warning_text).collect();
    if eq.warnings.contains(&Warning::ExtremePh) {
        notes.push("Extreme pH: the model is rough this far from neutral.".into());
    }
    let est = &r.estimate;
    let est_line = match est.actual_ph {
        Some(a) => format!(
            "pK {} · base share {} → would really give pH {} ({} from target)",
            fmt_ph(est.pk),
            crate::widgets::format::fmt_pct(est.base_fraction),
            fmt_ph(a),
            fmt_dph(a - spec.target_ph)
        ),
        None => format!(
            "pK {} · base share {} → cannot be made with these reagents",
            fmt_ph(est.pk),
            crate::widgets::format::fmt_pct(est.base_fraction)
        ),
    };
    let est_diff = est.actual_ph.map(|a| fmt_dph(a - spec.target_ph));
    let est_amounts = est
        .ingredients
        .iter()
        .map(|i| format!("{} {}", amount_text(i), pretty_formula(&i.formula)))
        .collect::<Vec<_>>()
        .join(", ");
    let lo = spec.target_ph - r.tolerance.window;
    let hi = spec.target_ph + r.tolerance.window;
    view! {
        {(!checks.is_empty())
            .then(|| {
                view! {
                    <ul class="unit-checks" data-testid="recipe-unit-check" role="alert">
                        {checks.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                    </ul>
                }
            })}
        <div class="headline">
            <div class="big-number">
                <span class="big-label">{format!("Predicted pH at {} °C", fmt_input(spec.temperature_c))}</span>
                <span class="big-value" data-testid="recipe-ph-exact">{fmt_ph(eq.ph)}</span>
            </div>
            {meter_shown.then(|| view! {
                <div class="big-number meter">
                    <span class="big-label" data-testid="recipe-meter-label">{
                        let of = meter_of(&spec, &r);
                        if of.is_empty() {
                            format!("Meter should read, at {} °C", fmt_input(r.meter.temperature_c))
                        } else {
                            format!("Meter should read, {of}, at {} °C", fmt_input(r.meter.temperature_c))
                        }
                    }</span>
                    <span class="big-value" data-testid="recipe-meter-ph">{fmt_ph(r.meter.ph)}</span>
                </div>
            })}
            <dl class="facts">
                <div>
                    <dt>"Ionic strength"</dt>
                    <dd data-testid="recipe-ionic">{fmt_conc(eq.ionic_strength)}</dd>
                </div>
                <div>
                    <dt>"Buffer capacity β"</dt>
                    <dd data-testid="recipe-capacity">{fmt_capacity(eq.capacity)}</dd>
                </div>
                <div>
                    <dt>"Henderson–Hasselbalch"</dt>
                    <dd data-testid="recipe-hh">
                        {est.actual_ph.map(fmt_ph).unwrap_or_else(|| "—".into())}
                        {est_diff.map(|d| view! { <span class="delta">" (" {d} ")"</span> })}
                    </dd>
                </div>
                {r.concentrate.map(|c| view! {
                    <div>
                        <dt>{format!("The {}× concentrate itself", fmt_input(c.factor))}</dt>
                        <dd data-testid="recipe-concentrate">
                            {concentrate_text(&c)}
                        </dd>
                    </div>
                })}
            </dl>
            <crate::widgets::uncertainty::RecipeU spec=spec.clone() result=r.clone() />
        </div>
        {meter_shown.then(|| view! { <p class="hint meter-note">{solver::recipe::METER_NOTE}</p> })}
        <h3>"Reagents"</h3>
        <table class="table ingredients">
            <thead>
                <tr>
                    <th scope="col">"Reagent"</th>
                    <th scope="col" class="num">"Amount"</th>
                    <th scope="col" class="num">"mmol"</th>
                    <th scope="col" class="num hide-narrow">"Molar mass / stock"</th>
                </tr>
            </thead>
            <tbody>
                {r
                    .ingredients
                    .iter()
                    .enumerate()
                    .map(|(i, ing)| {
                        let extra = match (ing.molar_mass, ing.stock_m) {
                            (Some(mm), _) => format!("{} g/mol", fmt_sig(mm, 5)),
                            (None, Some(m)) => format!("{} M stock", fmt_sig(m, 3)),
                            _ => String::new(),
                        };
                        view! {
                            <tr data-testid=format!("recipe-ingredient-{i}")>
                                <td>
                                    <span class="formula">{pretty_formula(&ing.formula)}</span>
                                    <span class="sub">{ing.name.clone()}</span>
                                    {undissolved(&r.warnings, &ing.formula).map(|t| view! {
                                        <span class="sub warn-inline" data-testid=format!("recipe-ingredient-{i}-solubility") role="note">
                                            {pretty_formula(&t)}
                                        </span>
                                    })}
                                </td>
                                <td class="num amount" data-testid=format!("recipe-ingredient-{i}-amount")>
                                    {amount_text(ing)}
                                </td>
                                <td class="num">{fmt_sig(ing.mol * 1000.0, 3)}</td>
                                <td class="num hide-narrow">{extra}</td>
                            </tr>
                        }
                    })
                    .collect_view()}
            </tbody>
        </table>
        <h3>"Steps"</h3>
        <ol class="steps" data-testid="recipe-steps">
            {r.steps.iter().map(|s| view! { <li>{pretty_formula(s)}</li> }).collect_view()}
        </ol>
        <div class="compare">
            <h3>"Exact vs. Henderson–Hasselbalch"</h3>
            <p>{est_line}</p>
            <p class="sub">
                {if est_amounts.is_empty() {
                    String::new()
                } else {
                    format!("The estimate would weigh/pour: {est_amounts}.")
                }}
            </p>
        </div>
        <div class="tolerance" data-testid="recipe-tolerance-budget">
            <h3>"Tolerance budget"</h3>
            <p>
                {format!(
                    "Stays within pH {} to {} until about {} mmol/L of strong acid or {} mmol/L of strong base is added.",
                    fmt_ph(lo),
                    fmt_ph(hi),
                    fmt_sig(r.tolerance.acid_mmol_per_l, 3),
                    fmt_sig(r.tolerance.base_mmol_per_l, 3)
                )}
            </p>
        </div>
        {(!notes.is_empty())
            .then(|| {
                view! {
                    <ul class="warnings" data-testid="recipe-warnings">
                        {notes.into_iter().map(|n| view! { <li>{pretty_formula(&n)}</li> }).collect_view()}
                    </ul>
                }
            })}
    }
}
