//! The number of distinct roots in GF(2^k), 4 ≤ k ≤ 64, of a polynomial of degree 3 or 4, by
//! GF(2)-linear algebra on the bits of the field instead of a Frobenius loop: in characteristic
//! 2, y ↦ c_4·y^4 + c_2·y^2 + c_1·y is GF(2)-linear (an affine polynomial; Berlekamp, Rumsey
//! and Solomon 1967), so c_4·y^4 + c_2·y^2 + c_1·y = r has 2^(k − rank) solutions or none,
//! by eliminating a k × k bit matrix whose columns come from c_4, c_2, c_1 by shifts and XORs.
//! Every quartic a_4·y^4 + a_3·y^3 + a_2·y^2 + a_1·y + a_0 (a_4 ≠ 0) reaches that form:
//! - a_3 = 0: it is already affine;
//! - a_3 ≠ 0: y = z + s with s² = a_1/a_3 (the root of the derivative a_3·y² + a_1) removes
//!   the z-term: a_4·z^4 + a_3·z^3 + b_2·z^2 + b_0 with b_2 = a_2 + a_3·s and
//!   b_0 = f(s) = E/a_3², E = a_4·a_1² + a_1·a_2·a_3 + a_0·a_3². When E ≠ 0 (f squarefree),
//!   z = 1/w gives the affine b_0·w^4 + b_2·w^2 + a_3·w = a_4 (times a_3², free of
//!   inversions), whose solutions w ≠ 0 are the roots. When E = 0, y = s is a repeated root
//!   and the others are the roots of a_4·z² + a_3·z + b_2, counted by the absolute trace
//!   (Lidl and Niederreiter 1983, ch. 2).
//!
//! A cubic f counts as the quartic y·f less the root y = 0 when f(0) ≠ 0. The square root
//! (the inverse Frobenius) and the trace are GF(2)-linear too: a table of √(t^i) and a mask.

use crate::field::Field;

/// Smallest k handled: multiplying by t^4 folds four bits back with x^k ≡ t^k mod the modulus.
pub const MIN_DEGREE: u32 = 4;

/// Root counts of small polynomials over GF(2^k) on the bits of the field's elements (the
/// polynomial basis 1, t, ..., t^(k−1) of [`Field::binary_degree`]).
#[derive(Clone, Debug)]
pub struct BinaryRoots<E: Field> {
    field: E,
    k: u32,
    mask: u64,
    /// fold_j[h] = h(t)·t^k reduced, for h of degree < j: what falls back into the low k
    /// bits when an element is multiplied by t^j (j = 1, 2, 4).
    fold1: [u64; 2],
    fold2: [u64; 4],
    fold4: [u64; 16],
    /// square_roots[i] = √(t^i).
    square_roots: Vec<u64>,
    /// Tr(x) is the parity of bits(x) & trace_mask.
    trace_mask: u64,
}

impl<E: Field> BinaryRoots<E> {
    /// The tables of `field` when it is GF(2^k), MIN_DEGREE ≤ k ≤ 64, with the bit hook;
    /// `None` otherwise (the caller keeps its general count).
    pub fn new(field: &E) -> Option<Self> {
        let k = field
            .binary_degree()
            .filter(|&k| (MIN_DEGREE..=64).contains(&k))?;
        let mask = u64::MAX >> (64 - k);
        let t = field.from_binary_bits(2);
        let power_bits = |e: u64| field.to_binary_bits(&field.pow(&t, e));
        // The bits are coordinates on the powers of t: check it once.
        if (0..k).any(|i| power_bits(u64::from(i)) != 1 << i) {
            return None;
        }
        let fold = |h: usize| {
            (0..4)
                .filter(|b| h >> b & 1 == 1)
                .fold(0, |acc, b| acc ^ power_bits(u64::from(k) + b as u64))
        };
        let square_roots = (0..k)
            .map(|i| {
                let root = field
                    .pth_root(&field.from_binary_bits(1 << i))
                    .expect("a finite field has square roots");
                field.to_binary_bits(&root)
            })
            .collect();
        let trace_mask = (0..k).fold(0, |acc, i| {
            let mut power = field.from_binary_bits(1 << i);
            let mut trace = power.clone();
            for _ in 1..k {
                power = field.mul(&power, &power);
                trace = field.add(&trace, &power);
            }
            acc | (field.to_binary_bits(&trace) & 1) << i
        });
        Some(BinaryRoots {
            field: field.clone(),
            k,
            mask,
            fold1: std::array::from_fn(&fold),
            fold2: std::array::from_fn(&fold),
            fold4: std::array::from_fn(&fold),
            square_roots,
            trace_mask,
        })
    }

    /// Tr(x) = x + x² + ... + x^(2^(k−1)), 0 or 1, as a bool.
    pub fn trace_is_one(&self, x: &E::Elem) -> bool {
        (self.field.to_binary_bits(x) & self.trace_mask).count_ones() % 2 == 1
    }

