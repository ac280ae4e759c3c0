//! Hilbert series of R/M for a monomial ideal M (the leading ideal of a Gröbner basis), by the
//! pivot recursion of Bigatti (1997, "Computation of Hilbert–Poincaré series"): for a monomial
//! ideal M and a monomial p not in M,
//!
//! ```text
//!     N(M) = N(M + (p)) + t^deg(p) · N(M : p),      H(R/M) = N(M) / (1 - t)^n,
//! ```
//!
//! with the pivot p a power of the variable that occurs in the most generators (exponent: the
//! median of its exponents), and the closed form N(M) = ∏ (1 - t^deg m) when the generators are
//! pairwise coprime. Both branches shrink the ideal, and the median pivot halves the generators
//! involving that variable, which keeps leading ideals with thousands of generators fast.
//!
//! R/I and R/in(I) have the same Hilbert function for homogeneous I and any order (Macaulay
//! 1927); for non-homogeneous I a degree-compatible order gives the *affine* Hilbert function
//! s ↦ dim_k R_{≤s}/I_{≤s}, whose series is H(R/in(I)) / (1 - t) (Cox, Little, O'Shea 1992, §9.3).
//! The recursion and the cancellation of factors (1 - t) run on big integers, since the first
//! numerator of an ideal in many variables has binomial coefficients far beyond any machine
//! word ((1 - t)^132 for 132 linear forms) while the reduced series is small; the results are
//! `i128`, and a result beyond that range is reported as [`Error::Overflow`], never wrapped.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::monomial::Monomial;
use num_bigint::BigInt;
use num_traits::{One, ToPrimitive, Zero};

fn overflow() -> Error {
    Error::Overflow("Hilbert series: a coefficient exceeds the 128-bit integer range".into())
}

/// The Hilbert series h(t) / (1 - t)^d of R/I, with h(1) ≠ 0 (unless I is the unit ideal,
/// where the series is 0: empty numerator, d = 0).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct HilbertSeries {
    /// Coefficients of h(t), the coefficient of t^i at index i.
    pub numerator: Vec<i128>,
    pub denominator_exponent: u32,
    /// Whether this is the series of the affine Hilbert function (non-homogeneous ideal).
    pub affine: bool,
}

/// A first numerator N(t) of H = N(t) / (1 - t)^n, coefficient of t^i at index i.
pub(crate) type BigNumerator = Vec<BigInt>;

impl HilbertSeries {
    /// From the first numerator N(t) of H = N(t) / (1 - t)^n, cancelling factors (1 - t).
    pub fn from_first_numerator(numerator: Vec<i128>, n: usize, affine: bool) -> Result<Self> {
        Self::from_big_numerator(numerator.into_iter().map(BigInt::from).collect(), n, affine)
    }

    pub(crate) fn from_big_numerator(
        mut numerator: BigNumerator,
        n: usize,
        affine: bool,
    ) -> Result<Self> {
        trim_big(&mut numerator);
        let mut d = n as u32 + u32::from(affine);
        while d > 0 && !numerator.is_empty() && numerator.iter().sum::<BigInt>().is_zero() {
            numerator = divide_by_one_minus_t(&numerator);
            d -= 1;
        }
        if numerator.is_empty() {
            d = 0;
        }
        let numerator = numerator
            .iter()
            .map(|c| c.to_i128().ok_or_else(overflow))
            .collect::<Result<Vec<_>>>()?;
        Ok(HilbertSeries {
            numerator,
            denominator_exponent: d,
            affine,
        })
    }

    /// Whether this is the series of the graded Hilbert function s ↦ dim_k (R/I)_s (homogeneous
    /// ideal); otherwise it is the affine one, s ↦ dim_k R_{≤s}/I_{≤s}. A point shows the
    /// difference: (x, y) has the graded series 1, (x - 1, y) the affine series 1/(1 - t).
    pub fn graded(&self) -> bool {
        !self.affine
    }

    /// The degree (multiplicity) h(1): for a zero-dimensional ideal, dim_k R/I.
    pub fn degree(&self) -> Result<i128> {
        self.numerator
            .iter()
            .try_fold(0i128, |a, b| a.checked_add(*b))
            .ok_or_else(overflow)
    }

    /// Krull dimension of R/I: d for a graded series, d - 1 for an affine one; -1 for the unit
    /// ideal.
    pub fn dimension(&self) -> i64 {
        if self.numerator.is_empty() {
            -1
        } else {
            i64::from(self.denominator_exponent) - i64::from(self.affine)
        }
    }

    /// The first `count` values of the Hilbert function (coefficients of the series).
    pub fn coefficients(&self, count: usize) -> Result<Vec<i128>> {
        let mut c: Vec<i128> = (0..count)
            .map(|i| self.numerator.get(i).copied().unwrap_or(0))
            .collect();
        for _ in 0..self.denominator_exponent {
            for i in 1..count {
                c[i] = c[i].checked_add(c[i - 1]).ok_or_else(overflow)?;
            }
        }
        Ok(c)
    }

