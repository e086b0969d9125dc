//! Prints a syntax tree in canonical form: one item per paragraph, two-space indentation,
//! the fewest parentheses that keep the meaning. Parsing the printed text gives the same tree
//! (tested in `parse/tests.rs` and `tests/grammar_examples.rs`).
//!
//! Comments are not part of the tree: [`formatted`] takes them from the lexer's side table
//! (`parse::parse_with_comments`) and prints each where it stood relative to the printed
//! lines. Every printed line is anchored at the source line its construct starts on; a
//! comment on a line of its own is printed before the first printed line anchored after it,
//! at that line's indentation (inside a body before its `end`, at the body's), so it stays
//! with the item it precedes; a comment after code on its line stays at the end of the
//! printed line that code went to. One blank line is kept wherever the source had one or
//! more before a comment or an anchored line. Printing the printed text again gives it back
//! unchanged.

use std::fmt::Write;

use super::ast::{
    Arg, BinaryOp, ClassItem, Condition, Expr, ExprKind, Item, ListEntry, ListKind, Measure,
    Pattern, Quantity, Rule, Rulebook, Test, TestKind, Text,
};
use crate::source::Span;

/// The canonical text of a rulebook, without comments.
pub fn canonical(book: &Rulebook) -> String {
    print(book, Printer::new("", &[]))
}

/// The canonical text of a rulebook parsed from `source`, with the comments at `comments`
/// (spans into `source`, in order) and its blank lines kept.
pub fn formatted(book: &Rulebook, source: &str, comments: &[Span]) -> String {
    print(book, Printer::new(source, comments))
}

fn print(book: &Rulebook, mut out: Printer) -> String {
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
        out.trailing_before(item_start(item));
        if !continues_header_block {
            out.blank();
        }
        item_text(&mut out, item);
        previous_was_header = one_line;
    }
    out.finish()
}

/// Where an item starts in its file.
fn item_start(item: &Item) -> usize {
    match item {
        Item::Series(t) | Item::Include(t) => t.span.start,
        Item::Edition(e) => e.name.span.start,
        Item::Decision(d) => d.span.start,
        Item::Coverage(c) => c.span.start,
        Item::Measure(m) => m.span.start,
        Item::Define(d) => d.span.start,
        Item::List(l) => l.span.start,
        Item::Class(c) => c.span.start,
        Item::Bulletin(b) => b.span.start,
    }
}

/// Where the `end` that closes a construct spanning `span` starts.
fn end_of(span: Span) -> usize {
    span.end.saturating_sub("end".len())
}

/// The printed text being built, and the comments still to place in it.
struct Printer<'a> {
    out: String,
    source: &'a str,
    comments: &'a [Span],
    /// The start of the last source line a printed line was anchored at.
    line_done: Option<usize>,
    /// Whether the last printed line is code (a comment may be put at its end).
    last_is_code: bool,
}

