//! Critical pairs and their pruning by the Gebauer–Möller criteria (Gebauer and Möller 1988,
//! in the form of Becker and Weispfenning, *Gröbner Bases*, 1993, procedure UPDATE).
//! Shared by every engine: engines differ in how they reduce pairs, not in which they keep.

use crate::monomial::{MaskLayout, Monomial};
use crate::order::MonomialOrder;

/// Which pending pairs an engine reduces next: one rule shared by every engine.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Selection {
    /// All pairs whose lcm has the least total degree: the normal strategy (Buchberger 1985;
    /// as used by Faugère 1999 for F4), right for orders that compare degrees first.
    LeastDegree,
    /// All pairs of least sugar (Giovini, Mora, Niesi, Robbiano and Traverso 1991).
    LeastSugar,
    /// Among the pairs of least sugar, those whose lcm is least in the monomial order: the
    /// normal strategy of the order itself, with sugar first. Under lex and block orders the
    /// whole sugar degree at once can run far above the degrees the basis needs (all pairs of
    /// one sugar may include lcms that are large in the order, whose S-polynomials reduce to
    /// dense high-degree remainders before the small ones have been found).
    LeastLcm,
}

impl Selection {
    /// The rule for a batch engine (F4) under `order`.
    pub fn for_order(order: &MonomialOrder) -> Selection {
        if order.is_degree_compatible() {
            Selection::LeastDegree
        } else {
            Selection::LeastLcm
        }
    }
}

#[derive(Clone, Debug)]
pub struct Pair {
    pub i: usize,
    pub j: usize,
    pub lcm: Monomial,
    /// Sugar degree (Giovini, Mora, Niesi, Robbiano, Traverso 1991) of the S-polynomial.
    pub sugar: u32,
    /// Divisibility mask of `lcm` (see [`MaskLayout`]): the union of the two leading
    /// monomials' masks, since each bit tests one exponent against a threshold.
    mask: u64,
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
    /// Divisibility masks of `leads`, in the layout set by the first element.
    lead_masks: Vec<u64>,
    layout: MaskLayout,
}

impl PairSet {
    fn pair(&self, i: usize, j: usize) -> Pair {
        let lcm = self.leads[i].lcm(&self.leads[j]);
        let s_i = self.sugars[i] + (lcm.degree() - self.leads[i].degree());
        let s_j = self.sugars[j] + (lcm.degree() - self.leads[j].degree());
        Pair {
            i,
            j,
            mask: self.lead_masks[i] | self.lead_masks[j],
            lcm,
            sugar: s_i.max(s_j),
        }
    }

    /// Adds a basis element with leading monomial `lead` and sugar `sugar`; returns its index.
    pub fn insert(&mut self, lead: Monomial, sugar: u32) -> usize {
        if self.leads.is_empty() {
            self.layout = MaskLayout::new(lead.nvars());
        }
        let t = self.leads.len();
        let h_mask = self.layout.mask(lead.exponents());
        self.leads.push(lead);
        self.lead_masks.push(h_mask);
        self.sugars.push(sugar);
        self.active.push(true);
        let h = &self.leads[t];

        // New pairs {g, h}: keep one per lcm, and none whose lcm is a multiple of another's.
        // Candidates are tested before their lcm is built (most are dropped).
        let candidates: Vec<Candidate> = (0..t)
            .filter(|&g| self.active[g])
            .map(|g| Candidate {
                g,
                mask: self.lead_masks[g] | h_mask,
                degree: lcm_degree(&self.leads[g], h),
                coprime: self.leads[g].coprime(h),
            })
            .collect();
        let kept: Vec<Pair> = undominated(candidates, &self.leads, h)
            .into_iter()
            .map(|g| self.pair(g, t))
            .collect();

        // Old pairs whose lcm is a multiple of lead(h), strictly "in between" (chain criterion).
        let leads = &self.leads;
        self.pairs.retain(|p| {
            h_mask & !p.mask != 0
                || !h.divides(&p.lcm)
                || leads[p.i].lcm_is(h, &p.lcm)
                || leads[p.j].lcm_is(h, &p.lcm)
        });
        self.pairs.extend(kept);

        for g in 0..t {
            if self.active[g] && h_mask & !self.lead_masks[g] == 0 && h.divides(&self.leads[g]) {
                self.active[g] = false;
            }
        }
        t
    }

