//! The certificate of a Noether normalization: monic equations by the determinant trick, the
//! coordinate change and its inverse, module generators and the generic rank; and the check of
//! a certificate from the ideal alone.
//!
//! Equations: with module generators b_1 = 1, ..., b_r (the standard monomials in the
//! non-parameters), the normal form of e·b_j for an element e gives e·b_j = Σ_k a_jk b_k with
//! a_jk in k[T]; then det(x·Id - A) kills every b_k, in particular 1, so it is a monic equation
//! of e over k[T] (the determinant trick: Atiyah and Macdonald 1969, Prop. 2.4; Eisenbud,
//! *Commutative Algebra*, §4.1). It needs the one basis that proved finiteness and nothing more.

use super::changes::Change;
use super::charpoly::characteristic_polynomial;
use super::finiteness::{generic_rank, standard_monomials, Proof};
use super::{FiniteProjection, Strategy};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::groebner::{groebner_basis, reduce::normal_form, Engine};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};
use std::cell::RefCell;
use std::collections::HashMap;

/// Names `{prefix}1..{prefix}count` for the first prefix that clashes with no name in `taken`.
pub fn fresh_symbols(prefix: &str, count: usize, taken: &[String]) -> Vec<String> {
    let mut prefix = prefix.to_string();
    loop {
        let names: Vec<String> = (1..=count).map(|k| format!("{prefix}{k}")).collect();
        if names.iter().all(|s| !taken.contains(s)) {
            return names;
        }
        prefix.push('_');
    }
}

/// Names already used by a ring: its variables and the field generator.
pub fn taken_names<F: Field>(ring: &Ring<F>) -> Vec<String> {
    let mut taken = ring.names().to_vec();
    taken.extend(ring.field.generator_name().map(String::from));
    taken
}

/// Everything but the search: the certificate from the change and the basis that proved it.
pub fn build<F: Field>(
    ring: &Ring<F>,
    change: &Change<F>,
    proof: &Proof<F>,
    strategy: Strategy,
    homogeneous: bool,
    control: &Control,
) -> Result<FiniteProjection<F>> {
    let d = change.params.len();
    let symbols = fresh_symbols("t", d, &taken_names(ring));
    let parameter_ring = Ring::new(ring.field.clone(), symbols.clone(), MonomialOrder::Grevlex)?;
    let mut coordinate_names = symbols;
    coordinate_names.extend(change.nonparams.iter().map(|&b| ring.names()[b].clone()));
    let coordinate_ring = Ring::new(ring.field.clone(), coordinate_names, MonomialOrder::Grevlex)?;

    let parameters = change.parameters(ring);
    let mut coordinates = parameters.clone();
    coordinates.extend(change.nonparams.iter().map(|&b| ring.var(b)));
    let inverse = inverse_map(ring, change, &coordinate_ring)?;

    let leads = proof.leading_monomials();
    let standard = standard_monomials(&leads, &proof.nonparam_pos, proof.ring.nvars(), control)?;
    let rank = generic_rank(&leads, &standard, &proof.nonparam_pos)?;
    let module_generators = standard
        .iter()
        .map(|m| {
            let mut e = vec![0u32; ring.nvars()];
            for (&b, &pos) in change.nonparams.iter().zip(&proof.nonparam_pos) {
                e[b] = m.exponents()[pos];
            }
            Ok(ring.term(Monomial::from_exponents(e)?, ring.field.one()))
        })
        .collect::<Result<Vec<_>>>()?;
    let module = Module::new(proof, &parameter_ring, standard);
    let equations = proof
        .images
        .iter()
        .map(|e| module.equation(e, control))
        .collect::<Result<Vec<_>>>()?;
    Ok(FiniteProjection {
        ring: ring.clone(),
        dimension: d,
        parameters,
        parameter_ring,
        coordinates,
        coordinate_ring,
        inverse,
        equations,
        module_generators,
        rank,
        strategy,
        homogeneous,
    })
}

/// x_{s_j} = y_j - h_j(y_N), x_b = y_b, written in the coordinate ring (parameters first).
fn inverse_map<F: Field>(
    ring: &Ring<F>,
    change: &Change<F>,
    coords: &Ring<F>,
) -> Result<Vec<Poly<F>>> {
    let d = change.params.len();
    let mut renaming = vec![Poly::zero(); ring.nvars()];
    for (k, &b) in change.nonparams.iter().enumerate() {
        renaming[b] = coords.var(d + k);
    }
    let mut inverse = renaming.clone();
    for (j, (&s, h)) in change.params.iter().zip(&change.shifts).enumerate() {
        inverse[s] = coords.sub(&coords.var(j), &ring.substitute(h, &renaming, coords)?);
    }
    Ok(inverse)
}

