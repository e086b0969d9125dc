//! Reading a declaration's YAML against the rulebook's measurement schema in one pass.
//!
//! Each piece is read by a `DeserializeSeed` that knows what the rulebook expects there, and
//! refuses bad input while serde_yaml is still at that node, so the error carries the line
//! and column of the offending key or value. Refusals travel as serde custom errors whose text
//! is `code \u{1f} message \u{1f} help`; `load/mod.rs` turns them back into problems.

use std::cell::RefCell;
use std::collections::{BTreeMap, HashSet};
use std::fmt;

use serde::de::{self, DeserializeSeed, Deserializer, MapAccess, SeqAccess, Visitor};

use super::declaration::{
    Declaration, Identity, Input, InputName, Place, Supplied, UncertaintySource,
};
use super::reading::{Reading, Refusal, read_instrument_quantity, read_number, read_text};
use crate::check::model::{CheckedRulebook, Measurement, Named, ValueKind};
use crate::suggest::closest;
use crate::units::Dimension;

/// Separates the parts of a refusal inside a serde error message.
pub const SEPARATOR: char = '\u{1f}';

/// The keys a declaration may have at its top level.
pub const TOP_KEYS: &[&str] = &[
    "engine",
    "car",
    "class",
    "event",
    "date",
    "measured_by",
    "instruments",
    "measurements",
    "components",
    "notes",
];

/// An instrument: what its readings' standard uncertainty is.
#[derive(Clone, Debug)]
pub struct Instrument {
    /// Standard uncertainty in SI units.
    pub standard_uncertainty: f64,
    /// The dimension of what it measures.
    pub dimension: Dimension,
}

/// A measurement that names an instrument, resolved once the whole file is read.
#[derive(Clone, Debug)]
pub struct InstrumentUse {
    /// The instrument's name.
    pub instrument: String,
    /// The inputs it applies to.
    pub inputs: Vec<u32>,
    /// The measurement's dimension.
    pub dimension: Dimension,
    /// Where the use is written.
    pub path: String,
}

/// Everything read so far.
#[derive(Default)]
pub struct State {
    /// The declaration being built.
    pub declaration: Declaration,
    /// Instruments by name.
    pub instruments: BTreeMap<String, Instrument>,
    /// Instrument uses to resolve at the end.
    pub uses: Vec<InstrumentUse>,
    /// The number of cylinders, from `cylinders` or the first per-cylinder list, and where.
    pub cylinders: Option<(usize, String)>,
    /// Which measurements have been written, by position in the schema.
    pub declared: Vec<bool>,
}

/// Reads a whole declaration.
pub struct DeclarationSeed<'a> {
    /// The rulebook whose schema the declaration follows.
    pub rulebook: &'a CheckedRulebook,
    /// What has been read.
    pub state: &'a RefCell<State>,
}

fn refuse<E: de::Error>(code: &str, message: impl fmt::Display, help: impl fmt::Display) -> E {
    E::custom(format!("{code}{SEPARATOR}{message}{SEPARATOR}{help}"))
}

fn refusal<E: de::Error>((code, message, help): Refusal) -> E {
    refuse(code, message, help)
}

impl<'de> DeserializeSeed<'de> for DeclarationSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de> Visitor<'de> for DeclarationSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str(
            "a declaration: a mapping with `class`, `measurements` and the engine's identity",
        )
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let mut seen = Vec::new();
        while let Some(key) = map.next_key_seed(KeySeed {
            keys: &Fixed(TOP_KEYS),
            seen: &mut seen,
            what: "declaration key",
        })? {
            match TOP_KEYS[key] {
                "class" => {
                    let class = map.next_value_seed(ClassSeed {
                        rulebook: self.rulebook,
                    })?;
                    self.state.borrow_mut().declaration.identity.class = Some(class);
                }
                "date" => {
                    let date = map.next_value_seed(DateSeed)?;
                    self.state.borrow_mut().declaration.identity.date = date;
                }
                "instruments" => map.next_value_seed(InstrumentsSeed { state: self.state })?,
                "measurements" => map.next_value_seed(MeasurementsSeed {
                    rulebook: self.rulebook,
                    state: self.state,
                    component: None,
                })?,
                "components" => map.next_value_seed(ComponentsSeed {
                    rulebook: self.rulebook,
                    state: self.state,
                })?,
                "notes" => {
                    map.next_value::<serde::de::IgnoredAny>()?;
                }
                field => {
                    let text = map.next_value_seed(TextSeed)?;
                    set_identity(
                        &mut self.state.borrow_mut().declaration.identity,
                        field,
                        text,
                    );
                }
            }
        }
        Ok(())
    }
}

