//! Reaction equation strings: `2 a_c + b_c -> c_c`, `a_c <-> b_c`.
//!
//! Grammar: `side arrow side`, a side is terms joined by ` + ` (spaces
//! required, so ids may contain `+`-free punctuation), a term is an optional
//! positive coefficient followed by a metabolite id. Either side may be empty
//! (boundary reactions such as `glc_e <->`).
//! Arrows: `->` / `=>` (forward), `<-` / `<=` (backward), `<->` / `<=>` (both).

/// Direction(s) an arrow allows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Arrow {
    Forward,
    Backward,
    Both,
}

/// One metabolite term, with the byte offset of its id in the equation text.
#[derive(Debug, Clone, PartialEq)]
pub struct Term {
    /// Signed: negative on the left side, positive on the right.
    pub coefficient: f64,
    pub id: String,
    pub offset: usize,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Equation {
    pub terms: Vec<Term>,
    pub arrow: Arrow,
}

/// A parse problem and the byte offset where it was noticed.
#[derive(Debug, Clone, PartialEq)]
pub struct EquationError {
    pub message: String,
    pub offset: usize,
}

/// Parse an equation. Left-hand terms get negative coefficients whatever the
/// arrow; the arrow only says which flux directions are meant (`<-`: the
/// flux is negative, as with SBML bounds such as [-1000, 0]).
pub fn parse(text: &str) -> Result<Equation, EquationError> {
    let tokens = tokenize(text);
    let arrows: Vec<usize> = tokens
        .iter()
        .enumerate()
        .filter(|(_, t)| arrow_of(t.text).is_some())
        .map(|(i, _)| i)
        .collect();
    let arrow_at = match arrows.as_slice() {
        [one] => *one,
        [] => {
            return Err(EquationError {
                message: format!(
                "no arrow in equation `{text}`; expected `->`, `<-` or `<->` between the two sides"
            ),
                offset: 0,
            })
        }
        [_, second, ..] => {
            return Err(EquationError {
                message: "more than one arrow in the equation".to_string(),
                offset: tokens[*second].offset,
            })
        }
    };
    let arrow = arrow_of(tokens[arrow_at].text).expect("arrow index comes from arrow_of");
    let mut terms = parse_side(&tokens[..arrow_at], -1.0)?;
    terms.extend(parse_side(&tokens[arrow_at + 1..], 1.0)?);
    if terms.is_empty() {
        return Err(EquationError {
            message: "equation has no metabolites".to_string(),
            offset: 0,
        });
    }
    Ok(Equation { terms, arrow })
}

#[derive(Debug, Clone, Copy)]
struct Token<'a> {
    text: &'a str,
    offset: usize,
}

fn tokenize(text: &str) -> Vec<Token<'_>> {
    let mut tokens = Vec::new();
    let mut start = None;
    for (i, c) in text.char_indices() {
        if c.is_whitespace() {
            if let Some(s) = start.take() {
                tokens.push(Token {
                    text: &text[s..i],
                    offset: s,
                });
            }
        } else if start.is_none() {
            start = Some(i);
        }
    }
    if let Some(s) = start {
        tokens.push(Token {
            text: &text[s..],
            offset: s,
        });
    }
    tokens
}

fn arrow_of(token: &str) -> Option<Arrow> {
    match token {
        "->" | "=>" | "-->" => Some(Arrow::Forward),
        "<-" | "<=" | "<--" => Some(Arrow::Backward),
        "<->" | "<=>" | "<-->" => Some(Arrow::Both),
        _ => None,
    }
}

