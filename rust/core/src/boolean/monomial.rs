//! Square-free monomials as bit sets, and the orders on them.
//!
//! In the Boolean ring GF(2)[x_0..x_{n-1}] / (x_i^2 + x_i) every monomial is square-free, so a
//! monomial is the set of its variables: bit `i % 64` of word `i / 64` stands for x_i. The product
//! of two monomials is the union of the sets (x^2 = x), divisibility is inclusion. Orders (with
//! x_0 > x_1 > ... as in the general rings): lex, deglex (degree, then lex) and grevlex (degree,
//! then the monomial with the smaller exponent in the last variable where they differ is the
//! larger), restricted to square-free monomials (Cox, Little and O'Shea 1992, §2.2).

use crate::error::{Error, Result};
use std::cmp::Ordering;
use std::hash::{BuildHasherDefault, Hash, Hasher};

/// A square-free monomial in at most `64 * W` variables.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub struct Bits<const W: usize>(pub [u64; W]);

impl<const W: usize> Hash for Bits<W> {
    #[inline]
    fn hash<H: Hasher>(&self, state: &mut H) {
        for w in self.0 {
            state.write_u64(w);
        }
    }
}

impl<const W: usize> Bits<W> {
    pub const ONE: Self = Bits([0; W]);

    /// The monomial whose words are `words` (missing words are zero).
    #[inline]
    pub fn from_slice(words: &[u64]) -> Self {
        let mut out = [0; W];
        out[..words.len()].copy_from_slice(words);
        Bits(out)
    }
    #[inline]
    pub fn var(v: usize) -> Self {
        let mut out = [0; W];
        out[v / 64] = 1 << (v % 64);
        Bits(out)
    }
    #[inline]
    pub fn degree(&self) -> u32 {
        self.0.iter().map(|w| w.count_ones()).sum()
    }
    #[inline]
    pub fn is_one(&self) -> bool {
        self.0.iter().all(|&w| w == 0)
    }
    /// The product (x^2 = x): the union of the variable sets.
    #[inline]
    pub fn union(&self, other: &Self) -> Self {
        Bits(std::array::from_fn(|i| self.0[i] | other.0[i]))
    }
    /// The variables of `self` not in `other` (the quotient when `other` divides `self`).
    #[inline]
    pub fn minus(&self, other: &Self) -> Self {
        Bits(std::array::from_fn(|i| self.0[i] & !other.0[i]))
    }
    #[inline]
    pub fn divides(&self, other: &Self) -> bool {
        (0..W).all(|i| self.0[i] & !other.0[i] == 0)
    }
    #[inline]
    pub fn coprime(&self, other: &Self) -> bool {
        (0..W).all(|i| self.0[i] & other.0[i] == 0)
    }
    #[inline]
    pub fn has_var(&self, v: usize) -> bool {
        self.0[v / 64] >> (v % 64) & 1 == 1
    }
    /// The variables, increasing.
    pub fn vars(&self) -> impl Iterator<Item = usize> + '_ {
        self.0.iter().enumerate().flat_map(|(i, &w)| {
            let mut w = w;
            std::iter::from_fn(move || {
                (w != 0).then(|| {
                    let b = w.trailing_zeros() as usize;
                    w &= w - 1;
                    64 * i + b
                })
            })
        })
    }
}

/// A monomial order on square-free monomials.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum BoolOrder {
    Lex,
    Deglex,
    #[default]
    Grevlex,
}

impl BoolOrder {
    /// Orders by name: `lex`, `deglex` (also `grlex`), `grevlex`.
    pub fn by_name(name: &str) -> Result<Self> {
        match name {
            "lex" => Ok(BoolOrder::Lex),
            "deglex" | "grlex" => Ok(BoolOrder::Deglex),
            "grevlex" => Ok(BoolOrder::Grevlex),
            other => Err(Error::invalid(format!(
                "unknown order '{other}' for a Boolean ring: expected lex, deglex or grevlex"
            ))),
        }
    }

    pub fn name(&self) -> &'static str {
        match self {
            BoolOrder::Lex => "lex",
            BoolOrder::Deglex => "deglex",
            BoolOrder::Grevlex => "grevlex",
        }
    }

    /// The same order on general monomials (deglex is called grlex there).
    pub fn general(&self) -> crate::order::MonomialOrder {
        use crate::order::MonomialOrder;
        match self {
            BoolOrder::Lex => MonomialOrder::Lex,
            BoolOrder::Deglex => MonomialOrder::Grlex,
            BoolOrder::Grevlex => MonomialOrder::Grevlex,
        }
    }

    /// Whether a larger degree always means a larger monomial.
    pub fn is_graded(&self) -> bool {
        !matches!(self, BoolOrder::Lex)
    }

    /// Compares two monomials given as words of the same length.
    #[inline]
    pub fn cmp(&self, a: &[u64], b: &[u64]) -> Ordering {
        let degree = |m: &[u64]| m.iter().map(|w| w.count_ones()).sum::<u32>();
        match self {
            BoolOrder::Lex => lex(a, b),
            BoolOrder::Deglex => degree(a).cmp(&degree(b)).then_with(|| lex(a, b)),
            BoolOrder::Grevlex => degree(a).cmp(&degree(b)).then_with(|| revlex(a, b)),
        }
    }

    #[inline]
    pub fn cmp_bits<const W: usize>(&self, a: &Bits<W>, b: &Bits<W>) -> Ordering {
        self.cmp(&a.0, &b.0)
    }
}

