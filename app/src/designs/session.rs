//! Start-up and this tab's session: tab id and sign of life, autosave to this tab's draft, share links that set work aside, Recovery actions, changes made by other tabs.

use super::conflicts::{external_change, External};
use super::drafts::{
    choose_tab_id, closed_drafts, draft_key, draft_worth_keeping, holds_work, load_stored,
    mark_alive, mark_closed, migrate_legacy, new_tab_id, parse_stored, set_aside, stored_text,
    Draft, StoredDraft, ALIVE_EVERY_MS, ALIVE_PREFIX, SET_ASIDE_PREFIX, TAB_DRAFT_PREFIX,
    TAB_ID_KEY,
};
use super::embed::{parse_query, UrlOptions};
use super::index::{design_key, read_design, same_content, INDEX_KEY, PREFIX, QUARANTINE_PREFIX};
use super::kv::{KvStore, LocalStore, StoreError};
use super::store::{now_ms, Keeping, NoticeAction, NoticeKind, OpenRef, Store};
use super::transfer::{export_one, file_name, import_designs};
use super::when::local_when;
use crate::designs::share;
use crate::state::AppState;
use crate::state::ViewOptions;
use leptos::prelude::*;
use solver::document::Design;

impl Store {
    /// Load a draft, re-linking it to its saved design when that still matches.
    pub(crate) fn apply_draft(&self, kv: &dyn KvStore, draft: Draft) {
        let stored = draft
            .open_id
            .as_deref()
            .and_then(|id| read_design(kv, id).ok());
        let open_id = draft.open_id.clone();
        match (
            open_id,
            external_change(stored, draft.base_saved_at_ms, draft.dirty),
        ) {
            (Some(id), External::Unchanged) => {
                if let Ok(saved) = read_design(kv, &id) {
                    self.open.set(Some(OpenRef { id, saved }));
                }
                self.state.load(draft.design);
            }
            (Some(id), External::Reload(theirs)) => {
                let theirs = *theirs;
                self.open.set(Some(OpenRef {
                    id,
                    saved: theirs.clone(),
                }));
                self.notify(
                    NoticeKind::Info,
                    format!(
                        "“{}” was updated in another tab; showing the newer version.",
                        theirs.name
                    ),
                    None,
                );
                self.state.load(theirs);
            }
            (Some(id), External::Diverged(theirs)) => {
                let theirs = *theirs;
                // Keep the edits; the next save will report the conflict.
                let mut base = theirs.clone();
                base.saved_at_ms = draft.base_saved_at_ms;
                self.open.set(Some(OpenRef { id, saved: base }));
                self.notify(
                    NoticeKind::Warn,
                    format!(
                        "“{}” was saved in another tab since you edited it here. Your unsaved changes are kept; saving will ask what to keep.",
                        theirs.name
                    ),
                    None,
                );
                self.state.load(draft.design);
            }
            (_, _) => {
                self.open.set(None);
                self.state.load(draft.design);
            }
        }
    }

