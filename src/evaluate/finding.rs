//! Findings and verdicts: ISO 14253-1 / ILAC-G8 non-binary outcomes from a margin and its
//! expanded uncertainty, the JCGM 106 probability of conformance (normal, or Student's t with
//! finite effective degrees of freedom), and the decision rules that
//! turn a finding into legal or illegal; and the value an `==` or `!=` finding shows.

use super::dual::Dual;
use super::expr::Evaluator;
use crate::check::resolved::{Expr, ExprKind};
use crate::load::{Input, Supplied};
use crate::parse::ast::DecisionRule;
use crate::report::format::Digits;
use crate::units::Unit;
use statrs::distribution::{ContinuousCDF, StudentsT};

/// What the measurement shows about one limit, independent of who is asking.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Finding {
    /// Outside the limit by more than the expanded uncertainty: nonconformity proven.
    Fail,
    /// Outside the limit, by less than the expanded uncertainty.
    ConditionalFail,
    /// Neither side shown: go/no-go gauge results that bound the measurand only on the side
    /// the limit does not need (a plug that entered, against an upper limit above its size).
    /// No value is known, so neither conformity nor nonconformity is proven
    /// ([`super::gauge`]).
    Open,
    /// Inside the limit, by less than the expanded uncertainty.
    ConditionalPass,
    /// Inside the limit by at least the expanded uncertainty: conformity proven.
    Pass,
}

impl Finding {
    /// The words a report uses.
    pub fn words(self) -> &'static str {
        match self {
            Finding::Pass => "pass",
            Finding::ConditionalPass => "conditional pass",
            Finding::ConditionalFail => "conditional fail",
            Finding::Open => "open",
            Finding::Fail => "fail",
        }
    }

    /// True for the findings that prove neither conformity nor nonconformity: the two inside
    /// the uncertainty band, and an open gauge result.
    pub fn is_conditional(self) -> bool {
        matches!(
            self,
            Finding::ConditionalPass | Finding::ConditionalFail | Finding::Open
        )
    }
}

/// The finding for a margin `m` (positive inside the limit) with expanded uncertainty `big_u`.
/// `strict` limits (`<`, `>`) do not include the limit value itself.
/// ILAC-G8:09/2019 §4.2; ISO 14253-1: conformity proven when the margin is at least U.
pub fn finding(margin: f64, big_u: f64, strict: bool) -> Finding {
    let inside = if strict { margin > 0.0 } else { margin >= 0.0 };
    match (inside, big_u > 0.0) {
        (true, false) => Finding::Pass,
        (false, false) => Finding::Fail,
        (true, true) if margin >= big_u => Finding::Pass,
        (true, true) => Finding::ConditionalPass,
        (false, true) if -margin > big_u => Finding::Fail,
        (false, true) => Finding::ConditionalFail,
    }
}

/// Standard normal distribution function Φ.
fn phi(z: f64) -> f64 {
    0.5 * libm::erfc(-z / std::f64::consts::SQRT_2)
}

/// The distribution function of Student's t with `nu` degrees of freedom; Φ when `nu` is
/// infinite (or not a number of degrees of freedom).
fn student(z: f64, nu: f64) -> f64 {
    if nu.is_finite()
        && let Ok(t) = StudentsT::new(0.0, 1.0, nu)
    {
        return t.cdf(z);
    }
    phi(z)
}

/// Probability of conformance for a one-sided limit (JCGM 106:2012): the probability that the
/// measurand lies inside the limit, `margin` away with standard uncertainty `u`. With infinite
/// effective degrees of freedom `nu` (every component of Type B) the measurand is normal and
/// p = Φ(margin / u); with finite ones (repeated readings) it is the scaled and shifted
/// t-distribution with ν_eff degrees of freedom (JCGM 101 6.4.9; JCGM 106 7.5, from memory),
/// p = F_ν(margin / u), so three re-cc'd readings 3.9 u inside give 97 %, not 99.99 %. With no
/// uncertainty it is 1 inside and 0 outside.
pub fn probability(margin: f64, u: f64, nu: f64, strict: bool) -> f64 {
    if u > 0.0 {
        student(margin / u, nu)
    } else if margin > 0.0 || (margin == 0.0 && !strict) {
        1.0
    } else {
        0.0
    }
}

/// Probability of conformance for a two-sided limit (JCGM 106:2012):
/// F((T_U − y)/u) − F((T_L − y)/u), written with the margin, standard uncertainty and effective
/// degrees of freedom at each limit (they differ only when a limit itself carries an
/// uncertainty).
pub fn probability_between(low: (f64, f64, f64), high: (f64, f64, f64)) -> f64 {
    let ((margin_low, u_low, nu_low), (margin_high, u_high, nu_high)) = (low, high);
    let upper = probability(margin_high, u_high, nu_high, false);
    let below_lower = 1.0 - probability(margin_low, u_low, nu_low, false);
    (upper - below_lower).max(0.0)
}

/// The call on one rule.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// Legal under the decision rule in force.
    Legal,
    /// Illegal under the decision rule in force.
    Illegal,
    /// A measurement it needs is missing.
    NotChecked,
    /// Its condition does not hold.
    NotApplicable,
    /// Its section lies outside the inspection's scope: it was not evaluated at all.
    NotInScope,
}

