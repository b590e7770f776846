//! Parametric degree models from a spec string `family:key=value,…`.
//!
//! | spec | p_k | support |
//! |---|---|---|
//! | `poisson:mean=c` | e^{−c} c^k / k! | k ≥ 0, truncated |
//! | `geometric:mean=m` | (1 − a) a^k, a = m/(1 + m) (the exponential distribution of Newman, Strogatz & Watts 2001, a = e^{−1/κ}) | k ≥ 0, truncated |
//! | `powerlaw:exponent=γ,min=a,max=b[,cutoff=κ]` | ∝ k^{−γ} e^{−k/κ} (no exponential factor without `cutoff`) | a ≤ k ≤ b; `max` may be omitted when `cutoff` is given (then truncated) |
//! | `negbin:mean=m,dispersion=r` | Γ(k + r)/(k! Γ(r)) (r/(r+m))^r (m/(r+m))^k — r is the dispersion ("size") parameter of epidemiology, variance m + m²/r; r → ∞ is Poisson | k ≥ 0, truncated |
//! | `regular:k=d` | all mass on d | {d} |
//!
//! Truncation: infinite supports stop at the first k past the mode where
//! a bound on the remaining tail of k² p_k (hence also of p_k and k p_k)
//! is below [`TAIL_MASS`] (1e-12) times the kept mass; the kept
//! probabilities are renormalized, and the dropped mass is recorded in
//! [`DegreeDistribution::dropped_tail`].

use super::distribution::{DegreeDistribution, DegreeError, MAX_SUPPORT, TAIL_MASS};

fn err(spec: &str, msg: String) -> DegreeError {
    DegreeError::Spec { spec: spec.to_owned(), msg }
}

