//! A recipe's bench steps in words (the numbers printed by [`crate::fmt`]).

use super::spec::{Ingredient, MeterReading, MeterSolution, Method, RecipeSpec};
use crate::equilibrium::activity::DAVIES_LIMIT;
use crate::fmt::{format_mass, format_volume_ml, sig, sig_fixed, sig_trim};

/// Share of the final volume the solids are usually dissolved in before titrating.
const DISSOLVE_SHARE: f64 = 0.8;
/// Share of the final volume kept free for making up to the mark when the titrant
/// leaves too little room for the usual dissolving volume.
const MAKE_UP_SHARE: f64 = 0.05;
/// Least share of the final volume the solids are dissolved in (common practice: enough
/// water to dissolve and stir; a smaller share is not offered).
const DISSOLVE_MIN_SHARE: f64 = 0.25;

/// How much water (mL) to dissolve the solids in before `titrant_ml` of titrant is added,
/// so that both fit below the mark of a `v_ml` flask: the usual 80 % when it fits, else
/// what is left after the titrant and a little room for making up (rounded down to two
/// figures); `None` when even that would be under a quarter of the final volume.
pub(crate) fn dissolving_ml(v_ml: f64, titrant_ml: f64) -> Option<f64> {
    let usual = v_ml * DISSOLVE_SHARE;
    if usual + titrant_ml <= v_ml * (1.0 + 1e-9) {
        return Some(usual);
    }
    let room = v_ml * (1.0 - MAKE_UP_SHARE) - titrant_ml;
    if room.is_nan() || room <= 0.0 {
        return None;
    }
    let step = 10f64.powf(room.log10().floor() - 1.0);
    let d = (room / step).floor() * step;
    (d >= v_ml * DISSOLVE_MIN_SHARE).then_some(d)
}

/// The titrant concentration at which the usual dissolving volume fits beside it, rounded
/// up to two figures (what a refusal suggests).
pub(crate) fn titrant_that_fits(v_ml: f64, titrant_ml: f64, titrant_m: f64) -> f64 {
    let need = titrant_m * titrant_ml / (v_ml * (1.0 - DISSOLVE_SHARE));
    if !(need.is_finite() && need > 0.0) {
        return titrant_m;
    }
    let step = 10f64.powf(need.log10().floor() - 1.0);
    (need / step).ceil() * step
}

/// The dissolving step's volume for a recipe: [`dissolving_ml`] beside the poured
/// titrant (the usual 80 % for the other methods).
fn dissolve_in(spec: &RecipeSpec, pours: &[(&Ingredient, f64)]) -> String {
    let v_ml = spec.volume_l * 1000.0;
    let poured: f64 = pours.iter().map(|(_, ml)| ml).sum();
    let usual = v_ml * DISSOLVE_SHARE;
    match dissolving_ml(v_ml, poured) {
        Some(d) if d < usual => format!(
            "{} mL of water (less than the usual {} mL: the {} of titrant must fit below the {} mL mark)",
            sig_trim(d, 3),
            sig_trim(usual, 3),
            format_volume_ml(poured),
            sig(v_ml, 4)
        ),
        _ => format!("{} mL of water", sig(usual, 3)),
    }
}

/// "Weigh …" steps for the weighed ingredients, in order, and the poured ones
/// (with their volume, mL) left for the method's own wording.
fn weigh_steps(ing: &[Ingredient]) -> (Vec<String>, Vec<(&Ingredient, f64)>) {
    let mut steps = Vec::new();
    let mut pours = Vec::new();
    for i in ing {
        match (i.grams, i.ml) {
            (Some(g), _) => steps.push(format!(
                "Weigh {} of {} — {}.",
                format_mass(g),
                i.formula,
                i.name
            )),
            (None, Some(ml)) => pours.push((i, ml)),
            _ => {}
        }
    }
    (steps, pours)
}

pub(crate) fn steps_text(spec: &RecipeSpec, ing: &[Ingredient]) -> Vec<String> {
    let v_ml = spec.volume_l * 1000.0;
    let (mut steps, pours) = weigh_steps(ing);
    match &spec.method {
        Method::TwoStocks { .. } => {
            for (i, ml) in &pours {
                steps.push(format!(
                    "Measure {} of {} M {} stock.",
                    format_volume_ml(*ml),
                    sig(i.stock_m.unwrap_or(0.0), 3),
                    i.formula
                ));
            }
            steps.push(format!(
                "Combine in a {} mL volumetric flask and make up to the mark with water at {} °C.",
                sig(v_ml, 4),
                sig(spec.temperature_c, 3)
            ));
        }
        Method::Titrate { .. } => {
            steps.push(format!("Dissolve in about {}.", dissolve_in(spec, &pours)));
            for (i, ml) in &pours {
                steps.push(format!(
                    "Add {} of {} M {} while stirring (predicted); confirm with a calibrated pH meter at {} °C.",
                    format_volume_ml(*ml),
                    sig(i.stock_m.unwrap_or(0.0), 3),
                    i.formula,
                    sig(spec.temperature_c, 3)
                ));
            }
            steps.push(format!("Make up to {} mL with water.", sig(v_ml, 4)));
        }
        Method::TwoForms { .. } => {
            steps.push(format!(
                "Dissolve in about {} mL of water, then make up to {} mL at {} °C.",
                sig(v_ml * 0.8, 3),
                sig(v_ml, 4),
                sig(spec.temperature_c, 3)
            ));
        }
    }
    steps.push(format!(
        "Check: pH {} at {} °C.",
        sig_fixed(spec.target_ph, 2),
        sig(spec.temperature_c, 3)
    ));
    steps
}

