//! Products with the matrix M of multiplication by a linear form ℓ on the standard monomials of a
//! zero-dimensional quotient A = R/I, in the structure such a matrix has (Faugère and Mou 2011):
//! a column b_j ↦ ℓ·b_j is a unit column wherever ℓ = x_i and x_i·b_j is standard again (a
//! partial permutation), and a normal form of a border monomial otherwise. The unit columns are
//! applied as index moves; the other columns are multiplied with the vector, over a prime field
//! below 2^32 on 32-bit residues with delayed reduction (products summed in one machine word
//! and reduced once per entry; a column at least half full is stored densely, up to its last
//! nonzero row, so that its loops run in vector lanes), over every other field entry by entry.
//!
//! One pass over the matrix gives both M^T·u and M·v: column j yields entry j of M^T·u (its dot
//! product with u) and adds v_j times itself to M·v. A Krylov sequence s_k = u·M^k·v then
//! advances from both ends at once, s_(i+j) = (M^T)^i u · M^j v, so that its 2D terms cost D
//! passes over the matrix instead of 2D.

use crate::control::Control;
use crate::error::Result;
use crate::field::{Field, PrimeField};
use crate::groebner::quotient::SparseColumn;
#[cfg(target_arch = "x86_64")]
use crate::vector_unit::VectorUnit;
use rayon::prelude::*;

/// (M^T·u, M·v).
type Products<E> = (Vec<E>, Vec<E>);

/// What a group of columns yields: their dot products with u (column index, value) and their
/// share of M·v.
type GroupProducts<E> = (Vec<(usize, E)>, Vec<E>);

/// The non-unit columns are split into about this many parallel tasks per thread (each with
/// its own accumulator for M·v), none smaller than [`GROUP_MIN_ENTRIES`] stored entries.
const GROUPS_PER_THREAD: usize = 2;
const GROUP_MIN_ENTRIES: usize = 1 << 13;

/// M in the structure of a multiplication matrix: unit columns and the others.
pub(crate) struct MultiplicationMatrix<F: Field> {
    field: F,
    dimension: usize,
    /// (j, k): column j is the unit vector e_k.
    units: Vec<(usize, usize)>,
    entries: Entries<F>,
}

/// The columns that are not unit vectors.
enum Entries<F: Field> {
    Word(WordColumns),
    /// Every other field: sparse columns, and the group boundaries.
    Generic(Vec<(usize, SparseColumn<F>)>, Vec<usize>),
}

/// The non-unit columns over a prime field below 2^32, as residues.
struct WordColumns {
    prime: PrimeField,
    /// Products of residues summed before a reduction (the sum stays below 2^64).
    batch: usize,
    columns: Vec<WordColumn>,
    /// Dense columns: the residues of rows 0, 1, ..., in turn.
    dense: Vec<u32>,
    /// Sparse columns: rows and residues.
    rows: Vec<u32>,
    values: Vec<u32>,
    /// Indices into `columns` where the parallel groups start, and the end.
    groups: Vec<usize>,
}

/// Column `index` of M: `dense[start..end]`, or `rows[start..end]` with `values[start..end]`.
struct WordColumn {
    index: usize,
    dense: bool,
    start: usize,
    end: usize,
}

