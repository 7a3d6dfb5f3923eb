//! Text summaries of the plots for the canvases' `aria-label`s.

use super::style::{Swatch, MUTED};
use crate::plots::data::{added_label, short, sig, PlotData};

/// pK legend entries: one line for a single system ("pKa at 37 °C, I = 0: 2.21, 7.18,
/// 12.25"), one per system when there are several.
pub(super) fn pk_legend(data: &PlotData) -> Vec<(Swatch, String)> {
    let t = short(data.temperature_c, 3);
    let list = |pks: &[f64]| {
        pks.iter()
            .map(|pk| format!("{pk:.2}"))
            .collect::<Vec<_>>()
            .join(", ")
    };
    match data.systems.as_slice() {
        [one] => vec![(
            Swatch::Dashed(MUTED),
            format!("pKa at {t} °C, I = 0: {}", list(&one.pks)),
        )],
        many => many
            .iter()
            .map(|sys| {
                (
                    Swatch::Dashed(MUTED),
                    format!("pKa {} ({t} °C, I = 0): {}", sys.name, list(&sys.pks)),
                )
            })
            .collect(),
    }
}

/// Text of the pK legend for summaries.
fn pk_text(data: &PlotData) -> String {
    pk_legend(data)
        .into_iter()
        .map(|e| e.1)
        .collect::<Vec<_>>()
        .join("; ")
}

/// Text for the canvas `aria-label` of the species plot.
pub fn species_summary(data: &PlotData) -> String {
    let at = data
        .species_at(data.ph)
        .map(|(_, v, _)| {
            v.iter()
                .filter(|s| s.fraction >= 0.005)
                .map(|s| format!("{} {:.0} %", s.label, s.fraction * 100.0))
                .collect::<Vec<_>>()
                .join(", ")
        })
        .unwrap_or_default();
    format!(
        "Species fractions from pH 0 to 14. At the working pH {:.2}: {at}. {}.",
        data.ph,
        pk_text(data)
    )
}

/// Text for the canvas `aria-label` of the capacity plot.
pub fn capacity_summary(data: &PlotData) -> String {
    // The buffering step nearest the working pH.
    let peak = data
        .pk_marks()
        .iter()
        .min_by(|a, b| (a.2 - data.ph).abs().total_cmp(&(b.2 - data.ph).abs()))
        .and_then(|m| crate::plots::data::nearest(&data.grid, m.2))
        .and_then(|i| Some((*data.grid.get(i)?, *data.capacity_mm.get(i)?)));
    let peak = peak.map_or(String::new(), |(x, b)| {
        format!(" Near pH {x:.1}, the nearest pK, β is {} mM/pH.", sig(b, 3))
    });
    format!(
        "Buffer capacity from pH 0 to 14. At the working pH {:.2}, β = {} mmol/(L·pH).{peak}",
        data.ph,
        sig(data.capacity_at_ph * 1000.0, 3)
    )
}

/// Text for the canvas `aria-label` of the titration plot.
pub fn titration_summary(data: &PlotData) -> String {
    let first = data.added_mm.first().zip(data.titration_ph.first());
    let last = data.added_mm.last().zip(data.titration_ph.last());
    match (first, last) {
        (Some((a0, p0)), Some((a1, p1))) => format!(
            "Titration curve starting at pH {:.2}: adding {} brings it to pH {p0:.2}; adding {} to pH {p1:.2}.",
            data.ph,
            added_label(*a0),
            added_label(*a1)
        ),
        _ => "Titration curve: no data.".into(),
    }
}
