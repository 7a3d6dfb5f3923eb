//! Reading what technicians type and writing solver numbers for people.
//!
//! Parsing is strict so nothing malformed ever reaches the solver: empty
//! text, words, `inf`/`NaN`, negative values and values outside a field's
//! [`Rule`] all come back as a message for the field. A comma decimal mark
//! (`7,4`) is accepted. Display helpers never compute chemistry; they only
//! round and pick units for numbers the solver returned.

use solver::fmt::{clip, sig, trim_zeros};
use solver::limits;
use solver::SolverError;

/// A unit a field can be entered in: its label and the factor to the base unit
/// (value in base unit = typed value × factor).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Unit {
    /// Label shown in the unit picker.
    pub label: &'static str,
    /// Multiply by this to get the base unit.
    pub factor: f64,
}

/// Concentration units (base: mol/L).
pub const CONC_UNITS: &[Unit] = &[
    Unit {
        label: "M",
        factor: 1.0,
    },
    Unit {
        label: "mM",
        factor: 1e-3,
    },
    Unit {
        label: "µM",
        factor: 1e-6,
    },
];

/// Volume units (base: L).
pub const VOLUME_UNITS: &[Unit] = &[
    Unit {
        label: "mL",
        factor: 1e-3,
    },
    Unit {
        label: "L",
        factor: 1.0,
    },
];

/// What a field accepts, in base units, and what to say otherwise: an entry of the
/// solver's rulebook ([`solver::limits`]), so the page and the solver refuse the same values.
pub use solver::limits::Limit as Rule;

/// pH on the activity scale.
pub const PH: Rule = limits::TARGET_PH;
/// Temperature, °C: the water data cover 0–60 °C.
pub const TEMPERATURE: Rule = limits::TEMPERATURE_C;
/// Total buffer concentration, mol/L (must be above zero).
pub const BUFFER_CONC: Rule = limits::TOTAL_CONC_M;
/// An amount that may be zero, mol/L.
pub const AMOUNT: Rule = limits::COMPONENT_CONC_M;
/// Final volume, L.
pub const VOLUME: Rule = limits::VOLUME_L;
/// Tolerance window half-width, pH units.
pub const TOLERANCE: Rule = limits::TOLERANCE_PH;
/// Stock or titrant molarity, mol/L.
pub const STOCK: Rule = limits::TITRANT_M;
/// Concentrate factor of a recipe (1 = made at working strength).
pub const CONCENTRATE: Rule = limits::CONCENTRATE_FACTOR;
/// Dilution factor.
pub const DILUTION: Rule = limits::DILUTION_FACTOR;
/// A field total (mg/L or mmol/L or µmol/L).
pub const FIELD_TOTAL: Rule = limits::FIELD_TOTAL;
/// Ionic strength typed directly, mol/L.
pub const IONIC: Rule = limits::IONIC_STRENGTH;
/// Specific conductance, µS/cm.
pub const CONDUCTIVITY: Rule = limits::CONDUCTIVITY_US_CM;
/// Total dissolved solids, mg/L.
pub const TDS: Rule = limits::TDS_MG_L;

/// At most this many characters of a bad value are quoted back in a message.
pub const QUOTE_CHARS: usize = solver::fmt::QUOTE_MAX;

/// Quote a user's text in a message: at most [`QUOTE_CHARS`] characters, with
/// an ellipsis when cut, so a pasted novel never becomes a novel-sized message.
pub fn quote(text: &str) -> String {
    format!("“{}”", clip(text.trim(), QUOTE_CHARS))
}

/// Parse a typed number: trims, accepts a comma or a point as the decimal mark
/// and a typographic minus; refuses empty text, words and non-finite values.
///
/// Same as [`parse_number_in`] with no decimal comma seen elsewhere.
///
/// # Errors
///
/// A message for the field.
pub fn parse_number(text: &str) -> Result<f64, String> {
    parse_number_in(text, false)
}

/// Whether `text` uses a comma as its decimal mark (`7,4`, `0,15`), so that
/// the rest of the entry can be read in that convention.
pub fn uses_decimal_comma(text: &str) -> bool {
    let t = text.trim();
    t.contains(',') && !t.contains('.') && parse_number_in(t, true).is_ok()
}

