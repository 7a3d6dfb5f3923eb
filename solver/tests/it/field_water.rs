//! Field water checks: salinity, alkalinity → carbonate, user limits, plot data, against published formulas.
//!
//! Sources and status of every value are listed in `tests/README.md`.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use solver::document::{demo_design, parse_design, to_json};
use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::limit::{Limit, LimitUnit};
use solver::field::plot::fraction_curves;
use solver::field::{field_reading, ionic_from, FieldSpec, IonicSource, TotalUnit};
use solver::SolverError;

fn spec(system: &str, ph: f64, t: f64, total: Option<f64>, ionic: IonicSource) -> FieldSpec {
    FieldSpec {
        system: system.into(),
        ph,
        temperature_c: t,
        total,
        total_unit: TotalUnit::MgPerLAs,
        ionic,
        alkalinity: None,
        limit: None,
        atmosphere: None,
    }
}

fn field_of(e: &SolverError) -> String {
    match e {
        SolverError::NotFinite { field }
        | SolverError::Negative { field, .. }
        | SolverError::OutOfRange { field, .. }
        | SolverError::Infeasible { field, .. }
        | SolverError::Document { field, .. } => field.clone(),
        other => panic!("unexpected {other:?}"),
    }
}

/// Emerson, Russo, Lund & Thurston (1975) J. Fish. Res. Board Can. 32, 2379:
/// pKa = 0.09018 + 2729.92/T (T in K), confirmed as quoted in secondary sources.
fn emerson_pka(t_c: f64) -> f64 {
    0.09018 + 2729.92 / (t_c + 273.15)
}

// Atomic weights, CIAAW 2021 abridged (confirmed, REFERENCE-DATA §4).
const H: f64 = 1.008;
const C: f64 = 12.011;
const N: f64 = 14.007;
const O: f64 = 15.999;
const S: f64 = 32.06;
const CA: f64 = 40.078;

// ---------------------------------------------------------------- salinity

#[test]
fn salinity_gives_dickson_ionic_strength() {
    // Dickson, Sabine & Christian (2007) PICES Spec. Publ. 3, ch. 5:
    // I = 19.924 S / (1000 − 1.005 S), recomputed here.
    for s in [0.0, 5.0, 20.0, 35.0, 40.0, 50.0] {
        let want = 19.924 * s / (1000.0 - 1.005 * s);
        let got = ionic_from(&IonicSource::Salinity { psu: s }).unwrap();
        assert!((got - want).abs() < 1e-12, "S = {s}: {got}");
    }
    // Common practice: seawater of S = 35 has I ≈ 0.72 mol/kg.
    let sw = ionic_from(&IonicSource::Salinity { psu: 35.0 }).unwrap();
    assert!((sw - 0.72).abs() < 0.01, "{sw}");
}

#[test]
fn absurd_salinity_is_refused_with_its_path() {
    for s in [-0.1, 50.1, f64::NAN, f64::INFINITY] {
        let e = ionic_from(&IonicSource::Salinity { psu: s }).unwrap_err();
        assert_eq!(field_of(&e), "ionic.psu", "{s}");
        let r = field_reading(
            &spec(
                "ammonium",
                8.0,
                20.0,
                None,
                IonicSource::Salinity { psu: s },
            ),
            &[],
        );
        assert_eq!(field_of(&r.unwrap_err()), "ionic.psu");
    }
    let mut d = demo_design();
    d.field.ionic = IonicSource::Salinity { psu: 60.0 };
    let e = parse_design(&to_json(&d)).unwrap_err();
    assert_eq!(field_of(&e), "field.ionic.psu");
}

