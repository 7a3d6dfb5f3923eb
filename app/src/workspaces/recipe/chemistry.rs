//! The recipe's chemistry beside its result: species fractions and buffer capacity around the target, with its marks.
//!
//! Data comes from the solver through [`crate::plots::data::compute`] (the
//! recipe's finished solution at the working temperature); drawing is the
//! Species tab's panel code with the target, tolerance window and meter
//! reading marked ([`crate::plots::draw::draw_recipe_chemistry`]).

use crate::plots::canvas::PlotCanvas;
use crate::plots::data::{self, short, sig, PlotData, Source};
use crate::plots::draw::{self, Marks};
use crate::workspaces::species::DataTable;
use leptos::prelude::*;
use solver::document::PlotSource;
use solver::recipe::{RecipeResult, RecipeSpec};
use solver::system::AcidSystem;
use solver::SolverError;

/// The marks of a solved recipe: target, tolerance, and the meter reading
/// when it is read at another temperature or on a concentrate.
pub fn recipe_marks(spec: &RecipeSpec, r: &RecipeResult) -> Marks {
    let differs =
        (r.meter.temperature_c - spec.temperature_c).abs() > 1e-9 || r.concentrate.is_some();
    Marks {
        target: spec.target_ph,
        tolerance: r.tolerance.window,
        meter: differs.then_some((r.meter.ph, r.meter.temperature_c)),
    }
}

/// Plot data and marks of a solved recipe.
///
/// # Errors
///
/// The message of a failed curve computation.
pub fn chemistry_data(
    spec: &RecipeSpec,
    r: &RecipeResult,
    custom: &[AcidSystem],
) -> Result<(PlotData, Marks), String> {
    let src = Source {
        kind: PlotSource::Recipe,
        mixture: r.mixture.clone(),
        custom: custom.to_vec(),
    };
    Ok((data::compute_curves(&src)?, recipe_marks(spec, r)))
}

/// The compact plot with its data table; nothing while the recipe has no result.
#[component]
pub(crate) fn RecipeChemistry(
    spec: Memo<RecipeSpec>,
    custom: Memo<Vec<AcidSystem>>,
    result: Memo<Result<RecipeResult, SolverError>>,
    pending: Memo<bool>,
) -> impl IntoView {
    // Computed and drawn after the page's first paint (the headline answer first).
    let painted = crate::state::use_app().painted;
    let plot = Memo::new(move |_| {
        if pending.get() || !painted.get() {
            return None;
        }
        result.with(|r| {
            let r = r.as_ref().ok()?;
            spec.with(|s| custom.with(|c| chemistry_data(s, r, c).ok()))
        })
    });
    let label = Signal::derive(move || {
        plot.with(|p| {
            p.as_ref()
                .map(|(d, m)| draw::recipe_summary(d, m))
                .unwrap_or_default()
        })
    });
    let paint = move |area: &crate::plots::canvas::CanvasArea, scale: f64| {
        plot.with(|p| match p {
            Some((d, m)) => draw::draw_recipe_chemistry(area, d, m, scale).ok(),
            None => None,
        })
    };
    let head = Signal::derive(move || {
        let mut h = vec!["pH".to_string(), "Marked".to_string()];
        plot.with(|p| {
            if let Some((d, _)) = p {
                h.extend(d.series.iter().map(|s| format!("{} %", d.label(s))));
            }
        });
        h.push("β, mM/pH".into());
        h
    });
    let rows = Signal::derive(move || {
        plot.with(|p| {
            p.as_ref()
                .map(|(d, m)| {
                    draw::recipe_table(d, m)
                        .into_iter()
                        .map(|row| {
                            let mut cells = vec![format!("{:.3}", row.ph), row.note];
                            cells.extend(row.fractions.iter().map(|f| short(f * 100.0, 3)));
                            cells.push(sig(row.beta_mm, 3));
                            cells
                        })
                        .collect()
                })
                .unwrap_or_default()
        })
    });
    let caption = Signal::derive(move || {
        plot.with(|p| {
            p.as_ref().map_or(String::new(), |(d, _)| {
                format!(
                    "Species fractions (% of the system total) and buffer capacity at {} °C, every half pH around the target and at the marks (nearest 0.025 pH).",
                    short(d.temperature_c, 3)
                )
            })
        })
    });
    view! {
        <Show when=move || plot.with(Option::is_some)>
            <figure class="plot-figure recipe-chem no-print" data-testid="recipe-chemistry">
                <figcaption>
                    <strong>"Its chemistry"</strong>
                    {move || {
                        spec.with(|s| {
                            format!(
                                " — species and buffer capacity at {} °C around the target; the shaded band is the tolerance window.",
                                short(s.temperature_c, 3)
                            )
                        })
                    }}
                </figcaption>
                <PlotCanvas
                    testid="recipe-chem-plot"
                    label=label
                    paint=paint
                    on_point=Callback::new(|_: f64| {})
                    on_step=Callback::new(|_: i32| {})
                />
                <DataTable
                    testid="recipe-chem-table"
                    summary="Data table of this plot"
                    caption=caption
                    head=head
                    rows=rows
                />
            </figure>
        </Show>
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use solver::document::demo_design;
    use solver::recipe::solve_recipe;

    #[test]
    fn the_meter_is_marked_only_when_it_is_read_elsewhere() {
        let mut spec = demo_design().recipe;
        spec.prepare_temperature_c = None;
        spec.concentrate_factor = 1.0;
        let r = solve_recipe(&spec, &[]).unwrap();
        let (d, m) = chemistry_data(&spec, &r, &[]).unwrap();
        assert_eq!(m.meter, None);
        assert!(
            (d.ph - spec.target_ph).abs() < 1e-3,
            "plot of the finished recipe"
        );
        spec.prepare_temperature_c = Some(22.0);
        let r = solve_recipe(&spec, &[]).unwrap();
        let m = recipe_marks(&spec, &r);
        assert_eq!(m.meter, Some((r.meter.ph, 22.0)));
        assert_eq!(m.tolerance, r.tolerance.window);
        let rows = draw::recipe_table(&d, &m);
        assert!(rows.iter().any(|row| row.note.contains("target")));
        assert!(rows.iter().any(|row| row.note.contains("meter reading")));
        assert!(
            rows.windows(2).all(|w| w[0].ph < w[1].ph),
            "pH order, one row per grid point"
        );
    }
}
