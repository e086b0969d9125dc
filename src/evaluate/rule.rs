//! One rule evaluated: its conditions in three-valued logic, its test as a finding with margin
//! and probability of conformance, the verdict under the decision rule, and the trace.

use super::dual::Dual;
use super::expr::Evaluator;
use super::finding::{Finding, Verdict, finding, probability, probability_between, verdict};
use super::outcome::{Applies, Checked, Numeric, Outcome, Trace};
use super::value::{Evaluated, Missing, Value};
use crate::check::model::{ClassRule, ValueKind};
use crate::load::Supplied;
use crate::parse::ast::{CompareOp, Condition, DecisionRule, Expr, ExprKind, Test, TestKind};
use crate::units::{self, Unit};

/// Coverage factor for the expanded uncertainty a finding is judged against (about 95 %).
pub const COVERAGE: f64 = 2.0;

/// A condition's truth, with doubt.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Truth {
    True,
    False,
    Uncertain,
}

impl<'a> Evaluator<'a> {
    /// Evaluates one rule of a class under a decision rule.
    pub fn rule(&mut self, r: &'a ClassRule, decision: DecisionRule) -> Outcome<'a> {
        let mut outcome = Outcome {
            rule: r,
            applies: Applies::Always,
            verdict: Verdict::NotChecked,
            checked: None,
            missing: Vec::new(),
            not_finite: false,
            trace: Vec::new(),
        };
        outcome.trace = self.trace(r);
        match self.conditions(&r.conditions, decision) {
            Err(missing) => {
                outcome.missing = missing.0.into_iter().collect();
                return outcome;
            }
            Ok(Truth::False) => {
                outcome.applies = Applies::DoesNotHold;
                outcome.verdict = Verdict::NotApplicable;
                return outcome;
            }
            Ok(Truth::Uncertain) => outcome.applies = Applies::Uncertain,
            Ok(Truth::True) if !r.conditions.is_empty() => outcome.applies = Applies::Holds,
            Ok(Truth::True) => {}
        }
        match self.test(&r.rule.require) {
            Err(missing) => outcome.missing = missing.0.into_iter().collect(),
            Ok(checked) if !checked.is_finite() => {
                // bad input must not turn into a verdict: a value that is not a number decides nothing
                outcome.not_finite = true;
                outcome.checked = Some(checked);
            }
            Ok(checked) => {
                let mut v = verdict(checked.finding, decision);
                // The inspector's rule gives the doubt to the competitor: a rule that may not
                // apply cannot prove a violation.
                if outcome.applies == Applies::Uncertain
                    && decision == DecisionRule::GuardedRejection
                {
                    v = Verdict::Legal;
                }
                outcome.verdict = v;
                outcome.checked = Some(checked);
            }
        }
        outcome
    }

    fn conditions(&mut self, conditions: &[Condition], decision: DecisionRule) -> Evaluated<Truth> {
        let mut truth = Truth::True;
        let mut missing: Option<Missing> = None;
        for c in conditions {
            match self.condition(c, decision) {
                Ok(Truth::False) => return Ok(Truth::False),
                Ok(Truth::Uncertain) => truth = Truth::Uncertain,
                Ok(Truth::True) => {}
                Err(m) => missing = Some(missing.map_or(m.clone(), |acc| acc.join(m))),
            }
        }
        match missing {
            Some(m) => Err(m),
            None => Ok(truth),
        }
    }

    /// Kleene logic: a false side settles `and`, a true side settles `or`, even when the
    /// other side is missing or uncertain.
    fn condition(&mut self, c: &Condition, decision: DecisionRule) -> Evaluated<Truth> {
        match c {
            Condition::Test(t) => {
                let checked = self.test(t)?;
                // a condition that cannot be computed may or may not hold
                if !checked.is_finite() {
                    return Ok(Truth::Uncertain);
                }
                Ok(truth_of(checked.finding, decision))
            }
            Condition::Not(inner, _) => Ok(match self.condition(inner, decision)? {
                Truth::True => Truth::False,
                Truth::False => Truth::True,
                Truth::Uncertain => Truth::Uncertain,
            }),
            Condition::And(a, b) => {
                match (self.condition(a, decision), self.condition(b, decision)) {
                    (Ok(Truth::False), _) | (_, Ok(Truth::False)) => Ok(Truth::False),
                    (Err(x), Err(y)) => Err(x.join(y)),
                    (Err(x), _) | (_, Err(x)) => Err(x),
                    (Ok(Truth::Uncertain), _) | (_, Ok(Truth::Uncertain)) => Ok(Truth::Uncertain),
                    _ => Ok(Truth::True),
                }
            }
            Condition::Or(a, b) => match (self.condition(a, decision), self.condition(b, decision))
            {
                (Ok(Truth::True), _) | (_, Ok(Truth::True)) => Ok(Truth::True),
                (Err(x), Err(y)) => Err(x.join(y)),
                (Err(x), _) | (_, Err(x)) => Err(x),
                (Ok(Truth::Uncertain), _) | (_, Ok(Truth::Uncertain)) => Ok(Truth::Uncertain),
                _ => Ok(Truth::False),
            },
        }
    }

    /// The finding of one test.
    pub fn test(&mut self, t: &Test) -> Evaluated<Checked> {
        match &t.kind {
            TestKind::Compare {
                left,
                op,
                right,
                allowance,
            } => {
                let (l, r) = super::value::both(self.eval(left), self.eval(right))?;
                let slack = self.allowance(allowance.as_ref());
                Ok(self.compare(&l, *op, &r, slack, limit_unit(left, right, self)))
            }
            TestKind::Between {
                subject,
                low,
                high,
                allowance,
            } => {
                let s = self.eval(subject);
                let (lo, hi) = super::value::both(self.eval(low), self.eval(high))?;
                let s = s?;
                let slack = self.allowance(allowance.as_ref());
                Ok(self.between(&s, &lo, &hi, slack, limit_unit(low, high, self)))
            }
            TestKind::Member {
                subject,
                negated,
                list,
            } => {
                let text = self.text(subject)?;
                let on_list = self
                    .rulebook
                    .lists
                    .iter()
                    .find(|l| l.name == list.text)
                    .is_some_and(|l| l.contains(&text));
                Ok(binary_finding(on_list != *negated, text))
            }
            TestKind::Matches {
                subject,
                negated,
                pattern,
            } => {
                let text = self.text(subject)?;
                let compiled = self
                    .rulebook
                    .patterns
                    .get(&(pattern.span.file, pattern.span.start));
                let matched = compiled.is_some_and(|re| re.is_match(&text));
                Ok(binary_finding(matched != *negated, text))
            }
        }
    }

    fn text(&mut self, e: &Expr) -> Evaluated<String> {
        Ok(match self.eval(e)? {
            Value::Text(t) => t,
            other => other
                .numbers()
                .first()
                .map(|d| d.value.to_string())
                .unwrap_or_default(),
        })
    }

    fn allowance(&mut self, e: Option<&Expr>) -> f64 {
        e.and_then(|e| self.eval(e).ok())
            .and_then(|v| v.numbers().first().map(|d| d.value))
            .unwrap_or(0.0)
    }

    fn compare(
        &self,
        l: &Value,
        op: CompareOp,
        r: &Value,
        slack: f64,
        unit: Option<&'static Unit>,
    ) -> Checked {
        if let (Value::Text(a), Value::Text(b)) = (l, r) {
            let equal = a == b;
            return binary_finding(equal == (op == CompareOp::Equal), a.clone());
        }
        if matches!(op, CompareOp::Equal | CompareOp::NotEqual) {
            let (a, b) = (first(l), first(r));
            let equal = (a - b).abs() <= 1e-9 * a.abs().max(b.abs()).max(1e-300);
            let shown = crate::report::format::number(a / unit.map_or(1.0, |u| u.to_si));
            return binary_finding(equal == (op == CompareOp::Equal), shown);
        }
        let (subject, limit, op) = if is_constant(r) || !is_constant(l) {
            (l, r, op)
        } else {
            (r, l, op.flipped())
        };
        let strict = matches!(op, CompareOp::Below | CompareOp::Above);
        let upper = matches!(op, CompareOp::AtMost | CompareOp::Below);
        // margin, positive inside: (limit + allowance) − value, or value − (limit − allowance)
        let margins = subject.zip(limit, |s, t| if upper { t.sub(s) } else { s.sub(t) });
        let (i, m) = self.worst(margins.numbers(), slack, strict);
        // a single value stands for every cylinder
        let at = |v: &Value| {
            v.numbers()
                .get(i)
                .or(v.numbers().first())
                .map_or(f64::NAN, |d| d.value)
        };
        let lim = at(limit) + if upper { slack } else { -slack };
        let numeric = self.numeric(
            at(subject),
            lim,
            &m,
            slack,
            strict,
            unit,
            cylinder(&margins, i),
            None,
        );
        Checked {
            finding: numeric.1,
            numeric: Some(numeric.0),
            observed: None,
        }
    }

    fn between(
        &self,
        s: &Value,
        lo: &Value,
        hi: &Value,
        slack: f64,
        unit: Option<&'static Unit>,
    ) -> Checked {
        let low_margins = s.zip(lo, |s, l| s.sub(l));
        let high_margins = s.zip(hi, |s, h| h.sub(s));
        let mut worst: Option<(usize, Checked, (f64, f64))> = None;
        for i in 0..low_margins.numbers().len() {
            let (ml, mh) = (&low_margins.numbers()[i], &high_margins.numbers()[i]);
            let (ul, uh) = (self.combined(ml), self.combined(mh));
            let (low_value, high_value) = (ml.value + slack, mh.value + slack);
            let f = finding(low_value, COVERAGE * ul, false).min(finding(
                high_value,
                COVERAGE * uh,
                false,
            ));
            let p = probability_between((low_value, ul), (high_value, uh));
            let value = s
                .numbers()
                .get(i)
                .or(s.numbers().first())
                .map_or(f64::NAN, |d| d.value);
            let (limit, margin, u, near) = if low_value < high_value {
                (value - low_value, low_value, ul, ml)
            } else {
                (value + high_value, high_value, uh, mh)
            };
            let range = (value - low_value, value + high_value);
            let numeric = Numeric {
                value,
                sensitivities: near.partials.clone(),
                limit,
                margin,
                expanded: COVERAGE * u,
                k: COVERAGE,
                probability: p,
                unit,
                cylinder: cylinder(&low_margins, i),
                range: Some(range),
            };
            let candidate = Checked {
                finding: f,
                numeric: Some(numeric),
                observed: None,
            };
            let better = worst
                .as_ref()
                .is_none_or(|(_, w, _)| rank(&candidate) < rank(w));
            if better {
                worst = Some((i, candidate, range));
            }
        }
        worst.map(|(_, c, _)| c).unwrap_or(Checked {
            finding: Finding::Fail,
            numeric: None,
            observed: None,
        })
    }

    /// The cylinder whose margin is worst: lowest probability of conformance, then least margin.
    fn worst(&self, margins: &[Dual], slack: f64, strict: bool) -> (usize, Dual) {
        let mut best = (0, f64::INFINITY, f64::INFINITY);
        for (i, m) in margins.iter().enumerate() {
            let p = probability(m.value + slack, self.combined(m), strict);
            if (p, m.value) < (best.1, best.2) {
                best = (i, p, m.value);
            }
        }
        (
            best.0,
            margins
                .get(best.0)
                .cloned()
                .unwrap_or_else(|| Dual::constant(f64::NAN)),
        )
    }

    #[allow(
        clippy::too_many_arguments,
        reason = "the parts of one numeric finding, computed together"
    )]
    fn numeric(
        &self,
        value: f64,
        limit: f64,
        m: &Dual,
        slack: f64,
        strict: bool,
        unit: Option<&'static Unit>,
        cylinder: Option<usize>,
        range: Option<(f64, f64)>,
    ) -> (Numeric, Finding) {
        let u = self.combined(m);
        let margin = m.value + slack;
        let f = finding(margin, COVERAGE * u, strict);
        let n = Numeric {
            value,
            sensitivities: m.partials.clone(),
            limit,
            margin,
            expanded: COVERAGE * u,
            k: COVERAGE,
            probability: probability(margin, u, strict),
            unit,
            cylinder,
            range,
        };
        (n, f)
    }

    /// Every input and derived value a rule reads, in the order first read.
    fn trace(&mut self, r: &'a ClassRule) -> Vec<Trace<'a>> {
        let mut lines = Vec::new();
        let mut seen: Vec<&'a str> = Vec::new();
        for name in &r.reads {
            self.trace_name(name, &mut lines, &mut seen);
        }
        lines
    }

    fn trace_name(&mut self, name: &'a str, lines: &mut Vec<Trace<'a>>, seen: &mut Vec<&'a str>) {
        if seen.contains(&name) || name == "pi" {
            return;
        }
        seen.push(name);
        let rulebook = self.rulebook;
        let declaration = self.declaration;
        if let Some(d) = rulebook.derived_value(name) {
            for inner in &d.reads {
                self.trace_name(inner, lines, seen);
            }
            self.computed(name);
            let numbers = match self.derived_cache(name) {
                Some(Ok(v)) => v.numbers(),
                _ => &[],
            };
            let values = numbers.iter().map(|n| n.value).collect();
            let uncertainties = numbers.iter().map(|n| self.combined(n)).collect();
            self.trace_literals(&d.expr, lines);
            lines.push(Trace::Derived {
                derived: d,
                values,
                uncertainties,
            });
            return;
        }
        match rulebook
            .measurement_index(name)
            .and_then(|i| declaration.supplied(i))
        {
            None => lines.push(Trace::Missing { name }),
            Some(Supplied::Text(value, place)) => lines.push(Trace::Text {
                name,
                value,
                place: *place,
            }),
            Some(Supplied::Single(id)) => lines.push(Trace::Input(*id)),
            Some(Supplied::PerCylinder(ids)) => {
                lines.extend(ids.iter().map(|id| Trace::Input(*id)))
            }
        }
    }

    /// Rulebook literals with a stated uncertainty that an expression reads.
    fn trace_literals(&self, e: &Expr, lines: &mut Vec<Trace<'a>>) {
        let mut ids = Vec::new();
        self.literal_ids(e, &mut ids);
        for id in ids {
            if !lines
                .iter()
                .any(|l| matches!(l, Trace::Input(i) if *i == id))
            {
                lines.push(Trace::Input(id));
            }
        }
    }
}

