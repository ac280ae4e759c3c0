//! Coefficient arithmetic of the F4 matrices: rows are stored in the smallest type that holds the
//! field's elements, and a row being reduced lives in a dense accumulator where multiply-adds are
//! summed with *delayed modular reduction* (Faugère–Lachartre 2010; Dumas, Giorgi and Pernet 2008
//! for the accumulation bounds): an entry is reduced modulo p only when it is read, or when the
//! accumulator could otherwise overflow.
//!
//! Three word kernels for GF(p), chosen by the size of p, and one generic kernel for any field:
//! - p < 2^21, stored as u16/u32, u64 accumulator, no reduction at all during a row's reduction
//!   unless more than (2^64 - p) / (p - 1)^2 multiply-adds land on one entry (2^22 at least);
//! - p < 2^31, stored as u32, u64 accumulator kept below p^2 by one branch-free conditional
//!   subtraction of p^2 per multiply-add;
//! - p < 2^63, stored as u64, u128 accumulator kept below p^2 the same way;
//! - larger p, on 2, 4 or 8 limbs: Montgomery residues, products summed as plain integers on
//!   2N + 1 limbs and reduced once per entry read (see `Montgomery::reduce_wide`);
//! - any other field: the field's own elements and operations.

use crate::field::field_size;
use crate::field::montgomery::{from_limbs, Montgomery};
use crate::field::{inverse_mod_word, Field, PrimeField};
use crate::vector_unit::VectorUnit;
use std::marker::PhantomData;

/// The arithmetic one matrix computation runs on. `axpy` expects strictly increasing columns.
pub trait Arith<F: Field>: Send + Sync {
    /// A stored coefficient.
    type C: Clone + Send + Sync + 'static;
    /// An accumulator entry.
    type A: Clone + Send + Sync;
    fn import(&self, field: &F, e: &F::Elem) -> Self::C;
    fn export(&self, field: &F, c: &Self::C) -> F::Elem;
    fn acc_zero(&self) -> Self::A;
    /// Whether the entry is exactly zero (it may still be ≡ 0 when not: see `settle`).
    fn acc_is_zero(&self, a: &Self::A) -> bool;
    fn load(&self, c: &Self::C) -> Self::A;
    /// The canonical coefficient an accumulator entry stands for.
    fn settle(&self, a: &Self::A) -> Self::C;
    fn is_zero(&self, c: &Self::C) -> bool;
    fn zero(&self) -> Self::C;
    fn one(&self) -> Self::C;
    fn mul(&self, a: &Self::C, b: &Self::C) -> Self::C;
    /// Inverse of a nonzero coefficient.
    fn inv(&self, a: &Self::C) -> Self::C;
    fn neg(&self, a: &Self::C) -> Self::C;
    /// acc[cols[k]] += m · coeffs[k] for every k.
    fn axpy(&self, acc: &mut [Self::A], cols: &[u32], coeffs: &[Self::C], m: &Self::C);
    /// acc[cols[k]·LANES + j] += m[j] · coeffs[k] for every k and lane j: the interleaved
    /// accumulator of LANES rows reduced together, so one pivot entry updates one cache line.
    fn axpy_lanes(
        &self,
        acc: &mut [Self::A],
        cols: &[u32],
        coeffs: &[Self::C],
        m: &[Self::C; LANES],
    );
    /// How many `axpy` calls an entry survives before `normalize` must run.
    fn headroom(&self) -> u64 {
        u64::MAX
    }
    /// Brings accumulator entries back into their canonical range.
    fn normalize(&self, _acc: &mut [Self::A]) {}
    /// Size of the set `element` draws from (all elements, or the first 2^63 of a larger
    /// field); `None` for an infinite field.
    fn sample_space(&self) -> Option<u64>;
    /// The element of index `i` < `sample_space()`.
    fn element(&self, i: u64) -> Self::C;
}

/// Rows reduced together in one interleaved accumulator (see `Arith::axpy_lanes`).
pub use crate::vector_unit::LANES;

/// Checks what the unchecked kernels rely on: increasing columns, the last inside `acc`.
#[inline]
fn check_row<T, C>(acc: &[T], lanes: usize, cols: &[u32], coeffs: &[C]) {
    debug_assert!(cols.windows(2).all(|w| w[0] < w[1]));
    assert!(
        cols.last()
            .is_none_or(|&c| (c as usize + 1) * lanes <= acc.len())
            && coeffs.len() >= cols.len()
    );
}

