//! Why an engine was inspected, what the inspection covered, and the seals on it: the
//! `inspection:` block of a declaration, once loaded.
//!
//! The data types live here so that the report, the scope of a check and the season log read
//! the same facts; the seeds that read the block from YAML, called by the declaration reader
//! (`seed.rs`) at the top-level key `inspection`, follow them. Each refusal is a load error at
//! its node (D32–D35), like every other part of a declaration.

use std::fmt;

use serde::de::{self, DeserializeSeed, Deserializer, IgnoredAny, MapAccess, SeqAccess, Visitor};

use super::error::{KeyKind, LoadError, REASON_WORDS, ScopeFault, SealFault};
use super::path::DeclPath;
use super::seed::{Context, Fixed, KeySeed, TextSeed};
use crate::suggest::closest;

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

impl Reason {
    /// The reason as a declaration writes it (`other` as its own text).
    pub fn words(&self) -> &str {
        match self {
            Reason::AfterFeature => "after-feature",
            Reason::Protest => "protest",
            Reason::Claim => "claim",
            Reason::RandomDraw => "random-draw",
            Reason::Other(text) => text,
        }
    }
}

/// Whether `section` lies in `scope`: it is one of its entries or under one (`6.2.1` is in
/// `6` and in `6.2`, but `6.21` is in neither).
pub fn in_scope(scope: &[String], section: &str) -> bool {
    scope.iter().any(|s| {
        section == s
            || section
                .strip_prefix(s.as_str())
                .is_some_and(|rest| rest.starts_with('.'))
    })
}

/// Whether `text` is a section number: whole numbers joined by dots (`5`, `6.2`, `6.2.1`).
pub fn is_section_number(text: &str) -> bool {
    !text.is_empty()
        && text
            .split('.')
            .all(|part| !part.is_empty() && part.bytes().all(|b| b.is_ascii_digit()))
}

/// The keys of `inspection:`.
const INSPECTION_KEYS: &[&str] = &["reason", "reference", "scope", "seals"];
/// The keys of `inspection.seals:`.
const SEALS_KEYS: &[&str] = &["found", "applied"];
/// The keys of one seal.
const SEAL_KEYS: &[&str] = &["number", "at"];

/// Reads `inspection:`; `None` when the node is skipped, an empty block when it is empty.
pub(super) struct InspectionSeed<'a> {
    pub(super) cx: Context<'a>,
    pub(super) path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for InspectionSeed<'_> {
    type Value = Option<Option<Inspection>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl<'de> Visitor<'de> for InspectionSeed<'_> {
    type Value = Option<Inspection>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping with `reason`, `reference`, `scope` and `seals`")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(Some(Inspection::default()))
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
        let cx = self.cx;
        let mut seen = Vec::new();
        let mut inspection = Inspection::default();
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(INSPECTION_KEYS),
            seen: &mut seen,
            kind: KeyKind::Inspection,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = self.path.key(INSPECTION_KEYS[at]);
            match INSPECTION_KEYS[at] {
                "reason" => inspection.reason = map.next_value_seed(ReasonSeed { cx, path })?,
                "reference" => {
                    inspection.reference = map.next_value_seed(TextSeed { cx, path })?.flatten()
                }
                "scope" => inspection.scope = map.next_value_seed(ScopeSeed { cx, path })?,
                _ => {
                    if let Some((found, applied)) = map.next_value_seed(SealsSeed { cx, path })? {
                        inspection.seals_found = found;
                        inspection.seals_applied = applied;
                    }
                }
            }
        }
        let unreferenced = match inspection.reason {
            Some(Reason::Protest) => Some("protest"),
            Some(Reason::Claim) => Some("claim"),
            _ => None,
        };
        if let (Some(reason), None) = (unreferenced, &inspection.reference) {
            let path = self.path.key("reason");
            return Err(cx.refuse(&path, LoadError::NoReference { reason }));
        }
        Ok(Some(inspection))
    }
}

/// `reason:` — one of [`REASON_WORDS`], or `{other: "why"}`.
struct ReasonSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for ReasonSeed<'_> {
    type Value = Option<Reason>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        let read = self
            .cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))?;
        Ok(read.flatten())
    }
}

