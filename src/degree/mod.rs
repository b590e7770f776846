//! Degree distributions and their generating functions.
