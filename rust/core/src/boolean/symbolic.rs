//! Symbolic preprocessing of the Boolean F4 engine (Faugère 1999): the rows of one step's
//! matrix, and the same machinery for normal forms of many polynomials at once.
//!
//! Rows are Boolean products u·g (x·x = x) of basis elements by monomials. When u shares no
//! variable with lm(g), u·g has leading monomial u ∪ lm(g) and every other monomial below it
//! (each u ∪ t is the reduction of u·t, which is below u·lm(g), by the field equations, which
//! only lower monomials): so every monomial divisible by a leading monomial gets one pivot row
//! with exactly that leading monomial. The matrix is then laid out in the block form of Faugère
//! and Lachartre (2010): pivot columns first (so pivot i leads column i), the other columns
//! after, both in decreasing order.

use super::linalg::{self, Work};
use super::monomial::{Bits, BoolOrder, WordMap};
use crate::control::Control;
use crate::error::{Error, Result};

/// Basis elements usable as reducers, indexed by one variable of their leading monomial so
/// that finding a divisor of t looks only at elements filed under t's variables.
pub struct Reducers<'a, const W: usize> {
    polys: &'a [Vec<Bits<W>>],
    by_var: Vec<Vec<u32>>,
}

impl<'a, const W: usize> Reducers<'a, W> {
    /// The elements `polys[i]` with `usable[i]` (none may be the constant 1).
    pub fn new(polys: &'a [Vec<Bits<W>>], usable: &[bool], nvars: usize) -> Self {
        let mut by_var = vec![Vec::new(); nvars];
        for (i, p) in polys.iter().enumerate() {
            if usable[i] {
                let v = p[0].vars().next().expect("no constant among reducers");
                by_var[v].push(i as u32);
            }
        }
        // Sparser reducers first: their rows bring fewer monomials.
        for list in &mut by_var {
            list.sort_by_key(|&i| polys[i as usize].len());
        }
        Reducers { polys, by_var }
    }

    /// An element whose leading monomial divides `t`: of the sparsest divisor filed under each
    /// of t's variables, the sparsest.
    pub fn find(&self, t: &Bits<W>) -> Option<usize> {
        let mut best: Option<usize> = None;
        for v in t.vars() {
            for &i in &self.by_var[v] {
                let i = i as usize;
                if self.polys[i][0].divides(t) {
                    if best.is_none_or(|b| self.polys[i].len() < self.polys[b].len()) {
                        best = Some(i);
                    }
                    break;
                }
            }
        }
        best
    }

    pub fn poly(&self, i: usize) -> &'a [Bits<W>] {
        &self.polys[i]
    }
}

/// The rows of one matrix while they are collected: columns are numbered as monomials appear.
pub struct Assembly<const W: usize> {
    index: WordMap<Bits<W>, u32>,
    monos: Vec<Bits<W>>,
    /// For each column, its pivot row (`u32::MAX`: none yet).
    pivot_of: Vec<u32>,
    /// For each column, the last row that had it: `row_stamp` when it is in the row being made,
    /// `row_stamp - 1` when it came in twice there and cancelled (see [`Assembly::product`]).
    stamp: Vec<u32>,
    row_stamp: u32,
    pivot_rows: Vec<Vec<u32>>,
    reduce_rows: Vec<Vec<u32>>,
    /// Products (multiplier, element) already made into rows.
    made: WordMap<(Bits<W>, usize), ()>,
    pub nonzeros: usize,
}

/// A matrix in block form: pivot rows (pivot i leads column i), rows to reduce, and the monomial
/// of every column.
pub struct Matrix<const W: usize> {
    pub pivots: Vec<Vec<u32>>,
    pub reduce: Vec<Vec<u32>>,
    pub monomials: Vec<Bits<W>>,
}

impl<const W: usize> Default for Assembly<W> {
    fn default() -> Self {
        Assembly {
            index: WordMap::default(),
            monos: Vec::new(),
            pivot_of: Vec::new(),
            stamp: Vec::new(),
            row_stamp: 0,
            pivot_rows: Vec::new(),
            reduce_rows: Vec::new(),
            made: WordMap::default(),
            nonzeros: 0,
        }
    }
}

impl<const W: usize> Assembly<W> {
    fn column(&mut self, m: Bits<W>) -> u32 {
        let next = self.monos.len() as u32;
        *self.index.entry(m).or_insert_with(|| {
            self.monos.push(m);
            self.pivot_of.push(u32::MAX);
            self.stamp.push(0);
            next
        })
    }

