//! The reagent editor's model, plain Rust: the typed text of every field, the system or added
//! forms it builds, and each field's message from the solver's own checks.
//!
//! Numbers are read with the page's strict parser ([`parse_number`]); everything else is
//! judged by `solver::document::reagent` (`system_field_problems` for a new system,
//! `validate_custom_forms` for forms added to an existing one), whose field paths
//! (`system.steps[1].pk25`) are turned into this editor's field keys (`rg-step-1-pk`).

use crate::widgets::format::{fmt_input, parse_number};
use solver::document::reagent::{system_field_problems, validate_custom_forms, Reagent};
use solver::system::formula::molar_mass;
use solver::system::library::{find_system, library};
use solver::system::{AcidSystem, CustomForm, Ion, ReagentForm, Step, TempModel, MAX_STEPS};
use solver::SolverError;
use std::collections::BTreeMap;

/// The typed text of one dissociation step.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct StepText {
    /// pK at 25 °C and I = 0.
    pub pk: String,
    /// ΔrH°, kJ/mol (optional).
    pub dh: String,
    /// ΔrCp°, J/(K·mol) (optional).
    pub dcp: String,
}

/// The typed text of one shelf form.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct FormText {
    /// Display name (the form's id is made from it).
    pub name: String,
    /// Formula, water of hydration after `·` or `.`.
    pub formula: String,
    /// Units of the system per formula unit.
    pub units: String,
    /// Na⁺ per formula unit.
    pub na: String,
    /// K⁺ per formula unit.
    pub k: String,
    /// Cl⁻ per formula unit.
    pub cl: String,
}

impl Default for FormText {
    fn default() -> Self {
        Self {
            name: String::new(),
            formula: String::new(),
            units: "1".into(),
            na: "0".into(),
            k: "0".into(),
            cl: "0".into(),
        }
    }
}

/// What the editor makes.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub enum Target {
    /// A new acid system with its forms.
    NewSystem,
    /// Shelf forms added to this system (library or the design's own).
    AddForms(String),
}

/// Everything typed into the editor.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct EditorModel {
    /// What is being made.
    pub target: Target,
    /// System name.
    pub name: String,
    /// Charge of the most protonated species.
    pub z0: String,
    /// Steps, most protonated first.
    pub steps: Vec<StepText>,
    /// Lowest temperature the constants hold for, °C.
    pub t_min: String,
    /// Highest temperature, °C.
    pub t_max: String,
    /// Species names, most protonated first (steps + 1).
    pub species: Vec<String>,
    /// Which species names the user typed (the others follow the charges).
    pub species_edited: Vec<bool>,
    /// Shelf forms.
    pub forms: Vec<FormText>,
    /// Where the constants come from (free text).
    pub source: String,
    /// Id of the system being edited (kept on save), if any.
    pub editing: Option<String>,
}

/// What the editor's text amounts to.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Checked {
    /// Message per field key (`rg-name`, `rg-step-0-pk`, `rg-form-1-formula`…).
    pub messages: BTreeMap<String, String>,
    /// Molar mass of each form's formula, g/mol, when it can be read.
    pub molar_masses: Vec<Option<f64>>,
    /// The reagent, when every field is right.
    pub reagent: Option<Reagent>,
    /// For added forms: all of them (the file holds one, the design all).
    pub added: Vec<CustomForm>,
}

const SUB: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];
const SUP: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];

fn digits(n: u32, table: &[char; 10]) -> String {
    n.to_string()
        .chars()
        .map(|c| {
            c.to_digit(10)
                .and_then(|d| table.get(d as usize))
                .copied()
                .unwrap_or(c)
        })
        .collect()
}

fn charge_text(z: i32) -> String {
    let sign = if z > 0 { '⁺' } else { '⁻' };
    match z.unsigned_abs() {
        0 => String::new(),
        1 => sign.to_string(),
        n => format!("{}{sign}", digits(n, &SUP)),
    }
}

