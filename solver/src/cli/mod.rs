//! The commands of the command-line entry as pure functions, arguments (and file bytes) in, output text and exit code out: `log` and `grid` here, `uncertainty` in [`uncertainty`].
//!
//! ```text
//! bufferwright log --system ID [options] FILE.csv|-
//! bufferwright grid --system ID --ph 6:9:0.5 --temp 5:30:5 [options]
//! ```
//!
//! Exit codes: 0 success; 1 a file or request refused; 2 usage; 3 (`log`)
//! the file was read but some rows could not be computed (they are in the
//! output with their reason in the `error` column and listed on stderr).

pub mod uncertainty;

use crate::field::carbonate::AlkalinityUnit;
use crate::field::csv::{Separator, MAX_BYTES};
use crate::field::grid::{
    parse_axis, render_csv, render_html, render_md, species_grid, GridSpec, Quantity,
};
use crate::field::limit::{Limit, LimitUnit};
use crate::field::log::{run_log, LogOptions, Role};
use crate::field::{IonicSource, TotalUnit};
use crate::mixture::lookup;

/// What a subcommand prints and returns.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CliOutput {
    /// Text for standard output.
    pub stdout: String,
    /// Text for standard error.
    pub stderr: String,
    /// Process exit code.
    pub code: u8,
}

/// Usage of `log`.
pub const LOG_USAGE: &str = "usage: bufferwright log --system ID [--temp C] [--total X] \
[--total-unit mg|mmol|umol|mg-nh3|mg-h2s|mg-caco3|mg-co2] [--ionic I | --salinity S | --conductivity uS_CM | --tds MG_L] \
[--alk-unit mg_caco3|meq] [--limit VALUE --limit-unit UNIT] [--col ROLE=COLUMN]... \
[--sep comma|semicolon|tab] FILE.csv|-";

/// Usage of `grid`.
pub const GRID_USAGE: &str = "usage: bufferwright grid --system ID --ph START:STOP:STEP \
--temp START:STOP:STEP [--species NAME] [--quantity fraction|conc] [--total X] \
[--total-unit mg|mmol|umol|mg-nh3|mg-h2s|mg-caco3|mg-co2] [--format csv|md|html] [--salinity S | --ionic I | --conductivity uS_CM]";

fn usage(msg: &str, usage: &str) -> CliOutput {
    CliOutput {
        stdout: String::new(),
        stderr: format!("{msg}\n{usage}\n"),
        code: 2,
    }
}

fn help(usage: &str) -> CliOutput {
    CliOutput {
        stdout: format!("{usage}\n"),
        stderr: String::new(),
        code: 0,
    }
}

fn refused(msg: String) -> CliOutput {
    CliOutput {
        stdout: String::new(),
        stderr: format!("{msg}\n"),
        code: 1,
    }
}

fn number(opt: &str, v: &str) -> Result<f64, String> {
    v.trim()
        .parse::<f64>()
        .ok()
        .filter(|x| x.is_finite())
        .ok_or_else(|| format!("{opt}: \"{v}\" is not a number"))
}

fn total_unit(v: &str) -> Result<TotalUnit, String> {
    match v {
        "mg" => Ok(TotalUnit::MgPerLAs),
        "mmol" => Ok(TotalUnit::MmolPerL),
        "umol" | "µmol" => Ok(TotalUnit::UmolPerL),
        "mg-nh3" => Ok(TotalUnit::MgPerLNh3),
        "mg-h2s" => Ok(TotalUnit::MgPerLH2s),
        "mg-caco3" => Ok(TotalUnit::MgPerLCaco3),
        "mg-co2" => Ok(TotalUnit::MgPerLCo2),
        o => Err(format!(
            "--total-unit: {} is not mg, mmol, umol, mg-nh3, mg-h2s, mg-caco3 or mg-co2",
            crate::fmt::quote(o)
        )),
    }
}

/// Options shared by both subcommands, gathered while reading the arguments.
#[derive(Default)]
struct Common {
    system: Option<String>,
    total: Option<f64>,
    total_unit: Option<TotalUnit>,
    ionic: Option<IonicSource>,
}

