//! Designs panel: save, open, rename, duplicate, delete, export, import and share designs.
//!
//! A thin component: every decision lives in [`crate::designs`] (plain
//! functions over a key-value store, tested natively) and
//! [`crate::designs::share`]; this file only wires buttons to those functions.

use crate::designs::index::{Summary, MAX_NAME_CHARS};
use crate::designs::store::{use_store, NoticeAction, NoticeKind, Store};
use crate::designs::transfer::{export_many, export_one, file_name, FILE_EXTENSION};
use crate::designs::when::local_when;
use crate::state::use_app;
use leptos::prelude::*;
use wasm_bindgen::{closure::Closure, JsCast, JsValue};

/// How many saved designs the list draws before "Show all".
const LIST_PAGE: usize = 200;

/// Styles of the panel and the embed bar (scoped by class; inline styles are allowed by the CSP).
const PANEL_CSS: &str = include_str!("designs.css");

fn notice_class(kind: NoticeKind) -> &'static str {
    match kind {
        NoticeKind::Info => "bw-notice bw-notice-info",
        NoticeKind::Warn => "bw-notice bw-notice-warn",
        NoticeKind::Error => "bw-notice bw-notice-error",
    }
}

/// Read the chosen file and hand its text to the store.
fn import_from_input(store: Store, input: web_sys::HtmlInputElement) {
    let Some(file) = input.files().and_then(|f| f.get(0)) else {
        return;
    };
    let name = file.name();
    if file.size() > crate::designs::transfer::MAX_IMPORT_BYTES as f64 {
        store.notify(
            NoticeKind::Error,
            format!("“{name}” was not imported: it is too large to be a design file. Nothing was changed."),
            None,
        );
        input.set_value("");
        return;
    }
    let on_text = Closure::once(move |v: JsValue| {
        let text = v.as_string().unwrap_or_default();
        store.import_text(&name, &text);
        input.set_value("");
    });
    let on_error = Closure::once(move |_: JsValue| {
        store.notify(
            NoticeKind::Error,
            "The file could not be read. Nothing was changed.",
            None,
        );
    });
    let _ = file.text().then(&on_text).catch(&on_error);
    on_text.forget();
    on_error.forget();
}

/// Copy text with the asynchronous clipboard API when the page may use it.
fn copy_text(store: Store, text: String) {
    let nav = window().navigator();
    let has_clipboard = js_sys::Reflect::get(&nav, &JsValue::from_str("clipboard"))
        .map(|c| !c.is_undefined() && !c.is_null())
        .unwrap_or(false);
    if !has_clipboard {
        store.notify(
            NoticeKind::Warn,
            "This browser does not allow copying from here: the link is selected, copy it by hand.",
            None,
        );
        return;
    }
    let done = Closure::once(move |_: JsValue| {
        store.notify(NoticeKind::Info, "Share link copied.", None);
    });
    let failed = Closure::once(move |_: JsValue| {
        store.notify(
            NoticeKind::Warn,
            "The browser refused to copy: the link is selected, copy it by hand.",
            None,
        );
    });
    let _ = nav.clipboard().write_text(&text).then(&done).catch(&failed);
    done.forget();
    failed.forget();
}

