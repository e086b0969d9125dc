//! Values during evaluation: a number (one, or one per cylinder) with its sensitivities, or
//! text; and the set of measurements found missing on the way.

use std::collections::BTreeSet;

use super::dual::Dual;

/// An evaluated expression.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    /// One number for the engine.
    Single(Dual),
    /// One number per cylinder, cylinder 1 first.
    PerCylinder(Vec<Dual>),
    /// Text.
    Text(String),
}

/// The measurements an expression needed and the declaration did not give.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Missing(pub BTreeSet<String>);

/// The result of evaluating something that may need a missing measurement.
pub type Evaluated<T> = Result<T, Missing>;

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

/// Both results, or every measurement either was missing.
pub fn both<A, B>(a: Evaluated<A>, b: Evaluated<B>) -> Evaluated<(A, B)> {
    match (a, b) {
        (Ok(a), Ok(b)) => Ok((a, b)),
        (Err(x), Err(y)) => Err(x.join(y)),
        (Err(x), _) | (_, Err(x)) => Err(x),
    }
}

/// All results, or every measurement any was missing.
pub fn all<T>(items: Vec<Evaluated<T>>) -> Evaluated<Vec<T>> {
    let mut values = Vec::with_capacity(items.len());
    let mut missing: Option<Missing> = None;
    for item in items {
        match item {
            Ok(v) => values.push(v),
            Err(m) => missing = Some(missing.map_or(m.clone(), |acc| acc.join(m))),
        }
    }
    match missing {
        Some(m) => Err(m),
        None => Ok(values),
    }
}

impl Value {
    /// The numbers: one, or one per cylinder.
    pub fn numbers(&self) -> &[Dual] {
        match self {
            Value::Single(d) => std::slice::from_ref(d),
            Value::PerCylinder(ds) => ds,
            Value::Text(_) => &[],
        }
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
            _ => Value::Single(Dual::constant(f64::NAN)),
        }
    }

    /// Applies `f` to each number.
    pub fn map(&self, f: impl Fn(&Dual) -> Dual) -> Value {
        match self {
            Value::Single(a) => Value::Single(f(a)),
            Value::PerCylinder(a) => Value::PerCylinder(a.iter().map(f).collect()),
            Value::Text(t) => Value::Text(t.clone()),
        }
    }
}
