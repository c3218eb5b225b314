//! Thermodynamic computations: constants, reaction energies and ΔG' ranges,
//! Alberty's Legendre transform of species data, membrane transport terms and
//! the built-in library of sourced species data.

pub mod compounds;
pub mod constants;
pub mod copies;
pub mod errors;
pub mod reaction;

pub mod legendre;
pub mod library;
pub mod metabolite;
pub mod provenance;
pub mod transport;
pub mod transport_only;
pub mod uncertainty;