impl<F: Field> MultiplicationMatrix<F> {
    /// M = Σ c_i · M_i for the linear form Σ c_i x_i, from the sparse columns of each M_i
    /// (`columns(i)`: column j holds the coordinates of x_i·b_j).
    pub(crate) fn of_form<'a>(
        field: &F,
        dimension: usize,
        form: &[(usize, F::Elem)],
        mut columns: impl FnMut(usize) -> Result<&'a [Vec<(usize, F::Elem)>]>,
        control: &Control,
    ) -> Result<Self>
    where
        F: 'a,
    {
        let others_and_units = match form {
            [(i, c)] if field.is_one(c) => split_units(field, columns(*i)?.iter().cloned()),
            _ => {
                let matrices: Vec<(&F::Elem, &[SparseColumn<F>])> = form
                    .iter()
                    .map(|(i, c)| Ok((c, columns(*i)?)))
                    .collect::<Result<_>>()?;
                // Column by column through one dense scratch column, reading back only the
                // rows the column touches: time and memory stay those of the sparse columns.
                let mut scratch = vec![field.zero(); dimension];
                let mut combined = Vec::with_capacity(dimension);
                for j in 0..dimension {
                    control.check()?;
                    let mut rows = Vec::new();
                    for (c, matrix) in &matrices {
                        for (k, m) in &matrix[j] {
                            scratch[*k] = field.add(&scratch[*k], &field.mul(c, m));
                            rows.push(*k);
                        }
                    }
                    rows.sort_unstable();
                    rows.dedup();
                    let column: SparseColumn<F> = rows
                        .into_iter()
                        .map(|k| (k, std::mem::replace(&mut scratch[k], field.zero())))
                        .filter(|(_, c)| !field.is_zero(c))
                        .collect();
                    combined.push(column);
                }
                split_units(field, combined.into_iter())
            }
        };
        let (units, others) = others_and_units;
        Ok(MultiplicationMatrix {
            field: field.clone(),
            dimension,
            units,
            entries: Entries::new(field, dimension, others),
        })
    }

    pub(crate) fn dimension(&self) -> usize {
        self.dimension
    }

    pub(crate) fn field(&self) -> &F {
        &self.field
    }

    /// (M^T·u, M·v) in one pass over the matrix.
    pub(crate) fn both_products(
        &self,
        u: &[F::Elem],
        v: &[F::Elem],
        control: &Control,
    ) -> Result<Products<F::Elem>> {
        control.check()?;
        let field = &self.field;
        let d = self.dimension;
        assert!(u.len() == d && v.len() == d, "vectors of the matrix's size");
        let mut transposed = vec![field.zero(); d];
        let mut product = match &self.entries {
            Entries::Word(word) => {
                let residues = |x: &[F::Elem]| -> Vec<u32> {
                    x.iter().map(|e| field.to_word(e) as u32).collect()
                };
                let (dots, sum) = word.both_products(d, &residues(u), &residues(v));
                for (j, x) in dots {
                    transposed[j] = field.from_word(x);
                }
                sum.into_iter().map(|x| field.from_word(x)).collect()
            }
            Entries::Generic(columns, groups) => {
                let parts: Vec<GroupProducts<F::Elem>> = groups
                    .par_windows(2)
                    .map(|g| generic_group(field, d, &columns[g[0]..g[1]], u, v))
                    .collect();
                let mut sum = vec![field.zero(); d];
                for (dots, partial) in parts {
                    for (j, x) in dots {
                        transposed[j] = x;
                    }
                    for (s, x) in sum.iter_mut().zip(&partial) {
                        *s = field.add(s, x);
                    }
                }
                sum
            }
        };
        for &(j, k) in &self.units {
            transposed[j] = u[k].clone();
            product[k] = field.add(&product[k], &v[j]);
        }
        Ok((transposed, product))
    }
}

/// The unit columns (j, k) and the others (j, column).
type Split<F> = (Vec<(usize, usize)>, Vec<(usize, SparseColumn<F>)>);

fn split_units<F: Field>(field: &F, columns: impl Iterator<Item = SparseColumn<F>>) -> Split<F> {
    let mut units = Vec::new();
    let mut others = Vec::new();
    for (j, column) in columns.enumerate() {
        match column.as_slice() {
            [(k, one)] if field.is_one(one) => units.push((j, *k)),
            _ => others.push((j, column)),
        }
    }
    (units, others)
}

impl<F: Field> Entries<F> {
    fn new(field: &F, d: usize, others: Vec<(usize, SparseColumn<F>)>) -> Self {
        match field.word_modulus().filter(|&p| p < 1 << 32) {
            Some(p) => Entries::Word(WordColumns::new(field, p, d, others)),
            None => {
                let groups = groups(others.iter().map(|(_, c)| c.len()));
                Entries::Generic(others, groups)
            }
        }
    }
}

