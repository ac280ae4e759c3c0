//! The monomial table of F4: every monomial met during a computation is stored once and named by
//! a `u32` index, so matrix rows are lists of indices and products are table look-ups.
//!
//! Hashing is linear in the exponent vector (h(a·b) = h(a) + h(b) with fixed pseudo-random
//! weights per variable), so the hash of a product costs one addition. Each entry also carries a
//! 64-bit divisibility mask ([`MaskLayout`]), so divisor searches mostly stop without reading
//! exponents.
//!
//! With at most 16 variables and degrees below 256 (nearly every F4 run), each monomial is also
//! kept packed, one byte per exponent in a u128: a product is then one 128-bit addition (no byte
//! can carry when the degrees sum below 256) and a comparison one 128-bit equality.

use crate::error::{Error, Result};
use crate::monomial::{MaskLayout, Monomial};
use crate::order::MonomialOrder;
use crate::rng::Rng;
use rayon::slice::ParallelSliceMut;
use std::cmp::Ordering;

pub struct MonomialTable {
    nvars: usize,
    order: MonomialOrder,
    monos: Vec<Monomial>,
    /// The exponents of every monomial again, contiguous (`nvars` per monomial): products and
    /// look-ups read them without following a pointer per monomial.
    exps: Vec<u32>,
    hashes: Vec<u64>,
    masks: Vec<u64>,
    /// Packed exponents of every monomial (see the module doc), while every monomial fits.
    packed: Option<Vec<u128>>,
    /// Open addressing: a slot holds the upper half of the hash above index + 1 (0 when empty),
    /// so most mismatches are rejected without reading the monomial. Length is a power of two.
    slots: Vec<u64>,
    weights: Vec<u64>,
    mask_layout: MaskLayout,
    scratch: Vec<u32>,
}

impl MonomialTable {
    pub fn new(nvars: usize, order: MonomialOrder) -> Self {
        // Fixed pseudo-random weights: runs are reproducible.
        let mut rng = Rng::with_state(0x9E37_79B9_7F4A_7C15);
        let weights = (0..nvars).map(|_| rng.next_u64()).collect();
        MonomialTable {
            nvars,
            order,
            monos: Vec::new(),
            exps: Vec::new(),
            hashes: Vec::new(),
            masks: Vec::new(),
            packed: (nvars <= PACKED_VARS).then(Vec::new),
            slots: vec![0; 1 << 12],
            weights,
            mask_layout: MaskLayout::new(nvars),
            scratch: vec![0; nvars],
        }
    }

    pub fn len(&self) -> usize {
        self.monos.len()
    }

    pub fn is_empty(&self) -> bool {
        self.monos.is_empty()
    }

    #[inline]
    pub fn monomial(&self, i: u32) -> &Monomial {
        &self.monos[i as usize]
    }

    #[inline]
    pub fn degree(&self, i: u32) -> u32 {
        self.monos[i as usize].degree()
    }

    /// Order comparison of two stored monomials.
    #[inline]
    pub fn cmp(&self, a: u32, b: u32) -> Ordering {
        if a == b {
            return Ordering::Equal;
        }
        self.order
            .cmp(&self.monos[a as usize], &self.monos[b as usize])
    }

    /// Sorts `monos` in decreasing order, on the current rayon pool when `parallel`.
    pub fn sort_decreasing(&self, monos: &mut [u32], parallel: bool) {
        let Some(key) = self.grevlex_key() else {
            if parallel {
                monos.par_sort_unstable_by(|&a, &b| self.cmp(b, a));
            } else {
                monos.sort_unstable_by(|&a, &b| self.cmp(b, a));
            }
            return;
        };
        let mut keyed: Vec<(u128, u32)> = monos.iter().map(|&m| (key(m), m)).collect();
        if parallel {
            keyed.par_sort_unstable_by(|a, b| b.0.cmp(&a.0));
        } else {
            keyed.sort_unstable_by_key(|k| std::cmp::Reverse(k.0));
        }
        for (slot, (_, m)) in monos.iter_mut().zip(keyed) {
            *slot = m;
        }
    }