fn set_identity(identity: &mut Identity, field: &str, text: Option<String>) {
    match field {
        "engine" => identity.engine = text,
        "car" => identity.car = text,
        "event" => identity.event = text,
        "measured_by" => identity.measured_by = text,
        _ => {}
    }
}

/// The keys one mapping may have: how to find one, and all of them for "did you mean".
trait Keys {
    /// The key's position, if it is one.
    fn find(&self, key: &str) -> Option<usize>;
    /// Every key, in order.
    fn all(&self) -> Vec<String>;

    /// How a key given twice is named, and the help for it.
    fn given_twice(&self, key: &str) -> (String, &'static str) {
        (key.to_string(), "keep one of the two entries")
    }
}

/// A fixed set of keys.
struct Fixed(&'static [&'static str]);

impl Keys for Fixed {
    fn find(&self, key: &str) -> Option<usize> {
        self.0.iter().position(|k| *k == key)
    }

    fn all(&self) -> Vec<String> {
        self.0.iter().map(|k| k.to_string()).collect()
    }
}

/// The components of the schema (`carburetor` for `carburetor.part`).
struct Components<'a>(Vec<&'a str>);

impl Keys for Components<'_> {
    fn find(&self, key: &str) -> Option<usize> {
        self.0.iter().position(|k| *k == key)
    }

    fn all(&self) -> Vec<String> {
        self.0.iter().map(|k| k.to_string()).collect()
    }
}

/// Measurement names: full names at `measurements:`, short names under a component;
/// positions are positions in the rulebook's schema.
struct MeasurementKeys<'a> {
    rulebook: &'a CheckedRulebook,
    component: Option<&'a str>,
}

impl MeasurementKeys<'_> {
    /// The name as written at this level, if the measurement belongs here.
    fn short<'n>(&self, name: &'n str) -> Option<&'n str> {
        match self.component {
            None => Some(name),
            Some(c) => name.strip_prefix(c).and_then(|rest| rest.strip_prefix('.')),
        }
    }
}

impl Keys for MeasurementKeys<'_> {
    fn find(&self, key: &str) -> Option<usize> {
        if self.component.is_none() {
            return match self.rulebook.index.get(key) {
                Some(Named::Measurement(i)) => Some(*i),
                _ => None,
            };
        }
        self.rulebook
            .measurements
            .iter()
            .position(|m| self.short(&m.name) == Some(key))
    }

    fn all(&self) -> Vec<String> {
        self.rulebook
            .measurements
            .iter()
            .filter_map(|m| self.short(&m.name).map(str::to_string))
            .collect()
    }

    fn given_twice(&self, key: &str) -> (String, &'static str) {
        let full = match self.component {
            Some(c) => format!("{c}.{key}"),
            None => key.to_string(),
        };
        (
            full,
            "give it once, under `measurements` or under its component",
        )
    }
}

/// A mapping key that must be one of `keys` and appear once; gives its position.
struct KeySeed<'s> {
    keys: &'s dyn Keys,
    seen: &'s mut Vec<bool>,
    what: &'static str,
}

impl<'de> DeserializeSeed<'de> for KeySeed<'_> {
    type Value = usize;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<usize, D::Error> {
        d.deserialize_str(self)
    }
}

impl<'de> Visitor<'de> for KeySeed<'_> {
    type Value = usize;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        write!(f, "a {}", self.what)
    }

    fn visit_str<E: de::Error>(self, key: &str) -> Result<usize, E> {
        let Some(at) = self.keys.find(key) else {
            let all = self.keys.all();
            let help = match closest(key, all.iter().map(String::as_str)) {
                Some(near) => format!("did you mean `{near}`?"),
                None => format!("the keys allowed here are {}", backticked(&all)),
            };
            return Err(refuse(
                "gonogo::load::unknown-key",
                format_args!("`{key}` is not a {} gonogo knows here", self.what),
                help,
            ));
        };
        if at >= self.seen.len() {
            self.seen.resize(at + 1, false);
        }
        if std::mem::replace(&mut self.seen[at], true) {
            let (name, help) = self.keys.given_twice(key);
            return Err(refuse(
                "gonogo::load::duplicate-key",
                format_args!("`{name}` is given twice"),
                help,
            ));
        }
        Ok(at)
    }
}

