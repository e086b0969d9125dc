//! The coverage factor a finding is judged with: a fixed k, or k from the t-distribution at
//! the effective degrees of freedom of the margin's combined uncertainty (GUM JCGM 100:2008,
//! G.3 and G.4), as the rulebook's `coverage` line says.

use statrs::distribution::{ContinuousCDF, Normal, StudentsT};

use super::dual::Dual;
use super::expr::Evaluator;
use crate::check::model::Coverage;
use crate::load::{Distribution, Input, InputId};

impl Evaluator<'_> {
    /// The coverage factor k and the effective degrees of freedom ν_eff of `d`'s combined
    /// standard uncertainty under the rulebook's coverage (ν_eff infinite when every component
    /// is of Type B).
    pub fn coverage(&self, d: &Dual) -> (f64, f64) {
        let nu = effective_degrees_of_freedom(&d.partials, |id| self.input_info(id));
        (coverage_factor(self.rulebook.coverage, nu), nu)
    }
}

/// Welch–Satterthwaite (GUM eq. G.2b): ν_eff = u_c⁴ / Σ (c_i·u_i)⁴/ν_i over every component of
/// every input, a component of infinite degrees of freedom (normal or rectangular, Type B)
/// adding nothing below the line. Infinite when no component has finite degrees of freedom or
/// the combined uncertainty is zero.
pub fn effective_degrees_of_freedom<'a>(
    partials: &[(InputId, f64)],
    input: impl Fn(InputId) -> Option<&'a Input>,
) -> f64 {
    let mut variance = 0.0;
    let mut below = 0.0;
    for (id, c) in partials {
        let Some(i) = input(*id) else { continue };
        variance += (c * i.standard_uncertainty).powi(2);
        for component in &i.components {
            if let Distribution::StudentT { degrees_of_freedom } = component.distribution {
                below += (c * component.standard_uncertainty).powi(4) / degrees_of_freedom;
            }
        }
    }
    if below > 0.0 && variance > 0.0 {
        variance.powi(2) / below
    } else {
        f64::INFINITY
    }
}

/// The coverage factor: the fixed k, or for a coverage probability p the quantile of the
/// t-distribution with ν degrees of freedom at (1 + p)/2 (GUM G.3.4), the normal quantile
/// when ν is infinite (GUM G.3.3: 1.960 for 95 %). Quantiles from `statrs`.
pub fn coverage_factor(coverage: Coverage, nu: f64) -> f64 {
    let p = match coverage {
        Coverage::Factor(k) => return k,
        Coverage::Probability(p) => p,
    };
    let level = (1.0 + p) / 2.0;
    if nu.is_finite()
        && let Ok(t) = StudentsT::new(0.0, 1.0, nu)
    {
        return t.inverse_cdf(level);
    }
    Normal::new(0.0, 1.0).map_or(f64::NAN, |n| n.inverse_cdf(level))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::load::{Component, InputName, UncertaintySource};

    fn close(a: f64, b: f64, digits: i32) -> bool {
        (a - b).abs() < 0.5 * 10f64.powi(-digits)
    }

    #[test]
    fn k_for_95_percent_follows_the_published_t_table() {
        // REFERENCES.md, GUM Table G.2 (checked there with scipy) for p = 95 %:
        // ν = 2 → 4.30, 5 → 2.57, 10 → 2.23, ∞ → 1.96; and 95.45 %: 2 → 4.53, 10 → 2.28, ∞ → 2.00
        let p95 = Coverage::Probability(0.95);
        assert!(close(coverage_factor(p95, 2.0), 4.30, 2));
        assert!(close(coverage_factor(p95, 5.0), 2.57, 2));
        assert!(close(coverage_factor(p95, 10.0), 2.23, 2));
        assert!(close(coverage_factor(p95, f64::INFINITY), 1.96, 2));
        let p9545 = Coverage::Probability(0.9545);
        assert!(close(coverage_factor(p9545, 2.0), 4.53, 2));
        assert!(close(coverage_factor(p9545, 10.0), 2.28, 2));
        assert!(close(coverage_factor(p9545, f64::INFINITY), 2.00, 2));
    }

    #[test]
    fn a_fixed_factor_is_kept_whatever_the_degrees_of_freedom() {
        assert_eq!(coverage_factor(Coverage::Factor(2.0), 3.0), 2.0);
        assert_eq!(coverage_factor(Coverage::default(), f64::INFINITY), 2.0);
    }

    fn input(u: f64, nu: Option<f64>) -> Input {
        Input {
            name: InputName::Literal("x".to_string()),
            value: 1.0,
            standard_uncertainty: u,
            components: vec![Component {
                standard_uncertainty: u,
                distribution: match nu {
                    Some(degrees_of_freedom) => Distribution::StudentT { degrees_of_freedom },
                    None => Distribution::Normal,
                },
            }],
            unit: None,
            written: None,
            source: UncertaintySource::Rulebook,
        }
    }

    #[test]
    fn welch_satterthwaite_gives_the_gum_g_4_1_example() {
        // GUM JCGM 100:2008 G.4.1 (from memory): Y = b·X1·X2·X3, relative standard
        // uncertainties 0.25 %, 0.57 %, 0.82 % from n = 10, 5 and 15 readings: u_c/y = 1.03 %,
        // ν_eff = 1.03⁴ / (0.25⁴/9 + 0.57⁴/4 + 0.82⁴/14) = 19.0, and t₉₅(19) = 2.09 (Table G.2)
        let inputs = [
            input(0.25, Some(9.0)),
            input(0.57, Some(4.0)),
            input(0.82, Some(14.0)),
        ];
        let partials = [(0, 1.0), (1, 1.0), (2, 1.0)];
        let nu = effective_degrees_of_freedom(&partials, |id| inputs.get(id as usize));
        assert!(close(nu, 19.0, 0), "ν_eff {nu}");
        assert!(close(
            coverage_factor(Coverage::Probability(0.95), nu.round()),
            2.09,
            2
        ));
    }

    #[test]
    fn type_b_components_alone_have_infinite_degrees_of_freedom() {
        let inputs = [input(0.3, None), input(0.4, None)];
        let partials = [(0, 1.0), (1, 2.0)];
        let nu = effective_degrees_of_freedom(&partials, |id| inputs.get(id as usize));
        assert_eq!(nu, f64::INFINITY);
    }
}
