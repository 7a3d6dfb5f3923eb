//! Validated input widgets: the one number field of the page, and a segmented choice.
//!
//! Every number input of every workspace is a [`NumberField`]: a described field (id, label,
//! document path and so its limit, unit or unit choice, getter and setter). Focus, strict
//! parsing (`1,000` refused as ambiguous), the limit, the unit rule (a picker converts) and the
//! messages beside the field are written here once; the plain rules are in
//! [`crate::widgets::field`].
//!
//! A field keeps the raw text the user typed, with the unit it was typed in; the design holds
//! only the last *valid* value. Valid text is written to the design from the input handler (never
//! from an effect). When the design is replaced wholesale (`AppState::load` bumps `revision`), the
//! typed text is forgotten and the field shows the design's value again.

use crate::state::{use_app, Parked};
use crate::widgets::field::{convert_text, limit_for, unit_check, view_units, Plausible, UnitOpt};
use crate::widgets::format::{
    best_unit, check_in, fmt_input, parse_number_in, uses_decimal_comma, Unit,
};
use leptos::prelude::*;
use solver::system::library::library;
use solver::system::thermo::system_pks;
use solver::system::AcidSystem;
use wasm_bindgen::JsCast;

/// A unit that is part of the design (a field total's unit, an alkalinity's, a limit's): the
/// options with their factors to a common base, the design's unit key, and the setter that
/// receives a new unit with the value converted into it.
#[derive(Debug, Clone, Copy)]
pub struct StoredUnits {
    /// The units the value may be in.
    pub options: Signal<Vec<UnitOpt>>,
    /// The design's unit key.
    pub key: Signal<String>,
    /// Receives (new unit key, the same amount in that unit).
    pub on_unit: Callback<(String, f64)>,
}

/// The id of the focused element, with its selection when it is a text input.
fn focused() -> Option<(String, u32, u32)> {
    let el = web_sys::window()?.document()?.active_element()?;
    let id = el.id();
    let input = el.dyn_into::<web_sys::HtmlInputElement>().ok()?;
    let a = input.selection_start().ok().flatten().unwrap_or(0);
    let b = input.selection_end().ok().flatten().unwrap_or(a);
    Some((id, a, b))
}

