//! Counter-based coins and named random streams.
//!
//! Every random decision that must be shared between rules (an edge's
//! transmission coin, a person's vaccine coin) is a pure function of
//! `(seed, stage, realization, index)`, computed by SplitMix64-style
//! hashing (Steele, Lea & Flood 2014). Nothing is carried between calls,
//! so results do not depend on thread count or schedule. Choices that a
//! rule makes for itself (a random order, an acquaintance's pick) come from
//! [`stream`], a ChaCha8 generator keyed by the same triple.
//!
//! This module owns randomness only; what a coin means is decided by the
//! caller.

use rand::{Rng, RngCore, SeedableRng};
use rand_chacha::ChaCha8Rng;

/// What a random number is used for; part of every key so that coins of
/// different purposes never coincide.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Stage {
    /// Edge transmission coins (bond percolation, live edges).
    Edge = 1,
    /// Per-person coins: vaccine take, prior immunity, exclusion.
    Node = 2,
    /// A rule's own randomness (random order, acquaintance draws).
    Rule = 3,
    /// Uptake: does the person accept the offered dose.
    Uptake = 4,
    /// Network generators.
    Generate = 5,
    /// Newman–Ziff occupation orders.
    Sweep = 6,
    /// Reverse-reachable set sampling.
    RrSet = 7,
    /// Evaluation-only draws (e.g. the introduced case).
    Eval = 8,
}

const GOLDEN: u64 = 0x9E37_79B9_7F4A_7C15;

/// The SplitMix64 finalizer: a bijective mix of 64 bits.
///
/// ```
/// assert_eq!(spreadplan::rng::splitmix64(0), 0xE220_A839_7B1D_CDAF);
/// ```
#[inline]
pub fn splitmix64(x: u64) -> u64 {
    let mut z = x.wrapping_add(GOLDEN);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// The key of one realization of one stage: hash it with an index through
/// [`hash`] to get that index's coin.
#[inline]
pub fn key(seed: u64, stage: Stage, realization: u64) -> u64 {
    splitmix64(splitmix64(seed ^ ((stage as u64) << 56)) ^ realization.wrapping_mul(GOLDEN))
}

/// 64 random bits for `index` under `key`.
#[inline]
pub fn hash(key: u64, index: u64) -> u64 {
    splitmix64(key ^ splitmix64(index))
}

/// A uniform number in `[0, 1)` with 53 random bits for `index` under `key`.
///
/// ```
/// use spreadplan::rng::{key, uniform, Stage};
/// let k = key(7, Stage::Edge, 0);
/// assert_eq!(uniform(k, 3), uniform(k, 3));
/// assert!((0.0..1.0).contains(&uniform(k, 3)));
/// ```
#[inline]
pub fn uniform(key: u64, index: u64) -> f64 {
    (hash(key, index) >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
}

/// The integer threshold for probability `p`: `hash(key, i) >> 11 <
/// threshold(p)` holds with probability `p` (exactly 0 for `p <= 0`,
/// always for `p >= 1`), and agrees with `uniform(key, i) < p`.
///
/// ```
/// use spreadplan::rng::{hit, threshold};
/// assert!(hit(threshold(1.0), 12345));
/// assert!(!hit(threshold(0.0), 0));
/// ```
#[inline]
pub fn threshold(p: f64) -> u64 {
    if p.is_nan() || p <= 0.0 {
        0
    } else if p >= 1.0 {
        1u64 << 53
    } else {
        (p * (1u64 << 53) as f64).ceil() as u64
    }
}

/// Whether 64 random bits fall under a [`threshold`].
#[inline]
pub fn hit(threshold: u64, bits: u64) -> bool {
    (bits >> 11) < threshold
}

/// The coin of `index` in `realization` of `stage`: uniform in `[0, 1)`.
#[inline]
pub fn coin(seed: u64, stage: Stage, realization: u64, index: u64) -> f64 {
    uniform(key(seed, stage, realization), index)
}

/// A named generator (ChaCha8) for a rule's own choices in one realization.
pub fn stream(seed: u64, stage: Stage, realization: u64) -> ChaCha8Rng {
    ChaCha8Rng::seed_from_u64(key(seed, stage, realization))
}

/// A uniform integer in `0..n` (`n > 0`), unbiased.
#[inline]
pub fn below<R: RngCore>(rng: &mut R, n: u64) -> u64 {
    debug_assert!(n > 0);
    rng.random_range(0..n)
}

/// Fisher–Yates shuffle driven by `rng`, stable across platforms.
pub fn shuffle<T, R: RngCore>(rng: &mut R, items: &mut [T]) {
    for i in (1..items.len()).rev() {
        let j = below(rng, i as u64 + 1) as usize;
        items.swap(i, j);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coins_are_pure_and_distinct_by_stage() {
        assert_eq!(coin(1, Stage::Edge, 2, 3), coin(1, Stage::Edge, 2, 3));
        assert_ne!(coin(1, Stage::Edge, 2, 3), coin(1, Stage::Node, 2, 3));
        assert_ne!(coin(1, Stage::Edge, 2, 3), coin(1, Stage::Edge, 3, 3));
    }

    #[test]
    fn threshold_matches_uniform() {
        let k = key(42, Stage::Edge, 0);
        for p in [0.0, 0.1, 0.5, 0.9, 1.0] {
            let t = threshold(p);
            for i in 0..2000 {
                assert_eq!(hit(t, hash(k, i)), uniform(k, i) < p, "p={p} i={i}");
            }
        }
    }

    #[test]
    fn coin_mean_is_half() {
        // 10^5 uniforms: sd of the mean = 0.289/316 ≈ 0.0009; 5 sd tolerance.
        let k = key(9, Stage::Node, 0);
        let m: f64 = (0..100_000).map(|i| uniform(k, i)).sum::<f64>() / 1e5;
        assert!((m - 0.5).abs() < 0.0046, "{m}");
    }

    #[test]
    fn shuffle_is_a_permutation() {
        let mut v: Vec<u32> = (0..100).collect();
        shuffle(&mut stream(1, Stage::Rule, 0), &mut v);
        let mut s = v.clone();
        s.sort();
        assert_eq!(s, (0..100).collect::<Vec<_>>());
        assert_ne!(v, s);
    }
}
