//! The parser's error type: where parsing stopped, what it expected there, or a specific
//! complaint (an unterminated string, a bad date), and its conversion to a [`Problem`].

use nom::error::{ErrorKind, ParseError};

use super::lexical::Input;
use crate::diagnostic::Problem;
use crate::source::{FileId, Span};

/// Why parsing failed at one place.
#[derive(Clone, Debug, PartialEq)]
pub enum SyntaxKind {
    /// Something else was expected; the labels say what.
    Expected(Expected),
    /// A specific complaint, with its code, message and help line.
    Specific {
        /// Stable code.
        code: &'static str,
        /// What is wrong.
        message: String,
        /// How to fix it.
        help: String,
    },
}

/// What was expected at one place: a few labels, kept inline so that the many failed
/// alternatives of a parse allocate nothing.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Expected {
    labels: [&'static str; 4],
    len: u8,
}

impl Expected {
    /// One label.
    pub fn one(label: &'static str) -> Expected {
        let mut e = Expected::default();
        e.push(label);
        e
    }

    /// Adds a label unless it is there already or the set is full.
    pub fn push(&mut self, label: &'static str) {
        if !self.labels().contains(&label) && usize::from(self.len) < self.labels.len() {
            self.labels[usize::from(self.len)] = label;
            self.len += 1;
        }
    }

    /// The labels, in the order first seen.
    pub fn labels(&self) -> &[&'static str] {
        &self.labels[..usize::from(self.len)]
    }
}

/// A syntax error at a byte offset.
#[derive(Clone, Debug, PartialEq)]
pub struct SyntaxError {
    /// The file.
    pub file: FileId,
    /// Byte offset where the problem starts.
    pub offset: usize,
    /// Length of the offending text, if known (0 means "the next token").
    pub len: usize,
    /// What went wrong.
    pub kind: SyntaxKind,
}

impl SyntaxError {
    /// Something else was expected at `input`.
    pub fn expected(input: &Input, what: &'static str) -> SyntaxError {
        SyntaxError {
            file: input.extra.file,
            offset: input.location_offset(),
            len: 0,
            kind: SyntaxKind::Expected(Expected::one(what)),
        }
    }

    /// A specific complaint about the `len` bytes at `input`.
    pub fn specific(
        input: &Input,
        len: usize,
        code: &'static str,
        message: impl Into<String>,
        help: impl Into<String>,
    ) -> SyntaxError {
        SyntaxError {
            file: input.extra.file,
            offset: input.location_offset(),
            len,
            kind: SyntaxKind::Specific {
                code,
                message: message.into(),
                help: help.into(),
            },
        }
    }

    /// The problem to show the user, with the offending token quoted from `text`.
    pub fn to_problem(&self, text: &str) -> Problem {
        match &self.kind {
            SyntaxKind::Expected(what) => {
                let found = found_token(text, self.offset);
                let span = Span::new(self.file, self.offset, self.offset + found.len().max(1));
                let found_words = if found.is_empty() {
                    "the end of the file".to_string()
                } else {
                    format!("`{found}`")
                };
                Problem::error(
                    "gonogo::parse::unexpected",
                    format!(
                        "expected {}, found {found_words}",
                        list_alternatives(what.labels())
                    ),
                    span,
                    "not expected here",
                )
                .with_help(expected_help(what.labels(), found))
            }
            SyntaxKind::Specific {
                code,
                message,
                help,
            } => {
                let len = if self.len == 0 {
                    found_token(text, self.offset).len().max(1)
                } else {
                    self.len
                };
                Problem::error(
                    code,
                    message.clone(),
                    Span::new(self.file, self.offset, self.offset + len),
                    "here",
                )
                .with_help(help.clone())
            }
        }
    }
}

/// The help line for an "expected" error: a keyword the user may have misspelt, else what
/// to write.
fn expected_help(what: &[&'static str], found: &str) -> String {
    let is_word = found
        .chars()
        .next()
        .is_some_and(|c| c.is_ascii_alphabetic());
    if is_word
        && !super::KEYWORDS.contains(&found)
        && let Some(near) = crate::suggest::closest(found, super::KEYWORDS.iter().copied())
    {
        return format!("did you mean `{near}`?");
    }
    format!(
        "write {} here; `grammar/rulebook.ebnf` shows the full syntax",
        list_alternatives(what)
    )
}

/// The token at `offset`: a word, a number, or one character.
fn found_token(text: &str, offset: usize) -> &str {
    let Some(rest) = text.get(offset..) else {
        return "";
    };
    let word_len: usize = rest
        .chars()
        .take_while(|c| c.is_alphanumeric() || *c == '_' || *c == '.')
        .map(char::len_utf8)
        .sum();
    let len = if word_len > 0 {
        word_len.min(40)
    } else {
        rest.chars().next().map_or(0, char::len_utf8)
    };
    &rest[..len]
}

/// `a`, `a or b`, `a, b or c`, without repeats and in the order first seen.
fn list_alternatives(items: &[&'static str]) -> String {
    let mut unique: Vec<&str> = Vec::new();
    for item in items {
        if !unique.contains(item) {
            unique.push(item);
        }
    }
    match unique.as_slice() {
        [] => "something else".to_string(),
        [one] => one.to_string(),
        [init @ .., last] => format!("{} or {last}", init.join(", ")),
    }
}

impl<'a> ParseError<Input<'a>> for SyntaxError {
    fn from_error_kind(input: Input<'a>, _kind: ErrorKind) -> SyntaxError {
        SyntaxError {
            file: input.extra.file,
            offset: input.location_offset(),
            len: 0,
            kind: SyntaxKind::Expected(Expected::default()),
        }
    }

    fn append(_input: Input<'a>, _kind: ErrorKind, other: SyntaxError) -> SyntaxError {
        other
    }

    /// Keeps the error that got furthest; at the same place, merges what was expected.
    fn or(self, other: SyntaxError) -> SyntaxError {
        match self.offset.cmp(&other.offset) {
            std::cmp::Ordering::Greater => self,
            std::cmp::Ordering::Less => other,
            std::cmp::Ordering::Equal => match (self.kind, other.kind) {
                (SyntaxKind::Expected(mut a), SyntaxKind::Expected(b)) => {
                    for label in b.labels() {
                        a.push(label);
                    }
                    SyntaxError {
                        kind: SyntaxKind::Expected(a),
                        ..other
                    }
                }
                (specific @ SyntaxKind::Specific { .. }, _) => SyntaxError {
                    kind: specific,
                    ..other
                },
                (_, kind) => SyntaxError { kind, ..other },
            },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn alternatives_read_as_a_sentence() {
        assert_eq!(list_alternatives(&["`end`"]), "`end`");
        assert_eq!(list_alternatives(&["a", "b", "a", "c"]), "a, b or c");
    }

    #[test]
    fn found_token_takes_a_word_or_one_character() {
        assert_eq!(found_token("bore <= 4", 0), "bore");
        assert_eq!(found_token("<= 4", 0), "<");
        assert_eq!(found_token("", 0), "");
    }
}
