//! Plot data: the solver's curves for the plotted composition, grouped for drawing, tables and readouts.
//!
//! Everything here is plain Rust over solver results (no web-sys), so it is
//! tested natively. Every number that reaches a plot, a table or the readout
//! comes from [`solver::mixture`]; this module only picks grid points and
//! formats them.

use solver::document::{Design, PlotSource};
use solver::mixture::{prepare, species_curves, titration_curve, MixtureSpec};
use solver::recipe::solve_recipe;
use solver::system::AcidSystem;

/// Lowest pH on the species and capacity plots.
pub const PH_MIN: f64 = 0.0;
/// Highest pH on the species and capacity plots.
pub const PH_MAX: f64 = 14.0;
/// Points on the pH grid (step 0.025 pH).
pub const PH_POINTS: usize = 561;
/// Points on the titration curve.
pub const TITRATION_POINTS: usize = 401;

/// The composition the plots show, resolved from the design.
#[derive(Debug, Clone, PartialEq)]
pub struct Source {
    /// Which part of the design it came from.
    pub kind: PlotSource,
    /// The mixture (the recipe's finished solution, or the mixture as entered).
    pub mixture: MixtureSpec,
    /// User-defined systems the mixture may name.
    pub custom: Vec<AcidSystem>,
}

/// Pick the composition to plot.
///
/// # Errors
///
/// The recipe's error message (prefixed) when the recipe has no solution.
pub fn source(design: &Design) -> Result<Source, String> {
    let mixture = match design.plot_source {
        PlotSource::Recipe => {
            solve_recipe(&design.recipe, &design.systems())
                .map_err(|e| format!("The recipe has no solution to plot: {e}"))?
                .mixture
        }
        PlotSource::Mixture => design.mixture.clone(),
    };
    Ok(Source {
        kind: design.plot_source,
        mixture,
        custom: design.systems(),
    })
}

/// One acid system on the plots (components of the same system merged).
#[derive(Debug, Clone, PartialEq)]
pub struct SystemInfo {
    /// Display name.
    pub name: String,
    /// Total concentration, mol/L.
    pub total_m: f64,
    /// Thermodynamic pK values at the temperature (I = 0).
    pub pks: Vec<f64>,
}

/// The fraction curve of one species.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Index into [`PlotData::systems`].
    pub system: usize,
    /// Species name.
    pub name: String,
    /// Fraction of the system total at each grid pH.
    pub fraction: Vec<f64>,
}

/// Everything the three plots draw.
#[derive(Debug, Clone, PartialEq)]
pub struct PlotData {
    /// Where the composition came from.
    pub kind: PlotSource,
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Working pH (the solved composition).
    pub ph: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// β at the working pH, mol/(L·pH).
    pub capacity_at_ph: f64,
    /// Systems, in the order first met.
    pub systems: Vec<SystemInfo>,
    /// pH grid.
    pub grid: Vec<f64>,
    /// Species fraction curves.
    pub series: Vec<Series>,
    /// β at each grid pH, mmol/(L·pH).
    pub capacity_mm: Vec<f64>,
    /// Titration: added strong base (+, NaOH) or acid (−, HCl), mmol/L.
    pub added_mm: Vec<f64>,
    /// Titration: pH at each added amount.
    pub titration_ph: Vec<f64>,
    /// Each species' share of its system's total at the working pH (exact,
    /// from the solved composition): (system index, species, fraction).
    pub shares_at_ph: Vec<(usize, String, f64)>,
}

/// Whether the species plot shows fractions or concentrations.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Quantity {
    /// Fraction of the system total (0–1).
    #[default]
    Fraction,
    /// Concentration, mmol/L.
    Concentration,
}

/// Titration span: twice the total buffer concentration each way (at least 1 mmol/L),
/// enough to pass every step of a diprotic system and reach the strong-acid/base walls.
pub fn titration_span_m(total_m: f64) -> f64 {
    (2.0 * total_m).max(0.001)
}