    /// Follow a storage change made by another tab.
    pub(crate) fn on_storage_event(&self, key: Option<String>, removed: bool) {
        match key.as_deref() {
            Some(k) if !k.starts_with(PREFIX) => return,
            // Another tab's sign of life or draft: only a closed tab (its sign
            // removed) or a change to the set-aside or damaged entries changes
            // the Recovery list; the saved designs are untouched.
            Some(k) if k.starts_with(ALIVE_PREFIX) => {
                if removed {
                    self.refresh_recovery(false);
                }
                return;
            }
            Some(k) if k.starts_with(TAB_DRAFT_PREFIX) => return,
            Some(k) if k.starts_with(SET_ASIDE_PREFIX) || k.starts_with(QUARANTINE_PREFIX) => {
                self.refresh_recovery(false);
                return;
            }
            _ => {}
        }
        self.refresh(false);
        let Some(open) = self.open.get_untracked() else {
            return;
        };
        if key
            .as_deref()
            .is_some_and(|k| k != design_key(&open.id) && k != INDEX_KEY)
        {
            return;
        }
        let Some(kv) = self.kv() else {
            return;
        };
        let stored = read_design(&kv, &open.id).ok();
        let dirty = self.dirty();
        match external_change(stored, open.saved.saved_at_ms, dirty) {
            External::Unchanged => {}
            External::Deleted => {
                self.open.set(None);
                self.notify(
                    NoticeKind::Warn,
                    format!(
                        "“{}” was deleted in another tab. It stays on screen here; save it to keep it.",
                        open.saved.name
                    ),
                    None,
                );
            }
            External::Reload(theirs) => {
                let theirs = *theirs;
                self.open.set(Some(OpenRef {
                    id: open.id.clone(),
                    saved: theirs.clone(),
                }));
                let ws = self.state.design.with_untracked(|d| d.workspace);
                let mut shown = theirs.clone();
                shown.workspace = ws;
                self.state.load(shown);
                self.notify(
                    NoticeKind::Info,
                    format!("“{}” was saved in another tab; this tab now shows that version.", theirs.name),
                    None,
                );
            }
            External::Diverged(theirs) => self.notify(
                NoticeKind::Warn,
                format!(
                    "“{}” was saved in another tab at {}. Your unsaved changes here are kept; saving will ask before overwriting.",
                    theirs.name,
                    local_when(theirs.saved_at_ms)
                ),
                None,
            ),
        }
    }

    /// This tab's draft record for `design`.
    pub(super) fn draft_record(&self, design: &Design) -> StoredDraft {
        let open = self.open.get_untracked();
        let draft = Draft {
            design: design.clone(),
            dirty: open
                .as_ref()
                .is_none_or(|o| !same_content(&o.saved, design)),
            base_saved_at_ms: open.as_ref().map_or(0.0, |o| o.saved.saved_at_ms),
            open_id: open.map(|o| o.id),
        };
        let from_link = self
            .link_design
            .with_value(|l| l.as_ref().is_some_and(|l| same_content(l, design)));
        if !from_link {
            // Changed once, it is the user's work from now on.
            self.link_design.set_value(None);
        }
        StoredDraft {
            from_link,
            ..StoredDraft::new(draft, now_ms())
        }
    }

    /// Write the working design to this tab's draft, and say honestly whether that worked.
    pub(crate) fn autosave(&self, design: &Design) {
        // Never store what the reader would refuse: the last readable draft stays.
        if let Some(why) = super::rules::document_problem(design) {
            self.keeping.set(Keeping::Held(why));
            return;
        }
        let rec = self.draft_record(design);
        let key = draft_key(&self.tab.get_value());
        let result = LocalStore::open().and_then(|mut kv| kv.set(&key, &stored_text(&rec)));
        let was_failing = self
            .keeping
            .with_untracked(|k| matches!(k, Keeping::Failing(_)));
        let was_held = self
            .keeping
            .with_untracked(|k| matches!(k, Keeping::Held(_)));
        match result {
            Ok(()) => {
                if was_failing {
                    self.notify(
                        NoticeKind::Info,
                        "Automatic keeping of your work has resumed.",
                        None,
                    );
                } else if was_held {
                    self.notify(
                        NoticeKind::Info,
                        "Your work is kept automatically again.",
                        None,
                    );
                }
                self.keeping.set(Keeping::Kept);
            }
            Err(e) => {
                let why = match e {
                    StoreError::Full => "browser storage is full".to_string(),
                    StoreError::Unavailable(w) => format!("browser storage is not available: {w}"),
                    other => other.to_string(),
                };
                if !was_failing {
                    self.notify(
                        NoticeKind::Warn,
                        format!(
                            "Your work can no longer be kept automatically ({why}). It is still on screen; export it or free some space."
                        ),
                        None,
                    );
                }
                self.keeping.set(Keeping::Failing(why));
            }
        }
    }

