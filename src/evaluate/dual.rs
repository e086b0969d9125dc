//! Forward-mode automatic differentiation: a value with its exact partial derivatives with
//! respect to every measured input. The GUM law of propagation (JCGM 100:2008, eq. 10) then
//! gives the combined standard uncertainty from those sensitivity coefficients.

use crate::load::InputId;

/// A value and its sensitivity coefficients ∂value/∂input, sorted by input, zeros left out.
#[derive(Clone, Debug, PartialEq)]
pub struct Dual {
    /// The value, in SI units.
    pub value: f64,
    /// `(input, ∂value/∂input)`, sorted by input.
    pub partials: Vec<(InputId, f64)>,
}

impl Dual {
    /// A constant: no input affects it.
    pub fn constant(value: f64) -> Dual {
        Dual {
            value,
            partials: Vec::new(),
        }
    }

    /// A measured input itself: its derivative with respect to itself is 1.
    pub fn input(id: InputId, value: f64) -> Dual {
        Dual {
            value,
            partials: vec![(id, 1.0)],
        }
    }

    /// A reading taken with an instrument whose calibration is a shared input: the reading
    /// plus the calibration's correction (its value: 0 as declared, a draw in a Monte Carlo
    /// run), so ∂/∂calibration is 1 for every reading of that instrument and a formula's
    /// sensitivity to it is the sum over its readings.
    pub fn reading(id: InputId, value: f64, calibration: Option<(InputId, f64)>) -> Dual {
        match calibration {
            Some((c, correction)) if c != id => {
                Dual::input(id, value).add(&Dual::input(c, correction))
            }
            _ => Dual::input(id, value),
        }
    }

    /// Combined standard uncertainty for uncorrelated inputs (GUM eq. 10):
    /// `u_c = √Σ (∂f/∂x_i · u(x_i))²`, with `u(x_i)` looked up by input; never `-0` (a float
    /// sum of nothing is `-0.0`, and its root too).
    pub fn combined_uncertainty(&self, u: impl Fn(InputId) -> f64) -> f64 {
        self.partials
            .iter()
            .map(|(id, c)| (c * u(*id)).powi(2))
            .fold(0.0, |sum, term| sum + term)
            .sqrt()
    }

    /// The sensitivity coefficient for one input (0 when it does not take part).
    pub fn partial(&self, id: InputId) -> f64 {
        self.partials
            .iter()
            .find(|(i, _)| *i == id)
            .map_or(0.0, |(_, c)| *c)
    }

    /// `a·self + b·other`, with value `value`: the building block of every operation.
    fn linear(&self, a: f64, other: &Dual, b: f64, value: f64) -> Dual {
        let mut partials = Vec::with_capacity(self.partials.len() + other.partials.len());
        let (mut i, mut j) = (0, 0);
        while i < self.partials.len() || j < other.partials.len() {
            let left = self.partials.get(i);
            let right = other.partials.get(j);
            let (id, c) = match (left, right) {
                (Some(&(li, lc)), Some(&(ri, _))) if li < ri => {
                    i += 1;
                    (li, a * lc)
                }
                (Some(&(li, _)), Some(&(ri, rc))) if ri < li => {
                    j += 1;
                    (ri, b * rc)
                }
                (Some(&(li, lc)), Some(&(_, rc))) => {
                    i += 1;
                    j += 1;
                    (li, a * lc + b * rc)
                }
                (Some(&(li, lc)), None) => {
                    i += 1;
                    (li, a * lc)
                }
                (None, Some(&(ri, rc))) => {
                    j += 1;
                    (ri, b * rc)
                }
                (None, None) => break,
            };
            if c != 0.0 {
                partials.push((id, c));
            }
        }
        Dual { value, partials }
    }

    /// Applies a function of one variable with derivative `slope` at this value.
    fn chain(&self, value: f64, slope: f64) -> Dual {
        let partials = self
            .partials
            .iter()
            .map(|(id, c)| (*id, c * slope))
            .filter(|(_, c)| *c != 0.0)
            .collect();
        Dual { value, partials }
    }

    /// Sum.
    pub fn add(&self, other: &Dual) -> Dual {
        self.linear(1.0, other, 1.0, self.value + other.value)
    }

    /// Difference.
    pub fn sub(&self, other: &Dual) -> Dual {
        self.linear(1.0, other, -1.0, self.value - other.value)
    }

    /// Product: d(xy) = y dx + x dy.
    pub fn mul(&self, other: &Dual) -> Dual {
        self.linear(other.value, other, self.value, self.value * other.value)
    }

    /// Quotient: d(x/y) = dx/y − x dy/y².
    pub fn div(&self, other: &Dual) -> Dual {
        let q = self.value / other.value;
        self.linear(1.0 / other.value, other, -q / other.value, q)
    }

    /// Negation.
    pub fn neg(&self) -> Dual {
        self.chain(-self.value, -1.0)
    }

    /// Multiplication by a constant.
    pub fn scale(&self, k: f64) -> Dual {
        self.chain(self.value * k, k)
    }

    /// Power with a constant exponent: d(xⁿ) = n xⁿ⁻¹ dx.
    pub fn powf(&self, n: f64) -> Dual {
        self.chain(self.value.powf(n), n * self.value.powf(n - 1.0))
    }

    /// Square root.
    pub fn sqrt(&self) -> Dual {
        let r = self.value.sqrt();
        self.chain(r, 0.5 / r)
    }

    /// Absolute value (derivative ±1; 0 at 0).
    pub fn abs(&self) -> Dual {
        self.chain(
            self.value.abs(),
            self.value.signum() * f64::from(u8::from(self.value != 0.0)),
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn x() -> Dual {
        Dual::input(0, 3.0)
    }

    fn y() -> Dual {
        Dual::input(1, 4.0)
    }

    #[test]
    fn product_rule() {
        let p = x().mul(&y());
        assert_eq!(p.value, 12.0);
        assert_eq!(p.partial(0), 4.0);
        assert_eq!(p.partial(1), 3.0);
    }

    #[test]
    fn quotient_rule() {
        let q = x().div(&y());
        assert_eq!(q.partial(0), 0.25);
        assert_eq!(q.partial(1), -3.0 / 16.0);
    }

    #[test]
    fn a_difference_of_an_input_with_itself_has_no_sensitivity() {
        let d = x().sub(&x());
        assert!(d.partials.is_empty());
        assert_eq!(d.combined_uncertainty(|_| 1.0), 0.0);
        // a sum of no terms is +0, so no report shows an uncertainty of `-0`
        assert!(d.combined_uncertainty(|_| 1.0).is_sign_positive());
        assert!(
            Dual::constant(2.0)
                .combined_uncertainty(|_| 1.0)
                .is_sign_positive()
        );
    }

    #[test]
    fn power_and_root_are_inverse_in_value_and_slope() {
        let r = x().powf(2.0).sqrt();
        assert!((r.value - 3.0).abs() < 1e-15);
        assert!((r.partial(0) - 1.0).abs() < 1e-15);
    }

    #[test]
    fn combined_uncertainty_of_a_sum_adds_in_quadrature() {
        // GUM JCGM 100:2008 eq. 10 with c1 = c2 = 1: u = √(0.3² + 0.4²) = 0.5
        let s = x().add(&y());
        let u = s.combined_uncertainty(|id| if id == 0 { 0.3 } else { 0.4 });
        assert!((u - 0.5).abs() < 1e-15);
    }
}
