//! The source a diagnostic echoes, cut to a readable width. A line longer than
//! [`MAX_LINE_BYTES`] is shown only around the labels on it, with `…` where text is left
//! out, and a line with no label on it only by its beginning; a label longer than
//! [`MAX_LABEL_BYTES`] is underlined by its start. The labels are moved to where their text
//! stands in the cut copy, so no label ever stands at a column the renderer cannot draw
//! and one error on a line of a million characters prints a few lines. Line numbers and the
//! `file:line:column` header still name the place in the real file.

use std::sync::Arc;

use miette::{MietteError, MietteSpanContents, SourceCode, SourceSpan, SpanContents};

/// Lines up to this many bytes are shown whole.
pub const MAX_LINE_BYTES: usize = 200;

/// Bytes shown on each side of a label on a long line.
const MARGIN_BYTES: usize = 40;

/// Longest label underlined on a long line, in bytes; a longer one is cut to its start.
pub const MAX_LABEL_BYTES: usize = 80;

/// What stands where text was left out.
const ELLIPSIS: &str = "…";

/// A run of bytes copied from the file: where it starts in the file, where in the copy, and
/// its length.
#[derive(Clone, Copy, Debug)]
struct Piece {
    original: usize,
    shown: usize,
    len: usize,
}

/// A file's text with its long lines cut, and the way back to the real offsets.
#[derive(Debug)]
pub struct Window {
    name: String,
    original: Arc<str>,
    shown: String,
    pieces: Vec<Piece>,
}

impl Window {
    /// The text of `name` cut around the labels (byte ranges of `original`), or `None` when
    /// no line is long and the text can be shown as it is.
    pub fn new(name: String, original: Arc<str>, labels: &[(usize, usize)]) -> Option<Window> {
        if !original.split('\n').any(|line| line.len() > MAX_LINE_BYTES) {
            return None;
        }
        let keep = kept_ranges(&original, labels);
        let mut window = Window {
            name,
            original: original.clone(),
            shown: String::with_capacity(original.len().min(1 << 16)),
            pieces: Vec::new(),
        };
        let mut line_start = 0;
        for line in original.split_inclusive('\n') {
            window.push_line(line_start, line, &keep);
            line_start += line.len();
        }
        Some(window)
    }

    /// A label's range as it stands in the cut copy: cut to [`MAX_LABEL_BYTES`] when it is
    /// longer and on one long line.
    pub fn span(&self, start: usize, end: usize) -> SourceSpan {
        let (start, end) = shown_label(&self.original, start, end);
        let (from, to) = (self.to_shown(start), self.to_shown(end));
        SourceSpan::new(from.into(), to.saturating_sub(from))
    }

    fn push_line(&mut self, line_start: usize, line: &str, keep: &[(usize, usize)]) {
        let body_len = line.trim_end_matches(['\n', '\r']).len();
        if line.len() <= MAX_LINE_BYTES {
            self.copy(line_start, line_start + line.len());
            return;
        }
        let line_end = line_start + body_len;
        let mut ranges: Vec<(usize, usize)> = keep
            .iter()
            .filter(|(s, e)| *s <= line_end && *e >= line_start)
            .map(|(s, e)| ((*s).max(line_start), (*e).min(line_end)))
            .collect();
        if ranges.is_empty() {
            ranges.push((line_start, line_start + MAX_LINE_BYTES / 2));
        }
        let mut at = line_start;
        for (s, e) in merge(ranges) {
            let (s, e) = (self.floor(s.max(at)), self.floor(e));
            if s > at {
                self.shown.push_str(ELLIPSIS);
            }
            self.copy(s, e.max(s));
            at = e.max(s);
        }
        if at < line_end {
            self.shown.push_str(ELLIPSIS);
        }
        self.copy(line_end, line_start + line.len());
    }

    fn copy(&mut self, from: usize, to: usize) {
        if to > from {
            self.pieces.push(Piece {
                original: from,
                shown: self.shown.len(),
                len: to - from,
            });
            self.shown.push_str(&self.original[from..to]);
        }
    }

    fn floor(&self, at: usize) -> usize {
        crate::source::floor_char_boundary(&self.original, at)
    }

    /// Where a byte of the file stands in the copy (the next kept byte if it was left out).
    fn to_shown(&self, original: usize) -> usize {
        let i = self
            .pieces
            .partition_point(|p| p.original + p.len < original);
        match self.pieces.get(i) {
            Some(p) if original >= p.original => p.shown + (original - p.original),
            Some(p) => p.shown,
            None => self.shown.len(),
        }
    }

