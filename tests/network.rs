//! Integration tests: network.
