//! Products of polynomials with word-size coefficients modulo m by number-theoretic transforms
//! (Pollard 1971; Schönhage and Strassen 1971): the integer product of the coefficient vectors
//! is computed modulo a few primes p = c·2^32 + 1 just below 2^62, whose multiplicative groups
//! hold roots of unity of order 2^32, and put together by the Chinese remainder theorem in
//! Garner's mixed-radix form (Garner 1959) before the reduction modulo m. The exact integer
//! coefficients are below n·(m − 1)^2, so the number of transform primes is chosen from m and n
//! (one for small m, at most three for m < 2^63). Arithmetic modulo a transform prime uses
//! Montgomery's reduction (Montgomery 1985) for the pointwise products and Shoup's precomputed
//! quotients (as in Harvey 2014) for the twiddle factors, kept in one contiguous table per level and
//! cached per length. The transforms are decimation in frequency forward and decimation in time
//! backward, so no bit reversal is needed between them.

use crate::field::primality::is_prime;
use crate::field::PrimeField;
use std::sync::OnceLock;

/// log2 of the largest transform length.
const MAX_LOG: u32 = 32;

/// A prime p < 2^62 with 2^32 | p − 1, with its Montgomery constants.
#[derive(Debug)]
pub struct TransformPrime {
    p: u64,
    /// −p^(−1) mod 2^64.
    neg_inv: u64,
    /// 2^128 mod p (converts into Montgomery form).
    r2: u64,
    /// A root of unity of order 2^32, in Montgomery form.
    root: u64,
    /// The twiddle tables of the transform lengths 2^k up to 2^CACHED_LOG, made on first use.
    twiddles: [OnceLock<Twiddles>; CACHED_LOG as usize + 1],
}

/// log2 of the longest transform whose twiddle tables are kept (2^20 entries, 16 MB a table).
const CACHED_LOG: u32 = 20;

/// The twiddle factors of every level of the transforms of one length n, each level contiguous:
/// entry h + j is (w_(2h)^j, its Shoup quotient) for the level of half-length h, w_(2h) the root
/// of unity of order 2h (or its inverse for the backward table).
#[derive(Debug)]
struct Twiddles {
    forward: Vec<[u64; 2]>,
    backward: Vec<[u64; 2]>,
}

impl TransformPrime {
    fn new(p: u64) -> Self {
        let mut inv: u64 = 1;
        for _ in 0..6 {
            inv = inv.wrapping_mul(2u64.wrapping_sub(p.wrapping_mul(inv)));
        }
        let r = (1u128 << 64) % p as u128;
        let r2 = (r * r % p as u128) as u64;
        let mut prime = TransformPrime {
            p,
            neg_inv: inv.wrapping_neg(),
            r2,
            root: 0,
            twiddles: std::array::from_fn(|_| OnceLock::new()),
        };
        let odd = (p - 1) >> MAX_LOG;
        let generator = (2..)
            .find(|&g| prime.is_generator(g, odd))
            .expect("a prime has a primitive root");
        prime.root = prime.to_montgomery(prime.power(generator, odd));
        prime
    }

    pub fn modulus(&self) -> u64 {
        self.p
    }

    /// a·b·2^(−64) mod p for a, b < 2p (then a·b < 2^64·p, as p < 2^62, and the sum below is
    /// under 2p before the last subtraction).
    #[inline(always)]
    pub(super) fn mont(&self, a: u64, b: u64) -> u64 {
        let t = a as u128 * b as u128;
        let m = (t as u64).wrapping_mul(self.neg_inv);
        let u = ((t + m as u128 * self.p as u128) >> 64) as u64;
        below(u, self.p)
    }
    #[inline(always)]
    pub(super) fn add(&self, a: u64, b: u64) -> u64 {
        let s = a + b;
        if s >= self.p {
            s - self.p
        } else {
            s
        }
    }
    #[inline(always)]
    pub(super) fn sub(&self, a: u64, b: u64) -> u64 {
        if a >= b {
            a - b
        } else {
            a + self.p - b
        }
    }
    pub(super) fn to_montgomery(&self, a: u64) -> u64 {
        self.mont(a % self.p, self.r2)
    }
    /// a·b mod p for plain residues.
    fn mul(&self, a: u64, b: u64) -> u64 {
        self.mont(self.to_montgomery(a), b)
    }
    fn power(&self, a: u64, mut e: u64) -> u64 {
        let (mut base, mut acc) = (a % self.p, 1u64);
        while e > 0 {
            if e & 1 == 1 {
                acc = self.mul(acc, base);
            }
            base = self.mul(base, base);
            e >>= 1;
        }
        acc
    }
    pub(super) fn inverse(&self, a: u64) -> u64 {
        self.power(a, self.p - 2)
    }
    /// Whether g generates the multiplicative group; p − 1 = odd · 2^32.
    fn is_generator(&self, g: u64, odd: u64) -> bool {
        let mut factors = vec![2];
        factors.extend(crate::field::primality::prime_divisors(odd));
        factors
            .iter()
            .all(|&r| self.power(g, (self.p - 1) / r) != 1)
    }

