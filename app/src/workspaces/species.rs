//! "Species and capacity" workspace: species, buffer capacity and titration plots of the recipe or the mixture.
//!
//! The component only wires signals: the plotted composition and its curves
//! are `Memo`s over the design (computed by [`crate::plots::data`] from the
//! solver), the pointer cursor and the fraction/concentration choice are local
//! signals, and the only effects are the canvases' own redraws.

use crate::plots::canvas::{CanvasArea, PlotCanvas};
use crate::plots::data::{self, added_label, conc_text, short, sig, PlotData, Quantity};
use crate::plots::draw::{self, Frame};
use crate::state::use_app;
use leptos::prelude::*;
use solver::document::PlotSource;

/// Where the pointer (or the arrow keys) last put the cursor.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Cursor {
    /// On the species or capacity plot, at a pH.
    Ph(f64),
    /// On the titration plot, at an added amount (mmol/L).
    Added(f64),
}

impl Cursor {
    fn ph(self) -> Option<f64> {
        match self {
            Cursor::Ph(x) => Some(x),
            Cursor::Added(_) => None,
        }
    }
    fn added(self) -> Option<f64> {
        match self {
            Cursor::Added(x) => Some(x),
            Cursor::Ph(_) => None,
        }
    }
}

type PlotResult = Result<PlotData, String>;

fn now_ms() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map_or(0.0, |p| p.now())
}

/// Paint one plot, or a short message when there is nothing to plot.
fn paint_or_message(
    area: &CanvasArea,
    scale: f64,
    data: &PlotResult,
    f: impl FnOnce(&CanvasArea, &PlotData) -> Option<Frame>,
) -> Option<Frame> {
    match data {
        Ok(d) => f(area, d),
        Err(_) => {
            let _ = draw::draw_message(area, "Nothing to plot (see the message above).", scale);
            Some(Frame {
                left: 0,
                right: 0,
                top: 0,
                bottom: 0,
                x: (0.0, 1.0),
            })
        }
    }
}

/// Text of the readout for a cursor position.
fn readout_text(data: &PlotData, cursor: Option<Cursor>) -> String {
    match cursor {
        Some(Cursor::Ph(ph)) => match data.species_at(ph) {
            Some((x, values, beta)) => {
                let species = values
                    .iter()
                    .map(|v| {
                        format!(
                            "{} {} ({} mM)",
                            v.label,
                            fraction_text(v.fraction),
                            conc_text(v.conc_mm)
                        )
                    })
                    .collect::<Vec<_>>()
                    .join(" · ");
                format!("pH {x:.2}: {species} · β {} mM/pH", sig(beta, 3))
            }
            None => String::new(),
        },
        Some(Cursor::Added(a)) => match data.titration_at(a) {
            Some((x, ph)) if x.abs() < 1e-9 => format!("nothing added: pH {ph:.2}"),
            Some((x, ph)) => format!("{} added → pH {ph:.2}", added_label(x)),
            None => String::new(),
        },
        None => "Point at or touch a plot (or focus it and use the arrow keys) to read the values there.".into(),
    }
}

/// A fraction for reading: three decimals, "<0.001" below that.
fn fraction_text(f: f64) -> String {
    if f > 0.0 && f < 0.0005 {
        "<0.001".into()
    } else {
        format!("{f:.3}")
    }
}

/// Short description of the plotted composition.
fn context_text(d: &PlotData) -> String {
    let systems = d
        .systems
        .iter()
        .map(|s| format!("{} {} mM", s.name, short(s.total_m * 1000.0, 3)))
        .collect::<Vec<_>>()
        .join(" + ");
    let from = match d.kind {
        PlotSource::Recipe => "the recipe's finished buffer",
        PlotSource::Mixture => "the flask mixture",
    };
    format!(
        "{systems} at {} °C: pH {:.2}, ionic strength {} M ({from}).",
        short(d.temperature_c, 3),
        d.ph,
        sig(d.ionic_strength, 3)
    )
}