impl<'a> Printer<'a> {
    fn new(source: &'a str, comments: &'a [Span]) -> Printer<'a> {
        Printer {
            out: String::new(),
            source,
            comments,
            line_done: None,
            last_is_code: false,
        }
    }

    /// One printed line at `depth`, for the construct that starts at `anchor` in the source.
    fn line(&mut self, depth: usize, anchor: usize, text: &str) {
        self.line_with(depth, depth, anchor, text);
    }

    /// The `end` line at `depth` of a body printed at `depth + 1`.
    fn end(&mut self, depth: usize, anchor: usize) {
        self.line_with(depth, depth + 1, anchor, "end");
    }

    fn line_with(&mut self, depth: usize, comment_depth: usize, anchor: usize, text: &str) {
        let start = self.line_start(anchor);
        if self.line_done.is_none_or(|done| start > done) {
            self.comments_before(start, comment_depth);
            if self.blank_line_before(start) {
                self.blank();
            }
            self.line_done = Some(start);
        }
        self.push(depth, text);
        self.last_is_code = true;
    }

    /// Places the comments that start before source offset `before`: at the end of the last
    /// printed line when code stood before them on their line, else on lines of their own.
    fn comments_before(&mut self, before: usize, depth: usize) {
        while let Some((comment, rest)) = self.comments.split_first() {
            if comment.start >= before {
                break;
            }
            self.comments = rest;
            let text = self.source.get(comment.start..comment.end).unwrap_or("#");
            let text = text.trim_end();
            if self.after_code(comment.start) && self.last_is_code {
                self.out.pop();
                self.out.push_str("  ");
                self.out.push_str(text);
                self.out.push('\n');
            } else {
                if self.blank_line_before(self.line_start(comment.start)) {
                    self.blank();
                }
                self.push(depth, text);
                self.last_is_code = false;
            }
        }
    }

    /// Places the comments that end the last printed line, before an item starting at
    /// `anchor` (so the blank line between items comes after them).
    fn trailing_before(&mut self, anchor: usize) {
        let start = self.line_start(anchor);
        while let Some(comment) = self.comments.first() {
            if comment.start >= start || !self.after_code(comment.start) {
                break;
            }
            self.comments_before(comment.start + 1, 0);
        }
    }

    /// The text with the comments left after the last item.
    fn finish(mut self) -> String {
        self.comments_before(usize::MAX, 0);
        self.out
    }

    /// One blank line, unless the text is empty or already ends with one.
    fn blank(&mut self) {
        if !self.out.is_empty() && !self.out.ends_with("\n\n") {
            self.out.push('\n');
        }
    }

    fn push(&mut self, depth: usize, text: &str) {
        for _ in 0..depth {
            self.out.push_str("  ");
        }
        self.out.push_str(text);
        self.out.push('\n');
    }

    /// The start of the source line that holds `offset`.
    fn line_start(&self, offset: usize) -> usize {
        let offset = offset.min(self.source.len());
        self.source
            .get(..offset)
            .and_then(|before| before.rfind('\n'))
            .map_or(0, |at| at + 1)
    }

    /// Whether code stands before `offset` on its source line.
    fn after_code(&self, offset: usize) -> bool {
        let start = self.line_start(offset);
        self.source
            .get(start..offset)
            .is_some_and(|before| !before.trim().is_empty())
    }

    /// Whether the source line before the one starting at `start` is blank.
    fn blank_line_before(&self, start: usize) -> bool {
        let Some(before) = start.checked_sub(1).and_then(|end| self.source.get(..end)) else {
            return false;
        };
        let previous = &before[before.rfind('\n').map_or(0, |at| at + 1)..];
        previous.trim().is_empty()
    }
}

/// `coverage k = 2` or `coverage 95 %`, the number as written.
fn coverage_text(c: &super::ast::Coverage) -> String {
    match c.spec {
        super::ast::CoverageSpec::Factor(_) => format!("coverage k = {}", c.written),
        super::ast::CoverageSpec::Percent(_) => format!("coverage {} %", c.written),
    }
}

fn item_text(out: &mut Printer, item: &Item) {
    let at = item_start(item);
    match item {
        Item::Series(name) => out.line(0, at, &format!("series {}", quoted(name))),
        Item::Edition(e) => out.line(
            0,
            at,
            &format!("edition {} effective {}", quoted(&e.name), e.effective.date),
        ),
        Item::Decision(d) => out.line(0, at, &format!("decision {}", d.rule.words())),
        Item::Coverage(c) => out.line(0, at, &coverage_text(c)),
        Item::Include(path) => out.line(0, at, &format!("include {}", quoted(path))),
        Item::Measure(m) => {
            let head = measure_text(m);
            match &m.procedure {
                Some(p) if head.len() + 1 + quoted(p).len() > MEASURE_WIDTH => {
                    out.line(0, at, &head);
                    out.line(1, p.span.start, &quoted(p));
                }
                Some(p) => out.line(0, at, &format!("{head} {}", quoted(p))),
                None => out.line(0, at, &head),
            }
        }
        Item::Define(d) => out.line(
            0,
            at,
            &format!("define {} = {}", d.name.text, expr_text(&d.expr)),
        ),
        Item::List(list) => {
            let kind = match list.kind {
                ListKind::Approved => "approved",
                ListKind::Banned => "banned",
            };
            out.line(
                0,
                at,
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
                let (text, span) = match entry {
                    ListEntry::Exact(t) => (quoted(t), t.span),
                    ListEntry::Pattern(p) => (pattern_text(p), p.span),
                };
                out.line(1, span.start, &text);
            }
            out.end(0, end_of(list.span));
        }
        Item::Class(c) => {
            let extends = c
                .extends
                .as_ref()
                .map(|e| format!(" extends {}", e.text))
                .unwrap_or_default();
            out.line(
                0,
                at,
                &format!("class {}{}{extends}", c.name.text, title_suffix(&c.title)),
            );
            body_text(out, 1, &c.body);
            out.end(0, end_of(c.span));
        }
        Item::Bulletin(b) => {
            out.line(
                0,
                at,
                &format!(
                    "bulletin {}{} effective {} amends {}",
                    quoted(&b.id),
                    title_suffix(&b.title),
                    b.effective.date,
                    b.amends.text
                ),
            );
            body_text(out, 1, &b.body);
            out.end(0, end_of(b.span));
        }
    }
}

