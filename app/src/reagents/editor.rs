//! The reagent editor and the shelf panel: make a system or add shelf forms, every field
//! checked as typed; put it in the design and on this browser's shelf; export and import
//! one reagent as a file.

use super::model::{form_text, Checked, EditorModel, FormText, Target};
use super::shelf::{put_reagent, read_shelf, remove_reagent, Shelf};
use crate::designs::kv::LocalStore;
use crate::state::use_app;
use leptos::prelude::*;
use solver::document::reagent::{parse_reagent, reagent_file_name, reagent_to_json, Reagent};
use solver::document::Design;
use solver::system::library::find_system;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

const CSS: &str = include_str!("reagents.css");

/// Put a reagent into a design: a system replaces the one with its id, or
/// is added; a form is added unless the design already holds it. Returns
/// the system id the reagent belongs to.
pub fn add_to_design(d: &mut Design, r: &Reagent) -> String {
    match r {
        Reagent::System(s) => {
            match d.custom_systems.iter_mut().find(|c| c.id == s.id) {
                Some(slot) => *slot = s.clone(),
                None => d.custom_systems.push(s.clone()),
            }
            s.id.clone()
        }
        Reagent::Form(f) => {
            if !d
                .custom_forms
                .iter()
                .any(|c| c.system == f.system && c.form.id == f.form.id)
            {
                d.custom_forms.push(f.clone());
            }
            f.system.clone()
        }
    }
}

/// Open the shelf and read it (setting damaged entries aside).
fn load_shelf() -> Result<Shelf, String> {
    let mut kv = LocalStore::open().map_err(|e| e.to_string())?;
    read_shelf(&mut kv, true).map_err(|e| e.to_string())
}

fn shelf_put(r: &Reagent) -> Result<(), String> {
    let mut kv = LocalStore::open().map_err(|e| e.to_string())?;
    put_reagent(&mut kv, r)
        .map(|_| ())
        .map_err(|e| format!("Not put on this browser's shelf: {e}"))
}

/// One text field of the editor with its message (`error-<id>`).
#[component]
fn RgField(
    #[prop(into)] id: String,
    #[prop(into)] label: String,
    #[prop(into)] value: Signal<String>,
    #[prop(into)] on_input: Callback<String>,
    #[prop(into)] message: Signal<Option<String>>,
    #[prop(optional, into)] hint: Option<Signal<String>>,
    #[prop(optional)] wide: bool,
) -> impl IntoView {
    let msg_id = format!("error-{id}");
    let invalid = move || message.with(Option::is_some);
    view! {
        <div class="field rg-field" class:invalid=invalid class:rg-wide=wide>
            <label for=id.clone()>{label}</label>
            <input
                id=id
                type="text"
                autocomplete="off"
                spellcheck="false"
                prop:value=move || value.get()
                aria-invalid=move || if invalid() { "true" } else { "false" }
                on:input=move |ev| on_input.run(event_target_value(&ev))
            />
            {hint.map(|h| view! { <p class="hint rg-hint">{move || h.get()}</p> })}
            {move || {
                message
                    .get()
                    .map(|m| view! { <p class="field-msg" data-testid=msg_id.clone() role="alert">{m}</p> })
            }}
        </div>
    }
}

