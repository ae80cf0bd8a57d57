//! Polynomials whose coefficients are polynomials in one named symbolic parameter (e.g. `psi`), their text
//! syntax and their specialisation at a rational value.
//!
//! A [`ParametricPolynomial`] stores, per exponent vector, a non-zero [`UniPoly`] in the parameter. The text
//! syntax extends [`super::Polynomial::parse`] (documented in `docs/model-file.md`):
//! ```text
//! polynomial := ['+' | '-'] term (('+' | '-') term)*
//! term       := item (['*'] item)*
//! item       := INTEGER ['/' INTEGER] | PARAM ['^' INTEGER] | 'x' INTEGER '_' INTEGER ['^' INTEGER]
//!             | '(' pexpr ')'
//! pexpr      := ['+' | '-'] pterm (('+' | '-') pterm)*     -- numbers and the parameter only
//! pterm      := pitem (['*'] pitem)*;  pitem := INTEGER ['/' INTEGER] | PARAM ['^' INTEGER] | '(' pexpr ')'
//! ```
//! Examples: `x1_0^2*x2_0^2 + psi*x1_0*x1_1*x2_0*x2_1 - (2 + 3/2*psi^2)*x1_1^2*x2_1^2`.
//!
//! Invariant: no stored coefficient polynomial is zero; every exponent vector has length `Σ (n_i + 1)`.

use super::{
    CharCursor, MAX_EXPONENT, PolyError, Polynomial, VariableLayout, monomial_text,
    significant_chars,
};
use crate::arith::UniPoly;
use num_rational::BigRational;
use num_traits::{One, Zero};
use std::collections::BTreeMap;

/// Largest power of the parameter accepted in the text syntax.
pub const MAX_PARAMETER_DEGREE: u32 = 64;

/// Is `name` usable as a parameter name: a letter, then letters, digits or `_`, at most 32 characters, and
/// not shaped like a coordinate `x<digits>_<digits>`?
pub fn is_valid_parameter_name(name: &str) -> bool {
    let mut chars = name.chars();
    let Some(first) = chars.next() else {
        return false;
    };
    if !first.is_ascii_alphabetic() || name.len() > 32 {
        return false;
    }
    if !name.chars().all(|c| c.is_ascii_alphanumeric() || c == '_') {
        return false;
    }
    !is_coordinate_name(name)
}

fn is_coordinate_name(name: &str) -> bool {
    let Some(rest) = name.strip_prefix('x') else {
        return false;
    };
    let Some((a, b)) = rest.split_once('_') else {
        return false;
    };
    !a.is_empty()
        && !b.is_empty()
        && a.chars().all(|c| c.is_ascii_digit())
        && b.chars().all(|c| c.is_ascii_digit())
}

/// A polynomial in the coordinates whose coefficients are polynomials in one parameter (module invariant).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParametricPolynomial {
    nvars: usize,
    parameter: String,
    terms: BTreeMap<Vec<u32>, UniPoly>,
}

impl ParametricPolynomial {
    /// Parse the extended text syntax with the parameter called `parameter`.
    ///
    /// # Panics
    /// **Panics** if `parameter` is not a valid name (see [`is_valid_parameter_name`]); callers check it first.
    ///
    /// ```
    /// use sheafwright::poly::{Polynomial, VariableLayout, parametric::ParametricPolynomial};
    /// use num_rational::BigRational;
    /// let layout = VariableLayout::new(&[1]);
    /// let p = ParametricPolynomial::parse("x1_0^2 + (1 - 2*psi)*x1_1^2", &layout, "psi").unwrap();
    /// assert_eq!(p.parameter_degree(), 1);
    /// let at2 = p.eval(&BigRational::from_integer(2.into()));
    /// assert_eq!(at2, Polynomial::parse("x1_0^2 - 3*x1_1^2", &layout).unwrap());
    /// ```
    pub fn parse(text: &str, layout: &VariableLayout, parameter: &str) -> Result<Self, PolyError> {
        assert!(
            is_valid_parameter_name(parameter),
            "ParametricPolynomial::parse: invalid parameter name {parameter:?}"
        );
        let terms = PParser {
            chars: significant_chars(text),
            pos: 0,
            layout,
            parameter,
        }
        .parse()?;
        Ok(ParametricPolynomial {
            nvars: layout.nvars(),
            parameter: parameter.to_string(),
            terms,
        })
    }

    /// The parameter's name.
    pub fn parameter(&self) -> &str {
        &self.parameter
    }

    /// The terms: exponent vector ↦ coefficient polynomial in the parameter.
    pub fn terms(&self) -> impl Iterator<Item = (&Vec<u32>, &UniPoly)> {
        self.terms.iter()
    }

