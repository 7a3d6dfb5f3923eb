//! `bufferwright log` and `grid`: field logs read row by row and pH × temperature tables, through the library and the binary.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use solver::field::carbonate::{Alkalinity, AlkalinityUnit};
use solver::field::csv::{parse, parse_number};
use solver::field::limit::{Limit, LimitUnit};
use solver::field::log::{run_log, LogOptions, LogPlan};
use solver::field::{field_reading, FieldSpec, IonicSource, TotalUnit};
use std::io::Write;
use std::process::{Command, Stdio};

fn run(args: &[&str], stdin: Option<&[u8]>) -> (i32, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    if let Some(s) = stdin {
        child.stdin.take().unwrap().write_all(s).unwrap();
    } else {
        drop(child.stdin.take());
    }
    let out = child.wait_with_output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn temp_file(name: &str, bytes: &[u8]) -> String {
    let p = std::env::temp_dir().join(format!("bw-logcli-{}-{name}", std::process::id()));
    std::fs::write(&p, bytes).unwrap();
    p.to_string_lossy().into_owned()
}

/// Column `name` of output table `out` as numbers (None for empty cells).
fn column(out: &str, name: &str) -> Vec<Option<f64>> {
    let t = parse(out, None).unwrap();
    let i = t.header.iter().position(|h| h == name).unwrap_or_else(|| {
        panic!("no column {name} in {:?}", t.header);
    });
    t.rows
        .iter()
        .map(|r| parse_number(&r.fields[i], t.decimal_comma).unwrap())
        .collect()
}

fn close(a: f64, b: f64) -> bool {
    // Output cells carry 6 significant digits.
    (a - b).abs() <= 1e-5 * b.abs().max(1e-300)
}

const AMMONIA_LOG: &str = "time,pH,Temp (°C),TAN (mg/L as N),Cond (µS/cm)\n\
2026-06-01 08:00,7.85,12.5,0.8,450\n\
2026-06-01 09:00,8.40,14.0,0.9,460\n\
2026-06-01 10:00,8.95,16.5,1.2,470\n\
2026-06-01 11:00,6.90,18.0,0.5,480\n";

#[test]
fn log_rows_equal_single_field_readings() {
    let mut opts = LogOptions::new("ammonium");
    opts.limit = Some(Limit {
        value: 0.02,
        unit: LimitUnit::MgPerLNh3,
    });
    let run_lib = run_log(AMMONIA_LOG.as_bytes(), &opts, &[], None).unwrap();
    assert!(run_lib.errors.is_empty(), "{:?}", run_lib.errors);
    let rows = [
        (7.85, 12.5, 0.8, 450.0),
        (8.40, 14.0, 0.9, 460.0),
        (8.95, 16.5, 1.2, 470.0),
        (6.90, 18.0, 0.5, 480.0),
    ];
    let frac = column(&run_lib.csv, "fraction_NH3");
    let nh3 = column(&run_lib.csv, "NH3_mg_l_as_NH3");
    let i = column(&run_lib.csv, "ionic_strength_mol_l");
    let cross = column(&run_lib.csv, "crossing_ph");
    for (k, (ph, t, tan, cond)) in rows.iter().enumerate() {
        let r = field_reading(
            &FieldSpec {
                system: "ammonium".into(),
                ph: *ph,
                temperature_c: *t,
                total: Some(*tan),
                total_unit: TotalUnit::MgPerLAs,
                ionic: IonicSource::Conductivity { us_cm: *cond },
                alkalinity: None,
                limit: opts.limit,
                atmosphere: None,
            },
            &[],
        )
        .unwrap();
        assert!(close(frac[k].unwrap(), r.species[1].fraction), "row {k}");
        assert!(close(nh3[k].unwrap(), r.species[1].amounts[1].mg_l));
        assert!(close(i[k].unwrap(), r.ionic_strength));
        assert!(close(
            cross[k].unwrap(),
            r.limit.unwrap().crossing_ph.unwrap()
        ));
    }
    // Input columns are kept verbatim, first.
    let t = parse(&run_lib.csv, None).unwrap();
    assert_eq!(
        &t.header[..5],
        &parse(AMMONIA_LOG, None).unwrap().header[..]
    );
    assert_eq!(t.rows[1].fields[0], "2026-06-01 09:00");
    // The binary prints exactly the library's CSV.
    let f = temp_file("ammonia.csv", AMMONIA_LOG.as_bytes());
    let (code, out, err) = run(
        &[
            "log",
            "--system",
            "ammonium",
            "--limit",
            "0.02",
            "--limit-unit",
            "mg_per_l_nh3",
            &f,
        ],
        None,
    );
    assert_eq!(code, 0, "{err}");
    assert_eq!(out, run_lib.csv);
    assert!(
        err.contains("4 rows read") && err.contains("caution"),
        "{err}"
    );
    // Standard input works the same.
    let (code, out2, _) = run(
        &[
            "log",
            "--system",
            "ammonium",
            "--limit",
            "0.02",
            "--limit-unit",
            "mg_per_l_nh3",
            "-",
        ],
        Some(AMMONIA_LOG.as_bytes()),
    );
    assert_eq!(code, 0);
    assert_eq!(out2, out);
}

#[test]
fn chunks_give_the_same_rows_as_one_pass() {
    let opts = LogOptions::new("ammonium");
    let plan = LogPlan::new(AMMONIA_LOG.as_bytes(), &opts, &[], None).unwrap();
    let whole = plan.compute(0..plan.len());
    let mut parts = plan.compute(0..3);
    parts.extend(plan.compute(3..99));
    assert_eq!(whole, parts);
    assert!(plan.compute(7..9).is_empty());
    assert_eq!(plan.write_csv(&parts), plan.write_csv(&whole));
}

#[test]
fn semicolons_and_decimal_commas_read_and_write_like_the_comma_file() {
    let eu = "Zeit;pH-Wert;Temperatur °C;TAN mg/l;Leitfähigkeit µS/cm\n\
08:00;7,85;12,5;0,8;450\n09:00;8,40;14,0;0,9;460\n10:00;8,95;16,5;1,2;470\n11:00;6,90;18,0;0,5;480\n";
    let opts = LogOptions::new("ammonium");
    let a = run_log(eu.as_bytes(), &opts, &[], None).unwrap();
    let b = run_log(AMMONIA_LOG.as_bytes(), &opts, &[], None).unwrap();
    assert!(a.errors.is_empty(), "{:?}", a.errors);
    let first = a.csv.lines().nth(1).unwrap();
    assert!(first.contains(';') && first.contains("0,0"), "{first}");
    let fa = column(&a.csv, "fraction_NH3");
    let fb = column(&b.csv, "fraction_NH3");
    assert_eq!(fa, fb);
    // Windows-1252 / Latin-1 header (°C as byte 0xB0) and a UTF-16 tab export.
    let latin: Vec<u8> = b"pH;T \xB0C;TAN\n7,85;12,5;0,8\n".to_vec();
    let r = run_log(&latin, &opts, &[], None).unwrap();
    assert!(r.errors.is_empty(), "{:?}", r.errors);
    assert_eq!(r.columns.temperature, Some(1));
    let utf16: Vec<u8> = [0xFF, 0xFE]
        .into_iter()
        .chain(
            "pH\tTemp °C\tTAN\r\n7,85\t12,5\t0,8\r\n"
                .encode_utf16()
                .flat_map(u16::to_le_bytes),
        )
        .collect();
    let r = run_log(&utf16, &opts, &[], None).unwrap();
    assert!(r.errors.is_empty(), "{:?}", r.errors);
    // No conductivity column here: I = 0, Emerson et al. (1975) directly.
    let want = 1.0 / (10f64.powf(0.09018 + 2729.92 / (12.5 + 273.15) - 7.85) + 1.0);
    assert!(close(column(&r.csv, "fraction_NH3")[0].unwrap(), want));
}

#[test]
fn hostile_files_are_refused_with_a_message() {
    // No pH column.
    let f = temp_file("noph.csv", b"time,temp,TAN\n08:00,12,0.8\n");
    let (code, out, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 1);
    assert!(out.is_empty());
    assert!(err.contains("no pH column"), "{err}");
    // Binary (a zip header).
    let f = temp_file("bin.csv", b"PK\x03\x04\x14\x00\x00\x00\x08\x00pH,T\n");
    let (code, _, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 1);
    assert!(err.contains("not a text file"), "{err}");
    // Empty file, missing file, unknown system, bad option.
    let f = temp_file("empty.csv", b"\n\n");
    let (code, _, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 1, "{err}");
    let (code, _, _) = run(&["log", "--system", "ammonium", "/nonexistent/x.csv"], None);
    assert_eq!(code, 1);
    let f = temp_file("ok.csv", AMMONIA_LOG.as_bytes());
    let (code, _, err) = run(&["log", "--system", "unobtainium", &f], None);
    assert_eq!(code, 1);
    assert!(err.contains("unobtainium"), "{err}");
    let (code, _, err) = run(&["log", "--system", "ammonium", "--frobnicate", &f], None);
    assert_eq!(code, 2, "{err}");
    // Two columns that both look like pH must be chosen explicitly.
    let two = "pH,pH 2,T\n7.0,7.1,20\n";
    let f = temp_file("two.csv", two.as_bytes());
    let (code, _, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 1);
    assert!(err.contains("several columns look like ph"), "{err}");
    let (code, out, err) = run(
        &["log", "--system", "ammonium", "--col", "ph=pH 2", &f],
        None,
    );
    assert_eq!(code, 0, "{err}");
    let fr = column(&out, "fraction_NH3")[0].unwrap();
    let want = 1.0 / (10f64.powf(0.09018 + 2729.92 / 293.15 - 7.1) + 1.0);
    assert!(close(fr, want), "{fr} vs {want}");
    // Over 50 MB is refused before parsing.
    let big = vec![b'7'; solver::field::csv::MAX_BYTES + 1];
    let e = run_log(&big, &LogOptions::new("ammonium"), &[], None).unwrap_err();
    assert!(e.to_string().contains("50 MB"), "{e}");
}

#[test]
fn bad_rows_are_listed_not_dropped() {
    let log = "label,pH,T,TAN\n\
a,7.5,20,1\n\
b,,20,1\n\
c,7,4,20,1\n\
d,15,20,1\n\
e,7.5,70,1\n\
f,7.5,20,-3\n\
g,7.5,20,\"1,5\"\n\
\n\
h,8.0,20,1\n";
    let f = temp_file("bad.csv", log.as_bytes());
    let (code, out, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 3, "{err}");
    let t = parse(&out, None).unwrap();
    assert_eq!(t.rows.len(), 8, "every data row is in the output");
    let e = t.header.iter().position(|h| h == "error").unwrap();
    let errors: Vec<&str> = t.rows.iter().map(|r| r.fields[e].as_str()).collect();
    assert!(errors[0].is_empty() && errors[7].is_empty());
    assert!(errors[1].contains("no pH"));
    assert!(
        errors[2].contains("fields but the header has 4"),
        "{}",
        errors[2]
    );
    assert!(errors[3].contains("ph") && errors[3].contains("15"));
    assert!(errors[4].contains("temperature_c"));
    assert!(errors[5].contains("total"));
    assert!(errors[6].contains("comma"));
    for line in [3, 4, 5, 6, 7, 8] {
        assert!(err.contains(&format!("line {line}:")), "{line}: {err}");
    }
    assert!(
        err.contains("1 blank lines skipped") && err.contains("6 with errors"),
        "{err}"
    );
}

#[test]
fn units_and_defaults_from_headers_and_options() {
    // mS/cm and °F headers are converted; a missing temperature uses --temp.
    let log = "pH,Water temp (°F),SpCond mS/cm,TAN\n8.0,68,0.5,1\n8.0,,0.5,1\n";
    let f = temp_file("units.csv", log.as_bytes());
    let (code, out, err) = run(&["log", "--system", "ammonium", "--temp", "10", &f], None);
    assert_eq!(code, 0, "{err}");
    let i = column(&out, "ionic_strength_mol_l");
    assert!(close(i[0].unwrap(), 1.6e-5 * 500.0));
    let fr = column(&out, "fraction_NH3");
    let at = |t: f64| {
        let one = FieldSpec {
            system: "ammonium".into(),
            ph: 8.0,
            temperature_c: t,
            total: Some(1.0),
            total_unit: TotalUnit::MgPerLAs,
            ionic: IonicSource::Conductivity { us_cm: 500.0 },
            alkalinity: None,
            limit: None,
            atmosphere: None,
        };
        field_reading(&one, &[]).unwrap().species[1].fraction
    };
    // 68 °F = 20 °C; the empty cell takes --temp 10.
    assert!(close(fr[0].unwrap(), at(20.0)));
    assert!(close(fr[1].unwrap(), at(10.0)));
    // Without --temp the empty cell is a row error.
    let (code, _, err) = run(&["log", "--system", "ammonium", &f], None);
    assert_eq!(code, 3);
    assert!(err.contains("no temperature"), "{err}");
}

#[test]
fn carbonate_log_with_salinity_and_alkalinity() {
    let log = "site;pH;temp;Sal (PSU);Alk (meq/L)\nA;7,9;15;5;2,1\nB;8,1;16;12;2,3\n";
    let opts = LogOptions::new("carbonate");
    let r = run_log(log.as_bytes(), &opts, &[], None).unwrap();
    assert!(r.errors.is_empty(), "{:?}", r.errors);
    let dic = column(&r.csv, "dic_mmol_l");
    let co2 = column(&r.csv, "free_co2_mg_l");
    for (k, (ph, t, s, alk)) in [(7.9, 15.0, 5.0, 2.1), (8.1, 16.0, 12.0, 2.3)]
        .iter()
        .enumerate()
    {
        let one = field_reading(
            &FieldSpec {
                system: "carbonate".into(),
                ph: *ph,
                temperature_c: *t,
                total: None,
                total_unit: TotalUnit::MgPerLAs,
                ionic: IonicSource::Salinity { psu: *s },
                alkalinity: Some(Alkalinity {
                    value: *alk,
                    unit: AlkalinityUnit::MeqPerL,
                }),
                limit: None,
                atmosphere: None,
            },
            &[],
        )
        .unwrap();
        let c = one.carbonate.unwrap();
        assert!(close(dic[k].unwrap(), c.dic_mmol_l));
        assert!(close(co2[k].unwrap(), c.free_co2_mg_l));
    }
}

#[test]
fn grid_csv_matches_single_readings() {
    let (code, out, err) = run(
        &[
            "grid", "--system", "ammonium", "--ph", "6:9:0.5", "--temp", "5:30:5",
        ],
        None,
    );
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("SDS"), "caution on stderr: {err}");
    let t = parse(&out, None).unwrap();
    assert_eq!(t.header.len(), 7);
    assert_eq!(t.header[1], "5 °C");
    assert_eq!(t.rows.len(), 7);
    for (i, row) in t.rows.iter().enumerate() {
        let ph = 6.0 + 0.5 * i as f64;
        for (j, cell) in row.fields.iter().skip(1).enumerate() {
            let temp = 5.0 + 5.0 * j as f64;
            let want = 1.0 / (10f64.powf(0.09018 + 2729.92 / (temp + 273.15) - ph) + 1.0);
            let got = parse_number(cell, false).unwrap().unwrap();
            assert!(close(got, want), "pH {ph} {temp} °C: {got} vs {want}");
        }
    }
    // Concentrations: fraction × total, mg/L as N.
    let (code, out, _) = run(
        &[
            "grid",
            "--system",
            "ammonium",
            "--ph",
            "8",
            "--temp",
            "20",
            "--quantity",
            "conc",
            "--total",
            "2",
        ],
        None,
    );
    assert_eq!(code, 0);
    let v = parse_number(&parse(&out, None).unwrap().rows[0].fields[1], false)
        .unwrap()
        .unwrap();
    let f = 1.0 / (10f64.powf(0.09018 + 2729.92 / 293.15 - 8.0) + 1.0);
    assert!(close(v, 2.0 * f));
}

