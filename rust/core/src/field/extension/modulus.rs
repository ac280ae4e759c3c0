//! The defining polynomial of GF(p^k) = GF(p)[a]/(f): dense polynomials over GF(p), arithmetic
//! modulo f, and Rabin's irreducibility test (Rabin 1980): a monic f of degree n is irreducible
//! over GF(p) iff x^(p^n) ≡ x (mod f) and gcd(x^(p^(n/r)) − x, f) = 1 for every prime r | n.
//!
//! Default modulus: the first monic irreducible polynomial of degree k in the order of its
//! integer representation Σ c_i p^i (coefficients compared from a^(k-1) down to a^0, each in
//! 0..p). For GF(2^8) that is a^8 + a^4 + a^3 + a + 1.

use crate::error::{Error, Result};
use crate::field::{Field, PrimeField};
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::Ring;

/// Dense polynomial over GF(p): coefficients low degree first, no trailing zeros (0 is empty).
pub(crate) type Dense = Vec<u64>;

/// A monic irreducible polynomial f over GF(p) of degree k ≥ 2, with arithmetic in GF(p)[a]/(f).
#[derive(Clone, Debug)]
pub struct Modulus {
    pub(crate) base: PrimeField,
    /// Coefficients c_0 .. c_k of f, c_k = 1.
    coeffs: Vec<u64>,
    /// Whether f is the default modulus of its field (then the spec omits it).
    is_default: bool,
}

impl PartialEq for Modulus {
    fn eq(&self, other: &Self) -> bool {
        self.base == other.base && self.coeffs == other.coeffs
    }
}

fn trim(mut v: Dense) -> Dense {
    while v.last() == Some(&0) {
        v.pop();
    }
    v
}

/// Prime divisors of n by trial division (n is a degree or a table size: small).
pub(crate) fn prime_divisors(mut n: u64) -> Vec<u64> {
    let mut out = Vec::new();
    let mut d = 2;
    while d * d <= n {
        if n % d == 0 {
            out.push(d);
            while n % d == 0 {
                n /= d;
            }
        }
        d += 1;
    }
    if n > 1 {
        out.push(n);
    }
    out
}

impl Modulus {
    /// f = Σ coeffs[i] a^i over GF(p); made monic. Errors if f has degree < 2 or is reducible.
    pub fn new(base: PrimeField, coeffs: Vec<u64>) -> Result<Self> {
        let p = base.modulus();
        let coeffs = trim(coeffs.into_iter().map(|c| c % p).collect());
        if coeffs.len() < 3 {
            return Err(Error::invalid(format!(
                "the modulus must have degree at least 2 (got degree {})",
                coeffs.len() as i64 - 1
            )));
        }
        let lead_inv = base.inv(coeffs.last().unwrap()).expect("nonzero");
        let coeffs = coeffs.iter().map(|c| base.mul(c, &lead_inv)).collect();
        let mut m = Modulus {
            base,
            coeffs,
            is_default: false,
        };
        if let Some(why) = m.reducibility_witness() {
            return Err(Error::invalid(format!(
                "the modulus {} is reducible over GF({p}){why}",
                m.text()
            )));
        }
        m.is_default = Modulus::first_irreducible(m.base.clone(), m.degree()).is_ok_and(|d| d == m);
        Ok(m)
    }

    /// The default modulus of GF(p^k) (see the module doc): the first irreducible.
    pub fn first_irreducible(base: PrimeField, k: u32) -> Result<Self> {
        if k < 2 {
            return Err(Error::invalid("an extension field needs degree k >= 2"));
        }
        let p = base.modulus();
        // Lower coefficients as base-p digits of a counter; density of irreducibles is ~1/k.
        let mut lower = vec![0u64; k as usize];
        loop {
            let mut coeffs = lower.clone();
            coeffs.push(1);
            let m = Modulus {
                base: base.clone(),
                coeffs,
                is_default: true,
            };
            if lower[0] != 0 && m.reducibility_witness().is_none() {
                return Ok(m);
            }
            // Count up the integer Σ c_i p^i: c_0 is the fastest digit.
            let mut i = 0;
            loop {
                lower[i] += 1;
                if lower[i] < p {
                    break;
                }
                lower[i] = 0;
                i += 1;
                if i == k as usize {
                    return Err(Error::invalid(format!(
                        "no irreducible polynomial of degree {k} over GF({p})"
                    )));
                }
            }
        }
    }

