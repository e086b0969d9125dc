//! Evaluating resolved expressions over a declaration: a fold over the checker's tree, each
//! number carrying its exact sensitivities to the measured inputs. Names are ids, calls are
//! bound, so nothing is looked up by name or by where it is written. Every formula and
//! operation is applied only inside its domain: outside it the value is not computed, and the
//! [`Breach`] says why.

use std::f64::consts::PI;

use super::dual::Dual;
use super::value::{Breach, Evaluated, Unevaluated, Value, all, both};
use crate::check::builtins::{Formula, extreme};
use crate::check::model::CheckedRulebook;
use crate::check::resolved::{
    Args, Bound, Call, DerivedId, Expr, ExprKind, Literal, LiteralId, MeasurementId, Term,
    TextExpr, TextKind,
};
use crate::load::InputId;
use crate::load::{Component, Declaration, Input, InputName, Supplied, UncertaintySource};
use crate::parse::ast::BinaryOp;

/// Evaluates expressions for one declaration, caching derived values.
pub struct Evaluator<'a> {
    /// The rulebook.
    pub rulebook: &'a CheckedRulebook,
    /// The declaration.
    pub declaration: &'a Declaration,
    /// Rulebook literals with a stated uncertainty, numbered after the declaration's inputs
    /// in the order first evaluated.
    pub rulebook_inputs: Vec<Input>,
    /// Numeric derived values computed so far, by [`DerivedId`].
    derived: Vec<Option<Evaluated<Value>>>,
    /// The input id of each literal with a stated uncertainty evaluated so far, by
    /// [`LiteralId`].
    literal_inputs: Vec<Option<InputId>>,
    /// Shifts added to the literals with a stated uncertainty, by [`LiteralId`]: a Monte Carlo
    /// draw (`evaluate::montecarlo`); empty otherwise.
    pub literal_shifts: Vec<f64>,
    /// Values without sensitivities: every input is taken as a constant (a Monte Carlo draw
    /// needs the value alone, and is much faster without them).
    pub values_only: bool,
}