impl Verdict {
    /// The word a report uses.
    pub fn words(self) -> &'static str {
        match self {
            Verdict::Legal => "LEGAL",
            Verdict::Illegal => "ILLEGAL",
            Verdict::NotChecked => "NOT CHECKED",
            Verdict::NotApplicable => "NOT APPLICABLE",
            Verdict::NotInScope => "NOT IN SCOPE",
        }
    }
}

/// The verdict a decision rule gives a finding (DESIGN.md section 5). An open finding is
/// legal under guarded rejection (no violation proven) and illegal under guarded acceptance
/// (conformity not proven); simple acceptance has no measured value to accept, and the rule
/// evaluation calls such a rule not checked before asking here (where it would be illegal).
pub fn verdict(finding: Finding, rule: DecisionRule) -> Verdict {
    let legal = match rule {
        // the inspector's rule: illegal only on a proven fail
        DecisionRule::GuardedRejection => finding != Finding::Fail,
        // the builder's rule: legal only on a proven pass
        DecisionRule::GuardedAcceptance => finding == Finding::Pass,
        // shared risk: the measured value alone decides
        DecisionRule::SimpleAcceptance => {
            matches!(finding, Finding::Pass | Finding::ConditionalPass)
        }
    };
    if legal {
        Verdict::Legal
    } else {
        Verdict::Illegal
    }
}

/// How far inside the limit a value must lie for `rule` to prove it passes, in multiples of
/// the expanded uncertainty U: the proven-pass line is the limit less this many U. Under
/// simple acceptance the measured value alone decides, so the line is the limit (0 U); under
/// guarded acceptance and guarded rejection a pass is proven at U inside (ISO 14253-1), the
/// line where [`finding`] gives [`Finding::Pass`] and guarded acceptance calls it legal.
pub fn proven_pass_guard(rule: DecisionRule) -> f64 {
    match rule {
        DecisionRule::SimpleAcceptance => 0.0,
        DecisionRule::GuardedAcceptance | DecisionRule::GuardedRejection => 1.0,
    }
}

impl Evaluator<'_> {
    /// The value an `==` or `!=` finding shows for `d`, the subject at `cylinder` (0-based): a
    /// reading tested as it is, as written (with its value in the limit's unit beside it when
    /// it was written in another), so `44.4501 mm` is not shown as the `1.75 in` it is not;
    /// a computed value with the digits its expanded uncertainty supports (GUM 7.2.6).
    pub fn equality_shown(
        &self,
        subject: &Expr,
        d: &Dual,
        cylinder: usize,
        unit: Option<&'static Unit>,
    ) -> String {
        let (k, _) = self.coverage(d);
        let digits = Digits::supported_in(k * self.combined(d), unit);
        let reading = self
            .subject_input(subject, cylinder)
            .filter(|i| i.value.to_bits() == d.value.to_bits());
        match reading.and_then(|i| Some((i, before_uncertainty(i.written.as_deref()?)?))) {
            Some((i, text)) if i.unit == unit.map(|u| u.symbol) => text.to_string(),
            Some((i, text)) => {
                let from = i.unit.and_then(crate::units::lookup);
                let digits = match digits {
                    Digits::Significant => converted_place(text, from, unit),
                    place => place,
                };
                format!("{text} ({})", digits.quantity(d.value, unit))
            }
            None => digits.quantity(d.value, unit),
        }
    }

    /// The reading a subject is when it is one measurement, at `cylinder` (0-based).
    fn subject_input(&self, subject: &Expr, cylinder: usize) -> Option<&Input> {
        let ExprKind::Measurement(m) = &subject.kind else {
            return None;
        };
        let id = match self.declaration.supplied(m.index())? {
            Supplied::Single(id) => *id,
            Supplied::PerCylinder(ids) => *ids.get(cylinder)?,
            Supplied::Text(..) => return None,
        };
        self.declaration.inputs.get(id as usize)
    }
}

/// The decimal place of a reading written as `text` in `from`, carried to `to` so that the
/// converted value keeps at least the written resolution (`44.45 mm` has 2 places, 1.7500 in
/// has 4); six significant digits where the text has no place (a fraction).
fn converted_place(text: &str, from: Option<&Unit>, to: Option<&Unit>) -> Digits {
    match (Digits::as_written(text), from, to) {
        (Digits::Place(p), Some(f), Some(t)) if f.to_si > 0.0 && t.to_si > 0.0 => {
            let shift = (t.to_si / f.to_si).log10().ceil();
            if shift.is_finite() {
                Digits::Place(p + shift as i32)
            } else {
                Digits::Significant
            }
        }
        _ => Digits::Significant,
    }
}

