//! Recipe workspace: from a target pH to what to weigh and pour, with the exact prediction.
//!
//! Inputs write the recipe part of the design from their handlers; the
//! result is one `Memo` over `solve_recipe`. The reagent pair follows the
//! solver's `suggest_pair` as long as the forms on screen are the suggested
//! ones; once the user picks forms by hand, edits to the target no longer
//! replace them (this is decided from the design itself, so it survives tab
//! switches and reloads).

use crate::state::use_app;
use crate::widgets::cautions::{cautions_for, corrosive_only_if, Caution, CautionPanel};
use crate::widgets::format::{
    error_field, error_message, fmt_capacity, fmt_conc, fmt_dph, fmt_input, fmt_ph, fmt_sig,
    pretty_formula, BUFFER_CONC, CONC_UNITS, PH, STOCK, TEMPERATURE, TOLERANCE, VOLUME,
    VOLUME_UNITS,
};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField, SystemPicker};
use leptos::prelude::*;
use solver::activity::ActivityModel;
use solver::equilibrium::Warning;
use solver::library::find_form;
use solver::mixture::{lookup, Additive, AdditiveSpec};
use solver::recipe::{
    form_level, format_mass, format_volume_ml, solve_recipe, suggest_pair, Ingredient, Method,
    RecipeResult, RecipeSpec, RecipeWarning,
};
use solver::system::AcidSystem;
use solver::SolverError;
use wasm_bindgen::{closure::Closure, JsValue};

/// Short key of a method (`two_forms`, `titrate`, `two_stocks`).
pub fn method_key(m: &Method) -> &'static str {
    match m {
        Method::TwoForms { .. } => "two_forms",
        Method::Titrate { .. } => "titrate",
        Method::TwoStocks { .. } => "two_stocks",
    }
}

/// The form weighed in the titration method for a suggested pair: the acid
/// form when titrating with a base, the base form when titrating with HCl.
fn titrate_form(titrant: Additive, acid: &str, base: &str) -> String {
    if titrant.charge() < 0.0 {
        base.to_string()
    } else {
        acid.to_string()
    }
}

