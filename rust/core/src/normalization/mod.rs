//! Noether normalization with a checkable certificate (Noether 1926; constructive form after
//! Nagata 1962): parameters p_1..p_d, d = dim R/I, such that k[p_1..p_d] -> R/I is injective
//! and R/I is a finite k[p]-module, with a monic equation over k[p] for every variable.
//!
//! The search tries the simplest change of coordinates first and stops at the first that works:
//! 1. *variables*: a maximal independent set of the leading ideal (Kredel and Weispfenning
//!    1988); the grevlex basis every caller computes anyway proves it at no cost when the other
//!    variables have pure powers in its leading ideal (see [`finiteness`]);
//! 2. *linear*: sparse unit-triangular shifts x_s -> x_s + c·x_b of the parameters by the
//!    variables that lack pure powers, then dense random linear forms when the field is large
//!    enough for them to succeed with good probability (Schwartz 1980, Zippel 1979);
//! 3. *nonlinear*: Nagata's substitutions with the smallest exponents that work ([`nagata`]),
//!    which always succeed.
//!
//! Every candidate of steps 1 and 2 is first tested in grevlex with the parameters last, one
//! basis about as cheap as the user's own, which proves finiteness whenever pure powers appear
//! and, for a random linear change over a large field, almost always does. Only when every
//! candidate fails there are they tested again in the elimination order, which is exact but
//! can cost a thousand times more ([`finiteness::test_change`]). The certificate then comes from
//! the basis that proved finiteness, by the determinant trick ([`certificate`]).

pub mod certificate;
pub mod changes;
pub mod charpoly;
pub mod finiteness;
pub mod nagata;
pub mod scalars;

#[cfg(test)]
mod tests;

use crate::control::Control;
use crate::dimension::{krull_dimension, maximum_independent_sets};
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use changes::{complement, dense_linear, field_size, sparse_linear, Change, Rng};
use finiteness::{missing_pure_powers, proof_from_basis, test_change, Proof, Test};

pub use certificate::{check_certificate, CertificateText};

/// The kind of coordinate change that produced the parameters.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Strategy {
    Variables,
    Linear,
    Nonlinear,
}

impl Strategy {
    pub fn name(&self) -> &'static str {
        match self {
            Strategy::Variables => "variables",
            Strategy::Linear => "linear",
            Strategy::Nonlinear => "nonlinear",
        }
    }
    pub fn from_name(name: &str) -> Option<Self> {
        match name {
            "variables" => Some(Strategy::Variables),
            "linear" => Some(Strategy::Linear),
            "nonlinear" => Some(Strategy::Nonlinear),
            _ => None,
        }
    }
}

/// The names callers may give for a strategy: the one list every front end reads.
pub const STRATEGY_NAMES: &[&str] = &["auto", "variables", "linear", "nonlinear"];

/// What the caller asks for: `Auto` tries variables, linear, nonlinear in turn; the others try
/// only that kind (and fail with a clear error when it does not work).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Request {
    #[default]
    Auto,
    Only(Strategy),
}

impl Request {
    pub fn from_name(name: &str) -> Result<Self> {
        match name {
            "auto" => Ok(Request::Auto),
            other => Strategy::from_name(other)
                .map(Request::Only)
                .ok_or_else(|| {
                    Error::invalid(format!(
                        "unknown normalization strategy '{other}': expected one of {}",
                        STRATEGY_NAMES.join(", ")
                    ))
                }),
        }
    }
    fn allows(&self, s: Strategy) -> bool {
        matches!(self, Request::Auto) || *self == Request::Only(s)
    }
}

#[derive(Clone, Copy, Debug, Default)]
pub struct Options {
    pub request: Request,
    /// Seed of every random choice: the same seed gives the same result.
    pub seed: u64,
}

/// A Noether normalization and its certificate (keys of the public interface).
#[derive(Clone, Debug)]
pub struct FiniteProjection<F: Field> {
    /// The ring of the ideal (original variables and order).
    pub ring: Ring<F>,
    pub dimension: usize,
    /// p_1..p_d in the original variables.
    pub parameters: Vec<Poly<F>>,
    /// k[t_1..t_d], the symbols standing for the parameters (named to avoid the ring's names).
    pub parameter_ring: Ring<F>,
    /// y_1..y_n in the original variables, y_1..y_d = p_1..p_d.
    pub coordinates: Vec<Poly<F>>,
    /// The ring of y_1..y_n: the parameter symbols, then the names of the other coordinates.
    pub coordinate_ring: Ring<F>,
    /// Each original variable written in y_1..y_n.
    pub inverse: Vec<Poly<F>>,
    /// For every original variable x: [1, c_{m-1}, ..., c_0] in k[t], with
    /// x^m + c_{m-1}(p) x^{m-1} + ... + c_0(p) in I.
    pub equations: Vec<Vec<Poly<F>>>,
    /// Generators of R/I as a k[p]-module.
    pub module_generators: Vec<Poly<F>>,
    /// dim over k(p) of R/I ⊗ k(p): the degree of the projection.
    pub rank: usize,
    pub strategy: Strategy,
    /// The input is homogeneous and so are the parameters.
    pub homogeneous: bool,
}

