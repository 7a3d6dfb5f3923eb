//! Tests of the calibration fit: slope, offset, residuals, verdicts and a sample's pH.
use super::*;

fn pt(s: &str, mv: f64) -> CalPoint {
    CalPoint {
        standard: s.into(),
        mv: Some(mv),
        displayed_ph: None,
        lot: String::new(),
    }
}

fn spec(t: f64, points: Vec<CalPoint>) -> CalibrationSpec {
    CalibrationSpec {
        temperature_c: t,
        points,
        ..Default::default()
    }
}

#[test]
fn signed_never_prints_minus_zero() {
    assert_eq!(signed(-0.0001, 3), "+0.000");
    assert_eq!(signed(-0.0006, 3), "-0.001");
    assert_eq!(signed(2.5, 1), "+2.5");
}

#[test]
fn one_point_is_refused() {
    let e = fit_calibration(&spec(25.0, vec![pt("borax", -130.0)])).unwrap_err();
    assert!(e.to_string().starts_with("calibration.points:"), "{e}");
}

#[test]
fn close_standards_are_refused_naming_the_second() {
    let e = fit_calibration(&spec(
        25.0,
        vec![pt("citrate", 190.0), pt("phthalate", 175.0)],
    ))
    .unwrap_err()
    .to_string();
    assert!(
        e.starts_with("calibration.points[1].standard") && e.contains("ill-defined"),
        "{e}"
    );
}

#[test]
fn a_wrong_point_is_named() {
    // Phosphate and borax on a good electrode; the phthalate reading is
    // that of the borax buffer (swapped bottles).
    let s = -59.16;
    let mv = |ph: f64| s * (ph - 7.0);
    let e = fit_calibration(&spec(
        25.0,
        vec![
            pt("phosphate_1_1", mv(6.865)),
            pt("borax", mv(9.180)),
            pt("phthalate", mv(9.180) + 400.0),
        ],
    ))
    .unwrap_err()
    .to_string();
    assert!(e.starts_with("calibration.points[2].mv"), "{e}");
}

#[test]
fn mv_out_of_bounds_and_unknown_standard() {
    let e = fit_calibration(&spec(
        25.0,
        vec![pt("borax", -2500.0), pt("phthalate", 170.0)],
    ))
    .unwrap_err()
    .to_string();
    assert!(e.starts_with("calibration.points[0].mv"), "{e}");
    let e = fit_calibration(&spec(
        25.0,
        vec![pt("lemonade", 0.0), pt("phthalate", 170.0)],
    ))
    .unwrap_err()
    .to_string();
    assert!(e.starts_with("calibration.points[0].standard"), "{e}");
}

#[test]
fn displayed_ph_is_read_as_an_ideal_unadjusted_meter() {
    let mut p = pt("phosphate_1_1", 0.0);
    p.mv = None;
    p.displayed_ph = Some(7.0);
    let mut q = pt("phthalate", 0.0);
    q.mv = None;
    q.displayed_ph = Some(4.0);
    let f = fit_calibration(&spec(25.0, vec![p, q])).unwrap();
    assert!((f.points[0].mv - 0.0).abs() < 1e-12);
    assert!((f.points[1].mv - 3.0 * nernst_mv_per_ph(25.0)).abs() < 1e-9);
}

#[test]
fn technical_buffer_is_interpolated_and_refused_outside() {
    let b = TechnicalBuffer {
        id: "lab_ph10".into(),
        name: "Lab pH 10".into(),
        values: vec![
            BottleValue {
                temperature_c: 30.0,
                ph: 9.96,
            },
            BottleValue {
                temperature_c: 10.0,
                ph: 10.18,
            },
        ],
        u95_ph: None,
    };
    let (ph, u) = buffer_ph("lab_ph10", 20.0, std::slice::from_ref(&b), "f", "t").unwrap();
    assert!((ph - 10.07).abs() < 1e-12 && (u - 0.02).abs() < 1e-12);
    let e = buffer_ph("lab_ph10", 35.0, &[b], "f", "t")
        .unwrap_err()
        .to_string();
    assert!(e.contains("10 to 30"), "{e}");
}
