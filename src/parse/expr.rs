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
    identifier, keyword, nested, pattern, quantity_parts, span_between, string, symbol, ws,
};

/// `expr = term { ("+" | "-") term }`
pub fn expr(input: Input) -> PResult<Expr> {
    let (mut rest, mut left) = term(input)?;
    for _ in 0..MAX_CHAIN {
        let op = alt((
            symbol("+", "`+`").map(|_| BinaryOp::Add),
            symbol("-", "`-`").map(|_| BinaryOp::Subtract),
        ));
        let Ok((after_op, op)) = opt_plus_minus(rest, op) else {
            return Ok((rest, left));
        };
        let (after, right) = term(after_op)?;
        left = binary(op, left, right);
        rest = after;
    }
    Err(chain_too_long(&rest))
}

/// `+` or `-`, but not the `+/-` that starts an uncertainty.
fn opt_plus_minus<'a>(
    input: Input<'a>,
    mut op: impl Parser<Input<'a>, Output = BinaryOp, Error = SyntaxError>,
) -> PResult<'a, BinaryOp> {
    let (start, _) = ws(input)?;
    if start.fragment().starts_with("+/-") {
        return Err(Err::Error(SyntaxError::expected(&start, "`+`")));
    }
    op.parse(start)
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
        let mut op = alt((
            symbol("*", "`*`").map(|_| BinaryOp::Multiply),
            symbol("/", "`/`").map(|_| BinaryOp::Divide),
        ));
        let Ok((after_op, op)) = op.parse(rest) else {
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
            kind: ExprKind::Quantity(owned_quantity(&parts)),
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

/// `compare_op = "<=" | "<" | ">=" | ">" | "==" | "!="`
fn compare_op(input: Input) -> PResult<CompareOp> {
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
    let (rest, kind) = alt((
        |i| comparison(i, subject.clone()),
        |i| between(i, subject.clone()),
        |i| membership(i, subject.clone()),
    ))
    .parse(rest)?;
    let (rest, kind) = with_allowance(rest, kind, allowance)?;
    Ok((
        rest,
        Test {
            kind,
            span: span_between(&start, &rest),
        },
    ))
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
    let (rest, _) = keyword("between").parse(input)?;
    let (rest, low) = nom::combinator::cut(expr).parse(rest)?;
    let (rest, _) = nom::combinator::cut(keyword("and")).parse(rest)?;
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
    let (rest, negated) = opt(keyword("not")).parse(input)?;
    let negated = negated.is_some();
    if let Ok((rest, _)) = keyword("in").parse(rest) {
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
    let (rest, _) = keyword("matches").parse(rest).map_err(|e| match e {
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
    let Ok((rest, at)) = keyword("allowing").parse(input) else {
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
    while let Ok((after, _)) = keyword("or").parse(rest) {
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
    while let Ok((after, _)) = keyword("and").parse(rest) {
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
    while let Ok((after, span)) = keyword("not").parse(rest) {
        if nots.len() >= MAX_CHAIN {
            return Err(chain_too_long(&rest));
        }
        nots.push(span);
        rest = after;
    }
    let (rest, mut cond) = alt((
        |i| test(i, Allowance::Refused).map(|(r, t)| (r, Condition::Test(t))),
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