/// Storage types for residues.
pub trait Word: Copy + Send + Sync + 'static {
    fn from_u64(v: u64) -> Self;
    fn get(self) -> u64;
}

impl Word for u16 {
    #[inline]
    fn from_u64(v: u64) -> Self {
        v as u16
    }
    #[inline]
    fn get(self) -> u64 {
        self as u64
    }
}

impl Word for u32 {
    #[inline]
    fn from_u64(v: u64) -> Self {
        v as u32
    }
    #[inline]
    fn get(self) -> u64 {
        self as u64
    }
}

/// Inverse modulo p of a pivot (a ≠ 0 mod p).
fn inv_mod(a: u64, p: u64) -> u64 {
    inverse_mod_word(a, p).expect("a pivot is nonzero")
}

/// The LANES entries of column `c` in an interleaved accumulator.
///
/// # Safety
/// (c + 1) · LANES ≤ the accumulator's length, and no other reference to those entries lives.
#[inline(always)]
unsafe fn lane_slot<'a>(base: *mut u64, c: u32) -> &'a mut [u64; LANES] {
    &mut *(base.add(c as usize * LANES) as *mut [u64; LANES])
}

/// `axpy_lanes` without any reduction (p < 2^21: see `SmallPrime::headroom`).
#[inline(always)]
fn lanes_lazy<W: Word>(acc: &mut [u64], cols: &[u32], coeffs: &[W], m: &[u32; LANES]) {
    let base = acc.as_mut_ptr();
    for (&c, x) in cols.iter().zip(coeffs) {
        // SAFETY: checked by the caller (`check_row`); one slot at a time.
        let (slot, x) = (unsafe { lane_slot(base, c) }, x.get() as u32 as u64);
        for j in 0..LANES {
            slot[j] += m[j] as u64 * x;
        }
    }
}

/// `lanes_lazy` compiled for AVX2.
///
/// # Safety
/// The CPU supports AVX2; the row was checked by `check_row`.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn lanes_lazy_avx2<W: Word>(acc: &mut [u64], cols: &[u32], coeffs: &[W], m: &[u32; LANES]) {
    lanes_lazy(acc, cols, coeffs, m)
}

/// `lanes_lazy` compiled for AVX-512.
///
/// # Safety
/// The CPU supports AVX-512F; the row was checked by `check_row`.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
unsafe fn lanes_lazy_avx512<W: Word>(
    acc: &mut [u64],
    cols: &[u32],
    coeffs: &[W],
    m: &[u32; LANES],
) {
    lanes_lazy(acc, cols, coeffs, m)
}

/// `axpy_lanes` keeping every entry below p^2 by a conditional subtraction.
fn lanes_reduced<W: Word>(acc: &mut [u64], cols: &[u32], coeffs: &[W], m: &[u32; LANES], p2: u64) {
    let base = acc.as_mut_ptr();
    for (&c, x) in cols.iter().zip(coeffs) {
        // SAFETY: checked by the caller (`check_row`); one slot at a time.
        let (slot, x) = (unsafe { lane_slot(base, c) }, x.get() as u32 as u64);
        for j in 0..LANES {
            let v = slot[j] + m[j] as u64 * x;
            slot[j] = v.min(v.wrapping_sub(p2));
        }
    }
}

/// GF(p) for p < 2^31 with coefficients stored as `W` and a u64 accumulator.
pub struct SmallPrime<W> {
    p: u64,
    p2: u64,
    /// No reduction during accumulation (p < 2^21); otherwise conditional subtraction of p^2.
    lazy: bool,
    headroom: u64,
    vector: VectorUnit,
    _w: PhantomData<W>,
}

impl<W: Word> SmallPrime<W> {
    pub fn new(p: u64) -> Self {
        debug_assert!(p < 1 << 31);
        let lazy = p < 1 << 21;
        let sq = (p - 1).max(1) * (p - 1).max(1);
        let headroom = if lazy { (u64::MAX - p) / sq } else { u64::MAX };
        SmallPrime {
            p,
            p2: p * p,
            lazy,
            headroom,
            vector: VectorUnit::detect(),
            _w: PhantomData,
        }
    }
}

