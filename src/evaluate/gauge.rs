//! Deciding a limit from go/no-go gauge results, which give bounds, never a value.
//!
//! A plug gauge of stated size s with expanded uncertainty U (coverage factor k) that enters a
//! bore proves the bore is at least the plug's true size; the true size lies in s ± U at the
//! coverage of k, so the result proves `bore ≥ s − U` (one-sided, at a coverage no less than
//! the two-sided interval's). A plug that does not enter proves `bore < s + U`. A ring gauge is
//! the mirror image: one that goes over proves `diameter ≤ s + U`, one that does not proves
//! `diameter > s − U`. ISO 14253-1:2017 (details from memory, as REFERENCES.md records them;
//! clause numbers not confirmed) counts the uncertainty against whoever makes the claim:
//! conformity is proven only when the whole uncertainty interval lies inside the
//! specification, nonconformity only when it lies wholly outside; ILAC-G8:09/2019 §4.2 writes
//! the decision rules as guard bands (w = U for guarded acceptance and rejection, w = 0 for
//! simple acceptance). Applied to a bound:
//!
//! * `≤ L` is proven met when a plug of s ≤ L − U did not enter (bore < s + U ≤ L), and
//!   proven failed when a plug of s > L + U entered (bore ≥ s − U > L);
//! * `≥ L` is proven met when a plug of s ≥ L + U entered, proven failed when one of
//!   s ≤ L − U did not;
//! * at the stated size alone (U ignored) the same tests give a *conditional* pass or fail:
//!   what simple acceptance reads, not proven under ISO 14253-1;
//! * a bound on the other side (a plug that entered, against `≤ L` with s ≤ L) says nothing
//!   about the rule: the finding is [`Finding::Open`]. Guarded rejection calls it legal (no
//!   violation is proven), guarded acceptance illegal (conformity is not proven), and simple
//!   acceptance, which decides on a measured value, has none to decide on: the rule is not
//!   checked, and the report says which gauge left it open.
//!
//! Values within rounding of each other (a relative 1e-12) count as equal: sizes and limits
//! are written decimals whose SI conversions differ in their last bits only.

use super::finding::Finding;
use crate::load::gauge::{Bound, GaugeResult};

/// One side of a limit: the value must be at most (`upper`) or at least `at`, SI units,
/// allowance included; `strict` excludes `at` itself.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LimitSide {
    /// True for `<=` and `<`.
    pub upper: bool,
    /// True for `<` and `>`.
    pub strict: bool,
    /// The limit.
    pub at: f64,
}

/// The gauge results' finding on one side of a limit, and the result that decided it (its
/// position in the measurement's results; `None` when the finding is open).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SideFinding {
    /// The limit side.
    pub limit: LimitSide,
    /// What the results prove about it.
    pub finding: Finding,
    /// The deciding result.
    pub decided_by: Option<usize>,
}

/// `a` against `b`, equal within rounding.
fn compare(a: f64, b: f64) -> std::cmp::Ordering {
    if (a - b).abs() <= 1e-12 * a.abs().max(b.abs()) {
        std::cmp::Ordering::Equal
    } else if a < b {
        std::cmp::Ordering::Less
    } else {
        std::cmp::Ordering::Greater
    }
}

/// Whether every value the bound allows lies inside the limit side.
pub fn all_inside(b: Bound, l: LimitSide) -> bool {
    use std::cmp::Ordering::*;
    // only a bound from the limit's own side can hold every value inside it
    if b.below == l.upper {
        return false;
    }
    let toward = if l.upper {
        compare(b.at, l.at)
    } else {
        compare(l.at, b.at)
    };
    match toward {
        Less => true,
        Equal => b.strict || !l.strict,
        Greater => false,
    }
}

/// Whether every value the bound allows lies outside the limit side.
pub fn all_outside(b: Bound, l: LimitSide) -> bool {
    use std::cmp::Ordering::*;
    // only a bound from the far side can put every value beyond the limit
    if b.below != l.upper {
        return false;
    }
    let beyond = if l.upper {
        compare(b.at, l.at)
    } else {
        compare(l.at, b.at)
    };
    match beyond {
        Greater => true,
        Equal => b.strict || l.strict,
        Less => false,
    }
}

