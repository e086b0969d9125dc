//! Repeated readings of one quantity, evaluated as Type A (GUM JCGM 100:2008, 4.2): the best
//! estimate is their mean, its standard uncertainty the experimental standard deviation of the
//! mean s/√n, with n − 1 degrees of freedom.

use super::error::LoadError;
use super::reading::Reading;

/// The Type A evaluation of n repeated readings.
#[derive(Clone, Debug, PartialEq)]
pub struct TypeA {
    /// The arithmetic mean q̄ (GUM eq. 3), in SI units.
    pub mean: f64,
    /// The experimental standard deviation s(q_k) (GUM eq. 4), in SI units.
    pub spread: f64,
    /// The experimental standard deviation of the mean s(q̄) = s/√n (GUM eq. 5): the
    /// standard uncertainty.
    pub standard_uncertainty: f64,
    /// n; the degrees of freedom are n − 1 (GUM G.3.3).
    pub count: usize,
}

/// Mean, s and s/√n of `values`; `None` for fewer than two.
pub fn type_a(values: &[f64]) -> Option<TypeA> {
    let count = values.len();
    if count < 2 {
        return None;
    }
    let n = count as f64;
    let mean = values.iter().sum::<f64>() / n;
    let squares: f64 = values.iter().map(|q| (q - mean).powi(2)).sum();
    let spread = (squares / (n - 1.0)).sqrt();
    Some(TypeA {
        mean,
        spread,
        standard_uncertainty: spread / n.sqrt(),
        count,
    })
}

impl TypeA {
    /// Whether the readings are all the same (to a part in 10⁹ of their mean, so that the
    /// same length written in two units counts as the same): a spread of zero, which says
    /// nothing of the instrument's resolution (GUM JCGM 100:2008, F.2.2.1).
    pub fn has_no_spread(&self) -> bool {
        self.spread <= 1e-9 * self.mean.abs()
    }
}

/// Repeated readings as one reading of their mean, written as the readings were (`72.1 cc,
/// 72.4 cc, 72.2 cc`) in the first one's unit, with their Type A evaluation.
pub fn combine(readings: &[Reading]) -> Result<(Reading, TypeA), LoadError> {
    if readings.iter().any(|r| r.stated.is_some()) {
        return Err(LoadError::StatedInReadings);
    }
    let values: Vec<f64> = readings.iter().map(|r| r.value).collect();
    let evaluated = type_a(&values).ok_or(LoadError::TooFewReadings {
        count: readings.len(),
    })?;
    let written: Vec<&str> = readings.iter().map(|r| r.written.as_str()).collect();
    let reading = Reading {
        value: evaluated.mean,
        stated: None,
        unit: readings.first().and_then(|r| r.unit),
        written: written.join(", "),
    };
    Ok((reading, evaluated))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn three_chamber_readings_give_their_mean_s_and_s_over_root_n() {
        // REFERENCES.md [computed from GUM 4.2]: 72.1, 72.4, 72.2 cc → mean 72.2333 cc,
        // s = 0.15275 cc, u = 0.08819 cc, ν = 2
        let a = type_a(&[72.1, 72.4, 72.2]).unwrap_or_else(|| panic!("two or more"));
        assert!((a.mean - 72.233_333).abs() < 1e-6);
        assert!((a.spread - 0.152_75).abs() < 1e-5);
        assert!((a.standard_uncertainty - 0.088_19).abs() < 1e-5);
        assert_eq!(a.count - 1, 2);
    }

    #[test]
    fn twenty_observations_give_s_of_the_mean_over_root_twenty_and_nineteen_degrees() {
        // GUM JCGM 100:2008 4.4.3 (from memory): 20 observations of a temperature, mean
        // 100.145 °C, s(t_k) = 1.489 °C, s(t̄) = s(t_k)/√20 = 0.333 °C, ν = 19. The readings
        // here are 100.145 ± d, ten each side, with d chosen so that s(t_k) = 1.489 °C.
        let d = 1.489 * (19.0f64 / 20.0).sqrt();
        let values: Vec<f64> = (0..20)
            .map(|i| 100.145 + if i % 2 == 0 { d } else { -d })
            .collect();
        let a = type_a(&values).unwrap_or_else(|| panic!("two or more"));
        assert!((a.mean - 100.145).abs() < 1e-12);
        assert!((a.spread - 1.489).abs() < 1e-12);
        assert!((a.standard_uncertainty - 0.333).abs() < 5e-4);
        assert_eq!(a.count - 1, 19);
    }

    #[test]
    fn readings_all_the_same_have_no_spread() {
        let same = |values: &[f64]| type_a(values).is_some_and(|a| a.has_no_spread());
        assert!(same(&[72.1e-6, 72.1e-6, 72.1e-6]));
        // 1.600 in and 40.64 mm are the same length (1 in = 25.4 mm exactly, NIST SP 811 B.8)
        assert!(same(&[1.6 * 0.0254, 40.64 * 0.001]));
        assert!(same(&[0.0, 0.0]));
        assert!(!same(&[72.1e-6, 72.2e-6, 72.1e-6]));
    }

    #[test]
    fn fewer_than_two_readings_have_no_type_a_evaluation() {
        assert_eq!(type_a(&[72.1]), None);
        assert_eq!(type_a(&[]), None);
        let one = Reading {
            value: 7.21e-5,
            stated: None,
            unit: Some("cc"),
            written: "72.1 cc".to_string(),
        };
        assert_eq!(
            combine(std::slice::from_ref(&one)).map(|_| ()),
            Err(LoadError::TooFewReadings { count: 1 })
        );
    }
}
