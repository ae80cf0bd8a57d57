//! Multivariate polynomials over Q on a product of projective spaces, and their text syntax.
//!
//! Variables are the homogeneous coordinates `x{I}_{J}`: `I` is the ambient factor (1-based), `J` the coordinate
//! within it (0-based, `0..=n_I`). A [`Polynomial`] stores its terms in a `BTreeMap` from exponent vectors (one
//! entry per variable, factors in order) to non-zero rational coefficients.
//!
//! Invariant: no stored coefficient is zero, and every exponent vector has length `Σ (n_i + 1)`.
//!
//! Text syntax (documented in `docs/model-file.md`):
//! ```text
//! polynomial := ['+' | '-'] term (('+' | '-') term)*
//! term       := coefficient | [coefficient ['*']] factor ('*' factor)*
//! coefficient:= INTEGER ['/' INTEGER]
//! factor     := 'x' INTEGER '_' INTEGER ['^' INTEGER]
//! ```
//! Whitespace is ignored. Example: `x1_0^2*x2_1 - 3/2*x1_1*x2_0 + 7*x1_0*x1_1*x2_0`.
//! Coefficients that depend on a named symbolic parameter are parsed by [`parametric::ParametricPolynomial`].

pub mod parametric;

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Zero};
use rand::Rng;
use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use std::collections::BTreeMap;
use thiserror::Error;

/// Largest exponent accepted in the text syntax (a guard against absurd input).
pub const MAX_EXPONENT: u32 = 1000;

/// Why a polynomial text or value was refused.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum PolyError {
    #[error("cannot parse polynomial at character {position}: {message}")]
    Syntax { position: usize, message: String },
    #[error(
        "variable x{factor}_{coord} does not exist: factor {factor} is P^{n} (coordinates 0..={n})"
    )]
    NoSuchVariable {
        factor: usize,
        coord: usize,
        n: usize,
    },
    #[error(
        "variable x{factor}_{coord}: there is no ambient factor {factor} (factors are numbered 1..={m})"
    )]
    NoSuchFactor {
        factor: usize,
        coord: usize,
        m: usize,
    },
    #[error(
        "term {term} has multidegree {got:?} but the equation is declared with multidegree {expected:?}"
    )]
    WrongDegree {
        term: String,
        got: Vec<u32>,
        expected: Vec<u32>,
    },
    #[error("the polynomial is zero")]
    Zero,
    #[error(
        "the polynomial is divisible by x{factor}_{coord}, so its zero set is reducible (singular)"
    )]
    DivisibleByVariable { factor: usize, coord: usize },
}

/// Layout of the variables of `P^{n_1} × … × P^{n_m}`: factor `i` owns variables `offset[i] .. offset[i]+n_i+1`.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct VariableLayout {
    dims: Vec<usize>,
    offsets: Vec<usize>,
    nvars: usize,
}

impl VariableLayout {
    /// The layout for ambient dimensions `dims`.
    pub fn new(dims: &[usize]) -> Self {
        let mut offsets = Vec::with_capacity(dims.len());
        let mut n = 0;
        for &d in dims {
            offsets.push(n);
            n += d + 1;
        }
        VariableLayout {
            dims: dims.to_vec(),
            offsets,
            nvars: n,
        }
    }
    /// Total number of variables `Σ (n_i + 1)`.
    pub fn nvars(&self) -> usize {
        self.nvars
    }
    /// Ambient dimensions.
    pub fn dims(&self) -> &[usize] {
        &self.dims
    }
    /// Index of the first variable of factor `i` (0-based factor).
    pub fn offset(&self, i: usize) -> usize {
        self.offsets[i]
    }
    /// The range of variable indices of factor `i`.
    pub fn range(&self, i: usize) -> std::ops::Range<usize> {
        self.offsets[i]..self.offsets[i] + self.dims[i] + 1
    }
    /// Multidegree of an exponent vector (sum of exponents per factor).
    pub fn multidegree(&self, e: &[u32]) -> Vec<u32> {
        (0..self.dims.len())
            .map(|i| e[self.range(i)].iter().sum())
            .collect()
    }
    /// Name of variable `v` in the text syntax.
    pub fn var_name(&self, v: usize) -> String {
        let i = self.offsets.partition_point(|&o| o <= v) - 1;
        format!("x{}_{}", i + 1, v - self.offsets[i])
    }
    /// Index of the variable `x{factor}_{coord}` (factor 1-based, coordinate 0-based), or the error naming
    /// the missing factor or coordinate.
    pub(crate) fn checked_variable(&self, factor: usize, coord: usize) -> Result<usize, PolyError> {
        let m = self.dims.len();
        if factor == 0 || factor > m {
            return Err(PolyError::NoSuchFactor { factor, coord, m });
        }
        let n = self.dims[factor - 1];
        if coord > n {
            return Err(PolyError::NoSuchVariable { factor, coord, n });
        }
        Ok(self.offsets[factor - 1] + coord)
    }
}

