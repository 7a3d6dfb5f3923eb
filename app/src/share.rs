//! Share links: a whole design carried in the URL fragment (`#d=<base64url of compact JSON>`).
//!
//! The fragment never reaches a server (browsers do not send it), so a share
//! link works from `file://`, from any static host and offline. Decoding goes
//! through [`solver::design::parse_design`], so an old or hand-edited link is
//! migrated and checked field by field like an imported file.
//!
//! Invariant: everything here is pure string work; the page glue that reads
//! `location` lives in `store.rs`.

use solver::design::{parse_design, to_json, Design};

/// Fragment parameter that carries a design.
pub const FRAGMENT_KEY: &str = "d";

const ALPHABET: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

/// Encode bytes as unpadded base64url (RFC 4648 §5).
///
/// # Example
///
/// ```
/// assert_eq!(app::share::base64url_encode(b"pH 7?"), "cEggNz8");
/// ```
pub fn base64url_encode(bytes: &[u8]) -> String {
    let mut out = String::with_capacity(bytes.len().div_ceil(3) * 4);
    for chunk in bytes.chunks(3) {
        let b = [
            chunk.first().copied().unwrap_or(0),
            chunk.get(1).copied().unwrap_or(0),
            chunk.get(2).copied().unwrap_or(0),
        ];
        let n = (u32::from(b[0]) << 16) | (u32::from(b[1]) << 8) | u32::from(b[2]);
        let chars = chunk.len() + 1;
        for i in 0..chars {
            let idx = (n >> (18 - 6 * i)) & 63;
            if let Some(&c) = ALPHABET.get(idx as usize) {
                out.push(char::from(c));
            }
        }
    }
    out
}

fn sextet(c: u8) -> Option<u32> {
    let v = match c {
        b'A'..=b'Z' => c - b'A',
        b'a'..=b'z' => c - b'a' + 26,
        b'0'..=b'9' => c - b'0' + 52,
        // Accept the standard alphabet too: links pasted through tools that "fix" them.
        b'-' | b'+' => 62,
        b'_' | b'/' => 63,
        _ => return None,
    };
    Some(u32::from(v))
}

/// Decode base64url (padding and the standard `+/` alphabet are accepted).
///
/// # Errors
///
/// A message naming the first character that is not base64, or a length that
/// cannot come from any byte string.
pub fn base64url_decode(text: &str) -> Result<Vec<u8>, String> {
    let trimmed = text.trim().trim_end_matches('=');
    let bytes = trimmed.as_bytes();
    if bytes.len() % 4 == 1 {
        return Err(format!(
            "the encoded text has an impossible length ({} characters): it was probably cut short",
            bytes.len()
        ));
    }
    let mut out = Vec::with_capacity(bytes.len() / 4 * 3 + 2);
    for (ci, chunk) in bytes.chunks(4).enumerate() {
        let mut n: u32 = 0;
        for (i, &c) in chunk.iter().enumerate() {
            let v = sextet(c).ok_or_else(|| {
                format!(
                    "character {:?} at position {} is not allowed in a share link",
                    char::from(c),
                    ci * 4 + i + 1
                )
            })?;
            n |= v << (18 - 6 * i);
        }
        let [_, b0, b1, b2] = n.to_be_bytes();
        out.push(b0);
        if chunk.len() > 2 {
            out.push(b1);
        }
        if chunk.len() > 3 {
            out.push(b2);
        }
    }
    Ok(out)
}

/// The fragment (without `#`) that carries `design`.
pub fn encode_fragment(design: &Design) -> String {
    let mut d = design.clone();
    // A shared design is a new thing for the receiver: no save time.
    d.saved_at_ms = 0.0;
    format!(
        "{FRAGMENT_KEY}={}",
        base64url_encode(to_json(&d).as_bytes())
    )
}

/// Value of parameter `key` in a fragment or query (`#a=1&d=...` or `?a=1&d=...`).
pub fn param<'a>(text: &'a str, key: &str) -> Option<&'a str> {
    let text = text.trim_start_matches(['#', '?']);
    text.split('&').find_map(|pair| {
        let (k, v) = pair.split_once('=').unwrap_or((pair, ""));
        (k == key).then_some(v)
    })
}

/// Read the design carried by a fragment.
///
/// `None` when the fragment carries no design; `Some(Err(reason))` when it
/// does but the design cannot be used (cut short, bad field...).
pub fn decode_fragment(hash: &str) -> Option<Result<Design, String>> {
    let raw = param(hash, FRAGMENT_KEY)?;
    Some(decode_payload(raw))
}

fn decode_payload(raw: &str) -> Result<Design, String> {
    // Some mail programs percent-encode a trailing '=' or wrap long links.
    let cleaned: String = raw
        .replace("%3D", "")
        .replace("%3d", "")
        .chars()
        .filter(|c| !c.is_whitespace())
        .collect();
    if cleaned.is_empty() {
        return Err("the link carries an empty design".into());
    }
    let bytes = base64url_decode(&cleaned)?;
    let text = String::from_utf8(bytes).map_err(|_| {
        "the link's design is not readable text: it was probably cut short".to_string()
    })?;
    parse_design(&text).map_err(|e| e.to_string())
}

