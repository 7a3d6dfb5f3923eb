//! A field sample resolved at its temperature and ionic strength (`FieldSample`), the
//! constants kept per temperature (`AtTemperature`, `FieldCache`), and the species that
//! matters for a system: what the reading, the limit, the alkalinity, plots, grids and logs
//! reuse.

use super::ionic::{ionic_from, IonicSource};
use super::seawater::{
    pk_ammonium_seawater, seawater_use, PkModel, SeawaterUse, SEAWATER_S_MAX, SEAWATER_T_MAX_C,
};
use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::{fractions_into, Acid};
use crate::error::{Result, SolverError};
use crate::mixture::lookup;
use crate::system::thermo::system_pks;
use crate::system::{AcidSystem, MAX_STEPS};
use crate::water::{debye_huckel_a, pkw};

/// The species that usually matters for a system (index, reason): the
/// toxic or reactive form a limit is set for.
pub fn target_species(system_id: &str) -> Option<(usize, &'static str)> {
    match system_id {
        "ammonium" => Some((1, "Un-ionized ammonia, the form toxic to fish")),
        "sulfide" => Some((0, "Hydrogen sulfide, the toxic form that escapes as gas")),
        "hypochlorous" => Some((0, "Hypochlorous acid, the stronger disinfectant")),
        "carbonate" => Some((0, "Dissolved (free) CO₂")),
        _ => None,
    }
}

/// What a [`FieldSample`] needs from the temperature alone: the system's
/// thermodynamic pK values, Kw and the Debye–Hückel A. Logs keep these per
/// distinct temperature ([`FieldCache`]) instead of redoing them per row;
/// the numbers are the same either way.
#[derive(Debug, Clone, PartialEq)]
pub struct AtTemperature {
    /// Temperature, °C (checked against 0–60 °C and the system's data).
    pub temperature_c: f64,
    /// Thermodynamic pK values at the temperature (I = 0).
    pub pks: Vec<f64>,
    acid: Acid,
    kw: f64,
    a_dh: f64,
}

impl AtTemperature {
    /// A system's constants at a temperature.
    ///
    /// # Errors
    ///
    /// Temperature outside 0–60 °C or the system's data (field `temperature_c`).
    pub fn new(sys: &AcidSystem, temperature_c: f64) -> Result<Self> {
        let t = crate::limits::FIELD_TEMPERATURE_C.check(temperature_c)?;
        let pks = system_pks(sys, t)?;
        let a_dh = debye_huckel_a(t)?;
        let acid = Acid::from_pks(sys.z0, &pks, 1.0);
        let kw = 10f64.powf(-pkw(t)?);
        Ok(Self {
            temperature_c: t,
            pks,
            acid,
            kw,
            a_dh,
        })
    }

    /// The sample at an ionic strength (Davies).
    pub fn sample(&self, ionic_strength: f64) -> FieldSample {
        FieldSample {
            acid: self.acid,
            kw: self.kw,
            a_dh: self.a_dh,
            gamma1: crate::equilibrium::activity::gamma1(
                ActivityModel::Davies,
                self.a_dh,
                ionic_strength,
            ),
            ionic_strength,
            model: PkModel::Davies,
        }
    }

    /// The sample for an ionic-strength source whose ionic strength is
    /// `ionic` (= [`ionic_from`] of it): the seawater ammonia model when the
    /// source is a salinity in its range, Davies otherwise.
    ///
    /// # Errors
    ///
    /// [`SolverError::Infeasible`] on the source's field when Davies would be
    /// used past its range ([`DAVIES_LIMIT`]): there the fractions are not
    /// just rough but biased (ammonia just past the seawater model's edge
    /// comes out 20–30 % low), so no value is given rather than a wrong one.
    pub fn sample_for_source(
        &self,
        sys: &AcidSystem,
        source: &IonicSource,
        ionic: f64,
    ) -> Result<FieldSample> {
        let mut sample = self.sample(ionic);
        match seawater_use(&sys.id, source, self.temperature_c) {
            SeawaterUse::Within(s) => {
                sample.acid =
                    Acid::from_pks(sys.z0, &[pk_ammonium_seawater(self.temperature_c, s)], 1.0);
                sample.gamma1 = 1.0;
                sample.model = PkModel::CleggWhitfield1995;
            }
            sea if ionic > DAVIES_LIMIT => {
                return Err(beyond_davies(sys, source, ionic, self.temperature_c, sea))
            }
            _ => {}
        }
        Ok(sample)
    }
}

