//! The pH meter bench: standard buffers at the bench temperature, the calibration check, a sample's pH from millivolts, and the `calibrate` command.
//!
//! ```text
//! bufferwright calibrate --temp T --point STANDARD=MV ... [--sample-mv MV] [--json]
//! bufferwright calibrate --temp T --standards [--json]
//! ```
//!
//! Exit codes of `calibrate`: 0 the calibration passes every verdict; 1 the
//! readings are refused (the message names the point); 2 usage; 3 fitted,
//! but a verdict fails (the output says which).
//!
//! Automatic temperature compensation corrects the electrode's slope for the
//! temperature, not the sample's chemistry: a buffer's pH itself changes with
//! temperature, which is why the standards are read at the bench temperature.

pub mod calibration;
pub mod standards;

pub use calibration::{
    displayed_to_mv, fit_calibration, mv_to_displayed, nernst_mv_per_ph, BottleValue, CalPoint,
    CalibrationFit, CalibrationSpec, FitPoint, Limits, SampleReading, TechnicalBuffer, Verdict,
};
pub use standards::{find_standard, standards_at, Standard, StandardRow, STANDARDS};

use crate::cli::CliOutput;

/// One line on automatic temperature compensation, for the page and the sheet.
pub const ATC_NOTE: &str = "Automatic temperature compensation corrects the electrode's slope \
for temperature, not the sample's chemistry: a buffer's pH itself changes with temperature.";

/// Usage of `calibrate`.
pub const CALIBRATE_USAGE: &str = "usage: bufferwright calibrate --temp T --point STANDARD=MV \
[--point STANDARD=MV]... [--sample-mv MV] [--json]\n       bufferwright calibrate --temp T \
--standards [--json]\nstandards: tetroxalate tartrate citrate phthalate phosphate_1_1 \
phosphate_1_3_5 borax carbonate calcium_hydroxide";

fn out(stdout: String, stderr: String, code: u8) -> CliOutput {
    CliOutput {
        stdout,
        stderr,
        code,
    }
}

fn usage(msg: &str) -> CliOutput {
    out(String::new(), format!("{msg}\n{CALIBRATE_USAGE}\n"), 2)
}

fn number(flag: &str, v: Option<&String>) -> Result<f64, CliOutput> {
    let Some(v) = v else {
        return Err(usage(&format!("{flag} needs a value")));
    };
    v.trim()
        .parse::<f64>()
        .ok()
        .filter(|x| x.is_finite())
        .ok_or_else(|| usage(&format!("{flag}: not a number: {}", crate::fmt::quote(v))))
}

/// The `calibrate` subcommand without its IO: arguments after `calibrate` in,
/// output and exit code out.
pub fn calibrate_command(args: &[String]) -> CliOutput {
    let mut temp = None;
    let mut points = Vec::new();
    let mut sample = None;
    let mut json = false;
    let mut list = false;
    let mut it = args.iter();
    while let Some(a) = it.next() {
        match a.as_str() {
            "--temp" => match number("--temp", it.next()) {
                Ok(v) => temp = Some(v),
                Err(e) => return e,
            },
            "--sample-mv" => match number("--sample-mv", it.next()) {
                Ok(v) => sample = Some(v),
                Err(e) => return e,
            },
            "--point" => {
                let Some(p) = it.next() else {
                    return usage("--point needs STANDARD=MV");
                };
                let Some((id, mv)) = p.split_once('=') else {
                    return usage(&format!(
                        "--point {}: write STANDARD=MV",
                        crate::fmt::quote(p)
                    ));
                };
                match number("--point", Some(&mv.to_string())) {
                    Ok(v) => points.push(CalPoint {
                        standard: id.trim().to_string(),
                        mv: Some(v),
                        displayed_ph: None,
                        lot: String::new(),
                    }),
                    Err(e) => return e,
                }
            }
            "--json" => json = true,
            "--standards" => list = true,
            "-h" | "--help" => return out(format!("{CALIBRATE_USAGE}\n"), String::new(), 0),
            other => return usage(&format!("unknown option {}", crate::fmt::quote(other))),
        }
    }
    let Some(t) = temp else {
        return usage("--temp is required");
    };
    if list {
        return match standards_at(t) {
            Ok(rows) if json => out(to_json(&rows), String::new(), 0),
            Ok(rows) => out(standards_text(t, &rows), String::new(), 0),
            Err(e) => out(String::new(), format!("{e}\n"), 1),
        };
    }
    let spec = CalibrationSpec {
        temperature_c: t,
        points,
        sample_mv: sample,
        ..Default::default()
    };
    match fit_calibration(&spec) {
        Ok(fit) => {
            let code = if fit.verdicts.iter().all(|v| v.pass) {
                0
            } else {
                3
            };
            let text = if json { to_json(&fit) } else { fit_text(&fit) };
            out(text, String::new(), code)
        }
        Err(e) => out(String::new(), format!("{e}\n"), 1),
    }
}

fn to_json<T: serde::Serialize>(v: &T) -> String {
    serde_json::to_string_pretty(v)
        .map(|s| s + "\n")
        .unwrap_or_default()
}

/// The standards table at a temperature, as text.
pub fn standards_text(t: f64, rows: &[StandardRow]) -> String {
    let mut s = format!("pH(S) of the standards at {t} °C (engine's value beside)\n");
    for r in rows {
        match r.ph {
            Some(p) => s.push_str(&format!(
                "  {:<18} {:>7.3} ± {:<5} {:<16} engine {}\n",
                r.id,
                p,
                r.u95,
                format!(
                    "[{}{}]",
                    r.status,
                    if r.interpolated { ", interpolated" } else { "" }
                ),
                r.engine_ph
                    .map_or_else(|| "—".to_string(), |e| format!("{e:.3} ({:+.3})", e - p)),
            )),
            None => s.push_str(&format!(
                "  {:<18} no value: published {} to {} °C\n",
                r.id, r.range_c.0, r.range_c.1
            )),
        }
    }
    s
}

/// A fit as text.
pub fn fit_text(f: &CalibrationFit) -> String {
    let mut s = format!(
        "Calibration at {} °C (Nernst slope {:.2} mV/pH)\n",
        f.temperature_c, f.nernst_mv_per_ph
    );
    for p in &f.points {
        s.push_str(&format!(
            "  {:<18} pH(S) {:>7.3}  {:>8.1} mV  residual {:+.3} pH\n",
            p.standard, p.ph, p.mv, p.residual_ph
        ));
    }
    s.push_str(&format!(
        "slope {:.2} mV/pH ({:.1} % of Nernst)\noffset {:+.1} mV at pH 7; pH {:.3} at 0 mV\n",
        f.slope_mv_per_ph, f.slope_percent, f.mv_at_ph7, f.ph_at_0mv
    ));
    for v in &f.verdicts {
        s.push_str(&format!(
            "  {} {}\n",
            if v.pass { "pass" } else { "FAIL" },
            v.text
        ));
    }
    if let Some(r) = f.sample {
        s.push_str(&format!(
            "sample {:.1} mV: pH {:.3} ± {:.3} (U95, k = 2)\n",
            r.mv, r.ph, r.u95_ph
        ));
    }
    s.push_str(&format!("note: {ATC_NOTE}\n"));
    s
}
