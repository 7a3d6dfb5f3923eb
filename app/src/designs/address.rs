//! The address links and QR codes point at: the page's own address, or the one the user says the page is served from (kept per browser), and whether a link only opens on this computer.

use super::kv::{KvStore, LocalStore};
use super::share::page_base;

/// Local-storage key of the address the user gave (plain text, an http(s) address).
pub const PAGE_ADDRESS_KEY: &str = "bufferwright.pageaddress";

/// Longest address accepted, characters.
const ADDRESS_MAX: usize = 500;

/// The address a link starts with: the user's address when given, else the page's own.
pub fn link_base(href: &str, given: Option<&str>) -> String {
    match given {
        Some(a) if !a.is_empty() => a.to_string(),
        _ => page_base(href).to_string(),
    }
}

/// Whether a link on `base` opens only on this computer (a file on disk, or a server on
/// this machine's own loopback address).
pub fn only_here(base: &str) -> bool {
    let lower = base.to_ascii_lowercase();
    if lower.starts_with("file:") {
        return true;
    }
    let host = lower
        .split_once("://")
        .map_or("", |(_, rest)| rest)
        .split(['/', '?', '#'])
        .next()
        .unwrap_or_default();
    let host = host.rsplit_once('@').map_or(host, |(_, h)| h);
    let name = if host.starts_with('[') {
        host.split(']')
            .next()
            .map_or(host, |h| h.trim_start_matches('['))
    } else {
        host.split(':').next().unwrap_or(host)
    };
    name == "localhost" || name.starts_with("127.") || name == "::1" || name == "0.0.0.0"
}

/// The address as typed, checked: empty (use the page's own), or an `http://` or
/// `https://` address without `#` or `?` parts.
///
/// # Errors
/// Why the address cannot be used, in plain words.
pub fn check_address(text: &str) -> Result<String, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(String::new());
    }
    if t.chars().count() > ADDRESS_MAX {
        return Err(format!("longer than {ADDRESS_MAX} characters"));
    }
    let lower = t.to_ascii_lowercase();
    let rest = lower
        .strip_prefix("https://")
        .or_else(|| lower.strip_prefix("http://"))
        .ok_or("an address starts with https:// or http:// (as in https://lab.example.org/bufferwright/)")?;
    if rest.is_empty() || rest.starts_with('/') {
        return Err("the address names no server".into());
    }
    if t.contains(['#', '?']) || t.chars().any(char::is_whitespace) {
        return Err("give the page's address only, without spaces, # or ? parts".into());
    }
    Ok(t.to_string())
}

/// The address kept in this browser, if any.
pub fn load() -> Option<String> {
    let kv = LocalStore::open().ok()?;
    let a = kv.get(PAGE_ADDRESS_KEY).ok().flatten()?;
    check_address(&a).ok().filter(|a| !a.is_empty())
}

/// Keep (or, for an empty address, forget) the address in this browser.
///
/// # Errors
/// Storage errors, in plain words.
pub fn store(address: &str) -> Result<(), String> {
    let mut kv = LocalStore::open().map_err(|e| e.to_string())?;
    if address.is_empty() {
        kv.remove(PAGE_ADDRESS_KEY).map_err(|e| e.to_string())
    } else {
        kv.set(PAGE_ADDRESS_KEY, address).map_err(|e| e.to_string())
    }
}

/// What the page says beside a link on `base`, when it only opens here.
pub fn local_note(base: &str) -> Option<&'static str> {
    only_here(base).then_some(
        "This link only works on this computer: the page is opened from a file or from this \
         computer's own server. Give the address the page is served from (below the link) so \
         that other devices can open links and QR codes.",
    )
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn file_and_loopback_links_only_open_here() {
        assert!(only_here("file:///home/me/bufferwright.html"));
        assert!(only_here("http://127.0.0.1:8080/"));
        assert!(only_here("http://localhost/bw/"));
        assert!(only_here("http://[::1]:8080/"));
        assert!(!only_here("https://lab.example.org/bufferwright/"));
        assert!(!only_here("https://localhost.example.org/"));
    }

    #[test]
    fn the_given_address_replaces_the_pages_own() {
        let href = "file:///home/me/bufferwright.html?x=1#z=abc";
        assert_eq!(link_base(href, None), "file:///home/me/bufferwright.html");
        assert_eq!(
            link_base(href, Some("https://lab.example.org/bw/")),
            "https://lab.example.org/bw/"
        );
    }

    #[test]
    fn addresses_are_checked_in_plain_words() {
        assert_eq!(check_address("  ").unwrap(), "");
        assert_eq!(
            check_address(" https://lab.example.org/bw/ ").unwrap(),
            "https://lab.example.org/bw/"
        );
        assert!(check_address("lab.example.org").is_err());
        assert!(check_address("https://").is_err());
        assert!(check_address("https://a.org/#z=1").is_err());
        assert!(check_address("javascript:alert(1)").is_err());
    }
}
