//! Boolean polynomials: sums of square-free monomials over GF(2), with every variable
//! satisfying v^2 = v, and the ring that gives them meaning.
//!
//! A [`BoolPoly`] holds its monomials as bit sets (see [`super::monomial`]), `words` words per
//! monomial, strictly decreasing in its ring's order; products reduce on the fly (x·x = x).
//! Polynomials come from text through the general reader ([`crate::parse`]) and from general
//! polynomials over GF(2) by reducing every exponent to 0 or 1 — both are the image in the
//! quotient ring GF(2)[x] / (x_i^2 + x_i).

use super::monomial::{Bits, BoolOrder};
use crate::error::{Error, Result};
use crate::field::{Field, PrimeField};
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use std::cmp::Ordering;

/// Most variables a Boolean ring may have: 16 words of 64 bits per monomial.
pub const MAX_VARIABLES: usize = 1024;

/// A Boolean polynomial: monomials strictly decreasing in its ring's order.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct BoolPoly {
    words: usize,
    data: Vec<u64>,
}

impl BoolPoly {
    pub fn zero(words: usize) -> Self {
        BoolPoly {
            words,
            data: Vec::new(),
        }
    }
    pub fn is_zero(&self) -> bool {
        self.data.is_empty()
    }
    /// Number of monomials.
    pub fn len(&self) -> usize {
        self.data.len() / self.words
    }
    pub fn is_empty(&self) -> bool {
        self.data.is_empty()
    }
    /// Words per monomial.
    pub fn words(&self) -> usize {
        self.words
    }
    /// The monomials, decreasing.
    pub fn monomials(&self) -> impl Iterator<Item = &[u64]> {
        self.data.chunks_exact(self.words)
    }
    pub fn leading_monomial(&self) -> Option<&[u64]> {
        self.monomials().next()
    }
    /// Total degree; `None` for zero.
    pub fn degree(&self) -> Option<u32> {
        self.monomials()
            .map(|m| m.iter().map(|w| w.count_ones()).sum())
            .max()
    }
    /// Whether the polynomial is 1.
    pub fn is_one(&self) -> bool {
        self.len() == 1 && self.data.iter().all(|&w| w == 0)
    }
    /// The monomials as bit sets of `W ≥ words` words.
    pub fn to_bits<const W: usize>(&self) -> Vec<Bits<W>> {
        self.monomials().map(Bits::from_slice).collect()
    }
    /// A polynomial from bit sets already strictly decreasing in the ring's order.
    pub fn from_bits<const W: usize>(words: usize, monomials: &[Bits<W>]) -> Self {
        let mut data = Vec::with_capacity(monomials.len() * words);
        for m in monomials {
            data.extend_from_slice(&m.0[..words]);
        }
        BoolPoly { words, data }
    }
}

/// The Boolean ring GF(2)[x_0..x_{n-1}] / (x_i^2 + x_i) with named variables and an order.
#[derive(Clone, Debug, PartialEq)]
pub struct BooleanRing {
    names: Vec<String>,
    pub order: BoolOrder,
    words: usize,
    /// The polynomial ring over GF(2) on the same names: the general reader works there.
    general: Ring<PrimeField>,
}

impl BooleanRing {
    /// A Boolean ring in the named variables (x_0 > x_1 > ... in the order of the list).
    pub fn new(names: Vec<String>, order: BoolOrder) -> Result<Self> {
        if names.len() > MAX_VARIABLES {
            return Err(Error::invalid(format!(
                "a Boolean ring has at most {MAX_VARIABLES} variables; {} were given",
                names.len()
            )));
        }
        let general = Ring::new(PrimeField::new(2)?, names.clone(), order.general())?;
        Ok(BooleanRing {
            words: names.len().div_ceil(64).max(1),
            names,
            order,
            general,
        })
    }

    pub fn nvars(&self) -> usize {
        self.names.len()
    }
    pub fn names(&self) -> &[String] {
        &self.names
    }
    /// Words per monomial.
    pub fn words(&self) -> usize {
        self.words
    }
    /// The polynomial ring over GF(2) with the same variables and order.
    pub fn general_ring(&self) -> &Ring<PrimeField> {
        &self.general
    }
    /// The same variables with another order.
    pub fn with_order(&self, order: BoolOrder) -> Result<Self> {
        BooleanRing::new(self.names.clone(), order)
    }

