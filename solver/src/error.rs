//! Error type of the solver: every variant names the offending field and value.

use crate::fmt::{clip, quote, QUOTE_MAX};
use std::fmt;

/// Everything that can go wrong in the solver.
///
/// Variants carry the field (a dotted path such as `recipe.target_ph` or a
/// species name) and the value that was refused, so the page can put the
/// message next to the right input.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum SolverError {
    /// A number was NaN or infinite.
    NotFinite {
        /// Field path.
        field: String,
    },
    /// A quantity that must be zero or positive was negative.
    Negative {
        /// Field path.
        field: String,
        /// The value given.
        value: f64,
    },
    /// A value outside the range the data or the model supports.
    OutOfRange {
        /// Field path.
        field: String,
        /// The value given.
        value: f64,
        /// Lowest accepted value.
        min: f64,
        /// Highest accepted value.
        max: f64,
    },
    /// A name that refers to nothing known (system, reagent form, ion...).
    Unknown {
        /// What kind of thing was looked up (`system`, `form`, ...).
        kind: String,
        /// The name given.
        name: String,
    },
    /// A field names a choice that does not exist (a reagent form not in the system).
    UnknownChoice {
        /// Field path of the choice (`recipe.method.acid_form`).
        field: String,
        /// What kind of thing was looked up (`form`).
        kind: String,
        /// The name given.
        name: String,
    },
    /// A chemical formula that could not be parsed.
    BadFormula {
        /// The formula text.
        formula: String,
        /// Byte position of the problem.
        position: usize,
    },
    /// The root finder could not bracket the charge balance.
    NoBracket {
        /// Lower pH searched.
        lo: f64,
        /// Upper pH searched.
        hi: f64,
    },
    /// The iteration did not converge.
    NoConvergence {
        /// Iterations used.
        iterations: u32,
        /// Final residual.
        residual: f64,
    },
    /// A recipe that cannot be made with the chosen reagents.
    Infeasible {
        /// Field path of the choice that makes it impossible.
        field: String,
        /// Plain explanation for the technician.
        reason: String,
    },
    /// A design document could not be read.
    Document {
        /// Field path inside the document (or `document` for syntax errors).
        field: String,
        /// What was wrong.
        reason: String,
    },
}

/// A number as the messages quote it: plain decimals as Rust prints them, but very small or
/// very large magnitudes in exponent form (`1e-300`, not 300 digits that stretch a page).
fn num(v: f64) -> String {
    let a = v.abs();
    if a != 0.0 && a.is_finite() && !(1e-4..1e16).contains(&a) {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}

impl fmt::Display for SolverError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::NotFinite { field } => write!(f, "{}: not a finite number", path(field)),
            Self::Negative { field, value } => {
                write!(
                    f,
                    "{}: must not be negative (got {})",
                    path(field),
                    num(*value)
                )
            }
            Self::OutOfRange {
                field,
                value,
                min,
                max,
            } => write!(
                f,
                "{}: {} is outside {} to {}",
                path(field),
                num(*value),
                num(*min),
                num(*max)
            ),
            Self::Unknown { kind, name } => {
                write!(f, "unknown {} {}", shorten_quoted(kind), quote(name))
            }
            Self::UnknownChoice { field, kind, name } => write!(
                f,
                "unknown {} ({}) {}",
                shorten_quoted(kind),
                path(field),
                quote(name)
            ),
            Self::BadFormula { formula, position } => {
                write!(
                    f,
                    "cannot read formula {} at position {position}",
                    quote(formula)
                )
            }
            Self::NoBracket { lo, hi } => {
                write!(f, "no charge-balance root between pH {lo} and {hi}")
            }
            Self::NoConvergence {
                iterations,
                residual,
            } => write!(
                f,
                "did not converge after {iterations} iterations (residual {residual:e})"
            ),
            Self::Infeasible { field, reason } | Self::Document { field, reason } => {
                write!(f, "{}: {}", path(field), shorten_quoted(reason))
            }
        }
    }
}