/// Digits before and after a single separator, when `t` is `[-+]digits SEP digits`.
fn split_once_digits(t: &str, sep: char) -> Option<(&str, &str)> {
    let body = t.strip_prefix(['-', '+']).unwrap_or(t);
    let (a, b) = body.split_once(sep)?;
    let digits = |s: &str| !s.is_empty() && s.chars().all(|c| c.is_ascii_digit());
    (digits(a) && digits(b)).then_some((a, b))
}

/// `1,000` (or, where a comma is the decimal mark elsewhere in the entry,
/// `1.000`) could be a thousands separator or a decimal mark: the two readings
/// differ by a factor of 1,000, so neither is guessed.
fn ambiguous_grouping(t: &str, sep: char) -> Option<String> {
    let (int, frac) = split_once_digits(t, sep)?;
    let grouped = frac.len() == 3 && int.len() <= 3 && !int.starts_with('0');
    if !grouped {
        return None;
    }
    let sign = if t.starts_with('-') { "-" } else { "" };
    let whole = format!("{sign}{int}{frac}");
    let decimal = trim_zeros(&format!("{sign}{int}.{frac}"));
    let decimal = if decimal.contains('.') {
        decimal
    } else {
        format!("{decimal}.0")
    };
    Some(format!(
        "“{t}” could be {whole} or {decimal}: type {whole} without a separator, or {decimal} with a point."
    ))
}

/// Parse a typed number as [`parse_number`] does. `comma_decimal_elsewhere`
/// says a decimal comma was used in another field of this entry: then `1.000`
/// is as ambiguous as `1,000` and is refused too.
///
/// # Errors
///
/// A message for the field; an ambiguous `1,000` offers both readings.
pub fn parse_number_in(text: &str, comma_decimal_elsewhere: bool) -> Result<f64, String> {
    let t = text.trim().replace('\u{2212}', "-");
    if t.is_empty() {
        return Err("Enter a value.".into());
    }
    if t.contains(',') && t.contains('.') {
        return Err(format!(
            "{}: use one decimal mark, a comma or a point, and no thousands separators.",
            quote(&t)
        ));
    }
    if t.matches(',').count() > 1 || t.matches('.').count() > 1 {
        let body = t.strip_prefix('-').unwrap_or(&t);
        let groups: Vec<&str> = body.split([',', '.']).collect();
        let digits = |g: &str| !g.is_empty() && g.chars().all(|c| c.is_ascii_digit());
        let looks_grouped = groups.iter().all(|g| digits(g))
            && groups.iter().skip(1).all(|g| g.len() == 3)
            && groups.first().is_some_and(|g| g.len() <= 3);
        if looks_grouped {
            let sign = if t.starts_with('-') { "-" } else { "" };
            return Err(format!(
                "{} is not a number: type {sign}{} without separators if that is what you mean.",
                quote(&t),
                groups.concat()
            ));
        }
        return Err(format!("{} is not a number.", quote(&t)));
    }
    if t.chars().any(char::is_whitespace) {
        let joined: String = t.chars().filter(|c| !c.is_whitespace()).collect();
        return Err(format!(
            "{} has a space in it: type {} if that is what you mean.",
            quote(&t),
            quote(&joined)
        ));
    }
    if let Some(msg) = ambiguous_grouping(&t, ',') {
        return Err(msg);
    }
    if comma_decimal_elsewhere {
        if let Some(msg) = ambiguous_grouping(&t, '.') {
            return Err(msg);
        }
    }
    let t = t.replace(',', ".");
    let allowed = |c: char| c.is_ascii_digit() || matches!(c, '.' | '-' | '+' | 'e' | 'E');
    if !t.chars().all(allowed) || !t.chars().any(|c| c.is_ascii_digit()) {
        return Err(format!("{} is not a number.", quote(text)));
    }
    match t.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(if v == 0.0 { 0.0 } else { v }),
        _ => Err(format!("{} is not a number.", quote(text))),
    }
}

