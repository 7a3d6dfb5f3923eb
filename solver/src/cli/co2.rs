//! The command line's CO₂: reading `--co2 5%|420uatm`, and the gas part of `--table`.

use crate::document::gas::{GasParts, GasReport};
use crate::equilibrium::gas::Atmosphere;
use crate::error::{Result, SolverError};

/// Read the command line's CO₂ figure: `5%` (of the dry gas) or `420uatm`
/// (also `420µatm`), a plain number being ambiguous.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `--co2` for text that is neither.
pub fn parse_co2(text: &str) -> Result<Atmosphere> {
    let t = text.trim();
    let num = |s: &str| s.trim().parse::<f64>().ok().filter(|v| v.is_finite());
    let bad = || SolverError::Infeasible {
        field: "--co2".into(),
        reason: format!(
            "{} is not a CO₂ figure: write a percentage (5%) or a partial pressure (420uatm)",
            crate::fmt::quote(t)
        ),
    };
    if let Some(v) = t.strip_suffix('%').and_then(num) {
        return Ok(Atmosphere::percent(v));
    }
    let low = t.to_ascii_lowercase();
    let uatm = low
        .strip_suffix("uatm")
        .or_else(|| low.strip_suffix("µatm"));
    match uatm.and_then(num) {
        Some(v) => Ok(Atmosphere::uatm(v)),
        None => Err(bad()),
    }
}

/// The gas part of a report as text, for the command line's `--table`.
pub fn gas_table(g: &GasReport) -> String {
    use crate::fmt::{sig, sig_trim};
    let mut out = String::from("\n== CO₂ atmosphere\n");
    let parts = |out: &mut String, label: &str, p: &GasParts| {
        match &p.what_if {
            Ok(w) => {
                out.push_str(&format!(
                    "  {label}: pH {:.2} under its gas; in room air ({} µatm) pH {:.2}",
                    w.ph,
                    sig_trim(w.room_air_uatm, 4),
                    w.room_air_ph
                ));
                if let (Some(x), Some(y)) = (w.other_percent, w.other_ph) {
                    out.push_str(&format!("; at {} % CO₂ pH {y:.2}", sig_trim(x, 3)));
                }
                out.push('\n');
            }
            Err(e) => out.push_str(&format!("  {label}: error: {e}\n")),
        }
        if let Ok(c) = &p.curve {
            let row: Vec<String> = c
                .co2_percent
                .iter()
                .zip(&c.ph)
                .step_by(4)
                .map(|(x, y)| format!("{}%:{y:.2}", sig_trim(*x, 3)))
                .collect();
            out.push_str(&format!(
                "  {label}: pH against CO₂ at {} °C  {}\n",
                sig(c.temperature_c, 3),
                row.join("  ")
            ));
            if let (Some(t), Some(x)) = (c.target_ph, c.target_co2_percent) {
                out.push_str(&format!(
                    "  {label}: target pH {t:.2} at {} % CO₂\n",
                    sig(x, 3)
                ));
            }
        }
    };
    if let Some(p) = &g.recipe {
        parts(&mut out, "recipe", p);
    }
    if let Some(p) = &g.mixture {
        parts(&mut out, "mixture", p);
    }
    match &g.field {
        Some(Ok(f)) => out.push_str(&format!(
            "  field: the sample is in balance with {} µatm; with {} µatm it settles at pH {:.2}, {} {} mg/L CO₂ (DIC {} → {} mmol/L)\n",
            sig(f.sample_co2_uatm, 3),
            sig(f.gas.co2_uatm, 3),
            f.equilibrium_ph,
            if f.co2_change_mg_l < 0.0 { "losing" } else { "gaining" },
            sig(f.co2_change_mg_l.abs(), 3),
            sig(f.dic_sample_mmol_l, 3),
            sig(f.dic_equilibrium_mmol_l, 3)
        )),
        Some(Err(e)) => out.push_str(&format!("  field: error: {e}\n")),
        None => {}
    }
    out.push_str("  (equilibrium with the gas; the time it takes is not computed)\n");
    out
}
