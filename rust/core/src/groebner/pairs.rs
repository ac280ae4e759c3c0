//! Critical pairs and their pruning by the Gebauer–Möller criteria (Gebauer and Möller 1988,
//! in the form of Becker and Weispfenning, *Gröbner Bases*, 1993, procedure UPDATE).
//! Shared by every engine: engines differ in how they reduce pairs, not in which they keep.

use crate::monomial::Monomial;

#[derive(Clone, Debug)]
pub struct Pair {
    pub i: usize,
    pub j: usize,
    pub lcm: Monomial,
    /// Sugar degree (Giovini, Mora, Niesi, Robbiano, Traverso 1991) of the S-polynomial.
    pub sugar: u32,
}

/// The basis under construction as leading monomials, sugars and which elements are still
/// needed (an element whose leading monomial is divisible by a newer one's is retired but keeps
/// its index, since pending pairs may still refer to it).
#[derive(Default)]
pub struct PairSet {
    pub leads: Vec<Monomial>,
    pub sugars: Vec<u32>,
    pub active: Vec<bool>,
    pub pairs: Vec<Pair>,
}

impl PairSet {
    fn pair(&self, i: usize, j: usize) -> Pair {
        let lcm = self.leads[i].lcm(&self.leads[j]);
        let s_i = self.sugars[i] + (lcm.degree() - self.leads[i].degree());
        let s_j = self.sugars[j] + (lcm.degree() - self.leads[j].degree());
        Pair {
            i,
            j,
            lcm,
            sugar: s_i.max(s_j),
        }
    }

    /// Adds a basis element with leading monomial `lead` and sugar `sugar`; returns its index.
    pub fn insert(&mut self, lead: Monomial, sugar: u32) -> usize {
        let t = self.leads.len();
        self.leads.push(lead);
        self.sugars.push(sugar);
        self.active.push(true);
        let h = &self.leads[t];

        // New pairs {g, h}: keep one per lcm, and none whose lcm is a multiple of another's.
        let mut candidates: Vec<Pair> = (0..t)
            .filter(|&g| self.active[g])
            .map(|g| self.pair(g, t))
            .collect();
        let mut kept: Vec<Pair> = Vec::new();
        while let Some(p) = candidates.pop() {
            let coprime = self.leads[p.i].coprime(h);
            let dominated = candidates
                .iter()
                .chain(kept.iter())
                .any(|q| q.lcm.divides(&p.lcm));
            if coprime || !dominated {
                kept.push(p);
            }
        }
        // Buchberger's product criterion: coprime leading monomials reduce to zero.
        kept.retain(|p| !self.leads[p.i].coprime(h));

        // Old pairs whose lcm is a multiple of lead(h), strictly "in between" (chain criterion).
        let leads = &self.leads;
        self.pairs.retain(|p| {
            !(h.divides(&p.lcm) && leads[p.i].lcm(h) != p.lcm && leads[p.j].lcm(h) != p.lcm)
        });
        self.pairs.extend(kept);

        for g in 0..t {
            if self.active[g] && h.divides(&self.leads[g]) {
                self.active[g] = false;
            }
        }
        t
    }

    /// Removes and returns the pairs of least sugar (ties: all of that sugar), for engines that
    /// handle a whole degree at once; `limit` caps how many.
    pub fn take_lowest(&mut self, limit: Option<usize>) -> Vec<Pair> {
        self.take_lowest_by(limit, |p| p.sugar)
    }

    /// The normal selection strategy (Buchberger 1985; as used by Faugère 1999 for F4): removes
    /// and returns all pairs whose lcm has the least total degree; `limit` caps how many, the
    /// rest wait for the next step.
    pub fn take_lowest_degree(&mut self, limit: Option<usize>) -> Vec<Pair> {
        self.take_lowest_by(limit, |p| p.lcm.degree())
    }

    fn take_lowest_by(&mut self, limit: Option<usize>, key: impl Fn(&Pair) -> u32) -> Vec<Pair> {
        let Some(min) = self.pairs.iter().map(&key).min() else {
            return vec![];
        };
        let (mut now, later): (Vec<Pair>, Vec<Pair>) =
            self.pairs.drain(..).partition(|p| key(p) == min);
        self.pairs = later;
        if let Some(limit) = limit {
            if now.len() > limit.max(1) {
                self.pairs.extend(now.drain(limit.max(1)..));
            }
        }
        now
    }

    /// Indices of the elements still needed for the final basis.
    pub fn active_indices(&self) -> Vec<usize> {
        (0..self.leads.len()).filter(|&i| self.active[i]).collect()
    }
}
