//! The pH standard buffers: published pH(S) against temperature, interpolated, with the engine's own value beside each.
//!
//! Values are those of the IUPAC/NBS scale as tabulated in Buck et al. (2002)
//! Pure Appl. Chem. 74, 2169 (primary standards) and Bates (1973)
//! *Determination of pH*, 2nd ed. (potassium tetroxalate and saturated
//! calcium hydroxide, which the 2002 recommendations list among the secondary
//! standards). Every cell carries its status (`confirmed` where the value was
//! re-read in a published source, `from memory` where it was recalled and not
//! re-read); `solver/tests/it/meter.rs` checks the cells against the sources and
//! against each other. Between table temperatures the value is interpolated
//! linearly (the tables are spaced 5 °C, 2–3 °C around 37 °C, and their second
//! differences are a few thousandths, so the interpolation error is below the
//! tables' last digit); outside a standard's table it is refused with its range.
//!
//! Phthalate is given by the equation of Hamer, Pinching & Acree (1946)
//! J. Res. NBS 36, 47, pH(S) = 4.000 + 4.79×10⁻⁵ (t − 15)², which gives the
//! 25 °C value of the 2002 table (4.005).

use crate::error::{finite, Result, SolverError};
use crate::mixture::{solve_mixture, ComponentSpec, MixtureSpec};
use crate::selfcheck::Status;
use serde::{Deserialize, Serialize};

/// How the values of a standard are given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Values {
    /// Table cells (°C, pH(S), status), temperatures rising.
    Table(&'static [(f64, f64, Status)]),
    /// Hamer, Pinching & Acree (1946): 4.000 + 4.79×10⁻⁵ (t − 15)², valid from
    /// `min` to `max` °C.
    Hamer1946 {
        /// Lowest temperature, °C.
        min: f64,
        /// Highest temperature, °C.
        max: f64,
    },
}

/// One standard buffer.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Standard {
    /// Stable id (`phosphate_1_1`), used in documents and on the command line.
    pub id: &'static str,
    /// Name in words.
    pub name: &'static str,
    /// What is dissolved, molal.
    pub composition: &'static str,
    /// A primary standard of the 2002 recommendations (false: listed there as secondary).
    pub primary: bool,
    /// pH(S) against temperature.
    pub values: Values,
    /// Expanded uncertainty of pH(S) (k = 2) used for the standard.
    pub u95: f64,
    /// Where the values come from.
    pub source: &'static str,
    /// The engine's recipe for the solution (system, form, mol/L), if its
    /// library holds the system.
    pub engine: &'static [(&'static str, &'static str, f64)],
}

use Status::{Confirmed as C, FromMemory as M};

const BUCK: &str =
    "Buck et al. (2002) Pure Appl. Chem. 74, 2169, table of pH(PS) of the primary standards";
const BATES: &str =
    "Bates (1973) Determination of pH, 2nd ed., Wiley, table of NBS standard values";
const HAMER: &str = "Hamer, Pinching & Acree (1946) J. Res. NBS 36, 47 (equation); 4.005 at 25 °C as in Buck et al. (2002)";

/// Expanded uncertainty (k = 2) of a primary standard's pH(S): Buck et al.
/// (2002) give a few thousandths for the primary standards; 0.005 is the
/// upper figure used here (from memory).
pub const U95_PRIMARY: f64 = 0.005;
/// Expanded uncertainty (k = 2) of the secondary standards: 0.01 (from memory).
pub const U95_SECONDARY: f64 = 0.01;

