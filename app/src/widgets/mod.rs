//! Building blocks every workspace uses: validated number inputs and choices,
//! parsing and number formatting, and the safety cautions panel.

pub mod answer;
pub mod cautions;
pub mod field;
pub mod format;
pub mod inputs;
mod roundtrip;
pub mod rows;
pub mod uncertainty;

#[cfg(test)]
mod tests;
