//! The parse stage's errors as data. [`ParseError`] says what went wrong in a rulebook's text
//! and [`ReadError`] why a file could not be read or included; each derives its code, message,
//! label and help from its fields in one place and becomes a [`Problem`]. [`SyntaxError`] is
//! the nom error type that carries a [`ParseError`] (or the set of things expected) to the
//! place parsing stopped.

use crate::diagnostic::codes;
use std::path::Path;

use nom::error::{ErrorKind, ParseError as NomParseError};

use super::lexical::{Input, MAX_CHAIN, MAX_DEPTH};
use crate::diagnostic::Problem;
use crate::source::{BadByte, FileId, MAX_FILE_BYTES, ReadFailure, Span};

/// What went wrong in a rulebook's text. Where it went wrong travels beside it (in a
/// [`SyntaxError`]) and is given to [`ParseError::problem`].
#[derive(Clone, Debug, PartialEq)]
pub enum ParseError {
    /// Something else was expected where `found` stands (empty at the end of the file).
    Unexpected {
        /// What would have been accepted.
        expected: Expected,
        /// The token written there.
        found: String,
    },
    /// More than [`MAX_CHAIN`] terms joined in one expression or condition.
    TooLong,
    /// Nesting deeper than [`MAX_DEPTH`] levels.
    TooDeep,
    /// An escape in a string that is not one of the known ones.
    BadEscape,
    /// A string with no closing quote on its line.
    UnterminatedString,
    /// A control character (other than a tab) in a string, written as it is or as `\u{...}`.
    ControlCharacter {
        /// Its code point.
        code_point: u32,
    },
    /// A fraction with a zero denominator.
    BadFraction,
    /// A number too large to be finite.
    NumberTooLarge,
    /// A date in the right shape that is not on the calendar.
    BadDate {
        /// The date as written.
        written: String,
    },
    /// A pattern with no closing `/` on its line.
    UnterminatedPattern,
    /// The empty pattern `//`, which every text matches.
    EmptyPattern,
    /// `allowing` in a condition.
    AllowanceInCondition,
    /// `allowing` after a list or pattern test.
    AllowanceOnList,
    /// `and` or `or` joining tests in a rule's `require`.
    JoinedRequire,
}

impl ParseError {
    /// The stable code.
    pub fn code(&self) -> codes::Code {
        match self {
            ParseError::Unexpected { .. } => codes::parse::UNEXPECTED,
            ParseError::TooLong => codes::parse::TOO_LONG,
            ParseError::TooDeep => codes::parse::TOO_DEEP,
            ParseError::BadEscape => codes::parse::BAD_ESCAPE,
            ParseError::UnterminatedString => codes::parse::UNTERMINATED_STRING,
            ParseError::ControlCharacter { .. } => codes::parse::CONTROL_CHARACTER,
            ParseError::BadFraction => codes::parse::BAD_FRACTION,
            ParseError::NumberTooLarge => codes::parse::NUMBER_TOO_LARGE,
            ParseError::BadDate { .. } => codes::parse::BAD_DATE,
            ParseError::UnterminatedPattern => codes::parse::UNTERMINATED_PATTERN,
            ParseError::EmptyPattern => codes::parse::EMPTY_PATTERN,
            ParseError::AllowanceInCondition => codes::parse::ALLOWANCE_IN_CONDITION,
            ParseError::AllowanceOnList => codes::parse::ALLOWANCE_ON_LIST,
            ParseError::JoinedRequire => codes::parse::JOINED_REQUIRE,
        }
    }

