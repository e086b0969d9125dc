//! Formatting: the whole document replaced by the canonical printer's text with its comments
//! and blank lines kept (what `gonogo fmt` writes); a document that does not parse is refused.

use lsp_types::{Position, Range, TextEdit};

use crate::parse::parse_with_comments;
use crate::parse::print::formatted;

/// The edit that puts `text` in canonical form (none when it already is), or why not.
pub fn edits(text: &str) -> Result<Vec<TextEdit>, String> {
    let (book, problems, comments) = parse_with_comments(0, text);
    if let Some(first) = problems.first() {
        return Err(format!(
            "not formatted: the file does not parse ({})",
            first.message
        ));
    }
    let printed = formatted(&book, text, &comments);
    if printed == text {
        return Ok(Vec::new());
    }
    let lines = u32::try_from(text.lines().count() + 1).unwrap_or(u32::MAX);
    Ok(vec![TextEdit::new(
        Range::new(Position::new(0, 0), Position::new(lines, 0)),
        printed,
    )])
}

#[cfg(test)]
mod tests {
    use super::edits;

    #[test]
    fn a_comment_survives_formatting() {
        let found = edits("# c\nseries   \"x\"\n").unwrap_or_default();
        assert_eq!(found.len(), 1);
        assert!(found[0].new_text.starts_with("# c\n"), "{:?}", found[0]);
        assert!(found[0].new_text.contains("series \"x\""), "{:?}", found[0]);
    }

    #[test]
    fn canonical_text_needs_no_edit() {
        let once = edits("# c\nseries   \"x\"\n").unwrap_or_default();
        let again = edits(&once[0].new_text).unwrap_or_default();
        assert!(again.is_empty(), "{again:?}");
    }
}
