//! Solutions of a system over a finite field: its rational points, its closed points, and its
//! equations carried into an extension field. Conversion and dispatch to
//! `fibrewise_core::points::{solve, closed, extension, rational}` (the last for Q); the work runs without the GIL and stops
//! on Ctrl-C (`long_run`).
//!
//! An extension GF(q^k) ⊇ GF(q) = GF(p)[a]/(m) receives the coefficients through the field
//! embedding that sends a to a root of m in GF(q^k) (`extension::generator_image`), never by
//! reading the generator's name again in the larger field, where `a` is another element.

use crate::basis::{engine_by_name, polys_in};
use crate::dispatch::{with_ring, AnyRing, Kind};
use crate::long_run::Budgeted;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::control::Control;
use fibrewise_core::extension::{BinaryField, ExtensionField, TableField};
use fibrewise_core::field::{BigPrimeField, RationalField};
use fibrewise_core::groebner::{Engine, ReducedBasis};
use fibrewise_core::points::closed::{self, ClosedPoint};
use fibrewise_core::points::extension::{embed_coefficients, generator_image, map_poly};
use fibrewise_core::points::{rational, solve};
use fibrewise_core::{Error, Field, Poly, PrimeField, Result, Ring};
use num_rational::BigRational;
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use std::sync::Arc;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(rational_points, m)?)?;
    m.add_function(wrap_pyfunction!(closed_points, m)?)?;
    m.add_function(wrap_pyfunction!(closed_points_over_q, m)?)?;
    m.add_function(wrap_pyfunction!(rational_points_of_basis, m)?)?;
    m.add_function(wrap_pyfunction!(embed, m)?)?;
    Ok(())
}

/// The points of V(gens) with coordinates in the field of `space`, each a list of coefficients
/// (ints: residues for GF(p), integer representations for GF(p^k)); at most `limit` of them.
/// Every point is checked in every generator by the core before it is returned.
#[pyfunction]
#[pyo3(signature = (space, gens, limit=None, engine="auto"))]
fn rational_points(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    limit: Option<usize>,
    engine: &str,
) -> PyResult<Vec<Vec<PyObject>>> {
    let engine = engine_by_name(engine)?;
    if let AnyRing::Rational(r) = &space.ring {
        return rational_points_over_q(py, space, r, &gens, limit, engine);
    }
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let points = space.run(py, |control| {
            solve::rational_points(r, &gens, limit, engine, control)
        })?;
        r.field.rows_to_py(py, &points)
    })
}

/// The points of a zero-dimensional system over a finite field from its reduced grevlex basis
/// `basis` (in `space`, whose order is grevlex), already computed by the caller: no second
/// basis. Each point is checked in every polynomial of `equations` before it is returned.
#[pyfunction]
#[pyo3(signature = (space, basis, equations, limit=None, engine="auto"))]
fn rational_points_of_basis(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
    equations: Vec<PyRef<'_, NativePoly>>,
    limit: Option<usize>,
    engine: &str,
) -> PyResult<Vec<Vec<PyObject>>> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let polys = polys_in(space, r, &basis)?;
        let equations = polys_in(space, r, &equations)?;
        let gb = ReducedBasis { ring: (**r).clone(), polys, stats: Default::default() };
        let mut points = space.run(py, |control| {
            let points = solve::zero_dimensional_points(&gb, engine, control)?;
            points.iter().try_for_each(|p| solve::check_point(r, &equations, p))?;
            Ok(points)
        })?;
        points.truncate(limit.unwrap_or(usize::MAX));
        r.field.rows_to_py(py, &points)
    })
}

