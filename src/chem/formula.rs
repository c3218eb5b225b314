//! Chemical formulas as written in metabolic models (`C6H12O6`,
//! `C21H26N7O17P3`, `Ca(NO3)2`, `CuSO4.5H2O`, `C5H6O5R2`, `(C5H8O4)n`).
//!
//! A symbol is an upper-case letter followed by lower-case letters. Symbols
//! of the periodic table are elements; any other symbol (`R`, `X`, `Z`,
//! `Rx`, …) is a *generic group*: a placeholder for an unspecified part of
//! the molecule (an acyl chain, a protein). A parenthesised part with a
//! letter instead of a number as multiplier (`(C5H8O4)n`) is a *repeat unit*
//! of unknown length. Formulas with either cannot be balanced.
//!
//! Only the symbol decides: `Y` is read as yttrium even though some models
//! use it as a placeholder; such a placeholder never makes a balanced
//! reaction look unbalanced, since it has the same "element" on both sides.

use std::collections::BTreeMap;
use std::fmt;

/// Every element symbol of the periodic table (IUPAC, elements 1–118).
const ELEMENTS: [&str; 118] = [
    "H", "He", "Li", "Be", "B", "C", "N", "O", "F", "Ne", "Na", "Mg", "Al", "Si", "P", "S", "Cl",
    "Ar", "K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Ga", "Ge", "As",
    "Se", "Br", "Kr", "Rb", "Sr", "Y", "Zr", "Nb", "Mo", "Tc", "Ru", "Rh", "Pd", "Ag", "Cd", "In",
    "Sn", "Sb", "Te", "I", "Xe", "Cs", "Ba", "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd", "Tb",
    "Dy", "Ho", "Er", "Tm", "Yb", "Lu", "Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au", "Hg", "Tl",
    "Pb", "Bi", "Po", "At", "Rn", "Fr", "Ra", "Ac", "Th", "Pa", "U", "Np", "Pu", "Am", "Cm", "Bk",
    "Cf", "Es", "Fm", "Md", "No", "Lr", "Rf", "Db", "Sg", "Bh", "Hs", "Mt", "Ds", "Rg", "Cn", "Nh",
    "Fl", "Mc", "Lv", "Ts", "Og",
];

/// True when `symbol` is an element of the periodic table.
pub fn is_element(symbol: &str) -> bool {
    ELEMENTS.contains(&symbol)
}

/// A parsed formula: atom counts plus what keeps it from being exact.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub struct Formula {
    /// Element symbol → number of atoms (only non-zero counts).
    pub elements: BTreeMap<String, i64>,
    /// Generic group symbol → count (`R`, `X`, …).
    pub generic: BTreeMap<String, i64>,
    /// Symbolic multipliers of repeat units found (`n` in `(C5H8O4)n`).
    pub repeat_units: Vec<String>,
}

impl Formula {
    /// True when every atom is known, so the formula can enter a balance.
    pub fn is_exact(&self) -> bool {
        self.generic.is_empty() && self.repeat_units.is_empty()
    }

    /// Number of atoms of `element` (0 when absent).
    pub fn count(&self, element: &str) -> i64 {
        self.elements.get(element).copied().unwrap_or(0)
    }

    fn add(&mut self, other: &Formula, times: i64) -> Result<(), FormulaErrorKind> {
        for (map, from) in [
            (&mut self.elements, &other.elements),
            (&mut self.generic, &other.generic),
        ] {
            for (symbol, n) in from {
                let scaled = n.checked_mul(times).ok_or(FormulaErrorKind::TooLarge)?;
                let entry = map.entry(symbol.clone()).or_insert(0);
                *entry = entry
                    .checked_add(scaled)
                    .ok_or(FormulaErrorKind::TooLarge)?;
            }
        }
        for unit in &other.repeat_units {
            if !self.repeat_units.contains(unit) {
                self.repeat_units.push(unit.clone());
            }
        }
        Ok(())
    }
}

/// Why a formula could not be read, with the 0-based character offset.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FormulaError {
    pub offset: usize,
    pub kind: FormulaErrorKind,
}

