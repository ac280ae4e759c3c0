//! Normal forms of sums Σ c_i·m_i·f_i modulo a Gröbner basis by heap division (Johnson 1974;
//! Monagan and Pearce 2007, "Polynomial division using dynamic arrays, heaps, and packed
//! exponent vectors"): every summand and every reducer used is a *stream* of terms held by its
//! next term in one max-heap, so a term is touched once when it comes out of the heap, however
//! many reduction steps follow. The merge-based division copies the whole rest at every step,
//! which is quadratic in the length of long intermediate results; this is linear up to the
//! heap's logarithm.
//!
//! Used where normal forms get long: the multiplication matrices of the certificate (products
//! e·b of a standard monomial) and the membership check of a monic equation.

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use std::cmp::Ordering;

/// One stream: the terms `poly[next..]` multiplied by `factor`·`shift`.
struct Stream<'a, F: Field> {
    terms: &'a [(Monomial, F::Elem)],
    factor: F::Elem,
    shift: Monomial,
    next: usize,
}

/// A max-heap of (monomial, stream) for a run-time monomial order.
struct Heap<'r, F: Field> {
    ring: &'r Ring<F>,
    items: Vec<(Monomial, usize)>,
}

impl<'r, F: Field> Heap<'r, F> {
    fn greater(&self, a: usize, b: usize) -> bool {
        self.ring.cmp(&self.items[a].0, &self.items[b].0) == Ordering::Greater
    }

    fn push(&mut self, m: Monomial, stream: usize) {
        self.items.push((m, stream));
        let mut k = self.items.len() - 1;
        while k > 0 {
            let parent = (k - 1) / 2;
            if !self.greater(k, parent) {
                break;
            }
            self.items.swap(k, parent);
            k = parent;
        }
    }

    fn peek(&self) -> Option<&Monomial> {
        self.items.first().map(|(m, _)| m)
    }

    fn pop(&mut self) -> Option<(Monomial, usize)> {
        if self.items.is_empty() {
            return None;
        }
        let last = self.items.len() - 1;
        self.items.swap(0, last);
        let top = self.items.pop();
        let mut k = 0;
        loop {
            let (l, r) = (2 * k + 1, 2 * k + 2);
            let mut largest = k;
            if l < self.items.len() && self.greater(l, largest) {
                largest = l;
            }
            if r < self.items.len() && self.greater(r, largest) {
                largest = r;
            }
            if largest == k {
                break;
            }
            self.items.swap(k, largest);
            k = largest;
        }
        top
    }
}

/// The normal form of Σ c·m·f over `summands` (c, m, f) modulo `basis` (a Gröbner basis of
/// `ring`'s order, leading coefficients nonzero): no term of the result is divisible by a
/// leading monomial of the basis.
pub fn normal_form_of_sum<F: Field>(
    ring: &Ring<F>,
    summands: &[(F::Elem, Monomial, &Poly<F>)],
    basis: &[Poly<F>],
    control: &Control,
) -> Result<Poly<F>> {
    let field = &ring.field;
    // (index in the basis, leading monomial, inverse of the leading coefficient).
    let leads: Vec<(usize, &Monomial, F::Elem)> = basis
        .iter()
        .enumerate()
        .filter_map(|(k, g)| {
            let (m, c) = g.terms().first()?;
            Some((k, m, field.inv(c)?))
        })
        .collect();
    let mut streams: Vec<Stream<'_, F>> = Vec::new();
    let mut heap = Heap {
        ring,
        items: Vec::new(),
    };
    for (c, m, f) in summands {
        if field.is_zero(c) || f.is_zero() {
            continue;
        }
        let stream = Stream {
            terms: f.terms(),
            factor: c.clone(),
            shift: m.clone(),
            next: 0,
        };
        advance(&mut streams, &mut heap, stream)?;
    }
    let mut remainder = Vec::new();
    while let Some(top) = heap.peek().cloned() {
        control.check()?;
        let mut coefficient = field.zero();
        while heap.peek() == Some(&top) {
            let (_, k) = heap.pop().expect("peeked");
            let s = &mut streams[k];
            let (_, c) = &s.terms[s.next];
            coefficient = field.add(&coefficient, &field.mul(c, &s.factor));
            s.next += 1;
            if let Some((m, _)) = s.terms.get(s.next) {
                let shifted = m.mul(&s.shift)?;
                heap.push(shifted, k);
            }
        }
        if field.is_zero(&coefficient) {
            continue;
        }
        match leads.iter().find(|(_, l, _)| l.divides(&top)) {
            Some((k, lead, inverse)) => {
                // top - (c / lc)·(top / lead)·g: the leading terms cancel, the tail streams on.
                let factor = field.neg(&field.mul(&coefficient, inverse));
                let stream = Stream {
                    terms: &basis[*k].terms()[1..],
                    factor,
                    shift: top.div(lead),
                    next: 0,
                };
                advance(&mut streams, &mut heap, stream)?;
            }
            None => remainder.push((top, coefficient)),
        }
    }
    Ok(Poly::from_sorted(remainder))
}

/// Adds a stream and pushes its first term (nothing when it is empty).
fn advance<'a, F: Field>(
    streams: &mut Vec<Stream<'a, F>>,
    heap: &mut Heap<'_, F>,
    stream: Stream<'a, F>,
) -> Result<()> {
    if let Some((m, _)) = stream.terms.first() {
        let shifted = m.mul(&stream.shift)?;
        heap.push(shifted, streams.len());
        streams.push(stream);
    }
    Ok(())
}

/// The normal form of `f` modulo `basis`.
pub fn normal_form<F: Field>(
    ring: &Ring<F>,
    f: &Poly<F>,
    basis: &[Poly<F>],
    control: &Control,
) -> Result<Poly<F>> {
    let one = Monomial::one(ring.nvars());
    normal_form_of_sum(ring, &[(ring.field.one(), one, f)], basis, control)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::groebner::{groebner_basis, reduce, Engine};
    use crate::order::MonomialOrder;
    use crate::rng::Rng;
    use crate::test_support::{polys, random_poly, ring_32003};

    /// The heap division agrees with the division algorithm of the engines (both give the
    /// unique normal form modulo a Gröbner basis), for sums of shifted multiples too.
    #[test]
    fn agrees_with_the_division_algorithm() {
        let mut rng = Rng::new(7);
        for order in [MonomialOrder::Grevlex, MonomialOrder::Lex] {
            let ring = ring_32003(&["x", "y", "z"], order);
            let gens = polys(&ring, &["x^2*y - z^3 + 1", "y^2 - x*z + 2", "x*y*z - 3"]);
            let gb = groebner_basis(&ring, &gens, Engine::default(), &Control::new()).unwrap();
            for _ in 0..40 {
                let f = random_poly(&ring, &mut rng, 8, 5);
                let g = random_poly(&ring, &mut rng, 5, 4);
                let m = random_poly(&ring, &mut rng, 1, 3)
                    .leading_monomial()
                    .cloned()
                    .unwrap_or_else(|| Monomial::one(3));
                let c = 1 + rng.below(32002);
                let sum = ring.add(&f, &ring.mul_term(&g, &c, &m).unwrap());
                let expected = reduce::normal_form(&ring, &sum, &gb.polys).unwrap();
                let one = Monomial::one(3);
                let summands = [(1u64, one, &f), (c, m, &g)];
                let got = normal_form_of_sum(&ring, &summands, &gb.polys, &Control::new());
                assert_eq!(got.unwrap(), expected);
            }
        }
    }
}
