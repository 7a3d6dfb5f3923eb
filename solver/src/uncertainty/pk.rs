//! Standard uncertainty of each library system's pK steps, with where each figure comes from.

use serde::Serialize;

/// Standard uncertainty of one dissociation step's pK (25 °C, I = 0).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PkUncertainty {
    /// System id.
    pub system: &'static str,
    /// Step, 1-based.
    pub step: usize,
    /// Standard uncertainty of the pK.
    pub u_pk: f64,
    /// Where the figure comes from, and whether it is an estimate.
    pub source: &'static str,
}

const EST_WELL: &str = "estimate (well-studied step; Goldberg, Kishore & Lennen 2002 and NIST \
     SRD 46 agree within 0.001–0.003; the compilation's per-entry figures were not re-read)";
const EST_GOOD: &str = "estimate (Good's buffer, one or two emf studies; of the size Goldberg, \
     Kishore & Lennen 2002 give, per-entry figures not re-read)";
const EST_FEW: &str = "estimate (few measurements; Goldberg, Kishore & Lennen 2002, per-entry \
     figures not re-read)";
const EST_FORMULA: &str =
    "estimate (system-specific formula; scatter of the fitted data, not re-read)";

/// Per-step pK uncertainties of the library systems.
pub const PK_UNCERTAINTY: &[PkUncertainty] = &[
    pk("acetate", 1, 0.003, EST_WELL),
    pk("formate", 1, 0.005, EST_WELL),
    pk("citrate", 1, 0.005, EST_WELL),
    pk("citrate", 2, 0.005, EST_WELL),
    pk("citrate", 3, 0.005, EST_WELL),
    pk("phosphate", 1, 0.005, EST_WELL),
    pk("phosphate", 2, 0.003, EST_WELL),
    pk(
        "phosphate",
        3,
        0.03,
        "estimate: Goldberg et al. (2002) 12.35 and NIST SRD 46 12.375 differ by 0.025",
    ),
    pk("carbonate", 1, 0.005, EST_FORMULA),
    pk("carbonate", 2, 0.005, EST_FORMULA),
    pk("borate", 1, 0.005, EST_FORMULA),
    pk("ammonium", 1, 0.005, EST_FORMULA),
    pk("tris", 1, 0.003, EST_FORMULA),
    pk("hepes", 1, 0.005, EST_GOOD),
    pk("mes", 1, 0.005, EST_GOOD),
    pk("mops", 1, 0.01, EST_FEW),
    pk(
        "pipes",
        1,
        0.1,
        "estimate: the value 2.67 itself is from memory, held constant",
    ),
    pk("pipes", 2, 0.01, EST_FEW),
    pk("bicine", 1, 0.01, EST_FEW),
    pk("tricine", 1, 0.01, EST_FEW),
    pk("glycine", 1, 0.005, EST_WELL),
    pk("glycine", 2, 0.005, EST_WELL),
    pk("succinate", 1, 0.01, EST_FEW),
    pk("succinate", 2, 0.01, EST_FEW),
    pk("imidazole", 1, 0.01, EST_FEW),
    pk("bistris", 1, 0.005, EST_GOOD),
    pk("aces", 1, 0.005, EST_FORMULA),
    pk("ches", 1, 0.005, EST_FORMULA),
    pk("caps", 1, 0.01, EST_FEW),
    pk("tes", 1, 0.005, EST_GOOD),
    pk("phthalate", 1, 0.01, EST_FEW),
    pk("phthalate", 2, 0.005, EST_WELL),
    pk(
        "hypochlorous",
        1,
        0.01,
        "estimate: Morris (1966) formula from memory",
    ),
    pk(
        "sulfide",
        1,
        0.02,
        "Millero (1988): ±0.02 as given, taken as a standard uncertainty",
    ),
];

const fn pk(system: &'static str, step: usize, u_pk: f64, source: &'static str) -> PkUncertainty {
    PkUncertainty {
        system,
        step,
        u_pk,
        source,
    }
}

/// Standard uncertainty assumed for a step not in [`PK_UNCERTAINTY`] (a
/// user-defined system).
pub const DEFAULT_U_PK: f64 = 0.02;

/// u(pK) and its source for a system's step (1-based). Steps not in the
/// table (user-defined systems) get [`DEFAULT_U_PK`], marked as an estimate.
pub fn pk_uncertainty(system: &str, step: usize) -> (f64, &'static str) {
    PK_UNCERTAINTY
        .iter()
        .find(|e| e.system == system && e.step == step)
        .map_or(
            (
                DEFAULT_U_PK,
                "estimate for a constant not in the library's table",
            ),
            |e| (e.u_pk, e.source),
        )
}