/// Past the Davies range with no salt-water model, no value is given: the
/// Davies equation turns over past I ≈ 0.5 (Davies 1962; common practice
/// puts its range at 0.1–0.5 mol/L), so a number there is biased, not rough.
#[test]
fn seawater_without_a_seawater_model_is_refused_not_guessed() {
    // Sulfide at S = 35 → I ≈ 0.72, past the Davies range (0.5), and no
    // seawater model for sulfide. (Ammonia has one: seawater_ammonia.rs.)
    let e = field_reading(
        &spec(
            "sulfide",
            8.1,
            20.0,
            Some(1.0),
            IonicSource::Salinity { psu: 35.0 },
        ),
        &[],
    )
    .unwrap_err();
    assert_eq!(e.field(), Some("field.ionic.psu"));
    let text = e.to_string();
    assert!(
        text.contains("0.7") && text.contains("no salt-water model") && text.contains("No value"),
        "{text}"
    );
    // Any source past the range is refused on its own field; just below the
    // range the value is given.
    for (source, field) in [
        (
            IonicSource::Direct {
                ionic_strength: 0.6,
            },
            "field.ionic.ionic_strength",
        ),
        (IonicSource::Tds { mg_l: 30_000.0 }, "field.ionic.mg_l"),
        (
            IonicSource::Conductivity { us_cm: 40_000.0 },
            "field.ionic.us_cm",
        ),
    ] {
        let e = field_reading(&spec("sulfide", 7.0, 20.0, None, source), &[]).unwrap_err();
        assert_eq!(e.field(), Some(field));
    }
    assert!(field_reading(
        &spec(
            "sulfide",
            7.0,
            20.0,
            None,
            IonicSource::Direct {
                ionic_strength: 0.49
            }
        ),
        &[],
    )
    .is_ok());
    let r = field_reading(
        &spec(
            "sulfide",
            8.1,
            20.0,
            None,
            IonicSource::Salinity { psu: 5.0 },
        ),
        &[],
    )
    .unwrap();
    assert!(!r.warnings.iter().any(|w| w.contains("indicative")));
    // Brackish water still says which pH scale is assumed.
    assert!(r.warnings.iter().any(|w| w.contains("pH scales")));
}

#[test]
fn ionic_strength_raises_the_apparent_pk_of_ammonium_by_davies() {
    // NH4+ -> NH3 + H+: apparent pK on the activity pH scale is pK − log γ₁
    // (an ionic strength given directly: no seawater model).
    let i: f64 = 19.924 * 20.0 / (1000.0 - 1.005 * 20.0);
    let r = field_reading(
        &spec(
            "ammonium",
            8.0,
            25.0,
            None,
            IonicSource::Direct { ionic_strength: i },
        ),
        &[],
    )
    .unwrap();
    // Davies (1962), A = 0.5085 at 25 °C (confirmed table).
    let log_g1 = -0.5085 * (i.sqrt() / (1.0 + i.sqrt()) - 0.3 * i);
    let want = emerson_pka(25.0) - log_g1;
    assert!((r.apparent_pks[0] - want).abs() < 1e-9);
    let f = 1.0 / (10f64.powf(want - 8.0) + 1.0);
    assert!((r.species[1].fraction - f).abs() < 1e-12);
}

// ---------------------------------------------------------------- Emerson

#[test]
fn emerson_fractions_at_several_ph_and_temperatures() {
    // Fraction NH3 = 1/(10^(pKa − pH) + 1), Emerson et al. (1975), I = 0.
    for t in [0.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0] {
        for ph in [6.5, 7.0, 7.5, 8.0, 8.5, 9.0, 9.5] {
            let r = field_reading(&spec("ammonium", ph, t, None, IonicSource::Zero), &[]).unwrap();
            let want = 1.0 / (10f64.powf(emerson_pka(t) - ph) + 1.0);
            let got = r.species[1].fraction;
            assert!(
                (got - want).abs() < 1e-9 * want.max(1e-3),
                "{t} °C pH {ph}: {got} vs {want}"
            );
        }
    }
}