    /// What is wrong.
    pub fn message(&self) -> String {
        match self {
            ParseError::Unexpected { expected, found } => {
                let found = if found.is_empty() {
                    "the end of the file".to_string()
                } else {
                    format!("`{}`", visible(found))
                };
                format!(
                    "expected {}, found {found}",
                    list_alternatives(expected.labels())
                )
            }
            ParseError::TooLong => {
                format!("more than {MAX_CHAIN} terms are joined in one expression or condition")
            }
            ParseError::TooDeep => format!("nesting is deeper than {MAX_DEPTH} levels"),
            ParseError::BadEscape => "unknown escape in string".to_string(),
            ParseError::UnterminatedString => "this string has no closing quote".to_string(),
            ParseError::ControlCharacter { code_point } => {
                format!("this string holds the control character U+{code_point:04X}")
            }
            ParseError::BadFraction => "this fraction divides by zero".to_string(),
            ParseError::NumberTooLarge => "this number is too large".to_string(),
            ParseError::BadDate { written } => format!("`{written}` is not a calendar date"),
            ParseError::UnterminatedPattern => "this pattern has no closing `/`".to_string(),
            ParseError::EmptyPattern => {
                "the empty pattern `//` matches every text, so a test with it can never fail"
                    .to_string()
            }
            ParseError::AllowanceInCondition => {
                "an allowance belongs to a rule's `require`, not to a condition".to_string()
            }
            ParseError::AllowanceOnList => {
                "an allowance applies to a numeric limit, not to a parts list or pattern"
                    .to_string()
            }
            ParseError::JoinedRequire => "a rule's `require` holds a single test".to_string(),
        }
    }

    /// The label under the offending text.
    pub fn label(&self) -> &'static str {
        match self {
            ParseError::Unexpected { .. } => "not expected here",
            _ => "here",
        }
    }

    /// How to fix it.
    pub fn help(&self) -> String {
        let fixed = match self {
            ParseError::Unexpected { expected, found } => {
                return expected_help(expected.labels(), found);
            }
            ParseError::TooLong => "name parts of it with `define` and join the names",
            ParseError::TooDeep => {
                "split the expression into named `define` values, or flatten the `when` groups"
            }
            ParseError::BadEscape => "the escapes are `\\\"`, `\\\\`, `\\n`, `\\t` and `\\u{...}`",
            ParseError::UnterminatedString => "end the string with `\"` on the same line",
            ParseError::ControlCharacter { .. } => {
                "remove it (it does not show when printed); write a line break as `\\n` and a tab as `\\t`"
            }
            ParseError::BadFraction => {
                "a fraction is written like `5/8` or `1-5/8`, with a denominator above zero"
            }
            ParseError::NumberTooLarge => "write a number below 1e300",
            ParseError::BadDate { .. } => {
                "write the date as year-month-day, for example `2027-03-06`"
            }
            ParseError::EmptyPattern => {
                "write what the text must look like between the slashes, like `/^TV-4[0-9]{2}$/`, or drop the test"
            }
            ParseError::UnterminatedPattern => {
                "end the pattern with `/` on the same line; write `\\/` for a slash inside it"
            }
            ParseError::AllowanceInCondition => {
                "move `allowing ...` to the rule's `require` line, or drop it"
            }
            ParseError::AllowanceOnList => {
                "drop `allowing ...`, or add the part to the list instead"
            }
            ParseError::JoinedRequire => {
                "split it into two rules with their own section numbers, or put the extra test in a `when` line"
            }
        };
        fixed.to_string()
    }

    /// The problem to show the user, underlining `at`.
    pub fn problem(&self, at: Span) -> Problem {
        Problem::error(self.code(), self.message(), at, self.label()).with_help(self.help())
    }
}

/// Why a declaration's text is not a quantity literal, in the user's terms: each says what is
/// wrong with the text rather than only what was expected.
#[derive(Clone, Debug, PartialEq)]
pub enum QuantityFault {
    /// Not the shape of a quantity at all.
    NotAQuantity,
    /// A quantity followed by text that is not part of it.
    Trailing {
        /// The text left over.
        rest: String,
    },
    /// A number beyond what a double holds, like `1e400`.
    TooLarge {
        /// The number as written.
        number: String,
    },
    /// A fraction over zero, like `5/0`.
    FractionOverZero {
        /// The fraction as written.
        number: String,
    },
    /// A word that stands for no number, like `NaN` or `inf`.
    NotANumber {
        /// The word as written.
        word: String,
    },
    /// A minus sign after `±`.
    NegativeUncertainty,
    /// A minus sign in `(k = ...)`.
    CoverageNotPositive,
}