    /// Give this tab a new id, leaving its old draft behind as the draft of a
    /// closed tab (listed under Recovery). Used when setting work aside fails:
    /// nothing needs writing for the old draft to stay where it is.
    fn leave_draft_behind(&self, kv: &mut LocalStore) {
        let old = self.tab.get_value();
        mark_closed(kv, &old);
        let tab = new_tab_id(kv, now_ms());
        if let Ok(mut session) = LocalStore::open_session() {
            let _ = session.set(TAB_ID_KEY, &tab);
        }
        let _ = mark_alive(kv, &tab, now_ms());
        self.tab.set_value(tab);
    }

    /// Keep this tab's current work before `incoming` replaces it.
    /// `Ok(Some(key))`: set aside under `key`; `Ok(None)`: nothing to keep;
    /// `Err(())`: storage refused, the old draft was left behind under its
    /// own key instead (still listed under Recovery).
    pub(super) fn keep_current(
        &self,
        kv: &mut LocalStore,
        current: Option<StoredDraft>,
        incoming: &Design,
        why: &str,
    ) -> Result<Option<String>, ()> {
        let Some(cur) = current else {
            return Ok(None);
        };
        if cur.from_link || !holds_work(kv, &cur) || !draft_worth_keeping(&cur.draft, incoming) {
            return Ok(None);
        }
        match set_aside(kv, &cur.draft, why, now_ms()) {
            Ok(key) => Ok(Some(key)),
            Err(_) => {
                self.leave_draft_behind(kv);
                Err(())
            }
        }
    }

    /// Bring back an entry of the Recovery list (set-aside work, a closed
    /// tab's draft, or a damaged entry that reads again). The work on screen
    /// is set aside first when it holds anything worth keeping.
    pub fn recovery_open(&self, key: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        let raw = match kv.get(key) {
            Ok(Some(r)) => r,
            Ok(None) => {
                self.notify(
                    NoticeKind::Warn,
                    "That entry is no longer stored (it may have been opened in another tab).",
                    None,
                );
                self.refresh_recovery(false);
                return;
            }
            Err(e) => return self.fail(&e),
        };
        if key.starts_with(QUARANTINE_PREFIX) {
            if let Ok(d) = solver::document::parse_design(&raw) {
                match import_designs(&mut kv, std::slice::from_ref(&d), now_ms()) {
                    Ok(_) => {
                        let _ = kv.remove(key);
                        self.notify(
                            NoticeKind::Info,
                            format!(
                                "“{}” reads again and is back among the saved designs.",
                                d.name
                            ),
                            None,
                        );
                        self.refresh(false);
                    }
                    Err(e) => self.fail(&e),
                }
                return;
            }
        }
        let stored = match parse_stored(&raw) {
            Ok(s) => s,
            Err(why) => {
                self.notify(
                    NoticeKind::Error,
                    format!("This entry cannot be opened: {why}. Export it to keep the text."),
                    None,
                );
                return;
            }
        };
        let current = self.state.design.with_untracked(|d| self.draft_record(d));
        let kept = self.keep_current(
            &mut kv,
            Some(current),
            &stored.draft.design,
            "replaced when you brought back other work",
        );
        if kept.is_err() {
            self.notify(
                NoticeKind::Error,
                "Storage is full: your current work could not be set aside, so nothing was replaced. Export it or free some space first.",
                None,
            );
            self.refresh_recovery(false);
            return;
        }
        let _ = kv.remove(key);
        self.link_design.set_value(None);
        let name = stored.draft.design.name.clone();
        self.apply_draft(&kv, stored.draft);
        let extra = if matches!(kept, Ok(Some(_))) {
            " The work that was on screen is listed under Recovery."
        } else {
            ""
        };
        self.notify(
            NoticeKind::Info,
            format!("Your previous work “{name}” is back.{extra}"),
            None,
        );
        self.refresh_recovery(false);
    }

