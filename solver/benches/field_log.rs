//! Criterion benchmarks of field logs: 10,000 rows read, computed and written (and the compute step by both paths); one grid.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    missing_docs,
    reason = "a benchmark binary: set-up failures should stop it, and criterion macros make undocumented items"
)]

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use solver::field::grid::{species_grid, GridSpec, Quantity};
use solver::field::limit::{Limit, LimitUnit};
use solver::field::log::{run_log, LogOptions, LogPlan};
use solver::field::{IonicSource, TotalUnit};

/// An invented logger export: 10,000 rows of pH, temperature, TAN, conductivity.
fn log_text(rows: usize) -> String {
    let mut s = String::from("time;pH;Temp °C;TAN mg/L;Cond µS/cm\n");
    for i in 0..rows {
        let x = i as f64;
        s.push_str(
            &format!(
                "{:02}:{:02};{:.2};{:.1};{:.2};{}\n",
                (i / 60) % 24,
                i % 60,
                7.2 + (x * 0.013).sin() * 0.9,
                14.0 + (x * 0.002).cos() * 6.0,
                0.5 + (x * 0.007).sin().abs(),
                400 + i % 200
            )
            .replace('.', ","),
        );
    }
    s
}

fn benches(cr: &mut Criterion) {
    let text = log_text(10_000);
    let mut opts = LogOptions::new("ammonium");
    opts.limit = Some(Limit {
        value: 0.02,
        unit: LimitUnit::MgPerLNh3,
    });
    let r = run_log(text.as_bytes(), &opts, &[], None).unwrap();
    assert!(r.errors.is_empty());
    cr.bench_function(
        "log: 10,000 rows, ammonia + limit, parse + compute + write",
        |b| b.iter(|| run_log(black_box(text.as_bytes()), &opts, &[], None).unwrap()),
    );
    // The compute step alone, the two paths side by side (same plan, same load).
    let plan = LogPlan::new(text.as_bytes(), &opts, &[], None).unwrap();
    cr.bench_function(
        "log compute only, 10,000 rows: one single reading per row (reference path)",
        |b| b.iter(|| plan.compute_each(black_box(0..plan.len()))),
    );
    cr.bench_function(
        "log compute only, 10,000 rows: constants kept per temperature (page and CLI path)",
        |b| b.iter(|| plan.compute(black_box(0..plan.len()))),
    );
    let out = plan.compute(0..plan.len());
    cr.bench_function("log write CSV only, 10,000 rows", |b| {
        b.iter(|| plan.write_csv(black_box(&out)))
    });
    let grid = GridSpec {
        system: "ammonium".into(),
        ph: (0..=60).map(|i| 6.0 + 0.05 * f64::from(i)).collect(),
        temperatures_c: (0..=30).map(f64::from).collect(),
        species: None,
        quantity: Quantity::Fraction,
        total: None,
        total_unit: TotalUnit::MgPerLAs,
        ionic: IonicSource::Zero,
    };
    cr.bench_function("grid: 61 pH × 31 temperatures", |b| {
        b.iter(|| species_grid(black_box(&grid), &[]).unwrap())
    });
}

criterion_group!(field_log, benches);
criterion_main!(field_log);
