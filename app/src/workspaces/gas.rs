//! A CO₂ atmosphere in the recipe, flask and field workspaces: the gas input, the gas what-ifs with the pH-vs-CO₂ plot, the field sample's equilibrium with the air.

use crate::plots::canvas::{CanvasArea, PlotCanvas};
use crate::plots::co2::{co2_summary, draw_co2, Co2View};
use crate::state::use_app;
use crate::widgets::format::{error_field, error_message, fmt_dph, fmt_ph};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField};
use leptos::prelude::*;
use solver::atmosphere::field::FieldGas;
use solver::atmosphere::what_if::{co2_curve, gas_what_if};
use solver::atmosphere::{Atmosphere, STANDARD_KPA};
use solver::mixture::MixtureSpec;
use solver::system::AcidSystem;
use solver::SolverError;

/// The other CO₂ percentage tried when the design names none.
const OTHER_PERCENT: f64 = 10.0;
/// The plot's highest CO₂ %.
const CURVE_MAX: f64 = 20.0;

/// The document paths of a workspace's atmosphere (CO₂ %, CO₂ µatm, total pressure): the
/// fields' limits come from the rulebook by these paths (`solver::limits::GAS`).
fn gas_paths(prefix: &str) -> (&'static str, &'static str, &'static str) {
    match prefix {
        "recipe" => (
            "recipe.atmosphere.co2_percent",
            "recipe.atmosphere.co2_uatm",
            "recipe.atmosphere.pressure_kpa",
        ),
        "field" => (
            "field.atmosphere.co2_percent",
            "field.atmosphere.co2_uatm",
            "field.atmosphere.pressure_kpa",
        ),
        _ => (
            "mixture.atmosphere.co2_percent",
            "mixture.atmosphere.co2_uatm",
            "mixture.atmosphere.pressure_kpa",
        ),
    }
}

fn kind_of(a: Option<Atmosphere>) -> &'static str {
    match a {
        None => "closed",
        Some(a) if a.co2_uatm.is_some() => "uatm",
        Some(_) => "percent",
    }
}

/// The gas input: closed (no gas), a CO₂ percentage (a humidified incubator
/// gas) or a partial pressure in µatm (air), and the total pressure. Ids are
/// `<prefix>-co2-kind-…`, `<prefix>-co2-value`, `<prefix>-co2-pressure`;
/// a solver message about the atmosphere shows beside the field it names.
#[component]
pub fn GasInput(
    /// Id prefix: `recipe`, `mixture` or `field`.
    prefix: &'static str,
    /// The workspace's atmosphere.
    #[prop(into)]
    value: Signal<Option<Atmosphere>>,
    /// Receives a new atmosphere (None: closed).
    on_value: Callback<Option<Atmosphere>>,
    /// The workspace's solver error, if any.
    #[prop(into)]
    error: Signal<Option<SolverError>>,
    /// What the gas does in this workspace.
    hint: &'static str,
) -> impl IntoView {
    let msg_for = move |suffix: &'static str| -> Signal<Option<String>> {
        Signal::derive(move || {
            error.with(|e| {
                e.as_ref()
                    .filter(|e| error_field(e).is_some_and(|f| f.ends_with(suffix)))
                    .map(error_message)
            })
        })
    };
    let general = Signal::derive(move || {
        error.with(|e| {
            e.as_ref()
                .filter(|e| error_field(e).is_some_and(|f| f.ends_with("atmosphere")))
                .map(error_message)
        })
    });
    let on_kind = Callback::new(move |k: String| {
        let pressure_kpa = value.get_untracked().and_then(|a| a.pressure_kpa);
        let next = match k.as_str() {
            "percent" => Some(Atmosphere {
                pressure_kpa,
                ..Atmosphere::percent(5.0)
            }),
            "uatm" => Some(Atmosphere {
                pressure_kpa,
                ..Atmosphere::uatm(solver::atmosphere::ROOM_AIR_UATM)
            }),
            _ => None,
        };
        on_value.run(next);
    });
    let set = move |f: fn(&mut Atmosphere, f64)| {
        Callback::new(move |v: f64| {
            if let Some(mut a) = value.get_untracked() {
                f(&mut a, v);
                on_value.run(Some(a));
            }
        })
    };
    // Rebuilt only when the kind changes, so typing in a field keeps its text.
    let kind = Memo::new(move |_| kind_of(value.get()));
    let (percent_path, uatm_path, kpa_path) = gas_paths(prefix);
    let fields = move || {
        let k = kind.get();
        (k != "closed").then(|| {
            let uatm = k == "uatm";
            let (label, co2_path, suffix, testid_suffix) = if uatm {
                ("CO₂ partial pressure", uatm_path, "µatm", "co2_uatm")
            } else {
                ("CO₂ (% of the dry gas, humidified)", percent_path, "%", "co2_percent")
            };
            let shown = Signal::derive(move || {
                value
                    .get()
                    .map_or(0.0, |a| a.co2_uatm.or(a.co2_percent).unwrap_or(0.0))
            });
            let on_co2 = if uatm {
                set(|a, v| a.co2_uatm = Some(v))
            } else {
                set(|a, v| a.co2_percent = Some(v))
            };
            view! {
                <div class="row-2">
                    <NumberField
                        id=format!("{prefix}-co2-value")
                        label=label
                        value=shown
                        on_value=on_co2
                        path=co2_path
                        suffix=suffix
                        error=msg_for(testid_suffix)
                    />
                    <NumberField
                        id=format!("{prefix}-co2-pressure")
                        label="Total pressure"
                        value=Signal::derive(move || value.get().and_then(|a| a.pressure_kpa).unwrap_or(STANDARD_KPA))
                        on_value=set(|a, v| a.pressure_kpa = (v != STANDARD_KPA).then_some(v))
                        path=kpa_path
                        suffix="kPa"
                        error=msg_for("pressure_kpa")
                    />
                </div>
            }
        })
    };
    view! {
        <div class="gas-input" data-testid=format!("{prefix}-co2")>
            <Choice
                name=format!("{prefix}-co2-kind")
                legend="CO₂ atmosphere"
                options=vec![
                    ChoiceOption::new("closed", "None (closed)"),
                    ChoiceOption::new("percent", "CO₂ %"),
                    ChoiceOption::new("uatm", "CO₂ µatm"),
                ]
                selected=Signal::derive(move || kind.get().to_string())
                on_change=on_kind
            />
            {move || (kind.get() != "closed").then(|| view! { <p class="hint">{hint}</p> })}
            {fields}
            {move || general.get().map(|m| view! {
                <p class="field-error" role="alert" data-testid=format!("error-{prefix}-co2")>{m}</p>
            })}
        </div>
    }
}

