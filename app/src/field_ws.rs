//! Placeholder for the field_ws component (being written).
use leptos::prelude::*;

/// Placeholder.
#[component]
pub fn FieldWorkspace() -> impl IntoView {
    view! { <section></section> }
}
