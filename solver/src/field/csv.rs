//! Plain CSV text for field logs: decoding, separator and decimal-comma detection, quoted fields, numbers, writing.
//!
//! What is read:
//!
//! - UTF-8 (with or without a byte-order mark), UTF-16 with a byte-order
//!   mark (spreadsheet "Unicode text" exports), and otherwise single-byte
//!   Latin-1 / Windows-1252 text such as a `°C` header from an old logger;
//! - comma, semicolon or tab separated, chosen from the header line (the
//!   most frequent of the three outside quotes);
//! - quoted fields with `""` for a quote, separators and line breaks inside
//!   quotes;
//! - decimal commas in semicolon- and tab-separated files.
//!
//! What is refused, with a message: files over [`MAX_BYTES`], binary data
//! (NUL bytes or control characters), a file without a header line.
//! Blank lines are skipped and counted; no data row is dropped.

use crate::error::{Result, SolverError};

/// Largest file accepted, bytes (50 MB).
pub const MAX_BYTES: usize = 50 * 1024 * 1024;

/// Field separator.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Separator {
    /// `,`
    Comma,
    /// `;`
    Semicolon,
    /// tab
    Tab,
}

impl Separator {
    /// The separator character.
    pub fn char(self) -> char {
        match self {
            Separator::Comma => ',',
            Separator::Semicolon => ';',
            Separator::Tab => '\t',
        }
    }
}

/// One data row: its line number in the file (the header is line 1) and its fields.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    /// Line of the file the row starts on (1-based; the header is line 1).
    pub line: usize,
    /// Field texts, unquoted.
    pub fields: Vec<String>,
}

/// A parsed table.
#[derive(Debug, Clone, PartialEq)]
pub struct Table {
    /// Separator found (or given).
    pub separator: Separator,
    /// Whether numbers use a decimal comma (semicolon or tab files whose
    /// numbers are written `7,4`).
    pub decimal_comma: bool,
    /// Header names, trimmed.
    pub header: Vec<String>,
    /// Data rows, in file order.
    pub rows: Vec<Row>,
    /// Blank lines skipped.
    pub blank_lines: usize,
}

fn file_err(reason: impl Into<String>) -> SolverError {
    SolverError::Document {
        field: "file".into(),
        reason: reason.into(),
    }
}

/// Decode file bytes to text, refusing binary data and oversized files.
///
/// # Errors
///
/// [`SolverError::Document`] (field `file`) for files over [`MAX_BYTES`],
/// NUL bytes or other control characters (binary), odd-length UTF-16.
pub fn decode(bytes: &[u8]) -> Result<String> {
    if bytes.len() > MAX_BYTES {
        return Err(file_err(format!(
            "the file is larger than {} MB: split it or remove columns",
            MAX_BYTES / (1024 * 1024)
        )));
    }
    let text = if let Some(rest) = bytes.strip_prefix(&[0xEF, 0xBB, 0xBF]) {
        String::from_utf8(rest.to_vec())
            .map_err(|_| file_err("the file says UTF-8 but is not valid UTF-8"))?
    } else if bytes.starts_with(&[0xFF, 0xFE]) || bytes.starts_with(&[0xFE, 0xFF]) {
        let le = bytes.starts_with(&[0xFF, 0xFE]);
        let body = bytes.get(2..).unwrap_or(&[]);
        if body.len() % 2 != 0 {
            return Err(file_err(
                "the file says UTF-16 but has an odd number of bytes",
            ));
        }
        let units: Vec<u16> = body
            .chunks_exact(2)
            .map(|c| match c {
                [a, b] if le => u16::from_le_bytes([*a, *b]),
                [a, b] => u16::from_be_bytes([*a, *b]),
                _ => 0,
            })
            .collect();
        String::from_utf16(&units).map_err(|_| file_err("the file is not valid UTF-16 text"))?
    } else {
        match std::str::from_utf8(bytes) {
            Ok(s) => s.to_string(),
            // Single-byte text (Latin-1 / Windows-1252 exports): bytes as code points.
            Err(_) => bytes.iter().map(|&b| char::from(b)).collect(),
        }
    };
    let bad = text
        .chars()
        .filter(|c| (c.is_control() && !matches!(c, '\t' | '\n' | '\r')) || *c == '\u{FFFD}')
        .take(1)
        .count();
    if bad > 0 || text.contains('\0') {
        return Err(file_err(
            "this is not a text file (binary data found): export the log as CSV text",
        ));
    }
    Ok(text)
}

