//! Placeholder for the designs_ws component (being written).
use leptos::prelude::*;

/// Placeholder.
#[component]
pub fn DesignsPanel() -> impl IntoView {
    view! { <section></section> }
}