    /// Under grevlex with at most 15 variables and degrees below 256 (while packed), a key whose
    /// integer order is the monomial order: the degree in the top byte, then 255 - e_i from the
    /// last variable to the first (at the last variable where two monomials of equal degree
    /// differ, the smaller exponent is the larger monomial). Keys are one comparison instead of
    /// a walk through two exponent vectors.
    fn grevlex_key(&self) -> Option<impl Fn(u32) -> u128 + Sync + '_> {
        if self.order != MonomialOrder::Grevlex || self.nvars > 15 || self.packed.is_none() {
            return None;
        }
        Some(move |m: u32| {
            let exps = self.exps_of(m);
            let degree: u32 = exps.iter().sum();
            exps.iter()
                .rev()
                .fold(u128::from(degree), |key, &e| key << 8 | u128::from(255 - e))
                << (8 * (15 - self.nvars))
        })
    }

    /// Whether monomial `a` divides monomial `b` (mask first, exponents only when needed).
    #[inline]
    pub fn divides(&self, a: u32, b: u32) -> bool {
        self.masks[a as usize] & !self.masks[b as usize] == 0
            && self
                .exps_of(a)
                .iter()
                .zip(self.exps_of(b))
                .all(|(x, y)| x <= y)
    }

    /// Whether a monomial with mask `mask_a` can divide monomial `b` (a fast necessary test).
    #[inline]
    pub fn may_divide(&self, mask_a: u64, b: u32) -> bool {
        mask_a & !self.masks[b as usize] == 0
    }

    #[inline]
    pub fn mask(&self, i: u32) -> u64 {
        self.masks[i as usize]
    }

    /// Index of `m`, inserting it if new.
    pub fn insert(&mut self, m: &Monomial) -> u32 {
        self.insert_exponents(m.exponents())
            .expect("a stored monomial's degree fits")
    }

    /// Index of the monomial with exponents `exps`, inserted if new; `Overflow` when its degree
    /// exceeds u32.
    pub fn insert_exponents(&mut self, exps: &[u32]) -> Result<u32> {
        self.scratch.copy_from_slice(exps);
        let h = self.hash_of(exps);
        self.lookup_scratch(h)
    }

    /// The exponents of stored monomial `i` (the same as `monomial(i).exponents()`, from the
    /// contiguous copy).
    #[inline]
    pub fn exponents(&self, i: u32) -> &[u32] {
        self.exps_of(i)
    }

    /// The exponents of stored monomial `i`.
    #[inline]
    fn exps_of(&self, i: u32) -> &[u32] {
        let start = i as usize * self.nvars;
        &self.exps[start..start + self.nvars]
    }

    /// Index of the product a·b; `Overflow` when an exponent or the degree exceeds u32.
    pub fn mul(&mut self, a: u32, b: u32) -> Result<u32> {
        if let Some(Ok(i)) = self.probe_packed_product(a, b) {
            return Ok(i);
        }
        let n = self.nvars;
        let (sa, sb) = (a as usize * n, b as usize * n);
        let (ea, eb) = (&self.exps[sa..sa + n], &self.exps[sb..sb + n]);
        let mut carry = false;
        for ((s, &x), &y) in self.scratch.iter_mut().zip(ea).zip(eb) {
            let (v, o) = x.overflowing_add(y);
            *s = v;
            carry |= o;
        }
        if carry {
            return Err(overflow());
        }
        let h = self.hashes[a as usize].wrapping_add(self.hashes[b as usize]);
        self.lookup_scratch(h)
    }

    /// Index of the quotient a / b, for b dividing a.
    pub fn div(&mut self, a: u32, b: u32) -> u32 {
        let n = self.nvars;
        let (sa, sb) = (a as usize * n, b as usize * n);
        let (ea, eb) = (&self.exps[sa..sa + n], &self.exps[sb..sb + n]);
        for ((s, &x), &y) in self.scratch.iter_mut().zip(ea).zip(eb) {
            *s = x - y;
        }
        let h = self.hashes[a as usize].wrapping_sub(self.hashes[b as usize]);
        self.lookup_scratch(h).expect("a quotient's degree fits")
    }

    fn hash_of(&self, exps: &[u32]) -> u64 {
        exps.iter()
            .zip(&self.weights)
            .fold(0u64, |h, (&e, &w)| h.wrapping_add(w.wrapping_mul(e as u64)))
    }

    /// First slot to probe for hash `h` in a table of `size` slots (a power of two). The hash is
    /// linear in the exponents, so its low bits follow the lattice of exponent vectors and would
    /// cluster under linear probing; a multiplicative mix takes the well-spread high bits instead.
    #[inline]
    fn home_slot(h: u64, size: usize) -> usize {
        (h.wrapping_mul(0x9E37_79B9_7F4A_7C15) >> (64 - size.trailing_zeros())) as usize
    }

    /// Index of the product a·b if the table holds it already. Reads only, so threads may
    /// share the table; `buf` is the caller's scratch.
    pub fn find_product(&self, a: u32, b: u32, buf: &mut Vec<u32>) -> Option<u32> {
        if let Some(found) = self.probe_packed_product(a, b) {
            return found.ok();
        }
        buf.clear();
        let (ea, eb) = (self.exps_of(a), self.exps_of(b));
        for (&x, &y) in ea.iter().zip(eb) {
            buf.push(x.checked_add(y)?);
        }
        let h = self.hashes[a as usize].wrapping_add(self.hashes[b as usize]);
        self.probe(buf, h).ok()
    }

    /// The products `mult`·t for every t of `terms`, as `find_product` gives them
    /// (`MISSING_PRODUCT` where the table lacks one). In batches, with the memory each probe
    /// will read fetched for the whole batch first (the home slots, then the monomials those
    /// slots name), so that the cache misses of a batch overlap instead of following one another:
    /// on large steps the table is far larger than the caches.
    pub fn find_products(&self, mult: u32, terms: &[u32], buf: &mut Vec<u32>) -> Vec<u32> {
        let Some(packed) = self.packed.as_ref() else {
            return terms
                .iter()
                .map(|&t| self.find_product(mult, t, buf).unwrap_or(MISSING_PRODUCT))
                .collect();
        };
        let (pm, hm) = (packed[mult as usize], self.hashes[mult as usize]);
        let mut out = Vec::with_capacity(terms.len());
        let mut homes = [0usize; PREFETCH_BATCH];
        for batch in terms.chunks(PREFETCH_BATCH) {
            for (home, &t) in homes.iter_mut().zip(batch) {
                let h = hm.wrapping_add(self.hashes[t as usize]);
                *home = Self::home_slot(h, self.slots.len());
                prefetch(&self.slots[*home]);
            }
            for &home in &homes[..batch.len()] {
                let slot = self.slots[home];
                if slot != 0 {
                    prefetch(&packed[(slot as u32 - 1) as usize]);
                }
            }
            for &t in batch {
                let found = match packed_product(pm, packed[t as usize]) {
                    Some(key) => {
                        let h = hm.wrapping_add(self.hashes[t as usize]);
                        self.probe_by(h, |i| packed[i as usize] == key).ok()
                    }
                    None => self.find_product(mult, t, buf),
                };
                out.push(found.unwrap_or(MISSING_PRODUCT));
            }
        }
        out
    }

    /// Index of the quotient a / b (b dividing a) if the table holds it already; reads only.
    pub fn find_quotient(&self, a: u32, b: u32, buf: &mut Vec<u32>) -> Option<u32> {
        buf.clear();
        let (ea, eb) = (self.exps_of(a), self.exps_of(b));
        buf.extend(ea.iter().zip(eb).map(|(&x, &y)| x - y));
        let h = self.hashes[a as usize].wrapping_sub(self.hashes[b as usize]);
        self.probe(buf, h).ok()
    }

    /// The index of the monomial with exponents `exps` and hash `h`, or the empty slot where it
    /// would go.
    #[inline]
    fn probe(&self, exps: &[u32], h: u64) -> std::result::Result<u32, usize> {
        self.probe_by(h, |i| self.exps_of(i) == exps)
    }

    /// The index of the monomial with hash `h` that `is_it` accepts, or the empty slot where it
    /// would go (linear probing; the hash tag screens out most other monomials unread).
    #[inline(always)]
    fn probe_by(&self, h: u64, is_it: impl Fn(u32) -> bool) -> std::result::Result<u32, usize> {
        let mask = self.slots.len() - 1;
        let mut pos = Self::home_slot(h, self.slots.len());
        let tag = h & TAG_MASK;
        loop {
            let slot = self.slots[pos];
            if slot == 0 {
                return Err(pos);
            }
            if slot & TAG_MASK == tag && is_it((slot as u32) - 1) {
                return Ok((slot as u32) - 1);
            }
            pos = (pos + 1) & mask;
        }
    }

    /// The product a·b probed by its packed form: `None` when packing does not apply to it,
    /// else what `probe` would say.
    #[inline]
    fn probe_packed_product(&self, a: u32, b: u32) -> Option<std::result::Result<u32, usize>> {
        let packed = self.packed.as_ref()?;
        let key = packed_product(packed[a as usize], packed[b as usize])?;
        let h = self.hashes[a as usize].wrapping_add(self.hashes[b as usize]);
        Some(self.probe_by(h, |i| packed[i as usize] == key))
    }

    /// Finds or inserts the monomial in `scratch` whose hash is `h`.
    fn lookup_scratch(&mut self, h: u64) -> Result<u32> {
        let pos = match self.probe(&self.scratch, h) {
            Ok(i) => return Ok(i),
            Err(pos) => pos,
        };
        let m = Monomial::from_exponents(self.scratch.clone())?;
        // u32::MAX itself is kept free as a marker for callers.
        let index = u32::try_from(self.monos.len())
            .ok()
            .filter(|&i| i < u32::MAX)
            .ok_or_else(|| Error::ResourceLimit("more than 2^32 - 1 distinct monomials".into()))?;
        self.masks.push(self.mask_layout.mask(m.exponents()));
        if m.degree() > PACKED_MAX_DEGREE {
            self.packed = None;
        }
        if let Some(packed) = &mut self.packed {
            packed.push(pack(&self.scratch));
        }
        self.exps.extend_from_slice(&self.scratch);
        self.monos.push(m);
        self.hashes.push(h);
        self.slots[pos] = (h & TAG_MASK) | (index as u64 + 1);
        if 2 * self.monos.len() > self.slots.len() {
            self.grow();
        }
        Ok(index)
    }

    fn grow(&mut self) {
        let size = self.slots.len() * 2;
        let mut slots = vec![0u64; size];
        for (i, &h) in self.hashes.iter().enumerate() {
            let mut pos = Self::home_slot(h, size);
            while slots[pos] != 0 {
                pos = (pos + 1) & (size - 1);
            }
            slots[pos] = (h & TAG_MASK) | (i as u64 + 1);
        }
        self.slots = slots;
    }
}

