//! A day's log in the field tab: paste or open a CSV, check the column mapping, compute every row in chunks, export.
//!
//! Rows are computed in time-budgeted slices: a slice keeps computing
//! batches of rows until about [`SLICE_BUDGET_MS`] have passed, then gives
//! the main thread back through a zero-delay message (not the next
//! animation frame, so a slice follows as soon as the page has painted and
//! handled input) and carries on; every [`FRAME_EVERY_MS`] or so it waits
//! for a frame instead, so progress is painted. A small log finishes in its first slice;
//! a long one never freezes the page, and progress shows as it goes. A file that is
//! refused (binary, too big, no pH column) leaves the results already shown
//! untouched.

use super::log_data::{append_csv, override_choice, roles_per_column, LogSummary, ShownRow};
use super::log_keep;
use crate::plots::canvas::{CanvasArea, PlotCanvas};
use crate::plots::field::{draw_log, LogSeries};
use crate::widgets::format::{fmt_pct, fmt_ph, fmt_sig};
use leptos::prelude::*;
use solver::field::csv::MAX_BYTES;
use solver::field::log::{LogOptions, LogPlan, Role};
use solver::field::FieldSpec;
use solver::system::AcidSystem;
use wasm_bindgen::closure::Closure;
use wasm_bindgen::JsCast;

/// Rows per batch inside a slice (the clock is read between batches).
const BATCH: usize = 100;
/// Work per slice, ms, before the main thread is given back to the page.
const SLICE_BUDGET_MS: f64 = 10.0;
/// At least this long between frames (ms) while a log runs: after that the
/// next slice waits for a frame, so progress is painted.
const FRAME_EVERY_MS: f64 = 40.0;

#[wasm_bindgen::prelude::wasm_bindgen]
extern "C" {
    type MessageChannel;
    #[wasm_bindgen(constructor, catch)]
    fn new() -> Result<MessageChannel, wasm_bindgen::JsValue>;
    #[wasm_bindgen(method, getter)]
    fn port1(this: &MessageChannel) -> MessagePort;
    #[wasm_bindgen(method, getter)]
    fn port2(this: &MessageChannel) -> MessagePort;

    type MessagePort;
    #[wasm_bindgen(method, setter)]
    fn set_onmessage(this: &MessagePort, f: Option<&js_sys::Function>);
    #[wasm_bindgen(method, js_name = postMessage)]
    fn post_message(this: &MessagePort, msg: &wasm_bindgen::JsValue);
}

type Pending = std::cell::RefCell<Vec<Box<dyn FnOnce()>>>;

thread_local! {
    /// Work waiting for the next message, and the channel that delivers it.
    static PENDING: Pending = const { std::cell::RefCell::new(Vec::new()) };
    static CHANNEL: Option<(MessagePort, Closure<dyn FnMut()>)> = {
        let ch = MessageChannel::new().ok()?;
        let run = Closure::<dyn FnMut()>::new(|| {
            let jobs = PENDING.with(|p| std::mem::take(&mut *p.borrow_mut()));
            for job in jobs {
                job();
            }
        });
        ch.port1().set_onmessage(Some(run.as_ref().unchecked_ref()));
        Some((ch.port2(), run))
    };
}

/// Run `f` in a new task as soon as the page has had its turn (a zero-delay
/// message: no 4 ms timer clamp, no wait for the next frame); a zero-delay
/// timeout where message channels are missing.
fn after_yield(f: impl FnOnce() + 'static) {
    let posted = CHANNEL.with(|c| match c {
        Some((port, _)) => {
            PENDING.with(|p| p.borrow_mut().push(Box::new(f)));
            port.post_message(&wasm_bindgen::JsValue::NULL);
            None
        }
        None => Some(f),
    });
    if let Some(f) = posted {
        set_timeout(f, std::time::Duration::ZERO);
    }
}

/// Log options from the reading on the page: system, defaults, limit.
pub fn options_from(spec: &FieldSpec, mapping: Vec<(Role, String)>) -> LogOptions {
    let mut o = LogOptions::new(&spec.system);
    o.temperature_c = Some(spec.temperature_c);
    o.total = spec.total;
    o.total_unit = spec.total_unit;
    o.ionic = spec.ionic;
    if let Some(a) = spec.alkalinity {
        o.alkalinity_unit = a.unit;
    }
    o.limit = spec.limit;
    o.mapping.choices = mapping;
    o
}

