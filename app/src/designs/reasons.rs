//! Read errors in plain words: why a saved design, draft or file could not be used, and the
//! place a document path names on the page.

use solver::error::SolverError;

fn between(text: &str, open: char, close: char) -> Option<&str> {
    let start = text.find(open)? + open.len_utf8();
    let len = text.get(start..)?.find(close)?;
    text.get(start..start + len)
}

fn where_in(field: &str) -> String {
    let f = field.trim_matches('.');
    if f.is_empty() || f == "document" {
        String::new()
    } else {
        format!(" in {}", plain_place(f))
    }
}

/// A document path (`recipe.salts[1].conc_m`) as the page names the place: the
/// workspace, then the field or row (`the Recipe's salt row 2, amount`).
pub fn plain_place(path: &str) -> String {
    let mut parts = Vec::new();
    for seg in path.split('.') {
        let (key, index) = match seg.split_once('[') {
            Some((k, rest)) => (k, rest.trim_end_matches(']').parse::<usize>().ok()),
            None => (seg, None),
        };
        let word = match key {
            "recipe" => "the Recipe",
            "mixture" => "the Flask",
            "what_if" => "the Flask's what-if",
            "field" => "the Field reading",
            "custom_systems" => "your own reagent",
            "custom_forms" => "your added form",
            "uncertainty" => "the ± figures",
            "name" => "the design's name",
            "salts" => "salt row",
            "components" => "component row",
            "additives" => "acid or base row",
            "forms" => "form",
            "steps" => "step",
            "target_ph" => "target pH",
            "ph" => "pH",
            "temperature_c" => "temperature",
            "prepare_temperature_c" => "preparation temperature",
            "total_conc_m" => "total concentration",
            "volume_l" => "volume",
            "tolerance_ph" => "pH tolerance",
            "concentrate_factor" => "concentrate factor",
            "conc_m" => "amount",
            "additive" => "salt",
            "method" => "method",
            "titrant_m" => "titrant concentration",
            "acid_stock_m" | "base_stock_m" => "stock concentration",
            "total" => "total",
            "total_unit" => "unit of the total",
            "limit" => "limit",
            "alkalinity" => "alkalinity",
            "counter_ions" => "counter-ions",
            "formula" => "formula",
            "reagent" => "the reagent",
            "pk25" => "pK at 25 °C",
            "dh_kj" => "ΔrH°",
            "dcp_j" => "ΔrCp°",
            "t_min_c" => "lowest temperature",
            "t_max_c" => "highest temperature",
            "bufferwright_reagent" => "the file's version",
            // A key this page does not know stays as written (the user looks for it).
            other => other,
        };
        let word = word.to_string();
        parts.push(match index {
            Some(i) => format!("{word} {}", i + 1),
            None => word,
        });
    }
    parts.join(", ")
}

/// A serde message (`missing field \`name\` at line 1 column 9`) in plain words.
fn plain_serde(msg: &str, field: &str) -> String {
    let at = where_in(field);
    if msg.contains("EOF while parsing") || msg.contains("unexpected end") {
        return "the text is cut short: it ends in the middle".into();
    }
    if msg.starts_with("missing field") {
        let name = between(msg, '`', '`').unwrap_or("a value");
        return format!("a part is missing: “{name}”{at}");
    }
    if msg.starts_with("unknown field") {
        let name = between(msg, '`', '`').unwrap_or("?");
        return format!("it holds an entry “{name}”{at} that this page does not know");
    }
    if msg.starts_with("unknown variant") {
        let name = between(msg, '`', '`').unwrap_or("?");
        return format!("the value “{name}”{at} is not one this page knows");
    }
    if msg.starts_with("invalid type") {
        let want = msg
            .split("expected ")
            .nth(1)
            .map(|w| w.split(" at line").next().unwrap_or(w))
            .unwrap_or("another kind");
        let want = match want {
            w if w.starts_with('f') || w.starts_with('u') || w.starts_with('i') => "a number",
            w if w.contains("string") => "text",
            w if w.contains("sequence") => "a list",
            w if w.contains("bool") => "yes or no",
            _ => "another kind of value",
        };
        return format!("a value{at} has the wrong kind (it should be {want})");
    }
    if msg.starts_with("expected") || msg.contains("key must be") || msg.contains("trailing") {
        return "the text is not readable as a design (it is not well-formed JSON)".into();
    }
    if msg.starts_with("invalid value") || msg.starts_with("invalid length") {
        return format!("a value{at} is not usable");
    }
    format!("it cannot be read{at}")
}

/// A JSON reading error in plain words.
pub fn plain_json_reason(e: &serde_json::Error) -> String {
    if e.is_eof() {
        return "the text is cut short: it ends in the middle".into();
    }
    plain_serde(&e.to_string(), "")
}

/// Why a design could not be used, in plain words (field paths kept where a
/// value is refused, so the user can find it).
pub fn plain_reason(e: &SolverError) -> String {
    match e {
        SolverError::Document { field, reason } => {
            if field == "document" {
                if reason.contains("EOF while parsing") {
                    "the text is cut short: it ends in the middle".into()
                } else if reason.starts_with("not valid JSON") {
                    "the text is not readable as a design (it is not well-formed JSON)".into()
                } else if reason.contains("schema") {
                    reason.clone()
                } else {
                    plain_serde(reason, "")
                }
            } else if reason.starts_with("unknown field") {
                // The field already ends with the unknown key.
                format!(
                    "{}: an entry this page does not know (unknown field: check the spelling)",
                    plain_place(field)
                )
            } else if reason.contains('`') || reason.starts_with("invalid") {
                plain_serde(reason, field)
            } else {
                format!("{}: {reason}", plain_place(field))
            }
        }
        other => match other.field() {
            Some(field) => {
                let text = other.to_string();
                let reason = text
                    .strip_prefix(field)
                    .map_or(text.as_str(), |r| r.trim_start_matches([':', ' ']));
                format!("{}: {reason}", plain_place(field))
            }
            None => other.to_string(),
        },
    }
}
