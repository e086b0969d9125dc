//! An engine declaration once loaded: who, what, when, and every measured value in SI units
//! with its standard uncertainty and where in the file it came from.

use std::collections::BTreeMap;
use std::path::PathBuf;

/// Identifies one input of a check: a measured scalar of the declaration (each cylinder's
/// bore is its own input), then the rulebook's literals with a stated uncertainty.
pub type InputId = u32;

use crate::check::model::CheckedRulebook;
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
    /// The calibration of an instrument, one correction common to every reading taken with
    /// it (a shared input of value 0).
    Calibration {
        /// The instrument.
        instrument: String,
        /// How many readings share it.
        readings: usize,
    },
    /// The mean of repeated readings (Type A, GUM 4.2): u = s/√n with n − 1 degrees of
    /// freedom, and the named instrument's components beside it.
    Repeated {
        /// How many readings, n.
        count: usize,
        /// Their experimental standard deviation s, in SI units (GUM eq. 4).
        spread: f64,
        /// The instrument they were taken with, if one is named.
        instrument: Option<String>,
    },
}

/// The distribution an uncertainty component is drawn from (JCGM 101:2008, 6.4): what a
/// Monte Carlo propagation samples, and where a component's degrees of freedom come from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Distribution {
    /// Normal (Gaussian): a stated expanded uncertainty or a calibration certificate.
    Normal,
    /// Rectangular (uniform) over ±√3·u: a digital resolution (GUM F.2.2.1).
    Rectangular,
    /// A scaled and shifted t-distribution: the mean of repeated readings (Type A, GUM 4.2),
    /// with its degrees of freedom.
    StudentT {
        /// Degrees of freedom, n − 1 for n readings.
        degrees_of_freedom: f64,
    },
}

/// One component of an input's standard uncertainty.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Component {
    /// The standard uncertainty of this component, in SI units.
    pub standard_uncertainty: f64,
    /// The distribution it is drawn from.
    pub distribution: Distribution,
}

impl Component {
    /// A normal component of standard uncertainty `u`.
    pub fn normal(u: f64) -> Component {
        Component {
            standard_uncertainty: u,
            distribution: Distribution::Normal,
        }
    }
}

/// Where in a declaration a value was written.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Place {
    /// Under `measurements:`, by its full name.
    Measurements,
    /// Under `components:`, by component and short name.
    Components,
}

impl Place {
    /// The top-level key.
    pub fn key(self) -> &'static str {
        match self {
            Place::Measurements => "measurements",
            Place::Components => "components",
        }
    }
}

/// What an input is.
#[derive(Clone, Debug, PartialEq)]
pub enum InputName {
    /// A declared measurement.
    Measured {
        /// Its position in the rulebook's measurement schema.
        measurement: usize,
        /// The cylinder, counting from 1, for per-cylinder values.
        cylinder: Option<usize>,
        /// Where the declaration wrote it.
        place: Place,
    },
    /// A rulebook literal with a stated uncertainty, as written.
    Literal(String),
    /// The calibration correction of an instrument, shared by every reading taken with it.
    Calibration {
        /// The instrument's name.
        instrument: String,
    },
}

/// One scalar measured input (each cylinder's bore is its own input).
#[derive(Clone, Debug, PartialEq)]
pub struct Input {
    /// What it is.
    pub name: InputName,
    /// Value in SI units.
    pub value: f64,
    /// Standard uncertainty in SI units: the components added in quadrature.
    pub standard_uncertainty: f64,
    /// The components of the standard uncertainty, each with its distribution (empty when the
    /// value is taken as exact).
    pub components: Vec<Component>,
    /// The unit it was written in, for showing it back.
    pub unit: Option<&'static str>,
    /// The value exactly as written (`4.0312 in`), when it was written as text.
    pub written: Option<String>,
    /// Where the uncertainty comes from.
    pub source: UncertaintySource,
}

impl Input {
    /// The measurement and cylinder, as a report names it: `bore[3]`, `stroke`, or the literal.
    pub fn label(&self, rulebook: &CheckedRulebook) -> String {
        match &self.name {
            InputName::Measured {
                measurement,
                cylinder,
                ..
            } => with_cylinder(measurement_name(rulebook, *measurement), *cylinder),
            InputName::Literal(text) => text.clone(),
            InputName::Calibration { instrument } => format!("{instrument} calibration"),
        }
    }

