//! Meter bench workspace: the standards' pH at the bench temperature, the calibration check (2–5 points), a sample's pH from its millivolts.
//!
//! The calibration lives in the design (`design.calibration`); until the user
//! types, the bench shows a starting calibration (phosphate and phthalate at
//! 25 °C, no readings) that is not saved. Rows are keyed by a stable row id,
//! not by position, so a removed row takes its typed text and marks with it.
//! Every number comes from `solver::meter`. The tables and results wait for
//! the page's first paint (`AppState::painted`).

pub mod buffers;
pub mod sheet;

use crate::state::use_app;
use crate::widgets::format::{check_in, error_field, error_message, fmt_input, fmt_ph};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField};
use leptos::prelude::*;
use solver::meter::{
    displayed_to_mv, find_standard, fit_calibration, mv_to_displayed, standards_at, CalPoint,
    CalibrationFit, CalibrationSpec, Limits, STANDARDS,
};
use solver::SolverError;

/// Which standard "Add a standard" offers next (common practice: pH 7, 4, 10 first).
const NEXT_STANDARD: [&str; 9] = [
    "phosphate_1_1",
    "phthalate",
    "borax",
    "carbonate",
    "tetroxalate",
    "calcium_hydroxide",
    "citrate",
    "tartrate",
    "phosphate_1_3_5",
];

/// The calibration shown before the user has typed anything.
pub fn starting_calibration() -> CalibrationSpec {
    let p = |s: &str| CalPoint {
        standard: s.into(),
        mv: None,
        displayed_ph: None,
        lot: String::new(),
    };
    CalibrationSpec {
        temperature_c: 25.0,
        points: vec![p("phosphate_1_1"), p("phthalate")],
        ..Default::default()
    }
}