/// Split text into records (fields unquoted), each with its starting line.
fn records(text: &str, sep: char) -> (Vec<(usize, Vec<String>, bool)>, bool) {
    let mut out = Vec::new();
    let mut fields = Vec::new();
    let mut field = String::new();
    let mut in_quotes = false;
    let mut line = 1usize;
    let mut start_line = 1usize;
    let mut any = false; // record has content (not a blank line)
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        if in_quotes {
            if c == '"' {
                if chars.peek() == Some(&'"') {
                    field.push('"');
                    chars.next();
                } else {
                    in_quotes = false;
                }
            } else {
                if c == '\n' {
                    line += 1;
                }
                field.push(c);
            }
            continue;
        }
        match c {
            '"' if field.trim().is_empty() => {
                field.clear();
                in_quotes = true;
                any = true;
            }
            c if c == sep => {
                fields.push(std::mem::take(&mut field));
                any = true;
            }
            '\r' => {}
            '\n' => {
                fields.push(std::mem::take(&mut field));
                let blank = !any && fields.iter().all(|f| f.trim().is_empty());
                out.push((start_line, std::mem::take(&mut fields), blank));
                line += 1;
                start_line = line;
                any = false;
            }
            c => {
                if !c.is_whitespace() {
                    any = true;
                }
                field.push(c);
            }
        }
    }
    if any || !field.is_empty() || !fields.is_empty() {
        fields.push(field);
        let blank = fields.iter().all(|f| f.trim().is_empty());
        out.push((start_line, fields, blank));
    }
    (out, in_quotes)
}

fn count_outside_quotes(line: &str, c: char) -> usize {
    let mut n = 0;
    let mut q = false;
    for ch in line.chars() {
        if ch == '"' {
            q = !q;
        } else if ch == c && !q {
            n += 1;
        }
    }
    n
}

/// Whether a cell is written as a decimal-comma number (`7,4`, `-0,25`).
fn is_decimal_comma_number(s: &str) -> bool {
    let t = s.trim();
    let t = t.strip_prefix(['-', '+']).unwrap_or(t);
    match t.split_once(',') {
        Some((a, b)) => {
            a.chars().all(|c| c.is_ascii_digit())
                && !b.is_empty()
                && b.chars().all(|c| c.is_ascii_digit())
        }
        None => false,
    }
}

/// Parse decoded text into a table.
///
/// `separator` overrides the detection. Lines that are only separators or
/// spaces are blank and skipped (counted in [`Table::blank_lines`]).
///
/// # Errors
///
/// [`SolverError::Document`] (field `file`) when there is no header line,
/// a header name is empty or repeated, or a quote is not closed.
///
/// # Example
///
/// ```
/// use solver::field::csv::{parse, Separator};
/// let t = parse("Zeit;pH;Temp °C\n08:00;7,85;12,5\n", None)?;
/// assert_eq!(t.separator, Separator::Semicolon);
/// assert!(t.decimal_comma);
/// assert_eq!(t.rows[0].fields[1], "7,85");
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn parse(text: &str, separator: Option<Separator>) -> Result<Table> {
    let first_line = text
        .lines()
        .find(|l| !l.trim().is_empty())
        .ok_or_else(|| file_err("the file is empty: a header line and data rows are needed"))?;
    let sep = separator.unwrap_or_else(|| {
        let counts = [
            (Separator::Comma, count_outside_quotes(first_line, ',')),
            (Separator::Semicolon, count_outside_quotes(first_line, ';')),
            (Separator::Tab, count_outside_quotes(first_line, '\t')),
        ];
        let mut best = (Separator::Comma, 0);
        for c in counts {
            if c.1 > best.1 {
                best = c;
            }
        }
        best.0
    });
    let (recs, unclosed) = records(text, sep.char());
    if unclosed {
        return Err(file_err(
            "a quoted field is not closed: a \" opens a field that never ends",
        ));
    }
    let mut recs = recs.into_iter();
    let mut blank_lines = 0;
    let header = loop {
        match recs.next() {
            None => return Err(file_err("the file has no header line")),
            Some((_, _, true)) => blank_lines += 1,
            Some((_, f, false)) => break f,
        }
    };
    let header: Vec<String> = header.iter().map(|h| h.trim().to_string()).collect();
    for (i, h) in header.iter().enumerate() {
        if h.is_empty() {
            return Err(file_err(format!(
                "column {} of the header has no name: the first line must name every column",
                i + 1
            )));
        }
        if header.iter().take(i).any(|o| o.eq_ignore_ascii_case(h)) {
            return Err(file_err(format!("two columns are named \"{h}\"")));
        }
    }
    let mut rows = Vec::new();
    for (line, fields, blank) in recs {
        if blank {
            blank_lines += 1;
        } else {
            rows.push(Row { line, fields });
        }
    }
    let decimal_comma = sep != Separator::Comma
        && rows
            .iter()
            .any(|r| r.fields.iter().any(|f| is_decimal_comma_number(f)));
    Ok(Table {
        separator: sep,
        decimal_comma,
        header,
        rows,
        blank_lines,
    })
}

