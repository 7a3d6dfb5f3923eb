//! User reagents: a same-constants copy of a library system gives the library's numbers, a
//! published check through a user-defined acid, added shelf forms, reagent files, and every
//! refusal named by its field.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use serde_json::{json, Value};
use solver::document::reagent::{
    parse_reagent, reagent_file_name, reagent_to_json, system_field_problems,
    validate_custom_forms, validate_user_system, Reagent,
};
use solver::document::{demo_design, parse_design, report, to_json, Design};
use solver::field::{field_reading, IonicSource, TotalUnit};
use solver::mixture::{prepare, solve_mixture, species_curves, ComponentSpec};
use solver::recipe::{solve_recipe, Method};
use solver::system::formula::molar_mass;
use solver::system::library::{find_system, library};
use solver::system::{AcidSystem, CustomForm, Ion, ReagentForm, Step, TempModel};

/// A user's copy of a library system: same constants and forms, its own id and name.
fn copy_of(id: &str) -> AcidSystem {
    let lib = find_system(id).unwrap().clone();
    AcidSystem {
        id: format!("my_{id}"),
        name: format!("My {}", lib.name),
        source: "copied by hand from the library's table".into(),
        ..lib
    }
}

/// JSON of `v` with the copy's id and name put back to the library's, so two results can be
/// compared as a whole.
fn as_library(v: &impl serde::Serialize, id: &str) -> Value {
    let lib = find_system(id).unwrap();
    let text = serde_json::to_string(v)
        .unwrap()
        .replace(&format!("\"my_{id}\""), &format!("\"{id}\""))
        .replace(&format!("My {}", lib.name), &lib.name);
    serde_json::from_str(&text).unwrap()
}

fn json_of(v: &impl serde::Serialize) -> Value {
    serde_json::to_value(v).unwrap()
}

/// A field reading without its reporting basis: mg/L "as P" (or N, S…) is tied to the
/// library system's id, so a user's copy reports in mmol/L only; fractions, amounts in mol/L,
/// pK values and ionic strength must still agree.
fn no_basis(mut v: Value) -> Value {
    fn strip(v: &mut Value) {
        match v {
            Value::Object(m) => {
                for k in ["basis", "amounts", "mg_l_as"] {
                    m.remove(k);
                }
                m.values_mut().for_each(strip);
            }
            Value::Array(a) => a.iter_mut().for_each(strip),
            _ => {}
        }
    }
    strip(&mut v);
    v
}

/// Equal, numbers to 1e−12 relative (an iterated budget may land one ulp apart when the
/// system list it searches is longer).
fn same(a: &Value, b: &Value, path: &str) {
    match (a, b) {
        (Value::Object(x), Value::Object(y)) => {
            assert_eq!(x.len(), y.len(), "{path}: keys");
            for (k, va) in x {
                same(va, &y[k], &format!("{path}.{k}"));
            }
        }
        (Value::Array(x), Value::Array(y)) => {
            assert_eq!(x.len(), y.len(), "{path}: length");
            for (i, (va, vb)) in x.iter().zip(y).enumerate() {
                same(va, vb, &format!("{path}[{i}]"));
            }
        }
        (Value::Number(x), Value::Number(y)) => {
            let (x, y) = (x.as_f64().unwrap(), y.as_f64().unwrap());
            assert!(
                (x - y).abs() <= 1e-12 * x.abs().max(y.abs()),
                "{path}: {x} vs {y}"
            );
        }
        _ => assert_eq!(a, b, "{path}"),
    }
}

