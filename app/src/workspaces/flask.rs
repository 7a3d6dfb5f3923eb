//! Flask workspace: what is in the flask → pH, ionic strength, species; and what-if changes.
//!
//! Rows (buffer components and strong acids, bases or salts) are edited in
//! place in the design's mixture; the result and the what-ifs are `Memo`s
//! over `solve_mixture` and `what_if`.

use crate::state::use_app;
use crate::widgets::cautions::{cautions_for_many, corrosive_only_if, CautionPanel};
use crate::widgets::format::{
    error_field, error_message, fmt_capacity, fmt_conc, fmt_dph, fmt_pct, fmt_ph, pretty_formula,
    CONC_UNITS,
};
use crate::widgets::inputs::{all_systems, system_label, Choice, ChoiceOption, NumberField};
use crate::widgets::rows;
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

/// Prefix of the buffer component rows' field ids (`mixture-comp-<key>-conc`).
const COMP_PREFIX: &str = "mixture-comp-";
/// Prefix of the acid/base/salt rows' field ids (`mixture-add-<key>-conc`).
const ADD_PREFIX: &str = "mixture-add-";

/// The solver's message for `field` of row `pos` of `list` (`components[1].conc_m`).
fn row_error(
    result: Memo<Result<MixtureResult, SolverError>>,
    pos: Memo<Option<usize>>,
    list: &'static str,
    field: &'static str,
) -> Signal<Option<String>> {
    Signal::derive(move || {
        let i = pos.get()?;
        let path = format!("{list}[{i}].{field}");
        result.with(|r| match r {
            Err(e) if error_field(e).as_deref() == Some(path.as_str()) => Some(error_message(e)),
            _ => None,
        })
    })
}

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
    // Rows are keyed by a stable id, never by position (see `widgets::rows`).
    let comp_keys = rows::keyed(COMP_PREFIX, n_comp, app.rows, app.revision);
    let add_keys = rows::keyed(ADD_PREFIX, n_add, app.rows, app.revision);
    let readonly = move || app.view.with(|v| v.readonly);

    let err_for = move |path: &'static str| -> Signal<Option<String>> {
        Signal::derive(move || {
            result.with(|r| match r {
                Err(e) if error_field(e).as_deref() == Some(path) => Some(error_message(e)),
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
                    <rows::KeyedRows keys=comp_keys row=Callback::new(move |k| view! {
                        <ComponentRow row=k pos=rows::position(comp_keys, k) spec=spec custom=custom result=result />
                    }.into_any()) />
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
                    <rows::KeyedRows keys=add_keys row=Callback::new(move |k| view! {
                        <AdditiveRow row=k pos=rows::position(add_keys, k) spec=spec result=result />
                    }.into_any()) />
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
                        path="mixture.temperature_c"
                        suffix="°C"
                        error=err_for("temperature_c")
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
                <crate::workspaces::gas::GasInput
                    prefix="mixture"
                    value=Signal::derive(move || spec.with(|s| s.atmosphere))
                    on_value=Callback::new(move |a| design.update(|d| d.mixture.atmosphere = a))
                    error=Signal::derive(move || result.with(|r| r.as_ref().err().cloned()))
                    hint="The flask has equilibrated with this gas: its dissolved CO₂ is fixed and the carbonate follows. It must list the carbonate system (0 M for plain water)."
                />
            </div>
            <div class="results">
                <MixtureResultView result=result pending=pending />
                <crate::reagents::UserReagentNote systems=Signal::derive(move || design.with(|d| d.mixture.components.iter().map(|c| c.system.clone()).collect::<Vec<_>>())) />
                <WhatIfPanel wi=wi whatif=whatif pending=Signal::derive(move || pending.get() || pending_wi.get()) />
                <crate::workspaces::gas::GasPanel prefix="mixture" mixture=Signal::derive(move || (!pending.get() && result.with(Result::is_ok)).then(|| spec.get())) custom=custom target=Signal::derive(|| None) />
                <CautionPanel items=cautions testid="mixture-cautions" />
            </div>
        </div>
    }
}

/// One buffer component row: system, form (or free acid), concentration, remove.
/// `row` is its stable key (its field ids), `pos` where it is now.
#[component]
fn ComponentRow(
    row: u64,
    pos: Memo<Option<usize>>,
    spec: Memo<MixtureSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<MixtureResult, SolverError>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let comp = move || spec.with(|s| pos.get().and_then(|i| s.components.get(i).cloned()));
    let system = move || comp().map(|c| c.system).unwrap_or_default();
    let form = move || {
        comp()
            .and_then(|c| c.form)
            .unwrap_or_else(|| FREE.to_string())
    };
    let edit = move |f: Box<dyn FnOnce(&mut ComponentSpec)>| {
        if let Some(i) = pos.get_untracked() {
            design.update(|d| {
                if let Some(c) = d.mixture.components.get_mut(i) {
                    f(c);
                }
            });
        }
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
    let n = move || pos.get().map_or(0, |i| i + 1);
    let sys_id = format!("{COMP_PREFIX}{row}-system");
    let form_id = format!("{COMP_PREFIX}{row}-form");
    view! {
        <div class="row-card" data-testid=format!("{COMP_PREFIX}{row}")>
            <div class="field">
                <label for=sys_id.clone()>{move || format!("Component {} system", n())}</label>
                <select
                    id=sys_id
                    disabled=readonly
                    prop:value=system
                    on:change=move |ev| {
                        let v = event_target_value(&ev);
                        edit(Box::new(move |c: &mut ComponentSpec| {
                            c.system = v;
                            c.form = None;
                        }));
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
                        edit(Box::new(move |c: &mut ComponentSpec| {
                            c.form = if v == FREE { None } else { Some(v) };
                        }));
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
                prefix=COMP_PREFIX
                row=row
                pos=pos
                path="mixture.components[].conc_m"
                remove_label=Signal::derive(move || format!("Remove buffer component {}", n()))
                value=Signal::derive(move || comp().map_or(0.0, |c| c.conc_m))
                on_value=Callback::new(move |v| edit(Box::new(move |c: &mut ComponentSpec| c.conc_m = v)))
                on_remove=Callback::new(move |i: usize| {
                    design.update(|d| {
                        if i < d.mixture.components.len() {
                            d.mixture.components.remove(i);
                        }
                    })
                })
                error=row_error(result, pos, "components", "conc_m")
            />
        </div>
    }
}

/// The end of a row: its concentration and its remove button, shared by the
/// flask's rows and the recipe's salts. Ids are `{prefix}{row}-conc` and
/// `{prefix}{row}-remove` with the row's stable key; removing the row takes
/// its key with it (see `widgets::rows`), so no other row inherits its text or unit.
#[component]
pub(crate) fn RowEnd(
    prefix: &'static str,
    row: u64,
    pos: Memo<Option<usize>>,
    path: &'static str,
    remove_label: Signal<String>,
    value: Signal<f64>,
    on_value: Callback<f64>,
    on_remove: Callback<usize>,
    error: Signal<Option<String>>,
) -> impl IntoView {
    let app = use_app();
    let readonly = move || app.view.with(|v| v.readonly);
    view! {
        <div class="row-end">
            <NumberField
                id=format!("{prefix}{row}-conc")
                label="Concentration"
                path=path
                value=value
                on_value=on_value
                units=CONC_UNITS
                error=error
            />
            <button
                type="button"
                class="btn icon"
                aria-label=remove_label
                data-testid=format!("{prefix}{row}-remove")
                disabled=readonly
                on:click=move |_| {
                    if let Some(i) = pos.get_untracked() {
                        app.rows.update_value(|r| r.removed(prefix, i));
                        on_remove.run(i);
                    }
                }
            >
                "✕"
            </button>
        </div>
    }
}

/// One strong acid / base / salt row (`row` its stable key, `pos` where it is now).
#[component]
fn AdditiveRow(
    row: u64,
    pos: Memo<Option<usize>>,
    spec: Memo<MixtureSpec>,
    result: Memo<Result<MixtureResult, SolverError>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let item = move || spec.with(|s| pos.get().and_then(|i| s.additives.get(i).copied()));
    let key = move || item().map_or("nacl", |a| additive_key(a.additive));
    let edit = move |f: Box<dyn FnOnce(&mut AdditiveSpec)>| {
        if let Some(i) = pos.get_untracked() {
            design.update(|d| {
                if let Some(x) = d.mixture.additives.get_mut(i) {
                    f(x);
                }
            });
        }
    };
    let n = move || pos.get().map_or(0, |i| i + 1);
    let sel_id = format!("{ADD_PREFIX}{row}-kind");
    view! {
        <div class="row-card" data-testid=format!("{ADD_PREFIX}{row}")>
            <div class="field">
                <label for=sel_id.clone()>{move || format!("Addition {}", n())}</label>
                <select
                    id=sel_id
                    disabled=readonly
                    prop:value=key
                    on:change=move |ev| {
                        let a = additive_from_key(&event_target_value(&ev));
                        edit(Box::new(move |x: &mut AdditiveSpec| x.additive = a));
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
                prefix=ADD_PREFIX
                row=row
                pos=pos
                path="mixture.additives[].conc_m"
                remove_label=Signal::derive(move || format!("Remove acid, base or salt {}", n()))
                value=Signal::derive(move || item().map_or(0.0, |a| a.conc_m))
                on_value=Callback::new(move |v| edit(Box::new(move |x: &mut AdditiveSpec| x.conc_m = v)))
                on_remove=Callback::new(move |i: usize| {
                    design.update(|d| {
                        if i < d.mixture.additives.len() {
                            d.mixture.additives.remove(i);
                        }
                    })
                })
                error=row_error(result, pos, "additives", "conc_m")
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
                        path="what_if.dilution_factor"
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
                        path="what_if.add_acid_m"
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
                        path="what_if.add_base_m"
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
                        path="what_if.temperature_c"
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