/// One notice with its buttons.
fn notice_view(store: Store, n: crate::designs::store::Notice) -> impl IntoView {
    let id = n.id;
    let state = store.state;
    let actions = match n.action {
        Some(NoticeAction::UndoDelete { id: did, design }) => view! {
            <button type="button" class="bw-btn bw-btn-small" data-testid="undo-delete"
                on:click=move |_| {
                    store.undo_delete(&did, &design);
                    store.dismiss(id);
                }>"Undo"</button>
        }
        .into_any(),
        Some(NoticeAction::Conflict { id: cid }) => {
            let cid2 = cid.clone();
            let cid3 = cid.clone();
            view! {
                <button type="button" class="bw-btn bw-btn-small" data-testid="conflict-copy"
                    on:click=move |_| { store.dismiss(id); store.resolve_copy(); }>
                    "Save mine as a copy"</button>
                <button type="button" class="bw-btn bw-btn-small" data-testid="conflict-overwrite"
                    on:click=move |_| { store.dismiss(id); store.resolve_overwrite(&cid2); }>
                    "Overwrite with mine"</button>
                <button type="button" class="bw-btn bw-btn-small" data-testid="conflict-theirs"
                    on:click=move |_| { store.dismiss(id); store.open_design(&cid3); }>
                    "Discard mine, open theirs"</button>
            }
            .into_any()
        }
        Some(NoticeAction::RestoreSetAside { key }) => view! {
            <button type="button" class="bw-btn bw-btn-small" data-testid="restore-previous"
                disabled=move || state.view.get().readonly
                on:click=move |_| { store.dismiss(id); store.recovery_open(&key); }>
                "Bring back my previous work"</button>
        }
        .into_any(),
        Some(NoticeAction::UndoRecoveryDelete { key, raw }) => view! {
            <button type="button" class="bw-btn bw-btn-small" data-testid="undo-recovery-delete"
                on:click=move |_| { store.dismiss(id); store.undo_recovery_delete(&key, &raw); }>
                "Undo"</button>
        }
        .into_any(),
        None => ().into_any(),
    };
    view! {
        <div class=notice_class(n.kind) data-testid="notice">
            <span class="bw-notice-text">{n.text}</span>
            <span class="bw-notice-actions">
                {actions}
                <button type="button" class="bw-btn-dismiss" aria-label="Dismiss message"
                    on:click=move |_| store.dismiss(id)>"×"</button>
            </span>
        </div>
    }
}

/// One row of the saved-designs table.
fn row_view(
    store: Store,
    index: usize,
    s: Summary,
    renaming: RwSignal<Option<String>>,
    rename_text: RwSignal<String>,
) -> impl IntoView {
    let state = store.state;
    let readonly = move || state.view.get().readonly;
    let id = s.id.clone();
    let is_open = {
        let id = id.clone();
        move || store.open.with(|o| o.as_ref().is_some_and(|o| o.id == id))
    };
    let is_renaming = {
        let id = id.clone();
        move || renaming.with(|r| r.as_deref() == Some(id.as_str()))
    };
    let commit = {
        let id = id.clone();
        move || {
            store.rename(&id, &rename_text.get_untracked());
            renaming.set(None);
            focus_after_render(&[&format!("#bw-rename-btn-{id}")]);
        }
    };
    let cancel = {
        let id = id.clone();
        move || {
            renaming.set(None);
            focus_after_render(&[&format!("#bw-rename-btn-{id}")]);
        }
    };
    let cancel2 = cancel.clone();
    let commit2 = commit.clone();
    let name = s.name.clone();
    let name_for_rename = s.name.clone();
    let (id_open, id_ren, id_dup, id_del) = (id.clone(), id.clone(), id.clone(), id.clone());
    let label = |verb: &str| format!("{verb} “{}”", s.name);
    let (l_open, l_ren, l_dup, l_del) = (
        label("Open"),
        label("Rename"),
        label("Duplicate"),
        label("Delete"),
    );
    view! {
        <tr data-testid=format!("design-row-{index}") data-id=id.clone()
            class:bw-row-open=is_open.clone()
            aria-current=move || if is_open() { Some("true") } else { None }>
            <td class="bw-col-name">
                <Show when=is_renaming.clone() fallback=move || view! {
                    <span class="bw-design-name" data-testid="design-row-name">{name.clone()}</span>
                }>
                    <input type="text" class="bw-rename-input" data-testid="rename-input"
                        id=format!("bw-rename-{}", s.id)
                        aria-label="New name" maxlength=MAX_NAME_CHARS.to_string()
                        prop:value=move || rename_text.get()
                        on:input=move |ev| rename_text.set(event_target_value(&ev))
                        on:keydown={
                            let commit = commit.clone();
                            let cancel = cancel.clone();
                            move |ev: web_sys::KeyboardEvent| match ev.key().as_str() {
                                "Enter" => commit(),
                                "Escape" => cancel(),
                                _ => {}
                            }
                        } />
                    <button type="button" class="bw-btn bw-btn-small" data-testid="rename-ok"
                        on:click={ let commit = commit2.clone(); move |_| commit() }>"OK"</button>
                    <button type="button" class="bw-btn bw-btn-small"
                        on:click={ let cancel = cancel2.clone(); move |_| cancel() }>"Cancel"</button>
                </Show>
            </td>
            <td class="bw-col-system">{s.system.clone()}</td>
            <td class="bw-col-ph">{format!("{:.2}", s.target_ph)}</td>
            <td class="bw-col-date">{local_when(s.saved_at_ms)}</td>
            <td class="bw-col-actions">
                <button type="button" class="bw-btn bw-btn-small" data-testid="open-design"
                    aria-label=l_open on:click=move |_| store.open_design(&id_open)>"Open"</button>
                <button type="button" class="bw-btn bw-btn-small" data-testid="rename-design"
                    id=format!("bw-rename-btn-{id}")
                    aria-label=l_ren hidden=readonly
                    on:click=move |_| {
                        rename_text.set(name_for_rename.clone());
                        renaming.set(Some(id_ren.clone()));
                        let input_id = format!("bw-rename-{id_ren}");
                        request_animation_frame(move || {
                            if let Some(i) = document()
                                .get_element_by_id(&input_id)
                                .and_then(|e| e.dyn_into::<web_sys::HtmlInputElement>().ok())
                            {
                                let _ = i.focus();
                                i.select();
                            }
                        });
                    }>"Rename"</button>
                <button type="button" class="bw-btn bw-btn-small" data-testid="duplicate-design"
                    aria-label=l_dup hidden=readonly
                    on:click=move |_| store.duplicate(&id_dup)>"Duplicate"</button>
                <button type="button" class="bw-btn bw-btn-small bw-btn-danger" data-testid="delete-design"
                    aria-label=l_del hidden=readonly
                    on:click=move |_| {
                        store.delete(&id_del);
                        // The row is gone: focus moves to the Undo of its notice (notices
                        // are newest first), or to the panel's heading when there is none.
                        focus_after_render(&["[data-testid=\"undo-delete\"]", "#designs-title"]);
                    }>"Delete"</button>
            </td>
        </tr>
    }
}

