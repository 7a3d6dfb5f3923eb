//! The solver's integration tests as one binary (one link step instead of one per file):
//! each file here is a module; sources and tolerances per file are in `../README.md`.

mod atmosphere;
mod atmosphere_cli;
mod bench_workflow;
mod cli;
mod cli_bench;
mod document_rules;
mod field_water;
mod log_cli;
mod log_fast_path;
mod meter;
mod meter_cli;
mod migration;
mod properties;
mod reagents;
mod reference_data;
mod schema;
mod seawater_ammonia;
mod selfcheck;
mod selfcheck_cli;
mod standards;
mod tidy;
mod titration_from_ph;
mod titration_volume;
mod uncertainty;
mod uncertainty_cli;
