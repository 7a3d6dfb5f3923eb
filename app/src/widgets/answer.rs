//! The headline answer of a workspace in one line, kept in view on a phone
//! while the inputs above the results are edited.

use leptos::prelude::*;

/// A one-line summary of a workspace's answer (`data-testid="answer"`).
///
/// On narrow screens it sticks to the top of the viewport, so the answer is
/// in view while typing; where results sit beside the inputs it is hidden
/// (the full result card is already in view).
#[component]
pub fn AnswerBar(
    /// The answer, or why there is none yet.
    #[prop(into)]
    text: Signal<String>,
    /// Whether `text` is an answer (`false`: a reason there is none).
    #[prop(into)]
    ok: Signal<bool>,
) -> impl IntoView {
    view! {
        <div class="answer-bar" class:answer-none=move || !ok.get() data-testid="answer"
            role="status" aria-live="polite">
            {move || text.get()}
        </div>
    }
}
