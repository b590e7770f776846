//! Progress reporting without printing: long phases call a [`Progress`]
//! that the command line turns into a progress bar (or nothing).

/// Receives progress of long phases. Implementations must be cheap and
/// thread-safe; the library calls them from rayon workers.
pub trait Progress: Sync {
    /// A phase with `total` steps begins.
    fn phase(&self, _name: &str, _total: u64) {}
    /// `n` more steps of the current phase are done.
    fn advance(&self, _n: u64) {}
    /// The current phase is over.
    fn finish(&self) {}
}

/// Progress that goes nowhere.
#[derive(Clone, Copy, Debug, Default)]
pub struct Silent;

impl Progress for Silent {}