/// What one result proves about one limit side (module doc: proven at the bound less its U,
/// conditional at the stated size, else open).
pub fn finding_of(result: &GaugeResult, l: LimitSide) -> Finding {
    let (proven, nominal) = (result.proven(), result.nominal());
    if all_inside(proven, l) {
        Finding::Pass
    } else if all_outside(proven, l) {
        Finding::Fail
    } else if all_inside(nominal, l) {
        Finding::ConditionalPass
    } else if all_outside(nominal, l) {
        Finding::ConditionalFail
    } else {
        Finding::Open
    }
}

/// What a measurement's results together prove about one limit side: the most decisive
/// result's finding (a proven one before a conditional one). Results that contradict each
/// other are refused at load, so the decisive ones never point both ways.
pub fn decide(results: &[GaugeResult], l: LimitSide) -> SideFinding {
    let findings: Vec<Finding> = results.iter().map(|r| finding_of(r, l)).collect();
    let order = [
        Finding::Fail,
        Finding::Pass,
        Finding::ConditionalFail,
        Finding::ConditionalPass,
    ];
    for wanted in order {
        if let Some(at) = findings.iter().position(|f| *f == wanted) {
            return SideFinding {
                limit: l,
                finding: wanted,
                decided_by: Some(at),
            };
        }
    }
    SideFinding {
        limit: l,
        finding: Finding::Open,
        decided_by: None,
    }
}

