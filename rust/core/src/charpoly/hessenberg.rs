//! The characteristic polynomial of a scalar matrix by reduction to Hessenberg form and the
//! recurrence on its leading minors (Cohen, *A Course in Computational Algebraic Number
//! Theory*, 1993, Algorithm 2.2.9): O(r^3) operations for every matrix, cyclic or not.

use crate::charpoly::scalars::Scalars;

/// det(x·Id - H) of a scalar matrix, coefficients low to high, by reduction to Hessenberg form
/// and the recurrence on its leading minors (Cohen 1993, Algorithm 2.2.9).
pub(super) fn hessenberg_charpoly<S: Scalars>(s: &S, mut h: Vec<Vec<S::E>>) -> Vec<S::E> {
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
