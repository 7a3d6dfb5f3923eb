//! pH × temperature tables of one species' fraction or concentration, as CSV, Markdown or a standalone HTML page.

use super::ionic::{ionic_from, IonicSource};
use super::reading::{reporting_bases, total_to_molar, TotalUnit};
use super::sample::{target_species, FieldSample};
use super::seawater::{outside_note, seawater_note, PkModel};
use crate::error::{in_range, Result, SolverError};
use crate::fmt::ascii_name;
use crate::mixture::lookup;
use crate::system::{AcidSystem, Hazard};
use serde::{Deserialize, Serialize};

/// Most values along one axis.
pub const MAX_AXIS: usize = 1001;

/// What the cells hold.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Quantity {
    /// Fraction of the total (0–1).
    #[default]
    Fraction,
    /// Concentration, mg/L as the system's first reporting basis (mmol/L without one).
    Conc,
}

/// A grid request.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GridSpec {
    /// System id.
    pub system: String,
    /// pH values (rows).
    pub ph: Vec<f64>,
    /// Temperatures, °C (columns).
    pub temperatures_c: Vec<f64>,
    /// Species name (`NH3`, `NH₃`, `HOCl`...); the form that matters when absent.
    #[serde(default)]
    pub species: Option<String>,
    /// Fraction or concentration.
    #[serde(default)]
    pub quantity: Quantity,
    /// Total, needed for concentrations.
    #[serde(default)]
    pub total: Option<f64>,
    /// Unit of the total.
    pub total_unit: TotalUnit,
    /// Ionic strength source.
    pub ionic: IonicSource,
}

/// A computed grid: `values[i][j]` at `ph[i]`, `temperatures_c[j]`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Grid {
    /// System display name.
    pub system_name: String,
    /// Species display name.
    pub species: String,
    /// What the cells hold, in words with the unit.
    pub quantity_label: String,
    /// pH values.
    pub ph: Vec<f64>,
    /// Temperatures, °C.
    pub temperatures_c: Vec<f64>,
    /// Cell values.
    pub values: Vec<Vec<f64>>,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// Warnings (model range).
    pub warnings: Vec<String>,
    /// Safety cautions for hazardous systems.
    pub cautions: Vec<String>,
}

/// Parse an axis: `start:stop:step` (stop included when the steps land on
/// it) or one value.
///
/// # Errors
///
/// Text that is not numbers, a step that is not positive, stop below start,
/// more than [`MAX_AXIS`] values.
///
/// # Example
///
/// ```
/// # use solver::field::grid::parse_axis;
/// assert_eq!(parse_axis("ph", "6:7:0.5")?, vec![6.0, 6.5, 7.0]);
/// assert_eq!(parse_axis("ph", "7.2")?, vec![7.2]);
/// assert!(parse_axis("ph", "9:6:1").is_err());
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn parse_axis(field: &str, text: &str) -> Result<Vec<f64>> {
    let bad = |reason: String| SolverError::Document {
        field: field.into(),
        reason,
    };
    let nums: Vec<f64> = text
        .split(':')
        .map(|p| {
            p.trim()
                .parse::<f64>()
                .ok()
                .filter(|v| v.is_finite())
                .ok_or_else(|| bad(format!("\"{p}\" is not a number (write start:stop:step)")))
        })
        .collect::<Result<_>>()?;
    match nums.as_slice() {
        [v] => Ok(vec![*v]),
        [start, stop, step] => {
            if *step <= 0.0 {
                return Err(bad(format!("the step {step} must be positive")));
            }
            if stop < start {
                return Err(bad(format!("stop {stop} is below start {start}")));
            }
            let n = ((stop - start) / step + 1e-9).floor() as usize + 1;
            if n > MAX_AXIS {
                return Err(bad(format!("{n} values is more than {MAX_AXIS}")));
            }
            Ok((0..n)
                .map(|i| {
                    let v = start + step * i as f64;
                    (v * 1e9).round() / 1e9
                })
                .collect())
        }
        _ => Err(bad(format!(
            "\"{text}\" is neither one value nor start:stop:step"
        ))),
    }
}