    /// The Hilbert polynomial P(s) = Σ_i h_i · C(s - i + d - 1, d - 1) as reduced fractions
    /// (numerator, denominator), the coefficient of s^j at index j; empty when P = 0.
    pub fn polynomial(&self) -> Result<Vec<(i128, i128)>> {
        let (scaled, denom) = self.scaled_polynomial();
        scaled
            .into_iter()
            .map(|c| {
                let g = num_integer::Integer::gcd(&c, &denom).max(BigInt::one());
                let (num, den) = (&c / &g, &denom / &g);
                Ok((
                    num.to_i128().ok_or_else(overflow)?,
                    den.to_i128().ok_or_else(overflow)?,
                ))
            })
            .collect()
    }

    /// (d - 1)! · P(s) with integer coefficients, and (d - 1)!.
    fn scaled_polynomial(&self) -> (Vec<BigInt>, BigInt) {
        let d = i64::from(self.denominator_exponent);
        if d == 0 {
            return (vec![], BigInt::one());
        }
        let mut total: Vec<BigInt> = vec![BigInt::zero(); d as usize];
        for (i, &h) in self.numerator.iter().enumerate() {
            // ∏_{j=0}^{d-2} (s + d - 1 - i - j) = (d-1)! · C(s - i + d - 1, d - 1).
            let mut factor: Vec<BigInt> = vec![BigInt::one()];
            for j in 0..d - 1 {
                factor = times_linear(&factor, d - 1 - i as i64 - j);
            }
            for (k, c) in factor.iter().enumerate() {
                total[k] += c * h;
            }
        }
        trim_big(&mut total);
        let factorial = (1..d).map(BigInt::from).product();
        (total, factorial)
    }

    /// The least s0 ≥ 0 with HF(s) = P(s) for every s ≥ s0 (equality is certain from
    /// deg h - d + 1 on; below that, the values are compared).
    pub fn regularity_index(&self) -> Result<u64> {
        let d = self.denominator_exponent as i64;
        let last_possible = self.numerator.len() as i64 - 1 - d;
        if last_possible < 0 {
            return Ok(0);
        }
        let values = self.big_coefficients(last_possible as usize + 1);
        let (scaled, denom) = self.scaled_polynomial();
        for s in (0..=last_possible).rev() {
            let p = scaled
                .iter()
                .rev()
                .fold(BigInt::zero(), |acc, c| acc * s + c);
            if &values[s as usize] * &denom != p {
                return Ok(s as u64 + 1);
            }
        }
        Ok(0)
    }

    /// The first `count` values of the Hilbert function as big integers.
    fn big_coefficients(&self, count: usize) -> Vec<BigInt> {
        let mut c: Vec<BigInt> = (0..count)
            .map(|i| BigInt::from(self.numerator.get(i).copied().unwrap_or(0)))
            .collect();
        for _ in 0..self.denominator_exponent {
            for i in 1..count {
                let previous = c[i - 1].clone();
                c[i] += previous;
            }
        }
        c
    }
}

fn trim_big(p: &mut Vec<BigInt>) {
    while p.last().is_some_and(|c| c.is_zero()) {
        p.pop();
    }
}

/// p(s) · (s + a).
fn times_linear(p: &[BigInt], a: i64) -> Vec<BigInt> {
    let mut out = vec![BigInt::zero(); p.len() + 1];
    for (k, c) in p.iter().enumerate() {
        out[k] += c * a;
        out[k + 1] += c;
    }
    out
}

/// p / (1 - t) for p with p(1) = 0: the quotient's coefficients are the partial sums of p.
fn divide_by_one_minus_t(p: &[BigInt]) -> Vec<BigInt> {
    let mut out = Vec::with_capacity(p.len());
    let mut acc = BigInt::zero();
    for c in &p[..p.len() - 1] {
        acc += c;
        out.push(acc.clone());
    }
    trim_big(&mut out);
    out
}

/// a += t^shift · b, growing `a` as needed (within the memory budget).
fn add_shifted(a: &mut BigNumerator, b: &[BigInt], shift: usize, control: &Control) -> Result<()> {
    let len = b.len().saturating_add(shift);
    if a.len() < len {
        reserve_numerator(a, len, control)?;
        a.resize(len, BigInt::zero());
    }
    for (k, c) in b.iter().enumerate() {
        if !c.is_zero() {
            a[k + shift] += c;
        }
    }
    Ok(())
}

/// Room for a dense numerator of `len` coefficients: its degree comes from the input's
/// exponents (x^4294967295 gives one of 2^32 coefficients), so it is announced first.
fn reserve_numerator(a: &mut BigNumerator, len: usize, control: &Control) -> Result<()> {
    let what = format!("a Hilbert series numerator of degree {}", len - 1);
    let bytes = (len as u64).saturating_mul(std::mem::size_of::<BigInt>() as u64);
    control.check_memory(bytes, &what)?;
    a.try_reserve_exact(len - a.len()).map_err(|_| {
        Error::ResourceLimit(format!(
            "out of memory: {what} needs about {}",
            crate::control::format_bytes(bytes)
        ))
    })
}

