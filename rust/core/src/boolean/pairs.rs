//! Critical pairs of a Boolean basis: the S-pairs of two elements, pruned by the criteria of
//! Gebauer and Möller (1988, in the form of procedure UPDATE of Becker and Weispfenning 1993),
//! and the pairs with the field equations x_v^2 + x_v, which are kept implicit.
//!
//! A Boolean basis G stands for G ∪ {x_v^2 + x_v} in GF(2)[x]. The pair of g with x_v^2 + x_v
//! has coprime leading monomials unless x_v divides lm(g) (Buchberger's first criterion drops
//! it then); otherwise its S-polynomial, reduced by the field equations, is x_v·g with x·x = x.
//! Those "field pairs" are never pruned (keeping a pair is always safe). The pairs between field
//! equations are coprime, and a field-equation pair never prunes a pair of G, since its lcm is
//! not square-free; so UPDATE restricted to G is UPDATE on the whole set minus some prunings of
//! field pairs.

use super::monomial::Bits;

#[derive(Clone, Copy, Debug)]
pub enum PairKind {
    /// The S-pair of basis elements i and j.
    Basis(usize, usize),
    /// x_v times basis element i.
    Field(usize, usize),
}

#[derive(Clone, Copy, Debug)]
pub struct Pair<const W: usize> {
    pub kind: PairKind,
    /// The lcm of the leading monomials (basis pairs) or the leading monomial (field pairs).
    pub lcm: Bits<W>,
    /// Degree at which the pair is handled: that of the lcm (basis pairs) or of x_v·g.
    pub degree: u32,
}

/// The pending pairs and which basis elements are still needed.
#[derive(Default)]
pub struct PairSet<const W: usize> {
    pub leads: Vec<Bits<W>>,
    /// An element whose leading monomial a newer element divides is retired: no new pairs, no
    /// reductions, but pending pairs may still refer to it.
    pub active: Vec<bool>,
    pub pairs: Vec<Pair<W>>,
}

impl<const W: usize> PairSet<W> {
    /// Adds a basis element with leading monomial `lead`, whose products x_v·g (x_v in the lead)
    /// have the degrees `field_degrees`; returns its index.
    pub fn insert(&mut self, lead: Bits<W>, field_degrees: &[(usize, u32)]) -> usize {
        let t = self.leads.len();
        let kept = self.new_pairs(&lead);
        // Criterion B on the old pairs of G.
        let leads = &self.leads;
        self.pairs.retain(|pair| match pair.kind {
            PairKind::Basis(i, j) => {
                !(lead.divides(&pair.lcm)
                    && leads[i].union(&lead) != pair.lcm
                    && leads[j].union(&lead) != pair.lcm)
            }
            PairKind::Field(..) => true,
        });
        for (g, lcm) in kept {
            self.pairs.push(Pair {
                kind: PairKind::Basis(g, t),
                lcm,
                degree: lcm.degree(),
            });
        }
        for &(v, degree) in field_degrees {
            self.pairs.push(Pair {
                kind: PairKind::Field(t, v),
                lcm: lead,
                degree,
            });
        }
        for g in 0..t {
            if self.active[g] && lead.divides(&self.leads[g]) {
                self.active[g] = false;
            }
        }
        self.leads.push(lead);
        self.active.push(true);
        t
    }

    /// The new pairs {g, h} that criteria M and F keep (Buchberger's first criterion then drops
    /// the coprime ones): a pair goes when another new pair's lcm divides its lcm, one pair
    /// stays of those with equal lcms, and coprime pairs prune others but are not kept.
    /// lcm(g', h) divides lcm(g, h) exactly when lm(g') \ lm(h) ⊆ lm(g) \ lm(h), so the pairs
    /// are visited by increasing size of that set; a pair survives when no survivor's set is
    /// inside its own. Sets of one variable are kept as a mask, so that most pairs are decided
    /// by one AND.
    fn new_pairs(&self, lead: &Bits<W>) -> Vec<(usize, Bits<W>)> {
        let mut candidates: Vec<(usize, Bits<W>, bool)> = (0..self.leads.len())
            .filter(|&g| self.active[g])
            .map(|g| (g, self.leads[g].minus(lead), self.leads[g].coprime(lead)))
            .collect();
        // Among equal sets the coprime pair comes first: it prunes the others.
        candidates.sort_by_key(|c| (c.1.degree(), !c.2));
        let mut single = Bits::<W>::ONE;
        let mut larger: Vec<Bits<W>> = Vec::new();
        let mut kept = Vec::new();
        for (g, rest, coprime) in candidates {
            if !rest.coprime(&single) || larger.iter().any(|d| d.divides(&rest)) {
                continue;
            }
            if rest.degree() == 1 {
                single = single.union(&rest);
            } else {
                larger.push(rest);
            }
            if !coprime {
                kept.push((g, rest.union(lead)));
            }
        }
        kept
    }

    /// Removes and returns the pairs of the lowest degree (the normal strategy).
    pub fn take_lowest(&mut self) -> Vec<Pair<W>> {
        let Some(low) = self.pairs.iter().map(|p| p.degree).min() else {
            return Vec::new();
        };
        let (taken, rest): (Vec<_>, Vec<_>) = self.pairs.iter().partition(|p| p.degree == low);
        self.pairs = rest;
        taken
    }
}