/// Solve the composition and compute every curve.
///
/// # Errors
///
/// A message for an empty composition or any solver error.
pub fn compute(src: &Source) -> Result<PlotData, String> {
    compute_with(src, true)
}

/// Like [`compute`] without the titration curve (left empty): the species
/// and capacity curves only, for the recipe's compact plot.
///
/// # Errors
///
/// As [`compute`].
pub fn compute_curves(src: &Source) -> Result<PlotData, String> {
    compute_with(src, false)
}

fn compute_with(src: &Source, titration: bool) -> Result<PlotData, String> {
    let text = |e: solver::SolverError| e.to_string();
    if src.mixture.components.is_empty() {
        return Err("The composition has no acid systems to plot.".into());
    }
    let p = prepare(&src.mixture, &src.custom).map_err(text)?;
    let eq = p.solve().map_err(text)?;
    let curves = species_curves(&p, eq.ionic_strength, PH_MIN, PH_MAX, PH_POINTS).map_err(text)?;
    let speciated = p.speciate(eq.ph, eq.ionic_strength);

    // Components of the same system share fractions (same pKs, same I): merge them.
    let mut systems: Vec<SystemInfo> = Vec::new();
    let mut ids: Vec<&str> = Vec::new();
    let mut series = Vec::new();
    let mut shares_at_ph = Vec::new();
    let mut curve_iter = curves.series.into_iter();
    for sp in &speciated {
        let chunk: Vec<(String, String, Vec<f64>)> =
            curve_iter.by_ref().take(sp.species.len()).collect();
        if let Some(k) = ids.iter().position(|id| *id == sp.system) {
            if let Some(s) = systems.get_mut(k) {
                s.total_m += sp.total;
            }
            continue;
        }
        let k = systems.len();
        shares_at_ph.extend(sp.species.iter().map(|r| (k, r.name.clone(), r.fraction)));
        ids.push(&sp.system);
        systems.push(SystemInfo {
            name: sp.name.clone(),
            total_m: sp.total,
            pks: sp.pks.clone(),
        });
        series.extend(chunk.into_iter().map(|(_, name, fraction)| Series {
            system: k,
            name,
            fraction,
        }));
    }
    let total: f64 = systems.iter().map(|s| s.total_m).sum();
    let (added_mm, titration_ph) = if titration {
        let span = titration_span_m(total);
        let t = titration_curve(&p, span, span, TITRATION_POINTS).map_err(text)?;
        (t.added_mmol_per_l, t.ph)
    } else {
        (Vec::new(), Vec::new())
    };
    Ok(PlotData {
        kind: src.kind,
        temperature_c: src.mixture.temperature_c,
        ph: eq.ph,
        ionic_strength: eq.ionic_strength,
        capacity_at_ph: eq.capacity,
        systems,
        grid: curves.ph,
        series,
        capacity_mm: curves.capacity.iter().map(|b| b * 1000.0).collect(),
        added_mm,
        titration_ph,
        shares_at_ph,
    })
}

/// Index of the grid value nearest to `x` (grids are increasing).
pub fn nearest(grid: &[f64], x: f64) -> Option<usize> {
    if grid.is_empty() || !x.is_finite() {
        return None;
    }
    let i = grid.partition_point(|g| *g < x);
    let hi = i.min(grid.len() - 1);
    let lo = i.saturating_sub(1);
    let d = |j: usize| grid.get(j).map_or(f64::INFINITY, |g| (g - x).abs());
    Some(if d(lo) <= d(hi) { lo } else { hi })
}

/// One species' value at a grid point.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesValue {
    /// Legend label.
    pub label: String,
    /// Fraction of the system total.
    pub fraction: f64,
    /// Concentration, mmol/L.
    pub conc_mm: f64,
}

impl PlotData {
    /// Legend label of a series: the species, with the system when several are plotted.
    pub fn label(&self, s: &Series) -> String {
        match self.systems.get(s.system) {
            Some(sys) if self.systems.len() > 1 => format!("{} ({})", s.name, sys.name),
            _ => s.name.clone(),
        }
    }

