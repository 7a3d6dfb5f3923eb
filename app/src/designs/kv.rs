//! Key-value adapter: the [`KvStore`] trait, [`MemStore`] for tests and [`LocalStore`] over the browser's storage.

use std::collections::BTreeMap;

/// Why storage refused.
#[derive(Debug, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum StoreError {
    /// Storage cannot be used at all (private mode, disabled by policy).
    Unavailable(String),
    /// The browser's storage quota is used up.
    Full,
    /// The design asked for is not stored (deleted in another tab?).
    Missing(String),
    /// Anything else the browser reported.
    Other(String),
}

impl std::fmt::Display for StoreError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            StoreError::Unavailable(why) => write!(
                f,
                "Browser storage is not available here ({why}): designs cannot be saved in this \
                 browser. Your work stays on screen; use “Export this design” to keep it in a file."
            ),
            StoreError::Full => write!(
                f,
                "Browser storage is full: nothing was saved. Your design is still on screen. \
                 Export it to a file, or delete saved designs you no longer need, then save again."
            ),
            StoreError::Missing(id) => write!(
                f,
                "That saved design is no longer stored (id {id}); it may have been deleted in another tab."
            ),
            StoreError::Other(why) => write!(f, "Browser storage refused: {why}"),
        }
    }
}

/// A minimal string key-value store: browser local storage or memory.
pub trait KvStore {
    /// Value of `key`, `None` if absent.
    ///
    /// # Errors
    /// Storage unusable.
    fn get(&self, key: &str) -> Result<Option<String>, StoreError>;
    /// Store `value` under `key`.
    ///
    /// # Errors
    /// [`StoreError::Full`] when the quota would be exceeded (nothing is written).
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError>;
    /// Remove `key` (absent keys are fine).
    ///
    /// # Errors
    /// Storage unusable.
    fn remove(&mut self, key: &str) -> Result<(), StoreError>;
    /// Every key.
    ///
    /// # Errors
    /// Storage unusable.
    fn keys(&self) -> Result<Vec<String>, StoreError>;
}

/// In-memory store with an optional quota, for tests and for pages without storage.
#[derive(Debug, Clone, Default)]
pub struct MemStore {
    /// Contents.
    pub map: BTreeMap<String, String>,
    /// Quota in bytes of keys + values (local storage counts UTF-16 units; close enough).
    pub quota: Option<usize>,
    /// Fail every `set` whose key starts with this (simulates a write failing midway).
    pub fail_set_prefix: Option<String>,
}

impl MemStore {
    /// Bytes used.
    pub fn used(&self) -> usize {
        self.map.iter().map(|(k, v)| k.len() + v.len()).sum()
    }
}

impl KvStore for MemStore {
    fn get(&self, key: &str) -> Result<Option<String>, StoreError> {
        Ok(self.map.get(key).cloned())
    }
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError> {
        if let Some(p) = &self.fail_set_prefix {
            if key.starts_with(p.as_str()) {
                return Err(StoreError::Full);
            }
        }
        if let Some(q) = self.quota {
            let old = self.map.get(key).map_or(0, |v| key.len() + v.len());
            if self.used() - old + key.len() + value.len() > q {
                return Err(StoreError::Full);
            }
        }
        self.map.insert(key.to_string(), value.to_string());
        Ok(())
    }
    fn remove(&mut self, key: &str) -> Result<(), StoreError> {
        self.map.remove(key);
        Ok(())
    }
    fn keys(&self) -> Result<Vec<String>, StoreError> {
        Ok(self.map.keys().cloned().collect())
    }
}

/// The page's `window.localStorage`.
#[derive(Debug, Clone)]
pub struct LocalStore {
    storage: web_sys::Storage,
}

impl LocalStore {
    /// Open local storage; fails in private modes and when blocked by policy.
    ///
    /// # Errors
    /// [`StoreError::Unavailable`] naming what the browser said.
    pub fn open() -> Result<Self, StoreError> {
        let w = web_sys::window().ok_or_else(|| StoreError::Unavailable("no window".into()))?;
        match w.local_storage() {
            Ok(Some(storage)) => Ok(Self { storage }),
            Ok(None) => Err(StoreError::Unavailable("the browser offers none".into())),
            Err(e) => Err(StoreError::Unavailable(js_error_text(&e))),
        }
    }