/// Under the gas: the same solution in room air and at another CO₂ %, the
/// CO₂ that meets the target, and pH against CO₂ % (shown once the page has
/// painted). Nothing when the solution has no atmosphere.
#[component]
pub fn GasPanel(
    /// Id prefix: `recipe` or `mixture`.
    prefix: &'static str,
    /// The solution under its gas (the recipe's finished solution, the flask).
    #[prop(into)]
    mixture: Signal<Option<MixtureSpec>>,
    /// The design's systems besides the library.
    custom: Memo<Vec<AcidSystem>>,
    /// The target pH to mark (the recipe's).
    #[prop(into)]
    target: Signal<Option<f64>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let wi = Memo::new(move |_| design.with(|d| d.what_if));
    let gassed = Memo::new(move |_| mixture.get().filter(|m| m.atmosphere.is_some()));
    let what = Memo::new(move |_| {
        gassed.with(|m| {
            m.as_ref().map(|m| {
                let mut w = wi.get();
                w.co2_percent = Some(w.co2_percent.unwrap_or(OTHER_PERCENT));
                custom.with(|c| gas_what_if(m, c, &w))
            })
        })
    });
    let view_data = Memo::new(move |_| {
        gassed.with(|m| {
            m.as_ref().map(|m| {
                custom
                    .with(|c| co2_curve(m, c, target.get(), CURVE_MAX, 41))
                    .map(|curve| Co2View {
                        current: m.atmosphere.and_then(|a| a.co2_percent).and_then(|x| {
                            what.with(|w| {
                                w.as_ref().and_then(|w| w.as_ref().ok()).map(|w| (x, w.ph))
                            })
                        }),
                        curve,
                    })
            })
        })
    });
    let line = move |room: bool| {
        move || {
            what.with(|w| match w {
                Some(Ok(w)) => {
                    let new = if room {
                        w.room_air_ph
                    } else {
                        w.other_ph.unwrap_or(f64::NAN)
                    };
                    format!("pH {} (change {})", fmt_ph(new), fmt_dph(new - w.ph))
                }
                _ => "—".into(),
            })
        }
    };
    let failed = move || {
        what.with(|w| match w {
            Some(Err(e)) => Some(error_message(e)),
            _ => None,
        })
    };
    let target_line = move || {
        view_data.with(|v| match v {
            Some(Ok(v)) => match (v.curve.target_ph, v.curve.target_co2_percent) {
                (Some(t), Some(x)) => Some(format!(
                    "It reaches the target pH {} at {} % CO₂.",
                    fmt_ph(t),
                    crate::plots::data::sig(x, 3)
                )),
                (Some(t), None) => Some(format!(
                    "No CO₂ between 0 and 100 % gives the target pH {}.",
                    fmt_ph(t)
                )),
                _ => None,
            },
            _ => None,
        })
    };
    let paint = move |area: &CanvasArea, scale: f64| {
        view_data.with(|v| match v {
            Some(Ok(v)) => draw_co2(area, v, scale).ok(),
            _ => None,
        })
    };
    let label = Signal::derive(move || {
        view_data.with(|v| match v {
            Some(Ok(v)) => co2_summary(v),
            _ => "No plot.".into(),
        })
    });
    // Built when a gas appears, not on every change of the solution.
    let has = Memo::new(move |_| gassed.with(Option::is_some));
    move || {
        has.get().then(|| {
            view! {
                <section class="card whatif" data-testid=format!("{prefix}-gas")>
                    <h2 class="card-title">"Under the gas"</h2>
                    <p class="hint">
                        "The pH once the solution has equilibrated with each gas; the time that takes is not computed."
                    </p>
                    <div class="whatif-grid">
                        <div class="whatif-item">
                            <NumberField
                                id=format!("gas-{prefix}-room")
                                label="In room air"
                                value=Signal::derive(move || wi.get().room_co2_uatm.unwrap_or(solver::atmosphere::ROOM_AIR_UATM))
                                on_value=Callback::new(move |v| design.update(|d| d.what_if.room_co2_uatm = Some(v)))
                                path="what_if.room_co2_uatm"
                                suffix="µatm"
                            />
                            <p class="whatif-out" data-testid=format!("{prefix}-gas-room-result")>{line(true)}</p>
                        </div>
                        <div class="whatif-item">
                            <NumberField
                                id=format!("gas-{prefix}-other")
                                label="At another CO₂"
                                value=Signal::derive(move || wi.get().co2_percent.unwrap_or(OTHER_PERCENT))
                                on_value=Callback::new(move |v| design.update(|d| d.what_if.co2_percent = Some(v)))
                                path="what_if.co2_percent"
                                suffix="%"
                            />
                            <p class="whatif-out" data-testid=format!("{prefix}-gas-other-result")>{line(false)}</p>
                        </div>
                    </div>
                    {move || target_line().map(|t| view! { <p data-testid=format!("{prefix}-gas-target")>{t}</p> })}
                    {move || failed().map(|m| view! { <p class="result-error" role="alert">{m}</p> })}
                    {move || app.painted.get().then(|| view! {
                        <figure class="plot-figure">
                            <figcaption><strong>"pH against CO₂"</strong>" — at the working temperature, the target dashed, the gas in use as a dot."</figcaption>
                            <PlotCanvas
                                testid=if prefix == "recipe" { "recipe-co2-plot" } else { "mixture-co2-plot" }
                                label=label
                                paint=paint
                                on_point=Callback::new(|_| {})
                                on_step=Callback::new(|_| {})
                            />
                        </figure>
                    })}
                </section>
            }
        })
    }
}