    pub fn zero(&self) -> BoolPoly {
        BoolPoly::zero(self.words)
    }
    pub fn one(&self) -> BoolPoly {
        BoolPoly {
            words: self.words,
            data: vec![0; self.words],
        }
    }
    pub fn var(&self, v: usize) -> Result<BoolPoly> {
        if v >= self.nvars() {
            return Err(Error::invalid(format!(
                "variable index {v} out of range for {} variables",
                self.nvars()
            )));
        }
        let mut data = vec![0; self.words];
        data[v / 64] = 1 << (v % 64);
        Ok(BoolPoly {
            words: self.words,
            data,
        })
    }

    fn check(&self, f: &BoolPoly) -> Result<()> {
        if f.words != self.words {
            return Err(Error::invalid(
                "the polynomial belongs to a Boolean ring with another number of variables",
            ));
        }
        Ok(())
    }

    /// The polynomial whose monomials are `data` (`words` words each, any order, repeats allowed):
    /// sorted, and monomials that occur an even number of times cancel.
    pub fn from_words(&self, data: &[u64]) -> Result<BoolPoly> {
        let w = self.words;
        if !data.len().is_multiple_of(w) {
            return Err(Error::invalid(format!(
                "monomial data of {} words is not a multiple of {w}",
                data.len()
            )));
        }
        let spare = self.nvars() % 64;
        let top_mask = if spare == 0 { !0 } else { (1u64 << spare) - 1 };
        if data.chunks_exact(w).any(|m| m[w - 1] & !top_mask != 0) {
            return Err(Error::invalid(
                "a monomial uses a variable beyond the ring's",
            ));
        }
        let mut index: Vec<usize> = (0..data.len() / w).collect();
        let mono = |i: usize| &data[i * w..(i + 1) * w];
        index.sort_unstable_by(|&a, &b| self.order.cmp(mono(b), mono(a)));
        let mut out = Vec::with_capacity(data.len());
        let mut k = 0;
        while k < index.len() {
            let mut run = 1;
            while k + run < index.len() && mono(index[k + run]) == mono(index[k]) {
                run += 1;
            }
            if run % 2 == 1 {
                out.extend_from_slice(mono(index[k]));
            }
            k += run;
        }
        Ok(BoolPoly {
            words: w,
            data: out,
        })
    }

    /// f + g: the merge of two sorted lists, equal monomials cancelling.
    pub fn add(&self, f: &BoolPoly, g: &BoolPoly) -> Result<BoolPoly> {
        self.check(f)?;
        self.check(g)?;
        let w = self.words;
        let mut out = Vec::with_capacity(f.data.len() + g.data.len());
        let (mut a, mut b) = (f.monomials().peekable(), g.monomials().peekable());
        loop {
            match (a.peek(), b.peek()) {
                (Some(x), Some(y)) => match self.order.cmp(x, y) {
                    Ordering::Greater => out.extend_from_slice(a.next().unwrap()),
                    Ordering::Less => out.extend_from_slice(b.next().unwrap()),
                    Ordering::Equal => {
                        a.next();
                        b.next();
                    }
                },
                (Some(_), None) => out.extend_from_slice(a.next().unwrap()),
                (None, Some(_)) => out.extend_from_slice(b.next().unwrap()),
                (None, None) => break,
            }
        }
        Ok(BoolPoly {
            words: w,
            data: out,
        })
    }

    /// f·g with x·x = x.
    pub fn mul(&self, f: &BoolPoly, g: &BoolPoly) -> Result<BoolPoly> {
        self.check(f)?;
        self.check(g)?;
        let products = f.len().checked_mul(g.len()).filter(|&p| p <= 1 << 28);
        let Some(products) = products else {
            return Err(Error::ResourceLimit(format!(
                "product of polynomials with {} and {} monomials is too large",
                f.len(),
                g.len()
            )));
        };
        let mut data = Vec::with_capacity(products * self.words);
        for m in f.monomials() {
            for n in g.monomials() {
                data.extend(m.iter().zip(n).map(|(x, y)| x | y));
            }
        }
        self.from_words(&data)
    }