fn suggestion(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(String, String)> {
    suggest_pair(&spec.system, spec.target_ph, spec.temperature_c, custom).ok()
}

/// Deprotonation level of one of the system's forms, if it has that form.
fn level_of(sys: &AcidSystem, form_id: &str) -> Option<f64> {
    find_form(sys, form_id).map(|f| form_level(sys, f))
}

/// Deprotonation levels of the forms in `spec` (acid side, base side), if they exist.
fn current_levels(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(f64, f64)> {
    let sys = lookup(&spec.system, custom).ok()?;
    let level = |id: &str| level_of(sys, id);
    match &spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => Some((level(acid_form)?, level(base_form)?)),
        Method::Titrate { form, .. } => {
            let l = level(form)?;
            Some((l, l))
        }
    }
}

/// Deprotonation levels of the solver's suggested pair, in the same shape as [`current_levels`].
fn suggested_levels(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(f64, f64)> {
    let (a, b) = suggestion(spec, custom)?;
    let sys = lookup(&spec.system, custom).ok()?;
    let level = |id: &str| level_of(sys, id);
    match &spec.method {
        Method::Titrate { titrant, .. } => {
            let l = level(&titrate_form(*titrant, &a, &b))?;
            Some((l, l))
        }
        _ => Some((level(&a)?, level(&b)?)),
    }
}

/// Whether the forms in `spec` sit on the levels the solver suggests for the
/// target (any hydrate or salt of those levels counts). Decides, when a
/// design is opened, whether its forms follow the target or were picked by hand.
pub fn follows_suggestion(spec: &RecipeSpec, custom: &[AcidSystem]) -> bool {
    match (suggested_levels(spec, custom), current_levels(spec, custom)) {
        (Some(s), Some(c)) => (s.0 - c.0).abs() < 1e-9 && (s.1 - c.1).abs() < 1e-9,
        _ => true,
    }
}

/// Put the suggested pair (or, failing that, the system's first and last
/// forms) into the method.
pub fn apply_suggestion(spec: &mut RecipeSpec, custom: &[AcidSystem]) {
    let pair = suggestion(spec, custom).or_else(|| {
        let sys = lookup(&spec.system, custom).ok()?;
        let first = sys.forms.first()?.id.clone();
        let last = sys.forms.last()?.id.clone();
        Some((first, last))
    });
    let Some((a, b)) = pair else { return };
    match &mut spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => {
            *acid_form = a;
            *base_form = b;
        }
        Method::Titrate { form, titrant, .. } => *form = titrate_form(*titrant, &a, &b),
    }
}

/// The form ids of a method, in slot order (acid side, base side; or the one weighed form).
pub fn method_forms(m: &Method) -> Vec<String> {
    match m {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => vec![acid_form.clone(), base_form.clone()],
        Method::Titrate { form, .. } => vec![form.clone()],
    }
}

/// The method's forms as people read them: `NaH₂PO₄·H₂O + Na₂HPO₄·7H₂O`.
pub fn forms_text(m: &Method, system: &str, custom: &[AcidSystem]) -> String {
    let sys = lookup(system, custom).ok();
    method_forms(m)
        .iter()
        .map(|id| {
            sys.and_then(|s| find_form(s, id))
                .map_or_else(|| id.clone(), |f| pretty_formula(&f.formula))
        })
        .collect::<Vec<_>>()
        .join(" + ")
}

/// The forms to move to when the target (or the temperature) now sits at
/// another pK than the forms in `spec`; `None` when they already bracket it.
///
/// The user's choices are kept where the system allows: a current form that
/// sits on one of the new levels stays, and a new form is the one with the
/// same counter-ions (Na⁺ or K⁺) and the same hydrate-or-not as the form it
/// replaces.
pub fn retarget(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<Method> {
    let want = suggested_levels(spec, custom)?;
    let have = current_levels(spec, custom)?;
    if (want.0 - have.0).abs() < 1e-9 && (want.1 - have.1).abs() < 1e-9 {
        return None;
    }
    let sys = lookup(&spec.system, custom).ok()?;
    let current = method_forms(&spec.method);
    let ions = |id: &str| -> Vec<solver::system::Ion> {
        find_form(sys, id)
            .map(|f| f.counter_ions.iter().map(|(ion, _)| *ion).collect())
            .unwrap_or_default()
    };
    let hydrate = |formula: &str| formula.contains('·') || formula.contains('.');
    let user_ions: Vec<solver::system::Ion> = current.iter().flat_map(|id| ions(id)).collect();
    let pick = |level: f64, replaces: &str| -> Option<String> {
        if let Some(kept) = current
            .iter()
            .find(|id| level_of(sys, id).is_some_and(|l| (l - level).abs() < 1e-9))
        {
            return Some(kept.clone());
        }
        let old = find_form(sys, replaces);
        let old_hydrate = old.is_some_and(|f| hydrate(&f.formula));
        sys.forms
            .iter()
            .enumerate()
            .filter(|(_, f)| (form_level(sys, f) - level).abs() < 1e-9)
            .max_by_key(|(i, f)| {
                let own: Vec<_> = f.counter_ions.iter().map(|(ion, _)| *ion).collect();
                let same_ions = !own.is_empty() && own.iter().all(|ion| user_ions.contains(ion));
                let same_hydrate = hydrate(&f.formula) == old_hydrate;
                // Highest score wins; on a tie the first listed form.
                (
                    u8::from(same_ions) * 2 + u8::from(same_hydrate),
                    std::cmp::Reverse(*i),
                )
            })
            .map(|(_, f)| f.id.clone())
    };
    let mut m = spec.method.clone();
    match &mut m {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => {
            let a = pick(want.0, acid_form)?;
            let b = pick(want.1, base_form)?;
            *acid_form = a;
            *base_form = b;
        }
        Method::Titrate { form, .. } => {
            *form = pick(want.0, form)?;
        }
    }
    Some(m)
}

/// A new method of kind `key`, with the suggested forms.
pub fn switch_method(spec: &mut RecipeSpec, custom: &[AcidSystem], key: &str) {
    let placeholder = String::new();
    spec.method = match key {
        "titrate" => Method::Titrate {
            form: placeholder,
            titrant: Additive::Naoh,
            titrant_m: 1.0,
        },
        "two_stocks" => Method::TwoStocks {
            acid_form: placeholder.clone(),
            acid_stock_m: 1.0,
            base_form: placeholder,
            base_stock_m: 1.0,
        },
        _ => Method::TwoForms {
            acid_form: placeholder.clone(),
            base_form: placeholder,
        },
    };
    apply_suggestion(spec, custom);
}

/// The amount column of an ingredient: mass to weigh or volume to pour.
pub fn amount_text(i: &Ingredient) -> String {
    match (i.grams, i.ml) {
        (Some(g), _) => format_mass(g),
        (None, Some(ml)) => format_volume_ml(ml),
        _ => "—".into(),
    }
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
        RecipeWarning::ConcentrateBeyondModel { .. } => w.message(),
    }
}

fn additive_name(a: Additive) -> &'static str {
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

fn recipe_cautions(spec: &RecipeSpec, custom: &[AcidSystem]) -> Vec<Caution> {
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

fn today() -> String {
    let d = js_sys::Date::new_0();
    let iso: String = d.to_iso_string().into();
    iso.get(..10).unwrap_or_default().to_string()
}

/// The recipe workspace.
#[component]
pub fn RecipeWorkspace() -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let spec = Memo::new(move |_| design.with(|d| d.recipe.clone()));
    let custom = Memo::new(move |_| design.with(|d| d.custom_systems.clone()));
    let result = Memo::new(move |_| spec.with(|s| custom.with(|c| solve_recipe(s, c))));
    let pending = Memo::new(move |_| !app.pending_in("recipe-").is_empty());

    // Forms follow the target unless picked by hand; decided from the forms
    // of a design when it is opened (see `follows_suggestion`).
    let follow = app.forms_follow;
    Effect::new(move |_| {
        app.revision.track();
        if follow.get_untracked().is_none() {
            let auto = design.with_untracked(|d| follows_suggestion(&d.recipe, &d.custom_systems));
            follow.set(Some(auto));
        }
    });
    let notice: RwSignal<Option<FormsNotice>> = RwSignal::new(None);
    let set_raw = move |f: Box<dyn FnOnce(&mut RecipeSpec)>| {
        design.update(|d| f(&mut d.recipe));
    };
    // The user is done with the target or temperature (left the field, pressed
    // Enter): if the forms follow the target and it now sits at another pK,
    // move them, say so, and offer to undo. Never on a passing keystroke.
    let commit = move |_: f64| {
        if follow.get_untracked() == Some(false) {
            return;
        }
        let (before, after) = design.with_untracked(|d| {
            (
                d.recipe.method.clone(),
                retarget(&d.recipe, &d.custom_systems),
            )
        });
        let Some(after) = after else { return };
        let text = design.with_untracked(|d| {
            format!(
                "Forms changed for the new target: {} → {}.",
                forms_text(&before, &d.recipe.system, &d.custom_systems),
                forms_text(&after, &d.recipe.system, &d.custom_systems)
            )
        });
        design.update(|d| d.recipe.method = after);
        notice.set(Some(FormsNotice { before, text }));
    };

    let err_for = move |path: &'static str| -> Signal<Option<String>> {
        Signal::derive(move || {
            result.with(|r| match r {
                Err(e) if error_field(e).as_deref() == Some(path) => Some(error_message(e)),
                _ => None,
            })
        })
    };

    let on_system = Callback::new(move |id: String| {
        design.update(|d| {
            let custom = d.custom_systems.clone();
            d.recipe.system = id;
            apply_suggestion(&mut d.recipe, &custom);
        });
        follow.set(Some(true));
        notice.set(None);
    });

    let temperature = Signal::derive(move || spec.with(|s| s.temperature_c));
    let inputs = view! {
        <div class="inputs card">
            <h2 class="card-title">"What to make"</h2>
            <SystemPicker
                id="recipe-system"
                label="Buffer system"
                selected=Signal::derive(move || spec.with(|s| s.system.clone()))
                temperature=temperature
                on_change=on_system
            />
            <div class="row-2">
                <NumberField
                    id="recipe-ph"
                    label="Target pH"
                    value=Signal::derive(move || spec.with(|s| s.target_ph))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.target_ph = v)))
                    on_commit=Callback::new(commit)
                    rule=PH
                    error=err_for("target_ph")
                />
                <NumberField
                    id="recipe-temp"
                    label="Working temperature"
                    value=temperature
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.temperature_c = v)))
                    on_commit=Callback::new(commit)
                    rule=TEMPERATURE
                    suffix="°C"
                    error=err_for("temperature_c")
                />
            </div>
            <div class="row-2">
                <NumberField
                    id="recipe-conc"
                    label="Buffer concentration"
                    value=Signal::derive(move || spec.with(|s| s.total_conc_m))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.total_conc_m = v)))
                    rule=BUFFER_CONC
                    units=CONC_UNITS
                    error=err_for("total_conc_m")
                />
                <NumberField
                    id="recipe-volume"
                    label="Final volume"
                    value=Signal::derive(move || spec.with(|s| s.volume_l))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.volume_l = v)))
                    rule=VOLUME
                    units=VOLUME_UNITS
                    error=err_for("volume_l")
                />
            </div>
            <MethodInputs spec=spec custom=custom result=result notice=notice />
            <details class="more">
                <summary>"Salt, activity model and tolerance"</summary>
                <SaltInputs spec=spec err=err_for("salts[0].conc_m") />
                <Choice
                    name="recipe-activity"
                    legend="Activity model"
                    options=vec![
                        ChoiceOption::new("davies", "Davies (real solution)"),
                        ChoiceOption::new("ideal", "Ideal (textbook)"),
                    ]
                    selected=Signal::derive(move || {
                        spec.with(|s| if s.activity == ActivityModel::Ideal { "ideal" } else { "davies" }.to_string())
                    })
                    on_change=Callback::new(move |v: String| {
                        set_raw(Box::new(move |s: &mut RecipeSpec| {
                            s.activity = if v == "ideal" { ActivityModel::Ideal } else { ActivityModel::Davies };
                        }))
                    })
                />
                <NumberField
                    id="recipe-tolerance"
                    label="Tolerance window (± pH)"
                    value=Signal::derive(move || spec.with(|s| s.tolerance_ph))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.tolerance_ph = v)))
                    rule=TOLERANCE
                    error=err_for("tolerance_ph")
                />
            </details>
        </div>
    };

    let cautions = Signal::derive(move || spec.with(|s| custom.with(|c| recipe_cautions(s, c))));
    view! {
        <div class="ws-grid">
            {inputs}
            <div class="results">
                <RecipeResultView spec=spec custom=custom result=result pending=pending />
                <CautionPanel items=cautions testid="recipe-cautions" />
            </div>
        </div>
    }
}