impl<F: Field, W: Word> Arith<F> for SmallPrime<W> {
    type C = W;
    type A = u64;
    fn import(&self, field: &F, e: &F::Elem) -> W {
        W::from_u64(field.to_word(e))
    }
    fn export(&self, field: &F, c: &W) -> F::Elem {
        field.from_word(c.get())
    }
    #[inline]
    fn acc_zero(&self) -> u64 {
        0
    }
    #[inline]
    fn acc_is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    #[inline]
    fn load(&self, c: &W) -> u64 {
        c.get()
    }
    #[inline]
    fn settle(&self, a: &u64) -> W {
        W::from_u64(*a % self.p)
    }
    #[inline]
    fn is_zero(&self, c: &W) -> bool {
        c.get() == 0
    }
    fn zero(&self) -> W {
        W::from_u64(0)
    }
    fn one(&self) -> W {
        W::from_u64(1)
    }
    #[inline]
    fn mul(&self, a: &W, b: &W) -> W {
        W::from_u64(a.get() * b.get() % self.p)
    }
    fn inv(&self, a: &W) -> W {
        W::from_u64(inv_mod(a.get(), self.p))
    }
    #[inline]
    fn neg(&self, a: &W) -> W {
        W::from_u64(if a.get() == 0 { 0 } else { self.p - a.get() })
    }
    #[inline]
    fn axpy(&self, acc: &mut [u64], cols: &[u32], coeffs: &[W], m: &W) {
        let m = m.get();
        // Row columns are strictly increasing, so checking the last one bounds them all and the
        // hot loops can skip per-element bounds checks.
        debug_assert!(cols.windows(2).all(|w| w[0] < w[1]));
        assert!(
            cols.last().is_none_or(|&c| (c as usize) < acc.len()) && coeffs.len() >= cols.len()
        );
        if self.lazy {
            // Four independent updates per round let the core overlap their loads and stores.
            let mut col_chunks = cols.chunks_exact(4);
            let mut coeff_chunks = coeffs[..cols.len()].chunks_exact(4);
            for (c4, x4) in (&mut col_chunks).zip(&mut coeff_chunks) {
                // SAFETY: columns increase and the last is below acc.len() (checked above).
                unsafe {
                    let (a, b, c, d) = (
                        m * x4[0].get(),
                        m * x4[1].get(),
                        m * x4[2].get(),
                        m * x4[3].get(),
                    );
                    *acc.get_unchecked_mut(c4[0] as usize) += a;
                    *acc.get_unchecked_mut(c4[1] as usize) += b;
                    *acc.get_unchecked_mut(c4[2] as usize) += c;
                    *acc.get_unchecked_mut(c4[3] as usize) += d;
                }
            }
            for (&c, &x) in col_chunks.remainder().iter().zip(coeff_chunks.remainder()) {
                // SAFETY: as above.
                unsafe { *acc.get_unchecked_mut(c as usize) += m * x.get() };
            }
        } else {
            let p2 = self.p2;
            for (&c, &x) in cols.iter().zip(coeffs) {
                // SAFETY: columns increase and the last is below acc.len() (checked above).
                let slot = unsafe { acc.get_unchecked_mut(c as usize) };
                let v = *slot + m * x.get();
                *slot = v.min(v.wrapping_sub(p2));
            }
        }
    }
    #[inline]
    fn axpy_lanes(&self, acc: &mut [u64], cols: &[u32], coeffs: &[W], m: &[W; LANES]) {
        check_row(acc, LANES, cols, coeffs);
        // Residues below 2^31: the products are 32 × 32-bit, which vectorizes.
        let m: [u32; LANES] = m.map(|x| x.get() as u32);
        if !self.lazy {
            lanes_reduced(acc, cols, coeffs, &m, self.p2);
            return;
        }
        #[cfg(target_arch = "x86_64")]
        match self.vector {
            // SAFETY: the CPU has the feature (detected at construction).
            VectorUnit::Avx512 => return unsafe { lanes_lazy_avx512(acc, cols, coeffs, &m) },
            VectorUnit::Avx2 => return unsafe { lanes_lazy_avx2(acc, cols, coeffs, &m) },
            VectorUnit::Baseline => {}
        }
        lanes_lazy(acc, cols, coeffs, &m);
    }
    fn headroom(&self) -> u64 {
        self.headroom
    }
    fn normalize(&self, acc: &mut [u64]) {
        for a in acc {
            *a %= self.p;
        }
    }
    fn sample_space(&self) -> Option<u64> {
        Some(self.p)
    }
    fn element(&self, i: u64) -> W {
        W::from_u64(i)
    }
}

