//! User reagents: checks for user-defined systems and added shelf forms, the systems a design
//! sees, the standalone reagent file, and the per-field checks a reagent editor shows.
//!
//! One mechanism checks everything: [`validate_user_system`] is
//! [`crate::system::thermo::validate_system`] plus the one rule it leaves out (a form's counter-ions
//! must leave the system in a charge its species can carry). Added forms, reagent files and
//! the editor's per-field messages all run it, on the system or on parts of it.

use crate::error::{Result, SolverError};
use crate::fmt::{clip, quote, QUOTE_MAX};
use crate::mixture::lookup;
use crate::system::formula::element_count;
use crate::system::library::{counter_charge, find_system};
use crate::system::thermo::validate_system;
use crate::system::{AcidSystem, CustomForm, Ion, ReagentForm, Step, TempModel};
use serde::{Deserialize, Serialize};

/// Version of the standalone reagent file ([`ReagentFile::bufferwright_reagent`]).
pub const REAGENT_FILE_VERSION: u32 = 1;

/// Largest reagent file read, bytes.
pub const REAGENT_FILE_MAX_BYTES: usize = 256 * 1024;

/// Charge each unit of the system carries as this form delivers it:
/// −(counter-ion charge) / units (Na₂HPO₄: −2; borax: −0.5; Tris·HCl: +1).
pub fn form_system_charge(form: &ReagentForm) -> f64 {
    -counter_charge(form) / form.units
}

/// Each form from index `from` on must leave the system in a charge its species carry.
/// (One built-in form breaks this on purpose: sodium sulfide, whose S²⁻ the library models
/// as HS⁻ plus hydroxide because pK2 of H₂S is not reliable; forms added to a built-in
/// system are checked, its own are not.)
fn check_form_charges(sys: &AcidSystem, from: usize) -> Result<()> {
    let hi = f64::from(sys.z0);
    let lo = hi - sys.steps.len() as f64;
    for (j, form) in sys.forms.iter().enumerate().skip(from) {
        let z = form_system_charge(form);
        if !(lo - 1e-9..=hi + 1e-9).contains(&z) {
            return Err(SolverError::Document {
                field: format!("system.forms[{j}].counter_ions"),
                reason: format!(
                    "these counter-ions leave each unit of the system with charge {z:+}, \
                     but its species carry {hi:+} to {lo:+} (check the charge of the most \
                     protonated species, the units and the counter-ions)"
                ),
            });
        }
    }
    Ok(())
}

/// Each form from index `from` on must declare the spectator ions its formula holds: as
/// many Na⁺ and K⁺ per formula unit as the formula has Na and K atoms (a sodium salt
/// declared without its Na⁺ would be taken for the free acid), and no more Cl⁻ than the
/// formula has Cl atoms (a system's own species may hold chlorine, as HOCl does, so
/// fewer is allowed). A formula that cannot be read is left to [`validate_system`].
fn check_form_formulas(sys: &AcidSystem, from: usize) -> Result<()> {
    for (j, form) in sys.forms.iter().enumerate().skip(from) {
        for ion in Ion::ALL {
            let element = ion_element(ion);
            let Ok(atoms) = element_count(&form.formula, element) else {
                continue;
            };
            let declared: f64 = form
                .counter_ions
                .iter()
                .filter(|(i, _)| *i == ion)
                .fold(0.0, |sum, &(_, n)| sum + n);
            let fits = match ion {
                Ion::Cl => declared <= atoms + 1e-9,
                Ion::Na | Ion::K => (declared - atoms).abs() <= 1e-9,
            };
            if !fits {
                let formula = quote(&form.formula);
                let symbol = ion.symbol();
                return Err(SolverError::Document {
                    field: format!("system.forms[{j}].counter_ions"),
                    reason: if atoms > declared {
                        format!(
                            "the formula {formula} holds {atoms} {element} per formula unit, \
                             but the counter-ions declare {declared} {symbol}: declare \
                             {atoms} {symbol} (a salt of the system), or correct the formula"
                        )
                    } else {
                        format!(
                            "the counter-ions declare {declared} {symbol} per formula unit, \
                             but the formula {formula} holds {atoms} {element}: correct \
                             the counter-ions or the formula"
                        )
                    },
                });
            }
        }
    }
    Ok(())
}

/// Longest name a user's system or form may have, characters.
pub const NAME_MAX: usize = 80;

/// A user's name: at most [`NAME_MAX`] characters.
fn check_name(field: String, name: &str) -> Result<()> {
    let n = name.chars().count();
    if n > NAME_MAX {
        return Err(SolverError::Document {
            field,
            reason: format!("the name is {n} characters long: at most {NAME_MAX}"),
        });
    }
    Ok(())
}

