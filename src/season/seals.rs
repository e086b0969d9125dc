//! What changed on an engine between two of its inspections: measurements whose written value
//! changed, seals found that do not match the seals applied last time, and measurements of a
//! sealed engine that moved by more than their measurement uncertainty allows.
//!
//! A measurement of a sealed engine "moved" when the two values differ by more than the
//! expanded uncertainty of their difference, `k·√(u₁² + u₂²)` with k = 2 (GUM JCGM 100:2008,
//! 5.1.2 for the combined uncertainty of a difference of uncorrelated values; k = 2 as in
//! 6.3). Car measurements (`car.`, such as weight with fuel) are not under a seal.

use serde_json::Value;

use super::query::Stored;

/// One measurement as a report gives it.
#[derive(Clone, Debug, PartialEq)]
pub struct Measured {
    /// `bore[1]`, `stroke`.
    pub label: String,
    /// As written in the declaration.
    pub written: String,
    /// The value in [`Measured::unit`], when numeric.
    pub value: Option<f64>,
    /// Its standard uncertainty.
    pub standard_uncertainty: f64,
    /// The unit of the value.
    pub unit: Option<String>,
}

/// A seal found on the engine that does not match the one applied at its previous inspection.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SealMismatch {
    /// Where, when stated.
    pub place: Option<String>,
    /// The number applied last time, if a seal was applied there.
    pub applied: Option<String>,
    /// The number found now, if any was.
    pub found: Option<String>,
}

/// What changed from one inspection of an engine to the next.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Changes {
    /// Measurements whose written value changed: label, before, after.
    pub changed: Vec<(String, String, String)>,
    /// Seals that do not match.
    pub seal_mismatches: Vec<SealMismatch>,
    /// Measurements of an engine sealed at the previous inspection that moved beyond their
    /// uncertainty: label, before, after.
    pub sealed_moved: Vec<(String, String, String)>,
}

impl Changes {
    /// Whether anything calls for an inspector's attention (a seal or a sealed measurement).
    pub fn flagged(&self) -> bool {
        !self.seal_mismatches.is_empty() || !self.sealed_moved.is_empty()
    }
}

/// Every measurement in a stored report, in order.
pub fn measurements(report: &str) -> Vec<Measured> {
    let doc: Value = serde_json::from_str(report).unwrap_or(Value::Null);
    let engine = doc.get("engines").and_then(|e| e.get(0)).unwrap_or(&doc);
    let inputs = engine.get("inputs").and_then(Value::as_array);
    inputs
        .into_iter()
        .flatten()
        .filter(|i| {
            i.get("origin")
                .and_then(Value::as_str)
                .is_some_and(|o| !o.starts_with("rulebook"))
        })
        .filter_map(|i| {
            Some(Measured {
                label: i.get("label")?.as_str()?.to_string(),
                written: i
                    .get("written")
                    .and_then(Value::as_str)
                    .map(str::to_string)
                    .or_else(|| i.get("value").map(Value::to_string))?,
                value: i.get("value").and_then(Value::as_f64),
                standard_uncertainty: i
                    .get("standard_uncertainty")
                    .and_then(Value::as_f64)
                    .unwrap_or(0.0),
                unit: i.get("unit").and_then(Value::as_str).map(str::to_string),
            })
        })
        .collect()
}

/// The seals of a stored JSON list: number and place.
pub fn seals(json: &str) -> Vec<(String, Option<String>)> {
    let list: Value = serde_json::from_str(json).unwrap_or(Value::Null);
    list.as_array()
        .into_iter()
        .flatten()
        .filter_map(|s| {
            let number = s.get("number")?.as_str()?.to_string();
            let place = s.get("place").and_then(Value::as_str).map(str::to_string);
            Some((number, place))
        })
        .collect()
}

/// What changed from `before` to `after`, two inspections of one engine.
pub fn compare(before: &Stored, after: &Stored) -> Changes {
    let old = measurements(&before.entry.report);
    let new = measurements(&after.entry.report);
    let applied = seals(&before.entry.seals_applied);
    let found = seals(&after.entry.seals_found);
    let mut changes = Changes {
        seal_mismatches: mismatches(&applied, &found),
        ..Changes::default()
    };
    for n in &new {
        let Some(o) = old.iter().find(|o| o.label == n.label) else {
            continue;
        };
        if o.written != n.written {
            changes
                .changed
                .push((n.label.clone(), o.written.clone(), n.written.clone()));
        }
        if !applied.is_empty() && !n.label.starts_with("car.") && moved(o, n) {
            changes
                .sealed_moved
                .push((n.label.clone(), o.written.clone(), n.written.clone()));
        }
    }
    changes
}

/// Whether two values differ by more than k = 2 times the combined standard uncertainty of
/// their difference.
pub fn moved(a: &Measured, b: &Measured) -> bool {
    let (Some(x), Some(y)) = (a.value, b.value) else {
        return false;
    };
    if a.unit != b.unit {
        return false;
    }
    let u = a.standard_uncertainty.hypot(b.standard_uncertainty);
    (x - y).abs() > 2.0 * u
}

/// Seals applied last time against those found now. A seal with a place is matched by its
/// place; one without by its number.
pub fn mismatches(
    applied: &[(String, Option<String>)],
    found: &[(String, Option<String>)],
) -> Vec<SealMismatch> {
    let mut out = Vec::new();
    for (number, place) in applied {
        let matched = found.iter().find(|(n, p)| match place {
            Some(_) => p == place,
            None => n == number,
        });
        match matched {
            Some((n, _)) if n == number => {}
            other => out.push(SealMismatch {
                place: place.clone(),
                applied: Some(number.clone()),
                found: other.map(|(n, _)| n.clone()),
            }),
        }
    }
    for (number, place) in found {
        let known = applied.iter().any(|(n, p)| match place {
            Some(_) => p == place,
            None => n == number,
        });
        if !known && !applied.is_empty() {
            out.push(SealMismatch {
                place: place.clone(),
                applied: None,
                found: Some(number.clone()),
            });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn seal(n: &str, p: Option<&str>) -> (String, Option<String>) {
        (n.to_string(), p.map(str::to_string))
    }

    #[test]
    fn a_seal_found_with_another_number_at_the_same_place_is_a_mismatch() {
        let applied = [seal("TV-S-1001", Some("intake, front left"))];
        let found = [seal("TV-S-1077", Some("intake, front left"))];
        let m = mismatches(&applied, &found);
        assert_eq!(m.len(), 1);
        assert_eq!(m[0].applied.as_deref(), Some("TV-S-1001"));
        assert_eq!(m[0].found.as_deref(), Some("TV-S-1077"));
        assert!(mismatches(&applied, &applied).is_empty());
    }

    #[test]
    fn a_missing_seal_is_a_mismatch_and_no_seal_applied_is_none() {
        let applied = [seal("TV-S-1001", None)];
        assert_eq!(mismatches(&applied, &[]).len(), 1);
        assert!(mismatches(&[], &[seal("TV-S-2", None)]).is_empty());
    }

    #[test]
    fn a_move_counts_beyond_twice_the_combined_uncertainty() {
        let at = |v: f64| Measured {
            label: "bore[1]".into(),
            written: v.to_string(),
            value: Some(v),
            standard_uncertainty: 0.0003,
            unit: Some("in".into()),
        };
        // 2 * sqrt(0.0003^2 + 0.0003^2) = 0.000848…: 0.0008 stays, 0.0009 moves
        assert!(!moved(&at(4.0300), &at(4.0308)));
        assert!(moved(&at(4.0300), &at(4.0309)));
    }
}
