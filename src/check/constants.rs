//! Constant folding: the value, in SI units, of an expression made only of numbers, units,
//! `pi`, arithmetic and derived values that are themselves constant.

use super::Checker;
use crate::parse::ast::{BinaryOp, Expr, ExprKind, Quantity};
use crate::units;

/// Folding follows derived values at most this deep (cycles are reported elsewhere).
const MAX_FOLD_DEPTH: u32 = 32;

impl Checker<'_> {
    /// The expression's constant value in SI units, if it has one (a number with a stated
    /// uncertainty counts as its value).
    pub(super) fn constant(&self, expr: &Expr) -> Option<f64> {
        let lookup = |name: &str| self.defines.get(name).map(|d| &d.expr);
        fold(expr, &lookup, true)
    }
}

/// The constant value of `expr` in SI units, following names through `lookup` to the
/// expressions of derived values. A number with a stated uncertainty is a constant only when
/// `uncertain_is_constant`.
pub(super) fn fold<'e>(
    expr: &'e Expr,
    lookup: &dyn Fn(&str) -> Option<&'e Expr>,
    uncertain_is_constant: bool,
) -> Option<f64> {
    fold_at(expr, lookup, uncertain_is_constant, 0)
}

fn fold_at<'e>(
    expr: &'e Expr,
    lookup: &dyn Fn(&str) -> Option<&'e Expr>,
    uncertain: bool,
    depth: u32,
) -> Option<f64> {
    if depth > MAX_FOLD_DEPTH {
        return None;
    }
    let value = match &expr.kind {
        ExprKind::Quantity(q) if q.uncertainty.is_some() && !uncertain => return None,
        ExprKind::Quantity(q) => quantity_si(q)?,
        ExprKind::Name(n) if n.text == "pi" => std::f64::consts::PI,
        ExprKind::Name(n) => fold_at(lookup(&n.text)?, lookup, uncertain, depth + 1)?,
        ExprKind::Negate(inner) => -fold_at(inner, lookup, uncertain, depth)?,
        ExprKind::Binary { op, left, right } => {
            let a = fold_at(left, lookup, uncertain, depth)?;
            let b = fold_at(right, lookup, uncertain, depth)?;
            match op {
                BinaryOp::Add => a + b,
                BinaryOp::Subtract => a - b,
                BinaryOp::Multiply => a * b,
                BinaryOp::Divide => a / b,
                BinaryOp::Power => a.powf(b),
            }
        }
        ExprKind::Text(_) | ExprKind::Call { .. } => return None,
    };
    value.is_finite().then_some(value)
}

/// A quantity literal's value in SI units (a number without a unit is itself).
pub fn quantity_si(q: &Quantity) -> Option<f64> {
    let unit = q
        .unit
        .as_ref()
        .or(q.uncertainty.as_ref().and_then(|u| u.unit.as_ref()));
    let factor = match unit {
        Some(u) => units::lookup(&u.symbol)?.to_si,
        None => 1.0,
    };
    Some(q.value.value * factor)
}
