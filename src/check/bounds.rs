//! Reasoning about limits: contradictory limits on one quantity in a class, and conditions
//! that can never hold. Both use intervals of constant bounds in SI units; anything that is
//! not a comparison of a quantity with a constant is left alone, so no false alarm is raised.

use std::collections::BTreeMap;

use super::Checker;
use super::classes::ClassState;
use super::error::CheckError;
use super::interval::Interval;
use super::limit::{self, Limit, Operand, Side};
use crate::parse::ast::{ClassItem, Condition, Expr, ExprKind};
use crate::parse::print::expr_text;
use crate::source::Span;

/// What one test says about one quantity.
struct Bound {
    /// The quantity, in canonical text.
    subject: String,
    /// The values it allows (numeric tests).
    interval: Option<Interval>,
    /// The text it must equal (`== "..."` tests).
    text: Option<String>,
    /// The test.
    span: Span,
    /// What the span shows, when it is not a test.
    label: Option<&'static str>,
}

impl<'a> Checker<'a> {
    /// Runs both reasonings.
    pub(super) fn check_bounds(&mut self, states: &[ClassState]) {
        for state in states {
            self.check_contradictions(state);
        }
        for body in self.bodies() {
            self.check_conditions_in(body, &mut Vec::new());
        }
    }

    fn check_contradictions(&mut self, state: &ClassState) {
        let mut by_subject: BTreeMap<String, Vec<Bound>> = BTreeMap::new();
        for r in state.rules.iter().filter(|r| r.conditions.is_empty()) {
            let limit = r.limit.as_ref().map(Limit::as_ref);
            if let Some(b) = limit.and_then(|l| self.bound_of(l, r.rule.require.span)) {
                by_subject.entry(b.subject.clone()).or_default().push(b);
            }
        }
        for (subject, bounds) in by_subject {
            if let Some((a, b)) = first_conflict(&bounds) {
                let ((a, _), (b, _)) = (a, b);
                self.error(
                    CheckError::ContradictoryLimits {
                        subject,
                        class: state.class.to_string(),
                        at: b,
                        other: (a.start != b.start).then_some(a),
                    }
                    .into(),
                );
            }
        }
    }

    fn check_conditions_in(&mut self, body: &'a [ClassItem], outer: &mut Vec<&'a Condition>) {
        for item in body {
            match item {
                ClassItem::Rule(rule) => {
                    if let Some(c) = &rule.condition {
                        self.check_condition_holds(c, outer);
                    }
                }
                ClassItem::When(group) => {
                    let ok = self.check_condition_holds(&group.condition, outer);
                    if ok {
                        outer.push(&group.condition);
                        self.check_conditions_in(&group.body, outer);
                        outer.pop();
                    }
                }
                ClassItem::Drop(_) => {}
            }
        }
    }

    /// Reports `cond` if, together with the enclosing conditions, it can never hold.
    /// A condition with an error already reported is left alone, and so is what it encloses:
    /// whatever its bounds say would only follow from that error.
    fn check_condition_holds(&mut self, cond: &Condition, outer: &[&Condition]) -> bool {
        if self.error_within(cond.span()) {
            return false;
        }
        let mut bounds = Vec::new();
        for c in outer.iter().copied().chain([cond]) {
            self.conjuncts(c, &mut bounds);
        }
        for name in bounds.iter().map(|b| b.subject.clone()).collect::<Vec<_>>() {
            if let Some(m) = self.measurements.get(name.as_str())
                && let Some((lo, hi)) = m.range
            {
                bounds.push(Bound {
                    subject: name,
                    interval: Some(Interval::closed(lo, hi)),
                    text: None,
                    span: m.span,
                    label: Some("declared range"),
                });
            }
        }
        let mut by_subject: BTreeMap<&str, Vec<&Bound>> = BTreeMap::new();
        for b in &bounds {
            by_subject.entry(&b.subject).or_default().push(b);
        }
        let conflict = by_subject.values().find_map(|group| {
            let owned: Vec<Bound> = group
                .iter()
                .map(|b| Bound {
                    subject: b.subject.clone(),
                    interval: b.interval,
                    text: b.text.clone(),
                    span: b.span,
                    label: b.label,
                })
                .collect();
            first_conflict(&owned)
        });
        let Some((a, b)) = conflict else { return true };
        let ((first, first_label), (second, second_label)) = (a, b);
        let inside = |s: Span| {
            s.file == cond.span().file && s.start >= cond.span().start && s.end <= cond.span().end
        };
        // Label the clashing parts, not the whole condition, so the labels do not overlap.
        let (primary, label) = if inside(second) && second.start != first.start {
            (
                second,
                second_label.unwrap_or("cannot hold together with the other part"),
            )
        } else {
            (cond.span(), "never true")
        };
        let parts = [
            (first, first_label.unwrap_or("this part")),
            (second, second_label.unwrap_or("this part")),
        ]
        .into_iter()
        .filter(|(span, _)| span.start != primary.start || span.file != primary.file)
        .collect();
        self.error(
            CheckError::NeverHolds {
                at: (primary, label),
                parts,
            }
            .into(),
        );
        false
    }

    /// The bounds of the tests joined by `and` at the top of `cond`.
    fn conjuncts(&self, cond: &Condition, out: &mut Vec<Bound>) {
        match cond {
            Condition::And(a, b) => {
                self.conjuncts(a, out);
                self.conjuncts(b, out);
            }
            Condition::Test(t) => out.extend(limit::of(t).and_then(|l| self.bound_of(l, t.span))),
            Condition::Or(..) | Condition::Not(..) => {}
        }
    }

    /// What a test says about one quantity compared with a constant, whichever side the
    /// constant is written on, if it says anything.
    fn bound_of(&self, limit: Limit<&Expr>, span: Span) -> Option<Bound> {
        if limit.subject.is_fixed() {
            return None;
        }
        let (interval, text) = match &limit.side {
            Side::Equal { value } if text_literal(value).is_some() => (None, text_literal(value)),
            _ => (
                Some(limit.evaluated(|e| self.constant(e))?.interval()?),
                None,
            ),
        };
        Some(Bound {
            subject: expr_text(limit.subject),
            interval,
            text,
            span,
            label: None,
        })
    }
}

fn text_literal(e: &Expr) -> Option<String> {
    match &e.kind {
        ExprKind::Text(t) => Some(t.value.clone()),
        _ => None,
    }
}

/// A span with the label to show it under, if not the default.
type Labelled = (Span, Option<&'static str>);

/// The first two bounds on one subject that cannot hold together (the same span twice when a
/// single test is empty by itself).
fn first_conflict(bounds: &[Bound]) -> Option<(Labelled, Labelled)> {
    let mut allowed = Interval::default();
    let mut text: Option<(&str, Labelled)> = None;
    let mut seen: Vec<Labelled> = Vec::new();
    for b in bounds {
        if let Some(i) = b.interval {
            let narrowed = allowed.intersect(i);
            if narrowed.is_empty() {
                let other = seen.iter().rev().copied().find(|(s, _)| {
                    bounds.iter().any(|o| {
                        o.span.start == s.start
                            && o.interval.is_some_and(|oi| oi.intersect(i).is_empty())
                    })
                });
                return Some((other.unwrap_or((b.span, b.label)), (b.span, b.label)));
            }
            allowed = narrowed;
        }
        if let Some(t) = &b.text {
            match text {
                Some((first, at)) if first != t => return Some((at, (b.span, b.label))),
                _ => text = Some((t, (b.span, b.label))),
            }
        }
        seen.push((b.span, b.label));
    }
    None
}