/// The points in Q^n of a zero-dimensional system over Q, exactly (Fractions), sorted; at most
/// `limit` of them. An error for a system of positive dimension.
fn rational_points_over_q(
    py: Python<'_>,
    space: &NativeSpace,
    r: &Ring<RationalField>,
    gens: &[PyRef<'_, NativePoly>],
    limit: Option<usize>,
    engine: Engine,
) -> PyResult<Vec<Vec<PyObject>>> {
    let gens = polys_in(space, r, gens)?;
    let mut points = space.run(py, |control| {
        rational::rational_points_over_q(r, &gens, engine, control)
    })?;
    points.truncate(limit.unwrap_or(usize::MAX));
    RationalField.rows_to_py(py, &points)
}

/// A closed point over Q as plain lists of Fractions: (degree, separating linear form as
/// (variable index, coefficient) pairs, minimal polynomial m of the form (coefficients from the
/// constant term up, monic), coordinates x_i = g_i(t) mod m (each from the constant term up)).
type RationalClosedPointLists = (
    usize,
    Vec<(usize, PyObject)>,
    Vec<PyObject>,
    Vec<Vec<PyObject>>,
);

/// The closed points over Q of a zero-dimensional system over Q, by increasing degree, each
/// with the minimal polynomial of a separating linear form and the coordinates as polynomials
/// in its root. Checked by the core in every equation before they are returned.
#[pyfunction]
#[pyo3(signature = (space, gens, engine="auto"))]
fn closed_points_over_q(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    engine: &str,
) -> PyResult<Vec<RationalClosedPointLists>> {
    let engine = engine_by_name(engine)?;
    let AnyRing::Rational(r) = &space.ring else {
        return Err(PyValueError::new_err(
            "closed points over Q: the space's field is not Q",
        ));
    };
    let gens = polys_in(space, r, &gens)?;
    let found = space.run(py, |control| {
        rational::closed_points_over_q(r, &gens, engine, control)
    })?;
    let q = |c: &BigRational| RationalField.coefficient_to_py(py, c);
    let list = |u: &[BigRational]| u.iter().map(q).collect::<PyResult<Vec<_>>>();
    found
        .iter()
        .map(|point| {
            let form = point
                .form
                .iter()
                .map(|(i, c)| Ok((*i, q(c)?)))
                .collect::<PyResult<Vec<_>>>()?;
            let coordinates = point
                .coordinates
                .iter()
                .map(|g| list(g))
                .collect::<PyResult<Vec<_>>>()?;
            Ok((
                point.degree,
                form,
                list(&point.minimal_polynomial)?,
                coordinates,
            ))
        })
        .collect()
}

/// The closed points of a zero-dimensional system: (degree, reduced lex basis of the maximal
/// ideal) for each, by increasing degree. The bases live in the space's variables with the lex
/// order.
#[pyfunction]
#[pyo3(signature = (space, gens, engine="auto"))]
fn closed_points(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    engine: &str,
) -> PyResult<Vec<(usize, Vec<NativePoly>)>> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let found = space.run(py, |control| {
            closed::closed_points(r, &gens, engine, control)
        })?;
        Ok(closed_points_to_py(found, space.memory))
    })
}

/// Closed points as (degree, native polynomials of the reduced lex basis of the maximal ideal).
pub(crate) fn closed_points_to_py<F: Kind>(
    points: Vec<ClosedPoint<F>>,
    memory: Option<u64>,
) -> Vec<(usize, Vec<NativePoly>)> {
    points
        .into_iter()
        .map(|p| {
            let basis = p.equations;
            (p.degree, native_polys(basis.ring, basis.polys, memory))
        })
        .collect()
}

/// Polynomials of a ring the core made (the lex ring of a closed point) as native handles.
pub(crate) fn native_polys<F: Kind>(
    ring: Ring<F>,
    polys: Vec<Poly<F>>,
    memory: Option<u64>,
) -> Vec<NativePoly> {
    let ring = F::wrap_ring(Arc::new(ring));
    polys
        .into_iter()
        .map(|p| NativePoly {
            ring: ring.clone(),
            poly: F::wrap_poly(p),
            memory,
        })
        .collect()
}

/// The polynomials of `space` as polynomials of `target` (same variables, a field containing
/// the field of `space`), every coefficient mapped by the field embedding; with them the image
/// of the generator of GF(p^j) (as `target`'s coefficient, an int), `None` for a prime field,
/// whose embedding is unique.
#[pyfunction]
fn embed(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    target: &NativeSpace,
) -> PyResult<(Vec<NativePoly>, Option<PyObject>)> {
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        with_ring!(&target.ring, t => {
            if r.names() != t.names() {
                return Err(PyValueError::new_err(format!(
                    "the spaces have different variables: {} and {}",
                    r.names().join(", "),
                    t.names().join(", ")
                )));
            }
            let (mapped, generator) = space.run(py, |control| {
                let embedding = Embedding::new(&r.field, &t.field, control)?;
                let mapped: Vec<_> = gens
                    .iter()
                    .map(|g| map_poly(g, t, &|c| embedding.image(c)))
                    .collect();
                Ok((mapped, embedding.generator))
            })?;
            let generator = generator
                .map(|g| t.field.coefficient_to_py(py, &g))
                .transpose()?;
            Ok((mapped.into_iter().map(|g| target.poly(g)).collect(), generator))
        })
    })
}

