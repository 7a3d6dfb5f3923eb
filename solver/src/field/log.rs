//! Field logs: a CSV of readings → one field reading per row, results as CSV (input columns + computed ones).
//!
//! Columns are guessed from the header names (case and units ignored):
//!
//! | role | header words |
//! |---|---|
//! | alkalinity | `alk…` (`meq` in the header: meq/L, else mg/L as CaCO₃) |
//! | conductivity | `cond…`, `EC`, `SpC`, `SC`, a `µS`/`mS` unit (`mS`: × 1000) |
//! | salinity | `sal…`, `PSU`, `ppt`, `‰` |
//! | pH | `pH` (not `pH mV`) |
//! | temperature | `temp…`, `T`, `WT`, `°C` (`°F`/`degF`/`Fahrenheit`: converted) |
//! | total | `total…`, `TAN`, `NH3-N`, `ammonia`, `sulfide`, `chlorine`, `DIC`, `conc…` (`mmol`, `µmol` in the header set the unit) |
//! | label | `time`, `date`, `timestamp`, `label`, `sample`, `id`, `site`, `tank`, `station`, `name` |
//!
//! in that order of precedence; two columns guessed for one role (other than
//! the label) is an error that asks for an explicit [`ColumnMapping`]. A row's
//! ionic strength comes from its salinity if there is one, else its
//! conductivity, else [`LogOptions::ionic`]; an empty temperature or total
//! cell falls back to the options. Every row gives a result or an error with
//! its line number; none is dropped.
//!
//! The work can be done in chunks ([`LogPlan::compute`] over a range of rows)
//! so the page can show progress.

use super::carbonate::{Alkalinity, AlkalinityUnit};
use super::csv::{
    decode, parse, parse_number, push_field, push_row, write_number, Separator, Table,
};
use super::ionic::IonicSource;
use super::limit::Limit;
use super::reading::{
    field_reading, field_reading_cached, reporting_bases, FieldResult, FieldSpec, TotalUnit,
};
use super::sample::{target_species, FieldCache};
use crate::error::{Result, SolverError};
use crate::fmt::ascii_name;
use crate::mixture::lookup;
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};
use std::ops::Range;

/// What a column holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Role {
    /// Time, date or sample label (kept, shown in messages).
    Label,
    /// Measured pH.
    Ph,
    /// Sample temperature.
    Temperature,
    /// Total of the system.
    Total,
    /// Specific conductance.
    Conductivity,
    /// Practical salinity.
    Salinity,
    /// Total alkalinity.
    Alkalinity,
}

impl Role {
    /// Every role, in guessing precedence.
    pub const ALL: [Role; 7] = [
        Role::Alkalinity,
        Role::Conductivity,
        Role::Salinity,
        Role::Ph,
        Role::Temperature,
        Role::Total,
        Role::Label,
    ];

    /// Name used in messages and in the CLI's `--col ROLE=HEADER`.
    pub fn key(self) -> &'static str {
        match self {
            Role::Label => "label",
            Role::Ph => "ph",
            Role::Temperature => "temperature",
            Role::Total => "total",
            Role::Conductivity => "conductivity",
            Role::Salinity => "salinity",
            Role::Alkalinity => "alkalinity",
        }
    }

    /// Parse a role name.
    pub fn from_key(key: &str) -> Option<Role> {
        Role::ALL.iter().copied().find(|r| r.key() == key)
    }
}

/// Explicit column choices that override the guess: for a role, a header
/// name (case-insensitive) or a 1-based column number; `"none"` ignores
/// the guessed column.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ColumnMapping {
    /// (role, header name or column number or `none`).
    #[serde(default)]
    pub choices: Vec<(Role, String)>,
}

/// Options of a log run: the system and the defaults rows fall back on.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LogOptions {
    /// System id.
    pub system: String,
    /// Temperature for rows without one, °C.
    #[serde(default)]
    pub temperature_c: Option<f64>,
    /// Total for rows without one.
    #[serde(default)]
    pub total: Option<f64>,
    /// Unit of totals (a `mmol`/`µmol` header overrides it).
    pub total_unit: TotalUnit,
    /// Ionic strength for rows without salinity or conductivity.
    pub ionic: IonicSource,
    /// Unit of an alkalinity column whose header names none.
    pub alkalinity_unit: AlkalinityUnit,
    /// Limit applied to every row.
    #[serde(default)]
    pub limit: Option<Limit>,
    /// Column choices.
    #[serde(default)]
    pub mapping: ColumnMapping,
}

