//! Gröbner bases of Boolean systems: F4 (Faugère 1999) on square-free monomials, with the field
//! equations x_v^2 + x_v implicit.
//!
//! The result G is the reduced Gröbner basis of I + (x_v^2 + x_v) in GF(2)[x] with the field
//! equations left out: G together with them is a Gröbner basis, and every element of G is
//! square-free and reduced. The engine handles, degree by degree (the normal strategy), the
//! S-pairs of G that the Gebauer–Möller criteria keep and the products x_v·g for x_v in lm(g)
//! (the S-pairs with the field equations, see [`super::pairs`]); each step's matrix is built by
//! [`super::symbolic`] and reduced by [`super::linalg`] (Four Russians tables over rows packed 64
//! coefficients a word).

use super::linalg::{self, BitMatrix, Echelon, Work};
use super::monomial::{sum_of, Bits, BoolOrder};
use super::pairs::{PairKind, PairSet};
use super::symbolic::{normal_forms, Assembly, Matrix, Reducers};
use crate::control::Control;
use crate::error::Result;
use crate::groebner::{Stats, StepStats};
use std::time::Instant;

/// The reduced Boolean Gröbner basis of `gens` (polynomials as decreasing monomial lists) in
/// `nvars` variables: sorted by decreasing leading monomial; `[1]` for the unit ideal.
pub fn compute<const W: usize>(
    order: BoolOrder,
    nvars: usize,
    gens: &[Vec<Bits<W>>],
    control: &Control,
) -> Result<(Vec<Vec<Bits<W>>>, Stats)> {
    let mut run = Run {
        order,
        nvars,
        polys: Vec::new(),
        pairs: PairSet::default(),
        stats: Stats {
            engine: "boolean-f4".into(),
            ..Default::default()
        },
    };
    let start = Instant::now();
    let result = run.main(gens, control)?;
    run.stats.seconds = start.elapsed().as_secs_f64();
    Ok((result, run.stats))
}

struct Run<const W: usize> {
    order: BoolOrder,
    nvars: usize,
    polys: Vec<Vec<Bits<W>>>,
    pairs: PairSet<W>,
    stats: Stats,
}

impl<const W: usize> Run<W> {
    fn main(&mut self, gens: &[Vec<Bits<W>>], control: &Control) -> Result<Vec<Vec<Bits<W>>>> {
        // The generators, Gaussian-eliminated among themselves, make the first elements.
        let mut assembly = Assembly::default();
        for g in gens.iter().filter(|g| !g.is_empty()) {
            assembly.add_to_reduce(Bits::ONE, usize::MAX, g);
        }
        let first = self.step(assembly, 0, 0, control)?;
        if self.insert_all(first) {
            return Ok(vec![vec![Bits::ONE]]);
        }
        loop {
            control.check()?;
            let selected = self.pairs.take_lowest();
            let Some(degree) = selected.first().map(|p| p.degree) else {
                break;
            };
            let step = self.stats.steps.len();
            control.check_degree(degree, step)?;
            let mut assembly = Assembly::default();
            for pair in &selected {
                match pair.kind {
                    PairKind::Basis(i, j) => {
                        for e in [i, j] {
                            let u = pair.lcm.minus(&self.polys[e][0]);
                            assembly.add_with_lead(u, e, &self.polys[e], pair.lcm);
                        }
                    }
                    PairKind::Field(i, v) => {
                        assembly.add_to_reduce(Bits::var(v), i, &self.polys[i]);
                    }
                }
            }
            let new = self.step(assembly, degree, selected.len(), control)?;
            if self.insert_all(new) {
                return Ok(vec![vec![Bits::ONE]]);
            }
        }
        self.reduced_basis(control)
    }

    /// One matrix: preprocessing, reduction of the rows to reduce by the pivot rows, echelon
    /// form of the rest; returns the new polynomials (leading monomials no reducer divides).
    fn step(
        &mut self,
        mut assembly: Assembly<W>,
        degree: u32,
        pairs: usize,
        control: &Control,
    ) -> Result<Vec<Vec<Bits<W>>>> {
        let clock = Instant::now();
        let usable = self.pairs.active.clone();
        let reducers = Reducers::new(&self.polys, &usable, self.nvars);
        assembly.preprocess(&reducers, control)?;
        self.stats.reached(degree);
        let mut stats = StepStats {
            degree,
            pairs,
            rows: assembly.rows(),
            columns: assembly.columns(),
            nonzeros: assembly.nonzeros,
            ..Default::default()
        };
        let matrix = assembly.finish(self.order);
        stats.seconds_symbolic = clock.elapsed().as_secs_f64();
        let clock = Instant::now();
        let step = self.stats.steps.len();
        matrix.check_size(control, step)?;
        let mut work = Work(0);
        let columns = matrix.monomials.len();
        let x = linalg::pivot_tails(&matrix.pivots, columns, control, &mut work)?;
        let (echelon, reduced) = reduce_rows(&matrix, &x, control, &mut work)?;
        let rank = echelon.rank();
        let new: Vec<Vec<Bits<W>>> = (0..rank)
            .map(|i| matrix.tail_monomials(echelon.rows.row(i)))
            .collect();
        stats.seconds_linear_algebra = clock.elapsed().as_secs_f64();
        stats.multiply_adds = work.0;
        stats.new_elements = new.len();
        self.stats.zero_reductions += reduced - rank;
        self.stats.steps.push(stats);
        Ok(new)
    }