impl<'de> Visitor<'de> for ReasonSeed<'_> {
    type Value = Option<Reason>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a reason like `after-feature`, or `{other: \"why\"}`")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(None)
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        let reason = match v {
            "after-feature" => Reason::AfterFeature,
            "protest" => Reason::Protest,
            "claim" => Reason::Claim,
            "random-draw" => Reason::RandomDraw,
            _ => {
                let error = LoadError::UnknownReason {
                    written: v.to_string(),
                    suggestion: closest(v, REASON_WORDS.iter().copied().chain(["other"])),
                };
                return Err(self.cx.refuse(&self.path, error));
            }
        };
        Ok(Some(reason))
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
        const KEYS: &[&str] = &["other"];
        let cx = self.cx;
        let (mut seen, mut text) = (Vec::new(), None);
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(KEYS),
            seen: &mut seen,
            kind: KeyKind::Inspection,
        })? {
            let path = self.path.key("other");
            match key {
                Some(_) => text = map.next_value_seed(TextSeed { cx, path })?.flatten(),
                None => {
                    map.next_value::<IgnoredAny>()?;
                }
            }
        }
        match text {
            Some(text) => Ok(Some(Reason::Other(text))),
            None => Err(cx.refuse(
                &self.path,
                LoadError::UnknownReason {
                    written: "other".to_string(),
                    suggestion: None,
                },
            )),
        }
    }
}

/// `scope:` — a list of section numbers.
struct ScopeSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for ScopeSeed<'_> {
    type Value = Option<Vec<String>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        let read = self
            .cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))?;
        Ok(read.flatten())
    }
}

impl<'de> Visitor<'de> for ScopeSeed<'_> {
    type Value = Option<Vec<String>>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a list of section numbers, like `[\"5\", \"6.2\"]`")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(None)
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Self::Value, A::Error> {
        let mut sections: Vec<String> = Vec::new();
        let mut index = 0;
        while let Some(section) = seq.next_element_seed(SectionSeed {
            cx: self.cx,
            path: self.path.element(index),
            earlier: &sections,
        })? {
            sections.extend(section);
            index += 1;
        }
        if index == 0 {
            return Err(self
                .cx
                .refuse(&self.path, LoadError::BadScope(ScopeFault::Empty)));
        }
        Ok(Some(sections))
    }
}

/// One section number of a scope: text, or a whole YAML number; not one of `earlier`.
struct SectionSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    earlier: &'a [String],
}

impl SectionSeed<'_> {
    fn once<E: de::Error>(&self, section: String) -> Result<String, E> {
        if self.earlier.contains(&section) {
            let error = LoadError::BadScope(ScopeFault::Twice { section });
            return Err(self.cx.refuse(&self.path, error));
        }
        Ok(section)
    }
}

impl<'de> DeserializeSeed<'de> for SectionSeed<'_> {
    type Value = Option<String>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl Visitor<'_> for SectionSeed<'_> {
    type Value = String;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a section number like \"6.2\"")
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<String, E> {
        self.once(v.to_string())
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<String, E> {
        self.visit_str(&v.to_string())
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<String, E> {
        let error = LoadError::BadScope(ScopeFault::Decimal {
            read: v.to_string(),
        });
        Err(self.cx.refuse(&self.path, error))
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<String, E> {
        let written = v.trim();
        if is_section_number(written) {
            return self.once(written.to_string());
        }
        let error = LoadError::BadScope(ScopeFault::NotASection {
            written: v.to_string(),
        });
        Err(self.cx.refuse(&self.path, error))
    }
}

/// `seals:` — `found` and `applied`, each a list of seals.
struct SealsSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for SealsSeed<'_> {
    type Value = Option<(Vec<Seal>, Vec<Seal>)>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        let read = self
            .cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))?;
        Ok(read.flatten())
    }
}

impl<'de> Visitor<'de> for SealsSeed<'_> {
    type Value = Option<(Vec<Seal>, Vec<Seal>)>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a mapping with `found` and `applied`, each a list of seals")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(None)
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
        let cx = self.cx;
        let mut seen = Vec::new();
        let (mut found, mut applied) = (Vec::new(), Vec::new());
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(SEALS_KEYS),
            seen: &mut seen,
            kind: KeyKind::Inspection,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = self.path.key(SEALS_KEYS[at]);
            let list = map
                .next_value_seed(SealListSeed { cx, path })?
                .unwrap_or_default();
            match at {
                0 => found = list,
                _ => applied = list,
            }
        }
        Ok(Some((found, applied)))
    }
}

