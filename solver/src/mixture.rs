//! What is in the flask: mixture specifications, their solution, speciation, curves and what-ifs.

use crate::equilibrium::activity::{gamma1, gamma_z, ActivityModel};
use crate::equilibrium::{
    capacity_with_gamma, fractions_into, solve, solve_addition, solve_hinted, Acid, Composition,
    Equilibrium,
};
use crate::error::{in_range, non_negative, Result, SolverError};
use crate::limits::{DILUTION_FACTOR, WHAT_IF_TEMPERATURE_C};
use crate::system::library::{counter_charge, find_form, find_system};
use crate::system::thermo::system_pks;
use crate::system::{AcidSystem, Ion, MAX_STEPS};
use crate::water::{debye_huckel_a, pkw};
use serde::{Deserialize, Serialize};

/// Strong acids, strong bases and inert salts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Additive {
    /// Hydrochloric acid (Cl⁻).
    Hcl,
    /// Sodium hydroxide (Na⁺).
    Naoh,
    /// Potassium hydroxide (K⁺).
    Koh,
    /// Sodium chloride (Na⁺ + Cl⁻).
    Nacl,
    /// Potassium chloride (K⁺ + Cl⁻).
    Kcl,
}

impl Additive {
    /// All additives in display order.
    pub const ALL: [Additive; 5] = [
        Additive::Hcl,
        Additive::Naoh,
        Additive::Koh,
        Additive::Nacl,
        Additive::Kcl,
    ];

    /// Spectator ions delivered per mole.
    pub fn ions(self) -> &'static [(Ion, f64)] {
        match self {
            Additive::Hcl => &[(Ion::Cl, 1.0)],
            Additive::Naoh => &[(Ion::Na, 1.0)],
            Additive::Koh => &[(Ion::K, 1.0)],
            Additive::Nacl => &[(Ion::Na, 1.0), (Ion::Cl, 1.0)],
            Additive::Kcl => &[(Ion::K, 1.0), (Ion::Cl, 1.0)],
        }
    }

    /// Net charge delivered per mole (+1 strong base, −1 strong acid, 0 salt).
    pub fn charge(self) -> f64 {
        self.ions()
            .iter()
            .map(|(ion, n)| f64::from(ion.charge()) * n)
            .sum()
    }

    /// Formula used for molar mass and display.
    pub fn formula(self) -> &'static str {
        match self {
            Additive::Hcl => "HCl",
            Additive::Naoh => "NaOH",
            Additive::Koh => "KOH",
            Additive::Nacl => "NaCl",
            Additive::Kcl => "KCl",
        }
    }

    /// Whether this is a strong acid or base (a hazard worth a caution).
    pub fn is_corrosive(self) -> bool {
        matches!(self, Additive::Hcl | Additive::Naoh | Additive::Koh)
    }
}

/// One acid system in the flask, added as a shelf form (or as the system itself).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ComponentSpec {
    /// System id (library or custom).
    pub system: String,
    /// Reagent form id; `None` means the fully protonated species with no counter-ions.
    #[serde(default)]
    pub form: Option<String>,
    /// Concentration of the form in the final solution, mol/L (formula units).
    pub conc_m: f64,
}

/// A strong acid, base or salt in the flask.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AdditiveSpec {
    /// Which one.
    pub additive: Additive,
    /// Concentration in the final solution, mol/L.
    pub conc_m: f64,
}

/// A mixture: what is in the flask and at which temperature.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MixtureSpec {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Activity model.
    #[serde(default)]
    pub activity: ActivityModel,
    /// Acid systems added.
    #[serde(default)]
    pub components: Vec<ComponentSpec>,
    /// Strong acids, bases and salts added.
    #[serde(default)]
    pub additives: Vec<AdditiveSpec>,
}

/// One species of a system at equilibrium.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesRow {
    /// Display name.
    pub name: String,
    /// Charge number.
    pub charge: i32,
    /// Concentration, mol/L.
    pub conc: f64,
    /// Fraction of the system total.
    pub fraction: f64,
    /// Activity (dimensionless, mol/L basis).
    pub activity: f64,
}

