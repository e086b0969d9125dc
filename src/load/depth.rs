//! The nesting of a declaration's flow collections (`[ … ]`, `{ … }`), measured in one pass
//! over the text before the YAML parser sees it. The parser's work grows with the square of
//! that nesting (100,000 nested `[` took 38 s), and no declaration needs more than a few
//! levels, so text nested deeper than [`MAX_FLOW_DEPTH`] is refused at the first bracket
//! past the cap. Block nesting (indentation, `- - -`) costs the parser linear time and is left
//! to it.
//!
//! The scan knows just enough YAML to count brackets as the parser will: comments, quoted
//! scalars, block scalars (`|`, `>`) and plain text in block context are skipped, so a `[`
//! inside a string or a note is never counted. In flow context every bracket outside quotes
//! is a collection, since a plain scalar there cannot hold one.

/// Deepest nesting of flow collections a declaration may have. A declaration uses one or two
/// levels (a list of values, an instrument written `{resolution: …}`).
pub const MAX_FLOW_DEPTH: usize = 64;

/// The byte offset of the first flow bracket nested deeper than [`MAX_FLOW_DEPTH`], if any.
pub fn too_deep(text: &str) -> Option<usize> {
    let body = text.strip_prefix('\u{feff}').unwrap_or(text); // a byte-order mark
    let skipped = text.len() - body.len();
    Scan::default().run(body.as_bytes()).map(|at| at + skipped)
}

/// The state of one scan.
#[derive(Default)]
struct Scan {
    /// Flow collections open here (0 in block context).
    depth: usize,
    /// Whether a node may start here in block context: at a line's first character, after
    /// an indicator (`- `, `: `, `? `) or an anchor or tag.
    node_start: bool,
}

impl Scan {
    fn run(mut self, bytes: &[u8]) -> Option<usize> {
        let mut i = 0;
        let mut line_indent = indent_at(bytes, 0);
        self.node_start = true;
        while i < bytes.len() {
            let b = bytes[i];
            let after_blank = i == 0 || matches!(bytes[i - 1], b' ' | b'\t' | b'\n' | b'\r');
            match b {
                b'\n' => {
                    i += 1;
                    line_indent = indent_at(bytes, i);
                    i += line_indent;
                    self.node_start = true;
                    continue;
                }
                b' ' | b'\t' | b'\r' => {}
                b'#' if after_blank => {
                    i = line_end(bytes, i);
                    continue;
                }
                b'"' | b'\'' if self.quote_may_start(bytes, i) => {
                    i = quoted_end(bytes, i);
                    self.node_start = false;
                    continue;
                }
                b'[' | b'{' if self.depth > 0 || self.node_start => {
                    self.depth += 1;
                    if self.depth > MAX_FLOW_DEPTH {
                        return Some(i);
                    }
                }
                b']' | b'}' if self.depth > 0 => {
                    self.depth -= 1;
                    self.node_start = false;
                }
                b'|' | b'>' if self.depth == 0 && self.node_start => {
                    i = block_scalar_end(bytes, i, line_indent);
                    continue;
                }
                b'-' | b'?' if self.depth == 0 && self.node_start && blank_or_end(bytes, i + 1) => {
                }
                b':' if self.depth == 0 && blank_or_end(bytes, i + 1) => self.node_start = true,
                b'&' | b'!' if self.depth == 0 && self.node_start => {
                    i = word_end(bytes, i); // an anchor or tag: the node starts after it
                    continue;
                }
                _ if self.depth == 0 => self.node_start = false,
                _ => {}
            }
            i += 1;
        }
        None
    }

    /// Whether a quote at `i` opens a quoted scalar rather than standing inside plain text.
    fn quote_may_start(&self, bytes: &[u8], i: usize) -> bool {
        if self.depth == 0 {
            return self.node_start;
        }
        i == 0
            || matches!(
                bytes[i - 1],
                b' ' | b'\t' | b'\n' | b'\r' | b'[' | b'{' | b',' | b':'
            )
    }
}

/// Whether the byte at `i` is white space or past the end.
fn blank_or_end(bytes: &[u8], i: usize) -> bool {
    bytes
        .get(i)
        .is_none_or(|b| matches!(b, b' ' | b'\t' | b'\n' | b'\r'))
}

/// The number of spaces at `i`.
fn indent_at(bytes: &[u8], i: usize) -> usize {
    bytes[i.min(bytes.len())..]
        .iter()
        .take_while(|b| **b == b' ')
        .count()
}