    /// Highest power of the parameter that occurs (0 when it does not occur).
    pub fn parameter_degree(&self) -> usize {
        self.terms
            .values()
            .filter_map(UniPoly::degree)
            .max()
            .unwrap_or(0)
    }

    /// The polynomial at parameter value `t` (exact).
    pub fn eval(&self, t: &BigRational) -> Polynomial {
        let mut p = Polynomial::zero(self.nvars);
        for (e, c) in &self.terms {
            p.add_term(e.clone(), c.eval(t));
        }
        p
    }

    /// Check the declared multidegree of every term and that the polynomial is not identically zero. (The
    /// conditions that depend on the value — non-zero, no variable factor — are checked at each value by
    /// [`Polynomial::check_equation`].)
    pub fn check_multidegree(
        &self,
        layout: &VariableLayout,
        expected: &[u32],
    ) -> Result<(), PolyError> {
        if self.terms.is_empty() {
            return Err(PolyError::Zero);
        }
        for e in self.terms.keys() {
            let got = layout.multidegree(e);
            if got != expected {
                return Err(PolyError::WrongDegree {
                    term: monomial_text(e, layout),
                    got,
                    expected: expected.to_vec(),
                });
            }
        }
        Ok(())
    }
}

struct PParser<'a> {
    chars: Vec<(usize, char)>,
    pos: usize,
    layout: &'a VariableLayout,
    parameter: &'a str,
}

enum Item {
    Scalar(UniPoly),
    Variable(usize, u32),
}

impl CharCursor for PParser<'_> {
    fn cursor(&self) -> (&[(usize, char)], usize) {
        (&self.chars, self.pos)
    }
    fn cursor_mut(&mut self) -> &mut usize {
        &mut self.pos
    }
}

