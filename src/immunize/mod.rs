//! Immunization rules (orders of whom to vaccinate), the class-level LP
//! allocation, and the immunization evaluator.
