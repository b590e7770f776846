//! Integration tests: generate.
