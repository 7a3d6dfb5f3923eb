//! Command-line entry: reads a design document (file or stdin) and prints the full result.
//!
//! ```text
//! bufferwright [--table] [--demo] [--co2 5%|420uatm] [FILE|-]
//! bufferwright log --system ID [options] FILE.csv|-     (see solver::cli)
//! bufferwright grid --system ID --ph A:B:S --temp A:B:S [options]
//! bufferwright self-check [--json|--csv]
//! bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]
//! bufferwright calibrate --temp T --point STANDARD=MV ... [--sample-mv MV] [--json]   (see solver::meter)
//! ```
//!
//! Prints JSON by default (every part of the design: recipe, mixture,
//! what-if, field reading, curves); `--table` prints a readable summary.
//! `--demo` prints the demo design document instead of reading one.
//! `--co2` puts a CO₂ atmosphere over every workspace of the design that holds
//! carbonate (`solver::document::report::with_co2`; refused when none does).
//! `self-check` runs the reference cases of `solver::selfcheck` (exit 1 if any fails);
//! `uncertainty` prints the uncertainty budgets of a design (`solver::uncertainty`).
//! Exit codes: 0 success, 1 unreadable or invalid document, 2 usage.

use solver::document::{demo_design, parse_design, report, to_json_pretty, Report};
use solver::fmt::{format_mass, format_volume_ml, sig, sig_trim};
use solver::recipe::{MeterSolution, METER_NOTE};
use std::io::Read;
use std::process::ExitCode;

const USAGE: &str = "usage: bufferwright [--table] [--demo] [--co2 5%|420uatm] [FILE|-]\n       bufferwright log --system ID [options] FILE.csv|-\n       bufferwright grid --system ID --ph A:B:S --temp A:B:S [options]\n       bufferwright self-check [--json|--csv]\n       bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]\n       bufferwright calibrate --temp T --point STANDARD=MV ... [--sample-mv MV] [--json]";

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let rest = args.get(1..).unwrap_or(&[]);
    match args.first().map(String::as_str) {
        Some("log") => return emit(solver::cli::log_command(rest, &mut read_limited)),
        Some("grid") => return emit(solver::cli::grid_command(rest)),
        Some("calibrate") => return emit(solver::meter::calibrate_command(rest)),
        _ => {}
    }
    if args.first().map(String::as_str) == Some("self-check") {
        let (text, code) = solver::selfcheck::self_check_command(args.get(1..).unwrap_or(&[]));
        if code == 2 {
            eprint!("{text}");
        } else {
            print!("{text}");
        }
        return ExitCode::from(code);
    }
    if args.first().map(String::as_str) == Some("uncertainty") {
        let (out, err, code) = solver::cli::uncertainty::uncertainty_command(
            args.get(1..).unwrap_or(&[]),
            &read_source,
        );
        print!("{out}");
        eprint!("{err}");
        return ExitCode::from(code);
    }
    let mut table = false;
    let mut demo = false;
    let mut path: Option<String> = None;
    let mut co2: Option<String> = None;
    let mut argv = std::env::args().skip(1);
    while let Some(arg) = argv.next() {
        match arg.as_str() {
            "--table" => table = true,
            "--co2" => match argv.next() {
                Some(v) => co2 = Some(v),
                None => {
                    eprintln!("--co2 needs a value (5% or 420uatm)\n{USAGE}");
                    return ExitCode::from(2);
                }
            },
            a if a.starts_with("--co2=") => co2 = a.strip_prefix("--co2=").map(str::to_string),
            "--demo" => demo = true,
            "-h" | "--help" => {
                println!("{USAGE}");
                return ExitCode::SUCCESS;
            }
            a if a.starts_with("--") => {
                eprintln!("unknown option {a}\n{USAGE}");
                return ExitCode::from(2);
            }
            a => {
                if path.is_some() {
                    eprintln!("only one document at a time\n{USAGE}");
                    return ExitCode::from(2);
                }
                path = Some(a.to_string());
            }
        }
    }
    if demo {
        println!("{}", to_json_pretty(&demo_design()));
        return ExitCode::SUCCESS;
    }
    let text = match path.as_deref() {
        None | Some("-") => {
            let mut s = String::new();
            if let Err(e) = std::io::stdin().read_to_string(&mut s) {
                eprintln!("cannot read stdin: {e}");
                return ExitCode::from(1);
            }
            s
        }
        Some(p) => match std::fs::read_to_string(p) {
            Ok(s) => s,
            Err(e) => {
                eprintln!("cannot read {p}: {e}");
                return ExitCode::from(1);
            }
        },
    };
    let mut design = match parse_design(&text) {
        Ok(d) => d,
        Err(e) => {
            eprintln!("invalid design: {e}");
            return ExitCode::from(1);
        }
    };
    if let Some(v) = co2 {
        use solver::cli::co2::parse_co2;
        use solver::document::report::with_co2;
        match parse_co2(&v).and_then(|a| with_co2(&design, &a)) {
            Ok((d, changed)) => {
                eprintln!("CO₂ atmosphere put over: {}", changed.join(", "));
                design = d;
            }
            Err(e) => {
                eprintln!("{e}");
                return ExitCode::from(1);
            }
        }
    }
    let rep = report(&design);
    if table {
        print!("{}", render_table(&rep));
    } else {
        match serde_json::to_string_pretty(&rep) {
            Ok(s) => println!("{s}"),
            Err(e) => {
                eprintln!("cannot serialise result: {e}");
                return ExitCode::from(1);
            }
        }
    }
    ExitCode::SUCCESS
}

