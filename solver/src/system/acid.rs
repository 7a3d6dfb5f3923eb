//! Acid–base systems and reagent forms: the data the engine and the library share.

use serde::{Deserialize, Serialize};

/// Most dissociation steps one system may have (hexaprotic).
pub const MAX_STEPS: usize = 6;

/// A spectator ion that never takes part in acid–base equilibria.
///
/// Counter-ions of salts (Na⁺ of Na₂HPO₄, Cl⁻ of Tris·HCl), strong acids and
/// bases (HCl → Cl⁻, NaOH → Na⁺) and inert salts (NaCl) all enter the charge
/// balance and the ionic strength only through these.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Ion {
    /// Sodium, Na⁺.
    Na,
    /// Potassium, K⁺.
    K,
    /// Chloride, Cl⁻.
    Cl,
}

impl Ion {
    /// All spectator ions, in display order.
    pub const ALL: [Ion; 3] = [Ion::Na, Ion::K, Ion::Cl];

    /// Charge number of the ion.
    pub fn charge(self) -> i32 {
        match self {
            Ion::Na | Ion::K => 1,
            Ion::Cl => -1,
        }
    }

    /// Display symbol.
    pub fn symbol(self) -> &'static str {
        match self {
            Ion::Na => "Na⁺",
            Ion::K => "K⁺",
            Ion::Cl => "Cl⁻",
        }
    }
}

/// How a dissociation constant varies with temperature.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[serde(deny_unknown_fields)]
pub enum TempModel {
    /// Van 't Hoff with constant heat capacity (Goldberg, Kishore & Lennen 2002):
    ///
    /// ```text
    /// ln K(T) = ln K(θ) − (ΔrH°/R)(1/T − 1/θ) + (ΔrCp°/R)(θ/T − 1 + ln(T/θ)),  θ = 298.15 K
    /// ```
    VantHoff {
        /// ΔrH° in kJ/mol.
        dh_kj: f64,
        /// ΔrCp° in J/(K·mol).
        dcp_j: f64,
    },
    /// No temperature data: the 25 °C value is used (the system's range is narrow).
    Constant,
    /// A published system-specific formula, named by [`PkFormula`].
    Formula {
        /// Which formula.
        formula: PkFormula,
    },
}

/// Published system-specific pK(T) formulas.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PkFormula {
    /// Tris, Bates & Hetzer (1961).
    TrisBatesHetzer,
    /// Boric acid, Manov, DeLollis & Acree (1944).
    BoricManov,
    /// ACES, Roy et al. (1997).
    AcesRoy,
    /// CHES, Roy et al. (1997).
    ChesRoy,
    /// Carbonic acid first step, Plummer & Busenberg (1982).
    CarbonicK1PlummerBusenberg,
    /// Carbonic acid second step, Plummer & Busenberg (1982).
    CarbonicK2PlummerBusenberg,
    /// Ammonium, Emerson et al. (1975).
    AmmoniumEmerson,
    /// Hypochlorous acid, Morris (1966).
    HypochlorousMorris,
    /// Hydrogen sulfide first step, Millero (1988).
    SulfideMillero,
}

/// One dissociation step `HₙA ⇌ H⁺ + Hₙ₋₁A`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Step {
    /// Thermodynamic pK at 25 °C and I = 0.
    pub pk25: f64,
    /// Temperature dependence.
    pub temp: TempModel,
}

/// A reagent as it sits on the shelf: a salt, a free acid or base, a hydrate.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ReagentForm {
    /// Stable identifier, unique within its system (`na2hpo4_7h2o`).
    pub id: String,
    /// Display name (`disodium hydrogen phosphate heptahydrate`).
    pub name: String,
    /// Formula with water of hydration after a `·` or `.` (`Na2HPO4·7H2O`).
    /// The molar mass is always computed from this, never typed.
    pub formula: String,
    /// Units of the system delivered per formula unit (borax: 4 borate).
    pub units: f64,
    /// Spectator ions delivered per formula unit (Na₂HPO₄: 2 Na⁺).
    pub counter_ions: Vec<(Ion, f64)>,
}

/// Warnings a system carries for the safety panel.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Hazard {
    /// Toxic un-ionized ammonia, ammonia vapour.
    Ammonia,
    /// Hydrogen sulfide gas.
    Sulfide,
    /// Chlorine and hypochlorite.
    Chlorine,
    /// Strongly acidic or caustic reagents in the system.
    Corrosive,
}

/// A polyprotic acid–base system with its constants and shelf forms.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AcidSystem {
    /// Stable identifier (`phosphate`).
    pub id: String,
    /// Display name.
    pub name: String,
    /// Charge of the fully protonated species (TrisH⁺: +1, H₃PO₄: 0).
    pub z0: i32,
    /// Dissociation steps in order, at most [`MAX_STEPS`].
    pub steps: Vec<Step>,
    /// Species names from the most protonated to the least (steps + 1 names).
    pub species: Vec<String>,
    /// Lowest temperature the data support, °C.
    pub t_min_c: f64,
    /// Highest temperature the data support, °C.
    pub t_max_c: f64,
    /// Shelf forms.
    pub forms: Vec<ReagentForm>,
    /// Where the constants come from.
    pub source: String,
    /// Safety flags.
    pub hazards: Vec<Hazard>,
}

/// A shelf form the user added to a system (library or user-defined) in a design:
/// `{"system": "hepes", "form": {...}}`. Usable by its id wherever the system's own
/// forms are.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CustomForm {
    /// Id of the system the form delivers (library or `custom_systems`).
    pub system: String,
    /// The form itself; its id must not clash with the system's forms.
    pub form: ReagentForm,
}
