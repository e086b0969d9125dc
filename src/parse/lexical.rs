//! The lexical layer of the parser: white space and comments, keywords, names, strings,
//! numbers (with trade-style mixed fractions), unit symbols, dates, section numbers and
//! regular-expression literals. Each parser skips leading white space itself; the comments it
//! skips are noted in a side table when [`with_comments`] asks for them.

use std::cell::RefCell;

use nom::{Err, IResult, Parser};

use super::ast::{Date, DateAt, Name, Pattern, Section, Text};
use super::error::{ParseError, SyntaxError};
use crate::source::{FileId, Span};

/// Deepest nesting of parentheses, calls and `when` groups the parser accepts.
pub const MAX_DEPTH: u32 = 64;

/// Most operands one chain of `+ - * /`, `and` or `or` may join before it must be split.
pub const MAX_CHAIN: usize = 200;

/// The error for a chain longer than [`MAX_CHAIN`].
pub fn chain_too_long(input: &Input) -> Err<SyntaxError> {
    Err::Failure(SyntaxError::specific(input, 1, ParseError::TooLong))
}

/// What the parser carries along with its position: the file and the nesting depth.
#[derive(Clone, Copy, Debug, Default)]
pub struct Context {
    /// The file being parsed.
    pub file: FileId,
    /// Current nesting depth.
    pub depth: u32,
}

/// Parser input: the remaining text with its offset in the file and the [`Context`]. (Only
/// the byte offset is kept: spans and diagnostics find lines from it when they need them.)
#[derive(Clone, Copy, Debug)]
pub struct Input<'a> {
    fragment: &'a str,
    offset: usize,
    /// The file and the nesting depth.
    pub extra: Context,
}

impl<'a> Input<'a> {
    /// The whole of `text`, at offset 0.
    pub fn new_extra(text: &'a str, extra: Context) -> Input<'a> {
        Input {
            fragment: text,
            offset: 0,
            extra,
        }
    }

    /// The text not yet parsed.
    pub fn fragment(&self) -> &&'a str {
        &self.fragment
    }

    /// The offset in bytes of [`Input::fragment`] in the file.
    pub fn location_offset(&self) -> usize {
        self.offset
    }

    /// The same position with its context changed by `change`.
    pub fn map_extra(self, change: impl FnOnce(Context) -> Context) -> Input<'a> {
        Input {
            extra: change(self.extra),
            ..self
        }
    }

    /// The input `bytes` bytes further on (a character boundary, within the text).
    pub fn take_from(&self, bytes: usize) -> Input<'a> {
        Input {
            fragment: &self.fragment[bytes..],
            offset: self.offset + bytes,
            extra: self.extra,
        }
    }
}

/// Parser result.
pub type PResult<'a, T> = IResult<Input<'a>, T, SyntaxError>;

/// Every reserved word. None can be a name; none but `in` can be a unit after a number.
pub const KEYWORDS: &[&str] = &[
    "series",
    "edition",
    "effective",
    "decision",
    "guarded",
    "rejection",
    "acceptance",
    "simple",
    "include",
    "measure",
    "per",
    "cylinder",
    "required",
    "optional",
    "range",
    "to",
    "define",
    "approved",
    "banned",
    "list",
    "end",
    "class",
    "extends",
    "bulletin",
    "amends",
    "when",
    "rule",
    "override",
    "drop",
    "require",
    "penalty",
    "note",
    "allowing",
    "between",
    "and",
    "or",
    "not",
    "in",
    "matches",
];

/// Whether a word is reserved (one of [`KEYWORDS`]). Looked up among the keywords of its
/// length, so that a name costs a few byte comparisons.
pub fn is_keyword(word: &str) -> bool {
    KEYWORDS_BY_LENGTH
        .get(word.len())
        .is_some_and(|same_length| same_length.contains(&word))
}

/// [`KEYWORDS`] grouped by length in bytes: entry `n` holds those of `n` bytes.
const KEYWORDS_BY_LENGTH: [&[&str]; 11] = [
    &[],
    &[],
    &["to", "or", "in"],
    &["per", "end", "and", "not"],
    &["list", "when", "rule", "drop", "note"],
    &["range", "class"],
    &["series", "simple", "define", "banned", "amends"],
    &[
        "edition", "guarded", "include", "measure", "extends", "require", "penalty", "between",
        "matches",
    ],
    &[
        "decision", "cylinder", "required", "optional", "approved", "bulletin", "override",
        "allowing",
    ],
    &["effective", "rejection"],
    &["acceptance"],
];

/// The span from `start` to `end` (two positions in the same file).
pub fn span_between(start: &Input, end: &Input) -> Span {
    Span::new(
        start.extra.file,
        start.location_offset(),
        end.location_offset(),
    )
}

thread_local! {
    /// The comments [`ws`] has skipped while [`with_comments`] runs on this thread; `None`
    /// at other times, so an ordinary parse only pays one look at it per comment.
    static COMMENTS: RefCell<Option<Vec<Span>>> = const { RefCell::new(None) };
}

