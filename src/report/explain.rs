//! One rule in plain words, for officials and competitors: what it requires, what is measured
//! and how, how each derived value is computed, when it applies, where it is written and how
//! the class came to have it, and the decision rule that will judge it.

use std::fmt::Write;

use super::format::Digits;
use crate::check::builtins::{self, Function};
use crate::check::limit::{self, Limit};
use crate::check::model::{CheckedRulebook, Class, ClassRule, Origin, ValueKind};
use crate::parse::ast::{CompareOp, Expr, ExprKind, TestKind};
use crate::parse::print::{expr_text, test_text};
use crate::source::SourceMap;

/// Where one version of a rule stands: from the edition or from a bulletin's date.
pub struct Found<'a> {
    /// The class.
    pub class: &'a Class,
    /// The rule.
    pub rule: &'a ClassRule,
    /// The bulletin date it comes into force, when a bulletin brought it.
    pub from: Option<String>,
}

/// Every version of `section` in the classes asked about (all classes when `class` is `None`):
/// as the edition has it, and as each later bulletin leaves it when that differs.
pub fn find<'a>(
    rulebook: &'a CheckedRulebook,
    class: Option<&str>,
    section: &str,
) -> Vec<Found<'a>> {
    let mut found = Vec::new();
    for c in rulebook
        .classes
        .iter()
        .filter(|c| class.is_none_or(|name| c.name == name))
    {
        let edition = c.rules.iter().find(|r| r.rule.section.text == section);
        if let Some(rule) = edition {
            found.push(Found {
                class: c,
                rule,
                from: None,
            });
        }
        let mut last = edition.map(|r| &r.origin);
        for a in &c.amended {
            if let Some(rule) = a.rules.iter().find(|r| r.rule.section.text == section)
                && last != Some(&rule.origin)
            {
                found.push(Found {
                    class: c,
                    rule,
                    from: Some(a.from.to_string()),
                });
                last = Some(&rule.origin);
            }
        }
    }
    found
}

/// The explanation of one version of a rule.
pub fn explain(rulebook: &CheckedRulebook, sources: &SourceMap, found: &Found) -> String {
    let r = &found.rule.rule;
    let mut out = String::new();
    let _ = writeln!(
        out,
        "{} \"{}\" in class {}",
        r.section.text, r.title.value, found.class.name
    );
    let file = sources.file(r.section.span.file);
    let (line, column) = file.line_column(r.section.span.start);
    let _ = writeln!(
        out,
        "  written at {}:{line}:{column}; {}",
        file.path.display(),
        provenance(found)
    );
    let _ = writeln!(
        out,
        "  requires   {}",
        requirement_words(rulebook, found.rule)
    );
    let _ = writeln!(out, "             (as written: {})", test_text(&r.require));
    if found.rule.conditions.is_empty() {
        let _ = writeln!(out, "  applies    always");
    }
    for c in &found.rule.condition_texts {
        let _ = writeln!(out, "  applies    only when {c}");
    }
    measured_lines(&mut out, rulebook, found.rule);
    let _ = writeln!(out, "  decided by {}", decision_words(rulebook, found.rule));
    if let Some(p) = &r.penalty {
        let _ = writeln!(out, "  penalty    {}", p.value);
    }
    if let Some(n) = &r.note {
        let _ = writeln!(out, "  note       {}", n.value);
    }
    out
}

fn provenance(found: &Found) -> String {
    let class = &found.class.name;
    match (&found.rule.origin, &found.from) {
        (Origin::Bulletin(b), Some(date)) => {
            format!("brought in by bulletin {b}, in force from {date}")
        }
        (Origin::Bulletin(b), None) => format!("from bulletin {b}"),
        (Origin::Class(c), _) if c != class => format!("inherited from class {c}"),
        (Origin::Class(_), _) if found.rule.rule.overrides => {
            format!("overridden in class {class}, replacing the rule it inherited")
        }
        (Origin::Class(_), _) => format!("written in class {class}"),
    }
}

fn op_words(op: CompareOp) -> &'static str {
    match op {
        CompareOp::AtMost => "at most",
        CompareOp::Below => "below",
        CompareOp::AtLeast => "at least",
        CompareOp::Above => "above",
        CompareOp::Equal => "equal to",
        CompareOp::NotEqual => "other than",
    }
}

fn requirement_words(rulebook: &CheckedRulebook, rule: &ClassRule) -> String {
    let test = &rule.rule.require;
    let every = if per_cylinder(rulebook, test) {
        "on every cylinder, "
    } else {
        ""
    };
    let words = match &rule.limit {
        Some(limit) => limit_words(limit),
        None => other_test_words(rulebook, test),
    };
    format!("{every}{words}")
}

/// A limit in words, subject first whichever side the limit is written on.
fn limit_words(limit: &Limit<Expr>) -> String {
    let subject = expr_text(&limit.subject);
    let (first, second) = limit.limits();
    let Some(op) = limit.op() else {
        let allowance = limit
            .allowance
            .as_ref()
            .map(|a| format!(", each end widened by {}", expr_text(a)))
            .unwrap_or_default();
        let high = second.map(expr_text).unwrap_or_default();
        return format!(
            "{subject} between {} and {high}{allowance}",
            expr_text(first)
        );
    };
    let allowance = limit
        .allowance
        .as_ref()
        .map(|a| allowance_words(limit, a, op))
        .unwrap_or_default();
    format!("{subject} {} {}{allowance}", op_words(op), expr_text(first))
}

