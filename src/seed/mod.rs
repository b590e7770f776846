//! Cascade models, reverse-reachable sets, seeding rules and the seeding
//! evaluator.