/// Speciation of one system.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SystemSpecies {
    /// System id.
    pub system: String,
    /// System display name.
    pub name: String,
    /// Total concentration, mol/L.
    pub total: f64,
    /// pK values at the working temperature and I = 0.
    pub pks: Vec<f64>,
    /// Species, most protonated first.
    pub species: Vec<SpeciesRow>,
}

/// The solved mixture.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MixtureResult {
    /// pH, ionic strength, capacity and warnings.
    pub equilibrium: Equilibrium,
    /// Species of every system.
    pub systems: Vec<SystemSpecies>,
    /// Spectator ion concentrations, mol/L.
    pub ions: Vec<(Ion, f64)>,
    /// pKw at the temperature.
    pub pkw: f64,
}

/// What a prepared mixture keeps of each system: its names, not its shelf forms.
#[derive(Debug, Clone, PartialEq)]
pub struct SystemLabel {
    /// System id.
    pub id: String,
    /// Display name.
    pub name: String,
    /// Species names, most protonated first.
    pub species: Vec<String>,
}

/// A mixture resolved at its temperature, ready for repeated solves.
#[derive(Debug, Clone, PartialEq)]
pub struct Prepared {
    /// Engine input.
    pub composition: Composition,
    /// Names of the systems, in the same order as `composition.acids`.
    pub systems: Vec<SystemLabel>,
    /// Spectator ions, mol/L, in [`Ion::ALL`] order.
    pub ions: [f64; 3],
    /// pKw.
    pub pkw: f64,
}

/// Look a system up among the custom ones first, then the library.
///
/// # Errors
///
/// [`SolverError::Unknown`] when no system has that id.
pub fn lookup<'a>(id: &str, custom: &'a [AcidSystem]) -> Result<&'a AcidSystem>
where
    'static: 'a,
{
    if let Some(s) = custom.iter().find(|s| s.id == id) {
        return Ok(s);
    }
    find_system(id).ok_or_else(|| SolverError::Unknown {
        kind: "system".into(),
        name: id.into(),
    })
}

fn ion_index(ion: Ion) -> usize {
    match ion {
        Ion::Na => 0,
        Ion::K => 1,
        Ion::Cl => 2,
    }
}

/// Resolve a mixture at its temperature.
///
/// # Errors
///
/// Field-named errors for negative or non-finite amounts, unknown systems or
/// forms, and temperatures outside the data's range.
pub fn prepare(spec: &MixtureSpec, custom: &[AcidSystem]) -> Result<Prepared> {
    let t = crate::limits::MIXTURE_TEMPERATURE_C.check(spec.temperature_c)?;
    let pkw = pkw(t)?;
    let a_dh = debye_huckel_a(t)?;
    let mut ions = [0.0; 3];
    let mut acids = Vec::with_capacity(spec.components.len());
    let mut systems = Vec::with_capacity(spec.components.len());
    for (i, comp) in spec.components.iter().enumerate() {
        let conc = non_negative(&format!("components[{i}].conc_m"), comp.conc_m)?;
        let sys = lookup(&comp.system, custom)?;
        let pks = system_pks(sys, t)?;
        let units = match &comp.form {
            None => 1.0,
            Some(fid) => {
                let form = find_form(sys, fid).ok_or_else(|| SolverError::Unknown {
                    kind: "form".into(),
                    name: fid.clone(),
                })?;
                for (ion, n) in &form.counter_ions {
                    if let Some(slot) = ions.get_mut(ion_index(*ion)) {
                        *slot += n * conc;
                    }
                }
                form.units
            }
        };
        // Several forms of one system are one system in solution.
        if let Some(pos) = systems.iter().position(|s: &SystemLabel| s.id == sys.id) {
            if let Some(a) = acids.get_mut(pos) {
                let a: &mut Acid = a;
                a.total += units * conc;
            }
        } else {
            acids.push(Acid::from_pks(sys.z0, &pks, units * conc));
            systems.push(SystemLabel {
                id: sys.id.clone(),
                name: sys.name.clone(),
                species: sys.species.clone(),
            });
        }
    }
    for (i, add) in spec.additives.iter().enumerate() {
        let conc = non_negative(&format!("additives[{i}].conc_m"), add.conc_m)?;
        for (ion, n) in add.additive.ions() {
            if let Some(slot) = ions.get_mut(ion_index(*ion)) {
                *slot += n * conc;
            }
        }
    }
    let (charge, z2) = spectators(&ions);
    Ok(Prepared {
        composition: Composition {
            acids,
            spectator_charge: charge,
            spectator_z2: z2,
            kw: 10f64.powf(-pkw),
            a_dh,
            activity: spec.activity,
        },
        systems,
        ions,
        pkw,
    })
}

