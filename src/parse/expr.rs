//! Expressions, tests and conditions. The production each function parses is written as an
//! EBNF comment above it, matching `grammar/rulebook.ebnf`.

use nom::branch::alt;
use nom::combinator::opt;
use nom::{Err, Parser};

use super::ast::{
    Arg, BinaryOp, CompareOp, Condition, Expr, ExprKind, Number, Quantity, Test, TestKind,
    Uncertainty, UnitRef,
};
use super::error::{ParseError, SyntaxError};
use super::lexical::{
    Input, MAX_CHAIN, NumberPiece, PResult, Piece, QuantityParts, chain_too_long, dotted_name,
    identifier, keyword, nested, next_word, pattern, peek, quantity_parts, span_between, string,
    symbol, ws,
};

/// `expr = term { ("+" | "-") term }`
pub fn expr(input: Input) -> PResult<Expr> {
    let (mut rest, mut left) = term(input)?;
    for _ in 0..MAX_CHAIN {
        let Some((after_op, op)) = plus_minus(rest) else {
            return Ok((rest, left));
        };
        let (after, right) = term(after_op)?;
        left = binary(op, left, right);
        rest = after;
    }
    Err(chain_too_long(&rest))
}

/// `+` or `-`, but not the `+/-` that starts an uncertainty.
fn plus_minus(input: Input) -> Option<(Input, BinaryOp)> {
    let (skip, text) = peek(&input);
    let op = match text.as_bytes().first()? {
        _ if text.starts_with("+/-") => return None,
        b'+' => BinaryOp::Add,
        b'-' => BinaryOp::Subtract,
        _ => return None,
    };
    Some((input.take_from(skip + 1), op))
}

/// `*` or `/`.
fn times_divide(input: Input) -> Option<(Input, BinaryOp)> {
    let (skip, text) = peek(&input);
    let op = match text.as_bytes().first()? {
        b'*' => BinaryOp::Multiply,
        b'/' => BinaryOp::Divide,
        _ => return None,
    };
    Some((input.take_from(skip + 1), op))
}

fn binary(op: BinaryOp, left: Expr, right: Expr) -> Expr {
    let span = left.span.to(right.span);
    Expr {
        kind: ExprKind::Binary {
            op,
            left: Box::new(left),
            right: Box::new(right),
        },
        span,
    }
}

/// `term = unary { ("*" | "/") unary }`
fn term(input: Input) -> PResult<Expr> {
    let (mut rest, mut left) = unary(input)?;
    for _ in 0..MAX_CHAIN {
        let Some((after_op, op)) = times_divide(rest) else {
            return Ok((rest, left));
        };
        let (after, right) = unary(after_op)?;
        left = binary(op, left, right);
        rest = after;
    }
    Err(chain_too_long(&rest))
}

/// `unary = { "-" } power`
fn unary(input: Input) -> PResult<Expr> {
    let mut signs = Vec::new();
    let mut rest = input;
    while let Ok((after, span)) = symbol("-", "`-`").parse(rest) {
        if signs.len() >= MAX_CHAIN {
            return Err(chain_too_long(&rest));
        }
        signs.push(span);
        rest = after;
    }
    let (rest, mut value) = power(rest)?;
    for sign in signs.into_iter().rev() {
        value = Expr {
            span: sign.to(value.span),
            kind: ExprKind::Negate(Box::new(value)),
        };
    }
    Ok((rest, value))
}

/// `power = atom [ "^" unary ]` (right-associative)
fn power(input: Input) -> PResult<Expr> {
    let (rest, base) = atom(input)?;
    match symbol("^", "`^`").parse(rest) {
        Ok((after, _)) => {
            let (after, exponent) = nested(after, unary)?;
            Ok((after, binary(BinaryOp::Power, base, exponent)))
        }
        Err(_) => Ok((rest, base)),
    }
}

/// `atom = quantity | string | call | name | "(" expr ")"`
fn atom(input: Input) -> PResult<Expr> {
    let (start, _) = ws(input)?;
    let first = start.fragment().chars().next();
    match first {
        Some(c) if c.is_ascii_digit() => quantity(start),
        Some('"') => {
            let (rest, text) = string(start)?;
            Ok((
                rest,
                Expr {
                    span: text.span,
                    kind: ExprKind::Text(text),
                },
            ))
        }
        Some('(') => parenthesised(start),
        _ => name_or_call(start),
    }
}