#[test]
fn reporting_bases_follow_molar_masses() {
    // 1 mg/L total ammonia as N at pH 8, 20 °C: NH3 as N and as NH3.
    let r = field_reading(
        &spec("ammonium", 8.0, 20.0, Some(1.0), IonicSource::Zero),
        &[],
    )
    .unwrap();
    let f = 1.0 / (10f64.powf(emerson_pka(20.0) - 8.0) + 1.0);
    let nh3 = &r.species[1];
    assert_eq!(nh3.amounts[0].basis, "N");
    assert_eq!(nh3.amounts[1].basis, "NH₃");
    assert!((nh3.amounts[0].mg_l - f).abs() < 1e-12);
    assert!((nh3.amounts[1].mg_l - f * (N + 3.0 * H) / N).abs() < 1e-9);
    // Sulfide as S and as H2S; carbonate as C and CO2 (molar basis) and CaCO3.
    let r = field_reading(
        &spec("sulfide", 7.0, 20.0, Some(2.0), IonicSource::Zero),
        &[],
    )
    .unwrap();
    let h2s = &r.species[0];
    assert!((h2s.amounts[1].mg_l / h2s.amounts[0].mg_l - (2.0 * H + S) / S).abs() < 1e-9);
    let r = field_reading(
        &spec("carbonate", 7.0, 20.0, Some(12.011), IonicSource::Zero),
        &[],
    )
    .unwrap();
    let total_co2: f64 = r.species.iter().map(|s| s.amounts[2].mg_l).sum();
    // As CaCO₃ each species is on its equivalents, with the trade's usual
    // factors (common practice): CO₂ × 2.27, HCO₃⁻ × 0.82, CO₃²⁻ × 1.67 mg
    // per mg of the species itself (two decimals: 1 % tolerance).
    for (j, factor, own) in [
        (0, 2.27, C + 2.0 * O),
        (1, 0.82, H + C + 3.0 * O),
        (2, 1.67, C + 3.0 * O),
    ] {
        let sp = &r.species[j];
        let own_mg = sp.conc_m.unwrap() * own * 1000.0;
        let got = sp.amounts[1].mg_l / own_mg;
        assert!(
            (got / factor - 1.0).abs() < 0.01,
            "species {j}: {got} vs {factor}"
        );
    }
    assert!((total_co2 - (C + 2.0 * O)).abs() < 1e-6);
    // Chlorine as Cl2 only.
    let r = field_reading(
        &spec("hypochlorous", 7.5, 20.0, Some(1.0), IonicSource::Zero),
        &[],
    )
    .unwrap();
    assert_eq!(r.species[0].amounts.len(), 1);
    assert_eq!(r.species[0].amounts[0].basis, "Cl₂");
}

// ---------------------------------------------------------------- alkalinity

/// Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46, 1011, log K =
/// a + bT + c/T + d log10 T + e/T² (confirmed, REFERENCE-DATA §2).
fn pb(k: [f64; 5], t_c: f64) -> f64 {
    let t = t_c + 273.15;
    10f64.powf(k[0] + k[1] * t + k[2] / t + k[3] * t.log10() + k[4] / (t * t))
}
const PB_K1: [f64; 5] = [-356.3094, -0.06091964, 21834.37, 126.8339, -1684915.0];
const PB_K2: [f64; 5] = [-107.8871, -0.03252849, 5151.79, 38.92561, -563713.9];

/// Exact carbonate alkalinity solution, computed directly: returns
/// (DIC mol/L, [CO2], [HCO3-], [CO3--]).
fn exact_carbonate(ph: f64, t_c: f64, pkw: f64, a_dh: f64, i: f64, ta: f64) -> [f64; 4] {
    let g1 = 10f64.powf(-a_dh * (i.sqrt() / (1.0 + i.sqrt()) - 0.3 * i));
    let g2 = g1.powi(4);
    let ah = 10f64.powf(-ph);
    let (k1, k2, kw) = (pb(PB_K1, t_c), pb(PB_K2, t_c), 10f64.powf(-pkw));
    let h = ah / g1;
    let oh = kw / (ah * g1);
    // [HCO3] = K1 [CO2] / (aH γ1); [CO3] = K2 γ1 [HCO3] / (aH γ2).
    let r1 = k1 / (ah * g1);
    let r2 = k2 * g1 / (ah * g2);
    // TA − OH + H = [CO2](r1 + 2 r1 r2)
    let co2 = (ta - oh + h) / (r1 + 2.0 * r1 * r2);
    let hco3 = co2 * r1;
    let co3 = hco3 * r2;
    [co2 + hco3 + co3, co2, hco3, co3]
}

