//! Building blocks every workspace uses: validated number inputs and choices,
//! parsing and number formatting, and the safety cautions panel.

pub mod answer;
pub mod cautions;
pub mod format;
pub mod inputs;
pub mod uncertainty;

#[cfg(test)]
mod tests;
