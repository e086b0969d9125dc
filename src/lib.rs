//! gonogo checks racing engines against a series' class rules.
//!
//! The pipeline, one module per stage, in order:
//!
//! 1. [`source`] reads files under a size cap into a source map, and [`parse`] turns rulebook
//!    text into a syntax tree (with its includes);
//! 2. [`check`] resolves names, units and built-ins into a resolved tree, puts every limit in
//!    one normal form, flattens classes and bulletins, and runs the static checks;
//! 3. [`load`] reads an engine declaration (YAML) against the checked rulebook's schema, every
//!    measured value with its unit, uncertainty and input id;
//! 4. [`evaluate`] folds each rule of the class over the declaration: values with exact
//!    sensitivities, findings, probabilities of conformance, verdicts and traces;
//! 5. [`analyze`] builds the officials' and builders' analyses on that: edition comparison,
//!    field impact, headroom;
//! 6. [`report`] turns an evaluated engine into one view and renders it as text, Markdown,
//!    HTML or JSON, besides sheets, explanations, diffs, impact and headroom reports.
//!
//! [`commands`] runs each subcommand through these stages and returns its document or its
//! problems, which `main.rs` renders once. Beside the stages: [`units`] the unit table,
//! [`color`] whether a stream gets colour, [`diagnostic`] the problem type and the table of
//! codes every stage reports with,
//! [`digest`] the SHA-256 fingerprints of a check's inputs, [`suggest`] "did you mean", [`exit`] the exit statuses, [`output`] writing a document
//! without ever costing an input, [`manual`] the manual pages, [`parallel`] an order-preserving map
//! over threads for fields of engines.

pub mod analyze;
pub mod check;
pub mod color;
pub mod commands;
pub mod diagnostic;
pub mod digest;
pub mod evaluate;
pub mod exit;
pub mod load;
pub mod lsp;
pub mod manual;
pub mod output;
pub mod parallel;
pub mod parse;
pub mod report;
pub mod season;
pub mod source;
pub mod spool;
pub mod suggest;
pub mod units;
