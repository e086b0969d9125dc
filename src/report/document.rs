//! A `check` report written one engine at a time, so a field of any size is reported without
//! holding it. Each layout is a head, the engines with a separator between them, and a foot:
//!
//! | layout   | head                            | between        | foot                        |
//! |----------|---------------------------------|----------------|-----------------------------|
//! | text     | —                               | a blank line   | the field table (2+ engines)|
//! | JSON     | `{ "schema": …, "engines": [`   | `,`            | `] }`                       |
//! | HTML     | the page head, titled by the first engine | a page break | the page's end        |
//! | Markdown | —                               | a rule (`---`) | —                           |
//!
//! Engines are added in the order they were named, each to one of the document's groups (one
//! group keeps that order; `--sort result` uses three). A group's engines go to a spool, a
//! temporary file once it outgrows memory, and are copied out in group order at the end;
//! the field table's rows are spooled the same way while its column widths are kept, so the
//! table is laid out as if it had been built whole. The bytes are the same as the
//! whole-field renderers' ([`super::json::document`], [`super::html::page`],
//! [`super::markdown::document`]), which are this module applied to a slice.

use std::io::{self, Read, Seek, Write};

use tempfile::SpooledTempFile;

use super::view::EngineView;
use super::{html, json, markdown, text};
use crate::evaluate::outcome::{EngineReport, EngineResult};

/// How a document is laid out.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Layout {
    /// The text report, with the field table after two or more engines.
    Text,
    /// One JSON document (schema [`json::SCHEMA`]).
    Json,
    /// One HTML page, a tech sheet per engine.
    Html,
    /// Markdown, the engines separated by a rule.
    Markdown,
}

/// Bytes a spool keeps in memory before it moves to a temporary file.
const SPOOL_IN_MEMORY: usize = 1 << 20;

/// One engine's part of a document, rendered: all the document needs of the engine.
#[derive(Debug)]
pub struct Rendered {
    /// The engine's own text in the layout.
    body: String,
    /// Its row of the field table (text only).
    row: Option<[String; 5]>,
    /// The page title, were this engine the page's first (HTML only).
    title: Option<String>,
    /// Its result, which the field table counts.
    result: EngineResult,
}

impl Rendered {
    /// The engine's report laid out as `layout` wants.
    pub fn new(layout: Layout, report: &EngineReport) -> Rendered {
        let result = report.result();
        match layout {
            Layout::Text => Rendered {
                body: text::engine(report),
                row: Some(field_row(report)),
                title: None,
                result,
            },
            Layout::Json => Rendered::of_view(json::engine(&EngineView::new(report)), result),
            Layout::Markdown => {
                Rendered::of_view(markdown::engine(&EngineView::new(report)), result)
            }
            Layout::Html => {
                let view = EngineView::new(report);
                Rendered {
                    body: html::engine(&view),
                    row: None,
                    title: Some(html::title(&view)),
                    result,
                }
            }
        }
    }

    fn of_view(body: String, result: EngineResult) -> Rendered {
        Rendered {
            body,
            row: None,
            title: None,
            result,
        }
    }
}

/// A document being built: engines added in order to groups, written out at the end.
pub struct Document {
    layout: Layout,
    groups: Vec<Group>,
    table: FieldTable,
}

/// The engines of one group, spooled.
struct Group {
    body: SpooledTempFile,
    rows: SpooledTempFile,
    engines: usize,
    title: Option<String>,
}

impl Group {
    fn new() -> Group {
        Group {
            body: SpooledTempFile::new(SPOOL_IN_MEMORY),
            rows: SpooledTempFile::new(SPOOL_IN_MEMORY),
            engines: 0,
            title: None,
        }
    }
}

impl Document {
    /// An empty document of `groups` groups (at least one), written in group order.
    pub fn new(layout: Layout, groups: usize) -> Document {
        Document {
            layout,
            groups: (0..groups.max(1)).map(|_| Group::new()).collect(),
            table: FieldTable::default(),
        }
    }

    /// Adds an engine at the end of `group` (the last group when out of range); fails only
    /// when a spool cannot be written.
    pub fn add(&mut self, group: usize, engine: Rendered) -> io::Result<()> {
        let last = self.groups.len() - 1;
        let layout = self.layout;
        let group = &mut self.groups[group.min(last)];
        if group.engines > 0 {
            group.body.write_all(separator(layout).as_bytes())?;
        }
        group.body.write_all(engine.body.as_bytes())?;
        if group.title.is_none() {
            group.title = engine.title;
        }
        if let Some(row) = engine.row {
            self.table.widen(&row);
            write_row(&mut group.rows, &row)?;
        }
        self.table.count(engine.result);
        group.engines += 1;
        Ok(())
    }

    /// How many engines the document holds.
    pub fn engines(&self) -> usize {
        self.groups.iter().map(|g| g.engines).sum()
    }

    /// Writes the whole document to `out`: head, every group's engines, the text field
    /// table, `closing` (a section some runs add after the engines), foot.
    pub fn finish(mut self, out: &mut dyn Write, closing: &str) -> io::Result<()> {
        let layout = self.layout;
        let title = self.groups.iter().find_map(|g| g.title.clone());
        let engines = self.engines();
        out.write_all(head(layout, title.as_deref().unwrap_or_default(), engines).as_bytes())?;
        let mut first = true;
        for group in self.groups.iter_mut().filter(|g| g.engines > 0) {
            if !first {
                out.write_all(separator(layout).as_bytes())?;
            }
            first = false;
            group.body.rewind()?;
            io::copy(&mut group.body, out)?;
        }
        if layout == Layout::Text && self.table.total > 1 {
            out.write_all(b"\n")?;
            self.write_field_table(out)?;
        }
        out.write_all(closing.as_bytes())?;
        out.write_all(foot(layout, engines).as_bytes())
    }