    /// Roots w^0, ..., w^(n/2 − 1) of a primitive n-th root of unity w (or its inverse), in
    /// Montgomery form.
    fn roots(&self, log_n: u32, inverse: bool) -> Vec<u64> {
        let mut w = self.root;
        for _ in log_n..MAX_LOG {
            w = self.mont(w, w);
        }
        if inverse {
            // w^(-1) = w^(n − 1).
            w = self.to_montgomery(self.inverse(self.mont(w, 1)));
        }
        let half = (1usize << log_n) / 2;
        let mut out = Vec::with_capacity(half);
        let mut x = self.to_montgomery(1);
        for _ in 0..half {
            out.push(x);
            x = self.mont(x, w);
        }
        out
    }

    /// The twiddle table of one direction for transforms of length 2^log_n (see [`Twiddles`]).
    fn level_table(&self, log_n: u32, inverse: bool) -> Vec<[u64; 2]> {
        let n = 1usize << log_n;
        let roots = self.roots(log_n, inverse);
        let mut out = vec![[0, 0]; n.max(2)];
        let mut half = 1;
        while half < n {
            let step = n / (2 * half);
            for j in 0..half {
                let w = self.mont(roots[j * step], 1);
                out[half + j] = [w, ((u128::from(w) << 64) / u128::from(self.p)) as u64];
            }
            half *= 2;
        }
        out
    }

    /// Runs `f` with the twiddle tables of length 2^log_n (cached up to [`CACHED_LOG`]).
    fn with_twiddles<R>(&self, log_n: u32, f: impl FnOnce(&Twiddles) -> R) -> R {
        let make = || Twiddles {
            forward: self.level_table(log_n, false),
            backward: self.level_table(log_n, true),
        };
        match self.twiddles.get(log_n as usize) {
            Some(cell) => f(cell.get_or_init(make)),
            None => f(&make()),
        }
    }

    /// x·w mod p up to one multiple of p (a value in [0, 2p)) by the precomputed quotient
    /// w' = ⌊w·2^64/p⌋ (Harvey 2014): one high and two low word products, no branch; valid for
    /// any x < 2^64 since p < 2^62.
    #[inline(always)]
    fn mul_shoup_lazy(&self, x: u64, w: [u64; 2]) -> u64 {
        let q = ((u128::from(x) * u128::from(w[1])) >> 64) as u64;
        x.wrapping_mul(w[0]).wrapping_sub(q.wrapping_mul(self.p))
    }

    /// Forward transform in place (decimation in frequency; output in bit-reversed order). The
    /// values stay in [0, 2p) without being fully reduced (Harvey 2014): p < 2^62 leaves room
    /// for sums below 4p, and the Montgomery products that follow accept inputs below 2p.
    fn forward(&self, a: &mut [u64], table: &[[u64; 2]]) {
        let n = a.len();
        let two_p = 2 * self.p;
        let mut half = n / 2;
        while half >= 1 {
            let level = &table[half..2 * half];
            for block in a.chunks_mut(2 * half) {
                let (lo, hi) = block.split_at_mut(half);
                for ((u, v), &w) in lo.iter_mut().zip(hi.iter_mut()).zip(level) {
                    let (x, y) = (*u, *v);
                    *u = below(x + y, two_p);
                    *v = self.mul_shoup_lazy(x + two_p - y, w);
                }
            }
            half /= 2;
        }
    }

    /// Inverse transform in place (decimation in time; input in bit-reversed order), without
    /// the division by n; values in [0, 2p) in and out, as in [`TransformPrime::forward`].
    fn backward(&self, a: &mut [u64], table: &[[u64; 2]]) {
        let n = a.len();
        let two_p = 2 * self.p;
        let mut half = 1;
        while half < n {
            let level = &table[half..2 * half];
            for block in a.chunks_mut(2 * half) {
                let (lo, hi) = block.split_at_mut(half);
                for ((u, v), &w) in lo.iter_mut().zip(hi.iter_mut()).zip(level) {
                    let (x, y) = (*u, self.mul_shoup_lazy(*v, w));
                    *u = below(x + y, two_p);
                    *v = below(x + two_p - y, two_p);
                }
            }
            half *= 2;
        }
    }