/// Species names suggested from the charges: `HₙA` with the charge of each
/// (phosphate, z0 = 0: H₃A, H₂A⁻, HA²⁻, A³⁻; an amine, z0 = +1: HA⁺, A).
pub fn suggest_species(z0: i32, n: usize) -> Vec<String> {
    (0..=n)
        .map(|j| {
            let protons = (n - j) as u32;
            let h = match protons {
                0 => String::new(),
                1 => "H".into(),
                p => format!("H{}", digits(p, &SUB)),
            };
            format!("{h}A{}", charge_text(z0 - j as i32))
        })
        .collect()
}

/// An id made from a name: lowercase letters, digits and `_`.
pub fn slug(name: &str) -> String {
    let mut s = String::new();
    for c in name.trim().chars() {
        if c.is_ascii_alphanumeric() {
            s.push(c.to_ascii_lowercase());
        } else if !s.is_empty() && !s.ends_with('_') {
            s.push('_');
        }
    }
    s.trim_end_matches('_').chars().take(40).collect()
}

impl EditorModel {
    /// A blank new system: one step, one form.
    pub fn new_system() -> Self {
        let mut m = Self {
            target: Target::NewSystem,
            name: String::new(),
            z0: "0".into(),
            steps: vec![StepText::default()],
            // Covers the recipe's usual 37 °C as well as room temperature.
            t_min: "10".into(),
            t_max: "40".into(),
            species: vec![],
            species_edited: vec![],
            forms: vec![FormText::default()],
            source: String::new(),
            editing: None,
        };
        m.sync_species();
        m
    }

    /// Blank shelf forms for the system `system_id`.
    pub fn add_forms(system_id: &str) -> Self {
        Self {
            target: Target::AddForms(system_id.to_string()),
            ..Self::new_system()
        }
    }

    /// The editor filled from a system (to change it or start from a copy).
    pub fn from_system(sys: &AcidSystem) -> Self {
        let steps = sys
            .steps
            .iter()
            .map(|s| match s.temp {
                TempModel::VantHoff { dh_kj, dcp_j } => StepText {
                    pk: fmt_input(s.pk25),
                    dh: fmt_input(dh_kj),
                    dcp: fmt_input(dcp_j),
                },
                _ => StepText {
                    pk: fmt_input(s.pk25),
                    ..StepText::default()
                },
            })
            .collect();
        let forms = sys.forms.iter().map(form_text).collect();
        let suggested = suggest_species(sys.z0, sys.steps.len());
        Self {
            target: Target::NewSystem,
            name: sys.name.clone(),
            z0: sys.z0.to_string(),
            steps,
            t_min: fmt_input(sys.t_min_c),
            t_max: fmt_input(sys.t_max_c),
            species_edited: sys
                .species
                .iter()
                .zip(suggested.iter().map(Some).chain(std::iter::repeat(None)))
                .map(|(a, b)| b != Some(a))
                .collect(),
            species: sys.species.clone(),
            forms,
            source: sys.source.clone(),
            editing: (find_system(&sys.id).is_none()).then(|| sys.id.clone()),
        }
    }

    /// The charge typed, when it is a whole number.
    pub fn z0_value(&self) -> Option<i32> {
        self.z0.trim().replace('\u{2212}', "-").parse::<i32>().ok()
    }

    /// Species names that were not typed by the user follow the charge and
    /// the number of steps.
    pub fn sync_species(&mut self) {
        let n = self.steps.len();
        let z0 = self.z0_value().unwrap_or(0);
        let suggested = suggest_species(z0, n);
        self.species.resize(n + 1, String::new());
        self.species_edited.resize(n + 1, false);
        for (j, s) in suggested.into_iter().enumerate() {
            if !self.species_edited.get(j).copied().unwrap_or(false) {
                if let Some(slot) = self.species.get_mut(j) {
                    *slot = s;
                }
            }
        }
    }

    /// Add a step (at most six).
    pub fn add_step(&mut self) {
        if self.steps.len() < MAX_STEPS {
            self.steps.push(StepText::default());
            self.sync_species();
        }
    }

    /// Remove the last step (at least one stays).
    pub fn remove_step(&mut self) {
        if self.steps.len() > 1 {
            self.steps.pop();
            self.sync_species();
        }
    }