/// After the next render, move keyboard focus to the first element found by
/// the first of `selectors` that matches, so focus never falls back to the top of the page when the
/// element that had it is removed (a rename field, a deleted row).
fn focus_after_render(selectors: &[&str]) {
    let selectors: Vec<String> = selectors.iter().map(|s| (*s).to_string()).collect();
    request_animation_frame(move || {
        let found = selectors.iter().find_map(|sel| {
            document()
                .query_selector(sel)
                .ok()
                .flatten()
                .and_then(|e| e.dyn_into::<web_sys::HtmlElement>().ok())
        });
        if let Some(el) = found {
            let _ = el.focus();
        }
    });
}

/// One line of the Recovery section.
fn recovery_row(
    store: Store,
    index: usize,
    item: crate::designs::recovery::RecoveryItem,
) -> impl IntoView {
    use crate::designs::recovery::RecoveryKind;
    let kind = match &item.kind {
        RecoveryKind::SetAside => "Set aside",
        RecoveryKind::ClosedTab => "From a closed tab",
        RecoveryKind::Damaged(_) => "Damaged",
    };
    let when = if item.when_ms > 0.0 {
        format!(" ({})", local_when(item.when_ms))
    } else {
        String::new()
    };
    let (k_open, k_exp, k_del) = (item.key.clone(), item.key.clone(), item.key.clone());
    let label = |verb: &str| format!("{verb} “{}”", item.title);
    let (l_open, l_exp, l_del) = (label("Open"), label("Export"), label("Delete"));
    let readonly = move || store.state.view.get().readonly;
    view! {
        <li class="bw-recovery-item" data-testid=format!("recovery-item-{index}") data-key=item.key.clone()>
            <span class="bw-recovery-kind">{kind}</span>
            " "
            <span class="bw-recovery-title" data-testid="recovery-title">{item.title.clone()}</span>
            <span class="bw-recovery-detail" data-testid="recovery-detail">{format!("{}{when}", item.detail)}</span>
            <span class="bw-recovery-actions">
                <button type="button" class="bw-btn bw-btn-small" data-testid="recovery-open"
                    aria-label=l_open hidden=move || !item.can_open || readonly()
                    on:click=move |_| store.recovery_open(&k_open)>"Open"</button>
                <button type="button" class="bw-btn bw-btn-small" data-testid="recovery-export"
                    aria-label=l_exp on:click=move |_| store.recovery_export(&k_exp)>"Export"</button>
                <button type="button" class="bw-btn bw-btn-small bw-btn-danger" data-testid="recovery-delete"
                    aria-label=l_del hidden=readonly
                    on:click=move |_| store.recovery_delete(&k_del)>"Delete"</button>
            </span>
        </li>
    }
}