    /// The value at a point of GF(2)^n.
    pub fn evaluate(&self, f: &BoolPoly, point: &[bool]) -> Result<bool> {
        self.check(f)?;
        if point.len() != self.nvars() {
            return Err(Error::invalid(format!(
                "evaluation point has {} coordinates for {} variables",
                point.len(),
                self.nvars()
            )));
        }
        let words = pack_point(point, self.words);
        Ok(f.monomials().fold(false, |acc, m| {
            acc ^ m.iter().zip(&words).all(|(&mw, &pw)| mw & !pw == 0)
        }))
    }

    /// The image of a general polynomial over GF(2) whose ring has these variables (same names,
    /// same positions): every exponent above 0 becomes 1.
    pub fn from_poly<F: Field>(&self, ring: &Ring<F>, f: &Poly<F>) -> Result<BoolPoly> {
        self.check_general(ring)?;
        let mut data = Vec::with_capacity(f.len() * self.words);
        for (m, c) in f.terms() {
            if ring.field.is_zero(c) {
                continue;
            }
            let mut word = vec![0u64; self.words];
            for (v, &e) in m.exponents().iter().enumerate() {
                if e > 0 {
                    word[v / 64] |= 1 << (v % 64);
                }
            }
            data.extend_from_slice(&word);
        }
        self.from_words(&data)
    }

    /// The same polynomial in a general ring over GF(2) with these variables.
    pub fn to_poly<F: Field>(&self, ring: &Ring<F>, f: &BoolPoly) -> Result<Poly<F>> {
        self.check_general(ring)?;
        self.check(f)?;
        let n = self.nvars();
        let terms = f.monomials().map(|m| {
            let exps = Monomial::from_exponent_fn(n, |v| (m[v / 64] >> (v % 64) & 1) as u32)
                .expect("exponents 0 and 1 cannot overflow");
            (exps, ring.field.one())
        });
        Ok(ring.from_terms(terms))
    }

    fn check_general<F: Field>(&self, ring: &Ring<F>) -> Result<()> {
        if ring.field.order().as_deref() != Some("2") {
            return Err(Error::invalid(format!(
                "a Boolean ring works over GF(2), not over {}",
                ring.field.spec()
            )));
        }
        if ring.names() != self.names.as_slice() {
            return Err(Error::invalid(
                "the general ring's variables differ from the Boolean ring's",
            ));
        }
        Ok(())
    }

    /// Reads polynomial text (the syntax of [`crate::parse`]) and reduces it.
    pub fn parse(&self, text: &str) -> Result<BoolPoly> {
        let f = crate::parse::parse_poly(&self.general, text)?;
        self.from_poly(&self.general, &f)
    }

    /// Text that [`BooleanRing::parse`] reads back: `x0*x3 + x1 + 1`.
    pub fn format(&self, f: &BoolPoly) -> String {
        if f.is_zero() {
            return "0".into();
        }
        let terms: Vec<String> = f
            .monomials()
            .map(|m| {
                let vars: Vec<&str> = (0..self.nvars())
                    .filter(|&v| m[v / 64] >> (v % 64) & 1 == 1)
                    .map(|v| self.names[v].as_str())
                    .collect();
                if vars.is_empty() {
                    "1".to_string()
                } else {
                    vars.join("*")
                }
            })
            .collect();
        terms.join(" + ")
    }

