//! Share links: a whole design carried in the URL fragment.
//!
//! Current links are `#z=<payload>.<check>`: the payload is the design's
//! compact JSON, deflate-compressed and written as unpadded base64url; the
//! check is the CRC-32 of the payload text in 8 hex digits, so a link edited
//! or mangled on the way is refused with the reason instead of opening a
//! different buffer. Links made before the check existed (`#d=<base64url of
//! JSON>`) still open, with a notice that they could not be checked.
//!
//! The fragment never reaches a server (browsers do not send it), so a share
//! link works from `file://`, from any static host and offline. Decoding goes
//! through [`solver::document::parse_design`], so an old or hand-edited link is
//! migrated and checked field by field like an imported file.
//!
//! Invariant: everything here is pure string work; the page glue that reads
//! `location` lives with the saved designs.

use base64::engine::general_purpose::{GeneralPurpose, GeneralPurposeConfig, URL_SAFE_NO_PAD};
use base64::engine::DecodePaddingMode;
use base64::{alphabet, Engine as _};
use solver::document::{parse_design, to_json, Design};

/// Fragment parameter of a checked, compressed link (current format).
pub const FRAGMENT_KEY: &str = "z";
/// Fragment parameter of the first link format (plain base64url JSON, no check).
pub const LEGACY_FRAGMENT_KEY: &str = "d";
/// Largest design a link may carry once inflated (bytes): a link is never a
/// way to make the page allocate without bound.
const MAX_INFLATED: usize = 1 << 20;

/// Decoding that accepts padding or none (links pasted through tools that add it).
const LENIENT: GeneralPurpose = GeneralPurpose::new(
    &alphabet::URL_SAFE,
    GeneralPurposeConfig::new()
        .with_encode_padding(false)
        .with_decode_padding_mode(DecodePaddingMode::Indifferent),
);
const LENIENT_STD: GeneralPurpose = GeneralPurpose::new(
    &alphabet::STANDARD,
    GeneralPurposeConfig::new()
        .with_encode_padding(false)
        .with_decode_padding_mode(DecodePaddingMode::Indifferent),
);

/// Encode bytes as unpadded base64url (RFC 4648 §5).
///
/// # Example
///
/// ```
/// assert_eq!(app::designs::share::base64url_encode(b"pH 7?"), "cEggNz8");
/// ```
pub fn base64url_encode(bytes: &[u8]) -> String {
    URL_SAFE_NO_PAD.encode(bytes)
}

/// Decode base64url (padding and the standard `+/` alphabet are accepted).
///
/// # Errors
///
/// A message saying the text is not base64 (with the position of the first
/// bad character) or was cut short.
pub fn base64url_decode(text: &str) -> Result<Vec<u8>, String> {
    let t = text.trim();
    let engine = if t.contains(['+', '/']) {
        &LENIENT_STD
    } else {
        &LENIENT
    };
    engine.decode(t).map_err(|e| match e {
        base64::DecodeError::InvalidByte(pos, b) => format!(
            "character {:?} at position {} is not allowed in a share link",
            char::from(b),
            pos + 1
        ),
        base64::DecodeError::InvalidLength(n) => format!(
            "the encoded text has an impossible length ({n} characters): it was probably cut short"
        ),
        _ => "the encoded text was cut short or edited".to_string(),
    })
}

/// The 8-hex-digit CRC-32 of a payload.
fn check_of(payload: &str) -> String {
    format!("{:08x}", crc32(payload.as_bytes()))
}

/// CRC-32 (the zlib/PNG one: reflected polynomial 0xEDB88320, all-ones start
/// and final xor), a bit at a time. Links are a few KB, so speed does not
/// matter here, and no 16 KB lookup table is shipped with the page.
fn crc32(bytes: &[u8]) -> u32 {
    let mut crc = !0u32;
    for &b in bytes {
        crc ^= u32::from(b);
        for _ in 0..8 {
            crc = (crc >> 1) ^ (0xEDB8_8320 & (crc & 1).wrapping_neg());
        }
    }
    !crc
}

/// The fragment (without `#`) that carries `design`.
pub fn encode_fragment(design: &Design) -> String {
    let mut d = design.clone();
    // A shared design is a new thing for the receiver: no save time.
    d.saved_at_ms = 0.0;
    let packed = miniz_oxide::deflate::compress_to_vec(to_json(&d).as_bytes(), 9);
    let payload = base64url_encode(&packed);
    let check = check_of(&payload);
    format!("{FRAGMENT_KEY}={payload}.{check}")
}

/// A design read from a link.
#[derive(Debug, Clone, PartialEq)]
pub struct LinkDesign {
    /// The design.
    pub design: Design,
    /// Whether the link carried a check that matched (`false`: a link made
    /// before links had one, opened without being checked).
    pub checked: bool,
}

/// What the page says when it opens a link that has no check.
pub const UNCHECKED_NOTE: &str =
    "This older link cannot be checked for changes made on the way: compare the amounts with the original before weighing.";

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
/// does but the design cannot be used (cut short, edited, bad field...).
pub fn decode_fragment(hash: &str) -> Option<Result<Design, String>> {
    decode_link(hash).map(|r| r.map(|l| l.design))
}

/// Read the design carried by a fragment, saying whether it was checked.
///
/// `None` when the fragment carries no design.
pub fn decode_link(hash: &str) -> Option<Result<LinkDesign, String>> {
    if let Some(raw) = param(hash, FRAGMENT_KEY) {
        return Some(decode_checked(raw).map(|design| LinkDesign {
            design,
            checked: true,
        }));
    }
    let raw = param(hash, LEGACY_FRAGMENT_KEY)?;
    Some(decode_legacy(raw).map(|design| LinkDesign {
        design,
        checked: false,
    }))
}

