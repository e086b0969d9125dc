//! Reading a declaration's YAML against the rulebook's measurement schema in one pass.
//!
//! Each piece is read by a `DeserializeSeed` that knows what the rulebook expects there and
//! where in the declaration it is ([`DeclPath`]). A bad key or value is refused while
//! serde_yaml is still at that node, so the error carries the line and column of the
//! offending text; the refusal itself travels as data through the [`Collector`], never as
//! text inside the serde error. A node the collector says to skip is read over, and the
//! measurement or instrument that holds it is left out of this reading.

use std::cell::RefCell;
use std::collections::{BTreeMap, HashSet};
use std::fmt;

use serde::de::{self, DeserializeSeed, Deserializer, IgnoredAny, MapAccess, SeqAccess, Visitor};

use super::collect::Collector;
use super::declaration::{
    Component, Declaration, Distribution, Identity, Input, InputId, InputName, Place, Supplied,
    UncertaintySource,
};
use super::error::{CoverageAt, KeyKind, LoadError, MERGE_KEY, Twice, YamlFeature};
use super::gauge::{GaugeResult, Gauged, GaugesSeed};
use super::inspection::InspectionSeed;
use super::path::DeclPath;
use super::reading::{Reading, read_instrument_quantity, read_number, read_text};
use super::repeated::{TypeA, combine};
use crate::check::model::{CheckedRulebook, Measurement, Named, ValueKind};
use crate::suggest::{closest, find_class};
use crate::units::Dimension;

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
    "inspection",
    "notes",
];

/// An instrument: what its readings' standard uncertainty is.
#[derive(Clone, Debug)]
pub struct Instrument {
    /// Standard uncertainty in SI units: the components added in quadrature.
    pub standard_uncertainty: f64,
    /// Its components: the resolution (rectangular) and the stated uncertainty (normal).
    pub components: Vec<Component>,
    /// The standard uncertainty of its calibration in SI units: one error common to every
    /// reading taken with it, so not among `components` but a shared input of its own.
    pub calibration: Option<f64>,
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
    /// The measurement's name.
    pub measurement: String,
    /// The measurement's dimension.
    pub dimension: Dimension,
    /// Where the instrument is named.
    pub path: DeclPath,
}

/// Everything read so far in one reading of the file.
#[derive(Default)]
pub struct State {
    /// The declaration being built.
    pub declaration: Declaration,
    /// Instruments by name.
    pub instruments: BTreeMap<String, Instrument>,
    /// Instruments left out of this reading because part of them was skipped.
    pub broken_instruments: HashSet<String>,
    /// Whether `instruments:` has been read (later uses are checked at once).
    pub instruments_read: bool,
    /// Whether `instruments:` was skipped as a whole, so no use can be checked.
    pub instruments_unusable: bool,
    /// Instrument uses to resolve at the end.
    pub uses: Vec<InstrumentUse>,
    /// The number of cylinders, from `cylinders` or the first per-cylinder list, and where.
    pub cylinders: Option<(usize, String)>,
    /// Which measurements have been written, by position in the schema.
    pub declared: Vec<bool>,
}

/// What every seed shares: the schema, the declaration being built, the collector.
#[derive(Clone, Copy)]
pub struct Context<'a> {
    /// The rulebook whose schema the declaration follows.
    pub rulebook: &'a CheckedRulebook,
    /// What has been read.
    pub state: &'a RefCell<State>,
    /// Where refusals are recorded.
    pub collector: &'a Collector,
}

impl Context<'_> {
    pub(super) fn refuse<E: de::Error>(&self, path: &DeclPath, error: LoadError) -> E {
        self.collector.refuse(path, error)
    }
}

/// Reads a whole declaration.
pub struct DeclarationSeed<'a> {
    /// What the seeds share.
    pub cx: Context<'a>,
}

impl<'de> DeserializeSeed<'de> for DeclarationSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        let collector = self.cx.collector;
        collector
            .guard(&DeclPath::root(), d, |d| d.deserialize_map(self))
            .map(|_| ())
    }
}

