//! Application shell: header with the design name, workspace tabs, the designs panel and the notes.
//!
//! Only the active workspace is mounted (so plots are sized when they are
//! visible); which one is active is part of the design (`design.workspace`).
//! In embed mode (`?embed=1`) the header, tabs and designs panel give way to
//! the embed bar.

use crate::designs::embed::EmbedBar;
use crate::designs::panel::{DesignsPanel, StorageAlert};
use crate::state::{use_app, AppState};
use crate::widgets::cautions::ModelNote;
use crate::workspaces::field::FieldWorkspace;
use crate::workspaces::flask::FlaskWorkspace;
use crate::workspaces::meter::MeterWorkspace;
use crate::workspaces::recipe::RecipeWorkspace;
use crate::workspaces::species::SpeciesWorkspace;
use leptos::prelude::*;
use solver::document::Workspace;

/// The workspaces in tab order: (workspace, short key, tab text).
pub const TABS: [(Workspace, &str, &str); 5] = [
    (Workspace::Recipe, "recipe", "Recipe"),
    (Workspace::Mixture, "mixture", "Flask"),
    (Workspace::Species, "species", "Species & capacity"),
    (Workspace::Field, "field", "Field reading"),
    (Workspace::Meter, "meter", "Meter bench"),
];

/// The tab text on a phone: the first word only ("Species", "Field").
fn short_text(text: &str) -> &str {
    text.split_whitespace().next().unwrap_or(text)
}

fn key_of(ws: Workspace) -> &'static str {
    TABS.iter()
        .find(|(w, _, _)| *w == ws)
        .map_or("recipe", |(_, k, _)| k)
}

/// Root component: provides the state, starts storage, lays out the page.
#[component]
pub fn App() -> impl IntoView {
    let state = AppState::new();
    provide_context(state);
    state.after_first_paint();
    crate::designs::init(state);
    view! { <Shell /> }
}

/// The page layout (expects an [`AppState`] in context).
#[component]
pub fn Shell() -> impl IntoView {
    let app = use_app();
    let embed = move || app.view.with(|v| v.embed);
    let active = Memo::new(move |_| app.design.with(|d| d.workspace));
    let name = move || app.design.with(|d| d.name.clone());

    view! {
        <div id="app-root" class="app" class:embed=embed data-workspace=move || key_of(active.get())>
            <a class="skip" href="#workspace">"Skip to the workspace"</a>
            <Show when=move || !embed()>
                <header class="masthead">
                    <div class="brand" aria-hidden="true">
                        <span class="brand-mark"></span>
                        "Bufferwright"
                    </div>
                    <h1 class="design-name" data-testid="design-name">
                        <span class="visually-hidden">"Bufferwright — "</span>
                        {name}
                    </h1>
                </header>
            </Show>
            <EmbedBar />
            <Show when=move || !embed()>
                <StorageAlert />
            </Show>
            <Tabs active=active />
            <main id="workspace" class="workspace" tabindex="-1">
                {move || {
                    let ws = active.get();
                    let key = key_of(ws);
                    let body = match ws {
                        Workspace::Recipe => view! { <RecipeWorkspace /> }.into_any(),
                        Workspace::Mixture => view! { <FlaskWorkspace /> }.into_any(),
                        Workspace::Species => view! { <SpeciesWorkspace /> }.into_any(),
                        Workspace::Field => view! { <FieldWorkspace /> }.into_any(),
                        Workspace::Meter => view! { <MeterWorkspace /> }.into_any(),
                    };
                    view! {
                        <section
                            role="tabpanel"
                            id=format!("panel-{key}")
                            aria-labelledby=format!("tab-{key}")
                            data-testid=format!("ws-{key}")
                            class=format!("panel panel-{key}")
                        >
                            {body}
                        </section>
                    }
                }}
            </main>
            // Below the workspace: built once the page has painted the answer.
            <Show when=move || !embed() && app.painted.get()>
                <div class="designs-area">
                    <DesignsPanel />
                </div>
            </Show>
            <footer class="notes">
                <ModelNote />
                <Show when=move || app.painted.get()>
                    <crate::checks::EngineCheck />
                </Show>
                <crate::offline::OfflineNote />
            </footer>
        </div>
    }
}

/// The tab bar (arrow keys move between tabs, as the tabs pattern expects).
#[component]
fn Tabs(active: Memo<Workspace>) -> impl IntoView {
    let app = use_app();
    let embed = move || app.view.with(|v| v.embed);
    let select = move |ws: Workspace| {
        app.design.update(|d| d.workspace = ws);
    };
    let on_key = move |ev: leptos::ev::KeyboardEvent| {
        let i = TABS
            .iter()
            .position(|(w, _, _)| *w == active.get_untracked())
            .unwrap_or(0);
        let n = TABS.len();
        let next = match ev.key().as_str() {
            "ArrowRight" => (i + 1) % n,
            "ArrowLeft" => (i + n - 1) % n,
            "Home" => 0,
            "End" => n - 1,
            _ => return,
        };
        ev.prevent_default();
        if let Some((ws, key, _)) = TABS.get(next) {
            select(*ws);
            if let Some(el) = document().get_element_by_id(&format!("tab-{key}")) {
                if let Ok(el) = wasm_bindgen::JsCast::dyn_into::<web_sys::HtmlElement>(el) {
                    let _ = el.focus();
                }
            }
        }
    };
    view! {
        <nav class="tabs" class:embed=embed aria-label="Workspaces">
            <div role="tablist" aria-label="Workspaces" on:keydown=on_key>
                {TABS
                    .iter()
                    .map(|(ws, key, text)| {
                        let ws = *ws;
                        let is = move || active.get() == ws;
                        view! {
                            <button
                                type="button"
                                role="tab"
                                id=format!("tab-{key}")
                                data-testid=format!("tab-{key}")
                                aria-controls=move || is().then(|| format!("panel-{key}"))
                                aria-selected=move || if is() { "true" } else { "false" }
                                tabindex=move || if is() { "0" } else { "-1" }
                                class="tab"
                                class:active=is
                                on:click=move |_| select(ws)
                            >
                                <span class="tab-long">{*text}</span>
                                <span class="tab-short">{short_text(text)}</span>
                            </button>
                        }
                    })
                    .collect_view()}
            </div>
        </nav>
    }
}
