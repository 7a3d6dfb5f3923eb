//! URL options (`?embed=1&readonly=1&ws=field`) and the small bar shown in embed mode.
//!
//! The page reads its options once at start-up ([`crate::designs::init`] calls
//! [`parse_query`] and writes [`crate::state::ViewOptions`]); the shell hides
//! its chrome when `view.embed` is set and mounts [`EmbedBar`].

use crate::state::use_app;
use leptos::prelude::*;
use solver::document::Workspace;

/// Styles of the embed bar (inline styles are allowed by the page's CSP).
const EMBED_CSS: &str =
    ".embed-bar{display:flex;flex-wrap:wrap;gap:.5rem;justify-content:space-between;\
align-items:center;padding:.2rem .6rem;font-size:.9rem;border-bottom:1px solid #c5cfd8;\
background:#f1f5f8;color:#1b2530}.embed-bar-name{font-weight:600}\
.embed-bar a{color:#12609a;min-height:2.75rem;display:inline-flex;align-items:center}\
.embed-bar-note{flex-basis:100%;font-size:.85rem;color:#33404d}\
.embed-bar-note.embed-bar-edited{color:#7a4a00;font-weight:600}";

/// What the embed bar says about keeping changes; `None` for a read-only embed.
pub fn keeping_note(readonly: bool, edited: bool) -> Option<&'static str> {
    match (readonly, edited) {
        (true, _) => None,
        (false, false) => Some(
            "Changes made here are not kept: reloading shows the original again. Open in Bufferwright to keep working on it.",
        ),
        (false, true) => Some(
            "You changed this example. The changes are not kept: they vanish on reload. Open in Bufferwright to keep them.",
        ),
    }
}

/// Options read from the page's query string.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct UrlOptions {
    /// `embed=1`: compact layout for an iframe.
    pub embed: bool,
    /// `readonly=1`: show, do not edit.
    pub readonly: bool,
    /// `ws=recipe|mixture|species|field`: workspace to open.
    pub workspace: Option<Workspace>,
}

impl UrlOptions {
    /// A view that must not read or write the user's autosaved draft: an embed
    /// (its preset design must not replace the user's work on the same origin)
    /// or a read-only view.
    pub fn ephemeral(&self) -> bool {
        self.embed || self.readonly
    }
}

fn flag(v: &str) -> bool {
    matches!(
        v.to_ascii_lowercase().as_str(),
        "" | "1" | "true" | "yes" | "on"
    )
}

/// Workspace from its URL name.
pub fn workspace_from_name(name: &str) -> Option<Workspace> {
    match name.to_ascii_lowercase().as_str() {
        "recipe" => Some(Workspace::Recipe),
        "mixture" => Some(Workspace::Mixture),
        "species" => Some(Workspace::Species),
        "field" => Some(Workspace::Field),
        "meter" => Some(Workspace::Meter),
        _ => None,
    }
}

/// URL name of a workspace.
pub fn workspace_name(ws: Workspace) -> &'static str {
    match ws {
        Workspace::Recipe => "recipe",
        Workspace::Mixture => "mixture",
        Workspace::Species => "species",
        Workspace::Field => "field",
        Workspace::Meter => "meter",
    }
}

/// Read the options from a query string (`?embed=1&ws=field`, leading `?` optional).
///
/// Unknown parameters and unknown workspace names are ignored; a flag counts
/// as set when present with no value or with `1`, `true`, `yes` or `on`.
pub fn parse_query(search: &str) -> UrlOptions {
    let mut o = UrlOptions::default();
    for pair in search.trim_start_matches('?').split('&') {
        let (k, v) = pair.split_once('=').unwrap_or((pair, ""));
        match k {
            "embed" => o.embed = flag(v),
            "readonly" => o.readonly = flag(v),
            "ws" => o.workspace = workspace_from_name(v).or(o.workspace),
            _ => {}
        }
    }
    o
}

/// Marker and "open full page" link shown in embed mode (renders nothing otherwise).
///
/// Carries `data-testid="embed-mode"` and `data-workspace` for tests and for
/// styling by the host page. The link opens the full page in a new tab with
/// the current design in the fragment, so the reader can keep working on it.
#[component]
pub fn EmbedBar() -> impl IntoView {
    let state = use_app();
    let href = move || {
        let d = state.design.get();
        let here = window().location().href().unwrap_or_default();
        let base = crate::designs::share::page_base(&here).to_string();
        format!("{base}#{}", crate::designs::share::encode_fragment(&d))
    };
    let store = crate::designs::store::use_store();
    let edited = move || {
        store.is_some_and(|s| {
            s.preset.with(|p| {
                p.as_ref().is_some_and(|p| {
                    state
                        .design
                        .with(|d| !crate::designs::index::same_content(p, d))
                })
            })
        })
    };
    move || {
        let v = state.view.get();
        v.embed.then(|| {
            let ws = move || workspace_name(state.design.with(|d| d.workspace));
            view! {
                <div class="embed-bar" data-testid="embed-mode" data-workspace=ws
                    data-readonly=if v.readonly { "1" } else { "0" }>
                    <style>{EMBED_CSS}</style>
                    <span class="embed-bar-name">{move || state.design.with(|d| d.name.clone())}</span>
                    <a class="embed-bar-open" href=href target="_blank" rel="noopener">
                        "Open in Bufferwright"
                    </a>
                    {move || {
                        let edited = edited();
                        keeping_note(v.readonly, edited).map(|text| view! {
                            <span class=if edited { "embed-bar-note embed-bar-edited" } else { "embed-bar-note" }
                                data-testid="embed-not-kept" data-edited=if edited { "1" } else { "0" }
                                role="status">{text}</span>
                        })
                    }}
                </div>
            }
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn query_flags_and_workspace() {
        let o = parse_query("?embed=1&readonly=true&ws=field");
        assert_eq!(
            o,
            UrlOptions {
                embed: true,
                readonly: true,
                workspace: Some(Workspace::Field)
            }
        );
        assert!(o.ephemeral());
        let o = parse_query("ws=Species&embed=0");
        assert!(!o.embed && !o.readonly && !o.ephemeral());
        assert_eq!(o.workspace, Some(Workspace::Species));
        assert!(parse_query("embed").embed);
        assert_eq!(parse_query(""), UrlOptions::default());
    }

    #[test]
    fn an_editable_embed_says_its_changes_are_not_kept() {
        assert_eq!(keeping_note(true, false), None);
        assert!(keeping_note(false, false).is_some_and(|t| t.contains("not kept")));
        assert!(keeping_note(false, true).is_some_and(|t| t.contains("vanish on reload")));
    }

    #[test]
    fn unknown_workspace_is_ignored() {
        assert_eq!(parse_query("?ws=plots").workspace, None);
        assert_eq!(
            parse_query("?ws=mixture&ws=nope").workspace,
            Some(Workspace::Mixture)
        );
    }

    #[test]
    fn workspace_names_round_trip() {
        for ws in [
            Workspace::Recipe,
            Workspace::Mixture,
            Workspace::Species,
            Workspace::Field,
            Workspace::Meter,
        ] {
            assert_eq!(workspace_from_name(workspace_name(ws)), Some(ws));
        }
    }
}
