//! The report of `gonogo units`: every unit a rulebook or declaration may write, grouped by
//! dimension, with its factor to the SI unit of that dimension as a decimal and as an exact
//! fraction. Text for people, JSON (schema `gonogo.units/1`) for programs.

use serde::Serialize;

use crate::units::{DimensionUnits, Ratio, Unit, by_dimension};

/// Output formats of `units`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum UnitsFormat {
    /// A table per dimension.
    Text,
    /// One JSON document (schema `gonogo.units/1`).
    Json,
}

/// The listing in `format`.
pub fn render(format: UnitsFormat) -> String {
    let groups = by_dimension();
    match format {
        UnitsFormat::Text => text(&groups),
        UnitsFormat::Json => json(&groups),
    }
}

/// One unit's factor, as the report shows it.
struct Factor {
    /// The exact decimal, when the fraction has one; else the float, marked `≈`.
    decimal: String,
    /// Whether `decimal` is exact.
    decimal_is_exact: bool,
    /// The fraction in lowest terms (`127/5000`), when the factor is rational.
    fraction: Option<String>,
}

impl Factor {
    fn of(unit: &Unit) -> Factor {
        let reduced = unit.exact.map(lowest_terms);
        let exact_decimal = reduced.and_then(terminating_decimal);
        Factor {
            decimal_is_exact: exact_decimal.is_some(),
            decimal: exact_decimal.unwrap_or_else(|| format!("≈ {}", unit.to_si)),
            fraction: reduced.map(|r| {
                if r.denominator == 1 {
                    r.numerator.to_string()
                } else {
                    format!("{}/{}", r.numerator, r.denominator)
                }
            }),
        }
    }
}

const HEADING: &str = "\
Units gonogo reads, by dimension. The factor converts one of the unit to the SI unit of its
dimension (NIST SP 811, Appendix B.8): written in full where its decimal ends, marked ≈ where
it does not. The exact fraction is what decides a value that lies exactly on a limit.
";

fn text(groups: &[DimensionUnits]) -> String {
    let mut out = String::from(HEADING);
    for group in groups {
        let factors: Vec<(&Unit, Factor)> =
            group.units.iter().map(|u| (*u, Factor::of(u))).collect();
        let symbol_width = column_width(factors.iter().map(|(u, _)| u.symbol), "unit");
        let decimal_width = column_width(factors.iter().map(|(_, f)| f.decimal.as_str()), "factor");
        out.push_str(&format!("\n{} (SI unit {})\n", group.name, group.si_unit));
        out.push_str(&format!(
            "  {:symbol_width$}  {:decimal_width$}  exact fraction\n",
            "unit", "factor"
        ));
        for (unit, factor) in &factors {
            let fraction = factor
                .fraction
                .as_deref()
                .unwrap_or("none: the factor is irrational");
            out.push_str(&format!(
                "  {:symbol_width$}  {:decimal_width$}  {fraction}\n",
                unit.symbol, factor.decimal
            ));
        }
    }
    out
}

/// The widest of the cells and the heading, in characters.
fn column_width<'a>(cells: impl Iterator<Item = &'a str>, heading: &str) -> usize {
    cells
        .map(|c| c.chars().count())
        .chain(std::iter::once(heading.chars().count()))
        .max()
        .unwrap_or(0)
}

/// The document `units --format json` writes.
#[derive(Serialize)]
struct UnitsReport {
    schema: &'static str,
    dimensions: Vec<JsonDimension>,
}

#[derive(Serialize)]
struct JsonDimension {
    dimension: &'static str,
    si_unit: &'static str,
    units: Vec<JsonUnit>,
}

#[derive(Serialize)]
struct JsonUnit {
    symbol: &'static str,
    /// The float factor gonogo propagates with.
    factor: f64,
    /// The exact decimal, when the fraction has one.
    exact_decimal: Option<String>,
    /// The exact fraction in lowest terms, as text (numerators pass 2^53).
    exact_fraction: Option<String>,
}

fn json(groups: &[DimensionUnits]) -> String {
    let report = UnitsReport {
        schema: "gonogo.units/1",
        dimensions: groups
            .iter()
            .map(|g| JsonDimension {
                dimension: g.name,
                si_unit: g.si_unit,
                units: g
                    .units
                    .iter()
                    .map(|u| {
                        let factor = Factor::of(u);
                        JsonUnit {
                            symbol: u.symbol,
                            factor: u.to_si,
                            exact_decimal: factor.decimal_is_exact.then_some(factor.decimal),
                            exact_fraction: factor.fraction,
                        }
                    })
                    .collect(),
            })
            .collect(),
    };
    serde_json::to_string_pretty(&report).unwrap_or_default() + "\n"
}

fn gcd(a: u128, b: u128) -> u128 {
    if b == 0 { a } else { gcd(b, a % b) }
}

/// The fraction in lowest terms.
fn lowest_terms(r: Ratio) -> Ratio {
    let g = gcd(r.numerator, r.denominator).max(1);
    Ratio {
        numerator: r.numerator / g,
        denominator: r.denominator / g,
    }
}

/// The decimal of a fraction in lowest terms whose denominator has no prime factor but 2 and
/// 5 (so its decimal ends), written out in full; `None` otherwise or past 128-bit integers.
fn terminating_decimal(r: Ratio) -> Option<String> {
    let (mut rest, mut twos, mut fives) = (r.denominator, 0u32, 0u32);
    while rest % 2 == 0 {
        rest /= 2;
        twos += 1;
    }
    while rest % 5 == 0 {
        rest /= 5;
        fives += 1;
    }
    if rest != 1 {
        return None;
    }
    let places = twos.max(fives);
    let scale = 10u128.checked_pow(places)? / r.denominator;
    let digits = r.numerator.checked_mul(scale)?.to_string();
    if places == 0 {
        return Some(digits);
    }
    let places = places as usize;
    let padded = format!("{digits:0>width$}", width = places + 1);
    let (whole, fraction) = padded.split_at(padded.len() - places);
    Some(format!("{whole}.{fraction}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_decimals_are_written_out_and_others_are_not() {
        // NIST SP 811 B.8: 1 in = 0.0254 m exactly; 1 lbf = 0.45359237 kg × 9.80665 m/s²
        let inch = Ratio {
            numerator: 254,
            denominator: 10_000,
        };
        assert_eq!(
            terminating_decimal(lowest_terms(inch)).as_deref(),
            Some("0.0254")
        );
        let lbf = crate::units::lookup("lbf")
            .and_then(|u| u.exact)
            .map(lowest_terms);
        assert_eq!(
            lbf.and_then(terminating_decimal).as_deref(),
            Some("4.4482216152605")
        );
        // 1 rpm = 1/60 rev/s has no decimal that ends
        let rpm = Ratio {
            numerator: 1,
            denominator: 60,
        };
        assert_eq!(terminating_decimal(rpm), None);
        let whole = Ratio {
            numerator: 100_000,
            denominator: 1,
        };
        assert_eq!(terminating_decimal(whole).as_deref(), Some("100000"));
    }

    #[test]
    fn every_unit_is_listed_once() {
        let text = render(UnitsFormat::Text);
        for unit in crate::units::UNITS {
            let rows = text
                .lines()
                .filter(|l| l.split_whitespace().next() == Some(unit.symbol))
                .count();
            assert_eq!(rows, 1, "`{}` listed {rows} times", unit.symbol);
        }
    }
}
