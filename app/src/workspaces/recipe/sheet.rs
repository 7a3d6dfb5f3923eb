//! The bench part of the printed recipe sheet: the meter reading in large type, fill-in lines and the share link's QR code.
//!
//! Shown only in print (`print-only`). The QR code is made in the page with
//! the `qrcode` crate (no network) and drawn as one SVG path by
//! [`qr_svg`], a plain function tested natively; the link is the one the
//! designs panel shares (`designs::share`), so scanning the sheet reopens
//! the design.

use crate::designs::share::share_url;
use crate::state::use_app;
use crate::widgets::format::{fmt_input, fmt_ph, pretty_formula};
use leptos::leptos_dom::helpers::{
    set_timeout_with_handle, window_event_listener_untyped, TimeoutHandle,
};
use leptos::prelude::*;
use qrcode::{Color, EcLevel, QrCode};
use solver::recipe::{MeterSolution, RecipeResult, RecipeSpec};
use solver::SolverError;
use std::time::Duration;

/// Wait after the last design change before the QR code is made again, ms.
const QR_DELAY_MS: u64 = 250;

/// Light modules around the code (the QR standard's quiet zone).
pub const QUIET: usize = 4;

/// A QR code as an SVG path over a square of `size` modules (quiet zone included).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct QrSvg {
    /// Side of the square, modules.
    pub size: usize,
    /// Path data: one `M x,y h n v1 h -n z` per run of dark modules in a row.
    pub path: String,
}

/// The QR code of `text` (error correction level L: share links are long,
/// and a printed sheet is read flat and close).
///
/// # Errors
///
/// When the text does not fit in a QR code.
pub fn qr_svg(text: &str) -> Result<QrSvg, String> {
    let code = QrCode::with_error_correction_level(text.as_bytes(), EcLevel::L)
        .map_err(|e| format!("no QR code: {e}"))?;
    let w = code.width();
    let colors = code.to_colors();
    let mut path = String::new();
    for (y, row) in colors.chunks(w.max(1)).enumerate() {
        let mut x = 0;
        while x < row.len() {
            if row.get(x) == Some(&Color::Dark) {
                let start = x;
                while row.get(x) == Some(&Color::Dark) {
                    x += 1;
                }
                let n = x - start;
                path.push_str(&format!("M{},{}h{n}v1h-{n}z", start + QUIET, y + QUIET));
            } else {
                x += 1;
            }
        }
    }
    Ok(QrSvg {
        size: w + 2 * QUIET,
        path,
    })
}

/// Which solution the meter reading is of, in words ("" for the buffer as
/// made): every meter figure on the card and the sheet is labelled with it.
pub(crate) fn meter_of(spec: &RecipeSpec, r: &RecipeResult) -> String {
    let n = fmt_input(spec.concentrate_factor);
    match r.meter.solution {
        MeterSolution::WorkingBuffer => String::new(),
        MeterSolution::Concentrate => format!("the {n}× concentrate"),
        MeterSolution::DilutedPortion => format!("a portion diluted {n}-fold, not the concentrate"),
    }
}

/// The meter line of the sheet: what the meter must read where the buffer
/// is made, and the pH it has once in use.
pub fn sheet_meter_text(spec: &RecipeSpec, r: &RecipeResult) -> (String, String) {
    let big = fmt_ph(r.meter.ph);
    let of = meter_of(spec, r);
    let what = if of.is_empty() {
        "the buffer".to_string()
    } else {
        of
    };
    let detail = format!(
        "Meter reading of {what} at {} °C. Once in use: pH {} at {} °C.",
        fmt_input(r.meter.temperature_c),
        fmt_ph(r.equilibrium.ph),
        fmt_input(spec.temperature_c)
    );
    (big, detail)
}

/// The design's current share link (the designs panel's `#z=` link, on the
/// full page's address), for the sheet's QR code and its small print.
pub(crate) fn share_link() -> Memo<String> {
    let app = use_app();
    let given = crate::designs::use_store().map(|s| s.page_address);
    Memo::new(move |_| {
        let d = app.design.get();
        let href = window().location().href().unwrap_or_default();
        let given = given.and_then(|g| g.get());
        share_url(
            &crate::designs::address::link_base(&href, given.as_deref()),
            &d,
        )
    })
}