    /// The distinct roots in GF(2^k) of a_3·y^3 + a_2·y^2 + a_1·y + a_0, a_3 ≠ 0.
    pub fn cubic(&self, a: &[E::Elem; 4]) -> u128 {
        let [a0, a1, a2, a3] = a;
        let on_y = self.quartic(&[
            self.field.zero(),
            a0.clone(),
            a1.clone(),
            a2.clone(),
            a3.clone(),
        ]);
        on_y - u128::from(!self.field.is_zero(a0))
    }

    /// The distinct roots in GF(2^k) of Σ a_i y^i, a_4 ≠ 0.
    pub fn quartic(&self, a: &[E::Elem; 5]) -> u128 {
        let field = &self.field;
        let [a0, a1, a2, a3, a4] = a;
        if field.is_zero(a3) {
            return self.affine_solutions(a4, a2, a1, a0);
        }
        let a3_squared = field.mul(a3, a3);
        let e = field.add(
            &field.add(
                &field.mul(a4, &field.mul(a1, a1)),
                &field.mul(&field.mul(a1, a2), a3),
            ),
            &field.mul(a0, &a3_squared),
        );
        // b_2 = a_2 + a_3·s with a_3·s = √(a_1·a_3).
        let b2 = field.add(a2, &self.square_root(&field.mul(a1, a3)));
        if field.is_zero(&e) {
            return 1 + self.nonzero_roots_of_quadratic(a4, a3, &b2, &a3_squared);
        }
        self.affine_solutions(
            &e,
            &field.mul(&a3_squared, &b2),
            &field.mul(&a3_squared, a3),
            &field.mul(&a3_squared, a4),
        )
    }

    /// The nonzero roots of a·z² + b·z + c, b ≠ 0, given b²: c = 0 leaves z = b/a; else two
    /// or none as Tr(ac/b²) is 0 or 1 (z = (b/a)·v gives v² + v = ac/b²), all nonzero.
    fn nonzero_roots_of_quadratic(
        &self,
        a: &E::Elem,
        b: &E::Elem,
        c: &E::Elem,
        b_squared: &E::Elem,
    ) -> u128 {
        let field = &self.field;
        if field.is_zero(c) {
            return 1;
        }
        debug_assert!(!field.is_zero(b));
        let inverse = field.inv(b_squared).expect("b is nonzero");
        if self.trace_is_one(&field.mul(&field.mul(a, c), &inverse)) {
            0
        } else {
            2
        }
    }

    /// √x: the sum of √(t^i) over the bits of x.
    fn square_root(&self, x: &E::Elem) -> E::Elem {
        let mut bits = self.field.to_binary_bits(x);
        let mut root = 0;
        while bits != 0 {
            root ^= self.square_roots[bits.trailing_zeros() as usize];
            bits &= bits - 1;
        }
        self.field.from_binary_bits(root)
    }

    /// The number of y in GF(2^k) with c_4·y^4 + c_2·y^2 + c_1·y = r: the column of t^i is
    /// c_4·t^(4i) + c_2·t^(2i) + c_1·t^i, each term one shift of the previous one; then
    /// Gaussian elimination on the columns with r beside them.
    fn affine_solutions(&self, c4: &E::Elem, c2: &E::Elem, c1: &E::Elem, r: &E::Elem) -> u128 {
        let field = &self.field;
        let k = self.k as usize;
        let (mut x4, mut x2, mut x1) = (
            field.to_binary_bits(c4),
            field.to_binary_bits(c2),
            field.to_binary_bits(c1),
        );
        let mut columns = [0u64; 65];
        for column in &mut columns[..k] {
            *column = x4 ^ x2 ^ x1;
            x4 = self.times_t_power(x4, 4, &self.fold4);
            x2 = self.times_t_power(x2, 2, &self.fold2);
            x1 = self.times_t_power(x1, 1, &self.fold1);
        }
        columns[k] = field.to_binary_bits(r);
        let rank = eliminate(&mut columns[..=k]);
        if columns[k] == 0 {
            1 << (k - rank)
        } else {
            0
        }
    }

    /// x·t^j reduced (j ≤ 4 ≤ k; `fold` the table for j).
    #[inline]
    fn times_t_power(&self, x: u64, j: u32, fold: &[u64]) -> u64 {
        ((x << j) & self.mask) ^ fold[(x >> (self.k - j)) as usize]
    }
}

/// Gaussian elimination on bit columns: each nonzero column but the last becomes in turn a
/// pivot on its lowest set bit, which is cleared from every later column (branch-free, so the
/// inner loop runs at the processor's full width). Returns the number of pivots, the rank of
/// all columns but the last; the last is left reduced, zero exactly when it lies in their span
/// (the pivots are echelon: a later pivot has the bits of the earlier ones cleared).
fn eliminate(columns: &mut [u64]) -> usize {
    let n = columns.len() - 1;
    let mut rank = 0;
    for i in 0..n {
        let pivot = columns[i];
        if pivot == 0 {
            continue;
        }
        rank += 1;
        let bit = pivot.trailing_zeros();
        for c in &mut columns[i + 1..] {
            *c ^= pivot & 0u64.wrapping_sub((*c >> bit) & 1);
        }
    }
    rank
}