    /// Download a Recovery entry: the design as a design file, or a damaged
    /// entry's text exactly as it was stored.
    pub fn recovery_export(&self, key: &str) {
        let Some(kv) = self.kv() else {
            return;
        };
        let Ok(Some(raw)) = kv.get(key) else {
            return;
        };
        if let Ok(s) = parse_stored(&raw) {
            let d = s.draft.design;
            return download(&file_name(&d.name), &export_one(&d));
        }
        if let Ok(d) = solver::document::parse_design(&raw) {
            return download(&file_name(&d.name), &export_one(&d));
        }
        let id: String = key
            .trim_start_matches(PREFIX)
            .chars()
            .map(|c| if c.is_ascii_alphanumeric() { c } else { '-' })
            .collect();
        download(&format!("damaged-{id}.txt"), &raw);
    }

    /// Delete a Recovery entry, offering undo.
    pub fn recovery_delete(&self, key: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        let Ok(Some(raw)) = kv.get(key) else {
            self.refresh_recovery(false);
            return;
        };
        let title = self
            .recovery
            .with_untracked(|r| r.iter().find(|i| i.key == key).map(|i| i.title.clone()))
            .unwrap_or_else(|| "the entry".into());
        match kv.remove(key) {
            Ok(()) => {
                self.notify(
                    NoticeKind::Info,
                    format!("Deleted “{title}” from Recovery."),
                    Some(NoticeAction::UndoRecoveryDelete {
                        key: key.to_string(),
                        raw,
                    }),
                );
                self.refresh_recovery(false);
            }
            Err(e) => self.fail(&e),
        }
    }

    /// Put a deleted Recovery entry back.
    pub fn undo_recovery_delete(&self, key: &str, raw: &str) {
        if let Some(mut kv) = self.kv() {
            if let Err(e) = kv.set(key, raw) {
                self.fail(&e);
            }
            self.refresh_recovery(false);
        }
    }
}

fn location_parts() -> (String, String, String) {
    let loc = window().location();
    (
        loc.search().unwrap_or_default(),
        loc.hash().unwrap_or_default(),
        loc.href().unwrap_or_default(),
    )
}

/// Drop the fragment from the address bar, so a reload shows the (autosaved)
/// edits instead of the link's original design.
fn forget_fragment(href: &str) {
    if let Ok(history) = window().history() {
        let _ = history.replace_state_with_url(
            &wasm_bindgen::JsValue::NULL,
            "",
            Some(share::strip_fragment(href)),
        );
    }
}

/// Read a share-link fragment: set this tab's unsaved work aside (in the
/// list under Recovery) when the link replaces it, report a broken link, and
/// drop the fragment from the address bar (except in embeds, whose reload
/// must show the preset again).
fn open_fragment(
    store: &Store,
    kv: Option<&mut LocalStore>,
    hash: &str,
    href: &str,
) -> Option<Design> {
    match share::decode_link(hash)? {
        Ok(share::LinkDesign { design: d, checked }) => {
            if !checked {
                store.notify(NoticeKind::Info, share::UNCHECKED_NOTE, None);
            }
            if !store.ephemeral {
                if let Some(kv) = kv {
                    let key = draft_key(&store.tab.get_value());
                    let current = kv
                        .get(&key)
                        .ok()
                        .flatten()
                        .and_then(|t| parse_stored(&t).ok());
                    match store.keep_current(kv, current, &d, "replaced by a design opened from a share link") {
                        Ok(Some(key)) => store.notify(
                            NoticeKind::Info,
                            "Opened the design from the link. Your previous unsaved work was kept aside (see Recovery).",
                            Some(NoticeAction::RestoreSetAside { key }),
                        ),
                        Ok(None) => {}
                        Err(()) => store.notify(
                            NoticeKind::Warn,
                            "Opened the design from the link. Storage is full, so your previous unsaved work was left where it was kept; it is listed under Recovery.",
                            None,
                        ),
                    }
                }
                store.link_design.set_value(Some(d.clone()));
                forget_fragment(href);
            }
            Some(d)
        }
        Err(why) => {
            store.notify(
                NoticeKind::Error,
                format!("The design in this link could not be opened: {why}."),
                None,
            );
            if !store.ephemeral {
                forget_fragment(href);
            }
            None
        }
    }
}