    /// The headline of the plotted composition: the main species' shares at
    /// the working pH (those of 1 % or more, largest first, at most four) and β.
    pub fn headline(&self) -> String {
        let mut main: Vec<&(usize, String, f64)> = self
            .shares_at_ph
            .iter()
            .filter(|(_, _, f)| *f >= 0.01)
            .collect();
        solver::order::sort_by(&mut main, |a, b| b.2.total_cmp(&a.2));
        let shares = main
            .iter()
            .take(4)
            .map(|(k, name, f)| {
                let name = match self.systems.get(*k) {
                    Some(sys) if self.systems.len() > 1 => format!("{name} ({})", sys.name),
                    _ => name.clone(),
                };
                format!("{name} {}", crate::widgets::format::fmt_pct(*f))
            })
            .collect::<Vec<_>>()
            .join(" · ");
        format!(
            "pH {:.2}: {shares} · β {}",
            self.ph,
            crate::widgets::format::fmt_capacity(self.capacity_at_ph)
        )
    }

    /// Total of a series' system, mmol/L.
    pub fn total_mm(&self, s: &Series) -> f64 {
        self.systems
            .get(s.system)
            .map_or(0.0, |sys| sys.total_m * 1000.0)
    }

    /// Value of a series at grid index `i` in the chosen quantity.
    pub fn value(&self, s: &Series, i: usize, q: Quantity) -> f64 {
        let f = s.fraction.get(i).copied().unwrap_or(f64::NAN);
        match q {
            Quantity::Fraction => f,
            Quantity::Concentration => f * self.total_mm(s),
        }
    }

    /// Every pK with its system index and step number (1-based), sorted by value.
    pub fn pk_marks(&self) -> Vec<(usize, usize, f64)> {
        let mut v: Vec<(usize, usize, f64)> = self
            .systems
            .iter()
            .enumerate()
            .flat_map(|(k, s)| s.pks.iter().enumerate().map(move |(j, pk)| (k, j + 1, *pk)))
            .collect();
        solver::order::sort_by(&mut v, |a, b| a.2.total_cmp(&b.2));
        v
    }

    /// Species values and β at the grid pH nearest `ph`.
    pub fn species_at(&self, ph: f64) -> Option<(f64, Vec<SpeciesValue>, f64)> {
        let i = nearest(&self.grid, ph)?;
        let x = *self.grid.get(i)?;
        let values = self
            .series
            .iter()
            .map(|s| SpeciesValue {
                label: self.label(s),
                fraction: self.value(s, i, Quantity::Fraction),
                conc_mm: self.value(s, i, Quantity::Concentration),
            })
            .collect();
        Some((
            x,
            values,
            self.capacity_mm.get(i).copied().unwrap_or(f64::NAN),
        ))
    }

    /// Titration point nearest an added amount (mmol/L): (added, pH).
    pub fn titration_at(&self, added_mm: f64) -> Option<(f64, f64)> {
        let i = nearest(&self.added_mm, added_mm)?;
        Some((*self.added_mm.get(i)?, *self.titration_ph.get(i)?))
    }

    /// Grid indices every `step` pH (for the tables).
    pub fn table_rows(&self, step: f64) -> Vec<usize> {
        let n = ((PH_MAX - PH_MIN) / step).round() as usize;
        let mut rows: Vec<usize> = (0..=n)
            .filter_map(|k| nearest(&self.grid, PH_MIN + step * k as f64))
            .collect();
        rows.dedup();
        rows
    }

    /// Titration indices for the table (`count` evenly spaced rows).
    pub fn titration_rows(&self, count: usize) -> Vec<usize> {
        let n = self.added_mm.len();
        if n == 0 || count < 2 {
            return Vec::new();
        }
        let mut rows: Vec<usize> = (0..count)
            .map(|k| ((n - 1) as f64 * k as f64 / (count - 1) as f64).round() as usize)
            .collect();
        rows.dedup();
        rows
    }