/// A list of seals, each number once.
struct SealListSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
}

impl<'de> DeserializeSeed<'de> for SealListSeed<'_> {
    type Value = Option<Vec<Seal>>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        let read = self
            .cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))?;
        Ok(read.flatten())
    }
}

impl<'de> Visitor<'de> for SealListSeed<'_> {
    type Value = Option<Vec<Seal>>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a list of seals, like `[{number: \"S-04417\", at: \"intake\"}]`")
    }

    fn visit_unit<E: de::Error>(self) -> Result<Self::Value, E> {
        Ok(None)
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Self::Value, A::Error> {
        let mut seals: Vec<Seal> = Vec::new();
        let mut index = 0;
        while let Some(seal) = seq.next_element_seed(SealSeed {
            cx: self.cx,
            path: self.path.element(index),
            earlier: &seals,
        })? {
            seals.extend(seal);
            index += 1;
        }
        Ok(Some(seals))
    }
}

/// One seal: its number alone, or `{number, at}`; a number not among `earlier`.
struct SealSeed<'a> {
    cx: Context<'a>,
    path: DeclPath,
    earlier: &'a [Seal],
}

impl<'de> DeserializeSeed<'de> for SealSeed<'_> {
    type Value = Option<Seal>;

    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Self::Value, D::Error> {
        let path = self.path.clone();
        self.cx
            .collector
            .guard(&path, d, |d| d.deserialize_any(self))
    }
}

impl<'de> Visitor<'de> for SealSeed<'_> {
    type Value = Seal;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a seal: its number, or `{number: \"S-04417\", at: \"where\"}`")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Seal, E> {
        self.numbered(Some(v.to_string()), None)
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Seal, E> {
        self.numbered(Some(v.to_string()), None)
    }

    fn visit_unit<E: de::Error>(self) -> Result<Seal, E> {
        self.numbered(None, None)
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Seal, A::Error> {
        let cx = self.cx;
        let mut seen = Vec::new();
        let (mut number, mut place) = (None, None);
        while let Some(key) = map.next_key_seed(KeySeed {
            cx,
            parent: &self.path,
            keys: &Fixed(SEAL_KEYS),
            seen: &mut seen,
            kind: KeyKind::Seal,
        })? {
            let Some(at) = key else {
                map.next_value::<IgnoredAny>()?;
                continue;
            };
            let path = self.path.key(SEAL_KEYS[at]);
            let text = map.next_value_seed(TextSeed { cx, path })?.flatten();
            match at {
                0 => number = text,
                _ => place = text,
            }
        }
        self.numbered(number, place)
    }
}

impl SealSeed<'_> {
    fn numbered<E: de::Error>(
        &self,
        number: Option<String>,
        place: Option<String>,
    ) -> Result<Seal, E> {
        match number
            .map(|n| n.trim().to_string())
            .filter(|n| !n.is_empty())
        {
            Some(number) if self.earlier.iter().any(|s| s.number == number) => Err(self
                .cx
                .refuse(&self.path, LoadError::BadSeal(SealFault::Twice { number }))),
            Some(number) => Ok(Seal { number, place }),
            None => Err(self
                .cx
                .refuse(&self.path, LoadError::BadSeal(SealFault::NoNumber))),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_section_is_in_the_scope_of_itself_and_its_parents_only() {
        let scope = vec!["5".to_string(), "6.2".to_string()];
        assert!(in_scope(&scope, "5"));
        assert!(in_scope(&scope, "5.1.3"));
        assert!(in_scope(&scope, "6.2"));
        assert!(in_scope(&scope, "6.2.1"));
        assert!(!in_scope(&scope, "6"));
        assert!(!in_scope(&scope, "6.21"));
        assert!(!in_scope(&scope, "55"));
    }

    #[test]
    fn section_numbers_are_whole_numbers_joined_by_dots() {
        assert!(is_section_number("6.2.1"));
        assert!(!is_section_number("6."));
        assert!(!is_section_number("heads"));
        assert!(!is_section_number(""));
    }
}