impl Common {
    /// Try one option; Ok(true) when it was one of these.
    fn take(
        &mut self,
        opt: &str,
        val: &mut dyn FnMut() -> Result<String, String>,
    ) -> Result<bool, String> {
        let set_ionic = |slot: &mut Option<IonicSource>, s: IonicSource| {
            if slot.is_some() {
                Err("give one of --ionic, --salinity, --conductivity, --tds".to_string())
            } else {
                *slot = Some(s);
                Ok(())
            }
        };
        match opt {
            "--system" => self.system = Some(val()?),
            "--total" => self.total = Some(number(opt, &val()?)?),
            "--total-unit" => self.total_unit = Some(total_unit(&val()?)?),
            "--ionic" => set_ionic(
                &mut self.ionic,
                IonicSource::Direct {
                    ionic_strength: number(opt, &val()?)?,
                },
            )?,
            "--salinity" => set_ionic(
                &mut self.ionic,
                IonicSource::Salinity {
                    psu: number(opt, &val()?)?,
                },
            )?,
            "--conductivity" => set_ionic(
                &mut self.ionic,
                IonicSource::Conductivity {
                    us_cm: number(opt, &val()?)?,
                },
            )?,
            "--tds" => set_ionic(
                &mut self.ionic,
                IonicSource::Tds {
                    mg_l: number(opt, &val()?)?,
                },
            )?,
            _ => return Ok(false),
        }
        Ok(true)
    }
}

/// `bufferwright log`: compute a field log. `read` loads the file named on
/// the command line (`-` for standard input), at most [`MAX_BYTES`] + 1
/// bytes, or says why it cannot.
pub fn log_command(
    args: &[String],
    read: &mut dyn FnMut(&str) -> Result<Vec<u8>, String>,
) -> CliOutput {
    let mut common = Common::default();
    let mut temp = None;
    let mut alk_unit = AlkalinityUnit::MgPerLCaco3;
    let mut limit_value = None;
    let mut limit_unit = None;
    let mut cols: Vec<(Role, String)> = Vec::new();
    let mut sep = None;
    let mut file = None;
    let mut it = args.iter();
    while let Some(a) = it.next() {
        if a == "-h" || a == "--help" {
            return help(LOG_USAGE);
        }
        let mut val = || {
            it.next()
                .cloned()
                .ok_or_else(|| format!("{a} needs a value"))
        };
        let r: Result<(), String> = (|| {
            if common.take(a, &mut val)? {
                return Ok(());
            }
            match a.as_str() {
                "--temp" => temp = Some(number(a, &val()?)?),
                "--alk-unit" => {
                    alk_unit = match val()?.as_str() {
                        "mg_caco3" => AlkalinityUnit::MgPerLCaco3,
                        "meq" => AlkalinityUnit::MeqPerL,
                        o => return Err(format!("--alk-unit: \"{o}\" is not mg_caco3 or meq")),
                    }
                }
                "--limit" => limit_value = Some(number(a, &val()?)?),
                "--limit-unit" => {
                    let v = val()?;
                    limit_unit = Some(LimitUnit::from_key(&v).ok_or_else(|| {
                        format!(
                            "--limit-unit: \"{v}\" is not one of {}",
                            LimitUnit::ALL.map(LimitUnit::key).join(", ")
                        )
                    })?)
                }
                "--col" => {
                    let v = val()?;
                    let (role, col) = v
                        .split_once('=')
                        .ok_or_else(|| format!("--col: \"{v}\" is not ROLE=COLUMN"))?;
                    let role = Role::from_key(role.trim()).ok_or_else(|| {
                        format!(
                            "--col: \"{role}\" is not one of {}",
                            Role::ALL.map(Role::key).join(", ")
                        )
                    })?;
                    cols.push((role, col.to_string()));
                }
                "--sep" => {
                    sep = Some(match val()?.as_str() {
                        "comma" => Separator::Comma,
                        "semicolon" => Separator::Semicolon,
                        "tab" => Separator::Tab,
                        o => return Err(format!("--sep: \"{o}\" is not comma, semicolon or tab")),
                    })
                }
                o if o.starts_with("--") => return Err(format!("unknown option {o}")),
                f => {
                    if file.is_some() {
                        return Err("only one file at a time".into());
                    }
                    file = Some(f.to_string());
                }
            }
            Ok(())
        })();
        if let Err(e) = r {
            return usage(&e, LOG_USAGE);
        }
    }
    let Some(system) = common.system else {
        return usage("--system is required", LOG_USAGE);
    };
    let Some(file) = file else {
        return usage("name a CSV file (or - for standard input)", LOG_USAGE);
    };
    let limit = match (limit_value, limit_unit) {
        (Some(value), Some(unit)) => Some(Limit { value, unit }),
        (None, None) => None,
        _ => return usage("--limit and --limit-unit go together", LOG_USAGE),
    };
    let mut options = LogOptions::new(&system);
    options.temperature_c = temp;
    options.total = common.total;
    options.total_unit = common.total_unit.unwrap_or(TotalUnit::MgPerLAs);
    options.ionic = common.ionic.unwrap_or(IonicSource::Zero);
    options.alkalinity_unit = alk_unit;
    options.limit = limit;
    options.mapping.choices = cols;
    let bytes = match read(&file) {
        Ok(b) => b,
        Err(e) => return refused(format!("cannot read {file}: {e}")),
    };
    if bytes.len() > MAX_BYTES {
        return refused(format!(
            "{file}: larger than {} MB; split the log",
            MAX_BYTES / (1024 * 1024)
        ));
    }
    match run_log(&bytes, &options, &[], sep) {
        Err(e) => refused(format!("{file}: {e}")),
        Ok(run) => {
            let mut stderr = format!(
                "{} rows read, {} computed, {} with errors{}\n",
                run.rows,
                run.rows - run.errors.len(),
                run.errors.len(),
                if run.blank_lines > 0 {
                    format!(", {} blank lines skipped", run.blank_lines)
                } else {
                    String::new()
                }
            );
            for (line, e) in &run.errors {
                stderr.push_str(&format!("line {line}: {e}\n"));
            }
            if let Ok(sys) = lookup(&system, &[]) {
                for c in crate::field::grid::cautions_for(&sys.hazards) {
                    stderr.push_str(&format!("caution: {c}\n"));
                }
            }
            CliOutput {
                stdout: run.csv,
                stderr,
                code: if run.errors.is_empty() { 0 } else { 3 },
            }
        }
    }
}

