//! Boolean systems over GF(2) (every variable satisfies v^2 = v): conversion and dispatch to
//! `fibrewise_core::boolean`.
//!
//! A Boolean space is a general space over GF(2), whose polynomials the Python side keeps, with
//! the core's `BooleanRing` on the same names and order beside it; polynomials cross between
//! the two by `BooleanRing::from_poly` (every exponent above 0 becomes 1) and `to_poly`.

use crate::basis::stats_to_py;
use crate::convert::{limits, with_time_limit};
use crate::dispatch::{same_variables_and_field, AnyPoly, AnyRing};
use crate::errors::IntoPy;
use crate::long_run::Budgeted;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::boolean::{
    self, BoolOrder, BoolPoly, BooleanBasis, BooleanRing, Choice, Method,
};
use fibrewise_core::control::Control;
use fibrewise_core::groebner::Stats;
use fibrewise_core::{MonomialOrder, Poly, PrimeField, Result, Ring};
use num_bigint::BigUint;
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use pyo3::types::{PyBytes, PyDict};
use std::sync::Arc;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_class::<NativeBooleanSpace>()?;
    Ok(())
}

#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativeBooleanSpace {
    ring: BooleanRing,
    /// The general ring over GF(2) of the space, in which the Python side keeps polynomials.
    general: Arc<Ring<PrimeField>>,
    /// The memory budget of the space (None: the default).
    memory: Option<u64>,
}

fn bool_order(order: &MonomialOrder) -> PyResult<BoolOrder> {
    match order {
        MonomialOrder::Lex => Ok(BoolOrder::Lex),
        MonomialOrder::Grlex => Ok(BoolOrder::Deglex),
        MonomialOrder::Grevlex => Ok(BoolOrder::Grevlex),
        _ => Err(PyValueError::new_err(
            "a Boolean space has the order lex, grlex or grevlex (block and weight orders are \
             not available on Boolean spaces)",
        )),
    }
}

impl Budgeted for NativeBooleanSpace {
    fn memory_budget(&self) -> Option<u64> {
        self.memory
    }
}

type Points<'py> = Vec<Bound<'py, PyBytes>>;

impl NativeBooleanSpace {
    fn wrap(&self, p: Poly<PrimeField>) -> NativePoly {
        NativePoly {
            ring: AnyRing::Prime(self.general.clone()),
            poly: AnyPoly::Prime(p),
            memory: self.memory,
        }
    }

    fn to_general(&self, f: &BoolPoly) -> PyResult<NativePoly> {
        Ok(self.wrap(self.ring.to_poly(&self.general, f).py_err()?))
    }

    fn to_boolean(&self, f: &NativePoly) -> PyResult<BoolPoly> {
        let own = AnyRing::Prime(self.general.clone());
        if !same_variables_and_field(&own, &f.ring) {
            return Err(PyValueError::new_err(
                "the polynomial does not belong to this Boolean space",
            ));
        }
        self.ring
            .from_poly(&self.general, f.inner::<PrimeField>()?)
            .py_err()
    }

    fn to_booleans(&self, fs: &[PyRef<'_, NativePoly>]) -> PyResult<Vec<BoolPoly>> {
        fs.iter().map(|f| self.to_boolean(f)).collect()
    }

    /// A solving call: the equations and method read in core terms, then `work` on them as a
    /// long run on at most `threads` threads.
    fn run_request<T: Send>(
        &self,
        py: Python<'_>,
        gens: &[PyRef<'_, NativePoly>],
        method: &str,
        threads: Option<usize>,
        work: impl FnOnce(&[BoolPoly], Method, &Control) -> Result<T> + Send,
    ) -> PyResult<T> {
        let gens = self.to_booleans(gens)?;
        let method = Method::by_name(method).py_err()?;
        let limits = limits(None, None, threads)?;
        self.run_limited(py, limits, |control| work(&gens, method, control))
    }

    fn basis_of(&self, polys: &[PyRef<'_, NativePoly>]) -> PyResult<BooleanBasis> {
        Ok(BooleanBasis {
            ring: self.ring.clone(),
            polys: self.to_booleans(polys)?,
            stats: Stats::default(),
        })
    }
}

/// The method chosen, as a dict: method, guess (hybrid), reason, estimates.
fn choice_to_py<'py>(py: Python<'py>, choice: &Choice) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("method", choice.method.name())?;
    let guess = match choice.method {
        Method::Hybrid { guess } => guess,
        _ => None,
    };
    d.set_item("guess", guess)?;
    d.set_item("reason", &choice.reason)?;
    let e = PyDict::new(py);
    let est = &choice.estimates;
    e.set_item("exhaustive", est.exhaustive)?;
    e.set_item("basis", est.basis)?;
    e.set_item("hybrid", est.hybrid)?;
    e.set_item("hybrid_guess", est.hybrid_guess)?;
    e.set_item("degree", est.degree)?;
    d.set_item("estimates", e)?;
    Ok(d)
}

fn points_to_py<'py>(py: Python<'py>, points: &[Vec<bool>]) -> Points<'py> {
    points
        .iter()
        .map(|p| {
            let bytes: Vec<u8> = p.iter().map(|&b| u8::from(b)).collect();
            PyBytes::new(py, &bytes)
        })
        .collect()
}

