//! Flask workspace: what is in the flask → pH, ionic strength, species; and what-if changes.
//!
//! Rows (buffer components and strong acids, bases or salts) are edited in
//! place in the design's mixture; the result and the what-ifs are `Memo`s
//! over `solve_mixture` and `what_if`.

use crate::state::use_app;
use crate::widgets::cautions::{cautions_for_many, corrosive_only_if, CautionPanel};
use crate::widgets::format::{
    error_field, error_message, fmt_capacity, fmt_conc, fmt_dph, fmt_pct, fmt_ph, pretty_formula,
    AMOUNT, CONC_UNITS, DILUTION, TEMPERATURE,
};
use crate::widgets::inputs::{all_systems, system_label, Choice, ChoiceOption, NumberField};
use leptos::prelude::*;
use solver::document::PlotSource;
use solver::equilibrium::activity::ActivityModel;
use solver::equilibrium::Warning;
use solver::mixture::{
    lookup, solve_mixture, what_if, Additive, AdditiveSpec, ComponentSpec, MixtureResult,
    MixtureSpec, WhatIf, WhatIfResult,
};
use solver::system::library::find_form;
use solver::system::{AcidSystem, ReagentForm};
use solver::SolverError;

/// Value of the "as the free acid" form option.
const FREE: &str = "__free";

fn additive_label(a: Additive) -> &'static str {
    match a {
        Additive::Hcl => "HCl — hydrochloric acid",
        Additive::Naoh => "NaOH — sodium hydroxide",
        Additive::Koh => "KOH — potassium hydroxide",
        Additive::Nacl => "NaCl — sodium chloride",
        Additive::Kcl => "KCl — potassium chloride",
    }
}

fn additive_key(a: Additive) -> &'static str {
    match a {
        Additive::Hcl => "hcl",
        Additive::Naoh => "naoh",
        Additive::Koh => "koh",
        Additive::Nacl => "nacl",
        Additive::Kcl => "kcl",
    }
}

fn additive_from_key(k: &str) -> Additive {
    Additive::ALL
        .into_iter()
        .find(|a| additive_key(*a) == k)
        .unwrap_or(Additive::Nacl)
}

fn mixture_cautions(
    spec: &MixtureSpec,
    custom: &[AcidSystem],
) -> Vec<crate::widgets::cautions::Caution> {
    let systems: Vec<&AcidSystem> = spec
        .components
        .iter()
        .filter_map(|c| lookup(&c.system, custom).ok())
        .collect();
    // Each component's shelf form, looked up once (None: added as the free acid).
    let forms: Vec<Option<&ReagentForm>> = spec
        .components
        .iter()
        .map(|c| {
            let sys = lookup(&c.system, custom).ok()?;
            find_form(sys, c.form.as_deref()?)
        })
        .collect();
    let formulas: Vec<&str> = forms.iter().flatten().map(|f| f.formula.as_str()).collect();
    let additives: Vec<Additive> = spec.additives.iter().map(|a| a.additive).collect();
    let free_form = spec
        .components
        .iter()
        .zip(&forms)
        .any(|(c, f)| c.form.is_none() || f.is_some_and(|f| f.counter_ions.is_empty()));
    corrosive_only_if(
        cautions_for_many(&systems, &formulas, &additives),
        free_form,
    )
}