/// A change of forms the page made, with what was there before (for undo).
#[derive(Debug, Clone, PartialEq)]
pub struct FormsNotice {
    /// The method before the change.
    pub before: Method,
    /// What changed, in words.
    pub text: String,
}

/// Whether the forms follow the target, what the page changed (with undo),
/// and what would change when the target moved to another pK.
#[component]
fn FormsStatus(
    spec: Memo<RecipeSpec>,
    custom: Memo<Vec<AcidSystem>>,
    notice: RwSignal<Option<FormsNotice>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let follow = app.forms_follow;
    let readonly = move || app.view.with(|v| v.readonly);
    let proposal = Memo::new(move |_| spec.with(|s| custom.with(|c| retarget(s, c))));
    let proposal_text = move || {
        proposal.get().map(|m| {
            let text = spec.with(|s| custom.with(|c| forms_text(&m, &s.system, c)));
            (m, text)
        })
    };
    let undo = move |_| {
        if let Some(n) = notice.get_untracked() {
            design.update(|d| d.recipe.method = n.before);
            follow.set(Some(false));
            notice.set(None);
        }
    };
    let use_proposal = move |_| {
        if let Some((m, _)) = proposal_text() {
            let before = spec.with_untracked(|s| s.method.clone());
            let text = spec.with_untracked(|s| {
                custom.with_untracked(|c| {
                    format!(
                        "Forms changed: {} → {}.",
                        forms_text(&before, &s.system, c),
                        forms_text(&m, &s.system, c)
                    )
                })
            });
            design.update(|d| d.recipe.method = m);
            notice.set(Some(FormsNotice { before, text }));
        }
    };
    view! {
        {move || {
            notice
                .get()
                .map(|n| {
                    view! {
                        <p class="notice" data-testid="recipe-forms-notice" role="status">
                            {n.text}
                            " "
                            <button type="button" class="btn link" data-testid="recipe-forms-undo"
                                disabled=readonly on:click=undo>
                                "Undo"
                            </button>
                        </p>
                    }
                })
        }}
        {move || {
            proposal_text()
                .map(|(_, text)| {
                    if follow.get() == Some(false) {
                        view! {
                            <p class="notice" data-testid="recipe-forms-offer" role="status">
                                "The target sits at another pK than the forms you picked. "
                                <button type="button" class="btn link" data-testid="recipe-forms-use"
                                    disabled=readonly on:click=use_proposal>
                                    {format!("Use {text}")}
                                </button>
                            </p>
                        }
                            .into_any()
                    } else {
                        view! {
                            <p class="hint" data-testid="recipe-forms-offer">
                                {format!("The target sits at another pK: when you leave the field, the forms change to {text}.")}
                            </p>
                        }
                            .into_any()
                    }
                })
        }}
        <p class="hint">
            {move || {
                if follow.get() == Some(false) {
                    "Forms picked by hand: they stay as they are when the target changes."
                } else {
                    "Forms follow the target: when you finish typing a target at another pK, the pair on either side of it is chosen for you, keeping your hydrate and counter-ion where the system has them."
                }
            }}
        </p>
    }
}

