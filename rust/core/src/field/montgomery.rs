//! Modular arithmetic for an odd modulus n < 2^(64N) on N fixed 64-bit limbs, by Montgomery
//! multiplication (Montgomery 1985) in the coarsely integrated operand scanning form (Koç,
//! Acar and Kaliski 1996). Residues are kept canonical (< n) so equal values are equal limbs.
//!
//! Limbs are little-endian. Everything here is constant-size: no allocation per operation.
//!
//! For sums of many products (the rows of F4's matrices) there is also *delayed reduction*
//! on W = 2N + 1 limbs ([`Montgomery::mul_add_wide`], [`Montgomery::reduce_wide`]): products
//! of residues are added as plain integers, and the sum is reduced once, by W one-limb
//! Montgomery steps and one multiplication. A product is below n^2 < 2^(128N), so the extra
//! limb lets 2^64 - 2 of them be added to a loaded value before anything can overflow.

use num_bigint::BigUint;

pub type Limbs<const N: usize> = [u64; N];

/// Montgomery context for one odd modulus n: R = 2^(64N).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Montgomery<const N: usize> {
    n: Limbs<N>,
    /// −n^(−1) mod 2^64.
    n_inv_neg: u64,
    /// R mod n (the Montgomery form of 1) and R^2 mod n (to enter Montgomery form).
    r1: Limbs<N>,
    r2: Limbs<N>,
    /// 2^(64(2N + 1)) mod n: brings a wide sum back to Montgomery form (see `reduce_wide`).
    wide: Limbs<N>,
}

#[inline]
fn mac(a: u64, b: u64, c: u64, carry: u64) -> (u64, u64) {
    let t = a as u128 + (b as u128) * (c as u128) + carry as u128;
    (t as u64, (t >> 64) as u64)
}

#[inline]
fn add_with_carry<const N: usize>(a: &Limbs<N>, b: &Limbs<N>) -> (Limbs<N>, bool) {
    let mut out = [0u64; N];
    let mut carry = false;
    for i in 0..N {
        let (s1, c1) = a[i].overflowing_add(b[i]);
        let (s2, c2) = s1.overflowing_add(carry as u64);
        out[i] = s2;
        carry = c1 || c2;
    }
    (out, carry)
}

#[inline]
fn sub_with_borrow<const N: usize>(a: &Limbs<N>, b: &Limbs<N>) -> (Limbs<N>, bool) {
    let mut out = [0u64; N];
    let mut borrow = false;
    for i in 0..N {
        let (d1, b1) = a[i].overflowing_sub(b[i]);
        let (d2, b2) = d1.overflowing_sub(borrow as u64);
        out[i] = d2;
        borrow = b1 || b2;
    }
    (out, borrow)
}

/// a ≥ b as unsigned integers.
#[inline]
pub fn geq<const N: usize>(a: &Limbs<N>, b: &Limbs<N>) -> bool {
    for i in (0..N).rev() {
        if a[i] != b[i] {
            return a[i] > b[i];
        }
    }
    true
}

/// The limbs of `x`, or `None` if it needs more than N limbs.
pub fn to_limbs<const N: usize>(x: &BigUint) -> Option<Limbs<N>> {
    let digits = x.to_u64_digits();
    if digits.len() > N {
        return None;
    }
    let mut out = [0u64; N];
    out[..digits.len()].copy_from_slice(&digits);
    Some(out)
}

pub fn from_limbs(x: &[u64]) -> BigUint {
    let words: Vec<u32> = x
        .iter()
        .flat_map(|w| [*w as u32, (*w >> 32) as u32])
        .collect();
    BigUint::new(words)
}

impl<const N: usize> Montgomery<N> {
    /// Context for an odd modulus n > 1 that fits N limbs; `None` otherwise.
    pub fn new(n: &BigUint) -> Option<Self> {
        let limbs = to_limbs::<N>(n)?;
        if limbs[0] & 1 == 0 || *n <= BigUint::from(1u8) {
            return None;
        }
        // Newton's iteration doubles the correct low bits of n^(-1) mod 2^64 each step.
        let mut inv: u64 = 1;
        for _ in 0..6 {
            inv = inv.wrapping_mul(2u64.wrapping_sub(limbs[0].wrapping_mul(inv)));
        }
        let mut m = Montgomery {
            n: limbs,
            n_inv_neg: inv.wrapping_neg(),
            r1: [0; N],
            r2: [0; N],
            wide: [0; N],
        };
        // 2^(64N) and 2^(128N) mod n by doubling from 1: no division needed.
        let mut x = [0u64; N];
        x[0] = 1;
        for _ in 0..64 * N {
            x = m.add(&x, &x);
        }
        m.r1 = x;
        for _ in 0..64 * N {
            x = m.add(&x, &x);
        }
        m.r2 = x;
        for _ in 0..64 {
            x = m.add(&x, &x);
        }
        m.wide = x;
        Some(m)
    }

    pub fn modulus(&self) -> &Limbs<N> {
        &self.n
    }
    /// 1 in Montgomery form.
    pub fn one(&self) -> Limbs<N> {
        self.r1
    }

    #[inline]
    pub fn add(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        let (s, carry) = add_with_carry(a, b);
        if carry || geq(&s, &self.n) {
            sub_with_borrow(&s, &self.n).0
        } else {
            s
        }
    }

    #[inline]
    pub fn sub(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        let (d, borrow) = sub_with_borrow(a, b);
        if borrow {
            add_with_carry(&d, &self.n).0
        } else {
            d
        }
    }

