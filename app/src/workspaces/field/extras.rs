//! Field reading extras: alkalinity and limit inputs, and the carbonate, limit and warning results.
//!
//! Kept apart from the main field workspace so that the headline and the
//! basic inputs stay small; each piece reads the design and the reading's
//! `Memo` and writes the design from its handlers.

use crate::state::use_app;
use crate::widgets::field::{Plausible, UnitOpt};
use crate::widgets::format::{error_field, error_message, fmt_ph, fmt_sig};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField, StoredUnits};
use leptos::prelude::*;
use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::limit::{Limit, LimitResult, LimitUnit};
use solver::field::{target_species, FieldResult, FieldSpec, FieldSpecies};
use solver::system::formula::basis_mass;
use solver::SolverError;

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

/// The alkalinity units, each with its factor to meq/L (the solver's
/// `Alkalinity::to_eq_per_l`: 50.04 mg of CaCO₃ per meq).
pub fn alkalinity_units() -> Vec<UnitOpt> {
    let meq = |unit| {
        Alkalinity { value: 1.0, unit }
            .to_eq_per_l()
            .map_or(f64::NAN, |eq| eq * 1000.0)
    };
    vec![
        UnitOpt::new(
            "mg_caco3",
            "mg/L as CaCO₃",
            meq(AlkalinityUnit::MgPerLCaco3),
        ),
        UnitOpt::new("meq", "meq/L", meq(AlkalinityUnit::MeqPerL)),
    ]
}

/// Where the alkalinity of natural and process waters usually lies, meq/L
/// (common practice: rarely above 20 meq/L, i.e. about 1000 mg/L as CaCO₃;
/// value from memory): past it the page asks to check the unit.
pub const ALKALINITY_USUAL: Plausible = Plausible {
    lo: 0.0,
    hi: 20.0,
    what: "natural waters",
};

/// The limit units of a system, each with its factor to mmol/L of the form
/// that matters (mass per unit over the basis's molar mass, the solver's
/// `basis_mass`), so that picking one converts the limit.
pub fn limit_unit_options(system: &str) -> Vec<UnitOpt> {
    limit_units(system)
        .into_iter()
        .map(|u| {
            let (_, _, formula, mg) = u.parts();
            let factor = basis_mass(formula).map_or(f64::NAN, |m| mg / m);
            UnitOpt::new(u.key(), u.label(), factor)
        })
        .collect()
}

/// The limit choice: none, or a limit (the one put away last if it fits the
/// system, else 1 in the system's first limit unit). `last` keeps a limit
/// that is put away.
pub fn set_limit_kind(f: &mut FieldSpec, set: bool, last: &mut Option<Limit>) {
    if let Some(l) = f.limit {
        *last = Some(l);
    }
    let first = limit_units(&f.system).first().copied();
    f.limit = match (set, first) {
        (true, Some(unit)) => Some(
            f.limit
                .or_else(|| last.filter(|l| l.unit.parts().0 == unit.parts().0))
                .unwrap_or(Limit { value: 1.0, unit }),
        ),
        _ => None,
    };
}

/// Alkalinity value and unit (carbonate, in place of a total). The field is
/// built when the alkalinity appears, never on a keystroke.
#[component]
pub fn AlkalinityInputs(
    spec: Memo<FieldSpec>,
    result: Memo<Result<FieldResult, SolverError>>,
) -> impl IntoView {
    let design = use_app().design;
    let has = Memo::new(move |_| spec.with(|s| s.alkalinity.is_some()));
    let unit_key = Memo::new(move |_| {
        spec.with(|s| match s.alkalinity.map(|a| a.unit) {
            Some(AlkalinityUnit::MeqPerL) => "meq",
            _ => "mg_caco3",
        })
        .to_string()
    });
    let stored = StoredUnits {
        options: Signal::stored(alkalinity_units()),
        key: unit_key.into(),
        on_unit: Callback::new(move |(k, v): (String, f64)| {
            design.update(|d| {
                let unit = if k == "meq" {
                    AlkalinityUnit::MeqPerL
                } else {
                    AlkalinityUnit::MgPerLCaco3
                };
                d.field.alkalinity = Some(Alkalinity { value: v, unit });
            })
        }),
    };
    move || {
        has.get().then(|| {
            view! {
                <NumberField
                    id="field-alk"
                    label="Alkalinity"
                    path="field.alkalinity.value"
                    value=Signal::derive(move || spec.with(|s| s.alkalinity.map_or(0.0, |a| a.value)))
                    on_value=Callback::new(move |v| design.update(|d| {
                        if let Some(a) = &mut d.field.alkalinity { a.value = v }
                    }))
                    stored=stored
                    plausible=ALKALINITY_USUAL
                    error=err_signal(result, "alkalinity.value")
                    hint="Total alkalinity, titrated to about pH 4.5"
                />
            }
        })
    }
}

/// The user's limit: none or one, its value and unit, with the plain line
/// that limits are the user's. Built per system, never on a keystroke.
#[component]
pub fn LimitInputs(
    spec: Memo<FieldSpec>,
    result: Memo<Result<FieldResult, SolverError>>,
) -> impl IntoView {
    let design = use_app().design;
    let last = StoredValue::new(None::<Limit>);
    let system = Memo::new(move |_| spec.with(|s| s.system.clone()));
    let has = Memo::new(move |_| spec.with(|s| s.limit.is_some()));
    let unit_key = Memo::new(move |_| {
        spec.with(|s| {
            s.limit
                .map(|l| l.unit.key().to_string())
                .unwrap_or_default()
        })
    });
    move || {
        let system = system.get();
        let (_, why) = target_species(&system)?;
        limit_units(&system).first()?;
        let options = vec![
            ChoiceOption::new("none", "No limit"),
            ChoiceOption::new("set", "Set a limit"),
        ];
        let on_change = Callback::new(move |k: String| {
            design.update(|d| {
                let mut l = last.get_value();
                set_limit_kind(&mut d.field, k == "set", &mut l);
                last.set_value(l);
            })
        });
        let stored = StoredUnits {
            options: Signal::stored(limit_unit_options(&system)),
            key: unit_key.into(),
            on_unit: Callback::new(move |(k, v): (String, f64)| {
                design.update(|d| {
                    if let Some(unit) = LimitUnit::from_key(&k) {
                        d.field.limit = Some(Limit { value: v, unit });
                    }
                })
            }),
        };
        Some(view! {
            <div class="field-limit-inputs" data-testid="field-limit-inputs">
                <Choice
                    name="field-limit-kind"
                    legend=format!("Your limit for {}", why.to_ascii_lowercase())
                    options=options
                    selected=Signal::derive(move || if has.get() { "set" } else { "none" }.to_string())
                    on_change=on_change
                />
                {move || has.get().then(|| view! {
                    <NumberField
                        id="field-limit"
                        label="Limit"
                        path="field.limit.value"
                        value=Signal::derive(move || spec.with(|s| s.limit.map_or(0.0, |l| l.value)))
                        on_value=Callback::new(move |v| design.update(|d| {
                            if let Some(l) = &mut d.field.limit { l.value = v }
                        }))
                        stored=stored
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
                    atmosphere: None,
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
            atmosphere: None,
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
