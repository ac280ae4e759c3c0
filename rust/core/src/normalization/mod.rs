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
pub mod check;
pub mod division;
pub mod finiteness;
pub mod nagata;

#[cfg(test)]
mod check_tests;
#[cfg(test)]
mod tests;

use crate::control::{Control, Limits};
use crate::dimension::{krull_dimension, maximum_independent_sets};
use crate::error::{Error, Result};
use crate::field::field_size;
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use changes::{complement, dense_linear, enumerated_linear, sparse_linear, Change, Rng};
use finiteness::{missing_pure_powers, proof_from_basis, test_change, Proof, Test};

pub use certificate::{CertificateText, Projection};
pub use check::check_certificate;

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
    /// The kind of a change: the variables themselves, linear forms, or anything else.
    pub fn of_change<F: Field>(change: &Change<F>) -> Self {
        if change.is_identity() {
            Strategy::Variables
        } else if change.is_linear() {
            Strategy::Linear
        } else {
            Strategy::Nonlinear
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
/// Random dense linear tries over a field too small for the probability bound. The bound is
/// only an upper bound on failure: over GF(7) a sparse surface of degree 47 (Bézout's bound 64)
/// is finite over about one random pair of linear forms in three, and a linear change keeps the
/// rank at the degree where a nonlinear one raises it (and the equations' cost with it). Each
/// try costs one grevlex basis, so a failed series costs far less than the equations it spares.
const SMALL_FIELD_DENSE_TRIES: usize = 16;
/// A trial elimination basis may reach this multiple of the input's and grevlex basis's degree.
const TRIAL_DEGREE_FACTOR: u32 = 2;
/// Largest exponent of the cheap nonlinear shifts tried before Nagata's search.
const SMALL_POWER_LIMIT: u32 = 4;
/// Most of those shifts tried (each costs one grevlex basis).
const SMALL_POWER_TRIES: usize = 400;
/// Most linear changes enumerated over a small field (each costs a basis or two).
const ENUMERATED_LINEAR_TRIES: usize = 32;
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
    project(ring, gens, grevlex_basis, options, control)?.into_certificate(control)
}

/// The projection without its equations: parameters, coordinates, rank, module generators and
/// strategy from the grevlex basis and the basis that proves finiteness, about the cost of one
/// basis when the variables or a linear change work. [`Projection::equations`] computes the
/// monic equations from the same proof when they are wanted.
pub fn project<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    grevlex_basis: Option<Vec<Poly<F>>>,
    options: &Options,
    control: &Control,
) -> Result<Projection<F>> {
    let mut search = Search::new(ring, gens, grevlex_basis, options, control)?;
    let (change, proof) = search.run()?;
    let homogeneous = search.homogeneous && change.is_linear();
    certificate::summary(ring, &change, proof, homogeneous, control)
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
        // A property of the ideal, read off its reduced grevlex basis (generators need not show it).
        let homogeneous = grevlex.polys.iter().all(|g| g.is_homogeneous());
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

    fn run(&mut self) -> Result<(Change<F>, Proof<F>)> {
        let request = self.options.request;
        // With d = 0 or d = n the variables are the only sensible answer, whatever was asked,
        // and the free test always finds them.
        let trivial = self.dimension == 0 || self.dimension == self.ring.nvars();
        if request.allows(Strategy::Variables) || trivial {
            if let Some(found) = self.free_variables() {
                return Ok(found);
            }
        }
        let gens = self.gens_grevlex();
        let ring = self.grevlex.ring.clone();
        // The simplest kind first (the variables of every independent set, then linear
        // changes); within a kind every candidate first in grevlex, where a proof costs one
        // cheap basis, and in the elimination order, exact but often a thousand times dearer,
        // only when all fail.
        for group in self.candidates() {
            for change in &group {
                if self.is_basis_at_hand(change) {
                    continue;
                }
                if let Some(proof) = test_change(&ring, &gens, change, Test::Grevlex, self.control)?
                {
                    return Ok((change.clone(), proof));
                }
            }
            // A trial elimination basis may climb far above the degrees of the grevlex one;
            // past a bound it is abandoned as a failed candidate (the next kind may be cheap).
            let bounded = self.control.child(Limits {
                max_degree: Some(self.trial_degree_bound()),
                ..self.control.limits.clone()
            });
            for change in &group {
                if self.grevlex_decides(change) {
                    continue;
                }
                let test = Test::Elimination;
                match test_change(&ring, &gens, change, test, &bounded) {
                    Ok(Some(proof)) => return Ok((change.clone(), proof)),
                    Ok(None) | Err(Error::ResourceLimit(_)) => {}
                    Err(e) => return Err(e),
                }
            }
        }
        if request.allows(Strategy::Nonlinear) {
            return self.by_nagata();
        }
        Err(Error::invalid(format!(
            "no Noether normalization of kind '{}' was found; use strategy 'auto' or 'nonlinear'",
            match request {
                Request::Only(s) => s.name(),
                Request::Auto => "auto",
            }
        )))
    }

    /// The highest degree a trial elimination basis may reach: twice the largest degree of
    /// the input and of its grevlex basis (or the caller's own bound when lower).
    fn trial_degree_bound(&self) -> u32 {
        let largest = self
            .gens
            .iter()
            .chain(&self.grevlex.polys)
            .filter_map(|g| g.degree())
            .max()
            .unwrap_or(1);
        let bound = largest.saturating_mul(TRIAL_DEGREE_FACTOR).max(2);
        self.control
            .limits
            .max_degree
            .map_or(bound, |own| own.min(bound))
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

    /// The changes the request allows in two groups, simplest first: the variables of every
    /// maximal independent set (they are few), then linear changes: sparse shifts and, over a
    /// field small enough, every linear form by increasing number of terms (dense ones
    /// included), else dense random linear forms when the field is large enough for them.
    fn candidates(&mut self) -> Vec<Vec<Change<F>>> {
        let request = self.options.request;
        let (n, d) = (self.ring.nvars(), self.dimension);
        let sets = self.independent_sets();
        let mut variables = Vec::new();
        if request.allows(Strategy::Variables) {
            variables.extend(sets.iter().map(|set| Change::variables(set, n)));
        }
        let mut linear = Vec::new();
        if !request.allows(Strategy::Linear) || d == 0 || d == n {
            return vec![variables, linear];
        }
        let params = sets
            .into_iter()
            .next()
            .unwrap_or_else(|| ((n - d)..n).collect());
        let ring = &self.grevlex.ring;
        if let Some(all) = enumerated_linear(ring, &params, ENUMERATED_LINEAR_TRIES) {
            // The enumeration reaches only the sparsest forms; dense ones are drawn after them.
            linear.extend(all);
            for _ in 0..self.dense_tries() {
                let change = dense_linear(ring, &params, &mut self.rng);
                // Over GF(2) or GF(3) most draws repeat a form already listed.
                if !linear.iter().any(|c: &Change<F>| c.shifts == change.shifts) {
                    linear.push(change);
                }
            }
            return vec![variables, linear];
        }
        let nonparams = complement(&params, n);
        let mut targets = missing_pure_powers(&self.leads(), &nonparams);
        if targets.is_empty() {
            targets = nonparams;
        }
        for round in 0..SPARSE_TRIES.min(targets.len().max(1) + 1) {
            linear.push(sparse_linear(ring, &params, &targets, round, &mut self.rng));
        }
        for _ in 0..self.dense_tries() {
            linear.push(dense_linear(ring, &params, &mut self.rng));
        }
        vec![variables, linear]
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
    /// result is certified anyway). When D/q ≤ 1/2 a few tries suffice; over smaller fields the
    /// bound says nothing, yet random linear forms often work, and linear parameters give the
    /// smallest rank: more tries there before going nonlinear.
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
        } else {
            SMALL_FIELD_DENSE_TRIES
        }
    }

    /// Nagata-like shifts with the smallest exponents first, x_{s_j} + Σ_b x_b^{e_jb} over the
    /// non-parameters b lacking a pure power ([`changes::small_powers`]), each tested by one
    /// grevlex basis: Nagata's search through elimination bases below can cost far more (its
    /// exponents grow fast), and small exponents usually suffice.
    fn small_powers(
        &mut self,
        ring: &Ring<F>,
        gens: &[Poly<F>],
    ) -> Result<Option<(Change<F>, Proof<F>)>> {
        let (n, d) = (self.ring.nvars(), self.dimension);
        if d == 0 || d == n {
            return Ok(None);
        }
        let params = self
            .independent_sets()
            .into_iter()
            .next()
            .unwrap_or_else(|| ((n - d)..n).collect());
        let nonparams = complement(&params, n);
        let mut targets = missing_pure_powers(&self.leads(), &nonparams);
        if targets.is_empty() {
            targets = nonparams;
        }
        let candidates = changes::small_powers(
            ring,
            &params,
            &targets,
            SMALL_POWER_LIMIT,
            SMALL_POWER_TRIES,
        );
        for change in candidates {
            if let Some(proof) = test_change(ring, gens, &change, Test::Grevlex, self.control)? {
                return Ok(Some((change, proof)));
            }
        }
        Ok(None)
    }

    /// Nagata's substitutions, proved in grevlex when it can, else in the elimination order.
    fn by_nagata(&mut self) -> Result<(Change<F>, Proof<F>)> {
        let ring = self.grevlex.ring.clone();
        let gens = self.gens_grevlex();
        if let Some(found) = self.small_powers(&ring, &gens)? {
            return Ok(found);
        }
        let change =
            nagata::nagata_change(&ring, &gens, self.dimension, &mut self.rng, self.control)?;
        if change.parameter_degree() > check::MAX_PARAMETER_DEGREE {
            return Err(Error::ResourceLimit(format!(
                "Noether normalization: Nagata's substitution needs parameters of degree {}, above {}",
                change.parameter_degree(),
                check::MAX_PARAMETER_DEGREE
            )));
        }
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
