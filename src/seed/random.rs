//! The `random` rule: `K` people drawn uniformly without replacement from
//! those who have not adopted yet — the baseline every targeted rule must
//! beat.

use crate::rng::{shuffle, stream, Stage};
use crate::seed::Cascade;

/// `k` uniformly random seeds (a Fisher–Yates shuffle from
/// `rng::stream(seed, Stage::Rule, stream_id)`), in draw order.
pub fn random_seeds(c: &Cascade<'_>, k: usize, seed: u64, stream_id: u64) -> Vec<u32> {
    let mut pool: Vec<u32> =
        (0..c.network().node_count() as u32).filter(|&v| !c.is_blocked(v)).collect();
    shuffle(&mut stream(seed, Stage::Rule, stream_id), &mut pool);
    pool.truncate(k);
    pool
}