    /// Where it was written: `measurements.bore[3]`, `components.carburetor.part`, `rulebook`.
    pub fn origin(&self, rulebook: &CheckedRulebook) -> String {
        match &self.name {
            InputName::Measured {
                measurement,
                cylinder,
                place,
            } => with_cylinder(
                &format!(
                    "{}.{}",
                    place.key(),
                    measurement_name(rulebook, *measurement)
                ),
                *cylinder,
            ),
            InputName::Literal(_) => "rulebook".to_string(),
            InputName::Calibration { instrument } => {
                format!("instruments.{instrument}.calibration")
            }
        }
    }
}

fn measurement_name(rulebook: &CheckedRulebook, index: usize) -> &str {
    rulebook
        .measurements
        .get(index)
        .map_or("?", |m| m.name.as_str())
}

fn with_cylinder(base: &str, cylinder: Option<usize>) -> String {
    match cylinder {
        Some(c) => format!("{base}[{c}]"),
        None => base.to_string(),
    }
}

/// What a declaration gives for one measurement.
#[derive(Clone, Debug, PartialEq)]
pub enum Supplied {
    /// One number for the engine.
    Single(InputId),
    /// One number per cylinder, cylinder 1 first.
    PerCylinder(Vec<InputId>),
    /// An identifier or other text, where it was written, and the text as written when white
    /// space around it was removed at load (`"TVH-2204 "` read as `TVH-2204`).
    Text(String, Place, Option<String>),
}

/// A loaded declaration.
#[derive(Clone, Debug, Default)]
pub struct Declaration {
    /// The file it came from.
    pub path: PathBuf,
    /// The SHA-256 of its bytes, as `sha256sum` prints it.
    pub sha256: String,
    /// Who and what.
    pub identity: Identity,
    /// Every scalar input, indexed by [`InputId`].
    pub inputs: Vec<Input>,
    /// What was supplied, by position in the rulebook's measurement schema; a measurement
    /// left out or left empty is `None`.
    pub supplied: Vec<Option<Supplied>>,
    /// For each reading taken with an instrument that has a calibration, the shared
    /// calibration input added to it (an input of [`InputName::Calibration`]).
    pub calibrations: BTreeMap<InputId, InputId>,
    /// Why it was inspected, what the inspection covered and the seals on it.
    pub inspection: super::inspection::Inspection,
    /// The measurements recorded as go/no-go gauge results, by position in the schema: each
    /// has no measured value (its slot of `supplied` is `None`).
    pub gauged: BTreeMap<usize, super::gauge::Gauged>,
}

impl Declaration {
    /// The input with this id.
    pub fn input(&self, id: InputId) -> &Input {
        &self.inputs[id as usize]
    }

    /// What was supplied for the measurement at this position of the schema.
    pub fn supplied(&self, measurement: usize) -> Option<&Supplied> {
        self.supplied.get(measurement).and_then(Option::as_ref)
    }

    /// The gauge results recorded for the measurement at this position of the schema.
    pub fn gauged(&self, measurement: usize) -> Option<&super::gauge::Gauged> {
        self.gauged.get(&measurement)
    }

    /// The shared calibration input added to reading `id`, if its instrument has one.
    pub fn calibration_of(&self, id: InputId) -> Option<InputId> {
        self.calibrations.get(&id).copied()
    }

    /// The calibration inputs shared by the readings of what was supplied, each once, in
    /// the order of the readings.
    pub fn calibrations_of(&self, supplied: &Supplied) -> Vec<InputId> {
        let readings: &[InputId] = match supplied {
            Supplied::Single(id) => std::slice::from_ref(id),
            Supplied::PerCylinder(ids) => ids,
            Supplied::Text(..) => &[],
        };
        let mut shared: Vec<InputId> = Vec::new();
        for c in readings.iter().filter_map(|r| self.calibration_of(*r)) {
            if !shared.contains(&c) {
                shared.push(c);
            }
        }
        shared
    }
}