/// Marks, in `find_products`, a product the table does not hold.
pub const MISSING_PRODUCT: u32 = u32::MAX;

/// Products whose slots are fetched together in `find_products`.
const PREFETCH_BATCH: usize = 16;

/// Asks the CPU to bring `x`'s cache line in (a hint only: no effect on the result).
#[inline(always)]
fn prefetch<T>(x: &T) {
    #[cfg(target_arch = "x86_64")]
    // SAFETY: prefetching is a hint that never faults, and SSE is part of baseline x86-64.
    unsafe {
        std::arch::x86_64::_mm_prefetch::<{ std::arch::x86_64::_MM_HINT_T0 }>(
            (x as *const T).cast::<i8>(),
        );
    }
    #[cfg(not(target_arch = "x86_64"))]
    let _ = x;
}

/// Most variables whose exponents are also kept packed, and the highest degree they may have.
const PACKED_VARS: usize = 16;
const PACKED_MAX_DEGREE: u32 = 255;
/// The top bit of every byte of a packed monomial.
const BYTE_TOPS: u128 = u128::from_le_bytes([0x80; 16]);

/// One byte per exponent (each at most PACKED_MAX_DEGREE), variable i in byte i.
fn pack(exps: &[u32]) -> u128 {
    exps.iter()
        .enumerate()
        .fold(0u128, |acc, (i, &e)| acc | (e as u128) << (8 * i))
}