impl<'de> Visitor<'de> for DeclarationSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str(
            "a declaration: a mapping with `class`, `measurements` and the engine's identity",
        )
    }

    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        Ok(())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let cx = self.cx;
        let root = DeclPath::root();
        let mut seen = Vec::new();
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &root,
            keys: &Fixed(TOP_KEYS),
            seen: &mut seen,
            kind: KeyKind::Declaration,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = root.key(TOP_KEYS[at]);
            match TOP_KEYS[at] {
                "class" => {
                    let class = map.next_value_seed(ClassSeed { cx, path })?;
                    cx.state.borrow_mut().declaration.identity.class = class;
                }
                "date" => {
                    let date = map.next_value_seed(DateSeed { cx, path })?;
                    cx.state.borrow_mut().declaration.identity.date = date.flatten();
                }
                "instruments" => map.next_value_seed(InstrumentsSeed { cx, path })?,
                "measurements" => map.next_value_seed(MeasurementsSeed {
                    cx,
                    path,
                    component: None,
                })?,
                "components" => map.next_value_seed(ComponentsSeed { cx, path })?,
                "inspection" => {
                    let inspection = map.next_value_seed(InspectionSeed { cx, path })?;
                    cx.state.borrow_mut().declaration.inspection =
                        inspection.flatten().unwrap_or_default();
                }
                "notes" => {
                    map.next_value::<IgnoredAny>()?;
                }
                field => {
                    let text = map.next_value_seed(TextSeed { cx, path })?;
                    set_identity(
                        &mut cx.state.borrow_mut().declaration.identity,
                        field,
                        text.flatten(),
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
pub(super) trait Keys {
    /// The key's position, if it is one.
    fn find(&self, key: &str) -> Option<usize>;
    /// Every key, in order.
    fn all(&self) -> Vec<String>;

    /// A key given twice: its full name and what it is.
    fn given_twice(&self, key: &str) -> (String, Twice) {
        (key.to_string(), Twice::Key)
    }
}

/// A fixed set of keys.
pub(super) struct Fixed(pub(super) &'static [&'static str]);

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

    fn given_twice(&self, key: &str) -> (String, Twice) {
        let full = match self.component {
            Some(c) => format!("{c}.{key}"),
            None => key.to_string(),
        };
        (full, Twice::Measurement)
    }
}

/// A mapping key that must be one of `keys` and appear once; gives its position, or `None`
/// for a key to skip.
pub(super) struct KeySeed<'s, 'a> {
    pub(super) cx: Context<'a>,
    pub(super) parent: &'s DeclPath,
    pub(super) keys: &'s dyn Keys,
    pub(super) seen: &'s mut Vec<bool>,
    pub(super) kind: KeyKind,
}

impl<'de> DeserializeSeed<'de> for KeySeed<'_, '_> {
    type Value = Option<usize>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<usize>, D::Error> {
        let (collector, parent) = (self.cx.collector, self.parent);
        d.deserialize_str(self)
            .map_err(|e| collector.foreign(parent, e))
    }
}

impl<'de> Visitor<'de> for KeySeed<'_, '_> {
    type Value = Option<usize>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str(self.kind.words())
    }

    fn visit_str<E: de::Error>(self, key: &str) -> Result<Option<usize>, E> {
        let path = self.parent.key(key);
        if self.cx.collector.skips(&path) {
            self.cx.collector.note_skipped();
            return Ok(None);
        }
        if key == MERGE_KEY {
            let error = LoadError::Unsupported(YamlFeature::MergeKey);
            return Err(self.cx.refuse(&path, error));
        }
        let Some(at) = self.keys.find(key) else {
            let allowed = self.keys.all();
            let suggestion = closest(key, allowed.iter().map(String::as_str)).map(str::to_string);
            let error = LoadError::UnknownKey {
                key: key.to_string(),
                kind: self.kind,
                suggestion,
                allowed,
            };
            return Err(self.cx.refuse(&path, error));
        };
        if at >= self.seen.len() {
            self.seen.resize(at + 1, false);
        }
        if std::mem::replace(&mut self.seen[at], true) {
            let (name, what) = self.keys.given_twice(key);
            return Err(self
                .cx
                .refuse(&path, LoadError::DuplicateKey { name, what }));
        }
        Ok(Some(at))
    }
}

/// A scalar read as text (strings and numbers alike); empty gives `None`.
pub(super) struct TextSeed<'a> {
    pub(super) cx: Context<'a>,
    pub(super) path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for TextSeed<'_> {
    type Value = Option<Option<String>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for TextSeed<'_> {
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
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for ClassSeed<'_> {
    type Value = Option<String>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<String>, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_str(self))
    }
}

impl Visitor<'_> for ClassSeed<'_> {
    type Value = String;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a class name")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<String, E> {
        match find_class(self.cx.rulebook, v) {
            Ok(_) => Ok(v.to_string()),
            Err(e) => Err(self.cx.refuse(&self.path, LoadError::UnknownClass(e))),
        }
    }
}