    /// The columns of u·poly (x·x = x), monomials that occur an even number of times cancelled,
    /// in no particular order. Columns are stamped with the row instead of sorting the row:
    /// sorting every row took a third of the engine's time.
    fn product(&mut self, u: &Bits<W>, poly: &[Bits<W>]) -> Vec<u32> {
        // Two stamps per row (present, cancelled); rows of earlier stamps never collide.
        self.row_stamp += 2;
        let present = self.row_stamp;
        let mut out = Vec::with_capacity(poly.len());
        let mut cancelled = false;
        for t in poly {
            let c = self.column(u.union(t));
            let stamp = &mut self.stamp[c as usize];
            if *stamp == present {
                *stamp = present - 1;
                cancelled = true;
            } else if *stamp == present - 1 {
                *stamp = present;
            } else {
                *stamp = present;
                out.push(c);
            }
        }
        if cancelled {
            let stamp = &self.stamp;
            out.retain(|&c| stamp[c as usize] == present);
        }
        self.nonzeros += out.len();
        out
    }

    /// Adds u·poly as the pivot row of the column of `lead` (which must be its leading
    /// monomial) when that column has none, as a row to reduce otherwise. `element` names the
    /// product so it is made once.
    pub fn add_with_lead(&mut self, u: Bits<W>, element: usize, poly: &[Bits<W>], lead: Bits<W>) {
        if self.made.insert((u, element), ()).is_some() {
            return;
        }
        let row = self.product(&u, poly);
        let col = self.column(lead);
        if self.pivot_of[col as usize] == u32::MAX {
            self.pivot_of[col as usize] = self.pivot_rows.len() as u32;
            self.pivot_rows.push(row);
        } else {
            self.reduce_rows.push(row);
        }
    }

    /// Adds u·poly as a row to reduce.
    pub fn add_to_reduce(&mut self, u: Bits<W>, element: usize, poly: &[Bits<W>]) {
        if element != usize::MAX && self.made.insert((u, element), ()).is_some() {
            return;
        }
        let row = self.product(&u, poly);
        if !row.is_empty() {
            self.reduce_rows.push(row);
        }
    }

    /// Gives every column whose monomial some reducer's leading monomial divides a pivot row,
    /// following the monomials those rows bring in.
    pub fn preprocess(&mut self, reducers: &Reducers<W>, control: &Control) -> Result<()> {
        let mut next = 0;
        while next < self.monos.len() {
            if next % 1024 == 0 {
                control.check()?;
            }
            let c = next;
            next += 1;
            if self.pivot_of[c] != u32::MAX {
                continue;
            }
            let t = self.monos[c];
            if let Some(i) = reducers.find(&t) {
                let poly = reducers.poly(i);
                let u = t.minus(&poly[0]);
                self.made.insert((u, i), ());
                let row = self.product(&u, poly);
                self.pivot_of[c] = self.pivot_rows.len() as u32;
                self.pivot_rows.push(row);
            }
        }
        Ok(())
    }

    pub fn columns(&self) -> usize {
        self.monos.len()
    }
    pub fn rows(&self) -> usize {
        self.pivot_rows.len() + self.reduce_rows.len()
    }
    pub fn reduce_count(&self) -> usize {
        self.reduce_rows.len()
    }

