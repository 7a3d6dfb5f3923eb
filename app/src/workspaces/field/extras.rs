//! Field reading extras: alkalinity and limit inputs, and the carbonate, limit and warning results.
//!
//! Kept apart from the main field workspace so that the headline and the
//! basic inputs stay small; each piece reads the design and the reading's
//! `Memo` and writes the design from its handlers.

use crate::state::use_app;
use crate::widgets::format::{error_field, error_message, fmt_ph, fmt_sig, Rule};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField};
use leptos::prelude::*;
use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::limit::{Limit, LimitResult, LimitUnit};
use solver::field::{target_species, FieldResult, FieldSpec, FieldSpecies};
use solver::SolverError;

/// Practical salinity, PSU.
pub const SALINITY: Rule = solver::limits::SALINITY_PSU;
/// Alkalinity (mg/L as CaCO₃ or meq/L).
pub const ALKALINITY: Rule = solver::limits::ALKALINITY_VALUE;
/// A user's limit (above zero).
pub const LIMIT_VALUE: Rule = solver::limits::LIMIT_VALUE;

/// Limit units that fit a system, in display order.
pub fn limit_units(system: &str) -> Vec<LimitUnit> {
    LimitUnit::ALL
        .iter()
        .copied()
        .filter(|u| u.parts().0 == system)
        .collect()
}

/// Keep the optional parts of a reading consistent with its system: an
/// alkalinity only for carbonate, a limit only in a unit of the system.
pub fn fit_to_system(f: &mut FieldSpec) {
    if f.system != "carbonate" {
        f.alkalinity = None;
    }
    if let Some(l) = &f.limit {
        if l.unit.parts().0 != f.system {
            f.limit = None;
        }
    }
    // A total typed as NH₃, H₂S, CaCO₃ or CO₂ is kept as the new system's
    // first basis, as the other mg/L totals are.
    if f.total_unit
        .fixed_basis()
        .is_some_and(|(id, _, _)| id != f.system)
    {
        f.total_unit = solver::field::TotalUnit::MgPerLAs;
    }
}

/// Fraction of the total at which the limit is reached (same water, same total).
pub fn limit_fraction(l: &LimitResult, target_fraction: f64) -> Option<f64> {
    (l.value_mg_l > 0.0 && l.limit_mg_l.is_finite())
        .then(|| target_fraction * l.limit_mg_l / l.value_mg_l)
        .filter(|f| f.is_finite())
}

/// The verdict sentence: within or over, by how much.
pub fn verdict_text(l: &LimitResult) -> String {
    let amount = format!("{} mg/L as {}", fmt_sig(l.value_mg_l, 3), l.basis);
    let limit = format!("{} mg/L as {}", fmt_sig(l.limit_mg_l, 3), l.basis);
    if l.exceeded {
        format!(
            "Over your limit: {} is {amount}, your limit is {limit} ({} mg/L over, {}× the limit).",
            l.species,
            fmt_sig(-l.margin, 3),
            fmt_sig(l.ratio, 3)
        )
    } else {
        format!(
            "Within your limit: {} is {amount}, your limit is {limit} ({} mg/L to spare, {} % of the limit).",
            l.species,
            fmt_sig(l.margin, 3),
            fmt_sig(l.ratio * 100.0, 3)
        )
    }
}

/// The crossing sentence: at what pH the same water meets the limit.
pub fn crossing_text(l: &LimitResult) -> String {
    match l.crossing_ph {
        Some(p) => {
            let dir = if l.rises_with_ph { "above" } else { "below" };
            format!(
                "The same water reaches your limit at pH {}: over it {dir} that pH.",
                fmt_ph(p)
            )
        }
        None => "No pH from 0 to 14 brings this water to your limit.".into(),
    }
}