/// Runs `parse` and returns its result with the span of every `#` comment the lexer skipped
/// on the way (the `#` to the end of its line, the line break left out), in file order, each
/// once (a parser that backtracks skips a comment more than once). This is the side table
/// `gonogo fmt` prints comments from; the syntax tree itself holds none.
pub fn with_comments<T>(parse: impl FnOnce() -> T) -> (T, Vec<Span>) {
    let outer = COMMENTS.with(|c| c.replace(Some(Vec::new())));
    let result = parse();
    let mut comments = COMMENTS.with(|c| c.replace(outer)).unwrap_or_default();
    comments.sort_by_key(|span| (span.start, span.end));
    comments.dedup_by_key(|span| span.start);
    (result, comments)
}

fn note_comment(span: Span) {
    COMMENTS.with(|c| {
        if let Some(table) = c.borrow_mut().as_mut() {
            table.push(span);
        }
    });
}

/// Skips white space and `#` comments.
pub fn ws(input: Input) -> PResult<()> {
    let at = blank_prefix(&input);
    // most tokens follow no white space: then the input is returned as it is, unsplit
    Ok((if at == 0 { input } else { advance(input, at) }, ()))
}

/// The text after the white space and comments at the start of `input`, and how many bytes
/// those take, without moving the input: a parser that fails at the first character it
/// looks at then costs no new position. (The comments are noted as [`ws`] notes them.)
pub fn peek<'a>(input: &Input<'a>) -> (usize, &'a str) {
    let text: &'a str = input.fragment();
    let at = blank_prefix(input);
    (at, &text[at..])
}

/// The input moved on past `skip` bytes of white space and `len` bytes of a token found by
/// [`peek`], with the span of the token.
fn take_token<'a>(input: &Input<'a>, skip: usize, len: usize) -> (Input<'a>, Span) {
    let rest = input.take_from(skip + len);
    let start = input.location_offset() + skip;
    let span = Span::new(input.extra.file, start, rest.location_offset());
    (rest, span)
}

/// The input moved on past the white space [`peek`] measured.
fn skip_blank<'a>(input: Input<'a>, skip: usize) -> Input<'a> {
    if skip == 0 {
        input
    } else {
        input.take_from(skip)
    }
}

/// The length of the white space and comments at the start of `input`, each comment noted:
/// ASCII blanks byte by byte, a comment up to its line break, and white space outside ASCII
/// as [`str::trim_start`] counts it.
#[inline]
fn blank_prefix(input: &Input) -> usize {
    // most tokens follow no white space: that is seen from the first byte, in line
    match input.fragment().as_bytes().first() {
        Some(b) if may_start_blank(*b) => blank_run(input),
        _ => 0,
    }
}

/// [`blank_prefix`] past its first byte's test.
#[inline(never)]
fn blank_run(input: &Input) -> usize {
    let text = *input.fragment();
    let bytes = text.as_bytes();
    let mut at = 0;
    loop {
        while bytes.get(at).is_some_and(|b| is_ascii_blank(*b)) {
            at += 1;
        }
        match bytes.get(at) {
            Some(b'#') => {
                let length = text[at..].find('\n').unwrap_or(text.len() - at);
                let start = input.location_offset() + at;
                note_comment(Span::new(input.extra.file, start, start + length));
                at += length;
            }
            Some(b) if *b >= 0x80 => {
                let tail = &text[at..];
                let blank = tail.len() - tail.trim_start().len();
                if blank == 0 {
                    return at;
                }
                at += blank;
            }
            _ => return at,
        }
    }
}

/// Whether `b` is white space in ASCII (what [`char::is_whitespace`] says of it).
fn is_ascii_blank(b: u8) -> bool {
    matches!(b, b' ' | b'\t' | b'\n' | b'\r' | 0x0b | 0x0c)
}

/// Whether a text starting with byte `b` may start with white space or a comment: an ASCII
/// blank, `#`, or the first byte of a character outside ASCII (some are white space).
fn may_start_blank(b: u8) -> bool {
    is_ascii_blank(b) || b == b'#' || b >= 0x80
}

fn is_name_start(c: char) -> bool {
    c.is_ascii_alphabetic() || c == '_'
}

fn is_name_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || c == '_'
}

/// The length in bytes of the bare word of name characters at the start of `text` (a name
/// character that is not a digit, then any name characters), 0 if there is none.
fn word_len(text: &str) -> usize {
    let bytes = text.as_bytes();
    if !bytes.first().is_some_and(|b| is_name_start(char::from(*b))) {
        return 0;
    }
    1 + bytes[1..]
        .iter()
        .take_while(|b| is_name_char(char::from(**b)))
        .count()
}

/// The word at the start of `input`, keyword or not, without skipping white space; empty
/// when a name character does not stand there.
pub fn next_word<'a>(input: &Input<'a>) -> &'a str {
    let text: &'a str = input.fragment();
    &text[..word_len(text)]
}

/// The word of name characters at the start of `text`, keyword or not; empty when a name
/// character does not stand there.
pub fn first_word(text: &str) -> &str {
    &text[..word_len(text)]
}

/// Whether `text` starts with the word `kw` not followed by a name character.
fn starts_with_word(text: &str, kw: &str) -> bool {
    let (text, kw) = (text.as_bytes(), kw.as_bytes());
    text.len() >= kw.len()
        && text.iter().zip(kw).all(|(a, b)| a == b)
        && !text
            .get(kw.len())
            .is_some_and(|b| is_name_char(char::from(*b)))
}