    #[inline]
    pub fn neg(&self, a: &Limbs<N>) -> Limbs<N> {
        self.sub(&[0; N], a)
    }

    /// a / 2 mod n (valid in and out of Montgomery form: halving commutes with scaling by R).
    pub fn half(&self, a: &Limbs<N>) -> Limbs<N> {
        let (x, top) = if a[0] & 1 == 1 {
            add_with_carry(a, &self.n)
        } else {
            (*a, false)
        };
        let mut out = [0u64; N];
        for i in 0..N {
            let next = if i + 1 < N { x[i + 1] } else { top as u64 };
            out[i] = (x[i] >> 1) | (next << 63);
        }
        out
    }

    /// a·b·R^(−1) mod n for a, b < n.
    #[inline]
    pub fn mul(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        let mut t = [0u64; N];
        let (mut t_n, mut t_n1);
        t_n = 0;
        for &b_i in b {
            let mut carry = 0;
            for j in 0..N {
                (t[j], carry) = mac(t[j], a[j], b_i, carry);
            }
            let s = t_n as u128 + carry as u128;
            t_n = s as u64;
            t_n1 = (s >> 64) as u64;
            let m = t[0].wrapping_mul(self.n_inv_neg);
            let (_, mut carry) = mac(t[0], m, self.n[0], 0);
            for j in 1..N {
                (t[j - 1], carry) = mac(t[j], m, self.n[j], carry);
            }
            let s = t_n as u128 + carry as u128;
            t[N - 1] = s as u64;
            t_n = t_n1 + (s >> 64) as u64;
        }
        if t_n != 0 || geq(&t, &self.n) {
            sub_with_borrow(&t, &self.n).0
        } else {
            t
        }
    }

    /// The wide value of a residue a (Montgomery form): a·R, so that [`Montgomery::reduce_wide`]
    /// gives a back. W must be 2N + 1.
    #[inline]
    pub fn widen<const W: usize>(&self, a: &Limbs<N>) -> [u64; W] {
        debug_assert_eq!(W, 2 * N + 1);
        let mut out = [0u64; W];
        out[N..2 * N].copy_from_slice(a);
        out
    }

    /// acc += a·b as integers (a, b < n, Montgomery forms). W must be 2N + 1; the sum must stay
    /// below 2^(64W), which holds for fewer than 2^64 - 1 products added to a widened residue.
    /// The product is formed apart and added in one carry chain: no branch on carries.
    #[inline(always)]
    pub fn mul_add_wide<const W: usize>(acc: &mut [u64; W], a: &Limbs<N>, b: &Limbs<N>) {
        debug_assert_eq!(W, 2 * N + 1);
        let mut product = [0u64; W];
        for (i, &bi) in b.iter().enumerate() {
            let mut carry = 0;
            for (j, &aj) in a.iter().enumerate() {
                (product[i + j], carry) = mac(product[i + j], aj, bi, carry);
            }
            product[i + N] = carry;
        }
        let mut carry = false;
        for k in 0..W {
            let (s1, c1) = acc[k].overflowing_add(product[k]);
            let (s2, c2) = s1.overflowing_add(carry as u64);
            acc[k] = s2;
            carry = c1 | c2;
        }
    }

    /// The residue (Montgomery form) that a wide sum of products of Montgomery forms stands
    /// for: acc·R^(−1) mod n. W one-limb Montgomery steps divide by 2^(64W) and leave a value
    /// at most n; one multiplication by 2^(64W) mod n then corrects the power of R.
    pub fn reduce_wide<const W: usize>(&self, acc: &[u64; W]) -> Limbs<N> {
        debug_assert_eq!(W, 2 * N + 1);
        // t < 2^(64W) throughout: each step maps t to (t + m·n) / 2^64 < t / 2^64 + n.
        let mut t = *acc;
        for _ in 0..W {
            let m = t[0].wrapping_mul(self.n_inv_neg);
            let (_, mut carry) = mac(t[0], m, self.n[0], 0);
            for j in 1..N {
                (t[j - 1], carry) = mac(t[j], m, self.n[j], carry);
            }
            for j in N..W {
                let (sum, overflow) = t[j].overflowing_add(carry);
                t[j - 1] = sum;
                carry = overflow as u64;
            }
            t[W - 1] = carry;
        }
        let mut low = [0u64; N];
        low.copy_from_slice(&t[..N]);
        if t[N..].iter().any(|&w| w != 0) || geq(&low, &self.n) {
            low = sub_with_borrow(&low, &self.n).0;
        }
        self.mul(&low, &self.wide)
    }

    /// Montgomery form of x < n.
    pub fn enter(&self, x: &Limbs<N>) -> Limbs<N> {
        self.mul(x, &self.r2)
    }
    /// Ordinary value of a Montgomery form.
    pub fn leave(&self, x: &Limbs<N>) -> Limbs<N> {
        let mut one = [0u64; N];
        one[0] = 1;
        self.mul(x, &one)
    }

    /// a^e for an exponent given as little-endian limbs of any length (a in Montgomery form).
    pub fn pow(&self, a: &Limbs<N>, e: &[u64]) -> Limbs<N> {
        let mut acc = self.r1;
        for &word in e.iter().rev() {
            for bit in (0..64).rev() {
                acc = self.mul(&acc, &acc);
                if (word >> bit) & 1 == 1 {
                    acc = self.mul(&acc, a);
                }
            }
        }
        acc
    }
}
