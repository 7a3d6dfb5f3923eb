//! Stable row keys: every list of rows (recipe salts, flask components and additions) names its
//! rows by a key from a counter, never by position, so a removed row takes its typed text, its
//! unit and its marks with it and the next row keeps its own.
//!
//! The design holds the rows in order and no keys (the document is unchanged); the page keeps one
//! key per row beside it ([`RowLists`], in `AppState::rows`). Keys are handed out by a counter
//! (no randomness); a design opened from outside starts each list again at 0, 1, 2… (its rows are
//! new rows). Every list edit goes through [`RowLists::removed`] (before the row leaves the
//! design) or is picked up by [`RowLists::keys`] (rows added at the end).

use leptos::prelude::*;
use std::collections::BTreeMap;

/// The keys of one list, in row order.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct RowKeys {
    keys: Vec<u64>,
    next: u64,
}

impl RowKeys {
    /// The keys for a list of `len` rows: rows added at the end get new keys,
    /// rows gone from the end lose theirs.
    pub fn sync(&mut self, len: usize) -> &[u64] {
        self.keys.truncate(len);
        while self.keys.len() < len {
            self.keys.push(self.next);
            self.next += 1;
        }
        &self.keys
    }

    /// Row `i` is about to be removed from the list: its key goes with it.
    pub fn remove(&mut self, i: usize) {
        if i < self.keys.len() {
            self.keys.remove(i);
        }
    }

    /// Where the row with `key` is now.
    pub fn position(&self, key: u64) -> Option<usize> {
        self.keys.iter().position(|k| *k == key)
    }
}

/// The row keys of every list of the page, by list name (`recipe-salt-`,
/// `mixture-comp-`, `mixture-add-`: the prefix of the rows' field ids).
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct RowLists {
    lists: BTreeMap<&'static str, RowKeys>,
}

impl RowLists {
    /// A design was opened from outside: every list starts again.
    pub fn reset(&mut self) {
        self.lists.clear();
    }

    /// The keys of list `name`, which now has `len` rows.
    pub fn keys(&mut self, name: &'static str, len: usize) -> Vec<u64> {
        self.lists.entry(name).or_default().sync(len).to_vec()
    }

    /// Row `i` of list `name` is about to be removed.
    pub fn removed(&mut self, name: &'static str, i: usize) {
        if let Some(l) = self.lists.get_mut(name) {
            l.remove(i);
        }
    }

    /// Where the row `key` of list `name` is now.
    pub fn position(&self, name: &'static str, key: u64) -> Option<usize> {
        self.lists.get(name).and_then(|l| l.position(key))
    }
}

/// The keys of list `name` as a `Memo`, for a keyed `<For>`: follows the
/// list's length and a design opened from outside (`rev`, the page's design revision).
pub fn keyed(
    name: &'static str,
    len: Memo<usize>,
    rows: StoredValue<RowLists>,
    rev: RwSignal<u64>,
) -> Memo<Vec<u64>> {
    Memo::new(move |_| {
        rev.track();
        let n = len.get();
        rows.try_update_value(|r| r.keys(name, n))
            .unwrap_or_default()
    })
}

/// A keyed list of rows: each row is built once for its key and kept while
/// the key lives (one instantiation of `<For>` for every list of the page).
#[component]
pub fn KeyedRows(
    /// The rows' keys, in order.
    keys: Memo<Vec<u64>>,
    /// Builds the row of a key.
    row: Callback<u64, AnyView>,
) -> impl IntoView {
    view! { <For each=move || keys.get() key=|k| *k children=move |k| row.run(k) /> }
}

/// Where the row `key` is now, following `keys`.
pub fn position(keys: Memo<Vec<u64>>, key: u64) -> Memo<Option<usize>> {
    Memo::new(move |_| keys.with(|k| k.iter().position(|x| *x == key)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_removed_row_takes_its_key_and_the_others_keep_theirs() {
        let mut r = RowLists::default();
        assert_eq!(r.keys("s", 2), vec![0, 1]);
        r.removed("s", 0);
        assert_eq!(r.keys("s", 1), vec![1], "the second row keeps its key");
        assert_eq!(r.position("s", 1), Some(0));
        assert_eq!(r.keys("s", 2), vec![1, 2], "a new row gets a new key");
        assert_eq!(r.keys("s", 1), vec![1]);
        assert_eq!(
            r.keys("s", 2),
            vec![1, 3],
            "a key is never handed out twice"
        );
        r.removed("s", 9);
        assert_eq!(r.keys("s", 2), vec![1, 3]);
        assert_eq!(r.keys("t", 1), vec![0], "each list has its own");
        r.reset();
        assert_eq!(r.keys("s", 2), vec![0, 1], "an opened design starts again");
    }
}
