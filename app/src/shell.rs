//! Application shell: header, workspace tabs, safety notes (being written).
use crate::state::AppState;
use leptos::prelude::*;

/// Root component.
#[component]
pub fn App() -> impl IntoView {
    let state = AppState::new();
    provide_context(state);
    view! { <main id="app-root"><h1>"Bufferwright"</h1></main> }
}
