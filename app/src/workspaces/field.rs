//! Field reading workspace: a measured pH and temperature → the share of each species.
//!
//! Built for one-handed tablet use at a tank or a sampling point: quick
//! buttons for the common questions, big touch targets, big numbers. The
//! result is one `Memo` over `solver::field::field_reading`. The optional
//! parts (alkalinity, the user's limit, warnings, the plot, a day's log)
//! live in the submodules.

pub(crate) mod extras;
mod log;
mod log_data;
mod log_keep;
mod plot;

use crate::state::use_app;
use crate::widgets::cautions::{cautions_for, corrosive_only_if, CautionPanel};
use crate::widgets::field::UnitOpt;
use crate::widgets::format::{
    error_field, error_message, fmt_conc, fmt_input, fmt_mg_l, fmt_pct, fmt_ph, fmt_sig,
};
use crate::widgets::inputs::{Choice, ChoiceOption, NumberField, StoredUnits, SystemPicker};
use extras::{
    fit_to_system, other_bases_text, AlkalinityInputs, CarbonateFacts, FieldWarnings, LimitInputs,
    LimitVerdict,
};
use leptos::prelude::*;
use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::{
    field_reading, reporting_basis, target_species, total_to_molar, FieldResult, FieldSpec,
    IonicSource, TotalUnit,
};
use solver::mixture::lookup;
use solver::SolverError;

/// Quick picks: (system id, button text).
pub const QUICK: [(&str, &str); 4] = [
    ("ammonium", "Ammonia (NH₃)"),
    ("sulfide", "Sulfide (H₂S)"),
    ("hypochlorous", "Free chlorine (HOCl)"),
    ("carbonate", "Carbonate (CO₂)"),
];

/// The species that usually matters for a system, with a short reason
/// (the solver's [`target_species`]).
pub fn key_species(system: &str) -> Option<(usize, &'static str)> {
    target_species(system)
}

fn ionic_key(i: &IonicSource) -> &'static str {
    match i {
        IonicSource::Zero => "zero",
        IonicSource::Direct { .. } => "direct",
        IonicSource::Conductivity { .. } => "conductivity",
        IonicSource::Tds { .. } => "tds",
        IonicSource::Salinity { .. } => "salinity",
    }
}

/// Whether the reading has a total, an alkalinity in its place, or neither.
fn total_kind(spec: &FieldSpec) -> &'static str {
    if spec.alkalinity.is_some() {
        "alk"
    } else if spec.total.is_some() {
        "measured"
    } else {
        "none"
    }
}

/// The key of a total unit in the total's unit picker.
pub fn total_unit_key(u: TotalUnit) -> &'static str {
    match u {
        TotalUnit::MgPerLAs => "mg",
        TotalUnit::MmolPerL => "mmol",
        TotalUnit::UmolPerL => "umol",
        TotalUnit::MgPerLNh3 => "mg_nh3",
        TotalUnit::MgPerLH2s => "mg_h2s",
        TotalUnit::MgPerLCaco3 => "mg_caco3",
        TotalUnit::MgPerLCo2 => "mg_co2",
    }
}

/// The total unit of a picker key (mg/L as the basis for an unknown key).
pub fn total_unit_from_key(k: &str) -> TotalUnit {
    match k {
        "mmol" => TotalUnit::MmolPerL,
        "umol" => TotalUnit::UmolPerL,
        k => EXTRA_TOTAL_UNITS
            .iter()
            .find(|(key, _)| *key == k)
            .map_or(TotalUnit::MgPerLAs, |(_, u)| *u),
    }
}