/// A polynomial with rational coefficients (see the module invariant).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Polynomial {
    nvars: usize,
    terms: BTreeMap<Vec<u32>, BigRational>,
}

impl Polynomial {
    /// The zero polynomial in `nvars` variables.
    pub fn zero(nvars: usize) -> Self {
        Polynomial {
            nvars,
            terms: BTreeMap::new(),
        }
    }

    /// Add `c · x^e` (drops the term if the sum cancels). Precondition: `e.len() == nvars`.
    pub fn add_term(&mut self, e: Vec<u32>, c: BigRational) {
        assert_eq!(e.len(), self.nvars, "add_term: exponent length");
        if c.is_zero() {
            return;
        }
        use std::collections::btree_map::Entry;
        match self.terms.entry(e) {
            Entry::Vacant(v) => {
                v.insert(c);
            }
            Entry::Occupied(mut o) => {
                *o.get_mut() += c;
                if o.get().is_zero() {
                    o.remove();
                }
            }
        }
    }

    /// Number of variables.
    pub fn nvars(&self) -> usize {
        self.nvars
    }

    /// The terms, ordered by exponent vector.
    pub fn terms(&self) -> impl Iterator<Item = (&Vec<u32>, &BigRational)> {
        self.terms.iter()
    }

    /// Number of non-zero terms.
    pub fn num_terms(&self) -> usize {
        self.terms.len()
    }

    /// True for the zero polynomial.
    pub fn is_zero(&self) -> bool {
        self.terms.is_empty()
    }

    /// Parse the text syntax for the given variable layout.
    ///
    /// ```
    /// use sheafwright::poly::{Polynomial, VariableLayout};
    /// let layout = VariableLayout::new(&[1, 1]);
    /// let p = Polynomial::parse("x1_0^2*x2_1 - 3/2*x1_1^2*x2_0", &layout).unwrap();
    /// assert_eq!(p.num_terms(), 2);
    /// assert!(p.check_equation(&layout, &[2, 1]).is_ok());
    /// assert!(Polynomial::parse("x1_0 +", &layout).is_err());
    /// ```
    pub fn parse(text: &str, layout: &VariableLayout) -> Result<Self, PolyError> {
        Parser::new(text, layout).parse()
    }

