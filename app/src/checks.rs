//! "Check the engine": the solver's own list of published reference cases, run in this browser, as a table with a CSV download and a printable report.
//!
//! The list, the computation and the pass/fail verdicts are the solver's
//! ([`solver::selfcheck::run_self_check`]): the same list the
//! `bufferwright self-check` command and the native test suite iterate. This
//! module only runs it when the view is opened and lays the rows out.
//!
//! Printing: "Print report" marks the page (`<html data-print="selfcheck">`)
//! for the length of the print, and the print rules in `trust.css` then show
//! the report alone. The mark is removed when the print is done.

use crate::workspaces::recipe::result::today;
use leptos::prelude::*;
use solver::selfcheck::{run_self_check, to_csv, CaseResult, SelfCheckReport};
use wasm_bindgen::JsCast;

/// Styles of the self-check view and of the uncertainty lines (scoped by class;
/// includes the print rules for the report).
const TRUST_CSS: &str = include_str!("trust.css");

/// Attribute set on `<html>` while the report is being printed.
pub const PRINT_ATTR: &str = "data-print";
/// Its value for the self-check report.
pub const PRINT_VALUE: &str = "selfcheck";

/// The summary line: engine version, date, counts.
pub fn summary_text(report: &SelfCheckReport, date: &str) -> String {
    let verdict = if report.failed == 0 && !report.cases.is_empty() {
        "every case within its tolerance"
    } else {
        "some cases outside their tolerance: see the marked rows"
    };
    format!(
        "Engine {} · checked {date} in this browser · {} passed, {} failed ({verdict})",
        report.engine_version, report.passed, report.failed
    )
}

/// File name of the CSV download.
pub fn csv_file_name(date: &str) -> String {
    if date.is_empty() {
        "bufferwright-self-check.csv".into()
    } else {
        format!("bufferwright-self-check-{date}.csv")
    }
}

/// Decimals written in a published value (`4.005` → 3), at most 8.
fn decimals_of(v: f64) -> usize {
    let s = format!("{v}");
    s.split_once('.').map_or(0, |(_, d)| d.len().min(8))
}

/// How many decimals to show a computed value and a difference with: two
/// more than the published value carries, and at least enough for the
/// tolerance's first figure.
pub fn shown_decimals(published: f64, tolerance: f64) -> usize {
    let from_tol = if tolerance > 0.0 && tolerance.is_finite() {
        (-tolerance.log10().floor()).max(0.0) as usize + 1
    } else {
        0
    };
    (decimals_of(published) + 2).max(from_tol).min(10)
}

fn minus(s: String) -> String {
    match s.strip_prefix('-') {
        Some(rest) => format!("\u{2212}{rest}"),
        None => s,
    }
}

/// A published value as written (`4.005`, `204.222`).
pub fn published_text(v: f64) -> String {
    if v.is_finite() {
        minus(format!("{v}"))
    } else {
        "—".into()
    }
}

/// The computed value of a row, or "error".
pub fn computed_text(r: &CaseResult) -> String {
    let d = shown_decimals(r.published, r.tolerance);
    match r.computed {
        Some(c) if c.is_finite() => minus(format!("{c:.d$}")),
        Some(_) => "not finite".into(),
        None => "error".into(),
    }
}

/// The signed difference computed − published of a row.
pub fn difference_text(r: &CaseResult) -> String {
    let d = shown_decimals(r.published, r.tolerance);
    match r.difference {
        Some(x) if x.is_finite() => {
            let s = format!("{x:.d$}");
            let zero = s
                .trim_start_matches('-')
                .trim_matches(|c| c == '0' || c == '.');
            if zero.is_empty() {
                format!("{:.d$}", 0.0)
            } else if x > 0.0 {
                format!("+{s}")
            } else {
                minus(s)
            }
        }
        _ => "—".into(),
    }
}

/// The tolerance of a row (`± 0.02`).
pub fn tolerance_text(r: &CaseResult) -> String {
    format!("± {}", published_text(r.tolerance))
}

/// Remove the print mark (when it is ours).
fn clear_print_mark() {
    if let Some(r) = document().document_element() {
        if r.get_attribute(PRINT_ATTR).as_deref() == Some(PRINT_VALUE) {
            let _ = r.remove_attribute(PRINT_ATTR);
        }
    }
}

/// Mark the page for printing the report, print, and unmark it afterwards.
/// Browsers return from `print()` when the print dialog closes; the view's
/// `afterprint` listener clears the mark as well, for those that do not.
fn print_report() {
    let Some(root) = document().document_element() else {
        return;
    };
    let _ = root.set_attribute(PRINT_ATTR, PRINT_VALUE);
    let _ = window().print();
    clear_print_mark();
}

/// One row of the table.
#[component]
fn CaseRow(r: CaseResult) -> impl IntoView {
    let verdict = if r.pass { "pass" } else { "FAIL" };
    let error = r.error.clone();
    view! {
        <tr
            data-testid=format!("selfcheck-row-{}", r.id)
            data-pass=if r.pass { "true" } else { "false" }
            class:fail=!r.pass
        >
            <td>
                {r.case.clone()}
                <span class="sub">{format!("{} · {} · {}", r.id, r.status.label(), r.source)}</span>
            </td>
            <td class="num">{published_text(r.published)}</td>
            <td class="num">{computed_text(&r)}</td>
            <td class="num">{difference_text(&r)}</td>
            <td class="num">{tolerance_text(&r)}</td>
            <td class="verdict">
                <strong>{verdict}</strong>
                {error.map(|e| view! { <span class="sub">{e}</span> })}
            </td>
        </tr>
    }
}