/// A user's system is named by its own name: not too long, and not the name of a library
/// system (it would print as that system).
fn check_system_name(sys: &AcidSystem) -> Result<()> {
    check_name("system.name".into(), &sys.name)?;
    let name = sys.name.trim();
    if let Some(lib) = crate::system::library::library()
        .iter()
        .find(|l| l.id != sys.id && l.name.trim().eq_ignore_ascii_case(name))
    {
        return Err(SolverError::Document {
            field: "system.name".into(),
            reason: format!(
                "{} is the name of a library system: give your reagent a name of its own \
                 (for example {})",
                quote(&lib.name),
                quote(&format!("{} (my own)", lib.name))
            ),
        });
    }
    Ok(())
}

/// The element symbol of a spectator ion (`Na`, `K`, `Cl`).
fn ion_element(ion: Ion) -> &'static str {
    match ion {
        Ion::Na => "Na",
        Ion::K => "K",
        Ion::Cl => "Cl",
    }
}

/// Check a user-defined system: everything [`validate_system`] checks (fields
/// named `system.…`), then each form's counter-ions against its formula (the Na and
/// K atoms it holds are declared, no more Cl⁻ than it holds) and against the charges
/// the system's species can carry (`system.forms[j].counter_ions`).
///
/// # Errors
///
/// The first problem found, naming its field.
pub fn validate_user_system(sys: &AcidSystem) -> Result<()> {
    validate_system(sys)?;
    check_system_name(sys)?;
    for (j, f) in sys.forms.iter().enumerate() {
        check_name(format!("system.forms[{j}].name"), &f.name)?;
    }
    check_form_charges(sys, 0)?;
    check_form_formulas(sys, 0)
}

/// Check added shelf forms against the systems they extend (the design's
/// `custom_systems` first, then the library). Fields are named
/// `custom_forms[i].system` and `custom_forms[i].form.…`.
///
/// # Errors
///
/// The first problem: an unknown system, or what [`validate_user_system`]
/// finds when the form is added to its system (bad formula, units, counter-ions,
/// an id the system or an earlier added form already uses).
pub fn validate_custom_forms(forms: &[CustomForm], systems: &[AcidSystem]) -> Result<()> {
    for (i, cf) in forms.iter().enumerate() {
        let root = format!("custom_forms[{i}]");
        let base = lookup(&cf.system, systems).map_err(|_| SolverError::Document {
            field: format!("{root}.system"),
            reason: format!("unknown system {}", quote(&cf.system)),
        })?;
        let mut probe = base.clone();
        probe.forms.extend(
            forms
                .iter()
                .take(i)
                .filter(|f| f.system == cf.system)
                .map(|f| f.form.clone()),
        );
        let j = probe.forms.len();
        probe.forms.push(cf.form.clone());
        let own = format!("system.forms[{j}]");
        validate_system(&probe)
            .and_then(|()| check_name(format!("system.forms[{j}].name"), &cf.form.name))
            .and_then(|()| check_form_charges(&probe, j))
            .and_then(|()| check_form_formulas(&probe, j))
            .map_err(|e| {
                e.map_field(|f| match f.strip_prefix(own.as_str()) {
                    Some(rest) => format!("{root}.form{rest}"),
                    None => format!("{root}.system ({f})"),
                })
            })?;
    }
    Ok(())
}

/// The systems a design sees: its own systems, and every system an added form
/// extends with that form appended (a library system is copied, so lookups find
/// the extended copy first). Forms naming no known system are left out
/// (validation refuses them).
pub fn systems_with_forms(systems: &[AcidSystem], forms: &[CustomForm]) -> Vec<AcidSystem> {
    let mut out = systems.to_vec();
    for cf in forms {
        if let Some(s) = out.iter_mut().find(|s| s.id == cf.system) {
            s.forms.push(cf.form.clone());
        } else if let Some(lib) = find_system(&cf.system) {
            let mut s = lib.clone();
            s.forms.push(cf.form.clone());
            out.push(s);
        }
    }
    out
}

// ---------------------------------------------------------------- reagent file

/// One reagent on its own: a whole system with its forms, or one shelf form
/// added to a system.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Reagent {
    /// A user-defined acid system.
    System(AcidSystem),
    /// An extra shelf form for a system.
    Form(CustomForm),
}

impl Reagent {
    /// Display name: the system's name, or the form's.
    pub fn name(&self) -> &str {
        match self {
            Reagent::System(s) => &s.name,
            Reagent::Form(f) => &f.form.name,
        }
    }
}