/// The editor. `on_done` receives the system id when the reagent was added
/// to the design, or `None` when the user closed it.
#[component]
pub fn ReagentEditor(
    /// What is typed.
    model: RwSignal<EditorModel>,
    /// Closed: with the system id the reagent belongs to when it was added.
    #[prop(into)]
    on_done: Callback<Option<String>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let checked: Memo<Checked> = Memo::new(move |_| {
        model.with(|m| design.with(|d| m.check(&d.custom_systems, &d.custom_forms)))
    });
    let status = RwSignal::new(None::<String>);
    let msg =
        move |key: String| Signal::derive(move || checked.with(|c| c.messages.get(&key).cloned()));
    let is_new = move || model.with(|m| m.target == Target::NewSystem);
    let field = move |key: &'static str,
                      label: &'static str,
                      get: fn(&EditorModel) -> String,
                      set: fn(&mut EditorModel, String)| {
        view! {
            <RgField
                id=key
                label=label
                value=Signal::derive(move || model.with(get))
                on_input=Callback::new(move |t: String| model.update(|m| set(m, t)))
                message=msg(key.to_string())
            />
        }
    };
    let n_steps = Memo::new(move |_| model.with(|m| m.steps.len()));
    let n_forms = Memo::new(move |_| model.with(|m| m.forms.len()));
    let step_rows = move || {
        (0..n_steps.get())
            .map(|i| {
                let get = move |f: fn(&super::model::StepText) -> String| {
                    Signal::derive(move || {
                        model.with(|m| m.steps.get(i).map(f).unwrap_or_default())
                    })
                };
                let set = move |f: fn(&mut super::model::StepText, String)| {
                    Callback::new(move |t: String| {
                        model.update(|m| {
                            if let Some(s) = m.steps.get_mut(i) {
                                f(s, t);
                            }
                        });
                    })
                };
                view! {
                    <div class="rg-step" data-testid=format!("rg-step-{i}")>
                        <span class="rg-step-n">{format!("Step {}", i + 1)}</span>
                        <RgField id=format!("rg-step-{i}-pk") label="pK at 25 °C, I = 0"
                            value=get(|s| s.pk.clone()) on_input=set(|s, t| s.pk = t)
                            message=msg(format!("rg-step-{i}-pk")) />
                        <RgField id=format!("rg-step-{i}-dh") label="ΔrH° kJ/mol (optional)"
                            value=get(|s| s.dh.clone()) on_input=set(|s, t| s.dh = t)
                            message=msg(format!("rg-step-{i}-dh")) />
                        <RgField id=format!("rg-step-{i}-dcp") label="ΔrCp° J/(K·mol) (optional)"
                            value=get(|s| s.dcp.clone()) on_input=set(|s, t| s.dcp = t)
                            message=msg(format!("rg-step-{i}-dcp")) />
                    </div>
                }
            })
            .collect_view()
    };
    let species_rows = move || {
        (0..=n_steps.get())
            .map(|j| {
                view! {
                    <RgField id=format!("rg-species-{j}") label=format!("Species {}", j + 1)
                        value=Signal::derive(move || model.with(|m| m.species.get(j).cloned().unwrap_or_default()))
                        on_input=Callback::new(move |t: String| model.update(|m| m.set_species(j, t)))
                        message=msg(format!("rg-species-{j}")) />
                }
            })
            .collect_view()
    };
    let form_rows = move || {
        (0..n_forms.get())
            .map(|j| {
                let get = move |f: fn(&FormText) -> String| {
                    Signal::derive(move || model.with(|m| m.forms.get(j).map(f).unwrap_or_default()))
                };
                let set = move |f: fn(&mut FormText, String)| {
                    Callback::new(move |t: String| {
                        model.update(|m| {
                            if let Some(s) = m.forms.get_mut(j) {
                                f(s, t);
                            }
                        });
                    })
                };
                let mass = Signal::derive(move || {
                    checked.with(|c| match c.molar_masses.get(j).copied().flatten() {
                        Some(m) => format!("Molar mass {m:.3} g/mol (computed from the formula)"),
                        None => "Molar mass: computed from the formula as you type".to_string(),
                    })
                });
                view! {
                    <fieldset class="rg-form" data-testid=format!("rg-form-{j}")>
                        <legend>{format!("Shelf form {}", j + 1)}</legend>
                        <RgField id=format!("rg-form-{j}-name") label="Name on the label" wide=true
                            value=get(|f| f.name.clone()) on_input=set(|f, t| f.name = t)
                            message=msg(format!("rg-form-{j}-name")) />
                        <RgField id=format!("rg-form-{j}-formula") label="Formula (hydrate after ·)"
                            value=get(|f| f.formula.clone()) on_input=set(|f, t| f.formula = t)
                            message=msg(format!("rg-form-{j}-formula")) hint=mass />
                        <RgField id=format!("rg-form-{j}-units") label="Units of the system per formula unit"
                            value=get(|f| f.units.clone()) on_input=set(|f, t| f.units = t)
                            message=msg(format!("rg-form-{j}-units")) />
                        <p class="rg-sub">"Counter-ions per formula unit"</p>
                        <div class="rg-ions">
                            <RgField id=format!("rg-form-{j}-na") label="Na⁺"
                                value=get(|f| f.na.clone()) on_input=set(|f, t| f.na = t)
                                message=msg(format!("rg-form-{j}-na")) />
                            <RgField id=format!("rg-form-{j}-k") label="K⁺"
                                value=get(|f| f.k.clone()) on_input=set(|f, t| f.k = t)
                                message=msg(format!("rg-form-{j}-k")) />
                            <RgField id=format!("rg-form-{j}-cl") label="Cl⁻"
                                value=get(|f| f.cl.clone()) on_input=set(|f, t| f.cl = t)
                                message=msg(format!("rg-form-{j}-cl")) />
                        </div>
                        {move || checked.with(|c| c.messages.get(&format!("rg-form-{j}-ions")).cloned()).map(|m| view! {
                            <p class="field-msg" data-testid=format!("error-rg-form-{j}-ions") role="alert">{m}</p>
                        })}
                    </fieldset>
                }
            })
            .collect_view()
    };
    let title = move || {
        model.with(|m| match &m.target {
            Target::NewSystem => "Your own acid system".to_string(),
            Target::AddForms(s) => {
                let name = find_system(s).map_or_else(|| s.clone(), |x| x.name.clone());
                format!("A shelf form of your own for {name}")
            }
        })
    };
    let save = move |_| {
        let c = checked.get_untracked();
        let Some(r) = c.reagent.clone() else { return };
        let mut sys_id = String::new();
        design.update(|d| {
            if c.added.is_empty() {
                sys_id = add_to_design(d, &r);
            } else {
                for f in &c.added {
                    sys_id = add_to_design(d, &Reagent::Form(f.clone()));
                }
            }
        });
        let mut problems = Vec::new();
        let all: Vec<Reagent> = if c.added.is_empty() {
            vec![r]
        } else {
            c.added.iter().cloned().map(Reagent::Form).collect()
        };
        for r in &all {
            if let Err(e) = shelf_put(r) {
                problems.push(e);
            }
        }
        if problems.is_empty() {
            on_done.run(Some(sys_id));
        } else {
            status.set(Some(format!(
                "Added to this design (it travels with exports and links). {}",
                problems.join(" ")
            )));
        }
    };
    let export = move |_| {
        if let Some(r) = checked.get_untracked().reagent {
            crate::designs::download(&reagent_file_name(&r), &reagent_to_json(&r));
        }
    };
    let problems = move || checked.with(|c| c.messages.len());
    let steps_full = move || n_steps.get() >= solver::system::MAX_STEPS;
    view! {
        <div class="rg-overlay" role="dialog" aria-modal="true" aria-label="Reagent editor"
            on:keydown=move |ev: leptos::ev::KeyboardEvent| {
                // Escape closes the editor as "Close" does: what is typed is kept.
                if ev.key() == "Escape" {
                    ev.prevent_default();
                    on_done.run(None);
                }
            }>
        <section class="rg-editor" data-testid="reagent-editor">
            <h3>{title}</h3>
            <p class="hint">"Constants you type are yours: the page checks that they make sense, not that they are right. Thermodynamic values (I = 0) only; vendor “apparent” pK at 0.1 M are not."</p>
            <Show when=is_new>
                {field("rg-name", "Name", |m| m.name.clone(), |m, t| m.name = t)}
                <div class="rg-row">
                    <RgField id="rg-z0" label="Charge of the most protonated species"
                        value=Signal::derive(move || model.with(|m| m.z0.clone()))
                        on_input=Callback::new(move |t: String| model.update(|m| { m.z0 = t; m.sync_species(); }))
                        message=msg("rg-z0".into())
                        hint=Signal::derive(|| "0 for an acid (HA), +1 for an amine (BH⁺)".to_string()) />
                </div>
                <div class="rg-row rg-range">
                    {field("rg-tmin", "Constants hold from (°C)", |m| m.t_min.clone(), |m, t| m.t_min = t)}
                    {field("rg-tmax", "to (°C)", |m| m.t_max.clone(), |m, t| m.t_max = t)}
                </div>
                <h4>"Dissociation steps"</h4>
                {step_rows}
                <div class="rg-buttons">
                    <button type="button" class="btn secondary" data-testid="rg-add-step"
                        disabled=steps_full
                        on:click=move |_| model.update(EditorModel::add_step)>"Add a step"</button>
                    <button type="button" class="btn secondary" data-testid="rg-remove-step"
                        disabled=move || n_steps.get() <= 1
                        on:click=move |_| model.update(EditorModel::remove_step)>"Remove the last step"</button>
                </div>
                {move || checked.with(|c| c.messages.get("rg-steps").cloned()).map(|m| view! { <p class="field-msg" data-testid="error-rg-steps">{m}</p> })}
                <h4>"Species (suggested from the charges; type to rename)"</h4>
                <div class="rg-row">{species_rows}</div>
            </Show>
            <h4>"Shelf forms"</h4>
            {form_rows}
            <div class="rg-buttons">
                <button type="button" class="btn secondary" data-testid="rg-add-form"
                    on:click=move |_| model.update(|m| m.forms.push(FormText::default()))>"Add a form"</button>
                <button type="button" class="btn secondary" data-testid="rg-remove-form"
                    disabled=move || n_forms.get() <= 1
                    on:click=move |_| model.update(|m| { m.forms.pop(); })>"Remove the last form"</button>
            </div>
            {move || checked.with(|c| c.messages.get("rg-forms").cloned()).map(|m| view! { <p class="field-msg" data-testid="error-rg-forms">{m}</p> })}
            <Show when=is_new>
                <div class="field rg-field rg-wide">
                    <label for="rg-source">"Source of the constants"</label>
                    <textarea id="rg-source" rows="2"
                        prop:value=move || model.with(|m| m.source.clone())
                        on:input=move |ev| { let t = event_target_value(&ev); model.update(|m| m.source = t); }
                    ></textarea>
                </div>
            </Show>
            <p class="hint" aria-live="polite" data-testid="rg-summary">
                {move || match problems() {
                    0 => "Every field is right.".to_string(),
                    1 => "1 field to correct (marked).".to_string(),
                    n => format!("{n} fields to correct (marked)."),
                }}
            </p>
            {move || status.get().map(|s| view! { <p class="notice" role="status">{s}</p> })}
            <div class="rg-buttons">
                <button type="button" class="btn" data-testid="rg-save"
                    disabled=move || checked.with(|c| c.reagent.is_none())
                    on:click=save>"Add to this design and my shelf"</button>
                <button type="button" class="btn secondary" data-testid="rg-export"
                    disabled=move || checked.with(|c| c.reagent.is_none() || c.added.len() > 1)
                    on:click=export>"Export as a file"</button>
                <button type="button" class="btn secondary" data-testid="rg-close"
                    on:click=move |_| on_done.run(None)>"Close"</button>
            </div>
        </section>
        </div>
    }
}

