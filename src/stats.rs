//! Estimates with 95% confidence intervals and paired differences.
//!
//! Monte Carlo metrics are means over independent realizations; their
//! interval is the Student-t interval `mean ± t_{0.975, R−1} · s / √R`
//! (common practice, no source). Proportions use the Wilson score interval
//! (Wilson 1927). Paired differences between rules evaluated on common
//! random numbers are the t-interval of the per-realization differences.
//! This module only summarizes numbers; it never draws them.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, StudentsT};

/// The two-sided confidence level used everywhere.
pub const CONFIDENCE: f64 = 0.95;

/// A Monte Carlo estimate: the mean and its 95% interval.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Estimate {
    /// Sample mean.
    pub mean: f64,
    /// Lower end of the 95% interval.
    pub ci_low: f64,
    /// Upper end of the 95% interval.
    pub ci_high: f64,
}

impl Estimate {
    /// An exact value: the interval has zero width.
    pub fn exact(x: f64) -> Self {
        Estimate { mean: x, ci_low: x, ci_high: x }
    }

    /// Half the interval's width.
    pub fn half_width(&self) -> f64 {
        (self.ci_high - self.ci_low) / 2.0
    }

    /// Whether `x` lies inside the interval (ends included).
    pub fn contains(&self, x: f64) -> bool {
        self.ci_low <= x && x <= self.ci_high
    }

    /// The same estimate with every number multiplied by `k > 0`.
    pub fn scaled(&self, k: f64) -> Self {
        Estimate { mean: self.mean * k, ci_low: self.ci_low * k, ci_high: self.ci_high * k }
    }
}

/// The 0.975 quantile of Student's t with `df` degrees of freedom.
///
/// ```
/// let t = spreadplan::stats::t_quantile(10);
/// assert!((t - 2.228).abs() < 1e-3); // standard t table
/// ```
pub fn t_quantile(df: usize) -> f64 {
    if df == 0 {
        return f64::INFINITY;
    }
    StudentsT::new(0.0, 1.0, df as f64)
        .map(|t| t.inverse_cdf(0.5 + CONFIDENCE / 2.0))
        .unwrap_or(1.959_963_984_540_054)
}

/// Mean and sample variance by a two-pass sum in index order (so the result
/// does not depend on how the samples were produced).
pub fn mean_var(samples: &[f64]) -> (f64, f64) {
    let n = samples.len();
    if n == 0 {
        return (f64::NAN, f64::NAN);
    }
    let mean = samples.iter().sum::<f64>() / n as f64;
    if n == 1 {
        return (mean, 0.0);
    }
    let ss: f64 = samples.iter().map(|x| (x - mean) * (x - mean)).sum();
    (mean, ss / (n - 1) as f64)
}

/// The t-interval of a sample mean. One sample gives a zero-width interval;
/// an empty sample gives NaN.
///
/// ```
/// let e = spreadplan::stats::mean_ci(&[1.0, 2.0, 3.0]);
/// assert_eq!(e.mean, 2.0);
/// // s = 1, t_{0.975,2} = 4.303: half width 4.303/√3 = 2.484
/// assert!((e.ci_high - 4.484).abs() < 1e-3);
/// ```
pub fn mean_ci(samples: &[f64]) -> Estimate {
    let n = samples.len();
    let (mean, var) = mean_var(samples);
    if n < 2 {
        return Estimate { mean, ci_low: mean, ci_high: mean };
    }
    let hw = t_quantile(n - 1) * (var / n as f64).sqrt();
    Estimate { mean, ci_low: mean - hw, ci_high: mean + hw }
}

/// The Wilson score interval of a proportion `successes / trials`.
///
/// ```
/// let e = spreadplan::stats::proportion_ci(0, 10);
/// assert_eq!(e.mean, 0.0);
/// assert!(e.ci_high > 0.2 && e.ci_high < 0.35); // Wilson: 0.2775
/// ```
pub fn proportion_ci(successes: u64, trials: u64) -> Estimate {
    if trials == 0 {
        return Estimate { mean: f64::NAN, ci_low: f64::NAN, ci_high: f64::NAN };
    }
    let z = 1.959_963_984_540_054_f64;
    let n = trials as f64;
    let p = successes as f64 / n;
    let denom = 1.0 + z * z / n;
    let centre = (p + z * z / (2.0 * n)) / denom;
    let hw = z * ((p * (1.0 - p) / n) + z * z / (4.0 * n * n)).sqrt() / denom;
    Estimate { mean: p, ci_low: (centre - hw).max(0.0), ci_high: (centre + hw).min(1.0) }
}

/// The t-interval of the paired differences `a[r] − b[r]`.
///
/// Panics if the slices differ in length (a programming error, not input).
pub fn paired_difference(a: &[f64], b: &[f64]) -> Estimate {
    assert_eq!(a.len(), b.len(), "paired samples must have equal length");
    let d: Vec<f64> = a.iter().zip(b).map(|(x, y)| x - y).collect();
    mean_ci(&d)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn t_quantiles_match_tables() {
        // Standard t table (e.g. NIST/SEMATECH e-Handbook, table 1.3.6.7.2).
        assert!((t_quantile(1) - 12.706).abs() < 1e-3);
        assert!((t_quantile(30) - 2.042).abs() < 1e-3);
        assert!((t_quantile(1_000_000) - 1.960).abs() < 1e-3);
    }

    #[test]
    fn paired_difference_of_equal_samples_is_zero() {
        let a = [0.1, 0.5, 0.3];
        let e = paired_difference(&a, &a);
        assert_eq!((e.mean, e.ci_low, e.ci_high), (0.0, 0.0, 0.0));
    }

    #[test]
    fn wilson_matches_worked_example() {
        // Wilson interval for 81/263 (Newcombe 1998, Stat Med 17:857; from memory,
        // re-derived by hand from the closed form):
        // 0.2553–0.3662.
        let e = proportion_ci(81, 263);
        assert!((e.ci_low - 0.2553).abs() < 5e-4, "{e:?}");
        assert!((e.ci_high - 0.3662).abs() < 5e-4, "{e:?}");
    }
}