/// Choose this tab's id, keep it in session storage, and keep its sign of
/// life fresh until the tab is hidden for good.
fn start_tab(store: Store, kv: &mut LocalStore) {
    let mut session = LocalStore::open_session().ok();
    let sid = session
        .as_ref()
        .and_then(|s| s.get(TAB_ID_KEY).ok().flatten());
    let tab = choose_tab_id(sid.as_deref(), kv, now_ms());
    if let Some(s) = session.as_mut() {
        let _ = s.set(TAB_ID_KEY, &tab);
    }
    let _ = mark_alive(kv, &tab, now_ms());
    store.tab.set_value(tab);
    set_interval(
        move || {
            if let Ok(mut kv) = LocalStore::open() {
                let _ = mark_alive(&mut kv, &store.tab.get_value(), now_ms());
            }
        },
        std::time::Duration::from_millis(ALIVE_EVERY_MS),
    );
    let on_hide = move |_: web_sys::Event| {
        if let Ok(mut kv) = LocalStore::open() {
            mark_closed(&mut kv, &store.tab.get_value());
        }
    };
    let on_show = move |_: web_sys::Event| {
        // Back from the page cache: the tab is open again.
        if let Ok(mut kv) = LocalStore::open() {
            let _ = mark_alive(&mut kv, &store.tab.get_value(), now_ms());
        }
    };
    std::mem::forget(window_event_listener_untyped("pagehide", on_hide));
    std::mem::forget(window_event_listener_untyped("pageshow", on_show));
}

/// This tab's draft, or (a new tab) the newest draft a closed tab left, taken over.
fn draft_for_this_tab(store: &Store, kv: &mut LocalStore) -> Option<Draft> {
    let tab = store.tab.get_value();
    let own = draft_key(&tab);
    match load_stored(kv, &own, now_ms()) {
        Ok(Ok(Some(s))) => {
            if s.from_link {
                store.link_design.set_value(Some(s.draft.design.clone()));
            }
            return Some(s.draft);
        }
        Ok(Ok(None)) => {}
        Ok(Err(q)) => {
            // One unreadable workspace must not cost the others: bring back what reads.
            let raw = q
                .moved_to
                .as_deref()
                .and_then(|k| kv.get(k).ok().flatten())
                .or_else(|| kv.get(&own).ok().flatten());
            if let Some((s, refused)) = raw.as_deref().and_then(super::rules::salvage_stored) {
                if kv.set(&own, &stored_text(&s)).is_ok() {
                    store.notify(
                        NoticeKind::Warn,
                        super::rules::salvage_notice(&refused),
                        None,
                    );
                    store.refresh_recovery(false);
                    return Some(s.draft);
                }
            }
            store.report_quarantine(&[q]);
        }
        Err(e) => {
            store.fail(&e);
            return None;
        }
    }
    let (closed, bad) = closed_drafts(kv, &tab, now_ms(), true).unwrap_or_default();
    store.report_quarantine(&bad);
    let first = closed.first()?;
    // Move it: write it as this tab's draft, then remove the old key.
    let mut taken = first.stored.clone();
    taken.updated_ms = now_ms();
    if kv.set(&own, &stored_text(&taken)).is_err() {
        return None; // it stays listed under Recovery
    }
    let _ = kv.remove(&first.key);
    if let Some(old) = first.key.strip_prefix(TAB_DRAFT_PREFIX) {
        super::side::move_side(kv, old, &tab);
    }
    let more = closed.len() - 1;
    let rest = match more {
        0 => String::new(),
        1 => " One more is listed under Recovery.".into(),
        n => format!(" {n} more are listed under Recovery."),
    };
    store.notify(
        NoticeKind::Info,
        format!(
            "Your unsaved work “{}” from a tab that was closed is back (last changed {}).{rest}",
            taken.draft.design.name,
            local_when(first.stored.updated_ms)
        ),
        None,
    );
    Some(taken.draft)
}

