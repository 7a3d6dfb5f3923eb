//! The recipe's inert salts (`recipe.salts`): list edits as plain functions, and the rows that wire them.
//!
//! A recipe carries any number of salt rows. Each salt may be listed once:
//! the solver's `validate_salts` refuses a second row of the same salt (it
//! does not merge them), and the refusal is shown beside that row. The edits
//! here never merge nor drop a row on their own, so what is on screen is
//! what the solver judges.

use crate::state::use_app;
use crate::widgets::format::{error_field, error_message};
use leptos::prelude::*;
use solver::mixture::{Additive, AdditiveSpec};
use solver::recipe::{RecipeResult, RecipeSpec};
use solver::SolverError;

/// Prefix of the salt rows' field ids (`recipe-salt-<key>-conc`, `recipe-salt-<key>-kind`).
pub const SALT_PREFIX: &str = "recipe-salt-";

/// What the page says about duplicates, beside the list.
pub const DUPLICATE_RULE: &str =
    "Each salt once: a salt listed twice is refused, not merged. Change or remove one of the two rows.";

/// The inert (neutral) salts the engine knows, in display order.
pub fn salt_kinds() -> Vec<Additive> {
    Additive::ALL
        .into_iter()
        .filter(|a| a.charge() == 0.0)
        .collect()
}

/// Concentration a new row starts at, mol/L: the usual strength of a
/// saline buffer (common practice: 137 mM NaCl, 2.7 mM KCl).
pub fn default_conc(a: Additive) -> f64 {
    match a {
        Additive::Kcl => 0.0027,
        _ => 0.137,
    }
}

/// The first salt not listed yet, if any.
pub fn next_salt(salts: &[AdditiveSpec]) -> Option<Additive> {
    salt_kinds()
        .into_iter()
        .find(|k| !salts.iter().any(|s| s.additive == *k))
}

/// Add a row with the next salt not listed; `false` (nothing changed) when
/// every salt is listed already.
pub fn add_salt(salts: &mut Vec<AdditiveSpec>) -> bool {
    match next_salt(salts) {
        Some(additive) => {
            salts.push(AdditiveSpec {
                additive,
                conc_m: default_conc(additive),
            });
            true
        }
        None => false,
    }
}

/// Change the salt of row `i` (its concentration stays). A kind listed in
/// another row is kept as picked: the solver refuses it beside the row.
pub fn set_salt_kind(salts: &mut [AdditiveSpec], i: usize, additive: Additive) {
    if let Some(s) = salts.get_mut(i) {
        s.additive = additive;
    }
}

/// Set the concentration of row `i`, mol/L.
pub fn set_salt_conc(salts: &mut [AdditiveSpec], i: usize, conc_m: f64) {
    if let Some(s) = salts.get_mut(i) {
        s.conc_m = conc_m;
    }
}

/// Remove row `i` (the rows after it move up).
pub fn remove_salt(salts: &mut Vec<AdditiveSpec>, i: usize) {
    if i < salts.len() {
        salts.remove(i);
    }
}

/// The solver's message for row `i` (`salts[i]`, `salts[i].conc_m`,
/// `salts[i].additive`), if its error is about that row.
pub fn salt_row_error(e: &SolverError, i: usize) -> Option<String> {
    let field = error_field(e)?;
    let row = format!("salts[{i}]");
    let rest = field.strip_prefix(&row)?;
    (rest.is_empty() || rest.starts_with('.')).then(|| error_message(e))
}

/// Key and label of a salt in the row's picker.
pub fn salt_key(a: Additive) -> &'static str {
    match a {
        Additive::Kcl => "kcl",
        Additive::Nacl => "nacl",
        Additive::Hcl => "hcl",
        Additive::Naoh => "naoh",
        Additive::Koh => "koh",
    }
}

/// The salt of a picker key (`None` for an unknown key).
pub fn salt_from_key(k: &str) -> Option<Additive> {
    salt_kinds().into_iter().find(|a| salt_key(*a) == k)
}

fn salt_label(a: Additive) -> &'static str {
    match a {
        Additive::Kcl => "KCl — potassium chloride",
        _ => "NaCl — sodium chloride",
    }
}