/// Parse `[coef] id (+ [coef] id)*`, possibly empty.
fn parse_side(tokens: &[Token<'_>], sign: f64) -> Result<Vec<Term>, EquationError> {
    let mut terms = Vec::new();
    let mut i = 0;
    while i < tokens.len() {
        if !terms.is_empty() {
            if tokens[i].text != "+" {
                // `+h_c` or `a_c+ b_c`: a `+` glued to an id.
                let glued = tokens[i].text.starts_with('+') || tokens[i - 1].text.ends_with('+');
                let advice = if glued { "; put spaces around '+'" } else { "" };
                return Err(EquationError {
                    message: format!(
                        "expected `+` between terms, found `{}`{advice}",
                        tokens[i].text
                    ),
                    offset: tokens[i].offset,
                });
            }
            i += 1;
            if i == tokens.len() {
                return Err(EquationError {
                    message: "expected a metabolite after `+`".to_string(),
                    offset: tokens[i - 1].offset,
                });
            }
        }
        let mut coefficient = 1.0;
        let token = tokens[i];
        if token.text == "+" {
            return Err(EquationError {
                message: "expected a metabolite, found `+`".to_string(),
                offset: token.offset,
            });
        }
        if let Some(number) = coefficient_of(token.text) {
            let Some(next) = tokens.get(i + 1) else {
                return Err(EquationError {
                    message: format!(
                        "coefficient `{}` is not followed by a metabolite",
                        token.text
                    ),
                    offset: token.offset,
                });
            };
            if next.text == "+" {
                return Err(EquationError {
                    message: format!(
                        "coefficient `{}` is not followed by a metabolite",
                        token.text
                    ),
                    offset: token.offset,
                });
            }
            if !(number.is_finite() && number > 0.0) {
                return Err(EquationError {
                    message: format!("coefficient `{}` must be a positive number", token.text),
                    offset: token.offset,
                });
            }
            if let Err(message) = super::limits::coefficient(number) {
                return Err(EquationError {
                    message,
                    offset: token.offset,
                });
            }
            coefficient = number;
            i += 1;
        }
        let id_token = tokens[i];
        terms.push(Term {
            coefficient: sign * coefficient,
            id: id_token.text.to_string(),
            offset: id_token.offset,
        });
        i += 1;
    }
    Ok(terms)
}

/// A token reads as a coefficient when it is a number (`2`, `0.5`, `1e-3`).
fn coefficient_of(token: &str) -> Option<f64> {
    let first = token.chars().next()?;
    if !(first.is_ascii_digit() || first == '.' || first == '-') {
        return None;
    }
    token.parse::<f64>().ok()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pairs(e: &Equation) -> Vec<(f64, &str)> {
        e.terms
            .iter()
            .map(|t| (t.coefficient, t.id.as_str()))
            .collect()
    }

    #[test]
    fn forward_equation_with_coefficients() {
        let e = parse("2 a_c + b_c -> c_c").unwrap();
        assert_eq!(e.arrow, Arrow::Forward);
        assert_eq!(pairs(&e), vec![(-2.0, "a_c"), (-1.0, "b_c"), (1.0, "c_c")]);
        assert_eq!(e.terms[1].offset, 8);
    }

    #[test]
    fn reversible_and_backward_arrows() {
        let e = parse("a <-> 0.5 b").unwrap();
        assert_eq!(e.arrow, Arrow::Both);
        assert_eq!(pairs(&e), vec![(-1.0, "a"), (0.5, "b")]);
        let e = parse("a <- b").unwrap();
        assert_eq!(e.arrow, Arrow::Backward);
        // As written: flux in the allowed (negative) direction turns b into a.
        assert_eq!(pairs(&e), vec![(-1.0, "a"), (1.0, "b")]);
    }

    #[test]
    fn one_sided_boundary_reactions() {
        let e = parse("glc_e <->").unwrap();
        assert_eq!(pairs(&e), vec![(-1.0, "glc_e")]);
        let e = parse("-> glc_e").unwrap();
        assert_eq!(pairs(&e), vec![(1.0, "glc_e")]);
    }

    #[test]
    fn errors_point_at_the_problem() {
        let e = parse("a + b c_c").unwrap_err();
        assert!(e.message.contains("no arrow"), "{}", e.message);
        let e = parse("a b -> c").unwrap_err();
        assert_eq!(e.offset, 2);
        assert!(e.message.contains("expected `+`"));
        let e = parse("a -> b -> c").unwrap_err();
        assert_eq!(e.offset, 7);
        let e = parse("a + -> c").unwrap_err();
        assert!(e.message.contains("after `+`"), "{}", e.message);
        let e = parse("0 a -> c").unwrap_err();
        assert!(e.message.contains("positive"), "{}", e.message);
        let e = parse("->").unwrap_err();
        assert!(e.message.contains("no metabolites"));
        let e = parse("2 -> c").unwrap_err();
        assert!(e.message.contains("not followed"), "{}", e.message);
    }

    #[test]
    fn a_plus_glued_to_an_id_asks_for_spaces() {
        let e = parse("atp_c + h2o_c -> adp_c +h_c").unwrap_err();
        assert_eq!(
            e.message,
            "expected `+` between terms, found `+h_c`; put spaces around '+'"
        );
        assert_eq!(e.offset, 23);
        let e = parse("a_c+ b_c -> c_c").unwrap_err();
        assert_eq!(
            e.message,
            "expected `+` between terms, found `b_c`; put spaces around '+'"
        );
        let e = parse("a_c b_c -> c_c").unwrap_err();
        assert_eq!(e.message, "expected `+` between terms, found `b_c`");
    }
}
