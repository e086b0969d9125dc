//! Parser tests: structure (spans ignored), precedence, the canonical printer's round trip,
//! and the underlined text of syntax errors.

use super::ast::{BinaryOp, ClassItem, Condition, ExprKind, Item, TestKind};
use super::error::ParseError;
use super::parse_rulebook;
use super::print::{canonical, expr_text};
use crate::diagnostic::Problem;

const HEADER: &str =
    "series \"S\"\nedition \"1\" effective 2027-01-01\ndecision simple acceptance\n";

fn parse_ok(text: &str) -> Vec<Item> {
    let (book, problems) = parse_rulebook(0, text);
    assert!(problems.is_empty(), "unexpected problems: {problems:?}");
    book.items
}

fn problems(text: &str) -> Vec<Problem> {
    parse_rulebook(0, text).1
}

/// The text under the primary label of the first problem.
fn underlined(text: &str) -> String {
    let p = problems(text);
    let span = p
        .first()
        .and_then(Problem::primary_span)
        .unwrap_or_default();
    text.get(span.start..span.end).unwrap_or("").to_string()
}

fn define_expr(source: &str) -> super::ast::Expr {
    let items = parse_ok(&format!("define x = {source}"));
    match items.into_iter().next() {
        Some(Item::Define(d)) => d.expr,
        other => panic!("expected a define, got {other:?}"),
    }
}

#[test]
fn multiplication_binds_tighter_than_addition() {
    let e = define_expr("a + b * c");
    let ExprKind::Binary { op, right, .. } = e.kind else {
        panic!("not binary")
    };
    assert_eq!(op, BinaryOp::Add);
    assert!(matches!(
        right.kind,
        ExprKind::Binary {
            op: BinaryOp::Multiply,
            ..
        }
    ));
}

#[test]
fn power_is_right_associative_and_above_negation() {
    assert_eq!(expr_text(&define_expr("2^3^2")), "2^3^2");
    let e = define_expr("-x^2");
    assert!(
        matches!(e.kind, ExprKind::Negate(ref inner) if matches!(inner.kind, ExprKind::Binary { op: BinaryOp::Power, .. }))
    );
}

#[test]
fn subtraction_is_left_associative() {
    let e = define_expr("a - b - c");
    let ExprKind::Binary { left, .. } = e.kind else {
        panic!("not binary")
    };
    assert!(matches!(
        left.kind,
        ExprKind::Binary {
            op: BinaryOp::Subtract,
            ..
        }
    ));
    assert_eq!(expr_text(&define_expr("a - (b - c)")), "a - (b - c)");
}

#[test]
fn a_mixed_fraction_is_one_number_but_spaced_minus_subtracts() {
    assert!(
        matches!(define_expr("1-5/8 in").kind, ExprKind::Quantity(ref q) if q.value.value == 1.625)
    );
    assert!(matches!(
        define_expr("1 - 5/8").kind,
        ExprKind::Binary {
            op: BinaryOp::Subtract,
            ..
        }
    ));
}

#[test]
fn uncertainty_in_both_spellings_with_coverage() {
    for text in ["4.030 in ± 0.0005 in", "4.030 in +/- 0.0005 in (k = 2)"] {
        let ExprKind::Quantity(q) = define_expr(text).kind else {
            panic!("not a quantity")
        };
        let u = q
            .uncertainty
            .unwrap_or_else(|| panic!("no uncertainty in {text}"));
        assert_eq!(u.value.value, 0.0005);
    }
}

#[test]
fn labelled_and_positional_arguments() {
    let ExprKind::Call { function, args } = define_expr("f(1, b: 2 in)").kind else {
        panic!("not a call")
    };
    assert_eq!(function.text, "f");
    assert!(args[0].label.is_none());
    assert_eq!(args[1].label.as_ref().map(|l| l.text.as_str()), Some("b"));
}

#[test]
fn conditions_give_not_then_and_then_or() {
    let text = format!(
        "{HEADER}class c when a == 1 or not b == 2 and c == 3 rule 1 \"t\" require x <= 1 end end end"
    );
    let items = parse_ok(&text);
    let Some(Item::Class(class)) = items.last() else {
        panic!("no class")
    };
    let ClassItem::When(group) = &class.body[0] else {
        panic!("no when")
    };
    let Condition::Or(_, right) = &group.condition else {
        panic!("or is not at the top")
    };
    let Condition::And(left, _) = right.as_ref() else {
        panic!("and is not below or")
    };
    assert!(matches!(left.as_ref(), Condition::Not(..)));
}