/// ∏ (1 - t^e) over the given degrees.
pub(crate) fn product_of_one_minus(
    degrees: impl Iterator<Item = u32>,
    control: &Control,
) -> Result<BigNumerator> {
    let mut p = vec![BigInt::one()];
    for e in degrees {
        control.check()?;
        let shifted: Vec<BigInt> = p.iter().map(|c| -c).collect();
        add_shifted(&mut p, &shifted, e as usize, control)?;
    }
    Ok(p)
}

/// Generators of a monomial ideal as exponent vectors.
type Gens = Vec<Vec<u32>>;

fn degree_of(m: &[u32]) -> u64 {
    m.iter().map(|&e| e as u64).sum()
}

fn divides(a: &[u32], b: &[u32]) -> bool {
    a.iter().zip(b).all(|(x, y)| x <= y)
}

/// Minimal generators: sorted by degree, each kept only if no kept one divides it.
fn minimalize(mut gens: Gens) -> Gens {
    gens.sort_by_key(|m| degree_of(m));
    gens.dedup();
    let mut kept: Gens = Vec::with_capacity(gens.len());
    for m in gens {
        if !kept.iter().any(|k| divides(k, &m)) {
            kept.push(m);
        }
    }
    kept
}

/// Whether no variable occurs in two generators.
fn pairwise_coprime(gens: &Gens, n: usize) -> bool {
    let mut used = vec![false; n];
    for m in gens {
        for (i, &e) in m.iter().enumerate() {
            if e > 0 {
                if used[i] {
                    return false;
                }
                used[i] = true;
            }
        }
    }
    true
}

/// The pivot x_i^e: i the variable occurring in the most generators, e the median of its
/// positive exponents. With minimal generators some generator has exponent ≥ e in x_i without
/// being x_i^a, so x_i^e is not in the ideal and both branches are smaller.
fn choose_pivot(gens: &Gens, n: usize) -> (usize, u32) {
    let mut counts = vec![0usize; n];
    for m in gens {
        for (i, &e) in m.iter().enumerate() {
            counts[i] += usize::from(e > 0);
        }
    }
    let var = (0..n).max_by_key(|&i| counts[i]).expect("some variable");
    let mut exps: Vec<u32> = gens.iter().map(|m| m[var]).filter(|&e| e > 0).collect();
    exps.sort_unstable();
    (var, exps[(exps.len() - 1) / 2])
}

/// First numerator N(t) of the Hilbert series of R/M, M generated by `gens` (minimal).
fn first_numerator(gens: Gens, n: usize, control: &Control) -> Result<BigNumerator> {
    control.check()?;
    if gens.iter().any(|m| m.iter().all(|&e| e == 0)) {
        return Ok(vec![]);
    }
    if pairwise_coprime(&gens, n) {
        return product_of_one_minus(gens.iter().map(|m| degree_of(m) as u32), control);
    }
    let (var, e) = choose_pivot(&gens, n);
    let colon: Gens = gens
        .iter()
        .map(|m| {
            let mut q = m.clone();
            q[var] = q[var].saturating_sub(e);
            q
        })
        .collect();
    let mut sum_ideal: Gens = gens.into_iter().filter(|m| m[var] < e).collect();
    let mut pivot = vec![0; n];
    pivot[var] = e;
    sum_ideal.push(pivot);
    let mut result = first_numerator(sum_ideal, n, control)?;
    let colon_part = first_numerator(minimalize(colon), n, control)?;
    add_shifted(&mut result, &colon_part, e as usize, control)?;
    trim_big(&mut result);
    Ok(result)
}

/// Hilbert series of R/M for the monomial ideal M generated by `leads` in `n` variables
/// (graded; `affine` divides once more by 1 - t for the affine Hilbert function).
pub fn monomial_ideal_series(
    n: usize,
    leads: &[Monomial],
    affine: bool,
    control: &Control,
) -> Result<HilbertSeries> {
    let gens = minimalize(leads.iter().map(|m| m.exponents().to_vec()).collect());
    // Fewer variables where possible: a variable in no generator only multiplies by 1/(1-t).
    let used: Vec<usize> = (0..n).filter(|&i| gens.iter().any(|m| m[i] > 0)).collect();
    let gens: Gens = gens
        .into_iter()
        .map(|m| used.iter().map(|&i| m[i]).collect())
        .collect();
    let numerator = first_numerator(gens, used.len(), control)?;
    let mut series = HilbertSeries::from_big_numerator(numerator, used.len(), affine)?;
    if !series.numerator.is_empty() {
        series.denominator_exponent += (n - used.len()) as u32;
    }
    Ok(series)
}