/// A date written `YYYY-MM-DD`.
struct DateSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for DateSeed<'_> {
    type Value = Option<Option<crate::parse::ast::Date>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for DateSeed<'_> {
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
        match crate::parse::date_literal(v) {
            Some(date) => Ok(Some(date)),
            None => Err(self.cx.refuse(
                &self.path,
                LoadError::BadDate {
                    written: v.to_string(),
                },
            )),
        }
    }
}

/// `instruments:` — each a mapping with `resolution`, `uncertainty` and `k`.
struct InstrumentsSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for InstrumentsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        let (path, cx) = (self.path.clone(), self.cx);
        let read = cx.collector.guard(&path, d, |d| d.deserialize_map(self))?;
        let mut state = cx.state.borrow_mut();
        state.instruments_read = true;
        // skipped as a whole: already reported, and no use of an instrument can be checked
        state.instruments_unusable |= read.is_none();
        Ok(())
    }
}

impl<'de> Visitor<'de> for InstrumentsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from instrument names to their resolution or uncertainty")
    }

    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        Ok(())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let cx = self.cx;
        let mut seen = HashSet::new();
        while let Some(key) = map.next_key_seed(InstrumentNameKey {
            cx,
            parent: &self.path,
            seen: &mut seen,
        })? {
            let (name, skipped) = key;
            let before = cx.collector.skipped();
            let instrument = if skipped {
                map.next_value::<IgnoredAny>()?;
                None
            } else {
                let path = self.path.key(&name);
                map.next_value_seed(InstrumentSeed { cx, path })?.flatten()
            };
            let mut state = cx.state.borrow_mut();
            match instrument {
                Some(i) if cx.collector.skipped() == before => {
                    state.instruments.insert(name, i);
                }
                _ => {
                    state.broken_instruments.insert(name);
                }
            }
        }
        Ok(())
    }
}

/// An instrument's name as a key of `instruments:`, given once; and whether to skip it.
struct InstrumentNameKey<'s, 'a> {
    cx: Context<'a>,
    parent: &'s DeclPath,
    seen: &'s mut HashSet<String>,
}

impl<'de> DeserializeSeed<'de> for InstrumentNameKey<'_, '_> {
    type Value = (String, bool);

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(String, bool), D::Error> {
        let (collector, parent) = (self.cx.collector, self.parent);
        d.deserialize_str(self)
            .map_err(|e| collector.foreign(parent, e))
    }
}

impl Visitor<'_> for InstrumentNameKey<'_, '_> {
    type Value = (String, bool);

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("an instrument's name")
    }

    fn visit_str<E: de::Error>(self, name: &str) -> Result<(String, bool), E> {
        let path = self.parent.key(name);
        if self.cx.collector.skips(&path) {
            self.cx.collector.note_skipped();
            return Ok((name.to_string(), true));
        }
        if name == MERGE_KEY {
            let error = LoadError::Unsupported(YamlFeature::MergeKey);
            return Err(self.cx.refuse(&path, error));
        }
        if !self.seen.insert(name.to_string()) {
            let error = LoadError::DuplicateKey {
                name: name.to_string(),
                what: Twice::Instrument,
            };
            return Err(self.cx.refuse(&path, error));
        }
        Ok((name.to_string(), false))
    }
}

/// One instrument.
struct InstrumentSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for InstrumentSeed<'_> {
    type Value = Option<Option<Instrument>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_map(self))
    }
}

impl<'de> Visitor<'de> for InstrumentSeed<'_> {
    type Value = Option<Instrument>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("`resolution`, `uncertainty` or `calibration`, with an optional `k`")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Option<Instrument>, A::Error> {
        const KEYS: &[&str] = &["resolution", "uncertainty", "calibration", "k"];
        let cx = self.cx;
        let before = cx.collector.skipped();
        let mut seen = Vec::new();
        let (mut resolution, mut expanded, mut calibration, mut k) = (None, None, None, None);
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(KEYS),
            seen: &mut seen,
            kind: KeyKind::Instrument,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = self.path.key(KEYS[at]);
            match KEYS[at] {
                "k" => k = map.next_value_seed(CoverageSeed { cx, path })?,
                "resolution" => {
                    resolution = map.next_value_seed(InstrumentQuantitySeed { cx, path })?
                }
                "calibration" => {
                    calibration = map.next_value_seed(InstrumentQuantitySeed { cx, path })?
                }
                _ => expanded = map.next_value_seed(InstrumentQuantitySeed { cx, path })?,
            }
        }
        if cx.collector.skipped() > before {
            return Ok(None);
        }
        let stated = Stated {
            random: expanded,
            calibration,
            k: k.unwrap_or(2.0),
        };
        instrument_from(resolution, stated)
            .map(Some)
            .map_err(|e| cx.refuse(&self.path, e))
    }
}