/// The link text as pasted: mail programs percent-encode a trailing `=` or
/// wrap long links.
fn cleaned(raw: &str) -> String {
    raw.replace("%3D", "")
        .replace("%3d", "")
        .chars()
        .filter(|c| !c.is_whitespace())
        .collect()
}

fn decode_checked(raw: &str) -> Result<Design, String> {
    let raw = cleaned(raw);
    if raw.is_empty() {
        return Err("the link carries an empty design".into());
    }
    let Some((payload, check)) = raw.rsplit_once('.') else {
        return Err("the link's check is missing: it was probably cut short".into());
    };
    if check.len() != 8 || check_of(payload) != check.to_ascii_lowercase() {
        return Err(
            "the link does not match its check: it was changed or cut on the way. Ask for the link again."
                .into(),
        );
    }
    let packed = base64url_decode(payload)?;
    let bytes = miniz_oxide::inflate::decompress_to_vec_with_limit(&packed, MAX_INFLATED)
        .map_err(|_| "the link's design cannot be unpacked".to_string())?;
    let text = String::from_utf8(bytes)
        .map_err(|_| "the link's design is not readable text".to_string())?;
    parse_design(&text).map_err(|e| super::reasons::plain_reason(&e))
}

fn decode_legacy(raw: &str) -> Result<Design, String> {
    let raw = cleaned(raw);
    if raw.is_empty() {
        return Err("the link carries an empty design".into());
    }
    let bytes = base64url_decode(&raw)?;
    let text = String::from_utf8(bytes).map_err(|_| {
        "the link's design is not readable text: it was probably cut short".to_string()
    })?;
    parse_design(&text).map_err(|e| super::reasons::plain_reason(&e))
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
mod tests {
    use super::*;
    use solver::document::demo_design;

    #[test]
    fn crc32_is_the_standard_one() {
        // The catalogued check value of CRC-32 (ISO-HDLC, as in zlib and PNG): common practice.
        assert_eq!(crc32(b"123456789"), 0xCBF4_3926);
        assert_eq!(crc32(b""), 0);
        // Links made before this function replaced the crc32fast crate open alike.
        let mut bytes = Vec::new();
        for n in 0..600u32 {
            assert_eq!(crc32(&bytes), crc32fast::hash(&bytes), "{n} bytes");
            bytes.push((n.wrapping_mul(2_654_435_761) >> 13) as u8);
        }
    }

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

    /// A link in the first format, as the page made it before links had a
    /// check (the demo design of that version, kept verbatim).
    fn legacy_link(d: &Design) -> String {
        format!("#d={}", base64url_encode(to_json(d).as_bytes()))
    }

    #[test]
    fn older_links_open_unchecked() {
        let d = demo_design();
        let got = decode_link(&legacy_link(&d)).unwrap().unwrap();
        assert!(!got.checked);
        assert_eq!(got.design.recipe, d.recipe);
        let now = decode_link(&format!("#{}", encode_fragment(&d)))
            .unwrap()
            .unwrap();
        assert!(now.checked);
    }

    #[test]
    fn any_one_character_edit_of_a_link_is_refused() {
        let frag = encode_fragment(&demo_design());
        let (_, payload) = frag.split_once('=').unwrap();
        let alphabet = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";
        for i in 0..payload.len() {
            let mut b = payload.as_bytes().to_vec();
            let c = b[i];
            if c == b'.' {
                continue;
            }
            b[i] = alphabet.iter().copied().find(|&a| a != c).unwrap();
            let edited = format!("#z={}", String::from_utf8(b).unwrap());
            match decode_link(&edited) {
                Some(Err(e)) => assert!(!e.is_empty()),
                other => panic!(
                    "edit at {i} opened: {:?}",
                    other.map(|r| r.map(|l| l.checked))
                ),
            }
        }
    }

    #[test]
    fn compressed_links_are_short() {
        let frag = encode_fragment(&demo_design());
        let legacy = legacy_link(&demo_design());
        // Measured: 583 vs 1106 characters for the demo design.
        assert!(
            frag.len() * 10 < legacy.len() * 6,
            "{} vs {}",
            frag.len(),
            legacy.len()
        );
    }

    #[test]
    fn fragment_round_trips_the_design_without_save_time() {
        let mut d = demo_design();
        d.saved_at_ms = 1_700_000_000_000.0;
        d.name = "Tank 3 — ünïcode µM".into();
        let frag = encode_fragment(&d);
        assert!(frag.starts_with("z="));
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
        assert!(err.contains("the Recipe, target pH"), "{err}");
        let packed = miniz_oxide::deflate::compress_to_vec(bad.as_bytes(), 9);
        let payload = base64url_encode(&packed);
        let link = format!("#z={payload}.{}", check_of(&payload));
        let err = decode_fragment(&link)
            .and_then(Result::err)
            .unwrap_or_default();
        assert!(err.contains("the Recipe, target pH"), "{err}");
    }

    #[test]
    fn share_url_keeps_query_and_replaces_fragment() {
        let d = demo_design();
        let url = share_url("file:///C:/lab/bufferwright.html?ws=field#d=old", &d);
        assert!(url.starts_with("file:///C:/lab/bufferwright.html?ws=field#z="));
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
        assert!(frag.len() < 800, "{} characters", frag.len());
    }
}
