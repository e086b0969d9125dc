//! One measured number from a declaration: the literal parsed with the rulebook's own
//! grammar, converted to SI, checked against the measurement's dimension and range.

use super::error::{CoverageAt, LoadError};
use crate::check::model::Measurement;
use crate::check::model::ValueKind;
use crate::parse::{QuantityFault, quantity_literal};
use crate::units::{self, Dimension};

/// A number as read, before its uncertainty is settled.
#[derive(Clone, Debug, PartialEq)]
pub struct Reading {
    /// Value in SI units.
    pub value: f64,
    /// A stated expanded uncertainty in SI units and its coverage factor.
    pub stated: Option<(f64, f64)>,
    /// The unit written.
    pub unit: Option<&'static str>,
    /// The value as written.
    pub written: String,
}

/// Reads a string such as `4.031 in` or `76.2 cc ± 0.2 cc (k = 2)` for `m`.
pub fn read_text(text: &str, m: &Measurement) -> Result<Reading, LoadError> {
    let (negative, q) = quantity_literal(text).map_err(|fault| bad_quantity(fault, example(m)))?;
    let value_unit = q
        .unit
        .or(q.uncertainty.and_then(|u| u.unit))
        .map(|p| p.text);
    let (unit, factor) = resolve_unit(value_unit, m)?;
    let sign = if negative { -1.0 } else { 1.0 };
    let stated = match q.uncertainty {
        Some(u) => {
            let (_, u_factor) = match u.unit {
                Some(symbol) => resolve_unit(Some(symbol.text), m)?,
                None => (unit, factor),
            };
            let k = u.coverage.map_or(2.0, |(k, _)| k);
            if k <= 0.0 {
                return Err(LoadError::BadCoverage(CoverageAt::Literal));
            }
            Some((u.value.0 * u_factor, k))
        }
        None => None,
    };
    let value = sign * q.value.0 * factor;
    check_value(value, m)?;
    Ok(Reading {
        value,
        stated,
        unit,
        written: text.trim().to_string(),
    })
}

/// Reads a bare YAML number for `m`; only plain numbers (counts, ratios) may be written so.
pub fn read_number(value: f64, m: &Measurement) -> Result<Reading, LoadError> {
    if dimension(m) != Dimension::NONE {
        return Err(LoadError::MissingUnit {
            measurement: m.name.clone(),
            dimension: dimension(m),
            example: example(m),
            bare: true,
        });
    }
    check_value(value, m)?;
    Ok(Reading {
        value,
        stated: None,
        unit: None,
        written: crate::report::format::shortest(value),
    })
}

/// Reads an instrument's resolution or uncertainty (any dimension; matched to its use later).
pub fn read_instrument_quantity(text: &str) -> Result<(f64, Dimension, f64), LoadError> {
    let (negative, q) = quantity_literal(text)
        .map_err(|fault| bad_quantity(fault, "`\"0.0001 in\"`".to_string()))?;
    let (dimension, factor) = match q.unit {
        Some(u) => match units::lookup(u.text) {
            Some(unit) => (unit.dimension, unit.to_si),
            None => return Err(unknown_unit(u.text)),
        },
        None => (Dimension::NONE, 1.0),
    };
    let value = q.value.0 * factor;
    if negative || value <= 0.0 {
        return Err(LoadError::NotPositive);
    }
    let k = q
        .uncertainty
        .and_then(|u| u.coverage)
        .map_or(2.0, |(k, _)| k);
    Ok((value, dimension, k))
}

/// The refusal of a text that is not a quantity; a coverage factor below zero is refused as
/// one of zero is.
fn bad_quantity(fault: QuantityFault, example: String) -> LoadError {
    match fault {
        QuantityFault::CoverageNotPositive => LoadError::BadCoverage(CoverageAt::Literal),
        fault => LoadError::BadQuantity { fault, example },
    }
}

fn dimension(m: &Measurement) -> Dimension {
    match m.kind {
        ValueKind::Number(d) => d,
        ValueKind::Text => Dimension::NONE,
    }
}