/// A reading's text without its stated `± U`, or `None` when nothing is left.
fn before_uncertainty(text: &str) -> Option<&str> {
    let end = text
        .find('±')
        .or_else(|| text.find("+/-"))
        .unwrap_or(text.len());
    Some(text[..end].trim()).filter(|t| !t.is_empty())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_proven_pass_line_is_where_guarded_acceptance_turns_legal() {
        // ISO 14253-1: conformity proven at a margin of U (REFERENCES.md vectors, U = 0.020);
        // simple acceptance decides on the measured value alone
        let big_u = 0.020;
        for rule in [
            DecisionRule::GuardedAcceptance,
            DecisionRule::SimpleAcceptance,
        ] {
            let line = proven_pass_guard(rule) * big_u;
            assert_eq!(verdict(finding(line, big_u, false), rule), Verdict::Legal);
            assert_eq!(
                verdict(finding(line - 1e-9, big_u, false), rule),
                Verdict::Illegal
            );
        }
        assert_eq!(proven_pass_guard(DecisionRule::GuardedRejection), 1.0);
    }

    /// REFERENCES.md check vectors: T_U = 10.000, u = 0.010, U = 0.020 (k = 2). Findings per
    /// ISO 14253-1 / ILAC-G8:09/2019 §4.2; probabilities per JCGM 106:2012, Φ((T_U − y)/u).
    const VECTORS: &[(f64, Finding, f64)] = &[
        (9.970, Finding::Pass, 0.99865),
        (9.990, Finding::ConditionalPass, 0.8413),
        (10.010, Finding::ConditionalFail, 0.1587),
        (10.030, Finding::Fail, 0.00135),
    ];

    #[test]
    fn findings_and_probabilities_match_the_reference_vectors() {
        for &(y, expected, p) in VECTORS {
            let margin = 10.000 - y;
            assert_eq!(finding(margin, 0.020, false), expected, "y = {y}");
            let got = probability(margin, 0.010, f64::INFINITY, false);
            assert!((got - p).abs() < 5e-5, "y = {y}: p = {got}, expected {p}");
        }
    }

    #[test]
    fn on_the_limit_the_probability_is_one_half() {
        // JCGM 106:2012: at y = T_U, p_c = 50 %
        assert!((probability(0.0, 0.01, f64::INFINITY, false) - 0.5).abs() < 1e-15);
        assert!((probability(0.0, 0.01, 2.0, false) - 0.5).abs() < 1e-15);
    }

    #[test]
    fn two_sided_probability_subtracts_both_tails() {
        // ±1 u from each limit: Φ(1) − Φ(−1) = 0.6827 (the normal distribution's 1σ mass)
        let inf = f64::INFINITY;
        let p = probability_between((0.01, 0.01, inf), (0.01, 0.01, inf));
        assert!((p - 0.682_689).abs() < 1e-6);
    }

    #[test]
    fn with_few_degrees_of_freedom_the_probability_follows_the_t_table() {
        // Student's t table, one-sided 95 %: t = 2.920 for ν = 2, 2.353 for ν = 3, 1.833 for
        // ν = 9 (GUM Table G.2's two-sided 90 % column, from memory); two-sided 95 % for ν = 9
        // is 2.262 (GUM Table G.2)
        assert!((probability(2.920, 1.0, 2.0, false) - 0.95).abs() < 1e-4);
        assert!((probability(2.353, 1.0, 3.0, false) - 0.95).abs() < 1e-4);
        assert!((probability(1.833, 1.0, 9.0, false) - 0.95).abs() < 1e-4);
        let p = probability_between((2.262, 1.0, 9.0), (2.262, 1.0, 9.0));
        assert!((p - 0.95).abs() < 1e-4, "{p}");
        // ν = 2 has the closed form F(t) = 1/2 + t / (2√(2 + t²)): 3.9 u inside is 97.0 %,
        // where the normal distribution says 99.995 %
        let closed = 0.5 + 3.9 / (2.0 * (2.0 + 3.9f64 * 3.9).sqrt());
        assert!((probability(3.9, 1.0, 2.0, false) - closed).abs() < 1e-9);
        assert!((closed - 0.970).abs() < 5e-4);
        assert!(probability(3.9, 1.0, f64::INFINITY, false) > 0.9999);
    }

    #[test]
    fn without_uncertainty_the_finding_is_binary() {
        assert_eq!(finding(0.0, 0.0, false), Finding::Pass);
        assert_eq!(finding(0.0, 0.0, true), Finding::Fail);
        assert_eq!(finding(-1e-9, 0.0, false), Finding::Fail);
    }

    #[test]
    fn decision_rules_split_the_conditional_findings() {
        use DecisionRule::*;
        let cases = [
            (Finding::ConditionalPass, GuardedRejection, Verdict::Legal),
            (Finding::ConditionalFail, GuardedRejection, Verdict::Legal),
            (Finding::Fail, GuardedRejection, Verdict::Illegal),
            (
                Finding::ConditionalPass,
                GuardedAcceptance,
                Verdict::Illegal,
            ),
            (Finding::Pass, GuardedAcceptance, Verdict::Legal),
            (Finding::ConditionalPass, SimpleAcceptance, Verdict::Legal),
            (Finding::ConditionalFail, SimpleAcceptance, Verdict::Illegal),
        ];
        for (f, rule, v) in cases {
            assert_eq!(verdict(f, rule), v, "{f:?} under {rule:?}");
        }
    }
}