/// Method choice with its form pickers and stock strengths.
#[component]
fn MethodInputs(
    spec: Memo<RecipeSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<RecipeResult, SolverError>>,
    notice: RwSignal<Option<FormsNotice>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let follow = app.forms_follow;
    let readonly = move || app.view.with(|v| v.readonly);
    let set_method =
        move |f: Box<dyn FnOnce(&mut Method)>| design.update(|d| f(&mut d.recipe.method));
    let kind = Signal::derive(move || spec.with(|s| method_key(&s.method).to_string()));
    let forms = Memo::new(move |_| {
        spec.with(|s| {
            custom.with(|c| {
                lookup(&s.system, c)
                    .map(|sys| {
                        sys.forms
                            .iter()
                            .map(|f| {
                                let mm = f
                                    .molar_mass()
                                    .map(|m| format!("{} g/mol", fmt_sig(m, 5)))
                                    .unwrap_or_else(|_| "molar mass unknown".into());
                                (
                                    f.id.clone(),
                                    format!("{} — {} ({mm})", pretty_formula(&f.formula), f.name),
                                )
                            })
                            .collect::<Vec<_>>()
                    })
                    .unwrap_or_default()
            })
        })
    });
    let method_err = Signal::derive(move || {
        result.with(|r| match r {
            Err(e) => error_field(e)
                .filter(|f| f.starts_with("method") && !f.ends_with("_m"))
                .map(|_| error_message(e)),
            Ok(_) => None,
        })
    });
    let form_select = move |id: &'static str, label: &'static str, which: u8| {
        let current = move || {
            spec.with(|s| match (&s.method, which) {
                (Method::TwoForms { acid_form, .. } | Method::TwoStocks { acid_form, .. }, 0) => {
                    acid_form.clone()
                }
                (Method::TwoForms { base_form, .. } | Method::TwoStocks { base_form, .. }, 1) => {
                    base_form.clone()
                }
                (Method::Titrate { form, .. }, _) => form.clone(),
                _ => String::new(),
            })
        };
        let on_change = move |ev: leptos::ev::Event| {
            let v = event_target_value(&ev);
            follow.set(Some(false));
            notice.set(None);
            set_method(Box::new(move |m: &mut Method| match (m, which) {
                (Method::TwoForms { acid_form, .. } | Method::TwoStocks { acid_form, .. }, 0) => {
                    *acid_form = v
                }
                (Method::TwoForms { base_form, .. } | Method::TwoStocks { base_form, .. }, 1) => {
                    *base_form = v
                }
                (Method::Titrate { form, .. }, _) => *form = v,
                _ => {}
            }));
        };
        view! {
            <div class="field">
                <label for=id>{label}</label>
                <select id=id disabled=readonly prop:value=current on:change=on_change>
                    {move || {
                        let cur = current();
                        forms
                            .get()
                            .into_iter()
                            .map(|(fid, text)| {
                                let sel = fid == cur;
                                view! { <option value=fid selected=sel>{text}</option> }
                            })
                            .collect_view()
                    }}
                </select>
            </div>
        }
    };
    let stock_field =
        move |id: &'static str, label: &'static str, which: u8, path: &'static str| {
            let value = Signal::derive(move || {
                spec.with(|s| match (&s.method, which) {
                    (Method::TwoStocks { acid_stock_m, .. }, 0) => *acid_stock_m,
                    (Method::TwoStocks { base_stock_m, .. }, 1) => *base_stock_m,
                    (Method::Titrate { titrant_m, .. }, _) => *titrant_m,
                    _ => 1.0,
                })
            });
            let err = Signal::derive(move || {
                result.with(|r| match r {
                    Err(e) if error_field(e).as_deref() == Some(path) => Some(error_message(e)),
                    _ => None,
                })
            });
            view! {
                <NumberField
                    id=id
                    label=label
                    value=value
                    on_value=Callback::new(move |v: f64| {
                        set_method(Box::new(move |m: &mut Method| match (m, which) {
                            (Method::TwoStocks { acid_stock_m, .. }, 0) => *acid_stock_m = v,
                            (Method::TwoStocks { base_stock_m, .. }, 1) => *base_stock_m = v,
                            (Method::Titrate { titrant_m, .. }, _) => *titrant_m = v,
                            _ => {}
                        }))
                    })
                    rule=STOCK
                    units=CONC_UNITS
                    error=err
                />
            }
        };
    let titrant_select = move || {
        let current = move || {
            spec.with(|s| match &s.method {
                Method::Titrate { titrant, .. } => additive_name(*titrant).to_string(),
                _ => String::new(),
            })
        };
        view! {
            <div class="field">
                <label for="recipe-titrant">"Titrant"</label>
                <select
                    id="recipe-titrant"
                    disabled=readonly
                    prop:value=current
                    on:change=move |ev| {
                        let v = event_target_value(&ev);
                        let t = match v.as_str() {
                            "HCl" => Additive::Hcl,
                            "KOH" => Additive::Koh,
                            _ => Additive::Naoh,
                        };
                        design.update(|d| {
                            if let Method::Titrate { titrant, .. } = &mut d.recipe.method {
                                *titrant = t;
                            }
                            // Acid form for a base titrant, base form for HCl: the
                            // weighed form follows the titrant unless picked by hand.
                            if follow.get_untracked() != Some(false) {
                                if let Some(m) = retarget(&d.recipe, &d.custom_systems) {
                                    d.recipe.method = m;
                                }
                            }
                        });
                    }
                >
                    {[Additive::Naoh, Additive::Koh, Additive::Hcl]
                        .into_iter()
                        .map(|a| {
                            let n = additive_name(a);
                            let label = match a {
                                Additive::Hcl => "HCl (strong acid)",
                                Additive::Koh => "KOH (strong base)",
                                _ => "NaOH (strong base)",
                            };
                            view! { <option value=n selected=move || current() == n>{label}</option> }
                        })
                        .collect_view()}
                </select>
            </div>
        }
    };

    view! {
        <Choice
            name="recipe-method"
            legend="How to make it"
            options=vec![
                ChoiceOption::new("two_forms", "Weigh two forms"),
                ChoiceOption::new("titrate", "One form + titrant"),
                ChoiceOption::new("two_stocks", "Mix two stocks"),
            ]
            selected=kind
            on_change=Callback::new(move |k: String| {
                design.update(|d| {
                    let custom = d.custom_systems.clone();
                    switch_method(&mut d.recipe, &custom, &k);
                });
                follow.set(Some(true));
                notice.set(None);
            })
        />
        {move || match kind.get().as_str() {
            "titrate" => {
                view! {
                    {form_select("recipe-form", "Form to weigh", 2)}
                    <div class="row-2">
                        {titrant_select()}
                        {stock_field("recipe-titrant-m", "Titrant strength", 2, "method.titrant_m")}
                    </div>
                }
                    .into_any()
            }
            "two_stocks" => {
                view! {
                    {form_select("recipe-acid-form", "Acid-side stock", 0)}
                    {stock_field("recipe-acid-stock", "Acid stock strength", 0, "method.acid_stock_m")}
                    {form_select("recipe-base-form", "Base-side stock", 1)}
                    {stock_field("recipe-base-stock", "Base stock strength", 1, "method.base_stock_m")}
                }
                    .into_any()
            }
            _ => {
                view! {
                    {form_select("recipe-acid-form", "Acid-side form", 0)}
                    {form_select("recipe-base-form", "Base-side form", 1)}
                }
                    .into_any()
            }
        }}
        <FormsStatus spec=spec custom=custom notice=notice />
        {move || {
            method_err
                .get()
                .map(|m| {
                    view! {
                        <p class="field-msg" data-testid="error-recipe-method" role="alert">
                            {m}
                        </p>
                    }
                })
        }}
    }
}

