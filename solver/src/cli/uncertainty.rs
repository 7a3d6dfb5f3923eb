//! The `bufferwright uncertainty` command without its IO, and the plain-text budget it prints.

use crate::document::report::design_uncertainty;
use crate::uncertainty::{Uncertainty, UncertaintyInputs};

/// Plain-text budget of one pH uncertainty (for the command line).
pub fn budget_text(title: &str, u: &Uncertainty) -> String {
    let mut out = format!(
        "{title}: U95 = ±{:.4} pH (k = 2, u_c = {:.4})\n",
        u.u95_ph, u.u_ph
    );
    for r in &u.budget {
        out.push_str(&format!(
            "  {:<34} u = {:<10} {:<6} u(pH) = {:.5}  {:>5.1} %\n",
            r.input,
            crate::fmt::sig(r.u_input, 3),
            r.unit,
            r.u_ph,
            r.share * 100.0
        ));
    }
    for n in &u.notes {
        out.push_str(&format!("  ! {n}\n"));
    }
    out
}

/// The `bufferwright uncertainty` command without its IO: the arguments
/// after `uncertainty`, and a reader for files (`-` is stdin). Returns
/// (text for stdout, text for stderr, exit code: 0 ok, 1 bad document or
/// inputs, 2 usage).
///
/// ```text
/// bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]
/// ```
///
/// `--inputs` names a JSON file of [`UncertaintyInputs`] (every key
/// optional); without it the design's own `uncertainty` key is used.
pub fn uncertainty_command(
    args: &[String],
    read: &dyn Fn(&str) -> std::result::Result<String, String>,
) -> (String, String, u8) {
    const USAGE: &str = "usage: bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]\n";
    let mut table = false;
    let mut inputs_path: Option<&str> = None;
    let mut path: Option<&str> = None;
    let mut it = args.iter();
    while let Some(a) = it.next() {
        match a.as_str() {
            "--table" => table = true,
            "--inputs" => match it.next() {
                Some(p) => inputs_path = Some(p),
                None => return (String::new(), format!("--inputs needs a file\n{USAGE}"), 2),
            },
            o if o.starts_with("--") => {
                return (String::new(), format!("unknown option {o}\n{USAGE}"), 2)
            }
            p => {
                if path.is_some() {
                    return (String::new(), format!("only one document\n{USAGE}"), 2);
                }
                path = Some(p);
            }
        }
    }
    let text = match read(path.unwrap_or("-")) {
        Ok(t) => t,
        Err(e) => return (String::new(), format!("{e}\n"), 1),
    };
    let design = match crate::document::design::parse_design(&text) {
        Ok(d) => d,
        Err(e) => return (String::new(), format!("invalid design: {e}\n"), 1),
    };
    let inputs = match inputs_path {
        None => design.uncertainty.clone(),
        Some(p) => {
            let parsed = read(p).and_then(|t| {
                serde_json::from_str::<UncertaintyInputs>(&t).map_err(|e| format!("{p}: {e}"))
            });
            match parsed {
                Ok(i) => i,
                Err(e) => return (String::new(), format!("invalid inputs: {e}\n"), 1),
            }
        }
    };
    if let Err(e) = inputs.validate() {
        return (String::new(), format!("invalid inputs: {e}\n"), 1);
    }
    let rep = design_uncertainty(&design, &inputs);
    if table {
        let mut out = String::new();
        for (title, part) in [("Recipe", &rep.recipe), ("Mixture", &rep.mixture)] {
            match part {
                Ok(u) => out.push_str(&budget_text(title, u)),
                Err(e) => out.push_str(&format!("{title}: error: {e}\n")),
            }
        }
        match &rep.field {
            Ok(f) => {
                for sp in &f.species {
                    out.push_str(&format!(
                        "Field {}: fraction {:.4} ± {:.4} (k = 2)\n",
                        sp.name, sp.fraction, sp.u95_fraction
                    ));
                }
            }
            Err(e) => out.push_str(&format!("Field: error: {e}\n")),
        }
        (out, String::new(), 0)
    } else {
        match serde_json::to_string_pretty(&rep) {
            Ok(s) => (s + "\n", String::new(), 0),
            Err(e) => (String::new(), format!("cannot serialise: {e}\n"), 1),
        }
    }
}