/// `"(" expr ")"`
fn parenthesised(input: Input) -> PResult<Expr> {
    let (after_open, open) = symbol("(", "`(`").parse(input)?;
    let (rest, mut inner) = nested(after_open, expr)?;
    let (rest, close) = symbol(")", "`)`").parse(rest)?;
    inner.span = open.to(close);
    Ok((rest, inner))
}

/// `call = name "(" [ arg { "," arg } ] ")"` or a plain `name`
fn name_or_call(input: Input) -> PResult<Expr> {
    let (rest, name) = dotted_name(input).map_err(|e| match e {
        Err::Error(_) => Err::Error(SyntaxError::expected(&input, "a value")),
        other => other,
    })?;
    let Ok((after_open, _)) = symbol("(", "`(`").parse(rest) else {
        return Ok((
            rest,
            Expr {
                span: name.span,
                kind: ExprKind::Name(name),
            },
        ));
    };
    let (rest, args) = nested(after_open, arguments)?;
    let (rest, close) = symbol(")", "`)` or `,`").parse(rest)?;
    let span = name.span.to(close);
    Ok((
        rest,
        Expr {
            span,
            kind: ExprKind::Call {
                function: name,
                args,
            },
        },
    ))
}

fn arguments(input: Input) -> PResult<Vec<Arg>> {
    let mut args = Vec::new();
    if symbol(")", "`)`").parse(input).is_ok() {
        return Ok((input, args));
    }
    let mut rest = input;
    loop {
        let (after, arg) = argument(rest)?;
        args.push(arg);
        match symbol(",", "`,`").parse(after) {
            Ok((after_comma, _)) => rest = after_comma,
            Err(_) => return Ok((after, args)),
        }
    }
}

/// `arg = [ identifier ":" ] expr`
fn argument(input: Input) -> PResult<Arg> {
    let labelled = (identifier, symbol(":", "`:`")).parse(input);
    let (rest, label) = match labelled {
        Ok((after, (label, _))) => (after, Some(label)),
        Err(_) => (input, None),
    };
    let (rest, value) = expr(rest)?;
    Ok((rest, Arg { label, value }))
}

/// A quantity literal as a syntax node (the grammar is in [`super::lexical::quantity_parts`]).
fn quantity(input: Input) -> PResult<Expr> {
    let (start, _) = ws(input)?;
    let (rest, parts) = quantity_parts(start)?;
    let span = span_between(&start, &rest);
    Ok((
        rest,
        Expr {
            span,
            kind: ExprKind::Quantity(Box::new(owned_quantity(&parts))),
        },
    ))
}

/// Owned syntax for borrowed quantity parts.
pub fn owned_quantity(parts: &QuantityParts) -> Quantity {
    let number = |(value, piece): NumberPiece| Number {
        value,
        text: piece.text.to_string(),
    };
    let unit = |piece: Piece| UnitRef {
        symbol: piece.text.to_string(),
        span: piece.span,
    };
    Quantity {
        value: number(parts.value),
        unit: parts.unit.map(unit),
        uncertainty: parts.uncertainty.map(|u| Uncertainty {
            value: number(u.value),
            unit: u.unit.map(unit),
            coverage: u.coverage.map(number),
        }),
    }
}

/// The comparison operator at the start of `input` (after white space is skipped) and its
/// length, if one stands there; tried in the order of [`compare_op`].
fn compare_op_here(input: &Input) -> Option<(CompareOp, usize)> {
    let bytes = input.fragment().as_bytes();
    match (bytes.first()?, bytes.get(1)) {
        (b'<', Some(b'=')) => Some((CompareOp::AtMost, 2)),
        (b'>', Some(b'=')) => Some((CompareOp::AtLeast, 2)),
        (b'=', Some(b'=')) => Some((CompareOp::Equal, 2)),
        (b'!', Some(b'=')) => Some((CompareOp::NotEqual, 2)),
        (b'<', _) => Some((CompareOp::Below, 1)),
        (b'>', _) => Some((CompareOp::Above, 1)),
        _ => None,
    }
}