fn err_signal(
    result: Memo<Result<FieldResult, SolverError>>,
    path: &'static str,
) -> Signal<Option<String>> {
    Signal::derive(move || {
        result.with(|r| match r {
            Err(e) if error_field(e).as_deref() == Some(path) => Some(error_message(e)),
            _ => None,
        })
    })
}

/// Alkalinity value and unit (carbonate, in place of a total).
#[component]
pub fn AlkalinityInputs(
    spec: Memo<FieldSpec>,
    result: Memo<Result<FieldResult, SolverError>>,
) -> impl IntoView {
    let design = use_app().design;
    let unit_key = move || {
        spec.with(|s| match s.alkalinity.map(|a| a.unit) {
            Some(AlkalinityUnit::MeqPerL) => "meq",
            _ => "mg_caco3",
        })
        .to_string()
    };
    move || {
        spec.with(|s| s.alkalinity.is_some()).then(|| {
            view! {
                <div class="row-2">
                    <NumberField
                        id="field-alk"
                        label="Alkalinity"
                        value=Signal::derive(move || spec.with(|s| s.alkalinity.map_or(0.0, |a| a.value)))
                        on_value=Callback::new(move |v| design.update(|d| {
                            if let Some(a) = &mut d.field.alkalinity { a.value = v }
                        }))
                        rule=ALKALINITY
                        error=err_signal(result, "alkalinity.value")
                        hint="Total alkalinity, titrated to about pH 4.5"
                    />
                    <Choice
                        name="field-alk-unit"
                        legend="Alkalinity unit"
                        options=vec![
                            ChoiceOption::new("mg_caco3", "mg/L as CaCO₃"),
                            ChoiceOption::new("meq", "meq/L"),
                        ]
                        selected=Signal::derive(unit_key)
                        on_change=Callback::new(move |k: String| design.update(|d| {
                            let unit = if k == "meq" { AlkalinityUnit::MeqPerL } else { AlkalinityUnit::MgPerLCaco3 };
                            let value = d.field.alkalinity.map_or(100.0, |a| a.value);
                            d.field.alkalinity = Some(Alkalinity { value, unit });
                        }))
                    />
                </div>
            }
        })
    }
}

/// The user's limit: unit (or none) and value, with the plain line that limits are the user's.
#[component]
pub fn LimitInputs(
    spec: Memo<FieldSpec>,
    result: Memo<Result<FieldResult, SolverError>>,
) -> impl IntoView {
    let design = use_app().design;
    let last_value = StoredValue::new(1.0_f64);
    move || {
        let system = spec.with(|s| s.system.clone());
        let (_, why) = target_species(&system)?;
        let mut options = vec![ChoiceOption::new("none", "No limit")];
        for u in limit_units(&system) {
            options.push(ChoiceOption::new(u.key(), u.label()));
        }
        let selected = Signal::derive(move || {
            spec.with(|s| s.limit.map_or("none", |l| l.unit.key()).to_string())
        });
        let on_change = Callback::new(move |k: String| {
            design.update(|d| {
                if let Some(l) = d.field.limit {
                    last_value.set_value(l.value);
                }
                d.field.limit = LimitUnit::from_key(&k).map(|unit| Limit {
                    value: d
                        .field
                        .limit
                        .map_or_else(|| last_value.get_value(), |l| l.value),
                    unit,
                });
            })
        });
        Some(view! {
            <div class="field-limit-inputs" data-testid="field-limit-inputs">
                <Choice
                    name="field-limit-unit"
                    legend=format!("Your limit for {}", why.to_ascii_lowercase())
                    options=options
                    selected=selected
                    on_change=on_change
                />
                {move || spec.with(|s| s.limit.map(|l| l.unit.label())).map(|suffix| view! {
                    <NumberField
                        id="field-limit"
                        label="Limit"
                        value=Signal::derive(move || spec.with(|s| s.limit.map_or(0.0, |l| l.value)))
                        on_value=Callback::new(move |v| design.update(|d| {
                            if let Some(l) = &mut d.field.limit { l.value = v }
                        }))
                        rule=LIMIT_VALUE
                        suffix=suffix
                        error=err_signal(result, "limit.value")
                    />
                })}
                <p class="hint" data-testid="field-limit-note">
                    "Limits are yours to enter: none is built in. Check them against local codes, permits and licensed practice."
                </p>
            </div>
        })
    }
}