impl QuantityFault {
    /// The fault in `text` where the quantity parser stopped with `error`.
    pub fn diagnose(text: &str, error: &SyntaxError) -> QuantityFault {
        let at = text.get(error.offset..).unwrap_or_default();
        let written = || at.get(..error.len).unwrap_or(at).to_string();
        if let SyntaxKind::Specific(specific) = &error.kind {
            match **specific {
                ParseError::NumberTooLarge => return QuantityFault::TooLarge { number: written() },
                ParseError::BadFraction => {
                    return QuantityFault::FractionOverZero { number: written() };
                }
                _ => {}
            }
        }
        let before = text.get(..error.offset).unwrap_or_default().trim_end();
        let negative = at.starts_with('-') || at.starts_with('\u{2212}');
        if negative && (before.ends_with('±') || before.ends_with("+/-")) {
            return QuantityFault::NegativeUncertainty;
        }
        if negative && before.ends_with('=') {
            return QuantityFault::CoverageNotPositive;
        }
        let word: String = at.chars().take_while(char::is_ascii_alphabetic).collect();
        let not_numbers = ["nan", "inf", "infinity"];
        if not_numbers.contains(&word.to_ascii_lowercase().as_str()) {
            return QuantityFault::NotANumber { word };
        }
        QuantityFault::NotAQuantity
    }

    /// What is wrong.
    pub fn message(&self) -> String {
        match self {
            QuantityFault::NotAQuantity => {
                "expected a number and its unit, like `4.030 in` or `76.2 cc ± 0.2 cc`".to_string()
            }
            QuantityFault::Trailing { rest } => {
                format!("unexpected `{}` after the quantity", visible(rest))
            }
            QuantityFault::TooLarge { number } => {
                format!("`{number}` is too large to be a number")
            }
            QuantityFault::FractionOverZero { number } => {
                format!("the fraction `{number}` divides by zero")
            }
            QuantityFault::NotANumber { word } => format!("`{}` is not a number", visible(word)),
            QuantityFault::NegativeUncertainty => "an uncertainty cannot be negative".to_string(),
            QuantityFault::CoverageNotPositive => {
                "the coverage factor must be above zero".to_string()
            }
        }
    }

    /// The label under the text.
    pub fn label(&self) -> &'static str {
        match self {
            QuantityFault::NotAQuantity | QuantityFault::Trailing { .. } => "not a quantity",
            QuantityFault::TooLarge { .. } => "too large",
            QuantityFault::FractionOverZero { .. } => "divides by zero",
            QuantityFault::NotANumber { .. } => "not a number",
            QuantityFault::NegativeUncertainty => "a negative uncertainty",
            QuantityFault::CoverageNotPositive => "coverage factor",
        }
    }

    /// How to fix it, given an example of a good literal (in backticks).
    pub fn help(&self, example: &str) -> String {
        match self {
            QuantityFault::NotAQuantity | QuantityFault::Trailing { .. } => {
                format!("write a number and its unit, like {example}")
            }
            QuantityFault::TooLarge { .. } => {
                format!("write the value as measured, below 1e300, like {example}")
            }
            QuantityFault::FractionOverZero { .. } => {
                "a fraction is written like `5/8` or `1-5/8`, with a denominator above zero"
                    .to_string()
            }
            QuantityFault::NotANumber { .. } => {
                format!("write the value as measured, like {example}")
            }
            QuantityFault::NegativeUncertainty => {
                "write the `±` part without a sign, like `4.030 in ± 0.002 in`".to_string()
            }
            QuantityFault::CoverageNotPositive => {
                "write `(k = 2)` for about 95 % coverage".to_string()
            }
        }
    }
}