/// A membership or pattern test in words.
fn other_test_words(rulebook: &CheckedRulebook, test: &crate::parse::ast::Test) -> String {
    match &test.kind {
        TestKind::Member {
            subject,
            negated,
            list,
        } => {
            let title = rulebook
                .lists
                .iter()
                .find(|l| l.name == list.text)
                .and_then(|l| l.title.clone())
                .map(|t| format!(" ({t})"))
                .unwrap_or_default();
            let on = if *negated { "not on" } else { "on" };
            format!(
                "{} {on} the list `{}`{title}",
                expr_text(subject),
                list.text
            )
        }
        TestKind::Matches {
            subject,
            negated,
            pattern,
        } => {
            let how = if *negated { "not matching" } else { "matching" };
            format!(
                "{} {how} the pattern /{}/{}",
                expr_text(subject),
                pattern.source,
                if pattern.ignore_case {
                    " (any case)"
                } else {
                    ""
                }
            )
        }
        TestKind::Compare { .. } | TestKind::Between { .. } => test_text(test),
    }
}

/// `, with a written allowance of 0.005 in (so at most 4.035 in)`; the sum is shown when both
/// are plain quantities, to the finer decimal place of the two.
fn allowance_words(limit: &Limit<Expr>, allowance: &Expr, op: CompareOp) -> String {
    let written = format!(", with a written allowance of {}", expr_text(allowance));
    let literal = |e: &Expr| match &e.kind {
        ExprKind::Quantity(q) => crate::check::quantity_si(q),
        _ => None,
    };
    let end = limit
        .evaluated(literal)
        .and_then(|l| l.interval())
        .and_then(|i| match (i.low, i.high) {
            (Some(end), None) | (None, Some(end)) => Some(end.value),
            _ => None,
        });
    let ExprKind::Quantity(l) = &limit.limits().0.kind else {
        return written;
    };
    let unit = l
        .unit
        .as_ref()
        .and_then(|u| crate::units::lookup(&u.symbol));
    // the sum to the finer decimal place of the two numbers written (`4.030 in` and
    // `0.0050 in` give `4.0350 in`); a fraction alone keeps six significant digits
    let digits = Digits::as_written(&expr_text(limit.limits().0))
        .finer(Digits::as_written(&expr_text(allowance)));
    match end {
        Some(effective) => format!(
            "{written} (so {} {})",
            op_words(op),
            digits.quantity(effective, unit)
        ),
        None => written,
    }
}

fn per_cylinder(rulebook: &CheckedRulebook, test: &crate::parse::ast::Test) -> bool {
    match &limit::subject(test).kind {
        ExprKind::Name(n) => rulebook
            .measurement(&n.text)
            .map(|m| m.per_cylinder)
            .or_else(|| rulebook.derived_value(&n.text).map(|d| d.ty.per_cylinder))
            .unwrap_or(false),
        _ => false,
    }
}

/// Each measurement the rule reads and each derived value between them, with its formula.
fn measured_lines(out: &mut String, rulebook: &CheckedRulebook, rule: &ClassRule) {
    let mut seen: Vec<&str> = Vec::new();
    for name in &rule.reads {
        name_lines(out, rulebook, name, &mut seen);
    }
    let optional: Vec<&str> = seen
        .iter()
        .copied()
        .filter(|n| rulebook.measurement(n).is_some_and(|m| !m.required))
        .collect();
    if !optional.is_empty() {
        let _ = writeln!(
            out,
            "  optional   not applicable to an engine whose declaration does not give {}; \
             a missing required measurement leaves it not checked",
            optional.join(" or ")
        );
    }
}

fn name_lines<'a>(
    out: &mut String,
    rulebook: &'a CheckedRulebook,
    name: &'a str,
    seen: &mut Vec<&'a str>,
) {
    if seen.contains(&name) || seen.len() > 64 {
        return;
    }
    seen.push(name);
    if let Some(m) = rulebook.measurement(name) {
        let kind = match m.kind {
            ValueKind::Text => "text".to_string(),
            ValueKind::Number(_) => m.dimension_word.clone(),
        };
        let shape = if m.per_cylinder {
            ", on every cylinder"
        } else {
            ""
        };
        let need = if m.required { "" } else { ", optional" };
        let how = m
            .procedure
            .as_ref()
            .map(|p| format!(": {p}"))
            .unwrap_or_default();
        let _ = writeln!(out, "  measured   {name} ({kind}{shape}{need}){how}");
    } else if let Some(d) = rulebook.derived_value(name) {
        let what = formula_summary(&d.expr)
            .map(|s| format!(" — {s}"))
            .unwrap_or_default();
        let _ = writeln!(out, "  computed   {name} = {}{what}", d.formula);
        for inner in &d.reads {
            name_lines(out, rulebook, inner, seen);
        }
    }
}

fn formula_summary(e: &crate::parse::ast::Expr) -> Option<&'static str> {
    match &e.kind {
        ExprKind::Call { function, .. } => match builtins::function(&function.text)? {
            Function::Formula(f) => Some(f.summary),
            Function::Generic(_) => None,
        },
        _ => None,
    }
}

/// The decision rule that judges the rule, whose it is, and what it means.
fn decision_words(rulebook: &CheckedRulebook, rule: &ClassRule) -> String {
    use crate::parse::ast::DecisionRule::*;
    let decision = rule.decision_in_force(None, rulebook.decision);
    let how = match decision {
        GuardedRejection => {
            "illegal only when the measurement proves the limit broken beyond its expanded uncertainty"
        }
        GuardedAcceptance => {
            "legal only when the measurement proves the limit kept beyond its expanded uncertainty"
        }
        SimpleAcceptance => "the measured value alone decides; its uncertainty is reported",
    };
    let whose = match &rule.rule.decision {
        Some(_) => format!(
            "this rule's own decision rule, in place of the rulebook's {}; `--as` on the \
             command line overrides it",
            rulebook.decision.words()
        ),
        None => "the rulebook's decision rule".to_string(),
    };
    format!("{} ({whose}): {how}", decision.words())
}
