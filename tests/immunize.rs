//! Integration tests: immunize.
