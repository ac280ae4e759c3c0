//! The characteristic polynomial det(x·Id - A) of a square matrix over a polynomial ring k[T].
//!
//! Two methods. When the field has more elements than the degree of the coefficients in each
//! t_i, by evaluation and interpolation: the coefficient of x^k is a polynomial in T whose degree
//! in t_i is at most the sum over rows of the largest t_i-degree in the row (each term of the
//! determinant takes one entry per row); evaluate A on a grid of that size, take the
//! characteristic polynomial of each scalar matrix as the minimal polynomial of a projected
//! Krylov sequence (Berlekamp–Massey) when that has full degree, else by reduction to Hessenberg form (Cohen, *A Course in Computational Algebraic Number Theory*,
//! 1993, Algorithm 2.2.9), and interpolate one variable at a time (Newton's divided differences).
//! Otherwise, by Berkowitz's division-free algorithm (Berkowitz 1984) directly over k[T], which
//! works in every characteristic, GF(2) included.

use super::scalars::{invert_all, Generic, Scalars, Words, LANES};
use super::zech::ZechExtension;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::poly::{Poly, Ring};
#[cfg(target_arch = "x86_64")]
use crate::vector_unit::VectorUnit;
use std::collections::HashMap;

/// Coefficients [1, c_{r-1}, ..., c_0] of det(x·Id - A) = x^r + c_{r-1} x^{r-1} + ... + c_0,
/// for an r × r matrix `a` (rows of equal length r) over `ring`.
pub fn characteristic_polynomial<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let Some(grid) = interpolation_grid(ring, a) else {
        return berkowitz(ring, a, control);
    };
    let points = grid.bounds.iter().max().map_or(1, |&b| b + 1);
    let q = crate::field::field_size(&ring.field).unwrap_or(u64::MAX);
    if points <= q {
        return by_interpolation(ring, a, &grid, control);
    }
    // Too few elements for the points: interpolate in an extension of the field.
    match ZechExtension::new(&ring.field, points, control)? {
        Some(large) => interpolate_in(&large, ring, a, &grid, control),
        None => berkowitz(ring, a, control),
    }
}

/// Largest number of values (grid points × coefficients) interpolation may hold.
const MAX_INTERPOLATION_VALUES: u64 = 20_000_000;

/// A cycle mean λ* as a fraction (numerator, denominator); `None` when the graph has no cycle.
type CycleMean = Option<(i64, i64)>;

/// The points that determine the coefficients: the lower set of exponents under the degree
/// bounds in each t_i and in total, and the largest cycle mean of the entries' total degrees
/// (the total degree of the coefficient of x^k is at most ⌊(r - k)·λ*⌋).
struct Grid {
    /// bounds[i]: the degree bound in t_i; interpolation needs bounds[i] + 1 distinct points.
    bounds: Vec<u64>,
    set: LowerSet,
    mean: CycleMean,
}

/// The interpolation grid, when it is small enough; `None` otherwise.
fn interpolation_grid<F: Field>(ring: &Ring<F>, a: &[Vec<Poly<F>>]) -> Option<Grid> {
    let d = ring.nvars();
    let r = a.len();
    let degree_in = |p: &Poly<F>, i: usize| {
        p.terms()
            .iter()
            .map(|(m, _)| u64::from(m.exponents()[i]))
            .max()
            .unwrap_or(0)
    };
    let total = |p: &Poly<F>| p.degree().map(u64::from);
    let total_mean = largest_cycle_mean(
        &a.iter()
            .map(|row| row.iter().map(total).collect())
            .collect::<Vec<_>>(),
    );
    let total_bound = cycle_bound(total_mean, r);
    let bounds: Vec<u64> = (0..d)
        .map(|i| {
            let rows: u64 = a
                .iter()
                .map(|row| row.iter().map(|p| degree_in(p, i)).max().unwrap_or(0))
                .sum();
            let cols: u64 = (0..r)
                .map(|k| a.iter().map(|row| degree_in(&row[k], i)).max().unwrap_or(0))
                .sum();
            let in_i = |p: &Poly<F>| (!p.is_zero()).then(|| degree_in(p, i));
            let cycles = cycle_bound(
                largest_cycle_mean(
                    &a.iter()
                        .map(|row| row.iter().map(in_i).collect())
                        .collect::<Vec<_>>(),
                ),
                r,
            );
            rows.min(cols).min(cycles).min(total_bound)
        })
        .collect();
    let points = bounds
        .iter()
        .try_fold(1u64, |acc, &b| acc.checked_mul(b + 1))?;
    (points.checked_mul(r as u64 + 1)? <= MAX_INTERPOLATION_VALUES).then(|| Grid {
        set: LowerSet::new(&bounds, total_bound),
        bounds,
        mean: total_mean,
    })
}