/// R/I as a module over k[T] on the standard monomials of a proof.
struct Module<'a, F: Field> {
    proof: &'a Proof<F>,
    params: &'a Ring<F>,
    standard: Vec<Monomial>,
    index: HashMap<Monomial, usize>,
    /// Normal forms of the monomials met so far: the products e·b of different elements e share
    /// most of their monomials (x·(yb) = y·(xb)), and a normal form is linear in its argument.
    normal_forms: RefCell<HashMap<Monomial, Poly<F>>>,
}

impl<'a, F: Field> Module<'a, F> {
    fn new(proof: &'a Proof<F>, params: &'a Ring<F>, standard: Vec<Monomial>) -> Self {
        let index = standard
            .iter()
            .enumerate()
            .map(|(k, m)| (m.clone(), k))
            .collect();
        Module {
            proof,
            params,
            standard,
            index,
            normal_forms: RefCell::new(HashMap::new()),
        }
    }

    /// Splits a monomial of the proof ring into its non-parameter part and its parameter part
    /// (a monomial of k[T]).
    fn split(&self, m: &Monomial) -> Result<(Monomial, Monomial)> {
        let (e, params) = (m.exponents(), &self.proof.param_pos);
        let x =
            Monomial::from_exponent_fn(e.len(), |i| if params.contains(&i) { 0 } else { e[i] })?;
        Ok((
            x,
            Monomial::from_exponent_fn(params.len(), |k| e[params[k]])?,
        ))
    }

    /// An element of the proof ring that involves only parameters, as a polynomial of k[T].
    fn in_parameters(&self, f: &Poly<F>) -> Result<Option<Poly<F>>> {
        let mut terms = Vec::with_capacity(f.len());
        for (m, c) in f.terms() {
            let (x, t) = self.split(m)?;
            if !x.is_one() {
                return Ok(None);
            }
            terms.push((t, c.clone()));
        }
        Ok(Some(self.params.from_terms(terms)))
    }

    /// A monic equation [1, c_{m-1}, ..., c_0] over k[T] for the element `e` of the proof ring.
    fn equation(&self, e: &Poly<F>, control: &Control) -> Result<Vec<Poly<F>>> {
        if let Some(t) = self.in_parameters(e)? {
            return Ok(vec![self.params.one(), self.params.neg(&t)]);
        }
        let shortcut = self.basis_equation(e)?;
        if let Some(eq) = &shortcut {
            if eq.len() <= self.standard.len() + 1 {
                return Ok(shortcut.unwrap());
            }
        }
        let matrix = self.multiplication_matrix(e, control)?;
        characteristic_polynomial(self.params, &matrix, control)
    }

    /// The matrix A over k[T] with e·b_j = Σ_k A[j][k] b_k modulo I.
    fn multiplication_matrix(&self, e: &Poly<F>, control: &Control) -> Result<Vec<Vec<Poly<F>>>> {
        let ring = &self.proof.ring;
        let r = self.standard.len();
        let mut matrix = Vec::with_capacity(r);
        for b in &self.standard {
            control.check()?;
            let product = ring.mul_term(e, &ring.field.one(), b)?;
            let nf = self.normal_form(&product)?;
            let mut row: Vec<Vec<(Monomial, F::Elem)>> = vec![Vec::new(); r];
            for (m, c) in nf.terms() {
                let (x, t) = self.split(m)?;
                // A standard x^α t^β has x^α standard, so the index always exists.
                let k = self.index[&x];
                row[k].push((t, c.clone()));
            }
            matrix.push(row.into_iter().map(|terms| self.entry(terms)).collect());
        }
        Ok(matrix)
    }

    /// An entry of the matrix from the parameter parts of the terms of a normal form that
    /// share one standard x^α, in the normal form's order. With the parameters last in grevlex
    /// that is already the order of k[T] (equal x^α: the parameters decide), so the terms are
    /// taken as they are once that is checked; otherwise they are sorted.
    fn entry(&self, terms: Vec<(Monomial, F::Elem)>) -> Poly<F> {
        let decreasing = terms
            .windows(2)
            .all(|w| self.params.cmp(&w[0].0, &w[1].0) == std::cmp::Ordering::Greater);
        if decreasing {
            Poly::from_sorted(terms)
        } else {
            self.params.from_terms(terms)
        }
    }

