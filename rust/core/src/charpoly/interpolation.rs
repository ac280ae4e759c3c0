//! The characteristic polynomial over k[T] by evaluation and interpolation: the matrix is
//! evaluated at the node points of a lower set of exponents, the scalar characteristic
//! polynomials come from [`super::krylov`], and each coefficient is interpolated by Newton's
//! divided differences along the lines of the set, axis after axis (multivariate Newton
//! interpolation on lower sets; Sauer 2006, Dyn and Floater 2014).

use super::bounds::{cycle_bound, Grid};
use super::krylov::{projection_vector, scalar_charpoly, Columns};
use crate::charpoly::scalars::{invert_all, Scalars, LANES};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::poly::{Poly, Ring};
use std::collections::HashMap;

pub(super) fn interpolate_in<S: Scalars>(
    s: &S,
    ring: &Ring<S::Base>,
    a: &[Vec<Poly<S::Base>>],
    grid: &Grid,
    control: &Control,
) -> Result<Vec<Poly<S::Base>>> {
    let (set, mean) = (&grid.set, grid.mean);
    let field = &ring.field;
    let r = a.len();
    let longest = set.exponents.iter().flatten().copied().max().unwrap_or(0);
    let nodes = Nodes::new(s, (0..=u64::from(longest)).map(|j| s.point(j)).collect());
    let entries = EntryTerms::new(s, a);
    let columns = Columns::new(r, |j, k| !a[j][k].is_zero());
    let projection = projection_vector(s, field, r);
    // values[k][g]: coefficient of x^k at the node point of the g-th exponent of the lower set.
    let mut values = vec![vec![s.zero(); set.exponents.len()]; r + 1];
    // The points in groups of LANES: their matrices share the nonzero pattern, so their Krylov
    // sequences are computed side by side.
    for first in (0..set.exponents.len()).step_by(LANES) {
        control.check()?;
        let group = first..(first + LANES).min(set.exponents.len());
        let matrices: Vec<Vec<Vec<S::E>>> = set.exponents[group.clone()]
            .iter()
            .map(|alpha| {
                let point: Vec<&S::E> = alpha.iter().map(|&j| &nodes.points[j as usize]).collect();
                entries.evaluate(s, &point)
            })
            .collect();
        let sequences = columns.sequences(s, &matrices, &projection);
        for ((g, matrix), sequence) in group.zip(matrices).zip(sequences) {
            for (k, c) in scalar_charpoly(s, matrix, &sequence)
                .into_iter()
                .enumerate()
            {
                values[k][g] = c;
            }
        }
    }
    let mut out = Vec::with_capacity(r + 1);
    for k in (0..=r).rev() {
        control.check()?;
        // The coefficient of x^k has total degree at most ⌊(r - k)·λ*⌋: its Newton coefficients
        // above that vanish, so the points up to that degree determine it.
        let degree = cycle_bound(mean, r - k);
        let coefficients = set.interpolate(s, &nodes, std::mem::take(&mut values[k]), degree);
        let terms = set
            .exponents
            .iter()
            .zip(coefficients)
            .filter(|(_, c)| !s.is_zero(c))
            .map(|(alpha, c)| {
                let c = s.export(&c).ok_or_else(|| {
                    Error::invalid(
                        "internal error: an interpolated coefficient lies outside the field",
                    )
                })?;
                Ok((crate::Monomial::from_exponents(alpha.clone())?, c))
            })
            .collect::<Result<Vec<_>>>()?;
        out.push(ring.from_terms(terms));
    }
    Ok(out)
}

/// The exponents α with α_i ≤ bound_i and |α| ≤ total: a lower set, on whose node points
/// (s_{α_1}, ..., s_{α_d}) a polynomial with exponents in the set is determined. Newton's form
/// N_α = Π_i (t_i - s_0)...(t_i - s_{α_i - 1}) makes the interpolation matrix a tensor product of
/// lower-triangular ones, so the coefficient at α only involves node points below α, all in
/// the set: one-variable divided differences along the lines of the set, axis after axis, are
/// exact (multivariate Newton interpolation on lower sets; Sauer 2006, Dyn and Floater 2014).
pub(super) struct LowerSet {
    exponents: Vec<Vec<u32>>,
    /// degrees[g]: the total degree |α| of exponents[g].
    degrees: Vec<u64>,
    /// lines[i]: the lines of the set along axis i, found once for all the coefficients.
    lines: Vec<Vec<Vec<usize>>>,
}