    /// The block form: columns renumbered (pivot columns first, each part decreasing). A pivot
    /// row's leading column comes first, the other columns of every row in no particular order
    /// (the reductions of [`linalg`] do not need them sorted).
    pub fn finish(self, order: BoolOrder) -> Matrix<W> {
        let cmp =
            |a: &u32, b: &u32| order.cmp_bits(&self.monos[*b as usize], &self.monos[*a as usize]);
        let (mut pivot_cols, mut other_cols): (Vec<u32>, Vec<u32>) =
            (0..self.monos.len() as u32).partition(|&c| self.pivot_of[c as usize] != u32::MAX);
        pivot_cols.sort_unstable_by(cmp);
        other_cols.sort_unstable_by(cmp);
        let mut position = vec![0u32; self.monos.len()];
        for (p, &c) in pivot_cols.iter().chain(&other_cols).enumerate() {
            position[c as usize] = p as u32;
        }
        let renumber =
            |row: Vec<u32>| -> Vec<u32> { row.into_iter().map(|c| position[c as usize]).collect() };
        let lead_first = |mut row: Vec<u32>| {
            let lead = (0..row.len())
                .min_by_key(|&i| row[i])
                .expect("pivot rows are nonzero");
            row.swap(0, lead);
            row
        };
        let mut pivot_rows: Vec<Option<Vec<u32>>> = self.pivot_rows.into_iter().map(Some).collect();
        let pivots: Vec<Vec<u32>> = pivot_cols
            .iter()
            .map(|&c| {
                lead_first(renumber(
                    pivot_rows[self.pivot_of[c as usize] as usize]
                        .take()
                        .unwrap(),
                ))
            })
            .collect();
        debug_assert!(pivots.iter().enumerate().all(|(i, r)| r[0] as usize == i));
        let reduce = self.reduce_rows.into_iter().map(renumber).collect();
        let monomials = pivot_cols
            .iter()
            .chain(&other_cols)
            .map(|&c| self.monos[c as usize])
            .collect();
        Matrix {
            pivots,
            reduce,
            monomials,
        }
    }
}

/// Bytes a dense matrix may take before the step stops with `ResourceLimit` (when the caller
/// set no smaller matrix limit): a fourth of a 24 GB machine.
const DENSE_BYTES: u64 = 6 << 30;

impl<const W: usize> Matrix<W> {
    /// The columns after the pivot ones, where reduced rows live.
    pub fn tail_columns(&self) -> usize {
        self.monomials.len() - self.pivots.len()
    }

    /// Checks the step against the caller's limits and the dense budget: the finished pivot
    /// tails (pivots x tail columns) and an echelon form of the tail columns.
    pub fn check_size(&self, control: &Control, step: usize) -> Result<()> {
        let (pivots, rows, tail) = (self.pivots.len(), self.reduce.len(), self.tail_columns());
        control.check_matrix(rows + pivots, self.monomials.len(), step)?;
        let words = tail.div_ceil(64) as u64;
        let bytes = (pivots as u64 + 2 * tail.min(rows) as u64) * words * 8;
        if bytes > DENSE_BYTES {
            return Err(Error::ResourceLimit(format!(
                "step {step} needs dense {pivots} x {tail} and {rows} x {tail} matrices over \
                 GF(2) ({} MB)",
                bytes >> 20
            )));
        }
        Ok(())
    }

    /// The monomials of the set bits of `tail`, a row over the tail columns (decreasing).
    pub fn tail_monomials(&self, tail: &[u64]) -> Vec<Bits<W>> {
        let monomials = &self.monomials[self.pivots.len()..];
        let mut out = Vec::new();
        for (w, &word) in tail.iter().enumerate() {
            let mut word = word;
            while word != 0 {
                out.push(monomials[64 * w + word.trailing_zeros() as usize]);
                word &= word - 1;
            }
        }
        out
    }
}

/// The normal forms of `polys` with respect to the reducers (every monomial divisible by a
/// reducer's leading monomial removed), all in one matrix: the polynomials are the rows to
/// reduce, preprocessing brings the reducer rows, and the finished pivot tails
/// ([`linalg::pivot_tails`]) clear the pivot columns.
pub fn normal_forms<const W: usize>(
    polys: &[Vec<Bits<W>>],
    reducers: &Reducers<W>,
    order: BoolOrder,
    control: &Control,
) -> Result<Vec<Vec<Bits<W>>>> {
    let mut assembly = Assembly::default();
    let mut keep = Vec::with_capacity(polys.len());
    for p in polys {
        let before = assembly.reduce_count();
        assembly.add_to_reduce(Bits::ONE, usize::MAX, p);
        keep.push(assembly.reduce_count() > before);
    }
    assembly.preprocess(reducers, control)?;
    let matrix = assembly.finish(order);
    matrix.check_size(control, 0)?;
    let mut work = Work(0);
    let columns = matrix.monomials.len();
    let x = linalg::pivot_tails(&matrix.pivots, columns, control, &mut work)?;
    let mut rows = matrix.reduce.iter().map(|row| {
        let mut tail = vec![0u64; x.stride];
        linalg::add_tail(row, &x, &mut tail, &mut work);
        matrix.tail_monomials(&tail)
    });
    Ok(keep
        .into_iter()
        .map(|k| if k { rows.next().unwrap() } else { Vec::new() })
        .collect())
}
