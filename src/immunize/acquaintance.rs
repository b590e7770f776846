//! The `acquaintance` rule of Cohen, Havlin & ben-Avraham (2003, PRL
//! 91:247901): pick a uniformly random person, vaccinate a uniformly random
//! contact of theirs, repeat until the budget is used. Needs only that
//! people can name a contact.
//!
//! Repeats: a draw that names someone already vaccinated or already immune
//! is discarded and drawn again (so every dose goes to a new person). The
//! resulting sequence is sampling *without replacement* with weights
//! `q_v = Σ_{u ∼ v} 1/k_u` (a random person u names v with probability
//! `1/(N k_u)`; k_u counts all of u's contacts, immune ones included, since
//! u may name them). This is generated exactly by exponential keys
//! (Efraimidis & Spirakis 2006): `key_v = E_v / q_v`, `E_v ~ Exp(1)`, in
//! ascending order — the same distribution as the draw-and-redraw process,
//! in O(N log N) instead of an unbounded number of redraws. People nobody
//! can name (no contacts) are never reached by the real procedure; they
//! come last, in random order, so that the order still covers everyone.

use rand::Rng;
use rand_chacha::ChaCha8Rng;

use super::Present;

/// The acquaintance order (see the module doc for the repeat rule).
pub fn acquaintance_order(present: &Present<'_>, rng: &mut ChaCha8Rng) -> Vec<u32> {
    let net = present.net;
    let mut keyed: Vec<(f64, u32)> = Vec::new();
    let mut unreachable = Vec::new();
    for v in present.candidates() {
        let q: f64 = net.neighbors(v).iter().map(|&u| 1.0 / net.degree(u) as f64).sum();
        // Draw E_v for every candidate so the stream position is fixed.
        let e = -(1.0 - rng.random::<f64>()).ln();
        if q > 0.0 {
            keyed.push((e / q, v));
        } else {
            unreachable.push((e, v));
        }
    }
    keyed.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    unreachable.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    keyed.iter().chain(&unreachable).map(|&(_, v)| v).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::{Network, WeightMerge};

    #[test]
    fn star_hub_is_named_first_most_of_the_time() {
        // Star with 10 leaves: q_hub = 10, q_leaf = 1/10, so P(hub first) =
        // 10 / (10 + 10·0.1) = 10/11 (sampling with weights q).
        let e: Vec<(u32, u32)> = (1..11).map(|i| (0, i)).collect();
        let net = Network::from_edges(11, false, e, None, WeightMerge::Max).unwrap().0;
        let p = Present::new(&net, &[]);
        let hits = (0..2000)
            .filter(|&r| {
                let mut rng = crate::rng::stream(5, crate::rng::Stage::Rule, r);
                acquaintance_order(&p, &mut rng)[0] == 0
            })
            .count();
        let f = hits as f64 / 2000.0;
        // Binomial sd at p = 0.909, n = 2000 is 0.0064; allow 4 sd.
        assert!((f - 10.0 / 11.0).abs() < 0.026, "{f}");
    }
}
