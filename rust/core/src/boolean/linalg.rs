//! Dense linear algebra over GF(2), rows packed 64 coefficients a word, elimination by XOR of
//! words, with the Method of Four Russians (Arlazarov, Dinic, Kronrod and Faradzev 1970): the
//! 2^k sums of k pivot rows are tabulated once (in Gray-code order, one row XOR each), and every
//! other row then clears k columns with a single table XOR instead of up to k row XORs — the
//! form used for echelon forms by Bard (2007).
//!
//! Two operations serve the Boolean F4 engine, whose matrices come in the block form of Faugère
//! and Lachartre (2010): pivot rows with distinct leading columns first, the rows to reduce below.
//! - [`reduce_by_pivots`]: clears the pivot columns of the rows to reduce using the (sparse)
//!   pivot rows, k pivots at a time.
//! - [`row_echelon`]: the reduced row echelon form of what is left, k columns at a time.

use crate::control::Control;
use crate::error::Result;
use rayon::prelude::*;

/// Columns handled per table: 2^8 sums of 8 rows (the usual choice for rows of a few hundred
/// words, whose table then stays in the second-level cache).
const MAX_K: usize = 8;

/// Row-word work below which a table pass stays on one thread.
const PARALLEL_WORDS: usize = 1 << 16;

/// A dense GF(2) matrix: `rows` rows of `stride` words, row-major.
#[derive(Clone, Debug, Default)]
pub struct BitMatrix {
    pub rows: usize,
    pub stride: usize,
    pub data: Vec<u64>,
}

impl BitMatrix {
    /// The zero matrix; the caller has checked the size against its limits.
    pub fn zeros(rows: usize, columns: usize) -> Self {
        let stride = columns.div_ceil(64);
        BitMatrix {
            rows,
            stride,
            data: vec![0; rows * stride],
        }
    }
    #[inline]
    pub fn row(&self, i: usize) -> &[u64] {
        &self.data[i * self.stride..(i + 1) * self.stride]
    }
    #[inline]
    pub fn row_mut(&mut self, i: usize) -> &mut [u64] {
        &mut self.data[i * self.stride..(i + 1) * self.stride]
    }
    #[inline]
    pub fn set(&mut self, i: usize, c: usize) {
        self.data[i * self.stride + c / 64] ^= 1 << (c % 64);
    }
    pub fn swap_rows(&mut self, a: usize, b: usize) {
        if a != b {
            for w in 0..self.stride {
                self.data.swap(a * self.stride + w, b * self.stride + w);
            }
        }
    }
}

/// The `k ≤ 32` bits of `row` at columns `c..c + k`, column c in bit 0.
#[inline]
pub fn window(row: &[u64], c: usize, k: usize) -> u32 {
    let (w, b) = (c / 64, c % 64);
    let mut v = row[w] >> b;
    if b + k > 64 {
        v |= row[w + 1] << (64 - b);
    }
    (v & ((1u64 << k) - 1)) as u32
}

#[inline]
fn bit(row: &[u64], c: usize) -> bool {
    row[c / 64] >> (c % 64) & 1 == 1
}

#[inline]
fn xor_into(dst: &mut [u64], src: &[u64]) {
    for (d, s) in dst.iter_mut().zip(src) {
        *d ^= s;
    }
}

/// The 2^k sums of the k rows `basis` (each `width` words), in a table of 2^k rows:
/// entry s is the sum of the rows whose bit is set in s.
fn gray_table(table: &mut Vec<u64>, basis: &[Vec<u64>], width: usize) {
    let k = basis.len();
    table.clear();
    table.resize((1 << k) * width, 0);
    for s in 1usize..1 << k {
        let low = s.trailing_zeros() as usize;
        let prev = s & (s - 1);
        let (done, rest) = table.split_at_mut(s * width);
        let entry = &mut rest[..width];
        entry.copy_from_slice(&done[prev * width..(prev + 1) * width]);
        xor_into(entry, &basis[low]);
    }
}