/// Parses a model spec; errors name the bad key or value.
///
/// ```
/// let d = spreadplan::degree::spec::parse("regular:k=4").unwrap();
/// assert_eq!(d.support(), &[4]);
/// assert!(spreadplan::degree::spec::parse("poisson:mean=-1").is_err());
/// ```
pub fn parse(spec: &str) -> Result<DegreeDistribution, DegreeError> {
    let s = spec.trim();
    let (family, rest) = s.split_once(':').unwrap_or((s, ""));
    let family = family.trim().to_ascii_lowercase();
    let mut kv: Vec<(String, f64)> = Vec::new();
    for part in rest.split(',').map(str::trim).filter(|p| !p.is_empty()) {
        let (k, v) = part
            .split_once('=')
            .ok_or_else(|| err(spec, format!("expected key=value, got {part:?}")))?;
        let key = k.trim().to_ascii_lowercase();
        let x: f64 = v
            .trim()
            .parse()
            .map_err(|_| err(spec, format!("{key} must be a number, got {:?}", v.trim())))?;
        if !x.is_finite() {
            return Err(err(spec, format!("{key} must be finite, got {:?}", v.trim())));
        }
        if kv.iter().any(|(k2, _)| *k2 == key) {
            return Err(err(spec, format!("key {key} given twice")));
        }
        kv.push((key, x));
    }
    let allowed: &[&str] = match family.as_str() {
        "poisson" | "geometric" => &["mean"],
        "powerlaw" => &["exponent", "min", "max", "cutoff"],
        "negbin" => &["mean", "dispersion"],
        "regular" => &["k"],
        _ => {
            return Err(err(
                spec,
                format!(
                "unknown family {family:?}; known: poisson, geometric, powerlaw, negbin, regular"
            ),
            ))
        }
    };
    if let Some((k, _)) = kv.iter().find(|(k, _)| !allowed.contains(&k.as_str())) {
        return Err(err(
            spec,
            format!("unknown key {k:?} for {family}; expected {}", allowed.join(", ")),
        ));
    }
    let get = |key: &str| kv.iter().find(|(k, _)| k == key).map(|&(_, x)| x);
    let need = |key: &str| get(key).ok_or_else(|| err(spec, format!("missing key {key}")));
    let positive = |key: &str| -> Result<f64, DegreeError> {
        let x = need(key)?;
        if x <= 0.0 {
            return Err(err(spec, format!("{key} must be > 0, got {x}")));
        }
        Ok(x)
    };
    let integer = |key: &str, x: f64| -> Result<u32, DegreeError> {
        if x < 0.0 || x.fract() != 0.0 || x > f64::from(u32::MAX) {
            return Err(err(spec, format!("{key} must be a non-negative integer, got {x}")));
        }
        Ok(x as u32)
    };
    let limit_mean = |key: &str, x: f64| -> Result<(), DegreeError> {
        if x > 1e6 {
            return Err(err(spec, format!("{key} must be at most 1e6, got {x}")));
        }
        Ok(())
    };
    let build = |pairs: Vec<(u32, f64)>, dropped: f64| {
        DegreeDistribution::from_classes(
            pairs
                .into_iter()
                .map(|(k, w)| super::DegreeClass {
                    degree: k,
                    group: None,
                    prob: w,
                    cost: 1.0,
                    uptake: 1.0,
                })
                .collect(),
            Vec::new(),
            s,
            dropped,
        )
        .map_err(|m| err(spec, m))
    };
    match family.as_str() {
        "regular" => {
            let k = integer("k", need("k")?)?;
            build(vec![(k, 1.0)], 0.0)
        }
        "poisson" => {
            let c = positive("mean")?;
            limit_mean("mean", c)?;
            // log p_k = −c + k ln c − ln k!, accumulated term by term.
            let lc = c.ln();
            let (pairs, dropped) =
                truncated(
                    spec,
                    c,
                    |k, prev| {
                        if k == 0 {
                            -c
                        } else {
                            prev + lc - f64::from(k).ln()
                        }
                    },
                )?;
            build(pairs, dropped)
        }
        "geometric" => {
            let m = positive("mean")?;
            limit_mean("mean", m)?;
            let a = m / (1.0 + m);
            let (la, l1a) = (a.ln(), (1.0 - a).ln());
            let (pairs, dropped) = truncated(spec, 0.0, |k, _| l1a + f64::from(k) * la)?;
            build(pairs, dropped)
        }
        "negbin" => {
            let m = positive("mean")?;
            limit_mean("mean", m)?;
            let r = positive("dispersion")?;
            let (lq, lp0) = ((m / (r + m)).ln(), r * (r / (r + m)).ln());
            let mode = ((r - 1.0) * m / r).max(0.0);
            let (pairs, dropped) = truncated(spec, mode, |k, prev| {
                if k == 0 {
                    lp0
                } else {
                    prev + ((f64::from(k) - 1.0 + r) / f64::from(k)).ln() + lq
                }
            })?;
            build(pairs, dropped)
        }
        "powerlaw" => {
            let g = need("exponent")?;
            if g <= 0.0 {
                return Err(err(spec, format!("exponent must be > 0, got {g}")));
            }
            let min = integer("min", get("min").unwrap_or(1.0))?;
            if min == 0 {
                return Err(err(
                    spec,
                    "min must be at least 1 (k^-exponent is infinite at 0)".into(),
                ));
            }
            let cutoff = match get("cutoff") {
                Some(x) if x <= 0.0 => {
                    return Err(err(spec, format!("cutoff must be > 0, got {x}")))
                }
                other => other,
            };
            let lw = |k: u32| -g * f64::from(k).ln() - cutoff.map_or(0.0, |kc| f64::from(k) / kc);
            match get("max") {
                Some(x) => {
                    let max = integer("max", x)?;
                    if max < min {
                        return Err(err(
                            spec,
                            format!("max must be >= min, got max={max}, min={min}"),
                        ));
                    }
                    if (max - min) as usize >= MAX_SUPPORT {
                        return Err(err(
                            spec,
                            format!("max - min must be below {MAX_SUPPORT}, got {}", max - min),
                        ));
                    }
                    // Weights relative to the largest (at min) to avoid underflow.
                    let l0 = lw(min);
                    build((min..=max).map(|k| (k, (lw(k) - l0).exp())).collect(), 0.0)
                }
                None => {
                    let Some(kc) = cutoff else {
                        return Err(err(
                            spec,
                            "missing key max (or give cutoff for an exponential cutoff)".into(),
                        ));
                    };
                    // Mode of k^-γ e^{-k/κ} is at k = min for γ > 0.
                    let l0 = lw(min);
                    let (pairs, dropped) =
                        truncated_from(spec, min, f64::from(min), 1.0 / kc, |k, _| lw(k) - l0)?;
                    build(pairs, dropped)
                }
            }
        }
        _ => unreachable!("family checked above"),
    }
}