/// GF(p) for 2^31 ≤ p < 2^63: u64 coefficients, u128 accumulator below p^2, reduced by the
/// field's own Barrett reduction (no 128-bit division).
pub struct LargePrime {
    p: u64,
    p2: u128,
    word: PrimeField,
}

impl LargePrime {
    pub fn new(p: u64) -> Self {
        LargePrime {
            p,
            p2: p as u128 * p as u128,
            word: PrimeField::known_prime(p),
        }
    }
}

impl<F: Field> Arith<F> for LargePrime {
    type C = u64;
    type A = u128;
    fn import(&self, field: &F, e: &F::Elem) -> u64 {
        field.to_word(e)
    }
    fn export(&self, field: &F, c: &u64) -> F::Elem {
        field.from_word(*c)
    }
    #[inline]
    fn acc_zero(&self) -> u128 {
        0
    }
    #[inline]
    fn acc_is_zero(&self, a: &u128) -> bool {
        *a == 0
    }
    #[inline]
    fn load(&self, c: &u64) -> u128 {
        *c as u128
    }
    #[inline]
    fn settle(&self, a: &u128) -> u64 {
        self.word.reduce_u128(*a) // a < p^2 < p·2^64
    }
    #[inline]
    fn is_zero(&self, c: &u64) -> bool {
        *c == 0
    }
    fn zero(&self) -> u64 {
        0
    }
    fn one(&self) -> u64 {
        1
    }
    #[inline]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        self.word.mul_u64(*a, *b)
    }
    fn inv(&self, a: &u64) -> u64 {
        inv_mod(*a, self.p)
    }
    #[inline]
    fn neg(&self, a: &u64) -> u64 {
        self.word.neg(a)
    }
    #[inline]
    fn axpy(&self, acc: &mut [u128], cols: &[u32], coeffs: &[u64], m: &u64) {
        let (m, p2) = (*m as u128, self.p2);
        for (&c, &x) in cols.iter().zip(coeffs) {
            let v = acc[c as usize] + m * x as u128;
            acc[c as usize] = v.min(v.wrapping_sub(p2));
        }
    }
    fn axpy_lanes(&self, acc: &mut [u128], cols: &[u32], coeffs: &[u64], m: &[u64; LANES]) {
        check_row(acc, LANES, cols, coeffs);
        let p2 = self.p2;
        for (&c, &x) in cols.iter().zip(coeffs) {
            let slot = &mut acc[c as usize * LANES..][..LANES];
            for (a, &mj) in slot.iter_mut().zip(m) {
                let v = *a + mj as u128 * x as u128;
                *a = v.min(v.wrapping_sub(p2));
            }
        }
    }
    fn sample_space(&self) -> Option<u64> {
        Some(self.p)
    }
    fn element(&self, i: u64) -> u64 {
        i
    }
}

/// GF(p) for a prime beyond a machine word on N limbs: coefficients are Montgomery residues,
/// an accumulator entry a sum of their products on W = 2N + 1 limbs, reduced when read.
pub struct BigPrime<const N: usize, const W: usize> {
    mont: Montgomery<N>,
    /// p − 2, for inverses by Fermat's little theorem.
    p_minus_2: Vec<u64>,
}

impl<const N: usize, const W: usize> BigPrime<N, W> {
    /// The kernel for the prime whose limbs are `modulus`; `None` unless it has N limbs and
    /// W = 2N + 1.
    pub fn new(modulus: &[u64]) -> Option<Self> {
        if modulus.len() != N || W != 2 * N + 1 {
            return None;
        }
        let p = from_limbs(modulus);
        let mont = Montgomery::<N>::new(&p)?;
        let p_minus_2 = (p - 2u32).to_u64_digits();
        Some(BigPrime { mont, p_minus_2 })
    }
}