/// An instrument's stated expanded uncertainties, each with its dimension, and the coverage
/// factor both are stated at.
struct Stated {
    /// `uncertainty`: the random part, independent from reading to reading.
    random: Option<(f64, Dimension)>,
    /// `calibration`: the systematic part, common to every reading.
    calibration: Option<(f64, Dimension)>,
    /// `k`.
    k: f64,
}

/// The standard uncertainty of an instrument: a digital resolution δ is a rectangular
/// distribution of half-width δ/2, so u = δ/(2√3) (GUM JCGM 100:2008, F.2.2.1); an expanded
/// uncertainty U at coverage factor k gives u = U/k; both together add in quadrature. A
/// calibration U gives u = U/k as well, kept apart: it is shared by every reading.
fn instrument_from(
    resolution: Option<(f64, Dimension)>,
    stated: Stated,
) -> Result<Instrument, LoadError> {
    let from_resolution = resolution.map(|(r, d)| (r / (2.0 * 3f64.sqrt()), d));
    let from_expanded = stated.random.map(|(u, d)| (u / stated.k, d));
    let from_calibration = stated.calibration.map(|(u, d)| (u / stated.k, d));
    let dimensions: Vec<Dimension> = [from_resolution, from_expanded, from_calibration]
        .iter()
        .flatten()
        .map(|(_, d)| *d)
        .collect();
    let dimension = match dimensions.as_slice() {
        [] => return Err(LoadError::InstrumentEmpty),
        [first, rest @ ..] if rest.iter().any(|d| d != first) => {
            return Err(LoadError::InstrumentMixed);
        }
        [first, ..] => *first,
    };
    let u = from_resolution
        .map_or(0.0, |(u, _)| u)
        .hypot(from_expanded.map_or(0.0, |(u, _)| u));
    let rectangular = from_resolution.map(|(u, _)| Component {
        standard_uncertainty: u,
        distribution: Distribution::Rectangular,
    });
    let normal = from_expanded.map(|(u, _)| Component::normal(u));
    Ok(Instrument {
        standard_uncertainty: u,
        components: rectangular.into_iter().chain(normal).collect(),
        calibration: from_calibration.map(|(u, _)| u),
        dimension,
    })
}

/// An instrument's `resolution` or `uncertainty`: a quantity of any dimension.
struct InstrumentQuantitySeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for InstrumentQuantitySeed<'_> {
    type Value = Option<(f64, Dimension)>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for InstrumentQuantitySeed<'_> {
    type Value = (f64, Dimension);

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a quantity with its unit, like \"0.0001 in\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        read_instrument_quantity(v)
            .map(|(value, d, _)| (value, d))
            .map_err(|e| self.cx.refuse(&self.path, e))
    }
}

/// A coverage factor, a plain number above zero.
struct CoverageSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for CoverageSeed<'_> {
    type Value = Option<f64>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<f64>, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for CoverageSeed<'_> {
    type Value = f64;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a coverage factor such as 2")
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<f64, E> {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(self
                .cx
                .refuse(&self.path, LoadError::BadCoverage(CoverageAt::Key)))
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
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for ComponentsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_map(self))
            .map(|_| ())
    }
}

impl<'de> Visitor<'de> for ComponentsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from component names to their measurements")
    }

    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        Ok(())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let cx = self.cx;
        let mut names: Vec<&str> = cx
            .rulebook
            .measurements
            .iter()
            .filter_map(|m| m.name.split_once('.').map(|(c, _)| c))
            .collect();
        names.dedup();
        let components = Components(names);
        let mut seen = Vec::new();
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &components,
            seen: &mut seen,
            kind: KeyKind::Component,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let component = components.0[at];
            map.next_value_seed(MeasurementsSeed {
                cx,
                path: self.path.key(component),
                component: Some(component),
            })?;
        }
        Ok(())
    }
}

/// A mapping from measurement names (after the component's prefix) to their values.
struct MeasurementsSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    component: Option<&'a str>,
}

impl<'de> DeserializeSeed<'de> for MeasurementsSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_map(self))
            .map(|_| ())
    }
}