/// `compare_op = "<=" | "<" | ">=" | ">" | "==" | "!="`
fn compare_op(input: Input) -> PResult<CompareOp> {
    let (start, _) = ws(input)?;
    if let Some((op, len)) = compare_op_here(&start) {
        return Ok((start.take_from(len), op));
    }
    alt((
        symbol("<=", "`<=`").map(|_| CompareOp::AtMost),
        symbol(">=", "`>=`").map(|_| CompareOp::AtLeast),
        symbol("==", "`==`").map(|_| CompareOp::Equal),
        symbol("!=", "`!=`").map(|_| CompareOp::NotEqual),
        symbol("<", "`<`").map(|_| CompareOp::Below),
        symbol(">", "`>`").map(|_| CompareOp::Above),
    ))
    .parse(input)
}

/// Whether a test may carry a written allowance (only a rule's `require` may).
#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Allowance {
    /// In a `require`.
    Allowed,
    /// In a condition.
    Refused,
}

/// `test = expr ( compare_op expr [ allowance ]
///              | "between" expr "and" expr [ allowance ]
///              | [ "not" ] "in" name
///              | [ "not" ] "matches" pattern )`
pub fn test(input: Input, allowance: Allowance) -> PResult<Test> {
    let (start, _) = ws(input)?;
    let (rest, subject) = expr(start)?;
    let (rest, kind) = test_kind(rest, subject)?;
    let (rest, kind) = with_allowance(rest, kind, allowance)?;
    Ok((
        rest,
        Test {
            kind,
            span: span_between(&start, &rest),
        },
    ))
}

/// What follows a test's subject: the first of a comparison, `between` and a membership or
/// pattern test that parses. The next token says which one that is; a test that none of them
/// starts goes through all three in turn, which gives the error naming what was expected.
fn test_kind(input: Input, subject: Expr) -> PResult<TestKind> {
    let (start, _) = ws(input)?;
    if compare_op_here(&start).is_some() {
        return comparison(start, subject);
    }
    match next_word(&start) {
        "between" => between(start, subject),
        // neither a comparison nor `between` starts with these words, and after them the
        // membership test either parses or fails for good
        "in" | "matches" => membership(start, subject),
        "not" if membership_after_not(start) => membership(start, subject),
        _ => all_test_kinds(start, subject),
    }
}

/// Whether `input`, which starts with `not`, goes on with `in` or `matches`.
fn membership_after_not(input: Input) -> bool {
    let Ok((after, _)) = keyword!("not").parse(input) else {
        return false;
    };
    ws(after).is_ok_and(|(next, _)| matches!(next_word(&next), "in" | "matches"))
}

/// Each kind of test tried in turn, as the grammar orders them.
fn all_test_kinds(input: Input, subject: Expr) -> PResult<TestKind> {
    alt((
        |i| comparison(i, subject.clone()),
        |i| between(i, subject.clone()),
        |i| membership(i, subject.clone()),
    ))
    .parse(input)
}

fn comparison(input: Input, left: Expr) -> PResult<TestKind> {
    let (rest, op) = compare_op(input)?;
    let (rest, right) = nom::combinator::cut(expr).parse(rest)?;
    Ok((
        rest,
        TestKind::Compare {
            left,
            op,
            right,
            allowance: None,
        },
    ))
}

fn between(input: Input, subject: Expr) -> PResult<TestKind> {
    let (rest, _) = keyword!("between").parse(input)?;
    let (rest, low) = nom::combinator::cut(expr).parse(rest)?;
    let (rest, _) = nom::combinator::cut(keyword!("and")).parse(rest)?;
    let (rest, high) = nom::combinator::cut(expr).parse(rest)?;
    Ok((
        rest,
        TestKind::Between {
            subject,
            low,
            high,
            allowance: None,
        },
    ))
}

