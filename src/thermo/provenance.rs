//! What a reviewer is told about the built-in library's values: where each
//! entry's numbers were printed (or that they were recalled from memory),
//! and how they were checked against printed values. Every check named here
//! is run by this module's tests for every entry that names it, within the
//! tolerance the sentence states, so the wording cannot claim more than is
//! verified. Per-species sources stay in the library CSV.

/// How an entry's values were checked against print.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Checked {
    /// The entries of ATP + H2O = ADP + phosphate, transformed, give the
    /// printed ΔrG'° at pH 5–9, I = 0.25 M, 298.15 K and 313.15 K.
    AtpHydrolysis,
    /// The single species, transformed, gives the printed ΔfG'° of Table 4.2
    /// at pH 5, 6, 7, 8 and 9 (I = 0.25 M, 298.15 K).
    Table42,
    /// As [`Checked::Table42`] without pH 6 (printed value suspect).
    Table42NotPh6,
    /// Its species ΔfG° give the printed ΔrG° of G6P²⁻ + H2O = glucose + HPO4²⁻.
    G6pHydrolysis,
    /// A convention, nothing to check.
    Convention,
    /// Not checked; the sentence says why.
    NotChecked,
}

/// Tolerance of [`Checked::AtpHydrolysis`], kJ/mol.
pub const ATP_HYDROLYSIS_TOLERANCE_KJ: f64 = 0.001;
/// Tolerance of the Table 4.2 checks, kJ/mol (the table prints two
/// decimals).
pub const TABLE_4_2_TOLERANCE_KJ: f64 = 0.01;
/// Tolerance of [`Checked::G6pHydrolysis`], kJ/mol (printed to two decimals).
pub const G6P_HYDROLYSIS_TOLERANCE_KJ: f64 = 0.01;

/// Printed ΔrG° of G6P²⁻ + H2O = glucose + HPO4²⁻ at 298.15 K, I = 0:
/// −10.87 kJ/mol (Alberty 2003, Problem 6.7, printed p. 334).
pub const G6P_HYDROLYSIS_PRINTED_KJ: f64 = -10.87;

/// Where each entry's values come from, in words (library key, sentence,
/// check). Claims of agreement come only from [`Checked`], never from the
/// sentence.
pub const ENTRIES: &[(&str, &str, Checked)] = &[
    (
        "atp",
        "ΔfG° of ATP⁴⁻ printed in Alberty 2003 (p. 260); HATP³⁻ and H2ATP²⁻ recalled from memory of the book's species tables; Mg complexes derived from the printed pKs (Table 1.2, p. 7); ΔfH° printed (p. 271)",
        Checked::AtpHydrolysis,
    ),
    (
        "adp",
        "ΔfG° and ΔfH° of the ADP species recalled from memory of Alberty 2003's species tables; Mg complexes derived from the printed pKs (Table 1.2, p. 7)",
        Checked::AtpHydrolysis,
    ),
    (
        "phosphate",
        "ΔfG° of HPO4²⁻ printed in Alberty 2003 (p. 333); H2PO4⁻ and both ΔfH° recalled from memory of the book's species tables; MgHPO4 derived from the printed pK (Table 1.2, p. 7)",
        Checked::AtpHydrolysis,
    ),
    (
        "water",
        "ΔfG° and ΔfH° of H2O printed in Alberty 2003 (pp. 333 and 349)",
        Checked::AtpHydrolysis,
    ),
    (
        "proton",
        "ΔfG°(H⁺) = 0 by convention (Alberty 2003, p. 260); H⁺ is fixed by the compartment pH",
        Checked::Convention,
    ),
    (
        "magnesium",
        "ΔfG° of Mg²⁺ recalled from memory of Alberty 2003's species tables",
        Checked::NotChecked,
    ),
    (
        "glucose",
        "ΔfG° printed in Alberty 2003 (Problem 6.7, p. 333)",
        Checked::G6pHydrolysis,
    ),
    (
        "glucose-6-phosphate",
        "ΔfG° of G6P²⁻ printed in Alberty 2003 (Problem 6.7, p. 333); HG6P⁻ and MgG6P derived from the printed pKs (Table 1.2, p. 7)",
        Checked::G6pHydrolysis,
    ),
    ("ribulose", TABLE_4_2_AND_4_3, Checked::Table42),
    ("serine", TABLE_4_2, Checked::Table42),
    ("sorbose", TABLE_4_2_AND_4_3, Checked::Table42),
    ("sucrose", TABLE_4_2_AND_4_3, Checked::Table42),
    ("tryptophan", TABLE_4_2_AND_4_3, Checked::Table42),
    ("tyrosine", TABLE_4_2, Checked::Table42),
    ("urea", TABLE_4_2_AND_4_3, Checked::Table42NotPh6),
    ("valine", TABLE_4_2_AND_4_3, Checked::Table42),
    ("xylose", TABLE_4_2_AND_4_3, Checked::Table42),
    ("xylulose", TABLE_4_2_AND_4_3, Checked::Table42),
    ("ubiquinone-10", TABLE_4_2, Checked::Table42),
    ("ubiquinol-10", TABLE_4_2, Checked::Table42),
];

