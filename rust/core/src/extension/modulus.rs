//! The defining polynomial of GF(p^k) = GF(p)[a]/(f): its irreducibility test, the default
//! choice of f, and arithmetic modulo f (on the dense polynomials of [`crate::univariate`]).
//!
//! Irreducibility by Rabin's test (Rabin 1980): a monic f of degree n is irreducible over GF(p)
//! iff x^(p^n) ≡ x (mod f) and gcd(x^(p^(n/r)) − x, f) = 1 for every prime r | n. The powers
//! x^(p^i) come one from the other by the Frobenius map h ↦ h^p, which over GF(p) is
//! h(x)^p = h(x^p): a spreading of the coefficients followed by one reduction modulo f, cheap
//! when f = x^n + g with g of low degree (every default modulus is of that form, see below).
//! Before the test, a candidate is divided by the monic irreducible polynomials of small degree
//! (those with p^d ≤ 256), which rejects most reducible candidates at once.
//!
//! Default modulus: the first monic irreducible polynomial of degree k in the order of its
//! integer representation Σ c_i p^i (coefficients compared from a^(k-1) down to a^0, each in
//! 0..p). For GF(2^8) that is a^8 + a^4 + a^3 + a + 1. Because the count runs up from the low
//! coefficients, the default modulus is always sparse: a^k + g(a) with g of small degree (for
//! GF(2^k), k ≤ 2000, deg g stays below 16 in practice; irreducibles of this form have density
//! about 1/k, so about k candidates are tried), and reductions modulo it cost O(k·deg g).

use super::squaring::BinarySquaring;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::primality::prime_divisors;
use crate::field::{Field, PrimeField};
use crate::univariate::{self, gcd::inverse_mod, Modulo, Univariate};

/// A dense polynomial over GF(p) (coefficients in 0..p, low degree first, no trailing zeros).
pub(crate) type Dense = Univariate<PrimeField>;

/// A monic irreducible polynomial f over GF(p) of degree k ≥ 2, with arithmetic in GF(p)[a]/(f).
#[derive(Clone, Debug)]
pub struct Modulus {
    pub(crate) base: PrimeField,
    /// Coefficients c_0 .. c_k of f, c_k = 1.
    coeffs: Vec<u64>,
    /// Whether f is the default modulus of its field (then the spec omits it).
    is_default: bool,
    /// The name of the generator a (a root of f) in texts: `a` unless the caller chose another.
    generator: String,
}

/// The generator's name when the caller gives none.
pub const DEFAULT_GENERATOR: &str = "a";

/// Two fields are the same when their moduli and generator names are: the name decides how
/// their elements read and print.
impl PartialEq for Modulus {
    fn eq(&self, other: &Self) -> bool {
        self.base == other.base && self.coeffs == other.coeffs && self.generator == other.generator
    }
}

impl Modulus {
    /// f = Σ coeffs[i] a^i over GF(p); made monic. Errors if f has degree < 2 or is reducible.
    pub fn new(base: PrimeField, coeffs: Vec<u64>) -> Result<Self> {
        Modulus::new_within(base, coeffs, &Control::new())
    }

    /// [`Modulus::new`], stopping with `Interrupted` when `control` says so.
    pub fn new_within(base: PrimeField, coeffs: Vec<u64>, control: &Control) -> Result<Self> {
        let p = base.modulus();
        let coeffs = univariate::trimmed(&base, coeffs.into_iter().map(|c| c % p).collect());
        if coeffs.len() < 3 {
            return Err(Error::invalid(format!(
                "the modulus must have degree at least 2 (got degree {})",
                coeffs.len() as i64 - 1
            )));
        }
        let coeffs = univariate::monic(&base, &coeffs);
        let mut m = Modulus {
            base,
            coeffs,
            is_default: false,
            generator: DEFAULT_GENERATOR.to_string(),
        };
        if let Some(why) = m.reducibility_witness(control)? {
            return Err(Error::invalid(format!(
                "the modulus {} is reducible over GF({p}){why}",
                m.text()
            )));
        }
        m.is_default = m.is_first_irreducible(control)?;
        Ok(m)
    }