impl<'de> Visitor<'de> for MeasurementsSeed<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping from measurement names to values")
    }

    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        Ok(())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        let cx = self.cx;
        let keys = MeasurementKeys {
            rulebook: cx.rulebook,
            component: self.component,
        };
        let place = if self.component.is_none() {
            Place::Measurements
        } else {
            Place::Components
        };
        loop {
            let mut declared = std::mem::take(&mut cx.state.borrow_mut().declared);
            let key = map.next_key_seed(KeySeed {
                cx,
                parent: &self.path,
                keys: &keys,
                seen: &mut declared,
                kind: KeyKind::Measurement,
            });
            cx.state.borrow_mut().declared = declared;
            let Some(key) = key? else { break };
            let found = key.and_then(|i| cx.rulebook.measurements.get(i).map(|m| (i, m)));
            let Some((index, measurement)) = found else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let short = keys.short(&measurement.name).unwrap_or(&measurement.name);
            map.next_value_seed(ValueSeed {
                cx,
                path: self.path.key(short),
                measurement,
                index,
                place,
            })?;
        }
        Ok(())
    }
}

/// One measurement's value, in any of the forms a declaration may write it.
struct ValueSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
    index: usize,
    place: Place,
}

impl<'de> DeserializeSeed<'de> for ValueSeed<'_> {
    type Value = ();

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
            .map(|_| ())
    }
}

impl ValueSeed<'_> {
    fn is_text(&self) -> bool {
        self.measurement.kind == ValueKind::Text
    }

    fn dimension(&self) -> Dimension {
        match self.measurement.kind {
            ValueKind::Number(d) => d,
            ValueKind::Text => Dimension::NONE,
        }
    }

    fn refuse<E: de::Error>(&self, error: LoadError) -> E {
        self.cx.refuse(&self.path, error)
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
    ) -> Result<Vec<u32>, E> {
        if self.measurement.per_cylinder {
            return Err(self.refuse(LoadError::NeedsList {
                measurement: self.measurement.name.clone(),
            }));
        }
        if self.measurement.name == "cylinders" {
            self.note_cylinders::<E>(reading.value.round() as usize)?;
        }
        let mut state = self.cx.state.borrow_mut();
        let id = push_input(&mut state.declaration, self.name(None), reading, source)
            .ok_or_else(|| self.refuse(LoadError::TooManyValues))?;
        self.supply(&mut state, Supplied::Single(id));
        Ok(vec![id])
    }

    /// Supplies a text value with the white space around it removed (a slip of the keyboard
    /// no tag carries), keeping the text as written when that changed it.
    fn text<E: de::Error>(&self, text: String) -> Result<(), E> {
        let trimmed = text.trim();
        let written = (trimmed.len() != text.len()).then(|| text.clone());
        let value = trimmed.to_string();
        let mut state = self.cx.state.borrow_mut();
        self.supply(&mut state, Supplied::Text(value, self.place, written));
        Ok(())
    }

    /// Checks a cylinder count against what other per-cylinder lists said.
    fn note_cylinders<E: de::Error>(&self, count: usize) -> Result<(), E> {
        let mut state = self.cx.state.borrow_mut();
        match &state.cylinders {
            Some((n, from)) if *n != count => Err(self.refuse(LoadError::CylinderCount {
                count,
                earlier: *n,
                from: from.clone(),
            })),
            Some(_) => Ok(()),
            None => {
                state.cylinders = Some((count, self.path.to_string()));
                Ok(())
            }
        }
    }

    fn per_cylinder<E: de::Error>(
        &self,
        readings: Vec<(Reading, Option<UncertaintySource>)>,
    ) -> Result<Vec<u32>, E> {
        if !self.measurement.per_cylinder {
            return Err(self.refuse(LoadError::NotAList {
                measurement: self.measurement.name.clone(),
                text: false,
            }));
        }
        if readings.is_empty() {
            return Err(self.refuse(LoadError::EmptyList));
        }
        self.note_cylinders::<E>(readings.len())?;
        let mut state = self.cx.state.borrow_mut();
        let ids: Vec<u32> = readings
            .into_iter()
            .enumerate()
            .map(|(i, (r, source))| {
                push_input(&mut state.declaration, self.name(Some(i + 1)), r, source)
                    .ok_or_else(|| self.refuse(LoadError::TooManyValues))
            })
            .collect::<Result<_, E>>()?;
        self.supply(&mut state, Supplied::PerCylinder(ids.clone()));
        Ok(ids)
    }

    fn element(&self, path: DeclPath) -> ElementSeed<'_> {
        ElementSeed {
            cx: self.cx,
            path,
            measurement: self.measurement,
        }
    }
}