/// Applies `f` to every row of `m` whose index is not in `skip`, in parallel when the work is
/// large enough.
fn for_rows(
    m: &mut BitMatrix,
    skip: std::ops::Range<usize>,
    width: usize,
    f: impl Fn(&mut [u64]) + Sync,
) {
    let stride = m.stride;
    if m.rows * width < PARALLEL_WORDS || rayon::current_num_threads() == 1 {
        for (i, row) in m.data.chunks_exact_mut(stride).enumerate() {
            if !skip.contains(&i) {
                f(row);
            }
        }
    } else {
        m.data
            .par_chunks_exact_mut(stride)
            .with_min_len(64)
            .enumerate()
            .for_each(|(i, row)| {
                if !skip.contains(&i) {
                    f(row);
                }
            });
    }
}

/// How many XORs of words a reduction performed (the statistics' "multiply-adds").
#[derive(Default)]
pub struct Work(pub u64);

/// The pivot rows fully reduced, restricted to the columns after the pivot ones: pivot i is a
/// list of distinct columns whose first is column i and the others larger, in any order (so the pivot columns are 0..pivots.len(),
/// pivot rows upper triangular), and row i of the result holds the bits, at columns
/// `pivots.len()..columns` shifted to 0, of pivot row i with every later pivot column cleared.
/// Computed from the last pivot up (back substitution): row i is its own columns beyond the
/// pivots plus the finished rows of the pivot columns it has. With X the result, a row r
/// reduces to its own columns beyond the pivots plus the rows of X at its pivot columns
/// ([`add_tail`]): the block elimination of Faugère and Lachartre (2010), with the pivot
/// block sparse and the rest dense.
pub fn pivot_tails(
    pivots: &[Vec<u32>],
    columns: usize,
    control: &Control,
    work: &mut Work,
) -> Result<BitMatrix> {
    let p = pivots.len();
    let mut x = BitMatrix::zeros(p, columns - p);
    let stride = x.stride;
    for i in (0..p).rev() {
        if i % 1024 == 0 {
            control.check()?;
        }
        let (head, done) = x.data.split_at_mut((i + 1) * stride);
        let row = &mut head[i * stride..];
        for &c in &pivots[i][1..] {
            let c = c as usize;
            if c < p {
                let j = c - i - 1;
                xor_into(row, &done[j * stride..(j + 1) * stride]);
                work.0 += stride as u64;
            } else {
                row[(c - p) / 64] ^= 1 << ((c - p) % 64);
            }
        }
    }
    Ok(x)
}

/// Adds to `out` (a row over the columns after the `x.rows` pivot ones) the reduction of the
/// row with distinct columns `row` (in any order) by the pivots whose finished tails are `x` (see
/// [`pivot_tails`]).
pub fn add_tail(row: &[u32], x: &BitMatrix, out: &mut [u64], work: &mut Work) {
    let p = x.rows;
    for &c in row {
        let c = c as usize;
        if c < p {
            xor_into(out, x.row(c));
            work.0 += x.stride as u64;
        } else {
            out[(c - p) / 64] ^= 1 << ((c - p) % 64);
        }
    }
}

/// A reduced row echelon form grown batch by batch: rows sorted by pivot column, each zero at
/// the other rows' pivot columns.
pub struct Echelon {
    pub rows: BitMatrix,
    pub pivot_cols: Vec<usize>,
    columns: usize,
}

impl Echelon {
    pub fn new(columns: usize) -> Self {
        Echelon {
            rows: BitMatrix::zeros(0, columns),
            pivot_cols: Vec::new(),
            columns,
        }
    }

    pub fn rank(&self) -> usize {
        self.pivot_cols.len()
    }

    /// Adds the rows of `batch` (of this form's width) to the row space.
    pub fn add(&mut self, mut batch: BitMatrix, control: &Control, work: &mut Work) -> Result<()> {
        reduce_by_echelon(&mut batch, &self.rows, &self.pivot_cols, control, work)?;
        let new_cols = row_echelon(&mut batch, 0, self.columns, control, work)?;
        if new_cols.is_empty() {
            return Ok(());
        }
        batch.rows = new_cols.len();
        batch.data.truncate(batch.rows * batch.stride);
        reduce_by_echelon(&mut self.rows, &batch, &new_cols, control, work)?;
        self.merge(batch, new_cols);
        Ok(())
    }