fn spectators(ions: &[f64; 3]) -> (f64, f64) {
    let mut charge = 0.0;
    let mut z2 = 0.0;
    for (ion, c) in Ion::ALL.iter().zip(ions.iter()) {
        let z = f64::from(ion.charge());
        charge += z * c;
        z2 += z * z * c;
    }
    (charge, z2)
}

impl Prepared {
    /// Solve the charge balance.
    ///
    /// # Errors
    ///
    /// As [`solve`].
    pub fn solve(&self) -> Result<Equilibrium> {
        solve(&self.composition, f64::NAN)
    }

    /// Speciation of every system at a pH and ionic strength.
    pub fn speciate(&self, ph: f64, ionic_strength: f64) -> Vec<SystemSpecies> {
        let c = &self.composition;
        let g1 = gamma1(c.activity, c.a_dh, ionic_strength);
        let mut out = Vec::with_capacity(c.acids.len());
        for (acid, sys) in c.acids.iter().zip(self.systems.iter()) {
            let mut fr = [0.0; MAX_STEPS + 1];
            let n = fractions_into(acid, ph, g1, &mut fr);
            let species = fr
                .iter()
                .take(n)
                .enumerate()
                .map(|(j, f)| {
                    let z = acid.z0 - j as i32;
                    let conc = acid.total * f;
                    SpeciesRow {
                        name: sys
                            .species
                            .get(j)
                            .cloned()
                            .unwrap_or_else(|| format!("species {j}")),
                        charge: z,
                        conc,
                        fraction: *f,
                        activity: conc * gamma_z(g1, z),
                    }
                })
                .collect();
            out.push(SystemSpecies {
                system: sys.id.clone(),
                name: sys.name.clone(),
                total: acid.total,
                pks: acid.ka.iter().take(acid.n).map(|k| -k.log10()).collect(),
                species,
            });
        }
        out
    }

    /// Spectator ions as (ion, mol/L), omitting absent ones.
    pub fn ion_list(&self) -> Vec<(Ion, f64)> {
        Ion::ALL
            .iter()
            .zip(self.ions.iter())
            .filter(|(_, c)| **c > 0.0)
            .map(|(i, c)| (*i, *c))
            .collect()
    }

    /// A copy with a strong acid (negative `amount`) or base (positive) added, mol/L.
    pub fn with_strong(&self, amount: f64) -> Prepared {
        let mut p = self.clone();
        if amount >= 0.0 {
            p.ions[0] += amount;
        } else {
            p.ions[2] -= amount;
        }
        let (charge, z2) = spectators(&p.ions);
        p.composition.spectator_charge = charge;
        p.composition.spectator_z2 = z2;
        p
    }
}

/// Solve a mixture: pH, ionic strength, capacity, species.
///
/// # Errors
///
/// Field-named validation errors (see [`prepare`]) and solver failures.
///
/// # Example
///
/// ```
/// use solver::mixture::{solve_mixture, MixtureSpec, ComponentSpec};
/// use solver::equilibrium::activity::ActivityModel;
/// // IUPAC primary standard: 0.025 KH2PO4 + 0.025 Na2HPO4, pH(S) 6.865 at 25 °C.
/// let spec = MixtureSpec {
///     temperature_c: 25.0,
///     activity: ActivityModel::Davies,
///     components: vec![
///         ComponentSpec { system: "phosphate".into(), form: Some("kh2po4".into()), conc_m: 0.025 },
///         ComponentSpec { system: "phosphate".into(), form: Some("na2hpo4".into()), conc_m: 0.025 },
///     ],
///     additives: vec![],
/// };
/// let r = solve_mixture(&spec, &[])?;
/// assert!((r.equilibrium.ph - 6.865).abs() < 0.02);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn solve_mixture(spec: &MixtureSpec, custom: &[AcidSystem]) -> Result<MixtureResult> {
    let p = prepare(spec, custom)?;
    let eq = p.solve()?;
    let systems = p.speciate(eq.ph, eq.ionic_strength);
    Ok(MixtureResult {
        systems,
        ions: p.ion_list(),
        pkw: p.pkw,
        equilibrium: eq,
    })
}