    /// The normal form of `f` modulo the proof's basis, term by term from the cache.
    fn normal_form(&self, f: &Poly<F>) -> Result<Poly<F>> {
        let ring = &self.proof.ring;
        let mut cache = self.normal_forms.borrow_mut();
        // Most products e·b have one term: then the sum is that term's scaled normal form, with
        // no merge (a merge copies every monomial once more).
        let mut sum: Option<Poly<F>> = None;
        for (m, c) in f.terms() {
            if !cache.contains_key(m) {
                let term = ring.term(m.clone(), ring.field.one());
                cache.insert(m.clone(), normal_form(ring, &term, &self.proof.basis)?);
            }
            let scaled = ring.scale(&cache[m], c);
            sum = Some(match sum {
                None => scaled,
                Some(s) => ring.add(&s, &scaled),
            });
        }
        Ok(sum.unwrap_or_else(Poly::zero))
    }

    /// A basis element in k[T][x] monic in x, when `e` is the non-parameter variable x: it is an
    /// equation at no cost, often of smaller degree than the determinant.
    fn basis_equation(&self, e: &Poly<F>) -> Result<Option<Vec<Poly<F>>>> {
        let Some(v) = single_variable(e) else {
            return Ok(None);
        };
        let mut best: Option<Vec<Poly<F>>> = None;
        for g in &self.proof.basis {
            if let Some(eq) = self.as_monic_in(g, v)? {
                if best.as_ref().is_none_or(|b| eq.len() < b.len()) {
                    best = Some(eq);
                }
            }
        }
        Ok(best)
    }

    /// `g` as [1, c_{m-1}, ..., c_0] in the variable v over k[T], if it lies in k[T][v] and its
    /// top coefficient in v is a nonzero constant.
    fn as_monic_in(&self, g: &Poly<F>, v: usize) -> Result<Option<Vec<Poly<F>>>> {
        let mut by_degree: HashMap<u32, Vec<(Monomial, F::Elem)>> = HashMap::new();
        for (m, c) in g.terms() {
            let (mut x, t) = self.split(m)?;
            let k = x.exponents()[v];
            x = x.div(&Monomial::var_power(x.nvars(), v, k));
            if !x.is_one() {
                return Ok(None);
            }
            by_degree.entry(k).or_default().push((t, c.clone()));
        }
        let top = by_degree.keys().copied().max().unwrap_or(0);
        let lead = self
            .params
            .from_terms(by_degree.remove(&top).unwrap_or_default());
        if top == 0 || !lead.is_constant() || lead.is_zero() {
            return Ok(None);
        }
        let scale = self
            .params
            .field
            .inv(lead.leading_coefficient().unwrap())
            .unwrap();
        let mut eq = vec![self.params.one()];
        for k in (0..top).rev() {
            let c = self
                .params
                .from_terms(by_degree.remove(&k).unwrap_or_default());
            eq.push(self.params.scale(&c, &scale));
        }
        Ok(Some(eq))
    }
}

/// The index i when f is exactly the variable x_i.
fn single_variable<F: Field>(f: &Poly<F>) -> Option<usize> {
    match f.terms() {
        [(m, _)] if m.degree() == 1 => m.pure_power_variable(),
        _ => None,
    }
}

/// Whether x^m + c_{m-1}(p) x^{m-1} + ... + c_0(p) lies in the ideal of the basis `gb`, by
/// Horner's rule with a normal form after every step: NF(NF(a)·x + c) = NF(a·x + c), and the
/// intermediate normal forms stay small where the expanded equation would not.
fn reduces_to_zero<F: Field>(
    gb: &crate::groebner::ReducedBasis<F>,
    params: &Ring<F>,
    parameters: &[Poly<F>],
    variable: usize,
    coefficients: &[Poly<F>],
) -> Result<bool> {
    let ring = &gb.ring;
    let x = ring.var(variable);
    let mut acc = Poly::zero();
    for c in coefficients {
        let c = params.substitute(c, parameters, ring)?;
        acc = gb.reduce(&ring.add(&ring.mul(&acc, &x)?, &c))?;
    }
    Ok(acc.is_zero())
}