    /// Interleaves the rows of `other` (whose pivot columns are new) by pivot column.
    fn merge(&mut self, other: BitMatrix, other_cols: Vec<usize>) {
        let stride = self.rows.stride;
        let total = self.rank() + other_cols.len();
        let mut data = Vec::with_capacity(total * stride);
        let mut cols = Vec::with_capacity(total);
        let (mut a, mut b) = (0, 0);
        while a < self.rank() || b < other_cols.len() {
            let take_own =
                b == other_cols.len() || (a < self.rank() && self.pivot_cols[a] < other_cols[b]);
            if take_own {
                data.extend_from_slice(self.rows.row(a));
                cols.push(self.pivot_cols[a]);
                a += 1;
            } else {
                data.extend_from_slice(other.row(b));
                cols.push(other_cols[b]);
                b += 1;
            }
        }
        self.rows = BitMatrix {
            rows: total,
            stride,
            data,
        };
        self.pivot_cols = cols;
    }
}

/// Reduces every row of `m` by the rows of `e`, a reduced echelon form whose row j has its pivot
/// at column `cols[j]` (and zeros at the other pivot columns): eight rows of `e` at a time are
/// tabulated, and every row of `m` clears their eight columns with one table XOR.
pub fn reduce_by_echelon(
    m: &mut BitMatrix,
    e: &BitMatrix,
    cols: &[usize],
    control: &Control,
    work: &mut Work,
) -> Result<()> {
    if m.rows == 0 {
        return Ok(());
    }
    let mut table = Vec::new();
    let k = table_size(m.rows);
    for (block, block_cols) in cols.chunks(k).enumerate() {
        control.check()?;
        let start = block * k;
        let first_word = block_cols[0] / 64;
        let width = e.stride - first_word;
        let basis: Vec<Vec<u64>> = (start..start + block_cols.len())
            .map(|j| e.row(j)[first_word..].to_vec())
            .collect();
        gray_table(&mut table, &basis, width);
        let table = &table;
        for_rows(m, 0..0, width, |row| {
            let s = block_cols
                .iter()
                .enumerate()
                .fold(0, |s, (j, &c)| s | (usize::from(bit(row, c)) << j));
            if s != 0 {
                xor_into(&mut row[first_word..], &table[s * width..(s + 1) * width]);
            }
        });
        work.0 += ((1u64 << block_cols.len()) + m.rows as u64) * width as u64;
    }
    Ok(())
}

/// Rows per table column: k with 2^k about the number of rows, so that building a table costs
/// no more than using it.
fn table_size(rows: usize) -> usize {
    (usize::BITS - rows.leading_zeros()).clamp(1, MAX_K as u32) as usize
}