/// Adds one measured value to the declaration's inputs and gives its id; `None` when the
/// ids have run out (more values than an 8 MiB file can hold, but never a wrapped id).
fn push_input(
    d: &mut Declaration,
    name: InputName,
    r: Reading,
    source: Option<UncertaintySource>,
) -> Option<InputId> {
    let (u, distribution, source) = match (r.stated, source) {
        (Some((expanded, k)), _) => (
            expanded / k,
            Distribution::Normal,
            UncertaintySource::Stated { k },
        ),
        (
            None,
            Some(UncertaintySource::Repeated {
                count,
                spread,
                instrument,
            }),
        ) => (
            spread / (count as f64).sqrt(),
            Distribution::StudentT {
                degrees_of_freedom: count.saturating_sub(1) as f64,
            },
            UncertaintySource::Repeated {
                count,
                spread,
                instrument,
            },
        ),
        (None, Some(s)) => (0.0, Distribution::Normal, s),
        (None, None) => (0.0, Distribution::Normal, UncertaintySource::None),
    };
    d.inputs.push(Input {
        name,
        value: r.value,
        standard_uncertainty: u,
        components: if u > 0.0 {
            vec![Component {
                standard_uncertainty: u,
                distribution,
            }]
        } else {
            Vec::new()
        },
        unit: r.unit,
        written: Some(r.written),
        source,
    });
    InputId::try_from(d.inputs.len() - 1).ok()
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
        let reading = read_text(v, self.measurement).map_err(|e| self.refuse(e))?;
        self.single::<E>(reading, None).map(|_| ())
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<(), E> {
        if self.is_text() {
            return self.text(v.to_string());
        }
        let reading = read_number(v, self.measurement).map_err(|e| self.refuse(e))?;
        self.single::<E>(reading, None).map(|_| ())
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
            return Err(self.refuse(LoadError::NotAList {
                measurement: self.measurement.name.clone(),
                text: true,
            }));
        }
        let before = self.cx.collector.skipped();
        let mut readings = Vec::new();
        while let Some(r) =
            seq.next_element_seed(self.element(self.path.element(readings.len())))?
        {
            readings.push(r);
        }
        if self.cx.collector.skipped() > before {
            return Ok(());
        }
        let readings = readings.into_iter().flatten().map(|r| (r, None)).collect();
        self.per_cylinder::<A::Error>(readings).map(|_| ())
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        const KEYS: &[&str] = &["value", "values", "readings", "instrument", "gauges"];
        let cx = self.cx;
        let before = cx.collector.skipped();
        let mut seen = Vec::new();
        let mut given = Given::default();
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(KEYS),
            seen: &mut seen,
            kind: KeyKind::Value,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            match KEYS[at] {
                "value" => {
                    let path = self.path.wrapper("value");
                    given.single = map.next_value_seed(self.element(path))?;
                }
                "values" => {
                    given.list = map.next_value_seed(ListSeed {
                        cx,
                        path: self.path.wrapper("values"),
                        measurement: self.measurement,
                    })?;
                }
                "readings" => {
                    given.repeated = map.next_value_seed(RepeatedSeed {
                        cx,
                        path: self.path.wrapper("readings"),
                        measurement: self.measurement,
                        per_cylinder: self.measurement.per_cylinder,
                    })?;
                }
                "gauges" => {
                    given.gauges = map.next_value_seed(GaugesSeed {
                        cx,
                        path: self.path.key("gauges"),
                        measurement: self.measurement,
                    })?;
                }
                _ => {
                    let path = self.path.key("instrument");
                    given.instrument = map
                        .next_value_seed(InstrumentNameSeed {
                            cx,
                            path: path.clone(),
                            measurement: self.measurement,
                        })?
                        .map(|name| (name, path));
                }
            }
        }
        if cx.collector.skipped() > before {
            return Ok(());
        }
        self.finish_map(given)
    }
}

/// What a measurement's mapping gave.
#[derive(Default)]
struct Given {
    single: Option<Reading>,
    list: Option<Vec<Reading>>,
    /// `readings:`: the mean of each set of repeated readings, one set per cylinder where the
    /// measurement is per cylinder.
    repeated: Option<Vec<(Reading, TypeA)>>,
    instrument: Option<(String, DeclPath)>,
    /// `gauges:`: go/no-go results in place of a measured value.
    gauges: Option<Vec<GaugeResult>>,
}

