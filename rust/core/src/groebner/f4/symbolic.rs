//! Symbolic preprocessing of F4 (Faugère 1999, §2.3): starting from the rows of the selected
//! pairs, every monomial that appears in a row and is divisible by a leading monomial of the
//! basis gets one reducer row (a monomial multiple of that basis element), until the set of rows
//! is closed. The result is the matrix's shape: its columns (monomials in decreasing order), the
//! known-pivot rows (distinct leading columns) and the new rows to be reduced by them.

use super::hash::{MonomialTable, MISSING_PRODUCT};
use super::parallel::map_items;
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
    /// The multiple each reducer row was made from.
    pub reducer_multiples: Vec<Multiple>,
    pub new_rows: Vec<Row<C>>,
}

impl<C> SymbolicMatrix<C> {
    pub fn rows(&self) -> usize {
        self.reducers.len() + self.new_rows.len()
    }
    /// The highest total degree of a monomial of the matrix.
    pub fn max_degree(&self, table: &MonomialTable) -> u32 {
        self.columns
            .iter()
            .map(|&m| table.degree(m))
            .max()
            .unwrap_or(0)
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

    /// The monomials of every `rows[i]` = mult · basis[element]: looked up in parallel in the
    /// (then read-only) table, the products not yet stored added afterwards, in order.
    fn expand_all(&mut self, rows: &[Multiple], control: &Control) -> Result<Vec<Vec<u32>>>
    where
        C: Send + Sync,
    {
        let (table, basis): (&MonomialTable, _) = (self.table, self.basis);
        let mut found = map_items(
            rows,
            PARALLEL_MIN_MONOMIALS,
            control,
            Vec::new,
            |buf, row| table.find_products(row.mult, &basis[row.element].monos, buf),
        );
        for (&row, monos) in rows.iter().zip(&mut found) {
            self.store_missing(row, monos)?;
        }
        Ok(found)
    }

    /// Fills the `MISSING` entries of the monomials of `row`, adding those products to the table.
    fn store_missing(&mut self, row: Multiple, monos: &mut [u32]) -> Result<()> {
        let element = &self.basis[row.element].monos;
        for (slot, &t) in monos.iter_mut().zip(element) {
            if *slot == MISSING {
                *slot = self.table.mul(row.mult, t)?;
            }
        }
        Ok(())
    }

    fn visit_tail(&mut self, monos: &[u32]) {
        for &m in &monos[1..] {
            self.mark(m, PENDING);
        }
    }

    /// The reducer row for `m` from what the parallel look-up found, adding the monomials it
    /// could not find to the table.
    fn complete(&mut self, m: u32, found: Found) -> Result<(Multiple, Vec<u32>)> {
        let mult = match found.mult {
            Some(mult) => mult,
            None => self.table.div(m, found.lead),
        };
        let multiple = Multiple {
            mult,
            element: found.element,
        };
        let mut monos = if found.monos.is_empty() {
            vec![MISSING; self.basis[found.element].monos.len()]
        } else {
            found.monos
        };
        self.store_missing(multiple, &mut monos)?;
        Ok((multiple, monos))
    }
}

/// Monomials per round below which the look-ups stay on the calling thread.
const PARALLEL_MIN_MONOMIALS: usize = 32;

/// Columns below which they are sorted on the calling thread.
const PARALLEL_MIN_SORT: usize = 4096;

/// Marks a product not yet in the monomial table.
const MISSING: u32 = MISSING_PRODUCT;

/// What the read-only look-up learnt about the reducer of one monomial: the divisor's element
/// and leading monomial, the multiplier if already stored, and the row's monomials (`MISSING`
/// where not stored; empty when the multiplier is unknown).
struct Found {
    element: usize,
    lead: u32,
    mult: Option<u32>,
    monos: Vec<u32>,
}

/// The first basis element (oldest first) whose leading monomial divides `m`: F4's choice of
/// reducer. (Preferring the sparsest, the newest or the one of largest leading degree all gave
/// larger matrices and more multiply-adds on katsura-9, katsura-10 and cyclic-7.)
fn first_divisor<'d>(
    table: &MonomialTable,
    divisors: &'d [Divisor],
    m: u32,
) -> Option<&'d Divisor> {
    divisors
        .iter()
        .find(|d| table.may_divide(d.mask, m) && table.divides(d.lead, m))
}

/// The reducer row of `m` from the divisor `pick` chooses, looked up in the read-only table.
fn find_reducer<C>(
    table: &MonomialTable,
    basis: &[Element<C>],
    pick: &(impl Fn(&MonomialTable, u32) -> Option<Divisor> + Sync),
    m: u32,
    buf: &mut Vec<u32>,
) -> Option<Found> {
    let d = pick(table, m)?;
    let mult = table.find_quotient(m, d.lead, buf);
    let monos = match mult {
        Some(mult) => table.find_products(mult, &basis[d.element].monos, buf),
        None => Vec::new(),
    };
    Some(Found {
        element: d.element,
        lead: d.lead,
        mult,
        monos,
    })
}

