//! Integration tests: one harness, one topic module per area. Checks name
//! their outside source beside the assertion.

mod common;
mod degree;
mod generate;
mod immunize;
mod network;
mod percolation;
mod report;
mod seed;