/// Check typed text against a rule; `factor` converts the typed unit to the base unit.
///
/// # Errors
///
/// A message for the field.
pub fn check(text: &str, rule: Rule, factor: f64) -> Result<f64, String> {
    check_in(text, rule, factor, false)
}

/// [`check`], reading `1.000` as ambiguous when a decimal comma was used
/// elsewhere in the entry (see [`parse_number_in`]).
///
/// # Errors
///
/// A message for the field.
pub fn check_in(text: &str, rule: Rule, factor: f64, comma_elsewhere: bool) -> Result<f64, String> {
    let v = parse_number_in(text, comma_elsewhere)?;
    // Only quantities that cannot be negative say so; a rule reaching below
    // zero (millivolts) judges by its range.
    if v < 0.0 && rule.min >= 0.0 {
        return Err("Must not be negative.".into());
    }
    let base = v * factor;
    // A hair of slack so that "5000 mM" is still 5 M after the multiplication (outward at
    // either end, also for a negative bound). Written so that a rule without bounds (NaN: a path
    // the rulebook does not hold) refuses every value.
    let (lo, hi) = (
        rule.min - rule.min.abs() * 1e-12,
        rule.max + rule.max.abs() * 1e-12,
    );
    if !(base >= lo && base <= hi) {
        return Err(rule.message.into());
    }
    Ok(base.clamp(rule.min, rule.max))
}

/// Text for an input from a stored value: up to six significant figures, no
/// trailing zeros, no exponent.
pub fn fmt_input(v: f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    trim_zeros(&sig(v, 6))
}

/// The unit (index into `units`) that shows `base` as a number between 1 and 1000 if possible.
pub fn best_unit(units: &[Unit], base: f64) -> usize {
    if units.is_empty() || !base.is_finite() || base == 0.0 {
        return 0;
    }
    let mut best = 0;
    let mut best_score = f64::INFINITY;
    for (i, u) in units.iter().enumerate() {
        let shown = (base / u.factor).abs();
        let score = if (1.0..1000.0).contains(&shown) {
            0.0
        } else if shown < 1.0 {
            -shown.log10() + 1.0
        } else {
            shown.log10() - 2.0
        };
        if score < best_score {
            best_score = score;
            best = i;
        }
    }
    best
}

fn with_minus(s: String) -> String {
    if let Some(rest) = s.strip_prefix('-') {
        format!("\u{2212}{rest}")
    } else {
        s
    }
}

/// A pH value to two decimals.
pub fn fmt_ph(v: f64) -> String {
    if !v.is_finite() {
        return "—".into();
    }
    with_minus(format!("{v:.2}"))
}

/// A signed pH change to two decimals (`+0.05`, `−0.12`, `0.00`).
pub fn fmt_dph(d: f64) -> String {
    if !d.is_finite() {
        return "—".into();
    }
    let s = format!("{d:.2}");
    if s == "0.00" || s == "-0.00" {
        "0.00".into()
    } else if d > 0.0 {
        format!("+{s}")
    } else {
        with_minus(s)
    }
}

/// A concentration in mol/L, shown in M, mM, µM or nM with three significant figures.
pub fn fmt_conc(m: f64) -> String {
    if !m.is_finite() {
        return "—".into();
    }
    let a = m.abs();
    let (v, u) = if a == 0.0 {
        (0.0, "M")
    } else if a >= 0.1 {
        (m, "M")
    } else if a >= 1e-4 {
        (m * 1e3, "mM")
    } else if a >= 1e-7 {
        (m * 1e6, "µM")
    } else {
        (m * 1e9, "nM")
    };
    with_minus(format!("{} {u}", trim_zeros(&sig(v, 3))))
}

/// A number with `n` significant figures and no trailing zeros.
pub fn fmt_sig(v: f64, n: i32) -> String {
    if !v.is_finite() {
        return "—".into();
    }
    with_minus(trim_zeros(&sig(v, n)))
}

