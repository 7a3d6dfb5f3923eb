//! The log's fast path (constants kept per temperature) against the reference path (one single reading per row), bit for bit, over many rows.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use solver::field::carbonate::AlkalinityUnit;
use solver::field::limit::{Limit, LimitUnit};
use solver::field::log::{LogOptions, LogPlan, RowOutcome};
use solver::field::{IonicSource, TotalUnit};

/// pH cells: the edges of 0–14, just outside them, half-typed and bad cells.
const PH_CELLS: [&str; 16] = [
    "0", "14", "0.0001", "13.9999", "-0.1", "14.1", "7", "4.49", "4.5", "9.25", "", "x", "7,4",
    "1e1", "NaN", "inf",
];

/// Temperature cells: edges of the data, out of range, repeated values (cache hits), empty
/// (falls back to the default).
const T_CELLS: [&str; 10] = ["0", "60", "-1", "61", "25", "25", "", "12.5", "abc", "40"];

/// An invented log of `n` rows cycling through edge cases, with >512 distinct temperatures
/// (the cache starts afresh when full) and salinities in and out of the seawater model's range.
fn log_text(n: usize) -> String {
    let mut s = String::from("label,pH,temp C,total,salinity,cond uS/cm,alkalinity meq/L\n");
    for i in 0..n {
        let ph = if i % 3 == 0 {
            PH_CELLS[i % PH_CELLS.len()].to_string()
        } else {
            format!("{:.3}", (i as f64 * 0.7351) % 14.0)
        };
        let t = if i % 5 == 0 {
            T_CELLS[(i / 5) % T_CELLS.len()].to_string()
        } else {
            format!("{:.2}", (i as f64 * 0.0137) % 45.0)
        };
        let total = match i % 7 {
            0 => String::new(),
            1 => "-1".into(),
            _ => format!("{:.3}", 0.05 + (i % 40) as f64 * 0.11),
        };
        let sal = match i % 11 {
            0 => "35".into(),
            1 => "45".into(),
            2 => "-2".into(),
            3 => format!("{:.1}", (i % 400) as f64 * 0.1),
            _ => String::new(),
        };
        let cond = match i % 13 {
            0 => "-5".into(),
            1 | 2 => String::new(),
            _ => format!("{}", 100 + i % 1500),
        };
        let alk = match i % 17 {
            0 => "0".into(),
            1 => String::new(),
            _ => format!("{:.2}", 0.2 + (i % 30) as f64 * 0.15),
        };
        // Every 97th row has one field too many (an unquoted separator).
        let extra = if i % 97 == 0 { ",oops" } else { "" };
        s.push_str(&format!(
            "r{i},{ph},{t},{total},{sal},{cond},{alk}{extra}\n"
        ));
    }
    s
}

fn options(system: &str, limit: Option<Limit>, alkalinity: bool) -> LogOptions {
    let mut o = LogOptions::new(system);
    o.temperature_c = Some(18.0);
    o.total = Some(1.5);
    o.total_unit = TotalUnit::MgPerLAs;
    o.ionic = IonicSource::Conductivity { us_cm: 300.0 };
    o.alkalinity_unit = AlkalinityUnit::MeqPerL;
    o.limit = limit;
    // An alkalinity replaces the total: one of the two columns is left out.
    let unused = if alkalinity {
        solver::field::log::Role::Total
    } else {
        solver::field::log::Role::Alkalinity
    };
    o.mapping.choices = vec![(unused, "none".into())];
    o
}

/// The outcomes as text: `{:?}` of an f64 is its shortest round-trip form, so equal
/// text means equal numbers, bit for bit (and NaN compares equal to itself).
fn text(o: &[RowOutcome]) -> Vec<String> {
    o.iter().map(|r| format!("{r:?}")).collect()
}

fn check(system: &str, limit: Option<Limit>, alkalinity: bool, rows: usize) {
    let bytes = log_text(rows);
    let plan = LogPlan::new(
        bytes.as_bytes(),
        &options(system, limit, alkalinity),
        &[],
        None,
    )
    .unwrap_or_else(|e| panic!("{system}: {e}"));
    assert_eq!(plan.len(), rows);
    let reference = plan.compute_each(0..rows);
    let fast = plan.compute(0..rows);
    let (a, b) = (text(&reference), text(&fast));
    for (k, (x, y)) in a.iter().zip(&b).enumerate() {
        assert_eq!(x, y, "{system}: row {k} differs");
    }
    assert_eq!(reference, fast);
    // Chunks of any size give the same rows and the same CSV.
    let mut chunked = Vec::new();
    let mut start = 0;
    for size in [1, 7, 100, 250, 3].iter().cycle() {
        if start >= rows {
            break;
        }
        chunked.extend(plan.compute(start..start + size));
        start += size;
    }
    assert_eq!(text(&chunked), a, "{system}: chunked");
    assert_eq!(plan.write_csv(&chunked), plan.write_csv(&reference));
    // The mix really covers good rows, bad rows and limit crossings.
    let ok = reference.iter().filter(|r| r.result.is_ok()).count();
    assert!(ok > rows / 10, "{system}: only {ok} good rows");
    assert!(ok < rows, "{system}: no bad rows");
    if limit.is_some() {
        let crossings = reference
            .iter()
            .filter_map(|r| r.result.as_ref().ok())
            .filter(|r| r.limit.as_ref().is_some_and(|l| l.crossing_ph.is_some()))
            .count();
        assert!(crossings > 0, "{system}: no crossing pH found");
    }
}

#[test]
fn ammonia_rows_equal_single_readings() {
    let limit = Limit {
        value: 20.0,
        unit: LimitUnit::UgPerLNh3,
    };
    check("ammonium", Some(limit), false, 6000);
    check("ammonium", None, false, 1500);
}

#[test]
fn polyprotic_and_alkalinity_rows_equal_single_readings() {
    check(
        "carbonate",
        Some(Limit {
            value: 10.0,
            unit: LimitUnit::MgPerLCo2,
        }),
        true,
        2500,
    );
    check(
        "sulfide",
        Some(Limit {
            value: 2.0,
            unit: LimitUnit::UgPerLS,
        }),
        false,
        2500,
    );
    check(
        "hypochlorous",
        Some(Limit {
            value: 0.5,
            unit: LimitUnit::MgPerLCl2,
        }),
        false,
        1500,
    );
    check("phosphate", None, false, 1500);
}