/// The offset of the line break ending the line at `i` (or the end).
fn line_end(bytes: &[u8], i: usize) -> usize {
    bytes[i..]
        .iter()
        .position(|b| *b == b'\n')
        .map_or(bytes.len(), |n| i + n)
}

/// The offset after the word at `i`: up to white space or the end.
fn word_end(bytes: &[u8], i: usize) -> usize {
    bytes[i..]
        .iter()
        .position(|b| matches!(b, b' ' | b'\t' | b'\n' | b'\r'))
        .map_or(bytes.len(), |n| i + n)
}

/// The offset after the quoted scalar opened at `i`: `"` with backslash escapes, `'` with
/// `''` for a quote; one left open runs to the end (the parser reports it).
fn quoted_end(bytes: &[u8], i: usize) -> usize {
    let quote = bytes[i];
    let mut j = i + 1;
    while j < bytes.len() {
        match bytes[j] {
            b'\\' if quote == b'"' => j += 2,
            b'\'' if quote == b'\'' && bytes.get(j + 1) == Some(&b'\'') => j += 2,
            b if b == quote => return j + 1,
            _ => j += 1,
        }
    }
    bytes.len()
}

/// The offset of the first line after the block scalar whose indicator is at `i`, on a line
/// indented `indent`: its content is every following line blank or indented further.
fn block_scalar_end(bytes: &[u8], i: usize, indent: usize) -> usize {
    let mut at = line_end(bytes, i);
    while at < bytes.len() {
        let next = at + 1;
        let spaces = indent_at(bytes, next);
        let end = line_end(bytes, next);
        let blank = bytes[next + spaces..end]
            .iter()
            .all(|b| matches!(b, b' ' | b'\t' | b'\r'));
        if !blank && spaces <= indent {
            return at;
        }
        at = end;
    }
    bytes.len()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn nested(open: &str, close: &str, n: usize) -> String {
        format!("bore: {}4{}\n", open.repeat(n), close.repeat(n))
    }

    #[test]
    fn nesting_up_to_the_cap_passes_and_one_more_is_refused_at_its_bracket() {
        assert_eq!(too_deep(&nested("[", "]", MAX_FLOW_DEPTH)), None);
        let text = nested("[", "]", MAX_FLOW_DEPTH + 1);
        assert_eq!(too_deep(&text), Some("bore: ".len() + MAX_FLOW_DEPTH));
        let text = nested("{a: ", "}", MAX_FLOW_DEPTH + 1);
        assert_eq!(too_deep(&text), Some("bore: ".len() + 4 * MAX_FLOW_DEPTH));
    }

    #[test]
    fn a_byte_order_mark_is_not_text() {
        // a flow sequence at the root, right after the mark: its first bracket counts
        let n = MAX_FLOW_DEPTH + 1;
        let text = format!("\u{feff}{}4{}\n", "[".repeat(n), "]".repeat(n));
        assert_eq!(
            too_deep(&text),
            Some('\u{feff}'.len_utf8() + MAX_FLOW_DEPTH)
        );
        let text = format!("\u{feff}{}", nested("[", "]", MAX_FLOW_DEPTH));
        assert_eq!(too_deep(&text), None);
    }

    #[test]
    fn siblings_do_not_add_up() {
        let row = format!("[{}4{}]", "[".repeat(40), "]".repeat(40));
        let text = format!("values: [{}]\n", vec![row; 100].join(", "));
        assert_eq!(too_deep(&text), None);
    }

    #[test]
    fn brackets_in_strings_comments_notes_and_block_scalars_are_not_counted() {
        let many = "[".repeat(100);
        for text in [
            format!("note: \"{many}\"\n"),
            format!("note: '{many}'\n"),
            format!("values: [\"{many}\", 'it''s {many}']\n"),
            format!("engine: x # {many}\n"),
            format!("# {many}\nengine: x\n"),
            format!("note: a {many}\n"),
            format!("note: |\n  {many}\n\n  {many}\nengine: x\n"),
            format!("- >-\n   {many}\n"),
            format!("note: \"escaped \\\" {many}\"\n"),
        ] {
            assert_eq!(too_deep(&text), None, "{text}");
        }
    }

    #[test]
    fn nesting_after_a_block_scalar_anchor_or_tag_is_counted() {
        let deep = format!("{}{}", "[".repeat(65), "]".repeat(65));
        for text in [
            format!("note: |\n  text\nbore: {deep}\n"),
            format!("bore: &a {deep}\n"),
            format!("bore: !t {}", "[&a ".repeat(65)),
            format!("- - {deep}\n"),
            format!("{deep}\n"),
            format!("? {deep}\n"),
        ] {
            assert!(too_deep(&text).is_some(), "{text}");
        }
    }
}