/// The demo design turned to `id` in every workspace, with the copy `my_<id>` carried along.
fn design_on(id: &str, use_copy: bool, method: Method) -> Design {
    let mut d = demo_design();
    d.custom_systems = vec![copy_of(id)];
    let sys = if use_copy {
        format!("my_{id}")
    } else {
        id.to_string()
    };
    d.recipe.system = sys.clone();
    d.recipe.method = method;
    d.mixture.components = vec![
        ComponentSpec {
            system: sys.clone(),
            form: Some(match id {
                "acetate" => "acetic_acid".into(),
                _ => "nah2po4_h2o".into(),
            }),
            conc_m: 0.03,
        },
        ComponentSpec {
            system: sys.clone(),
            form: Some(match id {
                "acetate" => "na_acetate_3h2o".into(),
                _ => "na2hpo4_7h2o".into(),
            }),
            conc_m: 0.02,
        },
    ];
    d.field.system = sys;
    d.field.total = Some(2.0);
    d.field.total_unit = TotalUnit::MmolPerL;
    d.field.ionic = IonicSource::Conductivity { us_cm: 450.0 };
    d
}

fn methods(id: &str) -> Vec<Method> {
    let (a, b) = match id {
        "acetate" => ("acetic_acid", "na_acetate_3h2o"),
        _ => ("nah2po4_h2o", "na2hpo4_7h2o"),
    };
    vec![
        Method::TwoForms {
            acid_form: a.into(),
            base_form: b.into(),
        },
        Method::Titrate {
            form: a.into(),
            titrant: solver::mixture::Additive::Naoh,
            titrant_m: 1.0,
        },
        Method::TwoStocks {
            acid_form: a.into(),
            acid_stock_m: 0.5,
            base_form: b.into(),
            base_stock_m: 0.5,
        },
    ]
}

#[test]
fn a_same_constants_copy_gives_the_library_numbers_everywhere() {
    for id in ["acetate", "phosphate"] {
        for method in methods(id) {
            let lib = design_on(id, false, method.clone());
            let mine = design_on(id, true, method.clone());
            // The design with the copy is a valid document and round-trips.
            let back = parse_design(&to_json(&mine)).unwrap();
            assert_eq!(back, mine);
            if id == "acetate" {
                let mut lib = lib.clone();
                let mut mine = mine.clone();
                lib.recipe.target_ph = 4.9;
                mine.recipe.target_ph = 4.9;
                check_same(id, &lib, &mine, &method);
            } else {
                check_same(id, &lib, &mine, &method);
            }
        }
    }
}

fn check_same(id: &str, lib: &Design, mine: &Design, method: &Method) {
    let r_lib = solve_recipe(&lib.recipe, &lib.systems()).unwrap();
    let r_mine = solve_recipe(&mine.recipe, &mine.systems()).unwrap();
    same(
        &as_library(&r_mine, id),
        &json_of(&r_lib),
        &format!("{id} recipe {method:?}"),
    );
    let m_lib = solve_mixture(&lib.mixture, &lib.systems()).unwrap();
    let m_mine = solve_mixture(&mine.mixture, &mine.systems()).unwrap();
    same(&as_library(&m_mine, id), &json_of(&m_lib), "flask");
    let p_lib = prepare(&lib.mixture, &lib.systems()).unwrap();
    let p_mine = prepare(&mine.mixture, &mine.systems()).unwrap();
    let c_lib = species_curves(&p_lib, 0.05, 0.0, 14.0, 57).unwrap();
    let c_mine = species_curves(&p_mine, 0.05, 0.0, 14.0, 57).unwrap();
    same(&as_library(&c_mine, id), &json_of(&c_lib), "curves");
    let f_lib = field_reading(&lib.field, &lib.systems()).unwrap();
    let f_mine = field_reading(&mine.field, &mine.systems()).unwrap();
    same(
        &no_basis(as_library(&f_mine, id)),
        &no_basis(json_of(&f_lib)),
        "field",
    );
    // And the whole report the command line prints.
    same(
        &no_basis(as_library(&report(mine), id)),
        &no_basis(json_of(&report(lib))),
        "report",
    );
}

