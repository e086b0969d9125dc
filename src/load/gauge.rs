//! Go/no-go gauge results: a measurement recorded not as a number but as whether a gauge of a
//! stated size, with its own expanded uncertainty, went into (a plug) or over (a ring) the
//! feature. Each result is a one-sided bound on the measurand; this file reads the `gauges:`
//! list of a measurement and refuses results no single size could give.
//!
//! ```yaml
//! throttle_bore:
//!   gauges:
//!     - {plug: "TV-G-0411", size: "1.6850 in ± 0.0002 in (k = 2)", result: entered}
//!     - {plug: "TV-G-0413", size: "1.6870 in ± 0.0002 in (k = 2)", result: did not enter}
//! ```

use std::fmt;

use serde::de::{self, DeserializeSeed, Deserializer, IgnoredAny, MapAccess, SeqAccess, Visitor};

use super::declaration::Place;
use super::error::{GaugeFault, KeyKind, LoadError};
use super::path::DeclPath;
use super::reading::read_text;
use super::seed::{Context, Fixed, KeySeed, TextSeed};
use crate::check::model::{Measurement, ValueKind};

/// What kind of gauge: a plug goes into a hole, a ring goes over a shaft.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum GaugeKind {
    /// A plug gauge, for a bore: it enters only a bore at least its size.
    Plug,
    /// A ring gauge, for a diameter: it goes over only a diameter at most its size.
    Ring,
}

impl GaugeKind {
    /// The key a declaration writes it with, and the word a report uses.
    pub fn words(self) -> &'static str {
        match self {
            GaugeKind::Plug => "plug",
            GaugeKind::Ring => "ring",
        }
    }

    /// The result as a declaration writes it and a report says it: `entered`, `did not
    /// enter` for a plug; `went over`, `did not go over` for a ring.
    pub fn result_words(self, went: bool) -> &'static str {
        match (self, went) {
            (GaugeKind::Plug, true) => "entered",
            (GaugeKind::Plug, false) => "did not enter",
            (GaugeKind::Ring, true) => "went over",
            (GaugeKind::Ring, false) => "did not go over",
        }
    }

    /// The results a declaration may write for this kind.
    pub fn results(self) -> [&'static str; 2] {
        [self.result_words(true), self.result_words(false)]
    }
}

/// One gauge tried on the feature.
#[derive(Clone, Debug, PartialEq)]
pub struct GaugeResult {
    /// Plug or ring.
    pub kind: GaugeKind,
    /// The gauge's own tag or serial number, as written (`TV-G-0412`).
    pub tag: String,
    /// Its size in SI units, from its calibration.
    pub size: f64,
    /// The expanded uncertainty of its size, U, in SI units.
    pub expanded: f64,
    /// The coverage factor U is stated at.
    pub k: f64,
    /// The unit the size was written in.
    pub unit: Option<&'static str>,
    /// The size as written, with its `± U`.
    pub written: String,
    /// Whether it went (a plug entered, a ring went over).
    pub went: bool,
    /// Where it was written: `components.carburetor.throttle_bore.gauges[2]`.
    pub origin: String,
}

/// A one-sided bound on a measurand: `value ≥ at` (or `> at` when strict) when `below` is
/// true, else `value ≤ at` (or `< at`).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Bound {
    /// True for a bound from below (the value is at least `at`).
    pub below: bool,
    /// Whether the value cannot equal `at`.
    pub strict: bool,
    /// Where the bound lies, SI units.
    pub at: f64,
}

impl GaugeResult {
    /// Whether the result bounds the measurand from below: a plug that entered (the bore is at
    /// least the plug) or a ring that did not go over (the diameter is more than the ring).
    pub fn bounds_below(&self) -> bool {
        match self.kind {
            GaugeKind::Plug => self.went,
            GaugeKind::Ring => !self.went,
        }
    }

    /// Whether the bound excludes the gauge's size itself: a plug enters a bore of its own
    /// size, and a ring goes over a diameter of its own size (a fit with no clearance), so
    /// only the results that did not go are strict.
    pub fn strict(&self) -> bool {
        !self.went
    }

