//! The `random` rule: doses in a uniformly random order, drawn afresh in
//! every realization. Needs no information about contacts.

use rand_chacha::ChaCha8Rng;

use super::Present;

/// A uniformly random permutation of the present people (Fisher–Yates
/// driven by `rng`).
pub fn random_order(present: &Present<'_>, rng: &mut ChaCha8Rng) -> Vec<u32> {
    let mut order = present.candidates();
    crate::rng::shuffle(rng, &mut order);
    order
}
