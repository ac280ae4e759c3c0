//! Reader for polynomial text: `x^2*y - 3/4*z + 1`, `(x+1)**3`, `-x`.
//!
//! A hand-written recursive-descent parser (no code is ever evaluated). Grammar, loosest first:
//! ```text
//! sum     := product (('+' | '-') product)*
//! product := unary (('*' | '/') unary)*          division only by nonzero constants
//! unary   := ('+' | '-') unary | power
//! power   := atom (('^' | '**') INTEGER)?
//! atom    := INTEGER | NAME | '(' sum ')'
//! ```
//! Names are ring variables, or the field generator (`a` in GF(p^k)). Errors carry the 1-based
//! line and column of the offending character.
//!
//! Time is linear in the length of the text for sums (up to the sort of the terms): the
//! summands of a sum are collected and combined once, never added one by one to a growing
//! polynomial. [`parse_poly_within`] parses under a [`Control`]: interruptible, and products
//! and powers written in the text are bounded by its memory budget.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::poly::{Poly, Ring};

#[derive(Clone, Debug, PartialEq)]
enum Tok {
    Int(String),
    Name(String),
    Plus,
    Minus,
    Star,
    Slash,
    Caret,
    LParen,
    RParen,
    End,
}

/// Where a token starts: 1-based line and column (in characters).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct Pos {
    line: usize,
    column: usize,
}

fn error_at(message: impl Into<String>, pos: Pos) -> Error {
    Error::parse(message, pos.line, pos.column)
}

fn describe(t: &Tok) -> String {
    match t {
        Tok::Int(s) => format!("number '{s}'"),
        Tok::Name(s) => format!("name '{s}'"),
        Tok::Plus => "'+'".into(),
        Tok::Minus => "'-'".into(),
        Tok::Star => "'*'".into(),
        Tok::Slash => "'/'".into(),
        Tok::Caret => "'^'".into(),
        Tok::LParen => "'('".into(),
        Tok::RParen => "')'".into(),
        Tok::End => "end of input".into(),
    }
}

/// Tokens with their positions.
fn tokenize(text: &str) -> Result<Vec<(Tok, Pos)>> {
    let chars: Vec<char> = text.chars().collect();
    let mut out = Vec::new();
    let (mut i, mut line, mut line_start) = (0, 1, 0);
    while i < chars.len() {
        let c = chars[i];
        let pos = Pos {
            line,
            column: i - line_start + 1,
        };
        let take_while = |i: &mut usize, pred: &dyn Fn(char) -> bool| {
            let start = *i;
            while *i < chars.len() && pred(chars[*i]) {
                *i += 1;
            }
            chars[start..*i].iter().collect::<String>()
        };
        let tok = match c {
            '\n' => {
                i += 1;
                line += 1;
                line_start = i;
                continue;
            }
            ' ' | '\t' | '\r' => {
                i += 1;
                continue;
            }
            '0'..='9' => Tok::Int(take_while(&mut i, &|c| c.is_ascii_digit())),
            c if c.is_ascii_alphabetic() || c == '_' => Tok::Name(take_while(&mut i, &|c| {
                c.is_ascii_alphanumeric() || c == '_'
            })),
            _ => {
                i += 1;
                match c {
                    '+' => Tok::Plus,
                    '-' => Tok::Minus,
                    '*' if chars.get(i) == Some(&'*') => {
                        i += 1;
                        Tok::Caret
                    }
                    '*' => Tok::Star,
                    '/' => Tok::Slash,
                    '^' => Tok::Caret,
                    '(' => Tok::LParen,
                    ')' => Tok::RParen,
                    other => return Err(error_at(format!("unexpected character '{other}'"), pos)),
                }
            }
        };
        out.push((tok, pos));
    }
    let end = Pos {
        line,
        column: chars.len() - line_start + 1,
    };
    out.push((Tok::End, end));
    Ok(out)
}

struct Parser<'a, F: Field> {
    ring: &'a Ring<F>,
    control: &'a Control,
    toks: Vec<(Tok, Pos)>,
    pos: usize,
    depth: usize,
}

/// Nesting deeper than this is refused rather than risking the stack.
const MAX_DEPTH: usize = 500;

/// Parses `text` as a polynomial of `ring`.
pub fn parse_poly<F: Field>(ring: &Ring<F>, text: &str) -> Result<Poly<F>> {
    parse_poly_within(ring, text, &Control::new())
}

