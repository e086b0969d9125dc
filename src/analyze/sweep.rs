//! A limit sweep: each engine's value of one numeric rule, with its expanded uncertainty U, set
//! against a range of candidate limits; for each candidate, how many engines would be legal,
//! conditional (inside the band of ±U) and illegal under the decision rule in force. The
//! finding and the verdict of each candidate are those `check` gives
//! ([`finding`](crate::evaluate::finding::finding), [`verdict`]), with the margin moved by the
//! candidate's distance from today's limit.

use crate::evaluate::finding::{Verdict, finding, verdict};
use crate::parse::ast::DecisionRule;

/// One engine's value of the rule, SI units.
#[derive(Clone, Debug, serde::Serialize)]
pub struct Point {
    /// The engine (or its file).
    pub engine: String,
    /// The value on the cylinder closest to the limit.
    pub value: f64,
    /// Its expanded uncertainty U.
    pub expanded: f64,
}

/// The counts under one candidate limit.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Tally {
    /// The candidate limit, SI units.
    pub limit: f64,
    /// Engines legal under the decision rule.
    pub legal: usize,
    /// Engines whose finding is conditional (pass or fail by less than U).
    pub conditional: usize,
    /// Engines illegal under the decision rule.
    pub illegal: usize,
}

/// `<=` (an upper limit) or `>=` (a lower one).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    /// The value must not exceed the limit.
    Upper,
    /// The value must not fall below it.
    Lower,
}

/// The counts of `field` under the candidate limit `limit`.
pub fn tally(field: &[Point], side: Side, limit: f64, decision: DecisionRule) -> Tally {
    let mut t = Tally {
        limit,
        legal: 0,
        conditional: 0,
        illegal: 0,
    };
    for p in field {
        let margin = match side {
            Side::Upper => limit - p.value,
            Side::Lower => p.value - limit,
        };
        let f = finding(margin, p.expanded, false);
        t.conditional += usize::from(f.is_conditional());
        match verdict(f, decision) {
            Verdict::Illegal => t.illegal += 1,
            _ => t.legal += 1,
        }
    }
    t
}

/// `n` candidates evenly spaced from `from` to `to`, both included.
pub fn candidates(from: f64, to: f64, n: usize) -> Vec<f64> {
    match n {
        0 => Vec::new(),
        1 => vec![from],
        _ => (0..n)
            .map(|i| from + (to - from) * i as f64 / (n - 1) as f64)
            .collect(),
    }
}

/// The tightest candidate that keeps at least `share` (0 to 1) of the field legal: the lowest
/// upper limit, or the highest lower limit.
pub fn keeping(tallies: &[Tally], side: Side, share: f64, engines: usize) -> Option<f64> {
    let enough = tallies
        .iter()
        .filter(|t| t.legal as f64 >= share * engines as f64)
        .map(|t| t.limit);
    match side {
        Side::Upper => enough.reduce(f64::min),
        Side::Lower => enough.reduce(f64::max),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn field() -> Vec<Point> {
        [9.2, 9.45, 9.65]
            .iter()
            .map(|&value| Point {
                engine: format!("e{value}"),
                value,
                expanded: 0.1,
            })
            .collect()
    }

    #[test]
    fn guarded_rejection_counts_a_conditional_fail_legal_and_simple_acceptance_does_not() {
        // ISO 14253-1 / ILAC-G8 bands: at 9.5, 9.2 passes by 0.3 > U; 9.45 passes by 0.05 < U
        // (conditional pass); 9.65 is 0.15 out, more than U, so proven out (fail)
        let t = tally(&field(), Side::Upper, 9.5, DecisionRule::GuardedRejection);
        assert_eq!((t.legal, t.conditional, t.illegal), (2, 1, 1));
        // at 9.6: 9.65 is 0.05 out, a conditional fail: legal under guarded rejection,
        // illegal under simple acceptance (the value alone decides)
        let t = tally(&field(), Side::Upper, 9.6, DecisionRule::GuardedRejection);
        assert_eq!((t.legal, t.conditional, t.illegal), (3, 1, 0));
        let t = tally(&field(), Side::Upper, 9.6, DecisionRule::SimpleAcceptance);
        assert_eq!((t.legal, t.illegal), (2, 1));
    }

    #[test]
    fn the_tightest_candidate_that_keeps_two_thirds_legal() {
        let limits = candidates(9.0, 10.0, 11);
        assert_eq!(limits.len(), 11);
        assert!((limits[5] - 9.5).abs() < 1e-12);
        let tallies: Vec<Tally> = limits
            .iter()
            .map(|&l| tally(&field(), Side::Upper, l, DecisionRule::GuardedRejection))
            .collect();
        // under guarded rejection 9.45 is legal from 9.35 on (a conditional fail), so 9.4 is
        // the lowest candidate with two of three legal; at 9.3 only 9.2 is
        let at = keeping(&tallies, Side::Upper, 2.0 / 3.0, 3).unwrap_or_default();
        assert!((at - 9.4).abs() < 1e-9, "{at}");
    }
}