impl<F: Field, const N: usize, const W: usize> Arith<F> for BigPrime<N, W> {
    type C = [u64; N];
    type A = [u64; W];
    fn import(&self, field: &F, e: &F::Elem) -> [u64; N] {
        let mut limbs = [0u64; N];
        field.to_montgomery_limbs(e, &mut limbs);
        limbs
    }
    fn export(&self, field: &F, c: &[u64; N]) -> F::Elem {
        field.from_montgomery_limbs(c)
    }
    #[inline]
    fn acc_zero(&self) -> [u64; W] {
        [0; W]
    }
    #[inline]
    fn acc_is_zero(&self, a: &[u64; W]) -> bool {
        a.iter().all(|&w| w == 0)
    }
    #[inline]
    fn load(&self, c: &[u64; N]) -> [u64; W] {
        self.mont.widen(c)
    }
    #[inline]
    fn settle(&self, a: &[u64; W]) -> [u64; N] {
        self.mont.reduce_wide(a)
    }
    #[inline]
    fn is_zero(&self, c: &[u64; N]) -> bool {
        c.iter().all(|&w| w == 0)
    }
    fn zero(&self) -> [u64; N] {
        [0; N]
    }
    fn one(&self) -> [u64; N] {
        self.mont.one()
    }
    #[inline]
    fn mul(&self, a: &[u64; N], b: &[u64; N]) -> [u64; N] {
        self.mont.mul(a, b)
    }
    fn inv(&self, a: &[u64; N]) -> [u64; N] {
        self.mont.pow(a, &self.p_minus_2)
    }
    #[inline]
    fn neg(&self, a: &[u64; N]) -> [u64; N] {
        self.mont.neg(a)
    }
    #[inline]
    fn axpy(&self, acc: &mut [[u64; W]], cols: &[u32], coeffs: &[[u64; N]], m: &[u64; N]) {
        check_row(acc, 1, cols, coeffs);
        for (&c, x) in cols.iter().zip(coeffs) {
            // SAFETY: columns increase and the last is inside `acc` (checked above).
            let slot = unsafe { acc.get_unchecked_mut(c as usize) };
            Montgomery::<N>::mul_add_wide(slot, m, x);
        }
    }
    fn axpy_lanes(
        &self,
        acc: &mut [[u64; W]],
        cols: &[u32],
        coeffs: &[[u64; N]],
        m: &[[u64; N]; LANES],
    ) {
        check_row(acc, LANES, cols, coeffs);
        let mut used = [0usize; LANES];
        let mut count = 0;
        for (j, mj) in m.iter().enumerate() {
            if *mj != [0; N] {
                used[count] = j;
                count += 1;
            }
        }
        let base = acc.as_mut_ptr();
        for (&c, x) in cols.iter().zip(coeffs) {
            // SAFETY: (c + 1)·LANES ≤ acc.len() (checked above); one slot at a time.
            let slot = unsafe { &mut *(base.add(c as usize * LANES) as *mut [[u64; W]; LANES]) };
            for &j in &used[..count] {
                Montgomery::<N>::mul_add_wide(&mut slot[j], &m[j], x);
            }
        }
    }
    /// A sum stays below 2^(64W) for 2^64 − 2 products on top of a loaded residue.
    fn headroom(&self) -> u64 {
        u64::MAX - 2
    }
    fn normalize(&self, acc: &mut [[u64; W]]) {
        for a in acc {
            *a = self.mont.widen(&self.mont.reduce_wide(a));
        }
    }
    fn sample_space(&self) -> Option<u64> {
        Some(1 << 63)
    }
    fn element(&self, i: u64) -> [u64; N] {
        let mut x = [0u64; N];
        x[0] = i;
        self.mont.enter(&x)
    }
}

/// Any field, through its own operations (no delayed reduction).
pub struct FieldOps<F: Field> {
    field: F,
}

impl<F: Field> FieldOps<F> {
    pub fn new(field: F) -> Self {
        FieldOps { field }
    }
}