/// The largest mean degree λ* of a cycle, given the degree of each entry (`None` for a zero
/// entry): each term of the coefficient of x^{r-k} in det(x·Id - A) is a product of entries
/// along disjoint cycles through k indices, so its degree is at most ⌊k·λ*⌋ (see
/// [`cycle_bound`]). Karp's theorem (Karp 1978) computes λ* from the heaviest walks with
/// exactly j edges: λ* = max_v min_j (W_r(v) - W_j(v)) / (r - j).
fn largest_cycle_mean(degrees: &[Vec<Option<u64>>]) -> CycleMean {
    let r = degrees.len();
    // walks[j][v]: largest degree of a walk of exactly j edges ending at v (None: no walk).
    let mut walks: Vec<Vec<Option<i64>>> = vec![vec![Some(0); r]];
    for j in 1..=r {
        let next = (0..r)
            .map(|v| {
                (0..r)
                    .filter_map(|u| Some(walks[j - 1][u]? + degrees[u][v]? as i64))
                    .max()
            })
            .collect();
        walks.push(next);
    }
    // Largest over v of the smallest ratio, compared exactly as fractions (numerator, denominator).
    let mut best: Option<(i64, i64)> = None;
    #[allow(clippy::needless_range_loop)] // v indexes every walk length's row, not one slice
    for v in 0..r {
        let Some(last) = walks[r][v] else { continue };
        let ratio = (0..r)
            .filter_map(|j| walks[j][v].map(|w| (last - w, (r - j) as i64)))
            .min_by(|a, b| {
                (i128::from(a.0) * i128::from(b.1)).cmp(&(i128::from(b.0) * i128::from(a.1)))
            });
        if let Some(q) = ratio {
            if best.is_none_or(|b| {
                i128::from(q.0) * i128::from(b.1) > i128::from(b.0) * i128::from(q.1)
            }) {
                best = Some(q);
            }
        }
    }
    best
}

/// ⌊k·λ*⌋: the degree bound of the coefficient of x^{r-k}, k ≤ r (0 without cycles).
fn cycle_bound(mean: CycleMean, k: usize) -> u64 {
    mean.map_or(0, |(num, den)| {
        u64::try_from((k as i64 * num).div_euclid(den)).unwrap_or(0)
    })
}

/// Interpolation in machine words when the field is a word-size prime field, else in the
/// field's own arithmetic: the same loops either way.
fn by_interpolation<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    grid: &Grid,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    match Words::new(&ring.field) {
        Some(words) => interpolate_in(&words, ring, a, grid, control),
        None => interpolate_in(&Generic(&ring.field), ring, a, grid, control),
    }
}

