//! Validated input widgets: a number field with inline messages and units, and a segmented choice.
//!
//! A [`NumberField`] keeps the raw text the user typed; the design holds only
//! the last *valid* value. Valid text is written to the design from the input
//! handler (never from an effect). When the design is replaced wholesale
//! (`AppState::load` bumps `revision`), the typed text is forgotten and the
//! field shows the design's value again.

use crate::state::use_app;
use crate::widgets::format::{best_unit, check_in, fmt_input, uses_decimal_comma, Rule, Unit};
use leptos::prelude::*;
use solver::system::library::library;
use solver::system::thermo::system_pks;
use solver::system::AcidSystem;

/// A labelled number input with optional unit picker and an inline message.
///
/// The message is the parser's (empty, not a number, negative, out of range)
/// or, when the text is valid, `error` (a solver message for this field).
/// The message element carries `data-testid="error-<id>"`.
#[component]
pub fn NumberField(
    /// DOM id of the input; the message is `error-<id>`.
    #[prop(into)]
    id: String,
    /// Visible label.
    #[prop(into)]
    label: String,
    /// Current value in the base unit, read from the design.
    #[prop(into)]
    value: Signal<f64>,
    /// Receives each valid value (base unit).
    #[prop(into)]
    on_value: Callback<f64>,
    /// What the field accepts.
    rule: Rule,
    /// Unit choices; empty for a unitless field.
    #[prop(optional)]
    units: &'static [Unit],
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
) -> impl IntoView {
    let app = use_app();
    let rev = app.revision;
    let unit = RwSignal::new(best_unit(units, value.get_untracked()));
    let factor = move |i: usize| units.get(i).map_or(1.0, |u| u.factor);
    // Text typed by the user, tagged with the revision it was typed against.
    // Text typed before a tab switch comes back from the page state.
    let typed: RwSignal<Option<(u64, String)>> =
        RwSignal::new(app.take_parked(&id).map(|t| (rev.get_untracked(), t)));
    let text = Memo::new(move |_| match typed.get() {
        Some((r, t)) if r == rev.get() => t,
        _ => fmt_input(value.get() / factor(unit.get())),
    });
    let comma = app.decimal_comma;
    let parsed = Memo::new(move |_| check_in(&text.get(), rule, factor(unit.get()), comma.get()));
    let message = move || match parsed.get() {
        Err(m) => Some(m),
        Ok(_) => error.and_then(|e| e.get()),
    };
    let invalid = move || message().is_some();
    let readonly = move || app.view.with(|v| v.readonly);

    let accept = {
        let id = id.clone();
        move |t: String, i: usize| {
            if uses_decimal_comma(&t) && !comma.get_untracked() {
                comma.set(true);
            }
            let result = check_in(&t, rule, factor(i), comma.get_untracked());
            typed.set(Some((rev.get_untracked(), t)));
            app.mark_field(&id, result.is_ok());
            if let Ok(v) = result {
                on_value.run(v);
            }
        }
    };
    let on_input = {
        let accept = accept.clone();
        move |ev: leptos::ev::Event| accept(event_target_value(&ev), unit.get_untracked())
    };
    let on_change = move |_ev: leptos::ev::Event| {
        if let (Some(cb), Ok(v)) = (on_commit, parsed.get_untracked()) {
            cb.run(v);
        }
    };
    // One rule for every unit picker: picking a unit converts the quantity on
    // screen (500 mL -> 0.5 L), whether it was typed or not; the amount never
    // changes by picking a unit. Text that is not a number yet stays as typed.
    let on_unit = {
        let accept = accept.clone();
        move |ev: leptos::ev::Event| {
            let i: usize = event_target_value(&ev).parse().unwrap_or(0);
            let old = unit.get_untracked();
            let current = text.get_untracked();
            let shown = check_in(&current, rule, factor(old), comma.get_untracked());
            unit.set(i);
            match shown {
                Ok(base) => {
                    typed.set(None);
                    accept(fmt_input(base / factor(i)), i);
                }
                Err(_) => accept(current, i),
            }
        }
    };
    {
        // A field that goes away takes its typed text with it, unless only
        // its tab went off screen: then the text is parked for its return.
        let id = id.clone();
        on_cleanup(move || {
            let t = typed
                .try_get_untracked()
                .flatten()
                .filter(|(r, _)| rev.try_get_untracked() == Some(*r))
                .map(|(_, t)| t);
            app.field_gone(&id, t);
        });
    }

    let msg_id = format!("error-{id}");
    let hint_id = format!("hint-{id}");
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
    let unit_picker = (!units.is_empty()).then(|| {
        let unit_label = format!("{label}: unit");
        view! {
            <select class="unit" aria-label=unit_label disabled=readonly on:change=on_unit
                prop:value=move || unit.get().to_string()>
                {units
                    .iter()
                    .enumerate()
                    .map(|(i, u)| {
                        view! {
                            <option value=i.to_string() selected=move || unit.get() == i>
                                {u.label}
                            </option>
                        }
                    })
                    .collect_view()}
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