/// The one number field: a labelled input with its unit (fixed, a display choice, or a unit
/// stored in the design) and the message beside it.
///
/// The message is the parser's (empty, not a number, ambiguous, negative, out of the path's
/// limit) or, when the text is valid, `error` (a solver message for this field); a number far
/// outside `plausible` adds a "check the unit" note. Ids: the message is `error-<id>`, the note
/// `check-<id>`. A field rebuilt while it has the focus takes the focus and the caret back.
#[component]
pub fn NumberField(
    /// DOM id of the input; the message is `error-<id>`.
    #[prop(into)]
    id: String,
    /// Visible label.
    #[prop(into)]
    label: String,
    /// Document path of the value (`recipe.target_ph`, `recipe.salts[].conc_m`): the field's
    /// limit comes from [`limit_for`], one lookup for the page.
    path: &'static str,
    /// Current value, read from the design: in the base unit of `units`, or in the stored unit.
    #[prop(into)]
    value: Signal<f64>,
    /// Receives each valid value (base unit, or the stored unit).
    #[prop(into)]
    on_value: Callback<f64>,
    /// Display-only unit choices (the design holds the base unit); empty for none.
    #[prop(optional)]
    units: &'static [Unit],
    /// A unit stored in the design (in place of `units`).
    #[prop(optional)]
    stored: Option<StoredUnits>,
    /// Fixed unit text after the input (when there is no unit choice).
    #[prop(optional, into)]
    suffix: Option<String>,
    /// A solver message for this field, shown when the text itself is fine.
    #[prop(optional, into)]
    error: Option<Signal<Option<String>>>,
    /// Short help under the label.
    #[prop(optional, into)]
    hint: Option<String>,
    /// Receives the value when the user is done with the field (leaves it or
    /// presses Enter) and the text is valid: for consequences that must not
    /// follow every passing keystroke.
    #[prop(optional, into)]
    on_commit: Option<Callback<f64>>,
    /// Where numbers usually lie (base unit): outside, a "check the unit" note.
    #[prop(optional)]
    plausible: Option<Plausible>,
) -> impl IntoView {
    let app = use_app();
    let rev = app.revision;
    let comma = app.decimal_comma;
    let rule = limit_for(path);
    let is_stored = stored.is_some();
    let parked = app.take_parked(&id);
    let view_opts = view_units(units);
    let first_unit = parked
        .as_ref()
        .filter(|p| view_opts.iter().any(|o| o.key == p.unit))
        .map(|p| p.unit.clone())
        .or_else(|| {
            view_opts
                .get(best_unit(units, value.get_untracked()))
                .map(|o| o.key.clone())
        })
        .unwrap_or_default();
    let local_unit = RwSignal::new(first_unit);
    let options: Signal<Vec<UnitOpt>> = match stored {
        Some(s) => s.options,
        None => Signal::stored(view_opts),
    };
    let unit_key = Signal::derive(move || match stored {
        Some(s) => s.key.get(),
        None => local_unit.get(),
    });
    let factor_of = move |key: &str| {
        options
            .try_with_untracked(|o| o.iter().find(|u| u.key == key).map(|u| u.factor))
            .flatten()
            .unwrap_or(1.0)
    };
    // Shown number × scale = the design's value: the unit's factor for a
    // display choice, 1 for a stored unit (the design holds the shown unit).
    let scale = move |key: &str| if is_stored { 1.0 } else { factor_of(key) };
    // Text typed by the user: (revision, unit key, text). Text typed before a
    // tab switch or a rebuild comes back from the page state, in its unit.
    let typed: RwSignal<Option<(u64, String, String)>> =
        RwSignal::new(parked.map(|p| (rev.get_untracked(), p.unit, p.text)));
    let text = Memo::new(move |_| {
        let key = unit_key.get();
        match typed.get() {
            Some((r, u, t)) if r == rev.get() && u == key => t,
            _ => fmt_input(
                value.get()
                    / options.with(|o| {
                        if is_stored {
                            1.0
                        } else {
                            o.iter().find(|u| u.key == key).map_or(1.0, |u| u.factor)
                        }
                    }),
            ),
        }
    });
    let parsed = Memo::new(move |_| {
        let key = unit_key.get();
        check_in(&text.get(), rule, scale(&key), comma.get())
    });
    let message = move || match parsed.get() {
        Err(m) => Some(m),
        Ok(_) => error.and_then(|e| e.get()),
    };
    let invalid = move || message().is_some();
    let readonly = move || app.view.with(|v| v.readonly);
    let unit_note = move || {
        let p = plausible?;
        parsed.get().ok()?;
        let shown = parse_number_in(&text.get(), comma.get()).ok()?;
        let key = unit_key.get();
        options.with(|o| {
            let i = o.iter().position(|u| u.key == key)?;
            unit_check(shown, i, o, p)
        })
    };

    let accept = {
        let id = id.clone();
        move |t: String, key: String| {
            let Some(c) = comma.try_get_untracked() else {
                return;
            };
            if uses_decimal_comma(&t) && !c {
                comma.set(true);
            }
            let result = check_in(&t, rule, scale(&key), comma.get_untracked());
            typed.set(Some((rev.get_untracked(), key, t)));
            app.mark_field(&id, result.is_ok());
            if let Ok(v) = result {
                on_value.run(v);
            }
        }
    };
    let on_input = {
        let accept = accept.clone();
        move |ev: leptos::ev::Event| {
            if let Some(key) = unit_key.try_get_untracked() {
                accept(event_target_value(&ev), key);
            }
        }
    };
    let on_change = move |_ev: leptos::ev::Event| {
        if let (Some(cb), Some(Ok(v))) = (on_commit, parsed.try_get_untracked()) {
            cb.run(v);
        }
    };
    // The unit rule, for every unit picker: picking a unit converts the
    // number on screen (500 mL -> 0.5 L), typed or not; the amount never
    // changes by picking a unit. Text that is not a number stays as typed.
    let on_unit = {
        let accept = accept.clone();
        let id = id.clone();
        move |ev: leptos::ev::Event| {
            let new = event_target_value(&ev);
            let (Some(old), Some(current), Some(c)) = (
                unit_key.try_get_untracked(),
                text.try_get_untracked(),
                comma.try_get_untracked(),
            ) else {
                return;
            };
            let (from, to) = (factor_of(&old), factor_of(&new));
            let number = parse_number_in(&current, c).ok();
            match stored {
                None => {
                    local_unit.set(new.clone());
                    if check_in(&current, rule, scale(&old), c).is_ok() {
                        // The design holds this amount: show it in the new unit, exactly.
                        typed.set(None);
                        app.mark_field(&id, true);
                    } else {
                        accept(convert_text(&current, c, from, to).unwrap_or(current), new);
                    }
                }
                Some(s) => {
                    // The design's value and unit change together, to the same amount,
                    // at full precision (the box shows it to six figures).
                    let amount = number.unwrap_or_else(|| value.get_untracked()) * from / to;
                    let ok = number.is_some() && check_in(&fmt_input(amount), rule, 1.0, c).is_ok();
                    typed.set(
                        number
                            .is_none()
                            .then(|| (rev.get_untracked(), new.clone(), current)),
                    );
                    app.mark_field(&id, ok);
                    s.on_unit.run((new, amount));
                }
            }
        }
    };
    let node = NodeRef::<leptos::html::Input>::new();
    {
        // A field rebuilt while it had the focus takes it back with the caret.
        let id = id.clone();
        Effect::new(move |_| {
            let Some(el) = node.get() else { return };
            let mine = app
                .refocus
                .try_get_value()
                .flatten()
                .filter(|(r, _, _)| *r == id);
            if let Some((_, a, b)) = mine {
                app.refocus.set_value(None);
                let _ = el.focus();
                let _ = el.set_selection_range(a, b);
            }
        });
    }
    {
        // A field that goes away takes its typed text with it, unless only
        // its tab went off screen or it is being rebuilt: then the text is
        // parked, with its unit, for its return.
        let id = id.clone();
        on_cleanup(move || {
            let t = typed
                .try_get_untracked()
                .flatten()
                .filter(|(r, _, _)| rev.try_get_untracked() == Some(*r))
                .map(|(_, unit, text)| Parked { text, unit });
            if let Some(f) = focused().filter(|f| f.0 == id) {
                app.refocus.try_set_value(Some(f));
                let refocus = app.refocus;
                set_timeout(
                    move || drop(refocus.try_set_value(None)),
                    std::time::Duration::ZERO,
                );
            }
            app.field_gone(&id, t);
        });
    }

    let msg_id = format!("error-{id}");
    let hint_id = format!("hint-{id}");
    let check_id = format!("check-{id}");
    let described = {
        let msg_id = msg_id.clone();
        let hint_id = hint_id.clone();
        let has_hint = hint.is_some();
        move || {
            let mut parts = Vec::new();
            if has_hint {
                parts.push(hint_id.clone());
            }
            if invalid() {
                parts.push(msg_id.clone());
            }
            (!parts.is_empty()).then(|| parts.join(" "))
        }
    };
    let has_units = !units.is_empty() || is_stored;
    let unit_picker = has_units.then(|| {
        let unit_label = format!("{label}: unit");
        view! {
            <select class="unit" aria-label=unit_label disabled=readonly on:change=on_unit
                prop:value=move || unit_key.get()>
                {move || {
                    let cur = unit_key.get();
                    options
                        .get()
                        .into_iter()
                        .map(|u| {
                            let sel = u.key == cur;
                            view! { <option value=u.key selected=sel>{u.label}</option> }
                        })
                        .collect_view()
                }}
            </select>
        }
    });
    let suffix_view = suffix.map(|s| view! { <span class="suffix" aria-hidden="true">{s}</span> });
    let hint_view = hint.map(|h| view! { <p class="hint" id=hint_id.clone()>{h}</p> });
    let id_for = id.clone();
    view! {
        <div class="field" class:invalid=invalid>
            <label for=id_for>{label}</label>
            {hint_view}
            <div class="field-row">
                <input
                    id=id
                    node_ref=node
                    type="text"
                    inputmode="decimal"
                    autocomplete="off"
                    spellcheck="false"
                    prop:value=move || text.get()
                    aria-invalid=move || if invalid() { "true" } else { "false" }
                    aria-describedby=described
                    disabled=readonly
                    on:input=on_input
                    on:change=on_change
                />
                {unit_picker}
                {suffix_view}
            </div>
            {move || {
                message()
                    .map(|m| {
                        view! {
                            <p class="field-msg" id=msg_id.clone() data-testid=msg_id.clone() role="alert">
                                {m}
                            </p>
                        }
                    })
            }}
            {move || {
                unit_note()
                    .map(|m| view! { <p class="hint unit-check" data-testid=check_id.clone() role="status">{m}</p> })
            }}
        </div>
    }
}