/// The keyword `kw`, not followed by a name character; `label` names it in "expected ..."
/// messages. Written through the [`keyword!`] macro, which finds the label at compile time.
pub fn keyword_labelled<'a>(
    kw: &'static str,
    label: &'static str,
) -> impl Parser<Input<'a>, Output = Span, Error = SyntaxError> {
    move |input: Input<'a>| {
        let (skip, text) = peek(&input);
        if starts_with_word(text, kw) {
            Ok(take_token(&input, skip, kw.len()))
        } else {
            Err(Err::Error(SyntaxError::expected_after(&input, skip, label)))
        }
    }
}

/// `keyword!("end")`: the parser for the keyword `end`, with its label looked up once, at
/// compile time, rather than each time the keyword is not there.
macro_rules! keyword {
    ($kw:literal) => {
        $crate::parse::lexical::keyword_labelled(
            $kw,
            const { $crate::parse::lexical::keyword_label($kw) },
        )
    };
}
pub(crate) use keyword;

/// The label naming a keyword in "expected ..." messages.
pub const fn keyword_label(kw: &str) -> &'static str {
    let mut i = 0;
    while i < KEYWORD_LABELS.len() {
        if same_bytes(KEYWORD_LABELS[i].0.as_bytes(), kw.as_bytes()) {
            return KEYWORD_LABELS[i].1;
        }
        i += 1;
    }
    "a keyword"
}

/// Whether two byte strings are equal (usable at compile time).
const fn same_bytes(a: &[u8], b: &[u8]) -> bool {
    if a.len() != b.len() {
        return false;
    }
    let mut i = 0;
    while i < a.len() {
        if a[i] != b[i] {
            return false;
        }
        i += 1;
    }
    true
}

const KEYWORD_LABELS: &[(&str, &str)] = &[
    ("series", "`series`"),
    ("edition", "`edition`"),
    ("effective", "`effective`"),
    ("decision", "`decision`"),
    ("guarded", "`guarded`"),
    ("rejection", "`rejection`"),
    ("acceptance", "`acceptance`"),
    ("simple", "`simple`"),
    ("include", "`include`"),
    ("measure", "`measure`"),
    ("per", "`per`"),
    ("cylinder", "`cylinder`"),
    ("required", "`required`"),
    ("optional", "`optional`"),
    ("range", "`range`"),
    ("to", "`to`"),
    ("define", "`define`"),
    ("approved", "`approved`"),
    ("banned", "`banned`"),
    ("list", "`list`"),
    ("end", "`end`"),
    ("class", "`class`"),
    ("extends", "`extends`"),
    ("bulletin", "`bulletin`"),
    ("amends", "`amends`"),
    ("when", "`when`"),
    ("rule", "`rule`"),
    ("override", "`override`"),
    ("drop", "`drop`"),
    ("require", "`require`"),
    ("penalty", "`penalty`"),
    ("note", "`note`"),
    ("allowing", "`allowing`"),
    ("between", "`between`"),
    ("and", "`and`"),
    ("or", "`or`"),
    ("not", "`not`"),
    ("in", "`in`"),
    ("matches", "`matches`"),
    ("ignoring", "`ignoring`"),
    ("case", "`case` (after `ignoring`)"),
];

/// A punctuation symbol such as `=`, `(`, `<=`.
pub fn symbol<'a>(
    sym: &'static str,
    label: &'static str,
) -> impl Parser<Input<'a>, Output = Span, Error = SyntaxError> {
    move |input: Input<'a>| {
        let (skip, text) = peek(&input);
        if text.starts_with(sym) {
            Ok(take_token(&input, skip, sym.len()))
        } else {
            Err(Err::Error(SyntaxError::expected_after(&input, skip, label)))
        }
    }
}

/// A single identifier that is not a keyword.
pub fn identifier(input: Input) -> PResult<Name> {
    let (skip, text) = peek(&input);
    let len = word_len(text);
    let text = &text[..len];
    if len == 0 || is_keyword(text) {
        return Err(Err::Error(SyntaxError::expected_after(
            &input, skip, "a name",
        )));
    }
    let (rest, span) = take_token(&input, skip, len);
    let text = text.to_string();
    Ok((rest, Name { text, span }))
}

/// A dotted name such as `carburetor.airflow`: identifiers joined by `.` with no spaces.
/// The whole name is measured first and copied once.
pub fn dotted_name(input: Input) -> PResult<Name> {
    let (skip, text) = peek(&input);
    let first = word_len(text);
    if first == 0 || is_keyword(&text[..first]) {
        return Err(Err::Error(SyntaxError::expected_after(
            &input, skip, "a name",
        )));
    }
    let start = skip_blank(input, skip);
    let mut len = first;
    while text.as_bytes().get(len) == Some(&b'.') {
        let part = word_len(&text[len + 1..]);
        if part == 0 || is_keyword(&text[len + 1..len + 1 + part]) {
            let after_dot = start.take_from(len + 1);
            return Err(Err::Failure(SyntaxError::expected(
                &after_dot,
                "a name after `.`",
            )));
        }
        len += 1 + part;
    }
    let rest = start.take_from(len);
    Ok((
        rest,
        Name {
            text: text[..len].to_string(),
            span: span_between(&start, &rest),
        },
    ))
}