    fn write_field_table(&mut self, out: &mut dyn Write) -> io::Result<()> {
        out.write_all(b"field\n")?;
        out.write_all(
            self.table
                .line(&FIELD_TABLE_HEADER.map(str::to_string))
                .as_bytes(),
        )?;
        for group in self.groups.iter_mut() {
            group.rows.rewind()?;
            for _ in 0..group.engines {
                let row = read_row(&mut group.rows)?;
                out.write_all(self.table.line(&row).as_bytes())?;
            }
        }
        out.write_all(self.table.totals().as_bytes())
    }
}

/// The whole document for `reports`, in their order, as one string.
pub fn whole(layout: Layout, reports: &[EngineReport]) -> String {
    let mut document = Document::new(layout, 1);
    let mut out = Vec::new();
    // spools and a Vec only fail when a temporary file cannot be written
    let written = reports
        .iter()
        .try_for_each(|r| document.add(0, Rendered::new(layout, r)))
        .and_then(|()| document.finish(&mut out, ""));
    if written.is_err() {
        return String::new();
    }
    String::from_utf8(out).unwrap_or_default()
}

/// What comes before the engines.
fn head(layout: Layout, title: &str, engines: usize) -> String {
    match layout {
        Layout::Json => json::head(engines),
        Layout::Html => html::head(title),
        Layout::Text | Layout::Markdown => String::new(),
    }
}

/// What comes between two engines.
fn separator(layout: Layout) -> &'static str {
    match layout {
        Layout::Text => "\n",
        Layout::Json => ",\n",
        Layout::Html => html::PAGE_BREAK,
        Layout::Markdown => "\n---\n\n",
    }
}

/// What comes after the engines (the text field table is written before this).
fn foot(layout: Layout, engines: usize) -> String {
    match layout {
        Layout::Json => json::foot(engines),
        Layout::Html => html::FOOT.to_string(),
        Layout::Text | Layout::Markdown => String::new(),
    }
}

/// The field table's column heads.
const FIELD_TABLE_HEADER: [&str; 5] = ["engine", "car", "class", "result", "closest call"];

/// The closing table of a text report over several engines, as it is gathered: its column
/// widths and the count of each result.
#[derive(Debug, Default)]
struct FieldTable {
    widths: [usize; 5],
    total: usize,
    legal: usize,
    illegal: usize,
    not_all_clear: usize,
}

impl FieldTable {
    fn widen(&mut self, row: &[String; 5]) {
        for (width, cell) in self.widths.iter_mut().zip(row) {
            *width = (*width).max(cell.chars().count());
        }
    }

    fn count(&mut self, result: EngineResult) {
        self.total += 1;
        match result {
            EngineResult::Legal => self.legal += 1,
            EngineResult::Illegal => self.illegal += 1,
            EngineResult::NotAllClear => self.not_all_clear += 1,
        }
    }

    /// One row, each cell padded to its column's width (the heads count too).
    fn line(&self, row: &[String; 5]) -> String {
        let cells: Vec<String> = row
            .iter()
            .zip(self.widths.iter().zip(FIELD_TABLE_HEADER))
            .map(|(cell, (width, head))| {
                let w = (*width).max(head.chars().count());
                format!("{cell:<w$}")
            })
            .collect();
        format!("  {}\n", cells.join("  ").trim_end())
    }

    fn totals(&self) -> String {
        format!(
            "{}: {} legal, {} illegal, {} not all clear\n",
            super::format::count(self.total, "engine", "engines"),
            self.legal,
            self.illegal,
            self.not_all_clear
        )
    }
}

/// An engine's row of the field table.
fn field_row(r: &EngineReport) -> [String; 5] {
    let engine = r
        .declaration
        .identity
        .engine
        .clone()
        .unwrap_or_else(|| r.declaration.path.display().to_string());
    let car = r.declaration.identity.car.as_deref().unwrap_or("—");
    [
        engine,
        car.to_string(),
        r.class.name.clone(),
        r.result().short_words().to_string(),
        super::view::closest_call(r)
            .map(|c| c.words())
            .unwrap_or_default(),
    ]
}

/// Writes a row to a spool, each cell a part ([`crate::spool`]).
fn write_row(spool: &mut impl Write, row: &[String; 5]) -> io::Result<()> {
    row.iter()
        .try_for_each(|cell| crate::spool::write_part(spool, cell.as_bytes()))
}

/// Reads back a row [`write_row`] wrote.
fn read_row(spool: &mut impl Read) -> io::Result<[String; 5]> {
    let mut row: [String; 5] = Default::default();
    for cell in &mut row {
        *cell = crate::spool::read_text(spool)?;
    }
    Ok(row)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_spooled_row_reads_back_as_written() {
        let row = ["TV-1", "", "Street Stock", "legal", "3.3 — ½ €"].map(str::to_string);
        let mut spool = SpooledTempFile::new(16);
        write_row(&mut spool, &row)
            .and_then(|()| write_row(&mut spool, &row))
            .unwrap_or_default();
        spool.rewind().unwrap_or_default();
        for _ in 0..2 {
            assert_eq!(read_row(&mut spool).ok(), Some(row.clone()));
        }
    }

    #[test]
    fn table_cells_are_padded_to_the_widest_cell_or_head_in_characters() {
        let mut table = FieldTable::default();
        let row = ["é1", "7", "c", "legal", ""].map(str::to_string);
        table.widen(&row);
        table.widen(&["engine-long", "", "", "", ""].map(str::to_string));
        assert_eq!(table.line(&row), "  é1           7    c      legal\n");
    }
}
