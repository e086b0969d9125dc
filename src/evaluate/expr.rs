//! Evaluating expressions over a declaration: names looked up, units converted to SI, built-in
//! formulas applied, every number carrying its exact sensitivities to the measured inputs.

use std::collections::HashMap;

use super::dual::{Dual, InputId};
use super::formulas;
use super::value::{Evaluated, Missing, Value, all, both};
use crate::check::builtins::{self, Function, Generic};
use crate::check::model::{CheckedRulebook, Named};
use crate::load::{Declaration, Input, InputName, Supplied, UncertaintySource};
use crate::parse::ast::{Arg, BinaryOp, Expr, ExprKind, Quantity};
use crate::source::Span;
use crate::units;

/// Evaluates expressions for one declaration, caching derived values.
pub struct Evaluator<'a> {
    /// The rulebook.
    pub rulebook: &'a CheckedRulebook,
    /// The declaration.
    pub declaration: &'a Declaration,
    /// Rulebook literals with a stated uncertainty, numbered after the declaration's inputs.
    pub rulebook_inputs: Vec<Input>,
    /// Derived values computed so far, by position in the rulebook's `derived`.
    derived: Vec<Option<Evaluated<Value>>>,
    literal_inputs: HashMap<(u32, usize), InputId>,
}

impl<'a> Evaluator<'a> {
    /// An evaluator for one declaration.
    pub fn new(rulebook: &'a CheckedRulebook, declaration: &'a Declaration) -> Evaluator<'a> {
        Evaluator {
            rulebook,
            declaration,
            rulebook_inputs: Vec::new(),
            derived: vec![None; rulebook.derived.len()],
            literal_inputs: HashMap::new(),
        }
    }

    /// An input by id: the declaration's, then the rulebook's literals.
    pub fn input_info(&self, id: InputId) -> Option<&Input> {
        let declared = self.declaration.inputs.len();
        match self.declaration.inputs.get(id as usize) {
            Some(input) => Some(input),
            None => self
                .rulebook_inputs
                .get((id as usize).checked_sub(declared)?),
        }
    }

    /// The standard uncertainty of an input.
    pub fn uncertainty(&self, id: InputId) -> f64 {
        self.input_info(id).map_or(0.0, |i| i.standard_uncertainty)
    }

    /// The combined standard uncertainty of a number (GUM eq. 10).
    pub fn combined(&self, d: &Dual) -> f64 {
        d.combined_uncertainty(|id| self.uncertainty(id))
    }

    /// The value of a derived value, computed once.
    pub fn derived(&mut self, name: &str) -> Option<Evaluated<Value>> {
        self.computed(name).cloned()
    }

    /// The value of a derived value, computed once and kept; borrowed from the cache.
    pub fn computed(&mut self, name: &str) -> Option<&Evaluated<Value>> {
        let Some(Named::Derived(at)) = self.rulebook.index.get(name).copied() else {
            return None;
        };
        if self.derived.get(at)?.is_none() {
            let rulebook = self.rulebook;
            let value = self.eval(&rulebook.derived.get(at)?.expr);
            self.derived[at] = Some(value);
        }
        self.derived.get(at)?.as_ref()
    }

    /// A derived value already computed, if it has been.
    pub fn derived_cache(&self, name: &str) -> Option<&Evaluated<Value>> {
        match self.rulebook.index.get(name) {
            Some(Named::Derived(at)) => self.derived.get(*at)?.as_ref(),
            _ => None,
        }
    }

    /// Evaluates an expression.
    pub fn eval(&mut self, expr: &Expr) -> Evaluated<Value> {
        match &expr.kind {
            ExprKind::Quantity(q) => Ok(Value::Single(self.literal(q, expr.span))),
            ExprKind::Text(t) => Ok(Value::Text(t.value.clone())),
            ExprKind::Name(n) => self.name(&n.text),
            ExprKind::Negate(inner) => Ok(self.eval(inner)?.map(Dual::neg)),
            ExprKind::Binary { op, left, right } => {
                let (l, r) = both(self.eval(left), self.eval(right))?;
                Ok(binary(*op, &l, &r))
            }
            ExprKind::Call { function, args } => self.call(&function.text, args),
        }
    }

    /// A literal in SI units; one with a stated uncertainty is an input of its own.
    fn literal(&mut self, q: &Quantity, span: Span) -> Dual {
        let value = crate::check::quantity_si(q).unwrap_or(f64::NAN);
        let Some(u) = &q.uncertainty else {
            return Dual::constant(value);
        };
        let key = (span.file, span.start);
        if let Some(id) = self.literal_inputs.get(&key) {
            return Dual::input(*id, value);
        }
        let unit = u
            .unit
            .as_ref()
            .or(q.unit.as_ref())
            .and_then(|s| units::lookup(&s.symbol));
        let k = u.coverage.as_ref().map_or(2.0, |k| k.value);
        let count = self.declaration.inputs.len() + self.rulebook_inputs.len();
        let id = InputId::try_from(count).unwrap_or(InputId::MAX);
        self.rulebook_inputs.push(Input {
            name: InputName::Literal(crate::parse::print::expr_text(&Expr {
                kind: ExprKind::Quantity(q.clone()),
                span,
            })),
            value,
            standard_uncertainty: u.value.value * unit.map_or(1.0, |u| u.to_si) / k,
            unit: unit.map(|u| u.symbol),
            written: None,
            source: UncertaintySource::Rulebook,
        });
        self.literal_inputs.insert(key, id);
        Dual::input(id, value)
    }

    /// The inputs of the literals with a stated uncertainty in `e` that have been evaluated.
    pub fn literal_ids(&self, e: &Expr, out: &mut Vec<InputId>) {
        match &e.kind {
            ExprKind::Quantity(_) => {
                out.extend(self.literal_inputs.get(&(e.span.file, e.span.start)))
            }
            ExprKind::Negate(inner) => self.literal_ids(inner, out),
            ExprKind::Binary { left, right, .. } => {
                self.literal_ids(left, out);
                self.literal_ids(right, out);
            }
            ExprKind::Call { args, .. } => {
                args.iter().for_each(|a| self.literal_ids(&a.value, out))
            }
            ExprKind::Text(_) | ExprKind::Name(_) => {}
        }
    }

    fn name(&mut self, name: &str) -> Evaluated<Value> {
        if name == "pi" {
            return Ok(Value::Single(Dual::constant(std::f64::consts::PI)));
        }
        if let Some(v) = self.derived(name) {
            return v;
        }
        let supplied = self
            .rulebook
            .measurement_index(name)
            .and_then(|i| self.declaration.supplied(i));
        match supplied {
            Some(Supplied::Single(id)) => Ok(Value::Single(self.input(*id))),
            Some(Supplied::PerCylinder(ids)) => Ok(Value::PerCylinder(
                ids.iter().map(|id| self.input(*id)).collect(),
            )),
            Some(Supplied::Text(t, _)) => Ok(Value::Text(t.clone())),
            None => Err(Missing::one(name)),
        }
    }

    fn input(&self, id: InputId) -> Dual {
        Dual::input(id, self.declaration.input(id).value)
    }

    fn call(&mut self, name: &str, args: &[Arg]) -> Evaluated<Value> {
        let Some(function) = builtins::function(name) else {
            return Ok(Value::Single(Dual::constant(f64::NAN)));
        };
        match function {
            Function::Generic(g) => {
                let values = all(args.iter().map(|a| self.eval(&a.value)).collect())?;
                Ok(generic(g, &values))
            }
            Function::Formula(f) => {
                let mut slots: Vec<Option<&Expr>> = vec![None; f.params.len()];
                for (i, arg) in args.iter().enumerate() {
                    let at = match &arg.label {
                        Some(label) => f.params.iter().position(|p| p.name == label.text),
                        None => Some(i),
                    };
                    if let Some(slot) = at.and_then(|at| slots.get_mut(at)) {
                        *slot = Some(&arg.value);
                    }
                }
                let values = all(slots
                    .into_iter()
                    .map(|e| match e {
                        Some(e) => self.eval(e),
                        None => Ok(Value::Single(Dual::constant(f64::NAN))),
                    })
                    .collect())?;
                Ok(formula(f.name, &values))
            }
        }
    }
}