    /// Set a species name typed by the user (empty text gives the suggestion back).
    pub fn set_species(&mut self, j: usize, text: String) {
        let edited = !text.trim().is_empty();
        if let Some(e) = self.species_edited.get_mut(j) {
            *e = edited;
        }
        if let Some(s) = self.species.get_mut(j) {
            *s = text;
        }
        if !edited {
            self.sync_species();
        }
    }

    fn system_id(&self, taken: &[String]) -> String {
        if let Some(id) = &self.editing {
            return id.clone();
        }
        let base = slug(&self.name);
        if base.is_empty() {
            return String::new();
        }
        let base = format!("user_{base}");
        let free = |id: &str| find_system(id).is_none() && !taken.iter().any(|t| t == id);
        if free(&base) {
            return base;
        }
        (2..1000)
            .map(|n| format!("{base}_{n}"))
            .find(|id| free(id))
            .unwrap_or(base)
    }

    fn build_forms(&self, messages: &mut BTreeMap<String, String>) -> Vec<ReagentForm> {
        self.forms
            .iter()
            .enumerate()
            .map(|(j, f)| {
                let mut read = |key: &str, text: &str| match parse_number(text) {
                    Ok(v) => v,
                    Err(m) => {
                        messages.insert(format!("rg-form-{j}-{key}"), m);
                        f64::NAN
                    }
                };
                let units = read("units", &f.units);
                let ions: Vec<(Ion, f64)> = [
                    (Ion::Na, "na", &f.na),
                    (Ion::K, "k", &f.k),
                    (Ion::Cl, "cl", &f.cl),
                ]
                .into_iter()
                .map(|(ion, key, text)| (ion, read(key, text)))
                .filter(|(_, n)| *n != 0.0)
                .collect();
                let id = slug(&f.name);
                ReagentForm {
                    id: if id.is_empty() {
                        id
                    } else {
                        format!("user_{id}")
                    },
                    name: f.name.trim().to_string(),
                    formula: f.formula.trim().to_string(),
                    units,
                    counter_ions: ions,
                }
            })
            .collect()
    }

    /// Read every field and check it: messages beside fields, molar masses
    /// as typed, and the reagent when nothing is wrong. `custom` is the
    /// design's own systems, `added` its added forms (ids must not clash).
    pub fn check(&self, custom: &[AcidSystem], added: &[CustomForm]) -> Checked {
        let mut messages = BTreeMap::new();
        let molar_masses = self
            .forms
            .iter()
            .map(|f| molar_mass(f.formula.trim()).ok())
            .collect();
        let forms = self.build_forms(&mut messages);
        match &self.target {
            Target::NewSystem => self.check_system(custom, forms, messages, molar_masses),
            Target::AddForms(sys) => {
                let existing: Vec<CustomForm> = added.to_vec();
                let mine: Vec<CustomForm> = forms
                    .into_iter()
                    .map(|form| CustomForm {
                        system: sys.clone(),
                        form,
                    })
                    .collect();
                let base = existing.len();
                for (j, cf) in mine.iter().enumerate() {
                    // The form alone after the design's own, then its id after the
                    // editor's earlier forms (standing in as copies of this one).
                    let mut alone = existing.clone();
                    alone.push(cf.clone());
                    let mut list = existing.clone();
                    list.extend(mine.iter().take(j).map(|c| CustomForm {
                        form: ReagentForm {
                            id: c.form.id.clone(),
                            ..cf.form.clone()
                        },
                        ..cf.clone()
                    }));
                    list.push(cf.clone());
                    let first = validate_custom_forms(&alone, custom)
                        .and_then(|()| validate_custom_forms(&list, custom));
                    if let Err(e) = first {
                        let field = e.field().unwrap_or_default().to_string();
                        let path = match &e {
                            _ if field.starts_with(&format!("custom_forms[{base}].")) => {
                                format!("custom_forms[{base}].form")
                            }
                            _ => format!("custom_forms[{}].form", base + j),
                        };
                        let key = match field.strip_prefix(&path) {
                            Some(rest) => form_key(j, rest),
                            None => "rg-forms".to_string(),
                        };
                        messages.entry(key).or_insert_with(|| message(&e, &field));
                    }
                }
                let ok = messages.is_empty() && !mine.is_empty();
                Checked {
                    messages,
                    molar_masses,
                    reagent: if ok {
                        mine.first().cloned().map(Reagent::Form)
                    } else {
                        None
                    },
                    added: if ok { mine } else { vec![] },
                }
            }
        }
    }