/// Changes to try on a mixture.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WhatIf {
    /// Dilute every concentration by this factor (≥ 1; 1 = no dilution).
    pub dilution_factor: f64,
    /// Strong acid (HCl) to add, mol/L of final solution.
    pub add_acid_m: f64,
    /// Strong base (NaOH) to add, mol/L of final solution.
    pub add_base_m: f64,
    /// Another temperature for the same composition, °C.
    pub temperature_c: f64,
}

impl Default for WhatIf {
    fn default() -> Self {
        Self {
            dilution_factor: 10.0,
            add_acid_m: 0.001,
            add_base_m: 0.001,
            temperature_c: 4.0,
        }
    }
}

/// The pH after each what-if change, each applied alone to the original mixture.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WhatIfResult {
    /// pH of the original mixture.
    pub ph: f64,
    /// pH after dilution.
    pub diluted_ph: f64,
    /// pH after adding the strong acid.
    pub after_acid_ph: f64,
    /// pH after adding the strong base.
    pub after_base_ph: f64,
    /// pH at the other temperature.
    pub at_temperature_ph: f64,
}

/// Apply each what-if change alone and solve.
///
/// # Errors
///
/// Field-named errors (`what_if.dilution_factor` must be ≥ 1, amounts ≥ 0,
/// temperature in range) and solver failures.
pub fn what_if(spec: &MixtureSpec, custom: &[AcidSystem], w: &WhatIf) -> Result<WhatIfResult> {
    let f = DILUTION_FACTOR.check_as(DILUTION_FACTOR.path, w.dilution_factor)?;
    let acid = non_negative("what_if.add_acid_m", w.add_acid_m)?;
    let base = non_negative("what_if.add_base_m", w.add_base_m)?;
    let t = WHAT_IF_TEMPERATURE_C.check_as(WHAT_IF_TEMPERATURE_C.path, w.temperature_c)?;
    let p = prepare(spec, custom)?;
    let eq = p.solve()?;
    let mut diluted = spec.clone();
    for c in &mut diluted.components {
        c.conc_m /= f;
    }
    for a in &mut diluted.additives {
        a.conc_m /= f;
    }
    let diluted_ph = solve_mixture(&diluted, custom)?.equilibrium.ph;
    let after_acid_ph = solve(&p.with_strong(-acid).composition, eq.ph)?.ph;
    let after_base_ph = solve(&p.with_strong(base).composition, eq.ph)?.ph;
    let mut warm = spec.clone();
    warm.temperature_c = t;
    let at_temperature_ph = solve_mixture(&warm, custom)?.equilibrium.ph;
    Ok(WhatIfResult {
        ph: eq.ph,
        diluted_ph,
        after_acid_ph,
        after_base_ph,
        at_temperature_ph,
    })
}

/// How much strong acid or base the solution takes before it leaves a pH window.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Tolerance {
    /// Half-width of the window, pH units.
    pub window: f64,
    /// Strong acid (mmol per litre) that lowers the pH by `window`.
    pub acid_mmol_per_l: f64,
    /// Strong base (mmol per litre) that raises the pH by `window`.
    pub base_mmol_per_l: f64,
}