impl LogOptions {
    /// Options for a system with no defaults: I = 0, mg/L totals, alkalinity as CaCO₃.
    pub fn new(system: &str) -> Self {
        Self {
            system: system.into(),
            temperature_c: None,
            total: None,
            total_unit: TotalUnit::MgPerLAs,
            ionic: IonicSource::Zero,
            alkalinity_unit: AlkalinityUnit::MgPerLCaco3,
            limit: None,
            mapping: ColumnMapping::default(),
        }
    }
}

/// The columns found, with the units read from their headers.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Columns {
    /// Label column.
    pub label: Option<usize>,
    /// pH column.
    pub ph: usize,
    /// Temperature column.
    pub temperature: Option<usize>,
    /// The temperature header says °F.
    pub fahrenheit: bool,
    /// Total column.
    pub total: Option<usize>,
    /// Unit of the total column (from its header, else the options).
    pub total_unit: Option<TotalUnit>,
    /// Conductivity column.
    pub conductivity: Option<usize>,
    /// Multiplier to µS/cm (1000 for a mS/cm header).
    pub conductivity_scale: f64,
    /// Salinity column.
    pub salinity: Option<usize>,
    /// Alkalinity column.
    pub alkalinity: Option<usize>,
    /// Unit of the alkalinity column.
    pub alkalinity_unit: Option<AlkalinityUnit>,
}

fn tokens(header: &str) -> Vec<String> {
    header
        .to_ascii_lowercase()
        .split(|c: char| !c.is_alphanumeric())
        .filter(|t| !t.is_empty())
        .map(str::to_string)
        .collect()
}

/// The role a header name suggests, if any.
pub fn guess_role(header: &str) -> Option<Role> {
    let t = tokens(header);
    let raw = header.to_ascii_lowercase();
    let any = |f: &dyn Fn(&str) -> bool| t.iter().any(|s| f(s));
    let has = |w: &str| t.iter().any(|s| s == w);
    if any(&|s| s.starts_with("alk")) {
        return Some(Role::Alkalinity);
    }
    if any(&|s| s.starts_with("cond") || s.starts_with("leitf"))
        || ["ec", "spc", "spcond", "sc", "µs", "us", "ms"]
            .iter()
            .any(|w| has(w))
    {
        return Some(Role::Conductivity);
    }
    if any(&|s| s.starts_with("sal")) || has("psu") || has("ppt") || raw.contains('‰') {
        return Some(Role::Salinity);
    }
    if has("ph") && !has("mv") {
        return Some(Role::Ph);
    }
    if any(&|s| s.starts_with("temp"))
        || has("t")
        || has("wt")
        || raw.contains("°c")
        || raw.contains("°f")
        || has("degc")
        || has("degf")
    {
        return Some(Role::Temperature);
    }
    if any(&|s| s.starts_with("total") || s.starts_with("conc"))
        || [
            "tan", "nh3", "nh4", "ammonia", "sulfide", "sulphide", "chlorine", "cl2", "dic",
        ]
        .iter()
        .any(|w| has(w))
    {
        return Some(Role::Total);
    }
    if [
        "time",
        "date",
        "datetime",
        "timestamp",
        "label",
        "sample",
        "id",
        "site",
        "tank",
        "station",
        "name",
        "zeit",
        "datum",
    ]
    .iter()
    .any(|w| has(w))
    {
        return Some(Role::Label);
    }
    None
}

fn doc(field: &str, reason: impl Into<String>) -> SolverError {
    SolverError::Document {
        field: field.into(),
        reason: reason.into(),
    }
}