/// Sparse linear tries before dense ones, and dense tries when the field is large enough.
const SPARSE_TRIES: usize = 2;
const DENSE_TRIES: usize = 3;
/// Extra random linear tries for homogeneous input over a field too small for the probability
/// bound: homogeneous linear parameters are preferred when they exist over the field.
const SMALL_FIELD_HOMOGENEOUS_TRIES: usize = 4;
/// Independent sets tested with an elimination basis when the free test fails.
const VARIABLE_SET_TRIES: usize = 2;
/// Largest number of maximal independent sets examined by the free test.
const INDEPENDENT_SET_LIMIT: usize = 64;

/// A Noether normalization of the ideal generated by `gens` in `ring`.
pub fn noether_normalization<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    options: &Options,
    control: &Control,
) -> Result<FiniteProjection<F>> {
    noether_normalization_from(ring, gens, None, options, control)
}

/// The same, from the reduced grevlex basis of `gens` when the caller already has it (its
/// elements, in the order the basis computation returned them): that basis is where the
/// search starts, so it is not computed twice. It is trusted, not checked.
pub fn noether_normalization_from<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    grevlex_basis: Option<Vec<Poly<F>>>,
    options: &Options,
    control: &Control,
) -> Result<FiniteProjection<F>> {
    let mut search = Search::new(ring, gens, grevlex_basis, options, control)?;
    let (change, proof, strategy) = search.run()?;
    let homogeneous = search.homogeneous && change.is_linear();
    certificate::build(ring, &change, &proof, strategy, homogeneous, control)
}

/// State shared by the stages of the search.
struct Search<'a, F: Field> {
    ring: &'a Ring<F>,
    gens: &'a [Poly<F>],
    options: &'a Options,
    control: &'a Control,
    grevlex: ReducedBasis<F>,
    dimension: usize,
    homogeneous: bool,
    rng: Rng,
}

impl<'a, F: Field> Search<'a, F> {
    fn new(
        ring: &'a Ring<F>,
        gens: &'a [Poly<F>],
        grevlex_basis: Option<Vec<Poly<F>>>,
        options: &'a Options,
        control: &'a Control,
    ) -> Result<Self> {
        let grevlex_ring = ring.with_order(MonomialOrder::Grevlex)?;
        let grevlex = match grevlex_basis {
            Some(polys) => ReducedBasis {
                polys: polys.into_iter().map(|g| grevlex_ring.adopt(g)).collect(),
                ring: grevlex_ring,
                stats: Default::default(),
            },
            None => {
                let adopted: Vec<Poly<F>> =
                    gens.iter().map(|g| grevlex_ring.adopt(g.clone())).collect();
                groebner_basis(&grevlex_ring, &adopted, Engine::default(), control)?
            }
        };
        let dim = krull_dimension(ring.nvars(), &grevlex.leading_monomials());
        if dim < 0 {
            return Err(Error::invalid(
                "Noether normalization of the unit ideal: the system has no solutions over the algebraic closure",
            ));
        }
        let homogeneous = gens.iter().all(|g| g.is_homogeneous());
        Ok(Search {
            ring,
            gens,
            options,
            control,
            grevlex,
            dimension: dim as usize,
            homogeneous,
            rng: Rng::new(options.seed),
        })
    }

    fn run(&mut self) -> Result<(Change<F>, Proof<F>, Strategy)> {
        let request = self.options.request;
        // With d = 0 or d = n the variables are the only sensible answer, whatever was asked,
        // and the free test always finds them.
        let trivial = self.dimension == 0 || self.dimension == self.ring.nvars();
        if request.allows(Strategy::Variables) || trivial {
            if let Some((change, proof)) = self.free_variables() {
                return Ok((change, proof, Strategy::Variables));
            }
        }
        let candidates = self.candidates();
        let gens = self.gens_grevlex();
        let ring = self.grevlex.ring.clone();
        // Every candidate first in grevlex, where a proof costs one cheap basis; the
        // elimination order, exact but often a thousand times dearer, only when all fail.
        for (change, strategy) in &candidates {
            if self.is_basis_at_hand(change) {
                continue;
            }
            if let Some(proof) = test_change(&ring, &gens, change, Test::Grevlex, self.control)? {
                return Ok((change.clone(), proof, *strategy));
            }
        }
        for (change, strategy) in &candidates {
            if self.grevlex_decides(change) {
                continue;
            }
            let test = Test::Elimination;
            if let Some(proof) = test_change(&ring, &gens, change, test, self.control)? {
                return Ok((change.clone(), proof, *strategy));
            }
        }
        if request.allows(Strategy::Nonlinear) {
            let (change, proof) = self.by_nagata()?;
            let strategy = if change.is_linear() {
                Strategy::Linear
            } else {
                Strategy::Nonlinear
            };
            return Ok((change, proof, strategy));
        }
        Err(Error::invalid(format!(
            "no Noether normalization of kind '{}' was found; use strategy 'auto' or 'nonlinear'",
            match request {
                Request::Only(s) => s.name(),
                Request::Auto => "auto",
            }
        )))
    }