/// Widest line a measurement is printed on with its procedure; past it the procedure goes on
/// a line of its own, indented.
const MEASURE_WIDTH: usize = 90;

/// A measurement's line without its procedure; `required`, the default, is left unsaid.
fn measure_text(m: &Measure) -> String {
    let mut text = format!("measure {}: {}", m.name.text, m.dimension.text);
    if m.per_cylinder {
        text.push_str(" per cylinder");
    }
    if !m.required {
        text.push_str(" optional");
    }
    if let Some((low, high)) = &m.range {
        let _ = write!(text, " range {} to {}", expr_text(low), expr_text(high));
    }
    text
}

fn body_text(out: &mut Printer, depth: usize, body: &[ClassItem]) {
    for item in body {
        match item {
            ClassItem::Rule(rule) => rule_text(out, depth, rule),
            ClassItem::When(group) => {
                out.line(
                    depth,
                    group.span.start,
                    &format!("when {}", condition_text(&group.condition)),
                );
                body_text(out, depth + 1, &group.body);
                out.end(depth, end_of(group.span));
            }
            ClassItem::Drop(section) => {
                out.line(depth, section.span.start, &format!("drop {}", section.text))
            }
        }
    }
}

fn rule_text(out: &mut Printer, depth: usize, rule: &Rule) {
    let keyword = if rule.overrides {
        "override rule"
    } else {
        "rule"
    };
    out.line(
        depth,
        rule.span.start,
        &format!("{keyword} {} {}", rule.section.text, quoted(&rule.title)),
    );
    let inner = depth + 1;
    if let Some(cond) = &rule.condition {
        let text = format!("when {}", condition_text(cond));
        out.line(inner, cond.span().start, &text);
    }
    let require = format!("require {}", test_text(&rule.require));
    out.line(inner, rule.require.span.start, &require);
    if let Some(d) = &rule.decision {
        out.line(inner, d.span.start, &format!("decision {}", d.rule.words()));
    }
    if let Some(p) = &rule.penalty {
        out.line(inner, p.span.start, &format!("penalty {}", quoted(p)));
    }
    if let Some(n) = &rule.note {
        out.line(inner, n.span.start, &format!("note {}", quoted(n)));
    }
    out.end(depth, end_of(rule.span));
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
    // room for a typical test, like `engine.displacement <= 362 ci`, without growing
    let mut out = String::with_capacity(64);
    write_test(&mut out, test);
    out
}

/// Writes the canonical text of a test to `out`.
fn write_test(out: &mut String, test: &Test) {
    match &test.kind {
        TestKind::Compare {
            left,
            op,
            right,
            allowance,
        } => {
            write_expr(out, left, 0);
            out.push(' ');
            out.push_str(op.symbol());
            out.push(' ');
            write_expr(out, right, 0);
            write_allowance(out, allowance);
        }
        TestKind::Between {
            subject,
            low,
            high,
            allowance,
        } => {
            write_expr(out, subject, 0);
            out.push_str(" between ");
            write_expr(out, low, 0);
            out.push_str(" and ");
            write_expr(out, high, 0);
            write_allowance(out, allowance);
        }
        TestKind::Member {
            subject,
            negated,
            list,
        } => {
            write_expr(out, subject, 0);
            out.push_str(if *negated { " not in " } else { " in " });
            out.push_str(&list.text);
        }
        TestKind::Matches {
            subject,
            negated,
            pattern,
        } => {
            write_expr(out, subject, 0);
            out.push_str(if *negated {
                " not matches "
            } else {
                " matches "
            });
            out.push_str(&pattern_text(pattern));
        }
    }
}