impl WordColumns {
    fn new<F: Field>(field: &F, p: u64, d: usize, others: Vec<(usize, SparseColumn<F>)>) -> Self {
        let prime = PrimeField::known_prime(p);
        let square = u128::from(p - 1) * u128::from(p - 1);
        // `batch` products below (p − 1)^2 plus one residue stay below 2^64.
        let batch = (u128::from(u64::MAX - p) / square.max(1)).min(1 << 40) as usize;
        let mut words = WordColumns {
            prime,
            batch: batch.max(1),
            columns: Vec::with_capacity(others.len()),
            dense: Vec::new(),
            rows: Vec::new(),
            values: Vec::new(),
            groups: Vec::new(),
        };
        for (index, column) in others {
            let height = column.iter().map(|(k, _)| k + 1).max().unwrap_or(0);
            assert!(height <= d, "rows of a {d} x {d} matrix");
            let dense = 2 * column.len() >= height;
            let (start, end) = if dense {
                let start = words.dense.len();
                words.dense.resize(start + height, 0);
                for (k, c) in &column {
                    words.dense[start + k] = field.to_word(c) as u32;
                }
                (start, start + height)
            } else {
                let start = words.rows.len();
                for (k, c) in &column {
                    words.rows.push(*k as u32);
                    words.values.push(field.to_word(c) as u32);
                }
                (start, words.rows.len())
            };
            words.columns.push(WordColumn {
                index,
                dense,
                start,
                end,
            });
        }
        words.groups = groups(words.columns.iter().map(|c| c.end - c.start));
        words
    }

    /// The dot products of the columns with u (column index, residue) and M·v without its unit
    /// columns (residues), by parallel groups of columns.
    fn both_products(&self, d: usize, u: &[u32], v: &[u32]) -> GroupProducts<u64> {
        assert!(u.len() == d && v.len() == d, "vectors of the matrix's size");
        let parts: Vec<GroupProducts<u64>> = self
            .groups
            .par_windows(2)
            .map(|g| self.group(d, &self.columns[g[0]..g[1]], u, v))
            .collect();
        let mut dots = Vec::with_capacity(self.columns.len());
        let mut sum = vec![0u64; d];
        for (group_dots, partial) in parts {
            dots.extend(group_dots);
            for (s, x) in sum.iter_mut().zip(partial) {
                *s = self.prime.reduce_u64(*s + x);
            }
        }
        (dots, sum)
    }

    /// [`WordColumns::group_in_lanes`] with the widest vector instructions the CPU has.
    fn group(&self, d: usize, columns: &[WordColumn], u: &[u32], v: &[u32]) -> GroupProducts<u64> {
        #[cfg(target_arch = "x86_64")]
        if VectorUnit::detect() != VectorUnit::Baseline {
            // SAFETY: the CPU has AVX2 (AVX-512 implies it).
            return unsafe { self.group_avx2(d, columns, u, v) };
        }
        self.group_in_lanes(d, columns, u, v)
    }

    crate::compiled_for_wider_units! {
        fn group_in_lanes[](d: usize, columns: &[WordColumn], u: &[u32], v: &[u32])
            -> GroupProducts<u64>;
        "avx2" => group_avx2,
    }

    /// One group of columns: their dot products with u and their share of M·v, reduced.
    #[inline(always)]
    fn group_in_lanes(
        &self,
        d: usize,
        columns: &[WordColumn],
        u: &[u32],
        v: &[u32],
    ) -> GroupProducts<u64> {
        let prime = &self.prime;
        let mut dots = Vec::with_capacity(columns.len());
        let mut acc = vec![0u64; d];
        // Columns added into `acc` since its last reduction.
        let mut pending = 0;
        for column in columns {
            if pending == self.batch {
                acc.iter_mut().for_each(|a| *a = prime.reduce_u64(*a));
                pending = 0;
            }
            let x = u64::from(v[column.index]);
            let range = column.start..column.end;
            let dot = if column.dense {
                let entries = &self.dense[range];
                for (a, &c) in acc.iter_mut().zip(entries) {
                    *a += u64::from(c) * x;
                }
                self.dense_dot(entries, u)
            } else {
                let (rows, values) = (&self.rows[range.clone()], &self.values[range]);
                let mut dot = 0u64;
                for (rows, values) in rows.chunks(self.batch).zip(values.chunks(self.batch)) {
                    let mut sum = 0u64;
                    for (&k, &c) in rows.iter().zip(values) {
                        let k = k as usize;
                        // SAFETY: every row is below d (checked in `WordColumns::new`), the
                        // length of `acc` and of `u` (checked in `both_products`).
                        unsafe {
                            *acc.get_unchecked_mut(k) += u64::from(c) * x;
                            sum += u64::from(c) * u64::from(*u.get_unchecked(k));
                        }
                    }
                    dot = prime.reduce_u64(prime.reduce_u64(sum) + dot);
                }
                dot
            };
            dots.push((column.index, dot));
            pending += 1;
        }
        acc.iter_mut().for_each(|a| *a = prime.reduce_u64(*a));
        (dots, acc)
    }