/// Start-up: URL options, the design to show, autosave and two-tab sync.
///
/// Call once inside the root component, after `provide_context(state)`.
/// Provides the [`Store`] context used by `DesignsPanel`.
///
/// Order: `?embed=1&readonly=1&ws=` set `state.view` and the workspace; the
/// design is the share link's, else this tab's draft (or the newest one a
/// closed tab left), else the demo. Embed and read-only views never read nor
/// write drafts.
pub fn init(state: AppState) {
    let (search, hash, href) = location_parts();
    let opts: UrlOptions = parse_query(&search);
    state.view.set(ViewOptions {
        embed: opts.embed,
        readonly: opts.readonly,
    });
    let store = Store::new(state, opts.ephemeral());
    provide_context(store);

    let mut kv = match LocalStore::open() {
        Ok(kv) => Some(kv),
        Err(e) => {
            store.available.set(false);
            if !opts.embed {
                store.notify(NoticeKind::Error, e.to_string(), None);
            }
            None
        }
    };

    if !store.ephemeral {
        if let Some(kv) = kv.as_mut() {
            if migrate_legacy(kv, now_ms()).is_err() {
                // The old keys stay where they are; the next load tries again.
            }
            start_tab(store, kv);
        }
    }

    let shown = open_fragment(&store, kv.as_mut(), &hash, &href);

    let mut draft_to_apply = None;
    if shown.is_none() && !store.ephemeral {
        if let Some(kv) = kv.as_mut() {
            draft_to_apply = draft_for_this_tab(&store, kv);
        }
    }

    if let (Some(d), Some(kv)) = (draft_to_apply, kv.as_ref()) {
        store.apply_draft(kv, d);
    } else {
        let mut d = shown.unwrap_or_else(|| state.design.get_untracked());
        if let Some(ws) = opts.workspace {
            d.workspace = ws;
        }
        state.load(d);
    }
    if let Some(ws) = opts.workspace {
        state.design.update(|d| d.workspace = ws);
    }
    if store.ephemeral {
        store.preset.set(Some(state.design.get_untracked()));
    }

    if kv.is_some() {
        store.refresh(true);
    }

    if !store.ephemeral && kv.is_some() {
        Effect::new(move |_| {
            let d = state.design.get();
            store.autosave(&d);
        });
        super::side::keep_unfinished_reagent(store, state);
    }

    let _storage = window_event_listener(leptos::ev::storage, move |ev: web_sys::StorageEvent| {
        store.on_storage_event(ev.key(), ev.new_value().is_none());
    });
    // A share link pasted into the address bar of an open page only changes the fragment.
    let _hash = window_event_listener(leptos::ev::hashchange, move |_| {
        let (_, hash, href) = location_parts();
        let mut kv = LocalStore::open().ok();
        if let Some(mut d) = open_fragment(&store, kv.as_mut(), &hash, &href) {
            if let Some(ws) = opts.workspace {
                d.workspace = ws;
            }
            store.open.set(None);
            state.load(d);
        }
    });
}

/// Download `text` as a file (Blob + temporary link; nothing leaves the page).
pub fn download(file_name: &str, text: &str) {
    use wasm_bindgen::JsCast;
    let parts = js_sys::Array::of1(&wasm_bindgen::JsValue::from_str(text));
    let opts = web_sys::BlobPropertyBag::new();
    opts.set_type("application/json");
    let Ok(blob) = web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts) else {
        return;
    };
    let Ok(url) = web_sys::Url::create_object_url_with_blob(&blob) else {
        return;
    };
    let doc = document();
    if let Some(a) = doc
        .create_element("a")
        .ok()
        .and_then(|e| e.dyn_into::<web_sys::HtmlAnchorElement>().ok())
    {
        a.set_href(&url);
        a.set_download(file_name);
        a.set_hidden(true);
        if let Some(body) = doc.body() {
            let _ = body.append_child(&a);
            a.click();
            let _ = body.remove_child(&a);
        }
    }
    set_timeout(
        move || {
            let _ = web_sys::Url::revoke_object_url(&url);
        },
        std::time::Duration::from_secs(30),
    );
}
