//! Prints a syntax tree in canonical form: one item per paragraph, two-space indentation,
//! the fewest parentheses that keep the meaning. Parsing the printed text gives the same tree
//! (tested in `parse/tests.rs`). Comments are not part of the tree and are not printed.

use std::fmt::Write;

use super::ast::{
    Arg, BinaryOp, ClassItem, Condition, Expr, ExprKind, Item, ListEntry, ListKind, Measure,
    Pattern, Quantity, Rule, Rulebook, Test, TestKind, Text,
};

/// The canonical text of a rulebook.
pub fn canonical(book: &Rulebook) -> String {
    let mut out = String::new();
    let mut previous_was_header = false;
    for item in &book.items {
        let header = matches!(
            item,
            Item::Series(_)
                | Item::Edition(_)
                | Item::Decision(_)
                | Item::Coverage(_)
                | Item::Include(_)
        );
        let one_line = header || matches!(item, Item::Measure(_) | Item::Define(_));
        let continues_header_block = one_line && previous_was_header;
        if !out.is_empty() && !continues_header_block {
            out.push('\n');
        }
        item_text(&mut out, item);
        previous_was_header = one_line;
    }
    out
}

/// `coverage k = 2` or `coverage 95 %`, the number as written.
fn coverage_text(c: &super::ast::Coverage) -> String {
    match c.spec {
        super::ast::CoverageSpec::Factor(_) => format!("coverage k = {}", c.written),
        super::ast::CoverageSpec::Percent(_) => format!("coverage {} %", c.written),
    }
}

fn item_text(out: &mut String, item: &Item) {
    match item {
        Item::Series(name) => line(out, 0, &format!("series {}", quoted(name))),
        Item::Edition(e) => line(
            out,
            0,
            &format!("edition {} effective {}", quoted(&e.name), e.effective.date),
        ),
        Item::Decision(d) => line(out, 0, &format!("decision {}", d.rule.words())),
        Item::Coverage(c) => line(out, 0, &coverage_text(c)),
        Item::Include(path) => line(out, 0, &format!("include {}", quoted(path))),
        Item::Measure(m) => line(out, 0, &measure_text(m)),
        Item::Define(d) => line(
            out,
            0,
            &format!("define {} = {}", d.name.text, expr_text(&d.expr)),
        ),
        Item::List(list) => {
            let kind = match list.kind {
                ListKind::Approved => "approved",
                ListKind::Banned => "banned",
            };
            line(
                out,
                0,
                &format!(
                    "{kind} list {}{}{}",
                    list.name.text,
                    title_suffix(&list.title),
                    if list.ignore_case {
                        " ignoring case"
                    } else {
                        ""
                    }
                ),
            );
            for entry in &list.entries {
                let text = match entry {
                    ListEntry::Exact(t) => quoted(t),
                    ListEntry::Pattern(p) => pattern_text(p),
                };
                line(out, 1, &text);
            }
            line(out, 0, "end");
        }
        Item::Class(c) => {
            let extends = c
                .extends
                .as_ref()
                .map(|e| format!(" extends {}", e.text))
                .unwrap_or_default();
            line(
                out,
                0,
                &format!("class {}{}{extends}", c.name.text, title_suffix(&c.title)),
            );
            body_text(out, 1, &c.body);
            line(out, 0, "end");
        }
        Item::Bulletin(b) => {
            line(
                out,
                0,
                &format!(
                    "bulletin {}{} effective {} amends {}",
                    quoted(&b.id),
                    title_suffix(&b.title),
                    b.effective.date,
                    b.amends.text
                ),
            );
            body_text(out, 1, &b.body);
            line(out, 0, "end");
        }
    }
}

fn measure_text(m: &Measure) -> String {
    let mut text = format!("measure {}: {}", m.name.text, m.dimension.text);
    if m.per_cylinder {
        text.push_str(" per cylinder");
    }
    text.push_str(if m.required { " required" } else { " optional" });
    if let Some((low, high)) = &m.range {
        let _ = write!(text, " range {} to {}", expr_text(low), expr_text(high));
    }
    if let Some(p) = &m.procedure {
        let _ = write!(text, " {}", quoted(p));
    }
    text
}

fn body_text(out: &mut String, depth: usize, body: &[ClassItem]) {
    for item in body {
        match item {
            ClassItem::Rule(rule) => rule_text(out, depth, rule),
            ClassItem::When(group) => {
                line(
                    out,
                    depth,
                    &format!("when {}", condition_text(&group.condition)),
                );
                body_text(out, depth + 1, &group.body);
                line(out, depth, "end");
            }
            ClassItem::Drop(section) => line(out, depth, &format!("drop {}", section.text)),
        }
    }
}

fn rule_text(out: &mut String, depth: usize, rule: &Rule) {
    let keyword = if rule.overrides {
        "override rule"
    } else {
        "rule"
    };
    line(
        out,
        depth,
        &format!("{keyword} {} {}", rule.section.text, quoted(&rule.title)),
    );
    if let Some(cond) = &rule.condition {
        line(out, depth + 1, &format!("when {}", condition_text(cond)));
    }
    line(
        out,
        depth + 1,
        &format!("require {}", test_text(&rule.require)),
    );
    if let Some(d) = &rule.decision {
        line(out, depth + 1, &format!("decision {}", d.rule.words()));
    }
    if let Some(p) = &rule.penalty {
        line(out, depth + 1, &format!("penalty {}", quoted(p)));
    }
    if let Some(n) = &rule.note {
        line(out, depth + 1, &format!("note {}", quoted(n)));
    }
    line(out, depth, "end");
}