/// One option of a [`Choice`].
#[derive(Debug, Clone, PartialEq)]
pub struct ChoiceOption {
    /// Value reported on change.
    pub value: String,
    /// Visible text.
    pub label: String,
}

impl ChoiceOption {
    /// Build an option.
    pub fn new(value: impl Into<String>, label: impl Into<String>) -> Self {
        Self {
            value: value.into(),
            label: label.into(),
        }
    }
}

/// A segmented control: radio buttons in a fieldset with a legend.
#[component]
pub fn Choice(
    /// Name of the radio group (unique on the page); option ids are `<name>-<value>`.
    #[prop(into)]
    name: String,
    /// Legend.
    #[prop(into)]
    legend: String,
    /// Options.
    options: Vec<ChoiceOption>,
    /// The selected value.
    #[prop(into)]
    selected: Signal<String>,
    /// Receives the new value.
    #[prop(into)]
    on_change: Callback<String>,
) -> impl IntoView {
    let app = use_app();
    let readonly = move || app.view.with(|v| v.readonly);
    let items = options
        .into_iter()
        .map(|o| {
            let id = format!("{name}-{}", o.value);
            let v = o.value.clone();
            let v2 = o.value.clone();
            view! {
                <input
                    type="radio"
                    class="seg-input"
                    id=id.clone()
                    name=name.clone()
                    value=o.value.clone()
                    data-testid=id.clone()
                    prop:checked=move || selected.get() == v
                    disabled=readonly
                    on:change=move |_| on_change.run(v2.clone())
                />
                <label class="seg-label" for=id>{o.label}</label>
            }
        })
        .collect_view();
    view! {
        <fieldset class="choice">
            <legend>{legend}</legend>
            <div class="seg">{items}</div>
        </fieldset>
    }
}