/// A fraction (0–1) as a percentage with three significant figures.
pub fn fmt_pct(f: f64) -> String {
    if !f.is_finite() {
        return "—".into();
    }
    let p = f * 100.0;
    if (99.995..100.0).contains(&p) {
        return "> 99.99 %".into();
    }
    if p != 0.0 && p.abs() < 1e-4 {
        return "< 0.0001 %".into();
    }
    format!("{} %", trim_zeros(&sig(p, 3)))
}

/// Buffer capacity β (mol/(L·pH)) in mM per pH unit.
pub fn fmt_capacity(beta: f64) -> String {
    format!("{} mM/pH", fmt_sig(beta * 1e3, 3))
}

/// mg/L with three significant figures.
pub fn fmt_mg_l(v: f64) -> String {
    format!("{} mg/L", fmt_sig(v, 3))
}

/// A formula (or a sentence holding formulas) with subscript counts:
/// `Na2HPO4·7H2O` → `Na₂HPO₄·7H₂O`. Only words the solver reads as a chemical formula get
/// subscripts (a user's name such as `lot A0` stays as typed); in them a digit is a count
/// when it follows a letter, a closing bracket or another count, so leading coefficients
/// (`7H2O`) stay as they are, as do numbers in prose (`500 mL`, `pH 7.4`).
pub fn pretty_formula(text: &str) -> String {
    let mut out = String::with_capacity(text.len() + 8);
    let mut word = String::new();
    for c in text.chars() {
        if c.is_whitespace() {
            out.push_str(&pretty_word(&word));
            word.clear();
            out.push(c);
        } else {
            word.push(c);
        }
    }
    out.push_str(&pretty_word(&word));
    out
}

/// One word of [`pretty_formula`]: subscripts only when it is a formula.
fn pretty_word(word: &str) -> String {
    const SUB: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];
    let core = word.trim_end_matches(['.', ',', ';', ':']);
    if !word.chars().any(|c| c.is_ascii_digit())
        || solver::system::formula::molar_mass(core).is_err()
    {
        return word.to_string();
    }
    let mut out = String::with_capacity(word.len() + 8);
    let mut prev: Option<char> = None;
    let mut in_count = false;
    for c in word.chars() {
        let count_here = c.is_ascii_digit()
            && (in_count || prev.is_some_and(|p| p.is_ascii_alphabetic() || p == ')' || p == ']'));
        if count_here {
            let d = c
                .to_digit(10)
                .and_then(|d| SUB.get(d as usize).copied())
                .unwrap_or(c);
            out.push(d);
            in_count = true;
        } else {
            out.push(c);
            in_count = false;
        }
        prev = Some(c);
    }
    out
}

/// The dotted field path a solver error names, if any (`target_ph`, `method.titrant_m`...).
pub fn error_field(e: &SolverError) -> Option<String> {
    e.field().map(str::to_string)
}

fn capitalise(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_ascii_uppercase().to_string() + c.as_str(),
        None => String::new(),
    }
}