#[test]
fn membership_patterns_and_ranges() {
    let text = format!(
        "{HEADER}class c\n rule 1 \"a\" require p not in heads end\n rule 2 \"b\" require p matches /^A-\\/1/i end\n rule 3 \"c\" require s between 1 in and 2 in allowing 0.1 in end\nend"
    );
    let items = parse_ok(&text);
    let Some(Item::Class(class)) = items.last() else {
        panic!("no class")
    };
    let kinds: Vec<&TestKind> = class
        .body
        .iter()
        .filter_map(|i| match i {
            ClassItem::Rule(r) => Some(&r.require.kind),
            _ => None,
        })
        .collect();
    assert!(matches!(kinds[0], TestKind::Member { negated: true, .. }));
    assert!(
        matches!(kinds[1], TestKind::Matches { pattern, .. } if pattern.source == "^A-/1" && pattern.ignore_case)
    );
    assert!(matches!(
        kinds[2],
        TestKind::Between {
            allowance: Some(_),
            ..
        }
    ));
}

#[test]
fn spans_cover_what_was_written() {
    let text = "define total = bore * 2";
    let items = parse_ok(text);
    let Some(Item::Define(d)) = items.first() else {
        panic!("no define")
    };
    assert_eq!(&text[d.name.span.start..d.name.span.end], "total");
    assert_eq!(&text[d.expr.span.start..d.expr.span.end], "bore * 2");
}

#[test]
fn trees_ignore_spans_and_layout() {
    let a = parse_ok("define x = (a+b)*c");
    let b = parse_ok("define   x =\n  ( a + b ) * c   # comment");
    let (Some(Item::Define(da)), Some(Item::Define(db))) = (a.first(), b.first()) else {
        panic!("no define")
    };
    assert_ne!(da.expr.span, db.expr.span, "the spans differ");
    assert_eq!(a, b);
}

#[test]
fn trees_that_differ_in_structure_are_unequal() {
    assert_ne!(parse_ok("define x = a + b"), parse_ok("define x = a - b"));
    assert_ne!(parse_ok("define x = a + b"), parse_ok("define y = a + b"));
    assert_ne!(parse_ok("define x = 4 in"), parse_ok("define x = 4 mm"));
}

#[test]
fn canonical_form_parses_back_to_the_same_tree() {
    let text = format!(
        "{HEADER}measure bore: length per cylinder optional range 3 in to 5 in \"gauge\"\n\
         define d = -(a - b)^2 / (c * (d + e)) - -f\n\
         approved list h \"t\" \"A\", /x\\/y/i end\n\
         class c \"C\" extends b drop 1.2 when not (a == 1 or b == \"q\\\"\") and c > 2 override rule 3a \"t\" when z != 0 require x <= 1-5/8 in ± 1 thou (k = 2) allowing 0.1 in decision guarded acceptance penalty \"p\" note \"n\" end end end\n\
         bulletin \"B\" \"title\" effective 2027-05-01 amends c rule 9 \"n\" require x not matches /a/ end end\n"
    );
    let first = parse_ok(&text);
    let printed = canonical(&super::ast::Rulebook {
        items: first.clone(),
    });
    let second = parse_ok(&printed);
    assert_eq!(first, second, "canonical text:\n{printed}");
}

#[test]
fn a_rule_keeps_its_own_decision_rule_through_the_printer() {
    use super::ast::DecisionRule;
    let text = format!(
        "{HEADER}class c rule 8.1 \"Weight\" require w >= 3000 lb decision simple acceptance \
         penalty \"p\" end rule 3.2 \"Bore\" require b <= 4 in end end\n"
    );
    let decisions = |items: Vec<Item>| -> Vec<Option<DecisionRule>> {
        items
            .into_iter()
            .filter_map(|i| match i {
                Item::Class(c) => Some(c.body),
                _ => None,
            })
            .flatten()
            .filter_map(|b| match b {
                ClassItem::Rule(r) => Some(r.decision.map(|d| d.rule)),
                _ => None,
            })
            .collect()
    };
    let first = parse_ok(&text);
    let printed = canonical(&super::ast::Rulebook {
        items: first.clone(),
    });
    assert!(
        printed.contains("    decision simple acceptance\n"),
        "{printed}"
    );
    let expected = vec![Some(DecisionRule::SimpleAcceptance), None];
    assert_eq!(decisions(first), expected);
    assert_eq!(decisions(parse_ok(&printed)), expected);
}