/// The page address `href` with its fragment replaced by one carrying `design`.
///
/// The query (`?embed=1&ws=field`) is kept, so a link made inside an embed
/// opens the same way.
pub fn share_url(href: &str, design: &Design) -> String {
    format!("{}#{}", strip_fragment(href), encode_fragment(design))
}

/// `href` without its fragment.
pub fn strip_fragment(href: &str) -> &str {
    href.split_once('#').map_or(href, |(base, _)| base)
}

/// `href` without query nor fragment (the full page, out of any embed options).
pub fn page_base(href: &str) -> &str {
    let base = strip_fragment(href);
    base.split_once('?').map_or(base, |(b, _)| b)
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
    use solver::design::demo_design;

    #[test]
    fn base64url_matches_rfc4648_vectors() {
        let cases: [(&str, &str); 7] = [
            ("", ""),
            ("f", "Zg"),
            ("fo", "Zm8"),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg"),
            ("fooba", "Zm9vYmE"),
            ("foobar", "Zm9vYmFy"),
        ];
        for (plain, enc) in cases {
            assert_eq!(base64url_encode(plain.as_bytes()), enc);
            assert_eq!(base64url_decode(enc), Ok(plain.as_bytes().to_vec()));
        }
    }

    #[test]
    fn base64url_uses_url_safe_alphabet_and_round_trips_all_bytes() {
        let all: Vec<u8> = (0..=255u8).collect();
        let enc = base64url_encode(&all);
        assert!(!enc.contains('+') && !enc.contains('/') && !enc.contains('='));
        assert_eq!(base64url_decode(&enc), Ok(all));
        // Standard alphabet and padding accepted.
        assert_eq!(base64url_decode("+/8="), base64url_decode("-_8"));
    }

    #[test]
    fn base64url_rejects_garbage_with_position() {
        let e = base64url_decode("Zm9v!g").unwrap_err();
        assert!(e.contains("'!'") && e.contains("position 5"), "{e}");
        let e = base64url_decode("Zm9vY").unwrap_err();
        assert!(e.contains("cut short"), "{e}");
    }

    #[test]
    fn fragment_round_trips_the_design_without_save_time() {
        let mut d = demo_design();
        d.saved_at_ms = 1_700_000_000_000.0;
        d.name = "Tank 3 — ünïcode µM".into();
        let frag = encode_fragment(&d);
        assert!(frag.starts_with("d="));
        let back = decode_fragment(&format!("#{frag}"))
            .and_then(Result::ok)
            .unwrap_or_else(demo_design);
        d.saved_at_ms = 0.0;
        assert_eq!(back, d);
    }

    #[test]
    fn fragment_without_design_is_none() {
        assert!(decode_fragment("").is_none());
        assert!(decode_fragment("#").is_none());
        assert!(decode_fragment("#section-2").is_none());
        assert!(decode_fragment("#x=1&dd=2").is_none());
    }

    #[test]
    fn cut_or_edited_links_are_refused_with_a_reason() {
        let frag = encode_fragment(&demo_design());
        let cut = frag.get(..frag.len() / 2).unwrap_or_default();
        let err = decode_fragment(cut)
            .and_then(Result::err)
            .unwrap_or_default();
        assert!(!err.is_empty());
        let empty = decode_fragment("#d=")
            .and_then(Result::err)
            .unwrap_or_default();
        assert!(empty.contains("empty"), "{empty}");
        // A valid encoding of a document with a bad field names the field.
        let bad = to_json(&demo_design()).replace("\"target_ph\":7.4", "\"target_ph\":15.0");
        let link = format!("#d={}", base64url_encode(bad.as_bytes()));
        let err = decode_fragment(&link)
            .and_then(Result::err)
            .unwrap_or_default();
        assert!(err.contains("recipe.target_ph"), "{err}");
    }

    #[test]
    fn share_url_keeps_query_and_replaces_fragment() {
        let d = demo_design();
        let url = share_url("file:///C:/lab/bufferwright.html?ws=field#d=old", &d);
        assert!(url.starts_with("file:///C:/lab/bufferwright.html?ws=field#d="));
        assert!(!url.contains("old"));
        let back = decode_fragment(url.split_once('#').map(|x| x.1).unwrap_or_default());
        assert!(matches!(back, Some(Ok(_))));
        assert_eq!(
            page_base("http://h/app/index.html?embed=1#d=x"),
            "http://h/app/index.html"
        );
        assert_eq!(strip_fragment("http://h/?a=1"), "http://h/?a=1");
    }

    #[test]
    fn param_reads_query_and_fragment_pairs() {
        assert_eq!(param("?embed=1&ws=field", "ws"), Some("field"));
        assert_eq!(param("#d=abc&x", "x"), Some(""));
        assert_eq!(param("ws=field", "embed"), None);
    }

    #[test]
    fn share_link_is_reasonably_short() {
        let frag = encode_fragment(&demo_design());
        // Well under the ~2000 characters some mail and chat tools keep.
        assert!(frag.len() < 2000, "{} characters", frag.len());
    }
}