/// Benzoic acid is not in the library. Published check (a general-chemistry worked problem,
/// "pH of a 0.40 M solution of benzoic acid, Ka = 6.3 × 10⁻⁵": [H⁺] = 5.0 × 10⁻³ M, pH 2.30;
/// seen as a practice problem on clutchprep.com, re-read): the user types pK = −log10(6.3e−5)
/// = 4.20 (thermodynamic pKa of benzoic acid 4.20, NIST SRD 46, from memory). The worked
/// answer uses concentrations and the square-root shortcut; with activities the pH of a
/// weak acid alone is nearly unchanged (γ of the neutral acid is 1 and γ² of the ions is
/// offset in pH = −log a(H⁺)), and the shortcut differs from the exact quadratic by
/// < 0.003, so ±0.02 holds a slip-free model and breaks on a wrong pK by 0.04.
#[test]
fn benzoic_acid_typed_by_a_user_reproduces_a_worked_example() {
    let benzoic = AcidSystem {
        id: "benzoic".into(),
        name: "Benzoic acid".into(),
        z0: 0,
        steps: vec![Step {
            pk25: -(6.3e-5f64).log10(),
            temp: TempModel::Constant,
        }],
        species: vec!["C₆H₅COOH".into(), "C₆H₅COO⁻".into()],
        t_min_c: 15.0,
        t_max_c: 35.0,
        forms: vec![
            ReagentForm {
                id: "benzoic_acid".into(),
                name: "benzoic acid".into(),
                formula: "C7H6O2".into(),
                units: 1.0,
                counter_ions: vec![],
            },
            ReagentForm {
                id: "na_benzoate".into(),
                name: "sodium benzoate".into(),
                formula: "C7H5NaO2".into(),
                units: 1.0,
                counter_ions: vec![(Ion::Na, 1.0)],
            },
        ],
        source: "Ka 6.3e-5 (general-chemistry worked problem)".into(),
        hazards: vec![],
    };
    validate_user_system(&benzoic).unwrap();
    let mut d = demo_design();
    d.custom_systems = vec![benzoic];
    d.mixture.temperature_c = 25.0;
    d.mixture.additives = vec![];
    d.mixture.components = vec![ComponentSpec {
        system: "benzoic".into(),
        form: Some("benzoic_acid".into()),
        conc_m: 0.40,
    }];
    let d = parse_design(&to_json(&d)).unwrap();
    let r = solve_mixture(&d.mixture, &d.systems()).unwrap();
    let ph = r.equilibrium.ph;
    assert!((ph - 2.30).abs() < 0.02, "pH {ph}");
    // Benzoic acid C7H6O2: 122.12 g/mol (CIAAW 2021 weights, computed).
    let m = molar_mass("C7H6O2").unwrap();
    assert!((m - 122.123).abs() < 0.002, "{m}");
}

#[test]
fn every_library_system_passes_the_user_check() {
    // The counter-ion rule is new: every built-in form meets it too, except sodium sulfide
    // (S²⁻ is modelled as HS⁻ + OH⁻ since pK2 of H₂S is not used), which stays in the library.
    for s in library() {
        let mut s = s.clone();
        s.forms
            .retain(|f| !(s.id == "sulfide" && f.formula.starts_with("Na2S")));
        validate_user_system(&s).unwrap_or_else(|e| panic!("{}: {e}", s.id));
    }
    // A form added to the sulfide system is still checked, the library's own are not.
    let sulfide = CustomForm {
        system: "sulfide".into(),
        form: ReagentForm {
            id: "khs".into(),
            name: "potassium hydrosulfide".into(),
            formula: "KHS".into(),
            units: 1.0,
            counter_ions: vec![(Ion::K, 1.0)],
        },
    };
    validate_custom_forms(std::slice::from_ref(&sulfide), &[]).unwrap();
}

fn k_hepes() -> CustomForm {
    CustomForm {
        system: "hepes".into(),
        form: ReagentForm {
            id: "hepes_k".into(),
            name: "HEPES potassium salt".into(),
            formula: "C8H17KN2O4S".into(),
            units: 1.0,
            counter_ions: vec![(Ion::K, 1.0)],
        },
    }
}

