//! Random and regular network generators, deterministic from a seed.
//!
//! Every generator returns a [`Network`](crate::network::Network) (and, for
//! models with groups, a [`NodeTable`](crate::network::NodeTable)); writing
//! files is the CLI's job through `network::load::write_edge_list`.
//! Randomness comes only from `rng::stream(seed, Stage::Generate, i)`
//! (ChaCha8), so the same seed gives the same network on every platform.
//! Degree distributions and their specs belong to `degree`.

mod barabasi_albert;
mod chung_lu;
mod configuration;
mod erdos_renyi;
mod lattice;
mod regular;
mod sbm;
mod town;
mod watts_strogatz;

pub use barabasi_albert::barabasi_albert;
pub use chung_lu::chung_lu;
pub use configuration::{configuration_model, Erased};
pub use erdos_renyi::{gnm, gnp};
pub use lattice::{square_lattice, triangular_lattice};
pub use regular::random_regular;
pub use sbm::{stochastic_block_model, Blocks};
pub use town::{town, Town, TownConfig, TOWN_GROUPS};
pub use watts_strogatz::watts_strogatz;

use rand::Rng;
use rand_chacha::ChaCha8Rng;

/// Why a generator refused its parameters.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum GenerateError {
    /// A parameter is outside its allowed range.
    #[error("{name} = {value}: {reason}")]
    Parameter {
        /// The parameter's name as the CLI spells it.
        name: &'static str,
        /// The bad value, formatted.
        value: String,
        /// What the value must satisfy.
        reason: String,
    },
    /// The randomized construction did not succeed within its attempt limit.
    #[error("gave up after {attempts} attempts: {what}")]
    GaveUp {
        /// Attempts made.
        attempts: u64,
        /// What could not be achieved.
        what: String,
    },
}

/// Shorthand for a [`GenerateError::Parameter`].
pub(crate) fn bad(
    name: &'static str,
    value: impl ToString,
    reason: impl ToString,
) -> GenerateError {
    GenerateError::Parameter { name, value: value.to_string(), reason: reason.to_string() }
}

/// The number of failures before the next success of Bernoulli(`p`) trials,
/// given `ln_q = ln(1 − p)` (geometric skipping; Batagelj & Brandes 2005,
/// eq. for `k = ⌊log(1 − r) / log(1 − p)⌋`). Returns `f64::INFINITY` when
/// `p = 0` and 0 when `p = 1`.
#[inline]
pub(crate) fn geometric_skip(rng: &mut ChaCha8Rng, ln_q: f64) -> f64 {
    if ln_q == f64::NEG_INFINITY {
        return 0.0;
    }
    if ln_q == 0.0 {
        return f64::INFINITY;
    }
    let r: f64 = rng.random::<f64>();
    ((-r).ln_1p() / ln_q).floor()
}

/// Refuses a model whose (expected) edge count would exceed the `u32`
/// edge-index limit of [`Network`](crate::network::Network).
pub(crate) fn check_edges(
    name: &'static str,
    value: impl ToString,
    edges: f64,
) -> Result<(), GenerateError> {
    if edges > u32::MAX as f64 * 0.99 {
        Err(bad(name, value, format!("about {edges:.3e} edges exceed the u32 edge limit")))
    } else {
        Ok(())
    }
}

/// Checks a probability parameter.
pub(crate) fn check_prob(name: &'static str, p: f64) -> Result<(), GenerateError> {
    if (0.0..=1.0).contains(&p) {
        Ok(())
    } else {
        Err(bad(name, p, "must be a probability in [0, 1]"))
    }
}