/// The units a total of `system` may be in, each with its factor to mol/L
/// (the solver's `total_to_molar`), so that picking one converts the total.
pub fn total_units(system: &str) -> Vec<UnitOpt> {
    let factor = |u: TotalUnit| total_to_molar(system, 1.0, u).unwrap_or(f64::NAN);
    let basis = reporting_basis(system).0;
    let mut v = Vec::new();
    if basis != "mmol" {
        v.push(UnitOpt::new(
            "mg",
            format!("mg/L as {basis}"),
            factor(TotalUnit::MgPerLAs),
        ));
    }
    for (k, u, label) in extra_total_units(system) {
        v.push(UnitOpt::new(k, format!("mg/L as {label}"), factor(u)));
    }
    v.push(UnitOpt::new("mmol", "mmol/L", factor(TotalUnit::MmolPerL)));
    v.push(UnitOpt::new("umol", "µmol/L", factor(TotalUnit::UmolPerL)));
    v
}

/// The total choice: `none` (not measured), `measured` (the total comes
/// back as it was last, in its unit), or `alk` (an alkalinity in its place).
/// `last_total` keeps a total that is put away.
pub fn set_total_kind(f: &mut FieldSpec, k: &str, last_total: &mut f64) {
    if let Some(t) = f.total {
        *last_total = t;
    }
    if k != "alk" {
        f.alkalinity = None;
    }
    match k {
        "none" => f.total = None,
        "alk" => {
            f.total = None;
            f.alkalinity.get_or_insert(Alkalinity {
                value: 100.0,
                unit: AlkalinityUnit::MgPerLCaco3,
            });
        }
        _ => f.total = Some(f.total.unwrap_or(*last_total)),
    }
}

/// Another system is picked: a total or alkalinity measured for the old one
/// is not a total of the new one (120 mg/L as CaCO₃ is not 120 mg/L as Cl₂),
/// so it is taken away, and the sentence that says so is returned.
pub fn change_system(f: &mut FieldSpec, id: &str, old_name: &str) -> Option<String> {
    if f.system == id {
        return None;
    }
    let had = match (f.total, f.alkalinity) {
        (_, Some(a)) => Some(format!(
            "an alkalinity of {} {}",
            fmt_input(a.value),
            match a.unit {
                AlkalinityUnit::MeqPerL => "meq/L",
                AlkalinityUnit::MgPerLCaco3 => "mg/L as CaCO₃",
            }
        )),
        (Some(t), None) => {
            let unit = total_units(&f.system)
                .into_iter()
                .find(|u| u.key == total_unit_key(f.total_unit))
                .map_or_else(String::new, |u| u.label);
            Some(format!("a total of {} {unit}", fmt_input(t)))
        }
        (None, None) => None,
    };
    f.system = id.to_string();
    f.total = None;
    f.alkalinity = None;
    fit_to_system(f);
    had.map(|h| {
        format!("The reading had {h} for {old_name}: a total is measured for one substance, so enter this water's total for the new system.")
    })
}

/// The extra mg/L bases a total may be typed in, per system: (choice key, unit).
const EXTRA_TOTAL_UNITS: [(&str, TotalUnit); 4] = [
    ("mg_nh3", TotalUnit::MgPerLNh3),
    ("mg_h2s", TotalUnit::MgPerLH2s),
    ("mg_caco3", TotalUnit::MgPerLCaco3),
    ("mg_co2", TotalUnit::MgPerLCo2),
];

/// The extra total units of a system: (choice key, unit, basis label).
fn extra_total_units(system: &str) -> Vec<(&'static str, TotalUnit, &'static str)> {
    EXTRA_TOTAL_UNITS
        .iter()
        .filter_map(|(k, u)| {
            u.fixed_basis()
                .filter(|(id, _, _)| *id == system)
                .map(|(_, label, _)| (*k, *u, label))
        })
        .collect()
}

/// Unit text of the per-species amount for a reporting basis.
fn amount_unit(basis: &str) -> String {
    if basis == "mmol" {
        "mmol/L".into()
    } else {
        format!("mg/L as {basis}")
    }
}