/// The flask workspace.
#[component]
pub fn FlaskWorkspace() -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let spec = Memo::new(move |_| design.with(|d| d.mixture.clone()));
    let custom = Memo::new(move |_| design.with(|d| d.systems()));
    let wi = Memo::new(move |_| design.with(|d| d.what_if));
    let result = Memo::new(move |_| spec.with(|s| custom.with(|c| solve_mixture(s, c))));
    let whatif = Memo::new(move |_| spec.with(|s| custom.with(|c| wi.with(|w| what_if(s, c, w)))));
    let pending = Memo::new(move |_| !app.pending_in("mixture-").is_empty());
    let pending_wi = Memo::new(move |_| !app.pending_in("whatif-").is_empty());
    let n_comp = Memo::new(move |_| spec.with(|s| s.components.len()));
    let n_add = Memo::new(move |_| spec.with(|s| s.additives.len()));
    let readonly = move || app.view.with(|v| v.readonly);

    let err_for = move |path: String| -> Signal<Option<String>> {
        Signal::derive(move || {
            result.with(|r| match r {
                Err(e) if error_field(e).as_deref() == Some(path.as_str()) => {
                    Some(error_message(e))
                }
                _ => None,
            })
        })
    };

    let add_component = move |_| {
        design.update(|d| {
            let system = d
                .mixture
                .components
                .last()
                .map_or_else(|| "phosphate".to_string(), |c| c.system.clone());
            d.mixture.components.push(ComponentSpec {
                system,
                form: None,
                conc_m: 0.01,
            });
        });
    };
    let add_additive = move |_| {
        design.update(|d| {
            d.mixture.additives.push(AdditiveSpec {
                additive: Additive::Nacl,
                conc_m: 0.1,
            });
        });
    };
    let cautions = Signal::derive(move || spec.with(|s| custom.with(|c| mixture_cautions(s, c))));

    let answer = Signal::derive(move || {
        if pending.get() {
            return (
                false,
                "Correct the marked fields to see the pH.".to_string(),
            );
        }
        result.with(|r| match r {
            Err(e) => (false, format!("No answer: {}", error_message(e))),
            Ok(r) => (
                true,
                format!(
                    "pH {} at {} °C · I {} · β {}",
                    fmt_ph(r.equilibrium.ph),
                    spec.with(|s| crate::widgets::format::fmt_input(s.temperature_c)),
                    fmt_conc(r.equilibrium.ionic_strength),
                    fmt_capacity(r.equilibrium.capacity)
                ),
            ),
        })
    });
    view! {
        <crate::widgets::answer::AnswerBar text=Signal::derive(move || answer.get().1) ok=Signal::derive(move || answer.get().0) />
        <div class="ws-grid">
            <div class="inputs card">
                <h2 class="card-title">"In the flask"</h2>
                <h3 id="mixture-components-title">"Buffer components"</h3>
                <div class="rows" role="group" aria-labelledby="mixture-components-title">
                    {move || {
                        let n = n_comp.get();
                        (0..n)
                            .map(|i| view! { <ComponentRow i=i spec=spec custom=custom err_for=err_for /> })
                            .collect_view()
                    }}
                    {move || {
                        (n_comp.get() == 0)
                            .then(|| view! { <p class="hint">"No buffer components yet."</p> })
                    }}
                </div>
                <button type="button" class="btn secondary" data-testid="mixture-add-component"
                    disabled=readonly on:click=add_component>
                    "+ Add a buffer component"
                </button>
                {move || (!app.view.with(|v| v.readonly)).then(|| view! {
                    <crate::reagents::ReagentPanel
                        id="mixture"
                        selected=Signal::derive(move || spec.with(|s| s.components.last().map_or_else(|| "phosphate".to_string(), |c| c.system.clone())))
                        on_pick=Callback::new(|_id: String| {})
                    />
                })}
                <h3 id="mixture-additives-title">"Strong acids, bases and salts"</h3>
                <div class="rows" role="group" aria-labelledby="mixture-additives-title">
                    {move || {
                        let n = n_add.get();
                        (0..n)
                            .map(|i| view! { <AdditiveRow i=i spec=spec err_for=err_for /> })
                            .collect_view()
                    }}
                </div>
                <button type="button" class="btn secondary" data-testid="mixture-add-additive"
                    disabled=readonly on:click=add_additive>
                    "+ Add acid, base or salt"
                </button>
                <div class="row-2">
                    <NumberField
                        id="mixture-temp"
                        label="Temperature"
                        value=Signal::derive(move || spec.with(|s| s.temperature_c))
                        on_value=Callback::new(move |v| design.update(|d| d.mixture.temperature_c = v))
                        rule=TEMPERATURE
                        suffix="°C"
                        error=err_for("temperature_c".into())
                    />
                    <Choice
                        name="mixture-activity"
                        legend="Activity model"
                        options=vec![
                            ChoiceOption::new("davies", "Davies"),
                            ChoiceOption::new("ideal", "Ideal"),
                        ]
                        selected=Signal::derive(move || {
                            spec.with(|s| if s.activity == ActivityModel::Ideal { "ideal" } else { "davies" }.to_string())
                        })
                        on_change=Callback::new(move |v: String| {
                            design.update(|d| {
                                d.mixture.activity = if v == "ideal" { ActivityModel::Ideal } else { ActivityModel::Davies };
                            })
                        })
                    />
                </div>
            </div>
            <div class="results">
                <MixtureResultView result=result pending=pending />
                <crate::reagents::UserReagentNote systems=Signal::derive(move || design.with(|d| d.mixture.components.iter().map(|c| c.system.clone()).collect::<Vec<_>>())) />
                <WhatIfPanel wi=wi whatif=whatif pending=Signal::derive(move || pending.get() || pending_wi.get()) />
                <CautionPanel items=cautions testid="mixture-cautions" />
            </div>
        </div>
    }
}

