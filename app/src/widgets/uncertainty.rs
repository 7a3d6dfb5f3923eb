//! Uncertainty beside a predicted value: "pH 7.40 ± 0.03 (U, k = 2, about 95 %)", its budget folded away, the solver's warnings, and the inputs for the user's own ± figures.
//!
//! Every number is the solver's (`solver::uncertainty`): the budget rows, the
//! expanded uncertainty, the warnings' text and the class A suggestions. This
//! module rounds and lays them out, and writes the user's figures into
//! `design.uncertainty` through [`NumberField`].

use crate::state::use_app;
use crate::widgets::format::{error_message, fmt_sig};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField};
use leptos::prelude::*;
use solver::field::{FieldResult, FieldSpec};
use solver::recipe::{RecipeResult, RecipeSpec};
use solver::uncertainty::{
    field_uncertainty, mixture_uncertainty, recipe_uncertainty, suggested_flask_ml, Uncertainty,
    UncertaintyInputs,
};

/// How the expanded uncertainty is stated after the number.
pub const COVERAGE_TEXT: &str = "(U, k = 2, about 95 %)";

/// Decimals for a value and its expanded uncertainty: two (as every pH on
/// the page) unless U would round to zero there.
pub fn u_decimals(u95: f64) -> usize {
    if !u95.is_finite() || u95 >= 0.0095 {
        2
    } else if u95 >= 0.000_95 {
        3
    } else {
        4
    }
}

/// "pH 7.40 ± 0.03": the value and U to the same decimals.
pub fn ph_with_u(ph: f64, u95: f64) -> String {
    let d = u_decimals(u95);
    let v = format!("{ph:.d$}");
    let v = v
        .strip_prefix('-')
        .map_or(v.clone(), |r| format!("\u{2212}{r}"));
    format!("pH {v} ± {u95:.d$}")
}

/// A fraction's U in percentage points ("± 0.84 percentage points").
pub fn fraction_u_text(u95_fraction: f64) -> String {
    format!("± {} percentage points", fmt_sig(u95_fraction * 100.0, 2))
}

/// A share of the variance as a whole percentage ("62 %", "< 1 %").
pub fn share_text(share: f64) -> String {
    if !share.is_finite() {
        "—".into()
    } else if share < 0.005 {
        "< 1 %".into()
    } else {
        format!("{:.0} %", share * 100.0)
    }
}

/// One budget row as shown: input, its standard uncertainty with unit, its
/// share, where the figure comes from.
#[derive(Debug, Clone, PartialEq)]
pub struct RowText {
    /// Input.
    pub input: String,
    /// "0.00058 g".
    pub u_input: String,
    /// "62 %".
    pub share: String,
    /// Source of the input's figure.
    pub source: String,
}

/// The rows of a pH budget, largest first (the solver's order).
pub fn ph_rows(u: &Uncertainty) -> Vec<RowText> {
    u.budget
        .iter()
        .map(|r| RowText {
            input: r.input.clone(),
            u_input: format!("{} {}", fmt_sig(r.u_input, 2), r.unit),
            share: share_text(r.share),
            source: r.source.clone(),
        })
        .collect()
}

/// The budget table, folded in a `<details>`.
#[component]
fn BudgetTable(rows: Vec<RowText>, testid: String) -> impl IntoView {
    view! {
        <details class="u-budget" data-testid=testid>
            <summary>"What the ± is made of"</summary>
            <table class="table">
                <thead>
                    <tr>
                        <th scope="col">"Input"</th>
                        <th scope="col" class="num">"Its uncertainty (u)"</th>
                        <th scope="col" class="num">"Share of U²"</th>
                    </tr>
                </thead>
                <tbody>
                    {rows
                        .into_iter()
                        .map(|r| {
                            view! {
                                <tr>
                                    <td>{r.input}<span class="sub">{r.source}</span></td>
                                    <td class="num">{r.u_input}</td>
                                    <td class="num">{r.share}</td>
                                </tr>
                            }
                        })
                        .collect_view()}
                </tbody>
            </table>
            <p class="hint">
                "Standard uncertainties combined in quadrature (first order, inputs taken as independent); a ± figure you enter is the half-width of a rectangular distribution. Shares are of the combined variance and add up to 100 %."
            </p>
        </details>
    }
}

