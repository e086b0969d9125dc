//! Top-level items and class bodies: the header, includes, the measurement schema, derived
//! values, parts lists, classes, rules, conditional groups and bulletins.

use nom::branch::alt;
use nom::combinator::{cut, opt};
use nom::{Err, Parser};

use super::ast::{
    Bulletin, Class, ClassItem, Coverage, CoverageSpec, Decision, DecisionRule, Define, Edition,
    Item, ListEntry, ListKind, Measure, PartsList, Rule, WhenGroup,
};
use super::error::{ParseError, SyntaxError};
use super::expr::{Allowance, condition, expr, test};
use super::lexical::{
    Input, PResult, date, dotted_name, first_word, identifier, keyword, nested, next_word,
    number_piece, pattern, peek, section, span_between, string, symbol, ws,
};

/// Keywords that start a top-level item; parsing resumes at one of these after an error.
pub const ITEM_KEYWORDS: &[&str] = &[
    "series", "edition", "decision", "coverage", "include", "measure", "define", "approved",
    "banned", "class", "bulletin",
];

/// `item = series | edition | decision | coverage | include | measure | define | list | class
///        | bulletin`
pub fn item(input: Input) -> PResult<Item> {
    alt((
        series,
        edition,
        decision,
        coverage,
        include,
        measure.map(Item::Measure),
        define.map(Item::Define),
        parts_list.map(Item::List),
        class.map(Item::Class),
        bulletin.map(Item::Bulletin),
    ))
    .parse(input)
    .map_err(|e| match e {
        Err::Error(err) => Err::Error(SyntaxError {
            kind: super::error::SyntaxKind::Expected(super::error::Expected::one(
                "an item (`measure`, `define`, `class`, `bulletin`, `approved list`, ...)",
            )),
            ..err
        }),
        other => other,
    })
}

/// `series = "series" string`
fn series(input: Input) -> PResult<Item> {
    let (rest, _) = keyword!("series").parse(input)?;
    let (rest, name) = cut(string).parse(rest)?;
    Ok((rest, Item::Series(name)))
}

/// `edition = "edition" string "effective" date`
fn edition(input: Input) -> PResult<Item> {
    let (rest, _) = keyword!("edition").parse(input)?;
    let (rest, (name, _, effective)) = cut((string, keyword!("effective"), date)).parse(rest)?;
    Ok((rest, Item::Edition(Edition { name, effective })))
}

/// `decision = "decision" decision_rule`
fn decision(input: Input) -> PResult<Item> {
    decision_line.map(Item::Decision).parse(input)
}

/// `"decision" decision_rule`, in the header or in a rule, with its span.
fn decision_line(input: Input) -> PResult<Decision> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("decision").parse(start)?;
    let (rest, rule) = cut(decision_rule).parse(rest)?;
    let span = span_between(&start, &rest);
    Ok((rest, Decision { rule, span }))
}

/// `decision_rule = "guarded" ( "rejection" | "acceptance" ) | "simple" "acceptance"`
fn decision_rule(input: Input) -> PResult<DecisionRule> {
    let guarded = (
        keyword!("guarded"),
        alt((
            keyword!("rejection").map(|_| DecisionRule::GuardedRejection),
            keyword!("acceptance").map(|_| DecisionRule::GuardedAcceptance),
        )),
    )
        .map(|(_, rule)| rule);
    let simple =
        (keyword!("simple"), keyword!("acceptance")).map(|_| DecisionRule::SimpleAcceptance);
    alt((guarded, simple)).parse(input)
}

/// `coverage = "coverage" ( "k" "=" number | number "%" )`
fn coverage(input: Input) -> PResult<Item> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("coverage").parse(start)?;
    let factor = (keyword!("k"), symbol("=", "`=`"), number_piece)
        .map(|(_, _, (value, piece))| (CoverageSpec::Factor(value), piece));
    let percent = (number_piece, symbol("%", "`%`"))
        .map(|((value, piece), _)| (CoverageSpec::Percent(value), piece));
    let (rest, (spec, piece)) = cut(alt((factor, percent))).parse(rest)?;
    let line = Coverage {
        spec,
        written: piece.text.to_string(),
        number: piece.span,
        span: span_between(&start, &rest),
    };
    Ok((rest, Item::Coverage(line)))
}

/// `include = "include" string`
fn include(input: Input) -> PResult<Item> {
    let (rest, _) = keyword!("include").parse(input)?;
    let (rest, path) = cut(string).parse(rest)?;
    Ok((rest, Item::Include(path)))
}