fn interpolate_in<S: Scalars>(
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

/// A fixed pseudo-random vector of nonzero scalars, the same for every matrix: the projection
/// of the Krylov sequences. The result never depends on it, only how often the fallback runs.
fn projection_vector<S: Scalars>(s: &S, field: &S::Base, r: usize) -> Vec<S::E> {
    let mut rng = super::changes::Rng::new(PROJECTION_SEED);
    (0..r).map(|_| s.import(&rng.nonzero(field))).collect()
}

const PROJECTION_SEED: u64 = 0x5eed_c0ff_ee00;

/// The exponents α with α_i ≤ bound_i and |α| ≤ total: a lower set, on whose node points
/// (s_{α_1}, ..., s_{α_d}) a polynomial with exponents in the set is determined. Newton's form
/// N_α = Π_i (t_i - s_0)...(t_i - s_{α_i - 1}) makes the interpolation matrix a tensor product of
/// lower-triangular ones, so the coefficient at α only involves node points below α, all in
/// the set: one-variable divided differences along the lines of the set, axis after axis, are
/// exact (multivariate Newton interpolation on lower sets; Sauer 2006, Dyn and Floater 2014).
struct LowerSet {
    exponents: Vec<Vec<u32>>,
    /// degrees[g]: the total degree |α| of exponents[g].
    degrees: Vec<u64>,
    /// lines[i]: the lines of the set along axis i, found once for all the coefficients.
    lines: Vec<Vec<Vec<usize>>>,
}

impl LowerSet {
    fn new(bounds: &[u64], total: u64) -> Self {
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

/// det(x·Id - A) of a scalar matrix, coefficients low to high. First as the minimal
/// polynomial of the sequence u·w_k, w_k = (A^T)^k e_1, k < 2r, for the fixed vector
/// `projection` = u (`sequence`, from [`Columns::sequences`]): it divides det(x·Id - A), so
/// when its degree is r the two are equal (Wiedemann 1986: the minimal polynomial of a
/// projected Krylov sequence; Krylov 1931). The 2r products A^T·w run over the nonzero entries
/// only (a matrix of multiplication by an element on standard monomials has unit rows wherever
/// x·b is standard again), and Berlekamp–Massey then costs O(r^2) where solving for the
/// coefficients would cost O(r^3). When the degree is smaller (the matrix is not cyclic for
/// e_1, or u is unlucky), by Hessenberg reduction, which always works.
fn scalar_charpoly<S: Scalars>(s: &S, a: Vec<Vec<S::E>>, sequence: &[S::E]) -> Vec<S::E> {
    let r = a.len();
    let connection = berlekamp_massey(s, sequence);
    if connection.len() == r + 1 {
        connection.into_iter().rev().collect()
    } else {
        hessenberg_charpoly(s, a)
    }
}

/// The positions (j, k) of an r × r matrix A that may be nonzero, by column k: what row k of
/// A^T reads. Several matrices with this pattern run their products A^T·w side by side, one
/// per lane of [`Scalars::lanes_mul_add`].
struct Columns {
    /// Column k holds the rows rows[starts[k]..starts[k + 1]].
    starts: Vec<usize>,
    rows: Vec<usize>,
}

impl Columns {
    fn new(r: usize, nonzero: impl Fn(usize, usize) -> bool) -> Self {
        let mut starts = vec![0];
        let mut rows = Vec::new();
        for k in 0..r {
            rows.extend((0..r).filter(|&j| nonzero(j, k)));
            starts.push(rows.len());
        }
        Columns { starts, rows }
    }

    /// For each matrix (at most LANES of them, zero outside the pattern) the sequence
    /// u·(A^T)^k e_1, k < 2r. Picks the widest vector instructions the CPU has: the lane loops
    /// are the same code either way.
    fn sequences<S: Scalars>(
        &self,
        s: &S,
        matrices: &[Vec<Vec<S::E>>],
        u: &[S::E],
    ) -> Vec<Vec<S::E>> {
        #[cfg(target_arch = "x86_64")]
        match VectorUnit::detect() {
            // SAFETY: the CPU has the feature.
            VectorUnit::Avx512 => return unsafe { self.sequences_avx512(s, matrices, u) },
            VectorUnit::Avx2 => return unsafe { self.sequences_avx2(s, matrices, u) },
            VectorUnit::Baseline => {}
        }
        self.sequences_in_lanes(s, matrices, u)
    }

    /// `sequences_in_lanes` compiled for AVX2.
    ///
    /// # Safety
    /// The CPU supports AVX2.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    unsafe fn sequences_avx2<S: Scalars>(
        &self,
        s: &S,
        matrices: &[Vec<Vec<S::E>>],
        u: &[S::E],
    ) -> Vec<Vec<S::E>> {
        self.sequences_in_lanes(s, matrices, u)
    }

    /// `sequences_in_lanes` compiled for AVX-512.
    ///
    /// # Safety
    /// The CPU supports AVX-512F.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx512f")]
    unsafe fn sequences_avx512<S: Scalars>(
        &self,
        s: &S,
        matrices: &[Vec<Vec<S::E>>],
        u: &[S::E],
    ) -> Vec<Vec<S::E>> {
        self.sequences_in_lanes(s, matrices, u)
    }

    #[inline(always)]
    fn sequences_in_lanes<S: Scalars>(
        &self,
        s: &S,
        matrices: &[Vec<Vec<S::E>>],
        u: &[S::E],
    ) -> Vec<Vec<S::E>> {
        let r = self.starts.len() - 1;
        let count = matrices.len();
        assert!((1..=LANES).contains(&count), "1 to LANES matrices");
        // An entry in every lane, given the lane's matrix index; lanes past `count` repeat the
        // last matrix.
        let lanes = |entry: &dyn Fn(usize) -> S::E| -> [S::E; LANES] {
            std::array::from_fn(|l| entry(l.min(count - 1)))
        };
        let values: Vec<[S::E; LANES]> = (0..r)
            .flat_map(|k| {
                self.rows[self.starts[k]..self.starts[k + 1]]
                    .iter()
                    .map(move |&j| (j, k))
            })
            .map(|(j, k)| lanes(&|l| matrices[l][j][k].clone()))
            .collect();
        let projection: Vec<[S::E; LANES]> = u.iter().map(|x| lanes(&|_| x.clone())).collect();
        let mut w = vec![lanes(&|_| s.zero()); r];
        if r > 0 {
            w[0] = lanes(&|_| s.one());
        }
        let mut next = w.clone();
        let mut sequences = vec![Vec::with_capacity(2 * r); count];
        for k in 0..2 * r {
            let mut acc = s.lanes_zero();
            for (x, y) in projection.iter().zip(&w) {
                s.lanes_mul_add(&mut acc, x, y);
            }
            for (sequence, value) in sequences.iter_mut().zip(s.lanes_finish(&acc)) {
                sequence.push(value);
            }
            if k + 1 < 2 * r {
                for (out, column) in next.iter_mut().zip(self.starts.windows(2)) {
                    let mut acc = s.lanes_zero();
                    for t in column[0]..column[1] {
                        s.lanes_mul_add(&mut acc, &values[t], &w[self.rows[t]]);
                    }
                    *out = s.lanes_finish(&acc);
                }
                std::mem::swap(&mut w, &mut next);
            }
        }
        sequences
    }
}

/// The shortest recurrence s_n + c_1 s_{n-1} + ... + c_L s_{n-L} = 0 (n ≥ L) of the sequence,
/// as [1, c_1, ..., c_L] (Massey 1969). For a sequence whose minimal recurrence has length L,
/// 2L terms determine it. Without divisions in the loop: the update C := b·C - d·x^shift·B
/// (b the discrepancy B had) keeps a nonzero multiple of Massey's C, which changes neither the
/// discrepancies' zero tests nor the lengths; one inverse at the end makes the constant term 1.
/// An inverse costs as much as dozens of products, and the loop would need one per length change.
pub(crate) fn berlekamp_massey<S: Scalars>(s: &S, sequence: &[S::E]) -> Vec<S::E> {
    let mut current = vec![s.one()];
    // The recurrence before the last length change, its discrepancy, and how many terms ago
    // that was.
    let mut before = vec![s.one()];
    let mut before_discrepancy = s.one();
    let mut shift = 1;
    let mut length = 0;
    for n in 0..sequence.len() {
        // current[0] ≠ 0, and its entries past the length are zero: the discrepancy (up to
        // the factor current[0]) is Σ_i current[i]·s_{n-i}.
        let discrepancy = s.dot(current.iter().zip(sequence[..=n].iter().rev()));
        if s.is_zero(&discrepancy) {
            shift += 1;
            continue;
        }
        let grows = 2 * length <= n;
        let previous = if grows { Some(current.clone()) } else { None };
        if current.len() < before.len() + shift {
            current.resize(before.len() + shift, s.zero());
        }
        if before_discrepancy != s.one() {
            for c in current.iter_mut() {
                *c = s.mul(c, &before_discrepancy);
            }
        }
        for (i, b) in before.iter().enumerate() {
            current[i + shift] = s.mul_sub(&current[i + shift], &discrepancy, b);
        }
        match previous {
            Some(previous) => {
                length = n + 1 - length;
                before = previous;
                before_discrepancy = discrepancy;
                shift = 1;
            }
            None => shift += 1,
        }
    }
    current.resize(length + 1, s.zero());
    let scale = s
        .inv(&current[0])
        .expect("a product of nonzero discrepancies");
    current.iter().map(|c| s.mul(c, &scale)).collect()
}

/// det(x·Id - H) of a scalar matrix, coefficients low to high, by reduction to Hessenberg form
/// and the recurrence on its leading minors (Cohen 1993, Algorithm 2.2.9).
fn hessenberg_charpoly<S: Scalars>(s: &S, mut h: Vec<Vec<S::E>>) -> Vec<S::E> {
    let n = h.len();
    for m in 1..n.saturating_sub(1) {
        let Some(i) = (m..n).find(|&i| !s.is_zero(&h[i][m - 1])) else {
            continue;
        };
        if i != m {
            h.swap(i, m);
            for row in h.iter_mut() {
                row.swap(i, m);
            }
        }
        let pivot_inv = s.inv(&h[m][m - 1]).expect("nonzero pivot");
        for i in m + 1..n {
            let u = s.mul(&h[i][m - 1], &pivot_inv);
            if s.is_zero(&u) {
                continue;
            }
            let (upper, lower) = h.split_at_mut(i);
            for (target, source) in lower[0].iter_mut().zip(&upper[m]) {
                *target = s.mul_sub(target, &u, source);
            }
            for row in h.iter_mut() {
                row[m] = s.mul_add(&row[m], &u, &row[i]);
            }
        }
    }
    // p_0 = 1; p_m = (x - h_mm) p_{m-1} - Σ_{i=1}^{m-1} (h_{m,m-1} ... h_{m-i+1,m-i}) h_{m-i,m} p_{m-i-1}
    let mut p: Vec<Vec<S::E>> = vec![vec![s.one()]];
    for m in 1..=n {
        let prev = &p[m - 1];
        let mut next = vec![s.zero(); m + 1];
        for (j, c) in prev.iter().enumerate() {
            next[j + 1] = s.add(&next[j + 1], c);
            next[j] = s.mul_sub(&next[j], c, &h[m - 1][m - 1]);
        }
        let mut t = s.one();
        for i in 1..m {
            t = s.mul(&t, &h[m - i][m - i - 1]);
            let factor = s.mul(&t, &h[m - i - 1][m - 1]);
            if s.is_zero(&factor) {
                continue;
            }
            for (j, c) in p[m - i - 1].iter().enumerate() {
                next[j] = s.mul_sub(&next[j], &factor, c);
            }
        }
        p.push(next);
    }
    p.pop().unwrap()
}

/// Berkowitz's division-free algorithm over k[T].
fn berkowitz<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let mut coeffs = vec![ring.one()];
    for r in 0..a.len() {
        let toeplitz = toeplitz_column(ring, a, r, control)?;
        // Char. poly. of the leading (r+1)-minor = lower-triangular Toeplitz(toeplitz) · coeffs.
        let mut next = vec![Poly::zero(); r + 2];
        for (i, out) in next.iter_mut().enumerate() {
            for (j, c) in coeffs.iter().enumerate().take(i + 1) {
                if !c.is_zero() && !toeplitz[i - j].is_zero() {
                    *out = ring.add(out, &ring.mul(&toeplitz[i - j], c)?);
                }
            }
        }
        coeffs = next;
    }
    Ok(coeffs)
}

/// First column of Berkowitz's Toeplitz matrix for step r:
/// [1, -a_rr, -R·C, -R·A_r·C, ..., -R·A_r^{r-1}·C], with A_r the leading r × r block,
/// R = a[r][0..r] and C = a[0..r][r].
fn toeplitz_column<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    r: usize,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let mut column = vec![ring.one(), ring.neg(&a[r][r])];
    let mut w: Vec<Poly<F>> = (0..r).map(|i| a[i][r].clone()).collect();
    for k in 0..r {
        control.check()?;
        column.push(ring.neg(&dot(ring, &a[r][..r], &w)?));
        if k + 1 < r {
            w = (0..r)
                .map(|i| dot(ring, &a[i][..r], &w))
                .collect::<Result<_>>()?;
        }
    }
    Ok(column)
}