/// Optional neutral salt.
#[component]
fn SaltInputs(spec: Memo<RecipeSpec>, err: Signal<Option<String>>) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let salt = move || spec.with(|s| s.salts.first().map(|a| a.additive));
    let current = move || match salt() {
        Some(Additive::Kcl) => "kcl",
        Some(_) => "nacl",
        None => "none",
    };
    view! {
        <div class="row-2">
            <div class="field">
                <label for="recipe-salt">"Added salt"</label>
                <select
                    id="recipe-salt"
                    disabled=readonly
                    prop:value=current
                    on:change=move |ev| {
                        let v = event_target_value(&ev);
                        design.update(|d| {
                            let conc = d.recipe.salts.first().map_or(0.15, |s| s.conc_m);
                            let first = match v.as_str() {
                                "nacl" => Some(AdditiveSpec { additive: Additive::Nacl, conc_m: conc }),
                                "kcl" => Some(AdditiveSpec { additive: Additive::Kcl, conc_m: conc }),
                                _ => None,
                            };
                            match (first, d.recipe.salts.first_mut()) {
                                (Some(a), Some(s0)) => *s0 = a,
                                (Some(a), None) => d.recipe.salts.push(a),
                                (None, _) => d.recipe.salts.clear(),
                            }
                        });
                    }
                >
                    <option value="none" selected=move || current() == "none">"None"</option>
                    <option value="nacl" selected=move || current() == "nacl">"NaCl"</option>
                    <option value="kcl" selected=move || current() == "kcl">"KCl"</option>
                </select>
            </div>
            <Show when=move || salt().is_some()>
                <NumberField
                    id="recipe-salt-conc"
                    label="Salt concentration"
                    value=Signal::derive(move || spec.with(|s| s.salts.first().map_or(0.0, |a| a.conc_m)))
                    on_value=Callback::new(move |v: f64| {
                        design.update(|d| {
                            if let Some(s) = d.recipe.salts.first_mut() {
                                s.conc_m = v;
                            }
                        })
                    })
                    rule=crate::widgets::format::AMOUNT
                    units=CONC_UNITS
                    error=err
                />
            </Show>
        </div>
    }
}