/// Builds the matrix for the `known` rows (distinct leading monomials: they become pivots) and
/// the `new` rows, adding reducers from `divisors` for every reducible monomial. The caller's
/// matrix limit is checked while the matrix grows (`step` names it in the error), so that an
/// oversized matrix is refused before it is built.
pub fn preprocess<C: Send + Sync>(
    control: &Control,
    step: usize,
    table: &mut MonomialTable,
    basis: &[Element<C>],
    divisors: &[Divisor],
    known: &[Multiple],
    new: &[Multiple],
) -> Result<SymbolicMatrix<C>> {
    let pick = |table: &MonomialTable, m: u32| first_divisor(table, divisors, m).copied();
    preprocess_with(control, step, table, basis, &pick, known, new)
}

/// The memory budget bounds the matrix while its rows are chosen, before it is built: each
/// entry is a column index and a coefficient, each column a table slot and an index.
fn check_matrix_memory<C>(
    control: &Control,
    entries: u64,
    rows: usize,
    cols: usize,
    step: usize,
) -> Result<()> {
    let entry = (std::mem::size_of::<u32>() + std::mem::size_of::<C>()) as u64;
    let bytes = entries
        .saturating_mul(entry)
        .saturating_add(cols as u64 * 8);
    match control.memory_budget() {
        Some(budget) if bytes > budget => control.check_memory(
            bytes,
            &format!("the matrix of F4 step {step} ({rows} rows and {cols} columns so far)"),
        ),
        _ => Ok(()),
    }
}

/// [`preprocess`] with the reducer of each monomial chosen by `pick` (`None`: not reducible).
pub fn preprocess_with<C: Send + Sync>(
    control: &Control,
    step: usize,
    table: &mut MonomialTable,
    basis: &[Element<C>],
    pick: &(impl Fn(&MonomialTable, u32) -> Option<Divisor> + Sync),
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
    let known_monos = closure.expand_all(known, control)?;
    let new_monos = closure.expand_all(new, control)?;
    for monos in &known_monos {
        closure.mark(monos[0], PIVOT);
    }
    for monos in &new_monos {
        closure.mark(monos[0], PENDING);
    }
    let mut reducers: Vec<(Multiple, Vec<u32>)> = known.iter().copied().zip(known_monos).collect();
    let new_rows: Vec<(Multiple, Vec<u32>)> = new.iter().copied().zip(new_monos).collect();
    for (_, monos) in reducers.iter().chain(&new_rows) {
        closure.visit_tail(monos);
    }
    control.check_matrix(reducers.len() + new_rows.len(), closure.seen.len(), step)?;
    let mut entries: u64 = reducers
        .iter()
        .chain(&new_rows)
        .map(|(_, monos)| monos.len() as u64)
        .sum();
    let rows = reducers.len() + new_rows.len();
    check_matrix_memory::<C>(control, entries, rows, closure.seen.len(), step)?;
    // In rounds: the reducers of a whole round are looked up in parallel in the (then read-only)
    // monomial table; monomials new to the table are added afterwards, in order. The closure does
    // not depend on the order in which monomials are handled, so neither does the matrix.
    while !closure.todo.is_empty() {
        control.check()?;
        let round = std::mem::take(&mut closure.todo);
        let table: &MonomialTable = closure.table;
        let found = map_items(
            &round,
            PARALLEL_MIN_MONOMIALS,
            control,
            Vec::new,
            |buf, &m| find_reducer(table, basis, pick, m, buf),
        );
        for (m, reducer) in round.into_iter().zip(found) {
            let Some(reducer) = reducer else {
                continue;
            };
            if closure.state_of(m) == PIVOT {
                continue;
            }
            let (mult, monos) = closure.complete(m, reducer)?;
            closure.mark(m, PIVOT);
            closure.visit_tail(&monos);
            entries += monos.len() as u64;
            reducers.push((mult, monos));
            let rows = reducers.len() + new_rows.len();
            control.check_matrix(rows, closure.seen.len(), step)?;
            check_matrix_memory::<C>(control, entries, rows, closure.seen.len(), step)?;
        }
    }
    let Closure {
        table, mut seen, ..
    } = closure;
    let parallel = seen.len() >= PARALLEL_MIN_SORT && control.limits.threads != Some(1);
    table.sort_decreasing(&mut seen, parallel);
    let mut col_of = vec![u32::MAX; table.len()];
    for (c, &m) in seen.iter().enumerate() {
        col_of[m as usize] = c as u32;
    }
    let to_row = |_: &mut (), (mult, monos): &(Multiple, Vec<u32>)| Row {
        cols: monos.iter().map(|&m| col_of[m as usize]).collect(),
        coeffs: basis[mult.element].coeffs.clone(),
    };
    Ok(SymbolicMatrix {
        reducer_multiples: reducers.iter().map(|(mult, _)| *mult).collect(),
        reducers: map_items(&reducers, PARALLEL_MIN_MONOMIALS, control, || (), to_row),
        new_rows: map_items(&new_rows, PARALLEL_MIN_MONOMIALS, control, || (), to_row),
        columns: seen,
    })
}
