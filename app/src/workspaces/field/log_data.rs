//! A day's log, the pure part: column roles for the mapping table, overrides, and the running summary built chunk by chunk.

use solver::field::log::{Columns, LogPlan, Role, RowOutcome};

/// Rows shown from the start of the log.
pub const FIRST_ROWS: usize = 20;
/// At most this many flagged rows and unreadable rows are listed.
pub const LIST_MAX: usize = 200;

/// The role each column plays (by index), from the columns the solver found.
pub fn roles_per_column(columns: &Columns, width: usize) -> Vec<Option<Role>> {
    let mut v = vec![None; width];
    let mut set = |i: Option<usize>, r: Role| {
        if let Some(slot) = i.and_then(|i| v.get_mut(i)) {
            *slot = Some(r);
        }
    };
    set(columns.label, Role::Label);
    set(Some(columns.ph), Role::Ph);
    set(columns.temperature, Role::Temperature);
    set(columns.total, Role::Total);
    set(columns.conductivity, Role::Conductivity);
    set(columns.salinity, Role::Salinity);
    set(columns.alkalinity, Role::Alkalinity);
    v
}

/// New explicit choices after the user sets column `col` (0-based) to `role`
/// (`None`: ignore the column). `current` is the role the column has now.
pub fn override_choice(
    choices: &[(Role, String)],
    col: usize,
    current: Option<Role>,
    role: Option<Role>,
) -> Vec<(Role, String)> {
    let col_key = (col + 1).to_string();
    let mut out: Vec<(Role, String)> = choices
        .iter()
        .filter(|(r, v)| Some(*r) != role && Some(*r) != current && *v != col_key)
        .cloned()
        .collect();
    if let Some(c) = current.filter(|c| Some(*c) != role) {
        out.push((c, "none".into()));
    }
    if let Some(r) = role {
        out.push((r, col_key));
    }
    out
}

/// One row of the shown table.
#[derive(Debug, Clone, PartialEq)]
pub struct ShownRow {
    /// File line.
    pub line: usize,
    /// Label cell.
    pub label: String,
    /// pH read.
    pub ph: Option<f64>,
    /// Temperature used, °C.
    pub temperature_c: Option<f64>,
    /// Fraction of the form that matters.
    pub fraction: Option<f64>,
    /// The plotted amount.
    pub value: Option<f64>,
    /// Over the limit.
    pub over: bool,
}

/// Everything the page shows of a computed log, built as chunks arrive.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LogSummary {
    /// Rows computed.
    pub done: usize,
    /// Rows in the log.
    pub rows: usize,
    /// The first rows.
    pub first: Vec<ShownRow>,
    /// Rows over the limit (at most [`LIST_MAX`]).
    pub flagged: Vec<ShownRow>,
    /// All rows over the limit.
    pub flagged_count: usize,
    /// Rows that could not be read: (line, reason), at most [`LIST_MAX`].
    pub errors: Vec<(usize, String)>,
    /// All unreadable rows.
    pub error_count: usize,
    /// (row index, plotted value).
    pub points: Vec<(f64, f64)>,
    /// What is plotted.
    pub label: String,
    /// Its unit (axis text).
    pub unit: String,
    /// The limit in the plotted unit.
    pub limit: Option<f64>,
    /// Index of the form that matters.
    pub target: Option<usize>,
}

/// The plotted amount of a row and whether it is over the limit.
fn row_value(r: &solver::field::FieldResult, target: Option<usize>) -> (Option<f64>, bool) {
    if let Some(l) = &r.limit {
        return (Some(l.value_mg_l), l.exceeded);
    }
    let sp = target.and_then(|t| r.species.get(t));
    let v = sp.and_then(|s| s.amounts.first().map(|a| a.mg_l).or(Some(s.fraction)));
    (v, false)
}

impl LogSummary {
    /// An empty summary for a plan.
    pub fn new(plan: &LogPlan) -> Self {
        let target = solver::field::target_species(&plan.options.system).map(|t| t.0);
        let has_total = plan.columns.total.is_some()
            || plan.options.total.is_some()
            || plan.columns.alkalinity.is_some();
        let bases = solver::field::reporting_bases(&plan.options.system);
        let (label, unit, limit) = match &plan.options.limit {
            Some(l) => {
                let (_, basis, _, scale) = l.unit.parts();
                (
                    "the form that matters".to_string(),
                    format!("mg/L as {basis}"),
                    Some(l.value * scale),
                )
            }
            None if has_total && !bases.is_empty() => (
                "the form that matters".to_string(),
                format!("mg/L as {}", bases.first().map_or("", |b| b.0)),
                None,
            ),
            None => (
                "the form that matters".to_string(),
                "share of the total".into(),
                None,
            ),
        };
        LogSummary {
            rows: plan.len(),
            label,
            unit,
            limit,
            target,
            ..Default::default()
        }
    }