fn backticked(items: &[String]) -> String {
    let shown: Vec<String> = items.iter().take(12).map(|i| format!("`{i}`")).collect();
    let more = if items.len() > 12 { ", ..." } else { "" };
    format!("{}{more}", shown.join(", "))
}

/// A scalar read as text (strings and numbers alike); empty gives `None`.
struct TextSeed;

impl<'de> DeserializeSeed<'de> for TextSeed {
    type Value = Option<String>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<String>, D::Error> {
        d.deserialize_any(self)
    }
}

impl Visitor<'_> for TextSeed {
    type Value = Option<String>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("text")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Option<String>, E> {
        Ok((!v.trim().is_empty()).then(|| v.to_string()))
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Option<String>, E> {
        Ok(Some(v.to_string()))
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Option<String>, E> {
        Ok(Some(v.to_string()))
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Option<String>, E> {
        Ok(Some(v.to_string()))
    }

    fn visit_unit<E: de::Error>(self) -> Result<Option<String>, E> {
        Ok(None)
    }
}

/// The class, which the rulebook must have.
struct ClassSeed<'a> {
    rulebook: &'a CheckedRulebook,
}

impl<'de> DeserializeSeed<'de> for ClassSeed<'_> {
    type Value = String;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<String, D::Error> {
        d.deserialize_str(self)
    }
}

impl Visitor<'_> for ClassSeed<'_> {
    type Value = String;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a class name")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<String, E> {
        if self.rulebook.class(v).is_some() {
            return Ok(v.to_string());
        }
        let names = self.rulebook.classes.iter().map(|c| c.name.as_str());
        let help = match closest(v, names) {
            Some(near) => format!("did you mean `{near}`?"),
            None => {
                let all: Vec<String> = self
                    .rulebook
                    .classes
                    .iter()
                    .map(|c| c.name.clone())
                    .collect();
                format!("the rulebook's classes are {}", backticked(&all))
            }
        };
        Err(refuse(
            "gonogo::load::unknown-class",
            format_args!("the rulebook has no class `{v}`"),
            help,
        ))
    }
}

/// A date written `YYYY-MM-DD`.
struct DateSeed;

impl<'de> DeserializeSeed<'de> for DateSeed {
    type Value = Option<crate::parse::ast::Date>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        d.deserialize_any(self)
    }
}

impl Visitor<'_> for DateSeed {
    type Value = Option<crate::parse::ast::Date>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a date like 2027-07-19")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(None)
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        if v.trim().is_empty() {
            return Ok(None);
        }
        crate::parse::date_literal(v).map(Some).ok_or_else(|| {
            refuse(
                "gonogo::load::bad-date",
                format_args!("`{v}` is not a calendar date"),
                "write the date as year-month-day, like `2027-07-19`",
            )
        })
    }
}

/// `instruments:` — each a mapping with `resolution`, `uncertainty` and `k`.
struct InstrumentsSeed<'a> {
    state: &'a RefCell<State>,
}

impl<'de> DeserializeSeed<'de> for InstrumentsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de> Visitor<'de> for InstrumentsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from instrument names to their resolution or uncertainty")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let mut seen = HashSet::new();
        while let Some(name) = map.next_key::<String>()? {
            if !seen.insert(name.clone()) {
                return Err(refuse(
                    "gonogo::load::duplicate-key",
                    format_args!("instrument `{name}` is given twice"),
                    "keep one of the two entries",
                ));
            }
            let instrument = map.next_value_seed(InstrumentSeed)?;
            self.state.borrow_mut().instruments.insert(name, instrument);
        }
        Ok(())
    }
}

struct InstrumentSeed;