/// Copy `text` to the clipboard; `done` receives whether it worked.
fn copy_to_clipboard(text: &str, done: impl Fn(bool) + 'static) {
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
fn RecipeResultView(
    spec: Memo<RecipeSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
) -> impl IntoView {
    let app = use_app();
    let copy_state: RwSignal<Option<bool>> = RwSignal::new(None);
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
                        format!(
                            "{} {} · pH {} at {} °C · {}",
                            fmt_conc(s.total_conc_m),
                            system_name.get(),
                            fmt_ph(s.target_ph),
                            fmt_input(s.temperature_c),
                            format_volume_ml(s.volume_l * 1000.0)
                        )
                    })
                }}
            </h2>
            <div aria-live="polite">{body}</div>
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
            // TODO(plots): a small species/capacity plot of the finished recipe would sit here
            // (needs a public mini-plot component from crate::plots; the e2e smoke test expects a
            // visible canvas.plot on the landing view, which is this workspace).
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
fn RecipeDetails(spec: RecipeSpec, result: RecipeResult) -> impl IntoView {
    let r = result;
    let eq = &r.equilibrium;
    let checks = bench_checks(&spec, &r.ingredients);
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
                <span class="big-label">"Predicted pH"</span>
                <span class="big-value" data-testid="recipe-ph-exact">{fmt_ph(eq.ph)}</span>
            </div>
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
            </dl>
        </div>
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
                        {notes.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                    </ul>
                }
            })}
    }
}