/// A string literal in double quotes. Escapes: `\"`, `\\`, `\n`, `\t`, `\u{XXXX}`.
pub fn string(input: Input) -> PResult<Text> {
    let (skip, text) = peek(&input);
    if !text.starts_with('"') {
        return Err(Err::Error(SyntaxError::expected_after(
            &input,
            skip,
            "a string in double quotes",
        )));
    }
    let start = skip_blank(input, skip);
    let body = &start.fragment()[1..];
    if let Some(len) = plain_string_len(body) {
        let rest = advance(start, len + 2);
        let value = body[..len].to_string();
        let span = span_between(&start, &rest);
        return Ok((rest, Text { value, span }));
    }
    let mut value = String::new();
    let mut chars = body.char_indices();
    while let Some((at, c)) = chars.next() {
        match c {
            '"' => {
                let rest = advance(start, at + 2);
                return Ok((
                    rest,
                    Text {
                        value,
                        span: span_between(&start, &rest),
                    },
                ));
            }
            '\n' => break,
            '\\' => match escape(&mut chars) {
                Some(decoded) if is_refused_control(decoded) && decoded != '\n' => {
                    let len = body.len() - chars.as_str().len() - at;
                    return Err(control_character(start, at, len, decoded));
                }
                Some(decoded) => value.push(decoded),
                None => {
                    let bad = advance(start, at + 1);
                    return Err(Err::Failure(SyntaxError::specific(
                        &bad,
                        2,
                        ParseError::BadEscape,
                    )));
                }
            },
            other if is_refused_control(other) => {
                return Err(control_character(start, at, other.len_utf8(), other));
            }
            other => value.push(other),
        }
    }
    Err(Err::Failure(SyntaxError::specific(
        &start,
        1,
        ParseError::UnterminatedString,
    )))
}

/// The length of a string's body up to its closing quote when it holds no escape and nothing
/// refused, so that it is its own value; `None` sends it through the full reading.
fn plain_string_len(body: &str) -> Option<usize> {
    for (at, c) in body.char_indices() {
        match c {
            '"' => return Some(at),
            '\\' | '\n' => return None,
            other if is_refused_control(other) => return None,
            _ => {}
        }
    }
    None
}

/// Whether a string may not hold `c`: every control character but the tab. (A line break
/// ends the string before this is asked, and `\n` writes one.)
fn is_refused_control(c: char) -> bool {
    c.is_control() && c != '\t'
}

/// The error for the control character `c`, written in `len` bytes at byte `at` of the
/// string's body (the text after the opening quote at `start`).
fn control_character(start: Input, at: usize, len: usize, c: char) -> Err<SyntaxError> {
    let bad = advance(start, at + 1);
    Err::Failure(SyntaxError::specific(
        &bad,
        len,
        ParseError::ControlCharacter {
            code_point: u32::from(c),
        },
    ))
}

fn escape(chars: &mut std::str::CharIndices) -> Option<char> {
    match chars.next()?.1 {
        '"' => Some('"'),
        '\\' => Some('\\'),
        'n' => Some('\n'),
        't' => Some('\t'),
        'u' => {
            if chars.next()?.1 != '{' {
                return None;
            }
            let hex: String = chars
                .by_ref()
                .map(|(_, c)| c)
                .take_while(|c| *c != '}')
                .collect();
            if hex.is_empty() || hex.len() > 6 {
                return None;
            }
            char::from_u32(u32::from_str_radix(&hex, 16).ok()?)
        }
        _ => None,
    }
}

/// A piece of a literal, borrowed from the source: its text and where it stands.
#[derive(Clone, Copy, Debug)]
pub struct Piece<'a> {
    /// The text as written.
    pub text: &'a str,
    /// Where.
    pub span: Span,
}

/// A number's value with the piece of text it was read from.
pub type NumberPiece<'a> = (f64, Piece<'a>);

/// The parts of a quantity literal `VALUE [UNIT] [± U [UNIT] [(k = K)]]`, borrowed from the
/// source: what both the rulebook parser and the declaration loader read quantities with.
#[derive(Clone, Copy, Debug)]
pub struct QuantityParts<'a> {
    /// The value.
    pub value: NumberPiece<'a>,
    /// Its unit.
    pub unit: Option<Piece<'a>>,
    /// The stated expanded uncertainty.
    pub uncertainty: Option<UncertaintyParts<'a>>,
}

/// The parts of `± U [UNIT] [(k = K)]`.
#[derive(Clone, Copy, Debug)]
pub struct UncertaintyParts<'a> {
    /// The expanded uncertainty.
    pub value: NumberPiece<'a>,
    /// Its unit.
    pub unit: Option<Piece<'a>>,
    /// The coverage factor.
    pub coverage: Option<NumberPiece<'a>>,
}