impl<'a> Evaluator<'a> {
    /// An evaluator for one declaration.
    pub fn new(rulebook: &'a CheckedRulebook, declaration: &'a Declaration) -> Evaluator<'a> {
        Evaluator {
            rulebook,
            declaration,
            rulebook_inputs: Vec::new(),
            derived: vec![None; rulebook.derived.len()],
            literal_inputs: vec![None; rulebook.literals.len()],
            literal_shifts: Vec::new(),
            values_only: false,
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

    /// The value of a numeric derived value, computed once and kept; borrowed from the cache.
    /// `None` for a derived value that is text.
    pub fn computed(&mut self, id: DerivedId) -> Option<&Evaluated<Value>> {
        let rulebook = self.rulebook;
        let Term::Number(body) = &rulebook.derived.get(id.index())?.body else {
            return None;
        };
        if self.derived.get(id.index())?.is_none() {
            let value = self.number(body);
            *self.derived.get_mut(id.index())? = Some(value);
        }
        self.derived.get(id.index())?.as_ref()
    }

    /// Evaluates a numeric expression.
    pub fn number(&mut self, expr: &Expr) -> Evaluated<Value> {
        match &expr.kind {
            ExprKind::Literal(l) => Ok(Value::Single(self.literal(l)?)),
            ExprKind::Pi => Ok(Value::Single(Dual::constant(PI))),
            ExprKind::Measurement(id) => self.measured(*id),
            ExprKind::Derived(id) => match self.computed(*id) {
                Some(value) => value.clone(),
                None => Err(Unevaluated::internal(
                    "a text derived value used as a number",
                )),
            },
            ExprKind::Negate(inner) => Ok(self.number(inner)?.map(Dual::neg)),
            ExprKind::Binary { op, left, right } => {
                let (l, r) = both(self.number(left), self.number(right))?;
                operands_in_domain(*op, &l, &r)?;
                if *op == BinaryOp::Power {
                    let root = r.numbers().iter().any(|e| e.value > 0.0 && e.value < 1.0);
                    self.differentiable(&l, |d| root && d.value == 0.0, POWER_AT_ZERO)?;
                    return Ok(l.zip(&r, |a, b| match a.value {
                        0.0 if b.value > 0.0 && b.value < 1.0 => Dual::constant(0.0),
                        _ => a.powf(b.value),
                    }));
                }
                Ok(binary(*op, &l, &r))
            }
            ExprKind::Formula(call) => self.formula(call),
            ExprKind::Reduce(how, arg) => {
                let value = self.number(arg)?;
                let reduced = how.apply(value.numbers()).ok_or_else(|| {
                    Unevaluated::internal("`max`, `min` or `mean` of no cylinders")
                })?;
                Ok(Value::Single(reduced))
            }
            ExprKind::Extreme { greater, args } => {
                let values = all(args.iter().map(|a| self.number(a)).collect::<Vec<_>>())?;
                let (first, rest) = values
                    .split_first()
                    .ok_or_else(|| Unevaluated::internal("`max` or `min` of no values"))?;
                Ok(rest.iter().fold(first.clone(), |acc, v| {
                    acc.zip(v, |a, b| extreme(*greater, a.clone(), b))
                }))
            }
            ExprKind::Abs(inner) => {
                let value = self.number(inner)?;
                self.differentiable(&value, |d| d.value == 0.0, ABS_AT_ZERO)?;
                Ok(value.map(Dual::abs))
            }
            ExprKind::Sqrt(inner) => {
                let value = self.number(inner)?;
                each_in_domain(&value, |d| (d.value < 0.0).then_some(SQRT))?;
                self.differentiable(&value, |d| d.value == 0.0, SQRT_AT_ZERO)?;
                // at an exact 0 the slope has no bound but no input is uncertain: the root is
                // exactly 0, with no uncertainty
                Ok(value.map(|d| match d.value {
                    0.0 => Dual::constant(0.0),
                    _ => d.sqrt(),
                }))
            }
        }
    }

    /// Where a function has no derivative (`at`) and its argument is uncertain, the law of
    /// propagation (GUM JCGM 100:2008, 5.1.2) cannot give the uncertainty: the value is not
    /// computed, cylinder by cylinder, rather than given a first-order uncertainty of 0 or
    /// without bound. Where no input of the argument is uncertain the function is applied.
    fn differentiable(
        &self,
        value: &Value,
        at: impl Fn(&Dual) -> bool,
        needs: Needs,
    ) -> Evaluated<()> {
        let uncertain = |d: &Dual| d.partials.iter().any(|(id, _)| self.uncertainty(*id) > 0.0);
        each_in_domain(value, |d| (at(d) && uncertain(d)).then_some(needs))
    }

    /// Evaluates a text expression.
    pub fn text(&mut self, expr: &TextExpr) -> Evaluated<String> {
        match &expr.kind {
            TextKind::Literal(t) => Ok(t.clone()),
            TextKind::Measurement(id) => {
                let name = self.measurement_name(*id)?;
                match self.declaration.supplied(id.index()) {
                    Some(Supplied::Text(t, ..)) => Ok(t.clone()),
                    Some(_) => Err(Unevaluated::internal(format!(
                        "`{name}` is text in the rulebook but a number in the declaration"
                    ))),
                    None => Err(Unevaluated::missing(name)),
                }
            }
            TextKind::Derived(id) => {
                let rulebook = self.rulebook;
                match rulebook.derived.get(id.index()).map(|d| &d.body) {
                    Some(Term::Text(body)) => self.text(body),
                    _ => Err(Unevaluated::internal(
                        "a numeric derived value used as text",
                    )),
                }
            }
        }
    }

    fn measurement_name(&self, id: MeasurementId) -> Evaluated<&'a str> {
        let rulebook = self.rulebook;
        rulebook
            .measurements
            .get(id.index())
            .map(|m| m.name.as_str())
            .ok_or_else(|| Unevaluated::internal("a measurement id outside the schema"))
    }

    fn measured(&self, id: MeasurementId) -> Evaluated<Value> {
        let name = self.measurement_name(id)?;
        match self.declaration.supplied(id.index()) {
            Some(Supplied::Single(input)) => Ok(Value::Single(self.input(*input)?)),
            Some(Supplied::PerCylinder(inputs)) => Ok(Value::PerCylinder(
                inputs
                    .iter()
                    .map(|i| self.input(*i))
                    .collect::<Evaluated<_>>()?,
            )),
            Some(Supplied::Text(..)) => Err(Unevaluated::internal(format!(
                "`{name}` is a number in the rulebook but text in the declaration"
            ))),
            None => Err(Unevaluated::missing(name)),
        }
    }

    fn input(&self, id: InputId) -> Evaluated<Dual> {
        let input = self.declaration.inputs.get(id as usize).ok_or_else(|| {
            Unevaluated::internal(format!("input {id} is not in the declaration"))
        })?;
        let calibration = self.declaration.calibration_of(id).map(|c| {
            let correction = self
                .declaration
                .inputs
                .get(c as usize)
                .map_or(0.0, |i| i.value);
            (c, correction)
        });
        Ok(self.dual(id, input.value, calibration))
    }