    /// The cyclic convolution of a and b of length n = 2^log_n (both zero-padded to n), exact
    /// modulo p.
    pub(super) fn convolve(&self, a: &[u64], b: &[u64], log_n: u32) -> Vec<u64> {
        self.with_twiddles(log_n, |twiddles| self.convolve_with(a, b, log_n, twiddles))
    }

    fn convolve_with(&self, a: &[u64], b: &[u64], log_n: u32, twiddles: &Twiddles) -> Vec<u64> {
        let mut fa = self.spectrum_with(a, log_n, twiddles);
        if std::ptr::eq(a, b) {
            fa.iter_mut().for_each(|x| *x = self.mont(*x, *x));
            self.finish_convolution(&mut fa, log_n, twiddles);
            fa
        } else {
            let fb = self.spectrum_with(b, log_n, twiddles);
            self.convolve_spectra_with(fa, &fb, log_n, twiddles)
        }
    }

    /// The forward transform of v (reduced modulo p, zero-padded to 2^log_n, v no longer): the
    /// spectrum of a fixed factor, computed once and given to [`TransformPrime::convolve_spectra`].
    pub(super) fn spectrum(&self, v: &[u64], log_n: u32) -> Vec<u64> {
        self.with_twiddles(log_n, |twiddles| self.spectrum_with(v, log_n, twiddles))
    }

    fn spectrum_with(&self, v: &[u64], log_n: u32, twiddles: &Twiddles) -> Vec<u64> {
        let n = 1usize << log_n;
        debug_assert!(v.len() <= n);
        let mut out: Vec<u64> = v.iter().map(|&x| x % self.p).collect();
        out.resize(n, 0);
        self.forward(&mut out, &twiddles.forward);
        out
    }

    /// The cyclic convolution (length 2^log_n, exact modulo p) of the two vectors whose spectra
    /// are given.
    pub(super) fn convolve_spectra(&self, fa: Vec<u64>, fb: &[u64], log_n: u32) -> Vec<u64> {
        self.with_twiddles(log_n, |twiddles| {
            self.convolve_spectra_with(fa, fb, log_n, twiddles)
        })
    }

    fn convolve_spectra_with(
        &self,
        mut fa: Vec<u64>,
        fb: &[u64],
        log_n: u32,
        twiddles: &Twiddles,
    ) -> Vec<u64> {
        fa.iter_mut()
            .zip(fb)
            .for_each(|(x, y)| *x = self.mont(*x, *y));
        self.finish_convolution(&mut fa, log_n, twiddles);
        fa
    }

    /// The backward transform of a pointwise product of spectra, scaled to the convolution.
    fn finish_convolution(&self, fa: &mut [u64], log_n: u32, twiddles: &Twiddles) {
        self.backward(fa, &twiddles.backward);
        // The pointwise Montgomery products left a factor 2^(−64); undo it with 1/n.
        let n_inv = self.inverse((1u64 << log_n) % self.p);
        let scale = self.mont(self.to_montgomery(n_inv), self.r2);
        fa.iter_mut().for_each(|x| *x = self.mont(*x, scale));
    }
}

/// x mod m for x < 2m, without a branch: x − m wraps around above x when x < m.
#[inline(always)]
fn below(x: u64, m: u64) -> u64 {
    x.min(x.wrapping_sub(m))
}

/// How many transform primes there are: enough for products of polynomials over prime fields of
/// up to 512 bits (coefficients of the integer product below 2^(2·512 + 32)).
pub const TRANSFORM_PRIME_COUNT: usize = 18;

/// The transform primes, largest first (all above 2^61).
pub fn transform_primes() -> &'static [TransformPrime] {
    static PRIMES: OnceLock<Vec<TransformPrime>> = OnceLock::new();
    PRIMES.get_or_init(|| {
        (1..1u64 << 30)
            .rev()
            .map(|c| (c << MAX_LOG) + 1)
            .filter(|&p| is_prime(p))
            .take(TRANSFORM_PRIME_COUNT)
            .map(TransformPrime::new)
            .collect()
    })
}

/// The product of the polynomials a and b (coefficients in 0..m, m < 2^63 prime or not),
/// coefficients reduced modulo m; length a.len() + b.len() − 1, not trimmed.
pub fn multiply_words(a: &[u64], b: &[u64], m: u64) -> Vec<u64> {
    let len = a.len() + b.len() - 1;
    let log_n = transform_log_length(len);
    let primes = word_transform_primes(m, a.len().min(b.len()));
    let same = std::ptr::eq(a, b);
    let residues: Vec<Vec<u64>> = rayon_map(primes, |prime| {
        prime.convolve(a, if same { a } else { b }, log_n)
    });
    let crt = Garner::new(primes, m);
    (0..len).map(|i| crt.combine(&residues, i)).collect()
}