/// The tolerance budget, solved exactly (not by linearising β).
///
/// # Errors
///
/// `tolerance_ph` must be in (0, 2]; solver failures.
pub fn tolerance(p: &Prepared, eq: &Equilibrium, window: f64) -> Result<Tolerance> {
    let w = in_range("tolerance_ph", window, 1e-4, 2.0)?;
    // Acid: Cl⁻ (charge −1, z² 1); base: Na⁺ (charge +1, z² 1).
    let (acid, _) = solve_addition(&p.composition, eq.ph - w, -1.0, 1.0)?;
    let (base, _) = solve_addition(&p.composition, eq.ph + w, 1.0, 1.0)?;
    Ok(Tolerance {
        window: w,
        acid_mmol_per_l: acid.max(0.0) * 1000.0,
        base_mmol_per_l: base.max(0.0) * 1000.0,
    })
}

/// Fractions of every species and buffer capacity over a pH grid, at the
/// mixture's own ionic strength.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesCurves {
    /// pH grid.
    pub ph: Vec<f64>,
    /// One series per species: (system name, species name, fraction at each pH).
    pub series: Vec<(String, String, Vec<f64>)>,
    /// β at each pH, mol/(L·pH).
    pub capacity: Vec<f64>,
}

/// Speciation and capacity curves over `[ph_min, ph_max]` with `n` points.
///
/// # Errors
///
/// `n` must be 2..=100 000 and the range increasing within −2…16.
pub fn species_curves(
    p: &Prepared,
    ionic_strength: f64,
    ph_min: f64,
    ph_max: f64,
    n: usize,
) -> Result<SpeciesCurves> {
    let lo = in_range("ph_min", ph_min, -2.0, 16.0)?;
    let hi = in_range("ph_max", ph_max, lo, 16.0)?;
    in_range("points", n as f64, 2.0, 100_000.0)?;
    let c = &p.composition;
    let g1 = gamma1(c.activity, c.a_dh, ionic_strength);
    let ph: Vec<f64> = (0..n)
        .map(|i| lo + (hi - lo) * i as f64 / (n - 1) as f64)
        .collect();
    let mut series: Vec<(String, String, Vec<f64>)> = Vec::new();
    for (acid, sys) in c.acids.iter().zip(p.systems.iter()) {
        let mut cols: Vec<Vec<f64>> = (0..=acid.n).map(|_| Vec::with_capacity(n)).collect();
        let mut fr = [0.0; MAX_STEPS + 1];
        for &x in &ph {
            fractions_into(acid, x, g1, &mut fr);
            for (col, f) in cols.iter_mut().zip(fr.iter()) {
                col.push(*f);
            }
        }
        for (j, col) in cols.into_iter().enumerate() {
            let name = sys
                .species
                .get(j)
                .cloned()
                .unwrap_or_else(|| format!("species {j}"));
            series.push((sys.name.clone(), name, col));
        }
    }
    let capacity = ph.iter().map(|&x| capacity_with_gamma(c, x, g1)).collect();
    Ok(SpeciesCurves {
        ph,
        series,
        capacity,
    })
}

/// A titration curve: pH against strong acid (negative) or base (positive) added.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TitrationCurve {
    /// Added amount, mmol per litre (negative = HCl, positive = NaOH).
    pub added_mmol_per_l: Vec<f64>,
    /// pH at each amount.
    pub ph: Vec<f64>,
}

