//! Krull dimension of R/I from the leading monomials of a Gröbner basis, by maximal independent
//! sets of variables (Kredel and Weispfenning 1988): a set S of variables is independent modulo
//! in(I) when no leading monomial involves only variables of S; dim R/I is the largest size of
//! such a set, for any monomial order.
//!
//! The search is a depth-first branch and bound over variables, trying the *last* variables first
//! so that the parameters it proposes sit at the small end of grevlex, where later steps (Noether
//! normalization) find them cheapest.

use crate::monomial::Monomial;

/// Variable sets as bit vectors.
#[derive(Clone, PartialEq, Eq, Debug)]
struct VarSet(Vec<u64>);

impl VarSet {
    fn empty(n: usize) -> Self {
        VarSet(vec![0; n.div_ceil(64).max(1)])
    }
    fn support(m: &Monomial) -> Self {
        let mut s = VarSet::empty(m.nvars());
        for (i, &e) in m.exponents().iter().enumerate() {
            if e > 0 {
                s.insert(i);
            }
        }
        s
    }
    fn insert(&mut self, i: usize) {
        self.0[i / 64] |= 1 << (i % 64);
    }
    fn remove(&mut self, i: usize) {
        self.0[i / 64] &= !(1 << (i % 64));
    }
    fn contains(&self, i: usize) -> bool {
        self.0[i / 64] >> (i % 64) & 1 == 1
    }
    fn is_subset(&self, other: &VarSet) -> bool {
        self.0.iter().zip(&other.0).all(|(a, b)| a & !b == 0)
    }
    fn members(&self, n: usize) -> Vec<usize> {
        (0..n).filter(|&i| self.contains(i)).collect()
    }
}

/// Supports of the leading monomials, without those containing another (they add nothing).
fn minimal_supports(leads: &[Monomial]) -> Vec<VarSet> {
    let mut supports: Vec<VarSet> = leads.iter().map(VarSet::support).collect();
    supports.sort_by_key(|s| s.0.iter().map(|w| w.count_ones()).sum::<u32>());
    let mut minimal: Vec<VarSet> = Vec::new();
    for s in supports {
        if !minimal.iter().any(|m| m.is_subset(&s)) {
            minimal.push(s);
        }
    }
    minimal
}

struct Search {
    n: usize,
    supports: Vec<VarSet>,
    best: usize,
    /// Independent sets of size `best` found so far (when enumerating).
    found: Vec<Vec<usize>>,
    limit: usize,
}

impl Search {
    fn independent_with(&self, set: &VarSet, i: usize) -> bool {
        // Only supports containing i can become subsets by adding i.
        self.supports
            .iter()
            .all(|s| !s.contains(i) || !s.is_subset(set))
    }

    /// Variables `order[pos..]` still to decide; `set` holds those included.
    fn run(&mut self, order: &[usize], pos: usize, set: &mut VarSet, size: usize, enumerate: bool) {
        let remaining = order.len() - pos;
        if size + remaining < self.best
            || (!enumerate && size + remaining == self.best && !self.found.is_empty())
        {
            return;
        }
        if self.found.len() >= self.limit && size + remaining <= self.best {
            return;
        }
        if pos == order.len() {
            if size > self.best {
                self.best = size;
                self.found.clear();
            }
            if size == self.best && self.found.len() < self.limit {
                self.found.push(set.members(self.n));
            }
            return;
        }
        let i = order[pos];
        set.insert(i);
        if self.independent_with(set, i) {
            self.run(order, pos + 1, set, size + 1, enumerate);
        }
        set.remove(i);
        self.run(order, pos + 1, set, size, enumerate);
    }
}

fn search(n: usize, leads: &[Monomial], enumerate: bool, limit: usize) -> Option<Search> {
    if leads.iter().any(|m| m.is_one()) {
        return None;
    }
    let mut s = Search {
        n,
        supports: minimal_supports(leads),
        best: 0,
        found: vec![],
        limit,
    };
    let order: Vec<usize> = (0..n).rev().collect();
    s.run(&order, 0, &mut VarSet::empty(n), 0, enumerate);
    Some(s)
}

/// Krull dimension of k[x_0..x_{n-1}]/I from the leading monomials of a Gröbner basis of I;
/// -1 for the unit ideal.
pub fn krull_dimension(n: usize, leads: &[Monomial]) -> i64 {
    search(n, leads, false, 1).map_or(-1, |s| s.best as i64)
}

/// One independent set of largest size (sorted variable indices); `None` for the unit ideal.
pub fn independent_variables(n: usize, leads: &[Monomial]) -> Option<Vec<usize>> {
    search(n, leads, false, 1).map(|s| s.found.into_iter().next().unwrap_or_default())
}

/// Up to `limit` independent sets of largest size, the ones made of later variables first.
pub fn maximum_independent_sets(n: usize, leads: &[Monomial], limit: usize) -> Vec<Vec<usize>> {
    search(n, leads, true, limit.max(1))
        .map(|s| s.found)
        .unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn m(e: &[u32]) -> Monomial {
        Monomial::from_exponents(e.to_vec()).unwrap()
    }

    #[test]
    fn textbook_dimensions() {
        // in(I) = (xy) in k[x, y]: the coordinate cross, dimension 1, independent {y} or {x}.
        assert_eq!(krull_dimension(2, &[m(&[1, 1])]), 1);
        assert_eq!(
            maximum_independent_sets(2, &[m(&[1, 1])], 10),
            vec![vec![1], vec![0]]
        );
        // Zero ideal: all variables; unit ideal: -1; (x^2, y^3): dimension 0.
        assert_eq!(krull_dimension(3, &[]), 3);
        assert_eq!(independent_variables(3, &[]), Some(vec![0, 1, 2]));
        assert_eq!(krull_dimension(2, &[m(&[0, 0])]), -1);
        assert_eq!(krull_dimension(2, &[m(&[2, 0]), m(&[0, 3])]), 0);
        // Twisted cubic, grevlex leading monomials y^2, xz... of (xz - y^2, yw - z^2, xw - yz)
        // in k[x, y, z, w]: the cone has dimension 2 (Cox–Little–O'Shea, from memory).
        let leads = [
            m(&[0, 2, 0, 0]),
            m(&[1, 0, 1, 0]),
            m(&[0, 1, 1, 0]),
            m(&[0, 0, 2, 0]),
        ];
        assert_eq!(krull_dimension(4, &leads), 2);
    }

    #[test]
    fn many_variables_use_several_words() {
        let n = 130;
        let leads: Vec<Monomial> = (0..n - 1).map(|i| Monomial::var_power(n, i, 2)).collect();
        assert_eq!(krull_dimension(n, &leads), 1);
        assert_eq!(independent_variables(n, &leads), Some(vec![n - 1]));
    }
}