#[derive(Debug, Clone, PartialEq, Eq)]
pub enum FormulaErrorKind {
    Empty,
    UnexpectedCharacter(char),
    UnclosedBracket(char),
    UnmatchedClosingBracket(char),
    /// A count of zero (`C0`), which is never meant.
    ZeroCount,
    TooLarge,
}

impl fmt::Display for FormulaError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.kind {
            FormulaErrorKind::Empty => write!(f, "empty formula"),
            FormulaErrorKind::UnexpectedCharacter(c) => write!(
                f,
                "unexpected character `{c}` at position {} (expected an element symbol, a count or a bracket)",
                self.offset + 1
            ),
            FormulaErrorKind::UnclosedBracket(c) => {
                write!(f, "bracket `{c}` at position {} is never closed", self.offset + 1)
            }
            FormulaErrorKind::UnmatchedClosingBracket(c) => write!(
                f,
                "closing bracket `{c}` at position {} has no opening bracket",
                self.offset + 1
            ),
            FormulaErrorKind::ZeroCount => {
                write!(f, "count of zero at position {}", self.offset + 1)
            }
            FormulaErrorKind::TooLarge => write!(f, "atom count too large"),
        }
    }
}

impl std::error::Error for FormulaError {}

/// Parses a formula. Accepted: element or generic symbols with optional
/// integer counts, nested `(…)` / `[…]` groups with an integer or a symbolic
/// (lower-case letters) multiplier, and adducts joined by `.`, `·` or `*`
/// with an optional leading count (`CuSO4.5H2O`).
pub fn parse_formula(text: &str) -> Result<Formula, FormulaError> {
    let chars: Vec<char> = text.trim().chars().collect();
    if chars.is_empty() {
        return Err(FormulaError {
            offset: 0,
            kind: FormulaErrorKind::Empty,
        });
    }
    let mut parser = Parser { chars, at: 0 };
    let mut total = Formula::default();
    loop {
        // An adduct part may start with its own multiplier: `.5H2O`.
        let times = parser.count()?.unwrap_or(1);
        let part = parser.sequence(None)?;
        total.add(&part, times).map_err(|kind| parser.error(kind))?;
        match parser.peek() {
            None => break,
            Some('.' | '·' | '*') => parser.at += 1,
            Some(c) => return Err(parser.error(FormulaErrorKind::UnexpectedCharacter(c))),
        }
    }
    total.elements.retain(|_, n| *n != 0);
    total.generic.retain(|_, n| *n != 0);
    Ok(total)
}

struct Parser {
    chars: Vec<char>,
    at: usize,
}

impl Parser {
    fn peek(&self) -> Option<char> {
        self.chars.get(self.at).copied()
    }

    fn error(&self, kind: FormulaErrorKind) -> FormulaError {
        FormulaError {
            offset: self.at,
            kind,
        }
    }

    /// An optional integer count; zero is refused.
    fn count(&mut self) -> Result<Option<i64>, FormulaError> {
        let start = self.at;
        let mut value: i64 = 0;
        while let Some(d) = self.peek().and_then(|c| c.to_digit(10)) {
            value = value
                .checked_mul(10)
                .and_then(|v| v.checked_add(i64::from(d)))
                .ok_or_else(|| self.error(FormulaErrorKind::TooLarge))?;
            self.at += 1;
        }
        if self.at == start {
            return Ok(None);
        }
        if value == 0 {
            return Err(FormulaError {
                offset: start,
                kind: FormulaErrorKind::ZeroCount,
            });
        }
        Ok(Some(value))
    }