fn with_alk(ph: f64, t: f64, ionic: IonicSource, value: f64, unit: AlkalinityUnit) -> FieldSpec {
    let mut s = spec("carbonate", ph, t, None, ionic);
    s.alkalinity = Some(Alkalinity { value, unit });
    s
}

#[test]
fn alkalinity_matches_an_exact_independent_computation() {
    // 25 °C, I = 0: pKw 13.995 (CRC Handbook, Bandura & Lvov 2006, confirmed);
    // 10 °C, I = 0.01: pKw from the library's Bandura–Lvov and A = 0.4960
    // (confirmed table).
    let cases = [
        (25.0, 0.0, 13.995, 0.5085),
        (10.0, 0.01, solver::water::pkw(10.0).unwrap(), 0.4960),
    ];
    for (t, i, pkw, a) in cases {
        for ph in [5.5, 6.5, 7.2, 8.0, 8.3, 9.0, 10.0] {
            let ta_meq = 2.5;
            let r = field_reading(
                &with_alk(
                    ph,
                    t,
                    IonicSource::Direct { ionic_strength: i },
                    ta_meq,
                    AlkalinityUnit::MeqPerL,
                ),
                &[],
            )
            .unwrap();
            let c = r.carbonate.as_ref().unwrap();
            let [dic, co2, hco3, co3] = exact_carbonate(ph, t, pkw, a, i, ta_meq / 1000.0);
            let rel = |got: f64, want: f64| ((got - want) / want).abs();
            // 2e-4: the 25 °C pKw is the rounded table value; the rest is exact.
            assert!(rel(c.dic_mmol_l, dic * 1000.0) < 2e-4, "{t} {ph}");
            assert!(rel(c.free_co2_mg_l, co2 * (C + 2.0 * O) * 1000.0) < 2e-4);
            assert!(rel(c.hco3_mg_l, hco3 * (H + C + 3.0 * O) * 1000.0) < 2e-4);
            assert!(rel(c.co3_mg_l, co3 * (C + 3.0 * O) * 1000.0) < 2e-4);
            // The species rows carry the same DIC.
            let total: f64 = r.species.iter().map(|s| s.conc_m.unwrap()).sum();
            assert!(rel(total, dic) < 2e-4);
        }
    }
}

#[test]
fn free_co2_agrees_with_standard_methods_calculation() {
    // Standard Methods 4500-CO2 D (calculation from pH and total alkalinity,
    // 25 °C, low-TDS water), formulas from memory:
    //   bicarbonate alkalinity B = (T − 5.0×10^(pH−10)) / (1 + 0.94×10^(pH−10))  (mg/L as CaCO3)
    //   carbonate alkalinity = 0.94 B 10^(pH−10);  free CO2 = 2.0 B 10^(6−pH)  (mg/L)
    // Its rounded constants (2.0, 0.94, 5.0) differ from the exact ones by up to ~2 %,
    // so the tolerance is 3 %.
    let t_alk = 100.0; // mg/L as CaCO3
    for ph in [6.5, 7.0, 7.5, 8.0, 8.5, 9.0] {
        let r = field_reading(
            &with_alk(
                ph,
                25.0,
                IonicSource::Zero,
                t_alk,
                AlkalinityUnit::MgPerLCaco3,
            ),
            &[],
        )
        .unwrap();
        let c = r.carbonate.unwrap();
        let x = 10f64.powf(ph - 10.0);
        let b = (t_alk - 5.0 * x) / (1.0 + 0.94 * x);
        let free = 2.0 * b * 10f64.powf(6.0 - ph);
        assert!(
            ((c.free_co2_mg_l - free) / free).abs() < 0.03,
            "pH {ph}: {} vs SM {free}",
            c.free_co2_mg_l
        );
        // Bicarbonate as CaCO3 (equivalent basis: 50.04 mg per meq).
        let eq_caco3 = (CA + C + 3.0 * O) / 2.0;
        let hco3_as_caco3 = c.hco3_mg_l / (H + C + 3.0 * O) * eq_caco3;
        assert!(((hco3_as_caco3 - b) / b).abs() < 0.03, "pH {ph}");
        // The species rows "as CaCO₃" report the same alkalinity figures the
        // method does (HCO₃⁻ on its one equivalent, not one CaCO₃ per carbon).
        let as_caco3 = |j: usize| {
            r.species[j]
                .amounts
                .iter()
                .find(|a| a.basis == "CaCO₃")
                .unwrap()
                .mg_l
        };
        assert!(
            ((as_caco3(1) - b) / b).abs() < 0.03,
            "pH {ph}: {} vs {b}",
            as_caco3(1)
        );
        if ph >= 8.5 {
            let co3_as_caco3 = c.co3_mg_l / (C + 3.0 * O) * 2.0 * eq_caco3;
            let sm = 0.94 * b * x;
            assert!(((co3_as_caco3 - sm) / sm).abs() < 0.03, "pH {ph}");
            assert!(((as_caco3(2) - sm) / sm).abs() < 0.03, "pH {ph}");
        }
    }
}

