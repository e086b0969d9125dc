//! The JSON report of `gonogo check`, schema `gonogo.check/2` (documented in README.md,
//! `schemas/check.schema.json`): the [`EngineView`] of each engine, serialised. Numbers are
//! given in the unit named beside them; each engine lists its inputs and derived values once,
//! with ids, and each rule's trace refers to them by id.
//!
//! The document is written in pieces ([`head`], one [`engine`] per engine separated by `,`
//! and a line break, [`foot`]) so a field of any size can be streamed
//! ([`super::document`]); the pieces put together are byte for byte what `serde_json`'s
//! pretty printer gives for the whole document (tested below).

use super::document::{Layout, whole};
use super::view::EngineView;
use crate::evaluate::outcome::EngineReport;

/// Schema name and version of the document.
pub const SCHEMA: &str = "gonogo.check/2";

/// Indentation of an engine inside the document's `engines` array.
const ENGINE_INDENT: &str = "    ";

/// The document for one or more engines.
pub fn document(reports: &[EngineReport]) -> String {
    whole(Layout::Json, reports)
}

/// The document for one or more engines' views.
pub fn document_of(views: &[EngineView]) -> String {
    let engines: Vec<String> = views.iter().map(engine).collect();
    format!(
        "{}{}{}",
        head(views.len()),
        engines.join(",\n"),
        foot(views.len())
    )
}

/// The document up to its first engine, for a document of `engines` engines.
pub fn head(engines: usize) -> String {
    let open = if engines == 0 { "[]" } else { "[\n" };
    format!("{{\n  \"schema\": \"{SCHEMA}\",\n  \"engines\": {open}")
}

/// One engine's object, indented as it stands in the `engines` array, without a line break
/// after it.
pub fn engine(view: &EngineView) -> String {
    indented(view)
}

/// A value pretty-printed and indented as an element of the `engines` array.
fn indented(value: &impl serde::Serialize) -> String {
    // serialising plain data to a string cannot fail; an empty object would fail the schema
    let object = serde_json::to_string_pretty(value).unwrap_or_default();
    let mut out = String::with_capacity(object.len() + object.len() / 8);
    for (i, line) in object.split('\n').enumerate() {
        if i > 0 {
            out.push('\n');
        }
        out.push_str(ENGINE_INDENT);
        out.push_str(line);
    }
    out
}

/// The document after its last engine.
pub fn foot(engines: usize) -> String {
    if engines == 0 {
        "\n}\n".to_string()
    } else {
        "\n  ]\n}\n".to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde::Serialize;

    /// What the whole document serialised at once looks like.
    #[derive(Serialize)]
    struct Whole<'a> {
        schema: &'static str,
        engines: &'a [serde_json::Value],
    }

    fn at_once(engines: &[serde_json::Value]) -> String {
        let doc = Whole {
            schema: SCHEMA,
            engines,
        };
        serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
    }

    fn in_pieces(engines: &[serde_json::Value]) -> String {
        let bodies: Vec<String> = engines.iter().map(indented).collect();
        format!(
            "{}{}{}",
            head(engines.len()),
            bodies.join(",\n"),
            foot(engines.len())
        )
    }

    #[test]
    fn pieces_put_together_are_the_pretty_printed_document() {
        let engine = serde_json::json!({
            "id": "TV-1", "rules": [], "empty": {}, "nested": {"a": [1, {"b": "x\ny"}]}
        });
        for count in 0..3 {
            let engines = vec![engine.clone(); count];
            assert_eq!(in_pieces(&engines), at_once(&engines), "{count} engines");
        }
    }
}