/// `measure = "measure" name ":" identifier [ "per" "cylinder" ] [ "required" | "optional" ]
///            [ "range" expr "to" expr ] [ string ]`
fn measure(input: Input) -> PResult<Measure> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("measure").parse(start)?;
    let (rest, (name, _, dimension)) =
        cut((dotted_name, symbol(":", "`:`"), identifier)).parse(rest)?;
    let (rest, per_cylinder) = opt((keyword!("per"), cut(keyword!("cylinder")))).parse(rest)?;
    let (rest, required) = opt(alt((
        keyword!("required").map(|_| true),
        keyword!("optional").map(|_| false),
    )))
    .parse(rest)?;
    let (rest, range) = opt((keyword!("range"), cut((expr, keyword!("to"), expr)))).parse(rest)?;
    let (rest, procedure) = opt(string).parse(rest)?;
    Ok((
        rest,
        Measure {
            name,
            dimension,
            per_cylinder: per_cylinder.is_some(),
            required: required.unwrap_or(true),
            range: range.map(|(_, (low, _, high))| (low, high)),
            procedure,
            span: span_between(&start, &rest),
        },
    ))
}

/// `define = "define" name "=" expr`
fn define(input: Input) -> PResult<Define> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("define").parse(start)?;
    let (rest, (name, _, value)) = cut((dotted_name, symbol("=", "`=`"), expr)).parse(rest)?;
    Ok((
        rest,
        Define {
            name,
            expr: value,
            span: span_between(&start, &rest),
        },
    ))
}

/// `list = ( "approved" | "banned" ) "list" identifier [ string ] [ "ignoring" "case" ]
///         { entry [ "," ] } "end"`
/// `entry = string | pattern`
fn parts_list(input: Input) -> PResult<PartsList> {
    let (start, _) = ws(input)?;
    let (rest, kind) = alt((
        keyword!("approved").map(|_| ListKind::Approved),
        keyword!("banned").map(|_| ListKind::Banned),
    ))
    .parse(start)?;
    let (rest, (_, name)) = cut((keyword!("list"), identifier)).parse(rest)?;
    let (rest, title) = opt(string).parse(rest)?;
    let (mut rest, ignoring) = opt((keyword!("ignoring"), cut(keyword!("case")))).parse(rest)?;
    let ignore_case = ignoring.is_some();
    let mut entries = Vec::new();
    loop {
        if let Ok((after, _)) = keyword!("end").parse(rest) {
            let span = span_between(&start, &after);
            return Ok((
                after,
                PartsList {
                    kind,
                    name,
                    title,
                    ignore_case,
                    entries,
                    span,
                },
            ));
        }
        let (after, entry) = alt((
            string.map(ListEntry::Exact),
            pattern.map(ListEntry::Pattern),
        ))
        .parse(rest)
        .map_err(|e| {
            cut_with(
                e,
                "a part number in quotes, a pattern like `/^AB-1[0-9]$/`, or `end`",
            )
        })?;
        entries.push(entry);
        let (after, _) = opt(symbol(",", "`,`")).parse(after)?;
        rest = after;
    }
}

/// Turns a recoverable error into a failure that names what was expected.
fn cut_with(e: Err<SyntaxError>, what: &'static str) -> Err<SyntaxError> {
    match e {
        Err::Error(mut err) => {
            err.kind = super::error::SyntaxKind::Expected(super::error::Expected::one(what));
            Err::Failure(err)
        }
        other => other,
    }
}

/// `class = "class" identifier [ string ] [ "extends" identifier ] body "end"`
fn class(input: Input) -> PResult<Class> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("class").parse(start)?;
    let (rest, name) = cut(identifier).parse(rest)?;
    let (rest, title) = opt(string).parse(rest)?;
    let (rest, extends) =
        opt((keyword!("extends"), cut(identifier)).map(|(_, n)| n)).parse(rest)?;
    let (rest, body) = body(rest)?;
    Ok((
        rest,
        Class {
            name,
            title,
            extends,
            body,
            span: span_between(&start, &rest),
        },
    ))
}