/// Why a rulebook file, or a file it includes, could not be read.
#[derive(Clone, Debug, PartialEq)]
pub enum ReadError {
    /// The operating system refused to read the file.
    Io {
        /// The file, as given.
        path: String,
        /// The operating system's reason.
        reason: String,
        /// The `include` that named it, if an include did.
        included_at: Option<Span>,
    },
    /// The file is larger than [`MAX_FILE_BYTES`].
    TooLarge {
        /// The file, as given.
        path: String,
        /// The `include` that named it, if an include did.
        included_at: Option<Span>,
    },
    /// The file is not UTF-8 text.
    NotUtf8 {
        /// The file, as given.
        path: String,
        /// The first bad byte and where it is.
        at: BadByte,
        /// The `include` that named it, if an include did.
        included_at: Option<Span>,
    },
    /// An include path that is absolute or climbs out with `..`.
    IncludeOutside {
        /// The path as written.
        include: String,
        /// Where.
        at: Span,
    },
    /// An include whose file is a link leading out of the including file's folder.
    IncludeLeadsOutside {
        /// The path as written.
        include: String,
        /// Where.
        at: Span,
    },
    /// An include whose file does not exist.
    IncludeMissing {
        /// The path as written.
        include: String,
        /// Where.
        at: Span,
    },
    /// An include whose file is a link that leads round in a loop of links.
    IncludeLinkLoop {
        /// The path as written.
        include: String,
        /// Where.
        at: Span,
    },
    /// An include that names a folder, a FIFO, a device or anything else that is not a
    /// regular file (it is never opened, so it cannot block the run).
    IncludeNotAFile {
        /// The path as written.
        include: String,
        /// What it is instead, like `a FIFO (named pipe)`.
        kind: &'static str,
        /// Where.
        at: Span,
    },
    /// An include that leads back to a file being read.
    IncludeCycle {
        /// The path as written.
        include: String,
        /// Where.
        at: Span,
    },
}

impl ReadError {
    /// The error for `path` that could not be read, named by an include at `included_at`.
    pub fn unreadable(path: &Path, failure: ReadFailure, included_at: Option<Span>) -> ReadError {
        let path = path.display().to_string();
        match failure {
            ReadFailure::Io(e) => ReadError::Io {
                path,
                reason: e.to_string(),
                included_at,
            },
            ReadFailure::TooLarge => ReadError::TooLarge { path, included_at },
            ReadFailure::NotUtf8(at) => ReadError::NotUtf8 {
                path,
                at,
                included_at,
            },
        }
    }

    /// The stable code.
    pub fn code(&self) -> codes::Code {
        match self {
            ReadError::Io { .. } => codes::read::IO,
            ReadError::TooLarge { .. } => codes::read::TOO_LARGE,
            ReadError::NotUtf8 { .. } => codes::read::NOT_UTF8,
            ReadError::IncludeOutside { .. } | ReadError::IncludeLeadsOutside { .. } => {
                codes::read::INCLUDE_OUTSIDE
            }
            ReadError::IncludeMissing { .. } => codes::read::INCLUDE_MISSING,
            ReadError::IncludeCycle { .. } => codes::read::INCLUDE_CYCLE,
            ReadError::IncludeLinkLoop { .. } => codes::read::INCLUDE_LINK_LOOP,
            ReadError::IncludeNotAFile { .. } => codes::read::INCLUDE_NOT_A_FILE,
        }
    }

    /// What is wrong.
    pub fn message(&self) -> String {
        match self {
            ReadError::Io { path, reason, .. } => format!("cannot read `{path}`: {reason}"),
            ReadError::TooLarge { path, .. } => {
                format!("`{path}` is over the limit of {MAX_FILE_BYTES} bytes (8 MiB)")
            }
            ReadError::NotUtf8 { path, at, .. } => format!(
                "`{path}` is not UTF-8 text: line {}, column {} holds the byte 0x{:02X}",
                at.line, at.column, at.value
            ),
            ReadError::IncludeOutside { include, .. } => {
                format!("`{include}` is not in this file's folder or below it")
            }
            ReadError::IncludeLeadsOutside { include, .. } => {
                format!("`{include}` leads outside this file's folder")
            }
            ReadError::IncludeMissing { include, .. } => {
                format!("the included file `{include}` does not exist")
            }
            ReadError::IncludeCycle { include, .. } => {
                format!("`{include}` includes itself, directly or through other files")
            }
            ReadError::IncludeLinkLoop { include, .. } => {
                format!("the included file `{include}` is a link that leads round in a loop")
            }
            ReadError::IncludeNotAFile { include, kind, .. } => {
                format!("the included file `{include}` is {kind}, not a regular file")
            }
        }
    }