/// The salt rows with their add button and the duplicate rule. Rows are
/// keyed by a stable id (see `widgets::rows`), never by position.
#[component]
pub(crate) fn SaltRows(
    spec: Memo<RecipeSpec>,
    result: Memo<Result<RecipeResult, SolverError>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let count = Memo::new(move |_| spec.with(|s| s.salts.len()));
    let keys = crate::widgets::rows::keyed(SALT_PREFIX, count, app.rows, app.revision);
    let can_add = Memo::new(move |_| spec.with(|s| next_salt(&s.salts).is_some()));
    let on_add = move |_| {
        design.update(|d| {
            let _ = add_salt(&mut d.recipe.salts);
        })
    };
    view! {
        <h3 id="recipe-salts-title">"Added salts"</h3>
        <p class="hint" data-testid="recipe-salts-rule">{DUPLICATE_RULE}</p>
        <div class="rows" role="group" aria-labelledby="recipe-salts-title" data-testid="recipe-salts">
            <crate::widgets::rows::KeyedRows keys=keys row=Callback::new(move |k| view! {
                <SaltRow row=k pos=crate::widgets::rows::position(keys, k) spec=spec result=result />
            }.into_any()) />
            {move || (count.get() == 0).then(|| view! { <p class="hint">"No salt added."</p> })}
        </div>
        <button type="button" class="btn secondary" data-testid="recipe-add-salt"
            disabled=move || readonly() || !can_add.get() on:click=on_add>
            "+ Add a salt"
        </button>
        {move || {
            (!can_add.get())
                .then(|| view! { <p class="hint">"Every salt the engine knows (NaCl, KCl) is listed."</p> })
        }}
    }
}