#[test]
fn errors_underline_the_offending_token() {
    assert_eq!(underlined("define x = 3 +"), "");
    assert_eq!(underlined("define x = (3"), "");
    assert_eq!(underlined("clas c end"), "clas");
    assert_eq!(underlined("define x = \"open"), "\"");
    assert_eq!(
        underlined("series \"s\" edition \"1\" effective 2027-02-30"),
        "2027-02-30"
    );
}

#[test]
fn every_broken_item_is_reported() {
    let text = "define a = \nmeasure b: length\ndefine c = (\nmeasure d: length\n";
    assert_eq!(problems(text).len(), 2);
}

#[test]
fn deep_nesting_is_an_error_not_a_crash() {
    let text = format!("define x = {}1", "(".repeat(100_000));
    let p = problems(&text);
    assert_eq!(p.len(), 1);
    assert_eq!(p[0].code, ParseError::TooDeep.code());
}

#[test]
fn long_chains_are_an_error_not_a_crash() {
    let text = format!("define x = 1{}", " + 1".repeat(10_000));
    assert_eq!(problems(&text)[0].code, ParseError::TooLong.code());
}

#[test]
fn a_require_with_and_gets_a_specific_error() {
    let text = "class c rule 1 \"t\" require a == 1 and b == 2 end end";
    assert_eq!(problems(text)[0].code, ParseError::JoinedRequire.code());
}

#[test]
fn an_allowance_in_a_condition_is_refused() {
    let text = "class c when a <= 1 allowing 1 rule 1 \"t\" require a == 1 end end end";
    assert_eq!(
        problems(text)[0].code,
        ParseError::AllowanceInCondition.code()
    );
}

#[test]
fn a_byte_order_mark_at_the_start_is_accepted() {
    let text = format!("\u{feff}{HEADER}");
    assert_eq!(parse_ok(&text), parse_ok(HEADER));
    // only at the start: anywhere else it is a character out of place, and named visibly
    let p = problems(&format!("{HEADER}\u{feff}"));
    assert_eq!(p.len(), 1);
    assert!(p[0].message.contains("`\\u{feff}`"), "{}", p[0].message);
}

#[test]
fn a_control_character_in_a_rule_title_is_refused_at_the_character() {
    let text = "class c rule 1 \"bore\u{0}limit\" require a == 1 end end";
    let p = problems(text);
    assert_eq!(
        p[0].code,
        ParseError::ControlCharacter { code_point: 0 }.code()
    );
    assert_eq!(underlined(text), "\u{0}");
    assert!(p[0].help.is_some());
}

#[test]
fn an_empty_pattern_is_refused_in_a_test_and_in_a_list() {
    let test = "class c rule 1 \"t\" require head.casting matches // end end";
    assert_eq!(problems(test)[0].code, ParseError::EmptyPattern.code());
    assert_eq!(underlined(test), "//");
    let list = "approved list heads \"Heads\" \"TV-1\", //i end";
    assert_eq!(problems(list)[0].code, ParseError::EmptyPattern.code());
}

/// The text `fmt` prints for `source`, with its comments.
fn fmt(source: &str) -> String {
    let (book, problems, comments) = super::parse_with_comments(0, source);
    assert!(problems.is_empty(), "{problems:?}");
    super::print::formatted(&book, source, &comments)
}

#[test]
fn fmt_keeps_leading_trailing_and_body_comments_and_blank_lines() {
    let source = "# file header\n\nseries \"S\"   # trailing\nedition \"1\" effective 2027-01-01\n\n\n# about the list\napproved list heads \"Heads\"\n  # first entry\n  \"A-1\" # kept at its end\n\n  /^B-#[0-9]$/\n  # before end\nend\nclass c\n  rule 1.1 \"t\"\n    # about the test\n    require x in heads\n  end # rule end\n  # last in body\nend\n# at the end\n";
    let expected = "# file header\n\nseries \"S\"  # trailing\nedition \"1\" effective 2027-01-01\n\n# about the list\napproved list heads \"Heads\"\n  # first entry\n  \"A-1\"  # kept at its end\n\n  /^B-#[0-9]$/\n  # before end\nend\n\nclass c\n  rule 1.1 \"t\"\n    # about the test\n    require x in heads\n  end  # rule end\n  # last in body\nend\n# at the end\n";
    let printed = fmt(source);
    assert_eq!(printed, expected);
    assert_eq!(fmt(&printed), printed, "not idempotent");
}

#[test]
fn a_hash_inside_a_string_or_pattern_is_no_comment() {
    let source = "approved list p \"P\"\n  \"A #1\"\n  /x #y/\nend\n";
    let (_, _, comments) = super::parse_with_comments(0, source);
    assert!(comments.is_empty(), "{comments:?}");
    assert_eq!(fmt(source), source);
}