    /// The place to underline and its label, when there is one.
    pub fn label(&self) -> Option<(Span, &'static str)> {
        match self {
            ReadError::Io { included_at, .. }
            | ReadError::TooLarge { included_at, .. }
            | ReadError::NotUtf8 { included_at, .. } => included_at.map(|s| (s, "included here")),
            ReadError::IncludeOutside { at, .. } => Some((*at, "include path")),
            ReadError::IncludeLeadsOutside { at, .. } => Some((*at, "a link leads elsewhere")),
            ReadError::IncludeMissing { at, .. } => Some((*at, "not found")),
            ReadError::IncludeCycle { at, .. } => Some((*at, "cycle")),
            ReadError::IncludeLinkLoop { at, .. } => Some((*at, "link loop")),
            ReadError::IncludeNotAFile { at, .. } => Some((*at, "not a regular file")),
        }
    }

    /// How to fix it.
    pub fn help(&self) -> &'static str {
        match self {
            ReadError::Io { .. } => "check the path and that the file may be read",
            ReadError::TooLarge { .. } => {
                "a rulebook or declaration this large is not a real one; split it or check the file"
            }
            ReadError::NotUtf8 { .. } => {
                "save the file as UTF-8 (an editor's \"encoding\" setting), or retype the character there"
            }
            ReadError::IncludeOutside { .. } => {
                "an include names a file beside this one or in a folder below it, like `parts/heads.rules`"
            }
            ReadError::IncludeLeadsOutside { .. } => {
                "copy the file into this folder instead of linking to it"
            }
            ReadError::IncludeMissing { .. } => {
                "check the file name; the path is relative to this file's folder"
            }
            ReadError::IncludeCycle { .. } => "remove one of the includes that close the loop",
            ReadError::IncludeLinkLoop { .. } => {
                "point the link at the rulebook file itself, or replace it with a copy of the file"
            }
            ReadError::IncludeNotAFile { .. } => {
                "an include names one rulebook file saved on disk, like `parts/heads.rules`"
            }
        }
    }
}

impl From<ReadError> for Problem {
    fn from(e: ReadError) -> Problem {
        let mut problem = Problem::unlocated(e.code(), e.message()).with_help(e.help());
        if let Some((span, label)) = e.label() {
            problem = problem.with_label(span, label);
        }
        problem
    }
}

/// Why parsing failed at one place.
#[derive(Clone, Debug, PartialEq)]
pub enum SyntaxKind {
    /// Something else was expected; the labels say what.
    Expected(Expected),
    /// A specific complaint, boxed: it is rare, and the nom error stays small for the many
    /// failed alternatives of a parse.
    Specific(Box<ParseError>),
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

    /// Something else was expected `skip` bytes into `input` (past its white space).
    pub fn expected_after(input: &Input, skip: usize, what: &'static str) -> SyntaxError {
        SyntaxError {
            file: input.extra.file,
            offset: input.location_offset() + skip,
            len: 0,
            kind: SyntaxKind::Expected(Expected::one(what)),
        }
    }

    /// A specific complaint about the `len` bytes at `input`.
    pub fn specific(input: &Input, len: usize, error: ParseError) -> SyntaxError {
        SyntaxError {
            file: input.extra.file,
            offset: input.location_offset(),
            len,
            kind: SyntaxKind::Specific(Box::new(error)),
        }
    }

    /// The problem to show the user, with the offending token quoted from `text`.
    pub fn to_problem(&self, text: &str) -> Problem {
        let found = found_token(text, self.offset);
        match &self.kind {
            SyntaxKind::Expected(expected) => ParseError::Unexpected {
                expected: *expected,
                found: found.to_string(),
            }
            .problem(self.span(found.len().max(1))),
            SyntaxKind::Specific(error) => {
                let len = if self.len == 0 {
                    found.len().max(1)
                } else {
                    self.len
                };
                error.problem(self.span(len))
            }
        }
    }

