//! Placeholder for the mixture_ws component (being written).
use leptos::prelude::*;

/// Placeholder.
#[component]
pub fn MixtureWorkspace() -> impl IntoView {
    view! { <section></section> }
}