/// The report: summary, buttons and the table.
#[component]
fn Report(report: SelfCheckReport, date: String) -> impl IntoView {
    let summary = summary_text(&report, &date);
    let all_pass = report.failed == 0 && !report.cases.is_empty();
    let csv = to_csv(&report);
    let file = csv_file_name(&date);
    let on_csv = move |_| crate::designs::download(&file, &csv);
    let rows = report.cases;
    view! {
        <div class="print-only selfcheck-print-head">
            <p class="print-title">"Bufferwright engine self-check"</p>
        </div>
        <p class="selfcheck-summary" class:all-pass=all_pass data-testid="selfcheck-summary" role="status">
            {summary}
        </p>
        <div class="actions">
            <button type="button" class="btn secondary" data-testid="selfcheck-csv" on:click=on_csv>
                "Download CSV"
            </button>
            <button type="button" class="btn secondary" data-testid="selfcheck-print" on:click=move |_| print_report()>
                "Print report"
            </button>
        </div>
        <div class="selfcheck-scroll">
            <table class="table selfcheck-table" data-testid="selfcheck-table">
                <caption class="visually-hidden">"Published reference values and what this engine computes for them"</caption>
                <thead>
                    <tr>
                        <th scope="col">"Case and source"</th>
                        <th scope="col" class="num">"Published"</th>
                        <th scope="col" class="num">"Computed"</th>
                        <th scope="col" class="num">"Difference"</th>
                        <th scope="col" class="num">"Tolerance"</th>
                        <th scope="col">"Result"</th>
                    </tr>
                </thead>
                <tbody>
                    {rows.into_iter().map(|r| view! { <CaseRow r=r /> }).collect_view()}
                </tbody>
            </table>
        </div>
        <p class="hint">
            "Status words: confirmed (read in the source), computed (from a confirmed formula or table), from memory (recalled, not re-read; the tolerance allows for a slip), common practice. The same list runs from the command line: bufferwright self-check."
        </p>
    }
}

/// The footer's "Check the engine" view: a `<details>` that runs the
/// self-check each time it is opened.
#[component]
pub fn EngineCheck() -> impl IntoView {
    let report: RwSignal<Option<(SelfCheckReport, String)>> = RwSignal::new(None);
    let on_toggle = move |ev: leptos::ev::Event| {
        let open = ev
            .target()
            .and_then(|t| t.dyn_into::<web_sys::Element>().ok())
            .is_some_and(|e| e.has_attribute("open"));
        if open {
            report.set(Some((run_self_check(), today())));
        }
    };
    let after = window_event_listener(leptos::ev::afterprint, move |_| clear_print_mark());
    on_cleanup(move || after.remove());
    view! {
        <style>{TRUST_CSS}</style>
        <details class="selfcheck" data-testid="selfcheck" on:toggle=on_toggle>
            <summary data-testid="selfcheck-open">"Check the engine"</summary>
            <div class="selfcheck-body">
                <p class="hint no-print">
                    "Recomputes published reference values (pH standards, pKw, molar masses, field fractions, recipe round trips) with the engine this page uses, here in this browser, and compares each with its tolerance."
                </p>
                {move || {
                    report
                        .get()
                        .map(|(r, date)| view! { <Report report=r date=date /> })
                }}
            </div>
        </details>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use solver::selfcheck::Status;

    fn row(published: f64, computed: Option<f64>, tolerance: f64) -> CaseResult {
        CaseResult {
            id: "x".into(),
            case: "a case".into(),
            published,
            source: "a source".into(),
            status: Status::Confirmed,
            computed,
            difference: computed.map(|c| c - published),
            tolerance,
            pass: computed.is_some_and(|c| (c - published).abs() <= tolerance),
            error: None,
        }
    }

    #[test]
    fn computed_values_carry_two_more_decimals_than_published() {
        let r = row(4.005, Some(4.012_34), 0.02);
        assert_eq!(computed_text(&r), "4.01234");
        assert_eq!(difference_text(&r), "+0.00734");
        assert_eq!(tolerance_text(&r), "± 0.02");
        assert_eq!(published_text(r.published), "4.005");
    }

    #[test]
    fn a_tiny_tolerance_still_shows_its_figure() {
        // A round trip: published 7.4, tolerance 0.001 → at least 4 decimals.
        let r = row(7.4, Some(7.400_02), 0.001);
        assert_eq!(shown_decimals(7.4, 0.001), 4);
        assert_eq!(computed_text(&r), "7.4000");
        assert_eq!(difference_text(&r), "0.0000");
    }

    #[test]
    fn negative_differences_use_a_minus_sign_and_errors_say_so() {
        let r = row(9.18, Some(9.17), 0.02);
        assert_eq!(difference_text(&r), "\u{2212}0.0100");
        let e = row(9.18, None, 0.02);
        assert_eq!(computed_text(&e), "error");
        assert_eq!(difference_text(&e), "—");
    }

    #[test]
    fn the_summary_counts_what_the_solver_reports() {
        let report = run_self_check();
        let s = summary_text(&report, "2026-01-02");
        assert!(s.contains(&format!("Engine {}", report.engine_version)));
        assert!(s.contains("2026-01-02"));
        assert!(s.contains(&format!(
            "{} passed, {} failed",
            report.passed, report.failed
        )));
        assert_eq!(report.failed, 0, "{}", solver::selfcheck::to_text(&report));
        assert!(s.contains("every case within its tolerance"));
        let mut bad = report.clone();
        bad.failed = 1;
        assert!(summary_text(&bad, "d").contains("marked rows"));
        assert_eq!(
            csv_file_name("2026-01-02"),
            "bufferwright-self-check-2026-01-02.csv"
        );
        assert_eq!(csv_file_name(""), "bufferwright-self-check.csv");
    }
}