/// The model filled from a reagent read from a file or the shelf.
pub fn model_of(r: &Reagent) -> EditorModel {
    match r {
        Reagent::System(s) => EditorModel::from_system(s),
        Reagent::Form(f) => EditorModel {
            forms: vec![form_text(&f.form)],
            ..EditorModel::add_forms(&f.system)
        },
    }
}

/// "Your own reagents" under a system picker: add a system, add a shelf form
/// to the selected one, this browser's shelf (use, export, remove), import a file.
#[component]
pub fn ReagentPanel(
    /// The system selected in the picker.
    #[prop(into)]
    selected: Signal<String>,
    /// Select a system in the picker.
    #[prop(into)]
    on_pick: Callback<String>,
    /// DOM id prefix (two pickers may be on a page).
    #[prop(into)]
    id: String,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    // The editor on screen: what is typed, and what it opened with.
    let editing: RwSignal<Option<(RwSignal<EditorModel>, EditorModel)>> = RwSignal::new(None);
    let unfinished = app.unfinished_reagent;
    let shelf = RwSignal::new(load_shelf());
    let notice = RwSignal::new(None::<String>);
    // Open the editor on `m`; `start` is what it first opened with (changes are
    // what differs from it). The editor's signal belongs to the panel, not to
    // the button that opened it (the "Continue editing" button goes away as it
    // is clicked).
    let owner = StoredValue::new_local(Owner::current());
    let open_at = move |m: EditorModel, start: EditorModel| {
        notice.set(None);
        let typed = match owner.get_value() {
            Some(o) => o.with(|| RwSignal::new(m)),
            None => RwSignal::new(m),
        };
        editing.set(Some((typed, start)));
    };
    let open = move |m: EditorModel| {
        if unfinished.with_untracked(Option::is_some) {
            notice.set(Some(
                "Continue or discard the reagent you left unfinished first: only one is kept."
                    .into(),
            ));
            return;
        }
        open_at(m.clone(), m);
    };
    // Closed without adding (or the panel goes away with the editor open):
    // what was typed is kept, never dropped.
    let keep_typed = move || {
        if let Some((typed, start)) = editing.try_get_untracked().flatten() {
            if let Some(typed) = typed.try_get_untracked() {
                if typed != start {
                    unfinished.set(Some((typed, start)));
                }
            }
        }
    };
    on_cleanup(keep_typed);
    on_cleanup(|| crate::designs::side::set_open_reagent(None));
    // What is typed in the open editor is kept across a reload too (`designs::side`).
    Effect::new(move |was_open: Option<bool>| {
        let open = editing
            .get()
            .map(|(typed, start)| (typed.get(), start))
            .filter(|(typed, start)| typed != start);
        let is_open = open.is_some();
        if is_open || was_open == Some(true) {
            crate::designs::side::set_open_reagent(open);
        }
        is_open
    });
    let done = Callback::new(move |sys: Option<String>| {
        if sys.is_none() {
            keep_typed();
        }
        editing.set(None);
        shelf.set(load_shelf());
        if let Some(s) = sys {
            on_pick.run(s.clone());
            notice.set(Some("Added to this design and to your shelf.".into()));
        }
    });
    let selected_name = move || {
        let id = selected.get();
        design.with(|d| {
            d.systems()
                .iter()
                .find(|s| s.id == id)
                .map(|s| s.name.clone())
                .or_else(|| find_system(&id).map(|s| s.name.clone()))
                .unwrap_or(id)
        })
    };
    let use_one = move |r: Reagent| {
        if let Some(why) = design.with_untracked(|d| crate::reagents::conflict::use_conflict(d, &r))
        {
            notice.set(Some(why));
            return;
        }
        let mut sys = String::new();
        design.update(|d| sys = add_to_design(d, &r));
        on_pick.run(sys);
        notice.set(Some(format!("“{}” is now in this design.", r.name())));
    };
    let file_id = format!("{id}-reagent-import");
    let file_for = file_id.clone();
    let import = move |ev: leptos::ev::Event| {
        let Some(input) = ev
            .target()
            .and_then(|t| t.dyn_into::<web_sys::HtmlInputElement>().ok())
        else {
            return;
        };
        let Some(file) = input.files().and_then(|f| f.get(0)) else {
            return;
        };
        let name = file.name();
        let on_text = Closure::once(move |v: JsValue| {
            let text = v.as_string().unwrap_or_default();
            input.set_value("");
            match parse_reagent(&text) {
                Ok(r) => {
                    let r2 = r.clone();
                    open(model_of(&r));
                    notice.set(Some(format!(
                        "“{name}” read: “{}”. Check it below, then add it.",
                        r2.name()
                    )));
                }
                Err(e) => notice.set(Some(format!(
                    "“{name}” was refused as a whole, nothing was changed: {}.",
                    crate::reagents::conflict::plain_file_reason(&e)
                ))),
            }
        });
        let _ = file.text().then(&on_text);
        on_text.forget();
    };
    let shelf_list = move || match shelf.get() {
        Err(e) => view! { <p class="notice" data-testid="rg-shelf-error">{e}</p> }.into_any(),
        Ok(s) => {
            let aside = s.set_aside.iter().map(|(id, key, why)| {
                let _ = id;
                let where_ = if key.is_some() { "kept aside unchanged" } else { "left in place" };
                view! { <p class="notice" data-testid="rg-shelf-aside">{format!("A damaged entry of your reagent shelf could not be read ({where_}): {why}")}</p> }
            }).collect_view();
            let rows = s.reagents.into_iter().map(|(sid, r)| {
                let (r1, r2) = (r.clone(), r.clone());
                let what = match &r {
                    Reagent::System(x) => format!("system, {} step(s), {} form(s)", x.steps.len(), x.forms.len()),
                    Reagent::Form(f) => format!("shelf form of {}", f.system),
                };
                let sid2 = sid.clone();
                view! {
                    <li class="rg-shelf-item" data-testid="rg-shelf-item">
                        <span><strong>{r.name().to_string()}</strong>" — "{what}</span>
                        <button type="button" class="btn secondary" on:click=move |_| use_one(r1.clone())>"Use"</button>
                        <button type="button" class="btn secondary" on:click=move |_| open(model_of(&r2))>"Edit"</button>
                        <button type="button" class="btn secondary" on:click=move |_| {
                            crate::designs::download(&reagent_file_name(&r), &reagent_to_json(&r));
                        }>"Export"</button>
                        <button type="button" class="btn secondary" on:click=move |_| {
                            if let Ok(mut kv) = LocalStore::open() {
                                let _ = remove_reagent(&mut kv, &sid2);
                            }
                            shelf.set(load_shelf());
                        }>"Remove from shelf"</button>
                    </li>
                }
            }).collect_view();
            view! { <div>{aside}<ul class="rg-shelf" data-testid="rg-shelf">{rows}</ul></div> }
                .into_any()
        }
    };
    view! {
        <details class="rg-panel" data-testid="reagent-panel">
            <style>{CSS}</style>
            <summary>"Your own reagents"</summary>
            <div class="rg-buttons">
                <button type="button" class="btn secondary" data-testid="rg-new"
                    on:click=move |_| open(EditorModel::new_system())>"Add your own system"</button>
                <button type="button" class="btn secondary" data-testid="rg-new-form"
                    on:click=move |_| open(EditorModel::add_forms(&selected.get_untracked()))>
                    {move || format!("Add a shelf form to {}", selected_name())}
                </button>
                <label class="btn secondary file-btn" for=file_for>
                    "Import a reagent file"
                    <input type="file" id=file_id accept=".json,application/json" data-testid="rg-import" on:change=import />
                </label>
            </div>
            {move || notice.get().map(|n| view! { <p class="notice" role="status" data-testid="rg-notice">{n}</p> })}
            {move || unfinished.get().map(|(m, _)| {
                let what = unfinished_label(&m);
                view! {
                    <p class="notice" data-testid="rg-unfinished">
                        {format!("You closed the editor before adding {what}; what you typed is kept here. ")}
                        <button type="button" class="btn secondary" data-testid="rg-continue"
                            on:click=move |_| {
                                if let Some((m, start)) = unfinished.get_untracked() {
                                    unfinished.set(None);
                                    open_at(m, start);
                                }
                            }>"Continue editing"</button>
                        " "
                        <button type="button" class="btn secondary" data-testid="rg-discard"
                            on:click=move |_| {
                                unfinished.set(None);
                                notice.set(Some("The unfinished reagent was discarded.".into()));
                            }>"Discard it"</button>
                    </p>
                }
            })}
            // In a portal: the editor is an overlay, above the sticky inputs column and tabs.
            {move || editing.get().map(|(m, _)| view! { <leptos::portal::Portal><ReagentEditor model=m on_done=done /></leptos::portal::Portal> })}
            <h4>"Your shelf in this browser"</h4>
            {shelf_list}
        </details>
    }
}

