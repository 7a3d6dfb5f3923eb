//! Solubility of the shelf salts in water against temperature, and the check of a recipe,
//! stock or concentrate against it at the temperatures it is made and stored at.
//!
//! Values are grams of the anhydrous salt per 100 g of water, at the
//! temperatures of the usual handbook table of aqueous solubility against
//! temperature (CRC Handbook of Chemistry and Physics, "Aqueous solubility
//! of inorganic compounds at various temperatures"; citric acid from the
//! same handbook's organic table). **Every figure here is from memory** and
//! is to be re-read against the handbook before it counts as a check; the
//! warnings therefore say "about" and use a margin (a solution is flagged
//! from 85 % of the estimated capacity). Between table temperatures the
//! value is interpolated linearly; outside the table's range nothing is
//! said (not checked). Forms with no entry here are not checked, and the
//! result says which.
//!
//! The capacity of a litre of solution is estimated from the mass fraction
//! at saturation, w = s/(100 + s), and a rough solution density of
//! 1 + 0.7·w g/mL (common practice for simple salts; no source): it is an
//! estimate for a warning, not a density model. Several salts in one
//! solution are checked one by one (no common-ion effect).

use super::spec::{Ingredient, RecipeSpec, RecipeWarning};
use crate::error::{Result, SolverError};
use crate::fmt::{sig, sig_trim};
pub use crate::system::formula::anhydrous;
use crate::system::formula::molar_mass;

/// One salt's solubility table.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SolubilityTable {
    /// Anhydrous formula as in the library's forms (`Na2HPO4`).
    pub formula: &'static str,
    /// (°C, g anhydrous salt per 100 g water), rising temperatures.
    pub points: &'static [(f64, f64)],
}

/// The salts with a solubility table (values from memory, see the module notes).
pub const SOLUBILITY: &[SolubilityTable] = &[
    SolubilityTable {
        formula: "NaCl",
        points: &[
            (0.0, 35.7),
            (10.0, 35.8),
            (20.0, 35.9),
            (30.0, 36.1),
            (40.0, 36.4),
            (60.0, 37.1),
        ],
    },
    SolubilityTable {
        formula: "KCl",
        points: &[
            (0.0, 28.0),
            (10.0, 31.2),
            (20.0, 34.2),
            (30.0, 37.2),
            (40.0, 40.1),
            (60.0, 45.8),
        ],
    },
    SolubilityTable {
        formula: "NH4Cl",
        points: &[
            (0.0, 29.4),
            (10.0, 33.3),
            (20.0, 37.2),
            (30.0, 41.4),
            (40.0, 45.8),
            (60.0, 55.3),
        ],
    },
    SolubilityTable {
        formula: "Na2HPO4",
        points: &[
            (0.0, 1.7),
            (10.0, 3.6),
            (20.0, 7.8),
            (25.0, 11.8),
            (30.0, 20.0),
            (40.0, 55.0),
        ],
    },
    SolubilityTable {
        formula: "NaH2PO4",
        points: &[
            (0.0, 56.5),
            (10.0, 69.8),
            (20.0, 86.9),
            (30.0, 106.5),
            (40.0, 133.3),
        ],
    },
    SolubilityTable {
        formula: "KH2PO4",
        points: &[
            (0.0, 14.8),
            (10.0, 18.3),
            (20.0, 22.6),
            (30.0, 28.0),
            (40.0, 35.5),
            (60.0, 50.2),
        ],
    },
    SolubilityTable {
        formula: "NaHCO3",
        points: &[
            (0.0, 6.9),
            (10.0, 8.15),
            (20.0, 9.6),
            (30.0, 11.1),
            (40.0, 12.7),
            (60.0, 16.4),
        ],
    },
    SolubilityTable {
        formula: "Na2CO3",
        points: &[
            (0.0, 7.0),
            (10.0, 12.5),
            (20.0, 21.5),
            (30.0, 39.7),
            (40.0, 49.0),
        ],
    },
    SolubilityTable {
        formula: "KHCO3",
        points: &[
            (0.0, 22.4),
            (10.0, 27.7),
            (20.0, 33.2),
            (30.0, 39.1),
            (40.0, 45.4),
            (60.0, 60.0),
        ],
    },
    SolubilityTable {
        formula: "K2CO3",
        points: &[(0.0, 105.5), (20.0, 110.5), (40.0, 116.9), (60.0, 126.8)],
    },
    SolubilityTable {
        formula: "H3BO3",
        points: &[
            (0.0, 2.52),
            (10.0, 3.49),
            (20.0, 4.72),
            (30.0, 6.23),
            (40.0, 8.08),
            (60.0, 12.9),
        ],
    },
    SolubilityTable {
        formula: "Na2B4O7",
        points: &[
            (0.0, 1.1),
            (10.0, 1.6),
            (20.0, 2.6),
            (30.0, 3.9),
            (40.0, 6.7),
            (60.0, 19.0),
        ],
    },
    SolubilityTable {
        formula: "C6H8O7",
        points: &[
            (0.0, 96.0),
            (10.0, 118.0),
            (20.0, 146.0),
            (30.0, 181.0),
            (40.0, 218.0),
        ],
    },
];

/// Fraction of the estimated capacity from which a solution is flagged.
pub const SOLUBILITY_MARGIN: f64 = 0.85;