/// The reagent file: `{"bufferwright_reagent": 1, "reagent": {"system": {…}}}`
/// or `{"bufferwright_reagent": 1, "reagent": {"form": {"system": "hepes", "form": {…}}}}`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ReagentFile {
    /// File version, [`REAGENT_FILE_VERSION`].
    pub bufferwright_reagent: u32,
    /// The reagent.
    pub reagent: Reagent,
}

/// Check a reagent. A system is checked on its own (fields `reagent.system.…`);
/// an added form against `systems` and the library (fields `reagent.form.…`).
///
/// # Errors
///
/// The first problem, naming its field.
pub fn validate_reagent(r: &Reagent, systems: &[AcidSystem]) -> Result<()> {
    match r {
        Reagent::System(s) => {
            validate_user_system(s).map_err(|e| e.reroot("system", "reagent.system"))
        }
        Reagent::Form(cf) => validate_custom_forms(std::slice::from_ref(cf), systems)
            .map_err(|e| e.reroot("custom_forms[0]", "reagent.form")),
    }
}

fn file_err(field: &str, reason: impl Into<String>) -> SolverError {
    SolverError::Document {
        field: field.into(),
        reason: reason.into(),
    }
}

/// Read a reagent file, refusing the whole file with the reason: not JSON, too
/// large, another version, an unknown key (by its path), or any field
/// [`validate_reagent`] refuses. Added forms are checked against the library.
///
/// # Errors
///
/// [`SolverError::Document`] (or a range error) naming the field.
///
/// # Example
///
/// ```
/// use solver::document::reagent::{parse_reagent, reagent_to_json, Reagent};
/// let lib = solver::system::library::find_system("acetate").cloned().ok_or(solver::SolverError::Unknown {
///     kind: "system".into(), name: "acetate".into() })?;
/// let r = Reagent::System(solver::system::AcidSystem {
///     id: "my_acetate".into(), name: "My acetate".into(), ..lib });
/// assert_eq!(parse_reagent(&reagent_to_json(&r))?, r);
/// assert!(parse_reagent("{\"bufferwright_reagent\": 1}").is_err());
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn parse_reagent(text: &str) -> Result<Reagent> {
    if text.len() > REAGENT_FILE_MAX_BYTES {
        return Err(file_err(
            "document",
            format!(
                "larger than {} KB: not a reagent file",
                REAGENT_FILE_MAX_BYTES / 1024
            ),
        ));
    }
    let value: serde_json::Value = serde_json::from_str(text)
        .map_err(|e| file_err("document", format!("not valid JSON: {e}")))?;
    match value
        .get("bufferwright_reagent")
        .and_then(serde_json::Value::as_u64)
    {
        Some(v) if v == u64::from(REAGENT_FILE_VERSION) => {}
        Some(v) => {
            return Err(file_err(
                "bufferwright_reagent",
                format!("version {v} is not supported (this page reads {REAGENT_FILE_VERSION})"),
            ))
        }
        None => {
            return Err(file_err(
                "bufferwright_reagent",
                "missing: not a Bufferwright reagent file",
            ))
        }
    }
    let file: ReagentFile = crate::document::docpath::from_value(&value)
        .map_err(|e| super::docpath::serde_err(&e.path(), &e.message))?;
    let back = serde_json::to_value(&file).unwrap_or(serde_json::Value::Null);
    if let Some(field) = super::docpath::extra_tagged_key(&value, &back, "") {
        return Err(file_err(
            &field,
            "unknown field (this kind takes no such key; check the spelling)",
        ));
    }
    validate_reagent(&file.reagent, &[])?;
    Ok(file.reagent)
}

/// A reagent as its file (indented JSON).
pub fn reagent_to_json(r: &Reagent) -> String {
    serde_json::to_string_pretty(&ReagentFile {
        bufferwright_reagent: REAGENT_FILE_VERSION,
        reagent: r.clone(),
    })
    .unwrap_or_default()
}

/// A file name for a reagent: `my-amine.bwreagent.json`.
pub fn reagent_file_name(r: &Reagent) -> String {
    let mut slug = String::new();
    for c in clip(r.name(), QUOTE_MAX).chars() {
        if c.is_ascii_alphanumeric() {
            slug.push(c.to_ascii_lowercase());
        } else if !slug.ends_with('-') && !slug.is_empty() {
            slug.push('-');
        }
    }
    let slug = slug.trim_end_matches('-');
    let slug = if slug.is_empty() { "reagent" } else { slug };
    format!("{slug}.bwreagent.json")
}