fn line(out: &mut String, depth: usize, text: &str) {
    for _ in 0..depth {
        out.push_str("  ");
    }
    out.push_str(text);
    out.push('\n');
}

fn title_suffix(title: &Option<Text>) -> String {
    title
        .as_ref()
        .map(|t| format!(" {}", quoted(t)))
        .unwrap_or_default()
}

/// A string literal with the escapes the parser reads.
pub fn quoted(text: &Text) -> String {
    let mut out = String::from("\"");
    for c in text.value.chars() {
        match c {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\t' => out.push_str("\\t"),
            c if c.is_control() => {
                let _ = write!(out, "\\u{{{:x}}}", c as u32);
            }
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

fn pattern_text(p: &Pattern) -> String {
    let flag = if p.ignore_case { "i" } else { "" };
    format!("/{}/{flag}", p.source.replace('/', "\\/"))
}

/// The canonical text of a test.
pub fn test_text(test: &Test) -> String {
    match &test.kind {
        TestKind::Compare {
            left,
            op,
            right,
            allowance,
        } => {
            format!(
                "{} {} {}{}",
                expr_text(left),
                op.symbol(),
                expr_text(right),
                allowance_text(allowance)
            )
        }
        TestKind::Between {
            subject,
            low,
            high,
            allowance,
        } => format!(
            "{} between {} and {}{}",
            expr_text(subject),
            expr_text(low),
            expr_text(high),
            allowance_text(allowance)
        ),
        TestKind::Member {
            subject,
            negated,
            list,
        } => {
            format!(
                "{} {}in {}",
                expr_text(subject),
                if *negated { "not " } else { "" },
                list.text
            )
        }
        TestKind::Matches {
            subject,
            negated,
            pattern,
        } => format!(
            "{} {}matches {}",
            expr_text(subject),
            if *negated { "not " } else { "" },
            pattern_text(pattern)
        ),
    }
}

fn allowance_text(allowance: &Option<Expr>) -> String {
    allowance
        .as_ref()
        .map(|a| format!(" allowing {}", expr_text(a)))
        .unwrap_or_default()
}

/// The canonical text of a condition.
pub fn condition_text(cond: &Condition) -> String {
    condition_at(cond, 0)
}

/// Precedence: or 1, and 2, not and atoms 3.
fn condition_at(cond: &Condition, context: u8) -> String {
    let (text, own) = match cond {
        Condition::Test(t) => (test_text(t), 3),
        Condition::Or(a, b) => (
            format!("{} or {}", condition_at(a, 1), condition_at(b, 2)),
            1,
        ),
        Condition::And(a, b) => (
            format!("{} and {}", condition_at(a, 2), condition_at(b, 3)),
            2,
        ),
        Condition::Not(inner, _) => (format!("not {}", condition_at(inner, 3)), 3),
    };
    if own < context {
        format!("({text})")
    } else {
        text
    }
}

/// The canonical text of an expression.
pub fn expr_text(expr: &Expr) -> String {
    expr_at(expr, 0)
}

fn precedence(op: BinaryOp) -> u8 {
    match op {
        BinaryOp::Add | BinaryOp::Subtract => 1,
        BinaryOp::Multiply | BinaryOp::Divide => 2,
        BinaryOp::Power => 4,
    }
}

/// `context` is the precedence the surrounding operator demands; 3 is unary minus.
fn expr_at(expr: &Expr, context: u8) -> String {
    let (text, own) = match &expr.kind {
        ExprKind::Quantity(q) => (quantity_text(q), 5),
        ExprKind::Text(t) => (quoted(t), 5),
        ExprKind::Name(n) => (n.text.clone(), 5),
        ExprKind::Call { function, args } => {
            let args: Vec<String> = args.iter().map(arg_text).collect();
            (format!("{}({})", function.text, args.join(", ")), 5)
        }
        ExprKind::Negate(inner) => (format!("-{}", expr_at(inner, 3)), 3),
        ExprKind::Binary { op, left, right } => {
            let p = precedence(*op);
            let (left_ctx, right_ctx) = if *op == BinaryOp::Power {
                (5, 3)
            } else {
                (p, p + 1)
            };
            let text = if *op == BinaryOp::Power {
                format!("{}^{}", expr_at(left, left_ctx), expr_at(right, right_ctx))
            } else {
                format!(
                    "{} {} {}",
                    expr_at(left, left_ctx),
                    op.symbol(),
                    expr_at(right, right_ctx)
                )
            };
            (text, p)
        }
    };
    if own < context {
        format!("({text})")
    } else {
        text
    }
}

fn arg_text(arg: &Arg) -> String {
    match &arg.label {
        Some(label) => format!("{}: {}", label.text, expr_text(&arg.value)),
        None => expr_text(&arg.value),
    }
}

fn quantity_text(q: &Quantity) -> String {
    let mut text = q.value.text.clone();
    if let Some(unit) = &q.unit {
        let _ = write!(text, " {}", unit.symbol);
    }
    if let Some(u) = &q.uncertainty {
        let _ = write!(text, " ± {}", u.value.text);
        if let Some(unit) = &u.unit {
            let _ = write!(text, " {}", unit.symbol);
        }
        if let Some(k) = &u.coverage {
            let _ = write!(text, " (k = {})", k.text);
        }
    }
    text
}