/// The reduced row echelon form of columns `first..columns` of `m` (columns before `first`
/// must be zero). Pivot rows end up as rows 0..rank in increasing pivot column; the returned
/// list gives their pivot columns. Rows after the rank are zero.
pub fn row_echelon(
    m: &mut BitMatrix,
    first: usize,
    columns: usize,
    control: &Control,
    work: &mut Work,
) -> Result<Vec<usize>> {
    let mut pivot_cols = Vec::new();
    let mut table = Vec::new();
    let k_max = table_size(m.rows);
    let mut c = first;
    while c < columns && pivot_cols.len() < m.rows {
        control.check()?;
        let k = k_max.min(columns - c);
        let r = pivot_cols.len();
        let found = find_window_pivots(m, r, c, k);
        if found.is_empty() {
            c += k;
            continue;
        }
        // Move the chosen rows to r, r+1, ... in the order found: they were found in
        // increasing row order from r on, so no swap moves a row chosen later.
        for (j, p) in found.iter().enumerate() {
            m.swap_rows(r + j, p.row);
        }
        let first_word = c / 64;
        let width = m.stride - first_word;
        let mut basis: Vec<Vec<u64>> = (0..found.len())
            .map(|j| m.row(r + j)[first_word..].to_vec())
            .collect();
        // Replay the eliminations of the window search, then clear every pivot bit from the
        // other pivot rows (later pivots first): the identity on the pivot columns.
        for (j, p) in found.iter().enumerate() {
            for l in 0..j {
                if p.combination >> l & 1 == 1 {
                    let (head, tail) = basis.split_at_mut(j);
                    xor_into(&mut tail[0], &head[l]);
                }
            }
        }
        let offset = c - first_word * 64;
        let pivot_bit: Vec<usize> = found.iter().map(|p| p.bit).collect();
        for j in (0..found.len()).rev() {
            for l in 0..found.len() {
                if l != j && bit(&basis[l], offset + pivot_bit[j]) {
                    let (a, b) = if l < j {
                        let (head, tail) = basis.split_at_mut(j);
                        (&mut head[l], &tail[0])
                    } else {
                        let (head, tail) = basis.split_at_mut(l);
                        (&mut tail[0], &head[j])
                    };
                    xor_into(a, b);
                }
            }
        }
        // Sort the pivots by column so the echelon form comes out in column order.
        let mut order: Vec<usize> = (0..found.len()).collect();
        order.sort_by_key(|&j| pivot_bit[j]);
        let basis: Vec<Vec<u64>> = order.iter().map(|&j| basis[j].clone()).collect();
        let bits: Vec<usize> = order.iter().map(|&j| pivot_bit[j]).collect();
        for (j, b) in basis.iter().enumerate() {
            m.row_mut(r + j)[first_word..].copy_from_slice(b);
        }
        gray_table(&mut table, &basis, width);
        let table = &table;
        let gather = |v: u32| -> usize {
            bits.iter()
                .enumerate()
                .fold(0, |s, (j, &b)| s | ((v as usize >> b & 1) << j))
        };
        for_rows(m, r..r + found.len(), width, |row| {
            let v = window(row, c, k);
            if v != 0 {
                let s = gather(v);
                xor_into(&mut row[first_word..], &table[s * width..(s + 1) * width]);
            }
        });
        work.0 += ((1u64 << found.len()) + m.rows as u64) * width as u64;
        pivot_cols.extend(bits.iter().map(|&b| c + b));
        c += k;
    }
    Ok(pivot_cols)
}

/// A pivot found in a window: its row, the bit (column offset in the window) it leads, and
/// which earlier pivots of the window were added to it.
struct WindowPivot {
    row: usize,
    bit: usize,
    combination: u32,
}