/// One buffer component row: system, form (or free acid), concentration, remove.
#[component]
fn ComponentRow<F>(
    i: usize,
    spec: Memo<MixtureSpec>,
    custom: Memo<Vec<AcidSystem>>,
    err_for: F,
) -> impl IntoView
where
    F: Fn(String) -> Signal<Option<String>> + Copy + 'static,
{
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let row = move || spec.with(|s| s.components.get(i).cloned());
    let system = move || row().map(|c| c.system).unwrap_or_default();
    let form = move || {
        row()
            .and_then(|c| c.form)
            .unwrap_or_else(|| FREE.to_string())
    };
    let t = move || spec.with(|s| s.temperature_c);
    let systems = Memo::new(move |_| custom.with(|c| all_systems(c)));
    let forms = Memo::new(move |_| {
        let id = system();
        custom.with(|c| {
            lookup(&id, c)
                .map(|s| {
                    let mut v = vec![(
                        FREE.to_string(),
                        format!(
                            "as {} (no counter-ions)",
                            s.species.first().cloned().unwrap_or_default()
                        ),
                    )];
                    v.extend(s.forms.iter().map(|f| {
                        (
                            f.id.clone(),
                            format!("{} — {}", pretty_formula(&f.formula), f.name),
                        )
                    }));
                    v
                })
                .unwrap_or_default()
        })
    });
    let sys_id = format!("mixture-comp-{i}-system");
    let form_id = format!("mixture-comp-{i}-form");
    let remove_label = format!("Remove buffer component {}", i + 1);
    view! {
        <div class="row-card" data-testid=format!("mixture-comp-{i}")>
            <div class="field">
                <label for=sys_id.clone()>{format!("Component {} system", i + 1)}</label>
                <select
                    id=sys_id
                    disabled=readonly
                    prop:value=system
                    on:change=move |ev| {
                        let v = event_target_value(&ev);
                        design.update(|d| {
                            if let Some(c) = d.mixture.components.get_mut(i) {
                                c.system = v;
                                c.form = None;
                            }
                        });
                    }
                >
                    {move || {
                        let cur = system();
                        let tc = t();
                        systems
                            .get()
                            .into_iter()
                            .map(|s| {
                                let sel = s.id == cur;
                                let label = match crate::widgets::inputs::user_mark(&s) {
                                    Some(m) => format!("★ {} ({m})", system_label(&s, tc)),
                                    None => system_label(&s, tc),
                                };
                                view! { <option value=s.id.clone() selected=sel>{label}</option> }
                            })
                            .collect_view()
                    }}
                </select>
            </div>
            <div class="field">
                <label for=form_id.clone()>"Added as"</label>
                <select
                    id=form_id
                    disabled=readonly
                    prop:value=form
                    on:change=move |ev| {
                        let v = event_target_value(&ev);
                        design.update(|d| {
                            if let Some(c) = d.mixture.components.get_mut(i) {
                                c.form = if v == FREE { None } else { Some(v) };
                            }
                        });
                    }
                >
                    {move || {
                        let cur = form();
                        forms
                            .get()
                            .into_iter()
                            .map(|(id, text)| {
                                let sel = id == cur;
                                view! { <option value=id selected=sel>{text}</option> }
                            })
                            .collect_view()
                    }}
                </select>
            </div>
            <RowEnd
                prefix="mixture-comp-"
                i=i
                remove_label=remove_label
                value=Signal::derive(move || row().map_or(0.0, |c| c.conc_m))
                on_value=Callback::new(move |v| {
                    design.update(|d| {
                        if let Some(c) = d.mixture.components.get_mut(i) {
                            c.conc_m = v;
                        }
                    })
                })
                on_remove=Callback::new(move |()| {
                    design.update(|d| {
                        if i < d.mixture.components.len() {
                            d.mixture.components.remove(i);
                        }
                    })
                })
                error=err_for(format!("components[{i}].conc_m"))
            />
        </div>
    }
}