    /// Where a byte of the copy came from in the file.
    fn to_original(&self, shown: usize) -> usize {
        let i = self.pieces.partition_point(|p| p.shown + p.len < shown);
        match self.pieces.get(i) {
            Some(p) if shown >= p.shown => p.original + (shown - p.shown).min(p.len),
            Some(p) => p.original,
            None => self.original.len(),
        }
    }
}

impl SourceCode for Window {
    fn read_span<'a>(
        &'a self,
        span: &SourceSpan,
        context_lines_before: usize,
        context_lines_after: usize,
    ) -> Result<Box<dyn SpanContents<'a> + 'a>, MietteError> {
        let contents =
            self.shown
                .as_str()
                .read_span(span, context_lines_before, context_lines_after)?;
        // the header's line and column are those of the real file
        let start = self.to_original(contents.span().offset());
        let real = self
            .original
            .as_ref()
            .read_span(&SourceSpan::new(start.into(), 0), 0, 0)?;
        let column = if context_lines_before == 0 {
            real.column()
        } else {
            contents.column()
        };
        Ok(Box::new(MietteSpanContents::new_named(
            self.name.clone(),
            contents.data(),
            *contents.span(),
            real.line(),
            column,
            contents.line_count(),
        )))
    }
}

/// A label's range with a long label on one line cut to its first [`MAX_LABEL_BYTES`].
fn shown_label(text: &str, start: usize, end: usize) -> (usize, usize) {
    let end = end.min(text.len()).max(start);
    let one_line = !text.get(start..end).unwrap_or("").contains('\n');
    if one_line && end - start > MAX_LABEL_BYTES {
        (
            start,
            crate::source::floor_char_boundary(text, start + MAX_LABEL_BYTES),
        )
    } else {
        (start, end)
    }
}

/// The ranges of the file to keep: a margin around each label's start and end.
fn kept_ranges(text: &str, labels: &[(usize, usize)]) -> Vec<(usize, usize)> {
    let mut keep = Vec::new();
    for &(start, end) in labels {
        let (start, end) = shown_label(text, start, end);
        let around = |at: usize| (at.saturating_sub(MARGIN_BYTES), at + MARGIN_BYTES);
        if text.get(start..end).is_some_and(|t| t.contains('\n')) {
            keep.push(around(start));
            keep.push(around(end));
        } else {
            keep.push((start.saturating_sub(MARGIN_BYTES), end + MARGIN_BYTES));
        }
    }
    keep
}

/// Sorted, overlapping ranges joined.
fn merge(mut ranges: Vec<(usize, usize)>) -> Vec<(usize, usize)> {
    ranges.sort_unstable();
    let mut out: Vec<(usize, usize)> = Vec::new();
    for (s, e) in ranges {
        match out.last_mut() {
            Some(last) if s <= last.1 => last.1 = last.1.max(e),
            _ => out.push((s, e)),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn short_lines_are_shown_as_they_are() {
        let text: Arc<str> = "series \"S\"\nrule 1\n".into();
        assert!(Window::new("a.rules".into(), text, &[(0, 6)]).is_none());
    }

    #[test]
    fn a_long_line_is_cut_around_its_label_and_the_label_moves_with_it() {
        let line = format!("{}BAD{}", "x".repeat(70_000), "y".repeat(30_000));
        let text: Arc<str> = format!("first\n{line}\nlast\n").into();
        let start = 6 + 70_000;
        let window = Window::new("a.rules".into(), text.clone(), &[(start, start + 3)])
            .unwrap_or_else(|| panic!("a 100k line must be cut"));
        assert!(window.shown.len() < 300, "{}", window.shown.len());
        assert!(window.shown.starts_with("first\n…x"));
        assert!(window.shown.ends_with("y…\nlast\n"));
        let span = window.span(start, start + 3);
        assert_eq!(
            &window.shown[span.offset()..span.offset() + span.len()],
            "BAD"
        );
        assert_eq!(window.to_original(span.offset()), start);
    }

    #[test]
    fn a_long_label_is_underlined_by_its_start() {
        let text: Arc<str> = format!("\"{}\"\n", "z".repeat(5_000)).into();
        let window =
            Window::new("a.rules".into(), text, &[(0, 5_002)]).unwrap_or_else(|| panic!("cut"));
        let span = window.span(0, 5_002);
        assert_eq!(span.offset(), 0);
        assert_eq!(span.len(), MAX_LABEL_BYTES);
    }
}