    /// Σ entries[t]·u[t] mod p, reduced once per `batch` products.
    #[inline(always)]
    fn dense_dot(&self, entries: &[u32], u: &[u32]) -> u64 {
        let prime = &self.prime;
        let mut total = 0u64;
        for (chunk, w) in entries.chunks(self.batch).zip(u.chunks(self.batch)) {
            let sum: u64 = chunk
                .iter()
                .zip(w)
                .map(|(&a, &b)| u64::from(a) * u64::from(b))
                .sum();
            total = prime.reduce_u64(prime.reduce_u64(sum) + total);
        }
        total
    }
}

/// Group boundaries over columns of the given sizes, balanced by stored entries.
fn groups(sizes: impl Iterator<Item = usize>) -> Vec<usize> {
    let sizes: Vec<usize> = sizes.collect();
    let total: usize = sizes.iter().sum();
    let wanted = GROUPS_PER_THREAD * rayon::current_num_threads();
    let target = (total / wanted.max(1)).max(GROUP_MIN_ENTRIES);
    let mut bounds = vec![0];
    let mut filled = 0;
    for (c, size) in sizes.iter().enumerate() {
        filled += size;
        if filled >= target {
            bounds.push(c + 1);
            filled = 0;
        }
    }
    if *bounds.last().expect("starts with 0") != sizes.len() {
        bounds.push(sizes.len());
    }
    bounds
}