/// The nine standards, in order of pH.
pub const STANDARDS: &[Standard] = &[
    Standard {
        id: "tetroxalate",
        name: "potassium tetroxalate",
        composition: "0.05 mol/kg KH3(C2O4)2·2H2O",
        primary: false,
        values: Values::Table(&[
            (0.0, 1.666, M),
            (5.0, 1.668, M),
            (10.0, 1.670, M),
            (15.0, 1.672, M),
            (20.0, 1.675, M),
            (25.0, 1.679, M),
            (30.0, 1.683, M),
            (35.0, 1.688, M),
            (37.0, 1.691, M),
            (40.0, 1.694, M),
            (50.0, 1.707, M),
        ]),
        u95: U95_SECONDARY,
        source: BATES,
        engine: &[],
    },
    Standard {
        id: "tartrate",
        name: "potassium hydrogen tartrate, saturated at 25 °C",
        composition: "about 0.034 mol/kg KHC4H4O6 (saturated at 25 °C)",
        primary: true,
        values: Values::Table(&[
            (25.0, 3.557, M),
            (30.0, 3.552, M),
            (35.0, 3.549, M),
            (37.0, 3.548, M),
            (40.0, 3.547, M),
            (50.0, 3.549, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[],
    },
    Standard {
        id: "citrate",
        name: "potassium dihydrogen citrate",
        composition: "0.05 mol/kg KH2C6H5O7",
        primary: true,
        values: Values::Table(&[
            (0.0, 3.863, M),
            (5.0, 3.840, M),
            (10.0, 3.820, M),
            (15.0, 3.802, M),
            (20.0, 3.788, M),
            (25.0, 3.776, C),
            (30.0, 3.766, M),
            (35.0, 3.759, M),
            (37.0, 3.756, M),
            (40.0, 3.754, M),
            (50.0, 3.749, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[("citrate", "kh2_citrate", 0.05)],
    },
    Standard {
        id: "phthalate",
        name: "potassium hydrogen phthalate",
        composition: "0.05 mol/kg KHC8H4O4",
        primary: true,
        values: Values::Hamer1946 {
            min: 0.0,
            max: 50.0,
        },
        u95: U95_PRIMARY,
        source: HAMER,
        engine: &[("phthalate", "khp", 0.05)],
    },
    Standard {
        id: "phosphate_1_1",
        name: "equimolal phosphate",
        composition: "0.025 mol/kg KH2PO4 + 0.025 mol/kg Na2HPO4",
        primary: true,
        values: Values::Table(&[
            (0.0, 6.984, M),
            (5.0, 6.951, M),
            (10.0, 6.923, M),
            (15.0, 6.900, M),
            (20.0, 6.881, M),
            (25.0, 6.865, C),
            (30.0, 6.853, M),
            (35.0, 6.844, M),
            (37.0, 6.841, M),
            (40.0, 6.838, M),
            (50.0, 6.833, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[
            ("phosphate", "kh2po4", 0.025),
            ("phosphate", "na2hpo4", 0.025),
        ],
    },
    Standard {
        id: "phosphate_1_3_5",
        name: "phosphate 1:3.5",
        composition: "0.008695 mol/kg KH2PO4 + 0.03043 mol/kg Na2HPO4",
        primary: true,
        values: Values::Table(&[
            (0.0, 7.534, M),
            (5.0, 7.500, M),
            (10.0, 7.472, M),
            (15.0, 7.448, M),
            (20.0, 7.429, M),
            (25.0, 7.413, C),
            (30.0, 7.400, M),
            (35.0, 7.389, M),
            (37.0, 7.386, M),
            (40.0, 7.380, M),
            (50.0, 7.367, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[
            ("phosphate", "kh2po4", 0.008695),
            ("phosphate", "na2hpo4", 0.03043),
        ],
    },
    Standard {
        id: "borax",
        name: "borax",
        composition: "0.01 mol/kg Na2B4O7·10H2O",
        primary: true,
        values: Values::Table(&[
            (0.0, 9.464, M),
            (5.0, 9.395, M),
            (10.0, 9.332, M),
            (15.0, 9.276, M),
            (20.0, 9.225, M),
            (25.0, 9.180, C),
            (30.0, 9.139, M),
            (35.0, 9.102, M),
            (37.0, 9.088, M),
            (40.0, 9.068, M),
            (50.0, 9.011, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[("borate", "borax_10h2o", 0.01)],
    },
    Standard {
        id: "carbonate",
        name: "carbonate",
        composition: "0.025 mol/kg NaHCO3 + 0.025 mol/kg Na2CO3",
        primary: true,
        values: Values::Table(&[
            (0.0, 10.317, M),
            (5.0, 10.245, M),
            (10.0, 10.179, M),
            (15.0, 10.118, M),
            (20.0, 10.062, M),
            (25.0, 10.012, C),
            (30.0, 9.966, M),
            (35.0, 9.926, M),
            (37.0, 9.910, M),
            (40.0, 9.889, M),
            (50.0, 9.828, M),
        ]),
        u95: U95_PRIMARY,
        source: BUCK,
        engine: &[
            ("carbonate", "nahco3", 0.025),
            ("carbonate", "na2co3", 0.025),
        ],
    },
    Standard {
        id: "calcium_hydroxide",
        name: "calcium hydroxide, saturated at 25 °C",
        composition: "about 0.0203 mol/kg Ca(OH)2 (saturated at 25 °C)",
        primary: false,
        // 37 °C is not listed: the recalled value was not good enough to keep;
        // it is interpolated between 35 and 40 °C.
        values: Values::Table(&[
            (0.0, 13.423, M),
            (5.0, 13.207, M),
            (10.0, 13.003, M),
            (15.0, 12.810, M),
            (20.0, 12.627, M),
            (25.0, 12.454, M),
            (30.0, 12.289, M),
            (35.0, 12.133, M),
            (40.0, 11.984, M),
            (50.0, 11.705, M),
        ]),
        u95: U95_SECONDARY,
        source: BATES,
        engine: &[],
    },
];

/// The standard with this id.
pub fn find_standard(id: &str) -> Option<&'static Standard> {
    STANDARDS.iter().find(|s| s.id == id)
}

impl Standard {
    /// Lowest and highest temperature with published values, °C.
    pub fn range_c(&self) -> (f64, f64) {
        match self.values {
            Values::Table(cells) => (
                cells.first().map_or(0.0, |c| c.0),
                cells.last().map_or(0.0, |c| c.0),
            ),
            Values::Hamer1946 { min, max } => (min, max),
        }
    }

    /// pH(S) at `t_c` °C and the status of the value: a table cell's own
    /// status at a table temperature; between cells, the weaker of the two
    /// (interpolated); the equation's values are computed from it.
    ///
    /// # Errors
    ///
    /// `field` (the temperature's path) outside the standard's range, with the range.
    pub fn ph_at(&self, t_c: f64, field: &str) -> Result<(f64, Status, bool)> {
        let t = finite(field, t_c)?;
        let (lo, hi) = self.range_c();
        if t < lo || t > hi {
            return Err(SolverError::Infeasible {
                field: field.into(),
                reason: format!(
                    "{t} °C is outside the published values of {} ({}), {lo} to {hi} °C",
                    self.id, self.name
                ),
            });
        }
        match self.values {
            Values::Hamer1946 { .. } => Ok((
                4.000 + 4.79e-5 * (t - 15.0) * (t - 15.0),
                Status::Computed,
                false,
            )),
            Values::Table(cells) => Ok(interpolate(cells, t)),
        }
    }

    /// What the engine computes for this solution at `t_c` (None when its
    /// library lacks the system or the temperature is outside its data).
    pub fn engine_ph(&self, t_c: f64) -> Option<f64> {
        if self.engine.is_empty() {
            return None;
        }
        let spec = MixtureSpec {
            temperature_c: t_c,
            activity: crate::equilibrium::activity::ActivityModel::Davies,
            components: self
                .engine
                .iter()
                .map(|(s, f, c)| ComponentSpec {
                    system: (*s).into(),
                    form: Some((*f).into()),
                    conc_m: *c,
                })
                .collect(),
            additives: vec![],
            atmosphere: None,
        };
        solve_mixture(&spec, &[]).ok().map(|r| r.equilibrium.ph)
    }
}

fn interpolate(cells: &[(f64, f64, Status)], t: f64) -> (f64, Status, bool) {
    for pair in cells.windows(2) {
        if let [(t0, p0, s0), (t1, p1, s1)] = pair {
            if (t - t0).abs() < 1e-9 {
                return (*p0, *s0, false);
            }
            if (t - t1).abs() < 1e-9 {
                return (*p1, *s1, false);
            }
            if t > *t0 && t < *t1 {
                let w = (t - t0) / (t1 - t0);
                let weaker = if *s0 == Status::Confirmed { *s1 } else { *s0 };
                return (p0 + w * (p1 - p0), weaker, true);
            }
        }
    }
    cells
        .first()
        .map_or((f64::NAN, Status::FromMemory, false), |c| (c.1, c.2, false))
}

/// Tolerance of the engine against pH(S): the self-check's, 0.02 at 25 °C and
/// 0.025 elsewhere (Bates–Guggenheim convention and molality against Davies
/// with molal ≈ molar).
pub fn engine_tolerance(t_c: f64) -> f64 {
    if (t_c - 25.0).abs() < 1e-9 {
        crate::selfcheck::PHS_TOL
    } else {
        crate::selfcheck::PHS_T_TOL
    }
}

/// One row of the standards table at a temperature.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StandardRow {
    /// Standard id.
    pub id: String,
    /// Name in words.
    pub name: String,
    /// Composition.
    pub composition: String,
    /// Primary (true) or secondary standard of the 2002 recommendations.
    pub primary: bool,
    /// Range of published values, °C.
    pub range_c: (f64, f64),
    /// pH(S) at the temperature (None outside the range).
    pub ph: Option<f64>,
    /// Expanded uncertainty (k = 2).
    pub u95: f64,
    /// Status word of the value (`confirmed`, `from memory`, `computed`).
    pub status: String,
    /// Interpolated between table temperatures.
    pub interpolated: bool,
    /// The reason there is no value (outside the range).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub refused: Option<String>,
    /// What the engine computes for the solution.
    pub engine_ph: Option<f64>,
    /// engine − published.
    pub difference: Option<f64>,
    /// Accepted |difference| (the self-check's tolerance).
    pub tolerance: f64,
    /// Citation.
    pub source: String,
}

/// Every standard at `t_c`: its published value (or why there is none) and
/// the engine's value beside it.
///
/// # Errors
///
/// A temperature that is not a number, or outside 0–100 °C.
pub fn standards_at(t_c: f64) -> Result<Vec<StandardRow>> {
    crate::error::in_range("temperature_c", t_c, 0.0, 100.0)?;
    Ok(STANDARDS
        .iter()
        .map(|s| {
            let (ph, status, interpolated, refused) = match s.ph_at(t_c, "temperature_c") {
                Ok((p, st, i)) => (Some(p), st.label().to_string(), i, None),
                Err(e) => (None, String::new(), false, Some(e.to_string())),
            };
            let engine_ph = if ph.is_some() { s.engine_ph(t_c) } else { None };
            StandardRow {
                id: s.id.into(),
                name: s.name.into(),
                composition: s.composition.into(),
                primary: s.primary,
                range_c: s.range_c(),
                ph,
                u95: s.u95,
                status,
                interpolated,
                refused,
                engine_ph,
                difference: ph.zip(engine_ph).map(|(p, e)| e - p),
                tolerance: engine_tolerance(t_c),
                source: s.source.into(),
            }
        })
        .collect())
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;

    #[test]
    fn ids_are_the_issue_names_in_order_of_ph() {
        let ids: Vec<&str> = STANDARDS.iter().map(|s| s.id).collect();
        assert_eq!(
            ids,
            [
                "tetroxalate",
                "tartrate",
                "citrate",
                "phthalate",
                "phosphate_1_1",
                "phosphate_1_3_5",
                "borax",
                "carbonate",
                "calcium_hydroxide"
            ]
        );
        let at25: Vec<f64> = STANDARDS
            .iter()
            .map(|s| s.ph_at(25.0, "t").unwrap().0)
            .collect();
        assert!(at25.windows(2).all(|w| w[0] < w[1]), "{at25:?}");
    }

    #[test]
    fn tables_rise_in_temperature() {
        for s in STANDARDS {
            if let Values::Table(c) = s.values {
                assert!(c.windows(2).all(|w| w[0].0 < w[1].0), "{}", s.id);
            }
        }
    }

    #[test]
    fn outside_the_range_is_refused_with_the_range() {
        let e = find_standard("tartrate")
            .unwrap()
            .ph_at(20.0, "calibration.temperature_c")
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("calibration.temperature_c") && e.contains("25 to 50"),
            "{e}"
        );
        assert!(find_standard("borax")
            .unwrap()
            .ph_at(f64::NAN, "t")
            .is_err());
    }

    #[test]
    fn between_cells_is_interpolated_and_marked() {
        let (p, st, i) = find_standard("phosphate_1_1")
            .unwrap()
            .ph_at(22.5, "t")
            .unwrap();
        assert!((p - (6.881 + 6.865) / 2.0).abs() < 1e-12);
        assert!(i);
        assert_eq!(st, Status::FromMemory);
    }
}