    fn leads(&self) -> Vec<crate::Monomial> {
        self.grevlex.leading_monomials()
    }

    fn independent_sets(&self) -> Vec<Vec<usize>> {
        maximum_independent_sets(self.ring.nvars(), &self.leads(), INDEPENDENT_SET_LIMIT)
    }

    fn gens_grevlex(&self) -> Vec<Poly<F>> {
        self.gens
            .iter()
            .map(|g| self.grevlex.ring.adopt(g.clone()))
            .collect()
    }

    /// Variables as parameters, proved by the grevlex basis at hand: some maximal independent
    /// set leaves every other variable with a pure power in its leading ideal.
    fn free_variables(&self) -> Option<(Change<F>, Proof<F>)> {
        let n = self.ring.nvars();
        let leads = self.leads();
        let set = self
            .independent_sets()
            .into_iter()
            .find(|set| missing_pure_powers(&leads, &complement(set, n)).is_empty())?;
        let proof = proof_from_basis(&self.grevlex.ring, &self.grevlex.polys, &set);
        Some((Change::variables(&set, n), proof))
    }

    /// The changes the request allows, simplest first: the variables of the first independent
    /// sets, then sparse linear shifts, then dense random linear forms.
    fn candidates(&mut self) -> Vec<(Change<F>, Strategy)> {
        let request = self.options.request;
        let (n, d) = (self.ring.nvars(), self.dimension);
        let mut list = Vec::new();
        let sets = self.independent_sets();
        if request.allows(Strategy::Variables) {
            for set in sets.iter().take(VARIABLE_SET_TRIES) {
                list.push((Change::variables(set, n), Strategy::Variables));
            }
        }
        if !request.allows(Strategy::Linear) || d == 0 || d == n {
            return list;
        }
        let params = sets
            .into_iter()
            .next()
            .unwrap_or_else(|| ((n - d)..n).collect());
        let nonparams = complement(&params, n);
        let mut targets = missing_pure_powers(&self.leads(), &nonparams);
        if targets.is_empty() {
            targets = nonparams;
        }
        let ring = &self.grevlex.ring;
        for round in 0..SPARSE_TRIES.min(targets.len().max(1) + 1) {
            let change = sparse_linear(ring, &params, &targets, round, &mut self.rng);
            list.push((change, Strategy::Linear));
        }
        for _ in 0..self.dense_tries() {
            let change = dense_linear(ring, &params, &mut self.rng);
            list.push((change, Strategy::Linear));
        }
        list
    }

    /// The grevlex basis in the coordinates of `change` is the one at hand (the parameters are
    /// already the last variables), which the free test found lacking pure powers.
    fn is_basis_at_hand(&self, change: &Change<F>) -> bool {
        let n = self.ring.nvars();
        let d = change.params.len();
        change.is_identity()
            && change
                .params
                .iter()
                .enumerate()
                .all(|(j, &s)| s == n - d + j)
    }

    /// Homogeneous input with linear parameters: the grevlex test was exact (Bayer and
    /// Stillman 1987), so the elimination order cannot succeed where it failed.
    fn grevlex_decides(&self, change: &Change<F>) -> bool {
        self.homogeneous && change.is_linear()
    }

    /// How many dense random linear changes are worth drawing. A random change fails only on
    /// the zero set of a nonzero polynomial of degree at most D in its coefficients, D the
    /// degree of the closure of V(I); by Schwartz–Zippel the chance of failure is at most D/q.
    /// D is bounded by Bézout's inequality as the product of the n - d largest generator degrees
    /// (an estimate when I is not a complete intersection: a failed try only costs a basis, the
    /// result is certified anyway). Draw only when D/q ≤ 1/2; homogeneous input gets a few
    /// tries even over small fields, because linear parameters are preferred there.
    fn dense_tries(&self) -> usize {
        let mut degrees: Vec<u32> = self.gens.iter().filter_map(|g| g.degree()).collect();
        degrees.sort_unstable_by(|a, b| b.cmp(a));
        let codim = self.ring.nvars() - self.dimension;
        let bezout: f64 = degrees
            .iter()
            .take(codim)
            .map(|&e| f64::from(e.max(1)))
            .product();
        let q = field_size(&self.ring.field).map_or(f64::INFINITY, |q| q as f64);
        if bezout / q <= 0.5 {
            DENSE_TRIES
        } else if self.homogeneous {
            SMALL_FIELD_HOMOGENEOUS_TRIES
        } else {
            0
        }
    }

    /// Nagata's substitutions, proved in grevlex when it can, else in the elimination order.
    fn by_nagata(&mut self) -> Result<(Change<F>, Proof<F>)> {
        let ring = self.grevlex.ring.clone();
        let gens = self.gens_grevlex();
        let change =
            nagata::nagata_change(&ring, &gens, self.dimension, &mut self.rng, self.control)?;
        for test in [Test::Grevlex, Test::Elimination] {
            if let Some(proof) = test_change(&ring, &gens, &change, test, self.control)? {
                return Ok((change, proof));
            }
        }
        Err(Error::invalid(
            "Noether normalization: Nagata's substitution did not give a finite projection",
        ))
    }
}