/// The "Species and capacity" workspace.
#[component]
pub fn SpeciesWorkspace() -> impl IntoView {
    let app = use_app();
    let source = Memo::new(move |_| app.design.with(data::source));
    let compute_ms = RwSignal::new(0.0_f64);
    let plot: Memo<PlotResult> = Memo::new(move |_| {
        let t0 = now_ms();
        let r = source.with(|s| s.as_ref().map_err(Clone::clone).and_then(data::compute));
        // For the redraw measurement (tests/perf/plots.mjs): the solver's share.
        compute_ms.set(now_ms() - t0);
        r
    });
    let kind = Memo::new(move |_| app.design.with(|d| d.plot_source));
    let stale = Memo::new(move |_| {
        let prefix = match kind.get() {
            PlotSource::Recipe => "recipe-",
            PlotSource::Mixture => "mixture-",
        };
        !app.pending_in(prefix).is_empty()
    });
    let quantity = RwSignal::new(Quantity::Fraction);
    let cursor = RwSignal::new(None::<Cursor>);
    // Each plot follows only its own kind of cursor: a move on the titration plot
    // leaves the species and capacity plots alone, and the other way round.
    let cursor_ph = Memo::new(move |_| cursor.get().and_then(Cursor::ph));
    let cursor_added = Memo::new(move |_| cursor.get().and_then(Cursor::added));

    let set_kind = move |k: PlotSource| {
        if app.design.with_untracked(|d| d.plot_source) != k {
            app.design.update(|d| d.plot_source = k);
        }
    };

    let on_ph = Callback::new(move |x: f64| cursor.set(Some(Cursor::Ph(x))));
    let on_added = Callback::new(move |x: f64| cursor.set(Some(Cursor::Added(x))));
    let step_ph = Callback::new(move |dir: i32| {
        let start = cursor
            .get_untracked()
            .and_then(Cursor::ph)
            .or_else(|| plot.with_untracked(|d| d.as_ref().ok().map(|d| d.ph)))
            .unwrap_or(7.0);
        let x = (start + 0.1 * f64::from(dir)).clamp(data::PH_MIN, data::PH_MAX);
        cursor.set(Some(Cursor::Ph(x)));
    });
    let step_added = Callback::new(move |dir: i32| {
        let span = plot.with_untracked(|d| {
            d.as_ref()
                .ok()
                .and_then(|d| d.added_mm.last().copied())
                .unwrap_or(1.0)
        });
        let start = cursor
            .get_untracked()
            .and_then(Cursor::added)
            .unwrap_or(0.0);
        let x = (start + span / 40.0 * f64::from(dir)).clamp(-span, span);
        cursor.set(Some(Cursor::Added(x)));
    });

    let paint_species = move |area: &CanvasArea, scale: f64| {
        let q = quantity.get();
        let c = cursor_ph.get();
        plot.with(|d| {
            paint_or_message(area, scale, d, |a, d| {
                draw::draw_species(a, d, q, c, scale).ok()
            })
        })
    };
    let paint_capacity = move |area: &CanvasArea, scale: f64| {
        let c = cursor_ph.get();
        plot.with(|d| {
            paint_or_message(area, scale, d, |a, d| {
                draw::draw_capacity(a, d, c, scale).ok()
            })
        })
    };
    let paint_titration = move |area: &CanvasArea, scale: f64| {
        let c = cursor_added.get();
        plot.with(|d| {
            paint_or_message(area, scale, d, |a, d| {
                draw::draw_titration(a, d, c, scale).ok()
            })
        })
    };

    let summary = move |f: fn(&PlotData) -> String| {
        Signal::derive(move || {
            plot.with(|d| match d {
                Ok(d) => f(d),
                Err(e) => format!("No plot: {e}"),
            })
        })
    };
    let readout = move || {
        plot.with(|d| match d {
            Ok(d) => readout_text(d, cursor.get()),
            Err(_) => String::new(),
        })
    };

    // The headline answer, kept in view on a phone as the other workspaces' are.
    let answer = Signal::derive(move || {
        if stale.get() {
            return (
                false,
                "Correct the marked fields to see the species.".to_string(),
            );
        }
        plot.with(|d| match d {
            Ok(d) => (true, d.headline()),
            Err(e) => (false, format!("No plot: {e}")),
        })
    });
    view! {
        <crate::widgets::answer::AnswerBar text=Signal::derive(move || answer.get().1) ok=Signal::derive(move || answer.get().0) />
        <div class="species-ws">
            <h2 class="card-title">"Species and capacity"</h2>
            <div class="plot-controls">
                <fieldset class="plot-choice">
                    <legend>"Plot"</legend>
                    <label>
                        <input
                            type="radio"
                            name="plot-source"
                            data-testid="plot-source-recipe"
                            prop:checked=move || kind.get() == PlotSource::Recipe
                            on:change=move |_| set_kind(PlotSource::Recipe)
                        />
                        "the recipe's buffer"
                    </label>
                    <label>
                        <input
                            type="radio"
                            name="plot-source"
                            data-testid="plot-source-mixture"
                            prop:checked=move || kind.get() == PlotSource::Mixture
                            on:change=move |_| set_kind(PlotSource::Mixture)
                        />
                        "the flask mixture"
                    </label>
                </fieldset>
                <fieldset class="plot-choice">
                    <legend>"Species as"</legend>
                    <label>
                        <input
                            type="radio"
                            name="plot-quantity"
                            data-testid="plot-quantity-fraction"
                            prop:checked=move || quantity.get() == Quantity::Fraction
                            on:change=move |_| quantity.set(Quantity::Fraction)
                        />
                        "fraction"
                    </label>
                    <label>
                        <input
                            type="radio"
                            name="plot-quantity"
                            data-testid="plot-quantity-concentration"
                            prop:checked=move || quantity.get() == Quantity::Concentration
                            on:change=move |_| quantity.set(Quantity::Concentration)
                        />
                        "concentration (mM)"
                    </label>
                </fieldset>
            </div>
            {move || {
                stale
                    .get()
                    .then(|| {
                        view! {
                            <p class="stale" data-testid="plot-stale" role="status">
                                "Some fields hold text that is not a valid value yet; the plots show the last valid design."
                            </p>
                        }
                    })
            }}
            {move || {
                plot.with(|d| match d {
                    Ok(d) => {
                        view! {
                            <p class="plot-context" data-testid="plot-context">
                                {context_text(d)}
                            </p>
                        }
                            .into_any()
                    }
                    Err(e) => {
                        view! {
                            <p class="result-error" data-testid="plot-error" role="alert">
                                {e.clone()}
                            </p>
                        }
                            .into_any()
                    }
                })
            }}
            <crate::reagents::UserReagentNote systems=Signal::derive(move || app.design.with(|d| match d.plot_source {
                PlotSource::Recipe => vec![d.recipe.system.clone()],
                PlotSource::Mixture => d.mixture.components.iter().map(|c| c.system.clone()).collect(),
            })) />
            <p class="plot-readout" data-testid="plot-readout" aria-live="polite">
                {readout}
            </p>
            <div class="plots" data-compute-ms=move || format!("{:.2}", compute_ms.get())>
                <figure class="plot-figure plot-wide">
                    <figcaption>
                        <strong>"Species"</strong>
                        " — how each system's total divides among its forms. Curves are at the solution's ionic strength; the pK marks are thermodynamic (I = 0), so the 50 % crossings sit slightly off them."
                    </figcaption>
                    <PlotCanvas
                        testid="plot-species"
                        label=summary(draw::species_summary)
                        paint=paint_species
                        on_point=on_ph
                        on_step=step_ph
                    />
                    <SpeciesTable plot=plot quantity=quantity />
                </figure>
                <figure class="plot-figure">
                    <figcaption>
                        <strong>"Buffer capacity β"</strong>
                        " — strong base per litre per pH unit the solution absorbs, mM/pH. Below pH 3 and above 11 water itself dominates."
                    </figcaption>
                    <PlotCanvas
                        testid="plot-capacity"
                        label=summary(draw::capacity_summary)
                        paint=paint_capacity
                        on_point=on_ph
                        on_step=step_ph
                    />
                    <CapacityTable plot=plot />
                </figure>
                <figure class="plot-figure">
                    <figcaption>
                        <strong>"Titration"</strong>
                        " — pH after adding HCl (left) or NaOH (right) to one litre, mmol/L."
                    </figcaption>
                    <PlotCanvas
                        testid="plot-titration"
                        label=summary(draw::titration_summary)
                        paint=paint_titration
                        on_point=on_added
                        on_step=step_added
                    />
                    <TitrationTable plot=plot />
                </figure>
            </div>
        </div>
    }
}