    /// Largest β worth showing: 1.2 × the highest value over pH 3–11 or at the
    /// working pH, rounded up (outside 3–11, water's own H⁺/OH⁻ capacity would
    /// flatten the buffer's peaks; the curve is cut where it leaves the scale).
    pub fn capacity_ceiling(&self) -> f64 {
        let top = self
            .grid
            .iter()
            .zip(self.capacity_mm.iter())
            .filter(|(x, _)| (3.0..=11.0).contains(*x))
            .map(|(_, b)| *b)
            .chain(std::iter::once(self.capacity_at_ph * 1000.0))
            .filter(|b| b.is_finite())
            .fold(0.0_f64, f64::max);
        nice_ceiling(top * 1.2)
    }

    /// Like [`PlotData::capacity_ceiling`] over pH `lo`–`hi` only (the
    /// recipe's compact plot), still leaving water's own capacity below pH 3
    /// and above 11 out of the scale.
    pub fn capacity_ceiling_between(&self, lo: f64, hi: f64) -> f64 {
        let top = self
            .grid
            .iter()
            .zip(self.capacity_mm.iter())
            .filter(|(x, _)| (lo.max(3.0)..=hi.min(11.0)).contains(*x))
            .map(|(_, b)| *b)
            .chain(std::iter::once(self.capacity_at_ph * 1000.0))
            .filter(|b| b.is_finite())
            .fold(0.0_f64, f64::max);
        nice_ceiling(top * 1.2)
    }

    /// Largest concentration any species reaches, mmol/L.
    pub fn max_total_mm(&self) -> f64 {
        self.systems
            .iter()
            .map(|s| s.total_m * 1000.0)
            .fold(0.0_f64, f64::max)
    }
}

/// Round up to 1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6 or 8 × a power of ten (at least 1e-3).
pub fn nice_ceiling(x: f64) -> f64 {
    if !(x.is_finite() && x > 1e-3) {
        return 1e-3;
    }
    let p = 10f64.powf(x.log10().floor());
    let m = x / p;
    let step = [1.0, 1.2, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0, 10.0]
        .into_iter()
        .find(|s| m <= *s + 1e-9)
        .unwrap_or(10.0);
    step * p
}

/// A number with `sig` significant digits by the solver's printer ([`solver::fmt::sig`]: no
/// exponent for everyday magnitudes, one far from 1); `–` when not finite.
pub fn sig(x: f64, sig: usize) -> String {
    if !x.is_finite() {
        return "–".into();
    }
    solver::fmt::sig(x, i32::try_from(sig).unwrap_or(3))
}

/// Like [`sig`] with trailing zeros after the decimal point dropped ("50", "37", "0.129").
pub fn short(x: f64, digits: usize) -> String {
    if !x.is_finite() {
        return "–".into();
    }
    solver::fmt::sig_trim(x, i32::try_from(digits).unwrap_or(3))
}

/// A concentration in mM for tables and the readout: three significant digits,
/// scientific notation below 0.001 mM.
pub fn conc_text(mm: f64) -> String {
    if mm.is_finite() && mm != 0.0 && mm.abs() < 1e-3 {
        format!("{mm:.2e}")
    } else {
        short(mm, 3)
    }
}

