//! gonogo checks racing engines against a series' class rules.
//!
//! The pipeline, one module per stage: [`parse`] turns rulebook text into a syntax tree,
//! [`check`] resolves names and units and runs the static checks, and the command line in
//! `main.rs` renders what they found. [`units`] holds the unit table; [`diagnostic`] the
//! problem type every stage reports.

pub mod check;
pub mod commands;
pub mod compare;
pub mod diagnostic;
pub mod evaluate;
pub mod exit;
pub mod impact;
pub mod load;
pub mod parallel;
pub mod parse;
pub mod report;
pub mod source;
pub mod suggest;
pub mod units;