    /// The bound at the gauge's stated size, as if that size were exact (what simple
    /// acceptance reads).
    pub fn nominal(&self) -> Bound {
        Bound {
            below: self.bounds_below(),
            strict: self.strict(),
            at: self.size,
        }
    }

    /// The bound the result proves whatever the gauge's true size within its expanded
    /// uncertainty: the true size lies in `size ± U` (at the coverage of `k`), so a plug that
    /// entered proves the bore is at least `size − U`, and one that did not enter proves it is
    /// less than `size + U` (ISO 14253-1:2017, from memory: the uncertainty counts against
    /// whoever makes the claim).
    pub fn proven(&self) -> Bound {
        let below = self.bounds_below();
        Bound {
            below,
            strict: self.strict(),
            at: if below {
                self.size - self.expanded
            } else {
                self.size + self.expanded
            },
        }
    }

    /// `plug TV-G-0412`.
    pub fn name(&self) -> String {
        format!("{} {}", self.kind.words(), self.tag)
    }
}

/// A measurement's gauge results, and where they were written.
#[derive(Clone, Debug, PartialEq)]
pub struct Gauged {
    /// Each gauge tried, in the order written.
    pub results: Vec<GaugeResult>,
    /// Where the measurement was written.
    pub place: Place,
}

impl Gauged {
    /// Every gauge's tag: `plug TV-G-0411, plug TV-G-0413`.
    pub fn names(&self) -> Vec<String> {
        self.results.iter().map(GaugeResult::name).collect()
    }
}

/// The first two results of one measurement that no single size satisfies together, if any:
/// a bound from below at or above a bound from above, each read with its gauge's U counted
/// (a plug that entered proves at least its size − U, one that did not proves less than its
/// size + U). Results that contradict only at the stated sizes are possible — a gauge's true
/// size is known to within its U — and are kept; the rule then decides at most conditionally
/// on them.
pub fn disagreement(results: &[GaugeResult]) -> Option<(&GaugeResult, &GaugeResult)> {
    for low in results.iter().filter(|r| r.bounds_below()) {
        for high in results.iter().filter(|r| !r.bounds_below()) {
            let (a, b) = (low.proven(), high.proven());
            if a.at > b.at || (a.at == b.at && (a.strict || b.strict)) {
                return Some((low, high));
            }
        }
    }
    None
}

/// `gauges:` — a list of gauge results for one measurement.
pub(super) struct GaugesSeed<'a> {
    pub(super) cx: Context<'a>,
    pub(super) path: DeclPath,
    pub(super) measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for GaugesSeed<'_> {
    type Value = Option<Vec<GaugeResult>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_seq(self))
    }
}

impl<'de> Visitor<'de> for GaugesSeed<'_> {
    type Value = Vec<GaugeResult>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a list of gauge results, like [{plug: \"TV-G-0412\", size: \"1.6875 in ± 0.0002 in\", result: entered}]")
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Self::Value, A::Error> {
        let m = self.measurement;
        if m.kind == ValueKind::Text || m.per_cylinder {
            let error = LoadError::CannotGauge {
                measurement: m.name.clone(),
                text: m.kind == ValueKind::Text,
            };
            return Err(self.cx.refuse(&self.path, error));
        }
        let before = self.cx.collector.skipped();
        let mut results = Vec::new();
        let mut count = 0;
        while let Some(r) = seq.next_element_seed(GaugeSeed {
            cx: self.cx,
            path: self.path.element(count),
            measurement: self.measurement,
        })? {
            count += 1;
            results.extend(r.flatten());
        }
        if self.cx.collector.skipped() > before {
            return Ok(Vec::new());
        }
        let refuse = |e| self.cx.refuse(&self.path, e);
        if count == 0 {
            return Err(refuse(LoadError::BadGauge(GaugeFault::Empty)));
        }
        if results.iter().any(|r| r.kind != results[0].kind) {
            return Err(refuse(LoadError::BadGauge(GaugeFault::MixedKinds)));
        }
        if let Some((low, high)) = disagreement(&results) {
            return Err(refuse(LoadError::GaugesDisagree {
                low: format!(
                    "{} {} {}",
                    low.name(),
                    size_text(low),
                    low.kind.result_words(low.went)
                ),
                high: format!(
                    "{} {} {}",
                    high.name(),
                    size_text(high),
                    high.kind.result_words(high.went)
                ),
            }));
        }
        Ok(results)
    }
}

