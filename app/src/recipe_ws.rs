//! Placeholder for the recipe_ws component (being written).
use leptos::prelude::*;

/// Placeholder.
#[component]
pub fn RecipeWorkspace() -> impl IntoView {
    view! { <section></section> }
}
