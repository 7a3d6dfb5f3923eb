//! The field reading's plot: share of the form that matters vs pH at the sample temperature and ±5 °C, with a data table.

use super::extras::limit_fraction;
use crate::plots::canvas::{CanvasArea, PlotCanvas};
use crate::plots::draw::{self, Frame};
use crate::plots::field::{draw_fraction, fraction_summary, FractionView};
use leptos::prelude::*;
use solver::field::plot::fraction_curves;
use solver::field::{FieldResult, FieldSpec};
use solver::system::AcidSystem;
use solver::SolverError;

/// Points on the pH grid of the plot.
const POINTS: usize = 121;
/// Half-width of the plotted pH window around the reading.
const HALF_SPAN: f64 = 3.0;

/// The plot's data for a reading, or why there is none.
pub fn fraction_view(
    spec: &FieldSpec,
    custom: &[AcidSystem],
    result: &FieldResult,
) -> Result<FractionView, String> {
    let target = result
        .target
        .ok_or_else(|| "This system has no single form that matters to plot.".to_string())?;
    let lo = (spec.ph - HALF_SPAN).clamp(0.0, 14.0 - 2.0 * HALF_SPAN);
    let hi = lo + 2.0 * HALF_SPAN;
    let c =
        fraction_curves(spec, custom, Some(target), lo, hi, POINTS).map_err(|e| e.to_string())?;
    let frac = result.species.get(target).map_or(0.0, |s| s.fraction);
    Ok(FractionView {
        species: c.species,
        ph: c.ph,
        curves: c
            .curves
            .into_iter()
            .map(|k| (k.temperature_c, k.fraction))
            .collect(),
        temperature_c: spec.temperature_c,
        reading: (spec.ph, frac),
        limit_fraction: result.limit.as_ref().and_then(|l| limit_fraction(l, frac)),
    })
}

/// The fraction plot with its data table.
#[component]
pub fn FractionPlot(
    spec: Memo<FieldSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<FieldResult, SolverError>>,
) -> impl IntoView {
    let data = Memo::new(move |_| {
        result.with(|r| match r {
            Ok(r) => spec.with(|s| custom.with(|c| fraction_view(s, c, r))),
            Err(e) => Err(e.to_string()),
        })
    });
    let paint = move |area: &CanvasArea, scale: f64| {
        data.with(|d| match d {
            Ok(v) => draw_fraction(area, v, scale).ok(),
            Err(_) => {
                let _ = draw::draw_message(area, "Nothing to plot.", scale);
                Some(Frame {
                    left: 0,
                    right: 0,
                    top: 0,
                    bottom: 0,
                    x: (0.0, 1.0),
                })
            }
        })
    };
    let label = Signal::derive(move || {
        data.with(|d| match d {
            Ok(v) => fraction_summary(v),
            Err(e) => format!("No plot: {e}"),
        })
    });
    let head = move || {
        data.with(|d| {
            let mut h = vec!["pH".to_string()];
            if let Ok(v) = d {
                h.extend(
                    v.curves
                        .iter()
                        .map(|(t, _)| format!("{} at {t} °C", v.species)),
                );
            }
            h
        })
    };
    let rows = move || data.with(|d| d.as_ref().map(|v| v.table_rows(10)).unwrap_or_default());
    let open = RwSignal::new(false);
    move || {
        data.with(|d| d.is_ok()).then(|| {
            view! {
                <figure class="plot-figure field-plot">
                    <figcaption>
                        <strong>"Share of the form that matters against pH"</strong>
                        " — at the sample temperature (dark) and 5 °C either side (light); the dot is your reading, the dashed line your limit."
                    </figcaption>
                    <PlotCanvas
                        testid="field-plot"
                        label=label
                        paint=paint
                        on_point=Callback::new(|_| {})
                        on_step=Callback::new(|_| {})
                    />
                    <details
                        class="plot-table"
                        data-testid="field-plot-table"
                        on:toggle=move |ev| {
                            let is_open = event_target::<web_sys::HtmlElement>(&ev).has_attribute("open");
                            open.set(is_open);
                        }
                    >
                        <summary>"Plot data as a table"</summary>
                        {move || open.get().then(|| view! {
                            <div class="table-scroll" role="region" tabindex="0" aria-label="Plot data as a table">
                                <table>
                                    <caption>"Share of the total, per cent"</caption>
                                    <thead>
                                        <tr>{head().into_iter().map(|h| view! { <th scope="col">{h}</th> }).collect_view()}</tr>
                                    </thead>
                                    <tbody>
                                        {rows().into_iter().map(|r| {
                                            let mut cells = r.into_iter();
                                            let first = cells.next().unwrap_or_default();
                                            view! {
                                                <tr>
                                                    <th scope="row">{first}</th>
                                                    {cells.map(|c| view! { <td>{c}</td> }).collect_view()}
                                                </tr>
                                            }
                                        }).collect_view()}
                                    </tbody>
                                </table>
                            </div>
                        })}
                    </details>
                </figure>
            }
        })
    }
}

#[cfg(test)]
#[allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]
mod tests {
    use super::*;
    use solver::field::limit::{Limit, LimitUnit};
    use solver::field::{field_reading, IonicSource, TotalUnit};

    #[test]
    fn ammonia_view_has_three_temperatures_and_the_limit() {
        let spec = FieldSpec {
            system: "ammonium".into(),
            ph: 8.0,
            temperature_c: 20.0,
            total: Some(1.0),
            total_unit: TotalUnit::MgPerLAs,
            ionic: IonicSource::Zero,
            alkalinity: None,
            limit: Some(Limit {
                value: 0.02,
                unit: LimitUnit::MgPerLNh3,
            }),
        };
        let r = field_reading(&spec, &[]);
        assert!(r.is_ok());
        if let Ok(r) = r {
            let v = fraction_view(&spec, &[], &r);
            assert!(v.is_ok(), "{v:?}");
            if let Ok(v) = v {
                assert_eq!(v.curves.len(), 3);
                assert!((v.ph[0] - 5.0).abs() < 1e-12);
                let l = v.limit_fraction.unwrap_or(0.0);
                // 0.02 mg/L NH3 of 1 mg/L N is 0.02 / (1 × 17.031/14.007) of the total.
                assert!((l - 0.02 / (17.031 / 14.007)).abs() < 1e-4, "{l}");
            }
        }
    }
}