/// Parses `text` as a polynomial of `ring` under `control` (interruption, memory budget).
pub fn parse_poly_within<F: Field>(
    ring: &Ring<F>,
    text: &str,
    control: &Control,
) -> Result<Poly<F>> {
    let mut p = Parser {
        ring,
        control,
        toks: tokenize(text)?,
        pos: 0,
        depth: 0,
    };
    if p.peek() == &Tok::End {
        return Err(error_at("empty polynomial text", p.at()));
    }
    let f = p.sum()?;
    match p.peek() {
        Tok::End => Ok(f),
        Tok::RParen => Err(error_at("unbalanced parenthesis: ')' without '('", p.at())),
        Tok::Int(_) | Tok::Name(_) | Tok::LParen => Err(error_at(
            format!("expected an operator before {}", describe(p.peek())),
            p.at(),
        )),
        t => Err(error_at(format!("unexpected {}", describe(t)), p.at())),
    }
}

impl<F: Field> Parser<'_, F> {
    fn peek(&self) -> &Tok {
        &self.toks[self.pos].0
    }
    fn at(&self) -> Pos {
        self.toks[self.pos].1
    }
    fn bump(&mut self) -> (Tok, Pos) {
        let t = self.toks[self.pos].clone();
        if t.0 != Tok::End {
            self.pos += 1;
        }
        t
    }

    /// The summands are collected and combined in one pass: adding each to a growing sum
    /// would cost time quadratic in the number of terms.
    fn sum(&mut self) -> Result<Poly<F>> {
        let mut summands = vec![self.product()?];
        loop {
            match self.peek() {
                Tok::Plus => {
                    self.bump();
                    self.control.check()?;
                    summands.push(self.product()?);
                }
                Tok::Minus => {
                    self.bump();
                    self.control.check()?;
                    let f = self.product()?;
                    summands.push(self.ring.neg(&f));
                }
                _ => break,
            }
        }
        if summands.len() == 1 {
            return Ok(summands.pop().expect("one summand"));
        }
        Ok(self
            .ring
            .from_terms(summands.into_iter().flat_map(Poly::into_terms)))
    }

    fn product(&mut self) -> Result<Poly<F>> {
        let mut acc = self.unary()?;
        loop {
            match self.peek() {
                Tok::Star => {
                    self.bump();
                    let factor = self.unary()?;
                    acc = self.ring.mul_within(&acc, &factor, self.control)?;
                }
                Tok::Slash => {
                    let at = self.bump().1;
                    let d = self.unary()?;
                    acc = self.divide(&acc, &d, at)?;
                }
                _ => return Ok(acc),
            }
        }
    }

    fn divide(&self, f: &Poly<F>, d: &Poly<F>, at: Pos) -> Result<Poly<F>> {
        if !d.is_constant() {
            return Err(error_at("division by a non-constant polynomial", at));
        }
        let field = &self.ring.field;
        let c = d
            .leading_coefficient()
            .cloned()
            .unwrap_or_else(|| field.zero());
        match field.inv(&c) {
            Some(ci) => Ok(self.ring.scale(f, &ci)),
            None => Err(error_at(
                format!("division by zero (the divisor is 0 in {})", field.spec()),
                at,
            )),
        }
    }

    fn unary(&mut self) -> Result<Poly<F>> {
        match self.peek() {
            Tok::Minus => {
                self.bump();
                let f = self.nested(|p| p.unary())?;
                Ok(self.ring.neg(&f))
            }
            Tok::Plus => {
                self.bump();
                self.nested(|p| p.unary())
            }
            _ => self.power(),
        }
    }

    fn nested(&mut self, inner: impl FnOnce(&mut Self) -> Result<Poly<F>>) -> Result<Poly<F>> {
        self.depth += 1;
        if self.depth > MAX_DEPTH {
            return Err(error_at("expression nested too deeply", self.at()));
        }
        let r = inner(self);
        self.depth -= 1;
        r
    }

    fn power(&mut self) -> Result<Poly<F>> {
        let base = self.atom()?;
        if self.peek() != &Tok::Caret {
            return Ok(base);
        }
        self.bump();
        let (tok, at) = self.bump();
        let Tok::Int(digits) = tok else {
            return Err(error_at(
                format!(
                    "expected a non-negative integer exponent, found {}",
                    describe(&tok)
                ),
                at,
            ));
        };
        let e: u32 = digits.parse().map_err(|_| {
            error_at(
                format!("exponent {digits} is too large (at most 2^32 - 1)"),
                at,
            )
        })?;
        if self.peek() == &Tok::Caret {
            return Err(error_at(
                "chained exponents are ambiguous: use parentheses",
                self.at(),
            ));
        }
        self.ring
            .pow_within(&base, e as u64, self.control)
            .map_err(|e| match e {
                Error::Interrupted => e,
                Error::ResourceLimit(m) => Error::ResourceLimit(format!(
                    "{m} (the power at line {}, column {})",
                    at.line, at.column
                )),
                other => error_at(other.to_string(), at),
            })
    }

    fn atom(&mut self) -> Result<Poly<F>> {
        let (tok, at) = self.bump();
        match tok {
            Tok::Int(digits) => Ok(self.ring.constant(self.ring.field.from_decimal(&digits))),
            Tok::Name(name) => self.name(&name, at),
            Tok::LParen => {
                let f = self.nested(|p| p.sum())?;
                match self.bump() {
                    (Tok::RParen, _) => Ok(f),
                    (Tok::End, end) => Err(error_at("unbalanced parenthesis: missing ')'", end)),
                    (t, other) => Err(error_at(
                        format!("expected ')' but found {}", describe(&t)),
                        other,
                    )),
                }
            }
            Tok::End => Err(error_at(
                "unexpected end of input: expected a number, a variable or '('",
                at,
            )),
            t => Err(error_at(
                format!(
                    "expected a number, a variable or '(' but found {}",
                    describe(&t)
                ),
                at,
            )),
        }
    }

    fn name(&self, name: &str, at: Pos) -> Result<Poly<F>> {
        if let Some(i) = self.ring.var_index(name) {
            return Ok(self.ring.var(i));
        }
        let field = &self.ring.field;
        if field.generator_name() == Some(name) {
            return Ok(self.ring.constant(field.generator().expect("generator")));
        }
        // `a` is the generator only in GF(p^k): say so where it means nothing.
        let generator_hint = if name == "a" && field.generator_name().is_none() {
            format!(
                "; {} has no generator a: it names the generator of GF(p^k) fields only",
                field.spec()
            )
        } else {
            String::new()
        };
        Err(error_at(
            format!(
                "unknown variable '{name}' (the variables are {}){generator_hint}",
                self.ring.names().join(", ")
            ),
            at,
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::order::MonomialOrder;
    use proptest::prelude::*;

    fn ring(p: u64) -> Ring<PrimeField> {
        let names = ["x", "y", "z"].iter().map(|s| s.to_string()).collect();
        Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap()
    }

    fn err(text: &str) -> (String, usize) {
        match parse_poly(&ring(7), text) {
            Err(Error::Parse {
                message,
                line: 1,
                column,
            }) => (message, column),
            other => panic!("expected a parse error for {text:?}, got {other:?}"),
        }
    }

    #[test]
    fn reads_the_interface_examples() {
        let r = ring(7);
        let f = parse_poly(&r, "x^2*y - 3/4*z + 1").unwrap();
        // 3/4 = 3 * 2 = 6 = -1 in GF(7), so -3/4 z = z.
        assert_eq!(r.format(&f), "x^2*y + z + 1");
        let g = parse_poly(&r, "(x+1)**3").unwrap();
        assert_eq!(r.format(&g), "x^3 + 3*x^2 + 3*x + 1");
        assert_eq!(r.format(&parse_poly(&r, "-x").unwrap()), "-x");
        assert_eq!(r.format(&parse_poly(&r, "-x^2").unwrap()), "-x^2");
        assert_eq!(r.format(&parse_poly(&r, "x - x").unwrap()), "0");
        assert_eq!(r.format(&parse_poly(&r, "8*x").unwrap()), "x");
    }

    #[test]
    fn errors_name_what_and_where() {
        assert_eq!(
            err("x + w"),
            ("unknown variable 'w' (the variables are x, y, z)".into(), 5)
        );
        assert_eq!(
            err("(x + y"),
            ("unbalanced parenthesis: missing ')'".into(), 7)
        );
        assert_eq!(
            err("x + y)"),
            ("unbalanced parenthesis: ')' without '('".into(), 6)
        );
        assert_eq!(
            err("1/7*x"),
            ("division by zero (the divisor is 0 in GF(7))".into(), 2)
        );
        assert_eq!(
            err("x +"),
            (
                "unexpected end of input: expected a number, a variable or '('".into(),
                4
            )
        );
        assert_eq!(err("2x").1, 2);
        assert_eq!(err("x / y").0, "division by a non-constant polynomial");
        assert_eq!(
            err("x^y").0,
            "expected a non-negative integer exponent, found name 'y'"
        );
        assert_eq!(err("x ? y"), ("unexpected character '?'".into(), 3));
        assert_eq!(err("").0, "empty polynomial text");
        assert!(err("x^99999999999").0.contains("too large"));
    }

    #[test]
    fn errors_give_the_line_of_multi_line_text() {
        let r = ring(7);
        let text = "x^2 + y\n  + 3*z\n  - w + 1";
        match parse_poly(&r, text) {
            Err(Error::Parse { line, column, .. }) => assert_eq!((line, column), (3, 5)),
            other => panic!("expected a parse error, got {other:?}"),
        }
        match parse_poly(&r, "x +\n") {
            Err(Error::Parse { line, column, .. }) => assert_eq!((line, column), (2, 1)),
            other => panic!("expected a parse error, got {other:?}"),
        }
        assert_eq!(
            r.format(&parse_poly(&r, "x\n+ y\r\n+ z").unwrap()),
            "x + y + z"
        );
    }

    /// A long sum comes out term for term: 30,000 distinct monomials x^i y^j with known
    /// coefficients, then the same sum minus itself, which must cancel to zero. (A sum is
    /// combined once, so this also runs in time linear in its length; the time itself is
    /// measured in bench/bench_fields.py, not asserted here.)
    #[test]
    fn long_sums_are_read_term_for_term() {
        let r = ring(65521);
        let n = 30_000u32;
        let term = |i: u32| format!("{}*x^{}*y^{}", i % 65520 + 1, i / 200, i % 200);
        let text: Vec<String> = (0..n).map(term).collect();
        let f = parse_poly(&r, &text.join(" + ")).unwrap();
        assert_eq!(f.len(), n as usize);
        for (m, c) in f.terms() {
            let (a, b) = (m.exponents()[0], m.exponents()[1]);
            assert_eq!(m.exponents()[2], 0);
            let i = a * 200 + b;
            assert_eq!(*c, (i % 65520 + 1) as u64, "x^{a}*y^{b}");
        }
        let back = format!("{} - ({})", text.join(" + "), text.join(" + "));
        assert!(parse_poly(&r, &back).unwrap().is_zero());
        let alternating: Vec<&str> = (0..n)
            .map(|i| if i % 2 == 0 { "x" } else { "-x" })
            .collect();
        assert!(parse_poly(&r, &alternating.join(" + ")).unwrap().is_zero());
    }

    /// A linear form in 1,000 variables: every variable appears with its own coefficient.
    #[test]
    fn linear_forms_in_many_variables() {
        let names: Vec<String> = (0..1000).map(|i| format!("v{i}")).collect();
        let r = Ring::new(
            PrimeField::new(32003).unwrap(),
            names.clone(),
            MonomialOrder::Grevlex,
        )
        .unwrap();
        let text: Vec<String> = names
            .iter()
            .enumerate()
            .map(|(i, v)| format!("{}*{v}", i + 1))
            .collect();
        let f = parse_poly(&r, &(text.join(" + ") + " + 7")).unwrap();
        assert_eq!(f.len(), 1001);
        for (i, (m, c)) in f.terms().iter().take(1000).enumerate() {
            assert_eq!(m.exponents()[i], 1);
            assert_eq!(*c, (i + 1) as u64);
        }
    }

    fn random_poly() -> impl Strategy<Value = Vec<(Vec<u32>, i64)>> {
        proptest::collection::vec((proptest::collection::vec(0u32..4, 3), -50i64..50), 0..8)
    }

    proptest! {
        /// str() of a polynomial reads back to the same polynomial, over small and large primes.
        #[test]
        fn format_parse_round_trip(terms in random_poly()) {
            for p in [2u64, 3, 65521, (1 << 63) - 25] {
                let r = ring(p);
                let f = r.from_terms(terms.iter().map(|(e, c)| {
                    (crate::Monomial::from_exponents(e.clone()).unwrap(), r.field.from_i64(*c))
                }));
                let text = r.format(&f);
                let back = parse_poly(&r, &text).unwrap();
                prop_assert_eq!(&back, &f, "text {}", text);
                prop_assert_eq!(r.format(&back), text);
            }
        }

        /// Ring arithmetic: distributivity and (f + g)^2 = f^2 + 2fg + g^2.
        #[test]
        fn ring_identities(a in random_poly(), b in random_poly(), c in random_poly()) {
            let r = ring(65521);
            let mk = |t: &Vec<(Vec<u32>, i64)>| r.from_terms(t.iter().map(|(e, c)| {
                (crate::Monomial::from_exponents(e.clone()).unwrap(), r.field.from_i64(*c))
            }));
            let (f, g, h) = (mk(&a), mk(&b), mk(&c));
            let lhs = r.mul(&f, &r.add(&g, &h)).unwrap();
            let rhs = r.add(&r.mul(&f, &g).unwrap(), &r.mul(&f, &h).unwrap());
            prop_assert_eq!(lhs, rhs);
            let sq = r.pow(&r.add(&f, &g), 2).unwrap();
            let two_fg = r.scale(&r.mul(&f, &g).unwrap(), &2);
            let expand = r.add(&r.add(&r.pow(&f, 2).unwrap(), &two_fg), &r.pow(&g, 2).unwrap());
            prop_assert_eq!(sq, expand);
            prop_assert_eq!(r.sub(&f, &f), Poly::zero());
        }
    }
}