/// The refusal of a reading whose ionic strength is past the Davies range
/// with no salt-water model for it, named on the source's field.
fn beyond_davies(
    sys: &AcidSystem,
    source: &IonicSource,
    ionic: f64,
    temperature_c: f64,
    sea: SeawaterUse,
) -> SolverError {
    let (field, given) = match source {
        IonicSource::Salinity { psu } => ("field.ionic.psu", format!("salinity {psu}")),
        IonicSource::Conductivity { us_cm } => {
            ("field.ionic.us_cm", format!("conductivity {us_cm} µS/cm"))
        }
        IonicSource::Tds { mg_l } => ("field.ionic.mg_l", format!("dissolved solids {mg_l} mg/L")),
        IonicSource::Direct { .. } | IonicSource::Zero => (
            "field.ionic.ionic_strength",
            "the ionic strength".to_string(),
        ),
    };
    let why = if matches!(sea, SeawaterUse::Outside(_)) {
        format!(
            "at {temperature_c} °C this is outside the seawater ammonia model (salinity 0–{SEAWATER_S_MAX} \
             at 0–{SEAWATER_T_MAX_C} °C here), and past the Davies activity model's range \
             (about {DAVIES_LIMIT} mol/L) the un-ionized share would come out 20–30 % low"
        )
    } else {
        format!(
            "this is past the range the Davies activity model holds in (about {DAVIES_LIMIT} \
             mol/L), and {} has no salt-water model here",
            sys.name
        )
    };
    SolverError::Infeasible {
        field: field.into(),
        reason: format!(
            "{given} gives an ionic strength of {ionic:.3} mol/L: {why}. No value is given rather \
             than a wrong one."
        ),
    }
}

/// Most temperatures a [`FieldCache`] keeps (it starts afresh when full).
const CACHE_TEMPERATURES: usize = 512;

/// Temperature constants of one system, kept per distinct temperature (by
/// its exact bits) across the readings of a log. Only successes are kept,
/// so a bad row gives the same error as a single reading.
#[derive(Debug, Clone, Default)]
pub struct FieldCache {
    system: String,
    temperatures: Vec<(u64, AtTemperature)>,
}

impl FieldCache {
    /// An empty cache.
    pub fn new() -> Self {
        Self::default()
    }

    pub(crate) fn at(&mut self, sys: &AcidSystem, temperature_c: f64) -> Result<&AtTemperature> {
        if self.system != sys.id {
            self.system.clone_from(&sys.id);
            self.temperatures.clear();
        }
        let bits = temperature_c.to_bits();
        let i = match self.temperatures.iter().position(|(b, _)| *b == bits) {
            Some(i) => i,
            None => {
                let at = AtTemperature::new(sys, temperature_c)?;
                if self.temperatures.len() >= CACHE_TEMPERATURES {
                    self.temperatures.clear();
                }
                self.temperatures.push((bits, at));
                self.temperatures.len() - 1
            }
        };
        self.temperatures
            .get(i)
            .map(|(_, a)| a)
            .ok_or_else(|| SolverError::Infeasible {
                field: "temperature_c".into(),
                reason: "internal: temperature cache".into(),
            })
    }
}