fn binary(op: BinaryOp, l: &Value, r: &Value) -> Value {
    match op {
        BinaryOp::Add => l.zip(r, Dual::add),
        BinaryOp::Subtract => l.zip(r, Dual::sub),
        BinaryOp::Multiply => l.zip(r, Dual::mul),
        BinaryOp::Divide => l.zip(r, Dual::div),
        // the checker allows only constant exponents
        BinaryOp::Power => l.zip(r, |a, b| a.powf(b.value)),
    }
}

fn generic(g: Generic, values: &[Value]) -> Value {
    let pick = |greater: bool, items: &[Dual]| -> Dual {
        let mut best = items
            .first()
            .cloned()
            .unwrap_or_else(|| Dual::constant(f64::NAN));
        for d in items.iter().skip(1) {
            if (d.value > best.value) == greater && d.value != best.value {
                best = d.clone();
            }
        }
        best
    };
    match (g, values) {
        (Generic::Max | Generic::Min, [Value::PerCylinder(ds)]) => {
            Value::Single(pick(g == Generic::Max, ds))
        }
        (Generic::Mean, [Value::PerCylinder(ds)]) => {
            let n = ds.len() as f64;
            let sum = ds.iter().skip(1).fold(ds[0].clone(), |acc, d| acc.add(d));
            Value::Single(sum.scale(1.0 / n))
        }
        (Generic::Max | Generic::Min, [first, rest @ ..]) => {
            rest.iter().fold(first.clone(), |acc, v| {
                acc.zip(v, |a, b| {
                    if (b.value > a.value) == (g == Generic::Max) && b.value != a.value {
                        b.clone()
                    } else {
                        a.clone()
                    }
                })
            })
        }
        (Generic::Abs, [v]) => v.map(Dual::abs),
        (Generic::Sqrt, [v]) => v.map(Dual::sqrt),
        _ => Value::Single(Dual::constant(f64::NAN)),
    }
}

/// Argument `a` for cylinder `i`: a single value serves every cylinder.
fn argument_at<'v>(a: &'v Value, i: usize, undefined: &'v Dual) -> &'v Dual {
    match a {
        Value::Single(d) => d,
        Value::PerCylinder(ds) => ds.get(i).unwrap_or(undefined),
        Value::Text(_) => undefined,
    }
}

/// Applies a formula cylinder by cylinder where its arguments are per cylinder.
fn formula(name: &str, args: &[Value]) -> Value {
    let cylinders = args.iter().find_map(|a| match a {
        Value::PerCylinder(ds) => Some(ds.len()),
        _ => None,
    });
    let undefined = Dual::constant(f64::NAN);
    let one = |i: usize| -> Dual {
        let x: Vec<&Dual> = args.iter().map(|a| argument_at(a, i, &undefined)).collect();
        formulas::apply(name, &x).unwrap_or_else(|| Dual::constant(f64::NAN))
    };
    match cylinders {
        Some(n) => Value::PerCylinder((0..n).map(one).collect()),
        None => Value::Single(one(0)),
    }
}