impl PParser<'_> {
    fn name(&mut self) -> String {
        let start = self.pos;
        while matches!(self.peek(), Some(c) if c.is_ascii_alphanumeric() || c == '_') {
            self.pos += 1;
        }
        self.chars[start..self.pos].iter().map(|(_, c)| c).collect()
    }

    fn parameter_power(&mut self) -> Result<UniPoly, PolyError> {
        let d = self.optional_power(MAX_PARAMETER_DEGREE)? as usize;
        let mut c = vec![BigRational::zero(); d + 1];
        c[d] = BigRational::one();
        Ok(UniPoly::new(c))
    }

    fn item(&mut self, scalar_only: bool) -> Result<Item, PolyError> {
        match self.peek() {
            Some(c) if c.is_ascii_digit() => Ok(Item::Scalar(UniPoly::constant(self.rational()?))),
            Some('(') => {
                self.pos += 1;
                let v = self.pexpr()?;
                if self.peek() != Some(')') {
                    return self.err("expected ')'");
                }
                self.pos += 1;
                Ok(Item::Scalar(v))
            }
            Some(c) if c.is_ascii_alphabetic() => {
                let start = self.pos;
                let name = self.name();
                if name == self.parameter {
                    return Ok(Item::Scalar(self.parameter_power()?));
                }
                if !is_coordinate_name(&name) {
                    self.pos = start;
                    return self.err(format!(
                        "unknown name {name:?}: expected a coordinate like x1_0 or the parameter {:?}",
                        self.parameter
                    ));
                }
                if scalar_only {
                    self.pos = start;
                    return self
                        .err("only numbers and the parameter may appear inside parentheses");
                }
                let (a, b) = name[1..].split_once('_').expect("coordinate shape");
                let (Ok(factor), Ok(coord)) = (a.parse::<usize>(), b.parse::<usize>()) else {
                    self.pos = start;
                    return self.err("coordinate index too large");
                };
                let v = self.layout.checked_variable(factor, coord)?;
                let p = self.optional_power(MAX_EXPONENT)?;
                Ok(Item::Variable(v, p))
            }
            Some(c) => self.err(format!("unexpected '{c}'")),
            None => self.err("unexpected end"),
        }
    }

    /// A product of items; `scalar_only` inside parentheses.
    fn product(&mut self, scalar_only: bool) -> Result<(Vec<u32>, UniPoly), PolyError> {
        let mut e = vec![0u32; self.layout.nvars()];
        let mut c = UniPoly::from_ints(&[1]);
        loop {
            match self.item(scalar_only)? {
                Item::Scalar(s) => {
                    c = c.mul(&s);
                    if c.degree().unwrap_or(0) > MAX_PARAMETER_DEGREE as usize {
                        return self.err(format!("parameter degree above {MAX_PARAMETER_DEGREE}"));
                    }
                }
                Item::Variable(v, p) => self.multiply_variable(&mut e, v, p)?,
            }
            match self.peek() {
                Some('*') => self.pos += 1,
                Some(ch) if ch.is_ascii_alphanumeric() || ch == '(' => {} // juxtaposition
                _ => return Ok((e, c)),
            }
        }
    }

    fn pexpr(&mut self) -> Result<UniPoly, PolyError> {
        if self.peek().is_none() || self.peek() == Some(')') {
            return self.err("empty parentheses");
        }
        let parts = self.signed_sum(
            |s, neg| {
                let (_, c) = s.product(true)?;
                Ok(if neg {
                    c.scale(&-BigRational::one())
                } else {
                    c
                })
            },
            Some(')'),
        )?;
        Ok(parts.iter().fold(UniPoly::default(), |a, b| a.add(b)))
    }

    fn parse(mut self) -> Result<BTreeMap<Vec<u32>, UniPoly>, PolyError> {
        if self.chars.is_empty() {
            return self.err("empty polynomial");
        }
        let parts = self.signed_sum(
            |s, neg| {
                let (e, c) = s.product(false)?;
                Ok((
                    e,
                    if neg {
                        c.scale(&-BigRational::one())
                    } else {
                        c
                    },
                ))
            },
            None,
        )?;
        let mut terms: BTreeMap<Vec<u32>, UniPoly> = BTreeMap::new();
        for (e, c) in parts {
            let entry = terms.entry(e).or_default();
            *entry = entry.add(&c);
        }
        terms.retain(|_, c| !c.is_zero());
        Ok(terms)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64) -> BigRational {
        BigRational::from_integer(n.into())
    }

    #[test]
    fn parses_parameter_coefficients() {
        let layout = VariableLayout::new(&[1, 1]);
        let p = ParametricPolynomial::parse(
            "x1_0^2*x2_0^2 + psi*x1_0*x1_1*x2_0*x2_1 - (2 + 3/2*psi^2) x1_1^2*x2_1^2 + 3*psi^2*x1_1^2*x2_1^2",
            &layout,
            "psi",
        )
        .unwrap();
        assert_eq!(p.parameter_degree(), 2);
        // At psi = 2 the last coefficient is −(2 + 6) + 12 = 4.
        let direct = Polynomial::parse(
            "x1_0^2*x2_0^2 + 2*x1_0*x1_1*x2_0*x2_1 + 4*x1_1^2*x2_1^2",
            &layout,
        )
        .unwrap();
        assert_eq!(p.eval(&q(2)), direct);
        assert!(p.check_multidegree(&layout, &[2, 2]).is_ok());
        assert!(p.check_multidegree(&layout, &[2, 1]).is_err());
        // Without the parameter it agrees with the plain parser.
        let text = "x1_0^2*x2_1 - 3/2*x1_1^2*x2_0 + 7 x1_0*x1_1*x2_0";
        let a = ParametricPolynomial::parse(text, &layout, "psi").unwrap();
        assert_eq!(a.parameter_degree(), 0);
        assert_eq!(a.eval(&q(5)), Polynomial::parse(text, &layout).unwrap());
    }

    #[test]
    fn refuses_bad_text() {
        let layout = VariableLayout::new(&[1, 1]);
        for bad in [
            "",
            "psi*",
            "(x1_0)*x2_0",
            "(1+psi*x1_0",
            "phi*x1_0*x2_0",
            "x3_0",
            "x1_2",
            "psi^99*x1_0",
            "()*x1_0",
            "x1_0 + + x2_0",
        ] {
            assert!(
                ParametricPolynomial::parse(bad, &layout, "psi").is_err(),
                "{bad:?} should be refused"
            );
        }
        assert!(is_valid_parameter_name("psi"));
        assert!(is_valid_parameter_name("t_2"));
        assert!(!is_valid_parameter_name("x1_0"));
        assert!(!is_valid_parameter_name("2a"));
        assert!(!is_valid_parameter_name(""));
    }

    #[test]
    fn arbitrary_text_never_panics() {
        use rand::{Rng, SeedableRng};
        let layout = VariableLayout::new(&[1, 2]);
        let alphabet: Vec<char> = "x12_0^*+-/()psi 39".chars().collect();
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(4);
        for _ in 0..5000 {
            let n = rng.gen_range(0..24);
            let text: String = (0..n)
                .map(|_| alphabet[rng.gen_range(0..alphabet.len())])
                .collect();
            if let Ok(p) = ParametricPolynomial::parse(&text, &layout, "psi") {
                let _ = p.eval(&q(3));
            }
        }
    }
}