    /// Symbols and groups up to the end, an adduct separator, or the
    /// closing bracket `close`.
    fn sequence(&mut self, close: Option<(char, usize)>) -> Result<Formula, FormulaError> {
        let mut formula = Formula::default();
        loop {
            match self.peek() {
                None => {
                    return match close {
                        Some((bracket, offset)) => Err(FormulaError {
                            offset,
                            kind: FormulaErrorKind::UnclosedBracket(opening_of(bracket)),
                        }),
                        None => Ok(formula),
                    };
                }
                Some(c) if c.is_ascii_uppercase() => {
                    let start = self.at;
                    self.at += 1;
                    while self.peek().is_some_and(|c| c.is_ascii_lowercase()) {
                        self.at += 1;
                    }
                    let symbol: String = self.chars[start..self.at].iter().collect();
                    let n = self.count()?.unwrap_or(1);
                    let map = if is_element(&symbol) {
                        &mut formula.elements
                    } else {
                        &mut formula.generic
                    };
                    let entry = map.entry(symbol).or_insert(0);
                    *entry = entry
                        .checked_add(n)
                        .ok_or_else(|| self.error(FormulaErrorKind::TooLarge))?;
                }
                Some(open @ ('(' | '[')) => {
                    let offset = self.at;
                    self.at += 1;
                    let wanted = if open == '(' { ')' } else { ']' };
                    let inner = self.sequence(Some((wanted, offset)))?;
                    self.at += 1; // the closing bracket, checked by `sequence`
                    if let Some(n) = self.count()? {
                        formula.add(&inner, n).map_err(|kind| self.error(kind))?;
                    } else if self.peek().is_some_and(|c| c.is_ascii_lowercase()) {
                        let start = self.at;
                        while self.peek().is_some_and(|c| c.is_ascii_lowercase()) {
                            self.at += 1;
                        }
                        let unit: String = self.chars[start..self.at].iter().collect();
                        formula.add(&inner, 1).map_err(|kind| self.error(kind))?;
                        if !formula.repeat_units.contains(&unit) {
                            formula.repeat_units.push(unit);
                        }
                    } else {
                        formula.add(&inner, 1).map_err(|kind| self.error(kind))?;
                    }
                }
                Some(c @ (')' | ']')) => {
                    return match close {
                        Some((wanted, _)) if wanted == c => Ok(formula),
                        _ => Err(self.error(FormulaErrorKind::UnmatchedClosingBracket(c))),
                    };
                }
                Some('.' | '·' | '*') if close.is_none() => return Ok(formula),
                Some(c) => return Err(self.error(FormulaErrorKind::UnexpectedCharacter(c))),
            }
        }
    }
}

