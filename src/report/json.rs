//! The JSON report of `gonogo check`, schema `gonogo.check/2` (documented in README.md,
//! `schemas/check.schema.json`): the [`EngineView`] of each engine, serialised. Numbers are
//! given in the unit named beside them; each engine lists its inputs and derived values once,
//! with ids, and each rule's trace refers to them by id.

use serde::Serialize;

use super::view::EngineView;
use crate::evaluate::outcome::EngineReport;

/// Schema name and version of the document.
pub const SCHEMA: &str = "gonogo.check/2";

/// The document for one or more engines.
pub fn document(reports: &[EngineReport]) -> String {
    let views: Vec<EngineView> = reports.iter().map(EngineView::new).collect();
    document_of(&views)
}

/// The document for one or more engines' views.
pub fn document_of(views: &[EngineView]) -> String {
    let doc = Document {
        schema: SCHEMA,
        engines: views,
    };
    // serialising plain data to a string cannot fail; an empty document would fail its schema
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

#[derive(Serialize)]
struct Document<'a> {
    schema: &'static str,
    engines: &'a [EngineView],
}