// ---------------------------------------------------------------- per-field checks

/// A system that passes [`validate_user_system`] with `n` constant steps and
/// charge `z0` (the frame the field checks put one part of the user's system in).
fn skeleton(z0: i32, n: usize) -> AcidSystem {
    AcidSystem {
        id: "probe".into(),
        name: "probe".into(),
        z0,
        steps: (0..n)
            .map(|i| Step {
                pk25: 1.0 + i as f64,
                temp: TempModel::Constant,
            })
            .collect(),
        species: (0..=n).map(|i| format!("s{i}")).collect(),
        t_min_c: 0.0,
        t_max_c: 60.0,
        forms: vec![],
        source: String::new(),
        hazards: vec![],
    }
}

/// Every problem a reagent editor shows beside its fields, at most one per
/// field path (`system.name`, `system.steps[1].pk25`, `system.t_max_c`,
/// `system.forms[0].formula`, `system.forms[0].counter_ions`, …), found by
/// running [`validate_user_system`] on the system and on parts of it: the
/// system without its forms; its first `i + 1` steps (so each step is judged
/// after the ones before it); its name, charge and temperature range in a
/// valid frame; each form alone in the system (or, when the system itself is
/// not yet valid, in a valid frame with the same charge and number of steps);
/// and each form's id after the forms before it.
pub fn system_field_problems(sys: &AcidSystem) -> Vec<SolverError> {
    let mut out: Vec<SolverError> = Vec::new();
    let mut push = |e: SolverError| {
        let f = e.field().map(str::to_string);
        if !out.iter().any(|o| o.field().map(str::to_string) == f) {
            out.push(e);
        }
    };
    let n = sys.steps.len();
    let bare = AcidSystem {
        forms: vec![],
        ..sys.clone()
    };
    let bare_ok = validate_user_system(&bare);
    // Name, id, charge and range, each in a valid frame.
    let frame = skeleton(0, 1);
    for probe in [
        AcidSystem {
            name: sys.name.clone(),
            ..frame.clone()
        },
        AcidSystem {
            id: sys.id.clone(),
            ..frame.clone()
        },
        AcidSystem {
            z0: sys.z0,
            ..frame.clone()
        },
        AcidSystem {
            t_min_c: sys.t_min_c,
            t_max_c: sys.t_max_c,
            ..frame.clone()
        },
    ] {
        if let Err(e) = validate_user_system(&probe) {
            push(e);
        }
    }
    // Steps, each after the ones before it.
    for i in 0..n.min(crate::system::MAX_STEPS) {
        // Earlier steps keep their pK (for the order) without their temperature data,
        // so a half-typed ΔrH° above does not hide this step's own problem.
        let mut p = skeleton(0, i + 1);
        p.steps = sys
            .steps
            .iter()
            .take(i)
            .map(|s| Step {
                pk25: s.pk25,
                temp: TempModel::Constant,
            })
            .chain(sys.steps.get(i).cloned())
            .collect();
        p.t_min_c = sys.t_min_c;
        p.t_max_c = sys.t_max_c;
        if let Err(e) = validate_user_system(&p) {
            let own = format!("system.steps[{i}]");
            if e.field().is_some_and(|f| f.starts_with(&own)) {
                push(e);
            }
        }
    }
    if let Err(e) = bare_ok.clone() {
        push(e);
    }
    // Forms.
    let base = if bare_ok.is_ok() {
        bare
    } else if (1..=crate::system::MAX_STEPS).contains(&n)
        && sys.z0.unsigned_abs() as usize <= crate::system::MAX_STEPS
    {
        skeleton(sys.z0, n)
    } else {
        return out;
    };
    for (j, form) in sys.forms.iter().enumerate() {
        let at_j = |e: SolverError| {
            e.map_field(|f| match f.strip_prefix("system.forms[0]") {
                Some(rest) => format!("system.forms[{j}]{rest}"),
                None => f.to_string(),
            })
        };
        let alone = AcidSystem {
            forms: vec![form.clone()],
            ..base.clone()
        };
        if let Err(e) = validate_user_system(&alone) {
            push(at_j(e));
            continue;
        }
        // The id after the ones before it (earlier forms stand in as copies of this one).
        let mut after = base.clone();
        after.forms = sys
            .forms
            .iter()
            .take(j)
            .map(|f| ReagentForm {
                id: f.id.clone(),
                ..form.clone()
            })
            .collect();
        after.forms.push(form.clone());
        if let Err(e) = validate_user_system(&after) {
            push(e);
        }
    }
    out
}
