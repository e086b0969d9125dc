//! The Monte Carlo check of one rule as a report shows it (JCGM 101:2008): the Monte Carlo
//! estimate, its standard uncertainty, the 95 % coverage interval and the probability of
//! conformance beside the linear (GUM) ones, and whether the law of propagation is adequate.

use serde::Serialize;

use super::format::{Digits, probability, quantity};
use super::view::Fact;
use crate::evaluate::montecarlo::{MonteCarlo, Validation};
use crate::units::Unit;

/// A rule's Monte Carlo check, in the unit of its limit.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MonteCarloView {
    /// Draws made.
    pub draws: usize,
    /// Draws for which the value had no finite value (counted as not conforming).
    pub undefined_draws: usize,
    /// The generator's seed.
    pub seed: u64,
    /// Whether the number of draws was chosen adaptively (JCGM 101 7.9).
    pub adaptive: bool,
    /// Whether the results settled to the numerical tolerance.
    pub settled: bool,
    /// The Monte Carlo estimate of the value tested (the mean of the draws).
    pub value: f64,
    /// Its standard uncertainty.
    pub standard_uncertainty: f64,
    /// The probabilistically symmetric 95 % coverage interval.
    pub coverage_interval: [f64; 2],
    /// The fraction of draws inside the limit at the closest cylinder.
    pub probability_of_conformance: f64,
    /// For a rule on every cylinder, the fraction of draws with every cylinder inside.
    pub all_cylinders_probability: Option<f64>,
    /// The GUM framework's estimate.
    pub linear_value: f64,
    /// Its standard uncertainty.
    pub linear_standard_uncertainty: f64,
    /// The coverage factor of its 95 % interval: t₀.₉₇₅ at the effective degrees of freedom,
    /// 1.96 when they are infinite.
    pub linear_coverage_factor: f64,
    /// Its 95 % interval, y ± k·u(y).
    pub linear_coverage_interval: [f64; 2],
    /// The numerical tolerance δ (JCGM 101 7.9.2, two significant digits of u).
    pub tolerance: f64,
    /// The larger distance between the ends of the two intervals.
    pub largest_difference: f64,
    /// `adequate`, `not_adequate` or `unsettled`.
    pub validation: Validation,
    /// The facts in words (the reports' words; not in the JSON).
    #[serde(skip)]
    pub facts: Vec<Fact>,
}

/// The view of a rule's Monte Carlo check in `unit`.
pub fn view(mc: &MonteCarlo, unit: Option<&'static Unit>) -> MonteCarloView {
    let s = unit.map_or(1.0, |u| u.to_si);
    let q = |v: f64| quantity(v, unit);
    let u = |v: f64| Digits::supported_in(v, unit).quantity(v, unit);
    let p = |v: f64| probability(v, true);
    let all = mc
        .all_cylinders
        .map(|a| format!(", all cylinders {}", p(a)))
        .unwrap_or_default();
    let undefined = if mc.undefined > 0 {
        format!(", {} without a value", mc.undefined)
    } else {
        String::new()
    };
    let how = format!(
        "{} draws{undefined}, seed {}, {}{}",
        mc.draws,
        mc.seed,
        if mc.adaptive { "adaptive" } else { "fixed" },
        if mc.settled {
            ", settled"
        } else {
            ", not settled"
        }
    );
    let fact = |label, text: String| Fact {
        label,
        code: None,
        text,
    };
    let facts = vec![
        fact(
            "Monte Carlo",
            format!(
                "{}, u {}, 95 % interval {} to {}, p {}{all} ({how})",
                q(mc.value),
                u(mc.standard_uncertainty),
                q(mc.interval.0),
                q(mc.interval.1),
                p(mc.probability)
            ),
        ),
        fact(
            "linear",
            format!(
                "{}, u {}, 95 % interval {} to {} (y ± {:.2} u)",
                q(mc.linear_value),
                u(mc.linear_uncertainty),
                q(mc.linear_interval.0),
                q(mc.linear_interval.1),
                mc.linear_k
            ),
        ),
        fact(
            "propagation",
            format!(
                "{}: the interval ends differ by up to {} against a tolerance of {}{} (JCGM 101 section 8)",
                mc.validation.words(),
                u(mc.distance),
                u(mc.tolerance),
                wider(mc)
            ),
        ),
    ];
    MonteCarloView {
        draws: mc.draws,
        undefined_draws: mc.undefined,
        seed: mc.seed,
        adaptive: mc.adaptive,
        settled: mc.settled,
        value: mc.value / s,
        standard_uncertainty: mc.standard_uncertainty / s,
        coverage_interval: [mc.interval.0 / s, mc.interval.1 / s],
        probability_of_conformance: mc.probability,
        all_cylinders_probability: mc.all_cylinders,
        linear_value: mc.linear_value / s,
        linear_standard_uncertainty: mc.linear_uncertainty / s,
        linear_coverage_factor: mc.linear_k,
        linear_coverage_interval: [mc.linear_interval.0 / s, mc.linear_interval.1 / s],
        tolerance: mc.tolerance / s,
        largest_difference: mc.distance / s,
        validation: mc.validation,
        facts,
    }
}

/// Which interval is the wider, when the linear one is not adequate.
fn wider(mc: &MonteCarlo) -> &'static str {
    if mc.validation != Validation::NotAdequate {
        return "";
    }
    let width = |(a, b): (f64, f64)| b - a;
    if width(mc.linear_interval) > width(mc.interval) {
        "; the linear interval is the wider"
    } else {
        "; the linear interval is the narrower"
    }
}