impl<F: Field> FiniteProjection<F> {
    /// Re-checks the certificate from the ideal generated by `gens` alone, independently of the
    /// search: every equation is monic and vanishes modulo I once t_j := p_j, the coordinates
    /// and their inverse compose to the identity both ways, the first d coordinates are the
    /// parameters, and d is the dimension of R/I. Monic equations for every variable make R/I
    /// finite over k[p]; d = dim R/I then forces k[p] -> R/I to be injective. Returns the list
    /// of problems found (empty when the certificate holds).
    pub fn verify(&self, gens: &[Poly<F>], control: &Control) -> Result<Vec<String>> {
        let mut problems = self.shape_problems();
        if !problems.is_empty() {
            return Ok(problems);
        }
        problems.extend(self.composition_problems()?);
        let grevlex = self.ring.with_order(MonomialOrder::Grevlex)?;
        let gens: Vec<Poly<F>> = gens.iter().map(|g| grevlex.adopt(g.clone())).collect();
        let gb = groebner_basis(&grevlex, &gens, Engine::default(), control)?;
        let dim = crate::dimension::krull_dimension(self.ring.nvars(), &gb.leading_monomials());
        if dim < 0 {
            problems.push("the ideal is the unit ideal: it has no Noether normalization".into());
            return Ok(problems);
        }
        if dim != self.dimension as i64 {
            problems.push(format!(
                "d = {} but the ideal has dimension {dim}",
                self.dimension
            ));
        }
        for (i, coefficients) in self.equations.iter().enumerate() {
            control.check()?;
            let name = &self.ring.names()[i];
            if !coefficients
                .first()
                .is_some_and(|c| *c == self.parameter_ring.one())
            {
                problems.push(format!(
                    "the equation for {name} is not monic: its first coefficient must be 1"
                ));
                continue;
            }
            let params: Vec<Poly<F>> = self
                .parameters
                .iter()
                .map(|p| grevlex.adopt(p.clone()))
                .collect();
            if !reduces_to_zero(&gb, &self.parameter_ring, &params, i, coefficients)? {
                problems.push(format!("the equation for {name} does not lie in the ideal"));
            }
        }
        if self.module_generators.is_empty() {
            problems.push("no module generators".into());
        } else if self.rank > self.module_generators.len() {
            problems.push(format!(
                "rank {} exceeds the number of module generators {}",
                self.rank,
                self.module_generators.len()
            ));
        }
        Ok(problems)
    }

    /// Counts that must agree before anything is computed.
    fn shape_problems(&self) -> Vec<String> {
        let (n, d) = (self.ring.nvars(), self.dimension);
        let mut problems = Vec::new();
        if self.parameters.len() != d || self.parameter_ring.nvars() != d {
            problems.push(format!(
                "d = {d} but there are {} parameters and {} parameter symbols",
                self.parameters.len(),
                self.parameter_ring.nvars()
            ));
        }
        if self.equations.len() != n {
            problems.push(format!(
                "{} equations for {n} variables: every variable needs one",
                self.equations.len()
            ));
        }
        if self.coordinates.len() != n
            || self.inverse.len() != n
            || self.coordinate_ring.nvars() != n
        {
            problems.push(format!(
                "{} coordinates, {} inverse images and {} coordinate symbols for {n} variables",
                self.coordinates.len(),
                self.inverse.len(),
                self.coordinate_ring.nvars()
            ));
        } else if self.coordinates[..d.min(n)]
            != self.parameters[..d.min(n).min(self.parameters.len())]
        {
            problems.push("the first d coordinates are not the parameters".into());
        }
        problems
    }

    /// inverse ∘ coordinates = identity on the original variables, and the other way round.
    fn composition_problems(&self) -> Result<Vec<String>> {
        let mut problems = Vec::new();
        for (i, g) in self.inverse.iter().enumerate() {
            let back = self
                .coordinate_ring
                .substitute(g, &self.coordinates, &self.ring)?;
            if back != self.ring.var(i) {
                problems.push(format!(
                    "inverse image of {} composed with the coordinates gives {}, not {}",
                    self.ring.names()[i],
                    self.ring.format(&back),
                    self.ring.names()[i]
                ));
            }
        }
        for (j, y) in self.coordinates.iter().enumerate() {
            let back = self
                .ring
                .substitute(y, &self.inverse, &self.coordinate_ring)?;
            if back != self.coordinate_ring.var(j) {
                problems.push(format!(
                    "coordinate {} composed with the inverse gives {}",
                    self.coordinate_ring.names()[j],
                    self.coordinate_ring.format(&back)
                ));
            }
        }
        Ok(problems)
    }