/// Read a number cell. Empty cells are `Ok(None)`.
///
/// With `decimal_comma`, `7,4` is 7.4 and a dot-grouped `1.250` is refused
/// as ambiguous; without it a comma in a number is refused (thousands
/// separators are not guessed). `nan`, `inf` and text are refused.
///
/// # Errors
///
/// A plain-language reason naming the text.
pub fn parse_number(cell: &str, decimal_comma: bool) -> std::result::Result<Option<f64>, String> {
    let t = cell.trim();
    if t.is_empty() {
        return Ok(None);
    }
    let owned;
    let t = if t.contains(',') {
        if !decimal_comma {
            return Err(format!(
                "\"{t}\" has a comma: thousands separators are not read, and decimal commas \
                 only in semicolon- or tab-separated files"
            ));
        }
        if t.contains('.') || t.matches(',').count() > 1 {
            return Err(format!("\"{t}\" mixes digit grouping and decimal marks"));
        }
        owned = t.replace(',', ".");
        owned.as_str()
    } else {
        if decimal_comma {
            let u = t.strip_prefix(['-', '+']).unwrap_or(t);
            if let Some((a, b)) = u.split_once('.') {
                if !a.is_empty()
                    && a.len() <= 3
                    && a.chars().all(|c| c.is_ascii_digit())
                    && b.len() == 3
                    && b.chars().all(|c| c.is_ascii_digit())
                {
                    return Err(format!(
                        "\"{t}\" is ambiguous in a file with decimal commas (a thousands \
                         separator or a decimal point?)"
                    ));
                }
            }
        }
        t
    };
    if !t
        .chars()
        .all(|c| c.is_ascii_digit() || matches!(c, '.' | '-' | '+' | 'e' | 'E'))
    {
        return Err(format!("\"{}\" is not a number", cell.trim()));
    }
    match t.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(Some(v)),
        _ => Err(format!("\"{}\" is not a number", cell.trim())),
    }
}

/// Append one field to a CSV line, quoted when it holds the separator, a
/// quote or a line break.
pub fn push_field(out: &mut String, field: &str, sep: Separator) {
    let s = sep.char();
    if field.contains(s) || field.contains('"') || field.contains('\n') || field.contains('\r') {
        out.push('"');
        out.push_str(&field.replace('"', "\"\""));
        out.push('"');
    } else {
        out.push_str(field);
    }
}

/// Append a whole row (fields separated, quoted as needed, then `\n`).
pub fn push_row<'a>(out: &mut String, fields: impl IntoIterator<Item = &'a str>, sep: Separator) {
    for (i, f) in fields.into_iter().enumerate() {
        if i > 0 {
            out.push(sep.char());
        }
        push_field(out, f, sep);
    }
    out.push('\n');
}

/// Format a number with 6 significant digits for a CSV cell (decimal comma
/// when asked); scientific notation below 1e−4 and from 1e9; empty for
/// non-finite values.
pub fn format_number(v: f64, decimal_comma: bool) -> String {
    let mut s = String::new();
    write_number(&mut s, v, decimal_comma);
    s
}