impl<'de> DeserializeSeed<'de> for InstrumentSeed {
    type Value = Instrument;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Instrument, D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de> Visitor<'de> for InstrumentSeed {
    type Value = Instrument;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("`resolution`, or `uncertainty` with an optional `k`")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Instrument, A::Error> {
        const KEYS: &[&str] = &["resolution", "uncertainty", "k"];
        let mut seen = Vec::new();
        let (mut resolution, mut expanded, mut k) = (None, None, None);
        while let Some(key) = map.next_key_seed(KeySeed {
            keys: &Fixed(KEYS),
            seen: &mut seen,
            what: "instrument key",
        })? {
            match KEYS[key] {
                "k" => k = Some(map.next_value_seed(CoverageSeed)?),
                "resolution" => resolution = Some(map.next_value_seed(InstrumentQuantitySeed)?),
                _ => expanded = Some(map.next_value_seed(InstrumentQuantitySeed)?),
            }
        }
        instrument_from(resolution, expanded, k.unwrap_or(2.0))
    }
}

/// The standard uncertainty of an instrument: a digital resolution δ is a rectangular
/// distribution of half-width δ/2, so u = δ/(2√3) (GUM JCGM 100:2008, F.2.2.1); an expanded
/// uncertainty U at coverage factor k gives u = U/k; both together add in quadrature.
fn instrument_from<E: de::Error>(
    resolution: Option<(f64, Dimension)>,
    expanded: Option<(f64, Dimension)>,
    k: f64,
) -> Result<Instrument, E> {
    let from_resolution = resolution.map(|(r, d)| (r / (2.0 * 3f64.sqrt()), d));
    let from_expanded = expanded.map(|(u, d)| (u / k, d));
    let dimension = match (from_resolution, from_expanded) {
        (Some((_, a)), Some((_, b))) if a != b => {
            return Err(refuse(
                "gonogo::load::wrong-dimension",
                "the resolution and the uncertainty are of different dimensions",
                "write both in units of what the instrument measures",
            ));
        }
        (Some((_, d)), _) | (None, Some((_, d))) => d,
        (None, None) => {
            return Err(refuse(
                "gonogo::load::instrument-empty",
                "this instrument has neither a resolution nor an uncertainty",
                "add `resolution: \"0.0001 in\"` or `uncertainty: \"0.0002 in\"`",
            ));
        }
    };
    let u = from_resolution
        .map_or(0.0, |(u, _)| u)
        .hypot(from_expanded.map_or(0.0, |(u, _)| u));
    Ok(Instrument {
        standard_uncertainty: u,
        dimension,
    })
}

struct InstrumentQuantitySeed;

impl<'de> DeserializeSeed<'de> for InstrumentQuantitySeed {
    type Value = (f64, Dimension);

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        d.deserialize_any(self)
    }
}

impl Visitor<'_> for InstrumentQuantitySeed {
    type Value = (f64, Dimension);

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a quantity with its unit, like \"0.0001 in\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        read_instrument_quantity(v)
            .map(|(value, d, _)| (value, d))
            .map_err(refusal)
    }
}

/// A coverage factor, a plain number above zero.
struct CoverageSeed;

impl<'de> DeserializeSeed<'de> for CoverageSeed {
    type Value = f64;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<f64, D::Error> {
        d.deserialize_any(self)
    }
}

impl Visitor<'_> for CoverageSeed {
    type Value = f64;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a coverage factor such as 2")
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<f64, E> {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(refuse(
                "gonogo::load::bad-coverage",
                "the coverage factor must be above zero",
                "write `k: 2` for about 95 % coverage",
            ))
        }
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<f64, E> {
        self.visit_f64(v as f64)
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<f64, E> {
        self.visit_f64(v as f64)
    }
}

/// `components:` — a mapping from component names (`carburetor`) to their measurements.
struct ComponentsSeed<'a> {
    rulebook: &'a CheckedRulebook,
    state: &'a RefCell<State>,
}

impl<'de> DeserializeSeed<'de> for ComponentsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de> Visitor<'de> for ComponentsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from component names to their measurements")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let mut names: Vec<&str> = self
            .rulebook
            .measurements
            .iter()
            .filter_map(|m| m.name.split_once('.').map(|(c, _)| c))
            .collect();
        names.dedup();
        let components = Components(names);
        let mut seen = Vec::new();
        while let Some(at) = map.next_key_seed(KeySeed {
            keys: &components,
            seen: &mut seen,
            what: "component",
        })? {
            let component = Some(components.0[at]);
            map.next_value_seed(MeasurementsSeed {
                rulebook: self.rulebook,
                state: self.state,
                component,
            })?;
        }
        Ok(())
    }
}