/// The solved recipe, or `None` while fields are marked or it has no solution
/// (and before the page's first paint: the sheet is print-only).
fn solved(
    spec: Memo<RecipeSpec>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
    painted: RwSignal<bool>,
) -> Option<(RecipeSpec, RecipeResult)> {
    if pending.get() || !painted.get() {
        return None;
    }
    Some((spec.get(), result.get().ok()?))
}

/// Top of the printed sheet: the meter reading in large type and the QR code.
#[component]
pub(crate) fn SheetTop(
    spec: Memo<RecipeSpec>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
    link: Memo<String>,
) -> impl IntoView {
    let painted = use_app().painted;
    // The code is made a moment after the design stops changing (about 15–40 ms
    // for a share link: not on every keystroke), and at once before printing.
    let qr: RwSignal<Option<(String, Result<QrSvg, String>)>> = RwSignal::new(None);
    let make = move || {
        let l = link.get_untracked();
        if qr.with_untracked(|q| q.as_ref().map(|x| &x.0) != Some(&l)) {
            let q = qr_svg(&l);
            qr.set(Some((l, q)));
        }
    };
    let timer = StoredValue::new(None::<TimeoutHandle>);
    Effect::new(move |_| {
        link.track();
        if let Some(h) = timer.get_value() {
            h.clear();
        }
        timer.set_value(set_timeout_with_handle(make, Duration::from_millis(QR_DELAY_MS)).ok());
    });
    let before_print = StoredValue::new_local(Some(window_event_listener_untyped(
        "beforeprint",
        move |_| make(),
    )));
    on_cleanup(move || {
        if let Some(h) = timer.get_value() {
            h.clear();
        }
        before_print.update_value(|h| {
            if let Some(h) = h.take() {
                h.remove();
            }
        });
    });
    let qr_view = move || {
        let current = link.get();
        match qr.get() {
            Some((l, Ok(q))) if l == current => {
                let vb = format!("0 0 {0} {0}", q.size);
                view! {
                    <svg viewBox=vb role="img" aria-label="QR code of this design's link"
                        shape-rendering="crispEdges" data-testid="sheet-qr-svg">
                        <rect width="100%" height="100%" fill="#fff"></rect>
                        <path d=q.path fill="#000"></path>
                    </svg>
                }
                .into_any()
            }
            Some((l, Err(e))) if l == current => {
                view! { <p class="sheet-qr-none">{e}</p> }.into_any()
            }
            _ => view! { <p class="sheet-qr-none">"QR code being made…"</p> }.into_any(),
        }
    };
    move || {
        solved(spec, result, pending, painted).map(|(s, r)| {
            let (big, detail) = sheet_meter_text(&s, &r);
            view! {
                <div class="print-only sheet-top" data-testid="recipe-sheet">
                    <div class="sheet-meter">
                        <p class="sheet-meter-label">"Meter must read"</p>
                        <p class="sheet-meter-value" data-testid="sheet-meter-ph">{big}</p>
                        <p class="sheet-meter-detail">{detail}</p>
                    </div>
                    <figure class="sheet-qr" data-testid="sheet-qr">
                        {qr_view}
                        <figcaption>"Scan to reopen this design."</figcaption>
                    </figure>
                </div>
            }
        })
    }
}