#[derive(Clone, Copy)]
struct Run {
    plan: StoredValue<Option<LogPlan>>,
    csv: StoredValue<String>,
    acc: StoredValue<LogSummary>,
    id: StoredValue<u64>,
    /// When the page last had a frame during this run (ms, `Date.now()`).
    painted: StoredValue<f64>,
    progress: RwSignal<(usize, usize)>,
    summary: RwSignal<Option<LogSummary>>,
    running: RwSignal<bool>,
}

impl Run {
    fn start(self, plan: LogPlan) {
        let id = self.id.get_value() + 1;
        self.id.set_value(id);
        self.acc.set_value(LogSummary::new(&plan));
        self.csv.set_value(String::new());
        self.progress.set((0, plan.len()));
        self.plan.set_value(Some(plan));
        self.running.set(true);
        self.painted.set_value(js_sys::Date::now());
        // The first slice right away: a small log is done before the page paints.
        self.step(id);
    }

    fn step(self, id: u64) {
        if self.id.get_value() != id {
            return;
        }
        let t0 = js_sys::Date::now();
        let total = self.plan.with_value(|p| p.as_ref().map_or(0, LogPlan::len));
        loop {
            let done = self.acc.with_value(|a| a.done);
            if done >= total {
                self.running.set(false);
                self.progress.set((total, total));
                self.summary.set(Some(self.acc.get_value()));
                return;
            }
            let end = (done + BATCH).min(total);
            self.plan.with_value(|p| {
                if let Some(p) = p {
                    let out = p.compute(done..end);
                    self.acc.update_value(|a| a.add(p, done, &out));
                    let text = p.write_csv(&out);
                    self.csv.update_value(|c| append_csv(c, &text));
                }
            });
            if js_sys::Date::now() - t0 > SLICE_BUDGET_MS {
                self.progress.set((end, total));
                break;
            }
        }
        if js_sys::Date::now() - self.painted.get_value() >= FRAME_EVERY_MS {
            // Chromium paints only now and then between back-to-back message tasks: wait for
            // a frame (progress shown), then go on in a task after it.
            request_animation_frame(move || {
                self.painted.set_value(js_sys::Date::now());
                after_yield(move || self.step(id));
            });
        } else {
            after_yield(move || self.step(id));
        }
    }
}

fn role_label(r: Option<Role>) -> &'static str {
    match r {
        None => "not used",
        Some(Role::Label) => "label / time",
        Some(Role::Ph) => "pH",
        Some(Role::Temperature) => "temperature",
        Some(Role::Total) => "total",
        Some(Role::Conductivity) => "conductivity",
        Some(Role::Salinity) => "salinity",
        Some(Role::Alkalinity) => "alkalinity",
    }
}

fn row_view(r: ShownRow, unit: String) -> impl IntoView {
    let over = r.over;
    view! {
        <tr class:over=over data-line=r.line>
            <th scope="row">{r.line}</th>
            <td>{r.label}</td>
            <td>{r.ph.map(fmt_ph).unwrap_or_default()}</td>
            <td>{r.temperature_c.map(|t| fmt_sig(t, 3)).unwrap_or_default()}</td>
            <td>{r.fraction.map(fmt_pct).unwrap_or_default()}</td>
            <td>{r.value.map(|v| format!("{} {unit}", fmt_sig(v, 3))).unwrap_or_default()}</td>
            <td>{if over { "over" } else { "" }}</td>
        </tr>
    }
}

