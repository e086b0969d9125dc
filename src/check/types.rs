//! Typing: every name, unit and function resolved, and every expression, comparison and
//! argument checked for dimension and for per-cylinder shape. Typing an expression also
//! resolves it: each typed expression comes back as a [`resolved`](super::resolved) tree.

use super::Checker;
use super::builtins::{self, Formula, Function, Generic, Reduce, Shape};
use super::error::{CheckError, Joined, LimitPart};
use super::limit::{Limit, SideKind, uncertain_on_limit};
use super::model::{Measurement, Type, ValueKind};
use super::resolved::{
    self, Call, DerivedId, ExprKind as R, Literal, LiteralId, MeasurementId, Term, TextExpr,
    TextKind, UncertainLiteral,
};
use crate::parse::ast::{
    Arg, BinaryOp, ClassItem, CompareOp, Condition, Expr, ExprKind, Measure, Quantity, Test,
    TestKind, UnitRef,
};
use crate::source::Span;
use crate::suggest::closest;
use crate::units::{self, DIMENSION_NAMES, Dimension, Unit, dimension_named};

/// Whether a test is a rule's limit or part of a condition.
#[derive(Clone, Copy, PartialEq, Eq)]
pub(super) enum Place {
    Require,
    Condition,
}

fn number(dimension: Dimension, per_cylinder: bool) -> Type {
    Type {
        kind: ValueKind::Number(dimension),
        per_cylinder,
    }
}

/// A typed expression: its type and its resolved tree.
pub(super) type Typed = (Type, Term);

/// A resolved numeric expression of type `ty`.
fn numeric(ty: Type, kind: R, span: Span) -> Typed {
    (ty, Term::Number(resolved::Expr { kind, span }))
}

impl<'a> Checker<'a> {
    /// Resolves each measurement's dimension word and range.
    pub(super) fn resolve_measurements(&mut self) {
        let order = self.measure_order.clone();
        for name in order {
            let Some(m) = self.measures.get(name).copied() else {
                continue;
            };
            if let Some(kind) = self.measure_kind(m) {
                let range = self.measure_range(m, kind);
                self.measurements.insert(
                    name,
                    Measurement {
                        name: m.name.text.clone(),
                        dimension_word: m.dimension.text.clone(),
                        kind,
                        per_cylinder: m.per_cylinder,
                        required: m.required,
                        range,
                        unit: m.range.as_ref().and_then(|(low, _)| written_unit(low)),
                        procedure: m.procedure.as_ref().map(|p| p.value.clone()),
                        span: m.name.span,
                    },
                );
            }
        }
    }

    fn measure_kind(&mut self, m: &Measure) -> Option<ValueKind> {
        let word = m.dimension.text.as_str();
        if word == "text" {
            if m.per_cylinder {
                self.error(
                    CheckError::PerCylinderText {
                        name: m.name.text.clone(),
                        at: m.dimension.span,
                    }
                    .into(),
                );
                return None;
            }
            return Some(ValueKind::Text);
        }
        if let Some(d) = dimension_named(word) {
            return Some(ValueKind::Number(d));
        }
        let names = DIMENSION_NAMES.iter().map(|(n, _)| *n).chain(["text"]);
        self.error(
            CheckError::UnknownDimension {
                word: word.to_string(),
                suggestion: closest(word, names).map(str::to_string),
                at: m.dimension.span,
            }
            .into(),
        );
        None
    }

    fn measure_range(&mut self, m: &Measure, kind: ValueKind) -> Option<(f64, f64)> {
        let (low, high) = m.range.as_ref()?;
        let ValueKind::Number(dim) = kind else {
            self.error(
                CheckError::RangeOnText {
                    name: m.name.text.clone(),
                    at: low.span.to(high.span),
                }
                .into(),
            );
            return None;
        };
        for end in [low, high] {
            if let Some(t) = self.type_of(end) {
                self.expect_dimension(t, dim, end.span, "a range limit");
            }
        }
        let (lo, hi) = (self.constant(low)?, self.constant(high)?);
        if lo >= hi {
            self.error(
                CheckError::EmptyRange {
                    name: m.name.text.clone(),
                    at: low.span.to(high.span),
                }
                .into(),
            );
            return None;
        }
        Some((lo, hi))
    }

    /// Types every derived value, in the order written.
    pub(super) fn type_defines(&mut self) {
        for name in self.define_order.clone() {
            self.define_type(name, Span::default());
        }
    }