impl Given {
    /// The first two of `value`, `values` and `readings` given, when more than one is.
    fn two_forms(&self) -> Option<(&'static str, &'static str)> {
        let given: Vec<&'static str> = [
            (self.single.is_some(), "value"),
            (self.list.is_some(), "values"),
            (self.repeated.is_some(), "readings"),
        ]
        .iter()
        .filter(|(is, _)| *is)
        .map(|(_, name)| *name)
        .collect();
        match given.as_slice() {
            [first, second, ..] => Some((first, second)),
            _ => None,
        }
    }
}

impl ValueSeed<'_> {
    fn finish_map<E: de::Error>(self, mut given: Given) -> Result<(), E> {
        if let Some(results) = given.gauges.take() {
            return self.gauged(results, &given);
        }
        let stated = given
            .single
            .iter()
            .chain(given.list.iter().flatten())
            .any(|r| r.stated.is_some());
        if stated && given.instrument.is_some() {
            return Err(self.refuse(LoadError::TwoUncertainties));
        }
        if let Some((first, second)) = given.two_forms() {
            return Err(self.refuse(LoadError::ValueAndValues { first, second }));
        }
        let instrument = given.instrument.as_ref().map(|(name, _)| name.clone());
        let source = instrument.clone().map(UncertaintySource::Instrument);
        let ids = match (given.single, given.list, given.repeated) {
            (Some(r), _, _) => self.single::<E>(r, source)?,
            (None, Some(rs), _) => {
                self.per_cylinder::<E>(rs.into_iter().map(|r| (r, source.clone())).collect())?
            }
            (None, None, Some(sets)) => self.repeated::<E>(sets, instrument)?,
            (None, None, None) => return Ok(()),
        };
        if let Some((instrument, path)) = given.instrument {
            self.cx.state.borrow_mut().uses.push(InstrumentUse {
                instrument,
                inputs: ids,
                measurement: self.measurement.name.clone(),
                dimension: self.dimension(),
                path,
            });
        }
        Ok(())
    }
}

impl ValueSeed<'_> {
    /// Records gauge results for the measurement, which then has no measured value: a
    /// mapping that also gives one is refused.
    fn gauged<E: de::Error>(&self, results: Vec<GaugeResult>, given: &Given) -> Result<(), E> {
        let beside = [
            (given.single.is_some(), "value"),
            (given.list.is_some(), "values"),
            (given.repeated.is_some(), "readings"),
            (given.instrument.is_some(), "instrument"),
        ]
        .into_iter()
        .find_map(|(is, name)| is.then_some(name));
        if let Some(beside) = beside {
            return Err(self.refuse(LoadError::GaugedAndMeasured { beside }));
        }
        let mut state = self.cx.state.borrow_mut();
        state.declaration.gauged.insert(
            self.index,
            Gauged {
                results,
                place: self.place,
            },
        );
        Ok(())
    }
}

impl ValueSeed<'_> {
    /// Inputs for repeated readings: their mean with its Type A uncertainty, one per cylinder
    /// where the measurement is per cylinder.
    fn repeated<E: de::Error>(
        &self,
        sets: Vec<(Reading, TypeA)>,
        instrument: Option<String>,
    ) -> Result<Vec<u32>, E> {
        if instrument.is_none()
            && let Some((_, a)) = sets.iter().find(|(_, a)| a.has_no_spread())
        {
            return Err(self.refuse(LoadError::IdenticalReadings { count: a.count }));
        }
        let with_source = |(reading, a): (Reading, TypeA)| {
            let source = UncertaintySource::Repeated {
                count: a.count,
                spread: a.spread,
                instrument: instrument.clone(),
            };
            (reading, Some(source))
        };
        let mut sets: Vec<_> = sets.into_iter().map(with_source).collect();
        if self.measurement.per_cylinder {
            return self.per_cylinder::<E>(sets);
        }
        match sets.pop() {
            Some((reading, source)) if sets.is_empty() => self.single::<E>(reading, source),
            _ => Err(self.refuse(LoadError::NeedsList {
                measurement: self.measurement.name.clone(),
            })),
        }
    }
}

/// `readings:` — repeated readings of one quantity (a list of at least two values), or for a
/// per-cylinder measurement one such list per cylinder; each list becomes its mean.
struct RepeatedSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
    /// Whether this is the outer list of a per-cylinder measurement, whose elements are
    /// lists of readings.
    per_cylinder: bool,
}

impl<'de> DeserializeSeed<'de> for RepeatedSeed<'_> {
    type Value = Option<Vec<(Reading, TypeA)>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_seq(self))
    }
}