    /// The default modulus of GF(p^k) (see the module doc): the first irreducible.
    pub fn first_irreducible(base: PrimeField, k: u32) -> Result<Self> {
        Modulus::first_irreducible_within(base, k, &Control::new())
    }

    /// [`Modulus::first_irreducible`], stopping with `Interrupted` when `control` says so (the
    /// search tests about k candidates, each by k Frobenius steps).
    pub fn first_irreducible_within(base: PrimeField, k: u32, control: &Control) -> Result<Self> {
        if k < 2 {
            return Err(Error::invalid("an extension field needs degree k >= 2"));
        }
        let sieve = SmallFactors::new(&base, k as usize);
        let mut candidates = Candidates::new(base.modulus(), k as usize);
        while let Some(lower) = candidates.next() {
            control.check()?;
            let mut coeffs = lower.to_vec();
            coeffs.push(1);
            let m = Modulus {
                base: base.clone(),
                coeffs,
                is_default: true,
                generator: DEFAULT_GENERATOR.to_string(),
            };
            if sieve.divides(&m) {
                continue;
            }
            if m.reducibility_witness(control)?.is_none() {
                return Ok(m);
            }
        }
        Err(Error::invalid(format!(
            "no irreducible polynomial of degree {k} over GF({})",
            base.modulus()
        )))
    }

    /// Whether f is the first irreducible of its degree, i.e. no candidate before it in the
    /// counting order is irreducible.
    fn is_first_irreducible(&self, control: &Control) -> Result<bool> {
        let first = Modulus::first_irreducible_within(self.base.clone(), self.degree(), control)?;
        Ok(first.coeffs == self.coeffs)
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

    /// The modulus as text in the generator, highest degree first, coefficients in 0..p.
    pub fn text(&self) -> String {
        format_dense(&self.coeffs, &self.generator)
    }

    /// The name of the generator in texts (`a` by default).
    pub fn generator(&self) -> &str {
        &self.generator
    }

    /// The same modulus with its generator called `name` (a plain identifier).
    pub fn with_generator(mut self, name: &str) -> Result<Self> {
        check_generator_name(name)?;
        self.generator = name.to_string();
        Ok(self)
    }

    /// None if irreducible; otherwise a short reason for the error message.
    fn reducibility_witness(&self, control: &Control) -> Result<Option<String>> {
        let f = &self.coeffs;
        let n = self.degree() as usize;
        if f[0] == 0 {
            return Ok(Some(" (a divides it)".into()));
        }
        let mut frobenius = Powers::new(self);
        let x: Dense = vec![0, 1];
        // powers[i] = x^(p^i) mod f, kept for i = n / r.
        let wanted: Vec<usize> = prime_divisors(n as u64)
            .into_iter()
            .map(|r| n / r as usize)
            .collect();
        let mut h = x.clone();
        let mut kept = Vec::new();
        for i in 1..=n {
            control.check()?;
            frobenius.step();
            if i == 1 || i == n || wanted.contains(&i) {
                h = frobenius.current();
            }
            if i == 1 {
                let roots =
                    univariate::gcd(&self.base, &univariate::subtract(&self.base, &h, &x), f);
                if roots.len() > 1 {
                    let root = univariate::roots(&self.base, &roots, control)?[0];
                    return Ok(Some(format!(" (a = {root} is a root)")));
                }
            }
            if wanted.contains(&i) {
                kept.push((i, h.clone()));
            }
        }
        if h != x {
            return Ok(Some(String::new()));
        }
        for (i, power) in kept {
            let g = univariate::gcd(&self.base, &univariate::subtract(&self.base, &power, &x), f);
            if g.len() > 1 {
                return Ok(Some(format!(" (it has a factor of degree dividing {i})")));
            }
        }
        Ok(None)
    }

    /// a·b mod f, trimmed.
    pub(crate) fn mul_mod(&self, a: &[u64], b: &[u64]) -> Dense {
        univariate::remainder(
            &self.base,
            &univariate::multiply(&self.base, a, b),
            &self.coeffs,
        )
    }

    /// a^e mod f.
    pub(crate) fn pow_mod(&self, a: &[u64], e: u64) -> Dense {
        Modulo::new(&self.base, &self.coeffs)
            .power(&self.mul_mod(a, &[1]), &[e], &Control::new())
            .expect("no limits and no interruption")
    }

    /// Inverse of a nonzero `a` modulo f (f is irreducible).
    pub(crate) fn inv_mod(&self, a: &[u64]) -> Option<Dense> {
        let a = univariate::trimmed(&self.base, a.to_vec());
        inverse_mod(&self.base, &a, &self.coeffs)
    }
}

/// h ↦ h^p mod f over GF(p): h(x)^p = h(x^p) spread out and reduced, when p is small; else by
/// repeated squaring.
struct Frobenius<'a> {
    modulus: &'a Modulus,
    modulo: Modulo<PrimeField>,
    /// The nonzero terms (j, c_j) of f − x^n, for the reduction x^n ≡ −(f − x^n).
    tail: Vec<(usize, u64)>,
}