/// How the panel names an unfinished reagent: its typed name, else what it was.
fn unfinished_label(m: &EditorModel) -> String {
    let name = m.name.trim();
    if !name.is_empty() {
        return crate::widgets::format::quote(name);
    }
    match &m.target {
        Target::NewSystem => "a new system".into(),
        Target::AddForms(system) => format!("shelf forms for {system}"),
    }
}

/// The design's own reagents among `ids`, as lines for a result panel: the
/// constants are the user's, with the source they gave.
pub fn user_reagent_notes(d: &Design, ids: &[String]) -> Vec<String> {
    let mut out = Vec::new();
    for id in ids {
        if out.iter().any(|l: &String| l.contains(&format!("[{id}]"))) {
            continue;
        }
        if let Some(s) = d.custom_systems.iter().find(|s| &s.id == id) {
            let src = if s.source.trim().is_empty() {
                "no source given".to_string()
            } else {
                s.source.trim().to_string()
            };
            out.push(format!(
                "{} is your own reagent: its constants are yours, not the library's. Source: {src}. [{id}]",
                s.name
            ));
        }
        let forms: Vec<&str> = d
            .custom_forms
            .iter()
            .filter(|f| &f.system == id)
            .map(|f| f.form.name.as_str())
            .collect();
        if !forms.is_empty() {
            out.push(format!(
                "Shelf forms you added ({}): their formulas, units and counter-ions are yours. [{id}]",
                forms.join(", ")
            ));
        }
    }
    out.into_iter()
        .map(|l| {
            l.rsplit_once(" [")
                .map_or(l.clone(), |(a, _)| a.to_string())
        })
        .collect()
}

/// A result panel's note about the user's own reagents among the systems it uses.
#[component]
pub fn UserReagentNote(
    /// System ids the panel's numbers use.
    #[prop(into)]
    systems: Signal<Vec<String>>,
) -> impl IntoView {
    let app = use_app();
    let lines =
        Memo::new(move |_| systems.with(|ids| app.design.with(|d| user_reagent_notes(d, ids))));
    move || {
        let l = lines.get();
        (!l.is_empty()).then(|| {
            view! {
                <div class="notice rg-note" data-testid="user-reagent-note">
                    {l.into_iter().map(|t| view! { <p>{t}</p> }).collect_view()}
                </div>
            }
        })
    }
}