/// The monomial with the first (lowest-index) variable where they differ is the larger.
#[inline]
fn lex(a: &[u64], b: &[u64]) -> Ordering {
    for (x, y) in a.iter().zip(b) {
        let diff = x ^ y;
        if diff != 0 {
            let lowest = diff & diff.wrapping_neg();
            return if x & lowest != 0 {
                Ordering::Greater
            } else {
                Ordering::Less
            };
        }
    }
    Ordering::Equal
}

/// Among monomials of one degree: the one with the last variable where they differ is the
/// smaller.
#[inline]
fn revlex(a: &[u64], b: &[u64]) -> Ordering {
    for (x, y) in a.iter().zip(b).rev() {
        let diff = x ^ y;
        if diff != 0 {
            let highest = 1u64 << (63 - diff.leading_zeros());
            return if x & highest != 0 {
                Ordering::Less
            } else {
                Ordering::Greater
            };
        }
    }
    Ordering::Equal
}

/// The sum of the monomials `monos` (any order, repeats allowed) as a polynomial: sorted
/// decreasing in `order`, monomials occurring an even number of times cancelled.
pub fn sum_of<const W: usize>(order: BoolOrder, mut monos: Vec<Bits<W>>) -> Vec<Bits<W>> {
    monos.sort_unstable_by(|a, b| order.cmp_bits(b, a));
    let mut out: Vec<Bits<W>> = Vec::with_capacity(monos.len());
    for m in monos {
        if out.last() == Some(&m) {
            out.pop();
        } else {
            out.push(m);
        }
    }
    out
}

/// A fast hasher for words (multiply and rotate): the monomial tables hash millions of keys that
/// need no protection against chosen collisions.
#[derive(Default, Clone, Copy)]
pub struct WordHasher(u64);

impl Hasher for WordHasher {
    #[inline]
    fn write(&mut self, bytes: &[u8]) {
        for chunk in bytes.chunks(8) {
            let mut word = [0u8; 8];
            word[..chunk.len()].copy_from_slice(chunk);
            self.write_u64(u64::from_le_bytes(word));
        }
    }
    #[inline]
    fn write_u64(&mut self, x: u64) {
        self.0 = (self.0.rotate_left(5) ^ x).wrapping_mul(0x517c_c1b7_2722_0a95);
    }
    #[inline]
    fn write_usize(&mut self, x: usize) {
        self.write_u64(x as u64);
    }
    #[inline]
    fn finish(&self) -> u64 {
        self.0 ^ (self.0 >> 29)
    }
}

pub type WordMap<K, V> = std::collections::HashMap<K, V, BuildHasherDefault<WordHasher>>;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::monomial::Monomial;

    /// On square-free monomials the three orders agree with the general orders of
    /// `crate::order` (exponents 0/1), for every pair of monomials in 5 variables.
    #[test]
    fn orders_agree_with_the_general_orders() {
        for order in [BoolOrder::Lex, BoolOrder::Deglex, BoolOrder::Grevlex] {
            let general = order.general();
            for a in 0u64..32 {
                for b in 0u64..32 {
                    let exps = |m: u64| {
                        Monomial::from_exponents((0..5).map(|i| (m >> i & 1) as u32).collect())
                            .unwrap()
                    };
                    assert_eq!(
                        order.cmp(&[a], &[b]),
                        general.cmp(&exps(a), &exps(b)),
                        "{order:?} {a:05b} {b:05b}"
                    );
                }
            }
        }
    }

    #[test]
    fn set_operations() {
        let a = Bits::<2>::from_slice(&[0b1011, 1]);
        let b = Bits::<2>::from_slice(&[0b0011, 0]);
        assert!(b.divides(&a) && !a.divides(&b));
        assert_eq!(a.minus(&b), Bits([0b1000, 1]));
        assert_eq!(a.degree(), 4);
        assert_eq!(a.vars().collect::<Vec<_>>(), vec![0, 1, 3, 64]);
        assert!(Bits::<2>::var(70).coprime(&a));
        assert!(a.has_var(64) && !a.has_var(2));
    }
}