#[test]
fn an_added_form_is_usable_by_id_in_recipe_flask_and_report() {
    let mut with_na = demo_design();
    with_na.recipe.system = "hepes".into();
    with_na.recipe.temperature_c = 25.0;
    with_na.recipe.method = Method::TwoForms {
        acid_form: "hepes".into(),
        base_form: "hepes_na".into(),
    };
    with_na.mixture.components = vec![ComponentSpec {
        system: "hepes".into(),
        form: Some("hepes_na".into()),
        conc_m: 0.02,
    }];
    let mut with_k = with_na.clone();
    with_k.custom_forms = vec![k_hepes()];
    with_k.recipe.method = Method::TwoForms {
        acid_form: "hepes".into(),
        base_form: "hepes_k".into(),
    };
    with_k.mixture.components[0].form = Some("hepes_k".into());
    let text = to_json(&with_k);
    assert!(text.contains("\"custom_forms\""));
    let with_k = parse_design(&text).unwrap();
    let na = solve_recipe(&with_na.recipe, &with_na.systems()).unwrap();
    let k = solve_recipe(&with_k.recipe, &with_k.systems()).unwrap();
    // Na⁺ and K⁺ are both +1 spectators: the same moles, pH and ionic strength.
    assert_eq!(na.equilibrium.ph, k.equilibrium.ph);
    assert_eq!(na.equilibrium.ionic_strength, k.equilibrium.ionic_strength);
    let (na_b, k_b) = (&na.ingredients[1], &k.ingredients[1]);
    assert_eq!(na_b.mol, k_b.mol);
    // The mass is weighed from the K salt's own formula.
    let m_k = molar_mass("C8H17KN2O4S").unwrap();
    assert!((k_b.grams.unwrap() - k_b.mol * m_k).abs() < 1e-9, "{k_b:?}");
    let mk = solve_mixture(&with_k.mixture, &with_k.systems()).unwrap();
    let mn = solve_mixture(&with_na.mixture, &with_na.systems()).unwrap();
    assert_eq!(mk.equilibrium.ph, mn.equilibrium.ph);
    let r = report(&with_k);
    assert!(r.recipe.is_ok() && r.mixture.is_ok() && r.curves.is_ok());
}

#[test]
fn documents_without_custom_forms_still_open_and_do_not_gain_the_key() {
    let text = to_json(&demo_design());
    assert!(!text.contains("custom_forms"), "{text}");
    assert_eq!(parse_design(&text).unwrap(), demo_design());
}

fn refused(d: &Value) -> String {
    parse_design(&d.to_string()).unwrap_err().to_string()
}

fn demo_value() -> Value {
    serde_json::from_str(&to_json(&demo_design())).unwrap()
}

#[test]
fn every_added_form_refusal_names_its_field() {
    let base = serde_json::to_value(k_hepes()).unwrap();
    let cases: Vec<(Value, &str)> = vec![
        (
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H17Kq", "units": 1.0, "counter_ions": []}}),
            "custom_forms[0].form.formula",
        ),
        (
            json!({"system": "nosuch", "form": base["form"]}),
            "custom_forms[0].system: unknown system",
        ),
        (
            json!({"system": "hepes", "form": {"id": "hepes_na", "name": "x", "formula": "C8H17NaN2O4S", "units": 1.0, "counter_ions": [["na", 1.0]]}}),
            "custom_forms[0].form.id: duplicate form id",
        ),
        (
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H17KN2O4S", "units": 0.0, "counter_ions": [["k", 1.0]]}}),
            "custom_forms[0].form.units",
        ),
        (
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H17KN2O4S", "units": -1.0, "counter_ions": [["k", 1.0]]}}),
            "custom_forms[0].form.units",
        ),
        (
            // HEPES species carry 0 and −1: two K⁺ would need −2.
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H16K2N2O4S", "units": 1.0, "counter_ions": [["k", 2.0]]}}),
            "custom_forms[0].form.counter_ions: these counter-ions leave",
        ),
        (
            // A chloride on a zwitterion whose top species is neutral.
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H18N2O4S·HCl", "units": 1.0, "counter_ions": [["cl", 1.0]]}}),
            "custom_forms[0].form.counter_ions",
        ),
        (
            json!({"system": "hepes", "form": {"id": "x", "name": "x", "formula": "C8H17KN2O4S", "units": 1.0, "counter_ions": [["k", 1.0]], "purity": 99}}),
            "custom_forms[0].form.purity: unknown field",
        ),
    ];
    for (cf, want) in cases {
        let mut v = demo_value();
        v["custom_forms"] = json!([cf]);
        let e = refused(&v);
        assert!(e.starts_with(want), "want {want}, got {e}");
    }
    // The same id twice among added forms: the second is named.
    let mut v = demo_value();
    v["custom_forms"] = json!([base.clone(), base]);
    let e = refused(&v);
    assert!(e.starts_with("custom_forms[1].form.id: duplicate"), "{e}");
    // A form for a user-defined system is checked against that system.
    let mut v = demo_value();
    let mut acetate = serde_json::to_value(copy_of("acetate")).unwrap();
    acetate["forms"] = json!([]);
    v["custom_systems"] = json!([acetate]);
    v["custom_forms"] = json!([{"system": "my_acetate", "form": {"id": "k", "name": "k", "formula": "C2H3KO2", "units": 1.0, "counter_ions": [["k", 1.0]]}}]);
    let d = parse_design(&v.to_string()).unwrap();
    assert!(d.systems()[0].forms.iter().any(|f| f.id == "k"));
}

