//! Squaring modulo f = x^n + g over GF(2) on packed bits, for the Frobenius steps of the
//! irreducibility test: in characteristic 2 squaring is linear, (Σ c_i x^i)^2 = Σ c_i x^(2i), so
//! a square is the bits spread apart (a table of the spread bytes), and the reduction by a
//! sparse f folds each word above x^n back onto lower words, one shift and XOR per term of g
//! (the standard word-level method; Hankerson, Menezes and Vanstone, *Guide to Elliptic Curve
//! Cryptography*, 2004, §2.3). A step costs O(n/64 · #terms of g) word operations instead of
//! O(n · #terms of g) coefficient operations.

use super::modulus::Dense;

/// x ↦ x^2 modulo f = x^n + g over GF(2), deg g ≤ n − 64, on bits packed 64 to a word.
pub(super) struct BinarySquaring {
    n: usize,
    /// The exponents of the terms of g.
    tail: Vec<usize>,
}

/// spread[b]: the bits of the byte b moved to the even positions of 16 bits.
const SPREAD: [u16; 256] = {
    let mut table = [0u16; 256];
    let mut b = 0;
    while b < 256 {
        let mut bit = 0;
        while bit < 8 {
            table[b] |= (((b >> bit) & 1) as u16) << (2 * bit);
            bit += 1;
        }
        b += 1;
    }
    table
};

impl BinarySquaring {
    /// For f over GF(2) given by its coefficients c_0..c_n (c_n = 1), when its lower terms
    /// leave the top word free (deg g ≤ n − 64); `None` otherwise.
    pub(super) fn new(coeffs: &[u64]) -> Option<Self> {
        let n = coeffs.len().checked_sub(1)?;
        let tail: Vec<usize> = (0..n).filter(|&j| coeffs[j] != 0).collect();
        let fits = tail.last().is_none_or(|&top| top + 64 <= n);
        fits.then_some(BinarySquaring { n, tail })
    }

    fn words(&self) -> usize {
        self.n.div_ceil(64)
    }

    /// The packed bits of a polynomial of degree < n (coefficients 0 or 1, low first).
    pub(super) fn pack(&self, h: &[u64]) -> Vec<u64> {
        let mut packed = vec![0u64; self.words()];
        for (i, &c) in h.iter().enumerate() {
            packed[i / 64] |= (c & 1) << (i % 64);
        }
        packed
    }

    /// The coefficients, low first, without trailing zeros.
    pub(super) fn unpack(&self, packed: &[u64]) -> Dense {
        let mut h: Dense = (0..self.n)
            .map(|i| (packed[i / 64] >> (i % 64)) & 1)
            .collect();
        while h.last() == Some(&0) {
            h.pop();
        }
        h
    }

    /// h^2 mod f.
    pub(super) fn square(&self, h: &[u64]) -> Vec<u64> {
        let mut wide = vec![0u64; 2 * self.words()];
        for (i, &w) in h.iter().enumerate() {
            wide[2 * i] = spread_half(w as u32);
            wide[2 * i + 1] = spread_half((w >> 32) as u32);
        }
        self.reduce(wide)
    }

    /// a mod f, word by word from the top: the bits of word w at positions ≥ n move down by
    /// n − j for every term x^j of g. Since j ≤ n − 64 they land in lower words only, which
    /// are reduced after.
    fn reduce(&self, mut a: Vec<u64>) -> Vec<u64> {
        let n = self.n;
        let boundary = n / 64;
        for w in (boundary..a.len()).rev() {
            let mask = if w == boundary {
                u64::MAX.checked_shl((n % 64) as u32).unwrap_or(0)
            } else {
                u64::MAX
            };
            let v = a[w] & mask;
            if v == 0 {
                continue;
            }
            a[w] ^= v;
            for &j in &self.tail {
                // Bit b of word w (position 64w + b) goes to position 64w + b − n + j.
                let start = (64 * w + j) as isize - n as isize;
                if start < 0 {
                    a[0] ^= v >> (-start) as u32;
                    continue;
                }
                let (word, shift) = (start as usize / 64, start as u32 % 64);
                a[word] ^= v << shift;
                if shift > 0 {
                    a[word + 1] ^= v >> (64 - shift);
                }
            }
        }
        a.truncate(self.words());
        a
    }
}

/// The 32 bits of `x` moved to the even positions of 64.
fn spread_half(x: u32) -> u64 {
    x.to_le_bytes()
        .iter()
        .enumerate()
        .fold(0u64, |acc, (i, &b)| {
            acc | u64::from(SPREAD[b as usize]) << (16 * i)
        })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::univariate;

    /// Packed squares agree with squares by the generic dense arithmetic modulo f, for
    /// f = x^n + g with the lower terms in several places (the boundary word full or not).
    #[test]
    fn packed_squares_agree_with_dense_products() {
        let base = PrimeField::new(2).unwrap();
        let mut rng = crate::rng::Rng::new(3);
        for (n, tail) in [
            (128usize, vec![0usize, 1, 2, 7]),
            (130, vec![0, 3, 66]),
            (200, vec![0, 1, 5, 136]),
            (64, vec![0]),
            (1000, vec![0, 3, 5, 11, 900]),
        ] {
            let mut f = vec![0u64; n + 1];
            f[n] = 1;
            for &j in &tail {
                f[j] = 1;
            }
            let squaring = BinarySquaring::new(&f).unwrap();
            let mut h: Dense = (0..n).map(|_| rng.next_u64() & 1).collect();
            while h.last() == Some(&0) {
                h.pop();
            }
            let mut packed = squaring.pack(&h);
            for _ in 0..5 {
                h = univariate::remainder(&base, &univariate::multiply(&base, &h, &h), &f);
                packed = squaring.square(&packed);
                assert_eq!(squaring.unpack(&packed), h, "n = {n}");
            }
        }
        // A term of g in the top word: no packed squaring.
        let mut f = vec![0u64; 101];
        f[100] = 1;
        f[0] = 1;
        f[40] = 1;
        assert!(BinarySquaring::new(&f).is_none());
    }
}
