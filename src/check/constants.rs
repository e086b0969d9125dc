//! Constant folding: the value, in SI units, of an expression made only of numbers, units,
//! `pi`, arithmetic and derived values that are themselves constant.

use super::Checker;
use crate::parse::ast::{BinaryOp, Expr, ExprKind, Quantity};
use crate::units;

/// Folding follows derived values at most this deep (cycles are reported elsewhere).
const MAX_FOLD_DEPTH: u32 = 32;

impl Checker<'_> {
    /// The expression's constant value in SI units, if it has one.
    pub(super) fn constant(&self, expr: &Expr) -> Option<f64> {
        self.fold(expr, 0)
    }

    fn fold(&self, expr: &Expr, depth: u32) -> Option<f64> {
        if depth > MAX_FOLD_DEPTH {
            return None;
        }
        let value = match &expr.kind {
            ExprKind::Quantity(q) => quantity_si(q)?,
            ExprKind::Name(n) if n.text == "pi" => std::f64::consts::PI,
            ExprKind::Name(n) => self.fold(&self.defines.get(n.text.as_str())?.expr, depth + 1)?,
            ExprKind::Negate(inner) => -self.fold(inner, depth)?,
            ExprKind::Binary { op, left, right } => {
                let (a, b) = (self.fold(left, depth)?, self.fold(right, depth)?);
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