    /// Generators of the fiber over a point τ of k^d: I + (p_1 - τ_1, ..., p_d - τ_d).
    /// Its vector-space dimension is at most the number of module generators.
    pub fn fiber(&self, gens: &[Poly<F>], point: &[F::Elem]) -> Result<Vec<Poly<F>>> {
        if point.len() != self.dimension {
            return Err(crate::Error::invalid(format!(
                "the fiber needs a point with {} coordinates, got {}",
                self.dimension,
                point.len()
            )));
        }
        let mut fiber = gens.to_vec();
        for (p, c) in self.parameters.iter().zip(point) {
            fiber.push(self.ring.sub(p, &self.ring.constant(c.clone())));
        }
        Ok(fiber)
    }
}

/// A certificate as text, the form it is saved and read back in (keys of the public interface).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CertificateText {
    pub dimension: i64,
    pub parameters: Vec<String>,
    pub parameter_symbols: Vec<String>,
    pub coordinates: Vec<String>,
    pub coordinate_symbols: Vec<String>,
    pub inverse: Vec<String>,
    pub equations: Vec<Vec<String>>,
    pub module_generators: Vec<String>,
    pub rank: i64,
    pub strategy: String,
    pub homogeneous: bool,
}

impl<F: Field> FiniteProjection<F> {
    pub fn to_text(&self) -> CertificateText {
        let fmt = |r: &Ring<F>, ps: &[Poly<F>]| ps.iter().map(|p| r.format(p)).collect::<Vec<_>>();
        CertificateText {
            dimension: self.dimension as i64,
            parameters: fmt(&self.ring, &self.parameters),
            parameter_symbols: self.parameter_ring.names().to_vec(),
            coordinates: fmt(&self.ring, &self.coordinates),
            coordinate_symbols: self.coordinate_ring.names().to_vec(),
            inverse: fmt(&self.coordinate_ring, &self.inverse),
            equations: self
                .equations
                .iter()
                .map(|e| fmt(&self.parameter_ring, e))
                .collect(),
            module_generators: fmt(&self.ring, &self.module_generators),
            rank: self.rank as i64,
            strategy: self.strategy.name().into(),
            homogeneous: self.homogeneous,
        }
    }

    /// Reads a saved certificate for the ring `ring`; the message says which entry is unreadable.
    pub fn from_text(ring: &Ring<F>, text: &CertificateText) -> std::result::Result<Self, String> {
        let dimension = usize::try_from(text.dimension)
            .map_err(|_| format!("d = {} is negative", text.dimension))?;
        let rank =
            usize::try_from(text.rank).map_err(|_| format!("rank {} is negative", text.rank))?;
        let symbols_ring = |names: &[String], what: &str| {
            Ring::new(ring.field.clone(), names.to_vec(), MonomialOrder::Grevlex)
                .map_err(|e| format!("{what}: {e}"))
        };
        let parameter_ring = symbols_ring(&text.parameter_symbols, "parameter_symbols")?;
        let coordinate_ring = symbols_ring(&text.coordinate_symbols, "coordinate_symbols")?;
        let read = |r: &Ring<F>,
                    items: &[String],
                    what: &str|
         -> std::result::Result<Vec<Poly<F>>, String> {
            items
                .iter()
                .enumerate()
                .map(|(k, s)| parse_poly(r, s).map_err(|e| format!("{what} {}: '{s}': {e}", k + 1)))
                .collect()
        };
        let equations = text
            .equations
            .iter()
            .enumerate()
            .map(|(i, eq)| {
                let name = ring
                    .names()
                    .get(i)
                    .cloned()
                    .unwrap_or_else(|| format!("#{}", i + 1));
                read(
                    &parameter_ring,
                    eq,
                    &format!("equation for {name}, coefficient"),
                )
            })
            .collect::<std::result::Result<Vec<_>, String>>()?;
        Ok(FiniteProjection {
            ring: ring.clone(),
            dimension,
            parameters: read(ring, &text.parameters, "parameter")?,
            coordinates: read(ring, &text.coordinates, "coordinate")?,
            inverse: read(&coordinate_ring, &text.inverse, "inverse image")?,
            module_generators: read(ring, &text.module_generators, "module generator")?,
            equations,
            parameter_ring,
            coordinate_ring,
            rank,
            strategy: Strategy::from_name(&text.strategy).unwrap_or(Strategy::Nonlinear),
            homogeneous: text.homogeneous,
        })
    }
}

/// Checks a saved certificate against the ideal generated by `gens`: the list of problems
/// (empty when it holds), unreadable entries included.
pub fn check_certificate<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    text: &CertificateText,
    control: &Control,
) -> Result<Vec<String>> {
    match FiniteProjection::from_text(ring, text) {
        Ok(nn) => nn.verify(gens, control),
        Err(problem) => Ok(vec![problem]),
    }
}