#[test]
fn alkalinity_the_ph_cannot_support_is_refused() {
    // Below the titration end point (pH 4.5, common practice) a positive
    // measured alkalinity is contradictory.
    let e = field_reading(
        &with_alk(4.2, 20.0, IonicSource::Zero, 0.5, AlkalinityUnit::MeqPerL),
        &[],
    )
    .unwrap_err();
    assert_eq!(field_of(&e), "alkalinity");
    assert!(e.to_string().contains("end point"), "{e}");
    // pH 11 at 25 °C: OH⁻ ≈ 1 meq/L alone exceeds 0.2 meq/L → negative DIC.
    let e = field_reading(
        &with_alk(11.0, 25.0, IonicSource::Zero, 0.2, AlkalinityUnit::MeqPerL),
        &[],
    )
    .unwrap_err();
    assert_eq!(field_of(&e), "alkalinity");
    assert!(e.to_string().contains("negative carbon"), "{e}");
    // Zero alkalinity at pH 3 would need > 1 mol/L of CO2.
    let e = field_reading(
        &with_alk(3.0, 25.0, IonicSource::Zero, 0.0, AlkalinityUnit::MeqPerL),
        &[],
    )
    .unwrap_err();
    assert_eq!(field_of(&e), "alkalinity");
    // Negative, absurd, wrong system, both total and alkalinity.
    let e = field_reading(
        &with_alk(7.0, 20.0, IonicSource::Zero, -1.0, AlkalinityUnit::MeqPerL),
        &[],
    )
    .unwrap_err();
    assert_eq!(field_of(&e), "alkalinity.value");
    let e = field_reading(
        &with_alk(
            7.0,
            20.0,
            IonicSource::Zero,
            20000.0,
            AlkalinityUnit::MgPerLCaco3,
        ),
        &[],
    )
    .unwrap_err();
    assert_eq!(field_of(&e), "alkalinity.value");
    let mut s = with_alk(7.0, 20.0, IonicSource::Zero, 1.0, AlkalinityUnit::MeqPerL);
    s.system = "ammonium".into();
    assert_eq!(field_of(&field_reading(&s, &[]).unwrap_err()), "alkalinity");
    let mut s = with_alk(7.0, 20.0, IonicSource::Zero, 1.0, AlkalinityUnit::MeqPerL);
    s.total = Some(12.0);
    assert_eq!(field_of(&field_reading(&s, &[]).unwrap_err()), "alkalinity");
    // Zero alkalinity at pH 5.6 is CO2 in pure water: DIC from [H+] − [OH-].
    let r = field_reading(
        &with_alk(5.6, 25.0, IonicSource::Zero, 0.0, AlkalinityUnit::MeqPerL),
        &[],
    )
    .unwrap();
    assert!(r.carbonate.unwrap().dic_mmol_l > 0.0);
}

// ---------------------------------------------------------------- limits

fn with_limit(mut s: FieldSpec, value: f64, unit: LimitUnit) -> FieldSpec {
    s.limit = Some(Limit { value, unit });
    s
}