#[test]
fn a_broken_custom_system_is_refused_naming_the_field_and_nothing_else() {
    let mut v = demo_value();
    let mut s = serde_json::to_value(copy_of("phosphate")).unwrap();
    s["steps"][1]["pk25"] = json!(1.0); // below pK1: out of order
    v["custom_systems"] = json!([s]);
    let before = v.clone();
    let e = refused(&v);
    assert!(e.starts_with("custom_systems[0].steps[1].pk25"), "{e}");
    assert_eq!(v, before, "the document is not touched");
    // Each field of a system is named in turn.
    let cases: Vec<(&str, Value, &str)> = vec![
        ("name", json!(" "), "custom_systems[0].name"),
        ("z0", json!(9), "custom_systems[0].z0"),
        ("t_max_c", json!(70.0), "custom_systems[0].t_max_c"),
        ("species", json!(["a", "b"]), "custom_systems[0].species"),
        ("steps", json!([]), "custom_systems[0].steps"),
    ];
    for (key, val, want) in cases {
        let mut v = demo_value();
        let mut s = serde_json::to_value(copy_of("phosphate")).unwrap();
        s[key] = val;
        v["custom_systems"] = json!([s]);
        let e = refused(&v);
        assert!(e.starts_with(want), "{key}: want {want}, got {e}");
    }
    // A charge that makes no sense with the forms: phosphate typed with z0 = −1.
    let mut v = demo_value();
    let mut s = serde_json::to_value(copy_of("phosphate")).unwrap();
    s["z0"] = json!(-1);
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_systems[0].forms[0].counter_ions"),
        "{e}"
    );
}