/// The meter bench.
#[component]
pub fn MeterWorkspace() -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let rev = app.revision;
    let cal = Memo::new(move |_| {
        design.with(|d| d.calibration.clone().unwrap_or_else(starting_calibration))
    });
    let fit = Memo::new(move |_| cal.with(fit_calibration));
    // The add-a-buffer form's fields do not hold up the calibration.
    let pending = Memo::new(move |_| {
        app.pending_in("meter-")
            .iter()
            .any(|id| !id.starts_with("meter-buf-"))
    });
    // Stable row ids, tagged with the revision they belong to.
    let ids = app.meter_rows;
    let rows = Memo::new(move |_| {
        let n = cal.with(|c| c.points.len());
        let r = rev.get();
        match ids.get() {
            (tag, v) if tag == r && v.len() == n => v,
            _ => (0..n as u64).collect(),
        }
    });
    let edit = move |f: &dyn Fn(&mut CalibrationSpec)| {
        design.update(|d| {
            let mut c = d.calibration.take().unwrap_or_else(starting_calibration);
            c.fit = None;
            f(&mut c);
            d.calibration = Some(c.with_fit());
        });
    };
    let edit_boxed = Callback::new(move |f: buffers::Edit| edit(&*f));
    let index_of = move |row: u64| rows.with(|r| r.iter().position(|x| *x == row));
    // Readings in displayed pH: as the points hold them, or as last picked
    // while no point has a reading yet.
    let kind_pick = RwSignal::new(false);
    let shown_ph = Memo::new(move |_| {
        cal.with(|c| {
            let shown = c.points.iter().any(|p| p.displayed_ph.is_some());
            let mv = c.points.iter().any(|p| p.mv.is_some());
            if shown || mv {
                shown && !mv
            } else {
                kind_pick.get()
            }
        })
    });
    let err_for = move |path: String| -> Signal<Option<String>> {
        Signal::derive(move || {
            fit.with(|r| match r {
                Err(e) if error_field(e).as_deref() == Some(path.as_str()) => {
                    Some(error_message(e))
                }
                _ => None,
            })
        })
    };
    let add = move |_| {
        let mut v = rows.get_untracked();
        let id = v.iter().max().map_or(1000, |m| (m + 1).max(1000));
        v.push(id);
        edit(&|c| {
            let t = c.temperature_c;
            let used: Vec<f64> = c
                .points
                .iter()
                .filter_map(|p| find_standard(&p.standard)?.ph_at(t, "t").ok())
                .map(|v| v.0)
                .collect();
            // The next standard in the order of the trade's usual 7-4-10 calibration,
            // published at this temperature and at least 1 pH from those in use.
            let s = NEXT_STANDARD
                .iter()
                .filter_map(|id| find_standard(id))
                .find(|s| {
                    s.ph_at(t, "t")
                        .is_ok_and(|(p, ..)| used.iter().all(|u| (u - p).abs() >= 1.0))
                })
                .map_or("borax", |s| s.id);
            c.points.push(CalPoint {
                standard: s.into(),
                mv: None,
                displayed_ph: None,
                lot: String::new(),
            });
        });
        ids.set((rev.get_untracked(), v));
    };
    let remove = move |row: u64| {
        let Some(i) = index_of(row) else { return };
        let mut v = rows.get_untracked();
        v.retain(|x| *x != row);
        edit(&|c| {
            if i < c.points.len() {
                c.points.remove(i);
            }
        });
        ids.set((rev.get_untracked(), v));
    };
    let on_kind = Callback::new(move |k: String| {
        kind_pick.set(k == "ph");
        edit(&|c| {
            let t = c.temperature_c;
            for p in &mut c.points {
                if k == "ph" {
                    p.displayed_ph =
                        p.mv.take()
                            .map(|mv| mv_to_displayed(mv, t))
                            .or(p.displayed_ph);
                } else {
                    p.mv = p
                        .displayed_ph
                        .take()
                        .map(|d| displayed_to_mv(d, t))
                        .or(p.mv);
                }
            }
        });
    });
    let row_view = move |row: u64| {
        let point = move || index_of(row).and_then(|i| cal.with(|c| c.points.get(i).cloned()));
        let path = move |leaf: &str| {
            index_of(row).map_or_else(String::new, |i| format!("calibration.points[{i}].{leaf}"))
        };
        let std_err = err_for(path("standard"));
        let mv_err = err_for(path("mv"));
        let ph_err = err_for(path("displayed_ph"));
        let sel_id = format!("meter-pt-{row}-std");
        let on_std = move |ev: leptos::ev::Event| {
            let v = event_target_value(&ev);
            if let Some(i) = index_of(row) {
                edit(&|c| {
                    if let Some(p) = c.points.get_mut(i) {
                        p.standard = v.clone();
                    }
                });
            }
        };
        let set_reading = move |v: f64| {
            if let Some(i) = index_of(row) {
                let shown = shown_ph.get_untracked();
                edit(&|c| {
                    if let Some(p) = c.points.get_mut(i) {
                        if shown {
                            p.displayed_ph = Some(v);
                        } else {
                            p.mv = Some(v);
                        }
                    }
                });
            }
        };
        let n = Signal::derive(move || index_of(row).map_or(0, |i| i + 1));
        view! {
            <div class="meter-row" data-testid=format!("meter-row-{row}") role="group"
                aria-label=move || format!("Standard {}", n.get())>
                <div class="field">
                    <label for=sel_id.clone()>{move || format!("Standard {}", n.get())}</label>
                    <select id=sel_id.clone() data-testid=sel_id.clone() on:change=on_std
                        prop:value=move || point().map(|p| p.standard).unwrap_or_default()>
                        {STANDARDS.iter().map(|s| view! { <option value=s.id>{s.name}</option> }).collect_view()}
                        {move || cal.with(|c| c.buffers.iter().map(|b| view! {
                            <option value=b.id.clone()>{format!("{} (yours)", b.name)}</option>
                        }).collect_view())}
                    </select>
                    {move || std_err.get().map(|m| view! { <p class="field-msg" role="alert">{m}</p> })}
                </div>
                {move || if shown_ph.get() {
                    view! {
                        <NumberField id=format!("meter-pt-{row}-ph") label="Displayed pH"
                            value=Signal::derive(move || point().and_then(|p| p.displayed_ph).unwrap_or(f64::NAN))
                            on_value=Callback::new(set_reading) path="calibration.points[].displayed_ph" error=ph_err />
                    }.into_any()
                } else {
                    view! {
                        <NumberField id=format!("meter-pt-{row}-mv") label="Reading"
                            value=Signal::derive(move || point().and_then(|p| p.mv).unwrap_or(f64::NAN))
                            on_value=Callback::new(set_reading) path="calibration.points[].mv" suffix="mV" error=mv_err />
                    }.into_any()
                }}
                <button type="button" class="btn remove" data-testid=format!("meter-remove-{row}")
                    aria-label=move || format!("Remove standard {}", n.get())
                    disabled=move || rows.with(|r| r.len() <= 2)
                    on:click=move |_| remove(row)>"Remove"</button>
            </div>
        }
    };
    let limit = move |id: &'static str,
                      label: &'static str,
                      path: &'static str,
                      suffix: &'static str,
                      get: fn(&Limits) -> f64,
                      set: fn(&mut Limits, f64)| {
        view! {
            <NumberField id=id label=label path=path suffix=suffix
                value=Signal::derive(move || cal.with(|c| get(&c.limits)))
                on_value=Callback::new(move |v| edit(&|c| set(&mut c.limits, v))) />
        }
    };
    view! {
        <div class="ws-grid meter">
            <div class="inputs card">
                <h2 class="card-title">"Calibration"</h2>
                <NumberField id="meter-temp" label="Temperature of the standards and the sample"
                    value=Signal::derive(move || cal.with(|c| c.temperature_c))
                    on_value=Callback::new(move |v| edit(&|c| c.temperature_c = v))
                    path="calibration.temperature_c" suffix="°C" error=err_for("calibration.temperature_c".into()) />
                <Choice name="meter-kind" legend="Readings are"
                    options=vec![ChoiceOption::new("mv", "Millivolts"), ChoiceOption::new("ph", "pH shown before adjustment")]
                    selected=Signal::derive(move || (if shown_ph.get() { "ph" } else { "mv" }).to_string())
                    on_change=on_kind />
                <For each=move || rows.get() key=|r| *r children=row_view />
                <button type="button" class="btn" data-testid="meter-add" on:click=add
                    disabled=move || rows.with(|r| r.len() >= solver::meter::calibration::POINTS_MAX)>
                    "Add a standard"
                </button>
                {move || err_for("calibration.points".into()).get().map(|m| view! {
                    <p class="field-msg" role="alert" data-testid="meter-points-error">{m}</p>
                })}
                <buffers::TechnicalBuffers cal=cal edit=edit_boxed />
                <details class="meter-limits">
                    <summary>"Acceptance limits (defaults: common practice)"</summary>
                    {limit("meter-lim-slope-min", "Slope at least", "calibration.limits.slope_min_percent", "% of Nernst", |l| l.slope_min_percent, |l, v| l.slope_min_percent = v)}
                    {limit("meter-lim-slope-max", "Slope at most", "calibration.limits.slope_max_percent", "% of Nernst", |l| l.slope_max_percent, |l, v| l.slope_max_percent = v)}
                    {limit("meter-lim-offset", "Offset within ±", "calibration.limits.offset_max_mv", "mV at pH 7", |l| l.offset_max_mv, |l, v| l.offset_max_mv = v)}
                    {limit("meter-lim-point", "Each point within ±", "calibration.limits.residual_max_ph", "pH", |l| l.residual_max_ph, |l, v| l.residual_max_ph = v)}
                </details>
                <SampleInput cal=cal edit=edit_boxed />
            </div>
            <div class="results">
                <Show when=move || app.painted.get()>
                    <FitView fit=fit pending=pending />
                    <StandardsTable t=Signal::derive(move || cal.with(|c| c.temperature_c)) />
                </Show>
                <p class="hint">{solver::meter::ATC_NOTE}</p>
            </div>
        </div>
    }
}

