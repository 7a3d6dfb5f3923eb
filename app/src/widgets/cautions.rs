//! Safety cautions shown beside recipes, mixtures and field readings, and the model-assumptions note.
//!
//! Which cautions apply is decided by plain functions over the solver's
//! system hazards, the reagent formulas and the additives in use; the
//! components only render the list. The texts are reminders, never a safety
//! assessment: every list ends by deferring to safety data sheets, local
//! codes and licensed practice.

use leptos::prelude::*;
use solver::mixture::Additive;
use solver::system::{AcidSystem, Hazard};

/// One caution.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Caution {
    /// Sulfide / hydrogen sulfide.
    Sulfide,
    /// Chlorine / hypochlorite.
    Chlorine,
    /// Ammonia.
    Ammonia,
    /// Hydrochloric acid stock.
    StrongAcid,
    /// Sodium or potassium hydroxide stock.
    StrongBase,
    /// Phosphoric acid (concentrated liquid).
    PhosphoricAcid,
    /// Trisodium / tripotassium phosphate (strongly alkaline).
    TribasicPhosphate,
    /// Free acids or concentrated stocks of the system are corrosive.
    CorrosiveForms,
}

impl Caution {
    /// Short heading.
    pub fn title(self) -> &'static str {
        match self {
            Caution::StrongAcid => "Hydrochloric acid",
            Caution::StrongBase => "Hydroxide (NaOH, KOH)",
            Caution::PhosphoricAcid => "Phosphoric acid",
            Caution::TribasicPhosphate => "Tribasic phosphate",
            Caution::CorrosiveForms => "Corrosive reagents",
            Caution::Ammonia => "Ammonia",
            Caution::Sulfide => "Sulfide",
            Caution::Chlorine => "Chlorine and hypochlorite",
        }
    }

    /// The reminder.
    pub fn text(self) -> &'static str {
        match self {
            Caution::StrongAcid => {
                "Corrosive to skin and eyes; concentrated stock fumes. Wear eye protection \
                 and gloves, and always add acid to water, never water to acid."
            }
            Caution::StrongBase => {
                "Caustic: severe eye damage on contact. Pellets heat up as they dissolve; \
                 add them slowly to water with eye protection and gloves."
            }
            Caution::PhosphoricAcid => {
                "The concentrated (85 %) liquid is corrosive and viscous; dispense it with \
                 eye protection and gloves and dilute it into water."
            }
            Caution::TribasicPhosphate => {
                "Solutions are strongly alkaline (pH above 11) and irritate skin and eyes."
            }
            Caution::CorrosiveForms => {
                "The free acid or base of this system, or its concentrated stock, is \
                 corrosive: wear eye protection and gloves."
            }
            Caution::Ammonia => {
                "Un-ionized NH₃ is toxic to fish at fractions of a mg/L, and its share rises \
                 with pH and temperature. Concentrated ammonia gives off irritating vapour: \
                 open it only with good ventilation."
            }
            Caution::Sulfide => {
                "Never acidify a sulfide solution: it releases hydrogen sulfide gas, which is \
                 toxic and quickly dulls the sense of smell, so odour is no warning. Work \
                 with ventilation."
            }
            Caution::Chlorine => {
                "Never mix chlorine or hypochlorite with acids (chlorine gas is released) or \
                 with ammonia (chloramines form). Store and handle them apart."
            }
        }
    }
}

fn from_hazards(hazards: &[Hazard], out: &mut Vec<Caution>) {
    for h in hazards {
        out.push(match h {
            Hazard::Ammonia => Caution::Ammonia,
            Hazard::Sulfide => Caution::Sulfide,
            Hazard::Chlorine => Caution::Chlorine,
            Hazard::Corrosive => Caution::CorrosiveForms,
        });
    }
}

fn from_formula(formula: &str, out: &mut Vec<Caution>) {
    let base = formula.split(['·', '.']).next().unwrap_or(formula);
    match base {
        "H3PO4" => out.push(Caution::PhosphoricAcid),
        "Na3PO4" | "K3PO4" => out.push(Caution::TribasicPhosphate),
        _ => {}
    }
}

fn from_additive(a: Additive, out: &mut Vec<Caution>) {
    match a {
        Additive::Hcl => out.push(Caution::StrongAcid),
        Additive::Naoh | Additive::Koh => out.push(Caution::StrongBase),
        Additive::Nacl | Additive::Kcl => {}
    }
}

fn tidy(mut v: Vec<Caution>) -> Vec<Caution> {
    solver::order::sort_by(&mut v, Ord::cmp);
    v.dedup();
    v
}

