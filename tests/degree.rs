//! Integration tests: degree.
