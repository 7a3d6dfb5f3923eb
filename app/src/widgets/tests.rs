//! The page's checks and the solver's validation read one rulebook: each limit's edge
//! values (its minimum and maximum, and just outside each) get the same verdict from the
//! page's number check and from the solver reading a design that holds the value.

use crate::widgets::format::check;
use solver::atmosphere::Atmosphere;
use solver::document::{demo_design, parse_design_value, Design};
use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::limit::{Limit as UserLimit, LimitUnit};
use solver::field::IonicSource;
use solver::limits::{self, Limit};
use solver::mixture::{Additive, AdditiveSpec};
use solver::recipe::Method;

/// A design whose recipe, mixture and field hold carbonate under a gas (the invented
/// incubator example), for the limits of [`limits::GAS`].
fn gassed_design() -> Design {
    solver::document::parse_design(include_str!("../../../solver/examples/incubator.json"))
        .expect("the incubator example reads")
}

/// Puts `v` into the atmosphere field a gas limit names, in the incubator example.
fn gas_design_with(limit: &Limit, v: f64) -> Design {
    let mut d = gassed_design();
    let (part, key) = limit.path.rsplit_once('.').unwrap_or_default();
    let slot = match part {
        "recipe.atmosphere" => &mut d.recipe.atmosphere,
        "mixture.atmosphere" => &mut d.mixture.atmosphere,
        "field.atmosphere" => &mut d.field.atmosphere,
        "what_if" => {
            match key {
                "room_co2_uatm" => d.what_if.room_co2_uatm = Some(v),
                "co2_percent" => d.what_if.co2_percent = Some(v),
                other => panic!("no way to set what_if.{other} in the test: add it"),
            }
            return d;
        }
        other => panic!("no way to set {other} in the test: add it"),
    };
    let a = slot.get_or_insert(Atmosphere::percent(5.0));
    match key {
        "co2_percent" => {
            a.co2_percent = Some(v);
            a.co2_uatm = None;
        }
        "co2_uatm" => {
            a.co2_uatm = Some(v);
            a.co2_percent = None;
        }
        "pressure_kpa" => a.pressure_kpa = Some(v),
        other => panic!("no way to set atmosphere.{other} in the test: add it"),
    }
    d
}

/// Puts `v` into the field a limit names, in a design that is otherwise the demo (the
/// incubator example for a gas limit).
fn design_with(limit: &Limit, v: f64) -> Design {
    if limits::GAS.contains(limit) {
        return gas_design_with(limit, v);
    }
    let mut d = demo_design();
    let (r, m, w, f, u) = (
        &mut d.recipe,
        &mut d.mixture,
        &mut d.what_if,
        &mut d.field,
        &mut d.uncertainty,
    );
    match limit.path {
        "recipe.target_ph" => r.target_ph = v,
        "recipe.temperature_c" => r.temperature_c = v,
        "recipe.total_conc_m" => r.total_conc_m = v,
        "recipe.volume_l" => r.volume_l = v,
        "recipe.tolerance_ph" => r.tolerance_ph = v,
        "recipe.concentrate_factor" => r.concentrate_factor = v,
        "recipe.store_temperature_c" => r.store_temperature_c = Some(v),
        "recipe.salts[].conc_m" => {
            r.salts = vec![AdditiveSpec {
                additive: Additive::Nacl,
                conc_m: v,
            }];
        }
        "recipe.method.titrant_m" => {
            r.method = Method::Titrate {
                form: "nah2po4_h2o".into(),
                titrant: Additive::Naoh,
                titrant_m: v,
            };
        }
        "recipe.method.acid_stock_m" | "recipe.method.base_stock_m" => {
            let acid = limit.path.ends_with("acid_stock_m");
            r.method = Method::TwoStocks {
                acid_form: "nah2po4_h2o".into(),
                acid_stock_m: if acid { v } else { 1.0 },
                base_form: "na2hpo4_7h2o".into(),
                base_stock_m: if acid { 1.0 } else { v },
            };
        }
        "mixture.temperature_c" => m.temperature_c = v,
        "mixture.components[].conc_m" => m.components[0].conc_m = v,
        "mixture.additives[].conc_m" => m.additives[0].conc_m = v,
        "what_if.dilution_factor" => w.dilution_factor = v,
        "what_if.add_acid_m" => w.add_acid_m = v,
        "what_if.add_base_m" => w.add_base_m = v,
        "what_if.temperature_c" => w.temperature_c = v,
        "field.ph" => f.ph = v,
        "field.temperature_c" => f.temperature_c = v,
        "field.total" => f.total = Some(v),
        "field.ionic.ionic_strength" => f.ionic = IonicSource::Direct { ionic_strength: v },
        "field.ionic.us_cm" => f.ionic = IonicSource::Conductivity { us_cm: v },
        "field.ionic.mg_l" => f.ionic = IonicSource::Tds { mg_l: v },
        "field.ionic.psu" => f.ionic = IonicSource::Salinity { psu: v },
        "field.limit.value" => {
            f.limit = Some(UserLimit {
                value: v,
                unit: LimitUnit::MgPerLNh3,
            });
        }
        "field.alkalinity.value" => {
            f.system = "carbonate".into();
            f.total = None;
            f.alkalinity = Some(Alkalinity {
                value: v,
                unit: AlkalinityUnit::MgPerLCaco3,
            });
        }
        "uncertainty.temperature_k" => u.temperature_k = v,
        "uncertainty.balance_mg" => u.balance_mg = v,
        "uncertainty.flask_ml" => u.flask_ml = Some(v),
        "uncertainty.pour_percent" => u.pour_percent = Some(v),
        "uncertainty.stock_percent" => u.stock_percent = v,
        "uncertainty.concentration_percent" => u.concentration_percent = v,
        "uncertainty.ph_meter" => u.ph_meter = v,
        "uncertainty.activity_base_ph" => u.activity_base_ph = v,
        "uncertainty.activity_per_ionic" => u.activity_per_ionic = v,
        other => panic!("no way to set {other} in the test: add it"),
    }
    d
}

fn edges(l: &Limit) -> [f64; 4] {
    let below = l.min - (l.min.abs() * 1e-6).max(1e-9);
    let above = l.max + (l.max.abs() * 1e-6).max(1e-9);
    [below, l.min, l.max, above]
}

#[test]
fn the_page_and_the_solver_give_each_edge_value_the_same_verdict() {
    let mut checked = 0;
    for l in limits::ALL.iter().chain(limits::GAS) {
        // Also bounded by the chosen system's own data, which only the solver knows.
        if l.path == limits::PREPARE_TEMPERATURE_C.path {
            continue;
        }
        assert!(
            parse_design_value(serde_json::to_value(design_with(l, l.min)).unwrap()).is_ok(),
            "{}: the demo (or the incubator example) with the minimum should be valid",
            l.path
        );
        for v in edges(l) {
            let page = check(&format!("{v:e}"), *l, 1.0).is_ok();
            let doc = serde_json::to_value(design_with(l, v)).unwrap();
            let solver = parse_design_value(doc);
            assert_eq!(
                page,
                solver.is_ok(),
                "{} at {v:e}: page {page}, solver {solver:?}",
                l.path
            );
            assert_eq!(page, l.admits(v), "{} at {v:e}", l.path);
            if let Err(e) = solver {
                let field = e.field().unwrap_or_default();
                let want = l.path.replace("[]", "[0]");
                assert!(
                    want.ends_with(field) || field == want,
                    "{}: the error names {field}",
                    l.path
                );
            }
            checked += 1;
        }
    }
    assert!(checked >= 4 * 40, "only {checked} values checked");
}
