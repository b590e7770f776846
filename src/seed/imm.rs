//! The `ris` rule: IMM, influence maximization via martingales (Tang, Shi
//! & Xiao 2015, SIGMOD), on reverse-reachable sets.
//!
//! Notation of the paper: `n` people who can adopt, budget `k`, slack `ε`,
//! failure exponent `ℓ`. The published algorithm:
//!
//! 1. `ℓ ← ℓ · (1 + ln 2 / ln n)` so that both phases together fail with
//!    probability at most `n^−ℓ`.
//! 2. Sampling phase: `ε' = √2 · ε`,
//!    `λ' = (2 + 2ε'/3) · (ln C(n, k) + ℓ ln n + ln log₂ n) · n / ε'²`;
//!    for `i = 1, …, log₂ n − 1`: `x = n / 2^i`, extend the collection to
//!    `θ_i = λ' / x` sets, take the greedy `k`-cover `S_i`; if
//!    `n · F_R(S_i) ≥ (1 + ε') · x` then `LB = n · F_R(S_i) / (1 + ε')`, stop.
//!    (`LB = 1` if no round passes.)
//! 3. `λ* = 2n · ((1 − 1/e) α + β)² / ε²` with `α = √(ℓ ln n + ln 2)`,
//!    `β = √((1 − 1/e) (ln C(n, k) + ℓ ln n + ln 2))`; extend to
//!    `θ = λ* / LB` sets and return the greedy `k`-cover.
//!
//! The result's expected reach is at least `(1 − 1/e − ε)` of the best `k`
//! seeds with probability at least `1 − n^−ℓ`. As published, the final
//! collection extends the one of the sampling phase (Chen 2018 discusses
//! the dependence this introduces; the effect is within the constant
//! factors of the analysis). A cap on the number of sets (`max_sets`)
//! protects memory; when it binds the guarantee is not certified and the
//! result says so.

use crate::progress::Progress;
use crate::seed::rr_sets::{greedy_cover, RrSets};
use crate::seed::Cascade;

/// IMM's output.
#[derive(Clone, Debug)]
pub struct Imm {
    /// Seeds in greedy order.
    pub seeds: Vec<u32>,
    /// The final RR collection (reused by the `lp` rule).
    pub sets: RrSets,
    /// `θ = λ* / LB` (before any cap).
    pub theta: f64,
    /// The sampling phase's lower bound `LB` on the optimum.
    pub lower_bound: f64,
    /// `ℓ` after the adjustment `ℓ · (1 + ln 2 / ln n)`.
    pub ell_adjusted: f64,
    /// `n · F_R(S)`: the coverage estimate of the seeds' reach.
    pub coverage_estimate: f64,
    /// Whether `max_sets` bound (guarantee not certified).
    pub capped: bool,
}

/// `ln C(n, k)`, summed term by term.
///
/// ```
/// let x = spreadplan::seed::ln_binomial(10, 3);
/// assert!((x - 120f64.ln()).abs() < 1e-12);
/// ```
pub fn ln_binomial(n: u64, k: u64) -> f64 {
    let k = k.min(n - k.min(n));
    (0..k).map(|i| ((n - i) as f64 / (i + 1) as f64).ln()).sum()
}

/// The published IMM constants `(λ', λ*)` for `n`, `k`, `ε` and the
/// adjusted `ℓ` (Tang, Shi & Xiao 2015, eqs. for λ' and λ*).
pub fn imm_lambdas(n: f64, k: u64, eps: f64, ell: f64) -> (f64, f64) {
    let lnc = ln_binomial(n as u64, k);
    let ln_n = n.ln();
    let eps1 = std::f64::consts::SQRT_2 * eps;
    let lambda1 = (2.0 + 2.0 * eps1 / 3.0) * (lnc + ell * ln_n + n.log2().ln()) * n / (eps1 * eps1);
    let e1 = 1.0 - (-1f64).exp();
    let alpha = (ell * ln_n + 2f64.ln()).sqrt();
    let beta = (e1 * (lnc + ell * ln_n + 2f64.ln())).sqrt();
    let lambda_star = 2.0 * n * (e1 * alpha + beta).powi(2) / (eps * eps);
    (lambda1, lambda_star)
}

/// Runs IMM for `k` seeds (see the module doc for the formulas).
/// `eps ∈ (0, 1)`, `ell > 0` and `1 ≤ k ≤ n` are checked by the caller.
pub fn imm(
    c: &Cascade<'_>,
    k: usize,
    eps: f64,
    ell: f64,
    seed: u64,
    max_sets: u64,
    progress: &dyn Progress,
) -> Imm {
    let n = c.active_count().max(2) as f64;
    let ell = ell * (1.0 + 2f64.ln() / n.ln());
    let (lambda1, lambda_star) = imm_lambdas(n, k as u64, eps, ell);
    let eps1 = std::f64::consts::SQRT_2 * eps;
    let mut sets = RrSets::new(0);
    let mut lb = 1.0;
    let mut capped = false;
    // i = 1, …, log₂ n − 1 (log₂ n rounded down).
    let rounds = (n.log2().floor() as i64 - 1).max(0);
    progress.phase("IMM sampling", rounds as u64 + 1);
    for i in 1..=rounds {
        let x = n / 2f64.powi(i as i32);
        let theta_i = (lambda1 / x).ceil();
        let target = theta_i.min(max_sets as f64) as u64;
        capped |= theta_i > max_sets as f64;
        sets.extend_to(c, target, seed);
        progress.advance(1);
        let cov = greedy_cover(&sets, c, k, &[], None);
        let f = *cov.covered.last().unwrap_or(&0) as f64 / sets.len().max(1) as f64;
        if n * f >= (1.0 + eps1) * x {
            lb = n * f / (1.0 + eps1);
            break;
        }
    }
    let theta = (lambda_star / lb).ceil();
    capped |= theta > max_sets as f64;
    sets.extend_to(c, (theta.min(max_sets as f64) as u64).max(sets.len() as u64), seed);
    progress.finish();
    let cov = greedy_cover(&sets, c, k, &[], None);
    let f = *cov.covered.last().unwrap_or(&0) as f64 / sets.len().max(1) as f64;
    Imm {
        seeds: cov.seeds,
        sets,
        theta,
        lower_bound: lb,
        ell_adjusted: ell,
        coverage_estimate: n * f,
        capped,
    }
}