/// A mapping from measurement names (after `prefix`) to their values.
struct MeasurementsSeed<'a> {
    rulebook: &'a CheckedRulebook,
    state: &'a RefCell<State>,
    component: Option<&'a str>,
}

impl<'de> DeserializeSeed<'de> for MeasurementsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de> Visitor<'de> for MeasurementsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from measurement names to values")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let keys = MeasurementKeys {
            rulebook: self.rulebook,
            component: self.component,
        };
        let place = if self.component.is_none() {
            Place::Measurements
        } else {
            Place::Components
        };
        loop {
            let key = {
                let mut state = self.state.borrow_mut();
                map.next_key_seed(KeySeed {
                    keys: &keys,
                    seen: &mut state.declared,
                    what: "measurement",
                })?
            };
            let Some(index) = key else { break };
            let Some(measurement) = self.rulebook.measurements.get(index) else {
                continue;
            };
            map.next_value_seed(ValueSeed {
                measurement,
                index,
                place,
                state: self.state,
            })?;
        }
        Ok(())
    }
}

/// One measurement's value, in any of the forms a declaration may write it.
struct ValueSeed<'a> {
    measurement: &'a Measurement,
    index: usize,
    place: Place,
    state: &'a RefCell<State>,
}

impl<'de> DeserializeSeed<'de> for ValueSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_any(self)
    }
}

impl ValueSeed<'_> {
    fn is_text(&self) -> bool {
        self.measurement.kind == ValueKind::Text
    }

    /// Where this value is written, for messages: `components.carburetor.airflow`.
    fn path(&self) -> String {
        format!("{}.{}", self.place.key(), self.measurement.name)
    }

    fn supply(&self, state: &mut State, supplied: Supplied) {
        let slots = &mut state.declaration.supplied;
        if slots.len() <= self.index {
            slots.resize(self.index + 1, None);
        }
        slots[self.index] = Some(supplied);
    }

    fn name(&self, cylinder: Option<usize>) -> InputName {
        InputName::Measured {
            measurement: self.index,
            cylinder,
            place: self.place,
        }
    }

    fn single<E: de::Error>(
        &self,
        reading: Reading,
        source: Option<UncertaintySource>,
    ) -> Result<(), E> {
        if self.measurement.per_cylinder {
            return Err(refuse(
                "gonogo::load::needs-list",
                format_args!(
                    "`{}` is measured on every cylinder: give a list, cylinder 1 first",
                    self.measurement.name
                ),
                "write the values as a list, like `[\"4.031 in\", \"4.030 in\", ...]`",
            ));
        }
        if self.measurement.name == "cylinders" {
            self.note_cylinders::<E>(reading.value.round() as usize)?;
        }
        let mut state = self.state.borrow_mut();
        let id = push_input(&mut state.declaration, self.name(None), reading, source);
        self.supply(&mut state, Supplied::Single(id));
        Ok(())
    }

    fn text<E: de::Error>(&self, text: String) -> Result<(), E> {
        let mut state = self.state.borrow_mut();
        self.supply(&mut state, Supplied::Text(text, self.place));
        Ok(())
    }

    /// Checks a cylinder count against what other per-cylinder lists said.
    fn note_cylinders<E: de::Error>(&self, count: usize) -> Result<(), E> {
        let mut state = self.state.borrow_mut();
        match &state.cylinders {
            Some((n, from)) if *n != count => Err(refuse(
                "gonogo::load::cylinder-count",
                format_args!("this gives {count} cylinders, but `{from}` gives {n}"),
                "every per-cylinder list has one value per cylinder, and `cylinders` counts them",
            )),
            Some(_) => Ok(()),
            None => {
                state.cylinders = Some((count, self.path()));
                Ok(())
            }
        }
    }

    fn per_cylinder<E: de::Error>(
        &self,
        readings: Vec<Reading>,
        source: Option<UncertaintySource>,
    ) -> Result<Vec<u32>, E> {
        if !self.measurement.per_cylinder {
            return Err(refuse(
                "gonogo::load::not-a-list",
                format_args!(
                    "`{}` is one value for the engine, not a list",
                    self.measurement.name
                ),
                "write a single value",
            ));
        }
        if readings.is_empty() {
            return Err(refuse(
                "gonogo::load::empty-list",
                "this list has no values",
                "give one value per cylinder, or leave the measurement out",
            ));
        }
        self.note_cylinders::<E>(readings.len())?;
        let mut state = self.state.borrow_mut();
        let ids: Vec<u32> = readings
            .into_iter()
            .enumerate()
            .map(|(i, r)| {
                push_input(
                    &mut state.declaration,
                    self.name(Some(i + 1)),
                    r,
                    source.clone(),
                )
            })
            .collect();
        self.supply(&mut state, Supplied::PerCylinder(ids.clone()));
        Ok(ids)
    }
}