#[test]
fn ammonia_limit_within_over_and_crossing_ph() {
    // 1 mg/L total ammonia as N, 20 °C, I = 0; a user's limit of 0.02 mg/L NH3.
    let pka = emerson_pka(20.0);
    let nh3_per_n = (N + 3.0 * H) / N;
    let wanted = 0.02 / nh3_per_n; // fraction that holds exactly the limit
    let crossing = pka + (wanted / (1.0 - wanted)).log10();
    for (ph, over) in [(7.5, false), (8.5, true)] {
        let s = with_limit(
            spec("ammonium", ph, 20.0, Some(1.0), IonicSource::Zero),
            0.02,
            LimitUnit::MgPerLNh3,
        );
        let l = field_reading(&s, &[]).unwrap().limit.unwrap();
        let f = 1.0 / (10f64.powf(pka - ph) + 1.0);
        assert!((l.value_mg_l - f * nh3_per_n).abs() < 1e-9);
        assert_eq!(l.exceeded, over);
        assert!((l.margin - (0.02 - l.value_mg_l)).abs() < 1e-15);
        assert!((l.crossing_ph.unwrap() - crossing).abs() < 1e-9);
        assert!(l.rises_with_ph);
        assert_eq!(l.basis, "NH₃");
    }
    // The same limit in µg/L, and as N, crosses at the same pH.
    let s = with_limit(
        spec("ammonium", 7.5, 20.0, Some(1.0), IonicSource::Zero),
        20.0,
        LimitUnit::UgPerLNh3,
    );
    let l = field_reading(&s, &[]).unwrap().limit.unwrap();
    assert!((l.crossing_ph.unwrap() - crossing).abs() < 1e-9);
    let s = with_limit(
        spec("ammonium", 7.5, 20.0, Some(1.0), IonicSource::Zero),
        0.02 / nh3_per_n,
        LimitUnit::MgPerLN,
    );
    let l = field_reading(&s, &[]).unwrap().limit.unwrap();
    assert!((l.crossing_ph.unwrap() - crossing).abs() < 1e-9);
}

#[test]
fn falling_forms_cross_the_other_way() {
    // H2S: fraction 1/(1 + 10^(pH − pK)); limit 0.5 of 1 mg/L S as S at 20 °C.
    let s = with_limit(
        spec("sulfide", 6.0, 20.0, Some(1.0), IonicSource::Zero),
        0.5,
        LimitUnit::MgPerLS,
    );
    let r = field_reading(&s, &[]).unwrap();
    let l = r.limit.unwrap();
    assert!(!l.rises_with_ph);
    assert!(l.exceeded);
    // fraction 0.5 is at pH = pK.
    assert!((l.crossing_ph.unwrap() - r.pks[0]).abs() < 1e-9);
    // HOCl as Cl2 from free chlorine: crossing where HOCl = limit.
    let s = with_limit(
        spec("hypochlorous", 7.0, 20.0, Some(2.0), IonicSource::Zero),
        1.0,
        LimitUnit::MgPerLCl2,
    );
    let r = field_reading(&s, &[]).unwrap();
    let l = r.limit.unwrap();
    assert!((l.crossing_ph.unwrap() - r.pks[0]).abs() < 1e-9);
    assert!(l.exceeded);
}

#[test]
fn limit_out_of_reach_has_no_crossing() {
    // A limit above the whole total cannot be crossed at any pH.
    let s = with_limit(
        spec("ammonium", 8.0, 20.0, Some(0.1), IonicSource::Zero),
        1.0,
        LimitUnit::MgPerLNh3,
    );
    let l = field_reading(&s, &[]).unwrap().limit.unwrap();
    assert!(!l.exceeded);
    assert_eq!(l.crossing_ph, None);
    assert!(l.ratio < 1.0);
    // A zero total has no crossing either.
    let s = with_limit(
        spec("ammonium", 8.0, 20.0, Some(0.0), IonicSource::Zero),
        1.0,
        LimitUnit::MgPerLNh3,
    );
    let l = field_reading(&s, &[]).unwrap().limit.unwrap();
    assert_eq!(l.crossing_ph, None);
    assert_eq!(l.value_mg_l, 0.0);
}