/// `quantity = number [ unit ] [ ("±" | "+/-") number [ unit ] [ "(" "k" "=" number ")" ] ]`
pub fn quantity_parts(input: Input) -> PResult<QuantityParts> {
    let (rest, value) = number_piece(input)?;
    let (rest, unit) = nom::combinator::opt(unit_piece).parse(rest)?;
    let (rest, uncertainty) = nom::combinator::opt(uncertainty_parts).parse(rest)?;
    Ok((
        rest,
        QuantityParts {
            value,
            unit,
            uncertainty,
        },
    ))
}

fn uncertainty_parts(input: Input) -> PResult<UncertaintyParts> {
    let (skip, text) = peek(&input);
    let sign_len = if text.starts_with('±') {
        '±'.len_utf8()
    } else if text.starts_with("+/-") {
        3
    } else {
        return Err(Err::Error(SyntaxError::expected_after(&input, skip, "`±`")));
    };
    let rest = advance(input, skip + sign_len);
    let (rest, value) = nom::combinator::cut(number_piece).parse(rest)?;
    let (rest, unit) = nom::combinator::opt(unit_piece).parse(rest)?;
    let (rest, coverage) = nom::combinator::opt(coverage_factor).parse(rest)?;
    Ok((
        rest,
        UncertaintyParts {
            value,
            unit,
            coverage,
        },
    ))
}

/// `"(" "k" "=" number ")"`
fn coverage_factor(input: Input) -> PResult<NumberPiece> {
    let (rest, _) = symbol("(", "`(`").parse(input)?;
    let (skip, text) = peek(&rest);
    if text.get(..word_len(text)) != Some("k") {
        return Err(Err::Failure(SyntaxError::expected_after(
            &rest, skip, "`k`",
        )));
    }
    let rest = rest.take_from(skip + 1);
    let (rest, _) = nom::combinator::cut(symbol("=", "`=`")).parse(rest)?;
    let (rest, value) = nom::combinator::cut(number_piece).parse(rest)?;
    let (rest, _) = nom::combinator::cut(symbol(")", "`)`")).parse(rest)?;
    Ok((rest, value))
}

/// A number: `42`, `4.030`, `1.5e-3`, a fraction `5/8`, or a mixed fraction `1-5/8`
/// (written with no spaces, as header tubes and valves are sized in the trade).
pub fn number_piece(input: Input) -> PResult<NumberPiece> {
    let (skip, text) = peek(&input);
    let whole = digits(text, 0);
    if whole == 0 {
        return Err(Err::Error(SyntaxError::expected_after(
            &input, skip, "a number",
        )));
    }
    let start = skip_blank(input, skip);
    let (len, value) = match fraction(text, whole) {
        Some(found) => found,
        None => {
            let len = decimal_len(text, whole);
            (len, text[..len].parse().unwrap_or(f64::NAN))
        }
    };
    if !value.is_finite() {
        let error = if text[..len].contains('/') {
            ParseError::BadFraction
        } else {
            ParseError::NumberTooLarge
        };
        return Err(Err::Failure(SyntaxError::specific(&start, len, error)));
    }
    let rest = advance(start, len);
    Ok((
        rest,
        (
            value,
            Piece {
                text: &text[..len],
                span: span_between(&start, &rest),
            },
        ),
    ))
}

/// The number of ASCII digits in `text` from byte `at`.
fn digits(text: &str, at: usize) -> usize {
    text.as_bytes()[at.min(text.len())..]
        .iter()
        .take_while(|b| b.is_ascii_digit())
        .count()
}

/// A fraction `N/D` or mixed fraction `W-N/D` after `whole` leading digits: its length and value.
fn fraction(text: &str, whole: usize) -> Option<(usize, f64)> {
    let bytes = text.as_bytes();
    let ratio = |num: usize, num_len: usize| -> Option<(usize, f64)> {
        let den_at = num + num_len + 1;
        let den_len = digits(text, den_at);
        (bytes.get(num + num_len) == Some(&b'/') && num_len > 0 && den_len > 0).then(|| {
            let (n, d): (f64, f64) = (
                text[num..num + num_len].parse().unwrap_or(f64::NAN),
                text[den_at..den_at + den_len].parse().unwrap_or(f64::NAN),
            );
            (den_at + den_len, n / d)
        })
    };
    if bytes.get(whole) == Some(&b'-') {
        let w: f64 = text[..whole].parse().unwrap_or(f64::NAN);
        return ratio(whole + 1, digits(text, whole + 1)).map(|(len, f)| (len, w + f));
    }
    ratio(0, whole)
}

/// Length of a decimal with optional fraction and exponent after `whole` leading digits.
fn decimal_len(text: &str, whole: usize) -> usize {
    let bytes = text.as_bytes();
    let mut len = whole;
    if bytes.get(len) == Some(&b'.') && digits(text, len + 1) > 0 {
        len += 1 + digits(text, len + 1);
    }
    if matches!(bytes.get(len), Some(b'e' | b'E')) {
        let sign = usize::from(matches!(bytes.get(len + 1), Some(b'+' | b'-')));
        let exponent = digits(text, len + 1 + sign);
        if exponent > 0 {
            len += 1 + sign + exponent;
        }
    }
    len
}