fn rank(c: &Checked) -> (Finding, f64, f64) {
    let n = c.numeric.as_ref();
    (
        c.finding,
        n.map_or(1.0, |n| n.probability),
        n.map_or(0.0, |n| n.margin),
    )
}

fn cylinder(v: &Value, i: usize) -> Option<usize> {
    matches!(v, Value::PerCylinder(_)).then_some(i + 1)
}

fn first(v: &Value) -> f64 {
    v.numbers().first().map_or(f64::NAN, |d| d.value)
}

fn is_constant(v: &Value) -> bool {
    matches!(v, Value::Single(d) if d.partials.is_empty())
}

fn truth_of(f: Finding, decision: DecisionRule) -> Truth {
    match (f, decision) {
        (Finding::Pass, _) => Truth::True,
        (Finding::Fail, _) => Truth::False,
        (Finding::ConditionalPass, DecisionRule::SimpleAcceptance) => Truth::True,
        (Finding::ConditionalFail, DecisionRule::SimpleAcceptance) => Truth::False,
        _ => Truth::Uncertain,
    }
}

fn binary_finding(holds: bool, observed: String) -> Checked {
    Checked {
        finding: if holds { Finding::Pass } else { Finding::Fail },
        numeric: None,
        observed: Some(observed),
    }
}