#[test]
fn carbonate_limit_crosses_at_the_same_dic() {
    let mut s = with_alk(7.0, 15.0, IonicSource::Zero, 2.0, AlkalinityUnit::MeqPerL);
    s.limit = Some(Limit {
        value: 10.0,
        unit: LimitUnit::MgPerLCo2,
    });
    let r = field_reading(&s, &[]).unwrap();
    let dic = r.carbonate.as_ref().unwrap().dic_mmol_l;
    let l = r.limit.unwrap();
    assert!((l.value_mg_l - r.carbonate.as_ref().unwrap().free_co2_mg_l).abs() < 1e-9);
    let at = l.crossing_ph.unwrap();
    let back = field_reading(
        &FieldSpec {
            total: Some(dic),
            total_unit: TotalUnit::MmolPerL,
            ph: at,
            alkalinity: None,
            limit: None,
            ..s.clone()
        },
        &[],
    )
    .unwrap();
    let co2 = back.species[0].amounts[2].mg_l;
    assert!((co2 - 10.0).abs() < 1e-6, "{co2}");
}

#[test]
fn limits_that_do_not_fit_are_refused() {
    let base = spec("sulfide", 7.0, 20.0, Some(1.0), IonicSource::Zero);
    let e = field_reading(&with_limit(base.clone(), 0.02, LimitUnit::MgPerLNh3), &[]).unwrap_err();
    assert_eq!(field_of(&e), "limit.unit");
    for v in [0.0, -1.0, f64::NAN, 1e7] {
        let e = field_reading(&with_limit(base.clone(), v, LimitUnit::MgPerLH2s), &[]).unwrap_err();
        assert_eq!(field_of(&e), "limit.value", "{v}");
    }
    let mut no_total = with_limit(base, 0.02, LimitUnit::MgPerLH2s);
    no_total.total = None;
    assert_eq!(
        field_of(&field_reading(&no_total, &[]).unwrap_err()),
        "limit"
    );
    // Through a design document the paths are prefixed.
    let mut d = demo_design();
    d.field.limit = Some(Limit {
        value: 0.02,
        unit: LimitUnit::MgPerLCo2,
    });
    assert_eq!(
        field_of(&parse_design(&to_json(&d)).unwrap_err()),
        "field.limit.unit"
    );
}

// ---------------------------------------------------------------- plot data

#[test]
fn plot_curves_equal_single_readings() {
    let s = spec(
        "ammonium",
        8.0,
        20.0,
        None,
        IonicSource::Conductivity { us_cm: 800.0 },
    );
    let c = fraction_curves(&s, &[], None, 0.0, 14.0, 200).unwrap();
    assert_eq!(c.ph.len(), 200);
    assert_eq!(c.species, "NH₃");
    let temps: Vec<f64> = c.curves.iter().map(|k| k.temperature_c).collect();
    assert_eq!(temps, vec![15.0, 20.0, 25.0]);
    for (k, curve) in c.curves.iter().enumerate() {
        for j in [0, 57, 114, 199] {
            let mut one = s.clone();
            one.ph = c.ph[j];
            one.temperature_c = temps[k];
            let r = field_reading(&one, &[]).unwrap();
            assert!((curve.fraction[j] - r.species[1].fraction).abs() < 1e-14);
        }
    }
    // HOCl data stop at 35 °C: the warm side curve of a 33 °C sample is left out.
    let h = spec("hypochlorous", 7.5, 33.0, None, IonicSource::Zero);
    let c = fraction_curves(&h, &[], None, 4.0, 11.0, 200).unwrap();
    assert_eq!(c.curves.len(), 2);
    assert_eq!(c.skipped_temperatures_c, vec![38.0]);
    // Bad arguments are named.
    assert_eq!(
        field_of(&fraction_curves(&h, &[], None, 9.0, 4.0, 200).unwrap_err()),
        "ph_hi"
    );
    assert_eq!(
        field_of(&fraction_curves(&h, &[], None, 4.0, 9.0, 1).unwrap_err()),
        "points"
    );
    let p = spec("phosphate", 7.0, 20.0, None, IonicSource::Zero);
    assert_eq!(
        field_of(&fraction_curves(&p, &[], None, 4.0, 9.0, 50).unwrap_err()),
        "species"
    );
    assert!(fraction_curves(&p, &[], Some(2), 4.0, 9.0, 50).is_ok());
}