    /// Removes and returns the next pairs to reduce by `selection`; `limit` caps how many (the
    /// others wait for the next call).
    pub fn take(
        &mut self,
        selection: Selection,
        order: &MonomialOrder,
        limit: Option<usize>,
    ) -> Vec<Pair> {
        match selection {
            Selection::LeastDegree => self.take_lowest_by(limit, |p| p.lcm.degree()),
            Selection::LeastSugar => self.take_lowest_by(limit, |p| p.sugar),
            Selection::LeastLcm => self.take_least_lcm(order, limit),
        }
    }

    fn take_lowest_by(&mut self, limit: Option<usize>, key: impl Fn(&Pair) -> u32) -> Vec<Pair> {
        let Some(min) = self.pairs.iter().map(&key).min() else {
            return vec![];
        };
        let (now, later): (Vec<Pair>, Vec<Pair>) =
            self.pairs.drain(..).partition(|p| key(p) == min);
        self.pairs = later;
        self.keep_at_most(now, limit)
    }

    /// The pairs of least sugar whose lcm is the least in `order` among them.
    fn take_least_lcm(&mut self, order: &MonomialOrder, limit: Option<usize>) -> Vec<Pair> {
        let Some(sugar) = self.pairs.iter().map(|p| p.sugar).min() else {
            return vec![];
        };
        let least = self
            .pairs
            .iter()
            .filter(|p| p.sugar == sugar)
            .map(|p| &p.lcm)
            .min_by(|a, b| order.cmp(a, b))
            .expect("a pair of that sugar")
            .clone();
        let (now, later): (Vec<Pair>, Vec<Pair>) = self
            .pairs
            .drain(..)
            .partition(|p| p.sugar == sugar && p.lcm == least);
        self.pairs = later;
        self.keep_at_most(now, limit)
    }

    /// The first `limit` of `now` (at least one); the rest go back to the pending pairs.
    fn keep_at_most(&mut self, mut now: Vec<Pair>, limit: Option<usize>) -> Vec<Pair> {
        if let Some(limit) = limit {
            if now.len() > limit.max(1) {
                self.pairs.extend(now.drain(limit.max(1)..));
            }
        }
        now
    }

    /// Drops the pending pairs of sugar at most `degree`: for a basis that is complete up to
    /// that (homogeneous) degree, their S-polynomials have standard representations already.
    pub fn drop_up_to_sugar(&mut self, degree: u32) {
        self.pairs.retain(|p| p.sugar > degree);
    }

    /// Indices of the elements still needed for the final basis.
    pub fn active_indices(&self) -> Vec<usize> {
        (0..self.leads.len()).filter(|&i| self.active[i]).collect()
    }
}

/// A new pair {g, h} before its lcm is built: the lcm's mask and degree.
#[derive(Clone, Copy)]
struct Candidate {
    g: usize,
    mask: u64,
    degree: u32,
    coprime: bool,
}

fn lcm_degree(a: &Monomial, b: &Monomial) -> u32 {
    let sum: u64 = a
        .exponents()
        .iter()
        .zip(b.exponents())
        .map(|(x, y)| u64::from(*x.max(y)))
        .sum();
    u32::try_from(sum).unwrap_or(u32::MAX)
}

/// The candidates (given by increasing g) by (degree, coprime first, g): a stable counting
/// sort, as the degrees span a short range and there are often thousands of candidates.
fn sorted_by_degree(candidates: Vec<Candidate>) -> Vec<Candidate> {
    let Some(low) = candidates.iter().map(|c| c.degree).min() else {
        return candidates;
    };
    let key = |c: &Candidate| 2 * (c.degree - low) as usize + usize::from(!c.coprime);
    let mut starts = vec![0usize; candidates.iter().map(key).max().unwrap_or(0) + 2];
    for c in &candidates {
        starts[key(c) + 1] += 1;
    }
    for k in 1..starts.len() {
        starts[k] += starts[k - 1];
    }
    let mut sorted = candidates.clone();
    for c in candidates {
        let k = key(&c);
        sorted[starts[k]] = c;
        starts[k] += 1;
    }
    sorted
}

