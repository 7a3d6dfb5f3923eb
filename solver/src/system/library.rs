//! The built-in library of acid–base systems, with constants, ranges and shelf forms.
//!
//! Constants are thermodynamic (I = 0, 25 °C) from Goldberg, Kishore &
//! Lennen (2002) J. Phys. Chem. Ref. Data 31, 231 (recalled values, checked
//! against NIST SRD 46 or the primary measurement where noted in each
//! system's `source`), or from a system-specific published formula
//! ([`PkFormula`]). For a formula step, `pk25` is the formula's own value at
//! 298.15 K, so the two never disagree. Molar masses are never typed: they
//! are computed from each form's `formula` (see [`crate::system::formula`]).

use std::sync::OnceLock;

use crate::error::Result;
use crate::system::acid::{AcidSystem, Hazard, Ion, PkFormula, ReagentForm, Step, TempModel};
use crate::system::formula::molar_mass;
use crate::system::thermo::THETA;

const GOLDBERG: &str = "Goldberg, Kishore & Lennen (2002) J. Phys. Chem. Ref. Data 31, 231 \
     (pK, ΔrH°, ΔrCp°; values from memory)";

/// All built-in systems, built once.
///
/// # Example
///
/// ```
/// let lib = solver::system::library::library();
/// assert!(lib.iter().any(|s| s.id == "phosphate"));
/// ```
pub fn library() -> &'static [AcidSystem] {
    static LIB: OnceLock<Vec<AcidSystem>> = OnceLock::new();
    LIB.get_or_init(build)
}

/// The built-in system with this id.
pub fn find_system(id: &str) -> Option<&'static AcidSystem> {
    library().iter().find(|s| s.id == id)
}

/// The form of `sys` with this id.
pub fn find_form<'a>(sys: &'a AcidSystem, form_id: &str) -> Option<&'a ReagentForm> {
    sys.forms.iter().find(|f| f.id == form_id)
}

/// Net spectator charge delivered per formula unit: Σ charge × count
/// (Na₂HPO₄: +2, Tris·HCl: −1, Tris base: 0).
pub fn counter_charge(form: &ReagentForm) -> f64 {
    form.counter_ions
        .iter()
        .map(|&(ion, n)| f64::from(ion.charge()) * n)
        .sum()
}

impl ReagentForm {
    /// Molar mass in g/mol, computed from [`ReagentForm::formula`].
    ///
    /// # Errors
    ///
    /// [`crate::SolverError::BadFormula`] when the formula cannot be read.
    pub fn molar_mass(&self) -> Result<f64> {
        molar_mass(&self.formula)
    }
}

// ---------------------------------------------------------------- helpers

fn vh(pk25: f64, dh_kj: f64, dcp_j: f64) -> Step {
    Step {
        pk25,
        temp: TempModel::VantHoff { dh_kj, dcp_j },
    }
}

fn constant(pk25: f64) -> Step {
    Step {
        pk25,
        temp: TempModel::Constant,
    }
}

fn by_formula(formula: PkFormula) -> Step {
    Step {
        pk25: formula.pk_at_kelvin(THETA),
        temp: TempModel::Formula { formula },
    }
}

fn form(id: &str, name: &str, formula: &str, units: f64, ions: &[(Ion, f64)]) -> ReagentForm {
    ReagentForm {
        id: id.into(),
        name: name.into(),
        formula: formula.into(),
        units,
        counter_ions: ions.to_vec(),
    }
}

/// A neutral shelf form delivering one unit and no spectator ions.
fn plain(id: &str, name: &str, formula: &str) -> ReagentForm {
    form(id, name, formula, 1.0, &[])
}

const NA: Ion = Ion::Na;
const K: Ion = Ion::K;
const CL: Ion = Ion::Cl;

#[expect(
    clippy::too_many_arguments,
    reason = "one argument per column of the library table"
)]
fn system(
    id: &str,
    name: &str,
    z0: i32,
    steps: Vec<Step>,
    species: &[&str],
    t_range: (f64, f64),
    forms: Vec<ReagentForm>,
    source: &str,
    hazards: &[Hazard],
) -> AcidSystem {
    AcidSystem {
        id: id.into(),
        name: name.into(),
        z0,
        steps,
        species: species.iter().map(|s| (*s).to_string()).collect(),
        t_min_c: t_range.0,
        t_max_c: t_range.1,
        forms,
        source: source.into(),
        hazards: hazards.to_vec(),
    }
}