/// Safety caution text for a system's hazards.
pub fn cautions_for(hazards: &[Hazard]) -> Vec<String> {
    let mut v = Vec::new();
    for h in hazards {
        let t = match h {
            Hazard::Ammonia => {
                "Ammonia: the un-ionized form is toxic to aquatic life and its vapour irritates."
            }
            Hazard::Sulfide => "Hydrogen sulfide is a toxic gas, released more as pH falls.",
            Hazard::Chlorine => "Chlorine and hypochlorite: never mix with acids or ammonia.",
            Hazard::Corrosive => continue,
        };
        v.push(t.to_string());
    }
    if !v.is_empty() {
        v.push(
            "This table is a calculation, not a safety assessment: follow the SDS, local codes \
             and licensed practice."
                .into(),
        );
    }
    v
}

/// Compute a grid.
///
/// # Errors
///
/// Unknown system or species; a pH outside 0–14; a temperature outside the
/// system's data (named with the system's range); a concentration asked
/// without a total; empty axes.
pub fn species_grid(spec: &GridSpec, custom: &[AcidSystem]) -> Result<Grid> {
    let sys = lookup(&spec.system, custom)?;
    if spec.ph.is_empty() || spec.temperatures_c.is_empty() {
        return Err(SolverError::Document {
            field: "grid".into(),
            reason: "both axes need at least one value".into(),
        });
    }
    for p in &spec.ph {
        in_range("ph", *p, 0.0, 14.0)?;
    }
    for t in &spec.temperatures_c {
        in_range("temperature_c", *t, sys.t_min_c, sys.t_max_c)?;
    }
    let index = match &spec.species {
        Some(name) => {
            let want = ascii_name(name).to_ascii_lowercase();
            sys.species
                .iter()
                .position(|s| ascii_name(s).to_ascii_lowercase() == want || s == name)
                .ok_or_else(|| SolverError::Unknown {
                    kind: format!(
                        "species of {} (one of {})",
                        sys.name,
                        sys.species
                            .iter()
                            .map(|s| ascii_name(s))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                    name: name.clone(),
                })?
        }
        None => target_species(&sys.id)
            .map(|t| t.0)
            .ok_or_else(|| SolverError::Infeasible {
                field: "species".into(),
                reason: format!(
                    "{} has no single form that matters: name a species",
                    sys.name
                ),
            })?,
    };
    let ionic = ionic_from(&spec.ionic)?;
    let (scale, label) = match spec.quantity {
        Quantity::Fraction => (1.0, "fraction of the total".to_string()),
        Quantity::Conc => {
            let t = spec.total.ok_or_else(|| SolverError::Infeasible {
                field: "total".into(),
                reason: "a concentration table needs a total".into(),
            })?;
            let m = total_to_molar(&sys.id, t, spec.total_unit)?;
            match reporting_bases(&sys.id).first() {
                Some((b, f)) => (
                    m * crate::system::formula::molar_mass(f)? * 1000.0,
                    format!("mg/L as {b}"),
                ),
                None => (m * 1000.0, "mmol/L".to_string()),
            }
        }
    };
    let mut columns = Vec::with_capacity(spec.temperatures_c.len());
    for t in &spec.temperatures_c {
        columns.push(FieldSample::for_source(sys, *t, &spec.ionic)?);
    }
    let values = spec
        .ph
        .iter()
        .map(|p| {
            columns
                .iter()
                .map(|s| s.fraction(index, *p) * scale)
                .collect()
        })
        .collect();
    let mut warnings = Vec::new();
    let sea = |s: &FieldSample| s.model == PkModel::CleggWhitfield1995;
    if let IonicSource::Salinity { psu } = spec.ionic {
        if columns.iter().any(sea) {
            warnings.push(seawater_note(psu));
        }
        if let Some(t) = spec
            .temperatures_c
            .iter()
            .zip(&columns)
            .find(|(_, s)| !sea(s) && sys.id == "ammonium")
            .map(|(t, _)| *t)
        {
            warnings.push(outside_note(psu, t));
        }
    }
    Ok(Grid {
        system_name: sys.name.clone(),
        species: sys.species.get(index).cloned().unwrap_or_default(),
        quantity_label: label,
        ph: spec.ph.clone(),
        temperatures_c: spec.temperatures_c.clone(),
        values,
        ionic_strength: ionic,
        warnings,
        cautions: cautions_for(&sys.hazards),
    })
}

fn cell(v: f64) -> String {
    super::csv::format_number(v, false)
}

fn axis(v: f64) -> String {
    super::csv::format_number(v, false)
}

/// The grid as CSV: first column pH, one column per temperature.
pub fn render_csv(g: &Grid) -> String {
    let sep = super::csv::Separator::Comma;
    let mut out = String::new();
    let head: Vec<String> = std::iter::once("pH".to_string())
        .chain(g.temperatures_c.iter().map(|t| format!("{} °C", axis(*t))))
        .collect();
    super::csv::push_row(&mut out, head.iter().map(String::as_str), sep);
    for (p, row) in g.ph.iter().zip(&g.values) {
        let cells: Vec<String> = std::iter::once(axis(*p))
            .chain(row.iter().map(|v| cell(*v)))
            .collect();
        super::csv::push_row(&mut out, cells.iter().map(String::as_str), sep);
    }
    out
}

fn title(g: &Grid) -> String {
    format!(
        "{} — {}, {} (I = {} mol/L)",
        g.system_name,
        g.species,
        g.quantity_label,
        cell(g.ionic_strength)
    )
}

/// The grid as a Markdown table with a title line and notes.
pub fn render_md(g: &Grid) -> String {
    let mut out = format!("**{}**\n\n| pH \\ T |", title(g));
    for t in &g.temperatures_c {
        out.push_str(&format!(" {} °C |", axis(*t)));
    }
    out.push_str("\n|---|");
    for _ in &g.temperatures_c {
        out.push_str("---:|");
    }
    out.push('\n');
    for (p, row) in g.ph.iter().zip(&g.values) {
        out.push_str(&format!("| {} |", axis(*p)));
        for v in row {
            out.push_str(&format!(" {} |", cell(*v)));
        }
        out.push('\n');
    }
    for n in g.warnings.iter().chain(&g.cautions) {
        out.push_str(&format!("\n> {n}\n"));
    }
    out
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// The grid as a standalone HTML page (no scripts, styles inline, no
/// outside requests).
pub fn render_html(g: &Grid) -> String {
    let t = esc(&title(g));
    let mut out = format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
         <title>{t}</title>\n<style>body{{font-family:sans-serif;margin:1.5em}}\
         table{{border-collapse:collapse}}th,td{{border:1px solid #999;padding:.25em .6em;\
         text-align:right}}caption{{font-weight:bold;margin-bottom:.5em;text-align:left}}\
         </style>\n</head>\n<body>\n<table>\n<caption>{t}</caption>\n<thead><tr><th scope=\"col\">pH \\ T</th>"
    );
    for temp in &g.temperatures_c {
        out.push_str(&format!("<th scope=\"col\">{} °C</th>", axis(*temp)));
    }
    out.push_str("</tr></thead>\n<tbody>\n");
    for (p, row) in g.ph.iter().zip(&g.values) {
        out.push_str(&format!("<tr><th scope=\"row\">{}</th>", axis(*p)));
        for v in row {
            out.push_str(&format!("<td>{}</td>", cell(*v)));
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</tbody>\n</table>\n");
    for n in g.warnings.iter().chain(&g.cautions) {
        out.push_str(&format!("<p>{}</p>\n", esc(n)));
    }
    out.push_str("</body>\n</html>\n");
    out
}