/// Whether lcm(a, h) divides lcm(b, h).
fn lcm_divides_lcm(a: &Monomial, b: &Monomial, h: &Monomial) -> bool {
    let (a, b) = (a.exponents(), b.exponents());
    h.exponents()
        .iter()
        .zip(a.iter().zip(b))
        .all(|(z, (x, y))| x.max(z) <= y.max(z))
}

/// The new pairs kept by the Gebauer–Möller criterion on new pairs and Buchberger's product
/// criterion, by decreasing g. A pair p is dropped when it is coprime, or when another
/// candidate q has an lcm dividing p's and either a smaller lcm, or the same lcm and (q is
/// coprime or q.g < p.g): of equal lcms the first is kept, unless one is coprime (then all go).
/// This is the outcome of the usual one-by-one procedure (each candidate tested against those
/// not yet tested and those kept), in closed form.
///
/// Candidates are visited by (degree, coprime first, g), so every q that can drop p comes before
/// it; p is tested only against the candidates not dropped so far and the coprime ones (a
/// dropped, not coprime q that would drop p was itself dropped by one of those, which then
/// drops p too).
fn undominated(candidates: Vec<Candidate>, leads: &[Monomial], h: &Monomial) -> Vec<usize> {
    let candidates = sorted_by_degree(candidates);
    let mut witnesses: Vec<&Candidate> = Vec::new();
    let mut kept = Vec::new();
    for p in &candidates {
        let dropped = witnesses.iter().any(|q| {
            q.mask & !p.mask == 0
                && (q.degree < p.degree || q.coprime || q.g < p.g)
                && lcm_divides_lcm(&leads[q.g], &leads[p.g], h)
        });
        if p.coprime || !dropped {
            witnesses.push(p);
        }
        if !p.coprime && !dropped {
            kept.push(p.g);
        }
    }
    kept.sort_unstable_by(|a, b| b.cmp(a));
    kept
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::rng::Rng;

    /// The update as usually written, one candidate at a time: each new pair is tested against
    /// the candidates not yet tested and those kept; then the product and chain criteria.
    fn update_one_by_one(before: &PairSet, h: &Monomial) -> Vec<(usize, usize)> {
        let t = before.leads.len();
        let lcm = |a: &Monomial| a.lcm(h);
        let mut candidates: Vec<usize> = (0..t).filter(|&g| before.active[g]).collect();
        let mut kept: Vec<usize> = Vec::new();
        while let Some(g) = candidates.pop() {
            let l = lcm(&before.leads[g]);
            let coprime = before.leads[g].coprime(h);
            let dominated = candidates
                .iter()
                .chain(kept.iter())
                .any(|&q| lcm(&before.leads[q]).divides(&l));
            if coprime || !dominated {
                kept.push(g);
            }
        }
        kept.retain(|&g| !before.leads[g].coprime(h));
        let mut pairs: Vec<(usize, usize)> = before
            .pairs
            .iter()
            .filter(|p| {
                !(h.divides(&p.lcm)
                    && before.leads[p.i].lcm(h) != p.lcm
                    && before.leads[p.j].lcm(h) != p.lcm)
            })
            .map(|p| (p.i, p.j))
            .collect();
        pairs.extend(kept.into_iter().map(|g| (g, t)));
        pairs
    }

    #[test]
    fn closed_form_update_matches_the_one_by_one_procedure() {
        // Random leading monomials with small exponents give many equal and dividing lcms.
        let mut rng = Rng::new(7);
        for (case, nvars) in (0..60).zip([2usize, 3, 4, 5].iter().cycle()) {
            let mut pairs = PairSet::default();
            for _ in 0..(60 + 5 * case) {
                let exps = (0..*nvars).map(|_| rng.below(4) as u32).collect();
                let h = Monomial::from_exponents(exps).unwrap();
                let expected = update_one_by_one(&pairs, &h);
                pairs.insert(h, 0);
                let got: Vec<(usize, usize)> = pairs.pairs.iter().map(|p| (p.i, p.j)).collect();
                assert_eq!(got, expected, "case {case}");
            }
        }
    }
}