    fn define_type(&mut self, name: &'a str, used_at: Span) -> Option<Type> {
        if let Some(ty) = self.define_types.get(name) {
            return *ty;
        }
        let define = *self.defines.get(name)?;
        if self.too_deep(name) {
            self.define_types.insert(name, None); // refused where the chain passed the cap
            return None;
        }
        if self.typing.contains(&name) {
            self.error(
                CheckError::DefineCycle {
                    name: name.to_string(),
                    at: used_at,
                    defined_at: define.name.span,
                }
                .into(),
            );
            self.define_types.insert(name, None);
            return None;
        }
        self.typing.push(name);
        let typed = self.resolve(&define.expr);
        self.typing.pop();
        if let Some((_, term)) = &typed
            && !self.define_terms.contains_key(name)
        {
            self.define_terms.insert(name, term.clone());
        }
        self.define_types
            .entry(name)
            .or_insert(typed.map(|(t, _)| t));
        self.define_types.get(name).copied().flatten()
    }

    /// The type of an expression, or `None` after reporting why it has none.
    pub(super) fn type_of(&mut self, expr: &Expr) -> Option<Type> {
        self.resolve(expr).map(|(t, _)| t)
    }

    /// The type and resolved tree of an expression, or `None` after reporting why it has none.
    pub(super) fn resolve(&mut self, expr: &Expr) -> Option<Typed> {
        match &expr.kind {
            ExprKind::Quantity(q) => {
                let d = self.quantity_type(q, expr.span)?;
                let literal = self.literal(q, expr)?;
                Some(numeric(number(d, false), R::Literal(literal), expr.span))
            }
            ExprKind::Text(t) => Some((
                Type {
                    kind: ValueKind::Text,
                    per_cylinder: false,
                },
                Term::Text(TextExpr {
                    kind: TextKind::Literal(t.value.clone()),
                    span: expr.span,
                }),
            )),
            ExprKind::Name(n) => self.name_type(&n.text, n.span),
            ExprKind::Call { function, args } => {
                self.call_type(&function.text, function.span, args, expr.span)
            }
            ExprKind::Negate(inner) => {
                let (t, term) = self.resolve(inner)?;
                let e = self.expect_number(t, term, inner.span, "`-`")?.1;
                Some(numeric(t, R::Negate(Box::new(e)), expr.span))
            }
            ExprKind::Binary { op, left, right } => self.binary_type(*op, left, right, expr.span),
        }
    }

    /// A quantity literal resolved: its digits, unit and SI value, and, with a stated
    /// uncertainty, its literal id (one per written literal, however often it is resolved).
    fn literal(&mut self, q: &Quantity, expr: &Expr) -> Option<Literal> {
        let si = super::quantity_si(q)?;
        let unit = q
            .unit
            .as_ref()
            .or(q.uncertainty.as_ref().and_then(|u| u.unit.as_ref()))
            .and_then(|u| units::lookup(&u.symbol));
        let uncertain = match &q.uncertainty {
            None => None,
            Some(u) => Some(self.uncertain_literal(q, u, expr, si)?),
        };
        Some(Literal {
            written: q.value.text.clone(),
            unit,
            si,
            uncertain,
        })
    }

