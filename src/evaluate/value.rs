//! Values during evaluation: a number (one, or one per cylinder) with its sensitivities; the
//! measurements found missing on the way; values outside the domain of the formula or
//! operation that needs them ([`Breach`]), which are never turned into a number; and an
//! internal error, which is reported with its message.

use std::collections::BTreeSet;

use super::dual::Dual;
use crate::load::InputId;
use crate::units::Dimension;

/// An evaluated numeric expression.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    /// One number for the engine.
    Single(Dual),
    /// One number per cylinder, cylinder 1 first.
    PerCylinder(Vec<Dual>),
}

/// The measurements an expression needed and the declaration did not give.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Missing(pub BTreeSet<String>);

/// Why something could not be evaluated.
#[derive(Clone, Debug, PartialEq)]
pub enum Unevaluated {
    /// Measurements the declaration does not give.
    Missing(Missing),
    /// Values outside the domain of a formula or operation, each cylinder's own.
    Domain(Vec<Breach>),
    /// Measurements recorded as gauge results that the test cannot be decided from.
    Gauged(Vec<super::outcome::GaugeGap>),
    /// A state the checker and the loader rule out (a mistake in gonogo), with what went wrong.
    Internal(String),
}

/// A value outside the domain of the formula or operation that needs it (a negative clearance
/// volume for a compression ratio, a divisor of zero): the data of the reason a rule is not
/// checked. Reports put it into words (`report::view`).
#[derive(Clone, Debug, PartialEq)]
pub struct Breach {
    /// The formula or operation, as a rulebook writes it: `compression_ratio`, `/`, `sqrt`.
    pub by: &'static str,
    /// What it needs, in words: `a positive clearance volume`.
    pub needs: &'static str,
    /// Where a formula and its domain come from (`None` for arithmetic).
    pub source: Option<&'static str>,
    /// The quantity tested, in words: `clearance volume`, `bore`, `divisor`.
    pub quantity: &'static str,
    /// Its value in SI units.
    pub value: f64,
    /// Its dimension, when known (an operation's operands carry none at evaluation).
    pub dimension: Option<Dimension>,
    /// The cylinder (1-based), for a per-cylinder value.
    pub cylinder: Option<usize>,
    /// The inputs the quantity is computed from, in input order.
    pub inputs: Vec<InputId>,
}

impl Breach {
    /// The inputs of these values together, each once: the first value's in input order,
    /// then those the next one adds, and so on (a formula's in the order of its parameters).
    pub fn inputs_of<'a>(values: impl IntoIterator<Item = &'a Dual>) -> Vec<InputId> {
        let mut ids: Vec<InputId> = Vec::new();
        for (id, _) in values.into_iter().flat_map(|d| d.partials.iter()) {
            if !ids.contains(id) {
                ids.push(*id);
            }
        }
        ids
    }
}

/// The result of evaluating something that may need a missing measurement.
pub type Evaluated<T> = Result<T, Unevaluated>;

impl Missing {
    /// One missing measurement.
    pub fn one(name: &str) -> Missing {
        Missing(BTreeSet::from([name.to_string()]))
    }

    /// Both sets together.
    pub fn join(mut self, other: Missing) -> Missing {
        self.0.extend(other.0);
        self
    }
}

impl Unevaluated {
    /// One missing measurement.
    pub fn missing(name: &str) -> Unevaluated {
        Unevaluated::Missing(Missing::one(name))
    }

    /// An internal error with its message.
    pub fn internal(what: impl Into<String>) -> Unevaluated {
        Unevaluated::Internal(what.into())
    }

    /// One value outside its domain.
    pub fn domain(breach: Breach) -> Unevaluated {
        Unevaluated::Domain(vec![breach])
    }