/// The sample's mV: optional, so an empty field means "no sample" (not an error).
#[component]
fn SampleInput(cal: Memo<CalibrationSpec>, edit: Callback<buffers::Edit>) -> impl IntoView {
    const ID: &str = "meter-sample-mv";
    let app = use_app();
    let rev = app.revision;
    let typed: RwSignal<Option<(u64, String)>> = RwSignal::new(None);
    let text = Memo::new(move |_| match typed.get() {
        Some((r, t)) if r == rev.get() => t,
        _ => cal.with(|c| c.sample_mv.map(fmt_input).unwrap_or_default()),
    });
    let parsed = Memo::new(move |_| {
        let t = text.get();
        if t.trim().is_empty() {
            Ok(None)
        } else {
            check_in(
                &t,
                solver::limits::CAL_SAMPLE_MV,
                1.0,
                app.decimal_comma.get(),
            )
            .map(Some)
        }
    });
    on_cleanup(move || app.mark_field(ID, true));
    let on_input = move |ev: leptos::ev::Event| {
        typed.set(Some((rev.get_untracked(), event_target_value(&ev))));
        let r = parsed.get_untracked();
        app.mark_field(ID, r.is_ok());
        if let Ok(v) = r {
            edit.run(Box::new(move |c| c.sample_mv = v));
        }
    };
    let invalid = move || parsed.with(Result::is_err);
    view! {
        <div class="field" class:invalid=invalid>
            <label for=ID>"Sample reading (optional)"</label>
            <p class="hint" id="hint-meter-sample-mv">"The pH of a sample read with this calibration; leave empty for none."</p>
            <div class="field-row">
                <input id=ID type="text" inputmode="decimal" autocomplete="off" spellcheck="false"
                    aria-describedby="hint-meter-sample-mv" aria-invalid=move || if invalid() { "true" } else { "false" }
                    prop:value=move || text.get() on:input=on_input />
                <span class="suffix" aria-hidden="true">"mV"</span>
            </div>
            {move || parsed.get().err().map(|m| view! {
                <p class="field-msg" role="alert" data-testid="error-meter-sample-mv">{m}</p>
            })}
        </div>
    }
}