/// Accumulates log-weights `logw(k, previous)` from k = 0 until past
/// `mode` the remaining tail is below [`TAIL_MASS`] of the total. The
/// tail after k is bounded by the geometric series of the current ratio
/// p_{k+1}/p_k (valid once the ratio decreases, i.e. past the mode of these
/// log-concave families).
fn truncated(
    spec: &str,
    mode: f64,
    logw: impl FnMut(u32, f64) -> f64,
) -> Result<(Vec<(u32, f64)>, f64), DegreeError> {
    truncated_from(spec, 0, mode, 0.0, logw)
}

/// As [`truncated`], starting at `start`. `min_decay` is a known lower
/// bound on −ln(p_{k+1}/p_k) over the whole tail (0: use the current
/// ratio, valid for log-concave weights past the mode).
fn truncated_from(
    spec: &str,
    start: u32,
    mode: f64,
    min_decay: f64,
    mut logw: impl FnMut(u32, f64) -> f64,
) -> Result<(Vec<(u32, f64)>, f64), DegreeError> {
    let mut pairs: Vec<(u32, f64)> = Vec::new();
    let mut prev = 0.0;
    let mut total = 0.0;
    let mut k = start;
    loop {
        let l = logw(k, prev);
        let w = l.exp();
        total += w;
        pairs.push((k, w));
        if f64::from(k) > mode && k > start {
            let next = logw(k + 1, l);
            // Log-concave tails: the current ratio bounds all later ones.
            // Power law × exponential: the ratios rise towards e^{-1/κ}.
            let ratio = if min_decay > 0.0 { (-min_decay).exp() } else { (next - l).exp() };
            // Bound the tail of k² p_k too (its term ratio carries the
            // factor ((k+2)/(k+1))², decreasing in k), so ⟨k⟩ and ⟨k²⟩ lose
            // less than TAIL_MASS as well.
            let k1 = f64::from(k) + 1.0;
            let ratio2 = ratio * ((k1 + 1.0) / k1).powi(2);
            if ratio2 < 1.0 {
                let tail = next.exp() / (1.0 - ratio);
                let tail2 = next.exp() * k1 * k1 / (1.0 - ratio2);
                if tail2 < TAIL_MASS * total {
                    return Ok((pairs, tail / (total + tail)));
                }
            }
        }
        if pairs.len() >= MAX_SUPPORT {
            return Err(err(spec, format!("support would exceed {MAX_SUPPORT} degrees")));
        }
        prev = l;
        k += 1;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn poisson_moments_and_tail() {
        let d = parse("poisson:mean=6").unwrap();
        assert!((d.mean() - 6.0).abs() < 1e-10);
        assert!((d.variance() - 6.0).abs() < 1e-9);
        assert!(d.dropped_tail() < 1e-12);
        let big = parse("poisson:mean=2000").unwrap();
        assert!((big.mean() - 2000.0).abs() < 1e-6);
    }

    #[test]
    fn geometric_negbin_powerlaw() {
        let g = parse("geometric:mean=6").unwrap();
        assert!((g.mean() - 6.0).abs() < 1e-9);
        // Variance of the geometric on k >= 0: m(1 + m).
        assert!((g.variance() - 42.0).abs() < 1e-7);
        let n = parse("negbin:mean=6,dispersion=0.8").unwrap();
        assert!((n.mean() - 6.0).abs() < 1e-8);
        assert!((n.variance() - (6.0 + 36.0 / 0.8)).abs() < 1e-6);
        let p = parse("powerlaw:exponent=2.5,min=2,max=300").unwrap();
        assert_eq!((p.support()[0], p.max_degree()), (2, 300));
        let c = parse("powerlaw:exponent=2,cutoff=20").unwrap();
        assert_eq!(c.support()[0], 1);
        assert!(c.max_degree() > 200);
    }

    #[test]
    fn errors_name_key_and_value() {
        let e = parse("poisson:mean=abc").unwrap_err().to_string();
        assert!(e.contains("mean") && e.contains("abc"), "{e}");
        let e = parse("poisson:lambda=3").unwrap_err().to_string();
        assert!(e.contains("lambda"), "{e}");
        let e = parse("zipf:a=2").unwrap_err().to_string();
        assert!(e.contains("zipf"), "{e}");
        let e = parse("regular:k=2.5").unwrap_err().to_string();
        assert!(e.contains("2.5"), "{e}");
        assert!(parse("powerlaw:exponent=2.5,min=2").is_err());
        assert!(parse("powerlaw:exponent=2.5,min=5,max=3").is_err());
        assert!(parse("negbin:mean=3").is_err());
        assert!(parse("poisson:mean=1e9").is_err());
        assert!(parse("geometric").is_err());
    }
}