    fn span(&self, len: usize) -> Span {
        Span::new(self.file, self.offset, self.offset + len)
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

/// The text with every character that does not show when printed (control and format
/// characters such as a NUL or a byte-order mark) written as `\u{...}`.
fn visible(text: &str) -> String {
    text.chars()
        .map(|c| {
            if c.is_control() || is_format_character(c) {
                format!("\\u{{{:x}}}", u32::from(c))
            } else {
                c.to_string()
            }
        })
        .collect()
}

/// The invisible format characters a file is likely to hold by accident: the byte-order
/// mark, zero-width spaces and joiners, and the direction marks and overrides.
fn is_format_character(c: char) -> bool {
    matches!(c, '\u{ad}' | '\u{200b}'..='\u{200f}' | '\u{202a}'..='\u{202e}' | '\u{2060}'..='\u{2064}' | '\u{2066}'..='\u{2069}' | '\u{feff}')
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

impl<'a> NomParseError<Input<'a>> for SyntaxError {
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
    fn each_parse_error_has_its_own_code() {
        let all = [
            ParseError::Unexpected {
                expected: Expected::one("a name"),
                found: String::new(),
            },
            ParseError::TooLong,
            ParseError::TooDeep,
            ParseError::BadEscape,
            ParseError::UnterminatedString,
            ParseError::ControlCharacter { code_point: 0 },
            ParseError::EmptyPattern,
            ParseError::BadFraction,
            ParseError::NumberTooLarge,
            ParseError::BadDate {
                written: "2027-02-30".to_string(),
            },
            ParseError::UnterminatedPattern,
            ParseError::AllowanceInCondition,
            ParseError::AllowanceOnList,
            ParseError::JoinedRequire,
        ];
        let mut codes: Vec<String> = all.iter().map(|e| e.code().to_string()).collect();
        codes.sort_unstable();
        codes.dedup();
        assert_eq!(codes.len(), all.len());
    }

    #[test]
    fn an_unexpected_end_of_file_is_named_so() {
        let e = ParseError::Unexpected {
            expected: Expected::one("`end`"),
            found: String::new(),
        };
        assert_eq!(e.message(), "expected `end`, found the end of the file");
        let p = e.problem(Span::new(0, 4, 5));
        assert_eq!(
            p.labels,
            vec![(Span::new(0, 4, 5), "not expected here".to_string())]
        );
    }

    #[test]
    fn an_unreadable_file_points_at_the_include_that_named_it() {
        let at = Span::new(0, 8, 20);
        let failure = ReadFailure::TooLarge;
        let p: Problem = ReadError::unreadable(Path::new("big.rules"), failure, Some(at)).into();
        assert_eq!(
            p.code,
            ReadError::TooLarge {
                path: String::new(),
                included_at: None
            }
            .code()
        );
        assert_eq!(
            p.message,
            "`big.rules` is over the limit of 8388608 bytes (8 MiB)"
        );
        assert_eq!(p.primary_span(), Some(at));
        let bad = BadByte::find(b"ab\nc\xffd", 4);
        assert_eq!(
            bad,
            BadByte {
                value: 0xff,
                line: 2,
                column: 2
            }
        );
        let unlocated: Problem =
            ReadError::unreadable(Path::new("big.rules"), ReadFailure::NotUtf8(bad), None).into();
        assert_eq!(unlocated.primary_span(), None);
    }

    #[test]
    fn an_invisible_character_found_is_written_so_it_shows() {
        let e = ParseError::Unexpected {
            expected: Expected::one("a name"),
            found: "\u{0}".to_string(),
        };
        assert_eq!(e.message(), "expected a name, found `\\u{0}`");
        assert_eq!(visible("a\u{200b}b±"), "a\\u{200b}b±");
    }

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