const TABLE_4_2: &str = "ΔfG° derived from the ΔfG'° printed for pH 7, I = 0.25 M, 298.15 K in Alberty 2003, Table 4.2 (p. 79)";
const TABLE_4_2_AND_4_3: &str = "ΔfG° derived from the ΔfG'° printed for pH 7, I = 0.25 M, 298.15 K in Alberty 2003, Table 4.2 (p. 79); ΔfH° from the ΔfH'° of Table 4.3 (p. 81)";

impl Checked {
    /// The sentence saying how the values were checked.
    pub fn sentence(self) -> String {
        match self {
            Checked::AtpHydrolysis => format!(
                "checked: with ATP, ADP, phosphate and water the transformed values reproduce the printed ΔrG'° of ATP + H2O = ADP + phosphate at pH 5–9, I = 0.25 M, at 298.15 K and 313.15 K (Alberty 2003, pp. 220 and 290) within {ATP_HYDROLYSIS_TOLERANCE_KJ} kJ/mol, computed with the book's R = 8.31451 J/(K·mol)"
            ),
            Checked::Table42 => format!(
                "checked: the transformed value reproduces the printed ΔfG'° at pH 5, 6, 7, 8 and 9 (Table 4.2) within {TABLE_4_2_TOLERANCE_KJ} kJ/mol, computed with the book's R = 8.31451 J/(K·mol)"
            ),
            Checked::Table42NotPh6 => format!(
                "checked: the transformed value reproduces the printed ΔfG'° at pH 5, 7, 8 and 9 (Table 4.2) within {TABLE_4_2_TOLERANCE_KJ} kJ/mol, computed with the book's R = 8.31451 J/(K·mol); the printed pH 6 value is off the pattern of its row and was left out"
            ),
            Checked::G6pHydrolysis => format!(
                "checked: the species values of glucose, G6P²⁻, HPO4²⁻ and H2O add up to the ΔrG° = −10.87 kJ/mol printed for G6P²⁻ + H2O = glucose + HPO4²⁻ (Alberty 2003, p. 334) within {G6P_HYDROLYSIS_TOLERANCE_KJ} kJ/mol (a check of the transcription)"
            ),
            Checked::Convention => "a convention; nothing to check".to_string(),
            Checked::NotChecked => "not checked against a printed value: it cancels from every value computed from the library, so no printed value can confirm it".to_string(),
        }
    }
}

/// The entry's provenance and check, if the library key has a row.
pub fn of(key: &str) -> Option<(&'static str, Checked)> {
    ENTRIES
        .iter()
        .find(|(k, _, _)| *k == key)
        .map(|&(_, words, checked)| (words, checked))
}