    fn shown(&self, plan: &LogPlan, index: usize, o: &RowOutcome) -> ShownRow {
        let spec = plan.spec_of(index).ok();
        let (value, over) = match &o.result {
            Ok(r) => row_value(r, self.target),
            Err(_) => (None, false),
        };
        ShownRow {
            line: o.line,
            label: o.label.clone().unwrap_or_default(),
            ph: spec.as_ref().map(|s| s.ph),
            temperature_c: spec.as_ref().map(|s| s.temperature_c),
            fraction: o.result.as_ref().ok().and_then(|r| {
                self.target
                    .and_then(|t| r.species.get(t))
                    .map(|s| s.fraction)
            }),
            value,
            over,
        }
    }

    /// Take in the outcomes of rows `start..start + outcomes.len()`.
    pub fn add(&mut self, plan: &LogPlan, start: usize, outcomes: &[RowOutcome]) {
        for (k, o) in outcomes.iter().enumerate() {
            let index = start + k;
            match &o.result {
                Ok(r) => {
                    let (value, over) = row_value(r, self.target);
                    if let Some(v) = value.filter(|v| v.is_finite()) {
                        self.points.push((index as f64, v));
                    }
                    if over {
                        self.flagged_count += 1;
                        if self.flagged.len() < LIST_MAX {
                            let s = self.shown(plan, index, o);
                            self.flagged.push(s);
                        }
                    }
                }
                Err(e) => {
                    self.error_count += 1;
                    if self.errors.len() < LIST_MAX {
                        self.errors.push((o.line, e.clone()));
                    }
                }
            }
            if self.first.len() < FIRST_ROWS {
                let s = self.shown(plan, index, o);
                self.first.push(s);
            }
        }
        self.done = start + outcomes.len();
    }
}

/// Append a chunk's CSV (from [`LogPlan::write_csv`]) to the export text: the header only once.
pub fn append_csv(out: &mut String, chunk_csv: &str) {
    if out.is_empty() {
        out.push_str(chunk_csv);
    } else if let Some((_, rest)) = chunk_csv.split_once('\n') {
        out.push_str(rest);
    }
}

#[cfg(test)]
#[allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]
mod tests {
    use super::*;
    use solver::field::limit::{Limit, LimitUnit};
    use solver::field::log::LogOptions;

    fn plan(text: &str, mapping: Vec<(Role, String)>) -> Option<LogPlan> {
        let mut o = LogOptions::new("ammonium");
        o.total = Some(2.0);
        o.limit = Some(Limit {
            value: 0.05,
            unit: LimitUnit::MgPerLNh3,
        });
        o.mapping.choices = mapping;
        LogPlan::new(text.as_bytes(), &o, &[], None).ok()
    }

    const LOG: &str = "time;pH;temp °C\n08:00;7,2;20\n09:00;x;20\n10:00;8,8;25\n";

    #[test]
    fn roles_follow_the_guess_and_overrides_move_them() {
        let p = plan(LOG, vec![]);
        assert!(p.is_some());
        let Some(p) = p else { return };
        let roles = roles_per_column(&p.columns, p.table.header.len());
        assert_eq!(
            roles,
            vec![Some(Role::Label), Some(Role::Ph), Some(Role::Temperature)]
        );
        // Ignore the temperature column: a default is then needed per row.
        let ch = override_choice(&[], 2, Some(Role::Temperature), None);
        assert_eq!(ch, vec![(Role::Temperature, "none".to_string())]);
        let q = plan(LOG, ch);
        assert!(q.is_some_and(|q| q.columns.temperature.is_none()));
        // Setting a column twice keeps one choice for it.
        let ch = override_choice(
            &[(Role::Label, "1".into())],
            0,
            Some(Role::Label),
            Some(Role::Total),
        );
        assert_eq!(
            ch,
            vec![(Role::Label, "none".into()), (Role::Total, "1".into())]
        );
    }

    #[test]
    fn chunks_add_up_to_one_run_and_one_csv() {
        let Some(p) = plan(LOG, vec![]) else { return };
        let mut s = LogSummary::new(&p);
        let mut csv = String::new();
        for start in 0..p.len() {
            let out = p.compute(start..start + 1);
            s.add(&p, start, &out);
            append_csv(&mut csv, &p.write_csv(&out));
        }
        let whole = p.write_csv(&p.compute(0..p.len()));
        assert_eq!(csv, whole);
        assert_eq!(s.done, 3);
        assert_eq!(s.error_count, 1);
        assert_eq!(s.errors[0].0, 3);
        assert_eq!(s.first.len(), 3);
        assert_eq!(s.points.len(), 2);
        // pH 8.8 at 25 °C with 2 mg/L N is far over 0.05 mg/L NH3.
        assert_eq!(s.flagged_count, 1);
        assert_eq!(s.flagged[0].line, 4);
        assert_eq!(s.flagged[0].ph, Some(8.8));
    }
}
