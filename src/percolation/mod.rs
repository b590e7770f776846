//! Percolation on a [`Network`](crate::network::Network): union–find,
//! bond and site realizations from counter-based coins, Newman–Ziff sweeps,
//! reverse-add budget curves, and the non-backtracking spectral radius.

mod union_find;

pub use union_find::UnionFind;