/// Titrate from `-max_acid_m` to `+max_base_m` (mol/L) in `n` points, drawn
/// from pH rather than toward it.
///
/// The two end points and the start (nothing added) are full solves. Between them the curve runs on an even pH grid: at each pH the
/// strong acid or base that puts the solution there follows directly from
/// the charge balance, with the ionic strength iterated to self-consistency
/// ([`solve_addition`]):
///
/// ```text
/// x_NaOH = S(pH, I) − S₀        (S: the spectator charge the balance needs at pH)
/// x_HCl  = S₀ − S(pH, I)        when x_NaOH < 0, with Cl⁻ instead of Na⁺ in I
/// ```
///
/// so each point costs about one speciation, not a Newton solve, and the
/// steep parts near equivalence get as many points as the flat ones. Exact
/// under the model: [`titration_curve_by_solves`] is the oracle in the tests.
///
/// # Errors
///
/// Negative or non-finite limits, `n` outside 2..=100 000, solver failures.
pub fn titration_curve(
    p: &Prepared,
    max_acid_m: f64,
    max_base_m: f64,
    n: usize,
) -> Result<TitrationCurve> {
    let a = non_negative("max_acid_m", max_acid_m)?;
    let b = non_negative("max_base_m", max_base_m)?;
    in_range("points", n as f64, 2.0, 100_000.0)?;
    let ph_after = |x: f64| -> Result<f64> {
        let mut work = p.clone();
        let mut ions = p.ions;
        if x >= 0.0 {
            ions[0] += x;
        } else {
            ions[2] -= x;
        }
        let (charge, z2) = spectators(&ions);
        work.composition.spectator_charge = charge;
        work.composition.spectator_z2 = z2;
        Ok(solve_hinted(&work.composition, f64::NAN, f64::NAN)?.ph)
    };
    let lo = ph_after(-a)?;
    let hi = ph_after(b)?;
    let mut added = Vec::with_capacity(n);
    let mut ph = Vec::with_capacity(n);
    for i in 0..n {
        let (x, at) = if i == 0 {
            (-a, lo)
        } else if i == n - 1 {
            (b, hi)
        } else {
            let at = lo + (hi - lo) * i as f64 / (n - 1) as f64;
            // Na⁺ of NaOH: charge +1, z² = 1; Cl⁻ of HCl: charge −1, z² = 1.
            let (base, _) = solve_addition(&p.composition, at, 1.0, 1.0)?;
            let x = if base >= 0.0 {
                base
            } else {
                -solve_addition(&p.composition, at, -1.0, 1.0)?.0
            };
            (x.clamp(-a, b), at)
        };
        added.push(x * 1000.0);
        ph.push(at);
    }
    // The start (nothing added) is a point of the curve: the grid point
    // nearest to it in pH becomes it, which keeps the curve monotone.
    if n > 2 && a > 0.0 && b > 0.0 {
        let start = ph_after(0.0)?;
        let step = (hi - lo) / (n - 1) as f64;
        if step > 0.0 {
            let k = (((start - lo) / step).round() as usize).clamp(1, n - 2);
            if let (Some(x), Some(y)) = (added.get_mut(k), ph.get_mut(k)) {
                *x = 0.0;
                *y = start;
            }
        }
    }
    Ok(TitrationCurve {
        added_mmol_per_l: added,
        ph,
    })
}

/// The titration curve the slow way, kept as the oracle of
/// [`titration_curve`]: `n` evenly spaced amounts, each a full solve
/// warm-started from its neighbour.
///
/// # Errors
///
/// Negative or non-finite limits, `n` outside 2..=100 000, solver failures.
pub fn titration_curve_by_solves(
    p: &Prepared,
    max_acid_m: f64,
    max_base_m: f64,
    n: usize,
) -> Result<TitrationCurve> {
    let a = non_negative("max_acid_m", max_acid_m)?;
    let b = non_negative("max_base_m", max_base_m)?;
    in_range("points", n as f64, 2.0, 100_000.0)?;
    let mut added = Vec::with_capacity(n);
    let mut ph = Vec::with_capacity(n);
    let mut work = p.clone();
    let mut guess = f64::NAN;
    let mut ionic = f64::NAN;
    for i in 0..n {
        let x = -a + (a + b) * i as f64 / (n - 1) as f64;
        let mut ions = p.ions;
        if x >= 0.0 {
            ions[0] += x;
        } else {
            ions[2] -= x;
        }
        let (charge, z2) = spectators(&ions);
        work.composition.spectator_charge = charge;
        work.composition.spectator_z2 = z2;
        let eq = solve_hinted(&work.composition, guess, ionic)?;
        guess = eq.ph;
        ionic = eq.ionic_strength;
        added.push(x * 1000.0);
        ph.push(eq.ph);
    }
    Ok(TitrationCurve {
        added_mmol_per_l: added,
        ph,
    })
}

/// Net charge per formula unit a form's counter-ions carry (re-exported helper).
pub fn form_counter_charge(sys: &AcidSystem, form_id: &str) -> Option<f64> {
    find_form(sys, form_id).map(counter_charge)
}