// ---------------------------------------------------------------- documents

#[test]
fn new_reading_parts_round_trip_and_refuse_unknown_keys() {
    let mut d = demo_design();
    d.field = with_alk(
        7.8,
        12.0,
        IonicSource::Salinity { psu: 8.0 },
        95.0,
        AlkalinityUnit::MgPerLCaco3,
    );
    d.field.limit = Some(Limit {
        value: 20.0,
        unit: LimitUnit::MgPerLCo2,
    });
    let j = to_json(&d);
    assert!(
        j.contains(r#""ionic":{"kind":"salinity","psu":8.0}"#),
        "{j}"
    );
    assert!(j.contains(r#""alkalinity":{"value":95.0,"unit":"mg_per_l_caco3"}"#));
    assert!(j.contains(r#""limit":{"value":20.0,"unit":"mg_per_l_co2"}"#));
    assert_eq!(parse_design(&j).unwrap(), d);
    // Older documents without the new keys still open (and do not gain them).
    let old = to_json(&demo_design());
    assert!(!old.contains("alkalinity") && !old.contains("\"limit\""));
    assert!(parse_design(&old).is_ok());
    // Unknown keys inside the new parts are refused.
    for bad in [
        j.replace(r#""psu":8.0"#, r#""psu":8.0,"scale":"total""#),
        j.replace(
            r#""unit":"mg_per_l_caco3""#,
            r#""unit":"mg_per_l_caco3","x":1"#,
        ),
        j.replace(
            r#""unit":"mg_per_l_co2""#,
            r#""unit":"mg_per_l_co2","legal":true"#,
        ),
        j.replace(r#""unit":"mg_per_l_co2""#, r#""unit":"ppm""#),
    ] {
        let e = parse_design(&bad).unwrap_err();
        assert!(field_of(&e).starts_with("field."), "{e}");
    }
}

#[test]
fn totals_in_every_trade_basis_give_the_same_water() {
    // 1 mg/L as N = 17.031/14.007 mg/L as NH3; 1 mg/L as S = 34.076/32.06 mg/L
    // as H2S; 1 mg/L as C = 100.086/12.011 mg/L as CaCO3 = 44.009/12.011 as CO2
    // (one formula unit per unit of the system; CIAAW 2021 weights).
    let cases = [
        ("ammonium", 8.0, TotalUnit::MgPerLNh3, (N + 3.0 * H) / N),
        ("sulfide", 7.0, TotalUnit::MgPerLH2s, (2.0 * H + S) / S),
        (
            "carbonate",
            7.0,
            TotalUnit::MgPerLCaco3,
            (CA + C + 3.0 * O) / C,
        ),
        ("carbonate", 7.0, TotalUnit::MgPerLCo2, (C + 2.0 * O) / C),
    ];
    for (system, ph, unit, ratio) in cases {
        let first =
            field_reading(&spec(system, ph, 20.0, Some(1.0), IonicSource::Zero), &[]).unwrap();
        let mut s = spec(system, ph, 20.0, Some(ratio), IonicSource::Zero);
        s.total_unit = unit;
        let other = field_reading(&s, &[]).unwrap();
        for (a, b) in first.species.iter().zip(&other.species) {
            let (a, b) = (a.conc_m.unwrap(), b.conc_m.unwrap());
            assert!(
                (a - b).abs() < 1e-9 * a.max(1e-12),
                "{system} {unit:?}: {a} vs {b}"
            );
        }
    }
    // A basis of another system is refused on `total_unit`.
    let mut s = spec("sulfide", 7.0, 20.0, Some(1.0), IonicSource::Zero);
    s.total_unit = TotalUnit::MgPerLNh3;
    assert_eq!(field_of(&field_reading(&s, &[]).unwrap_err()), "total_unit");
    // The JSON names are stable.
    let j = serde_json::to_string(&TotalUnit::MgPerLCaco3).unwrap();
    assert_eq!(j, r#""mg_per_l_caco3""#);
}