/// Find the columns of a header: guesses, then the mapping's choices.
///
/// # Errors
///
/// No pH column; two columns guessed for one role; a mapping naming a
/// column that does not exist.
pub fn find_columns(header: &[String], mapping: &ColumnMapping) -> Result<Columns> {
    let mut chosen: Vec<(Role, Option<usize>)> = Vec::new();
    for (role, pick) in &mapping.choices {
        let p = pick.trim();
        let idx = if p.eq_ignore_ascii_case("none") {
            None
        } else if let Some(i) = header.iter().position(|h| h.eq_ignore_ascii_case(p)) {
            Some(i)
        } else if let Ok(n) = p.parse::<usize>() {
            if n == 0 || n > header.len() {
                return Err(doc(
                    &format!("mapping.{}", role.key()),
                    format!("there is no column {n} (the file has {})", header.len()),
                ));
            }
            Some(n - 1)
        } else {
            return Err(doc(
                &format!("mapping.{}", role.key()),
                format!(
                    "no column is named \"{p}\" (columns: {})",
                    header.join(", ")
                ),
            ));
        };
        chosen.push((*role, idx));
    }
    let explicit = |r: Role| chosen.iter().find(|c| c.0 == r).map(|c| c.1);
    let taken: Vec<usize> = chosen.iter().filter_map(|c| c.1).collect();
    let col = |role: Role| -> Result<Option<usize>> {
        if let Some(e) = explicit(role) {
            return Ok(e);
        }
        let hits: Vec<usize> = header
            .iter()
            .enumerate()
            .filter(|(i, h)| !taken.contains(i) && guess_role(h) == Some(role))
            .map(|(i, _)| i)
            .collect();
        match hits.as_slice() {
            [] => Ok(None),
            [one] => Ok(Some(*one)),
            [first, ..] if role == Role::Label => Ok(Some(*first)),
            many => Err(doc(
                &format!("mapping.{}", role.key()),
                format!(
                    "several columns look like {}: {}; say which one to use",
                    role.key(),
                    many.iter()
                        .filter_map(|i| header.get(*i))
                        .map(|h| format!("\"{h}\""))
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            )),
        }
    };
    let ph = col(Role::Ph)?.ok_or_else(|| {
        doc(
            "mapping.ph",
            format!(
                "no pH column found (columns: {}); name it \"pH\" or say which column holds pH",
                header.join(", ")
            ),
        )
    })?;
    let temperature = col(Role::Temperature)?;
    let total = col(Role::Total)?;
    let conductivity = col(Role::Conductivity)?;
    let salinity = col(Role::Salinity)?;
    let alkalinity = col(Role::Alkalinity)?;
    let label = col(Role::Label)?;
    let toks = |i: Option<usize>| {
        i.and_then(|i| header.get(i))
            .map(|h| tokens(h))
            .unwrap_or_default()
    };
    let raw = |i: Option<usize>| {
        i.and_then(|i| header.get(i))
            .map(|h| h.to_ascii_lowercase())
            .unwrap_or_default()
    };
    let tt = toks(temperature);
    let fahrenheit =
        raw(temperature).contains("°f") || tt.iter().any(|t| t == "degf" || t == "fahrenheit");
    let ct = toks(conductivity);
    let conductivity_scale = if ct.iter().any(|t| t == "ms") {
        1000.0
    } else {
        1.0
    };
    let tot = toks(total);
    let total_unit = if tot.iter().any(|t| t == "mmol") {
        Some(TotalUnit::MmolPerL)
    } else if tot.iter().any(|t| t == "µmol" || t == "umol") {
        Some(TotalUnit::UmolPerL)
    } else {
        None
    };
    let at = toks(alkalinity);
    let alkalinity_unit = if at.iter().any(|t| t == "meq") {
        Some(AlkalinityUnit::MeqPerL)
    } else if at.iter().any(|t| t == "caco3") {
        Some(AlkalinityUnit::MgPerLCaco3)
    } else {
        None
    };
    Ok(Columns {
        label,
        ph,
        temperature,
        fahrenheit,
        total,
        total_unit,
        conductivity,
        conductivity_scale,
        salinity,
        alkalinity,
        alkalinity_unit,
    })
}

/// The outcome of one row.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RowOutcome {
    /// Line of the file (the header is line 1).
    pub line: usize,
    /// The row's label cell, if there is a label column.
    pub label: Option<String>,
    /// The reading, or why the row could not be computed.
    pub result: std::result::Result<FieldResult, String>,
}