fn dot<F: Field>(ring: &Ring<F>, u: &[Poly<F>], v: &[Poly<F>]) -> Result<Poly<F>> {
    let mut acc = Poly::zero();
    for (x, y) in u.iter().zip(v) {
        if !x.is_zero() && !y.is_zero() {
            acc = ring.add(&acc, &ring.mul(x, y)?);
        }
    }
    Ok(acc)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;

    /// Both methods on the same random matrices: interpolation over GF(101) (in words and in the
    /// field's arithmetic), Berkowitz forced.
    #[test]
    fn interpolation_agrees_with_berkowitz() {
        let mut rng = crate::normalization::changes::Rng::new(9);
        for (nvars, size) in (1..=3).flat_map(|d| (0..6).map(move |s| (d, s))) {
            let names = ["s", "t", "u"][..nvars]
                .iter()
                .map(|v| v.to_string())
                .collect();
            let ring =
                Ring::new(PrimeField::new(101).unwrap(), names, MonomialOrder::Grevlex).unwrap();
            let a: Vec<Vec<Poly<PrimeField>>> = (0..size)
                .map(|_| {
                    (0..size)
                        .map(|_| {
                            let terms = (0..3).map(|_| {
                                let e = (0..nvars)
                                    .map(|i| (rng.next_u64() % (3 - i as u64 % 2)) as u32)
                                    .collect();
                                (
                                    crate::Monomial::from_exponents(e).unwrap(),
                                    rng.next_u64() % 101,
                                )
                            });
                            ring.from_terms(terms)
                        })
                        .collect()
                })
                .collect();
            let fast = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
            let grid = interpolation_grid(&ring, &a).unwrap();
            let expected = berkowitz(&ring, &a, &Control::new()).unwrap();
            assert_eq!(fast, expected, "{nvars} variables, size {size}");
            // The same interpolation in the field's own arithmetic, the path of every field
            // that is not a word-size prime field.
            let generic = interpolate_in(&Generic(&ring.field), &ring, &a, &grid, &Control::new());
            assert_eq!(generic.unwrap(), expected, "{nvars} variables, size {size}");
        }
    }

    /// A random r × r matrix over `ring` whose entries have up to three terms with exponents
    /// below `most` in each variable.
    fn random_polynomial_matrix<F: Field>(
        ring: &Ring<F>,
        rng: &mut crate::normalization::changes::Rng,
        size: usize,
        most: u64,
    ) -> Vec<Vec<Poly<F>>> {
        let q = crate::field::field_size(&ring.field).unwrap();
        (0..size)
            .map(|_| {
                (0..size)
                    .map(|_| {
                        let terms = (0..3).map(|_| {
                            let e = (0..ring.nvars())
                                .map(|_| (rng.next_u64() % most) as u32)
                                .collect();
                            let c = ring.field.element_from_index(rng.next_u64() % q);
                            (crate::Monomial::from_exponents(e).unwrap(), c)
                        });
                        ring.from_terms(terms)
                    })
                    .collect()
            })
            .collect()
    }

    /// Over fields with fewer elements than the degrees need as points (GF(2), GF(7), GF(4)),
    /// interpolation runs in an extension of the field and gives what Berkowitz's algorithm
    /// gives over the field itself, on random matrices whose degree bounds exceed the field.
    #[test]
    fn interpolation_in_an_extension_agrees_with_berkowitz() {
        fn agree<F: Field>(field: F, seed: u64) {
            let mut rng = crate::normalization::changes::Rng::new(seed);
            let q = crate::field::field_size(&field).unwrap();
            let mut extended = 0;
            for (nvars, size) in [(1, 3), (1, 6), (2, 4), (2, 6), (3, 3)] {
                let names = ["s", "t", "u"][..nvars]
                    .iter()
                    .map(|v| v.to_string())
                    .collect();
                let ring = Ring::new(field.clone(), names, MonomialOrder::Grevlex).unwrap();
                let a = random_polynomial_matrix(&ring, &mut rng, size, 4);
                let grid = interpolation_grid(&ring, &a).unwrap();
                if grid.bounds.iter().any(|&b| b >= q) {
                    extended += 1;
                }
                let expected = berkowitz(&ring, &a, &Control::new()).unwrap();
                let fast = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
                assert_eq!(
                    fast,
                    expected,
                    "{} {nvars} variables, size {size}",
                    field.spec()
                );
            }
            assert!(
                extended >= 3,
                "{}: the extension must be exercised",
                field.spec()
            );
        }
        agree(PrimeField::new(2).unwrap(), 1);
        agree(PrimeField::new(7).unwrap(), 2);
        let crate::field::AnyField::Table(gf4) = crate::field::AnyField::parse("GF(4)").unwrap()
        else {
            panic!("GF(4) is a table field")
        };
        agree(gf4, 3);
    }

    /// The sequence u·(A^T)^k e_1, k < 2r, of one matrix, through the lanes.
    fn sequence<S: Scalars>(s: &S, a: &[Vec<S::E>], u: &[S::E]) -> Vec<S::E> {
        let columns = Columns::new(a.len(), |j, k| !s.is_zero(&a[j][k]));
        columns.sequences(s, &[a.to_vec()], u).pop().unwrap()
    }

    /// det(x·Id - A) by the sequence when it has full degree, else by Hessenberg reduction.
    fn charpoly_of<S: Scalars>(s: &S, a: Vec<Vec<S::E>>, u: &[S::E]) -> Vec<S::E> {
        let sequence = sequence(s, &a, u);
        scalar_charpoly(s, a, &sequence)
    }

    /// det(x·Id - A) by the sequence alone: `None` when its minimal polynomial falls short.
    fn sequence_charpoly<S: Scalars>(s: &S, a: &[Vec<S::E>], u: &[S::E]) -> Option<Vec<S::E>> {
        let connection = berlekamp_massey(s, &sequence(s, a, u));
        (connection.len() == a.len() + 1).then(|| connection.into_iter().rev().collect())
    }

    /// The sequence shortcut agrees with Hessenberg reduction where it applies, and declines
    /// the matrices that are not cyclic for the first unit vector (a scalar matrix); both in the
    /// field's arithmetic and in machine words.
    #[test]
    fn sequence_agrees_with_hessenberg() {
        let field = PrimeField::new(101).unwrap();
        let generic = Generic(&field);
        let words = Words::new(&field).unwrap();
        let mut rng = crate::normalization::changes::Rng::new(4);
        let mut used = 0;
        for size in 1..9 {
            let u = projection_vector(&generic, &field, size);
            assert_eq!(u, projection_vector(&words, &field, size));
            for sparse in [false, true] {
                let a = random_matrix(&mut rng, size, 101, sparse);
                if let Some(k) = sequence_charpoly(&generic, &a, &u) {
                    assert_eq!(k, hessenberg_charpoly(&generic, a.clone()), "{a:?}");
                    assert_eq!(Some(k), sequence_charpoly(&words, &a, &u), "{a:?}");
                    used += 1;
                }
                let expected = hessenberg_charpoly(&generic, a.clone());
                assert_eq!(hessenberg_charpoly(&words, a.clone()), expected);
                assert_eq!(charpoly_of(&generic, a.clone(), &u), expected);
                assert_eq!(charpoly_of(&words, a, &u), expected);
            }
        }
        assert!(
            used > 8,
            "the shortcut should apply to most random matrices"
        );
        let scalar = vec![vec![3, 0], vec![0, 3]];
        let u = projection_vector(&generic, &field, 2);
        assert_eq!(sequence_charpoly(&generic, &scalar, &u), None);
        // (x - 3)^2 = x^2 - 6x + 9 over GF(101).
        assert_eq!(charpoly_of(&words, scalar.clone(), &u), vec![9, 95, 1]);
        assert_eq!(charpoly_of(&generic, scalar, &u), vec![9, 95, 1]);
    }

    /// Berlekamp–Massey finds the Fibonacci recurrence s_n - s_{n-1} - s_{n-2} = 0 from four
    /// terms, and a geometric sequence's s_n - 3·s_{n-1} = 0 (textbook facts), over GF(101);
    /// the all-zero sequence has the empty recurrence.
    #[test]
    fn berlekamp_massey_on_textbook_sequences() {
        let field = PrimeField::new(101).unwrap();
        let words = Words::new(&field).unwrap();
        assert_eq!(berlekamp_massey(&words, &[1, 1, 2, 3]), vec![1, 100, 100]);
        assert_eq!(
            berlekamp_massey(&words, &[0, 1, 1, 2, 3, 5, 8, 13]),
            vec![1, 100, 100]
        );
        assert_eq!(berlekamp_massey(&words, &[2, 6, 18, 54]), vec![1, 98]);
        assert_eq!(berlekamp_massey(&words, &[0, 0, 0]), vec![1]);
    }

    fn random_matrix(
        rng: &mut crate::normalization::changes::Rng,
        size: usize,
        p: u64,
        sparse: bool,
    ) -> Vec<Vec<u64>> {
        (0..size)
            .map(|_| {
                (0..size)
                    .map(|_| {
                        if sparse && !rng.next_u64().is_multiple_of(3) {
                            0
                        } else {
                            rng.next_u64() % p
                        }
                    })
                    .collect()
            })
            .collect()
    }

    /// Word arithmetic over GF(4294967291) (2^32 - 5, the largest prime below 2^32) gives the
    /// same characteristic polynomials as the field's own arithmetic on random 30 × 30 matrices,
    /// the size of the batch benchmark's multiplication matrices.
    #[test]
    fn words_agree_with_the_field_near_two_to_the_32() {
        let p = 4_294_967_291;
        let field = PrimeField::new(p).unwrap();
        let words = Words::new(&field).unwrap();
        let mut rng = crate::normalization::changes::Rng::new(17);
        for sparse in [false, true] {
            let a = random_matrix(&mut rng, 30, p, sparse);
            let expected = hessenberg_charpoly(&Generic(&field), a.clone());
            let u = projection_vector(&words, &field, 30);
            assert!(sequence_charpoly(&words, &a, &u).is_some());
            assert_eq!(charpoly_of(&words, a.clone(), &u), expected);
            assert_eq!(hessenberg_charpoly(&words, a), expected);
        }
    }

    /// A textbook example: [[2, 1], [1, 2]] has eigenvalues 1 and 3, so det(x·Id - A) =
    /// x^2 - 4x + 3 (Strang, *Linear Algebra and Its Applications*, §5.1); over GF(4294967291)
    /// that is [3, p - 4, 1]. And a triangular matrix has the product of (x - a_ii).
    #[test]
    fn textbook_characteristic_polynomials_in_words() {
        let p = 4_294_967_291;
        let field = PrimeField::new(p).unwrap();
        let words = Words::new(&field).unwrap();
        let u = projection_vector(&words, &field, 3);
        assert_eq!(
            charpoly_of(&words, vec![vec![2, 1], vec![1, 2]], &u[..2]),
            vec![3, p - 4, 1]
        );
        // (x - 1)(x - 2)(x - 5) = x^3 - 8x^2 + 17x - 10.
        let upper = vec![vec![1, 7, 9], vec![0, 2, 4], vec![0, 0, 5]];
        assert_eq!(charpoly_of(&words, upper, &u), vec![p - 10, 17, p - 8, 1]);
    }

    #[test]
    fn two_by_two_and_companion() {
        let ring = Ring::new(
            PrimeField::new(101).unwrap(),
            vec!["t".into()],
            MonomialOrder::Grevlex,
        )
        .unwrap();
        let p = |s: &str| parse_poly(&ring, s).unwrap();
        // det(x - [[a, b], [c, d]]) = x^2 - (a + d) x + (ad - bc).
        let a = vec![vec![p("t"), p("2")], vec![p("3"), p("t + 1")]];
        let cp = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
        assert_eq!(cp, vec![p("1"), p("-2*t - 1"), p("t^2 + t - 6")]);
        // The companion matrix of x^3 + t x + 5 has that characteristic polynomial (Lang, Algebra).
        let z = Poly::zero;
        let comp = vec![
            vec![z(), z(), p("-5")],
            vec![p("1"), z(), p("-t")],
            vec![z(), p("1"), z()],
        ];
        let cp = characteristic_polynomial(&ring, &comp, &Control::new()).unwrap();
        assert_eq!(cp, vec![p("1"), z(), p("t"), p("5")]);
    }
}
