//! Hilbert series of R/I from the leading ideal of a Gröbner basis, by the pivot recursion of
//! Bigatti (1997, "Computation of Hilbert–Poincaré series"): for a monomial ideal M and a
//! monomial p not in M,
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
//! Coefficients are `i128`; overflow is reported as [`Error::Overflow`], never wrapped.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};

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

impl HilbertSeries {
    /// From the first numerator N(t) of H = N(t) / (1 - t)^n, cancelling factors (1 - t).
    pub fn from_first_numerator(mut numerator: Vec<i128>, n: usize, affine: bool) -> Result<Self> {
        trim(&mut numerator);
        let mut d = n as u32 + u32::from(affine);
        while d > 0 && !numerator.is_empty() && sum(&numerator)? == 0 {
            numerator = divide_by_one_minus_t(&numerator)?;
            d -= 1;
        }
        if numerator.is_empty() {
            d = 0;
        }
        Ok(HilbertSeries {
            numerator,
            denominator_exponent: d,
            affine,
        })
    }

    /// The degree (multiplicity) h(1): for a zero-dimensional ideal, dim_k R/I.
    pub fn degree(&self) -> Result<i128> {
        sum(&self.numerator)
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
        let (scaled, denom) = self.scaled_polynomial()?;
        Ok(scaled
            .into_iter()
            .map(|c| reduce_fraction(c, denom))
            .collect())
    }

    /// (d - 1)! · P(s) with integer coefficients, and (d - 1)!.
    fn scaled_polynomial(&self) -> Result<(Vec<i128>, i128)> {
        let d = self.denominator_exponent as i128;
        if d == 0 {
            return Ok((vec![], 1));
        }
        let mut total: Vec<i128> = vec![0; d as usize];
        for (i, &h) in self.numerator.iter().enumerate() {
            // ∏_{j=0}^{d-2} (s + d - 1 - i - j) = (d-1)! · C(s - i + d - 1, d - 1).
            let mut factor: Vec<i128> = vec![1];
            for j in 0..d - 1 {
                factor = times_linear(&factor, d - 1 - i as i128 - j)?;
            }
            for (k, c) in factor.iter().enumerate() {
                total[k] = c
                    .checked_mul(h)
                    .and_then(|v| v.checked_add(total[k]))
                    .ok_or_else(overflow)?;
            }
        }
        trim(&mut total);
        let factorial = (1..d)
            .try_fold(1i128, |a, b| a.checked_mul(b))
            .ok_or_else(overflow)?;
        Ok((total, factorial))
    }

    /// The least s0 ≥ 0 with HF(s) = P(s) for every s ≥ s0 (equality is certain from
    /// deg h - d + 1 on; below that, the values are compared).
    pub fn regularity_index(&self) -> Result<u64> {
        let d = self.denominator_exponent as i64;
        let last_possible = self.numerator.len() as i64 - 1 - d;
        if last_possible < 0 {
            return Ok(0);
        }
        let values = self.coefficients(last_possible as usize + 1)?;
        let (scaled, denom) = self.scaled_polynomial()?;
        for s in (0..=last_possible).rev() {
            let p = evaluate(&scaled, s as i128)?;
            if values[s as usize].checked_mul(denom).ok_or_else(overflow)? != p {
                return Ok(s as u64 + 1);
            }
        }
        Ok(0)
    }
}

fn trim(p: &mut Vec<i128>) {
    while p.last() == Some(&0) {
        p.pop();
    }
}

fn sum(p: &[i128]) -> Result<i128> {
    p.iter()
        .try_fold(0i128, |a, b| a.checked_add(*b))
        .ok_or_else(overflow)
}

fn evaluate(p: &[i128], s: i128) -> Result<i128> {
    p.iter()
        .rev()
        .try_fold(0i128, |acc, c| {
            acc.checked_mul(s).and_then(|v| v.checked_add(*c))
        })
        .ok_or_else(overflow)
}