/// A log ready to compute: the table, its columns and the options.
#[derive(Debug, Clone)]
pub struct LogPlan {
    /// The parsed table.
    pub table: Table,
    /// Columns found.
    pub columns: Columns,
    /// Options.
    pub options: LogOptions,
    custom: Vec<AcidSystem>,
    species_ascii: Vec<String>,
    steps: usize,
}

/// Basis label in ASCII (`NH₃` → `NH3`, `Cl₂` → `Cl2`).
fn ascii_basis(b: &str) -> String {
    ascii_name(b)
}

impl LogPlan {
    /// Decode, parse and map a log file.
    ///
    /// # Errors
    ///
    /// File-level problems (too big, binary, no header, no pH column, an
    /// ambiguous column) and an unknown system; row problems come later,
    /// per row.
    pub fn new(
        bytes: &[u8],
        options: &LogOptions,
        custom: &[AcidSystem],
        separator: Option<Separator>,
    ) -> Result<LogPlan> {
        let sys = lookup(&options.system, custom)?;
        let text = decode(bytes)?;
        let table = parse(&text, separator)?;
        let columns = find_columns(&table.header, &options.mapping)?;
        Ok(LogPlan {
            species_ascii: sys.species.iter().map(|s| ascii_name(s)).collect(),
            steps: sys.steps.len(),
            table,
            columns,
            options: options.clone(),
            custom: custom.to_vec(),
        })
    }

    /// Number of data rows.
    pub fn len(&self) -> usize {
        self.table.rows.len()
    }

    /// Whether there are no data rows.
    pub fn is_empty(&self) -> bool {
        self.table.rows.is_empty()
    }

    fn number(
        &self,
        fields: &[String],
        col: Option<usize>,
        role: Role,
    ) -> std::result::Result<Option<f64>, String> {
        let Some(i) = col else { return Ok(None) };
        let cell = fields.get(i).map(String::as_str).unwrap_or("");
        parse_number(cell, self.table.decimal_comma).map_err(|e| {
            let name = self.table.header.get(i).map(String::as_str).unwrap_or("?");
            format!("column \"{name}\" ({}): {e}", role.key())
        })
    }

    fn row_spec(&self, fields: &[String]) -> std::result::Result<FieldSpec, String> {
        let c = &self.columns;
        let o = &self.options;
        if fields.len() > self.table.header.len() {
            return Err(format!(
                "{} fields but the header has {} columns (an unquoted separator?)",
                fields.len(),
                self.table.header.len()
            ));
        }
        let ph = self
            .number(fields, Some(c.ph), Role::Ph)?
            .ok_or_else(|| "no pH in this row".to_string())?;
        let temperature_c = match self.number(fields, c.temperature, Role::Temperature)? {
            Some(t) if c.fahrenheit => (t - 32.0) * 5.0 / 9.0,
            Some(t) => t,
            None => o.temperature_c.ok_or_else(|| {
                "no temperature in this row and no default temperature given".to_string()
            })?,
        };
        let (total, total_unit) = match self.number(fields, c.total, Role::Total)? {
            Some(t) => (Some(t), c.total_unit.unwrap_or(o.total_unit)),
            None => (o.total, o.total_unit),
        };
        let ionic = if let Some(s) = self.number(fields, c.salinity, Role::Salinity)? {
            IonicSource::Salinity { psu: s }
        } else if let Some(k) = self.number(fields, c.conductivity, Role::Conductivity)? {
            IonicSource::Conductivity {
                us_cm: k * c.conductivity_scale,
            }
        } else {
            o.ionic
        };
        let alkalinity = self
            .number(fields, c.alkalinity, Role::Alkalinity)?
            .map(|value| Alkalinity {
                value,
                unit: c.alkalinity_unit.unwrap_or(o.alkalinity_unit),
            });
        // An alkalinity replaces a default total (a total cell in the same row is refused).
        let total = if alkalinity.is_some()
            && c.total
                .is_none_or(|i| fields.get(i).is_none_or(|f| f.trim().is_empty()))
        {
            None
        } else {
            total
        };
        Ok(FieldSpec {
            system: o.system.clone(),
            ph,
            temperature_c,
            total,
            total_unit,
            ionic,
            alkalinity,
            limit: o.limit,
        })
    }

