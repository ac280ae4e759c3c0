//! GF(q) for q = p^k ≤ 2^16 by logarithm tables: elements are stored as the integer
//! Σ c_i p^i of their coefficient vector (c_i of a^i), products and inverses go through
//! tables of discrete logarithms to a primitive element (the classical table method; Lidl and
//! Niederreiter, Finite Fields, 1983, ch. 9), sums are digit-wise (XOR in characteristic 2).

use super::modulus::{Dense, Modulus};
use crate::error::{Error, Result};
use crate::field::primality::prime_divisors;
use crate::field::Field;

#[derive(Clone, Debug)]
pub struct TableField {
    modulus: Modulus,
    p: u32,
    q: u32,
    /// exp[i] = g^i for 0 ≤ i < 2(q-1), so a product needs no reduction of the exponent sum.
    exp: Vec<u32>,
    /// log[x] for x ≠ 0 (log[0] unused).
    log: Vec<u32>,
}

impl PartialEq for TableField {
    fn eq(&self, other: &Self) -> bool {
        self.modulus == other.modulus
    }
}

/// Largest field size handled by tables.
pub const MAX_TABLE_ORDER: u64 = 1 << 16;

impl TableField {
    pub fn new(modulus: Modulus) -> Result<Self> {
        let q64 = u64::try_from(modulus.order()).unwrap_or(u64::MAX);
        if q64 > MAX_TABLE_ORDER {
            return Err(Error::invalid(format!(
                "table arithmetic needs q <= 2^16; {} has more elements",
                modulus.spec()
            )));
        }
        let (p, q) = (modulus.characteristic() as u32, q64 as u32);
        let mut f = TableField {
            modulus,
            p,
            q,
            exp: Vec::new(),
            log: vec![0; q as usize],
        };
        let g = f.primitive_element();
        let mut x: Dense = vec![1];
        f.exp = Vec::with_capacity(2 * (q as usize - 1));
        for i in 0..q - 1 {
            let code = f.encode(&x);
            f.exp.push(code);
            f.log[code as usize] = i;
            x = f.modulus.mul_mod(&x, &g);
        }
        let first_half = f.exp.clone();
        f.exp.extend(first_half);
        Ok(f)
    }

    pub fn modulus(&self) -> &Modulus {
        &self.modulus
    }

    /// Integer representation Σ c_i p^i.
    pub fn encode(&self, c: &[u64]) -> u32 {
        c.iter().rev().fold(0u32, |acc, &d| acc * self.p + d as u32)
    }
    /// Coefficient vector (length k) of an integer representation.
    pub fn decode(&self, mut x: u32) -> Vec<u64> {
        (0..self.modulus.degree())
            .map(|_| {
                let d = x % self.p;
                x /= self.p;
                d as u64
            })
            .collect()
    }

    /// The element of least integer representation whose order is q − 1.
    fn primitive_element(&self) -> Dense {
        let n = (self.q - 1) as u64;
        let factors = prime_divisors(n);
        (2..self.q)
            .map(|x| self.decode(x))
            .find(|g| {
                factors
                    .iter()
                    .all(|r| self.modulus.pow_mod(g, n / r) != vec![1])
            })
            .expect("a finite field has a primitive element")
    }

    fn digitwise(&self, mut a: u32, mut b: u32, op: impl Fn(u32, u32) -> u32) -> u32 {
        let (mut out, mut place) = (0, 1);
        while a > 0 || b > 0 {
            out += op(a % self.p, b % self.p) * place;
            a /= self.p;
            b /= self.p;
            place *= self.p;
        }
        out
    }
}

impl Field for TableField {
    type Elem = u32;

    fn zero(&self) -> u32 {
        0
    }
    fn one(&self) -> u32 {
        1
    }
    fn is_zero(&self, a: &u32) -> bool {
        *a == 0
    }
    fn add(&self, a: &u32, b: &u32) -> u32 {
        if self.p == 2 {
            return a ^ b;
        }
        let p = self.p;
        self.digitwise(*a, *b, |x, y| if x + y >= p { x + y - p } else { x + y })
    }
    fn sub(&self, a: &u32, b: &u32) -> u32 {
        if self.p == 2 {
            return a ^ b;
        }
        let p = self.p;
        self.digitwise(*a, *b, |x, y| if x >= y { x - y } else { x + p - y })
    }
    fn neg(&self, a: &u32) -> u32 {
        self.sub(&0, a)
    }
    fn mul(&self, a: &u32, b: &u32) -> u32 {
        if *a == 0 || *b == 0 {
            return 0;
        }
        self.exp[(self.log[*a as usize] + self.log[*b as usize]) as usize]
    }
    fn inv(&self, a: &u32) -> Option<u32> {
        (*a != 0).then(|| self.exp[((self.q - 1 - self.log[*a as usize]) % (self.q - 1)) as usize])
    }
    fn pow(&self, a: &u32, e: u64) -> u32 {
        if *a == 0 {
            return u32::from(e == 0);
        }
        let l = (self.log[*a as usize] as u64 * (e % (self.q as u64 - 1))) % (self.q as u64 - 1);
        self.exp[l as usize]
    }
    fn from_i64(&self, v: i64) -> u32 {
        v.rem_euclid(self.p as i64) as u32
    }
    fn from_decimal(&self, digits: &str) -> u32 {
        self.modulus.base.from_decimal(digits) as u32
    }
    fn characteristic(&self) -> String {
        self.p.to_string()
    }
    fn order(&self) -> Option<String> {
        Some(self.q.to_string())
    }
    fn degree(&self) -> u32 {
        self.modulus.degree()
    }
    fn spec(&self) -> String {
        self.modulus.spec()
    }
    fn format(&self, a: &u32) -> String {
        super::modulus::format_dense(&self.decode(*a), self.modulus.generator())
    }
    fn generator_name(&self) -> Option<&str> {
        Some(self.modulus.generator())
    }
    fn generator(&self) -> Option<u32> {
        Some(self.p)
    }
    fn element_from_index(&self, i: u64) -> u32 {
        (i % self.q as u64) as u32
    }
    fn size_hint(&self) -> f64 {
        self.q as f64
    }
    fn characteristic_u64(&self) -> Option<u64> {
        Some(self.p as u64)
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        Some(vec![self.q as u64])
    }
    /// In characteristic 2 the integer representation is the coordinate bits.
    fn binary_degree(&self) -> Option<u32> {
        (self.p == 2).then(|| self.modulus.degree())
    }
    fn to_binary_bits(&self, a: &u32) -> u64 {
        u64::from(*a)
    }
    fn from_binary_bits(&self, bits: u64) -> u32 {
        bits as u32
    }
    /// The inverse of Frobenius: a^(q/p), computed on the logarithm.
    fn pth_root(&self, a: &u32) -> Option<u32> {
        Some(self.pow(a, self.q as u64 / self.p as u64))
    }
}
