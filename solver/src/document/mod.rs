//! Documents a user keeps: the design (`design`: schema, migration, validation), the
//! path-keeping JSON reader every document goes through (`docpath`), reagent files
//! (`reagent`), and what a whole design gives (`report`).

pub mod design;
pub mod docpath;
pub mod reagent;
pub mod report;

pub use design::{
    parse_design, parse_design_value, to_json, to_json_pretty, validate_design, Design, PlotSource,
    Workspace, SCHEMA_VERSION,
};
pub use report::{demo_design, design_uncertainty, report, DesignUncertainty, Report};