/// Warnings of the reading (model range, indicative values), shown plainly.
#[component]
pub fn FieldWarnings(warnings: Vec<String>) -> impl IntoView {
    (!warnings.is_empty()).then(|| {
        view! {
            <ul class="field-warnings" data-testid="field-warnings" role="note">
                {warnings.into_iter().map(|w| view! { <li>{w}</li> }).collect_view()}
            </ul>
        }
    })
}

/// The limit verdict block.
#[component]
pub fn LimitVerdict(limit: LimitResult) -> impl IntoView {
    let over = limit.exceeded;
    view! {
        <div class="limit-verdict" class:over=over data-testid="field-limit" data-state=if over { "over" } else { "within" }>
            <p class="limit-verdict-text" data-testid="field-limit-verdict">
                <strong>{verdict_text(&limit)}</strong>
            </p>
            <p data-testid="field-limit-crossing" data-crossing-ph=limit.crossing_ph.map(|p| format!("{p}")).unwrap_or_default()>
                {crossing_text(&limit)}
            </p>
            <p class="hint">"Your limit, not a built-in one: it defers to local codes and licensed practice."</p>
        </div>
    }
}

/// Carbonate system from the alkalinity: DIC, free CO₂, HCO₃⁻, CO₃²⁻.
#[component]
pub fn CarbonateFacts(carbonate: solver::field::carbonate::CarbonateResult) -> impl IntoView {
    let c = carbonate;
    view! {
        <dl class="facts carbonate-facts" data-testid="field-carbonate">
            <div>
                <dt>"Free CO₂"</dt>
                <dd data-testid="field-free-co2" data-value=format!("{}", c.free_co2_mg_l)>
                    {format!("{} mg/L", fmt_sig(c.free_co2_mg_l, 3))}
                </dd>
            </div>
            <div>
                <dt>"Dissolved inorganic carbon"</dt>
                <dd data-testid="field-dic" data-value=format!("{}", c.dic_mmol_l)>
                    {format!("{} mmol/L", fmt_sig(c.dic_mmol_l, 3))}
                </dd>
            </div>
            <div>
                <dt>"Bicarbonate HCO₃⁻"</dt>
                <dd data-testid="field-hco3">{format!("{} mg/L", fmt_sig(c.hco3_mg_l, 3))}</dd>
            </div>
            <div>
                <dt>"Carbonate CO₃²⁻"</dt>
                <dd data-testid="field-co3">{format!("{} mg/L", fmt_sig(c.co3_mg_l, 3))}</dd>
            </div>
        </dl>
        <p class="hint">{c.ignored.clone()}</p>
    }
}

/// A species' amount in the system's other reporting bases (ammonia as NH₃
/// beside N, sulfide as H₂S beside S, carbonate as CaCO₃ and CO₂ beside C),
/// `·`-separated; empty when there is no total or no second basis.
pub fn other_bases_text(sp: &FieldSpecies) -> String {
    sp.amounts
        .iter()
        .skip(1)
        .map(|a| format!("{} mg/L as {}", fmt_sig(a.mg_l, 3), a.basis))
        .collect::<Vec<_>>()
        .join(" · ")
}

#[cfg(test)]
#[allow(clippy::panic, clippy::indexing_slicing)]
mod tests {
    use super::*;