/// A range decided side by side: the worse side's finding (an open side leaves a passing
/// other side open, and a failing other side failed).
pub fn decide_between(results: &[GaugeResult], low: f64, high: f64) -> [SideFinding; 2] {
    let side = |upper, at| LimitSide {
        upper,
        strict: false,
        at,
    };
    [
        decide(results, side(false, low)),
        decide(results, side(true, high)),
    ]
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::load::gauge::GaugeKind;

    const IN: f64 = 0.0254; // NIST SP 811 B.8: 1 in = 0.0254 m exactly

    fn gauge(kind: GaugeKind, size_in: f64, u_in: f64, went: bool) -> GaugeResult {
        GaugeResult {
            kind,
            tag: "T".into(),
            size: size_in * IN,
            expanded: u_in * IN,
            k: 2.0,
            unit: Some("in"),
            written: String::new(),
            went,
            origin: String::new(),
        }
    }

    fn plug(size_in: f64, went: bool) -> GaugeResult {
        gauge(GaugeKind::Plug, size_in, 0.0002, went)
    }

    fn at_most(l_in: f64) -> LimitSide {
        LimitSide {
            upper: true,
            strict: false,
            at: l_in * IN,
        }
    }

    fn at_least(l_in: f64) -> LimitSide {
        LimitSide {
            upper: false,
            strict: false,
            at: l_in * IN,
        }
    }

    /// ISO 14253-1 decision rules on a bound, limit 1.6875 in, U = 0.0002 in: conformity is
    /// proven only when the bound less U lies inside, nonconformity only when it lies outside
    /// by more than U; between, the stated size alone decides (conditional).
    #[test]
    fn an_upper_limit_against_plugs_follows_iso_14253_1() {
        use Finding::*;
        let cases = [
            // did not enter: bore < s + U
            (1.6873, false, Pass),            // s + U = 1.6875 ≤ L: proven
            (1.6874, false, ConditionalPass), // s ≤ L < s + U
            (1.6875, false, ConditionalPass), // s = L: bore < L at the stated size
            (1.6876, false, Open),            // bore < 1.6878 says nothing of ≤ 1.6875
            // entered: bore ≥ s − U
            (1.6878, true, Fail),            // s − U = 1.6876 > L: proven
            (1.6877, true, ConditionalFail), // s − U = L: a bore of exactly L is legal
            (1.6876, true, ConditionalFail), // s > L ≥ s − U
            (1.6875, true, Open),            // bore ≥ L meets ≤ L at L itself
            (1.6850, true, Open),
        ];
        for (size, went, expected) in cases {
            let f = finding_of(&plug(size, went), at_most(1.6875));
            assert_eq!(f, expected, "plug {size} in, went {went}");
        }
    }

    #[test]
    fn a_lower_limit_is_the_mirror_image() {
        use Finding::*;
        // bore ≥ 1.5000 in: a plug of s ≥ L + U that enters proves it
        assert_eq!(finding_of(&plug(1.5002, true), at_least(1.5)), Pass);
        assert_eq!(
            finding_of(&plug(1.5001, true), at_least(1.5)),
            ConditionalPass
        );
        assert_eq!(
            finding_of(&plug(1.5000, true), at_least(1.5)),
            ConditionalPass
        );
        // one of s ≤ L − U that does not enter proves the bore too small
        assert_eq!(finding_of(&plug(1.4998, false), at_least(1.5)), Fail);
        assert_eq!(
            finding_of(&plug(1.4999, false), at_least(1.5)),
            ConditionalFail
        );
        assert_eq!(
            finding_of(&plug(1.5000, false), at_least(1.5)),
            ConditionalFail
        );
        assert_eq!(finding_of(&plug(1.5003, false), at_least(1.5)), Open);
    }

    #[test]
    fn a_strict_limit_excludes_the_bound_it_meets() {
        // bore < 1.6875 in: a plug of exactly 1.6877 in that entered proves bore ≥ 1.6875,
        // which fails `<` (and only conditionally fails `<=`, above)
        let strict = LimitSide {
            strict: true,
            ..at_most(1.6875)
        };
        assert_eq!(finding_of(&plug(1.6877, true), strict), Finding::Fail);
        // not entering 1.6873 proves bore < 1.6875: meets `<` too
        assert_eq!(finding_of(&plug(1.6873, false), strict), Finding::Pass);
    }

    #[test]
    fn a_ring_that_goes_over_bounds_the_diameter_from_above() {
        // header tube OD ≤ 1.625 in: a ring of 1.6248 in ± 0.0002 in that goes over proves
        // OD ≤ 1.6250; one of 1.6253 that does not proves OD > 1.6251
        let ring = |s, went| gauge(GaugeKind::Ring, s, 0.0002, went);
        assert_eq!(
            finding_of(&ring(1.6248, true), at_most(1.625)),
            Finding::Pass
        );
        assert_eq!(
            finding_of(&ring(1.6253, false), at_most(1.625)),
            Finding::Fail
        );
        assert_eq!(
            finding_of(&ring(1.6253, true), at_most(1.625)),
            Finding::Open
        );
    }

    #[test]
    fn the_most_decisive_result_decides() {
        // go plug 1.6850 entered, no-go plug 1.6870 did not: bore in [1.6848, 1.6872)
        let results = [plug(1.6850, true), plug(1.6870, false)];
        let side = decide(&results, at_most(1.6875));
        assert_eq!(side.finding, Finding::Pass);
        assert_eq!(side.decided_by, Some(1));
        // the go plug alone leaves `≤ 1.6875` open
        let open = decide(&results[..1], at_most(1.6875));
        assert_eq!((open.finding, open.decided_by), (Finding::Open, None));
    }

    #[test]
    fn a_range_needs_both_sides_proven() {
        let results = [plug(1.6850, true), plug(1.6870, false)];
        let [low, high] = decide_between(&results, 1.6840 * IN, 1.6875 * IN);
        assert_eq!((low.finding, high.finding), (Finding::Pass, Finding::Pass));
        // one gauge bounds one side only: the other side stays open
        let [low, high] = decide_between(&results[..1], 1.6840 * IN, 1.6875 * IN);
        assert_eq!((low.finding, high.finding), (Finding::Pass, Finding::Open));
        assert_eq!(low.finding.min(high.finding), Finding::Open);
    }
}