/// Print a subcommand's output and turn its code into the exit code.
fn emit(out: solver::cli::CliOutput) -> ExitCode {
    print!("{}", out.stdout);
    eprint!("{}", out.stderr);
    ExitCode::from(out.code)
}

/// Read a file (or stdin for `-`), at most one byte past the log size limit.
fn read_limited(path: &str) -> Result<Vec<u8>, String> {
    let limit = solver::field::csv::MAX_BYTES as u64 + 1;
    let mut buf = Vec::new();
    let r = if path == "-" {
        std::io::stdin().take(limit).read_to_end(&mut buf)
    } else {
        std::fs::File::open(path).and_then(|f| f.take(limit).read_to_end(&mut buf))
    };
    r.map(|_| buf).map_err(|e| e.to_string())
}
/// Read a file, or stdin for `-`.
fn read_source(p: &str) -> Result<String, String> {
    if p == "-" {
        let mut s = String::new();
        std::io::stdin()
            .read_to_string(&mut s)
            .map_err(|e| format!("cannot read stdin: {e}"))?;
        Ok(s)
    } else {
        std::fs::read_to_string(p).map_err(|e| format!("cannot read {p}: {e}"))
    }
}

fn render_table(r: &Report) -> String {
    let mut out = format!("Design: {}\n\n", r.name);
    out.push_str("== Recipe\n");
    match &r.recipe {
        Ok(rec) => {
            for i in &rec.ingredients {
                let amount = match (i.grams, i.ml) {
                    (Some(g), _) => format_mass(g),
                    (None, Some(ml)) => format_volume_ml(ml),
                    _ => String::new(),
                };
                out.push_str(&format!(
                    "  {:<28} {:>12}   {}\n",
                    i.formula, amount, i.name
                ));
            }
            out.push_str(&format!(
                "  pH (exact)        {:.3}\n  ionic strength    {} M\n  capacity          {} mM/pH\n",
                rec.equilibrium.ph,
                sig(rec.equilibrium.ionic_strength, 3),
                sig(rec.equilibrium.capacity * 1000.0, 3)
            ));
            let of = match rec.meter.solution {
                MeterSolution::WorkingBuffer => "",
                MeterSolution::Concentrate => " (the concentrate)",
                MeterSolution::DilutedPortion => " (a portion diluted to working strength)",
            };
            out.push_str(&format!(
                "  meter reads       pH {:.2} at {} °C{of}\n",
                rec.meter.ph,
                sig(rec.meter.temperature_c, 3)
            ));
            if let Some(c) = &rec.concentrate {
                let ph = c.ph.map_or_else(
                    || "pH not predicted (past the activity model)".to_string(),
                    |p| format!("pH {p:.2}"),
                );
                out.push_str(&format!(
                    "  concentrate {:>4}×  {ph}, ionic strength {} M\n",
                    sig_trim(c.factor, 3),
                    sig(c.ionic_strength, 3)
                ));
            }
            if let Some(a) = rec.estimate.actual_ph {
                out.push_str(&format!(
                    "  HH estimate gives pH {:.3} (off by {:+.3})\n",
                    a,
                    a - rec.equilibrium.ph
                ));
            }
            out.push_str(&format!(
                "  tolerance ±{}: {} mmol/L acid, {} mmol/L base\n",
                rec.tolerance.window,
                sig(rec.tolerance.acid_mmol_per_l, 3),
                sig(rec.tolerance.base_mmol_per_l, 3)
            ));
            if rec.meter.temperature_c != rec.mixture.temperature_c {
                out.push_str(&format!("  note: {METER_NOTE}\n"));
            }
            for w in &rec.warnings {
                out.push_str(&format!("  warning: {}\n", w.message()));
            }
            for (n, s) in rec.steps.iter().enumerate() {
                out.push_str(&format!("  {}. {}\n", n + 1, s));
            }
        }
        Err(e) => out.push_str(&format!("  error: {e}\n")),
    }
    out.push_str("\n== Mixture\n");
    match &r.mixture {
        Ok(m) => {
            out.push_str(&format!(
                "  pH {:.3}   I = {} M\n",
                m.equilibrium.ph,
                sig(m.equilibrium.ionic_strength, 3)
            ));
            for s in &m.systems {
                for sp in &s.species {
                    out.push_str(&format!(
                        "  {:<14} {:<12} {:>12} M  {:>7.3} %\n",
                        s.name,
                        sp.name,
                        sig(sp.conc, 4),
                        sp.fraction * 100.0
                    ));
                }
            }
        }
        Err(e) => out.push_str(&format!("  error: {e}\n")),
    }
    if let Ok(w) = &r.what_if {
        out.push_str(&format!(
            "  what-if: diluted {:.3}, +acid {:.3}, +base {:.3}, other temperature {:.3}\n",
            w.diluted_ph, w.after_acid_ph, w.after_base_ph, w.at_temperature_ph
        ));
    }
    out.push_str("\n== Field reading\n");
    match &r.field {
        Ok(f) => {
            out.push_str(&format!("  model: {}\n", f.model.describe()));
            for sp in &f.species {
                let conc = sp
                    .mg_l_as
                    .map(|v| format!("{} mg/L as {}", sig(v, 3), f.basis))
                    .unwrap_or_default();
                out.push_str(&format!(
                    "  {:<12} {:>8.3} %  {}\n",
                    sp.name,
                    sp.fraction * 100.0,
                    conc
                ));
            }
            for w in &f.warnings {
                out.push_str(&format!("  note: {w}\n"));
            }
        }
        Err(e) => out.push_str(&format!("  error: {e}\n")),
    }
    if let Some(g) = &r.gas {
        out.push_str(&solver::cli::co2::gas_table(g));
    }
    out
}
