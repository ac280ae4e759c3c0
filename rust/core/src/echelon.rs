//! Dense Gaussian elimination over a field, for the small matrices of quotient algebras: an
//! echelon form built one vector at a time, which gives ranks and, when asked to track how rows
//! combine the inputs, the first linear dependence among them.

use crate::field::Field;

/// A row with its pivot column (where it is 1) and, when tracked, the combination of the
/// inputs that gives it.
struct EchelonRow<F: Field> {
    row: Vec<F::Elem>,
    pivot: usize,
    combination: Vec<F::Elem>,
}

/// Vectors added one at a time, kept in echelon form (each row reduced against the earlier ones).
pub struct Echelon<F: Field> {
    field: F,
    rows: Vec<EchelonRow<F>>,
    inputs: usize,
    track: bool,
}

impl<F: Field> Echelon<F> {
    /// An echelon that records combinations, for [`Echelon::add`]'s dependence.
    pub fn new(field: F) -> Self {
        Echelon {
            field,
            rows: Vec::new(),
            inputs: 0,
            track: true,
        }
    }

    /// An echelon for spans and ranks only (no combinations kept).
    pub fn span(field: F) -> Self {
        Echelon {
            field,
            rows: Vec::new(),
            inputs: 0,
            track: false,
        }
    }

    /// Dimension of the span of the vectors added so far.
    pub fn rank(&self) -> usize {
        self.rows.len()
    }

    /// Adds `v`; if it is a combination of the earlier independent inputs, returns coefficients
    /// c_0..c_k (c_k = 1, k the index of `v`; empty when not tracking) with Σ c_j · input_j = 0,
    /// and leaves the echelon unchanged.
    pub fn add(&mut self, mut v: Vec<F::Elem>) -> Option<Vec<F::Elem>> {
        let f = &self.field;
        let k = self.inputs;
        let mut combo = if self.track {
            vec![f.zero(); k + 1]
        } else {
            vec![]
        };
        if self.track {
            combo[k] = f.one();
        }
        for EchelonRow {
            row,
            pivot,
            combination,
        } in &self.rows
        {
            let factor = v[*pivot].clone();
            if f.is_zero(&factor) {
                continue;
            }
            for (x, y) in v.iter_mut().zip(row) {
                *x = f.sub(x, &f.mul(&factor, y));
            }
            for (x, y) in combo.iter_mut().zip(combination) {
                *x = f.sub(x, &f.mul(&factor, y));
            }
        }
        let Some(pivot) = v.iter().position(|x| !f.is_zero(x)) else {
            return Some(combo);
        };
        let inv = f.inv(&v[pivot]).expect("nonzero");
        let row = v.iter().map(|x| f.mul(x, &inv)).collect();
        let combination = combo.iter().map(|x| f.mul(x, &inv)).collect();
        self.rows.push(EchelonRow {
            row,
            pivot,
            combination,
        });
        self.inputs += 1;
        None
    }
}

/// Rank of a dense matrix given by its rows.
pub fn rank<F: Field>(field: &F, rows: Vec<Vec<F::Elem>>) -> usize {
    let mut echelon = Echelon::span(field.clone());
    for row in rows {
        echelon.add(row);
    }
    echelon.rank()
}

/// A basis of the kernel {v : M·v = 0} of the matrix with rows `rows` and `columns` columns,
/// from the reduced row echelon form: one vector per non-pivot column.
pub fn kernel<F: Field>(
    field: &F,
    mut rows: Vec<Vec<F::Elem>>,
    columns: usize,
) -> Vec<Vec<F::Elem>> {
    let mut pivots: Vec<usize> = Vec::new();
    let mut top = 0;
    for col in 0..columns {
        let Some(found) = (top..rows.len()).find(|&r| !field.is_zero(&rows[r][col])) else {
            continue;
        };
        rows.swap(top, found);
        let inv = field.inv(&rows[top][col]).expect("nonzero");
        let pivot_row: Vec<F::Elem> = rows[top].iter().map(|x| field.mul(x, &inv)).collect();
        for (r, row) in rows.iter_mut().enumerate() {
            let factor = row[col].clone();
            if r == top || field.is_zero(&factor) {
                continue;
            }
            for (x, y) in row.iter_mut().zip(&pivot_row) {
                *x = field.sub(x, &field.mul(&factor, y));
            }
        }
        rows[top] = pivot_row;
        pivots.push(col);
        top += 1;
    }
    (0..columns)
        .filter(|c| !pivots.contains(c))
        .map(|free| {
            let mut v = vec![field.zero(); columns];
            v[free] = field.one();
            for (r, &p) in pivots.iter().enumerate() {
                v[p] = field.neg(&rows[r][free]);
            }
            v
        })
        .collect()
}