    fn uncertain_literal(
        &mut self,
        q: &Quantity,
        u: &crate::parse::ast::Uncertainty,
        expr: &Expr,
        si: f64,
    ) -> Option<LiteralId> {
        let at = (expr.span.file, expr.span.start);
        if let Some(id) = self.literal_ids.get(&at) {
            return Some(*id);
        }
        let unit = u
            .unit
            .as_ref()
            .or(q.unit.as_ref())
            .map(|s| units::lookup(&s.symbol));
        let unit: Option<&'static Unit> = match unit {
            Some(found) => Some(found?),
            None => None,
        };
        let k = u.coverage.as_ref().map_or(2.0, |k| k.value);
        let id = LiteralId::new(self.literals.len());
        self.literals.push(UncertainLiteral {
            text: crate::parse::print::expr_text(expr),
            value: si,
            standard_uncertainty: u.value.value * unit.map_or(1.0, |u| u.to_si) / k,
            unit,
        });
        self.literal_ids.insert(at, id);
        Some(id)
    }

    fn quantity_type(&mut self, q: &Quantity, span: Span) -> Option<Dimension> {
        let value_unit = match &q.unit {
            Some(u) => Some(self.unit(u)?),
            None => None,
        };
        let Some(u) = &q.uncertainty else {
            return Some(value_unit.unwrap_or(Dimension::NONE));
        };
        let u_unit = match &u.unit {
            Some(unit) => Some((self.unit(unit)?, unit.span)),
            None => None,
        };
        if let (Some(v), Some((w, span))) = (value_unit, u_unit)
            && v != w
        {
            self.error(
                CheckError::UncertaintyDimension {
                    uncertainty: w,
                    value: v,
                    at: span,
                }
                .into(),
            );
            return None;
        }
        if let Some(k) = &u.coverage
            && k.value <= 0.0
        {
            self.error(CheckError::BadCoverage { at: span }.into());
        }
        Some(
            value_unit
                .or(u_unit.map(|(d, _)| d))
                .unwrap_or(Dimension::NONE),
        )
    }

    fn unit(&mut self, unit: &UnitRef) -> Option<Dimension> {
        if let Some(u) = units::lookup(&unit.symbol) {
            return Some(u.dimension);
        }
        self.error(
            CheckError::UnknownUnit {
                symbol: unit.symbol.clone(),
                suggestion: units::closest_unit(&unit.symbol).map(str::to_string),
                at: unit.span,
            }
            .into(),
        );
        None
    }

    fn name_type(&mut self, name: &str, span: Span) -> Option<Typed> {
        if name == "pi" {
            return Some(numeric(number(Dimension::NONE, false), R::Pi, span));
        }
        if let Some(m) = self.measurements.get(name) {
            self.used.insert(name.to_string());
            let ty = Type {
                kind: m.kind,
                per_cylinder: m.per_cylinder,
            };
            let id = MeasurementId::new(*self.measure_ids.get(name)?);
            return Some(match ty.kind {
                ValueKind::Number(_) => numeric(ty, R::Measurement(id), span),
                ValueKind::Text => (ty, text_term(TextKind::Measurement(id), span)),
            });
        }
        if self.measures.contains_key(name) {
            self.used.insert(name.to_string());
            return None; // its dimension is unknown, already reported
        }
        if let Some((key, _)) = self.defines.get_key_value(name) {
            self.used.insert(name.to_string());
            let key = *key;
            let ty = self.define_type(key, span)?;
            let id = DerivedId::new(*self.define_ids.get(key)?);
            return Some(match ty.kind {
                ValueKind::Number(_) => numeric(ty, R::Derived(id), span),
                ValueKind::Text => (ty, text_term(TextKind::Derived(id), span)),
            });
        }
        let candidates: Vec<&str> = self
            .measures
            .keys()
            .chain(self.defines.keys())
            .copied()
            .collect();
        self.error(
            CheckError::UnknownName {
                name: name.to_string(),
                suggestion: closest(name, candidates).map(str::to_string),
                at: span,
            }
            .into(),
        );
        None
    }

    fn binary_type(
        &mut self,
        op: BinaryOp,
        left: &Expr,
        right: &Expr,
        span: Span,
    ) -> Option<Typed> {
        let (l, r) = (self.resolve(left), self.resolve(right));
        let ((lt, lterm), (rt, rterm)) = (l?, r?);
        let what = match op {
            BinaryOp::Add => "`+`",
            BinaryOp::Subtract => "`-`",
            BinaryOp::Multiply => "`*`",
            BinaryOp::Divide => "`/`",
            BinaryOp::Power => "`^`",
        };
        let (ld, le) = self.expect_number(lt, lterm, left.span, what)?;
        let (rd, re) = self.expect_number(rt, rterm, right.span, what)?;
        self.check_constant_arithmetic(op, left, right, span);
        let per_cylinder = lt.per_cylinder || rt.per_cylinder;
        let dim = match op {
            BinaryOp::Add | BinaryOp::Subtract => {
                if ld != rd {
                    let joined_by = if op == BinaryOp::Add {
                        Joined::Add
                    } else {
                        Joined::Subtract
                    };
                    self.mismatch(joined_by, (left, ld), (right, rd));
                    return None;
                }
                ld
            }
            BinaryOp::Multiply => ld.times(rd),
            BinaryOp::Divide => ld.divided_by(rd),
            BinaryOp::Power => self.power_dimension(ld, right, rd)?,
        };
        let kind = R::Binary {
            op,
            left: Box::new(le),
            right: Box::new(re),
        };
        Some(numeric(number(dim, per_cylinder), kind, span))
    }

    /// Refuses a division by a constant zero, and arithmetic on constants that overflows.
    fn check_constant_arithmetic(&mut self, op: BinaryOp, left: &Expr, right: &Expr, span: Span) {
        let divisor = self.constant(right);
        if op == BinaryOp::Divide && divisor == Some(0.0) {
            self.error(CheckError::DivisionByZero { at: right.span }.into());
            return;
        }
        let (Some(a), Some(b)) = (self.constant(left), divisor) else {
            return;
        };
        let result = match op {
            BinaryOp::Add => a + b,
            BinaryOp::Subtract => a - b,
            BinaryOp::Multiply => a * b,
            BinaryOp::Divide => a / b,
            BinaryOp::Power => a.powf(b),
        };
        if !result.is_finite() {
            self.error(CheckError::NotFinite { at: span }.into());
        }
    }

    fn power_dimension(
        &mut self,
        base: Dimension,
        exponent: &Expr,
        exp_dim: Dimension,
    ) -> Option<Dimension> {
        if base.is_dimensionless() && exp_dim.is_dimensionless() {
            return Some(Dimension::NONE);
        }
        match self.constant(exponent) {
            Some(e) if exp_dim.is_dimensionless() && e.fract() == 0.0 && e.abs() <= 6.0 => {
                Some(base.power(e as i8))
            }
            _ => {
                self.error(
                    CheckError::BadExponent {
                        base,
                        at: exponent.span,
                    }
                    .into(),
                );
                None
            }
        }
    }

    fn call_type(&mut self, name: &str, span: Span, args: &[Arg], whole: Span) -> Option<Typed> {
        let Some(function) = builtins::function(name) else {
            self.error(
                CheckError::UnknownFunction {
                    name: name.to_string(),
                    suggestion: closest(name, builtins::function_names()).map(str::to_string),
                    at: span,
                }
                .into(),
            );
            for arg in args {
                self.type_of(&arg.value);
            }
            return None;
        };
        match function {
            Function::Formula(f) => self.formula_type(f, args, whole),
            Function::Generic(g) => self.generic_type(name, g, args, whole),
        }
    }

    fn formula_type(
        &mut self,
        formula: &'static Formula,
        args: &[Arg],
        whole: Span,
    ) -> Option<Typed> {
        let slots = self.bind_arguments(formula, args, whole)?;
        let mut per_cylinder = false;
        let mut ok = true;
        let mut bound = Vec::with_capacity(slots.len());
        for (param, arg) in formula.params.iter().zip(slots) {
            let Some((t, term)) = self.resolve(&arg.value) else {
                ok = false;
                continue;
            };
            let Some((d, e)) = self.expect_number(t, term, arg.value.span, formula.name) else {
                ok = false;
                continue;
            };
            bound.push(e);
            if d != param.dimension {
                self.error(
                    CheckError::ArgumentDimension {
                        function: formula.name.to_string(),
                        param: param.name.to_string(),
                        expected: param.dimension,
                        found: d,
                        at: arg.value.span,
                    }
                    .into(),
                );
                ok = false;
            }
            if t.per_cylinder && param.shape == Shape::Single {
                self.error(
                    CheckError::NeedsSingleValue {
                        function: formula.name.to_string(),
                        param: param.name.to_string(),
                        at: arg.value.span,
                    }
                    .into(),
                );
                ok = false;
            }
            per_cylinder |= t.per_cylinder;
        }
        if !ok {
            return None;
        }
        let Some(call) = Call::bind(formula, bound) else {
            self.error(
                CheckError::FormulaTableMismatch {
                    function: formula.name.to_string(),
                    params: formula.params.len(),
                    arity: formula.apply.arity(),
                    at: whole,
                }
                .into(),
            );
            return None;
        };
        Some(numeric(
            number(formula.result, per_cylinder),
            R::Formula(call),
            whole,
        ))
    }

    /// Puts each argument in its parameter's slot: positional first, then by label.
    fn bind_arguments<'b>(
        &mut self,
        formula: &Formula,
        args: &'b [Arg],
        whole: Span,
    ) -> Option<Vec<&'b Arg>> {
        let mut slots: Vec<Option<&Arg>> = vec![None; formula.params.len()];
        let mut ok = true;
        for (i, arg) in args.iter().enumerate() {
            let index = match &arg.label {
                None => i,
                Some(label) => match formula.params.iter().position(|p| p.name == label.text) {
                    Some(index) => index,
                    None => {
                        let names = formula.params.iter().map(|p| p.name);
                        self.error(
                            CheckError::UnknownArgument {
                                function: formula.name.to_string(),
                                signature: param_list(formula),
                                label: label.text.clone(),
                                suggestion: closest(&label.text, names).map(str::to_string),
                                at: label.span,
                            }
                            .into(),
                        );
                        ok = false;
                        continue;
                    }
                },
            };
            match slots.get_mut(index) {
                Some(slot @ None) => *slot = Some(arg),
                Some(Some(_)) => {
                    self.error(
                        CheckError::ArgumentTwice {
                            function: formula.name.to_string(),
                            signature: param_list(formula),
                            param: formula.params[index].name.to_string(),
                            at: arg.value.span,
                        }
                        .into(),
                    );
                    ok = false;
                }
                None => {
                    self.error(
                        CheckError::TooManyArguments {
                            function: formula.name.to_string(),
                            signature: param_list(formula),
                            takes: formula.params.len(),
                            given: args.len(),
                            at: arg.value.span,
                        }
                        .into(),
                    );
                    ok = false;
                }
            }
        }
        let missing: Vec<String> = formula
            .params
            .iter()
            .zip(&slots)
            .filter(|(_, s)| s.is_none())
            .map(|(p, _)| p.name.to_string())
            .collect();
        if ok && !missing.is_empty() {
            self.error(
                CheckError::ArgumentMissing {
                    function: formula.name.to_string(),
                    signature: param_list(formula),
                    missing,
                    at: whole,
                }
                .into(),
            );
            return None;
        }
        if !ok {
            for arg in args {
                self.type_of(&arg.value);
            }
            return None;
        }
        Some(slots.into_iter().flatten().collect())
    }

    fn generic_type(&mut self, name: &str, g: Generic, args: &[Arg], whole: Span) -> Option<Typed> {
        if let Some(label) = args.iter().find_map(|a| a.label.as_ref()) {
            self.error(
                CheckError::LabelNotTaken {
                    function: name.to_string(),
                    at: label.span,
                }
                .into(),
            );
            return None;
        }
        let typed: Vec<Option<Typed>> = args.iter().map(|a| self.resolve(&a.value)).collect();
        let typed: Vec<Typed> = typed.into_iter().collect::<Option<_>>()?;
        let types: Vec<Type> = typed.iter().map(|(t, _)| *t).collect();
        let mut dims = Vec::new();
        let mut exprs = Vec::new();
        for ((t, term), a) in typed.into_iter().zip(args) {
            let (d, e) = self.expect_number(t, term, a.value.span, name)?;
            dims.push(d);
            exprs.push(e);
        }
        let reduce = match g {
            Generic::Max => Some(Reduce::Max),
            Generic::Min => Some(Reduce::Min),
            Generic::Mean => Some(Reduce::Mean),
            Generic::Abs | Generic::Sqrt => None,
        };
        let one = |exprs: Vec<resolved::Expr>| exprs.into_iter().next().map(Box::new);
        match (g, types.as_slice(), dims.first().copied()) {
            (_, [t], Some(d)) if g.reduces() && t.per_cylinder => {
                let kind = R::Reduce(reduce?, one(exprs)?);
                Some(numeric(number(d, false), kind, whole))
            }
            (Generic::Max | Generic::Min, [_, _, ..], Some(first)) => {
                if dims.iter().any(|d| *d != first) {
                    self.error(
                        CheckError::MixedDimensions {
                            function: name.to_string(),
                            at: whole,
                        }
                        .into(),
                    );
                    return None;
                }
                let kind = R::Extreme {
                    greater: g == Generic::Max,
                    args: exprs,
                };
                let per_cylinder = types.iter().any(|t| t.per_cylinder);
                Some(numeric(number(first, per_cylinder), kind, whole))
            }
            (Generic::Abs, [t], Some(_)) => Some(numeric(*t, R::Abs(one(exprs)?), whole)),
            (Generic::Sqrt, [t], Some(d)) => match g.result(d) {
                Some(root) => Some(numeric(
                    number(root, t.per_cylinder),
                    R::Sqrt(one(exprs)?),
                    whole,
                )),
                None => {
                    self.error(
                        CheckError::BadRoot {
                            dimension: d,
                            at: whole,
                        }
                        .into(),
                    );
                    None
                }
            },
            _ => {
                self.error(
                    CheckError::GenericArgumentCount {
                        function: name.to_string(),
                        aggregate: g.reduces(),
                        at: whole,
                    }
                    .into(),
                );
                None
            }
        }
    }

    /// The dimension and resolved tree of a numeric expression, or an error that text cannot
    /// take part in `what`.
    pub(super) fn expect_number(
        &mut self,
        t: Type,
        term: Term,
        span: Span,
        what: &str,
    ) -> Option<(Dimension, resolved::Expr)> {
        match (t.kind, term) {
            (ValueKind::Number(d), Term::Number(e)) => Some((d, e)),
            _ => {
                self.text_in_arithmetic(span, what);
                None
            }
        }
    }

    fn text_in_arithmetic(&mut self, span: Span, what: &str) {
        self.error(
            CheckError::TextInArithmetic {
                used_in: what.to_string(),
                at: span,
            }
            .into(),
        );
    }

    /// Reports a value of the wrong dimension; true when it has the one wanted.
    fn expect_dimension(&mut self, t: Type, want: Dimension, span: Span, what: &str) -> bool {
        if let ValueKind::Number(d) = t.kind
            && d == want
        {
            return true;
        }
        self.error(
            CheckError::WrongDimension {
                what: what.to_string(),
                expected: want,
                found: t.kind,
                at: span,
            }
            .into(),
        );
        false
    }

    /// Reports two sides of different dimensions joined by `joined_by`.
    fn mismatch(&mut self, joined_by: Joined, left: (&Expr, Dimension), right: (&Expr, Dimension)) {
        let bare_number_beside = if is_bare_number(right.0) && right.1.is_dimensionless() {
            Some(left.1)
        } else if is_bare_number(left.0) && left.1.is_dimensionless() {
            Some(right.1)
        } else {
            None
        };
        self.error(
            CheckError::DimensionMismatch {
                joined_by,
                left: left.1,
                right: right.1,
                left_at: left.0.span,
                right_at: right.0.span,
                bare_number_beside,
            }
            .into(),
        );
    }

    /// Type-checks the rules of every class and bulletin, as written.
    pub(super) fn check_rules(&mut self) {
        for body in self.bodies() {
            self.check_body(body);
        }
    }

    fn check_body(&mut self, body: &[ClassItem]) {
        for item in body {
            match item {
                ClassItem::Rule(rule) => {
                    if let Some(c) = &rule.condition {
                        self.resolve_condition(c);
                    }
                    self.resolve_test(&rule.require, Place::Require);
                }
                ClassItem::When(group) => {
                    self.resolve_condition(&group.condition);
                    self.check_body(&group.body);
                }
                ClassItem::Drop(_) => {}
            }
        }
    }

    /// Checks and resolves a condition; both sides of `and` and `or` are checked either way.
    pub(super) fn resolve_condition(&mut self, cond: &Condition) -> Option<resolved::Condition> {
        use resolved::Condition as C;
        match cond {
            Condition::Test(t) => self.resolve_test(t, Place::Condition).map(C::Test),
            Condition::And(a, b) => {
                let (a, b) = (self.resolve_condition(a), self.resolve_condition(b));
                Some(C::And(Box::new(a?), Box::new(b?)))
            }
            Condition::Or(a, b) => {
                let (a, b) = (self.resolve_condition(a), self.resolve_condition(b));
                Some(C::Or(Box::new(a?), Box::new(b?)))
            }
            Condition::Not(inner, _) => Some(C::Not(Box::new(self.resolve_condition(inner)?))),
        }
    }

    /// Checks one test and resolves it: both sides typed and of one dimension, the list
    /// known, the pattern sound.
    pub(super) fn resolve_test(&mut self, test: &Test, place: Place) -> Option<resolved::Test> {
        let kind = match &test.kind {
            TestKind::Compare {
                left,
                op,
                right,
                allowance,
            } => self.resolve_compare(left, *op, right, allowance.as_ref(), place)?,
            TestKind::Between {
                subject,
                low,
                high,
                allowance,
            } => self.resolve_between(subject, low, high, allowance.as_ref(), place)?,
            TestKind::Member {
                subject,
                negated,
                list,
            } => {
                let subject = self.expect_text(subject, place);
                let id = self.list_id(list);
                resolved::TestKind::Member {
                    subject: subject?,
                    negated: *negated,
                    list: id?,
                }
            }
            TestKind::Matches {
                subject,
                negated,
                pattern,
            } => {
                let subject = self.expect_text(subject, place);
                let pattern = self.test_pattern(pattern);
                resolved::TestKind::Matches {
                    subject: subject?,
                    negated: *negated,
                    pattern: pattern?,
                }
            }
        };
        Some(resolved::Test {
            kind,
            span: test.span,
        })
    }

    fn resolve_compare(
        &mut self,
        left: &Expr,
        op: CompareOp,
        right: &Expr,
        allowance: Option<&Expr>,
        place: Place,
    ) -> Option<resolved::TestKind> {
        self.check_exact_limit(Limit::compare(left, op, right, allowance), place);
        let (l, r) = (self.resolve(left), self.resolve(right));
        let ((lt, lterm), (rt, rterm)) = (l?, r?);
        let ok = self.check_comparison(left, op, right, lt, rt, place);
        let allowance = allowance.map(|a| self.check_allowance(a, lt, Some(op)));
        if !ok {
            return None;
        }
        let allowance = allowance.map_or(Some(None), |a| a.map(Some))?;
        match (lterm, rterm) {
            (Term::Number(l), Term::Number(r)) => Some(resolved::TestKind::Limit {
                limit: Limit::compare(l, op, r, allowance),
                unit: self.limit_unit(left, right),
            }),
            (Term::Text(l), Term::Text(r)) => Some(resolved::TestKind::TextEqual {
                left: l,
                equal: op == CompareOp::Equal,
                right: r,
            }),
            _ => None, // reported by `check_comparison`
        }
    }

    fn resolve_between(
        &mut self,
        subject: &Expr,
        low: &Expr,
        high: &Expr,
        allowance: Option<&Expr>,
        place: Place,
    ) -> Option<resolved::TestKind> {
        self.check_exact_limit(Limit::between(subject, low, high, allowance), place);
        let typed = [self.resolve(subject), self.resolve(low), self.resolve(high)];
        let [Some((st, s)), Some((lt, l)), Some((ht, h))] = typed else {
            return None;
        };
        let low_ok = self.check_comparison(subject, CompareOp::AtLeast, low, st, lt, place);
        let high_ok = self.check_comparison(subject, CompareOp::AtMost, high, st, ht, place);
        let allowance = allowance.map(|a| self.check_allowance(a, st, None));
        if !(low_ok && high_ok) {
            return None;
        }
        let allowance = allowance.map_or(Some(None), |a| a.map(Some))?;
        let (Term::Number(s), Term::Number(l), Term::Number(h)) = (s, l, h) else {
            return None; // text between text: reported by `check_comparison`
        };
        Some(resolved::TestKind::Limit {
            limit: Limit::between(s, l, h, allowance),
            unit: self.limit_unit(low, high),
        })
    }

    /// The id of a parts list, or an error that the rulebook has none of that name.
    fn list_id(&mut self, list: &crate::parse::ast::Name) -> Option<resolved::ListId> {
        if !self.lists.contains_key(list.text.as_str()) {
            self.error(
                CheckError::UnknownList {
                    name: list.text.clone(),
                    suggestion: closest(&list.text, self.lists.keys().copied()).map(str::to_string),
                    at: list.span,
                }
                .into(),
            );
            return None;
        }
        // a list whose own patterns do not compile is reported where it is compiled
        let at = self
            .compiled_lists
            .keys()
            .position(|n| *n == list.text.as_str())?;
        Some(resolved::ListId::new(at))
    }

    /// The compiled pattern of a `matches` test, compiled once however often it is resolved.
    fn test_pattern(&mut self, pattern: &crate::parse::ast::Pattern) -> Option<regex::Regex> {
        let at = (pattern.span.file, pattern.span.start);
        if let Some(re) = self.test_patterns.get(&at) {
            return Some(re.clone());
        }
        let re = self.compile_pattern(pattern, false)?;
        self.test_patterns.insert(at, re.clone());
        Some(re)
    }

    fn expect_text(&mut self, subject: &Expr, place: Place) -> Option<TextExpr> {
        let (t, term) = self.resolve(subject)?;
        let text = match term {
            Term::Text(text) => Some(text),
            Term::Number(_) => {
                self.error(
                    CheckError::NotText {
                        found: t.kind,
                        at: subject.span,
                    }
                    .into(),
                );
                None
            }
        };
        let shape_ok = self.check_shape(t, subject.span, place);
        text.filter(|_| shape_ok)
    }

    /// Reports a comparison of unlike things or of text by order; true when it is sound.
    fn check_comparison(
        &mut self,
        left: &Expr,
        op: CompareOp,
        right: &Expr,
        lt: Type,
        rt: Type,
        place: Place,
    ) -> bool {
        let mut ok = false;
        match (lt.kind, rt.kind) {
            (ValueKind::Text, ValueKind::Text) => {
                if matches!(op, CompareOp::Equal | CompareOp::NotEqual) {
                    ok = true;
                } else {
                    self.error(
                        CheckError::TextOrder {
                            op,
                            at: left.span.to(right.span),
                        }
                        .into(),
                    );
                }
            }
            (ValueKind::Number(ld), ValueKind::Number(rd)) => {
                if ld == rd {
                    ok = true;
                } else {
                    self.mismatch(Joined::Compare, (left, ld), (right, rd));
                }
            }
            (l, r) => {
                self.error(
                    CheckError::KindMismatch {
                        left: l,
                        right: r,
                        left_at: left.span,
                        right_at: right.span,
                    }
                    .into(),
                );
            }
        }
        let left_ok = self.check_shape(lt, left.span, place);
        let right_ok = self.check_shape(rt, right.span, place);
        ok && left_ok && right_ok
    }

    /// Reports a per-cylinder value in a condition; true when the shape is sound.
    fn check_shape(&mut self, t: Type, span: Span, place: Place) -> bool {
        if place == Place::Condition && t.per_cylinder {
            self.error(CheckError::PerCylinderCondition { at: span }.into());
            return false;
        }
        true
    }

    /// Reports every `±` written on a limit or its allowance, directly or inside a `define`
    /// the limit names: a limit is exact (ISO 14253-1), and `±` there would widen the
    /// measurement's uncertainty instead of the limit.
    fn check_exact_limit(&mut self, limit: Limit<&Expr>, place: Place) {
        let part = match limit.kind() {
            _ if place == Place::Condition => LimitPart::Condition,
            SideKind::Equal | SideKind::NotEqual => LimitPart::Equality,
            _ => LimitPart::Limit,
        };
        let (first, second) = limit.limits();
        let sides = [
            Some((*first, part)),
            second.map(|s| (*s, part)),
            limit.allowance.map(|a| (a, LimitPart::Allowance)),
        ];
        let lookup = |name: &str| self.defines.get(name).map(|d| &d.expr);
        let mut errors = Vec::new();
        for (side, part) in sides.into_iter().flatten() {
            for found in uncertain_on_limit(side, &lookup) {
                let ExprKind::Quantity(q) = &found.literal.kind else {
                    continue;
                };
                let Some(u) = &q.uncertainty else { continue };
                let unit = u.unit.as_ref().or(q.unit.as_ref());
                let uncertainty = match unit {
                    Some(unit) => format!("{} {}", u.value.text, unit.symbol),
                    None => u.value.text.clone(),
                };
                errors.push(CheckError::UncertainLimit {
                    part,
                    uncertainty,
                    through: found.through.map(|n| n.text.clone()),
                    at: found.through.map_or(found.literal.span, |n| n.span),
                    literal: found.literal.span,
                });
            }
        }
        for e in errors {
            self.error(e.into());
        }
    }

    /// Checks an allowance and resolves it, `None` after reporting what is wrong with it.
    fn check_allowance(
        &mut self,
        allowance: &Expr,
        limit: Type,
        op: Option<CompareOp>,
    ) -> Option<resolved::Expr> {
        if matches!(op, Some(CompareOp::Equal | CompareOp::NotEqual)) {
            self.error(CheckError::AllowanceOnEquality { at: allowance.span }.into());
            return None;
        }
        let (t, term) = self.resolve(allowance)?;
        let dimension_ok = match limit.kind {
            ValueKind::Number(d) => self.expect_dimension(t, d, allowance.span, "the allowance"),
            ValueKind::Text => true, // the comparison itself is reported
        };
        match self.constant(allowance) {
            Some(v) if v >= 0.0 => {}
            Some(_) => {
                self.error(CheckError::NegativeAllowance { at: allowance.span }.into());
                return None;
            }
            None => {
                self.error(CheckError::AllowanceNotConstant { at: allowance.span }.into());
                return None;
            }
        }
        match term {
            Term::Number(e) if dimension_ok => Some(e),
            _ => None,
        }
    }

    /// The unit to show a limit in: the first unit written on the limit side, else on the
    /// other side, else the unit gonogo shows the dimension of the first name read in.
    fn limit_unit(&self, a: &Expr, b: &Expr) -> Option<&'static Unit> {
        let written = first_unit(b).or_else(|| first_unit(a));
        written.or_else(|| {
            let mut names = Vec::new();
            a.names(&mut names);
            b.names(&mut names);
            names
                .into_iter()
                .filter_map(|n| self.dimension_of(n))
                .find_map(units::display_unit)
        })
    }

    /// The dimension of a numeric measurement or derived value.
    fn dimension_of(&self, name: &str) -> Option<Dimension> {
        let kind = match self.measurements.get(name) {
            Some(m) => m.kind,
            None => self.define_types.get(name).copied().flatten()?.kind,
        };
        match kind {
            ValueKind::Number(d) => Some(d),
            ValueKind::Text => None,
        }
    }
}

