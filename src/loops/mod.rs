//! Internal loops in the closed network.