/// The end of a flask row: its concentration and its remove button, shared by
/// buffer components and acid/base/salt rows. Ids are `{prefix}{i}-conc` and
/// `{prefix}{i}-remove`; removing a row renumbers the typed text of the rows
/// after it (see `AppState::rows_removed`).
#[component]
pub(crate) fn RowEnd(
    prefix: &'static str,
    i: usize,
    remove_label: String,
    value: Signal<f64>,
    on_value: Callback<f64>,
    on_remove: Callback<()>,
    error: Signal<Option<String>>,
) -> impl IntoView {
    let app = use_app();
    let readonly = move || app.view.with(|v| v.readonly);
    view! {
        <div class="row-end">
            <NumberField
                id=format!("{prefix}{i}-conc")
                label="Concentration"
                value=value
                on_value=on_value
                rule=AMOUNT
                units=CONC_UNITS
                error=error
            />
            <button
                type="button"
                class="btn icon"
                aria-label=remove_label
                data-testid=format!("{prefix}{i}-remove")
                disabled=readonly
                on:click=move |_| {
                    app.rows_removed(prefix, i);
                    on_remove.run(());
                }
            >
                "✕"
            </button>
        </div>
    }
}

/// One strong acid / base / salt row.
#[component]
fn AdditiveRow<F>(i: usize, spec: Memo<MixtureSpec>, err_for: F) -> impl IntoView
where
    F: Fn(String) -> Signal<Option<String>> + Copy + 'static,
{
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let row = move || spec.with(|s| s.additives.get(i).copied());
    let key = move || row().map_or("nacl", |a| additive_key(a.additive));
    let sel_id = format!("mixture-add-{i}-kind");
    let remove_label = format!("Remove acid, base or salt {}", i + 1);
    view! {
        <div class="row-card" data-testid=format!("mixture-add-{i}")>
            <div class="field">
                <label for=sel_id.clone()>{format!("Addition {}", i + 1)}</label>
                <select
                    id=sel_id
                    disabled=readonly
                    prop:value=key
                    on:change=move |ev| {
                        let a = additive_from_key(&event_target_value(&ev));
                        design.update(|d| {
                            if let Some(x) = d.mixture.additives.get_mut(i) {
                                x.additive = a;
                            }
                        });
                    }
                >
                    {Additive::ALL
                        .into_iter()
                        .map(|a| {
                            let k = additive_key(a);
                            view! { <option value=k selected=move || key() == k>{additive_label(a)}</option> }
                        })
                        .collect_view()}
                </select>
            </div>
            <RowEnd
                prefix="mixture-add-"
                i=i
                remove_label=remove_label
                value=Signal::derive(move || row().map_or(0.0, |a| a.conc_m))
                on_value=Callback::new(move |v| {
                    design.update(|d| {
                        if let Some(x) = d.mixture.additives.get_mut(i) {
                            x.conc_m = v;
                        }
                    })
                })
                on_remove=Callback::new(move |()| {
                    design.update(|d| {
                        if i < d.mixture.additives.len() {
                            d.mixture.additives.remove(i);
                        }
                    })
                })
                error=err_for(format!("additives[{i}].conc_m"))
            />
        </div>
    }
}