#[test]
fn the_reagent_file_round_trips_and_is_refused_whole_with_the_reason() {
    let sys = Reagent::System(copy_of("acetate"));
    let text = reagent_to_json(&sys);
    assert_eq!(parse_reagent(&text).unwrap(), sys);
    assert_eq!(reagent_file_name(&sys), "my-acetate.bwreagent.json");
    let form = Reagent::Form(k_hepes());
    assert_eq!(parse_reagent(&reagent_to_json(&form)).unwrap(), form);
    let v: Value = serde_json::from_str(&text).unwrap();
    let bad = |f: &dyn Fn(&mut Value)| {
        let mut w = v.clone();
        f(&mut w);
        parse_reagent(&w.to_string()).unwrap_err().to_string()
    };
    let e = bad(&|w| w["reagent"]["system"]["steps"][0]["pk25"] = json!(30.0));
    assert!(e.starts_with("reagent.system.steps[0].pk25"), "{e}");
    let e = bad(&|w| w["reagent"]["system"]["colour"] = json!("red"));
    assert!(e.starts_with("reagent.system.colour: unknown field"), "{e}");
    let e = bad(&|w| w["extra"] = json!(1));
    assert!(e.starts_with("extra: unknown field"), "{e}");
    let e = bad(&|w| w["bufferwright_reagent"] = json!(7));
    assert!(e.starts_with("bufferwright_reagent: version 7"), "{e}");
    let e = bad(&|w| w["reagent"]["system"]["forms"][1]["formula"] = json!("NaQ"));
    assert!(e.starts_with("reagent.system.forms[1].formula"), "{e}");
    // A design document is not a reagent file.
    let e = parse_reagent(&to_json(&demo_design()))
        .unwrap_err()
        .to_string();
    assert!(e.starts_with("bufferwright_reagent: missing"), "{e}");
    let e = parse_reagent("{not json").unwrap_err().to_string();
    assert!(e.contains("not valid JSON"), "{e}");
    let e = parse_reagent(&" ".repeat(300_000)).unwrap_err().to_string();
    assert!(e.contains("larger than"), "{e}");
    // A form for a system the library does not hold.
    let mut f = serde_json::to_value(ReagentFileLike::form()).unwrap();
    f["reagent"]["form"]["system"] = json!("nosuch");
    let e = parse_reagent(&f.to_string()).unwrap_err().to_string();
    assert!(e.starts_with("reagent.form.system: unknown system"), "{e}");
}

struct ReagentFileLike;
impl ReagentFileLike {
    fn form() -> Value {
        serde_json::from_str(&reagent_to_json(&Reagent::Form(k_hepes()))).unwrap()
    }
}

#[test]
fn the_editor_checks_show_every_field_at_once() {
    let mut s = copy_of("phosphate");
    s.name = String::new();
    s.steps[2].pk25 = 5.0; // below pK2
    s.t_min_c = 20.0;
    s.t_max_c = 10.0;
    s.forms[1].formula = "NaH2PQ4".into();
    s.forms[2].units = 0.0;
    s.forms[3].id = s.forms[0].id.clone();
    let problems = system_field_problems(&s);
    let fields: Vec<&str> = problems.iter().filter_map(|e| e.field()).collect();
    for want in [
        "system.name",
        "system.t_max_c",
        "system.forms[1].formula",
        "system.forms[2].units",
        "system.forms[3].id",
    ] {
        assert!(fields.contains(&want), "{want} not in {fields:?}");
    }
    // With the range fixed, the out-of-order step is named too.
    s.t_min_c = 0.0;
    s.t_max_c = 60.0;
    let problems = system_field_problems(&s);
    let fields: Vec<&str> = problems.iter().filter_map(|e| e.field()).collect();
    assert!(fields.contains(&"system.steps[2].pk25"), "{fields:?}");
    assert!(!fields.contains(&"system.steps[1].pk25"), "{fields:?}");
    // A valid system has no problems.
    assert!(system_field_problems(&copy_of("phosphate")).is_empty());
    // A form whose counter-ions do not fit the charge, while the steps are still half typed.
    let mut t = copy_of("acetate");
    t.steps[0].pk25 = f64::NAN;
    t.forms[1].counter_ions = vec![(Ion::Cl, 1.0)];
    let fields: Vec<String> = system_field_problems(&t)
        .iter()
        .filter_map(|e| e.field().map(str::to_string))
        .collect();
    assert!(
        fields.contains(&"system.steps[0].pk25".to_string()),
        "{fields:?}"
    );
    assert!(
        fields.contains(&"system.forms[1].counter_ions".to_string()),
        "{fields:?}"
    );
    // Added forms go through the same check.
    let e = validate_custom_forms(
        &[CustomForm {
            system: "hepes".into(),
            form: ReagentForm {
                units: 0.0,
                ..k_hepes().form
            },
        }],
        &[],
    )
    .unwrap_err();
    assert_eq!(e.field(), Some("custom_forms[0].form.units"));
}