/// The designs panel (mounted by the shell; needs [`crate::designs::init`] to have run).
#[component]
pub fn DesignsPanel() -> impl IntoView {
    let Some(store) = use_store() else {
        return view! {
            <section class="designs-panel" data-testid="designs-panel">
                <p>"Saved designs are not available: the page did not start its storage."</p>
            </section>
        }
        .into_any();
    };
    let state = use_app();
    let readonly = move || state.view.get().readonly;
    let available = move || store.available.get();
    let renaming = RwSignal::new(None::<String>);
    // A long list (thousands imported) draws its newest rows first; the rest on request.
    let shown = RwSignal::new(LIST_PAGE);
    let rename_text = RwSignal::new(String::new());

    let status = move || {
        if store.ephemeral {
            return "This view does not keep changes. Open the full page to save designs."
                .to_string();
        }
        if !available() {
            return "Saving is not possible in this browser: use Export to keep your work."
                .to_string();
        }
        let dirty = store.dirty();
        let open = store.open.get();
        crate::designs::store::status_line(open.as_ref(), dirty, &store.keeping.get())
    };
    let save_label = move || {
        if store.open.with(Option::is_some) {
            "Save changes"
        } else {
            "Save"
        }
    };
    let link_base = Memo::new(move |_| {
        let href = window().location().href().unwrap_or_default();
        crate::designs::address::link_base(&href, store.page_address.get().as_deref())
    });
    let share_link = Memo::new(move |_| {
        let d = state.design.get();
        crate::designs::share::share_url(&link_base.get(), &d)
    });
    let address_text = RwSignal::new(store.page_address.get_untracked().unwrap_or_default());
    let address_error = RwSignal::new(None::<String>);
    let set_address = move || {
        let typed = address_text.get_untracked();
        match crate::designs::address::check_address(&typed) {
            Ok(a) => {
                address_error.set(None);
                if let Err(why) = crate::designs::address::store(&a) {
                    store.notify(
                        NoticeKind::Warn,
                        format!("The address is used in this tab but could not be kept ({why})."),
                        None,
                    );
                }
                store.page_address.set((!a.is_empty()).then_some(a));
            }
            Err(why) => address_error.set(Some(why)),
        }
    };
    let share_input = NodeRef::<leptos::html::Input>::new();
    let file_input = NodeRef::<leptos::html::Input>::new();

    let export_current = move |_| {
        let d = state.design.get_untracked();
        if let Some(why) = crate::designs::rules::document_problem(&d) {
            store.notify(
                NoticeKind::Error,
                crate::designs::rules::refusal("exported", &why),
                None,
            );
            return;
        }
        crate::designs::session::download(&file_name(&d.name), &export_one(&d));
    };
    let export_all = move |_| {
        let all = store.all_saved();
        if all.is_empty() {
            store.notify(
                NoticeKind::Warn,
                "There are no saved designs to export.",
                None,
            );
            return;
        }
        let day = local_when(js_sys::Date::now());
        let day = day.split(' ').next().unwrap_or("designs").to_string();
        crate::designs::session::download(
            &format!("bufferwright-saved-designs-{day}{FILE_EXTENSION}"),
            &export_many(&all),
        );
    };
    let copy_link = move |_| {
        if let Some(why) = state
            .design
            .with_untracked(crate::designs::rules::document_problem)
        {
            store.notify(
                NoticeKind::Error,
                crate::designs::rules::refusal("shared", &why),
                None,
            );
            return;
        }
        if let Some(input) = share_input.get_untracked() {
            input.select();
        }
        copy_text(store, share_link.get_untracked());
    };
    let on_file = move |ev: leptos::ev::Event| {
        if let Some(input) = ev
            .target()
            .and_then(|t| t.dyn_into::<web_sys::HtmlInputElement>().ok())
        {
            import_from_input(store, input);
        }
    };
    let _ = file_input;

    view! {
        <section class="designs-panel" data-testid="designs-panel" aria-labelledby="designs-title">
            <style>{PANEL_CSS}</style>
            <h2 id="designs-title" class="bw-panel-title" tabindex="-1">"Saved designs"</h2>
            <div class="bw-notices" data-testid="storage-message" role="status" aria-live="polite">
                {move || store.notices.get().into_iter().map(|n| notice_view(store, n)).collect_view()}
            </div>

            <div class="bw-current">
                <label class="bw-name-field" for="bw-design-name">"Design name"</label>
                <div class="bw-current-row">
                    <input id="bw-design-name" type="text" data-testid="design-name-input"
                        maxlength=MAX_NAME_CHARS.to_string()
                        readonly=readonly
                        prop:value=move || {
                            state.revision.track();
                            store.name_rev.track();
                            state.design.with_untracked(|d| d.name.clone())
                        }
                        on:input=move |ev| {
                            let v = event_target_value(&ev);
                            if v.chars().count() <= MAX_NAME_CHARS {
                                state.design.update(|d| d.name = v);
                            }
                        } />
                    <button type="button" class="bw-btn bw-btn-primary" data-testid="save-design"
                        hidden=move || readonly() || store.ephemeral
                        on:click=move |_| store.save(false)>{save_label}</button>
                    <button type="button" class="bw-btn" data-testid="save-as-new"
                        hidden=move || readonly() || store.ephemeral || store.open.with(Option::is_none)
                        on:click=move |_| store.save(true)>"Save as new"</button>
                </div>
                <p class="bw-status" data-testid="design-status">{status}</p>
            </div>

            <div class="bw-table-wrap">
                <Show when=move || store.list.with(|l| !l.is_empty()) fallback=move || view! {
                    <p class="bw-empty" data-testid="designs-empty">
                        "No saved designs in this browser yet."
                    </p>
                }>
                    <table class="bw-designs" data-testid="designs-table">
                        <caption class="bw-visually-hidden">"Designs saved in this browser, newest first"</caption>
                        <thead>
                            <tr>
                                <th scope="col">"Name"</th>
                                <th scope="col">"System"</th>
                                <th scope="col">"Target pH"</th>
                                <th scope="col">"Saved"</th>
                                <th scope="col"><span class="bw-visually-hidden">"Actions"</span></th>
                            </tr>
                        </thead>
                        <tbody>
                            {move || {
                                let limit = shown.get();
                                store
                                    .list
                                    .get()
                                    .into_iter()
                                    .take(limit)
                                    .enumerate()
                                    .map(|(i, s)| row_view(store, i, s, renaming, rename_text))
                                    .collect_view()
                            }}
                        </tbody>
                    </table>
                    <Show when=move || { store.list.with(Vec::len) > shown.get() }>
                        <p class="bw-hint" data-testid="designs-more">
                            {move || format!("Showing the {} newest of {} saved designs. ", shown.get(), store.list.with(Vec::len))}
                            <button type="button" class="bw-btn bw-btn-small" data-testid="show-all-designs"
                                on:click=move |_| shown.set(usize::MAX)>"Show all"</button>
                        </p>
                    </Show>
                </Show>
            </div>

            <Show when=move || store.recovery.with(|r| !r.is_empty())>
                <div class="bw-recovery" data-testid="recovery">
                    <h3 class="bw-sub" id="bw-recovery-title">"Recovery"</h3>
                    <p class="bw-hint">"Work kept aside so nothing is lost: set aside when a share link replaced it (the last ten are kept), left by a tab that was closed, or an entry that could not be read. Open brings it back (what is on screen is set aside first)."</p>
                    <ul class="bw-recovery-list" aria-labelledby="bw-recovery-title">
                        {move || store.recovery.get().into_iter().enumerate()
                            .map(|(i, item)| recovery_row(store, i, item)).collect_view()}
                    </ul>
                </div>
            </Show>

            <div class="bw-files">
                <h3 class="bw-sub">"Files"</h3>
                <div class="bw-buttons">
                    <button type="button" class="bw-btn" data-testid="export-design"
                        on:click=export_current>"Export this design"</button>
                    <button type="button" class="bw-btn" data-testid="export-all"
                        disabled=move || !available() || store.list.with(Vec::is_empty)
                        on:click=export_all>"Export all saved"</button>
                    <label class="bw-btn bw-file-label" hidden=readonly>
                        "Import from file…"
                        <input type="file" class="bw-file-input" data-testid="import-file"
                            node_ref=file_input
                            accept=".json,application/json" on:change=on_file />
                    </label>
                </div>
                <p class="bw-hint">"Files are Bufferwright design files ("{FILE_EXTENSION}"): plain JSON you can keep, mail or check in."</p>
            </div>

            <div class="bw-share">
                <h3 class="bw-sub"><label for="bw-share-link">"Share link"</label></h3>
                <div class="bw-current-row">
                    <input id="bw-share-link" type="text" readonly data-testid="share-link"
                        node_ref=share_input
                        prop:value=move || share_link.get()
                        on:focus=move |ev| {
                            if let Some(i) = ev.target().and_then(|t| t.dyn_into::<web_sys::HtmlInputElement>().ok()) {
                                i.select();
                            }
                        } />
                    <button type="button" class="bw-btn" data-testid="copy-share-link" on:click=copy_link>
                        "Copy link"
                    </button>
                </div>
                <p class="bw-hint">"The whole design travels inside the link (after the #); opening it shows the design. Nothing is uploaded."</p>
                {move || crate::designs::address::local_note(&link_base.get()).map(|n| view! {
                    <p class="bw-hint bw-warn" data-testid="share-local-note">{n}</p>
                })}
                <label for="bw-page-address" class="bw-sub">"Address this page is served from (for links and QR codes)"</label>
                <div class="bw-current-row">
                    <input id="bw-page-address" type="url" data-testid="page-address"
                        placeholder="https://lab.example.org/bufferwright/"
                        prop:value=move || address_text.get()
                        aria-invalid=move || address_error.with(Option::is_some).to_string()
                        on:input=move |ev| address_text.set(event_target_value(&ev))
                        on:change=move |_| set_address()
                        on:keydown=move |ev: leptos::ev::KeyboardEvent| {
                            if ev.key() == "Enter" {
                                set_address();
                            }
                        } />
                </div>
                {move || address_error.get().map(|e| view! {
                    <p class="bw-error" role="alert" data-testid="error-page-address">{e}</p>
                })}
                <p class="bw-hint">"Kept in this browser. Leave it empty to use the address in the address bar."</p>
            </div>
        </section>
    }
    .into_any()
}