fn push_input(
    d: &mut Declaration,
    name: InputName,
    r: Reading,
    source: Option<UncertaintySource>,
) -> u32 {
    let (u, source) = match (r.stated, source) {
        (Some((expanded, k)), _) => (expanded / k, UncertaintySource::Stated { k }),
        (None, Some(s)) => (0.0, s),
        (None, None) => (0.0, UncertaintySource::None),
    };
    d.inputs.push(Input {
        name,
        value: r.value,
        standard_uncertainty: u,
        unit: r.unit,
        written: Some(r.written),
        source,
    });
    u32::try_from(d.inputs.len() - 1).unwrap_or(u32::MAX)
}

impl<'de> Visitor<'de> for ValueSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        if self.is_text() {
            f.write_str("text")
        } else if self.measurement.per_cylinder {
            f.write_str("a list of values, one per cylinder")
        } else {
            f.write_str("a value with its unit")
        }
    }

    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        Ok(())
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<(), E> {
        if v.trim().is_empty() {
            return Ok(());
        }
        if self.is_text() {
            return self.text(v.to_string());
        }
        let reading = read_text(v, self.measurement).map_err(refusal)?;
        self.single(reading, None)
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<(), E> {
        if self.is_text() {
            return self.text(v.to_string());
        }
        let reading = read_number(v, self.measurement).map_err(refusal)?;
        self.single(reading, None)
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<(), E> {
        if self.is_text() {
            return self.text(v.to_string());
        }
        self.visit_f64(v as f64)
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<(), E> {
        if self.is_text() {
            return self.text(v.to_string());
        }
        self.visit_f64(v as f64)
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<(), A::Error> {
        if self.is_text() {
            return Err(refuse(
                "gonogo::load::not-a-list",
                format_args!("`{}` is text, not a list", self.measurement.name),
                "write a single value",
            ));
        }
        let mut readings = Vec::new();
        while let Some(r) = seq.next_element_seed(ElementSeed {
            measurement: self.measurement,
        })? {
            readings.push(r);
        }
        self.per_cylinder(readings, None).map(|_| ())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        const KEYS: &[&str] = &["value", "values", "instrument"];
        let mut seen = Vec::new();
        let (mut single, mut list, mut instrument) = (None, None, None);
        while let Some(key) = map.next_key_seed(KeySeed {
            keys: &Fixed(KEYS),
            seen: &mut seen,
            what: "value key",
        })? {
            match KEYS[key] {
                "value" => {
                    single = Some(map.next_value_seed(ElementSeed {
                        measurement: self.measurement,
                    })?)
                }
                "values" => {
                    list = Some(map.next_value_seed(ListSeed {
                        measurement: self.measurement,
                    })?)
                }
                _ => {
                    instrument = Some(map.next_value_seed(InstrumentNameSeed {
                        state: self.state,
                        measurement: self.measurement,
                    })?)
                }
            }
        }
        self.finish_map(single, list, instrument)
    }
}

impl ValueSeed<'_> {
    fn finish_map<E: de::Error>(
        self,
        single: Option<Reading>,
        list: Option<Vec<Reading>>,
        instrument: Option<String>,
    ) -> Result<(), E> {
        let stated = single
            .iter()
            .chain(list.iter().flatten())
            .any(|r| r.stated.is_some());
        if stated && instrument.is_some() {
            return Err(refuse(
                "gonogo::load::two-uncertainties",
                "this value has its own `±` and also names an instrument",
                "give the uncertainty one way: remove the `±` or the `instrument`",
            ));
        }
        let source = instrument.clone().map(UncertaintySource::Instrument);
        let ids = match (single, list) {
            (Some(_), Some(_)) => {
                return Err(refuse(
                    "gonogo::load::value-and-values",
                    "give `value` or `values`, not both",
                    "use `values` for a per-cylinder list",
                ));
            }
            (Some(r), None) => {
                self.single::<E>(r, source)?;
                let state = self.state.borrow();
                match state.declaration.supplied(self.index) {
                    Some(Supplied::Single(id)) => vec![*id],
                    _ => Vec::new(),
                }
            }
            (None, Some(rs)) => self.per_cylinder::<E>(rs, source)?,
            (None, None) => return Ok(()),
        };
        if let Some(name) = instrument {
            let dimension = match self.measurement.kind {
                ValueKind::Number(d) => d,
                ValueKind::Text => Dimension::NONE,
            };
            self.state.borrow_mut().uses.push(InstrumentUse {
                instrument: name,
                inputs: ids,
                dimension,
                path: self.path(),
            });
        }
        Ok(())
    }
}

/// One number of a measurement: a string literal or a plain YAML number.
struct ElementSeed<'a> {
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for ElementSeed<'_> {
    type Value = Reading;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Reading, D::Error> {
        d.deserialize_any(self)
    }
}

impl Visitor<'_> for ElementSeed<'_> {
    type Value = Reading;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a value with its unit, like \"4.031 in\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Reading, E> {
        read_text(v, self.measurement).map_err(refusal)
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Reading, E> {
        read_number(v, self.measurement).map_err(refusal)
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Reading, E> {
        self.visit_f64(v as f64)
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Reading, E> {
        self.visit_f64(v as f64)
    }
}

/// `values:` — a list of numbers.
struct ListSeed<'a> {
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for ListSeed<'_> {
    type Value = Vec<Reading>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Vec<Reading>, D::Error> {
        d.deserialize_seq(self)
    }
}

impl<'de> Visitor<'de> for ListSeed<'_> {
    type Value = Vec<Reading>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a list of values, one per cylinder")
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Vec<Reading>, A::Error> {
        let mut readings = Vec::new();
        while let Some(r) = seq.next_element_seed(ElementSeed {
            measurement: self.measurement,
        })? {
            readings.push(r);
        }
        Ok(readings)
    }
}

/// `instrument:` — the name of an instrument; checked now when the instruments came first.
struct InstrumentNameSeed<'a> {
    state: &'a RefCell<State>,
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for InstrumentNameSeed<'_> {
    type Value = String;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<String, D::Error> {
        d.deserialize_str(self)
    }
}