/// The field reading workspace.
#[component]
pub fn FieldWorkspace() -> impl IntoView {
    let app = use_app();
    let design = app.design;
    let spec = Memo::new(move |_| design.with(|d| d.field.clone()));
    let custom = Memo::new(move |_| design.with(|d| d.systems()));
    let result = Memo::new(move |_| spec.with(|s| custom.with(|c| field_reading(s, c))));
    // The sample with its gas: None without an atmosphere.
    let gas = Memo::new(move |_| {
        spec.with(|s| custom.with(|c| solver::atmosphere::field::field_gas(s, c).transpose()))
    });
    let pending = Memo::new(move |_| !app.pending_in("field-").is_empty());
    let readonly = move || app.view.with(|v| v.readonly);
    let last_total = StoredValue::new(spec.with_untracked(|s| s.total.unwrap_or(1.0)));

    let err_for = move |path: &'static str| -> Signal<Option<String>> {
        Signal::derive(move || {
            result.with(|r| match r {
                // The solver names document paths ("field.ionic.psu") or, in
                // older messages, paths inside the reading ("total"): both
                // land beside the same input.
                Err(e)
                    if error_field(e)
                        .as_deref()
                        .map(|f| f.strip_prefix("field.").unwrap_or(f))
                        == Some(path) =>
                {
                    Some(error_message(e))
                }
                _ => None,
            })
        })
    };
    let total_notice: RwSignal<Option<String>> = RwSignal::new(None);
    let set_system = move |id: String| {
        let old = result.with_untracked(|r| {
            r.as_ref().map_or_else(
                |_| spec.with_untracked(|s| s.system.clone()),
                |r| r.system_name.clone(),
            )
        });
        let mut note = None;
        design.update(|d| note = change_system(&mut d.field, &id, &old));
        total_notice.set(note);
    };
    let system = Memo::new(move |_| spec.with(|s| s.system.clone()));
    let kind = Memo::new(move |_| spec.with(total_kind));
    let t_units = Memo::new(move |_| total_units(&system.get()));
    let t_unit = Memo::new(move |_| spec.with(|s| total_unit_key(s.total_unit).to_string()));
    let ionic_kind = Memo::new(move |_| spec.with(|s| ionic_key(&s.ionic)));
    let other_system =
        Memo::new(move |_| spec.with(|s| !QUICK.iter().any(|(id, _)| *id == s.system)));

    let total_options = move || {
        let mut v = vec![
            ChoiceOption::new("none", "Not measured"),
            ChoiceOption::new("measured", "Measured"),
        ];
        if system.get() == "carbonate" {
            v.push(ChoiceOption::new("alk", "Alkalinity instead"));
        }
        v
    };
    let on_total_kind = Callback::new(move |k: String| {
        total_notice.set(None);
        design.update(|d| {
            let mut last = last_total.get_value();
            set_total_kind(&mut d.field, &k, &mut last);
            last_total.set_value(last);
        })
    });
    let on_ionic_kind = Callback::new(move |k: String| {
        design.update(|d| {
            d.field.ionic = match k.as_str() {
                "direct" => IonicSource::Direct {
                    ionic_strength: 0.01,
                },
                "conductivity" => IonicSource::Conductivity { us_cm: 500.0 },
                "tds" => IonicSource::Tds { mg_l: 300.0 },
                "salinity" => IonicSource::Salinity { psu: 35.0 },
                _ => IonicSource::Zero,
            };
        })
    });
    let ionic_field = move || {
        let kind = ionic_kind.get();
        let (label, suffix, doc_path) = match kind {
            "direct" => ("Ionic strength", "mol/L", "field.ionic.ionic_strength"),
            "conductivity" => ("Conductivity", "µS/cm", "field.ionic.us_cm"),
            "tds" => ("Total dissolved solids", "mg/L", "field.ionic.mg_l"),
            "salinity" => ("Salinity", "PSU", "field.ionic.psu"),
            _ => return None,
        };
        let path = doc_path.trim_start_matches("field.");
        Some(view! {
            <NumberField
                id=format!("field-ionic-{kind}-value")
                label=label
                value=Signal::derive(move || {
                    spec.with(|s| match s.ionic {
                        IonicSource::Direct { ionic_strength } => ionic_strength,
                        IonicSource::Conductivity { us_cm } => us_cm,
                        IonicSource::Tds { mg_l } => mg_l,
                        IonicSource::Salinity { psu } => psu,
                        IonicSource::Zero => 0.0,
                    })
                })
                on_value=Callback::new(move |v: f64| {
                    design.update(|d| match &mut d.field.ionic {
                        IonicSource::Direct { ionic_strength } => *ionic_strength = v,
                        IonicSource::Conductivity { us_cm } => *us_cm = v,
                        IonicSource::Tds { mg_l } => *mg_l = v,
                        IonicSource::Salinity { psu } => *psu = v,
                        IonicSource::Zero => {}
                    })
                })
                path=doc_path
                suffix=suffix
                error=err_for(path)
            />
        })
    };
    let cautions = Signal::derive(move || {
        spec.with(|s| {
            custom.with(|c| {
                corrosive_only_if(cautions_for(lookup(&s.system, c).ok(), &[], &[]), false)
            })
        })
    });

    let answer = Signal::derive(move || {
        if pending.get() {
            return (
                false,
                "Correct the marked fields to see the reading.".to_string(),
            );
        }
        result.with(|r| match r {
            Err(e) => (false, format!("No reading: {}", error_message(e))),
            Ok(r) => {
                let key = spec.with(|s| key_species(&s.system)).map_or(0, |(i, _)| i);
                let text = r.species.get(key).map_or_else(String::new, |sp| {
                    let amount = sp
                        .mg_l_as
                        .filter(|_| r.basis != "mmol")
                        .map(|v| format!(" · {} as {}", fmt_mg_l(v), r.basis))
                        .unwrap_or_default();
                    format!("{} {}{amount}", sp.name, fmt_pct(sp.fraction))
                });
                (true, text)
            }
        })
    });
    view! {
            <crate::widgets::answer::AnswerBar text=Signal::derive(move || answer.get().1) ok=Signal::derive(move || answer.get().0) />
            <div class="ws-grid field-ws">
                <div class="inputs card">
                    <h2 class="card-title">"Reading"</h2>
                    <div class="quick" role="group" aria-label="Common questions">
                        {QUICK
                            .iter()
                            .map(|(id, text)| {
                                let id = *id;
                                view! {
                                    <button
                                        type="button"
                                        class="btn quick-btn"
                                        data-testid=format!("field-quick-{id}")
                                        aria-pressed=move || if spec.with(|s| s.system == id) { "true" } else { "false" }
                                        disabled=readonly
                                        on:click=move |_| set_system(id.to_string())
                                    >
                                        {*text}
                                    </button>
                                }
                            })
                            .collect_view()}
                    </div>
    <details
                        class="other-systems"
                        open=move || other_system.get()
                    >
                        <summary>"Any library system"</summary>
                        <SystemPicker
                        id="field-system"
                        label="System"
                        selected=Signal::derive(move || spec.with(|s| s.system.clone()))
                        temperature=Signal::derive(move || spec.with(|s| s.temperature_c))
                        on_change=Callback::new(set_system)
                    />
                    </details>
                    <div class="row-2">
                        <NumberField
                            id="field-ph"
                            label="Measured pH"
                            value=Signal::derive(move || spec.with(|s| s.ph))
                            on_value=Callback::new(move |v| design.update(|d| d.field.ph = v))
                            path="field.ph"
                            error=err_for("ph")
                        />
                        <NumberField
                            id="field-temp"
                            label="Sample temperature"
                            value=Signal::derive(move || spec.with(|s| s.temperature_c))
                            on_value=Callback::new(move |v| design.update(|d| d.field.temperature_c = v))
                            path="field.temperature_c"
                            suffix="°C"
                            error=err_for("temperature_c")
                        />
                    </div>
                    {move || {
                        let opts = total_options();
                        view! {
                            <Choice
                                name="field-total-kind"
                                legend="Total concentration (optional)"
                                options=opts
                                selected=Signal::derive(move || kind.get().to_string())
                                on_change=on_total_kind
                            />
                        }
                    }}
                    {move || total_notice.get().map(|n| view! {
                        <p class="notice" data-testid="field-total-notice" role="status">{n}</p>
                    })}
                    {move || (kind.get() == "measured").then(|| view! {
                        <NumberField
                            id="field-total"
                            label="Total"
                            path="field.total"
                            value=Signal::derive(move || spec.with(|s| s.total.unwrap_or(0.0)))
                            on_value=Callback::new(move |v| design.update(|d| d.field.total = Some(v)))
                            stored=StoredUnits {
                                options: t_units.into(),
                                key: t_unit.into(),
                                on_unit: Callback::new(move |(k, v): (String, f64)| design.update(|d| {
                                    d.field.total_unit = total_unit_from_key(&k);
                                    d.field.total = Some(v);
                                })),
                            }
                            error=err_for("total")
                        />
                    })}
                    <Choice
                        name="field-ionic"
                        legend="Ionic strength from"
                        options=vec![
                            ChoiceOption::new("zero", "Nothing (I = 0)"),
                            ChoiceOption::new("conductivity", "Conductivity"),
                            ChoiceOption::new("tds", "TDS"),
                            ChoiceOption::new("salinity", "Salinity"),
                            ChoiceOption::new("direct", "Known I"),
                        ]
                        selected=Signal::derive(move || spec.with(|s| ionic_key(&s.ionic).to_string()))
                        on_change=on_ionic_kind
                    />
                    {ionic_field}
                    <AlkalinityInputs spec=spec result=result />
                    <LimitInputs spec=spec result=result />
                    <crate::workspaces::gas::GasInput
                        prefix="field"
                        value=Signal::derive(move || spec.with(|s| s.atmosphere))
                        on_value=Callback::new(move |a| design.update(|d| d.field.atmosphere = a))
                        error=Signal::derive(move || gas.with(|g| g.as_ref().and_then(|g| g.as_ref().err().cloned())))
                        hint="The sample's pH once it has equilibrated with this gas, and the CO₂ it would lose or gain (carbonate with an alkalinity)."
                    />
                </div>
                <div class="results">
                    <FieldResultView spec=spec result=result pending=pending />
                    <crate::reagents::UserReagentNote systems=Signal::derive(move || spec.with(|s| vec![s.system.clone()])) />
                    <crate::workspaces::gas::FieldGasLines result=Signal::derive(move || gas.get()) />
                    {move || (!pending.get()).then(|| view! { <plot::FractionPlot spec=spec custom=custom result=result /> })}
                    <CautionPanel items=cautions testid="field-cautions" />
                </div>
            </div>
            <log::DayLog spec=spec custom=custom />
        }
}