/// One salt row: which salt, its concentration, remove; the solver's
/// message for the row beside it. `row` is its stable key (its field ids),
/// `pos` where it is now (its label and the solver's `salts[i]`).
#[component]
fn SaltRow(
    row: u64,
    pos: Memo<Option<usize>>,
    spec: Memo<RecipeSpec>,
    result: Memo<Result<RecipeResult, SolverError>>,
) -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let readonly = move || app.view.with(|v| v.readonly);
    let salt = move || spec.with(|s| pos.get().and_then(|i| s.salts.get(i).copied()));
    let key = move || salt().map_or("nacl", |a| salt_key(a.additive));
    let err = Signal::derive(move || {
        let i = pos.get()?;
        result.with(|r| r.as_ref().err().and_then(|e| salt_row_error(e, i)))
    });
    // A duplicate names the row (`salts[i]`), not its amount: say it under the picker.
    let kind_err = Signal::derive(move || {
        let i = pos.get()?;
        result.with(|r| match r {
            Err(e) if error_field(e).as_deref() == Some(&format!("salts[{i}]")) => {
                Some(error_message(e))
            }
            _ => None,
        })
    });
    let conc_err = Signal::derive(move || err.get().filter(|_| kind_err.get().is_none()));
    let n = move || pos.get().map_or(0, |i| i + 1);
    let sel_id = format!("{SALT_PREFIX}{row}-kind");
    let kind_msg = format!("error-{SALT_PREFIX}{row}-kind");
    view! {
        <div class="row-card" data-testid=format!("{SALT_PREFIX}{row}")>
            <div class="field" class:invalid=move || kind_err.get().is_some()>
                <label for=sel_id.clone()>{move || format!("Salt {}", n())}</label>
                <select
                    id=sel_id
                    disabled=readonly
                    prop:value=key
                    aria-invalid=move || if kind_err.get().is_some() { "true" } else { "false" }
                    on:change=move |ev| {
                        if let (Some(a), Some(i)) = (salt_from_key(&event_target_value(&ev)), pos.get_untracked()) {
                            design.update(|d| set_salt_kind(&mut d.recipe.salts, i, a));
                        }
                    }
                >
                    {salt_kinds()
                        .into_iter()
                        .map(|a| {
                            let k = salt_key(a);
                            view! { <option value=k selected=move || key() == k>{salt_label(a)}</option> }
                        })
                        .collect_view()}
                </select>
                {move || {
                    kind_err
                        .get()
                        .map(|m| {
                            view! {
                                <p class="field-msg" data-testid=kind_msg.clone() role="alert">
                                    {m}
                                </p>
                            }
                        })
                }}
            </div>
            <crate::workspaces::flask::RowEnd
                prefix=SALT_PREFIX
                row=row
                pos=pos
                path="recipe.salts[].conc_m"
                remove_label=Signal::derive(move || format!("Remove salt {}", n()))
                value=Signal::derive(move || salt().map_or(0.0, |a| a.conc_m))
                on_value=Callback::new(move |v| {
                    if let Some(i) = pos.get_untracked() {
                        design.update(|d| set_salt_conc(&mut d.recipe.salts, i, v));
                    }
                })
                on_remove=Callback::new(move |i: usize| design.update(|d| remove_salt(&mut d.recipe.salts, i)))
                error=conc_err
            />
        </div>
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use solver::document::demo_design;
    use solver::recipe::solve_recipe;

    fn spec_with(salts: Vec<AdditiveSpec>) -> RecipeSpec {
        let mut s = demo_design().recipe;
        s.salts = salts;
        s
    }

    #[test]
    fn the_inert_salts_are_the_neutral_additives() {
        assert_eq!(salt_kinds(), vec![Additive::Nacl, Additive::Kcl]);
        for a in salt_kinds() {
            assert_eq!(salt_from_key(salt_key(a)), Some(a));
        }
        assert_eq!(
            salt_from_key("hcl"),
            None,
            "a strong acid is not a salt row"
        );
    }

    #[test]
    fn adding_takes_the_next_salt_not_listed_and_stops_when_all_are() {
        let mut v = Vec::new();
        assert!(add_salt(&mut v));
        assert!(add_salt(&mut v));
        assert_eq!(
            v.iter().map(|s| s.additive).collect::<Vec<_>>(),
            vec![Additive::Nacl, Additive::Kcl]
        );
        assert_eq!(v[0].conc_m, 0.137);
        assert_eq!(v[1].conc_m, 0.0027);
        assert!(!add_salt(&mut v), "nothing left to add");
        assert_eq!(v.len(), 2);
        remove_salt(&mut v, 0);
        assert_eq!(v[0].additive, Additive::Kcl, "the row after moved up");
        assert!(add_salt(&mut v));
        assert_eq!(v[1].additive, Additive::Nacl, "the free salt comes back");
        remove_salt(&mut v, 9);
        assert_eq!(
            v.len(),
            2,
            "removing a row that is not there changes nothing"
        );
    }

    #[test]
    fn every_salt_is_weighed_and_each_row_edits_only_itself() {
        let mut v = Vec::new();
        add_salt(&mut v);
        add_salt(&mut v);
        set_salt_conc(&mut v, 1, 0.005);
        let r = solve_recipe(&spec_with(v.clone()), &[]).unwrap();
        let grams = |f: &str| {
            r.ingredients
                .iter()
                .find(|i| i.formula == f)
                .and_then(|i| i.grams)
        };
        let vol = demo_design().recipe.volume_l;
        // 0.137 mol/L × V × 58.44 g/mol (NaCl), 0.005 × V × 74.55 (KCl): CIAAW weights, from memory.
        assert!((grams("NaCl").unwrap() - 0.137 * vol * 58.44).abs() < 0.01 * vol);
        assert!((grams("KCl").unwrap() - 0.005 * vol * 74.55).abs() < 0.01 * vol);
        assert_eq!(v[0].conc_m, 0.137, "row 0 untouched");
        assert!(
            r.steps.iter().any(|s| s.contains("NaCl")) && r.steps.iter().any(|s| s.contains("KCl"))
        );
    }

    #[test]
    fn a_duplicate_is_refused_beside_its_own_row_not_merged() {
        let mut v = Vec::new();
        add_salt(&mut v);
        add_salt(&mut v);
        set_salt_kind(&mut v, 1, Additive::Nacl);
        assert_eq!(v.len(), 2, "the page does not merge on its own");
        let e = solve_recipe(&spec_with(v), &[]).unwrap_err();
        assert_eq!(salt_row_error(&e, 0), None);
        let m = salt_row_error(&e, 1).unwrap();
        assert!(m.contains("twice"), "{m}");
        assert_eq!(salt_row_error(&e, 10), None, "salts[1] is not salts[10]");
    }

    #[test]
    fn a_negative_amount_is_named_on_its_row() {
        let mut v = Vec::new();
        add_salt(&mut v);
        add_salt(&mut v);
        set_salt_conc(&mut v, 1, -1.0);
        let e = solve_recipe(&spec_with(v), &[]).unwrap_err();
        assert!(salt_row_error(&e, 1).is_some());
        assert!(salt_row_error(&e, 0).is_none());
    }
}