/// The size as written, without its `± U`.
fn size_text(r: &GaugeResult) -> &str {
    r.written
        .split(['±'])
        .next()
        .map_or(r.written.as_str(), |s| s.split("+/-").next().unwrap_or(s))
        .trim()
}

/// One gauge result: `plug` or `ring` with its tag, `size` with its `± U`, `result`.
struct GaugeSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
}

impl<'de> DeserializeSeed<'de> for GaugeSeed<'_> {
    type Value = Option<Option<GaugeResult>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_map(self))
    }
}

/// The keys of one gauge result.
const KEYS: &[&str] = &["plug", "ring", "size", "result"];

impl<'de> Visitor<'de> for GaugeSeed<'_> {
    type Value = Option<GaugeResult>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a gauge result: `plug` or `ring` with the gauge's tag, `size`, `result`")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
        let cx = self.cx;
        let before = cx.collector.skipped();
        let mut seen = Vec::new();
        let mut tags: Vec<(GaugeKind, String)> = Vec::new();
        let (mut size, mut result) = (None, None);
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(KEYS),
            seen: &mut seen,
            kind: KeyKind::Gauge,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = self.path.key(KEYS[at]);
            match KEYS[at] {
                "size" => {
                    size = map.next_value_seed(SizeSeed {
                        cx,
                        path,
                        measurement: self.measurement,
                    })?
                }
                "result" => {
                    let kind = tags.first().map(|(kind, _)| *kind);
                    result = map.next_value_seed(ResultSeed { cx, path, kind })?;
                }
                kind => {
                    let text = map.next_value_seed(TextSeed { cx, path })?.flatten();
                    let kind = if kind == "plug" {
                        GaugeKind::Plug
                    } else {
                        GaugeKind::Ring
                    };
                    tags.push((kind, text.unwrap_or_default().trim().to_string()));
                }
            }
        }
        if cx.collector.skipped() > before {
            return Ok(None);
        }
        let refuse = |fault| cx.refuse(&self.path, LoadError::BadGauge(fault));
        let (kind, tag) = match tags.as_slice() {
            [] => return Err(refuse(GaugeFault::NoKind)),
            [(_, tag)] if tag.is_empty() => return Err(refuse(GaugeFault::NoKind)),
            [(kind, tag)] => (*kind, tag.clone()),
            _ => return Err(refuse(GaugeFault::TwoKinds)),
        };
        let Some((size, expanded, k, unit, written)) = size else {
            return Err(refuse(GaugeFault::NoSize));
        };
        let Some((said, result_path)) = result else {
            return Err(refuse(GaugeFault::NoResult { kind }));
        };
        // a result read before the gauge's kind was known is checked against it now
        let went = went(kind, &said).ok_or_else(|| {
            let fault = GaugeFault::UnknownResult {
                written: said.clone(),
                kind,
            };
            cx.refuse(&result_path, LoadError::BadGauge(fault))
        })?;
        Ok(Some(GaugeResult {
            kind,
            tag,
            size,
            expanded,
            k,
            unit,
            written,
            went,
            origin: self.path.to_string(),
        }))
    }
}

/// Whether `said` says the gauge went, for its kind (white space around it and case ignored);
/// `None` when it is not one of the kind's two results.
fn went(kind: GaugeKind, said: &str) -> Option<bool> {
    let said = said.trim().to_lowercase();
    let words = said.split_whitespace().collect::<Vec<_>>().join(" ");
    kind.results()
        .iter()
        .position(|r| *r == words)
        .map(|at| at == 0)
}

/// A gauge's `result`, checked while it is read against the gauge's kind when that came
/// first (else against both kinds' words, and against its kind once the result is read).
struct ResultSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    kind: Option<GaugeKind>,
}

impl<'de> DeserializeSeed<'de> for ResultSeed<'_> {
    type Value = Option<(String, DeclPath)>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_str(self))
    }
}

