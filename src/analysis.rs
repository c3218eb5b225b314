//! The analysis context shared by all checks.