    #[test]
    fn every_trade_basis_is_shown_beside_the_first() {
        let reading = |system: &str, ph: f64| {
            solver::field::field_reading(
                &FieldSpec {
                    system: system.into(),
                    ph,
                    temperature_c: 20.0,
                    total: Some(1.0),
                    total_unit: solver::field::TotalUnit::MgPerLAs,
                    ionic: solver::field::IonicSource::Zero,
                    alkalinity: None,
                    limit: None,
                },
                &[],
            )
            .unwrap_or_else(|e| panic!("{system}: {e}"))
        };
        // Ammonia as N (the total's basis) and as NH₃; sulfide as S and H₂S;
        // carbonate as C, CaCO₃ and CO₂; chlorine as Cl₂ only.
        let r = reading("ammonium", 8.0);
        assert_eq!(r.basis, "N");
        assert!(other_bases_text(&r.species[1]).ends_with("mg/L as NH₃"));
        let r = reading("sulfide", 7.0);
        assert_eq!(r.basis, "S");
        assert!(other_bases_text(&r.species[0]).ends_with("mg/L as H₂S"));
        let r = reading("carbonate", 7.0);
        let t = other_bases_text(&r.species[0]);
        assert!(t.contains("as CaCO₃ · ") && t.ends_with("as CO₂"), "{t}");
        let r = reading("hypochlorous", 7.0);
        assert_eq!(r.basis, "Cl₂");
        assert_eq!(other_bases_text(&r.species[0]), "");
    }

    fn lr(exceeded: bool) -> LimitResult {
        LimitResult {
            species: "NH₃".into(),
            basis: "NH₃".into(),
            limit_mg_l: 0.02,
            value_mg_l: if exceeded { 0.05 } else { 0.01 },
            exceeded,
            margin: if exceeded { -0.03 } else { 0.01 },
            ratio: if exceeded { 2.5 } else { 0.5 },
            crossing_ph: Some(7.6),
            rises_with_ph: true,
        }
    }

    #[test]
    fn verdict_says_over_or_within_and_by_how_much() {
        let over = verdict_text(&lr(true));
        assert!(over.starts_with("Over"), "{over}");
        assert!(over.contains("0.03 mg/L over"), "{over}");
        let within = verdict_text(&lr(false));
        assert!(within.starts_with("Within"), "{within}");
        assert!(within.contains("50"), "{within}");
    }

    #[test]
    fn crossing_direction_follows_the_form() {
        assert!(crossing_text(&lr(true)).contains("above"));
        let mut l = lr(true);
        l.rises_with_ph = false;
        assert!(crossing_text(&l).contains("below"));
        l.crossing_ph = None;
        assert!(crossing_text(&l).starts_with("No pH"));
    }

    #[test]
    fn limit_fraction_scales_the_reading() {
        let f = limit_fraction(&lr(true), 0.05).unwrap_or(0.0);
        assert!((f - 0.02).abs() < 1e-12);
    }

    #[test]
    fn units_and_optional_parts_follow_the_system() {
        assert_eq!(limit_units("ammonium").len(), 4);
        assert!(limit_units("phosphate").is_empty());
        let mut f = FieldSpec {
            system: "ammonium".into(),
            ph: 8.0,
            temperature_c: 20.0,
            total: Some(1.0),
            total_unit: solver::field::TotalUnit::MgPerLAs,
            ionic: solver::field::IonicSource::Zero,
            alkalinity: Some(Alkalinity {
                value: 1.0,
                unit: AlkalinityUnit::MeqPerL,
            }),
            limit: Some(Limit {
                value: 1.0,
                unit: LimitUnit::MgPerLH2s,
            }),
        };
        fit_to_system(&mut f);
        assert!(f.alkalinity.is_none());
        assert!(f.limit.is_none());
        f.total_unit = solver::field::TotalUnit::MgPerLNh3;
        fit_to_system(&mut f);
        assert_eq!(f.total_unit, solver::field::TotalUnit::MgPerLNh3);
        f.system = "sulfide".into();
        fit_to_system(&mut f);
        assert_eq!(f.total_unit, solver::field::TotalUnit::MgPerLAs);
    }
}
