//! Browser tests of the storage glue: `LocalStore` against the real `window.localStorage`
//! (quota errors mapped to `StoreError::Full`, nothing half-written), and the designs panel
//! mounted with `store::init` (save lists the design under its own key).
#![cfg(target_arch = "wasm32")]
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic,
    missing_docs
)]

use app::designs::panel::{DesignsPanel, StorageAlert};
use app::designs::{
    design_key, init, save_design, scan, use_store, KvStore, LocalStore, NoticeKind, SaveOutcome,
    SaveTarget, StoreError, INDEX_KEY,
};
use app::state::AppState;
use leptos::prelude::*;
use solver::document::demo_design;
use wasm_bindgen::JsCast;
use wasm_bindgen_test::*;
use web_sys::HtmlElement;

wasm_bindgen_test_configure!(run_in_browser);

fn clear() {
    web_sys::window()
        .unwrap()
        .local_storage()
        .unwrap()
        .unwrap()
        .clear()
        .unwrap();
}

#[wasm_bindgen_test]
fn local_store_reads_writes_and_lists_keys() {
    clear();
    let mut kv = LocalStore::open().unwrap();
    assert_eq!(kv.get("bufferwright.t"), Ok(None));
    kv.set("bufferwright.t", "µ 7.4").unwrap();
    assert_eq!(kv.get("bufferwright.t"), Ok(Some("µ 7.4".into())));
    assert!(kv.keys().unwrap().contains(&"bufferwright.t".to_string()));
    kv.remove("bufferwright.t").unwrap();
    assert_eq!(kv.get("bufferwright.t"), Ok(None));
}

#[wasm_bindgen_test]
fn quota_exceeded_is_reported_as_full_and_nothing_is_half_written() {
    clear();
    let mut kv = LocalStore::open().unwrap();
    let first = match save_design(&mut kv, &SaveTarget::New, &demo_design(), 1000.0) {
        Ok(SaveOutcome::Saved { id, .. }) => id,
        other => panic!("{other:?}"),
    };
    // Fill what is left of the quota.
    let mut n = 0;
    let mut size = 1 << 20;
    while size >= 8 {
        let chunk = "x".repeat(size);
        while kv.set(&format!("filler.{n}"), &chunk).is_ok() {
            n += 1;
        }
        size /= 2;
    }
    assert!(n > 0);
    assert_eq!(
        kv.set("filler.last", &"y".repeat(4096)),
        Err(StoreError::Full)
    );
    let index_before = kv.get(INDEX_KEY).unwrap();
    let keys_before = kv.keys().unwrap().len();
    let r = save_design(&mut kv, &SaveTarget::New, &demo_design(), 2000.0);
    assert_eq!(r, Err(StoreError::Full));
    assert_eq!(kv.get(INDEX_KEY).unwrap(), index_before);
    assert_eq!(kv.keys().unwrap().len(), keys_before);
    assert!(kv.get(&design_key(&first)).unwrap().is_some());
    clear();
}

#[wasm_bindgen_test]
async fn panel_saves_the_working_design_under_its_own_key() {
    clear();
    let doc = document();
    let host: HtmlElement = doc.create_element("div").unwrap().unchecked_into();
    doc.body().unwrap().append_child(&host).unwrap();
    let state = AppState::new();
    let handle = leptos::mount::mount_to(host.clone(), move || {
        provide_context(state);
        init(state);
        view! { <DesignsPanel /> }
    });
    let save: HtmlElement = host
        .query_selector("[data-testid=save-design]")
        .unwrap()
        .unwrap()
        .unchecked_into();
    save.click();
    // Let the reactive system settle.
    for _ in 0..4 {
        leptos::task::tick().await;
    }
    let mut kv = LocalStore::open().unwrap();
    let s = scan(&mut kv, false, 0.0).unwrap();
    assert_eq!(s.designs.len(), 1);
    assert_eq!(s.designs[0].1.name, demo_design().name);
    assert!(host
        .text_content()
        .unwrap_or_default()
        .contains("Saved “Hatchery lab — assay buffer”"));
    assert!(host
        .query_selector("[data-testid=design-row-0]")
        .unwrap()
        .is_some());
    drop(handle);
    clear();
}

#[wasm_bindgen_test]
async fn storage_alert_shows_the_first_sentence_of_a_problem_only() {
    clear();
    let doc = document();
    let host: HtmlElement = doc.create_element("div").unwrap().unchecked_into();
    doc.body().unwrap().append_child(&host).unwrap();
    let state = AppState::new();
    let slot = std::rc::Rc::new(std::cell::Cell::new(None));
    let out = slot.clone();
    let handle = leptos::mount::mount_to(host.clone(), move || {
        provide_context(state);
        init(state);
        let store = use_store().unwrap();
        store.notify(NoticeKind::Info, "Saved “x”.", None);
        out.set(Some(store));
        view! { <StorageAlert /> }
    });
    for _ in 0..4 {
        leptos::task::tick().await;
    }
    assert!(host
        .query_selector("[data-testid=storage-alert]")
        .unwrap()
        .is_none());
    let store = slot.get().unwrap();
    store.notify(
        NoticeKind::Error,
        "Browser storage is full: nothing was saved. Your design is still on screen.",
        None,
    );
    for _ in 0..4 {
        leptos::task::tick().await;
    }
    let alert = host
        .query_selector("[data-testid=storage-alert]")
        .unwrap()
        .unwrap();
    let text = alert.text_content().unwrap_or_default();
    assert!(
        text.contains("Browser storage is full: nothing was saved. Saved designs"),
        "{text}"
    );
    assert!(!text.contains("still on screen"));
    drop(handle);
    clear();
}