/// An embedding of a finite field `F` into a field `E` of the same characteristic: for GF(p^j)
/// given by the image of its generator, for GF(p) the unique one.
struct Embedding<'a, F: Field, E: Field> {
    from: &'a F,
    to: &'a E,
    generator: Option<E::Elem>,
}

impl<'a, F: PrimeCoefficients, E: Field> Embedding<'a, F, E> {
    fn new(from: &'a F, to: &'a E, control: &Control) -> Result<Self> {
        let no_embedding = || {
            Error::invalid(format!(
                "{} does not contain {}: no embedding of the coefficients",
                to.spec(),
                from.spec()
            ))
        };
        if from.word_modulus().is_none() && from.modulus_of_extension().is_none() {
            // Q and primes beyond a machine word: only the field itself contains them.
            return if from.spec() == to.spec() {
                Err(Error::invalid(format!(
                    "{} is already the field of the system: no embedding needed",
                    to.spec()
                )))
            } else {
                Err(no_embedding())
            };
        }
        if from.characteristic() != to.characteristic() || to.order().is_none() {
            return Err(no_embedding());
        }
        let generator = match from.modulus_of_extension() {
            Some(m) => Some(generator_image(m, to, control)?),
            None => None,
        };
        Ok(Embedding {
            from,
            to,
            generator,
        })
    }

    fn image(&self, c: &F::Elem) -> E::Elem {
        let coefficients = self.from.prime_coefficients(c);
        match &self.generator {
            Some(g) => embed_coefficients(self.to, &coefficients, g),
            None => self.to.from_i64(coefficients[0] as i64),
        }
    }
}

/// Elements of GF(p) (p < 2^63) and GF(p^k) as coefficient vectors over GF(p).
trait PrimeCoefficients: Field {
    /// The modulus m of GF(p^k) = GF(p)[a]/(m); `None` for other fields.
    fn modulus_of_extension(&self) -> Option<&fibrewise_core::extension::Modulus> {
        None
    }
    /// c_0, c_1, ... with c = Σ c_i a^i (one residue for GF(p)); only called for the fields
    /// that [`Embedding::new`] accepts.
    fn prime_coefficients(&self, c: &Self::Elem) -> Vec<u64>;
}

impl PrimeCoefficients for PrimeField {
    fn prime_coefficients(&self, c: &u64) -> Vec<u64> {
        vec![self.to_word(c)]
    }
}

impl PrimeCoefficients for TableField {
    fn modulus_of_extension(&self) -> Option<&fibrewise_core::extension::Modulus> {
        Some(self.modulus())
    }
    fn prime_coefficients(&self, c: &u32) -> Vec<u64> {
        self.decode(*c)
    }
}

impl PrimeCoefficients for BinaryField {
    fn modulus_of_extension(&self) -> Option<&fibrewise_core::extension::Modulus> {
        Some(self.modulus())
    }
    fn prime_coefficients(&self, c: &u64) -> Vec<u64> {
        (0..self.degree()).map(|i| (c >> i) & 1).collect()
    }
}

impl PrimeCoefficients for ExtensionField {
    fn modulus_of_extension(&self) -> Option<&fibrewise_core::extension::Modulus> {
        Some(self.modulus())
    }
    fn prime_coefficients(&self, c: &Box<[u64]>) -> Vec<u64> {
        c.to_vec()
    }
}

/// Fields without an embedding into another field (Embedding::new refuses them).
macro_rules! no_prime_coefficients {
    ($($t:ty),*) => {$(
        impl PrimeCoefficients for $t {
            fn prime_coefficients(&self, _c: &Self::Elem) -> Vec<u64> {
                unreachable!("Embedding::new refuses {}", self.spec())
            }
        }
    )*};
}
no_prime_coefficients!(
    BigPrimeField<2>,
    BigPrimeField<4>,
    BigPrimeField<8>,
    RationalField
);