/// Short name of the added reagent for an amount (mmol/L): "HCl" below zero, "NaOH" above.
pub fn added_label(added_mm: f64) -> String {
    if added_mm < 0.0 {
        format!("{} mmol/L HCl", short(-added_mm, 3))
    } else if added_mm > 0.0 {
        format!("{} mmol/L NaOH", short(added_mm, 3))
    } else {
        "nothing added".into()
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;
    use solver::document::demo_design;

    /// The demo design's recipe (phosphate, pH 7.4 at 37 °C) as plot data.
    pub(crate) fn recipe_data() -> PlotData {
        let d = demo_design();
        let src = source(&d).unwrap_or_else(|e| unreachable!("{e}"));
        compute(&src).unwrap_or_else(|e| unreachable!("{e}"))
    }

    /// The demo design's mixture (Tris + Tris·HCl + NaCl).
    pub(crate) fn mixture_data() -> PlotData {
        let mut d = demo_design();
        d.plot_source = PlotSource::Mixture;
        let src = source(&d).unwrap_or_else(|e| unreachable!("{e}"));
        compute(&src).unwrap_or_else(|e| unreachable!("{e}"))
    }

    #[test]
    fn recipe_curves_have_the_expected_shape() {
        let d = recipe_data();
        assert_eq!(d.grid.len(), PH_POINTS);
        assert_eq!(d.systems.len(), 1);
        assert_eq!(d.series.len(), 4, "phosphate has four species");
        assert!(
            (d.ph - 7.4).abs() < 1e-3,
            "recipe hits its target: {}",
            d.ph
        );
        for i in [0, 100, 280, 400, 560] {
            let sum: f64 = d
                .series
                .iter()
                .map(|s| d.value(s, i, Quantity::Fraction))
                .sum();
            assert!((sum - 1.0).abs() < 1e-9, "fractions sum to 1 at {i}: {sum}");
        }
        assert_eq!(d.added_mm.len(), TITRATION_POINTS);
        let (x0, ph0) = d.titration_at(0.0).unwrap_or_default();
        assert!(x0.abs() < 1e-9 && (ph0 - d.ph).abs() < 1e-6);
        assert!(d
            .titration_ph
            .iter()
            .zip(d.titration_ph.iter().skip(1))
            .all(|(a, b)| *b >= *a - 1e-9));
    }

    #[test]
    fn components_of_one_system_are_merged() {
        let d = mixture_data();
        assert_eq!(d.systems.len(), 1, "tris base + tris·HCl are one system");
        assert_eq!(d.series.len(), 2);
        assert!((d.systems.first().map_or(0.0, |s| s.total_m) - 0.05).abs() < 1e-12);
    }

    #[test]
    fn nearest_and_rows() {
        let g = [0.0, 0.5, 1.0, 1.5];
        assert_eq!(nearest(&g, -3.0), Some(0));
        assert_eq!(nearest(&g, 0.74), Some(1));
        assert_eq!(nearest(&g, 0.76), Some(2));
        assert_eq!(nearest(&g, 9.0), Some(3));
        assert_eq!(nearest(&[], 1.0), None);
        let d = recipe_data();
        let rows = d.table_rows(0.5);
        assert_eq!(rows.len(), 29);
        assert_eq!(rows.first().and_then(|i| d.grid.get(*i)), Some(&0.0));
        assert_eq!(d.titration_rows(21).len(), 21);
    }

    #[test]
    fn capacity_ceiling_keeps_the_buffer_peak_in_view() {
        let d = recipe_data();
        let top = d.capacity_ceiling();
        let beta = d.capacity_at_ph * 1000.0;
        assert!(top > beta && top < 3.0 * beta, "ceiling {top} vs β {beta}");
        assert_eq!(nice_ceiling(27.0), 30.0);
        assert_eq!(nice_ceiling(52.0), 60.0);
        assert_eq!(nice_ceiling(2.1), 2.5);
        assert_eq!(nice_ceiling(100.0), 100.0);
    }

    #[test]
    fn formatting() {
        assert_eq!(sig(0.123_456, 3), "0.123");
        assert_eq!(sig(28.81, 3), "28.8");
        assert_eq!(sig(1234.0, 3), "1234");
        // The solver's printer: a tiny capacity keeps its digits instead of 0.000000.
        assert_eq!(sig(2.5e-8, 3), "2.50e-8");
        assert_eq!(short(2.5e-8, 3), "2.5e-8");
        assert_eq!(short(50.0, 3), "50");
        assert_eq!(short(0.1290, 3), "0.129");
        assert_eq!(added_label(-5.0), "5 mmol/L HCl");
        assert_eq!(added_label(12.5), "12.5 mmol/L NaOH");
        assert_eq!(conc_text(0.000106), "1.06e-4");
        assert_eq!(conc_text(35.6), "35.6");
        assert_eq!(added_label(0.0), "nothing added");
    }
}