    fn check_system(
        &self,
        custom: &[AcidSystem],
        forms: Vec<ReagentForm>,
        mut messages: BTreeMap<String, String>,
        molar_masses: Vec<Option<f64>>,
    ) -> Checked {
        let z0 = match self.z0_value() {
            Some(z) => z,
            None => {
                messages.insert(
                    "rg-z0".into(),
                    "Enter a whole number (the charge, e.g. 0 or 1 or −1).".into(),
                );
                0
            }
        };
        let mut read = |key: String, text: &str, optional: bool| -> Option<f64> {
            if optional && text.trim().is_empty() {
                return None;
            }
            match parse_number(text) {
                Ok(v) => Some(v),
                Err(m) => {
                    messages.insert(key, m);
                    Some(f64::NAN)
                }
            }
        };
        let steps: Vec<Step> = self
            .steps
            .iter()
            .enumerate()
            .map(|(i, s)| {
                let pk = read(format!("rg-step-{i}-pk"), &s.pk, false).unwrap_or(f64::NAN);
                let dh = read(format!("rg-step-{i}-dh"), &s.dh, true);
                let dcp = read(format!("rg-step-{i}-dcp"), &s.dcp, true);
                Step {
                    pk25: pk,
                    temp: if dh.is_none() && dcp.is_none() {
                        TempModel::Constant
                    } else {
                        TempModel::VantHoff {
                            dh_kj: dh.unwrap_or(0.0),
                            dcp_j: dcp.unwrap_or(0.0),
                        }
                    },
                }
            })
            .collect();
        let t_min = read("rg-tmin".into(), &self.t_min, false).unwrap_or(f64::NAN);
        let t_max = read("rg-tmax".into(), &self.t_max, false).unwrap_or(f64::NAN);
        let taken: Vec<String> = custom
            .iter()
            .filter(|s| Some(&s.id) != self.editing.as_ref())
            .map(|s| s.id.clone())
            .collect();
        let sys = AcidSystem {
            id: self.system_id(&taken),
            name: self.name.trim().to_string(),
            z0,
            steps,
            species: self.species.iter().map(|s| s.trim().to_string()).collect(),
            t_min_c: t_min,
            t_max_c: t_max,
            forms,
            source: self.source.trim().to_string(),
            hazards: vec![],
        };
        for e in system_field_problems(&sys) {
            let field = e.field().unwrap_or_default().to_string();
            let key = system_key(&field);
            messages.entry(key).or_insert_with(|| message(&e, &field));
        }
        if sys.forms.is_empty() {
            messages.insert(
                "rg-forms".into(),
                "Add at least one shelf form (what you weigh).".into(),
            );
        }
        let ok = messages.is_empty();
        Checked {
            messages,
            molar_masses,
            reagent: ok.then_some(Reagent::System(sys)),
            added: vec![],
        }
    }
}

/// The typed text of a stored form.
pub fn form_text(f: &ReagentForm) -> FormText {
    let count = |ion: Ion| {
        fmt_input(
            f.counter_ions
                .iter()
                .filter(|(i, _)| *i == ion)
                .map(|(_, n)| n)
                .sum(),
        )
    };
    FormText {
        name: f.name.clone(),
        formula: f.formula.clone(),
        units: fmt_input(f.units),
        na: count(Ion::Na),
        k: count(Ion::K),
        cl: count(Ion::Cl),
    }
}

/// Editor key of a form field from the rest of its solver path (`.formula`).
fn form_key(j: usize, rest: &str) -> String {
    let part = match rest.trim_start_matches('.') {
        "formula" => "formula",
        "units" => "units",
        "id" | "name" => "name",
        _ => "ions",
    };
    format!("rg-form-{j}-{part}")
}