    /// Check that every term has multidegree `expected`, that the polynomial is non-zero and that no variable
    /// divides it (a variable factor makes the zero set reducible, hence singular).
    pub fn check_equation(
        &self,
        layout: &VariableLayout,
        expected: &[u32],
    ) -> Result<(), PolyError> {
        if self.is_zero() {
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
        for v in 0..self.nvars {
            if self.terms.keys().all(|e| e[v] > 0) {
                let i = layout.offsets.partition_point(|&o| o <= v) - 1;
                return Err(PolyError::DivisibleByVariable {
                    factor: i + 1,
                    coord: v - layout.offset(i),
                });
            }
        }
        Ok(())
    }

    /// Render in the text syntax (parses back to the same polynomial).
    pub fn to_text(&self, layout: &VariableLayout) -> String {
        if self.is_zero() {
            return "0".into();
        }
        let mut out = String::new();
        for (i, (e, c)) in self.terms.iter().enumerate() {
            let neg = c < &BigRational::zero();
            let abs = if neg { -c.clone() } else { c.clone() };
            if i == 0 {
                if neg {
                    out.push('-');
                }
            } else {
                out.push_str(if neg { " - " } else { " + " });
            }
            let mono = monomial_text(e, layout);
            if abs.is_one() {
                out.push_str(&mono);
            } else if mono == "1" {
                out.push_str(&abs.to_string());
            } else {
                out.push_str(&format!("{abs}*{mono}"));
            }
        }
        out
    }

    /// A polynomial of multidegree `degree` with every monomial present and random non-zero integer coefficients
    /// in `[-bound, bound]`, drawn from a ChaCha8 stream seeded with `seed` (reproducible across platforms).
    pub fn random(layout: &VariableLayout, degree: &[u32], seed: u64, bound: i64) -> Self {
        let mut rng = ChaCha8Rng::seed_from_u64(seed);
        let mut p = Polynomial::zero(layout.nvars());
        for e in monomials_of_multidegree(layout, degree) {
            let mut c = 0i64;
            while c == 0 {
                c = rng.gen_range(-bound..=bound);
            }
            p.add_term(e, BigRational::from_integer(BigInt::from(c)));
        }
        p
    }
}

/// All exponent vectors of multidegree `degree` (each factor's block sums to its degree), in lexicographic order.
pub fn monomials_of_multidegree(layout: &VariableLayout, degree: &[u32]) -> Vec<Vec<u32>> {
    let mut out = vec![vec![0u32; layout.nvars()]];
    for (i, &d) in degree.iter().enumerate() {
        let block = compositions(d, layout.dims()[i] + 1);
        let mut next = Vec::with_capacity(out.len() * block.len());
        for base in &out {
            for b in &block {
                let mut e = base.clone();
                e[layout.range(i)].copy_from_slice(b);
                next.push(e);
            }
        }
        out = next;
    }
    out
}

/// All vectors of `parts` non-negative integers summing to `total`, in lexicographic order.
pub fn compositions(total: u32, parts: usize) -> Vec<Vec<u32>> {
    fn rec(total: u32, parts: usize, cur: &mut Vec<u32>, out: &mut Vec<Vec<u32>>) {
        if parts == 1 {
            cur.push(total);
            out.push(cur.clone());
            cur.pop();
            return;
        }
        for a in 0..=total {
            cur.push(a);
            rec(total - a, parts - 1, cur, out);
            cur.pop();
        }
    }
    let mut out = Vec::new();
    if parts == 0 {
        if total == 0 {
            out.push(Vec::new());
        }
        return out;
    }
    rec(total, parts, &mut Vec::with_capacity(parts), &mut out);
    out
}

/// One monomial in the text syntax (`x1_0^2*x2_1`; `1` for the empty monomial), shared by the renderers of
/// this module and of [`parametric`].
pub(crate) fn monomial_text(e: &[u32], layout: &VariableLayout) -> String {
    let parts: Vec<String> = e
        .iter()
        .enumerate()
        .filter(|(_, p)| **p > 0)
        .map(|(v, &p)| {
            if p == 1 {
                layout.var_name(v)
            } else {
                format!("{}^{}", layout.var_name(v), p)
            }
        })
        .collect();
    if parts.is_empty() {
        "1".into()
    } else {
        parts.join("*")
    }
}

/// The input with whitespace dropped, as (byte offset, character) pairs: what the parsers read.
pub(crate) fn significant_chars(text: &str) -> Vec<(usize, char)> {
    text.char_indices()
        .filter(|(_, c)| !c.is_whitespace())
        .collect()
}

/// The character cursor shared by the polynomial parsers of this module and of [`parametric`]: positions in
/// errors are 1-based character offsets of the input.
pub(crate) trait CharCursor {
    /// The input as (byte offset, character) pairs, and the current index into it.
    fn cursor(&self) -> (&[(usize, char)], usize);
    /// The current index, for advancing.
    fn cursor_mut(&mut self) -> &mut usize;

    /// A syntax error at the current position.
    fn err<T>(&self, message: impl Into<String>) -> Result<T, PolyError> {
        let (chars, pos) = self.cursor();
        let position = chars
            .get(pos)
            .map(|(i, _)| *i + 1)
            .unwrap_or_else(|| chars.last().map(|(i, _)| i + 2).unwrap_or(1));
        Err(PolyError::Syntax {
            position,
            message: message.into(),
        })
    }