/// A volume in plain words: `50 mL`, `1.5 L`.
pub(crate) fn volume_words(ml: f64) -> String {
    if ml >= 1000.0 {
        format!("{} L", sig_trim(ml / 1000.0, 4))
    } else {
        format!("{} mL", sig_trim(ml, 4))
    }
}

/// Steps at the bench when the buffer is made at another temperature than
/// it is used at, or made as a concentrate: what to dissolve, at which
/// temperature to read the meter, what it should read there, how to dilute.
/// `concentrate_ionic` is the concentrate's ionic strength, when one is made;
/// when the meter reading is of a diluted portion
/// ([`MeterSolution::DilutedPortion`]) the steps say why and never ask to
/// adjust the concentrate by the meter.
pub(crate) fn bench_steps(
    spec: &RecipeSpec,
    ing: &[Ingredient],
    meter: &MeterReading,
    concentrate_ionic: Option<f64>,
) -> Vec<String> {
    let v_ml = spec.volume_l * 1000.0;
    let n = spec.concentrate_factor;
    let tp = sig(meter.temperature_c, 3);
    let t = sig(spec.temperature_c, 3);
    let target = sig_fixed(spec.target_ph, 2);
    let reading = format!("pH {} at {tp} °C", sig_fixed(meter.ph, 2));
    let unpredicted = meter.solution == MeterSolution::DilutedPortion;
    let (what, beside) = if n > 1.0 {
        (
            format!("the {}× concentrate", sig_trim(n, 3)),
            format!(
                "diluted {}-fold it is pH {target} at {t} °C",
                sig_trim(n, 3)
            ),
        )
    } else {
        (
            "the buffer".to_string(),
            format!("pH {target} at the working temperature, {t} °C"),
        )
    };
    let why = format!(
        "the concentrate's own reading is not predicted: its ionic strength, {} M, is past the activity model's range (about {DAVIES_LIMIT} M)",
        sig(concentrate_ionic.unwrap_or(0.0), 3)
    );
    let (mut steps, pours) = weigh_steps(ing);
    match &spec.method {
        Method::TwoStocks { .. } => {
            for (i, ml) in &pours {
                steps.push(format!(
                    "Measure {} of {} M {} stock.",
                    format_volume_ml(*ml),
                    sig(i.stock_m.unwrap_or(0.0), 3),
                    i.formula
                ));
            }
            steps.push(format!(
                "Combine in a {} mL volumetric flask, bring to {tp} °C and make up to the mark with water.",
                sig(v_ml, 4)
            ));
        }
        Method::Titrate { .. } => {
            steps.push(format!(
                "Dissolve in about {} and bring to {tp} °C.",
                dissolve_in(spec, &pours)
            ));
            for (i, ml) in &pours {
                if unpredicted {
                    steps.push(format!(
                        "Add exactly {} of {} M {} while stirring: the computed amount; do not titrate the concentrate by the meter ({why}).",
                        format_volume_ml(*ml),
                        sig(i.stock_m.unwrap_or(0.0), 3),
                        i.formula
                    ));
                } else {
                    steps.push(format!(
                        "Add {} of {} M {} while stirring (predicted), titrating until the meter reads {reading} ({beside}).",
                        format_volume_ml(*ml),
                        sig(i.stock_m.unwrap_or(0.0), 3),
                        i.formula
                    ));
                }
            }
            steps.push(format!(
                "Make up to {} mL with water at {tp} °C.",
                sig(v_ml, 4)
            ));
        }
        Method::TwoForms { .. } => {
            steps.push(format!(
                "Dissolve in about {} mL of water, bring to {tp} °C, then make up to {} mL.",
                sig(v_ml * 0.8, 3),
                sig(v_ml, 4)
            ));
        }
    }
    if unpredicted {
        steps.push(format!(
            "Check: dilute a portion 1 + {} with water (for example {} made up to {}) and bring it to {tp} °C: the meter should read {reading}. Do not adjust the concentrate itself to this value: {why}.",
            sig_trim(n - 1.0, 3),
            volume_words(10.0),
            volume_words(10.0 * n)
        ));
    } else {
        steps.push(format!(
            "Check: the meter should read {reading} for {what} ({beside})."
        ));
    }
    if n > 1.0 {
        steps.push(format!(
            "Before use, dilute 1 + {} with water: {} of concentrate made up to {} gives pH {target} at {t} °C; this batch makes {}.",
            sig_trim(n - 1.0, 3),
            volume_words(v_ml / n),
            volume_words(v_ml),
            volume_words(v_ml * n)
        ));
    }
    steps
}