    /// Open this tab's session storage (it survives reloads of the tab, not its closing).
    ///
    /// # Errors
    /// [`StoreError::Unavailable`] naming what the browser said.
    pub fn open_session() -> Result<Self, StoreError> {
        let w = web_sys::window().ok_or_else(|| StoreError::Unavailable("no window".into()))?;
        match w.session_storage() {
            Ok(Some(storage)) => Ok(Self { storage }),
            Ok(None) => Err(StoreError::Unavailable("the browser offers none".into())),
            Err(e) => Err(StoreError::Unavailable(js_error_text(&e))),
        }
    }
}

fn js_error_name(e: &wasm_bindgen::JsValue) -> String {
    js_sys::Reflect::get(e, &wasm_bindgen::JsValue::from_str("name"))
        .ok()
        .and_then(|v| v.as_string())
        .unwrap_or_default()
}

fn js_error_text(e: &wasm_bindgen::JsValue) -> String {
    let msg = js_sys::Reflect::get(e, &wasm_bindgen::JsValue::from_str("message"))
        .ok()
        .and_then(|v| v.as_string())
        .or_else(|| e.as_string())
        .unwrap_or_default();
    let name = js_error_name(e);
    match (name.is_empty(), msg.is_empty()) {
        (true, true) => "access refused".into(),
        (false, true) => name,
        (true, false) => msg,
        (false, false) => format!("{name}: {msg}"),
    }
}

fn unavailable(e: &wasm_bindgen::JsValue) -> StoreError {
    StoreError::Unavailable(js_error_text(e))
}

impl KvStore for LocalStore {
    fn get(&self, key: &str) -> Result<Option<String>, StoreError> {
        self.storage.get_item(key).map_err(|e| unavailable(&e))
    }
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError> {
        self.storage.set_item(key, value).map_err(|e| {
            let name = js_error_name(&e);
            if name == "QuotaExceededError" || name == "NS_ERROR_DOM_QUOTA_REACHED" {
                StoreError::Full
            } else if name == "SecurityError" {
                unavailable(&e)
            } else {
                StoreError::Other(js_error_text(&e))
            }
        })
    }
    fn remove(&mut self, key: &str) -> Result<(), StoreError> {
        self.storage.remove_item(key).map_err(|e| unavailable(&e))
    }
    fn keys(&self) -> Result<Vec<String>, StoreError> {
        // One call for all keys (`Object.keys(localStorage)`), not one call per key.
        Ok(js_sys::Object::keys(&self.storage)
            .iter()
            .filter_map(|v| v.as_string())
            .collect())
    }
}
#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn mem_store_reads_writes_and_lists() {
        let mut kv = MemStore::default();
        assert_eq!(kv.get("a"), Ok(None));
        kv.set("a", "1").unwrap();
        kv.set("b", "22").unwrap();
        assert_eq!(kv.get("a"), Ok(Some("1".into())));
        assert_eq!(kv.keys(), Ok(vec!["a".to_string(), "b".to_string()]));
        assert_eq!(kv.used(), 5);
        kv.remove("a").unwrap();
        kv.remove("never there").unwrap();
        assert_eq!(kv.keys(), Ok(vec!["b".to_string()]));
    }

    #[test]
    fn mem_store_quota_refuses_without_writing_and_counts_replacements() {
        let mut kv = MemStore {
            quota: Some(10),
            ..MemStore::default()
        };
        kv.set("k", "12345678").unwrap(); // 9 bytes
        assert_eq!(kv.set("x", "12"), Err(StoreError::Full));
        assert_eq!(kv.get("x"), Ok(None));
        // Replacing a value counts only the difference.
        kv.set("k", "123456789").unwrap();
        assert_eq!(kv.used(), 10);
        kv.fail_set_prefix = Some("bad.".into());
        assert_eq!(kv.set("bad.1", ""), Err(StoreError::Full));
    }

    #[test]
    fn store_errors_say_what_to_do() {
        assert!(StoreError::Full.to_string().contains("nothing was saved"));
        assert!(StoreError::Unavailable("x".into())
            .to_string()
            .contains("Export this design"));
        assert!(StoreError::Missing("k1".into()).to_string().contains("k1"));
    }
}