#[cfg(test)]
#[allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]
mod tests {
    use super::*;
    use solver::design::demo_design;

    fn forms(spec: &RecipeSpec) -> (String, String) {
        match &spec.method {
            Method::TwoForms {
                acid_form,
                base_form,
            } => (acid_form.clone(), base_form.clone()),
            other => panic!("unexpected {other:?}"),
        }
    }

    #[test]
    fn demo_hydrates_count_as_following_the_suggestion() {
        let spec = demo_design().recipe;
        assert!(follows_suggestion(&spec, &[]));
        assert_eq!(
            retarget(&spec, &[]),
            None,
            "7.4 already sits between the demo's forms"
        );
    }

    #[test]
    fn moving_the_target_to_another_pk_keeps_hydrate_and_counter_ion() {
        let mut spec = demo_design().recipe;
        spec.target_ph = 7.1;
        assert_eq!(retarget(&spec, &[]), None, "same step: nothing to change");
        spec.target_ph = 11.5;
        spec.method = retarget(&spec, &[]).unwrap();
        let (a, b) = forms(&spec);
        assert_eq!(
            a, "na2hpo4_7h2o",
            "the heptahydrate sits on the new acid side: kept"
        );
        let sys = lookup("phosphate", &[]).unwrap();
        let base = find_form(sys, &b).unwrap();
        assert!(
            base.formula.contains('·'),
            "a hydrate replaces a hydrate: {}",
            base.formula
        );
        assert!(base
            .counter_ions
            .iter()
            .all(|(i, _)| *i == solver::system::Ion::Na));
        let r = solve_recipe(&spec, &[]);
        assert!(r.is_ok(), "{r:?}");
        // Back to 7.4: the monohydrate-or-anhydrous choice follows the user's forms.
        spec.target_ph = 7.4;
        spec.method = retarget(&spec, &[]).unwrap();
        assert_eq!(forms(&spec).1, "na2hpo4_7h2o");
    }