impl SolverError {
    /// The field path the error names, if it names one (`recipe.volume_l`, `salts[0].conc_m`).
    ///
    /// ```
    /// use solver::limits::VOLUME_L;
    /// let e = VOLUME_L.check(0.0).unwrap_err();
    /// assert_eq!(e.field(), Some("volume_l"));
    /// ```
    pub fn field(&self) -> Option<&str> {
        match self {
            Self::NotFinite { field }
            | Self::Negative { field, .. }
            | Self::OutOfRange { field, .. }
            | Self::Infeasible { field, .. }
            | Self::Document { field, .. }
            | Self::UnknownChoice { field, .. } => Some(field),
            _ => None,
        }
    }

    /// The same error with its field path rewritten by `f`.
    pub fn map_field(self, f: impl Fn(&str) -> String) -> Self {
        match self {
            Self::NotFinite { field } => Self::NotFinite { field: f(&field) },
            Self::Negative { field, value } => Self::Negative {
                field: f(&field),
                value,
            },
            Self::OutOfRange {
                field,
                value,
                min,
                max,
            } => Self::OutOfRange {
                field: f(&field),
                value,
                min,
                max,
            },
            Self::Infeasible { field, reason } => Self::Infeasible {
                field: f(&field),
                reason,
            },
            Self::Document { field, reason } => Self::Document {
                field: f(&field),
                reason,
            },
            Self::UnknownChoice { field, kind, name } => Self::UnknownChoice {
                field: f(&field),
                kind,
                name,
            },
            other => other,
        }
    }

    /// Replace the leading `from` of the field path by `to` (`system.steps[1]` →
    /// `custom_systems[0].steps[1]` with `from = "system"`, `to = "custom_systems[0]"`); a
    /// path that does not start with `from` is put under `to`.
    pub fn reroot(self, from: &str, to: &str) -> Self {
        self.map_field(|f| match f.strip_prefix(from) {
            Some(rest) if rest.is_empty() || rest.starts_with(['.', '[']) => format!("{to}{rest}"),
            _ => format!("{to}.{f}"),
        })
    }
}

impl std::error::Error for SolverError {}

/// Most characters of a field path that a message shows.
const PATH_MAX: usize = 120;

/// Most characters of a reason that a message shows.
const REASON_MAX: usize = 300;

fn path(field: &str) -> String {
    clip(field, PATH_MAX)
}

/// A message with every quoted run (`"…"` or `` `…` ``, as serde quotes the
/// offending value) cut to [`QUOTE_MAX`] characters, and the whole message
/// to a few hundred, so a huge input never comes back whole.
pub fn shorten_quoted(msg: &str) -> String {
    let mut out = String::with_capacity(msg.len().min(REASON_MAX + 8));
    let mut rest = msg;
    while let Some(open) = rest.find(['"', '`']) {
        let (before, tail) = rest.split_at(open);
        out.push_str(before);
        let mut chars = tail.chars();
        let q = chars.next().unwrap_or('"');
        let inner = chars.as_str();
        match inner.find(q) {
            Some(close) => {
                out.push(q);
                out.push_str(&clip(&inner[..close], QUOTE_MAX));
                out.push(q);
                rest = &inner[close + q.len_utf8()..];
            }
            None => {
                out.push(q);
                out.push_str(&clip(inner, QUOTE_MAX));
                rest = "";
            }
        }
    }
    out.push_str(rest);
    clip(&out, REASON_MAX)
}

/// Result alias used throughout the crate.
pub type Result<T> = std::result::Result<T, SolverError>;

/// Reject NaN and infinities, naming the field.
pub(crate) fn finite(field: &str, v: f64) -> Result<f64> {
    if v.is_finite() {
        Ok(v)
    } else {
        Err(SolverError::NotFinite {
            field: field.to_string(),
        })
    }
}

/// Reject negative, NaN and infinite values, naming the field.
pub(crate) fn non_negative(field: &str, v: f64) -> Result<f64> {
    let v = finite(field, v)?;
    if v < 0.0 {
        Err(SolverError::Negative {
            field: field.to_string(),
            value: v,
        })
    } else {
        Ok(v)
    }
}

/// Reject values outside `[min, max]`, naming the field.
pub(crate) fn in_range(field: &str, v: f64, min: f64, max: f64) -> Result<f64> {
    let v = finite(field, v)?;
    if v < min || v > max {
        Err(SolverError::OutOfRange {
            field: field.to_string(),
            value: v,
            min,
            max,
        })
    } else {
        Ok(v)
    }
}