/// Cautions for making a buffer from `sys` with these reagent formulas and additives.
pub fn cautions_for(
    sys: Option<&AcidSystem>,
    formulas: &[&str],
    additives: &[Additive],
) -> Vec<Caution> {
    let mut out = Vec::new();
    if let Some(s) = sys {
        from_hazards(&s.hazards, &mut out);
    }
    for f in formulas {
        from_formula(f, &mut out);
    }
    for a in additives {
        from_additive(*a, &mut out);
    }
    tidy(out)
}

/// Cautions for several systems at once (a mixture).
pub fn cautions_for_many(
    systems: &[&AcidSystem],
    formulas: &[&str],
    additives: &[Additive],
) -> Vec<Caution> {
    let mut out = Vec::new();
    for s in systems {
        out.extend(cautions_for(Some(s), &[], &[]));
    }
    out.extend(cautions_for(None, formulas, additives));
    tidy(out)
}

/// Keep the general "corrosive reagents" caution only when `free_form_used`
/// (a free acid or base of a system flagged corrosive is on the bench); a
/// salt-only recipe or a field reading does not need it.
pub fn corrosive_only_if(mut list: Vec<Caution>, free_form_used: bool) -> Vec<Caution> {
    if !free_form_used {
        list.retain(|c| *c != Caution::CorrosiveForms);
    }
    list
}

/// The closing line of every caution list.
pub const DEFER: &str = "These are reminders, not a safety assessment. Follow the safety data \
    sheet of each chemical, your local codes and your organisation's licensed practice.";

/// A cautions panel; shows nothing when the list is empty.
#[component]
pub fn CautionPanel(
    /// Cautions to list.
    #[prop(into)]
    items: Signal<Vec<Caution>>,
    /// Test id of the panel.
    #[prop(into)]
    testid: String,
) -> impl IntoView {
    move || {
        let list = items.get();
        (!list.is_empty()).then(|| {
            view! {
                <aside class="cautions" data-testid=testid.clone() aria-label="Safety cautions">
                    <h3>"Cautions"</h3>
                    <ul>
                        {list
                            .into_iter()
                            .map(|c| {
                                view! {
                                    <li>
                                        <strong>{c.title()}": "</strong>
                                        {c.text()}
                                    </li>
                                }
                            })
                            .collect_view()}
                    </ul>
                    <p class="defer">{DEFER}</p>
                </aside>
            }
        })
    }
}

/// The model assumptions behind every number on the page.
#[component]
pub fn ModelNote() -> impl IntoView {
    view! {
        <details class="model-note" data-testid="model-note">
            <summary>"Model assumptions"</summary>
            <ul>
                <li>"Dilute aqueous solution; activity coefficients from the Davies equation (or all equal to one in ideal mode), trusted up to an ionic strength of about 0.5 mol/L."</li>
                <li>"Ideal mixing: volumes add, and reagents dissolve completely."</li>
                <li>"No complexation, ion pairing or precipitation; spectator ions (Na⁺, K⁺, Cl⁻) only add charge and ionic strength."</li>
                <li>"pH is on the activity scale, as a calibrated glass electrode reads it."</li>
                <li>"Constants are thermodynamic values corrected for temperature, valid only inside each system's data range (at most 0–60 °C)."</li>
                <li>"Field totals are converted on the stated reporting basis; ionic strength from conductivity or TDS uses common rules of thumb."</li>
            </ul>
        </details>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use solver::system::library::find_system;

    #[test]
    fn strong_reagents_and_hazards() {
        let p = find_system("phosphate").unwrap();
        let c = cautions_for(Some(p), &["H3PO4", "Na3PO4·12H2O"], &[Additive::Naoh]);
        assert!(c.contains(&Caution::PhosphoricAcid));
        assert!(c.contains(&Caution::TribasicPhosphate));
        assert!(c.contains(&Caution::StrongBase));
        let s = find_system("sulfide").unwrap();
        assert!(cautions_for(Some(s), &[], &[]).contains(&Caution::Sulfide));
        let h = find_system("hypochlorous").unwrap();
        assert!(cautions_for(Some(h), &[], &[]).contains(&Caution::Chlorine));
        assert!(cautions_for(None, &["NaH2PO4·H2O"], &[Additive::Nacl]).is_empty());
        assert!(DEFER.contains("safety data sheet"));
        let a = find_system("acetate").unwrap();
        let all = cautions_for(Some(a), &[], &[]);
        assert!(all.contains(&Caution::CorrosiveForms));
        assert!(corrosive_only_if(all, false).is_empty());
    }
}
