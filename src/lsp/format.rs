//! Formatting: the whole document replaced by the canonical printer's text (what `gonogo fmt`
//! writes). The printer keeps no comments yet, so a document with a comment is refused rather
//! than stripped of it, and so is one that does not parse.

use lsp_types::{Position, Range, TextEdit};

use crate::parse::parse_rulebook;
use crate::parse::print::canonical;

/// The edit that puts `text` in canonical form (none when it already is), or why not.
pub fn edits(text: &str) -> Result<Vec<TextEdit>, String> {
    if has_comment(text) {
        return Err(
            "not formatted: the canonical printer keeps no comments yet, and this file has one"
                .to_string(),
        );
    }
    let (book, problems) = parse_rulebook(0, text);
    if let Some(first) = problems.first() {
        return Err(format!(
            "not formatted: the file does not parse ({})",
            first.message
        ));
    }
    let printed = canonical(&book);
    if printed == text {
        return Ok(Vec::new());
    }
    let lines = u32::try_from(text.lines().count() + 1).unwrap_or(u32::MAX);
    Ok(vec![TextEdit::new(
        Range::new(Position::new(0, 0), Position::new(lines, 0)),
        printed,
    )])
}

/// Whether a `#` outside a string starts a comment somewhere (a `#` in a pattern counts too,
/// which only refuses formatting where it need not).
fn has_comment(text: &str) -> bool {
    text.lines().any(|line| {
        let mut in_string = false;
        let mut escaped = false;
        for c in line.chars() {
            match c {
                _ if escaped => escaped = false,
                '\\' if in_string => escaped = true,
                '"' => in_string = !in_string,
                '#' if !in_string => return true,
                _ => {}
            }
        }
        false
    })
}

#[cfg(test)]
mod tests {
    use super::{edits, has_comment};

    #[test]
    fn comments_outside_strings_are_found() {
        assert!(has_comment("series \"x\"\n# a comment\n"));
        assert!(!has_comment("series \"club #4\"\n"));
    }

    #[test]
    fn a_file_with_a_comment_is_not_formatted() {
        let found = edits("# c\nseries \"x\"\n");
        assert!(found.is_err_and(|e| e.contains("comment")));
    }
}
