//! Random and regular network generators, deterministic from a seed.
//!
//! Every generator returns a [`Network`](crate::network::Network) (and, for
//! models with groups, a [`NodeTable`](crate::network::NodeTable)); writing
//! files is the CLI's job through `network::load::write_edge_list`.
