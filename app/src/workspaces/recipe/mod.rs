//! Recipe workspace: from a target pH to what to weigh and pour, with the exact prediction.
//!
//! Inputs write the recipe part of the design from their handlers; the
//! result is one `Memo` over `solve_recipe`. The reagent pair follows the
//! solver's `suggest_pair` as long as the forms on screen are the suggested
//! ones; once the user picks forms by hand, edits to the target no longer
//! replace them (this is decided from the design itself, so it survives tab
//! switches and reloads).
//!
//! The tab's code: [`forms`] (which reagent forms, and when they follow the
//! target), [`result`] (the recipe card, its text and checks), [`salts`]
//! (the salt rows and their list edits), and the
//! inputs here.

pub mod chemistry;
pub mod forms;
pub mod result;
pub mod salts;
pub mod sheet;
#[cfg(test)]
mod tests;

pub use forms::*;
pub use result::*;
pub use salts::*;

use crate::state::use_app;
use crate::widgets::answer::AnswerBar;
use crate::widgets::cautions::CautionPanel;
use crate::widgets::format::{
    error_field, error_message, fmt_sig, pretty_formula, CONC_UNITS, VOLUME_UNITS,
};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField, SystemPicker};
use leptos::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::mixture::{lookup, Additive};
use solver::recipe::{solve_recipe, Method, RecipeResult, RecipeSpec};
use solver::system::AcidSystem;
use solver::SolverError;

/// The recipe workspace.
#[component]
pub fn RecipeWorkspace() -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let spec = Memo::new(move |_| design.with(|d| d.recipe.clone()));
    let custom = Memo::new(move |_| design.with(|d| d.systems()));
    let result = Memo::new(move |_| spec.with(|s| custom.with(|c| solve_recipe(s, c))));
    let pending = Memo::new(move |_| !app.pending_in("recipe-").is_empty());

    // Forms follow the target unless picked by hand; decided from the forms
    // of a design when it is opened (see `follows_suggestion`).
    let follow = app.forms_follow;
    Effect::new(move |_| {
        app.revision.track();
        if follow.get_untracked().is_none() {
            let auto = design.with_untracked(|d| follows_suggestion(&d.recipe, &d.systems()));
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
        let (before, after) =
            design.with_untracked(|d| (d.recipe.method.clone(), retarget(&d.recipe, &d.systems())));
        let Some(after) = after else { return };
        let text = design.with_untracked(|d| {
            format!(
                "Forms changed for the new target: {} → {}.",
                forms_text(&before, &d.recipe.system, &d.systems()),
                forms_text(&after, &d.recipe.system, &d.systems())
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
            let custom = d.systems();
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
                    path="recipe.target_ph"
                    error=err_for("target_ph")
                />
                <NumberField
                    id="recipe-temp"
                    label="Working temperature"
                    value=temperature
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.temperature_c = v)))
                    on_commit=Callback::new(commit)
                    path="recipe.temperature_c"
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
                    path="recipe.total_conc_m"
                    units=CONC_UNITS
                    error=err_for("total_conc_m")
                />
                <NumberField
                    id="recipe-volume"
                    label="Final volume"
                    value=Signal::derive(move || spec.with(|s| s.volume_l))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.volume_l = v)))
                    path="recipe.volume_l"
                    units=VOLUME_UNITS
                    error=err_for("volume_l")
                />
            </div>
            <div class="row-2">
                <NumberField
                    id="recipe-prep-temp"
                    label="Made and checked at"
                    hint="Where the meter reads it: usually the bench, 20–25 °C."
                    value=Signal::derive(move || spec.with(|s| s.prepare_temperature_c.unwrap_or(s.temperature_c)))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.prepare_temperature_c = Some(v))))
                    path="recipe.prepare_temperature_c"
                    suffix="°C"
                    error=err_for("prepare_temperature_c")
                />
                <NumberField
                    id="recipe-concentrate"
                    label="Make as a concentrate"
                    hint="1 = working strength; 10 = a 10× stock diluted later."
                    value=Signal::derive(move || spec.with(|s| s.concentrate_factor))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.concentrate_factor = v)))
                    path="recipe.concentrate_factor"
                    suffix="×"
                    error=err_for("concentrate_factor")
                />
            </div>
            <div class="row-2">
                <NumberField
                    id="recipe-store-temp"
                    label="Kept at"
                    hint="Where the bottle is stored (a cold room is about 4 °C): its salts are checked against what dissolves there."
                    value=Signal::derive(move || spec.with(|s| s.store_temperature_c.or(s.prepare_temperature_c).unwrap_or(s.temperature_c)))
                    on_value=Callback::new(move |v| set_raw(Box::new(move |s: &mut RecipeSpec| s.store_temperature_c = Some(v))))
                    path="recipe.store_temperature_c"
                    suffix="°C"
                    error=err_for("store_temperature_c")
                />
            </div>
            <MethodInputs spec=spec custom=custom result=result notice=notice />
            <details class="more">
                <summary>"Salts (NaCl, KCl), activity model and tolerance"</summary>
                <SaltRows spec=spec result=result />
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
                    path="recipe.tolerance_ph"
                    error=err_for("tolerance_ph")
                />
            </details>
            <crate::workspaces::gas::GasInput
                prefix="recipe"
                value=Signal::derive(move || spec.with(|s| s.atmosphere))
                on_value=Callback::new(move |a| design.update(|d| d.recipe.atmosphere = a))
                error=Signal::derive(move || result.with(|r| r.as_ref().err().cloned()))
                hint="For a carbonate medium in an incubator: choose Carbonate, weigh one form (NaHCO₃ or Na₂CO₃, the titrate method's form); the amount is what gives the target once equilibrated with this gas."
            />
            <crate::widgets::uncertainty::UncertaintyFields volume_l=Signal::derive(move || spec.with(|s| s.volume_l)) />
        </div>
    };

    let cautions = Signal::derive(move || spec.with(|s| custom.with(|c| recipe_cautions(s, c))));
    let answer = Signal::derive(move || {
        if pending.get() {
            return (
                false,
                "Correct the marked fields to see the recipe.".to_string(),
            );
        }
        result.with(|r| match r {
            Err(e) => (false, format!("No recipe: {}", error_message(e))),
            Ok(r) => spec.with(|s| (true, answer_line(s, r))),
        })
    });
    view! {
        <AnswerBar text=Signal::derive(move || answer.get().1) ok=Signal::derive(move || answer.get().0) />
        <div class="ws-grid">
            {inputs}
            <div class="results">
                <RecipeResultView spec=spec custom=custom result=result pending=pending />
                <crate::reagents::UserReagentNote systems=Signal::derive(move || spec.with(|s| vec![s.system.clone()])) />
                <crate::workspaces::gas::GasPanel prefix="recipe" mixture=Signal::derive(move || result.with(|r| r.as_ref().ok().map(|r| r.mixture.clone()))) custom=custom target=Signal::derive(move || Some(spec.with(|s| s.target_ph))) />
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
                    path=match which {
                        0 => "recipe.method.acid_stock_m",
                        1 => "recipe.method.base_stock_m",
                        _ => "recipe.method.titrant_m",
                    }
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
                                if let Some(m) = retarget(&d.recipe, &d.systems()) {
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
                    let custom = d.systems();
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
