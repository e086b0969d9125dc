//! The probability that every cylinder conforms, as a report shows it beside the closest
//! cylinder's: the figure, how it was computed, the inputs the cylinders share, and which of
//! the two the finding was judged on.

use serde::Serialize;

use super::format::probability;
use crate::evaluate::joint::{AllCylinders, JointMethod};
use crate::evaluate::outcome::EngineReport;

/// The probability that every cylinder conforms.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct AllCylindersView {
    /// The probability that every cylinder conforms, 0 to 1.
    pub probability_of_conformance: f64,
    /// How many cylinders.
    pub cylinders: usize,
    /// The inputs in more than one cylinder's margin, by label (`stroke`).
    pub shared_inputs: Vec<String>,
    /// `product` (nothing shared), `quadrature` (one or two shared dimensions) or `sampled`.
    pub method: &'static str,
    /// For `sampled`, the draws, the seed and the standard error of the figure.
    pub sampled: Option<SampledView>,
    /// Which probability the finding was judged on: always `closest_cylinder`
    /// (ISO 14253-1 judges each cylinder against its limit).
    pub decision_uses: &'static str,
    /// The fact in words (the reports' words; not in the JSON).
    #[serde(skip)]
    pub shown: String,
}

/// How a sampled figure was made.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SampledView {
    /// Draws.
    pub samples: usize,
    /// The generator's seed.
    pub seed: u64,
    /// The standard error of the figure.
    pub standard_error: f64,
}

/// The view of the figure, the shared inputs named as the report names them.
pub fn view(all: &AllCylinders, uncertain: bool, r: &EngineReport) -> AllCylindersView {
    let shared_inputs: Vec<String> = all
        .shared
        .iter()
        .map(|id| r.input(*id).label(r.rulebook))
        .collect();
    let (method, sampled) = match all.method {
        JointMethod::Product => ("product", None),
        JointMethod::Quadrature { .. } => ("quadrature", None),
        JointMethod::Sampled {
            samples,
            seed,
            standard_error,
            ..
        } => (
            "sampled",
            Some(SampledView {
                samples,
                seed,
                standard_error,
            }),
        ),
    };
    let how = match (&all.method, shared_inputs.as_slice()) {
        (JointMethod::Product, _) | (_, []) => {
            "no input shared between cylinders: the product of their probabilities".to_string()
        }
        (JointMethod::Sampled { samples, seed, .. }, names) => format!(
            "{} shared between cylinders: {samples} draws over them, seed {seed}",
            names.join(", ")
        ),
        (JointMethod::Quadrature { .. }, names) => format!(
            "{} shared between cylinders: integrated over {}",
            names.join(", "),
            if names.len() == 1 { "it" } else { "them" }
        ),
    };
    AllCylindersView {
        probability_of_conformance: all.probability,
        cylinders: all.cylinders,
        shown: format!(
            "p {} that all {} conform ({how}); the finding is judged on the closest cylinder",
            probability(all.probability, uncertain),
            all.cylinders
        ),
        shared_inputs,
        method,
        sampled,
        decision_uses: "closest_cylinder",
    }
}