/// The packed form of the product of two packed monomials, `None` when an exponent carries out
/// of its byte (above 255) and so leaves the packed form. Testing the carry out of each byte
/// reads no more than the two packed words (a degree test would read both monomials).
#[inline(always)]
fn packed_product(pa: u128, pb: u128) -> Option<u128> {
    let key = pa.wrapping_add(pb);
    (((pa & pb) | ((pa ^ pb) & !key)) & BYTE_TOPS == 0).then_some(key)
}

/// The bits of a slot that hold the hash tag (the index + 1 takes the lower 32).
const TAG_MASK: u64 = !0u64 << 32;

fn overflow() -> Error {
    Error::Overflow("exponent overflow: a degree exceeds 2^32 - 1".into())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keyed_sort_agrees_with_the_order() {
        // Grevlex keys (up to 15 variables) and the comparator fallback (other orders, 16
        // variables) must give the order's decreasing sequence.
        let mut rng = crate::rng::Rng::new(11);
        for (nvars, order) in [
            (3, MonomialOrder::Grevlex),
            (8, MonomialOrder::Grevlex),
            (15, MonomialOrder::Grevlex),
            (16, MonomialOrder::Grevlex),
            (8, MonomialOrder::Lex),
        ] {
            let mut t = MonomialTable::new(nvars, order.clone());
            let mut monos: Vec<u32> = (0..500)
                .map(|_| {
                    let exps = (0..nvars).map(|_| rng.below(4) as u32).collect();
                    t.insert(&Monomial::from_exponents(exps).unwrap())
                })
                .collect();
            monos.sort_unstable();
            monos.dedup();
            let mut expected = monos.clone();
            expected.sort_by(|&a, &b| order.cmp(t.monomial(b), t.monomial(a)));
            for parallel in [false, true] {
                let mut got = monos.clone();
                t.sort_decreasing(&mut got, parallel);
                assert_eq!(got, expected, "{nvars} variables, {order:?}");
            }
        }
    }

    #[test]
    fn a_packed_exponent_that_carries_is_not_taken_for_another_monomial() {
        // x^200 · x^100 = x^300 does not fit a byte: its packed sum wraps to x^44·y, which is in
        // the table. The look-up must not return it, and the product must come out exact.
        let mut t = MonomialTable::new(2, MonomialOrder::Grevlex);
        let wrapped = t.insert(&Monomial::from_exponents(vec![44, 1]).unwrap());
        let a = t.insert(&Monomial::from_exponents(vec![200, 0]).unwrap());
        let b = t.insert(&Monomial::from_exponents(vec![100, 0]).unwrap());
        let c = t.insert(&Monomial::from_exponents(vec![55, 0]).unwrap());
        let mut buf = Vec::new();
        assert_eq!(t.find_product(a, b, &mut buf), None);
        let top = t.insert(&Monomial::from_exponents(vec![255, 0]).unwrap());
        assert_eq!(t.find_product(a, c, &mut buf), Some(top));
        let ab = t.mul(a, b).unwrap();
        assert_ne!(ab, wrapped);
        assert_eq!(t.monomial(ab).exponents(), &[300, 0]);
    }

    #[test]
    fn batched_products_agree_with_single_look_ups() {
        // Products present and absent, more terms than one prefetch batch, and (three
        // variables, below the packed bound; nineteen, above it) both look-up paths; x^200
        // times x^100 carries out of its byte and must be reported missing, not confused.
        for nvars in [3, 19] {
            let mut t = MonomialTable::new(nvars, MonomialOrder::Grevlex);
            let mut rng = crate::rng::Rng::new(5);
            let mut random = |t: &mut MonomialTable| {
                let exps = (0..nvars).map(|_| rng.below(3) as u32).collect();
                t.insert(&Monomial::from_exponents(exps).unwrap())
            };
            let terms: Vec<u32> = (0..200).map(|_| random(&mut t)).collect();
            let mult = random(&mut t);
            for &term in terms.iter().step_by(3) {
                t.mul(mult, term).unwrap();
            }
            let big = t.insert(&Monomial::var_power(nvars, 0, 200));
            let bigger = t.insert(&Monomial::var_power(nvars, 0, 100));
            t.mul(big, mult).unwrap();
            let mut buf = Vec::new();
            for (m, terms) in [(mult, terms.clone()), (big, vec![bigger, big, mult])] {
                let single: Vec<u32> = terms
                    .iter()
                    .map(|&x| t.find_product(m, x, &mut buf).unwrap_or(MISSING_PRODUCT))
                    .collect();
                assert_eq!(t.find_products(m, &terms, &mut buf), single);
                assert!(
                    single.contains(&MISSING_PRODUCT)
                        && single.iter().any(|&p| p != MISSING_PRODUCT)
                );
            }
        }
    }

    #[test]
    fn products_quotients_and_masks_agree_with_monomials() {
        let mut t = MonomialTable::new(3, MonomialOrder::Grevlex);
        let a = t.insert(&Monomial::from_exponents(vec![2, 0, 1]).unwrap());
        let b = t.insert(&Monomial::from_exponents(vec![0, 3, 1]).unwrap());
        let ab = t.mul(a, b).unwrap();
        assert_eq!(t.monomial(ab).exponents(), &[2, 3, 2]);
        assert_eq!(
            t.insert(&Monomial::from_exponents(vec![2, 3, 2]).unwrap()),
            ab
        );
        assert_eq!(t.div(ab, a), b);
        assert!(t.divides(a, ab) && t.divides(b, ab) && !t.divides(a, b) && !t.divides(ab, a));
        // Many inserts force the table to grow; indices stay stable.
        let ids: Vec<u32> = (0..5000u32)
            .map(|k| {
                t.insert(&Monomial::from_exponents(vec![k % 17, k / 17 % 19, k / 323]).unwrap())
            })
            .collect();
        for (k, &i) in ids.iter().enumerate() {
            let k = k as u32;
            assert_eq!(t.monomial(i).exponents(), &[k % 17, k / 17 % 19, k / 323]);
        }
        let big = t.insert(&Monomial::var_power(3, 0, u32::MAX));
        assert!(matches!(t.mul(big, a), Err(Error::Overflow(_))));
    }
}