/// Label of a system in pickers: its name and its pK values at `t_c`
/// (from the solver), or a note when its data do not reach `t_c`.
pub fn system_label(sys: &AcidSystem, t_c: f64) -> String {
    match system_pks(sys, t_c) {
        Ok(pks) => {
            let list: Vec<String> = pks.iter().map(|p| fmt_sig_fixed(*p, 2)).collect();
            format!(
                "{} — pK {} at {} °C",
                sys.name,
                list.join(", "),
                fmt_input(t_c)
            )
        }
        Err(_) => format!(
            "{} — no data at {} °C ({}–{} °C)",
            sys.name,
            fmt_input(t_c),
            fmt_input(sys.t_min_c),
            fmt_input(sys.t_max_c)
        ),
    }
}

fn fmt_sig_fixed(v: f64, d: usize) -> String {
    format!("{v:.d$}")
}

/// Does `sys` match a search text? Words match the name, id or species; a
/// number matches systems with a pK within one unit of it at `t_c`. Case is
/// ignored for ASCII letters (names and formulas are written in them).
pub fn system_matches(sys: &AcidSystem, query: &str, t_c: f64) -> bool {
    let q = query.trim().to_ascii_lowercase();
    if q.is_empty() {
        return true;
    }
    if let Ok(x) = crate::widgets::format::parse_number(&q) {
        return system_pks(sys, t_c).is_ok_and(|pks| pks.iter().any(|p| (p - x).abs() <= 1.0));
    }
    sys.name.to_ascii_lowercase().contains(&q)
        || sys.id.contains(&q)
        || sys
            .species
            .iter()
            .any(|s| s.to_ascii_lowercase().contains(&q))
        || sys.forms.iter().any(|f| {
            f.name.to_ascii_lowercase().contains(&q) || f.formula.to_ascii_lowercase().contains(&q)
        })
}

/// All systems the design can use: its custom ones (with any shelf forms the
/// user added, see `Design::systems`), then the library systems they do not replace.
pub fn all_systems(custom: &[AcidSystem]) -> Vec<AcidSystem> {
    custom
        .iter()
        .chain(
            library()
                .iter()
                .filter(|l| !custom.iter().any(|c| c.id == l.id)),
        )
        .cloned()
        .collect()
}

/// How a picker marks the user's own reagents: a system of the user's, or a
/// library system with shelf forms the user added; `None` for a plain library system.
pub fn user_mark(sys: &AcidSystem) -> Option<&'static str> {
    match solver::system::library::find_system(&sys.id) {
        None => Some("your reagent"),
        Some(lib) if lib != sys => Some("with your shelf forms"),
        Some(_) => None,
    }
}