impl Visitor<'_> for ResultSeed<'_> {
    type Value = (String, DeclPath);

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str(
            "`entered` or `did not enter` for a plug, `went over` or `did not go over` for a ring",
        )
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        let kinds = match self.kind {
            Some(kind) => vec![kind],
            None => vec![GaugeKind::Plug, GaugeKind::Ring],
        };
        if kinds.iter().any(|k| went(*k, v).is_some()) {
            return Ok((v.to_string(), self.path));
        }
        let fault = GaugeFault::UnknownResult {
            written: v.trim().to_string(),
            kind: kinds[0],
        };
        Err(self.cx.refuse(&self.path, LoadError::BadGauge(fault)))
    }
}

/// A gauge's `size`: a quantity of the measurement's dimension with its stated `± U`.
struct SizeSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    measurement: &'a Measurement,
}

/// A gauge size read: SI value, U, k, unit, as written.
type Size = (f64, f64, f64, Option<&'static str>, String);

impl<'de> DeserializeSeed<'de> for SizeSeed<'_> {
    type Value = Option<Size>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for SizeSeed<'_> {
    type Value = Size;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("the gauge's size with its expanded uncertainty, like \"1.6875 in ± 0.0002 in (k = 2)\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Size, E> {
        let reading = read_text(v, self.measurement).map_err(|e| self.cx.refuse(&self.path, e))?;
        match reading.stated {
            // a gauge's size is never known exactly: a `± 0` is no uncertainty stated
            Some((expanded, k)) if expanded > 0.0 => {
                Ok((reading.value, expanded, k, reading.unit, reading.written))
            }
            _ => Err(self
                .cx
                .refuse(&self.path, LoadError::BadGauge(GaugeFault::NoUncertainty))),
        }
    }

    fn visit_f64<E: de::Error>(self, _: f64) -> Result<Size, E> {
        Err(self
            .cx
            .refuse(&self.path, LoadError::BadGauge(GaugeFault::NoUncertainty)))
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Size, E> {
        self.visit_f64(v as f64)
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Size, E> {
        self.visit_f64(v as f64)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn plug(size: f64, went: bool) -> GaugeResult {
        GaugeResult {
            kind: GaugeKind::Plug,
            tag: format!("P-{size}"),
            size,
            expanded: 0.0002,
            k: 2.0,
            unit: Some("in"),
            written: format!("{size} in ± 0.0002 in"),
            went,
            origin: String::new(),
        }
    }

    #[test]
    fn a_plug_that_entered_bounds_the_bore_from_below_less_its_uncertainty() {
        // a plug enters only a bore at least its own size (common practice, no source); its
        // true size may be U smaller than stated (ISO 14253-1, from memory: the uncertainty
        // counts against whoever makes the claim)
        let p = plug(1.6875, true).proven();
        assert!(p.below && !p.strict);
        assert!((p.at - 1.6873).abs() < 1e-12);
        let q = plug(1.6875, false).proven();
        assert!(!q.below && q.strict);
        assert!((q.at - 1.6877).abs() < 1e-12);
    }

    #[test]
    fn results_no_single_size_gives_disagree() {
        // entered 1.6870 and did not enter 1.6875: the bore lies between, consistent
        assert!(disagreement(&[plug(1.6870, true), plug(1.6875, false)]).is_none());
        // entered the larger plug, not the smaller: no bore does that
        assert!(disagreement(&[plug(1.6875, true), plug(1.6870, false)]).is_some());
        // the same size both entered and did not: possible within the gauges' U (0.0002 in)
        assert!(disagreement(&[plug(1.6875, true), plug(1.6875, false)]).is_none());
        // a larger plug entered and a smaller did not, within U: 1.6850 <= bore < 1.6852
        assert!(disagreement(&[plug(1.6852, true), plug(1.6850, false)]).is_none());
        // ... but not beyond it: 1.6858 - U is above 1.6850 + U
        assert!(disagreement(&[plug(1.6858, true), plug(1.6850, false)]).is_some());
    }

    #[test]
    fn result_words_are_read_whatever_their_case_and_spacing() {
        assert_eq!(went(GaugeKind::Plug, "Entered"), Some(true));
        assert_eq!(went(GaugeKind::Plug, "did  not enter "), Some(false));
        assert_eq!(went(GaugeKind::Plug, "went over"), None);
        assert_eq!(went(GaugeKind::Ring, "did not go over"), Some(false));
    }
}