    /// Inserts new elements in decreasing order of leading monomial, so that an element whose
    /// leading monomial another one divides comes first and is retired by it (its pairs stay,
    /// as the criteria require). Returns true when 1 is among them.
    fn insert_all(&mut self, mut new: Vec<Vec<Bits<W>>>) -> bool {
        if new.iter().any(|p| p[0].is_one()) {
            return true;
        }
        new.sort_by(|a, b| self.order.cmp_bits(&b[0], &a[0]));
        for p in new {
            let lead = p[0];
            let field_degrees: Vec<(usize, u32)> = lead
                .vars()
                .filter_map(|v| field_product_degree(&p, v).map(|d| (v, d)))
                .collect();
            self.pairs.insert(lead, &field_degrees);
            self.polys.push(p);
        }
        false
    }

    /// The active elements (a minimal basis) with their tails brought to normal form.
    fn reduced_basis(&mut self, control: &Control) -> Result<Vec<Vec<Bits<W>>>> {
        let active: Vec<usize> = (0..self.polys.len())
            .filter(|&i| self.pairs.active[i])
            .collect();
        let tails: Vec<Vec<Bits<W>>> = active
            .iter()
            .map(|&i| self.polys[i][1..].to_vec())
            .collect();
        let reducers = Reducers::new(&self.polys, &self.pairs.active, self.nvars);
        let tails = normal_forms(&tails, &reducers, self.order, control)?;
        let mut basis: Vec<Vec<Bits<W>>> = active
            .iter()
            .zip(tails)
            .map(|(&i, tail)| {
                let mut p = vec![self.polys[i][0]];
                p.extend(tail);
                p
            })
            .collect();
        basis.sort_by(|a, b| self.order.cmp_bits(&b[0], &a[0]));
        Ok(basis)
    }
}

/// The echelon form of the reduce rows of `matrix` over its tail columns, each row reduced by
/// the pivots through their finished tails `x`, and how many rows went in. Rows go in by
/// batches and stop early when nothing more can come: when the echelon form has every tail
/// column (the other rows reduce to zero) or has the constant 1 (the ideal is the whole ring).
fn reduce_rows<const W: usize>(
    matrix: &Matrix<W>,
    x: &BitMatrix,
    control: &Control,
    work: &mut Work,
) -> Result<(Echelon, usize)> {
    let tail = matrix.tail_columns();
    let mut echelon = Echelon::new(tail);
    let one = (tail > 0 && matrix.monomials.last() == Some(&Bits::ONE)).then(|| tail - 1);
    let mut next = 0;
    while next < matrix.reduce.len() && echelon.rank() < tail {
        control.check()?;
        // Enough rows to fill the missing columns, with room for some that reduce to zero.
        let want = (tail - echelon.rank() + 64).max(256);
        let end = (next + want).min(matrix.reduce.len());
        let mut batch = BitMatrix::zeros(end - next, tail);
        for (i, row) in matrix.reduce[next..end].iter().enumerate() {
            linalg::add_tail(row, x, batch.row_mut(i), work);
        }
        echelon.add(batch, control, work)?;
        next = end;
        if one.is_some() && echelon.pivot_cols.last().copied() == one {
            break;
        }
    }
    Ok((echelon, next))
}

/// The degree of x_v·p (x·x = x), or `None` when the product adds nothing: it is p itself
/// (every monomial has x_v) or zero.
fn field_product_degree<const W: usize>(p: &[Bits<W>], v: usize) -> Option<u32> {
    if p.iter().all(|t| t.has_var(v)) {
        return None;
    }
    let x = Bits::var(v);
    let product = sum_of(BoolOrder::Lex, p.iter().map(|t| t.union(&x)).collect());
    product.iter().map(|m| m.degree()).max()
}