/// The transform primes for products modulo m of polynomials whose shorter factor has
/// `shorter` coefficients: the integer coefficients are below shorter·(m − 1)^2.
pub(super) fn word_transform_primes(m: u64, shorter: usize) -> &'static [TransformPrime] {
    let bits = 2 * (64 - (m - 1).leading_zeros()) + (usize::BITS - shorter.leading_zeros());
    &transform_primes()[..(bits as usize).div_ceil(61).clamp(1, 3)]
}

/// log2 of the transform length for a product of `len` coefficients.
pub(super) fn transform_log_length(len: usize) -> u32 {
    let log_n = len.next_power_of_two().trailing_zeros();
    assert!(log_n <= MAX_LOG, "a product longer than 2^32 coefficients");
    log_n
}

pub(super) fn rayon_map<T: Sync, R: Send>(
    items: &[T],
    f: impl Fn(&T) -> R + Sync + Send,
) -> Vec<R> {
    use rayon::prelude::*;
    items.par_iter().map(f).collect()
}

/// Arithmetic modulo m < 2^63 (prime or not) for the final reduction.
enum Target {
    Prime(PrimeField),
    Composite(u64),
}

impl Target {
    fn new(m: u64) -> Self {
        PrimeField::new(m).map_or(Target::Composite(m), Target::Prime)
    }
    fn modulus(&self) -> u64 {
        match self {
            Target::Prime(f) => f.modulus(),
            Target::Composite(m) => *m,
        }
    }
    fn reduce(&self, a: u64) -> u64 {
        a % self.modulus()
    }
    fn mul(&self, a: u64, b: u64) -> u64 {
        match self {
            Target::Prime(f) => f.mul_u64(a, b),
            Target::Composite(m) => (a as u128 * b as u128 % *m as u128) as u64,
        }
    }
    fn add(&self, a: u64, b: u64) -> u64 {
        let m = self.modulus();
        let s = a + b;
        if s >= m {
            s - m
        } else {
            s
        }
    }
}

/// The Chinese remainder step from residues modulo the transform primes to a residue modulo m,
/// by Garner's mixed-radix digits: x = v0 + v1·p0 + v2·p0·p1 with 0 ≤ v_i < p_i.
pub(super) struct Garner<'a> {
    primes: &'a [TransformPrime],
    target: Target,
    /// p0^(−1) mod p1, p0 mod p2, (p0·p1)^(−1) mod p2 (in Montgomery form where multiplied).
    inv_p0_mod_p1: u64,
    p0_mod_p2: u64,
    inv_p01_mod_p2: u64,
    /// p0 mod m and p0·p1 mod m.
    p0_mod_m: u64,
    p01_mod_m: u64,
}

impl<'a> Garner<'a> {
    pub(super) fn new(primes: &'a [TransformPrime], m: u64) -> Self {
        let target = Target::new(m);
        let p0 = primes[0].p;
        let (mut inv_p0_mod_p1, mut p0_mod_p2, mut inv_p01_mod_p2) = (0, 0, 0);
        if let Some(p1) = primes.get(1) {
            inv_p0_mod_p1 = p1.to_montgomery(p1.inverse(p0 % p1.p));
        }
        if let Some(p2) = primes.get(2) {
            p0_mod_p2 = p2.to_montgomery(p0 % p2.p);
            let p01 = p2.mul(p0 % p2.p, primes[1].p % p2.p);
            inv_p01_mod_p2 = p2.to_montgomery(p2.inverse(p01));
        }
        let p0_mod_m = target.reduce(p0);
        let p01_mod_m = target.mul(p0_mod_m, primes.get(1).map_or(0, |p1| target.reduce(p1.p)));
        Garner {
            primes,
            target,
            inv_p0_mod_p1,
            p0_mod_p2,
            inv_p01_mod_p2,
            p0_mod_m,
            p01_mod_m,
        }
    }

    /// Coefficient i modulo m.
    pub(super) fn combine(&self, residues: &[Vec<u64>], i: usize) -> u64 {
        let t = &self.target;
        let v0 = residues[0][i];
        let mut x = t.reduce(v0);
        if let Some(p1) = self.primes.get(1) {
            let v1 = p1.mont(p1.sub(residues[1][i], v0 % p1.p), self.inv_p0_mod_p1);
            x = t.add(x, t.mul(t.reduce(v1), self.p0_mod_m));
            if let Some(p2) = self.primes.get(2) {
                let partial = p2.add(v0 % p2.p, p2.mont(v1 % p2.p, self.p0_mod_p2));
                let v2 = p2.mont(p2.sub(residues[2][i], partial), self.inv_p01_mod_p2);
                x = t.add(x, t.mul(t.reduce(v2), self.p01_mod_m));
            }
        }
        x
    }
}