    /// The character at the cursor.
    fn peek(&self) -> Option<char> {
        self.cursor().0.get(self.cursor().1).map(|(_, c)| *c)
    }

    /// A run of decimal digits (at most 200).
    fn integer(&mut self) -> Result<BigInt, PolyError> {
        let start = self.cursor().1;
        while matches!(self.peek(), Some(c) if c.is_ascii_digit()) {
            *self.cursor_mut() += 1;
        }
        if start == self.cursor().1 {
            return self.err("expected a number");
        }
        if self.cursor().1 - start > 200 {
            return self.err("number too long");
        }
        let s: String = self.cursor().0[start..self.cursor().1]
            .iter()
            .map(|(_, c)| c)
            .collect();
        Ok(s.parse().expect("digits parse"))
    }

    /// An integer no larger than `limit`; `what` names it in the error.
    fn small(&mut self, what: &str, limit: u64) -> Result<u64, PolyError> {
        let v = self.integer()?;
        match u64::try_from(&v) {
            Ok(x) if x <= limit => Ok(x),
            _ => self.err(format!("{what} {v} is too large (limit {limit})")),
        }
    }

    /// A coefficient `INTEGER ['/' INTEGER]`; a zero denominator is an error.
    fn rational(&mut self) -> Result<BigRational, PolyError> {
        let num = self.integer()?;
        let mut den = BigInt::one();
        if self.peek() == Some('/') {
            *self.cursor_mut() += 1;
            den = self.integer()?;
            if den.is_zero() {
                return self.err("division by zero in a coefficient");
            }
        }
        Ok(BigRational::new(num, den))
    }

    /// An optional `'^' INTEGER` (at most `limit`); 1 when absent.
    fn optional_power(&mut self, limit: u32) -> Result<u32, PolyError> {
        if self.peek() == Some('^') {
            *self.cursor_mut() += 1;
            Ok(self.small("exponent", limit as u64)? as u32)
        } else {
            Ok(1)
        }
    }

    /// Multiply the monomial `e` by variable `v` to the power `p`, refusing exponents above
    /// [`MAX_EXPONENT`].
    fn multiply_variable(&self, e: &mut [u32], v: usize, p: u32) -> Result<(), PolyError> {
        e[v] = e[v].saturating_add(p);
        if e[v] > MAX_EXPONENT {
            return self.err(format!("exponent above {MAX_EXPONENT}"));
        }
        Ok(())
    }

    /// `['+' | '-'] X (('+' | '-') X)*`, each `X` read by `each` (told whether its sign is negative), up
    /// to the end or the character `stop`.
    fn signed_sum<T>(
        &mut self,
        mut each: impl FnMut(&mut Self, bool) -> Result<T, PolyError>,
        stop: Option<char>,
    ) -> Result<Vec<T>, PolyError>
    where
        Self: Sized,
    {
        let mut out = Vec::new();
        let mut first = true;
        loop {
            let negative = match self.peek() {
                Some('+') => {
                    *self.cursor_mut() += 1;
                    false
                }
                Some('-') => {
                    *self.cursor_mut() += 1;
                    true
                }
                _ if first => false,
                None => break,
                Some(c) if Some(c) == stop => break,
                Some(c) => {
                    return self.err(format!("expected '+' or '-' between terms, found '{c}'"));
                }
            };
            first = false;
            out.push(each(self, negative)?);
        }
        Ok(out)
    }
}

impl CharCursor for Parser<'_> {
    fn cursor(&self) -> (&[(usize, char)], usize) {
        (&self.chars, self.pos)
    }
    fn cursor_mut(&mut self) -> &mut usize {
        &mut self.pos
    }
}

struct Parser<'a> {
    chars: Vec<(usize, char)>,
    pos: usize,
    layout: &'a VariableLayout,
}

impl<'a> Parser<'a> {
    fn new(text: &str, layout: &'a VariableLayout) -> Self {
        Parser {
            chars: significant_chars(text),
            pos: 0,
            layout,
        }
    }