/// p(s) · (s + a).
fn times_linear(p: &[i128], a: i128) -> Result<Vec<i128>> {
    let mut out = vec![0i128; p.len() + 1];
    for (k, c) in p.iter().enumerate() {
        out[k] = c
            .checked_mul(a)
            .and_then(|v| v.checked_add(out[k]))
            .ok_or_else(overflow)?;
        out[k + 1] = out[k + 1].checked_add(*c).ok_or_else(overflow)?;
    }
    Ok(out)
}

/// p / (1 - t) for p with p(1) = 0: the quotient's coefficients are the partial sums of p.
fn divide_by_one_minus_t(p: &[i128]) -> Result<Vec<i128>> {
    let mut out = Vec::with_capacity(p.len());
    let mut acc = 0i128;
    for c in &p[..p.len() - 1] {
        acc = acc.checked_add(*c).ok_or_else(overflow)?;
        out.push(acc);
    }
    trim(&mut out);
    Ok(out)
}

fn gcd(a: i128, b: i128) -> i128 {
    if b == 0 {
        a.abs()
    } else {
        gcd(b, a % b)
    }
}

fn reduce_fraction(num: i128, den: i128) -> (i128, i128) {
    let g = gcd(num, den).max(1);
    (num / g, den / g)
}

/// Dense polynomials in t for the recursion.
fn add_shifted(a: &mut Vec<i128>, b: &[i128], shift: usize) -> Result<()> {
    if a.len() < b.len() + shift {
        a.resize(b.len() + shift, 0);
    }
    for (k, c) in b.iter().enumerate() {
        a[k + shift] = a[k + shift].checked_add(*c).ok_or_else(overflow)?;
    }
    Ok(())
}

/// ∏ (1 - t^e) over the given degrees.
fn product_of_one_minus(degrees: impl Iterator<Item = u32>) -> Result<Vec<i128>> {
    let mut p = vec![1i128];
    for e in degrees {
        let shifted: Vec<i128> = p.iter().map(|c| -c).collect();
        add_shifted(&mut p, &shifted, e as usize)?;
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
fn first_numerator(gens: Gens, n: usize, control: &Control) -> Result<Vec<i128>> {
    control.check()?;
    if gens.iter().any(|m| m.iter().all(|&e| e == 0)) {
        return Ok(vec![]);
    }
    if pairwise_coprime(&gens, n) {
        return product_of_one_minus(gens.iter().map(|m| degree_of(m) as u32));
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
    add_shifted(&mut result, &colon_part, e as usize)?;
    trim(&mut result);
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
    let mut series = HilbertSeries::from_first_numerator(numerator, used.len(), affine)?;
    if !series.numerator.is_empty() {
        series.denominator_exponent += (n - used.len()) as u32;
    }
    Ok(series)
}

/// Hilbert series of R/I from a Gröbner basis of I. Homogeneous I: any order. Otherwise the
/// order must be degree-compatible and the result is the affine series.
pub fn series_of_basis<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Result<HilbertSeries> {
    let homogeneous = gb.polys.iter().all(Poly::is_homogeneous);
    if !homogeneous && !gb.ring.order.is_degree_compatible() {
        return Err(Error::invalid(
            "Hilbert series of a non-homogeneous ideal needs a basis in a degree-compatible order (grlex, grevlex)",
        ));
    }
    monomial_ideal_series(
        gb.ring.nvars(),
        &gb.leading_monomials(),
        !homogeneous,
        control,
    )
}

/// The order to use for the Hilbert series of the ideal generated by `gens`: the ring's own when
/// the generators are homogeneous or the order is degree-compatible, grevlex otherwise.
pub fn order_for_series<F: Field>(ring: &Ring<F>, gens: &[Poly<F>]) -> MonomialOrder {
    if ring.order.is_degree_compatible() || gens.iter().all(Poly::is_homogeneous) {
        ring.order.clone()
    } else {
        MonomialOrder::Grevlex
    }
}

/// Hilbert series of R/(gens): graded for homogeneous generators, affine otherwise.
pub fn hilbert_series<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    engine: Engine,
    control: &Control,
) -> Result<HilbertSeries> {
    let order = order_for_series(ring, gens);
    let r = ring.with_order(order)?;
    let gens: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
    let gb = groebner_basis(&r, &gens, engine, control)?;
    series_of_basis(&gb, control)
}

#[cfg(test)]
mod tests;