/// End of the printed sheet: fill-in lines (one lot line per reagent), the
/// cautions line when no specific caution applies, and the link in small print.
#[component]
pub(crate) fn SheetFill(
    spec: Memo<RecipeSpec>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
    link: Memo<String>,
    no_cautions: Signal<bool>,
) -> impl IntoView {
    let painted = use_app().painted;
    move || {
        solved(spec, result, pending, painted).map(|(sp, r)| {
            let lots = r
                .ingredients
                .iter()
                .map(|i| {
                    view! {
                        <div class="fill">
                            <span class="fill-label">{pretty_formula(&i.formula)} " lot"</span>
                            <span class="fill-line"></span>
                        </div>
                    }
                })
                .collect_view();
            let of = meter_of(&sp, &r);
            let target = format!(
                "at ____ °C (meter must read {} at {} °C{})",
                fmt_ph(r.meter.ph),
                fmt_input(r.meter.temperature_c),
                if of.is_empty() { String::new() } else { format!(", {of}") }
            );
            view! {
                <section class="print-only bench-sheet" data-testid="recipe-sheet-fill" aria-label="Bench record">
                    {no_cautions.get().then(|| view! {
                        <p class="sheet-cautions">
                            "Cautions: none specific to these reagents. "
                            {crate::widgets::cautions::DEFER}
                        </p>
                    })}
                    <div class="sheet-fill">
                        <h3>"Bench record"</h3>
                        <div class="fill"><span class="fill-label">"Prepared by"</span><span class="fill-line"></span></div>
                        <div class="fill"><span class="fill-label">"Date"</span><span class="fill-line"></span></div>
                        {lots}
                        <div class="fill">
                            <span class="fill-label">"Meter reading observed"</span>
                            <span class="fill-line"></span>
                            <span class="fill-label">{target}</span>
                        </div>
                        <div class="fill"><span class="fill-label">"Expiry"</span><span class="fill-line"></span></div>
                    </div>
                    <crate::workspaces::meter::sheet::MeterSheet />
                    <p class="sheet-link" data-testid="sheet-link">{move || link.get()}</p>
                    {move || link.with(|l| crate::designs::address::local_note(l)).map(|n| view! {
                        <p class="sheet-link" data-testid="sheet-link-local">{n}</p>
                    })}
                </section>
            }
        })
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;

    /// The dark modules a path draws, read back from its `M x,y h n` runs.
    fn modules(q: &QrSvg) -> Vec<Vec<bool>> {
        let mut grid = vec![vec![false; q.size]; q.size];
        for run in q.path.split('M').skip(1) {
            let (xy, rest) = run.split_once('h').unwrap();
            let (x, y) = xy.split_once(',').unwrap();
            let n: usize = rest.split('v').next().unwrap().parse().unwrap();
            let (x, y): (usize, usize) = (x.parse().unwrap(), y.parse().unwrap());
            for cell in &mut grid[y][x..x + n] {
                assert!(!*cell, "runs do not overlap");
                *cell = true;
            }
        }
        grid
    }

    #[test]
    fn the_path_draws_exactly_the_codes_dark_modules_inside_a_quiet_zone() {
        let text = "https://example.org/bufferwright/#z=abc.0123abcd";
        let q = qr_svg(text).unwrap();
        let code = QrCode::with_error_correction_level(text.as_bytes(), EcLevel::L).unwrap();
        let w = code.width();
        assert_eq!(q.size, w + 8);
        let grid = modules(&q);
        let colors = code.to_colors();
        for y in 0..q.size {
            for x in 0..q.size {
                let inside = (QUIET..QUIET + w).contains(&x) && (QUIET..QUIET + w).contains(&y);
                let want = inside && colors[(y - QUIET) * w + (x - QUIET)] == Color::Dark;
                assert_eq!(grid[y][x], want, "module {x},{y}");
            }
        }
        // The three finder patterns: a 7×7 dark ring at the top-left, top-right and bottom-left.
        for (fx, fy) in [(0, 0), (w - 7, 0), (0, w - 7)] {
            for k in 0..7 {
                assert!(grid[QUIET + fy][QUIET + fx + k] && grid[QUIET + fy + 6][QUIET + fx + k]);
                assert!(grid[QUIET + fy + k][QUIET + fx] && grid[QUIET + fy + k][QUIET + fx + 6]);
            }
        }
    }

    #[test]
    fn a_real_share_link_fits_and_an_oversized_text_is_refused() {
        let d = solver::document::demo_design();
        let link = share_url("https://example.org/bufferwright/", &d);
        let q = qr_svg(&link).unwrap();
        assert!(q.size <= 177 + 8, "a QR code is at most version 40");
        assert!(qr_svg(&"x".repeat(4000)).is_err());
    }
}
