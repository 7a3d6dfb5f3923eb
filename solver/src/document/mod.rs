//! Documents a user keeps: the design (`design`: schema, migration, validation), the
//! path-keeping JSON reader every document goes through (`docpath`), reagent files
//! (`reagent`), what a whole design gives (`report`), its CO₂ atmospheres (`gas`), and a
//! refused design taken apart by workspace (`salvage`).

pub mod design;
pub mod docpath;
pub mod gas;
pub mod reagent;
pub mod report;
pub mod salvage;

pub use design::{
    parse_design, parse_design_value, to_json, to_json_pretty, validate_design, Design, PlotSource,
    Workspace, SCHEMA_VERSION,
};
pub use report::{demo_design, design_uncertainty, report, DesignUncertainty, Report};
