//! The component tests' shared harness: mount a view with a fresh `AppState`, let Leptos and the browser settle, find, type, choose and click the way a browser does.
#![allow(dead_code, clippy::unwrap_used, clippy::expect_used, clippy::panic)]

use app::state::AppState;
use leptos::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{Element, Event, EventInit, HtmlElement, HtmlInputElement, HtmlSelectElement};

/// Mount `f` (with `state` in context) into a new container; returns the container.
pub fn mount<F, V>(state: AppState, f: F) -> Element
where
    F: FnOnce() -> V + 'static,
    V: IntoView + 'static,
{
    let doc = document();
    let host: HtmlElement = doc.create_element("div").unwrap().unchecked_into();
    doc.body().unwrap().append_child(&host).unwrap();
    let handle = leptos::mount::mount_to(host.clone(), move || {
        provide_context(state);
        f()
    });
    // Keep the view mounted for the rest of the test run.
    std::mem::forget(handle);
    host.unchecked_into()
}

pub async fn settle() {
    for _ in 0..4 {
        leptos::task::tick().await;
    }
    // One macrotask as well, for anything queued with a timer.
    let p = js_sys::Promise::new(&mut |resolve, _| {
        window()
            .set_timeout_with_callback_and_timeout_and_arguments_0(&resolve, 0)
            .unwrap();
    });
    wasm_bindgen_futures::JsFuture::from(p).await.unwrap();
    leptos::task::tick().await;
}

pub fn find(root: &Element, sel: &str) -> Option<Element> {
    root.query_selector(sel).unwrap()
}

pub fn text(root: &Element, testid: &str) -> Option<String> {
    find(root, &format!("[data-testid=\"{testid}\"]")).map(|e| e.text_content().unwrap_or_default())
}

pub fn bubbling(kind: &str) -> Event {
    let init = EventInit::new();
    init.set_bubbles(true);
    Event::new_with_event_init_dict(kind, &init).unwrap()
}

pub async fn type_into(root: &Element, id: &str, value: &str) {
    let input: HtmlInputElement = find(root, &format!("#{id}"))
        .unwrap_or_else(|| panic!("no input #{id}"))
        .unchecked_into();
    input.set_value(value);
    input.dispatch_event(&bubbling("input")).unwrap();
    settle().await;
}

pub async fn commit(root: &Element, id: &str) {
    let input: HtmlInputElement = find(root, &format!("#{id}"))
        .unwrap_or_else(|| panic!("no input #{id}"))
        .unchecked_into();
    input.dispatch_event(&bubbling("change")).unwrap();
    settle().await;
}

pub async fn choose(root: &Element, id: &str, value: &str) {
    let select: HtmlSelectElement = find(root, &format!("#{id}"))
        .unwrap_or_else(|| panic!("no select #{id}"))
        .unchecked_into();
    select.set_value(value);
    select.dispatch_event(&bubbling("change")).unwrap();
    settle().await;
}

pub async fn click(root: &Element, testid: &str) {
    let el: HtmlElement = find(root, &format!("[data-testid=\"{testid}\"]"))
        .unwrap_or_else(|| panic!("no [data-testid={testid}]"))
        .unchecked_into();
    el.click();
    settle().await;
}

/// Open the `<details data-testid=...>` and wait for its `toggle` event to run.
pub async fn open_details(root: &Element, testid: &str) {
    let d = find(root, &format!("[data-testid=\"{testid}\"]"))
        .unwrap_or_else(|| panic!("no [data-testid={testid}]"));
    d.set_attribute("open", "").unwrap();
    // `toggle` is queued as a task after the attribute changes.
    for _ in 0..3 {
        settle().await;
    }
}