/// Up to this characteristic the Frobenius map spreads coefficients instead of squaring.
const SPREAD_LIMIT: u64 = 64;

/// The powers x^(p^i) mod f one after the other: on packed bits in characteristic 2 when f is
/// sparse enough ([`BinarySquaring`]), else by [`Frobenius`] on dense coefficients.
enum Powers<'a> {
    Packed {
        squaring: BinarySquaring,
        bits: Vec<u64>,
    },
    Dense {
        frobenius: Frobenius<'a>,
        h: Dense,
    },
}

impl<'a> Powers<'a> {
    /// Starts at x.
    fn new(modulus: &'a Modulus) -> Self {
        let x: Dense = vec![0, 1];
        match BinarySquaring::new(&modulus.coeffs).filter(|_| modulus.characteristic() == 2) {
            Some(squaring) => Powers::Packed {
                bits: squaring.pack(&x),
                squaring,
            },
            None => Powers::Dense {
                frobenius: Frobenius::new(modulus),
                h: x,
            },
        }
    }

    /// x^(p^i) ↦ x^(p^(i+1)).
    fn step(&mut self) {
        match self {
            Powers::Packed { squaring, bits } => *bits = squaring.square(bits),
            Powers::Dense { frobenius, h } => *h = frobenius.apply(h),
        }
    }

    /// The current power, dense.
    fn current(&self) -> Dense {
        match self {
            Powers::Packed { squaring, bits } => squaring.unpack(bits),
            Powers::Dense { h, .. } => h.clone(),
        }
    }
}

impl<'a> Frobenius<'a> {
    fn new(modulus: &'a Modulus) -> Self {
        let n = modulus.degree() as usize;
        Frobenius {
            modulus,
            modulo: Modulo::new(&modulus.base, &modulus.coeffs),
            tail: (0..n)
                .filter(|&j| modulus.coeffs[j] != 0)
                .map(|j| (j, modulus.coeffs[j]))
                .collect(),
        }
    }

    fn apply(&self, h: &[u64]) -> Dense {
        let p = self.modulus.characteristic();
        if p > SPREAD_LIMIT || self.tail.len() * 4 > self.modulus.degree() as usize {
            return self
                .modulo
                .power(h, &[p], &Control::new())
                .expect("no limits and no interruption");
        }
        let mut spread = vec![0u64; (h.len().max(1) - 1) * p as usize + 1];
        for (i, &c) in h.iter().enumerate() {
            spread[i * p as usize] = c;
        }
        self.reduce_sparse(spread)
    }

    /// a mod f for f = x^n + tail, one top coefficient at a time: O((deg a − n)·|tail|).
    fn reduce_sparse(&self, mut a: Vec<u64>) -> Dense {
        let base = &self.modulus.base;
        let n = self.modulus.degree() as usize;
        for top in (n..a.len()).rev() {
            let c = a[top];
            if c == 0 {
                continue;
            }
            for &(j, t) in &self.tail {
                let k = top - n + j;
                a[k] = base.sub(&a[k], &base.mul(&c, &t));
            }
            a[top] = 0;
        }
        a.truncate(n);
        univariate::trimmed(base, a)
    }
}