    /// An input's number, with its instrument's calibration correction: with its
    /// sensitivities, or alone when only values are wanted.
    fn dual(&self, id: InputId, value: f64, calibration: Option<(InputId, f64)>) -> Dual {
        if self.values_only {
            Dual::constant(value + calibration.map_or(0.0, |(_, c)| c))
        } else {
            Dual::reading(id, value, calibration)
        }
    }

    /// A literal in SI units; one with a stated uncertainty is an input of its own, numbered
    /// the first time it is evaluated.
    fn literal(&mut self, l: &Literal) -> Evaluated<Dual> {
        let Some(literal) = l.uncertain else {
            return Ok(Dual::constant(l.si));
        };
        let shift = self.literal_shifts.get(literal.index()).copied();
        let id = self.literal_input(literal)?;
        Ok(self.dual(id, l.si + shift.unwrap_or(0.0), None))
    }

    fn literal_input(&mut self, literal: LiteralId) -> Evaluated<InputId> {
        let unknown = || Unevaluated::internal("a literal id outside the rulebook");
        if let Some(id) = self
            .literal_inputs
            .get(literal.index())
            .ok_or_else(unknown)?
        {
            return Ok(*id);
        }
        let rulebook = self.rulebook;
        let written = rulebook.literals.get(literal.index()).ok_or_else(unknown)?;
        let id = input_id(self.declaration.inputs.len() + self.rulebook_inputs.len())?;
        self.rulebook_inputs.push(Input {
            name: InputName::Literal(written.text.clone()),
            value: written.value,
            standard_uncertainty: written.standard_uncertainty,
            components: vec![Component::normal(written.standard_uncertainty)],
            unit: written.unit.map(|u| u.symbol),
            written: None,
            source: UncertaintySource::Rulebook,
        });
        if let Some(slot) = self.literal_inputs.get_mut(literal.index()) {
            *slot = Some(id);
        }
        Ok(id)
    }

    /// The inputs of the literals with a stated uncertainty in `term` that have been
    /// evaluated.
    pub fn literal_ids(&self, term: &Term, out: &mut Vec<InputId>) {
        let mut literals = Vec::new();
        term.literals(&mut literals);
        out.extend(
            literals
                .into_iter()
                .filter_map(|l| self.literal_inputs.get(l.index()).copied().flatten()),
        );
    }

    fn formula(&mut self, call: &Call) -> Evaluated<Value> {
        match &call.args {
            Args::Two(bound) => self.apply(call.formula, bound),
            Args::Three(bound) => self.apply(call.formula, bound),
            Args::Seven(bound) => self.apply(call.formula, bound),
        }
    }

    /// Applies a formula cylinder by cylinder where its arguments are per cylinder, each
    /// cylinder only inside the formula's domain (every cylinder outside it is named).
    fn apply<const N: usize>(
        &mut self,
        formula: &'static Formula,
        bound: &Bound<N>,
    ) -> Evaluated<Value> {
        let values = all(bound
            .args
            .iter()
            .map(|a| self.number(a))
            .collect::<Vec<_>>())?;
        let cylinders = values.iter().find_map(|v| match v {
            Value::PerCylinder(ds) => Some(ds.len()),
            Value::Single(_) => None,
        });
        if values.len() != N {
            return Err(Unevaluated::internal(
                "a formula given the wrong number of values",
            ));
        }
        let one = |i: usize| -> Evaluated<Dual> {
            // the arguments at cylinder i, on the stack: the first one missing is the error
            let mut x: [&Dual; N] = [&NOTHING; N];
            for (slot, v) in x.iter_mut().zip(&values) {
                *slot = v.at(i)?;
            }
            formula_in_domain(formula, &x, cylinders.map(|_| i + 1))?;
            Ok((bound.apply)(x))
        };
        match cylinders {
            Some(n) => Ok(Value::PerCylinder(all((0..n).map(one))?)),
            None => Ok(Value::Single(one(0)?)),
        }
    }
}

/// A placeholder for a formula's argument before it is read (never passed on).
static NOTHING: Dual = Dual {
    value: 0.0,
    partials: Vec::new(),
};

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

/// Outside its domain, the first requirement of a formula its arguments break, with the
/// inputs of the arguments that requirement reads.
fn formula_in_domain<const N: usize>(
    formula: &'static Formula,
    x: &[&Dual; N],
    cylinder: Option<usize>,
) -> Evaluated<()> {
    let values: [f64; N] = std::array::from_fn(|k| x[k].value);
    let Some((requirement, value)) = formula.breach(&values) else {
        return Ok(());
    };
    let read = requirement
        .reads()
        .iter()
        .filter_map(|i| x.get(*i).copied());
    Err(Unevaluated::domain(Breach {
        by: formula.name,
        needs: requirement.needs,
        source: Some(formula.source),
        quantity: requirement.quantity,
        value,
        dimension: Some(requirement.dimension),
        cylinder,
        inputs: Breach::inputs_of(read),
    }))
}