    fn parse(mut self) -> Result<Polynomial, PolyError> {
        let mut p = Polynomial::zero(self.layout.nvars());
        if self.chars.is_empty() {
            return self.err("empty polynomial");
        }
        let terms = self.signed_sum(
            |s, negative| {
                let (e, c) = s.term()?;
                Ok((e, if negative { -c } else { c }))
            },
            None,
        )?;
        for (e, c) in terms {
            p.add_term(e, c);
        }
        Ok(p)
    }

    fn term(&mut self) -> Result<(Vec<u32>, BigRational), PolyError> {
        let mut coeff = BigRational::one();
        let mut e = vec![0u32; self.layout.nvars()];
        if matches!(self.peek(), Some(c) if c.is_ascii_digit()) {
            coeff = self.rational()?;
            match self.peek() {
                Some('*') => self.pos += 1,
                Some('x') => {} // "3 x1_0": juxtaposition means multiplication
                _ => return Ok((e, coeff)),
            }
        }
        loop {
            match self.peek() {
                Some('x') => self.pos += 1,
                Some(c) => return self.err(format!("expected a variable like x1_0, found '{c}'")),
                None => return self.err("expected a variable like x1_0, found the end"),
            }
            let factor = self.small("factor index", 1 << 20)? as usize;
            if self.peek() != Some('_') {
                return self.err("expected '_' in a variable name like x1_0");
            }
            self.pos += 1;
            let coord = self.small("coordinate index", 1 << 20)? as usize;
            let v = self.layout.checked_variable(factor, coord)?;
            let power = self.optional_power(MAX_EXPONENT)?;
            self.multiply_variable(&mut e, v, power)?;
            if self.peek() == Some('*') {
                self.pos += 1;
                continue;
            }
            break;
        }
        Ok((e, coeff))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_and_round_trips() {
        let layout = VariableLayout::new(&[1, 1]);
        let p = Polynomial::parse(
            "x1_0^2*x2_1 - 3/2*x1_1*x2_0*x1_0 + 7 x1_1^2 * x2_1",
            &layout,
        )
        .unwrap();
        assert_eq!(p.num_terms(), 3);
        p.check_equation(&layout, &[2, 1]).unwrap();
        let text = p.to_text(&layout);
        assert_eq!(Polynomial::parse(&text, &layout).unwrap(), p);
    }

    #[test]
    fn reports_errors() {
        let layout = VariableLayout::new(&[1, 1]);
        assert!(matches!(
            Polynomial::parse("x1_0 + ", &layout),
            Err(PolyError::Syntax { .. })
        ));
        assert!(matches!(
            Polynomial::parse("x3_0", &layout),
            Err(PolyError::NoSuchFactor { .. })
        ));
        assert!(matches!(
            Polynomial::parse("x1_2", &layout),
            Err(PolyError::NoSuchVariable { .. })
        ));
        assert!(matches!(
            Polynomial::parse("y1_0", &layout),
            Err(PolyError::Syntax { .. })
        ));
        let p = Polynomial::parse("x1_0*x2_0 - x1_0*x2_0", &layout).unwrap();
        assert_eq!(p.check_equation(&layout, &[1, 1]), Err(PolyError::Zero));
        let p = Polynomial::parse("x1_0^2*x2_0 + x1_0*x1_1*x2_1", &layout).unwrap();
        assert!(matches!(
            p.check_equation(&layout, &[2, 1]),
            Err(PolyError::DivisibleByVariable {
                factor: 1,
                coord: 0
            })
        ));
        let p = Polynomial::parse("x1_0^2*x2_0 + x1_1*x2_1", &layout).unwrap();
        assert!(matches!(
            p.check_equation(&layout, &[2, 1]),
            Err(PolyError::WrongDegree { .. })
        ));
    }

    #[test]
    fn random_polynomial_is_reproducible_and_full() {
        let layout = VariableLayout::new(&[4]);
        let a = Polynomial::random(&layout, &[5], 7, 100);
        let b = Polynomial::random(&layout, &[5], 7, 100);
        assert_eq!(a, b);
        assert_eq!(a.num_terms(), 126); // C(9,4) quintic monomials
        assert_ne!(a, Polynomial::random(&layout, &[5], 8, 100));
    }
}