/// `bufferwright grid`: a pH × temperature table.
pub fn grid_command(args: &[String]) -> CliOutput {
    let mut common = Common::default();
    let mut ph = None;
    let mut temps = None;
    let mut species = None;
    let mut quantity = Quantity::Fraction;
    let mut format = "csv".to_string();
    let mut it = args.iter();
    while let Some(a) = it.next() {
        if a == "-h" || a == "--help" {
            return help(GRID_USAGE);
        }
        let mut val = || {
            it.next()
                .cloned()
                .ok_or_else(|| format!("{a} needs a value"))
        };
        let r: Result<(), String> = (|| {
            if common.take(a, &mut val)? {
                return Ok(());
            }
            match a.as_str() {
                "--ph" => ph = Some(val()?),
                "--temp" => temps = Some(val()?),
                "--species" => species = Some(val()?),
                "--quantity" => {
                    quantity = match val()?.as_str() {
                        "fraction" => Quantity::Fraction,
                        "conc" => Quantity::Conc,
                        o => return Err(format!("--quantity: \"{o}\" is not fraction or conc")),
                    }
                }
                "--format" => {
                    format = val()?;
                    if !matches!(format.as_str(), "csv" | "md" | "html") {
                        return Err(format!("--format: \"{format}\" is not csv, md or html"));
                    }
                }
                o => return Err(format!("unknown argument {o}")),
            }
            Ok(())
        })();
        if let Err(e) = r {
            return usage(&e, GRID_USAGE);
        }
    }
    let (Some(system), Some(ph), Some(temps)) = (common.system, ph, temps) else {
        return usage("--system, --ph and --temp are required", GRID_USAGE);
    };
    let axes = parse_axis("--ph", &ph).and_then(|p| Ok((p, parse_axis("--temp", &temps)?)));
    let (ph, temperatures_c) = match axes {
        Ok(a) => a,
        Err(e) => return usage(&e.to_string(), GRID_USAGE),
    };
    let spec = GridSpec {
        system,
        ph,
        temperatures_c,
        species,
        quantity,
        total: common.total,
        total_unit: common.total_unit.unwrap_or(TotalUnit::MgPerLAs),
        ionic: common.ionic.unwrap_or(IonicSource::Zero),
    };
    match species_grid(&spec, &[]) {
        Err(e) => refused(e.to_string()),
        Ok(g) => {
            let stdout = match format.as_str() {
                "md" => render_md(&g),
                "html" => render_html(&g),
                _ => render_csv(&g),
            };
            let stderr = if format == "csv" {
                g.warnings
                    .iter()
                    .chain(&g.cautions)
                    .map(|n| format!("{n}\n"))
                    .collect()
            } else {
                String::new()
            };
            CliOutput {
                stdout,
                stderr,
                code: 0,
            }
        }
    }
}
