//! The meter part of the printed bench sheet: calibration temperature, the standards with their pH(S) and a lot line each, slope and offset (filled in from the design's calibration, or lines to fill).

use crate::state::use_app;
use crate::widgets::format::fmt_input;
use leptos::prelude::*;
use solver::meter::find_standard;

fn line(label: String) -> impl IntoView {
    view! { <div class="fill"><span class="fill-label">{label}</span><span class="fill-line"></span></div> }
}

/// Print-only block for the bench sheet (built once the page has painted).
#[component]
pub fn MeterSheet() -> impl IntoView {
    let app = use_app();
    move || {
        if !app.painted.get() {
            return None;
        }
        let cal = app.design.with(|d| d.calibration.clone());
        let body = match cal {
            Some(c) => {
                let t = c.temperature_c;
                let stds = c
                    .points
                    .iter()
                    .map(|p| {
                        let ph = find_standard(&p.standard)
                            .and_then(|s| s.ph_at(t, "t").ok())
                            .map_or_else(String::new, |v| format!(" pH(S) {:.3}", v.0));
                        let name =
                            find_standard(&p.standard).map_or(p.standard.as_str(), |s| s.name);
                        line(format!("{name}{ph}, lot {}", p.lot))
                    })
                    .collect_view();
                let fit = c.fit.as_ref().map_or_else(
                    || {
                        "Slope ______ mV/pH (____ % of Nernst)   Offset ______ mV at pH 7"
                            .to_string()
                    },
                    |f| {
                        format!(
                            "Slope {:.2} mV/pH ({:.1} % of Nernst)   Offset {:+.1} mV at pH 7   {}",
                            f.slope_mv_per_ph,
                            f.slope_percent,
                            f.mv_at_ph7,
                            if f.verdicts.iter().all(|v| v.pass) {
                                "all checks pass"
                            } else {
                                "a check FAILS"
                            }
                        )
                    },
                );
                view! {
                    <p data-testid="sheet-meter-fit">{format!("Calibrated at {} °C. ", fmt_input(t))}{fit}</p>
                    {stds}
                }
                .into_any()
            }
            None => view! {
                {line("Calibration temperature (°C)".into())}
                {line("Standard 1, pH(S), lot".into())}
                {line("Standard 2, pH(S), lot".into())}
                {line("Slope (mV/pH, % of Nernst)".into())}
                {line("Offset (mV at pH 7)".into())}
            }
            .into_any(),
        };
        Some(view! {
            <div class="sheet-fill sheet-meter" data-testid="sheet-meter">
                <h3>"pH meter calibration"</h3>
                {body}
                {line("Checked by".into())}
            </div>
        })
    }
}