/// A text expression as a typed term.
fn text_term(kind: TextKind, span: Span) -> Term {
    Term::Text(TextExpr { kind, span })
}

/// The first unit written in an expression, in the order written.
fn first_unit(e: &Expr) -> Option<&'static Unit> {
    match &e.kind {
        ExprKind::Quantity(q) => q
            .unit
            .as_ref()
            .or(q.uncertainty.as_ref().and_then(|u| u.unit.as_ref()))
            .and_then(|u| units::lookup(&u.symbol)),
        ExprKind::Negate(inner) => first_unit(inner),
        ExprKind::Binary { left, right, .. } => first_unit(left).or_else(|| first_unit(right)),
        ExprKind::Call { args, .. } => args.iter().find_map(|a| first_unit(&a.value)),
        ExprKind::Text(_) | ExprKind::Name(_) => None,
    }
}

/// The unit written on a range end (`40 cc` gives `cc`).
fn written_unit(e: &Expr) -> Option<&'static str> {
    match &e.kind {
        ExprKind::Quantity(q) => q
            .unit
            .as_ref()
            .and_then(|u| units::lookup(&u.symbol))
            .map(|u| u.symbol),
        ExprKind::Negate(inner) => written_unit(inner),
        _ => None,
    }
}

/// Whether an expression is a number written with no unit, on its value or its uncertainty.
fn is_bare_number(e: &Expr) -> bool {
    matches!(&e.kind, ExprKind::Quantity(q)
        if q.unit.is_none() && q.uncertainty.as_ref().is_none_or(|u| u.unit.is_none()))
}

/// A formula's parameters in order, as `(a, b, c)`.
fn param_list(formula: &Formula) -> String {
    let names: Vec<&str> = formula.params.iter().map(|p| p.name).collect();
    format!("({})", names.join(", "))
}
