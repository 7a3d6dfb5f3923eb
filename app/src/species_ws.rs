//! Placeholder for the species_ws component (being written).
use leptos::prelude::*;

/// Placeholder.
#[component]
pub fn SpeciesWorkspace() -> impl IntoView {
    view! { <section></section> }
}