#[component]
fn FieldResultView(
    spec: Memo<FieldSpec>,
    result: Memo<Result<FieldResult, SolverError>>,
    pending: Memo<bool>,
) -> impl IntoView {
    let body = move || {
        if pending.get() {
            return view! {
                <p class="stale" data-testid="field-stale" role="status">
                    "Correct the marked fields to see the reading."
                </p>
            }
            .into_any();
        }
        match result.get() {
            Err(e) => view! {
                <p class="result-error" data-testid="field-error" role="alert">
                    <strong>"No reading: "</strong>
                    {error_message(&e)}
                </p>
            }
            .into_any(),
            Ok(r) => {
                let s = spec.get();
                let key = key_species(&s.system);
                let unit = amount_unit(&r.basis);
                let hero = key.and_then(|(i, why)| {
                    let sp = r.species.get(i)?;
                    let amount = sp.mg_l_as.map(|v| {
                        if r.basis == "mmol" {
                            format!("{} mmol/L", fmt_sig(v, 3))
                        } else {
                            format!("{} as {}", fmt_mg_l(v), r.basis)
                        }
                    });
                    Some(view! {
                        <div class="hero" data-testid="field-hero">
                            <p class="hero-label">{why}</p>
                            <p class="hero-value">
                                <span class="formula">{sp.name.clone()}</span>
                                " "
                                <span class="hero-pct">{fmt_pct(sp.fraction)}</span>
                            </p>
                            {amount.map(|a| view! { <p class="hero-amount">{a}</p> })}
                            <crate::widgets::uncertainty::FieldFractionU spec=s.clone() result=r.clone() species=i />
                        </div>
                    })
                });
                let pks = r
                    .pks
                    .iter()
                    .map(|p| fmt_ph(*p))
                    .collect::<Vec<_>>()
                    .join(", ");
                let apks = r
                    .apparent_pks
                    .iter()
                    .map(|p| fmt_ph(*p))
                    .collect::<Vec<_>>()
                    .join(", ");
                let warnings = r.warnings.clone();
                let limit = r.limit.clone().map(|l| view! { <LimitVerdict limit=l /> });
                let carbonate = r
                    .carbonate
                    .clone()
                    .map(|c| view! { <CarbonateFacts carbonate=c /> });
                view! {
                    {hero}
                    {limit}
                    <FieldWarnings warnings=warnings />
                    {carbonate}
                    <div class="species-cards">
                        {r
                            .species
                            .iter()
                            .enumerate()
                            .map(|(i, sp)| {
                                let is_key = key.is_some_and(|(k, _)| k == i);
                                view! {
                                    <div class="species-card" class:key=is_key data-testid=format!("field-species-{i}")>
                                        <p class="formula species-name">{sp.name.clone()}</p>
                                        <p class="species-pct" data-testid=format!("field-fraction-{i}")>
                                            {fmt_pct(sp.fraction)}
                                        </p>
                                        <p class="species-conc" data-testid=format!("field-conc-{i}")>
                                            {match (sp.mg_l_as, sp.conc_m) {
                                                (Some(v), Some(c)) => format!("{} {unit} · {}", fmt_sig(v, 3), fmt_conc(c)),
                                                _ => "Enter a total for amounts".to_string(),
                                            }}
                                        </p>
                                        {let alt = other_bases_text(sp);
                                        (!alt.is_empty()).then(|| view! {
                                            <p class="species-conc" data-testid=format!("field-bases-{i}")>{alt}</p>
                                        })}
                                    </div>
                                }
                            })
                            .collect_view()}
                    </div>
                    <dl class="facts">
                        <div>
                            <dt>{format!("pK at {} °C", fmt_input(s.temperature_c))}</dt>
                            <dd data-testid="field-pk">{pks}</dd>
                        </div>
                        <div>
                            <dt>"Apparent pK in this water"</dt>
                            <dd>{apks}</dd>
                        </div>
                        <div>
                            <dt>"Ionic strength used"</dt>
                            <dd data-testid="field-ionic-used">{fmt_conc(r.ionic_strength)}</dd>
                        </div>
                        <div>
                            <dt>"Model"</dt>
                            <dd data-testid="field-model" title=r.model.describe()>{r.model.short()}</dd>
                        </div>
                    </dl>
                }
                .into_any()
            }
        }
    };
    view! {
        <section class="card result-card" aria-labelledby="field-result-title">
            <h2 class="card-title" id="field-result-title">
                {move || {
                    spec.with(|s| {
                        let name = result.with(|r| r.as_ref().map(|r| r.system_name.clone()).unwrap_or_default());
                        format!("{name} at pH {} and {} °C", fmt_ph(s.ph), fmt_input(s.temperature_c))
                    })
                }}
            </h2>
            <div aria-live="polite">{body}</div>
        </section>
    }
}
