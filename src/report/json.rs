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

/// A value pretty-printed and indented as an element of the `engines` array, written in one
/// pass by [`Nested`].
fn indented(value: &impl serde::Serialize) -> String {
    let mut out = ENGINE_INDENT.as_bytes().to_vec();
    let mut serializer = serde_json::Serializer::with_formatter(&mut out, Nested::in_engines());
    // serialising plain data to memory cannot fail; an empty object would fail the schema
    if value.serialize(&mut serializer).is_err() {
        return String::new();
    }
    String::from_utf8(out).unwrap_or_default()
}

/// `serde_json`'s pretty layout (two spaces a level, `": "` after a key, an empty array or
/// object as `[]` or `{}`) begun `depth` levels in, so an engine is laid out as it stands
/// inside the document without re-indenting its text.
struct Nested {
    depth: usize,
    has_value: bool,
}

impl Nested {
    /// Inside the document's object and its `engines` array.
    fn in_engines() -> Nested {
        Nested {
            depth: 2,
            has_value: false,
        }
    }

    fn line<W: ?Sized + std::io::Write>(&self, out: &mut W, first: bool) -> std::io::Result<()> {
        out.write_all(if first { b"\n" } else { b",\n" })?;
        (0..self.depth).try_for_each(|_| out.write_all(b"  "))
    }

    fn close<W: ?Sized + std::io::Write>(
        &mut self,
        out: &mut W,
        end: &[u8],
    ) -> std::io::Result<()> {
        self.depth -= 1;
        if self.has_value {
            out.write_all(b"\n")?;
            (0..self.depth).try_for_each(|_| out.write_all(b"  "))?;
        }
        out.write_all(end)
    }
}

impl serde_json::ser::Formatter for Nested {
    fn begin_array<W: ?Sized + std::io::Write>(&mut self, out: &mut W) -> std::io::Result<()> {
        self.depth += 1;
        self.has_value = false;
        out.write_all(b"[")
    }

    fn end_array<W: ?Sized + std::io::Write>(&mut self, out: &mut W) -> std::io::Result<()> {
        self.close(out, b"]")
    }

    fn begin_array_value<W: ?Sized + std::io::Write>(
        &mut self,
        out: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        self.line(out, first)
    }

    fn end_array_value<W: ?Sized + std::io::Write>(&mut self, _: &mut W) -> std::io::Result<()> {
        self.has_value = true;
        Ok(())
    }

    fn begin_object<W: ?Sized + std::io::Write>(&mut self, out: &mut W) -> std::io::Result<()> {
        self.depth += 1;
        self.has_value = false;
        out.write_all(b"{")
    }

    fn end_object<W: ?Sized + std::io::Write>(&mut self, out: &mut W) -> std::io::Result<()> {
        self.close(out, b"}")
    }

    fn begin_object_key<W: ?Sized + std::io::Write>(
        &mut self,
        out: &mut W,
        first: bool,
    ) -> std::io::Result<()> {
        self.line(out, first)
    }

    fn begin_object_value<W: ?Sized + std::io::Write>(
        &mut self,
        out: &mut W,
    ) -> std::io::Result<()> {
        out.write_all(b": ")
    }

    fn end_object_value<W: ?Sized + std::io::Write>(&mut self, _: &mut W) -> std::io::Result<()> {
        self.has_value = true;
        Ok(())
    }
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
            "id": "TV-1", "rules": [], "empty": {}, "nested": {"a": [1, {"b": "x\ny"}, [], [[2]]]},
            "last": [{"c": null, "d": [true, 1.5e-7]}]
        });
        for count in 0..3 {
            let engines = vec![engine.clone(); count];
            assert_eq!(in_pieces(&engines), at_once(&engines), "{count} engines");
        }
    }
}