/// The field sample at equilibrium with its gas: its own CO₂, the pH it
/// settles at and the CO₂ it would lose or gain.
#[component]
pub fn FieldGasLines(
    /// The solver's answer (None: no atmosphere given).
    #[prop(into)]
    result: Signal<Option<Result<FieldGas, SolverError>>>,
) -> impl IntoView {
    move || {
        result.with(|r| match r {
            Some(Ok(g)) => {
                let sig = crate::plots::data::sig;
                let change = if g.co2_change_mg_l < 0.0 {
                    format!("it would lose {} mg/L of CO₂", sig(-g.co2_change_mg_l, 3))
                } else {
                    format!("it would take up {} mg/L of CO₂", sig(g.co2_change_mg_l, 3))
                };
                Some(view! {
                    <section class="card whatif" data-testid="field-gas">
                        <h2 class="card-title">"With the air"</h2>
                        <p data-testid="field-gas-sample">{format!(
                            "The sample as read is in balance with {} µatm of CO₂.",
                            sig(g.sample_co2_uatm, 3)
                        )}</p>
                        <p data-testid="field-gas-result">{format!(
                            "Left to equilibrate with {} µatm it settles at pH {}: {change} (dissolved carbon {} → {} mmol/L; free CO₂ then {} mg/L).",
                            sig(g.gas.co2_uatm, 3),
                            fmt_ph(g.equilibrium_ph),
                            sig(g.dic_sample_mmol_l, 3),
                            sig(g.dic_equilibrium_mmol_l, 3),
                            sig(g.free_co2_equilibrium_mg_l, 3)
                        )}</p>
                        <p class="hint">"The alkalinity is kept (CO₂ exchange does not change it); the time to equilibrate is not computed."</p>
                    </section>
                })
            }
            _ => None,
        })
    }
}