    /// The modulus written in `a` (e.g. `a^8+a^4+a^3+a+1`); its degree must be `k` if given.
    pub fn parse(base: PrimeField, k: Option<u32>, text: &str) -> Result<Self> {
        let ring = Ring::new(base.clone(), vec!["a".to_string()], MonomialOrder::Lex)?;
        let f = parse_poly(&ring, text).map_err(|e| match e {
            Error::Parse {
                message, column, ..
            } => Error::invalid(format!("modulus '{text}': column {column}: {message}")),
            other => other,
        })?;
        let degree = f.degree().unwrap_or(0) as usize;
        if let Some(k) = k {
            if degree != k as usize {
                return Err(Error::invalid(format!(
                    "modulus '{text}' has degree {degree}, but the field needs degree {k}"
                )));
            }
        }
        let mut coeffs = vec![0u64; degree + 1];
        for (m, c) in f.terms() {
            coeffs[m.exponents()[0] as usize] = *c;
        }
        Modulus::new(base, coeffs)
    }

    pub fn characteristic(&self) -> u64 {
        self.base.modulus()
    }
    pub fn degree(&self) -> u32 {
        self.coeffs.len() as u32 - 1
    }
    /// c_0 .. c_k, low degree first, monic.
    pub fn coefficients(&self) -> &[u64] {
        &self.coeffs
    }

    /// The modulus as text in `a`, highest degree first, coefficients in 0..p.
    pub fn text(&self) -> String {
        format_dense(&self.coeffs, "a")
    }

    /// None if irreducible; otherwise a short reason for the error message.
    fn reducibility_witness(&self) -> Option<String> {
        let n = self.degree() as u64;
        if self.coeffs[0] == 0 {
            return Some(" (a divides it)".into());
        }
        let p = self.characteristic();
        if p <= 1 << 16 {
            if let Some(r) = (1..p).find(|&r| self.eval(r) == 0) {
                return Some(format!(" (a = {r} is a root)"));
            }
        }
        let x: Dense = vec![0, 1];
        // frob[i] = x^(p^i) mod f.
        let mut frob = vec![x.clone()];
        for _ in 0..n {
            let next = self.pow_mod(frob.last().unwrap(), p);
            frob.push(next);
        }
        if frob[n as usize] != x {
            return Some(String::new());
        }
        for r in prime_divisors(n) {
            let h = self.sub(&frob[(n / r) as usize], &x);
            let g = self.gcd(&h, &self.coeffs);
            if g.len() > 1 {
                return Some(format!(" (it has a factor of degree dividing {})", n / r));
            }
        }
        None
    }

    fn eval(&self, r: u64) -> u64 {
        let b = &self.base;
        self.coeffs
            .iter()
            .rev()
            .fold(0, |acc, c| b.add(&b.mul(&acc, &r), c))
    }

    pub(crate) fn sub(&self, a: &[u64], b: &[u64]) -> Dense {
        let b_ = &self.base;
        let n = a.len().max(b.len());
        trim(
            (0..n)
                .map(|i| b_.sub(a.get(i).unwrap_or(&0), b.get(i).unwrap_or(&0)))
                .collect(),
        )
    }

    /// Product of two dense polynomials (no reduction).
    fn mul_full(&self, a: &[u64], b: &[u64]) -> Dense {
        if a.is_empty() || b.is_empty() {
            return Vec::new();
        }
        let f = &self.base;
        let mut out = vec![0u64; a.len() + b.len() - 1];
        for (i, x) in a.iter().enumerate() {
            if *x == 0 {
                continue;
            }
            for (j, y) in b.iter().enumerate() {
                out[i + j] = f.add(&out[i + j], &f.mul(x, y));
            }
        }
        trim(out)
    }

    /// Remainder of `a` by a polynomial `m` with invertible leading coefficient.
    fn rem(&self, mut a: Dense, m: &[u64]) -> Dense {
        let f = &self.base;
        let dm = m.len() - 1;
        let lead_inv = f
            .inv(m.last().unwrap())
            .expect("nonzero leading coefficient");
        while a.len() > dm {
            let top = a.len() - 1;
            let c = f.mul(&a[top], &lead_inv);
            if c != 0 {
                for (j, mj) in m.iter().enumerate() {
                    let k = top - dm + j;
                    a[k] = f.sub(&a[k], &f.mul(&c, mj));
                }
            }
            a.pop();
            a = trim(a);
        }
        a
    }