/// A unit symbol after a number, borrowed from the source: a word of letters with `²`, `³`,
/// `^N` and one `/word` (`in`, `cm³`, `in^2`, `L/s`), or `°` or `%`. A keyword other than
/// `in` is not a unit.
pub fn unit_piece(input: Input) -> PResult<Piece> {
    let (skip, frag) = peek(&input);
    let len = unit_len(frag);
    let text = &frag[..len];
    if len == 0 || (text != "in" && is_keyword(text)) {
        return Err(Err::Error(SyntaxError::expected_after(
            &input, skip, "a unit",
        )));
    }
    let (rest, span) = take_token(&input, skip, len);
    Ok((rest, Piece { text, span }))
}

/// Length in bytes of the unit symbol at the start of `text`, 0 if there is none.
fn unit_len(text: &str) -> usize {
    if text.starts_with('°') || text.starts_with('%') {
        return text.chars().next().map_or(0, char::len_utf8);
    }
    let base = unit_word_len(text);
    if base == 0 {
        return 0;
    }
    let rest = &text[base..];
    match rest.strip_prefix('/') {
        Some(after) if after.starts_with(|c: char| c.is_ascii_alphabetic()) => {
            base + 1 + unit_word_len(after)
        }
        _ => base,
    }
}

/// Letters, then optional `²`/`³` or `^` with digits.
fn unit_word_len(text: &str) -> usize {
    let letters: usize = text
        .chars()
        .take_while(|c| c.is_ascii_alphabetic())
        .map(char::len_utf8)
        .sum();
    if letters == 0 {
        return 0;
    }
    let rest = &text[letters..];
    if rest.starts_with('²') || rest.starts_with('³') {
        return letters + 2;
    }
    if let Some(after) = rest.strip_prefix('^') {
        let digits = after.chars().take_while(char::is_ascii_digit).count();
        if digits > 0 {
            return letters + 1 + digits;
        }
    }
    letters
}

/// A date `YYYY-MM-DD` that exists on the calendar.
pub fn date(input: Input) -> PResult<DateAt> {
    let (skip, text) = peek(&input);
    let Some(len) = date_shape_len(text) else {
        return Err(Err::Error(SyntaxError::expected_after(
            &input,
            skip,
            "a date like `2027-03-06`",
        )));
    };
    let written = &text[..len];
    match parse_date(written) {
        Some(date) => {
            let (rest, span) = take_token(&input, skip, len);
            Ok((rest, DateAt { date, span }))
        }
        None => Err(Err::Failure(SyntaxError::specific(
            &input.take_from(skip),
            len,
            ParseError::BadDate {
                written: written.to_string(),
            },
        ))),
    }
}

/// The length of the shape of a date at the start of `text`: digits, `-`, digits, `-`, digits.
fn date_shape_len(text: &str) -> Option<usize> {
    let mut len = 0;
    for part in 0..3 {
        if part > 0 {
            if text.as_bytes().get(len) != Some(&b'-') {
                return None;
            }
            len += 1;
        }
        let n = digits(text, len);
        if n == 0 {
            return None;
        }
        len += n;
    }
    Some(len)
}

fn parse_date(text: &str) -> Option<Date> {
    let mut parts = text.split('-');
    let (y, m, d) = (parts.next()?, parts.next()?, parts.next()?);
    if y.len() != 4 || m.len() != 2 || d.len() != 2 {
        return None;
    }
    let (year, month, day): (u16, u8, u8) = (y.parse().ok()?, m.parse().ok()?, d.parse().ok()?);
    let leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
    let days = match month {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if leap => 29,
        2 => 28,
        _ => return None,
    };
    (day >= 1 && day <= days).then_some(Date { year, month, day })
}

/// A section number: digits, then `.`-separated parts of digits and letters (`3.1`, `12a`).
pub fn section(input: Input) -> PResult<Section> {
    let (skip, text) = peek(&input);
    let alphanumerics = |at: usize| {
        text.as_bytes()[at.min(text.len())..]
            .iter()
            .take_while(|b| b.is_ascii_alphanumeric())
            .count()
    };
    let whole = digits(text, 0);
    if whole == 0 {
        return Err(Err::Error(SyntaxError::expected_after(
            &input,
            skip,
            "a section number like `3.1`",
        )));
    }
    let mut len = whole + alphanumerics(whole);
    while text.as_bytes().get(len) == Some(&b'.') {
        let part = alphanumerics(len + 1);
        if part == 0 {
            break;
        }
        len += 1 + part;
    }
    let (rest, span) = take_token(&input, skip, len);
    let text = text[..len].to_string();
    Ok((rest, Section { text, span }))
}

/// A regular-expression literal `/.../` with an optional `i` flag; `\/` stands for `/`.
pub fn pattern(input: Input) -> PResult<Pattern> {
    let (skip, text) = peek(&input);
    if !text.starts_with('/') {
        return Err(Err::Error(SyntaxError::expected_after(
            &input,
            skip,
            "a pattern like `/^AB-12[0-9]{2}$/`",
        )));
    }
    let start = skip_blank(input, skip);
    let body = &start.fragment()[1..];
    let mut source = String::new();
    let mut chars = body.char_indices();
    while let Some((at, c)) = chars.next() {
        match c {
            '/' if at == 0 => {
                return Err(Err::Failure(SyntaxError::specific(
                    &start,
                    2,
                    ParseError::EmptyPattern,
                )));
            }
            '/' => return finish_pattern(start, source, at + 2),
            '\n' => break,
            '\\' => match chars.next() {
                Some((_, '/')) => source.push('/'),
                Some((_, next)) => {
                    source.push('\\');
                    source.push(next);
                }
                None => break,
            },
            other => source.push(other),
        }
    }
    Err(Err::Failure(SyntaxError::specific(
        &start,
        1,
        ParseError::UnterminatedPattern,
    )))
}