/// [`format_number`] appended to `out` without an intermediate string.
///
/// In the plain range the digits come from one integer rounding,
/// `m = round(|v|·10^d)` with `d = 5 − ⌊log10|v|⌋` decimals, so no float
/// formatting is involved (logs write tens of thousands of cells).
pub fn write_number(out: &mut String, v: f64, decimal_comma: bool) {
    use std::fmt::Write;
    if !v.is_finite() {
        return;
    }
    if v == 0.0 {
        out.push('0');
        return;
    }
    let mag = v.abs().log10().floor() as i32;
    if !(-4..9).contains(&mag) {
        let start = out.len();
        let _ = write!(out, "{v:.5e}");
        if decimal_comma {
            if let Some(i) = out.get(start..).and_then(|t| t.find('.')) {
                out.replace_range(start + i..start + i + 1, ",");
            }
        }
        return;
    }
    let decimals = (5 - mag).max(0) as usize;
    // |v| < 1e9 and at most 9 decimals: m < 1e15, exact in u64.
    let m = (v.abs() * 10f64.powi(decimals as i32)).round() as u64;
    let mut digits = [0u8; 24];
    let mut n = 0;
    let mut x = m;
    loop {
        if let Some(d) = digits.get_mut(n) {
            *d = b'0' + (x % 10) as u8;
        }
        n += 1;
        x /= 10;
        if x == 0 {
            break;
        }
    }
    // Pad so there is at least one digit before the decimal point.
    while n <= decimals {
        if let Some(d) = digits.get_mut(n) {
            *d = b'0';
        }
        n += 1;
    }
    // Drop trailing zeros of the fraction part (digits are stored reversed).
    let mut skip = 0;
    while skip < decimals && digits.get(skip) == Some(&b'0') {
        skip += 1;
    }
    if v < 0.0 && m > 0 {
        out.push('-');
    }
    for i in (skip..n).rev() {
        if i + 1 == decimals && skip < decimals {
            out.push(if decimal_comma { ',' } else { '.' });
        }
        out.push(char::from(digits.get(i).copied().unwrap_or(b'0')));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quoted_fields_and_line_numbers() {
        let t = parse(
            "a,b\n\"x, y\",\"say \"\"hi\"\"\"\n\n\"two\nlines\",3\n4,5",
            None,
        )
        .unwrap();
        assert_eq!(t.rows[0].fields, vec!["x, y", "say \"hi\""]);
        assert_eq!(t.rows[0].line, 2);
        assert_eq!(t.rows[1].line, 4);
        assert_eq!(t.rows[1].fields[0], "two\nlines");
        assert_eq!(t.rows[2].line, 6);
        assert_eq!(t.blank_lines, 1);
        // A quote inside an unquoted field is literal; an unclosed quoted field is refused.
        let t = parse("a,b\n12\" pipe,3\n", None).unwrap();
        assert_eq!(t.rows[0].fields[0], "12\" pipe");
        assert!(parse("a,b\n\"open,3\n4,5\n", None).is_err());
    }

    #[test]
    fn numbers() {
        assert_eq!(parse_number(" 7.4 ", false), Ok(Some(7.4)));
        assert_eq!(parse_number("7,4", true), Ok(Some(7.4)));
        assert_eq!(parse_number("", true), Ok(None));
        assert!(parse_number("7,4", false).is_err());
        assert!(parse_number("1.250", true).is_err());
        assert!(parse_number("1.250,5", true).is_err());
        assert_eq!(parse_number("1.25", true), Ok(Some(1.25)));
        assert!(parse_number("nan", false).is_err());
        assert!(parse_number("inf", false).is_err());
        assert!(parse_number("7.4 pH", false).is_err());
        assert_eq!(parse_number("1e-3", false), Ok(Some(0.001)));
    }

    #[test]
    fn formatting() {
        assert_eq!(format_number(0.0396123456, false), "0.0396123");
        assert_eq!(format_number(7.25, true), "7,25");
        assert_eq!(format_number(1.5e-7, false), "1.50000e-7");
        assert_eq!(format_number(123456.0, false), "123456");
        assert_eq!(format_number(-0.5, false), "-0.5");
        assert_eq!(format_number(9.999999, false), "10");
        assert_eq!(format_number(0.00012345678, true), "0,000123457");
        assert_eq!(format_number(12.5, false), "12.5");
        assert_eq!(format_number(3.0, false), "3");
        assert_eq!(format_number(1234.5678, false), "1234.57");
        assert_eq!(format_number(2.5e9, false), "2.50000e9");
        // Round trip to 6 significant digits over many magnitudes.
        for k in -40..90 {
            let v = 1.234567891 * 10f64.powf(f64::from(k) / 10.0);
            let back: f64 = format_number(v, false).parse().unwrap();
            assert!(((back - v) / v).abs() < 5e-6, "{v}: {back}");
        }
        let mut s = String::new();
        push_row(&mut s, ["a;b", "c\"d", "e"], Separator::Semicolon);
        assert_eq!(s, "\"a;b\";\"c\"\"d\";e\n");
    }

    #[test]
    fn decoding() {
        assert_eq!(decode(b"\xEF\xBB\xBFpH\n7").unwrap(), "pH\n7");
        assert_eq!(decode(b"T \xB0C\n").unwrap(), "T °C\n");
        let utf16: Vec<u8> = [0xFF, 0xFE]
            .into_iter()
            .chain("pH\t°C\n".encode_utf16().flat_map(u16::to_le_bytes))
            .collect();
        assert_eq!(decode(&utf16).unwrap(), "pH\t°C\n");
        assert!(decode(b"PK\x03\x04\x00\x00").is_err());
        assert!(decode(&[0x89, b'P', b'N', b'G', 0x0D, 0x0A, 0x1A, 0x0A]).is_err());
    }
}