    #[test]
    fn a_passing_keystroke_changes_nothing_by_itself() {
        // The page moves forms only on commit; the design holding a transient
        // target keeps the user's forms, and coming back proposes nothing.
        let mut spec = demo_design().recipe;
        let before = spec.method.clone();
        spec.target_ph = 1.0;
        assert!(retarget(&spec, &[]).is_some(), "pH 1 is at another pK");
        assert_eq!(spec.method, before);
        spec.target_ph = 7.4;
        assert_eq!(retarget(&spec, &[]), None);
        assert_eq!(spec.method, before);
    }

    #[test]
    fn hand_picked_forms_are_detected_on_open() {
        let mut spec = demo_design().recipe;
        if let Method::TwoForms { base_form, .. } = &mut spec.method {
            *base_form = "na3po4_12h2o".into();
        }
        assert!(!follows_suggestion(&spec, &[]));
    }

    #[test]
    fn implausible_bench_amounts_ask_to_check_the_unit() {
        let mut spec = demo_design().recipe;
        let r = solve_recipe(&spec, &[]).unwrap();
        assert!(
            bench_checks(&spec, &r.ingredients).is_empty(),
            "the demo is a bench recipe"
        );
        spec.volume_l = 250.0; // "250" typed, then the unit switched to L
        let r = solve_recipe(&spec, &[]).unwrap();
        let checks = bench_checks(&spec, &r.ingredients);
        assert!(
            checks.iter().any(|c| c.contains("final volume")),
            "{checks:?}"
        );
        assert!(
            checks.iter().any(|c| c.contains("more than 1 kg")),
            "{checks:?}"
        );
        spec.volume_l = 0.5;
        spec.total_conc_m = 2.5;
        assert!(bench_checks(&spec, &[])
            .iter()
            .any(|c| c.contains("unusually strong")));
    }

    #[test]
    fn forms_read_as_formulas() {
        let spec = demo_design().recipe;
        let t = forms_text(&spec.method, &spec.system, &[]);
        assert!(t.contains(" + "), "{t}");
        assert!(t.contains('·'), "{t}");
    }

    #[test]
    fn switching_method_picks_forms_of_the_system() {
        let mut spec = demo_design().recipe;
        switch_method(&mut spec, &[], "titrate");
        match &spec.method {
            Method::Titrate { form, titrant, .. } => {
                assert_eq!(*titrant, Additive::Naoh);
                assert!(lookup("phosphate", &[])
                    .unwrap()
                    .forms
                    .iter()
                    .any(|f| f.id == *form));
            }
            other => panic!("unexpected {other:?}"),
        }
        assert!(solve_recipe(&spec, &[]).is_ok());
        switch_method(&mut spec, &[], "two_stocks");
        assert!(solve_recipe(&spec, &[]).is_ok());
    }

    #[test]
    fn recipe_text_has_name_reagents_steps_and_prediction() {
        let d = demo_design();
        let r = solve_recipe(&d.recipe, &[]).unwrap();
        let t = recipe_text(&d.name, "2026-01-01", &d.recipe, &r, "Phosphate");
        assert!(t.starts_with("Hatchery lab"));
        assert!(t.contains("Date: 2026-01-01"));
        assert!(t.contains(&amount_text(&r.ingredients[0])));
        assert!(t.contains("1. Weigh"));
        assert!(t.contains("Predicted pH 7.40"));
    }

    #[test]
    fn cautions_follow_the_reagents() {
        let mut spec = demo_design().recipe;
        assert!(
            recipe_cautions(&spec, &[]).is_empty(),
            "two sodium phosphate salts"
        );
        switch_method(&mut spec, &[], "titrate");
        assert!(recipe_cautions(&spec, &[]).contains(&Caution::StrongBase));
    }
}