/// Up to k rows from `from` on whose k-bit windows at column `c` are independent, found by
/// elimination on the windows alone (small integers): each row's window is reduced by the
/// pivots found so far; a nonzero remainder makes the row a pivot at its lowest bit.
fn find_window_pivots(m: &BitMatrix, from: usize, c: usize, k: usize) -> Vec<WindowPivot> {
    let mut found: Vec<(WindowPivot, u32)> = Vec::new();
    for i in from..m.rows {
        let mut v = window(m.row(i), c, k);
        if v == 0 {
            continue;
        }
        let mut combination = 0u32;
        for (l, (p, value)) in found.iter().enumerate() {
            if v >> p.bit & 1 == 1 {
                v ^= value;
                combination ^= 1 << l;
            }
        }
        if v != 0 {
            let pivot = WindowPivot {
                row: i,
                bit: v.trailing_zeros() as usize,
                combination,
            };
            found.push((pivot, v));
            if found.len() == k {
                break;
            }
        }
    }
    found.into_iter().map(|(p, _)| p).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::rng::Rng;

    fn random(rows: usize, cols: usize, density: u64, rng: &mut Rng) -> BitMatrix {
        let mut m = BitMatrix::zeros(rows, cols);
        for i in 0..rows {
            for c in 0..cols {
                if rng.below(100) < density {
                    m.set(i, c);
                }
            }
        }
        m
    }

    /// Plain Gauss–Jordan elimination, one row XOR at a time: the textbook procedure the
    /// table-driven one must agree with.
    fn plain_rref(m: &mut BitMatrix, cols: usize) -> Vec<usize> {
        let mut r = 0;
        let mut pivots = vec![];
        for c in 0..cols {
            let Some(p) = (r..m.rows).find(|&i| bit(m.row(i), c)) else {
                continue;
            };
            m.swap_rows(r, p);
            let pivot = m.row(r).to_vec();
            for i in 0..m.rows {
                if i != r && bit(m.row(i), c) {
                    xor_into(m.row_mut(i), &pivot);
                }
            }
            pivots.push(c);
            r += 1;
        }
        pivots
    }

    #[test]
    fn echelon_form_agrees_with_plain_elimination() {
        let mut rng = Rng::new(7);
        for (rows, cols, density) in [(5, 9, 50), (40, 70, 30), (300, 200, 5), (130, 130, 50)] {
            let m = random(rows, cols, density, &mut rng);
            let (mut a, mut b) = (m.clone(), m.clone());
            let pa = row_echelon(&mut a, 0, cols, &Control::new(), &mut Work(0)).unwrap();
            let pb = plain_rref(&mut b, cols);
            assert_eq!(pa, pb);
            // The reduced echelon form of a row space is unique.
            assert_eq!(a.data, b.data, "{rows}x{cols}");
        }
    }

    fn random_pivots(p: usize, cols: usize, rng: &mut Rng) -> Vec<Vec<u32>> {
        (0..p)
            .map(|i| {
                let mut row: Vec<u32> = (i + 1..cols)
                    .filter(|_| rng.below(10) == 0)
                    .map(|c| c as u32)
                    .collect();
                row.insert(0, i as u32);
                row
            })
            .collect()
    }

    /// Reduction through the finished pivot tails equals plain substitution, pivot by pivot.
    #[test]
    fn pivot_tails_reduce_as_plain_substitution() {
        let mut rng = Rng::new(11);
        let (p, cols, rows) = (150, 230, 60);
        let pivots = random_pivots(p, cols, &mut rng);
        let m = random(rows, cols, 30, &mut rng);
        let x = pivot_tails(&pivots, cols, &Control::new(), &mut Work(0)).unwrap();
        let mut plain = m.clone();
        for i in 0..rows {
            for (c, pivot) in pivots.iter().enumerate() {
                if bit(plain.row(i), c) {
                    for &x in pivot {
                        plain.data[i * plain.stride + x as usize / 64] ^= 1 << (x % 64);
                    }
                }
            }
        }
        for i in 0..rows {
            let row: Vec<u32> = (0..cols as u32)
                .filter(|&c| bit(m.row(i), c as usize))
                .collect();
            let mut tail = vec![0u64; x.stride];
            add_tail(&row, &x, &mut tail, &mut Work(0));
            let expected: Vec<bool> = (p..cols).map(|c| bit(plain.row(i), c)).collect();
            let got: Vec<bool> = (0..cols - p).map(|c| bit(&tail, c)).collect();
            assert!((0..p).all(|c| !bit(plain.row(i), c)));
            assert_eq!(got, expected, "row {i}");
        }
    }

    /// An echelon form grown in batches of every size equals the plain reduced echelon form
    /// of all the rows at once.
    #[test]
    fn echelon_grown_in_batches_agrees_with_plain_elimination() {
        let mut rng = Rng::new(5);
        for (rows, cols, density, batch) in [(90, 70, 30, 7), (300, 150, 3, 64), (40, 200, 50, 1)] {
            let m = random(rows, cols, density, &mut rng);
            let mut plain = m.clone();
            let pivots = plain_rref(&mut plain, cols);
            let mut grown = Echelon::new(cols);
            for start in (0..rows).step_by(batch) {
                let end = (start + batch).min(rows);
                let mut part = BitMatrix::zeros(end - start, cols);
                part.data
                    .copy_from_slice(&m.data[start * m.stride..end * m.stride]);
                grown.add(part, &Control::new(), &mut Work(0)).unwrap();
            }
            assert_eq!(grown.pivot_cols, pivots);
            assert_eq!(
                grown.rows.data,
                plain.data[..pivots.len() * plain.stride],
                "{rows}x{cols} in batches of {batch}"
            );
        }
    }
}
