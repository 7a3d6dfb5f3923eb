//! The footer's offline line says what this browser really does with the page: a copy kept for
//! offline use, being kept, not kept (no service worker here, or the browser refused it), or a
//! single file opened from disk. `public/register-sw.js` reports its state on the root element
//! (`data-offline`) and with a `bufferwright-offline` event; the line follows it.
use leptos::prelude::*;

/// What register-sw.js said, or "file" when the page is not served over http(s).
fn state_now() -> String {
    let protocol = window().location().protocol().unwrap_or_default();
    if protocol != "http:" && protocol != "https:" {
        return "file".into();
    }
    document()
        .document_element()
        .and_then(|e| e.get_attribute("data-offline"))
        .unwrap_or_default()
}

/// The sentence for a state (kept short: it sits in the footer of every view).
pub fn offline_text(state: &str) -> &'static str {
    match state {
        "ready" => "Runs entirely in this browser and works offline after this visit; nothing you enter leaves the device.",
        "file" => "Runs from this single file, entirely in this browser: keep the file to use it offline; nothing you enter leaves the device.",
        "unsupported" => "Runs entirely in this browser; nothing you enter leaves the device. This browser allows no offline copy here, so the page is not kept for offline use: keep the single-file version to work without a network.",
        "failed" => "Runs entirely in this browser; nothing you enter leaves the device. This browser refused to keep an offline copy, so the page is not kept for offline use: keep the single-file version to work without a network.",
        _ => "Runs entirely in this browser; nothing you enter leaves the device. Keeping a copy for offline use…",
    }
}

/// The footer's offline line (`data-testid="offline-status"`, `data-state` the state).
#[component]
pub fn OfflineNote() -> impl IntoView {
    let state = RwSignal::new(state_now());
    let handle =
        window_event_listener_untyped("bufferwright-offline", move |_| state.set(state_now()));
    on_cleanup(move || handle.remove());
    view! {
        <p class="offline-note" data-testid="offline-status" data-state=move || state.get() role="status">
            {move || offline_text(&state.get())}
        </p>
    }
}

#[cfg(test)]
mod tests {
    use super::offline_text;

    #[test]
    fn only_a_ready_worker_claims_offline_use() {
        assert!(offline_text("ready").contains("works offline"));
        for s in ["", "pending", "unsupported", "failed", "file"] {
            assert!(!offline_text(s).contains("works offline"), "{s}");
        }
        assert!(offline_text("unsupported").contains("not kept for offline use"));
        assert!(offline_text("failed").contains("not kept for offline use"));
    }
}
