//! Why an engine was inspected, what the inspection covered, and the seals on it: the
//! `inspection:` block of a declaration, once loaded.
//!
//! The data types live here so that the report, the scope of a check and the season log read
//! the same facts; reading the block from YAML is the declaration reader's job.

/// Why an engine was inspected.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Reason {
    /// The routine check of the finishers after a race.
    AfterFeature,
    /// A competitor's protest, with its reference in [`Inspection::reference`].
    Protest,
    /// A claim of the engine under the series' claiming rule.
    Claim,
    /// Chosen by a random draw.
    RandomDraw,
    /// Asked for by the officials for another stated reason.
    Other(String),
}

/// One numbered seal and where on the engine it sits.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Seal {
    /// The number stamped on the seal, as written.
    pub number: String,
    /// Where it is (`intake to head, front left bolt`), when stated.
    pub place: Option<String>,
}

/// The `inspection:` block: reason, scope and seals. Every part is optional; a declaration
/// without the block is a full inspection for no stated reason, with no seals recorded.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Inspection {
    /// Why the engine was inspected.
    pub reason: Option<Reason>,
    /// The protest's, claim's or draw's reference, as written.
    pub reference: Option<String>,
    /// The sections inspected (`5`, `6.2`), as written; `None` is every rule of the class.
    pub scope: Option<Vec<String>>,
    /// The seals found on the engine when it came in.
    pub seals_found: Vec<Seal>,
    /// The seals applied when it left.
    pub seals_applied: Vec<Seal>,
}