/// A collapsible data table, rendered only while open (cheap redraws).
#[component]
pub(crate) fn DataTable(
    testid: &'static str,
    summary: &'static str,
    caption: Signal<String>,
    head: Signal<Vec<String>>,
    rows: Signal<Vec<Vec<String>>>,
) -> impl IntoView {
    let open = RwSignal::new(false);
    view! {
        <details
            class="plot-table"
            data-testid=testid
            on:toggle=move |ev| {
                let is_open = event_target::<web_sys::HtmlElement>(&ev).has_attribute("open");
                open.set(is_open);
            }
        >
            <summary>{summary}</summary>
            {move || {
                open.get()
                    .then(|| {
                        view! {
                            <div
                                class="table-scroll"
                                role="region"
                                tabindex="0"
                                aria-label=summary
                            >
                                <table>
                                    <caption>{caption}</caption>
                                    <thead>
                                        <tr>
                                            {head
                                                .get()
                                                .into_iter()
                                                .map(|h| view! { <th scope="col">{h}</th> })
                                                .collect_view()}
                                        </tr>
                                    </thead>
                                    <tbody>
                                        {rows
                                            .get()
                                            .into_iter()
                                            .map(|r| {
                                                let mut cells = r.into_iter();
                                                let first = cells.next().unwrap_or_default();
                                                view! {
                                                    <tr>
                                                        <th scope="row">{first}</th>
                                                        {cells.map(|c| view! { <td>{c}</td> }).collect_view()}
                                                    </tr>
                                                }
                                            })
                                            .collect_view()}
                                    </tbody>
                                </table>
                            </div>
                        }
                    })
            }}
        </details>
    }
}