fn membership(input: Input, subject: Expr) -> PResult<TestKind> {
    let (rest, negated) = opt(keyword!("not")).parse(input)?;
    let negated = negated.is_some();
    if let Ok((rest, _)) = keyword!("in").parse(rest) {
        let (rest, list) = nom::combinator::cut(identifier).parse(rest)?;
        return Ok((
            rest,
            TestKind::Member {
                subject,
                negated,
                list,
            },
        ));
    }
    let (rest, _) = keyword!("matches").parse(rest).map_err(|e| match e {
        Err::Error(mut err) => {
            if let super::error::SyntaxKind::Expected(what) = &mut err.kind {
                what.push(if negated {
                    "`in`"
                } else {
                    "a comparison like `<=`, `between`, `in` or `matches`"
                });
            }
            Err::Error(err)
        }
        other => other,
    })?;
    let (rest, pattern) = nom::combinator::cut(pattern).parse(rest)?;
    Ok((
        rest,
        TestKind::Matches {
            subject,
            negated,
            pattern,
        },
    ))
}

/// `allowance = "allowing" expr`
fn with_allowance(input: Input, mut kind: TestKind, allowance: Allowance) -> PResult<TestKind> {
    let Ok((rest, at)) = keyword!("allowing").parse(input) else {
        return Ok((input, kind));
    };
    if allowance == Allowance::Refused {
        let (start, _) = ws(input)?;
        return Err(Err::Failure(SyntaxError::specific(
            &start,
            at.end - at.start,
            ParseError::AllowanceInCondition,
        )));
    }
    let (rest, value) = nom::combinator::cut(expr).parse(rest)?;
    match &mut kind {
        TestKind::Compare { allowance, .. } | TestKind::Between { allowance, .. } => {
            *allowance = Some(value);
            Ok((rest, kind))
        }
        _ => {
            let (start, _) = ws(input)?;
            Err(Err::Failure(SyntaxError::specific(
                &start,
                at.end - at.start,
                ParseError::AllowanceOnList,
            )))
        }
    }
}

/// `condition = and_condition { "or" and_condition }`
pub fn condition(input: Input) -> PResult<Condition> {
    let (mut rest, mut left) = and_condition(input)?;
    let mut count = 0;
    while let Ok((after, _)) = keyword!("or").parse(rest) {
        count += 1;
        if count >= MAX_CHAIN {
            return Err(chain_too_long(&rest));
        }
        let (after, right) = nom::combinator::cut(and_condition).parse(after)?;
        left = Condition::Or(Box::new(left), Box::new(right));
        rest = after;
    }
    Ok((rest, left))
}

/// `and_condition = not_condition { "and" not_condition }`
fn and_condition(input: Input) -> PResult<Condition> {
    let (mut rest, mut left) = not_condition(input)?;
    let mut count = 0;
    while let Ok((after, _)) = keyword!("and").parse(rest) {
        count += 1;
        if count >= MAX_CHAIN {
            return Err(chain_too_long(&rest));
        }
        let (after, right) = nom::combinator::cut(not_condition).parse(after)?;
        left = Condition::And(Box::new(left), Box::new(right));
        rest = after;
    }
    Ok((rest, left))
}

/// `not_condition = { "not" } ( test | "(" condition ")" )`
fn not_condition(input: Input) -> PResult<Condition> {
    let mut nots = Vec::new();
    let mut rest = input;
    while let Ok((after, span)) = keyword!("not").parse(rest) {
        if nots.len() >= MAX_CHAIN {
            return Err(chain_too_long(&rest));
        }
        nots.push(span);
        rest = after;
    }
    let (rest, mut cond) = alt((
        |i| test(i, Allowance::Refused).map(|(r, t)| (r, Condition::Test(Box::new(t)))),
        parenthesised_condition,
    ))
    .parse(rest)?;
    for not in nots.into_iter().rev() {
        let span = not.to(cond.span());
        cond = Condition::Not(Box::new(cond), span);
    }
    Ok((rest, cond))
}

fn parenthesised_condition(input: Input) -> PResult<Condition> {
    let (rest, _) = symbol("(", "`(`").parse(input)?;
    let (rest, cond) = nested(rest, condition)?;
    let (rest, _) = nom::combinator::cut(symbol(")", "`)`")).parse(rest)?;
    Ok((rest, cond))
}