fn opening_of(close: char) -> char {
    if close == ')' {
        '('
    } else {
        '['
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn atoms(formula: &Formula) -> Vec<(&str, i64)> {
        formula
            .elements
            .iter()
            .map(|(s, n)| (s.as_str(), *n))
            .collect()
    }

    #[test]
    fn glucose() {
        // C6H12O6: molecular formula of glucose (common practice).
        let f = parse_formula("C6H12O6").unwrap();
        assert_eq!(atoms(&f), vec![("C", 6), ("H", 12), ("O", 6)]);
        assert!(f.is_exact());
    }

    #[test]
    fn two_letter_symbols_and_implicit_one() {
        // ATP4- as written in BiGG models: C10H12N5O13P3 (from the e_coli_core file).
        let f = parse_formula("C10H12N5O13P3").unwrap();
        assert_eq!(f.count("P"), 3);
        assert_eq!(f.count("N"), 5);
        let f = parse_formula("CoClNa").unwrap();
        assert_eq!(atoms(&f), vec![("Cl", 1), ("Co", 1), ("Na", 1)]);
        // Upper case matters: CO is carbon monoxide, Co is cobalt.
        assert_eq!(
            atoms(&parse_formula("CO").unwrap()),
            vec![("C", 1), ("O", 1)]
        );
    }

    #[test]
    fn repeated_symbols_add_up() {
        // Acetic acid written as a condensed formula, CH3COOH = C2H4O2 (common practice).
        let f = parse_formula("CH3COOH").unwrap();
        assert_eq!(atoms(&f), vec![("C", 2), ("H", 4), ("O", 2)]);
    }

    #[test]
    fn parentheses_multiply_and_nest() {
        // Calcium nitrate Ca(NO3)2 = CaN2O6 (common practice).
        let f = parse_formula("Ca(NO3)2").unwrap();
        assert_eq!(atoms(&f), vec![("Ca", 1), ("N", 2), ("O", 6)]);
        // Nested brackets: K4[Fe(CN)6] (potassium ferrocyanide) = C6FeK4N6
        // (common practice).
        let f = parse_formula("K4[Fe(CN)6]").unwrap();
        assert_eq!(atoms(&f), vec![("C", 6), ("Fe", 1), ("K", 4), ("N", 6)]);
    }

    #[test]
    fn adducts_with_leading_count() {
        // Copper(II) sulfate pentahydrate CuSO4·5H2O = CuH10O9S (common practice).
        for text in ["CuSO4.5H2O", "CuSO4·5H2O", "CuSO4*5H2O"] {
            let f = parse_formula(text).unwrap();
            assert_eq!(
                atoms(&f),
                vec![("Cu", 1), ("H", 10), ("O", 9), ("S", 1)],
                "{text}"
            );
        }
    }

    #[test]
    fn generic_groups_are_told_apart() {
        // Recon3D writes acyl groups as R, e.g. C5H6O5R2 and C24H46NO7RCO.
        let f = parse_formula("C5H6O5R2").unwrap();
        assert_eq!(f.generic.get("R"), Some(&2));
        assert_eq!(f.count("C"), 5);
        assert!(!f.is_exact());
        let f = parse_formula("C24H46NO7RCO").unwrap();
        assert_eq!(f.count("C"), 25);
        assert_eq!(f.count("O"), 8);
        assert_eq!(f.generic.get("R"), Some(&1));
        let f = parse_formula("XH").unwrap();
        assert_eq!(f.generic.get("X"), Some(&1));
        assert_eq!(f.count("H"), 1);
    }

    #[test]
    fn repeat_units_are_not_exact() {
        // Xylan-like polymer written with a symbolic repeat count.
        let f = parse_formula("(C5H8O4)n").unwrap();
        assert_eq!(f.repeat_units, vec!["n".to_string()]);
        assert_eq!(f.count("C"), 5);
        assert!(!f.is_exact());
        assert!(f.generic.is_empty());
    }

    #[test]
    fn bad_formulas_say_where() {
        let e = parse_formula("C6H12O6+").unwrap_err();
        assert_eq!(e.kind, FormulaErrorKind::UnexpectedCharacter('+'));
        assert_eq!(e.offset, 7);
        let e = parse_formula("Ca(NO3").unwrap_err();
        assert_eq!(e.kind, FormulaErrorKind::UnclosedBracket('('));
        assert_eq!(e.offset, 2);
        assert_eq!(e.to_string(), "bracket `(` at position 3 is never closed");
        let e = parse_formula("NO3)2").unwrap_err();
        assert_eq!(e.kind, FormulaErrorKind::UnmatchedClosingBracket(')'));
        let e = parse_formula("Ca(NO3]").unwrap_err();
        assert_eq!(e.kind, FormulaErrorKind::UnmatchedClosingBracket(']'));
        assert_eq!(
            parse_formula("  ").unwrap_err().kind,
            FormulaErrorKind::Empty
        );
        assert_eq!(
            parse_formula("C0H2").unwrap_err().kind,
            FormulaErrorKind::ZeroCount
        );
        assert_eq!(
            parse_formula("C99999999999999999999").unwrap_err().kind,
            FormulaErrorKind::TooLarge
        );
        assert_eq!(
            parse_formula("c6h12o6").unwrap_err().kind,
            FormulaErrorKind::UnexpectedCharacter('c')
        );
    }

    #[test]
    fn periodic_table_lookup() {
        // 118 elements (IUPAC 2016 names for 113, 115, 117, 118).
        assert_eq!(ELEMENTS.len(), 118);
        assert!(is_element("Og") && is_element("Y") && is_element("W"));
        assert!(!is_element("R") && !is_element("X") && !is_element("Z"));
        let mut sorted = ELEMENTS.to_vec();
        sorted.sort_unstable();
        sorted.dedup();
        assert_eq!(sorted.len(), 118, "no duplicate symbols");
    }
}