/// The unit to show a limit in: the first unit written on the limit side, else the unit
/// gonogo shows that dimension in.
fn limit_unit(a: &Expr, b: &Expr, ev: &Evaluator) -> Option<&'static Unit> {
    let written = first_unit(b).or_else(|| first_unit(a));
    written.or_else(|| {
        let mut names = Vec::new();
        a.names(&mut names);
        b.names(&mut names);
        names
            .into_iter()
            .filter_map(|n| dimension_of(n, ev))
            .find_map(units::display_unit)
    })
}

fn dimension_of(name: &str, ev: &Evaluator) -> Option<crate::units::Dimension> {
    let kind = ev
        .rulebook
        .measurement(name)
        .map(|m| m.kind)
        .or_else(|| ev.rulebook.derived_value(name).map(|d| d.ty.kind))?;
    match kind {
        ValueKind::Number(d) => Some(d),
        ValueKind::Text => None,
    }
}

fn first_unit(e: &Expr) -> Option<&'static Unit> {
    match &e.kind {
        ExprKind::Quantity(q) => q
            .unit
            .as_ref()
            .or(q.uncertainty.as_ref().and_then(|u| u.unit.as_ref()))
            .and_then(|u| units::lookup(&u.symbol)),
        ExprKind::Negate(inner) => first_unit(inner),
        ExprKind::Binary { left, right, .. } => first_unit(left).or_else(|| first_unit(right)),
        ExprKind::Call { args, .. } => args.iter().find_map(|a| first_unit(&a.value)),
        ExprKind::Text(_) | ExprKind::Name(_) => None,
    }
}