/// A field sample resolved at its temperature and ionic strength: what the
/// speciation, alkalinity, limit crossing, plots and grids reuse. Built
/// without the mixture machinery (no allocation beyond the pK list) because
/// logs build one per row.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldSample {
    /// The system's constants at the temperature (total 1 mol/L).
    pub acid: Acid,
    /// Ionic product of water at the temperature.
    pub kw: f64,
    /// Debye–Hückel A at the temperature.
    pub a_dh: f64,
    /// γ₁ at the sample's ionic strength (Davies).
    pub gamma1: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// The model of the constants in `acid`: with [`PkModel::Davies`] they
    /// are thermodynamic and `gamma1` applies; with the seawater model they
    /// are already the apparent (stoichiometric) constants and `gamma1` is 1.
    pub model: PkModel,
}

impl FieldSample {
    /// Resolve a system (by id) at a temperature and ionic strength.
    ///
    /// # Errors
    ///
    /// Unknown system, temperature outside 0–60 °C or the system's data.
    pub fn new(
        system: &str,
        temperature_c: f64,
        ionic_strength: f64,
        custom: &[AcidSystem],
    ) -> Result<Self> {
        Self::for_system(lookup(system, custom)?, temperature_c, ionic_strength)
    }

    /// Resolve a system at a temperature and ionic strength.
    ///
    /// # Errors
    ///
    /// Temperature outside 0–60 °C or the system's data (field `temperature_c`).
    pub fn for_system(sys: &AcidSystem, temperature_c: f64, ionic_strength: f64) -> Result<Self> {
        Ok(AtTemperature::new(sys, temperature_c)?.sample(ionic_strength))
    }

    /// Resolve a system at a temperature for an ionic-strength source: the
    /// seawater ammonia model when the source is a salinity in its range
    /// ([`seawater_use`]), Davies at the source's ionic strength otherwise.
    ///
    /// # Errors
    ///
    /// A bad source reading; temperature outside 0–60 °C or the system's
    /// data; an ionic strength past the Davies range with no salt-water
    /// model ([`AtTemperature::sample_for_source`]).
    pub fn for_source(sys: &AcidSystem, temperature_c: f64, source: &IonicSource) -> Result<Self> {
        let ionic = ionic_from(source)?;
        let at = AtTemperature::new(sys, temperature_c)?;
        at.sample_for_source(sys, source, ionic)
    }

    /// Apparent (concentration-scale) pK values at the sample's ionic
    /// strength: pK − (2z+1)·log γ₁ with Davies (z the charge of the base
    /// form), or the seawater model's own constants.
    pub fn apparent_pks(&self, thermodynamic: &[f64]) -> Vec<f64> {
        match self.model {
            PkModel::CleggWhitfield1995 => self.pks(),
            PkModel::Davies => {
                let lg = self.gamma1.log10();
                thermodynamic
                    .iter()
                    .enumerate()
                    .map(|(i, pk)| {
                        let zj = self.acid.z0 - (i as i32 + 1);
                        pk - f64::from(2 * zj + 1) * lg
                    })
                    .collect()
            }
        }
    }

    /// Fractions of every species at `ph` (most protonated first) and their number.
    pub fn fractions(&self, ph: f64) -> ([f64; MAX_STEPS + 1], usize) {
        let mut out = [0.0; MAX_STEPS + 1];
        let n = fractions_into(&self.acid, ph, self.gamma1, &mut out);
        (out, n)
    }

    /// Fraction of species `index` at `ph` (0 when there is no such species).
    pub fn fraction(&self, index: usize, ph: f64) -> f64 {
        let (f, n) = self.fractions(ph);
        if index < n {
            f.get(index).copied().unwrap_or(0.0)
        } else {
            0.0
        }
    }

    /// Thermodynamic pK values at the temperature (I = 0).
    pub fn pks(&self) -> Vec<f64> {
        self.acid
            .ka
            .iter()
            .take(self.acid.n)
            .map(|k| -k.log10())
            .collect()
    }
}