/// The day's log panel.
#[component]
pub fn DayLog(spec: Memo<FieldSpec>, custom: Memo<Vec<AcidSystem>>) -> impl IntoView {
    let source = StoredValue::new(Vec::<u8>::new());
    let name = RwSignal::new(String::from("log"));
    let pasted = RwSignal::new(String::new());
    let message = RwSignal::new(None::<String>);
    let mapping = RwSignal::new(Vec::<(Role, String)>::new());
    let columns = RwSignal::new(Vec::<(String, Option<Role>)>::new());
    let run = Run {
        plan: StoredValue::new(None),
        csv: StoredValue::new(String::new()),
        acc: StoredValue::new(LogSummary::default()),
        id: StoredValue::new(0),
        painted: StoredValue::new(0.0),
        progress: RwSignal::new((0, 0)),
        summary: RwSignal::new(None),
        running: RwSignal::new(false),
    };

    // Plan from the kept bytes and the current mapping; a refusal keeps what is shown.
    let plan_and_run = move || {
        let opts = spec.with_untracked(|s| options_from(s, mapping.get_untracked()));
        let planned =
            source.with_value(|b| custom.with_untracked(|c| LogPlan::new(b, &opts, c, None)));
        match planned {
            Ok(p) => {
                message.set(None);
                let roles = roles_per_column(&p.columns, p.table.header.len());
                columns.set(p.table.header.iter().cloned().zip(roles).collect());
                run.start(p);
            }
            Err(e) => message.set(Some(format!(
                "The log could not be read: {e}. Results already shown are kept."
            ))),
        }
    };
    // Kept for the page's life and across a reload (see `log_keep`).
    let keep = move || {
        source.with_value(|bytes| {
            let text = (bytes.len() <= 4 * log_keep::KEEP_MAX_CHARS)
                .then(|| String::from_utf8(bytes.clone()).ok())
                .flatten()
                .filter(|t| !t.is_empty());
            let mut d = log_keep::LogDraft {
                name: name.get_untracked(),
                pasted: pasted.get_untracked(),
                source_dropped: text.is_none() && !bytes.is_empty(),
                source: text,
                mapping: Vec::new(),
            };
            d.set_choices(&mapping.get_untracked());
            log_keep::keep(&d, bytes);
        });
    };
    let load = move |bytes: Vec<u8>, file: String| {
        if bytes.len() > MAX_BYTES {
            message.set(Some(format!(
                "“{file}” is over 50 MB: split it into smaller logs. Results already shown are kept."
            )));
            return;
        }
        source.set_value(bytes);
        name.set(file);
        mapping.set(Vec::new());
        plan_and_run();
        keep();
    };
    if let Some((d, bytes)) = log_keep::restore() {
        pasted.set(d.pasted.clone());
        name.set(d.name.clone());
        mapping.set(d.choices());
        if bytes.is_empty() {
            if d.source_dropped {
                message.set(Some(format!(
                    "The log “{}” was too large to keep across a reload: open it again (your column choices are kept).",
                    d.name
                )));
            }
        } else {
            source.set_value(bytes);
            plan_and_run();
        }
    }
    let on_file = move |ev: leptos::ev::Event| {
        let input = event_target::<web_sys::HtmlInputElement>(&ev);
        let Some(file) = input.files().and_then(|f| f.get(0)) else {
            return;
        };
        let fname = file.name();
        if file.size() > MAX_BYTES as f64 {
            message.set(Some(format!(
                "“{fname}” is over 50 MB: split it into smaller logs. Results already shown are kept."
            )));
            input.set_value("");
            return;
        }
        let Ok(reader) = web_sys::FileReader::new() else {
            return;
        };
        let r2 = reader.clone();
        let onload = Closure::once(move |_: web_sys::Event| {
            let bytes = r2
                .result()
                .map(|v| js_sys::Uint8Array::new(&v).to_vec())
                .unwrap_or_default();
            load(bytes, fname);
        });
        reader.set_onload(Some(onload.as_ref().unchecked_ref()));
        onload.forget();
        let _ = reader.read_as_array_buffer(&file);
        input.set_value("");
    };
    let on_pick_role = move |col: usize, value: String| {
        let current = columns.with_untracked(|c| c.get(col).and_then(|x| x.1));
        let role = Role::from_key(&value);
        mapping.update(|m| *m = override_choice(m, col, current, role));
        plan_and_run();
        keep();
    };
    let export = move |_| {
        let text = run.csv.get_value();
        if !text.is_empty() {
            let base = name.get_untracked();
            let base = base.trim_end_matches(".csv");
            crate::designs::download(&format!("{base}-results.csv"), &text);
        }
    };
    let series = Memo::new(move |_| {
        run.summary.with(|s| {
            s.as_ref().map(|s| LogSeries {
                label: format!("{}, {}", s.label, s.unit),
                points: s.points.clone(),
                rows: s.rows,
                limit: s.limit,
            })
        })
    });
    let paint = move |area: &CanvasArea, scale: f64| {
        series.with(|s| s.as_ref().and_then(|s| draw_log(area, s, scale).ok()))
    };
    let plot_label = Signal::derive(move || {
        run.summary.with(|s| {
            s.as_ref().map_or_else(String::new, |s| {
                format!(
                    "{} by row over {} rows; {} over your limit; {} rows could not be read.",
                    s.label, s.rows, s.flagged_count, s.error_count
                )
            })
        })
    });

    view! {
        <section class="card field-log" aria-labelledby="field-log-title" data-testid="field-log">
            <h2 class="card-title" id="field-log-title">"A day's log"</h2>
            <p class="hint">
                "Paste a CSV of readings or open a .csv file. Every row is computed with the settings of the reading above (system, defaults, your limit)."
            </p>
            <label for="field-log-text">"Paste CSV"</label>
            <textarea
                id="field-log-text"
                data-testid="field-log-text"
                rows="5"
                prop:value=move || pasted.get()
                on:input=move |ev| {
                    pasted.set(event_target_value(&ev));
                    keep();
                }
            ></textarea>
            <div class="log-actions">
                <button
                    type="button"
                    class="btn"
                    data-testid="field-log-read"
                    on:click=move |_| load(pasted.get_untracked().into_bytes(), "pasted-log".into())
                >
                    "Compute pasted log"
                </button>
                <label class="btn file-btn">
                    "Open .csv file"
                    <input type="file" accept=".csv,text/csv,text/plain" data-testid="field-log-file" on:change=on_file />
                </label>
                <button
                    type="button"
                    class="btn"
                    data-testid="field-log-again"
                    disabled=move || columns.with(Vec::is_empty)
                    on:click=move |_| plan_and_run()
                >
                    "Compute again with the reading's settings"
                </button>
            </div>
            {move || message.get().map(|m| view! {
                <p class="result-error" role="alert" data-testid="field-log-message">{m}</p>
            })}
            {move || (!columns.with(Vec::is_empty)).then(|| view! {
                <fieldset class="log-mapping" data-testid="field-log-mapping">
                    <legend>"Columns (guessed from the header; change any)"</legend>
                    {columns.get().into_iter().enumerate().map(|(i, (h, role))| {
                        let id = format!("field-log-col-{i}");
                        let current = role.map_or("none", Role::key);
                        view! {
                            <div class="log-col">
                                <label for=id.clone()>{h}</label>
                                <select id=id data-testid=format!("field-log-col-{i}") on:change=move |ev| on_pick_role(i, event_target_value(&ev))>
                                    {std::iter::once(None).chain(Role::ALL.iter().copied().map(Some)).map(|r| {
                                        let key = r.map_or("none", Role::key);
                                        view! { <option value=key selected={key == current}>{role_label(r)}</option> }
                                    }).collect_view()}
                                </select>
                            </div>
                        }
                    }).collect_view()}
                </fieldset>
            })}
            <p role="status" data-testid="field-log-progress" data-done=move || run.progress.get().0 data-total=move || run.progress.get().1 data-running=move || run.running.get().to_string()>
                {move || {
                    let (d, t) = run.progress.get();
                    if t == 0 { String::new() }
                    else if run.running.get() { format!("Computing… {d} of {t} rows") }
                    else { format!("Computed {t} rows.") }
                }}
            </p>
            {move || run.summary.get().map(|s| {
                let unit = s.unit.clone();
                let u2 = unit.clone();
                view! {
                    <p data-testid="field-log-counts">
                        {format!("{} rows: {} over your limit, {} could not be read.", s.rows, s.flagged_count, s.error_count)}
                    </p>
                    <button type="button" class="btn" data-testid="field-log-export" on:click=export>"Export results (CSV)"</button>
                    <div class="table-scroll" role="region" tabindex="0" aria-label="Log rows">
                        <table data-testid="field-log-table">
                            <caption>{format!("First {} rows, then rows over your limit", s.first.len())}</caption>
                            <thead><tr>
                                <th scope="col">"Line"</th><th scope="col">"Label"</th><th scope="col">"pH"</th>
                                <th scope="col">"°C"</th><th scope="col">"Share"</th><th scope="col">"Amount"</th><th scope="col">"Limit"</th>
                            </tr></thead>
                            <tbody>
                                {s.first.clone().into_iter().map(|r| row_view(r, unit.clone())).collect_view()}
                            </tbody>
                            <tbody data-testid="field-log-flagged">
                                {s.flagged.clone().into_iter().map(|r| row_view(r, u2.clone())).collect_view()}
                            </tbody>
                        </table>
                    </div>
                    {(!s.errors.is_empty()).then(|| view! {
                        <details class="log-errors" data-testid="field-log-errors" open=true>
                            <summary>{format!("{} rows could not be read", s.error_count)}</summary>
                            <ul>
                                {s.errors.iter().map(|(line, why)| view! { <li>{format!("Line {line}: {why}")}</li> }).collect_view()}
                            </ul>
                        </details>
                    })}
                }
            })}
            {move || series.with(Option::is_some).then(|| view! {
                <figure class="plot-figure">
                    <figcaption>"The form that matters, row by row, with your limit (dashed)."</figcaption>
                    <PlotCanvas testid="field-log-plot" label=plot_label paint=paint on_point=Callback::new(|_| {}) on_step=Callback::new(|_| {}) />
                </figure>
            })}
        </section>
    }
}
