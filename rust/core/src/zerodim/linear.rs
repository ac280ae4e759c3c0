//! Dense Gaussian elimination over a field, for the small matrices of quotient algebras:
//! rank, and an incremental echelon form that reports the first linear dependence.

use crate::field::Field;

/// Rank of a dense matrix (rows of equal length) by Gaussian elimination.
pub fn rank<F: Field>(field: &F, mut rows: Vec<Vec<F::Elem>>) -> usize {
    let cols = rows.first().map_or(0, Vec::len);
    let mut rank = 0;
    for c in 0..cols {
        let Some(p) = (rank..rows.len()).find(|&r| !field.is_zero(&rows[r][c])) else { continue };
        rows.swap(rank, p);
        let inv = field.inv(&rows[rank][c]).expect("pivot is nonzero");
        let pivot_row: Vec<F::Elem> = rows[rank].iter().map(|v| field.mul(v, &inv)).collect();
        for row in rows.iter_mut().skip(rank + 1) {
            let factor = row[c].clone();
            if !field.is_zero(&factor) {
                for k in c..cols {
                    row[k] = field.sub(&row[k], &field.mul(&factor, &pivot_row[k]));
                }
            }
        }
        rows[rank] = pivot_row;
        rank += 1;
    }
    rank
}

/// A row with its pivot column (where it is 1) and the combination of the inputs giving it.
struct EchelonRow<F: Field> {
    row: Vec<F::Elem>,
    pivot: usize,
    combination: Vec<F::Elem>,
}

/// Vectors added one at a time, kept in echelon form together with how each row is combined
/// from the inputs, so that the first dependence among the inputs can be read off.
pub struct Echelon<F: Field> {
    field: F,
    rows: Vec<EchelonRow<F>>,
    inputs: usize,
}

impl<F: Field> Echelon<F> {
    pub fn new(field: F) -> Self {
        Echelon { field, rows: Vec::new(), inputs: 0 }
    }

    /// Adds `v`; if it is a combination of the earlier inputs, returns coefficients c_0..c_k
    /// (c_k = 1, k the index of `v`) with Σ c_j · input_j = 0, and leaves the echelon unchanged.
    pub fn add(&mut self, mut v: Vec<F::Elem>) -> Option<Vec<F::Elem>> {
        let f = &self.field;
        let k = self.inputs;
        let mut combo = vec![f.zero(); k + 1];
        combo[k] = f.one();
        for EchelonRow { row, pivot, combination: row_combo } in &self.rows {
            let factor = v[*pivot].clone();
            if f.is_zero(&factor) {
                continue;
            }
            for (x, y) in v.iter_mut().zip(row) {
                *x = f.sub(x, &f.mul(&factor, y));
            }
            for (x, y) in combo.iter_mut().zip(row_combo) {
                *x = f.sub(x, &f.mul(&factor, y));
            }
        }
        let Some(pivot) = v.iter().position(|x| !f.is_zero(x)) else { return Some(combo) };
        let inv = f.inv(&v[pivot]).expect("nonzero");
        let v = v.iter().map(|x| f.mul(x, &inv)).collect();
        let combo = combo.iter().map(|x| f.mul(x, &inv)).collect();
        self.rows.push(EchelonRow { row: v, pivot, combination: combo });
        self.inputs += 1;
        None
    }
}