/// One group of sparse columns over any field: their dot products with u and their share of
/// M·v.
fn generic_group<F: Field>(
    field: &F,
    d: usize,
    columns: &[(usize, SparseColumn<F>)],
    u: &[F::Elem],
    v: &[F::Elem],
) -> GroupProducts<F::Elem> {
    let mut dots = Vec::with_capacity(columns.len());
    let mut acc = vec![field.zero(); d];
    for (j, column) in columns {
        let dot = column.iter().fold(field.zero(), |s, (k, m)| {
            field.add(&s, &field.mul(m, &u[*k]))
        });
        dots.push((*j, dot));
        if !field.is_zero(&v[*j]) {
            for (k, m) in column {
                acc[*k] = field.add(&acc[*k], &field.mul(m, &v[*j]));
            }
        }
    }
    (dots, acc)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field_kind::AnyField;
    use crate::rng::Rng;
    use crate::univariate::random_element;

    /// A d × d matrix shaped like a multiplication matrix: unit columns, sparse columns and
    /// columns full up to some row, as sparse columns.
    fn structured_columns<F: Field>(field: &F, d: usize, rng: &mut Rng) -> Vec<SparseColumn<F>> {
        let nonzero = |rng: &mut Rng| loop {
            let c = random_element(field, rng);
            if !field.is_zero(&c) {
                return c;
            }
        };
        (0..d)
            .map(|_| match rng.next_u64() % 3 {
                0 => vec![((rng.next_u64() % d as u64) as usize, field.one())],
                1 => {
                    let mut rows: Vec<usize> = (0..1 + rng.next_u64() % 6)
                        .map(|_| (rng.next_u64() % d as u64) as usize)
                        .collect();
                    rows.sort_unstable();
                    rows.dedup();
                    rows.into_iter().map(|k| (k, nonzero(rng))).collect()
                }
                _ => {
                    let height = 1 + (rng.next_u64() % d as u64) as usize;
                    let mut column = Vec::new();
                    for k in 0..height {
                        if !rng.next_u64().is_multiple_of(8) {
                            column.push((k, nonzero(rng)));
                        }
                    }
                    column
                }
            })
            .collect()
    }

    /// M^T·u and M·v entry by entry from the dense matrix Σ c_i M_i.
    fn plain_products<F: Field>(
        field: &F,
        d: usize,
        form: &[(usize, F::Elem)],
        matrices: &[Vec<SparseColumn<F>>],
        u: &[F::Elem],
        v: &[F::Elem],
    ) -> (Vec<F::Elem>, Vec<F::Elem>) {
        let mut dense = vec![vec![field.zero(); d]; d];
        for (i, c) in form {
            for (j, column) in matrices[*i].iter().enumerate() {
                for (k, m) in column {
                    dense[*k][j] = field.add(&dense[*k][j], &field.mul(c, m));
                }
            }
        }
        let transposed = (0..d)
            .map(|j| {
                (0..d).fold(field.zero(), |s, k| {
                    field.add(&s, &field.mul(&dense[k][j], &u[k]))
                })
            })
            .collect();
        let product = (0..d)
            .map(|k| {
                (0..d).fold(field.zero(), |s, j| {
                    field.add(&s, &field.mul(&dense[k][j], &v[j]))
                })
            })
            .collect();
        (transposed, product)
    }

    #[test]
    fn both_products_agree_with_the_plain_products() {
        // Word primes below 2^32 (the residue kernel; 4294967291 reduces after every product),
        // a word prime above 2^32, a two-limb prime and extension fields (the generic path);
        // one variable and a combination of two; a small matrix and one split into groups.
        let specs = [
            "GF(65521)",
            "GF(4294967291)",
            "GF(2305843009213693951)",
            "GF(170141183460469231731687303715884105727)",
            "GF(2^8)",
            "GF(9)",
        ];
        let control = Control::new();
        for spec in specs {
            let any = AnyField::parse(spec).unwrap();
            crate::with_any_field!(any, field => {
                for d in [17, 300] {
                    let mut rng = Rng::new(d as u64);
                    let matrices: Vec<Vec<Vec<(usize, _)>>> =
                        (0..2).map(|_| structured_columns(&field, d, &mut rng)).collect();
                    let forms = [
                        vec![(1, field.one())],
                        vec![(0, random_element(&field, &mut rng)), (1, random_element(&field, &mut rng))],
                    ];
                    for form in &forms {
                        let matrix = MultiplicationMatrix::of_form(
                            &field,
                            d,
                            form,
                            |i| Ok(matrices[i].as_slice()),
                            &control,
                        )
                        .unwrap();
                        let u: Vec<_> = (0..d).map(|_| random_element(&field, &mut rng)).collect();
                        let v: Vec<_> = (0..d).map(|_| random_element(&field, &mut rng)).collect();
                        let got = matrix.both_products(&u, &v, &control).unwrap();
                        let expected = plain_products(&field, d, form, &matrices, &u, &v);
                        assert!(got == expected, "{spec}, d = {d}, {} terms", form.len());
                    }
                }
            });
        }
    }

    #[test]
    fn word_columns_take_both_layouts_and_several_groups() {
        // The test above must reach the dense and the sparse residue loops and the groups.
        let field = PrimeField::new(65521).unwrap();
        let columns = structured_columns(&field, 300, &mut Rng::new(300));
        let matrix = MultiplicationMatrix::of_form(
            &field,
            300,
            &[(0, 1)],
            |_| Ok(columns.as_slice()),
            &Control::new(),
        )
        .unwrap();
        let Entries::Word(words) = &matrix.entries else {
            panic!("GF(65521) takes the residue kernel");
        };
        assert!(words.columns.iter().any(|c| c.dense));
        assert!(words.columns.iter().any(|c| !c.dense));
        assert!(!matrix.units.is_empty());
        assert!(words.groups.len() > 2 || rayon::current_num_threads() == 1);
    }
}
