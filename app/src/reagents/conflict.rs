//! Bringing a reagent in without surprises: "Use" on a shelf reagent never silently replaces a different reagent of the same name in the design (it is refused, with the difference), and a refused reagent file is explained in plain words.

use crate::designs::reasons::plain_reason;
use crate::widgets::format::fmt_input;
use solver::document::reagent::Reagent;
use solver::document::Design;
use solver::system::{AcidSystem, ReagentForm};
use solver::SolverError;

/// The first difference between two systems, in words (`pK 1: 4.2 here, 4.5 on the shelf`).
fn system_difference(here: &AcidSystem, shelf: &AcidSystem) -> Option<String> {
    if here.steps.len() != shelf.steps.len() {
        return Some(format!(
            "{} step(s) here, {} on the shelf",
            here.steps.len(),
            shelf.steps.len()
        ));
    }
    for (i, (a, b)) in here.steps.iter().zip(&shelf.steps).enumerate() {
        if a.pk25 != b.pk25 {
            return Some(format!(
                "pK {} at 25 °C: {} here, {} on the shelf",
                i + 1,
                fmt_input(a.pk25),
                fmt_input(b.pk25)
            ));
        }
        if a.temp != b.temp {
            return Some(format!("the temperature data of step {} differ", i + 1));
        }
    }
    if here.z0 != shelf.z0 {
        return Some(format!(
            "charge {} here, {} on the shelf",
            here.z0, shelf.z0
        ));
    }
    if (here.t_min_c, here.t_max_c) != (shelf.t_min_c, shelf.t_max_c) {
        return Some(format!(
            "{} to {} °C here, {} to {} °C on the shelf",
            fmt_input(here.t_min_c),
            fmt_input(here.t_max_c),
            fmt_input(shelf.t_min_c),
            fmt_input(shelf.t_max_c)
        ));
    }
    if here.forms.len() != shelf.forms.len() {
        return Some(format!(
            "{} form(s) here, {} on the shelf",
            here.forms.len(),
            shelf.forms.len()
        ));
    }
    for (a, b) in here.forms.iter().zip(&shelf.forms) {
        if let Some(d) = form_difference(a, b) {
            return Some(d);
        }
    }
    (here != shelf).then(|| "their names, species or sources differ".to_string())
}

/// The first difference between two forms, in words.
fn form_difference(here: &ReagentForm, shelf: &ReagentForm) -> Option<String> {
    if here.formula != shelf.formula {
        return Some(format!(
            "formula {} here, {} on the shelf",
            here.formula, shelf.formula
        ));
    }
    if here.units != shelf.units || here.counter_ions != shelf.counter_ions {
        return Some(format!(
            "the units or counter-ions of “{}” differ",
            here.name
        ));
    }
    (here != shelf).then(|| format!("the form “{}” differs", here.name))
}

/// Why "Use" must not bring `r` into `d`: the design already holds a different reagent
/// under the same id (a system of the same name, or a form of the same name for the same
/// system). `None` when it can be used (new, or the same).
pub fn use_conflict(d: &Design, r: &Reagent) -> Option<String> {
    let (name, difference) = match r {
        Reagent::System(s) => {
            let here = d.custom_systems.iter().find(|c| c.id == s.id)?;
            (s.name.clone(), system_difference(here, s)?)
        }
        Reagent::Form(f) => {
            let here = d
                .custom_forms
                .iter()
                .find(|c| c.system == f.system && c.form.id == f.form.id)?;
            (f.form.name.clone(), form_difference(&here.form, &f.form)?)
        }
    };
    Some(format!(
        "Not used: this design already has its own “{name}”, which differs from the one on \
         your shelf ({difference}). Nothing was replaced. To use the shelf's, edit it and give \
         it another name, or edit the design's own to match."
    ))
}

/// Why a reagent file was refused, in plain words (no parser jargon, no field paths).
pub fn plain_file_reason(e: &SolverError) -> String {
    plain_reason(e).replace("as a design", "as a reagent file")
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use solver::document::demo_design;
    use solver::document::reagent::parse_reagent;
    use solver::system::library::find_system;

    fn mine(pk: f64) -> AcidSystem {
        let mut s = find_system("acetate").unwrap().clone();
        s.id = "user_mine".into();
        s.name = "Mine".into();
        s.steps[0].pk25 = pk;
        s
    }

    #[test]
    fn a_different_reagent_of_the_same_name_is_not_replaced() {
        let mut d = demo_design();
        assert_eq!(use_conflict(&d, &Reagent::System(mine(4.2))), None);
        d.custom_systems.push(mine(4.2));
        assert_eq!(use_conflict(&d, &Reagent::System(mine(4.2))), None);
        let why = use_conflict(&d, &Reagent::System(mine(4.5))).unwrap();
        assert!(
            why.contains("pK 1 at 25 °C: 4.2 here, 4.5 on the shelf"),
            "{why}"
        );
        assert!(why.contains("Nothing was replaced"), "{why}");
    }

    #[test]
    fn file_errors_read_in_plain_words() {
        for text in [
            "{\"bufferwright_reagent\": 1, \"reagent\": {\"system\": {\"id\": ",
            "nonsense",
        ] {
            let why = plain_file_reason(&parse_reagent(text).unwrap_err());
            assert!(!why.contains("EOF") && !why.contains("expected"), "{why}");
        }
        let mut v: serde_json::Value = serde_json::from_str(
            &solver::document::reagent::reagent_to_json(&Reagent::System(mine(4.2))),
        )
        .unwrap();
        v["reagent"]["system"]["steps"][0]["pk25"] = serde_json::json!("four");
        let why = plain_file_reason(&parse_reagent(&v.to_string()).unwrap_err());
        assert!(!why.contains("f64") && why.contains("a number"), "{why}");
    }
}