/// pH, ionic strength, capacity and the species table.
#[component]
fn MixtureResultView(
    result: Memo<Result<MixtureResult, SolverError>>,
    pending: Memo<bool>,
) -> impl IntoView {
    let app = use_app();
    let plot_here = move |_| {
        app.design.update(|d| {
            d.plot_source = PlotSource::Mixture;
            d.workspace = solver::document::Workspace::Species;
        });
    };
    let body = move || {
        if pending.get() {
            return view! {
                <p class="stale" data-testid="mixture-stale" role="status">
                    "Correct the marked fields to see the pH."
                </p>
            }
            .into_any();
        }
        match result.get() {
            Err(e) => view! {
                <p class="result-error" data-testid="mixture-error" role="alert">
                    <strong>"No result: "</strong>
                    {error_message(&e)}
                </p>
            }
            .into_any(),
            Ok(r) => {
                let eq = r.equilibrium.clone();
                let mut notes = Vec::new();
                if eq.warnings.contains(&Warning::IonicStrengthBeyondModel) {
                    notes.push("Ionic strength is beyond the range the Davies equation is trusted in (about 0.5 M): treat the pH as approximate.");
                }
                if eq.warnings.contains(&Warning::ExtremePh) {
                    notes.push("Extreme pH: the model is rough this far from neutral.");
                }
                view! {
                    <div class="headline">
                        <div class="big-number">
                            <span class="big-label">"pH"</span>
                            <span class="big-value" data-testid="mixture-ph">{fmt_ph(eq.ph)}</span>
                        </div>
                        <dl class="facts">
                            <div>
                                <dt>"Ionic strength"</dt>
                                <dd data-testid="mixture-ionic">{fmt_conc(eq.ionic_strength)}</dd>
                            </div>
                            <div>
                                <dt>"Buffer capacity β"</dt>
                                <dd data-testid="mixture-capacity">{fmt_capacity(eq.capacity)}</dd>
                            </div>
                            <div>
                                <dt>"pKw"</dt>
                                <dd>{fmt_ph(r.pkw)}</dd>
                            </div>
                        </dl>
                        <crate::widgets::uncertainty::MixtureU ph=eq.ph />
                    </div>
                    {r
                        .systems
                        .iter()
                        .enumerate()
                        .map(|(si, s)| {
                            let pks = s.pks.iter().map(|p| fmt_ph(*p)).collect::<Vec<_>>().join(", ");
                            view! {
                                <table class="table species" data-testid=format!("mixture-species-{si}")>
                                    <caption>
                                        {format!("{} — total {} · pK {pks}", s.name, fmt_conc(s.total))}
                                    </caption>
                                    <thead>
                                        <tr>
                                            <th scope="col">"Species"</th>
                                            <th scope="col" class="num">"Concentration"</th>
                                            <th scope="col" class="num">"Share"</th>
                                        </tr>
                                    </thead>
                                    <tbody>
                                        {s
                                            .species
                                            .iter()
                                            .map(|row| {
                                                view! {
                                                    <tr>
                                                        <td class="formula">{row.name.clone()}</td>
                                                        <td class="num">{fmt_conc(row.conc)}</td>
                                                        <td class="num">
                                                            <span class="bar" style=format!("--share:{}", row.fraction.clamp(0.0, 1.0))></span>
                                                            {fmt_pct(row.fraction)}
                                                        </td>
                                                    </tr>
                                                }
                                            })
                                            .collect_view()}
                                    </tbody>
                                </table>
                            }
                        })
                        .collect_view()}
                    {(!r.ions.is_empty())
                        .then(|| {
                            let ions = r
                                .ions
                                .iter()
                                .map(|(ion, c)| format!("{} {}", ion.symbol(), fmt_conc(*c)))
                                .collect::<Vec<_>>()
                                .join(" · ");
                            view! { <p class="sub">"Spectator ions: " {ions}</p> }
                        })}
                    {(!notes.is_empty())
                        .then(|| {
                            view! {
                                <ul class="warnings">
                                    {notes.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                                </ul>
                            }
                        })}
                }
                .into_any()
            }
        }
    };
    view! {
        <section class="card result-card" aria-labelledby="mixture-result-title">
            <h2 class="card-title" id="mixture-result-title">"Equilibrium"</h2>
            <div aria-live="polite">{body}</div>
            <div class="actions">
                <button type="button" class="btn secondary" data-testid="mixture-plot" on:click=plot_here>
                    "Plot this flask in Species & capacity"
                </button>
            </div>
        </section>
    }
}

/// What-if controls, each applied alone to the flask.
#[component]
fn WhatIfPanel(
    wi: Memo<WhatIf>,
    whatif: Memo<Result<WhatIfResult, SolverError>>,
    #[prop(into)] pending: Signal<bool>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let line = move |which: u8| {
        move || {
            if pending.get() {
                return ("—".to_string(), String::new());
            }
            whatif.with(|r| match r {
                Ok(w) => {
                    let new = match which {
                        0 => w.diluted_ph,
                        1 => w.after_acid_ph,
                        2 => w.after_base_ph,
                        _ => w.at_temperature_ph,
                    };
                    (format!("pH {}", fmt_ph(new)), fmt_dph(new - w.ph))
                }
                Err(_) => ("—".to_string(), String::new()),
            })
        }
    };
    let wi_err = move || {
        whatif.with(|r| match r {
            Err(e) if !pending.get() => Some(error_message(e)),
            _ => None,
        })
    };
    let outcome = move |which: u8, testid: &'static str| {
        let l = line(which);
        let l2 = line(which);
        view! {
            <p class="whatif-out" data-testid=testid>
                <span class="whatif-ph">{move || l().0}</span>
                <span class="delta">{move || {
                    let d = l2().1;
                    if d.is_empty() { String::new() } else { format!("change {d}") }
                }}</span>
            </p>
        }
    };
    view! {
        <section class="card whatif" aria-labelledby="whatif-title">
            <h2 class="card-title" id="whatif-title">"What if…"</h2>
            <p class="hint">"Each change is applied alone to the flask as it is now."</p>
            <div class="whatif-grid">
                <div class="whatif-item">
                    <NumberField
                        id="whatif-dilution"
                        label="Dilute by a factor of"
                        value=Signal::derive(move || wi.get().dilution_factor)
                        on_value=Callback::new(move |v| design.update(|d| d.what_if.dilution_factor = v))
                        rule=DILUTION
                        suffix="×"
                    />
                    {outcome(0, "whatif-dilution-result")}
                </div>
                <div class="whatif-item">
                    <NumberField
                        id="whatif-acid"
                        label="Add strong acid (HCl)"
                        value=Signal::derive(move || wi.get().add_acid_m)
                        on_value=Callback::new(move |v| design.update(|d| d.what_if.add_acid_m = v))
                        rule=AMOUNT
                        units=CONC_UNITS
                    />
                    {outcome(1, "whatif-acid-result")}
                </div>
                <div class="whatif-item">
                    <NumberField
                        id="whatif-base"
                        label="Add strong base (NaOH)"
                        value=Signal::derive(move || wi.get().add_base_m)
                        on_value=Callback::new(move |v| design.update(|d| d.what_if.add_base_m = v))
                        rule=AMOUNT
                        units=CONC_UNITS
                    />
                    {outcome(2, "whatif-base-result")}
                </div>
                <div class="whatif-item">
                    <NumberField
                        id="whatif-temp"
                        label="Change temperature to"
                        value=Signal::derive(move || wi.get().temperature_c)
                        on_value=Callback::new(move |v| design.update(|d| d.what_if.temperature_c = v))
                        rule=TEMPERATURE
                        suffix="°C"
                    />
                    {outcome(3, "whatif-temp-result")}
                </div>
            </div>
            {move || wi_err().map(|m| view! { <p class="result-error" role="alert" data-testid="whatif-error">{m}</p> })}
            <p class="sub">"Acid and base amounts are per litre of the solution in the flask."</p>
        </section>
    }
}