/// What an operation of arithmetic needs, when an operand breaks it.
#[derive(Clone, Copy)]
struct Needs {
    by: &'static str,
    needs: &'static str,
    quantity: &'static str,
}

const DIVISOR: Needs = Needs {
    by: "/",
    needs: "a divisor other than zero",
    quantity: "divisor",
};
const SQRT: Needs = Needs {
    by: "sqrt",
    needs: "a value of at least zero",
    quantity: "value under the root",
};
/// The words of a function with no derivative at 0, where its argument is uncertain.
macro_rules! no_derivative_at_zero {
    ($what:literal) => {
        concat!(
            $what,
            " other than 0 where it is uncertain: at 0 there is no derivative, so the law of ",
            "propagation of uncertainty (GUM JCGM 100:2008, 5.1.2) gives no uncertainty and ",
            "a Monte Carlo propagation (JCGM 101) is needed"
        )
    };
}

const ABS_AT_ZERO: Needs = Needs {
    by: "abs",
    needs: no_derivative_at_zero!("an argument"),
    quantity: "argument",
};
const SQRT_AT_ZERO: Needs = Needs {
    by: "sqrt",
    needs: no_derivative_at_zero!("a value"),
    quantity: "value under the root",
};
const POWER_AT_ZERO: Needs = Needs {
    by: "^",
    needs: no_derivative_at_zero!("a base for a power between 0 and 1"),
    quantity: "base",
};
const FRACTIONAL_POWER: Needs = Needs {
    by: "^",
    needs: "a base of at least zero for a power that is not a whole number",
    quantity: "base",
};
const NEGATIVE_POWER: Needs = Needs {
    by: "^",
    needs: "a base other than zero for a negative power",
    quantity: "base",
};

/// Where an operation's operands are outside its domain: a divisor of zero, a negative base
/// of a fractional power, a zero base of a negative one.
fn operands_in_domain(op: BinaryOp, l: &Value, r: &Value) -> Evaluated<()> {
    match op {
        BinaryOp::Divide => each_in_domain(r, |d| (d.value == 0.0).then_some(DIVISOR)),
        BinaryOp::Power => {
            let exponents = r.numbers();
            each_in_domain(l, |base| {
                exponents.iter().find_map(|e| {
                    if base.value < 0.0 && e.value.fract() != 0.0 {
                        Some(FRACTIONAL_POWER)
                    } else if base.value == 0.0 && e.value < 0.0 {
                        Some(NEGATIVE_POWER)
                    } else {
                        None
                    }
                })
            })
        }
        BinaryOp::Add | BinaryOp::Subtract | BinaryOp::Multiply => Ok(()),
    }
}

/// Every number of `value` that `breaks` finds outside the domain, cylinder by cylinder.
fn each_in_domain(value: &Value, breaks: impl Fn(&Dual) -> Option<Needs>) -> Evaluated<()> {
    let breaches: Vec<Breach> = value
        .numbers()
        .iter()
        .enumerate()
        .filter_map(|(i, d)| {
            let needs = breaks(d)?;
            Some(Breach {
                by: needs.by,
                needs: needs.needs,
                source: None,
                quantity: needs.quantity,
                value: d.value,
                dimension: None,
                cylinder: value.is_per_cylinder().then_some(i + 1),
                inputs: Breach::inputs_of([d]),
            })
        })
        .collect();
    if breaches.is_empty() {
        Ok(())
    } else {
        Err(Unevaluated::Domain(breaches))
    }
}

/// The id of the input numbered `count`, or an error when ids run out (never a reused id).
fn input_id(count: usize) -> Evaluated<InputId> {
    InputId::try_from(count).map_err(|_| {
        Unevaluated::internal(format!(
            "input {count} is beyond the {} inputs gonogo can number",
            InputId::MAX
        ))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn input_ids_that_run_out_are_an_error_not_a_shared_id() {
        // issue 8: the input after the last id fell back to `u32::MAX`, an id it could share
        assert_eq!(input_id(7), Ok(7));
        let last = InputId::MAX as usize;
        assert_eq!(input_id(last), Ok(InputId::MAX));
        assert!(matches!(input_id(last + 1), Err(Unevaluated::Internal(_))));
    }
}
