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
use super::division::normal_form;
use super::finiteness::{generic_rank, standard_monomials, Proof, MAX_MODULE_GENERATORS};
use super::{FiniteProjection, Strategy};
use crate::charpoly::characteristic_polynomial;
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};
use crate::symbols::{fresh_symbols, taken_names};
use std::cell::RefCell;
use std::collections::HashMap;

/// A finite projection with every claim but the monic equations, and the basis that proves
/// it: the equations come from that basis on first use ([`Projection::equations`]), since they
/// can cost far more than everything else and most callers never read them.
#[derive(Clone, Debug)]
pub struct Projection<F: Field> {
    /// The certificate without its equations (`equations` is empty).
    summary: FiniteProjection<F>,
    proof: Proof<F>,
    standard: Vec<Monomial>,
}

impl<F: Field> Projection<F> {
    /// Every claim but the equations (its `equations` list is empty).
    pub fn summary(&self) -> &FiniteProjection<F> {
        &self.summary
    }

    /// For every original variable, its monic equation [1, c_{m-1}, ..., c_0] over k[t].
    pub fn equations(&self, control: &Control) -> Result<Vec<Vec<Poly<F>>>> {
        let module = Module::new(
            &self.proof,
            &self.summary.parameter_ring,
            self.standard.clone(),
        );
        self.proof
            .images
            .iter()
            .map(|e| module.equation(e, control))
            .collect()
    }

    /// The whole certificate, equations included.
    pub fn into_certificate(self, control: &Control) -> Result<FiniteProjection<F>> {
        let equations = self.equations(control)?;
        Ok(FiniteProjection {
            equations,
            ..self.summary
        })
    }
}

/// Everything but the search and the equations: the summary from the change and the basis that
/// proved it.
pub fn summary<F: Field>(
    ring: &Ring<F>,
    change: &Change<F>,
    proof: Proof<F>,
    homogeneous: bool,
    control: &Control,
) -> Result<Projection<F>> {
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
    let standard = standard_monomials(
        &leads,
        &proof.nonparam_pos,
        proof.ring.nvars(),
        MAX_MODULE_GENERATORS,
        control,
    )?;
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
    let summary = FiniteProjection {
        ring: ring.clone(),
        dimension: d,
        parameters,
        parameter_ring,
        coordinates,
        coordinate_ring,
        inverse,
        equations: Vec::new(),
        module_generators,
        rank,
        strategy: Strategy::of_change(change),
        homogeneous,
    };
    Ok(Projection {
        summary,
        proof,
        standard,
    })
}

/// x_{s_j} = y_j - h_j(y_N), x_b = y_b, written in the coordinate ring (parameters first).
pub(super) fn inverse_map<F: Field>(
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
pub(super) struct Module<'a, F: Field> {
    proof: &'a Proof<F>,
    params: &'a Ring<F>,
    standard: Vec<Monomial>,
    index: HashMap<Monomial, usize>,
    /// Normal forms of the monomials met so far: the products e·b of different elements e share
    /// most of their monomials (x·(yb) = y·(xb)), and a normal form is linear in its argument.
    normal_forms: RefCell<HashMap<Monomial, Poly<F>>>,
}

impl<'a, F: Field> Module<'a, F> {
    pub(super) fn new(proof: &'a Proof<F>, params: &'a Ring<F>, standard: Vec<Monomial>) -> Self {
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
    pub(super) fn equation(&self, e: &Poly<F>, control: &Control) -> Result<Vec<Poly<F>>> {
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
    pub(super) fn multiplication_matrix(
        &self,
        e: &Poly<F>,
        control: &Control,
    ) -> Result<Vec<Vec<Poly<F>>>> {
        let ring = &self.proof.ring;
        let r = self.standard.len();
        let mut matrix = Vec::with_capacity(r);
        for b in &self.standard {
            control.check()?;
            let product = ring.mul_term(e, &ring.field.one(), b)?;
            let nf = self.normal_form(&product, control)?;
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
    fn normal_form(&self, f: &Poly<F>, control: &Control) -> Result<Poly<F>> {
        let ring = &self.proof.ring;
        let mut cache = self.normal_forms.borrow_mut();
        // Most products e·b have one term: then the sum is that term's scaled normal form, with
        // no merge (a merge copies every monomial once more).
        let mut sum: Option<Poly<F>> = None;
        for (m, c) in f.terms() {
            if !cache.contains_key(m) {
                let term = ring.term(m.clone(), ring.field.one());
                let nf = normal_form(ring, &term, &self.proof.basis, control)?;
                cache.insert(m.clone(), nf);
            }
            let scaled = ring.scale(&cache[m], c);
            sum = Some(match sum {
                None => scaled,
                Some(s) => ring.add(&s, &scaled),
            });
        }
        Ok(sum.unwrap_or_else(Poly::zero))
    }

    /// Whether Σ_k w_k·b_k, with w_k in k[T] and b_k the standard monomials, lies in the ideal.
    pub(super) fn combination_is_zero(&self, w: &[Poly<F>], control: &Control) -> Result<bool> {
        let ring = &self.proof.ring;
        let n = ring.nvars();
        let mut terms = Vec::new();
        for (wk, b) in w.iter().zip(&self.standard) {
            for (t, c) in wk.terms() {
                let (e, params) = (t.exponents(), &self.proof.param_pos);
                let lift = Monomial::from_exponent_fn(n, |i| {
                    params.iter().position(|&p| p == i).map_or(0, |k| e[k])
                })?;
                terms.push((lift.mul(b)?, c.clone()));
            }
        }
        let sum = ring.from_terms(terms);
        Ok(normal_form(ring, &sum, &self.proof.basis, control)?.is_zero())
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

impl<F: Field> FiniteProjection<F> {
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
        let strategy = Strategy::from_name(&text.strategy).ok_or_else(|| {
            format!(
                "strategy '{}' is not one of variables, linear, nonlinear",
                text.strategy
            )
        })?;
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
            strategy,
            homogeneous: text.homogeneous,
        })
    }
}