/// A message for a technician from a solver error (without the field path).
pub fn error_message(e: &SolverError) -> String {
    match e {
        SolverError::OutOfRange {
            field,
            value,
            min,
            max,
        } if field.ends_with("temperature_c") => format!(
            "No data for this system at {} °C: its constants cover {} to {} °C.",
            fmt_sig(*value, 4),
            fmt_sig(*min, 3),
            fmt_sig(*max, 3)
        ),
        SolverError::OutOfRange {
            value, min, max, ..
        } => format!(
            "{} is outside the accepted range ({} to {}).",
            fmt_sig(*value, 4),
            fmt_sig(*min, 3),
            fmt_sig(*max, 3)
        ),
        SolverError::Negative { .. } => "Must not be negative.".into(),
        SolverError::NotFinite { .. } => "Not a finite number.".into(),
        SolverError::Infeasible { reason, .. } => {
            format!("{}.", capitalise(reason.trim_end_matches('.')))
        }
        SolverError::NoBracket { .. } | SolverError::NoConvergence { .. } => {
            format!("The equilibrium could not be solved for these inputs ({e}).")
        }
        other => capitalise(&other.to_string()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_plain_and_comma_decimals() {
        assert_eq!(parse_number("7.4"), Ok(7.4));
        assert_eq!(parse_number("7,4"), Ok(7.4));
        assert_eq!(parse_number("  37 "), Ok(37.0));
        assert_eq!(parse_number(".5"), Ok(0.5));
        assert_eq!(parse_number("1e-3"), Ok(0.001));
        assert_eq!(parse_number("\u{2212}2"), Ok(-2.0));
        assert_eq!(parse_number("-0"), Ok(0.0));
    }

    #[test]
    fn refuses_empty_words_and_non_finite() {
        assert_eq!(parse_number(""), Err("Enter a value.".into()));
        assert_eq!(parse_number("   "), Err("Enter a value.".into()));
        assert!(parse_number("abc").unwrap_err().contains("not a number"));
        assert!(parse_number("inf").is_err());
        assert!(parse_number("NaN").is_err());
        assert!(parse_number("1e999").is_err());
        assert!(parse_number("7.4.1").is_err());
        assert!(parse_number("1,2,3").is_err());
        assert!(parse_number("1.000,5")
            .unwrap_err()
            .contains("decimal mark"));
        assert!(parse_number("-").is_err());
        assert!(parse_number("e").is_err());
        assert!(parse_number("7 4").is_err());
    }

    #[test]
    fn a_thousands_comma_is_refused_with_both_readings() {
        let m = parse_number("1,000").unwrap_err();
        assert!(m.contains("1000") && m.contains("1.0"), "{m}");
        let m = parse_number("12,500").unwrap_err();
        assert!(m.contains("12500") && m.contains("12.5"), "{m}");
        assert!(parse_number("-1,000").unwrap_err().contains("-1000"));
        // Unambiguous decimal commas keep working.
        assert_eq!(parse_number("7,4"), Ok(7.4));
        assert_eq!(parse_number("0,15"), Ok(0.15));
        assert_eq!(
            parse_number("0,150"),
            Ok(0.15),
            "no thousands group starts with 0"
        );
        assert_eq!(parse_number("1,0"), Ok(1.0));
        assert_eq!(parse_number("1234,5"), Ok(1234.5));
        // A point is a decimal point, unless a comma was the decimal mark elsewhere.
        assert_eq!(parse_number("1.000"), Ok(1.0));
        let m = parse_number_in("1.000", true).unwrap_err();
        assert!(m.contains("1000") && m.contains("1.0"), "{m}");
        assert_eq!(parse_number_in("7.4", true), Ok(7.4));
        assert!(uses_decimal_comma("7,4"));
        assert!(!uses_decimal_comma("1,000"));
        assert!(!uses_decimal_comma("7.4"));
        // Several groups, spaces.
        let m = parse_number("1,000,000").unwrap_err();
        assert!(m.contains("1000000"), "{m}");
        let m = parse_number("1 000").unwrap_err();
        assert!(m.contains("“1000”"), "{m}");
    }

    #[test]
    fn long_bad_values_are_quoted_short() {
        let long = "x".repeat(10_000);
        let m = parse_number(&long).unwrap_err();
        assert!(m.chars().count() < 120, "{} chars", m.chars().count());
        assert!(m.contains('…'));
        assert_eq!(quote("abc"), "“abc”");
    }

    #[test]
    fn checks_rules() {
        assert_eq!(check("7,4", PH, 1.0), Ok(7.4));
        assert_eq!(check("15", PH, 1.0), Err(PH.message.into()));
        assert_eq!(check("-1", PH, 1.0), Err("Must not be negative.".into()));
        assert_eq!(check("", PH, 1.0), Err("Enter a value.".into()));
        assert_eq!(check("0", PH, 1.0), Ok(0.0));
        assert_eq!(check("14", PH, 1.0), Ok(14.0));
        assert!(check("61", TEMPERATURE, 1.0).is_err());
        assert_eq!(check("50", BUFFER_CONC, 1e-3), Ok(0.05));
        assert_eq!(
            check("0", BUFFER_CONC, 1e-3),
            Err(BUFFER_CONC.message.into())
        );
        assert_eq!(check("5000", BUFFER_CONC, 1e-3), Ok(5.0));
        assert!(check("6", BUFFER_CONC, 1.0).is_err());
        assert_eq!(check("500", VOLUME, 1e-3), Ok(0.5));
        assert!(check("0.5", DILUTION, 1.0).is_err());
        assert_eq!(check("0", AMOUNT, 1e-3), Ok(0.0));
    }

    #[test]
    fn formats_inputs_and_units() {
        assert_eq!(fmt_input(7.4), "7.4");
        assert_eq!(fmt_input(0.05), "0.05");
        assert_eq!(fmt_input(37.0), "37");
        assert_eq!(fmt_input(1e-7), "1e-7");
        assert_eq!(fmt_input(1e-300), "1e-300");
        assert_eq!(fmt_input(2.5e-6), "0.0000025");
        assert_eq!(parse_number(&fmt_input(1.5e-9)), Ok(1.5e-9));
        assert_eq!(best_unit(CONC_UNITS, 0.05), 1);
        assert_eq!(best_unit(CONC_UNITS, 1.0), 0);
        assert_eq!(best_unit(CONC_UNITS, 5e-6), 2);
        assert_eq!(best_unit(VOLUME_UNITS, 0.5), 0);
        assert_eq!(best_unit(VOLUME_UNITS, 2.0), 1);
    }

    #[test]
    fn formats_results() {
        assert_eq!(fmt_ph(7.4), "7.40");
        assert_eq!(fmt_dph(0.0321), "+0.03");
        assert_eq!(fmt_dph(-0.12), "\u{2212}0.12");
        assert_eq!(fmt_dph(-0.001), "0.00");
        assert_eq!(fmt_conc(0.05), "50 mM");
        assert_eq!(fmt_conc(0.15), "0.15 M");
        assert_eq!(fmt_conc(2.5e-6), "2.5 µM");
        assert_eq!(fmt_pct(0.0396), "3.96 %");
        assert_eq!(fmt_pct(0.5), "50 %");
        assert_eq!(fmt_pct(1e-9), "< 0.0001 %");
        assert_eq!(fmt_capacity(0.0284), "28.4 mM/pH");
        assert_eq!(fmt_mg_l(0.0317), "0.0317 mg/L");
    }

    #[test]
    fn formulas_get_subscripts_prose_does_not() {
        assert_eq!(pretty_formula("Na2HPO4·7H2O"), "Na₂HPO₄·7H₂O");
        assert_eq!(pretty_formula("C6H6Na2O7·1.5H2O"), "C₆H₆Na₂O₇·1.5H₂O");
        assert_eq!(
            pretty_formula("Weigh 733.5 mg of NaH2PO4·H2O at pH 7.40 in 500.0 mL."),
            "Weigh 733.5 mg of NaH₂PO₄·H₂O at pH 7.40 in 500.0 mL."
        );
        assert_eq!(pretty_formula("mes2 step2"), "mes2 step2");
        assert_eq!(
            pretty_formula("Weigh 1.2 g of C7H5NaO2 — lot A0 (K2 batch)."),
            "Weigh 1.2 g of C₇H₅NaO₂ — lot A0 (K2 batch)."
        );
        assert_eq!(pretty_formula("(NH4)2SO4"), "(NH₄)₂SO₄");
    }

    #[test]
    fn maps_solver_errors_to_fields() {
        let e = SolverError::OutOfRange {
            field: "temperature_c".into(),
            value: 55.0,
            min: 0.0,
            max: 50.0,
        };
        assert_eq!(error_field(&e).as_deref(), Some("temperature_c"));
        assert!(error_message(&e).contains("0 to 50 °C"));
        let u = SolverError::UnknownChoice {
            field: "method.acid_form".into(),
            kind: "form".into(),
            name: "x".into(),
        };
        assert_eq!(error_field(&u).as_deref(), Some("method.acid_form"));
        let i = SolverError::Infeasible {
            field: "target_ph".into(),
            reason: "the target pH is above what the base form alone gives".into(),
        };
        assert!(error_message(&i).starts_with("The target pH"));
    }
}