    /// The field reading a row asks for, or why it cannot be read.
    ///
    /// # Errors
    ///
    /// The row's problem as text.
    pub fn spec_of(&self, row: usize) -> std::result::Result<FieldSpec, String> {
        match self.table.rows.get(row) {
            Some(r) => self.row_spec(&r.fields),
            None => Err(format!("no row {row}")),
        }
    }

    /// Compute rows `range` (clamped to the table), in order.
    ///
    /// The system's constants are worked out once per distinct temperature
    /// in the range ([`FieldCache`]); every row's result is the one
    /// [`field_reading`] gives for [`LogPlan::spec_of`] that row, number for
    /// number ([`LogPlan::compute_each`] is that reference path).
    pub fn compute(&self, range: Range<usize>) -> Vec<RowOutcome> {
        let mut cache = FieldCache::new();
        self.outcomes(range, |s| field_reading_cached(s, &self.custom, &mut cache))
    }

    /// Compute rows `range` one single reading at a time ([`field_reading`]
    /// per row, nothing kept between rows): the reference the faster
    /// [`LogPlan::compute`] is tested against.
    pub fn compute_each(&self, range: Range<usize>) -> Vec<RowOutcome> {
        self.outcomes(range, |s| field_reading(s, &self.custom))
    }

    fn outcomes(
        &self,
        range: Range<usize>,
        mut read: impl FnMut(&FieldSpec) -> Result<FieldResult>,
    ) -> Vec<RowOutcome> {
        let end = range.end.min(self.len());
        let start = range.start.min(end);
        self.table
            .rows
            .get(start..end)
            .unwrap_or(&[])
            .iter()
            .map(|r| RowOutcome {
                line: r.line,
                label: self
                    .columns
                    .label
                    .and_then(|i| r.fields.get(i))
                    .map(|s| s.trim().to_string()),
                result: self
                    .row_spec(&r.fields)
                    .and_then(|s| read(&s).map_err(|e| e.to_string())),
            })
            .collect()
    }

    fn has_totals(&self) -> bool {
        self.columns.total.is_some()
            || self.options.total.is_some()
            || self.columns.alkalinity.is_some()
    }

    fn has_carbonate(&self) -> bool {
        self.options.system == "carbonate" && self.columns.alkalinity.is_some()
    }

    /// Names of the computed columns, in output order.
    pub fn computed_header(&self) -> Vec<String> {
        let mut h = vec!["ionic_strength_mol_l".to_string()];
        if self.steps == 1 {
            h.push("pk_apparent".into());
        } else {
            for i in 0..self.steps {
                h.push(format!("pk{}_apparent", i + 1));
            }
        }
        for s in &self.species_ascii {
            h.push(format!("fraction_{s}"));
        }
        if self.has_totals() {
            let bases = reporting_bases(&self.options.system);
            let targets: Vec<usize> = match target_species(&self.options.system) {
                Some((t, _)) => vec![t],
                None => (0..self.species_ascii.len()).collect(),
            };
            for t in targets {
                let name = self.species_ascii.get(t).cloned().unwrap_or_default();
                if bases.is_empty() {
                    h.push(format!("{name}_mmol_l"));
                }
                for (b, _) in bases {
                    h.push(format!("{name}_mg_l_as_{}", ascii_basis(b)));
                }
            }
        }
        if self.has_carbonate() {
            for k in ["dic_mmol_l", "free_co2_mg_l", "hco3_mg_l", "co3_mg_l"] {
                h.push(k.into());
            }
        }
        if let Some(l) = &self.options.limit {
            let (_, basis, ..) = l.unit.parts();
            h.push(format!("limit_amount_mg_l_as_{}", ascii_basis(basis)));
            for k in ["limit_exceeded", "limit_ratio", "crossing_ph"] {
                h.push(k.into());
            }
        }
        h.push("warnings".into());
        h.push("error".into());
        h
    }