/// The monic polynomials x^k + g in the counting order of the module doc, with g(0) ≠ 0.
struct Candidates {
    p: u64,
    lower: Vec<u64>,
    started: bool,
}

impl Candidates {
    fn new(p: u64, k: usize) -> Self {
        Candidates {
            p,
            lower: vec![0; k],
            started: false,
        }
    }

    /// The next lower coefficients c_0..c_(k−1) with c_0 ≠ 0, or None after the last.
    fn next(&mut self) -> Option<&[u64]> {
        loop {
            if self.started && !self.count_up() {
                return None;
            }
            self.started = true;
            if self.lower[0] != 0 {
                return Some(&self.lower);
            }
        }
    }

    /// Count up the integer Σ c_i p^i (c_0 is the fastest digit); false after the last.
    fn count_up(&mut self) -> bool {
        for digit in self.lower.iter_mut() {
            *digit += 1;
            if *digit < self.p {
                return true;
            }
            *digit = 0;
        }
        false
    }
}

/// The monic irreducible polynomials over GF(p) of degree d ≥ 1 with p^d ≤ 256 and 2d ≤ k,
/// for trial division of the default-modulus candidates.
struct SmallFactors {
    base: PrimeField,
    factors: Vec<Dense>,
}

/// Largest number of monic polynomials of one degree enumerated for trial division.
const SIEVE_SIZE: u64 = 256;

impl SmallFactors {
    fn new(base: &PrimeField, k: usize) -> Self {
        let p = base.modulus();
        let mut factors: Vec<Dense> = Vec::new();
        let mut d = 1;
        while 2 * d <= k && p.checked_pow(d as u32).is_some_and(|n| n <= SIEVE_SIZE) {
            for code in 0..p.pow(d as u32) {
                let mut g: Dense = (0..d).map(|i| code / p.pow(i as u32) % p).collect();
                g.push(1);
                let reducible = factors
                    .iter()
                    .any(|h| h.len() < g.len() && univariate::remainder(base, &g, h).is_empty());
                if !reducible {
                    factors.push(g);
                }
            }
            d += 1;
        }
        SmallFactors {
            base: base.clone(),
            factors,
        }
    }

    /// Whether one of the small irreducibles divides f = x^k + g: x^k mod h by repeated
    /// squaring modulo the small h, plus g mod h.
    fn divides(&self, f: &Modulus) -> bool {
        let k = f.degree() as u64;
        let lower = &f.coeffs[..k as usize];
        self.factors.iter().any(|h| {
            let modulo = Modulo::new(&self.base, h);
            let top = modulo
                .x_power(&[k], &Control::new())
                .expect("no limits and no interruption");
            let low = univariate::remainder(
                &self.base,
                &univariate::trimmed(&self.base, lower.to_vec()),
                h,
            );
            univariate::add(&self.base, &top, &low).is_empty()
        })
    }
}

/// A generator name must read as one name in polynomial texts.
pub(crate) fn check_generator_name(name: &str) -> Result<()> {
    let mut chars = name.chars();
    let starts_well = chars
        .next()
        .is_some_and(|c| c.is_ascii_alphabetic() || c == '_');
    if starts_well && chars.all(|c| c.is_ascii_alphanumeric() || c == '_') {
        Ok(())
    } else {
        Err(Error::invalid(format!(
            "the generator name '{name}' is not a name (letters, digits and _, not starting with a digit)"
        )))
    }
}

/// Dense polynomial as text in `name`, highest degree first (`a^3 + 2*a + 1`, `0`), with
/// coefficients in 0..p.
pub(crate) fn format_dense(c: &[u64], name: &str) -> String {
    univariate::format_terms(
        c.iter()
            .enumerate()
            .rev()
            .filter(|(_, &ci)| ci != 0)
            .map(|(i, ci)| (i, ci.to_string())),
        name,
    )
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
        if self.is_default && self.generator == DEFAULT_GENERATOR {
            format!("GF({p}^{k})")
        } else {
            format!("GF({p})[{}]/({})", self.generator, self.text())
        }
    }
}