impl LowerSet {
    pub(super) fn new(bounds: &[u64], total: u64) -> Self {
        let mut exponents = Vec::new();
        let mut current = vec![0u32; bounds.len()];
        Self::enumerate(bounds, total, 0, &mut current, &mut exponents);
        let index: HashMap<Vec<u32>, usize> = exponents
            .iter()
            .enumerate()
            .map(|(g, e)| (e.clone(), g))
            .collect();
        let lines = (0..bounds.len())
            .map(|i| {
                exponents
                    .iter()
                    .filter(|e| e[i] == 0)
                    .map(|start| Self::line(&index, start, i))
                    .collect()
            })
            .collect();
        let degrees = exponents
            .iter()
            .map(|e| e.iter().map(|&x| u64::from(x)).sum())
            .collect();
        LowerSet {
            exponents,
            degrees,
            lines,
        }
    }

    fn enumerate(
        bounds: &[u64],
        left: u64,
        i: usize,
        current: &mut Vec<u32>,
        out: &mut Vec<Vec<u32>>,
    ) {
        if i == bounds.len() {
            out.push(current.clone());
            return;
        }
        for e in 0..=bounds[i].min(left) {
            current[i] = e as u32;
            Self::enumerate(bounds, left - e, i + 1, current, out);
        }
        current[i] = 0;
    }

    /// The points of the set on the line through `start` (whose i-th exponent is 0) along axis i.
    fn line(index: &HashMap<Vec<u32>, usize>, start: &[u32], i: usize) -> Vec<usize> {
        let mut alpha = start.to_vec();
        let mut line = Vec::new();
        while let Some(&g) = index.get(&alpha) {
            line.push(g);
            alpha[i] += 1;
        }
        line
    }

    /// Values at the node points -> coefficients of the monomials t^α, for a polynomial of
    /// total degree at most `degree`. Its Newton coefficients above that degree are zero, and
    /// the coefficient at α only involves points below α, so only the points with
    /// |α| <= `degree` are used: along each line, a prefix (|α| grows by one per step).
    fn interpolate<S: Scalars>(
        &self,
        s: &S,
        nodes: &Nodes<S>,
        mut values: Vec<S::E>,
        degree: u64,
    ) -> Vec<S::E> {
        for (value, &d) in values.iter_mut().zip(&self.degrees) {
            if d > degree {
                *value = s.zero();
            }
        }
        for pass in 0..2 {
            for lines in &self.lines {
                for line in lines {
                    let used = line
                        .iter()
                        .take_while(|&&g| self.degrees[g] <= degree)
                        .count();
                    let line = &line[..used];
                    let ys: Vec<S::E> = line.iter().map(|&g| values[g].clone()).collect();
                    let out = if pass == 0 {
                        divided_differences(s, nodes, &ys)
                    } else {
                        newton_to_monomial(s, &nodes.points[..line.len()], &ys)
                    };
                    for (&g, c) in line.iter().zip(out) {
                        values[g] = c;
                    }
                }
            }
        }
        values
    }
}

/// The matrix entries as lists of terms (index of a distinct monomial t^β, coefficient), converted
/// once: at a point each distinct monomial is evaluated once, and each entry costs one
/// multiply-add per term and no allocation.
struct EntryTerms<S: Scalars> {
    monomials: Vec<Vec<u32>>,
    rows: Vec<Vec<EntryTerm<S>>>,
}

/// One entry: (index into the distinct monomials, coefficient) for each of its terms.
type EntryTerm<S> = Vec<(usize, <S as Scalars>::E)>;