/// Editor key of a solver field path (`system.steps[1].pk25` → `rg-step-1-pk`).
pub fn system_key(field: &str) -> String {
    let f = field.strip_prefix("system.").unwrap_or(field);
    let index = |s: &str| -> Option<(usize, String)> {
        let (n, rest) = s.split_once(']')?;
        Some((n.parse().ok()?, rest.to_string()))
    };
    if let Some((i, rest)) = f.strip_prefix("steps[").and_then(index) {
        let part = match rest.trim_start_matches('.') {
            "dh_kj" => "dh",
            "dcp_j" => "dcp",
            _ => "pk",
        };
        return format!("rg-step-{i}-{part}");
    }
    if let Some((j, rest)) = f.strip_prefix("forms[").and_then(index) {
        return form_key(j, &rest);
    }
    if let Some((j, _)) = f.strip_prefix("species[").and_then(index) {
        return format!("rg-species-{j}");
    }
    match f {
        "name" | "id" => "rg-name",
        "z0" => "rg-z0",
        "t_min_c" => "rg-tmin",
        "t_max_c" => "rg-tmax",
        "species" => "rg-species-0",
        _ => "rg-steps",
    }
    .to_string()
}

/// The solver's message in the editor's words: without the field path, and
/// with the usual slips said plainly.
fn message(e: &SolverError, field: &str) -> String {
    let text = e.to_string();
    let bare = text
        .strip_prefix(field)
        .map(|r| r.trim_start_matches(": ").to_string())
        .unwrap_or(text.clone());
    match e {
        SolverError::NotFinite { .. } => "Enter a number.".into(),
        SolverError::OutOfRange { value, min, .. }
            if field.ends_with(".pk25") && !field.contains("steps[0]") && value <= min =>
        {
            format!(
                "pK values go up from step to step: this one must be above the one before ({}).",
                fmt_input(*min)
            )
        }
        SolverError::OutOfRange { min, max, .. } if field.ends_with(".units") => format!(
            "Must be above 0 (how many units of the system one formula unit delivers; {} to {}).",
            fmt_input(*min),
            fmt_input(*max)
        ),
        SolverError::Document { reason, .. } if reason == "must not be empty" => {
            if field.contains("forms[") {
                "Give the form a name.".into()
            } else {
                "Must not be empty.".into()
            }
        }
        SolverError::Document { reason, .. } if reason.starts_with("duplicate form id") => {
            "Another form of this system has this name: choose another.".into()
        }
        _ => bare,
    }
}