/// A pH with its U, the budget and the warnings (or why there is no U).
#[component]
fn PhU(ph: f64, u: Memo<Result<Uncertainty, String>>, testid: &'static str) -> impl IntoView {
    move || match u.get() {
        Ok(u) => {
            let notes = u.notes.clone();
            view! {
                <div class="u-block">
                    <p class="u95" data-testid=testid>
                        <span class="u95-value">{ph_with_u(ph, u.u95_ph)}</span>
                        " "
                        <span class="u95-how">{COVERAGE_TEXT}</span>
                    </p>
                    <BudgetTable rows=ph_rows(&u) testid=format!("{testid}-budget") />
                    {(!notes.is_empty())
                        .then(|| {
                            view! {
                                <ul class="u-notes" data-testid=format!("{testid}-warnings")>
                                    {notes.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                                </ul>
                            }
                        })}
                </div>
            }
            .into_any()
        }
        Err(m) => view! {
            <p class="u-error" data-testid=testid>{format!("No uncertainty figure: {m}")}</p>
        }
        .into_any(),
    }
}

/// The user's figures and the design's custom systems, as memos.
fn inputs_and_custom() -> (
    Memo<UncertaintyInputs>,
    Memo<Vec<solver::system::AcidSystem>>,
) {
    let app = use_app();
    let design = app.design;
    (
        Memo::new(move |_| design.with(|d| d.uncertainty.clone())),
        Memo::new(move |_| design.with(solver::document::Design::systems)),
    )
}

/// U of a recipe's predicted pH (`data-testid="recipe-u95"`).
#[component]
pub fn RecipeU(
    /// The recipe as entered.
    spec: RecipeSpec,
    /// Its solved result.
    result: RecipeResult,
) -> impl IntoView {
    let (inputs, custom) = inputs_and_custom();
    let ph = result.equilibrium.ph;
    let u = Memo::new(move |_| {
        inputs.with(|i| {
            custom.with(|c| recipe_uncertainty(&spec, &result, i, c).map_err(|e| error_message(&e)))
        })
    });
    view! { <PhU ph=ph u=u testid="recipe-u95" /> }
}

/// U of the flask's pH (`data-testid="mixture-u95"`), for the design's mixture.
#[component]
pub fn MixtureU(
    /// The flask's pH from the solver.
    ph: f64,
) -> impl IntoView {
    let (inputs, custom) = inputs_and_custom();
    let design = use_app().design;
    let mixture = Memo::new(move |_| design.with(|d| d.mixture.clone()));
    let u = Memo::new(move |_| {
        mixture.with(|m| {
            inputs.with(|i| {
                custom.with(|c| mixture_uncertainty(m, i, c, None).map_err(|e| error_message(&e)))
            })
        })
    });
    view! { <PhU ph=ph u=u testid="mixture-u95" /> }
}

/// U of one species fraction of a field reading (`data-testid="field-u95"`).
#[component]
pub fn FieldFractionU(
    /// The reading as entered.
    spec: FieldSpec,
    /// Its result.
    result: FieldResult,
    /// Which species (0 = most protonated).
    species: usize,
) -> impl IntoView {
    let (inputs, custom) = inputs_and_custom();
    let u = Memo::new(move |_| {
        inputs.with(|i| {
            custom.with(|c| {
                field_uncertainty(&spec, &result, i, c)
                    .map_err(|e| error_message(&e))
                    .and_then(|f| {
                        f.species
                            .get(species)
                            .cloned()
                            .ok_or_else(|| "no such species".to_string())
                    })
            })
        })
    });
    move || match u.get() {
        Ok(s) => {
            let rows: Vec<RowText> = s
                .budget
                .iter()
                .map(|r| RowText {
                    input: r.input.clone(),
                    u_input: format!("{} {}", fmt_sig(r.u_input, 2), r.unit),
                    share: share_text(r.share),
                    source: r.source.clone(),
                })
                .collect();
            view! {
                <div class="u-block">
                    <p class="hero-u" data-testid="field-u95">
                        {fraction_u_text(s.u95_fraction)}
                        " "
                        <span class="u95-how">{COVERAGE_TEXT}</span>
                    </p>
                    <BudgetTable rows=rows testid="field-u95-budget".to_string() />
                </div>
            }
            .into_any()
        }
        Err(m) => view! {
            <p class="u-error" data-testid="field-u95">{format!("No uncertainty figure: {m}")}</p>
        }
        .into_any(),
    }
}

/// The user's own ± figures (balance, flask, thermometer, stocks, pH meter),
/// written into `design.uncertainty`; folded in a `<details class="more">`.
/// Suggestions come from the solver's defaults and class A tables.
#[component]
pub fn UncertaintyFields(
    /// Final volume of the recipe, L (for the class A flask suggestion).
    #[prop(into)]
    volume_l: Signal<f64>,
) -> impl IntoView {
    let design = use_app().design;
    let u = Memo::new(move |_| design.with(|d| d.uncertainty.clone()));
    let set = move |f: Box<dyn FnOnce(&mut UncertaintyInputs)>| {
        design.update(|d| f(&mut d.uncertainty));
    };
    let defaults = UncertaintyInputs::default();
    let suggested = Memo::new(move |_| suggested_flask_ml(volume_l.get() * 1000.0));
    let own_flask = Memo::new(move |_| u.with(|x| x.flask_ml.is_some()));
    let flask_text = move || {
        format!(
            "Class A for a {} mL flask: ± {} mL (common practice; ISO 1042 tolerance, from memory).",
            fmt_sig(volume_l.get() * 1000.0, 4),
            fmt_sig(suggested.get(), 3)
        )
    };
    view! {
        <details class="more u-inputs" data-testid="recipe-uncertainty-inputs">
            <summary>"Your balance, glassware and meter (for the ±)"</summary>
            <div class="row-2">
                <NumberField
                    id="recipe-u-balance"
                    label="Balance readability"
                    hint=format!("Common practice: ± {} mg for a top-loading balance; an analytical balance reads to 0.1 mg.", defaults.balance_mg)
                    value=Signal::derive(move || u.with(|x| x.balance_mg))
                    on_value=Callback::new(move |v| set(Box::new(move |x: &mut UncertaintyInputs| x.balance_mg = v)))
                    path="uncertainty.balance_mg"
                    suffix="± mg"
                />
                <NumberField
                    id="recipe-u-temp"
                    label="Thermometer"
                    hint=format!("Common practice: ± {} K for a lab thermometer.", defaults.temperature_k)
                    value=Signal::derive(move || u.with(|x| x.temperature_k))
                    on_value=Callback::new(move |v| set(Box::new(move |x: &mut UncertaintyInputs| x.temperature_k = v)))
                    path="uncertainty.temperature_k"
                    suffix="± K"
                />
            </div>
            <Choice
                name="recipe-u-flask"
                legend="Volumetric flask tolerance"
                options=vec![
                    ChoiceOption::new("class_a", "Class A (suggested)"),
                    ChoiceOption::new("own", "My own figure"),
                ]
                selected=Signal::derive(move || if own_flask.get() { "own" } else { "class_a" }.to_string())
                on_change=Callback::new(move |k: String| {
                    let s = suggested.get_untracked();
                    set(Box::new(move |x: &mut UncertaintyInputs| {
                        x.flask_ml = (k == "own").then_some(x.flask_ml.unwrap_or(s));
                    }))
                })
            />
            <p class="hint" data-testid="recipe-u-flask-suggestion">{flask_text}</p>
            <Show when=move || own_flask.get()>
                <NumberField
                    id="recipe-u-flask"
                    label="Your flask"
                    value=Signal::derive(move || u.with(|x| x.flask_ml.unwrap_or_else(|| suggested.get())))
                    on_value=Callback::new(move |v| set(Box::new(move |x: &mut UncertaintyInputs| x.flask_ml = Some(v))))
                    path="uncertainty.flask_ml"
                    suffix="± mL"
                />
            </Show>
            <div class="row-2">
                <NumberField
                    id="recipe-u-stock"
                    label="Stock and titrant strength"
                    hint=format!("Estimate: ± {} % for a stock made by weighing; a standardised titrant is better.", defaults.stock_percent)
                    value=Signal::derive(move || u.with(|x| x.stock_percent))
                    on_value=Callback::new(move |v| set(Box::new(move |x: &mut UncertaintyInputs| x.stock_percent = v)))
                    path="uncertainty.stock_percent"
                    suffix="± %"
                />
                <NumberField
                    id="recipe-u-meter"
                    label="pH meter"
                    hint=format!("Common practice: ± {} pH after a two-point calibration (used by the field reading).", defaults.ph_meter)
                    value=Signal::derive(move || u.with(|x| x.ph_meter))
                    on_value=Callback::new(move |v| set(Box::new(move |x: &mut UncertaintyInputs| x.ph_meter = v)))
                    path="uncertainty.ph_meter"
                    suffix="± pH"
                />
            </div>
            <p class="hint">"Poured volumes use the class A pipette tolerance for their size (common practice); these figures are saved with the design."</p>
        </details>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use solver::document::demo_design;
    use solver::recipe::solve_recipe;

    #[test]
    fn value_and_u_share_their_decimals() {
        assert_eq!(ph_with_u(7.4012, 0.0312), "pH 7.40 ± 0.03");
        assert_eq!(ph_with_u(7.4012, 0.0041), "pH 7.401 ± 0.004");
        assert_eq!(ph_with_u(7.4, 0.0004), "pH 7.4000 ± 0.0004");
        assert_eq!(share_text(0.624), "62 %");
        assert_eq!(share_text(0.001), "< 1 %");
        assert_eq!(fraction_u_text(0.00843), "± 0.84 percentage points");
    }

    #[test]
    fn the_demo_recipe_budget_is_the_solvers() {
        let d = demo_design();
        let r = solve_recipe(&d.recipe, &[]).unwrap();
        let u = recipe_uncertainty(&d.recipe, &r, &d.uncertainty, &[]).unwrap();
        let rows = ph_rows(&u);
        assert_eq!(rows.len(), u.budget.len());
        assert!(!rows.is_empty());
        assert_eq!(rows[0].input, u.budget[0].input);
        assert!(u.u95_ph > 0.0 && u.u95_ph < 0.2, "{}", u.u95_ph);
        assert!(ph_with_u(r.equilibrium.ph, u.u95_ph).starts_with("pH 7.40 ± "));
    }
}
