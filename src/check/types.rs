//! Typing: every name, unit and function resolved, and every expression, comparison and
//! argument checked for dimension and for per-cylinder shape. Typing an expression also
//! resolves it: each typed expression comes back as a [`resolved`](super::resolved) tree.

use super::Checker;
use super::builtins::{self, Formula, Function, Generic, Reduce, Shape};
use super::limit::Limit;
use super::model::{Measurement, Type, ValueKind};
use super::resolved::{
    self, Call, DerivedId, ExprKind as R, Literal, LiteralId, MeasurementId, Term, TextExpr,
    TextKind, UncertainLiteral,
};
use crate::diagnostic::Problem;
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
                    Problem::error(
                        "gonogo::check::per-cylinder-text",
                        format!(
                            "`{}` is text, and text is recorded once for the engine",
                            m.name.text
                        ),
                        m.dimension.span,
                        "text",
                    )
                    .with_help("remove `per cylinder`, or declare one text measurement per part"),
                );
                return None;
            }
            return Some(ValueKind::Text);
        }
        if let Some(d) = dimension_named(word) {
            return Some(ValueKind::Number(d));
        }
        let names = DIMENSION_NAMES.iter().map(|(n, _)| *n).chain(["text"]);
        let help = match closest(word, names) {
            Some(near) => format!("did you mean `{near}`?"),
            None => {
                "use one of length, area, volume, mass, time, force, pressure, airflow, angle, \
                     speed, power, count, ratio, number or text"
                    .to_string()
            }
        };
        self.error(
            Problem::error(
                "gonogo::check::unknown-dimension",
                format!("`{word}` is not a dimension gonogo knows"),
                m.dimension.span,
                "unknown dimension",
            )
            .with_help(help),
        );
        None
    }

    fn measure_range(&mut self, m: &Measure, kind: ValueKind) -> Option<(f64, f64)> {
        let (low, high) = m.range.as_ref()?;
        let ValueKind::Number(dim) = kind else {
            self.error(
                Problem::error(
                    "gonogo::check::range-on-text",
                    format!("`{}` is text and cannot have a range", m.name.text),
                    low.span.to(high.span),
                    "range",
                )
                .with_help("remove the range, or give the measurement a numeric dimension"),
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
                Problem::error(
                    "gonogo::check::empty-range",
                    format!(
                        "the range of `{}` is empty: its low end is not below its high end",
                        m.name.text
                    ),
                    low.span.to(high.span),
                    "low end first, then high end",
                )
                .with_help("write the range low to high, like `range 3.9 in to 4.2 in`"),
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
        if self.typing.contains(&name) {
            self.error(
                Problem::error(
                    "gonogo::check::define-cycle",
                    format!("`{name}` is defined in terms of itself"),
                    used_at,
                    "used here",
                )
                .with_label(define.name.span, "defined here")
                .with_help("a derived value cannot depend on itself, directly or through others; break the loop"),
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
                Problem::error(
                    "gonogo::check::uncertainty-dimension",
                    format!("the uncertainty is a {w}, but the value is a {v}"),
                    span,
                    "uncertainty unit",
                )
                .with_help("write the uncertainty in a unit of the same dimension as the value"),
            );
            return None;
        }
        if let Some(k) = &u.coverage
            && k.value <= 0.0
        {
            self.error(
                Problem::error(
                    "gonogo::check::bad-coverage",
                    "the coverage factor must be above zero",
                    span,
                    "coverage factor",
                )
                .with_help("write `(k = 2)` for about 95 % coverage"),
            );
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
        let help = match units::closest_unit(&unit.symbol) {
            Some(near) => {
                format!("did you mean `{near}`? The units gonogo knows are listed in README.md")
            }
            None => {
                "use a unit gonogo knows, such as `in`, `mm`, `ci`, `cc`, `lb`, `cfm` or `inHg` \
                     (README.md lists them all)"
                    .to_string()
            }
        };
        self.error(
            Problem::error(
                "gonogo::check::unknown-unit",
                format!("`{}` is not a unit gonogo knows", unit.symbol),
                unit.span,
                "unknown unit",
            )
            .with_help(help),
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
            let id = MeasurementId::new(self.measure_order.iter().position(|n| *n == name)?);
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
            let id = DerivedId::new(self.define_order.iter().position(|n| *n == key)?);
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
        let help = match closest(name, candidates) {
            Some(near) => format!("did you mean `{near}`?"),
            None => format!("declare it with `measure {name}: ...` or `define {name} = ...`"),
        };
        self.error(
            Problem::error(
                "gonogo::check::unknown-name",
                format!("`{name}` is not a measurement or derived value of this rulebook"),
                span,
                "unknown name",
            )
            .with_help(help),
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
        let per_cylinder = lt.per_cylinder || rt.per_cylinder;
        let dim = match op {
            BinaryOp::Add | BinaryOp::Subtract => {
                if ld != rd {
                    self.mismatch(
                        "gonogo::check::dimension-mismatch",
                        format!(
                            "cannot {} a {rd} and a {ld}",
                            if op == BinaryOp::Add {
                                "add"
                            } else {
                                "subtract"
                            }
                        ),
                        (left, ld),
                        (right, rd),
                    );
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
                    Problem::error(
                        "gonogo::check::bad-exponent",
                        format!("a {base} can only be raised to a whole number from -6 to 6"),
                        exponent.span,
                        "exponent",
                    )
                    .with_help("write the exponent as a plain whole number, like `bore^2`; use `sqrt(...)` for roots"),
                );
                None
            }
        }
    }

    fn call_type(&mut self, name: &str, span: Span, args: &[Arg], whole: Span) -> Option<Typed> {
        let Some(function) = builtins::function(name) else {
            let help = match closest(name, builtins::function_names()) {
                Some(near) => format!("did you mean `{near}`?"),
                None => "the built-in functions are listed in grammar/rulebook.ebnf".to_string(),
            };
            self.error(
                Problem::error(
                    "gonogo::check::unknown-function",
                    format!("`{name}` is not a built-in function"),
                    span,
                    "unknown function",
                )
                .with_help(help),
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
                    Problem::error(
                        "gonogo::check::argument-dimension",
                        format!(
                            "`{}` of `{}` must be a {}, but this is a {d}",
                            param.name, formula.name, param.dimension
                        ),
                        arg.value.span,
                        &format!("a {d}"),
                    )
                    .with_help(format!("pass a {} here", param.dimension)),
                );
                ok = false;
            }
            if t.per_cylinder && param.shape == Shape::Single {
                self.error(
                    Problem::error(
                        "gonogo::check::needs-single-value",
                        format!(
                            "`{}` of `{}` takes one value for the engine, not one per cylinder",
                            param.name, formula.name
                        ),
                        arg.value.span,
                        "one value per cylinder",
                    )
                    .with_help("reduce it to one value with `max(...)`, `min(...)` or `mean(...)`"),
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
                Problem::error(
                    "gonogo::check::internal",
                    format!(
                        "the built-in `{}` has {} parameters, but its implementation takes {}",
                        formula.name,
                        formula.params.len(),
                        formula.apply.arity()
                    ),
                    whole,
                    "this call",
                )
                .with_help("this is a mistake in gonogo's formula table, not in the rulebook; please report it"),
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
                        let help = match closest(&label.text, names) {
                            Some(near) => format!("did you mean `{near}`?"),
                            None => format!("`{}` takes {}", formula.name, param_list(formula)),
                        };
                        self.error(
                            Problem::error(
                                "gonogo::check::unknown-argument",
                                format!("`{}` has no parameter `{}`", formula.name, label.text),
                                label.span,
                                "unknown parameter",
                            )
                            .with_help(help),
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
                        Problem::error(
                            "gonogo::check::argument-twice",
                            format!("`{}` is given twice", formula.params[index].name),
                            arg.value.span,
                            "second value",
                        )
                        .with_help(format!(
                            "`{}` takes {}",
                            formula.name,
                            param_list(formula)
                        )),
                    );
                    ok = false;
                }
                None => {
                    self.error(
                        Problem::error(
                            "gonogo::check::argument-count",
                            format!(
                                "`{}` takes {} arguments, not {}",
                                formula.name,
                                formula.params.len(),
                                args.len()
                            ),
                            arg.value.span,
                            "one too many",
                        )
                        .with_help(format!(
                            "`{}` takes {}",
                            formula.name,
                            param_list(formula)
                        )),
                    );
                    ok = false;
                }
            }
        }
        let missing: Vec<&str> = formula
            .params
            .iter()
            .zip(&slots)
            .filter(|(_, s)| s.is_none())
            .map(|(p, _)| p.name)
            .collect();
        if ok && !missing.is_empty() {
            self.error(
                Problem::error(
                    "gonogo::check::argument-missing",
                    format!("`{}` is missing {}", formula.name, backticked(&missing)),
                    whole,
                    "incomplete call",
                )
                .with_help(format!(
                    "`{}` takes {}",
                    formula.name,
                    param_list(formula)
                )),
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
                Problem::error(
                    "gonogo::check::unknown-argument",
                    format!("`{name}` takes no labelled arguments"),
                    label.span,
                    "label",
                )
                .with_help(format!("write `{name}(value)` without a label")),
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
                        Problem::error(
                            "gonogo::check::dimension-mismatch",
                            format!("the values of `{name}` must all have one dimension"),
                            whole,
                            "mixed dimensions",
                        )
                        .with_help("compare like with like, converting where needed"),
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
                        Problem::error(
                            "gonogo::check::bad-root",
                            format!("the square root of a {d} has no dimension gonogo can name"),
                            whole,
                            "square root",
                        )
                        .with_help("take the square root of an area or a dimensionless ratio"),
                    );
                    None
                }
            },
            _ => {
                let expects = if g.reduces() {
                    "one value measured per cylinder (or, for max and min, two or more values)"
                } else {
                    "exactly one value"
                };
                self.error(
                    Problem::error(
                        "gonogo::check::argument-count",
                        format!("`{name}` takes {expects}"),
                        whole,
                        "here",
                    )
                    .with_help(format!(
                        "write `{name}(bore)` with a per-cylinder measurement, for example"
                    )),
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
            Problem::error(
                "gonogo::check::text-in-arithmetic",
                format!("text cannot be used in {what}"),
                span,
                "text",
            )
            .with_help(
                "only numbers take part in arithmetic; compare text with `==`, `in` or `matches`",
            ),
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
            Problem::error(
                "gonogo::check::dimension-mismatch",
                format!("{what} must be a {want}, but this is a {}", t.kind),
                span,
                &format!("a {}", t.kind),
            )
            .with_help(unit_hint(want)),
        );
        false
    }

    fn mismatch(
        &mut self,
        code: &'static str,
        message: String,
        left: (&Expr, Dimension),
        right: (&Expr, Dimension),
    ) {
        let bare_number = |e: &Expr| matches!(&e.kind, ExprKind::Quantity(q) if q.unit.is_none() && q.uncertainty.as_ref().is_none_or(|u| u.unit.is_none()));
        let help = if bare_number(right.0) && right.1.is_dimensionless() {
            format!("the number has no unit: {}", unit_hint(left.1))
        } else if bare_number(left.0) && left.1.is_dimensionless() {
            format!("the number has no unit: {}", unit_hint(right.1))
        } else {
            "both sides must have the same dimension; check the units and the quantities compared"
                .to_string()
        };
        self.error(
            Problem::error(code, message, right.0.span, &format!("a {}", right.1))
                .with_label(left.0.span, format!("a {}", left.1))
                .with_help(help),
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
            let help = match closest(&list.text, self.lists.keys().copied()) {
                Some(near) => format!("did you mean `{near}`?"),
                None => format!("define it with `approved list {} ... end`", list.text),
            };
            self.error(
                Problem::error(
                    "gonogo::check::unknown-list",
                    format!("`{}` is not a parts list of this rulebook", list.text),
                    list.span,
                    "unknown list",
                )
                .with_help(help),
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
        let re = self.compile_pattern(pattern)?;
        self.test_patterns.insert(at, re.clone());
        Some(re)
    }

    fn expect_text(&mut self, subject: &Expr, place: Place) -> Option<TextExpr> {
        let (t, term) = self.resolve(subject)?;
        let text = match term {
            Term::Text(text) => Some(text),
            Term::Number(_) => {
                self.error(
                    Problem::error(
                        "gonogo::check::not-text",
                        format!(
                            "a {} cannot be looked up in a parts list or matched by a pattern",
                            t.kind
                        ),
                        subject.span,
                        &format!("a {}", t.kind),
                    )
                    .with_help("test a part or casting number, a measurement declared as `text`"),
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
                        Problem::error(
                            "gonogo::check::text-order",
                            format!("text cannot be compared with `{}`", op.symbol()),
                            left.span.to(right.span),
                            "text comparison",
                        )
                        .with_help(
                            "compare text with `==` or `!=`, or test it with `in` or `matches`",
                        ),
                    );
                }
            }
            (ValueKind::Number(ld), ValueKind::Number(rd)) => {
                if ld == rd {
                    ok = true;
                } else {
                    self.mismatch(
                        "gonogo::check::dimension-mismatch",
                        format!("cannot compare a {ld} with a {rd}"),
                        (left, ld),
                        (right, rd),
                    );
                }
            }
            (l, r) => {
                self.error(
                    Problem::error(
                        "gonogo::check::dimension-mismatch",
                        format!("cannot compare {l} with {r}"),
                        right.span,
                        &format!("{r}"),
                    )
                    .with_label(left.span, format!("{l}"))
                    .with_help("text is compared with text in quotes, numbers with numbers"),
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
            self.error(
                Problem::error(
                    "gonogo::check::per-cylinder-condition",
                    "a condition needs one value for the engine, not one per cylinder",
                    span,
                    "one value per cylinder",
                )
                .with_help("reduce it with `max(...)`, `min(...)` or `mean(...)`"),
            );
            return false;
        }
        true
    }

    /// Checks an allowance and resolves it, `None` after reporting what is wrong with it.
    fn check_allowance(
        &mut self,
        allowance: &Expr,
        limit: Type,
        op: Option<CompareOp>,
    ) -> Option<resolved::Expr> {
        if matches!(op, Some(CompareOp::Equal | CompareOp::NotEqual)) {
            self.error(
                Problem::error(
                    "gonogo::check::allowance-on-equality",
                    "an allowance widens a limit, and `==` or `!=` has none to widen",
                    allowance.span,
                    "allowance",
                )
                .with_help("use `<=`, `>=` or `between` with the allowance, or drop it"),
            );
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
                self.error(
                    Problem::error(
                        "gonogo::check::negative-allowance",
                        "an allowance cannot be negative",
                        allowance.span,
                        "negative",
                    )
                    .with_help(
                        "an allowance loosens the limit; to tighten it, change the limit itself",
                    ),
                );
                return None;
            }
            None => {
                self.error(
                    Problem::error(
                        "gonogo::check::allowance-not-constant",
                        "an allowance must be a fixed amount, not a measured one",
                        allowance.span,
                        "not a fixed amount",
                    )
                    .with_help(
                        "write the allowance as a number with a unit, like `allowing 0.005 in`",
                    ),
                );
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

fn unit_hint(d: Dimension) -> String {
    match units::display_unit(d) {
        Some(u) => format!("write a {d} with its unit, like `1 {}`", u.symbol),
        None => format!("write a {d}"),
    }
}

fn param_list(formula: &Formula) -> String {
    let names: Vec<&str> = formula.params.iter().map(|p| p.name).collect();
    format!("({})", names.join(", "))
}

fn backticked(names: &[&str]) -> String {
    let quoted: Vec<String> = names.iter().map(|n| format!("`{n}`")).collect();
    quoted.join(", ")
}
