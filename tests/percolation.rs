//! Integration tests: percolation.