/// g of anhydrous salt per 100 g water at `t` °C, interpolated; `None` when
/// the salt has no table or `t` is outside it.
///
/// # Example
///
/// ```
/// use solver::recipe::solubility::grams_per_100g_water;
/// assert_eq!(grams_per_100g_water("KCl", 20.0), Some(34.2));
/// assert_eq!(grams_per_100g_water("KCl", 80.0), None);
/// assert_eq!(grams_per_100g_water("C4H11NO3", 20.0), None); // no table
/// ```
pub fn grams_per_100g_water(formula: &str, t: f64) -> Option<f64> {
    let table = SOLUBILITY.iter().find(|s| s.formula == formula)?;
    let pts = table.points;
    pts.windows(2).find_map(|w| match w {
        [(t0, s0), (t1, s1)] if (*t0..=*t1).contains(&t) => {
            Some(s0 + (s1 - s0) * (t - t0) / (t1 - t0))
        }
        _ => None,
    })
}

/// Estimated grams of anhydrous salt a litre of saturated solution holds,
/// from `s` g per 100 g water (see the module notes).
pub fn capacity_g_per_l(s: f64) -> f64 {
    let w = s / (100.0 + s);
    1000.0 * (1.0 + 0.7 * w) * w
}

/// One salt of a solution checked at one temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct SolubilityCheck {
    /// The formula weighed (`Na2HPO4·7H2O`).
    pub formula: String,
    /// Its concentration in the solution made, mol/L.
    pub conc_m: f64,
    /// g/L of the anhydrous salt that is.
    pub needed_g_l: f64,
    /// Estimated g/L of the anhydrous salt that dissolves at the temperature.
    pub soluble_g_l: f64,
    /// The temperature, °C.
    pub temperature_c: f64,
    /// Lowest table temperature at which it would dissolve, °C, if any.
    pub dissolves_above_c: Option<f64>,
}

/// Check a salt at `conc_m` mol/L against its solubility at `t` °C: `Some`
/// when it needs at least [`SOLUBILITY_MARGIN`] of the estimated capacity,
/// `None` when it is well inside it, has no table, or `t` is outside it.
pub fn check_salt(formula: &str, conc_m: f64, t: f64) -> Option<SolubilityCheck> {
    let base = anhydrous(formula);
    let m = molar_mass(base).ok()?;
    let needed = conc_m * m;
    let soluble = capacity_g_per_l(grams_per_100g_water(base, t)?);
    if !(needed.is_finite() && needed >= SOLUBILITY_MARGIN * soluble) {
        return None;
    }
    let table = SOLUBILITY.iter().find(|s| s.formula == base)?;
    let dissolves_above_c = table.points.iter().map(|(tt, _)| *tt).find(|tt| {
        grams_per_100g_water(base, *tt)
            .is_some_and(|s| needed < SOLUBILITY_MARGIN * capacity_g_per_l(s))
    });
    Some(SolubilityCheck {
        formula: formula.to_string(),
        conc_m,
        needed_g_l: needed,
        soluble_g_l: soluble,
        temperature_c: t,
        dissolves_above_c,
    })
}

/// Whether a salt has a solubility table here.
pub fn has_table(formula: &str) -> bool {
    let base = anhydrous(formula);
    SOLUBILITY.iter().any(|s| s.formula == base)
}

/// Each weighed salt of the solution made checked against its solubility
/// where it is made (`t_prep`) and, when given, where it is kept.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `concentrate_factor` for a concentrate
/// with a salt that would not dissolve at any temperature of its table.
pub(crate) fn recipe_warnings(
    spec: &RecipeSpec,
    ingredients: &[Ingredient],
    t_prep: f64,
) -> Result<Vec<RecipeWarning>> {
    let mut out = Vec::new();
    for i in ingredients.iter().filter(|i| i.grams.is_some()) {
        let c = i.mol / spec.volume_l;
        let made = check_salt(&i.formula, c, t_prep);
        if let Some(m) = &made {
            if spec.concentrate_factor > 1.0 && m.dissolves_above_c.is_none() {
                return Err(SolverError::Infeasible {
                    field: "concentrate_factor".into(),
                    reason: format!(
                        "the {}× concentrate needs about {} g/L of {}, more than dissolves at any temperature of its solubility table (about {} g/L at {} °C); choose a smaller factor",
                        sig_trim(spec.concentrate_factor, 3),
                        sig(m.needed_g_l, 3),
                        anhydrous(&i.formula),
                        sig(m.soluble_g_l, 2),
                        sig_trim(t_prep, 3)
                    ),
                });
            }
        }
        let stored = spec
            .store_temperature_c
            .filter(|t| *t != t_prep)
            .and_then(|t| check_salt(&i.formula, c, t));
        for (check, is_stored) in [(made, false), (stored, true)] {
            if let Some(k) = check {
                out.push(RecipeWarning::Solubility {
                    formula: k.formula,
                    conc_m: k.conc_m,
                    needed_g_l: k.needed_g_l,
                    soluble_g_l: k.soluble_g_l,
                    temperature_c: k.temperature_c,
                    stored: is_stored,
                    dissolves_above_c: k.dissolves_above_c,
                });
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tables_rise_in_temperature_and_are_positive() {
        for s in SOLUBILITY {
            assert!(
                s.points.windows(2).all(|w| w[0].0 < w[1].0),
                "{}",
                s.formula
            );
            assert!(s.points.iter().all(|p| p.1 > 0.0), "{}", s.formula);
            assert!(molar_mass(s.formula).is_ok(), "{}", s.formula);
        }
    }

    #[test]
    fn interpolation_and_edges() {
        let v = grams_per_100g_water("Na2HPO4", 22.0).unwrap_or(0.0);
        assert!((v - (7.8 + 4.0 * 0.4)).abs() < 1e-9, "{v}");
        assert_eq!(grams_per_100g_water("Na2HPO4", 41.0), None);
        assert_eq!(anhydrous("Na2HPO4·7H2O"), "Na2HPO4");
        assert!(has_table("NaH2PO4·H2O") && !has_table("C4H11NO3"));
    }
}