impl<F: Field> Arith<F> for FieldOps<F> {
    type C = F::Elem;
    type A = F::Elem;
    fn import(&self, _field: &F, e: &F::Elem) -> F::Elem {
        e.clone()
    }
    fn export(&self, _field: &F, c: &F::Elem) -> F::Elem {
        c.clone()
    }
    fn acc_zero(&self) -> F::Elem {
        self.field.zero()
    }
    fn acc_is_zero(&self, a: &F::Elem) -> bool {
        self.field.is_zero(a)
    }
    fn load(&self, c: &F::Elem) -> F::Elem {
        c.clone()
    }
    fn settle(&self, a: &F::Elem) -> F::Elem {
        a.clone()
    }
    fn is_zero(&self, c: &F::Elem) -> bool {
        self.field.is_zero(c)
    }
    fn zero(&self) -> F::Elem {
        self.field.zero()
    }
    fn one(&self) -> F::Elem {
        self.field.one()
    }
    fn mul(&self, a: &F::Elem, b: &F::Elem) -> F::Elem {
        self.field.mul(a, b)
    }
    fn inv(&self, a: &F::Elem) -> F::Elem {
        self.field.inv(a).expect("pivots are nonzero")
    }
    fn neg(&self, a: &F::Elem) -> F::Elem {
        self.field.neg(a)
    }
    fn axpy(&self, acc: &mut [F::Elem], cols: &[u32], coeffs: &[F::Elem], m: &F::Elem) {
        for (&c, x) in cols.iter().zip(coeffs) {
            let slot = &mut acc[c as usize];
            *slot = self.field.add(slot, &self.field.mul(m, x));
        }
    }
    fn axpy_lanes(
        &self,
        acc: &mut [F::Elem],
        cols: &[u32],
        coeffs: &[F::Elem],
        m: &[F::Elem; LANES],
    ) {
        check_row(acc, LANES, cols, coeffs);
        for (j, mj) in m.iter().enumerate() {
            if self.field.is_zero(mj) {
                continue;
            }
            for (&c, x) in cols.iter().zip(coeffs) {
                let slot = &mut acc[c as usize * LANES + j];
                *slot = self.field.add(slot, &self.field.mul(mj, x));
            }
        }
    }
    fn sample_space(&self) -> Option<u64> {
        field_size(&self.field).map(|q| q.min(1 << 63))
    }
    fn element(&self, i: u64) -> F::Elem {
        self.field.element_from_index(i)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::{BigPrimeField, PrimeField};
    use num_bigint::BigUint;

    /// Each kernel, fed many multiply-adds onto one entry, agrees with exact integer arithmetic.
    fn check<A: Arith<PrimeField>>(a: &A, p: u64) {
        let f = PrimeField::new(p).unwrap();
        let mut acc = vec![a.acc_zero(); 3];
        let (mut exact0, mut exact2) = (0u128, 0u128);
        let mut budget = a.headroom();
        for k in 0..1000u64 {
            let (x, y, m) = (
                (p - 1 - k % p) % p,
                (k * 7919) % p,
                (p - 1 - (k * 31) % p) % p,
            );
            let (xs, ys, ms) = (a.import(&f, &x), a.import(&f, &y), a.import(&f, &m));
            a.axpy(&mut acc, &[0, 2], &[xs, ys], &ms);
            exact0 = (exact0 + m as u128 * x as u128) % p as u128;
            exact2 = (exact2 + m as u128 * y as u128) % p as u128;
            budget -= 1;
            if budget == 0 {
                a.normalize(&mut acc);
                budget = a.headroom();
            }
        }
        assert_eq!(a.export(&f, &a.settle(&acc[0])) as u128, exact0);
        assert_eq!(a.export(&f, &a.settle(&acc[2])) as u128, exact2);
        assert!(a.acc_is_zero(&acc[1]));
        let x = a.import(&f, &(p - 1));
        assert_eq!(a.export(&f, &a.mul(&x, &a.inv(&x))), 1);
    }

    /// The kernel as arithmetic of `BigPrimeField<N>` (so that calls name the field).
    fn over_field<const N: usize, const W: usize>(
        kernel: &BigPrime<N, W>,
    ) -> &impl Arith<BigPrimeField<N>, C = [u64; N], A = [u64; W]> {
        kernel
    }

    /// The big-prime kernel against the field's own arithmetic: sums of many products, with
    /// and without a normalization on the way, and the eight-lane form.
    fn check_big<const N: usize, const W: usize>(field: &BigPrimeField<N>) {
        let kernel = BigPrime::<N, W>::new(&field.montgomery_modulus().unwrap()).unwrap();
        let a = over_field(&kernel);
        let mut rng = crate::rng::Rng::new(N as u64);
        let mut random = || {
            let i = rng.next_u64();
            field.pow(&field.element_from_index(i | 1), 1 + i % 7)
        };
        for normalize_at in [None, Some(100)] {
            let start = random();
            let mut acc = vec![a.load(&a.import(field, &start))];
            let mut lanes = vec![a.acc_zero(); LANES];
            let mut expected = start;
            let mut expected_lanes = vec![field.zero(); LANES];
            for k in 0..300 {
                let (x, m) = (random(), random());
                let (xs, ms) = (a.import(field, &x), a.import(field, &m));
                a.axpy(&mut acc, &[0], &[xs], &ms);
                expected = field.add(&expected, &field.mul(&x, &m));
                // Lane 3 gets a zero multiplier, the others m + j.
                let ml: [[u64; N]; LANES] = std::array::from_fn(|j| match j {
                    3 => a.zero(),
                    _ => a.import(field, &field.add(&m, &field.from_i64(j as i64))),
                });
                a.axpy_lanes(&mut lanes, &[0], &[xs], &ml);
                for (j, e) in expected_lanes.iter_mut().enumerate() {
                    *e = field.add(e, &field.mul(&x, &a.export(field, &ml[j])));
                }
                if normalize_at == Some(k) {
                    a.normalize(&mut acc);
                    a.normalize(&mut lanes);
                }
            }
            assert_eq!(a.export(field, &a.settle(&acc[0])), expected);
            for (lane, e) in lanes.iter().zip(&expected_lanes) {
                assert_eq!(a.export(field, &a.settle(lane)), *e);
            }
        }
        let x = a.import(field, &random());
        assert_eq!(a.mul(&x, &a.inv(&x)), a.one());
    }

    #[test]
    fn big_prime_kernels_agree_with_the_field() {
        let two = |k: u32| BigUint::from(2u8).pow(k);
        // 2^127 − 1 (a Mersenne prime), 2^255 − 19 (Bernstein 2006) and the NIST P-384 prime
        // (FIPS 186-4), all from memory, as in the field's own tests.
        check_big::<2, 5>(&BigPrimeField::<2>::new(&(two(127) - 1u32)).unwrap());
        check_big::<4, 9>(&BigPrimeField::<4>::new(&(two(255) - 19u32)).unwrap());
        let p384 = two(384) - two(128) - two(96) + two(32) - 1u32;
        check_big::<8, 17>(&BigPrimeField::<8>::new(&p384).unwrap());
        // The largest residue everywhere: 1000 products p − 1 times p − 1 on a loaded p − 1.
        let f = BigPrimeField::<4>::new(&(two(255) - 19u32)).unwrap();
        let kernel = BigPrime::<4, 9>::new(&f.montgomery_modulus().unwrap()).unwrap();
        let a = over_field(&kernel);
        let top = a.import(&f, &f.from_i64(-1));
        let mut acc = vec![a.load(&top)];
        for _ in 0..1000 {
            a.axpy(&mut acc, &[0], &[top], &top);
        }
        let expected = (0..1000).fold(f.from_i64(-1), |s, _| f.add(&s, &f.one()));
        assert_eq!(a.export(&f, &a.settle(&acc[0])), expected);
    }

    #[test]
    fn kernels_agree_with_exact_arithmetic() {
        // Primes from the field tests' list (2^31 - 1 and 2^63 - 25 are the largest primes below
        // those powers of two; tables of primes, from memory).
        check(&SmallPrime::<u16>::new(2), 2);
        check(&SmallPrime::<u16>::new(3), 3);
        check(&SmallPrime::<u16>::new(65521), 65521);
        check(&SmallPrime::<u32>::new(2147483647), 2147483647);
        check(&LargePrime::new((1 << 31) + 11), (1 << 31) + 11);
        check(&LargePrime::new((1 << 63) - 25), (1 << 63) - 25);
        check(&FieldOps::new(PrimeField::new(65521).unwrap()), 65521);
    }
}