impl<'de> Visitor<'de> for RepeatedSeed<'_> {
    type Value = Vec<(Reading, TypeA)>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        if self.per_cylinder {
            f.write_str("a list with one list of repeated readings per cylinder")
        } else {
            f.write_str("a list of repeated readings, like [\"72.1 cc\", \"72.4 cc\"]")
        }
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Self::Value, A::Error> {
        let before = self.cx.collector.skipped();
        if self.per_cylinder {
            let mut sets = Vec::new();
            let mut count = 0;
            while let Some(set) = seq.next_element_seed(RepeatedSeed {
                cx: self.cx,
                path: self.path.element(count),
                measurement: self.measurement,
                per_cylinder: false,
            })? {
                count += 1;
                sets.extend(set.into_iter().flatten());
            }
            return Ok(sets);
        }
        let mut readings = Vec::new();
        let mut count = 0;
        while let Some(r) = seq.next_element_seed(ElementSeed {
            cx: self.cx,
            path: self.path.element(count),
            measurement: self.measurement,
        })? {
            count += 1;
            readings.extend(r);
        }
        if self.cx.collector.skipped() > before {
            return Ok(Vec::new());
        }
        let set = combine(&readings).map_err(|e| self.cx.refuse(&self.path, e))?;
        Ok(vec![set])
    }
}

/// One number of a measurement: a string literal or a plain YAML number.
struct ElementSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for ElementSeed<'_> {
    type Value = Option<Reading>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<Reading>, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for ElementSeed<'_> {
    type Value = Reading;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a value with its unit, like \"4.031 in\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Reading, E> {
        read_text(v, self.measurement).map_err(|e| self.cx.refuse(&self.path, e))
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Reading, E> {
        read_number(v, self.measurement).map_err(|e| self.cx.refuse(&self.path, e))
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Reading, E> {
        self.visit_f64(v as f64)
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Reading, E> {
        self.visit_f64(v as f64)
    }
}

/// `values:` — a list of numbers; elements skipped are left out (and counted as skipped).
struct ListSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for ListSeed<'_> {
    type Value = Option<Vec<Reading>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_seq(self))
    }
}

impl<'de> Visitor<'de> for ListSeed<'_> {
    type Value = Vec<Reading>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a list of values, one per cylinder")
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Vec<Reading>, A::Error> {
        let mut readings = Vec::new();
        let mut count = 0;
        while let Some(r) = seq.next_element_seed(ElementSeed {
            cx: self.cx,
            path: self.path.element(count),
            measurement: self.measurement,
        })? {
            count += 1;
            readings.extend(r);
        }
        Ok(readings)
    }
}

/// `instrument:` — the name of an instrument; checked now when the instruments came first,
/// else once the whole file is read (and then raised here on the next reading).
struct InstrumentNameSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for InstrumentNameSeed<'_> {
    type Value = Option<String>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Option<String>, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_str(self))
    }
}

impl Visitor<'_> for InstrumentNameSeed<'_> {
    type Value = String;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("the name of an instrument")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<String, E> {
        let collector = self.cx.collector;
        if let Some(error) = collector.deferred(&self.path) {
            return Err(self.cx.refuse(&self.path, error));
        }
        let state = self.cx.state.borrow();
        if state.instruments_unusable || state.broken_instruments.contains(v) {
            collector.note_skipped(); // already reported; this measurement is left out
            return Ok(v.to_string());
        }
        if !state.instruments_read {
            return Ok(v.to_string()); // instruments come later in the file; checked at the end
        }
        let want = match self.measurement.kind {
            ValueKind::Number(d) => d,
            ValueKind::Text => Dimension::NONE,
        };
        match instrument_problem(&state.instruments, v, &self.measurement.name, want) {
            Some(error) => Err(self.cx.refuse(&self.path, error)),
            None => Ok(v.to_string()),
        }
    }
}

/// What is wrong with naming instrument `name` for a measurement of dimension `want`, if
/// anything.
pub fn instrument_problem(
    instruments: &BTreeMap<String, Instrument>,
    name: &str,
    measurement: &str,
    want: Dimension,
) -> Option<LoadError> {
    match instruments.get(name) {
        Some(i) if i.dimension != want => Some(LoadError::InstrumentWrongDimension {
            instrument: name.to_string(),
            measures: i.dimension,
            measurement: measurement.to_string(),
            wants: want,
        }),
        Some(_) => None,
        None => Some(LoadError::UnknownInstrument {
            name: name.to_string(),
            suggestion: closest(name, instruments.keys().map(String::as_str)).map(str::to_string),
        }),
    }
}
