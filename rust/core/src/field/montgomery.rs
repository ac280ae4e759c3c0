//! Modular arithmetic for an odd modulus n < 2^(64N) on N fixed 64-bit limbs, by Montgomery
//! multiplication (Montgomery 1985) in the coarsely integrated operand scanning form (Koç,
//! Acar and Kaliski 1996). Residues are kept canonical (< n) so equal values are equal limbs.
//!
//! Limbs are little-endian. Everything here is constant-size: no allocation per operation.

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
        for i in 0..N {
            let mut carry = 0;
            for j in 0..N {
                (t[j], carry) = mac(t[j], a[j], b[i], carry);
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