/// `bulletin = "bulletin" string [ string ] "effective" date "amends" identifier body "end"`
fn bulletin(input: Input) -> PResult<Bulletin> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("bulletin").parse(start)?;
    let (rest, id) = cut(string).parse(rest)?;
    let (rest, title) = opt(string).parse(rest)?;
    let (rest, (_, effective, _, amends)) =
        cut((keyword!("effective"), date, keyword!("amends"), identifier)).parse(rest)?;
    let (rest, body) = body(rest)?;
    Ok((
        rest,
        Bulletin {
            id,
            title,
            effective,
            amends,
            body,
            span: span_between(&start, &rest),
        },
    ))
}

/// `body = { rule | when_group | drop } "end"`
///
/// The next word says which item follows: each of `rule`, `when` and `drop` either parses
/// or fails for good once its first keyword is there, so the others need not be tried.
fn body(mut input: Input) -> PResult<Vec<ClassItem>> {
    let mut items = Vec::new();
    loop {
        let (start, _) = ws(input)?;
        let parsed = match next_word(&start) {
            "end" => return Ok((start.take_from(3), items)),
            "rule" | "override" => rule.map(ClassItem::Rule).parse(start),
            "when" => when_group.map(ClassItem::When).parse(start),
            "drop" => drop_rule(start),
            _ => alt((
                rule.map(ClassItem::Rule),
                when_group.map(ClassItem::When),
                drop_rule,
            ))
            .parse(start),
        };
        let (rest, item) =
            parsed.map_err(|e| cut_with(e, "`rule`, `override rule`, `when`, `drop` or `end`"))?;
        items.push(item);
        input = rest;
    }
}

/// `drop = "drop" section`
fn drop_rule(input: Input) -> PResult<ClassItem> {
    let (rest, _) = keyword!("drop").parse(input)?;
    let (rest, section) = cut(section).parse(rest)?;
    Ok((rest, ClassItem::Drop(section)))
}

/// `when_group = "when" condition body "end"`
fn when_group(input: Input) -> PResult<WhenGroup> {
    let (start, _) = ws(input)?;
    let (rest, _) = keyword!("when").parse(start)?;
    let (rest, condition) = cut(condition).parse(rest)?;
    let (rest, body) = nested(rest, body)?;
    Ok((
        rest,
        WhenGroup {
            condition,
            body,
            span: span_between(&start, &rest),
        },
    ))
}

/// `rule = [ "override" ] "rule" section string [ "when" condition ] "require" test
///         [ "decision" decision_rule ] [ "penalty" string ] [ "note" string ] "end"`
fn rule(input: Input) -> PResult<Rule> {
    let (start, _) = ws(input)?;
    let (rest, overrides) = opt(keyword!("override")).parse(start)?;
    let (rest, _) = if overrides.is_some() {
        cut(keyword!("rule")).parse(rest)?
    } else {
        keyword!("rule").parse(rest)?
    };
    let (rest, (section, title)) = cut((section, string)).parse(rest)?;
    let (rest, condition) = opt((keyword!("when"), cut(condition)).map(|(_, c)| c)).parse(rest)?;
    let (rest, _) = cut(keyword!("require")).parse(rest)?;
    let (rest, require) = cut(|i| test(i, Allowance::Allowed)).parse(rest)?;
    refuse_joined_tests(rest)?;
    // each clause below starts past white space: skipped once here, not by each in turn
    let (rest, _) = ws(rest)?;
    let (rest, decision) = opt(decision_line).parse(rest)?;
    let (rest, _) = ws(rest)?;
    let (rest, penalty) = opt((keyword!("penalty"), cut(string)).map(|(_, s)| s)).parse(rest)?;
    let (rest, _) = ws(rest)?;
    let (rest, note) = opt((keyword!("note"), cut(string)).map(|(_, s)| s)).parse(rest)?;
    let (rest, _) = ws(rest)?;
    let (rest, _) = keyword!("end")
        .parse(rest)
        .map_err(|e| cut_with(e, "`decision`, `penalty`, `note` or `end`"))?;
    Ok((
        rest,
        Rule {
            overrides: overrides.is_some(),
            section,
            title,
            condition,
            require,
            decision,
            penalty,
            note,
            span: span_between(&start, &rest),
        },
    ))
}

/// A `require` holds one test; `and` or `or` after it gets a specific error.
fn refuse_joined_tests(input: Input) -> PResult<()> {
    let (skip, text) = peek(&input);
    match first_word(text) {
        joiner @ ("and" | "or") => Err(Err::Failure(SyntaxError::specific(
            &input.take_from(skip),
            joiner.len(),
            ParseError::JoinedRequire,
        ))),
        _ => Ok((input, ())),
    }
}