    /// Both reasons together: the first internal error; else every missing measurement
    /// (a value outside its domain shows once they are given); else every gauged measurement
    /// that cannot decide; else every breach.
    pub fn join(self, other: Unevaluated) -> Unevaluated {
        match (self, other) {
            (Unevaluated::Internal(e), _) | (_, Unevaluated::Internal(e)) => {
                Unevaluated::Internal(e)
            }
            (Unevaluated::Missing(a), Unevaluated::Missing(b)) => Unevaluated::Missing(a.join(b)),
            (Unevaluated::Missing(m), Unevaluated::Gauged(_))
            | (Unevaluated::Gauged(_), Unevaluated::Missing(m)) => Unevaluated::Missing(m),
            (Unevaluated::Gauged(mut a), Unevaluated::Gauged(b)) => {
                a.extend(b.into_iter().filter(|g| !a.contains(g)).collect::<Vec<_>>());
                Unevaluated::Gauged(a)
            }
            (Unevaluated::Gauged(g), Unevaluated::Domain(_))
            | (Unevaluated::Domain(_), Unevaluated::Gauged(g)) => Unevaluated::Gauged(g),
            (Unevaluated::Missing(m), Unevaluated::Domain(_))
            | (Unevaluated::Domain(_), Unevaluated::Missing(m)) => Unevaluated::Missing(m),
            (Unevaluated::Domain(mut a), Unevaluated::Domain(b)) => {
                for breach in b {
                    if !a.contains(&breach) {
                        a.push(breach);
                    }
                }
                Unevaluated::Domain(a)
            }
        }
    }
}

/// Both results, or every reason either failed.
pub fn both<A, B>(a: Evaluated<A>, b: Evaluated<B>) -> Evaluated<(A, B)> {
    match (a, b) {
        (Ok(a), Ok(b)) => Ok((a, b)),
        (Err(x), Err(y)) => Err(x.join(y)),
        (Err(x), _) | (_, Err(x)) => Err(x),
    }
}

/// All results, or every reason any failed.
pub fn all<T>(items: impl IntoIterator<Item = Evaluated<T>>) -> Evaluated<Vec<T>> {
    let mut values = Vec::new();
    let mut failed: Option<Unevaluated> = None;
    for item in items {
        match item {
            Ok(v) => values.push(v),
            Err(e) => failed = Some(failed.map_or(e.clone(), |acc| acc.join(e))),
        }
    }
    match failed {
        Some(e) => Err(e),
        None => Ok(values),
    }
}

impl Value {
    /// The numbers: one, or one per cylinder.
    pub fn numbers(&self) -> &[Dual] {
        match self {
            Value::Single(d) => std::slice::from_ref(d),
            Value::PerCylinder(ds) => ds,
        }
    }

    /// The number for cylinder `i` (0-based): a single value stands for every cylinder.
    pub fn at(&self, i: usize) -> Evaluated<&Dual> {
        match self {
            Value::Single(d) => Ok(d),
            Value::PerCylinder(ds) => ds.get(i).ok_or_else(|| {
                Unevaluated::internal(format!(
                    "a per-cylinder value has {} cylinders, and cylinder {} was asked for",
                    ds.len(),
                    i + 1
                ))
            }),
        }
    }

    /// Whether it has one value per cylinder.
    pub fn is_per_cylinder(&self) -> bool {
        matches!(self, Value::PerCylinder(_))
    }

    /// Applies `f` to each number, pairing per-cylinder values cylinder by cylinder and a
    /// single value with every cylinder.
    pub fn zip(&self, other: &Value, f: impl Fn(&Dual, &Dual) -> Dual) -> Value {
        match (self, other) {
            (Value::Single(a), Value::Single(b)) => Value::Single(f(a, b)),
            (Value::PerCylinder(a), Value::Single(b)) => {
                Value::PerCylinder(a.iter().map(|x| f(x, b)).collect())
            }
            (Value::Single(a), Value::PerCylinder(b)) => {
                Value::PerCylinder(b.iter().map(|y| f(a, y)).collect())
            }
            (Value::PerCylinder(a), Value::PerCylinder(b)) => {
                Value::PerCylinder(a.iter().zip(b).map(|(x, y)| f(x, y)).collect())
            }
        }
    }

    /// Applies `f` to each number.
    pub fn map(&self, f: impl Fn(&Dual) -> Dual) -> Value {
        match self {
            Value::Single(a) => Value::Single(f(a)),
            Value::PerCylinder(a) => Value::PerCylinder(a.iter().map(f).collect()),
        }
    }
}