/// A one-line alert for the top of the page when storage needs attention
/// (full, unavailable, an entry set aside, a save conflict); renders nothing
/// otherwise. The full message and its buttons are in the designs panel,
/// which the alert links to. Not a live region: the panel already announces.
#[component]
pub fn StorageAlert() -> impl IntoView {
    let store = use_store();
    move || {
        let store = store?;
        let n = store.notices.with(|ns| {
            ns.iter()
                .find(|n| matches!(n.kind, NoticeKind::Warn | NoticeKind::Error))
                .cloned()
        })?;
        let first = n
            .text
            .split(". ")
            .next()
            .unwrap_or_default()
            .trim_end_matches('.')
            .to_string();
        Some(view! {
            <p class=format!("bw-alert {}", notice_class(n.kind)) data-testid="storage-alert">
                <style>{ALERT_CSS}</style>
                <span>{first}"."</span>
                " "
                <a href="#designs-title">"Saved designs"</a>
            </p>
        })
    }
}

/// Styles of [`StorageAlert`].
const ALERT_CSS: &str = ".bw-alert{margin:.4rem 0;padding:.4rem .7rem;border-radius:6px;\
border-left:5px solid;display:flex;flex-wrap:wrap;gap:.3rem;align-items:center}\
.bw-alert.bw-notice-warn{background:#fff5dc;border-color:#9a6700}\
.bw-alert.bw-notice-error{background:#fde8e8;border-color:#b42318}\
.bw-alert a{color:inherit;font-weight:600}";
