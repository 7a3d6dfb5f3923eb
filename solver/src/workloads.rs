//! The benchmark workloads, defined once: the criterion benches (native) and
//! the page's in-browser timing (`app/src/bench.rs`) time exactly these.

use crate::equilibrium::activity::ActivityModel;
use crate::mixture::{Additive, AdditiveSpec, ComponentSpec, MixtureSpec};
use crate::recipe::{Method, RecipeSpec};

/// Three systems and a salt: phosphate (both forms), Tris·HCl, sodium
/// acetate and 0.1 M NaCl at 25 °C with Davies activities.
pub fn three_systems() -> MixtureSpec {
    let c = |s: &str, f: &str, m: f64| ComponentSpec {
        system: s.into(),
        form: Some(f.into()),
        conc_m: m,
    };
    MixtureSpec {
        temperature_c: 25.0,
        activity: ActivityModel::Davies,
        components: vec![
            c("phosphate", "nah2po4", 0.02),
            c("phosphate", "na2hpo4", 0.03),
            c("tris", "tris_hcl", 0.02),
            c("acetate", "na_acetate", 0.01),
        ],
        additives: vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.1,
        }],
        atmosphere: None,
    }
}

/// A two-form recipe: 500 mL of 50 mM phosphate at pH 7.4, 37 °C, with
/// 0.15 M NaCl, from the monohydrate and the heptahydrate.
pub fn phosphate_recipe() -> RecipeSpec {
    RecipeSpec {
        system: "phosphate".into(),
        target_ph: 7.4,
        temperature_c: 37.0,
        total_conc_m: 0.05,
        volume_l: 0.5,
        salts: vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.15,
        }],
        activity: ActivityModel::Davies,
        method: Method::TwoForms {
            acid_form: "nah2po4_h2o".into(),
            base_form: "na2hpo4_7h2o".into(),
        },
        tolerance_ph: 0.05,
        prepare_temperature_c: None,
        concentrate_factor: 1.0,
        atmosphere: None,
        store_temperature_c: None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_workloads_solve() {
        let p = crate::mixture::prepare(&three_systems(), &[]);
        assert!(p.is_ok_and(|p| p.solve().is_ok()));
        assert!(crate::recipe::solve_recipe(&phosphate_recipe(), &[]).is_ok());
    }
}
