//! Which reagent forms a recipe uses: the pair the solver suggests for the
//! target, whether the forms on screen follow it, and how they move to another
//! pK keeping the user's hydrate and counter-ion.

use crate::widgets::format::pretty_formula;
use solver::mixture::{lookup, Additive};
use solver::recipe::{form_level, suggest_pair, Method, RecipeSpec};
use solver::system::library::find_form;
use solver::system::AcidSystem;

/// Short key of a method (`two_forms`, `titrate`, `two_stocks`).
pub fn method_key(m: &Method) -> &'static str {
    match m {
        Method::TwoForms { .. } => "two_forms",
        Method::Titrate { .. } => "titrate",
        Method::TwoStocks { .. } => "two_stocks",
    }
}

/// The form weighed in the titration method for a suggested pair: the acid
/// form when titrating with a base, the base form when titrating with HCl.
pub(crate) fn titrate_form(titrant: Additive, acid: &str, base: &str) -> String {
    if titrant.charge() < 0.0 {
        base.to_string()
    } else {
        acid.to_string()
    }
}

pub(crate) fn suggestion(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(String, String)> {
    suggest_pair(&spec.system, spec.target_ph, spec.temperature_c, custom).ok()
}

/// Deprotonation level of one of the system's forms, if it has that form.
pub(crate) fn level_of(sys: &AcidSystem, form_id: &str) -> Option<f64> {
    find_form(sys, form_id).map(|f| form_level(sys, f))
}

/// Deprotonation levels of the forms in `spec` (acid side, base side), if they exist.
pub(crate) fn current_levels(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(f64, f64)> {
    let sys = lookup(&spec.system, custom).ok()?;
    let level = |id: &str| level_of(sys, id);
    match &spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => Some((level(acid_form)?, level(base_form)?)),
        Method::Titrate { form, .. } => {
            let l = level(form)?;
            Some((l, l))
        }
    }
}

/// Deprotonation levels of the solver's suggested pair, in the same shape as [`current_levels`].
pub(crate) fn suggested_levels(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<(f64, f64)> {
    let (a, b) = suggestion(spec, custom)?;
    let sys = lookup(&spec.system, custom).ok()?;
    let level = |id: &str| level_of(sys, id);
    match &spec.method {
        Method::Titrate { titrant, .. } => {
            let l = level(&titrate_form(*titrant, &a, &b))?;
            Some((l, l))
        }
        _ => Some((level(&a)?, level(&b)?)),
    }
}

/// Whether the forms in `spec` sit on the levels the solver suggests for the
/// target (any hydrate or salt of those levels counts). Decides, when a
/// design is opened, whether its forms follow the target or were picked by hand.
pub fn follows_suggestion(spec: &RecipeSpec, custom: &[AcidSystem]) -> bool {
    match (suggested_levels(spec, custom), current_levels(spec, custom)) {
        (Some(s), Some(c)) => (s.0 - c.0).abs() < 1e-9 && (s.1 - c.1).abs() < 1e-9,
        _ => true,
    }
}

/// Put the suggested pair (or, failing that, the system's first and last
/// forms) into the method.
pub fn apply_suggestion(spec: &mut RecipeSpec, custom: &[AcidSystem]) {
    let pair = suggestion(spec, custom).or_else(|| {
        let sys = lookup(&spec.system, custom).ok()?;
        let first = sys.forms.first()?.id.clone();
        let last = sys.forms.last()?.id.clone();
        Some((first, last))
    });
    let Some((a, b)) = pair else { return };
    match &mut spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => {
            *acid_form = a;
            *base_form = b;
        }
        Method::Titrate { form, titrant, .. } => *form = titrate_form(*titrant, &a, &b),
    }
}

/// The form ids of a method, in slot order (acid side, base side; or the one weighed form).
pub fn method_forms(m: &Method) -> Vec<String> {
    match m {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => vec![acid_form.clone(), base_form.clone()],
        Method::Titrate { form, .. } => vec![form.clone()],
    }
}

/// The method's forms as people read them: `NaH₂PO₄·H₂O + Na₂HPO₄·7H₂O`.
pub fn forms_text(m: &Method, system: &str, custom: &[AcidSystem]) -> String {
    let sys = lookup(system, custom).ok();
    method_forms(m)
        .iter()
        .map(|id| {
            sys.and_then(|s| find_form(s, id))
                .map_or_else(|| id.clone(), |f| pretty_formula(&f.formula))
        })
        .collect::<Vec<_>>()
        .join(" + ")
}

/// The forms to move to when the target (or the temperature) now sits at
/// another pK than the forms in `spec`; `None` when they already bracket it.
///
/// The user's choices are kept where the system allows: a current form that
/// sits on one of the new levels stays, and a new form is the one with the
/// same counter-ions (Na⁺ or K⁺) and the same hydrate-or-not as the form it
/// replaces.
pub fn retarget(spec: &RecipeSpec, custom: &[AcidSystem]) -> Option<Method> {
    let want = suggested_levels(spec, custom)?;
    let have = current_levels(spec, custom)?;
    if (want.0 - have.0).abs() < 1e-9 && (want.1 - have.1).abs() < 1e-9 {
        return None;
    }
    let sys = lookup(&spec.system, custom).ok()?;
    let current = method_forms(&spec.method);
    let ions = |id: &str| -> Vec<solver::system::Ion> {
        find_form(sys, id)
            .map(|f| f.counter_ions.iter().map(|(ion, _)| *ion).collect())
            .unwrap_or_default()
    };
    let hydrate = |formula: &str| formula.contains('·') || formula.contains('.');
    let user_ions: Vec<solver::system::Ion> = current.iter().flat_map(|id| ions(id)).collect();
    let pick = |level: f64, replaces: &str| -> Option<String> {
        if let Some(kept) = current
            .iter()
            .find(|id| level_of(sys, id).is_some_and(|l| (l - level).abs() < 1e-9))
        {
            return Some(kept.clone());
        }
        let old = find_form(sys, replaces);
        let old_hydrate = old.is_some_and(|f| hydrate(&f.formula));
        sys.forms
            .iter()
            .enumerate()
            .filter(|(_, f)| (form_level(sys, f) - level).abs() < 1e-9)
            .max_by_key(|(i, f)| {
                let own: Vec<_> = f.counter_ions.iter().map(|(ion, _)| *ion).collect();
                let same_ions = !own.is_empty() && own.iter().all(|ion| user_ions.contains(ion));
                let same_hydrate = hydrate(&f.formula) == old_hydrate;
                // Highest score wins; on a tie the first listed form.
                (
                    u8::from(same_ions) * 2 + u8::from(same_hydrate),
                    std::cmp::Reverse(*i),
                )
            })
            .map(|(_, f)| f.id.clone())
    };
    let mut m = spec.method.clone();
    match &mut m {
        Method::TwoForms {
            acid_form,
            base_form,
        }
        | Method::TwoStocks {
            acid_form,
            base_form,
            ..
        } => {
            let a = pick(want.0, acid_form)?;
            let b = pick(want.1, base_form)?;
            *acid_form = a;
            *base_form = b;
        }
        Method::Titrate { form, .. } => {
            *form = pick(want.0, form)?;
        }
    }
    Some(m)
}

/// A new method of kind `key`, with the suggested forms.
pub fn switch_method(spec: &mut RecipeSpec, custom: &[AcidSystem], key: &str) {
    let placeholder = String::new();
    spec.method = match key {
        "titrate" => Method::Titrate {
            form: placeholder,
            titrant: Additive::Naoh,
            titrant_m: 1.0,
        },
        "two_stocks" => Method::TwoStocks {
            acid_form: placeholder.clone(),
            acid_stock_m: 1.0,
            base_form: placeholder,
            base_stock_m: 1.0,
        },
        _ => Method::TwoForms {
            acid_form: placeholder.clone(),
            base_form: placeholder,
        },
    };
    apply_suggestion(spec, custom);
}
