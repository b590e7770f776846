//! The `acquaintance` rule: a random contact of a random person — what a
//! team without a network map can do (friend nomination; Cohen, Havlin &
//! ben-Avraham 2003 for immunization; Kim et al. 2015 found nominated
//! friends outperform random seeds in the field).

use crate::rng::{below, stream, Stage};
use crate::seed::Cascade;

/// `k` distinct seeds: repeatedly draw a random person who has not
/// adopted, then one of their contacts (out-neighbours when directed)
/// uniformly; the contact becomes a seed unless already adopted or
/// chosen. People without contacts nominate nobody. After `100 · n` draws
/// without filling the budget (a network with very few contacts), the
/// remaining seeds are drawn uniformly (stated by the rule's output only
/// through the seed list; common practice, no source).
pub fn acquaintance_seeds(c: &Cascade<'_>, k: usize, seed: u64, stream_id: u64) -> Vec<u32> {
    let net = c.network();
    let pool: Vec<u32> = (0..net.node_count() as u32).filter(|&v| !c.is_blocked(v)).collect();
    let mut rng = stream(seed, Stage::Rule, stream_id);
    let mut chosen = vec![false; net.node_count()];
    let mut seeds = Vec::with_capacity(k);
    if pool.is_empty() {
        return seeds;
    }
    let mut draws = 0u64;
    let limit = 100 * pool.len() as u64 + 1000;
    while seeds.len() < k && draws < limit {
        draws += 1;
        let person = pool[below(&mut rng, pool.len() as u64) as usize];
        let contacts = net.neighbors(person);
        if contacts.is_empty() {
            continue;
        }
        let f = contacts[below(&mut rng, contacts.len() as u64) as usize];
        if !chosen[f as usize] && !c.is_blocked(f) {
            chosen[f as usize] = true;
            seeds.push(f);
        }
    }
    while seeds.len() < k && seeds.len() < pool.len() {
        let v = pool[below(&mut rng, pool.len() as u64) as usize];
        if !chosen[v as usize] {
            chosen[v as usize] = true;
            seeds.push(v);
        }
    }
    seeds
}