fn write_allowance(out: &mut String, allowance: &Option<Expr>) {
    if let Some(a) = allowance {
        out.push_str(" allowing ");
        write_expr(out, a, 0);
    }
}

/// The canonical text of a condition.
pub fn condition_text(cond: &Condition) -> String {
    let mut out = String::new();
    write_condition(&mut out, cond, 0);
    out
}

/// Writes a condition; `context` is the precedence around it: or 1, and 2, not and atoms 3.
fn write_condition(out: &mut String, cond: &Condition, context: u8) {
    let own = match cond {
        Condition::Test(_) | Condition::Not(..) => 3,
        Condition::Or(..) => 1,
        Condition::And(..) => 2,
    };
    let grouped = own < context;
    if grouped {
        out.push('(');
    }
    match cond {
        Condition::Test(t) => write_test(out, t),
        Condition::Or(a, b) => {
            write_condition(out, a, 1);
            out.push_str(" or ");
            write_condition(out, b, 2);
        }
        Condition::And(a, b) => {
            write_condition(out, a, 2);
            out.push_str(" and ");
            write_condition(out, b, 3);
        }
        Condition::Not(inner, _) => {
            out.push_str("not ");
            write_condition(out, inner, 3);
        }
    }
    if grouped {
        out.push(')');
    }
}

/// The canonical text of an expression.
pub fn expr_text(expr: &Expr) -> String {
    let mut out = String::new();
    write_expr(&mut out, expr, 0);
    out
}

fn precedence(op: BinaryOp) -> u8 {
    match op {
        BinaryOp::Add | BinaryOp::Subtract => 1,
        BinaryOp::Multiply | BinaryOp::Divide => 2,
        BinaryOp::Power => 4,
    }
}

/// Writes an expression; `context` is the precedence the surrounding operator demands (3 is
/// unary minus), and an expression that binds less tightly is put in parentheses.
fn write_expr(out: &mut String, expr: &Expr, context: u8) {
    let own = match &expr.kind {
        ExprKind::Negate(_) => 3,
        ExprKind::Binary { op, .. } => precedence(*op),
        _ => 5,
    };
    let grouped = own < context;
    if grouped {
        out.push('(');
    }
    match &expr.kind {
        ExprKind::Quantity(q) => write_quantity(out, q),
        ExprKind::Text(t) => out.push_str(&quoted(t)),
        ExprKind::Name(n) => out.push_str(&n.text),
        ExprKind::Call { function, args } => {
            out.push_str(&function.text);
            out.push('(');
            for (i, arg) in args.iter().enumerate() {
                if i > 0 {
                    out.push_str(", ");
                }
                write_arg(out, arg);
            }
            out.push(')');
        }
        ExprKind::Negate(inner) => {
            out.push('-');
            write_expr(out, inner, 3);
        }
        ExprKind::Binary { op, left, right } if *op == BinaryOp::Power => {
            write_expr(out, left, 5);
            out.push('^');
            write_expr(out, right, 3);
        }
        ExprKind::Binary { op, left, right } => {
            write_expr(out, left, own);
            out.push(' ');
            out.push(op.symbol());
            out.push(' ');
            write_expr(out, right, own + 1);
        }
    }
    if grouped {
        out.push(')');
    }
}

fn write_arg(out: &mut String, arg: &Arg) {
    if let Some(label) = &arg.label {
        out.push_str(&label.text);
        out.push_str(": ");
    }
    write_expr(out, &arg.value, 0);
}

fn write_quantity(out: &mut String, q: &Quantity) {
    out.push_str(&q.value.text);
    if let Some(unit) = &q.unit {
        out.push(' ');
        out.push_str(&unit.symbol);
    }
    if let Some(u) = &q.uncertainty {
        out.push_str(" ± ");
        out.push_str(&u.value.text);
        if let Some(unit) = &u.unit {
            out.push(' ');
            out.push_str(&unit.symbol);
        }
        if let Some(k) = &u.coverage {
            out.push_str(" (k = ");
            out.push_str(&k.text);
            out.push(')');
        }
    }
}