#[test]
fn grid_markdown_html_and_refusals() {
    let (code, md, _) = run(
        &[
            "grid",
            "--system",
            "sulfide",
            "--ph",
            "6:8:1",
            "--temp",
            "10:20:10",
            "--format",
            "md",
            "--species",
            "HS",
            "--salinity",
            "15",
        ],
        None,
    );
    assert_eq!(code, 0);
    assert!(md.contains("| pH \\ T | 10 °C | 20 °C |"), "{md}");
    assert!(md.contains("HS⁻"), "{md}");
    // Salinity 30 (I ≈ 0.6): past the Davies range, no seawater model for
    // sulfide: refused, never a table of biased numbers.
    let (code, out, err) = run(
        &[
            "grid",
            "--system",
            "sulfide",
            "--ph",
            "6:8:1",
            "--temp",
            "10:20:10",
            "--salinity",
            "30",
        ],
        None,
    );
    assert_ne!(code, 0, "{out}");
    assert!(err.contains("No value is given"), "{err}");
    let (code, html, _) = run(
        &[
            "grid",
            "--system",
            "hypochlorous",
            "--ph",
            "6:9:1",
            "--temp",
            "10:30:10",
            "--format",
            "html",
        ],
        None,
    );
    assert_eq!(code, 0);
    assert!(html.starts_with("<!DOCTYPE html>"));
    assert!(html.contains("<table>") && html.contains("</html>"));
    assert_eq!(html.matches("<tr>").count(), 5);
    assert!(!html.contains("http") && !html.contains("<script") && !html.contains("src="));
    // Refusals: temperature outside the data, conc without total, unknown
    // species, a system without a form that matters, a bad axis.
    let (code, _, err) = run(
        &[
            "grid",
            "--system",
            "hypochlorous",
            "--ph",
            "7",
            "--temp",
            "0:40:10",
        ],
        None,
    );
    assert_eq!(code, 1);
    assert!(err.contains("temperature_c") && err.contains("35"), "{err}");
    let (code, _, err) = run(
        &[
            "grid",
            "--system",
            "ammonium",
            "--ph",
            "7",
            "--temp",
            "20",
            "--quantity",
            "conc",
        ],
        None,
    );
    assert_eq!(code, 1);
    assert!(err.contains("total"), "{err}");
    let (code, _, err) = run(
        &[
            "grid",
            "--system",
            "ammonium",
            "--ph",
            "7",
            "--temp",
            "20",
            "--species",
            "XY",
        ],
        None,
    );
    assert_eq!(code, 1);
    assert!(err.contains("NH4, NH3"), "{err}");
    let (code, _, _) = run(
        &["grid", "--system", "phosphate", "--ph", "7", "--temp", "20"],
        None,
    );
    assert_eq!(code, 1);
    let (code, _, err) = run(
        &[
            "grid", "--system", "ammonium", "--ph", "9:6:1", "--temp", "20",
        ],
        None,
    );
    assert_eq!(code, 2, "{err}");
}

