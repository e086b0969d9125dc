//! The lines of a file around a diagnostic's labels. miette finds the line and column of a
//! span by reading its source from the start, so a rulebook of 20,000 warnings was read from
//! its start 20,000 times; each diagnostic now carries only the lines around its labels, cut
//! with the file's line index, and reports the file's own line numbers.

use std::sync::Arc;

use miette::{MietteError, MietteSpanContents, SourceCode, SourceSpan, SpanContents};

use crate::source::SourceFile;

/// Lines kept before the first label and after the last (miette shows one of each).
const CONTEXT_LINES: usize = 3;

/// The lines around some labels of a file: the text, where it starts in the file, and the
/// file's number of its first line.
#[derive(Debug)]
pub struct Excerpt {
    name: String,
    /// The excerpt's text, whole lines of the file.
    pub text: Arc<str>,
    /// The byte of the file where the excerpt starts.
    pub base: usize,
    first_line: usize,
}

impl Excerpt {
    /// The lines of `file` from [`CONTEXT_LINES`] before the first of `labels` (byte ranges of
    /// the file) to as many after the last.
    pub fn new(file: &SourceFile, labels: &[(usize, usize)]) -> Excerpt {
        let first = labels.iter().map(|l| l.0).min().unwrap_or(0);
        let last = labels.iter().map(|l| l.1).max().unwrap_or(0);
        let first_line = file.line_of(first).saturating_sub(CONTEXT_LINES);
        let end_line = file.line_of(last) + CONTEXT_LINES + 1;
        let base = file.line_start(first_line);
        let end = file.line_start(end_line).max(base);
        Excerpt {
            name: file.path.display().to_string(),
            text: Arc::from(&file.text[base..end]),
            base,
            first_line,
        }
    }

    /// A byte range of the file as a span of the excerpt.
    pub fn span(&self, start: usize, end: usize) -> SourceSpan {
        let start = start.saturating_sub(self.base).min(self.text.len());
        let end = end.saturating_sub(self.base).clamp(start, self.text.len());
        SourceSpan::new(start.into(), end - start)
    }

    /// Contents read from the excerpt (or a cut copy of it) renamed and renumbered as the file.
    pub fn renumbered<'a>(
        &self,
        contents: &(dyn SpanContents<'a> + 'a),
    ) -> Box<dyn SpanContents<'a> + 'a> {
        Box::new(MietteSpanContents::new_named(
            self.name.clone(),
            contents.data(),
            *contents.span(),
            contents.line() + self.first_line,
            contents.column(),
            contents.line_count(),
        ))
    }
}

impl SourceCode for Excerpt {
    fn read_span<'a>(
        &'a self,
        span: &SourceSpan,
        before: usize,
        after: usize,
    ) -> Result<Box<dyn SpanContents<'a> + 'a>, MietteError> {
        let contents = self.text.as_ref().read_span(span, before, after)?;
        Ok(self.renumbered(contents.as_ref()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::path::PathBuf;

    #[test]
    fn an_excerpt_keeps_the_files_line_numbers_and_offsets() {
        let text: String = (1..=100).map(|i| format!("line {i}\n")).collect();
        let file = SourceFile::new(PathBuf::from("x.rules"), Arc::from(text.as_str()));
        let at = text.find("line 50").unwrap_or(0);
        let excerpt = Excerpt::new(&file, &[(at, at + 7)]);
        assert!(excerpt.text.starts_with("line 47\n"), "{}", excerpt.text);
        assert!(excerpt.text.ends_with("line 53\n"), "{}", excerpt.text);
        let span = excerpt.span(at, at + 7);
        let contents = excerpt
            .read_span(&span, 0, 0)
            .unwrap_or_else(|e| panic!("{e}"));
        // miette's lines count from 0: line 50 of the file is 49
        assert_eq!(contents.line(), 49);
        assert_eq!(contents.column(), 0);
        assert_eq!(contents.name(), Some("x.rules"));
    }
}
