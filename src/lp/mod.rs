//! Linear programming: the only module that talks to an LP solver.