fn fmt_mv(v: f64) -> String {
    format!("{v:+.1} mV").replace('-', "−")
}

#[component]
fn FitView(fit: Memo<Result<CalibrationFit, SolverError>>, pending: Memo<bool>) -> impl IntoView {
    let app = use_app();
    let recipe = Memo::new(move |_| {
        app.design.with(|d| {
            solver::recipe::solve_recipe(&d.recipe, &d.systems())
                .ok()
                .map(|r| (r.meter, d.recipe.tolerance_ph))
        })
    });
    move || {
        if pending.get() {
            return view! {
                <p class="stale" role="status" data-testid="meter-stale">"Correct the marked fields to see the calibration."</p>
            }
            .into_any();
        }
        match fit.get() {
            Err(e) => view! {
                <p class="result-error" role="alert" data-testid="meter-error">
                    <strong>"No calibration: "</strong>{error_message(&e)}
                </p>
            }
            .into_any(),
            Ok(f) => {
                let verdicts = f.verdicts.iter().map(|v| view! {
                    <li class=if v.pass { "pass" } else { "fail" } data-testid=format!("meter-verdict-{}", v.standard.clone().unwrap_or_else(|| v.check.clone()))>
                        <strong>{if v.pass { "Pass: " } else { "Fail: " }}</strong>{v.text.clone()}
                    </li>
                }).collect_view();
                let points = f.points.iter().map(|p| view! {
                    <tr><td>{if p.name.is_empty() { p.standard.clone() } else { p.name.clone() }}</td><td>{format!("{:.3}", p.ph)}</td><td>{fmt_mv(p.mv)}</td><td>{solver::meter::calibration::signed(p.residual_ph, 3)}</td></tr>
                }).collect_view();
                let sample = f.sample.map(|s| {
                    let check = recipe.get().filter(|(m, _)| (m.temperature_c - f.temperature_c).abs() < 0.05).map(|(m, tol)| {
                        let d = s.ph - m.ph;
                        format!("The recipe's buffer should read pH {} here: {} off ({} its tolerance ±{}).",
                            fmt_ph(m.ph), format!("{d:+.2}").replace('-', "−"),
                            if d.abs() <= tol { "within" } else { "outside" }, fmt_input(tol))
                    });
                    view! {
                        <div class="headline">
                            <div><span class="big-label">"Sample"</span>
                                <span class="big-value" data-testid="meter-sample-ph">{format!("pH {:.2}", s.ph)}</span>
                                <span data-testid="meter-sample-u">{format!(" ± {:.2} (U95, k = 2)", s.u95_ph)}</span></div>
                        </div>
                        {check.map(|c| view! { <p data-testid="meter-recipe-check">{c}</p> })}
                    }
                });
                view! {
                    <section class="card" aria-live="polite">
                        <h2 class="card-title">"Electrode"</h2>
                        <div class="headline">
                            <div><span class="big-label">"Slope"</span>
                                <span class="big-value" data-testid="meter-percent">{format!("{:.1} %", f.slope_percent)}</span>
                                <span data-testid="meter-slope">{format!(" {:.2} mV/pH (Nernst {:.2})", f.slope_mv_per_ph, f.nernst_mv_per_ph).replace('-', "−")}</span></div>
                            <div><span class="big-label">"Offset"</span>
                                <span class="big-value" data-testid="meter-offset">{fmt_mv(f.mv_at_ph7)}</span>
                                <span>{format!(" at pH 7; pH {:.2} at 0 mV", f.ph_at_0mv)}</span></div>
                        </div>
                        <ul class="meter-verdicts">{verdicts}</ul>
                        <table class="table"><thead><tr><th>"Standard"</th><th>"pH(S)"</th><th>"Reading"</th><th>"Residual pH"</th></tr></thead>
                            <tbody>{points}</tbody></table>
                        {sample}
                    </section>
                }
                .into_any()
            }
        }
    }
}