fn finish_pattern(start: Input, source: String, len: usize) -> PResult<Pattern> {
    let rest = advance(start, len);
    let ignore_case =
        rest.fragment().starts_with('i') && !rest.fragment()[1..].starts_with(is_name_char);
    let rest = advance(rest, usize::from(ignore_case));
    Ok((
        rest,
        Pattern {
            source,
            ignore_case,
            span: span_between(&start, &rest),
        },
    ))
}

/// The input `bytes` bytes further on. (nom's `take` counts characters; offsets here are bytes.)
pub fn advance(input: Input, bytes: usize) -> Input {
    let text = input.fragment();
    let mut at = bytes.min(text.len());
    while !text.is_char_boundary(at) {
        at -= 1;
    }
    input.take_from(at)
}

/// Runs `inner` one nesting level deeper, failing cleanly past [`MAX_DEPTH`].
pub fn nested<'a, T>(
    input: Input<'a>,
    inner: impl FnOnce(Input<'a>) -> PResult<'a, T>,
) -> PResult<'a, T> {
    if input.extra.depth >= MAX_DEPTH {
        return Err(Err::Failure(SyntaxError::specific(
            &input,
            1,
            ParseError::TooDeep,
        )));
    }
    let deeper = input.map_extra(|c| Context {
        depth: c.depth + 1,
        ..c
    });
    let (rest, value) = inner(deeper)?;
    Ok((
        rest.map_extra(|c| Context {
            depth: c.depth - 1,
            ..c
        }),
        value,
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn input(text: &str) -> Input<'_> {
        Input::new_extra(text, Context::default())
    }

    fn value(text: &str) -> f64 {
        number_piece(input(text))
            .map(|(_, (v, _))| v)
            .unwrap_or(f64::NAN)
    }

    #[test]
    fn mixed_fractions_are_whole_plus_fraction() {
        // header tube sizes: 1-5/8 in = 1.625 in (common practice, no source)
        assert_eq!(value("1-5/8"), 1.625);
        assert_eq!(value("5/8"), 0.625);
        assert_eq!(value("1-3/4"), 1.75);
    }

    #[test]
    fn a_number_stops_where_its_syntax_does() {
        let len = |text: &str| {
            number_piece(input(text))
                .map(|(_, (_, p))| p.text.len())
                .unwrap_or(0)
        };
        assert_eq!(len("4.030 in"), 5);
        assert_eq!(len("4. in"), 1);
        assert_eq!(len("2e"), 1);
        assert_eq!(len("1-5/8in"), 5);
        assert_eq!(len("1-x"), 1);
    }

    #[test]
    fn decimals_and_exponents() {
        assert_eq!(value("4.030"), 4.03);
        assert_eq!(value("1.5e-3"), 0.0015);
        assert_eq!(value("12"), 12.0);
    }

    #[test]
    fn a_fraction_over_zero_is_an_error() {
        assert!(matches!(number_piece(input("3/0")), Err(Err::Failure(_))));
    }

    #[test]
    fn units_take_one_symbol_and_stop_at_keywords() {
        assert_eq!(unit_len("in and"), 2);
        assert_eq!(unit_len("cm³ "), 4);
        assert_eq!(unit_len("in^2)"), 4);
        assert_eq!(unit_len("L/s"), 3);
        assert_eq!(unit_len("in/2"), 2);
        assert_eq!(unit_len("° "), 2);
        assert!(unit_piece(input(" and")).is_err());
        assert!(unit_piece(input(" in")).is_ok());
    }

    #[test]
    fn strings_resolve_escapes() {
        let (_, text) = string(input(r#""a \"b\" \u{B1}""#)).unwrap_or_else(|_| panic!("parse"));
        assert_eq!(text.value, "a \"b\" ±");
    }

    #[test]
    fn control_characters_in_strings_are_refused_where_they_stand() {
        let refused = |text: &str| match string(input(text)) {
            Err(Err::Failure(e)) => match e.kind {
                super::super::SyntaxKind::Specific(k) => Some((*k, e.offset, e.len)),
                _ => None,
            },
            _ => None,
        };
        let nul = ParseError::ControlCharacter { code_point: 0 };
        assert_eq!(refused("\"ab\u{0}c\""), Some((nul.clone(), 3, 1)));
        assert_eq!(refused(r#""ab\u{0}c""#), Some((nul, 3, 5)));
        let escape = ParseError::ControlCharacter { code_point: 0x1b };
        assert_eq!(refused("\"\u{1b}[31m\""), Some((escape, 1, 1)));
        assert!(string(input("\"a\tb\"")).is_ok());
        assert!(string(input(r#""a\nb\tc""#)).is_ok());
    }

    #[test]
    fn the_empty_pattern_is_refused() {
        let refused = |text: &str| match pattern(input(text)) {
            Err(Err::Failure(e)) => {
                e.kind == super::super::SyntaxKind::Specific(Box::new(ParseError::EmptyPattern))
            }
            _ => false,
        };
        assert!(refused("//"));
        assert!(refused(" //i"));
        assert!(pattern(input("/a/")).is_ok());
        assert!(pattern(input(r"/\//")).is_ok());
    }

    #[test]
    fn dates_must_exist() {
        assert!(date(input("2028-02-29")).is_ok());
        assert!(matches!(date(input("2027-02-29")), Err(Err::Failure(_))));
        assert!(matches!(date(input("2027-13-01")), Err(Err::Failure(_))));
    }

    #[test]
    fn a_date_is_three_groups_of_digits_then_checked_on_the_calendar() {
        // the shape with the wrong number of digits is a bad date, not another token
        assert!(matches!(date(input("2027-3-6")), Err(Err::Failure(_))));
        // no third group: not a date at all, so another parser may try
        assert!(matches!(date(input("2027-03")), Err(Err::Error(_))));
        assert!(matches!(date(input("x2027-03-06")), Err(Err::Error(_))));
        let (rest, at) = date(input("  2027-03-06 x")).unwrap_or_else(|_| panic!("date"));
        assert_eq!(
            (at.span.start, at.span.end, rest.location_offset()),
            (2, 12, 12)
        );
    }

    #[test]
    fn patterns_unescape_slashes_and_read_the_flag() {
        let (_, p) = pattern(input(r"/^A\/B$/i")).unwrap_or_else(|_| panic!("parse"));
        assert_eq!(p.source, "^A/B$");
        assert!(p.ignore_case);
    }

    #[test]
    fn the_keywords_by_length_are_the_keywords() {
        let mut grouped: Vec<&str> = KEYWORDS_BY_LENGTH
            .iter()
            .flat_map(|g| g.iter().copied())
            .collect();
        let mut listed = KEYWORDS.to_vec();
        grouped.sort_unstable();
        listed.sort_unstable();
        assert_eq!(grouped, listed);
        for (len, group) in KEYWORDS_BY_LENGTH.iter().enumerate() {
            assert!(group.iter().all(|kw| kw.len() == len), "{group:?}");
        }
        assert!(KEYWORDS.iter().all(|kw| is_keyword(kw)));
        for not_reserved in [
            "coverage", "ignoring", "case", "k", "ends", "rules", "", "i",
        ] {
            assert!(!is_keyword(not_reserved), "{not_reserved}");
        }
    }

    #[test]
    fn white_space_is_what_trim_start_skips() {
        // every ASCII blank, and white space outside ASCII (U+00A0, U+2003), with comments
        for text in [
            " \t\n\r\u{b}\u{c}x",
            "\u{a0}x",
            " \u{2003} # note\n\u{85}x",
            "x",
            "",
        ] {
            let (rest, _) = ws(input(text)).unwrap_or_else(|_| panic!("ws"));
            let expected =
                text.trim_start()
                    .split_once('#')
                    .map_or(text.trim_start(), |(_, after)| {
                        after
                            .split_once('\n')
                            .map_or("", |(_, next)| next.trim_start())
                    });
            assert_eq!(*rest.fragment(), expected, "{text:?}");
        }
        // U+001C to U+001F are separators but not white space
        assert_eq!(
            *ws(input("\u{1c}x"))
                .map(|(r, _)| r)
                .unwrap_or_else(|_| panic!("ws"))
                .fragment(),
            "\u{1c}x"
        );
    }

    #[test]
    fn a_keyword_is_a_whole_word() {
        assert!(keyword!("end").parse(input(" end")).is_ok());
        assert!(keyword!("end").parse(input("end.")).is_ok());
        assert!(keyword!("end").parse(input("ends")).is_err());
        assert!(keyword!("end").parse(input("end_")).is_err());
        assert!(keyword!("end").parse(input("end2")).is_err());
        assert!(keyword!("end").parse(input("en")).is_err());
        assert!(keyword!("in").parse(input("in\u{e9}")).is_ok());
    }

    #[test]
    fn a_plain_string_and_one_with_escapes_read_alike() {
        let read = |text: &str| {
            string(input(text))
                .map(|(rest, t)| (t.value, t.span, rest.location_offset()))
                .ok()
        };
        assert_eq!(
            read(r#""TVH-2204" x"#).map(|(v, _, at)| (v, at)),
            Some(("TVH-2204".to_string(), 10))
        );
        assert_eq!(
            read(r#""a\u{2d}b""#).map(|(v, _, at)| (v, at)),
            Some(("a-b".to_string(), 10))
        );
        assert_eq!(
            read("\"cast \u{2014} iron\"").map(|(v, _, _)| v),
            Some("cast \u{2014} iron".to_string())
        );
        assert!(read("\"open\n\"").is_none());
    }

    #[test]
    fn names_are_not_keywords_and_may_be_dotted() {
        assert!(identifier(input("and")).is_err());
        let (_, n) = dotted_name(input(" carburetor.airflow ")).unwrap_or_else(|_| panic!("parse"));
        assert_eq!(n.text, "carburetor.airflow");
    }
}
