//! Integration tests: seed.