/// Species values every 0.5 pH.
#[component]
fn SpeciesTable(plot: Memo<PlotResult>, quantity: RwSignal<Quantity>) -> impl IntoView {
    let head = Signal::derive(move || {
        let mut h = vec!["pH".to_string()];
        plot.with(|d| {
            if let Ok(d) = d {
                h.extend(d.series.iter().map(|s| d.label(s)));
            }
        });
        h
    });
    let rows = Signal::derive(move || {
        let q = quantity.get();
        plot.with(|d| match d {
            Ok(d) => d
                .table_rows(0.5)
                .into_iter()
                .map(|i| {
                    let mut r = vec![format!("{:.1}", d.grid.get(i).copied().unwrap_or(f64::NAN))];
                    r.extend(d.series.iter().map(|s| match q {
                        Quantity::Fraction => fraction_text(d.value(s, i, q)),
                        Quantity::Concentration => conc_text(d.value(s, i, q)),
                    }));
                    r
                })
                .collect(),
            Err(_) => Vec::new(),
        })
    });
    let caption = Signal::derive(move || match quantity.get() {
        Quantity::Fraction => "Fraction of each system's total, every 0.5 pH".to_string(),
        Quantity::Concentration => "Concentration of each species (mM), every 0.5 pH".to_string(),
    });
    view! {
        <DataTable
            testid="table-species"
            summary="Species table"
            caption=caption
            head=head
            rows=rows
        />
    }
}

/// β every 0.5 pH.
#[component]
fn CapacityTable(plot: Memo<PlotResult>) -> impl IntoView {
    let head = Signal::derive(|| vec!["pH".to_string(), "β, mM/pH".to_string()]);
    let rows = Signal::derive(move || {
        plot.with(|d| match d {
            Ok(d) => d
                .table_rows(0.5)
                .into_iter()
                .map(|i| {
                    vec![
                        format!("{:.1}", d.grid.get(i).copied().unwrap_or(f64::NAN)),
                        sig(d.capacity_mm.get(i).copied().unwrap_or(f64::NAN), 3),
                    ]
                })
                .collect(),
            Err(_) => Vec::new(),
        })
    });
    let caption = Signal::derive(|| "Buffer capacity β, every 0.5 pH".to_string());
    view! {
        <DataTable
            testid="table-capacity"
            summary="Capacity table"
            caption=caption
            head=head
            rows=rows
        />
    }
}

/// Titration curve at 21 evenly spaced amounts.
#[component]
fn TitrationTable(plot: Memo<PlotResult>) -> impl IntoView {
    let head = Signal::derive(|| vec!["Added, mmol/L".to_string(), "pH".to_string()]);
    let rows = Signal::derive(move || {
        plot.with(|d| match d {
            Ok(d) => d
                .titration_rows(21)
                .into_iter()
                .filter_map(|i| {
                    let (a, ph) = (d.added_mm.get(i)?, d.titration_ph.get(i)?);
                    Some(vec![added_label(*a), format!("{ph:.2}")])
                })
                .collect(),
            Err(_) => Vec::new(),
        })
    });
    let caption = Signal::derive(|| "pH after adding strong acid or base".to_string());
    view! {
        <DataTable
            testid="table-titration"
            summary="Titration table"
            caption=caption
            head=head
            rows=rows
        />
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::plots::data::tests::recipe_data;

    #[test]
    fn readout_reads_the_solver_curves() {
        let d = recipe_data();
        let t = readout_text(&d, Some(Cursor::Ph(7.2)));
        assert!(t.starts_with("pH 7.20:"), "{t}");
        assert!(t.contains("β "), "{t}");
        let t = readout_text(&d, Some(Cursor::Added(-10.0)));
        assert!(t.contains("mmol/L HCl added → pH"), "{t}");
        assert!(readout_text(&d, None).contains("Point at"));
        assert!(
            context_text(&d).contains("Phosphate 50 mM"),
            "{}",
            context_text(&d)
        );
        assert_eq!(fraction_text(0.0001), "<0.001");
    }
}