/// A searchable system picker: a search box (name, species, formula, or a pH
/// to find systems with a pK near it) filtering a labelled list whose entries
/// show each system's pK values at the working temperature.
#[component]
pub fn SystemPicker(
    /// DOM id of the select; the search box is `<id>-search`.
    #[prop(into)]
    id: String,
    /// Visible label.
    #[prop(into)]
    label: String,
    /// Selected system id.
    #[prop(into)]
    selected: Signal<String>,
    /// Temperature for the pK values, °C.
    #[prop(into)]
    temperature: Signal<f64>,
    /// Receives the chosen system id.
    #[prop(into)]
    on_change: Callback<String>,
) -> impl IntoView {
    let app = use_app();
    let readonly = move || app.view.with(|v| v.readonly);
    let query = RwSignal::new(String::new());
    let custom = Memo::new(move |_| app.design.with(solver::document::Design::systems));
    let shown = Memo::new(move |_| {
        let t = temperature.get();
        let q = query.get();
        let sel = selected.get();
        custom.with(|c| {
            let mut found: Vec<&AcidSystem> = Vec::new();
            let systems = all_systems(c);
            found.extend(
                systems
                    .iter()
                    .filter(|s| s.id == sel || system_matches(s, &q, t)),
            );
            // A pH typed in the search box lists the nearest pK first.
            if let Ok(x) = crate::widgets::format::parse_number(&q) {
                let gap = |s: &AcidSystem| {
                    system_pks(s, t)
                        .ok()
                        .and_then(|p| p.iter().map(|p| (p - x).abs()).reduce(f64::min))
                        .unwrap_or(f64::INFINITY)
                };
                solver::order::sort_by(&mut found, |a, b| gap(a).total_cmp(&gap(b)));
            }
            let mut v: Vec<(String, String)> = found
                .iter()
                .map(|s| {
                    let label = system_label(s, t);
                    let label = match user_mark(s) {
                        Some(m) => format!("★ {label} ({m})"),
                        None => label,
                    };
                    (s.id.clone(), label)
                })
                .collect();
            if !v.iter().any(|(i, _)| *i == sel) {
                v.insert(0, (sel.clone(), format!("{sel} (not in the library)")));
            }
            v
        })
    });
    let count = move || shown.with(Vec::len);
    let search_id = format!("{id}-search");
    let panel_id = id.clone();
    let search_label = format!("{label}: search");
    view! {
        <div class="field system-picker">
            <label for=id.clone()>{label}</label>
            <input
                type="search"
                id=search_id
                class="search"
                placeholder="Name, formula or a pH (7.4)"
                aria-label=search_label
                autocomplete="off"
                prop:value=move || query.get()
                on:input=move |ev| query.set(event_target_value(&ev))
            />
            <select
                id=id
                data-testid="system-select"
                disabled=readonly
                prop:value=move || selected.get()
                on:change=move |ev| on_change.run(event_target_value(&ev))
            >
                {move || {
                    shown
                        .get()
                        .into_iter()
                        .map(|(sid, text)| {
                            let s2 = sid.clone();
                            view! {
                                <option value=sid selected=move || selected.get() == s2>
                                    {text}
                                </option>
                            }
                        })
                        .collect_view()
                }}
            </select>
            <p class="hint" aria-live="polite">
                {move || {
                    let n = count();
                    if query.with(|q| q.trim().is_empty()) {
                        format!("{n} systems")
                    } else {
                        format!("{n} shown (the selected one always stays in the list)")
                    }
                }}
            </p>
            {move || (!readonly()).then(|| view! {
                <crate::reagents::ReagentPanel selected=selected on_pick=on_change id=panel_id.clone() />
            })}
        </div>
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use solver::system::library::find_system;

    #[test]
    fn search_by_name_formula_species_or_ph() {
        let p = find_system("phosphate").unwrap();
        let a = find_system("acetate").unwrap();
        assert!(system_matches(p, "", 25.0));
        assert!(system_matches(p, "phos", 25.0));
        assert!(system_matches(p, "HPO4", 25.0), "formula of a form");
        assert!(system_matches(a, "glacial", 25.0), "form name");
        assert!(system_matches(p, "7,4", 25.0), "pK 7.2 is within one unit");
        assert!(!system_matches(a, "7.4", 25.0), "pK 4.76 is not");
    }

    #[test]
    fn labels_show_pk_at_temperature_or_the_data_range() {
        let t = find_system("tris").unwrap();
        let l = system_label(t, 37.0);
        assert!(l.starts_with("Tris — pK 7.7"), "{l}");
        assert!(system_label(t, 59.0).contains("no data at 59 °C"));
    }
}