impl<S: Scalars> EntryTerms<S> {
    fn new(s: &S, a: &[Vec<Poly<S::Base>>]) -> Self {
        let mut index: HashMap<Vec<u32>, usize> = HashMap::new();
        let mut monomials = Vec::new();
        let rows = a
            .iter()
            .map(|row| {
                row.iter()
                    .map(|p| {
                        p.terms()
                            .iter()
                            .map(|(m, c)| {
                                let next = monomials.len();
                                let k = *index.entry(m.exponents().to_vec()).or_insert(next);
                                if k == next {
                                    monomials.push(m.exponents().to_vec());
                                }
                                (k, s.import(c))
                            })
                            .collect()
                    })
                    .collect()
            })
            .collect();
        EntryTerms { monomials, rows }
    }

    /// The scalar matrix at `point`.
    fn evaluate(&self, s: &S, point: &[&S::E]) -> Vec<Vec<S::E>> {
        let monomial_values: Vec<S::E> = self
            .monomials
            .iter()
            .map(|beta| {
                beta.iter().zip(point).fold(s.one(), |acc, (&e, x)| {
                    (0..e).fold(acc, |acc, _| s.mul(&acc, x))
                })
            })
            .collect();
        self.rows
            .iter()
            .map(|row| {
                row.iter()
                    .map(|terms| s.dot(terms.iter().map(|(k, c)| (c, &monomial_values[*k]))))
                    .collect()
            })
            .collect()
    }
}

/// The interpolation nodes s_0, s_1, ... and the inverses 1/(s_i - s_{i-level}) that divided
/// differences divide by, computed once for all the lines and coefficients they serve.
struct Nodes<S: Scalars> {
    points: Vec<S::E>,
    /// inverse_gaps[level][i] = 1/(s_i - s_{i-level}) for i >= level >= 1.
    inverse_gaps: Vec<Vec<S::E>>,
}

impl<S: Scalars> Nodes<S> {
    fn new(s: &S, points: Vec<S::E>) -> Self {
        let n = points.len();
        let gaps: Vec<S::E> = (1..n)
            .flat_map(|level| (level..n).map(move |i| (level, i)))
            .map(|(level, i)| s.sub(&points[i], &points[i - level]))
            .collect();
        let mut inverses = invert_all(s, &gaps)
            .expect("nodes are distinct")
            .into_iter();
        let inverse_gaps = (0..n)
            .map(|level| {
                (0..n)
                    .map(|i| match level {
                        0 => s.zero(),
                        _ if i < level => s.zero(),
                        _ => inverses.next().unwrap(),
                    })
                    .collect()
            })
            .collect();
        Nodes {
            points,
            inverse_gaps,
        }
    }
}

/// Newton coefficients of the polynomial of degree < len taking values `ys` at the first
/// len nodes (divided differences).
fn divided_differences<S: Scalars>(s: &S, nodes: &Nodes<S>, ys: &[S::E]) -> Vec<S::E> {
    let n = ys.len();
    let mut dd = ys.to_vec();
    for level in 1..n {
        for i in (level..n).rev() {
            let num = s.sub(&dd[i], &dd[i - 1]);
            dd[i] = s.mul(&num, &nodes.inverse_gaps[level][i]);
        }
    }
    dd
}

/// Monomial coefficients (low to high) of Σ dd_i (x - x_0)...(x - x_{i-1}), by Horner's rule.
fn newton_to_monomial<S: Scalars>(s: &S, xs: &[S::E], dd: &[S::E]) -> Vec<S::E> {
    let n = xs.len();
    let mut coeffs = vec![s.zero(); n];
    for i in (0..n).rev() {
        // coeffs := coeffs·(x - x_i) + dd[i]; the degree stays below n.
        for j in (0..n).rev() {
            let shifted = if j > 0 {
                coeffs[j - 1].clone()
            } else {
                s.zero()
            };
            coeffs[j] = s.mul_sub(&shifted, &coeffs[j], &xs[i]);
        }
        coeffs[0] = s.add(&coeffs[0], &dd[i]);
    }
    coeffs
}
