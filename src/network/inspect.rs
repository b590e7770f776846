//! Structural summaries of a network: degree moments, components,
//! clustering, assortativity, cores and the configuration-model threshold
//! estimate. Pure functions of a [`Network`](crate::network::Network).