impl Visitor<'_> for InstrumentNameSeed<'_> {
    type Value = String;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("the name of an instrument")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<String, E> {
        let state = self.state.borrow();
        if state.instruments.is_empty() {
            return Ok(v.to_string()); // instruments come later in the file; checked at the end
        }
        match state.instruments.get(v) {
            Some(i) => {
                let want = match self.measurement.kind {
                    ValueKind::Number(d) => d,
                    ValueKind::Text => Dimension::NONE,
                };
                if i.dimension != want {
                    return Err(refuse(
                        "gonogo::load::wrong-dimension",
                        format_args!(
                            "instrument `{v}` measures a {}, but `{}` is a {want}",
                            i.dimension, self.measurement.name
                        ),
                        "name an instrument that measures this kind of quantity",
                    ));
                }
                Ok(v.to_string())
            }
            None => Err(unknown_instrument(v, &state.instruments)),
        }
    }
}

/// The refusal for an instrument the declaration does not list.
pub fn unknown_instrument<E: de::Error>(
    name: &str,
    instruments: &BTreeMap<String, Instrument>,
) -> E {
    let help = match closest(name, instruments.keys().map(String::as_str)) {
        Some(near) => format!("did you mean `{near}`?"),
        None => "list it under `instruments:` with its resolution or uncertainty".to_string(),
    };
    refuse(
        "gonogo::load::unknown-instrument",
        format_args!("`{name}` is not an instrument of this declaration"),
        help,
    )
}
