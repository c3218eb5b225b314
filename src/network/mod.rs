//! Metabolite–reaction graph and stoichiometric matrix.