#[test]
fn garbage_never_panics() {
    // Deterministic pseudo-random bytes and CSV-like text (a 64-bit LCG).
    let mut x: u64 = 0x2545_F491_4F6C_DD1D;
    let mut next = || {
        x = x
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (x >> 33) as usize
    };
    let alphabet = b"pH,;\t\"\n\r 0123456789.,-+eE temp TAN cond sal alk \xB0C\x00\xFF";
    for opts in [
        LogOptions::new("ammonium"),
        LogOptions::new("carbonate"),
        LogOptions::new("sulfide"),
    ] {
        for _ in 0..400 {
            let len = next() % 200;
            let mut bytes: Vec<u8> = b"pH;Temp;TAN;Cond;Sal;Alk\n".to_vec();
            for _ in 0..len {
                bytes.push(alphabet[next() % alphabet.len()]);
            }
            if let Ok(plan) = LogPlan::new(&bytes, &opts, &[], None) {
                let rows = plan.compute(0..plan.len());
                assert_eq!(rows.len(), plan.len());
                let _ = plan.write_csv(&rows);
            }
            let raw: Vec<u8> = (0..len).map(|_| (next() % 256) as u8).collect();
            let _ = run_log(&raw, &opts, &[], None);
        }
    }
}

/// The trade's mg/L bases reach the command line too: a total of 1.0 mg/L as NH₃ is
/// 14.007/17.031 mg/L as N (molar masses from CIAAW 2021 weights, computed).
#[test]
fn total_unit_takes_the_trades_bases() {
    let csv = b"pH,temp\n8.0,20\n";
    let as_n = format!("{}", 14.007 / 17.031);
    let (c1, nh3, e1) = run(
        &[
            "log",
            "--system",
            "ammonium",
            "--total",
            "1.0",
            "--total-unit",
            "mg-nh3",
            "-",
        ],
        Some(csv),
    );
    let (c2, n, e2) = run(
        &[
            "log",
            "--system",
            "ammonium",
            "--total",
            &as_n,
            "--total-unit",
            "mg",
            "-",
        ],
        Some(csv),
    );
    assert_eq!((c1, c2), (0, 0), "{e1} {e2}");
    let un = |out: &str| {
        column(out, "NH3_mg_l_as_N")
            .into_iter()
            .flatten()
            .collect::<Vec<f64>>()
    };
    let (a, b) = (un(&nh3), un(&n));
    assert_eq!(a.len(), 1, "{nh3}");
    assert!(close(a[0], b[0]), "{a:?} vs {b:?}");
    let (code, _, err) = run(
        &[
            "log",
            "--system",
            "ammonium",
            "--total-unit",
            "mg-as-fish",
            "-",
        ],
        // Refused while reading the options, before any input: nothing to pipe in.
        None,
    );
    assert_ne!(code, 0);
    assert!(err.contains("mg-nh3"), "{err}");
}