/// Every system the picker offers: the design's own (with added forms), then the library.
pub fn known_system_ids(custom: &[AcidSystem]) -> Vec<String> {
    custom
        .iter()
        .map(|s| s.id.clone())
        .chain(library().iter().map(|s| s.id.clone()))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn typed_acetate() -> EditorModel {
        let mut m = EditorModel::new_system();
        m.name = "My acetate".into();
        m.steps[0] = StepText {
            pk: "4.756".into(),
            dh: "-0.41".into(),
            dcp: "-142".into(),
        };
        m.t_min = "0".into();
        m.t_max = "60".into();
        m.forms[0] = FormText {
            name: "acetic acid".into(),
            formula: "C2H4O2".into(),
            ..FormText::default()
        };
        m.forms.push(FormText {
            name: "sodium acetate trihydrate".into(),
            formula: "C2H3NaO2·3H2O".into(),
            na: "1".into(),
            ..FormText::default()
        });
        m
    }

    #[test]
    fn a_typed_copy_of_acetate_builds_the_library_constants() {
        let c = typed_acetate().check(&[], &[]);
        assert!(c.messages.is_empty(), "{:?}", c.messages);
        let Some(Reagent::System(s)) = c.reagent else {
            unreachable!("no system")
        };
        let lib = find_system("acetate").unwrap();
        assert_eq!(s.id, "user_my_acetate");
        assert_eq!(s.steps, lib.steps);
        assert_eq!(s.z0, lib.z0);
        assert_eq!(s.species, vec!["HA", "A⁻"]);
        assert!((c.molar_masses[1].unwrap() - 136.079).abs() < 0.001);
    }

    #[test]
    fn species_follow_the_charge_until_typed() {
        assert_eq!(suggest_species(0, 3), vec!["H₃A", "H₂A⁻", "HA²⁻", "A³⁻"]);
        assert_eq!(suggest_species(1, 1), vec!["HA⁺", "A"]);
        let mut m = EditorModel::new_system();
        m.set_species(1, "B".into());
        m.z0 = "1".into();
        m.sync_species();
        assert_eq!(m.species, vec!["HA⁺", "B"]);
        m.add_step();
        assert_eq!(m.species.len(), 3);
        assert_eq!(m.species[0], "H₂A⁺");
        m.set_species(1, String::new());
        assert_eq!(m.species[1], "HA");
    }

    #[test]
    fn every_field_gets_its_own_message() {
        let mut m = typed_acetate();
        m.name = " ".into();
        m.z0 = "one".into();
        m.add_step();
        m.steps[1].pk = "3".into(); // below the first
        m.steps[0].dh = "1,000".into(); // ambiguous
        m.forms[0].formula = "C2H4Q2".into();
        m.forms[1].units = "0".into();
        let c = m.check(&[], &[]);
        let has = |k: &str| c.messages.get(k).cloned().unwrap_or_default();
        assert!(has("rg-name").contains("empty"), "{:?}", c.messages);
        assert!(has("rg-z0").contains("whole number"), "{:?}", c.messages);
        assert!(
            has("rg-step-1-pk").contains("above the one before"),
            "{:?}",
            c.messages
        );
        assert!(has("rg-step-0-dh").contains("1000"), "{:?}", c.messages);
        assert!(
            has("rg-form-0-formula").contains("formula"),
            "{:?}",
            c.messages
        );
        assert!(
            has("rg-form-1-units").contains("above 0"),
            "{:?}",
            c.messages
        );
        assert!(c.molar_masses[0].is_none());
        assert!(c.reagent.is_none());
    }

    #[test]
    fn a_charge_that_does_not_fit_the_forms_is_named_at_the_form() {
        let mut m = typed_acetate();
        m.z0 = "-1".into();
        let c = m.check(&[], &[]);
        assert!(
            c.messages
                .get("rg-form-0-ions")
                .is_some_and(|t| t.contains("charge")),
            "{:?}",
            c.messages
        );
    }

    #[test]
    fn added_forms_are_checked_against_their_system() {
        let mut m = EditorModel::add_forms("hepes");
        m.forms[0] = FormText {
            name: "HEPES potassium salt".into(),
            formula: "C8H17KN2O4S".into(),
            k: "1".into(),
            ..FormText::default()
        };
        let c = m.check(&[], &[]);
        assert!(c.messages.is_empty(), "{:?}", c.messages);
        assert_eq!(c.added[0].form.id, "user_hepes_potassium_salt");
        // Two K⁺ do not fit HEPES (0 and −1); the same name twice is refused.
        m.forms.push(FormText {
            k: "2".into(),
            ..m.forms[0].clone()
        });
        let c = m.check(&[], &[]);
        assert!(
            c.messages.contains_key("rg-form-1-ions"),
            "{:?}",
            c.messages
        );
        m.forms[1].k = "1".into();
        let c = m.check(&[], &[]);
        assert!(
            c.messages
                .get("rg-form-1-name")
                .is_some_and(|t| t.contains("another")),
            "{:?}",
            c.messages
        );
        // An id the design already holds is refused too.
        let m2 = EditorModel {
            forms: vec![m.forms[0].clone()],
            ..m.clone()
        };
        let first = m2.check(&[], &[]).added;
        let c = m2.check(&[], &first);
        assert!(
            c.messages.contains_key("rg-form-0-name"),
            "{:?}",
            c.messages
        );
    }

    #[test]
    fn a_library_system_round_trips_through_the_editor() {
        let lib = find_system("phosphate").unwrap();
        let m = EditorModel::from_system(lib);
        let mut m = m;
        m.name = "My phosphate".into();
        let c = m.check(&[], &[]);
        let Some(Reagent::System(s)) = c.reagent else {
            unreachable!("{:?}", c.messages)
        };
        assert_eq!(s.steps, lib.steps);
        assert_eq!(s.species, lib.species);
        assert_eq!(s.forms.len(), lib.forms.len());
    }
}
