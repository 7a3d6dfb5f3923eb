//! The one number printer: significant figures, trimmed zeros, masses and volumes for the
//! bench, ASCII names for column headers, and a user's text quoted at most [`QUOTE_MAX`]
//! characters. The steps, the sheet, the command line, the plots and the page all print
//! through it, so one value reads the same everywhere.

/// Most characters of a user's value that a message quotes.
pub const QUOTE_MAX: usize = 60;

/// Round to `n` significant figures and print without exponent; far from 1 (below 10⁻⁶ or
/// from 10¹⁵) with one, so a hand-edited 1e-300 never prints hundreds of digits. Zero and
/// non-finite values print as `0`.
///
/// ```
/// use solver::fmt::sig;
/// assert_eq!(sig(0.123_456, 3), "0.123");
/// assert_eq!(sig(1234.0, 3), "1234");
/// assert_eq!(sig(2.5e-8, 3), "2.50e-8");
/// ```
pub fn sig(v: f64, n: i32) -> String {
    if v == 0.0 || !v.is_finite() {
        return "0".into();
    }
    let mag = v.abs().log10().floor() as i32;
    if !(-6..15).contains(&mag) {
        let digits = (n - 1).max(0) as usize;
        return format!("{v:.digits$e}");
    }
    let decimals = (n - 1 - mag).max(0) as usize;
    format!("{v:.decimals$}")
}

/// Trailing zeros after a decimal point dropped, and the point with them
/// (`2.500` → `2.5`, `10.0` → `10`; `2.50e-8` → `2.5e-8`).
pub fn trim_zeros(s: &str) -> String {
    match s.split_once('e') {
        Some((m, e)) => format!("{}e{e}", trim_zeros(m)),
        None if s.contains('.') => s.trim_end_matches('0').trim_end_matches('.').to_string(),
        None => s.to_string(),
    }
}

/// [`sig`] without trailing zeros: `10`, `2.5`.
///
/// ```
/// assert_eq!(solver::fmt::sig_trim(2.5, 3), "2.5");
/// assert_eq!(solver::fmt::sig_trim(2.5e-8, 3), "2.5e-8");
/// ```
pub fn sig_trim(v: f64, n: i32) -> String {
    trim_zeros(&sig(v, n))
}

/// A fixed number of decimals (pH to two places).
pub fn sig_fixed(v: f64, decimals: usize) -> String {
    format!("{v:.decimals$}")
}

/// A mass with four significant figures, in g from 1 g and in mg below; `—` when not finite.
///
/// ```
/// assert_eq!(solver::fmt::format_mass(0.7335), "733.5 mg");
/// assert_eq!(solver::fmt::format_mass(5.277), "5.277 g");
/// ```
pub fn format_mass(g: f64) -> String {
    if !g.is_finite() {
        return "—".into();
    }
    if g.abs() < 1.0 {
        format!("{} mg", sig(g * 1000.0, 4))
    } else {
        format!("{} g", sig(g, 4))
    }
}

/// A volume given in mL: four significant figures in mL from 1 mL, three in µL below;
/// `—` when not finite.
pub fn format_volume_ml(ml: f64) -> String {
    if !ml.is_finite() {
        return "—".into();
    }
    if ml.abs() < 1.0 {
        format!("{} µL", sig(ml * 1000.0, 3))
    } else {
        format!("{} mL", sig(ml, 4))
    }
}

/// A species or basis name in plain ASCII for column names: `NH₃` → `NH3`, `HCO₃⁻` → `HCO3`,
/// `CO₂(aq)` → `CO2`.
pub fn ascii_name(name: &str) -> String {
    let mut s = String::new();
    for c in name.chars() {
        match c {
            '₀'..='₉' => s.push(char::from(b'0' + (c as u32 - '₀' as u32) as u8)),
            '⁺' | '⁻' | '⁰' | '¹' | '²' | '³' | '⁴' | '⁵' | '⁶' | '⁷' | '⁸' | '⁹' =>
                {}
            c if c.is_ascii() => s.push(c),
            _ => {}
        }
    }
    s.replace("(aq)", "")
}

/// `s` cut to at most `max` characters, with an ellipsis when it was cut.
pub fn clip(s: &str, max: usize) -> String {
    match s.char_indices().nth(max) {
        Some((cut, _)) => format!("{}…", s.get(..cut).unwrap_or(s)),
        None => s.to_string(),
    }
}

/// A value the user gave, for a message: in double quotes, at most [`QUOTE_MAX`]
/// characters, with an ellipsis when it was cut.
///
/// ```
/// let long = "x".repeat(10_000);
/// let q = solver::fmt::quote(&long);
/// assert!(q.chars().count() < 70 && q.ends_with("…\""));
/// assert_eq!(solver::fmt::quote("tris"), "\"tris\"");
/// ```
pub fn quote(s: &str) -> String {
    format!("\"{}\"", clip(s, QUOTE_MAX))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sig_figs() {
        assert_eq!(sig(3.45678, 4), "3.457");
        assert_eq!(sig(123.456, 4), "123.5");
        assert_eq!(sig(0.012345, 3), "0.0123");
        assert_eq!(format_mass(0.5), "500.0 mg");
    }

    #[test]
    fn far_from_one_takes_an_exponent_and_trims_it() {
        assert_eq!(sig(2.5e-8, 3), "2.50e-8");
        assert_eq!(sig_trim(2.5e-8, 3), "2.5e-8");
        assert_eq!(sig_trim(10.0, 3), "10");
        assert_eq!(sig(f64::NAN, 3), "0");
        assert_eq!(ascii_name("CO₂(aq)"), "CO2");
        assert_eq!(clip("abcdef", 3), "abc…");
    }
}
