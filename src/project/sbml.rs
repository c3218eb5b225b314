//! SBML import.