#[pymethods]
impl NativeBooleanSpace {
    /// The Boolean ring on the variables and order of `space`, which must be over GF(2).
    #[new]
    fn new(space: &NativeSpace) -> PyResult<Self> {
        let AnyRing::Prime(general) = &space.ring else {
            return Err(PyValueError::new_err(
                "a Boolean space is over GF(2) (boolean=True needs the field GF(2))",
            ));
        };
        if general.field.modulus() != 2 {
            return Err(PyValueError::new_err(format!(
                "a Boolean space is over GF(2), not over GF({}) (boolean=True needs the field GF(2))",
                general.field.modulus()
            )));
        }
        let order = bool_order(&general.order)?;
        let ring = BooleanRing::new(general.names().to_vec(), order).py_err()?;
        Ok(NativeBooleanSpace {
            ring,
            general: general.clone(),
            memory: space.memory,
        })
    }

    /// `f` with every exponent above 0 made 1 (its image in the Boolean ring).
    fn reduce(&self, f: PyRef<'_, NativePoly>) -> PyResult<NativePoly> {
        let b = self.to_boolean(&f)?;
        self.to_general(&b)
    }

    /// The reduced Boolean Gröbner basis of `gens` and the engine's statistics.
    #[pyo3(signature = (gens, max_degree=None, max_matrix=None, threads=None, max_seconds=None))]
    fn basis<'py>(
        &self,
        py: Python<'py>,
        gens: Vec<PyRef<'py, NativePoly>>,
        max_degree: Option<u32>,
        max_matrix: Option<u64>,
        threads: Option<usize>,
        max_seconds: Option<f64>,
    ) -> PyResult<(Vec<NativePoly>, Bound<'py, PyDict>)> {
        let gens = self.to_booleans(&gens)?;
        let limits = with_time_limit(limits(max_degree, max_matrix, threads)?, max_seconds)?;
        let b = self.run_limited(py, limits, |control| {
            boolean::basis(&self.ring, &gens, control)
        })?;
        let polys = b
            .polys
            .iter()
            .map(|p| self.to_general(p))
            .collect::<PyResult<_>>()?;
        Ok((polys, stats_to_py(py, &b.stats)?))
    }

    /// The reduced Gröbner basis in GF(2)[x] of the ideal with the field equations, from the
    /// reduced Boolean basis `basis`.
    fn with_field_equations(&self, basis: Vec<PyRef<'_, NativePoly>>) -> PyResult<Vec<NativePoly>> {
        let general = self.basis_of(&basis)?.with_field_equations().py_err()?;
        Ok(general.into_iter().map(|p| self.wrap(p)).collect())
    }

    /// The normal form of `f` modulo the ideal whose reduced Boolean basis is `basis`.
    fn normal_form(
        &self,
        py: Python<'_>,
        basis: Vec<PyRef<'_, NativePoly>>,
        f: PyRef<'_, NativePoly>,
    ) -> PyResult<NativePoly> {
        let b = self.basis_of(&basis)?;
        let f = self.to_boolean(&f)?;
        let nf = self.run(py, |control| b.normal_form(&f, control))?;
        self.to_general(&nf)
    }

    /// The number of solutions in GF(2)^n of the ideal whose reduced Boolean basis is `basis`.
    fn count_of_basis(
        &self,
        py: Python<'_>,
        basis: Vec<PyRef<'_, NativePoly>>,
    ) -> PyResult<BigUint> {
        let b = self.basis_of(&basis)?;
        self.run(py, |control| b.count_solutions(control))
    }

    /// The method the cost estimate picks for `gens` on `threads` threads (all: None).
    #[pyo3(signature = (gens, method="auto", threads=None))]
    fn choose_method<'py>(
        &self,
        py: Python<'py>,
        gens: Vec<PyRef<'py, NativePoly>>,
        method: &str,
        threads: Option<usize>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let choice = self.run_request(py, &gens, method, threads, |gens, method, control| {
            Ok(boolean::resolve_method(&self.ring, gens, method, control))
        })?;
        choice_to_py(py, &choice)
    }

    /// The solutions of `gens` (at most `limit`) by `method`: (points as bytes of 0/1 values,
    /// count or None when the search stopped at the limit, the method chosen, the engine's
    /// statistics or None).
    #[pyo3(signature = (gens, method="auto", limit=None, threads=None))]
    #[allow(clippy::type_complexity)]
    fn solve<'py>(
        &self,
        py: Python<'py>,
        gens: Vec<PyRef<'py, NativePoly>>,
        method: &str,
        limit: Option<usize>,
        threads: Option<usize>,
    ) -> PyResult<(
        Points<'py>,
        Option<BigUint>,
        Bound<'py, PyDict>,
        Option<Bound<'py, PyDict>>,
    )> {
        let found = self.run_request(py, &gens, method, threads, |gens, method, control| {
            boolean::solve(&self.ring, gens, method, limit, control)
        })?;
        let stats = found
            .stats
            .as_ref()
            .map(|s| stats_to_py(py, s))
            .transpose()?;
        Ok((
            points_to_py(py, &found.points),
            found.count,
            choice_to_py(py, &found.choice)?,
            stats,
        ))
    }

    /// The number of solutions of `gens` in GF(2)^n by `method`, and the method chosen.
    #[pyo3(signature = (gens, method="auto", threads=None))]
    fn count<'py>(
        &self,
        py: Python<'py>,
        gens: Vec<PyRef<'py, NativePoly>>,
        method: &str,
        threads: Option<usize>,
    ) -> PyResult<(BigUint, Bound<'py, PyDict>)> {
        let found = self.run_request(py, &gens, method, threads, |gens, method, control| {
            boolean::count(&self.ring, gens, method, control)
        })?;
        let count = found
            .count
            .ok_or_else(|| crate::errors::internal("a count ended without its number"))?;
        Ok((count, choice_to_py(py, &found.choice)?))
    }
}
