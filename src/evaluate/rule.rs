//! One rule evaluated: its conditions in three-valued logic, its test as a finding with margin
//! and probability of conformance, the verdict under the decision rule, and the trace. Each
//! kind of test has its own function: [`Evaluator::compare`] for a limit on one side,
//! [`Evaluator::equality`] for `==` and `!=` of numbers, [`Evaluator::between`] for a range,
//! and membership, patterns and text equality as pass or fail.

use super::dual::Dual;
use super::exact::End;
use super::expr::Evaluator;
use super::finding::{Finding, Verdict, finding, probability, probability_between, verdict};
use super::gauge::{self, LimitSide};
use super::outcome::{Applies, Checked, GaugeCall, GaugeGap, GaugeWhy, Numeric, Outcome, Trace};
use super::value::{Evaluated, Unevaluated, Value, both};
use crate::check::limit::{Limit, Side};
use crate::check::model::{CheckedRulebook, ClassRule};
use crate::check::resolved::{Condition, Expr, ExprKind, Read, Term, Test, TestKind};
use crate::load::{Declaration, Supplied};
use crate::parse::ast::DecisionRule;
use crate::units::Unit;

/// A condition's truth, with doubt.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Truth {
    True,
    False,
    Uncertain,
}

impl<'a> Evaluator<'a> {
    /// Evaluates one rule of a class under its decision rule: `command_line` (`--as`) when
    /// given, else the rule's own, else the rulebook's.
    pub fn rule(&mut self, r: &'a ClassRule, command_line: Option<DecisionRule>) -> Outcome<'a> {
        let decision = r.decision_in_force(command_line, self.rulebook.decision);
        let mut outcome = Outcome {
            rule: r,
            decision,
            applies: Applies::Always,
            verdict: Verdict::NotChecked,
            checked: None,
            missing: Vec::new(),
            not_finite: false,
            outside_domain: Vec::new(),
            gauge_gaps: Vec::new(),
            error: None,
            trace: Vec::new(),
        };
        outcome.trace = self.trace(r);
        match self.conditions(&r.when, decision) {
            Err(why) => {
                outcome.applies = Applies::NotComputed;
                outcome.record(why, self.rulebook, self.declaration);
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
        // bad input must not turn into a verdict: a value that is not a number decides nothing
        match self.test(&r.test).and_then(Checked::finite) {
            Err(why) => outcome.record(why, self.rulebook, self.declaration),
            Ok(checked) => {
                if let Some(why) = open_under_simple_acceptance(&checked, decision) {
                    outcome.record(why, self.rulebook, self.declaration);
                    return outcome;
                }
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
        let mut missing: Option<Unevaluated> = None;
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
                // a condition that cannot be computed is unknown, as with a missing measurement
                let checked = self.test(t).and_then(Checked::finite)?;
                // nor can one on gauge results that leave it open, under simple acceptance:
                // there is no measured value to take as true
                if let Some(why) = open_under_simple_acceptance(&checked, decision) {
                    return Err(why);
                }
                Ok(truth_of(checked.finding, decision))
            }
            Condition::Not(inner) => Ok(match self.condition(inner, decision)? {
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
            TestKind::Limit { limit, unit } => match self.gauged_subject(&limit.subject) {
                Some(index) => self.gauged_limit(limit, index),
                None => self.limit(limit, *unit),
            },
            TestKind::TextEqual { left, equal, right } => {
                let (a, b) = both(self.text(left), self.text(right))?;
                Ok(binary_finding((a == b) == *equal, a))
            }
            TestKind::Member {
                subject,
                negated,
                list,
            } => {
                let text = self.text(subject)?;
                let list = self
                    .rulebook
                    .lists
                    .get(list.index())
                    .ok_or_else(|| Unevaluated::internal("a list id outside the rulebook"))?;
                let near_match = list.near_match(&text);
                Ok(Checked {
                    near_match,
                    ..binary_finding(list.contains(&text) != *negated, text)
                })
            }
            TestKind::Matches {
                subject,
                negated,
                pattern,
            } => {
                let text = self.text(subject)?;
                Ok(binary_finding(pattern.is_match(&text) != *negated, text))
            }
        }
    }

    /// A limit in normal form, on every cylinder: each side has its own way of deciding.
    fn limit(&mut self, limit: &Limit<Expr>, unit: Option<&'static Unit>) -> Evaluated<Checked> {
        let subject = self.number(&limit.subject);
        let (first, second) = limit.limits();
        let first = self.number(first);
        let second = second.map(|e| self.number(e)).transpose();
        let (subject, (first, second)) = both(subject, both(first, second))?;
        let slack = self.allowance(limit.allowance.as_ref())?;
        match (&limit.side, second) {
            (Side::Upper { strict, .. }, _) => {
                self.one_sided(limit, &subject, &first, true, *strict, slack, unit)
            }
            (Side::Lower { strict, .. }, _) => {
                self.one_sided(limit, &subject, &first, false, *strict, slack, unit)
            }
            (Side::Equal { .. }, _) => self.equality(limit, &subject, true, &first, unit),
            (Side::NotEqual { .. }, _) => self.equality(limit, &subject, false, &first, unit),
            (Side::Between { .. }, Some(high)) => {
                self.between(limit, &subject, &first, &high, slack, unit)
            }
            (Side::Between { .. }, None) => {
                Err(Unevaluated::internal("a range without its upper limit"))
            }
        }
    }

    /// The position of the measurement a limit tests, when it is one measurement recorded as
    /// gauge results.
    fn gauged_subject(&self, subject: &Expr) -> Option<usize> {
        let ExprKind::Measurement(m) = &subject.kind else {
            return None;
        };
        self.declaration.gauged(m.index()).map(|_| m.index())
    }

    /// A limit on a gauged measurement, decided from what its results prove
    /// ([`super::gauge`]): each side of the limit on its own, the worse side deciding a range.
    /// A limit with an uncertainty of its own or one per cylinder, and `==` or `!=`, cannot
    /// be decided from bounds.
    fn gauged_limit(&mut self, limit: &Limit<Expr>, index: usize) -> Evaluated<Checked> {
        let gap = |why| {
            Unevaluated::Gauged(vec![GaugeGap {
                measurement: index,
                why,
            }])
        };
        let (first, second) = limit.limits();
        let first = self.number(first);
        let second = second.map(|e| self.number(e)).transpose();
        let (first, second) = both(first, second)?;
        let slack = self.allowance(limit.allowance.as_ref())?;
        let exact = |v: &Value| match v {
            Value::Single(d) if self.combined(d) == 0.0 => Some(d.value),
            _ => None,
        };
        let a = exact(&first).ok_or_else(|| gap(GaugeWhy::UnsureLimit))?;
        let results = self
            .declaration
            .gauged(index)
            .map(|g| g.results.as_slice())
            .unwrap_or_default();
        let side = |upper, strict, at| LimitSide { upper, strict, at };
        let sides = match &limit.side {
            Side::Upper { strict, .. } => {
                vec![gauge::decide(results, side(true, *strict, a + slack))]
            }
            Side::Lower { strict, .. } => {
                vec![gauge::decide(results, side(false, *strict, a - slack))]
            }
            Side::Equal { .. } | Side::NotEqual { .. } => return Err(gap(GaugeWhy::Equality)),
            Side::Between { .. } => {
                let b = second
                    .as_ref()
                    .and_then(exact)
                    .ok_or_else(|| gap(GaugeWhy::UnsureLimit))?;
                gauge::decide_between(results, a - slack, b + slack).to_vec()
            }
        };
        let finding = sides
            .iter()
            .map(|s| s.finding)
            .min()
            .unwrap_or(Finding::Open);
        let unit = results
            .first()
            .and_then(|r| r.unit)
            .and_then(crate::units::lookup);
        Ok(Checked {
            finding,
            numeric: None,
            observed: None,
            near_match: None,
            gauge: Some(GaugeCall {
                measurement: index,
                sides,
                unit,
            }),
        })
    }

    /// A written allowance in SI units (0 without one); the checker made it a constant.
    fn allowance(&mut self, e: Option<&Expr>) -> Evaluated<f64> {
        let Some(e) = e else { return Ok(0.0) };
        match self.number(e)? {
            Value::Single(d) => Ok(d.value),
            Value::PerCylinder(_) => Err(Unevaluated::internal("an allowance per cylinder")),
        }
    }

    /// `==` or `!=` of numbers, on every cylinder: any cylinder that breaks it fails the rule.
    /// Equality is exact where both sides are ([`Evaluator::equal`]). The value shown is the
    /// first such cylinder's ([`Evaluator::equality_shown`]), with every cylinder that breaks
    /// it named; on a pass, the value of cylinder 1 "on every cylinder".
    fn equality(
        &self,
        written: &Limit<Expr>,
        l: &Value,
        equal: bool,
        r: &Value,
        unit: Option<&'static Unit>,
    ) -> Evaluated<Checked> {
        let same = self.equal(written, l, r);
        if same.is_empty() {
            return Err(no_value());
        }
        let breaking: Vec<usize> = (same.iter().enumerate())
            .filter_map(|(i, s)| (*s != equal).then_some(i))
            .collect();
        let shown_at = breaking.first().copied().unwrap_or(0);
        let at = l.at(shown_at)?;
        let mut shown = self.equality_shown(&written.subject, at, shown_at, unit);
        if l.is_per_cylinder() || r.is_per_cylinder() {
            shown = match breaking.as_slice() {
                [] => format!("{shown} on every cylinder"),
                [one] => format!("{shown} on cylinder {}", one + 1),
                many => {
                    let list: Vec<String> = many.iter().map(|i| (i + 1).to_string()).collect();
                    format!(
                        "{shown} on cylinder {}; cylinders {} break the rule",
                        shown_at + 1,
                        list.join(", ")
                    )
                }
            };
        }
        Ok(binary_finding(breaking.is_empty(), shown))
    }

    /// A limit on one side (`<=`, `<` when `upper`; `>=`, `>` otherwise), on every
    /// cylinder: the worst decides.
    #[allow(
        clippy::too_many_arguments,
        reason = "the limit as written and its evaluated parts, read together"
    )]
    fn one_sided(
        &self,
        written: &Limit<Expr>,
        subject: &Value,
        limit: &Value,
        upper: bool,
        strict: bool,
        slack: f64,
        unit: Option<&'static Unit>,
    ) -> Evaluated<Checked> {
        // margin, positive inside: (limit + allowance) − value, or value − (limit − allowance),
        // exact at the limit
        let end = if upper { End::Upper } else { End::Lower };
        let margins = self.margins(written, end, subject, limit, slack);
        let (i, m) = self.worst(margins.numbers(), strict)?;
        let lim = limit.at(i)?.value + if upper { slack } else { -slack };
        let mut numeric = self.numeric(
            subject.at(i)?.value,
            lim,
            &m,
            strict,
            unit,
            cylinder(&margins, i),
            None,
        );
        numeric.0.all_cylinders =
            super::joint::one_sided(margins.numbers(), strict, |id| self.uncertainty(id));
        Ok(Checked {
            finding: numeric.1,
            numeric: Some(numeric.0),
            observed: None,
            near_match: None,
            gauge: None,
        })
    }

    /// A range (`between`), on every cylinder: the worst decides.
    fn between(
        &self,
        written: &Limit<Expr>,
        s: &Value,
        lo: &Value,
        hi: &Value,
        slack: f64,
        unit: Option<&'static Unit>,
    ) -> Evaluated<Checked> {
        // each margin with the allowance, exact at the limit
        let low_margins = self.margins(written, End::Low, s, lo, slack);
        let high_margins = self.margins(written, End::High, s, hi, slack);
        let mut worst: Option<Checked> = None;
        for (i, (ml, mh)) in low_margins
            .numbers()
            .iter()
            .zip(high_margins.numbers())
            .enumerate()
        {
            let (ul, uh) = (self.combined(ml), self.combined(mh));
            let (low_value, high_value) = (ml.value, mh.value);
            let ((kl, nl), (kh, nh)) = (self.coverage(ml), self.coverage(mh));
            let f = finding(low_value, kl * ul, false).min(finding(high_value, kh * uh, false));
            let p = probability_between((low_value, ul, nl), (high_value, uh, nh));
            let value = s.at(i)?.value;
            let (limit, margin, u, near) = if low_value < high_value {
                (value - low_value, low_value, ul, ml)
            } else {
                (value + high_value, high_value, uh, mh)
            };
            let (k, degrees_of_freedom) = self.coverage(near);
            let numeric = Numeric {
                value,
                sensitivities: near.partials.clone(),
                limit,
                margin,
                expanded: k * u,
                k,
                degrees_of_freedom,
                probability: p,
                unit,
                cylinder: cylinder(&low_margins, i),
                range: Some((value - low_value, value + high_value)),
                all_cylinders: None,
                monte_carlo: None,
            };
            let candidate = Checked {
                finding: f,
                numeric: Some(numeric),
                observed: None,
                near_match: None,
                gauge: None,
            };
            if worst.as_ref().is_none_or(|w| rank(&candidate) < rank(w)) {
                worst = Some(candidate);
            }
        }
        if let Some(n) = worst.as_mut().and_then(|w| w.numeric.as_mut()) {
            n.all_cylinders =
                super::joint::between(low_margins.numbers(), high_margins.numbers(), |id| {
                    self.uncertainty(id)
                });
        }
        worst.ok_or_else(no_value)
    }

    /// The cylinder whose margin (allowance included) is worst: lowest probability of
    /// conformance, then least margin.
    fn worst(&self, margins: &[Dual], strict: bool) -> Evaluated<(usize, Dual)> {
        let mut best = (0, f64::INFINITY, f64::INFINITY);
        for (i, m) in margins.iter().enumerate() {
            let p = probability(m.value, self.combined(m), self.coverage(m).1, strict);
            if (p, m.value) < (best.1, best.2) {
                best = (i, p, m.value);
            }
        }
        let m = margins.get(best.0).ok_or_else(no_value)?;
        Ok((best.0, m.clone()))
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
        strict: bool,
        unit: Option<&'static Unit>,
        cylinder: Option<usize>,
        range: Option<(f64, f64)>,
    ) -> (Numeric, Finding) {
        let u = self.combined(m);
        let (k, degrees_of_freedom) = self.coverage(m);
        let margin = m.value;
        let f = finding(margin, k * u, strict);
        let n = Numeric {
            value,
            sensitivities: m.partials.clone(),
            limit,
            margin,
            expanded: k * u,
            k,
            degrees_of_freedom,
            probability: probability(margin, u, degrees_of_freedom, strict),
            unit,
            cylinder,
            range,
            all_cylinders: None,
            monte_carlo: None,
        };
        (n, f)
    }

    /// Every input and derived value a rule reads, in the order first read.
    fn trace(&mut self, r: &'a ClassRule) -> Vec<Trace<'a>> {
        let mut lines = Vec::new();
        let mut seen: Vec<Read> = Vec::new();
        for read in &r.read_ids {
            self.trace_read(*read, &mut lines, &mut seen);
        }
        lines
    }

    fn trace_read(&mut self, read: Read, lines: &mut Vec<Trace<'a>>, seen: &mut Vec<Read>) {
        if seen.contains(&read) {
            return;
        }
        seen.push(read);
        let rulebook = self.rulebook;
        let declaration = self.declaration;
        match read {
            Read::Derived(id) => {
                let Some(d) = rulebook.derived.get(id.index()) else {
                    return;
                };
                for inner in &d.read_ids {
                    self.trace_read(*inner, lines, seen);
                }
                let (values, uncertainties) = match self.computed(id) {
                    Some(Ok(v)) => {
                        let numbers = v.numbers().to_vec();
                        let values = numbers.iter().map(|n| n.value).collect();
                        (values, numbers.iter().map(|n| self.combined(n)).collect())
                    }
                    _ => (Vec::new(), Vec::new()),
                };
                self.trace_literals(&d.body, lines);
                lines.push(Trace::Derived {
                    derived: d,
                    values,
                    uncertainties,
                });
            }
            Read::Measurement(id) => {
                let Some(m) = rulebook.measurements.get(id.index()) else {
                    return;
                };
                let name = m.name.as_str();
                match declaration.supplied(id.index()) {
                    None => match declaration.gauged(id.index()) {
                        Some(g) => lines
                            .extend(g.results.iter().map(|result| Trace::Gauge { name, result })),
                        None => lines.push(Trace::Missing { name }),
                    },
                    Some(Supplied::Text(value, place, written)) => lines.push(Trace::Text {
                        name,
                        value,
                        written: written.as_deref(),
                        place: *place,
                    }),
                    Some(Supplied::Single(id)) => lines.push(Trace::Input(*id)),
                    Some(Supplied::PerCylinder(ids)) => {
                        lines.extend(ids.iter().map(|id| Trace::Input(*id)))
                    }
                }
                if let Some(supplied) = declaration.supplied(id.index()) {
                    for shared in declaration.calibrations_of(supplied) {
                        if !lines
                            .iter()
                            .any(|l| matches!(l, Trace::Input(i) if *i == shared))
                        {
                            lines.push(Trace::Input(shared));
                        }
                    }
                }
            }
        }
    }

    /// Rulebook literals with a stated uncertainty that an expression reads.
    fn trace_literals(&self, e: &Term, lines: &mut Vec<Trace<'a>>) {
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

impl Outcome<'_> {
    /// Records why the rule could not be evaluated. A rule that misses only optional
    /// measurements does not apply to the engine ("not applicable, optional, not measured");
    /// one that misses a required measurement, alone or beside optional ones, stays not
    /// checked.
    /// A gauged measurement an expression needed is not missing: it has bounds and no value,
    /// and the rule is not checked for that reason ([`GaugeWhy::NeedsAValue`]).
    fn record(&mut self, why: Unevaluated, rulebook: &CheckedRulebook, declaration: &Declaration) {
        match why {
            Unevaluated::Missing(missing) => {
                for name in missing.0 {
                    let gauged = rulebook
                        .measurement_index(&name)
                        .filter(|i| declaration.gauged(*i).is_some());
                    match gauged {
                        Some(measurement) => self.gauge_gaps.push(GaugeGap {
                            measurement,
                            why: GaugeWhy::NeedsAValue,
                        }),
                        None => self.missing.push(name),
                    }
                }
            }
            Unevaluated::Gauged(gaps) => self.gauge_gaps = gaps,
            Unevaluated::Domain(breaches) => {
                self.not_finite = true;
                self.outside_domain = breaches;
            }
            Unevaluated::Internal(error) => self.error = Some(error),
        }
        if rulebook.all_optional(&self.missing) {
            self.applies = Applies::NotMeasured;
            self.verdict = Verdict::NotApplicable;
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

/// The error for a test whose value has no number (a per-cylinder value of no cylinders,
/// which the loader refuses): such a test decides nothing.
fn no_value() -> Unevaluated {
    Unevaluated::internal("the value tested has no number to compare")
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
        near_match: None,
        gauge: None,
    }
}
/// Why a test on gauge results that leave it open decides nothing under simple acceptance,
/// which decides on a measured value and gauges give none: the gap to report; `None` for any
/// other test or decision rule.
fn open_under_simple_acceptance(checked: &Checked, decision: DecisionRule) -> Option<Unevaluated> {
    match checked {
        Checked {
            finding: Finding::Open,
            gauge: Some(call),
            ..
        } if decision == DecisionRule::SimpleAcceptance => {
            Some(Unevaluated::Gauged(vec![GaugeGap {
                measurement: call.measurement,
                why: GaugeWhy::OpenUnderSimpleAcceptance,
            }]))
        }
        _ => None,
    }
}
