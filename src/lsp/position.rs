//! Byte offsets of a source file as LSP positions and back. The protocol counts a line's
//! characters in UTF-16 code units (LSP 3.17, "Position": the default and only encoding every
//! client must accept), so `±` is one unit and a character outside the Basic Multilingual
//! Plane is two.

use lsp_types::{Position, Range};

use crate::source::{SourceFile, Span, floor_char_boundary};

/// The position of a byte offset.
pub fn position(file: &SourceFile, offset: usize) -> Position {
    let at = floor_char_boundary(&file.text, offset);
    let line = file.line_of(at);
    let start = file.line_start(line);
    let units: usize = file.text[start..at].chars().map(char::len_utf16).sum();
    Position::new(to_u32(line), to_u32(units))
}

/// The range a span covers.
pub fn range(file: &SourceFile, span: Span) -> Range {
    Range::new(position(file, span.start), position(file, span.end))
}

/// The byte offset of a position: past the end of a line is its end, past the last line is
/// the end of the text, and a position inside a surrogate pair is the character's start.
pub fn offset(file: &SourceFile, at: Position) -> usize {
    let text = &file.text;
    let line = at.line as usize;
    let start = file.line_start(line);
    if start >= text.len() {
        return text.len();
    }
    let mut units = 0usize;
    for (i, c) in text[start..].char_indices() {
        if c == '\n' || units + c.len_utf16() > at.character as usize {
            return start + i;
        }
        units += c.len_utf16();
    }
    text.len()
}

fn to_u32(n: usize) -> u32 {
    u32::try_from(n).unwrap_or(u32::MAX)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::SourceMap;

    /// The LSP specification (3.17, "Text Documents", Position) counts UTF-16 code units: its
    /// own example is `a𐐀b`, where `b` is at character 3 because `𐐀` takes two units.
    #[test]
    fn characters_are_counted_in_utf16_code_units() {
        let mut map = SourceMap::default();
        let id = map.add("a.rules".into(), "x\na𐐀b ±1 mm\n".into());
        let file = map.file(id);
        let b = file.text.find('b').unwrap_or_default();
        assert_eq!(position(file, b), Position::new(1, 3));
        assert_eq!(offset(file, Position::new(1, 3)), b);
        // `±` is one UTF-16 unit and two UTF-8 bytes
        let one = file.text.find('1').unwrap_or_default();
        assert_eq!(position(file, one), Position::new(1, 6));
        assert_eq!(offset(file, Position::new(1, 6)), one);
        // past the end of a line is its end; past the last line is the end of the text
        assert_eq!(offset(file, Position::new(0, 40)), 1);
        assert_eq!(offset(file, Position::new(9, 0)), file.text.len());
    }
}
