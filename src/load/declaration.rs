//! An engine declaration once loaded: who, what, when, and every measured value in SI units
//! with its standard uncertainty and where in the file it came from.

use std::collections::BTreeMap;
use std::path::PathBuf;

use crate::evaluate::dual::InputId;
use crate::parse::ast::Date;

/// Who and what was measured.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Identity {
    /// Engine or seal number.
    pub engine: Option<String>,
    /// Car number.
    pub car: Option<String>,
    /// The class the engine runs in.
    pub class: Option<String>,
    /// The event.
    pub event: Option<String>,
    /// The date of the inspection.
    pub date: Option<Date>,
    /// Who measured.
    pub measured_by: Option<String>,
}

/// Where an input's standard uncertainty comes from.
#[derive(Clone, Debug, PartialEq)]
pub enum UncertaintySource {
    /// Written with the value (`± U`, coverage factor `k`).
    Stated {
        /// The coverage factor used.
        k: f64,
    },
    /// From a named instrument of the declaration.
    Instrument(String),
    /// From a literal in the rulebook.
    Rulebook,
    /// None stated: the value is taken as exact.
    None,
}

/// One scalar measured input (each cylinder's bore is its own input).
#[derive(Clone, Debug, PartialEq)]
pub struct Input {
    /// The measurement, with the cylinder for per-cylinder values (`bore[3]`).
    pub label: String,
    /// Value in SI units.
    pub value: f64,
    /// Standard uncertainty in SI units.
    pub standard_uncertainty: f64,
    /// The unit it was written in, for showing it back.
    pub unit: Option<&'static str>,
    /// The value exactly as written (`4.0312 in`), when it was written as text.
    pub written: Option<String>,
    /// Where the uncertainty comes from.
    pub source: UncertaintySource,
    /// Where it was written: a path in the declaration (`measurements.bore[3]`) or a rulebook
    /// location.
    pub origin: String,
}

/// What a declaration gives for one measurement.
#[derive(Clone, Debug, PartialEq)]
pub enum Supplied {
    /// One number for the engine.
    Single(InputId),
    /// One number per cylinder, cylinder 1 first.
    PerCylinder(Vec<InputId>),
    /// An identifier or other text, and where it was written.
    Text(String, String),
}

/// A loaded declaration.
#[derive(Clone, Debug, Default)]
pub struct Declaration {
    /// The file it came from.
    pub path: PathBuf,
    /// Who and what.
    pub identity: Identity,
    /// Every scalar input, indexed by [`InputId`].
    pub inputs: Vec<Input>,
    /// What was supplied for each measurement; a measurement left out or left empty is absent.
    pub supplied: BTreeMap<String, Supplied>,
}

impl Declaration {
    /// The input with this id.
    pub fn input(&self, id: InputId) -> &Input {
        &self.inputs[id as usize]
    }
}