    /// a·b mod f, trimmed.
    pub(crate) fn mul_mod(&self, a: &[u64], b: &[u64]) -> Dense {
        self.rem(self.mul_full(a, b), &self.coeffs)
    }

    pub(crate) fn pow_mod(&self, a: &[u64], mut e: u64) -> Dense {
        let mut base = a.to_vec();
        let mut acc: Dense = vec![1];
        while e > 0 {
            if e & 1 == 1 {
                acc = self.mul_mod(&acc, &base);
            }
            e >>= 1;
            if e > 0 {
                base = self.mul_mod(&base, &base);
            }
        }
        acc
    }

    /// Monic gcd by Euclid's algorithm.
    fn gcd(&self, a: &[u64], b: &[u64]) -> Dense {
        let (mut r0, mut r1) = (trim(a.to_vec()), trim(b.to_vec()));
        while !r1.is_empty() {
            let r = self.rem(r0, &r1);
            r0 = r1;
            r1 = r;
        }
        r0
    }

    /// Inverse of a nonzero reduced `a` modulo f, by the extended Euclidean algorithm.
    pub(crate) fn inv_mod(&self, a: &[u64]) -> Option<Dense> {
        let f = &self.base;
        let a = trim(a.to_vec());
        if a.is_empty() {
            return None;
        }
        let (mut r0, mut r1) = (self.coeffs.clone(), a);
        let (mut t0, mut t1): (Dense, Dense) = (Vec::new(), vec![1]);
        while !r1.is_empty() {
            let (q, r) = self.divrem(&r0, &r1);
            let t = self.sub(&t0, &self.mul_full(&q, &t1));
            (r0, r1) = (r1, r);
            (t0, t1) = (t1, t);
        }
        // r0 is a nonzero constant because f is irreducible.
        let c = f.inv(&r0[0])?;
        Some(trim(t0.iter().map(|x| f.mul(x, &c)).collect()))
    }

    fn divrem(&self, a: &[u64], m: &[u64]) -> (Dense, Dense) {
        let f = &self.base;
        let mut r = a.to_vec();
        if r.len() < m.len() {
            return (Vec::new(), r);
        }
        let dm = m.len() - 1;
        let lead_inv = f.inv(m.last().unwrap()).expect("nonzero");
        let mut q = vec![0u64; r.len() - dm];
        while r.len() > dm {
            let top = r.len() - 1;
            let c = f.mul(&r[top], &lead_inv);
            q[top - dm] = c;
            for (j, mj) in m.iter().enumerate() {
                let k = top - dm + j;
                r[k] = f.sub(&r[k], &f.mul(&c, mj));
            }
            r.pop();
        }
        (trim(q), trim(r))
    }
}

/// Dense polynomial as text in `name`, highest degree first (`a^3 + 2*a + 1`, `0`).
pub(crate) fn format_dense(c: &[u64], name: &str) -> String {
    let mut parts = Vec::new();
    for (i, &ci) in c.iter().enumerate().rev() {
        if ci == 0 {
            continue;
        }
        let power = match i {
            0 => String::new(),
            1 => name.to_string(),
            _ => format!("{name}^{i}"),
        };
        parts.push(match (ci, i) {
            (_, 0) => ci.to_string(),
            (1, _) => power,
            _ => format!("{ci}*{power}"),
        });
    }
    if parts.is_empty() {
        "0".into()
    } else {
        parts.join(" + ")
    }
}

impl Modulus {
    /// q = p^k.
    pub fn order(&self) -> num_bigint::BigUint {
        num_bigint::BigUint::from(self.characteristic()).pow(self.degree())
    }

    /// Whether this is the default modulus of its field (so the spec can omit it).
    pub fn is_default(&self) -> bool {
        self.is_default
    }

    /// `GF(p^k)`, or `GF(p)[a]/(f)` when the modulus f is not the default one.
    pub fn spec(&self) -> String {
        let (p, k) = (self.characteristic(), self.degree());
        if self.is_default {
            format!("GF({p}^{k})")
        } else {
            format!("GF({p})[a]/({})", self.text())
        }
    }
}
