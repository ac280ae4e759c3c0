//! Symbolic preprocessing of F4 (Faugère 1999, §2.3): starting from the rows of the selected
//! pairs, every monomial that appears in a row and is divisible by a leading monomial of the
//! basis gets one reducer row (a monomial multiple of that basis element), until the set of rows
//! is closed. The result is the matrix's shape: its columns (monomials in decreasing order), the
//! known-pivot rows (distinct leading columns) and the new rows to be reduced by them.

use super::hash::MonomialTable;
use crate::control::Control;
use crate::error::Result;
use std::sync::Arc;

/// A basis element: monomial indices in decreasing order and their coefficients (monic: the first
/// coefficient is one).
pub struct Element<C> {
    pub monos: Vec<u32>,
    pub coeffs: Arc<[C]>,
}

impl<C> Element<C> {
    pub fn lead(&self) -> u32 {
        self.monos[0]
    }
}

/// A sparse matrix row: increasing column indices (decreasing monomials) and their coefficients.
/// Rows made from basis elements share the element's coefficients.
pub struct Row<C> {
    pub cols: Vec<u32>,
    pub coeffs: Arc<[C]>,
}

/// A multiple `mult · basis[element]` to be put in the matrix.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub struct Multiple {
    pub mult: u32,
    pub element: usize,
}

/// A basis element that may serve as reducer: its leading monomial, the monomial's mask and
/// the element's index.
#[derive(Clone, Copy)]
pub struct Divisor {
    pub lead: u32,
    pub mask: u64,
    pub element: usize,
}

pub struct SymbolicMatrix<C> {
    /// Monomial index of each column, decreasing in the monomial order.
    pub columns: Vec<u32>,
    /// Known pivots: the given known rows first (in their order), then the reducers found here.
    pub reducers: Vec<Row<C>>,
    pub new_rows: Vec<Row<C>>,
}

impl<C> SymbolicMatrix<C> {
    pub fn rows(&self) -> usize {
        self.reducers.len() + self.new_rows.len()
    }
    pub fn nonzeros(&self) -> usize {
        self.reducers
            .iter()
            .chain(&self.new_rows)
            .map(|r| r.cols.len())
            .sum()
    }
}

const UNSEEN: u8 = 0;
const PENDING: u8 = 1;
const PIVOT: u8 = 2;

struct Closure<'a, C> {
    table: &'a mut MonomialTable,
    basis: &'a [Element<C>],
    state: Vec<u8>,
    seen: Vec<u32>,
    todo: Vec<u32>,
}

impl<C> Closure<'_, C> {
    fn mark(&mut self, m: u32, to: u8) {
        if self.state.len() <= m as usize {
            self.state
                .resize(self.table.len().max(m as usize + 1), UNSEEN);
        }
        let s = &mut self.state[m as usize];
        if *s == UNSEEN {
            self.seen.push(m);
            if to == PENDING {
                self.todo.push(m);
            }
        }
        if to == PIVOT || *s == UNSEEN {
            *s = to;
        }
    }

    fn state_of(&self, m: u32) -> u8 {
        self.state.get(m as usize).copied().unwrap_or(UNSEEN)
    }

    /// The monomials of mult · basis[element].
    fn expand(&mut self, mult: Multiple) -> Result<Vec<u32>> {
        let basis = self.basis;
        basis[mult.element]
            .monos
            .iter()
            .map(|&t| self.table.mul(mult.mult, t))
            .collect()
    }

    fn visit_tail(&mut self, monos: &[u32]) {
        for &m in &monos[1..] {
            self.mark(m, PENDING);
        }
    }

    /// A reducer for `m`: the first basis element (oldest first) whose leading monomial divides
    /// `m`. (Preferring the sparsest, the newest or the one of largest leading degree all gave
    /// larger matrices on katsura-9 and cyclic-7.)
    fn find_divisor(&self, m: u32, divisors: &[Divisor]) -> Option<Divisor> {
        divisors
            .iter()
            .copied()
            .find(|d| self.table.may_divide(d.mask, m) && self.table.divides(d.lead, m))
    }
}

/// Builds the matrix for the `known` rows (distinct leading monomials: they become pivots) and
/// the `new` rows, adding reducers from `divisors` for every reducible monomial.
pub fn preprocess<C>(
    control: &Control,
    table: &mut MonomialTable,
    basis: &[Element<C>],
    divisors: &[Divisor],
    known: &[Multiple],
    new: &[Multiple],
) -> Result<SymbolicMatrix<C>> {
    let state = vec![UNSEEN; table.len()];
    let mut closure = Closure {
        table,
        basis,
        state,
        seen: vec![],
        todo: vec![],
    };
    let mut reducers: Vec<(Multiple, Vec<u32>)> = Vec::with_capacity(known.len());
    let mut new_rows: Vec<(Multiple, Vec<u32>)> = Vec::with_capacity(new.len());
    for &k in known {
        let monos = closure.expand(k)?;
        closure.mark(monos[0], PIVOT);
        reducers.push((k, monos));
    }
    for &k in new {
        let monos = closure.expand(k)?;
        closure.mark(monos[0], PENDING);
        new_rows.push((k, monos));
    }
    for (_, monos) in reducers.iter().chain(&new_rows) {
        closure.visit_tail(monos);
    }
    while let Some(m) = closure.todo.pop() {
        if closure.seen.len() % 1024 == 0 {
            control.check()?;
        }
        if closure.state_of(m) == PIVOT {
            continue;
        }
        let Some(d) = closure.find_divisor(m, divisors) else {
            continue;
        };
        let mult = Multiple {
            mult: closure.table.div(m, d.lead),
            element: d.element,
        };
        let monos = closure.expand(mult)?;
        closure.mark(m, PIVOT);
        closure.visit_tail(&monos);
        reducers.push((mult, monos));
    }
    let Closure {
        table, mut seen, ..
    } = closure;
    seen.sort_unstable_by(|&a, &b| table.cmp(b, a));
    let mut col_of = vec![u32::MAX; table.len()];
    for (c, &m) in seen.iter().enumerate() {
        col_of[m as usize] = c as u32;
    }
    let to_row = |(mult, monos): (Multiple, Vec<u32>)| Row {
        cols: monos.iter().map(|&m| col_of[m as usize]).collect(),
        coeffs: basis[mult.element].coeffs.clone(),
    };
    Ok(SymbolicMatrix {
        reducers: reducers.into_iter().map(to_row).collect(),
        new_rows: new_rows.into_iter().map(to_row).collect(),
        columns: seen,
    })
}