    /// Append the computed cells of one row (each preceded by the separator).
    fn write_computed(&self, out: &mut String, outcome: &RowOutcome, n: usize) {
        let sep = self.table.separator;
        let dc = self.table.decimal_comma;
        let num = |out: &mut String, v: Option<f64>| {
            out.push(sep.char());
            if let Some(v) = v {
                write_number(out, v, dc);
            }
        };
        let r = match &outcome.result {
            Ok(r) => r,
            Err(e) => {
                for _ in 0..n.saturating_sub(1) {
                    out.push(sep.char());
                }
                out.push(sep.char());
                push_field(out, e, sep);
                return;
            }
        };
        num(out, Some(r.ionic_strength));
        for p in &r.apparent_pks {
            num(out, Some(*p));
        }
        for s in &r.species {
            num(out, Some(s.fraction));
        }
        if self.has_totals() {
            let bases = reporting_bases(&self.options.system);
            let targets = match target_species(&self.options.system) {
                Some((t, _)) => t..t + 1,
                None => 0..r.species.len(),
            };
            for t in targets {
                let sp = r.species.get(t);
                if bases.is_empty() {
                    num(out, sp.and_then(|s| s.conc_m).map(|c| c * 1000.0));
                }
                for k in 0..bases.len() {
                    num(out, sp.and_then(|s| s.amounts.get(k)).map(|a| a.mg_l));
                }
            }
        }
        if self.has_carbonate() {
            let c = r.carbonate.as_ref();
            num(out, c.map(|c| c.dic_mmol_l));
            num(out, c.map(|c| c.free_co2_mg_l));
            num(out, c.map(|c| c.hco3_mg_l));
            num(out, c.map(|c| c.co3_mg_l));
        }
        if self.options.limit.is_some() {
            let l = r.limit.as_ref();
            num(out, l.map(|l| l.value_mg_l));
            out.push(sep.char());
            if let Some(l) = l {
                out.push_str(if l.exceeded { "yes" } else { "no" });
            }
            num(out, l.map(|l| l.ratio));
            num(out, l.and_then(|l| l.crossing_ph));
        }
        out.push(sep.char());
        if !r.warnings.is_empty() {
            push_field(out, &r.warnings.join(" "), sep);
        }
        out.push(sep.char());
    }

    /// Write the results as CSV: the input header and cells as read, then
    /// the computed columns; same separator and decimal mark as the input.
    /// `outcomes` are rows of this plan (from [`LogPlan::compute`]).
    pub fn write_csv(&self, outcomes: &[RowOutcome]) -> String {
        let sep = self.table.separator;
        let width = self.table.header.len();
        let computed = self.computed_header();
        let n = computed.len();
        let head: Vec<String> = self.table.header.iter().cloned().chain(computed).collect();
        let mut out = String::with_capacity(200 + outcomes.len() * (width * 10 + n * 11));
        push_row(&mut out, head.iter().map(String::as_str), sep);
        let mut by_line = self.table.rows.iter().peekable();
        for o in outcomes {
            // Rows are looked up by line; outcomes come in file order.
            let fields = loop {
                match by_line.next() {
                    Some(r) if r.line == o.line => break Some(&r.fields),
                    Some(_) => continue,
                    None => break None,
                }
            };
            for k in 0..width {
                if k > 0 {
                    out.push(sep.char());
                }
                if let Some(f) = fields.and_then(|f| f.get(k)) {
                    push_field(&mut out, f, sep);
                }
            }
            self.write_computed(&mut out, o, n);
            out.push('\n');
        }
        out
    }
}

/// Everything a whole-file run gives.
#[derive(Debug, Clone)]
pub struct LogRun {
    /// Results as CSV text.
    pub csv: String,
    /// Data rows read.
    pub rows: usize,
    /// Rows that could not be computed: (line, reason).
    pub errors: Vec<(usize, String)>,
    /// Blank lines skipped.
    pub blank_lines: usize,
    /// Columns used.
    pub columns: Columns,
}

/// Read and compute a whole log in one call.
///
/// # Errors
///
/// As [`LogPlan::new`].
pub fn run_log(
    bytes: &[u8],
    options: &LogOptions,
    custom: &[AcidSystem],
    separator: Option<Separator>,
) -> Result<LogRun> {
    let plan = LogPlan::new(bytes, options, custom, separator)?;
    let outcomes = plan.compute(0..plan.len());
    let errors = outcomes
        .iter()
        .filter_map(|o| o.result.as_ref().err().map(|e| (o.line, e.clone())))
        .collect();
    Ok(LogRun {
        csv: plan.write_csv(&outcomes),
        rows: plan.len(),
        errors,
        blank_lines: plan.table.blank_lines,
        columns: plan.columns.clone(),
    })
}