#[component]
fn StandardsTable(t: Signal<f64>) -> impl IntoView {
    let rows = Memo::new(move |_| standards_at(t.get()).unwrap_or_default());
    view! {
        <section class="card" data-testid="meter-standards">
            <h2 class="card-title">{move || format!("Standards at {} °C", fmt_input(t.get()))}</h2>
            <table class="table">
                <thead><tr><th>"Standard"</th><th>"pH(S)"</th><th>"Engine"</th><th class="hide-narrow">"Status"</th></tr></thead>
                <tbody>
                    {move || rows.get().into_iter().map(|r| {
                        let ph = r.ph.map_or_else(|| format!("only {}–{} °C", r.range_c.0, r.range_c.1), |p| format!("{p:.3} ± {}", r.u95));
                        let engine = r.engine_ph.map_or_else(|| "—".to_string(), |e| format!("{e:.3} ({})", format!("{:+.3}", r.difference.unwrap_or(0.0)).replace('-', "−")));
                        let status = format!("{}{}", r.status, if r.interpolated { ", interpolated" } else { "" });
                        view! {
                            <tr data-testid=format!("meter-std-{}", r.id)>
                                <td>{r.name}</td><td>{ph}</td><td>{engine}</td><td class="hide-narrow">{status}</td>
                            </tr>
                        }
                    }).collect_view()}
                </tbody>
            </table>
            <p class="hint">"pH(S): Buck et al. (2002) Pure Appl. Chem. 74, 2169; Bates (1973) for tetroxalate and calcium hydroxide; phthalate by Hamer, Pinching & Acree (1946). \"From memory\": recalled, not re-read. Engine: this page's own model of the same solution."</p>
        </section>
    }
}