/// Van 't Hoff systems: 0–60 °C (Goldberg et al. give ~274–350 K).
const VH_RANGE: (f64, f64) = (0.0, 60.0);

/// A Good's buffer that is a zwitterionic free acid (net charge 0) with one
/// useful step and a sodium salt.
fn good_zwitterion(
    id: &str,
    name: &str,
    step: Step,
    t_range: (f64, f64),
    acid_formula: &str,
    salt_formula: Option<&str>,
    source: &str,
) -> AcidSystem {
    let mut forms = vec![plain(id, &format!("{name} (free acid)"), acid_formula)];
    if let Some(salt) = salt_formula {
        forms.push(form(
            &format!("{id}_na"),
            &format!("{name} sodium salt"),
            salt,
            1.0,
            &[(NA, 1.0)],
        ));
    }
    system(
        id,
        name,
        0,
        vec![step],
        &[name, &format!("{name}⁻")],
        t_range,
        forms,
        source,
        &[],
    )
}

fn goldberg_plus(extra: &str) -> String {
    format!("{GOLDBERG}; {extra}")
}

// ---------------------------------------------------------------- the data

fn build() -> Vec<AcidSystem> {
    let mut v = Vec::with_capacity(25);

    v.push(system(
        "acetate",
        "Acetate",
        0,
        vec![vh(4.756, -0.41, -142.0)],
        &["CH₃COOH", "CH₃COO⁻"],
        VH_RANGE,
        vec![
            plain("acetic_acid", "acetic acid (glacial)", "C2H4O2"),
            form(
                "na_acetate",
                "sodium acetate",
                "C2H3NaO2",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "na_acetate_3h2o",
                "sodium acetate trihydrate",
                "C2H3NaO2·3H2O",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "k_acetate",
                "potassium acetate",
                "C2H3KO2",
                1.0,
                &[(K, 1.0)],
            ),
        ],
        &goldberg_plus("pK agrees with NIST SRD 46 (4.757)"),
        &[Hazard::Corrosive],
    ));

    v.push(system(
        "formate",
        "Formate",
        0,
        vec![vh(3.744, -0.1, -165.0)],
        &["HCOOH", "HCOO⁻"],
        VH_RANGE,
        vec![
            plain("formic_acid", "formic acid", "CH2O2"),
            form("na_formate", "sodium formate", "CHNaO2", 1.0, &[(NA, 1.0)]),
            form("k_formate", "potassium formate", "CHKO2", 1.0, &[(K, 1.0)]),
        ],
        &goldberg_plus("pK agrees with NIST SRD 46 (3.745)"),
        &[Hazard::Corrosive],
    ));

    v.push(system(
        "citrate",
        "Citrate",
        0,
        vec![
            vh(3.128, 4.07, -131.0),
            vh(4.761, 2.23, -178.0),
            vh(6.396, -3.38, -254.0),
        ],
        &["H₃Cit", "H₂Cit⁻", "HCit²⁻", "Cit³⁻"],
        VH_RANGE,
        vec![
            plain("citric_acid", "citric acid (anhydrous)", "C6H8O7"),
            plain("citric_acid_h2o", "citric acid monohydrate", "C6H8O7·H2O"),
            form(
                "kh2_citrate",
                "potassium dihydrogen citrate",
                "C6H7KO7",
                1.0,
                &[(K, 1.0)],
            ),
            form(
                "na2h_citrate_1_5h2o",
                "disodium hydrogen citrate sesquihydrate",
                "C6H6Na2O7·1.5H2O",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na3_citrate",
                "trisodium citrate (anhydrous)",
                "C6H5Na3O7",
                1.0,
                &[(NA, 3.0)],
            ),
            form(
                "na3_citrate_2h2o",
                "trisodium citrate dihydrate",
                "C6H5Na3O7·2H2O",
                1.0,
                &[(NA, 3.0)],
            ),
            form(
                "k3_citrate_h2o",
                "tripotassium citrate monohydrate",
                "C6H5K3O7·H2O",
                1.0,
                &[(K, 3.0)],
            ),
        ],
        &goldberg_plus("pK1–pK3 agree with NIST SRD 46 (3.128, 4.761, 6.396)"),
        &[],
    ));

    v.push(system(
        "phosphate",
        "Phosphate",
        0,
        vec![
            vh(2.148, -8.0, -141.0),
            vh(7.198, 3.6, -230.0),
            vh(12.35, 16.0, -242.0),
        ],
        &["H₃PO₄", "H₂PO₄⁻", "HPO₄²⁻", "PO₄³⁻"],
        VH_RANGE,
        vec![
            // 85 % liquid phosphoric acid is handled as a stock solution.
            plain("h3po4", "phosphoric acid", "H3PO4"),
            form(
                "nah2po4",
                "sodium dihydrogen phosphate (anhydrous)",
                "NaH2PO4",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "nah2po4_h2o",
                "sodium dihydrogen phosphate monohydrate",
                "NaH2PO4·H2O",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "nah2po4_2h2o",
                "sodium dihydrogen phosphate dihydrate",
                "NaH2PO4·2H2O",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "na2hpo4",
                "disodium hydrogen phosphate (anhydrous)",
                "Na2HPO4",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2hpo4_2h2o",
                "disodium hydrogen phosphate dihydrate",
                "Na2HPO4·2H2O",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2hpo4_7h2o",
                "disodium hydrogen phosphate heptahydrate",
                "Na2HPO4·7H2O",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2hpo4_12h2o",
                "disodium hydrogen phosphate dodecahydrate",
                "Na2HPO4·12H2O",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na3po4_12h2o",
                "trisodium phosphate dodecahydrate",
                "Na3PO4·12H2O",
                1.0,
                &[(NA, 3.0)],
            ),
            form(
                "kh2po4",
                "potassium dihydrogen phosphate",
                "KH2PO4",
                1.0,
                &[(K, 1.0)],
            ),
            form(
                "k2hpo4",
                "dipotassium hydrogen phosphate",
                "K2HPO4",
                1.0,
                &[(K, 2.0)],
            ),
            form("k3po4", "tripotassium phosphate", "K3PO4", 1.0, &[(K, 3.0)]),
        ],
        &goldberg_plus("pK1, pK2 agree with NIST SRD 46 (2.148, 7.198; pK3 12.375 there)"),
        &[Hazard::Corrosive],
    ));

    v.push(system(
        "carbonate",
        "Carbonate",
        0,
        vec![
            by_formula(PkFormula::CarbonicK1PlummerBusenberg),
            by_formula(PkFormula::CarbonicK2PlummerBusenberg),
        ],
        &["CO₂(aq)", "HCO₃⁻", "CO₃²⁻"],
        PkFormula::CarbonicK1PlummerBusenberg.range_c(),
        vec![
            form(
                "nahco3",
                "sodium hydrogen carbonate",
                "NaHCO3",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "na2co3",
                "sodium carbonate (anhydrous)",
                "Na2CO3",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2co3_10h2o",
                "sodium carbonate decahydrate",
                "Na2CO3·10H2O",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "khco3",
                "potassium hydrogen carbonate",
                "KHCO3",
                1.0,
                &[(K, 1.0)],
            ),
            form("k2co3", "potassium carbonate", "K2CO3", 1.0, &[(K, 2.0)]),
        ],
        "Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46, 1011 (K1 on the CO2(aq) \
         basis, K2; fitted 0–90 °C, used 0–60 °C). Closed system: no CO2 exchange with air",
        &[],
    ));

    v.push(system(
        "borate",
        "Borate",
        0,
        vec![by_formula(PkFormula::BoricManov)],
        &["B(OH)₃", "B(OH)₄⁻"],
        PkFormula::BoricManov.range_c(),
        vec![
            plain("h3bo3", "boric acid", "H3BO3"),
            // Na2B4O7 + 7 H2O → 2 B(OH)3 + 2 B(OH)4⁻ + 2 Na⁺
            form(
                "borax_10h2o",
                "sodium tetraborate decahydrate (borax)",
                "Na2B4O7·10H2O",
                4.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2b4o7",
                "sodium tetraborate (anhydrous)",
                "Na2B4O7",
                4.0,
                &[(NA, 2.0)],
            ),
        ],
        "Manov, DeLollis & Acree (1944) J. Res. NBS 33, 287 (0–60 °C). Polyborates above \
         about 0.025 M total boron are not modelled",
        &[],
    ));

    v.push(system(
        "ammonium",
        "Ammonium / ammonia",
        1,
        vec![by_formula(PkFormula::AmmoniumEmerson)],
        &["NH₄⁺", "NH₃"],
        PkFormula::AmmoniumEmerson.range_c(),
        vec![
            form("nh4cl", "ammonium chloride", "NH4Cl", 1.0, &[(CL, 1.0)]),
            // Concentrated aqueous ammonia is handled as a stock solution.
            plain("nh3", "ammonia (aqueous)", "NH3"),
        ],
        "Emerson, Russo, Lund & Thurston (1975) J. Fish. Res. Board Can. 32, 2379 (0–50 °C); \
         agrees with NIST SRD 46 (9.244)",
        &[Hazard::Ammonia, Hazard::Corrosive],
    ));

    v.push(system(
        "tris",
        "Tris",
        1,
        vec![by_formula(PkFormula::TrisBatesHetzer)],
        &["TrisH⁺", "Tris"],
        PkFormula::TrisBatesHetzer.range_c(),
        vec![
            plain("tris_base", "Tris base", "C4H11NO3"),
            form(
                "tris_hcl",
                "Tris hydrochloride",
                "C4H11NO3·HCl",
                1.0,
                &[(CL, 1.0)],
            ),
        ],
        "Bates & Hetzer (1961) J. Phys. Chem. 65, 667 (0–50 °C); Goldberg et al. (2002): 8.072",
        &[],
    ));

    v.push(good_zwitterion(
        "hepes",
        "HEPES",
        vh(7.564, 20.4, 47.0),
        VH_RANGE,
        "C8H18N2O4S",
        Some("C8H17N2NaO4S"),
        &goldberg_plus("pK agrees with Vega & Bates (1976) (7.565)"),
    ));

    let mut mes = good_zwitterion(
        "mes",
        "MES",
        vh(6.270, 14.8, 5.0),
        VH_RANGE,
        "C6H13NO4S",
        Some("C6H12NNaO4S"),
        &goldberg_plus("pK agrees with Vega & Bates (1976) (6.270)"),
    );
    mes.forms
        .insert(1, plain("mes_h2o", "MES monohydrate", "C6H13NO4S·H2O"));
    v.push(mes);

    v.push(good_zwitterion(
        "mops",
        "MOPS",
        vh(7.184, 21.1, 25.0),
        VH_RANGE,
        "C7H15NO4S",
        Some("C7H14NNaO4S"),
        &goldberg_plus("measured 7.18 (J. Solution Chem.)"),
    ));

    v.push(system(
        "pipes",
        "PIPES",
        0,
        // pK1 ≈ 2.67 is from memory (no temperature data: held constant);
        // it is there so that the net-neutral free acid H₂PIPES dissolves
        // correctly. pK2 from Goldberg et al. (2002).
        vec![constant(2.67), vh(7.141, 11.2, 22.0)],
        &["H₂PIPES", "HPIPES⁻", "PIPES²⁻"],
        VH_RANGE,
        vec![
            plain("pipes", "PIPES (free acid)", "C8H18N2O6S2"),
            form(
                "pipes_na",
                "PIPES monosodium salt",
                "C8H17N2NaO6S2",
                1.0,
                &[(NA, 1.0)],
            ),
            form(
                "pipes_na2",
                "PIPES disodium salt",
                "C8H16N2Na2O6S2",
                1.0,
                &[(NA, 2.0)],
            ),
        ],
        &goldberg_plus("pK2; pK1 2.67 from memory, held constant"),
        &[],
    ));

    v.push(good_zwitterion(
        "bicine",
        "Bicine",
        vh(8.334, 26.34, 0.0),
        VH_RANGE,
        "C6H13NO4",
        Some("C6H12NNaO4"),
        &goldberg_plus("pK agrees with Roy et al. (2006) (8.333)"),
    ));

    v.push(good_zwitterion(
        "tricine",
        "Tricine",
        vh(8.135, 31.37, -53.0),
        VH_RANGE,
        "C6H13NO5",
        None,
        GOLDBERG,
    ));

    v.push(system(
        "glycine",
        "Glycine",
        1,
        vec![vh(2.351, 4.00, -139.0), vh(9.780, 44.2, -57.0)],
        &["⁺H₃NCH₂COOH", "⁺H₃NCH₂COO⁻", "H₂NCH₂COO⁻"],
        VH_RANGE,
        vec![
            plain("glycine", "glycine", "C2H5NO2"),
            form(
                "glycine_hcl",
                "glycine hydrochloride",
                "C2H5NO2·HCl",
                1.0,
                &[(CL, 1.0)],
            ),
            form(
                "na_glycinate",
                "sodium glycinate",
                "C2H4NNaO2",
                1.0,
                &[(NA, 1.0)],
            ),
        ],
        &goldberg_plus("pK1, pK2 agree with NIST SRD 46 (2.350, 9.778)"),
        &[],
    ));

    v.push(system(
        "succinate",
        "Succinate",
        0,
        vec![vh(4.207, 3.0, -121.0), vh(5.636, -0.5, -217.0)],
        &["H₂Suc", "HSuc⁻", "Suc²⁻"],
        VH_RANGE,
        vec![
            plain("succinic_acid", "succinic acid", "C4H6O4"),
            form(
                "na2_succinate",
                "disodium succinate (anhydrous)",
                "C4H4Na2O4",
                1.0,
                &[(NA, 2.0)],
            ),
            form(
                "na2_succinate_6h2o",
                "disodium succinate hexahydrate",
                "C4H4Na2O4·6H2O",
                1.0,
                &[(NA, 2.0)],
            ),
        ],
        GOLDBERG,
        &[],
    ));

    v.push(system(
        "imidazole",
        "Imidazole",
        1,
        vec![vh(6.993, 36.64, -9.0)],
        &["ImH⁺", "Im"],
        VH_RANGE,
        vec![
            plain("imidazole", "imidazole", "C3H4N2"),
            form(
                "imidazole_hcl",
                "imidazole hydrochloride",
                "C3H4N2·HCl",
                1.0,
                &[(CL, 1.0)],
            ),
        ],
        GOLDBERG,
        &[],
    ));

    v.push(system(
        "bistris",
        "Bis-Tris",
        1,
        vec![vh(6.484, 28.4, 27.0)],
        &["Bis-TrisH⁺", "Bis-Tris"],
        VH_RANGE,
        vec![
            plain("bistris", "Bis-Tris", "C8H19NO5"),
            form(
                "bistris_hcl",
                "Bis-Tris hydrochloride",
                "C8H19NO5·HCl",
                1.0,
                &[(CL, 1.0)],
            ),
        ],
        &goldberg_plus("pK agrees with Roy et al. (2014) (6.4828)"),
        &[],
    ));

    v.push(good_zwitterion(
        "aces",
        "ACES",
        by_formula(PkFormula::AcesRoy),
        PkFormula::AcesRoy.range_c(),
        "C4H10N2O4S",
        Some("C4H9N2NaO4S"),
        "Roy et al. (1997) J. Chem. Eng. Data 42, 41 (0–50 °C, range from memory); \
         Goldberg et al. (2002): 6.847",
    ));

    v.push(good_zwitterion(
        "ches",
        "CHES",
        by_formula(PkFormula::ChesRoy),
        PkFormula::ChesRoy.range_c(),
        "C8H17NO3S",
        Some("C8H16NNaO3S"),
        "Roy et al. (1997) J. Chem. Eng. Data 42, 41 (0–50 °C, range from memory); \
         Goldberg et al. (2002): 9.394",
    ));

    v.push(good_zwitterion(
        "caps",
        "CAPS",
        vh(10.499, 48.1, 57.0),
        VH_RANGE,
        "C9H19NO3S",
        Some("C9H18NNaO3S"),
        &goldberg_plus("pK agrees with Roy et al. (1997) formula (10.4993)"),
    ));

    v.push(good_zwitterion(
        "tes",
        "TES",
        vh(7.550, 32.1, 0.0),
        VH_RANGE,
        "C6H15NO6S",
        Some("C6H14NNaO6S"),
        "pK Vega & Bates (1976) (7.550); ΔrH°, ΔrCp° Goldberg, Kishore & Lennen (2002) \
         J. Phys. Chem. Ref. Data 31, 231 (from memory)",
    ));

    v.push(system(
        "phthalate",
        "Phthalate",
        0,
        vec![constant(2.950), constant(5.408)],
        &["H₂Phth", "HPhth⁻", "Phth²⁻"],
        (15.0, 35.0),
        vec![
            plain("phthalic_acid", "phthalic acid", "C8H6O4"),
            form(
                "khp",
                "potassium hydrogen phthalate",
                "C8H5KO4",
                1.0,
                &[(K, 1.0)],
            ),
            form(
                "k2_phthalate",
                "dipotassium phthalate",
                "C8H4K2O4",
                1.0,
                &[(K, 2.0)],
            ),
        ],
        "NIST SRD 46 (pK1 2.950, pK2 5.408); no enthalpy data used: constant pK, 15–35 °C only",
        &[],
    ));

    v.push(system(
        "hypochlorous",
        "Hypochlorous acid",
        0,
        vec![by_formula(PkFormula::HypochlorousMorris)],
        &["HOCl", "OCl⁻"],
        PkFormula::HypochlorousMorris.range_c(),
        vec![
            // Bleach (a solution) is handled as a stock solution.
            form("naocl", "sodium hypochlorite", "NaClO", 1.0, &[(NA, 1.0)]),
        ],
        "Morris (1966) J. Phys. Chem. 70, 3798 (5–35 °C; formula from memory)",
        &[Hazard::Chlorine, Hazard::Corrosive],
    ));

    v.push(system(
        "sulfide",
        "Hydrogen sulfide",
        0,
        // Monoprotic on purpose: pK2 of H2S is > 17 and disputed by orders of
        // magnitude, so S²⁻ is negligible in water; Na2S then acts as
        // HS⁻ + OH⁻ through its second Na⁺.
        vec![by_formula(PkFormula::SulfideMillero)],
        &["H₂S", "HS⁻"],
        PkFormula::SulfideMillero.range_c(),
        vec![
            form("nahs", "sodium hydrosulfide", "NaHS", 1.0, &[(NA, 1.0)]),
            form(
                "na2s_9h2o",
                "sodium sulfide nonahydrate",
                "Na2S·9H2O",
                1.0,
                &[(NA, 2.0)],
            ),
        ],
        "Millero (1988), freshwater H2S first step (0–50 °C, range from memory); pK2 \
         not modelled (> 17, disputed)",
        &[Hazard::Sulfide, Hazard::Corrosive],
    ));

    v
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::system::thermo::{system_pks, validate_system};
    use crate::system::MAX_STEPS;

    const IDS: [&str; 25] = [
        "acetate",
        "formate",
        "citrate",
        "phosphate",
        "carbonate",
        "borate",
        "ammonium",
        "tris",
        "hepes",
        "mes",
        "mops",
        "pipes",
        "bicine",
        "tricine",
        "glycine",
        "succinate",
        "imidazole",
        "bistris",
        "aces",
        "ches",
        "caps",
        "tes",
        "phthalate",
        "hypochlorous",
        "sulfide",
    ];

    #[test]
    fn every_required_system_is_present_and_valid() {
        for id in IDS {
            let s = find_system(id).unwrap_or_else(|| panic!("missing {id}"));
            validate_system(s).unwrap_or_else(|e| panic!("{id}: {e}"));
            assert!(!s.forms.is_empty(), "{id}");
            assert!(!s.source.is_empty(), "{id}");
            assert!(s.steps.len() <= MAX_STEPS);
        }
        assert_eq!(library().len(), IDS.len());
        assert!(find_system("nope").is_none());
    }

    #[test]
    fn ids_are_unique() {
        let lib = library();
        for (i, a) in lib.iter().enumerate() {
            assert!(lib.iter().skip(i + 1).all(|b| b.id != a.id), "{}", a.id);
        }
    }

    #[test]
    fn every_form_has_a_molar_mass() {
        for s in library() {
            for f in &s.forms {
                let m = f
                    .molar_mass()
                    .unwrap_or_else(|e| panic!("{}/{}: {e}", s.id, f.id));
                assert!(m > 1.0 && m < 1000.0, "{}/{}: {m}", s.id, f.id);
                assert!(find_form(s, &f.id).is_some());
            }
        }
    }

    #[test]
    fn forms_are_charge_consistent() {
        // A neutral solid dissolves to the system in some protonation state
        // plus its spectator ions, with zero net charge: the charge of the
        // system part, −counter_charge/units, must be a species charge
        // z0 − k (k = 0..=steps) or, for strong bases like Na2S in the
        // monoprotic sulfide model, below the last species (excess → OH⁻).
        for s in library() {
            let zmin = s.z0 - s.steps.len() as i32;
            for f in &s.forms {
                let z = -counter_charge(f) / f.units;
                let exact = (zmin..=s.z0).any(|zk| (f64::from(zk) - z).abs() < 1e-9);
                // Known exceptions: borax gives 2 B(OH)3 + 2 B(OH)4⁻ (mean −½);
                // Na2S gives HS⁻ + OH⁻ in the monoprotic sulfide model.
                let known = matches!(
                    (s.id.as_str(), f.id.as_str()),
                    ("borate", "borax_10h2o" | "na2b4o7") | ("sulfide", "na2s_9h2o")
                );
                let ok_species = exact || known;
                assert!(ok_species, "{}/{}: charge {z}", s.id, f.id);
            }
        }
    }

    #[test]
    fn counter_charge_examples() {
        let p = find_system("phosphate").unwrap();
        assert_eq!(counter_charge(find_form(p, "na2hpo4_7h2o").unwrap()), 2.0);
        let t = find_system("tris").unwrap();
        assert_eq!(counter_charge(find_form(t, "tris_hcl").unwrap()), -1.0);
        assert_eq!(counter_charge(find_form(t, "tris_base").unwrap()), 0.0);
        let b = find_system("borate").unwrap();
        let borax = find_form(b, "borax_10h2o").unwrap();
        assert_eq!(borax.units, 4.0);
        assert_eq!(counter_charge(borax), 2.0);
    }

    #[test]
    fn system_pks_checks_range() {
        let hocl = find_system("hypochlorous").unwrap();
        assert!(system_pks(hocl, 4.0).is_err());
        assert!(system_pks(hocl, 20.0).is_ok());
        let ph = find_system("phthalate").unwrap();
        assert_eq!(system_pks(ph, 30.0).unwrap(), vec![2.950, 5.408]);
        assert!(system_pks(ph, 10.0).is_err());
    }

    #[test]
    fn hazards() {
        assert!(find_system("ammonium")
            .unwrap()
            .hazards
            .contains(&Hazard::Ammonia));
        assert!(find_system("sulfide")
            .unwrap()
            .hazards
            .contains(&Hazard::Sulfide));
        assert!(find_system("hypochlorous")
            .unwrap()
            .hazards
            .contains(&Hazard::Chlorine));
        assert!(find_system("phosphate")
            .unwrap()
            .hazards
            .contains(&Hazard::Corrosive));
    }

    #[test]
    fn pks_stay_finite_and_ordered_over_each_range() {
        for s in library() {
            let n = ((s.t_max_c - s.t_min_c) * 2.0).round() as i32;
            for k in 0..=n {
                let t = (s.t_min_c + f64::from(k) * 0.5).min(s.t_max_c);
                let pk = system_pks(s, t).unwrap();
                assert!(pk.iter().all(|p| p.is_finite()), "{} at {t}", s.id);
                assert!(
                    pk.windows(2).all(|w| w[0] < w[1]),
                    "{} at {t}: {pk:?}",
                    s.id
                );
            }
        }
    }
}
