//! The characteristic polynomial of a scalar matrix as the minimal polynomial of a projected
//! Krylov sequence u·(A^T)^k e_1 (Krylov 1931; Wiedemann 1986), found by Berlekamp–Massey
//! (Massey 1969), for several matrices of one nonzero pattern side by side in vector lanes;
//! Hessenberg reduction ([`super::hessenberg`]) when the sequence falls short.

use super::hessenberg::hessenberg_charpoly;
use crate::charpoly::scalars::{Scalars, LANES};
#[cfg(target_arch = "x86_64")]
use crate::vector_unit::VectorUnit;

/// A fixed pseudo-random vector of nonzero scalars, the same for every matrix: the projection
/// of the Krylov sequences. The result never depends on it, only how often the fallback runs.
pub(super) fn projection_vector<S: Scalars>(s: &S, field: &S::Base, r: usize) -> Vec<S::E> {
    let mut rng = crate::rng::Rng::new(PROJECTION_SEED);
    (0..r).map(|_| s.import(&rng.nonzero(field))).collect()
}

const PROJECTION_SEED: u64 = 0x5eed_c0ff_ee00;

/// det(x·Id - A) of a scalar matrix, coefficients low to high. First as the minimal
/// polynomial of the sequence u·w_k, w_k = (A^T)^k e_1, k < 2r, for the fixed vector
/// `projection` = u (`sequence`, from [`Columns::sequences`]): it divides det(x·Id - A), so
/// when its degree is r the two are equal (Wiedemann 1986: the minimal polynomial of a
/// projected Krylov sequence; Krylov 1931). The 2r products A^T·w run over the nonzero entries
/// only (a matrix of multiplication by an element on standard monomials has unit rows wherever
/// x·b is standard again), and Berlekamp–Massey then costs O(r^2) where solving for the
/// coefficients would cost O(r^3). When the degree is smaller (the matrix is not cyclic for
/// e_1, or u is unlucky), by Hessenberg reduction, which always works.
pub(super) fn scalar_charpoly<S: Scalars>(
    s: &S,
    a: Vec<Vec<S::E>>,
    sequence: &[S::E],
) -> Vec<S::E> {
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
pub(super) struct Columns {
    /// Column k holds the rows rows[starts[k]..starts[k + 1]].
    starts: Vec<usize>,
    rows: Vec<usize>,
}

impl Columns {
    pub(super) fn new(r: usize, nonzero: impl Fn(usize, usize) -> bool) -> Self {
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
    pub(super) fn sequences<S: Scalars>(
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

    crate::compiled_for_wider_units! {
        fn sequences_in_lanes[S: Scalars](s: &S, matrices: &[Vec<Vec<S::E>>], u: &[S::E])
            -> Vec<Vec<S::E>>;
        "avx2" => sequences_avx2,
        "avx512f" => sequences_avx512,
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