fn resolve_unit(
    unit: Option<&str>,
    m: &Measurement,
) -> Result<(Option<&'static str>, f64), LoadError> {
    let want = dimension(m);
    let Some(symbol) = unit else {
        if want == Dimension::NONE {
            return Ok((None, 1.0));
        }
        return Err(LoadError::MissingUnit {
            measurement: m.name.clone(),
            dimension: want,
            example: example(m),
            bare: false,
        });
    };
    let Some(found) = units::lookup(symbol) else {
        return Err(unknown_unit(symbol));
    };
    if found.dimension != want {
        return Err(LoadError::WrongUnit {
            measurement: m.name.clone(),
            wants: want,
            unit: symbol.to_string(),
            found: found.dimension,
            example: example(m),
        });
    }
    Ok((Some(found.symbol), found.to_si))
}

fn unknown_unit(symbol: &str) -> LoadError {
    LoadError::UnknownUnit {
        symbol: symbol.to_string(),
        suggestion: units::closest_unit(symbol),
    }
}

fn check_value(value: f64, m: &Measurement) -> Result<(), LoadError> {
    if !value.is_finite() {
        return Err(LoadError::NotFinite);
    }
    if m.dimension_word == "count" && value.fract() != 0.0 {
        return Err(LoadError::NotWhole {
            measurement: m.name.clone(),
            value,
        });
    }
    let negatives_allowed = m.range.is_some_and(|(low, _)| low < 0.0);
    if value < 0.0 && !negatives_allowed {
        return Err(LoadError::Negative {
            measurement: m.name.clone(),
        });
    }
    if let Some((low, high)) = m.range
        && (value < low || value > high)
    {
        return Err(LoadError::OutOfRange {
            measurement: m.name.clone(),
            expected: range_text(m, low, high),
        });
    }
    Ok(())
}

fn range_text(m: &Measurement, low: f64, high: f64) -> String {
    match units::display_unit(dimension(m)) {
        Some(u) => format!(
            "{} {} to {} {}",
            short(low / u.to_si),
            u.symbol,
            short(high / u.to_si),
            u.symbol
        ),
        None => format!("{} to {}", short(low), short(high)),
    }
}

fn short(v: f64) -> String {
    let text = format!("{v:.6}");
    text.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// An example literal of the measurement's dimension, in backticks.
pub fn example(m: &Measurement) -> String {
    match units::display_unit(dimension(m)) {
        Some(u) => format!("`\"1.0 {}\"`", u.symbol),
        None => "`2`".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnostic::codes;
    use crate::source::Span;

    fn bore() -> Measurement {
        Measurement {
            name: "bore".into(),
            dimension_word: "length".into(),
            kind: ValueKind::Number(Dimension::LENGTH),
            per_cylinder: true,
            required: true,
            range: Some((0.0254 * 3.5, 0.0254 * 4.5)),
            unit: Some("in"),
            procedure: None,
            span: Span::default(),
        }
    }

    #[test]
    fn a_length_in_inches_becomes_metres_with_its_uncertainty() {
        // NIST SP 811 B.8: 1 in = 0.0254 m exactly
        let r =
            read_text("4.031 in ± 0.0004 in (k = 2)", &bore()).unwrap_or_else(|e| panic!("{e:?}"));
        assert!((r.value - 4.031 * 0.0254).abs() < 1e-15);
        assert_eq!(
            r.stated
                .map(|(u, k)| (u / 0.0254, k))
                .map(|(u, k)| ((u - 0.0004).abs() < 1e-15, k)),
            Some((true, 2.0))
        );
        assert_eq!(r.unit, Some("in"));
    }

    #[test]
    fn the_wrong_dimension_is_refused() {
        let e = read_text("76 cc", &bore()).err().map(|e| e.code());
        assert_eq!(e, Some(codes::load::WRONG_DIMENSION));
    }

    #[test]
    fn negative_and_out_of_range_values_are_refused() {
        assert_eq!(
            read_text("-4.0 in", &bore()).err().map(|e| e.code()),
            Some(codes::load::NEGATIVE)
        );
        assert_eq!(read_text("103 mm", &bore()).err().map(|e| e.code()), None);
        assert_eq!(
            read_text("4.03 mm", &bore()).err().map(|e| e.code()),
            Some(codes::load::OUT_OF_RANGE)
        );
    }

    #[test]
    fn a_bare_number_needs_a_unit_unless_the_measurement_is_a_plain_number() {
        assert_eq!(
            read_number(4.03, &bore()).err().map(|e| e.code()),
            Some(codes::load::MISSING_UNIT)
        );
    }
}