/// The sentence shown wherever a library value is: where it was printed and
/// how it was checked.
pub fn sentence(key: &str) -> String {
    match of(key) {
        Some((words, checked)) => format!(
            "built-in library ('{key}'): {words}; {}",
            checked.sentence()
        ),
        None => format!(
            "built-in library ('{key}'): R. A. Alberty, Thermodynamics of Biochemical Reactions (Wiley, 2003); not checked against a printed value"
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::thermo::legendre::tests::TABLE_4_2_SINGLE_SPECIES;
    use crate::thermo::legendre::{Conditions, Transform, R_ALBERTY_2003_KJ};
    use crate::thermo::library::{lookup_key, Library, LibraryEntry};

    fn book(ph: f64, t_k: f64) -> Transform {
        Transform::new(Conditions::new(ph, 0.25, t_k))
            .unwrap()
            .with_gas_constant(R_ALBERTY_2003_KJ)
    }

    fn entry(key: &str) -> &'static LibraryEntry {
        lookup_key(key).unwrap_or_else(|| panic!("no library entry {key}"))
    }

    fn dfg_prime(key: &str, t: &Transform) -> f64 {
        t.reactant_dfg_prime(&entry(key).species_list()).unwrap()
    }

    /// The species of `key` with this label.
    fn species_dfg0(key: &str, label: &str) -> f64 {
        entry(key)
            .species
            .iter()
            .find(|s| s.label == label)
            .unwrap_or_else(|| panic!("{key} has no species {label}"))
            .species
            .dfg0_kj
    }

    #[test]
    fn every_library_entry_has_exactly_one_provenance_row() {
        let keys: Vec<&str> = Library::builtin()
            .entries()
            .iter()
            .map(|e| e.key.as_str())
            .collect();
        let rows: Vec<&str> = ENTRIES.iter().map(|(k, _, _)| *k).collect();
        let mut sorted_keys = keys.clone();
        sorted_keys.sort_unstable();
        let mut sorted_rows = rows.clone();
        sorted_rows.sort_unstable();
        assert_eq!(sorted_rows, sorted_keys);
        // The free-text part never claims agreement: only checks do.
        for (key, words, _) in ENTRIES {
            for claim in ["reproduce", "within", "confirm", "checked"] {
                assert!(!words.contains(claim), "{key}: `{claim}` in {words}");
            }
        }
    }

    #[test]
    fn values_said_to_be_from_memory_are_those_the_library_marks_so() {
        // An entry whose species data include a value recalled from memory
        // says "recalled from memory"; one without says nothing of the kind.
        for e in Library::builtin().entries() {
            let from_memory = e.species.iter().any(|s| {
                s.dfg0_source.starts_with("from memory")
                    || s.dfh0_source
                        .as_deref()
                        .is_some_and(|h| h.starts_with("from memory"))
            });
            let (words, _) = of(&e.key).unwrap();
            assert_eq!(
                words.contains("recalled from memory"),
                from_memory,
                "{}: {words}",
                e.key
            );
        }
    }

    #[test]
    fn atp_hydrolysis_claim_holds_at_the_stated_tolerance() {
        // Printed ΔrG'° of ATP + H2O = ADP + phosphate, I = 0.25 M, pH 5–9:
        // Alberty 2003, printed p. 220 (298.15 K) and p. 290 (313.15 K).
        let printed_298 = [-32.5633, -33.2166, -36.0353, -41.0742, -46.7021];
        let printed_313 = [-32.8677, -33.5895, -36.6852, -42.0518, -47.9736];
        let claimed: Vec<&str> = ENTRIES
            .iter()
            .filter(|(_, _, c)| *c == Checked::AtpHydrolysis)
            .map(|(k, _, _)| *k)
            .collect();
        assert_eq!(claimed, ["atp", "adp", "phosphate", "water"]);
        for (i, ph) in [5.0, 6.0, 7.0, 8.0, 9.0].into_iter().enumerate() {
            for (t_k, printed) in [(298.15, printed_298[i]), (313.15, printed_313[i])] {
                let t = book(ph, t_k);
                let value = dfg_prime("adp", &t) + dfg_prime("phosphate", &t)
                    - dfg_prime("atp", &t)
                    - dfg_prime("water", &t);
                assert!(
                    (value - printed).abs() <= ATP_HYDROLYSIS_TOLERANCE_KJ,
                    "{t_k} K pH {ph}: {value} vs {printed}"
                );
            }
        }
    }

    #[test]
    fn table_4_2_claims_hold_at_the_stated_tolerance() {
        // Alberty 2003, Table 4.2 (continued), printed p. 79, I = 0.25 M,
        // 298.15 K (rows copied in thermo::legendre's tests).
        let mut entries_checked = 0;
        for (key, _, checked) in ENTRIES {
            let skip_ph6 = match checked {
                Checked::Table42 => false,
                Checked::Table42NotPh6 => true,
                _ => continue,
            };
            let e = entry(key);
            let (_, _, row) = TABLE_4_2_SINGLE_SPECIES
                .iter()
                .find(|(name, _, _)| lookup_key(name).is_some_and(|x| x.key == e.key))
                .unwrap_or_else(|| panic!("{key}: no printed Table 4.2 row to check against"));
            for (i, printed) in row.iter().enumerate() {
                if skip_ph6 && i == 1 {
                    continue;
                }
                let ph = 5.0 + i as f64;
                let value = book(ph, 298.15)
                    .reactant_dfg_prime(&e.species_list())
                    .unwrap();
                assert!(
                    (value - printed).abs() <= TABLE_4_2_TOLERANCE_KJ,
                    "{key} pH {ph}: {value} vs {printed}"
                );
            }
            entries_checked += 1;
        }
        assert_eq!(entries_checked, 12);
    }

    #[test]
    fn g6p_hydrolysis_claim_holds_at_the_stated_tolerance() {
        // ΔrG° = ΔfG°(glucose) + ΔfG°(HPO4²⁻) − ΔfG°(G6P²⁻) − ΔfG°(H2O), species
        // at I = 0; printed −10.87 kJ/mol (Alberty 2003, Problem 6.7, p. 334).
        let claimed: Vec<&str> = ENTRIES
            .iter()
            .filter(|(_, _, c)| *c == Checked::G6pHydrolysis)
            .map(|(k, _, _)| *k)
            .collect();
        assert_eq!(claimed, ["glucose", "glucose-6-phosphate"]);
        let value = species_dfg0("glucose", "glucose") + species_dfg0("phosphate", "HPO4 2-")
            - species_dfg0("glucose-6-phosphate", "G6P2-")
            - species_dfg0("water", "H2O");
        assert!(
            (value - G6P_HYDROLYSIS_PRINTED_KJ).abs() <= G6P_HYDROLYSIS_TOLERANCE_KJ,
            "{value}"
        );
    }

    #[test]
    fn the_sentence_names_the_print_and_the_check() {
        assert_eq!(
            sentence("serine"),
            "built-in library ('serine'): ΔfG° derived from the ΔfG'° printed for pH 7, I = 0.25 M, 298.15 K in Alberty 2003, Table 4.2 (p. 79); checked: the transformed value reproduces the printed ΔfG'° at pH 5, 6, 7, 8 and 9 (Table 4.2) within 0.01 kJ/mol, computed with the book's R = 8.31451 J/(K·mol)"
        );
        assert!(sentence("magnesium").contains("recalled from memory"));
        assert!(sentence("magnesium").contains("not checked"));
    }
}