    /// f with the variables `fixed[i].0` set to `fixed[i].1`.
    pub fn substitute(&self, f: &BoolPoly, fixed: &[(usize, bool)]) -> Result<BoolPoly> {
        self.check(f)?;
        let (mut clear, mut kill) = (vec![0u64; self.words], vec![0u64; self.words]);
        for &(v, value) in fixed {
            if v >= self.nvars() {
                return Err(Error::invalid(format!("variable index {v} out of range")));
            }
            // A variable set to 1 disappears from its monomials; set to 0 it kills them.
            if value {
                clear[v / 64] |= 1 << (v % 64);
            } else {
                kill[v / 64] |= 1 << (v % 64);
            }
        }
        let mut data = Vec::with_capacity(f.data.len());
        for m in f.monomials() {
            if m.iter().zip(&kill).any(|(a, k)| a & k != 0) {
                continue;
            }
            data.extend(m.iter().zip(&clear).map(|(a, c)| a & !c));
        }
        self.from_words(&data)
    }
}

/// A point of GF(2)^n as bit-set words (bit v set when coordinate v is 1).
pub fn pack_point(point: &[bool], words: usize) -> Vec<u64> {
    let mut out = vec![0u64; words];
    for (v, &b) in point.iter().enumerate() {
        if b {
            out[v / 64] |= 1 << (v % 64);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ring(n: usize) -> BooleanRing {
        BooleanRing::new(
            (0..n).map(|i| format!("x{i}")).collect(),
            BoolOrder::Grevlex,
        )
        .unwrap()
    }

    #[test]
    fn products_reduce_and_like_terms_cancel() {
        let r = ring(3);
        let f = r.parse("x0^3*x1 + x1*x0 + x2 + 1").unwrap();
        assert_eq!(r.format(&f), "x2 + 1");
        let g = r.parse("(x0 + 1)*(x0 + x1)").unwrap();
        // x0^2 + x0 x1 + x0 + x1 = x0 x1 + x1 since x0^2 = x0.
        assert_eq!(r.format(&g), "x0*x1 + x1");
        let h = r
            .mul(&r.parse("x0 + x1").unwrap(), &r.parse("x0").unwrap())
            .unwrap();
        assert_eq!(r.format(&h), "x0*x1 + x0");
        assert_eq!(r.parse(&r.format(&g)).unwrap(), g);
        assert!(r.add(&g, &g).unwrap().is_zero());
    }

    /// Evaluation agrees with the general polynomial's value over GF(2) at all 8 points.
    #[test]
    fn evaluation_agrees_with_the_general_polynomial() {
        let r = ring(3);
        let text = "x0^2*x1 + x1*x2^3 + x0 + x2 + 1";
        let general = r.general_ring();
        let f = crate::parse::parse_poly(general, text).unwrap();
        let b = r.parse(text).unwrap();
        for p in 0u64..8 {
            let point: Vec<bool> = (0..3).map(|i| p >> i & 1 == 1).collect();
            let values: Vec<u64> = point.iter().map(|&x| x as u64).collect();
            let expected = general.evaluate(&f, &values).unwrap() == 1;
            assert_eq!(r.evaluate(&b, &point).unwrap(), expected);
        }
        let back = r.to_poly(general, &b).unwrap();
        assert_eq!(r.from_poly(general, &back).unwrap(), b);
    }

    #[test]
    fn bad_input_is_refused() {
        let r = ring(3);
        assert!(r.parse("x0 + y").is_err());
        let gf3 = Ring::new(
            PrimeField::new(3).unwrap(),
            (0..3).map(|i| format!("x{i}")).collect(),
            BoolOrder::Grevlex.general(),
        )
        .unwrap();
        let f = crate::parse::parse_poly(&gf3, "x0").unwrap();
        assert!(r.from_poly(&gf3, &f).is_err());
        assert!(BooleanRing::new(vec!["a".into(); 2], BoolOrder::Lex).is_err());
    }

    #[test]
    fn many_variables_and_substitution() {
        let r = ring(200);
        let f = r.parse("x0*x150*x199 + x70 + x150").unwrap();
        assert_eq!(r.words(), 4);
        assert_eq!(r.format(&f), "x0*x150*x199 + x70 + x150");
        let g = r.substitute(&f, &[(150, true), (70, false)]).unwrap();
        assert_eq!(r.format(&g), "x0*x199 + 1");
        let mut point = vec![false; 200];
        point[0] = true;
        point[199] = true;
        assert!(!r.evaluate(&g, &point).unwrap());
    }
}