#[test]
fn a_form_must_declare_the_spectator_ions_its_formula_holds() {
    // Sodium benzoate typed with no Na⁺ would be taken for the free acid: refused, naming
    // the element and the count.
    let mut sys = copy_of("acetate");
    sys.forms = vec![ReagentForm {
        id: "na_benzoate".into(),
        name: "sodium benzoate".into(),
        formula: "C7H5NaO2".into(),
        units: 1.0,
        counter_ions: vec![],
    }];
    let e = validate_user_system(&sys).unwrap_err().to_string();
    assert!(
        e.starts_with("system.forms[0].counter_ions: the formula \"C7H5NaO2\" holds 1 Na"),
        "{e}"
    );
    assert!(e.contains("declare 0 Na⁺"), "{e}");
    // Declared K⁺ the formula does not hold.
    sys.forms[0].formula = "C7H6O2".into();
    sys.forms[0].counter_ions = vec![(Ion::K, 1.0)];
    let e = validate_user_system(&sys).unwrap_err().to_string();
    assert!(e.contains("declare 1 K⁺") && e.contains("holds 0 K"), "{e}");
    // More chloride than the formula holds.
    let mut tris = copy_of("tris");
    tris.forms = vec![ReagentForm {
        id: "t".into(),
        name: "t".into(),
        formula: "C4H11NO3".into(),
        units: 1.0,
        counter_ions: vec![(Ion::Cl, 1.0)],
    }];
    assert!(validate_user_system(&tris).is_err());
    // The same as an added form in a design, and in the editor's per-field checks.
    let mut v = demo_value();
    v["custom_forms"] = json!([{"system": "acetate", "form": {"id": "x", "name": "x",
        "formula": "C2H3NaO2", "units": 1.0, "counter_ions": []}}]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_forms[0].form.counter_ions: the formula"),
        "{e}"
    );
    sys.forms[0].formula = "C7H5NaO2".into();
    sys.forms[0].counter_ions = vec![];
    let problems = system_field_problems(&sys);
    assert!(
        problems
            .iter()
            .any(|p| p.field() == Some("system.forms[0].counter_ions")),
        "{problems:?}"
    );
    // Declared right, it passes (hypochlorite's Cl belongs to the system: fewer Cl⁻ is fine).
    sys.forms[0].counter_ions = vec![(Ion::Na, 1.0)];
    validate_user_system(&sys).unwrap();
    let hocl = find_system("hypochlorous").unwrap();
    validate_user_system(hocl).unwrap();
}

#[test]
fn names_and_temperature_ranges_are_refused_in_plain_words() {
    let mut sys = copy_of("acetate");
    // A temperature range given the wrong way round names both ends.
    sys.t_min_c = 60.0;
    sys.t_max_c = 0.0;
    let e = validate_user_system(&sys).unwrap_err().to_string();
    assert!(
        e.starts_with("system.t_max_c") && e.contains("(0 °C) must be above the lowest (60 °C)"),
        "{e}"
    );
    sys.t_min_c = 10.0;
    sys.t_max_c = 40.0;
    validate_user_system(&sys).unwrap();
    // A library system's name, in any case, is refused; a name of its own passes.
    sys.name = " phosphate ".into();
    let e = validate_user_system(&sys).unwrap_err().to_string();
    assert!(
        e.starts_with("system.name") && e.contains("library system"),
        "{e}"
    );
    sys.name = "Phosphate (my own)".into();
    validate_user_system(&sys).unwrap();
    // Names are capped at 80 characters (system and form).
    sys.name = "x".repeat(81);
    assert!(validate_user_system(&sys)
        .unwrap_err()
        .to_string()
        .starts_with("system.name"));
    sys.name = "x".repeat(80);
    validate_user_system(&sys).unwrap();
    sys.forms[0].name = "y".repeat(5000);
    let e = validate_user_system(&sys).unwrap_err().to_string();
    assert!(
        e.starts_with("system.forms[0].name") && e.contains("at most 80"),
        "{e}"
    );
    let mut cf = k_hepes();
    cf.form.name = "z".repeat(81);
    assert!(validate_custom_forms(&[cf], &[]).is_err());
}
