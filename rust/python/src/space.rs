//! Native field, space and polynomial handles. Python's `fibrewise.Field`, `Space` and
//! `Polynomial` wrap these. A space is k^n with named coordinates and a monomial order; its
//! polynomials live in the core's `Ring`.

use crate::convert::order_from_py;
use crate::dispatch::{
    same_variables_and_field, with_field, with_ring, AnyField, AnyPoly, AnyRing, Kind, Wrap,
};
use crate::errors::{internal, IntoPy};
use crate::long_run::{self, Budgeted};
use fibrewise_core::control::Limits;
use fibrewise_core::parse::parse_poly_within;
use fibrewise_core::poly::{power_size, substitution_size};
use fibrewise_core::{Field, Monomial, Poly, Ring};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use std::sync::Arc;

#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativeField {
    pub field: AnyField,
}

#[pymethods]
impl NativeField {
    /// The field named by `spec`; with `modulus`, GF(p^k) on that modulus (text in the
    /// generator); `generator` names the generator of GF(p^k) in texts. Built without the GIL,
    /// interruptible.
    #[new]
    #[pyo3(signature = (spec, modulus=None, generator="a"))]
    fn new(py: Python<'_>, spec: &str, modulus: Option<&str>, generator: &str) -> PyResult<Self> {
        let field = long_run::run(py, Limits::default(), None, |control| {
            AnyField::parse_within(spec, modulus, generator, control)
        })?;
        Ok(NativeField { field })
    }
    /// The name of the generator of GF(p^k) (`a` by default); None for other fields.
    #[getter]
    fn generator(&self) -> Option<String> {
        with_field!(&self.field, f => f.generator_name().map(String::from))
    }
    #[getter]
    fn characteristic(&self) -> String {
        with_field!(&self.field, f => f.characteristic())
    }
    /// Number of elements; None for Q.
    #[getter]
    fn size(&self) -> Option<String> {
        with_field!(&self.field, f => f.order())
    }
    #[getter]
    fn degree(&self) -> u32 {
        with_field!(&self.field, f => f.degree())
    }
    #[getter]
    fn spec(&self) -> String {
        with_field!(&self.field, f => f.spec())
    }
    fn __eq__(&self, other: &NativeField) -> bool {
        self.field == other.field
    }
}

#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativeSpace {
    pub ring: AnyRing,
    /// Memory budget in bytes of every computation in this space (None: the core's default).
    pub memory: Option<u64>,
}

fn new_ring<F: Kind>(field: &F, names: Vec<String>, order: &Bound<'_, PyAny>) -> PyResult<AnyRing> {
    let order = order_from_py(order, names.len())?;
    Ok(F::wrap_ring(Arc::new(
        Ring::new(field.clone(), names, order).py_err()?,
    )))
}

impl Budgeted for NativeSpace {
    fn memory_budget(&self) -> Option<u64> {
        self.memory
    }
}

impl NativeSpace {
    pub fn poly<F: Kind>(&self, p: Poly<F>) -> NativePoly {
        NativePoly {
            ring: self.ring.clone(),
            poly: F::wrap_poly(p),
            memory: self.memory,
        }
    }
}

#[pymethods]
impl NativeSpace {
    #[new]
    #[pyo3(signature = (field, names, order, memory=None))]
    fn new(
        field: &NativeField,
        names: Vec<String>,
        order: &Bound<'_, PyAny>,
        memory: Option<u64>,
    ) -> PyResult<Self> {
        let ring = with_field!(&field.field, f => new_ring(f, names, order)?);
        Ok(NativeSpace { ring, memory })
    }
    /// The memory budget in bytes (None: the default, a fraction of the machine's memory).
    #[getter]
    fn memory(&self) -> Option<u64> {
        self.memory
    }
    #[getter]
    fn names(&self) -> Vec<String> {
        with_ring!(&self.ring, r => r.names().to_vec())
    }
    #[getter]
    fn field(&self) -> NativeField {
        with_ring!(&self.ring, r => NativeField { field: r.field.clone().into_any() })
    }
    /// The same space with another order.
    fn with_order(&self, order: &Bound<'_, PyAny>) -> PyResult<NativeSpace> {
        let ring = with_ring!(&self.ring, r => new_ring(&r.field, r.names().to_vec(), order)?);
        Ok(NativeSpace {
            ring,
            memory: self.memory,
        })
    }
    /// Parsed without the GIL, interruptible, powers and products within the memory budget.
    /// Only a parenthesis lets a text expand beyond its length ((x + 1)^1000, products of
    /// sums): a text without one is read at once.
    fn parse(&self, py: Python<'_>, text: &str) -> PyResult<NativePoly> {
        let cost = if text.contains('(') {
            u64::MAX
        } else {
            text.len() as u64
        };
        with_ring!(&self.ring, r => {
            let p = long_run::run_sized(py, cost, self.memory, |control| parse_poly_within(r, text, control))?;
            Ok(self.poly(p))
        })
    }
    fn constant(&self, value: &Bound<'_, PyAny>) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.poly(r.constant(r.field.coefficient_from_py(value)?))))
    }
    fn var(&self, i: usize) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            if i >= r.nvars() {
                return Err(PyValueError::new_err(format!("variable index {i} out of range")));
            }
            Ok(self.poly(r.var(i)))
        })
    }
    /// A polynomial from (exponent tuple, coefficient) pairs.
    #[allow(clippy::wrong_self_convention)] // the space (its ring) makes the polynomial
    fn from_terms(&self, terms: Vec<(Vec<u32>, Bound<'_, PyAny>)>) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            let mut out = Vec::with_capacity(terms.len());
            for (exps, c) in terms {
                if exps.len() != r.nvars() {
                    return Err(PyValueError::new_err(format!(
                        "exponent vector {exps:?} has {} entries for {} variables", exps.len(), r.nvars())));
                }
                out.push((Monomial::from_exponents(exps).py_err()?, r.field.coefficient_from_py(&c)?));
            }
            Ok(self.poly(r.from_terms(out)))
        })
    }
}

#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativePoly {
    pub ring: AnyRing,
    pub poly: AnyPoly,
    /// The memory budget of its space.
    pub memory: Option<u64>,
}

impl NativePoly {
    /// The polynomial, typed by the ring it belongs to.
    pub fn inner_of<F: Kind>(&self, _ring: &Ring<F>) -> PyResult<&Poly<F>> {
        self.inner()
    }
    pub fn inner<F: Kind>(&self) -> PyResult<&Poly<F>> {
        F::unwrap_poly(&self.poly).ok_or_else(|| internal("polynomial does not match its ring"))
    }
    fn wrap<F: Kind>(&self, p: Poly<F>) -> NativePoly {
        NativePoly {
            ring: self.ring.clone(),
            poly: F::wrap_poly(p),
            memory: self.memory,
        }
    }
    /// `other` as a polynomial of this ring (same field and variables; sorted for this order).
    pub fn other_in<F: Kind>(&self, ring: &Ring<F>, other: &NativePoly) -> PyResult<Poly<F>> {
        if !same_variables_and_field(&self.ring, &other.ring) {
            return Err(PyValueError::new_err(
                "the polynomials belong to different spaces",
            ));
        }
        let p = other.inner::<F>()?.clone();
        Ok(if with_ring!(&other.ring, o => o.order == ring.order) {
            p
        } else {
            ring.adopt(p)
        })
    }
}

#[pymethods]
impl NativePoly {
    fn add(&self, other: &NativePoly) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.add(self.inner_of(r)?, &self.other_in(r, other)?))))
    }
    fn sub(&self, other: &NativePoly) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.sub(self.inner_of(r)?, &self.other_in(r, other)?))))
    }
    /// Long products run without the GIL, interruptible, within the memory budget.
    fn mul(&self, py: Python<'_>, other: &NativePoly) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            let (f, g) = (self.inner_of(r)?, &self.other_in(r, other)?);
            let cost = (f.len() as u64).saturating_mul(g.len() as u64);
            Ok(self.wrap(long_run::run_sized(py, cost, self.memory, |control| r.mul_within(f, g, control))?))
        })
    }
    fn neg(&self) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.neg(self.inner_of(r)?))))
    }
    fn pow(&self, py: Python<'_>, e: u64) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            let f = self.inner_of(r)?;
            let cost = power_size(f, e).saturating_mul(f.len() as u64);
            Ok(self.wrap(long_run::run_sized(py, cost, self.memory, |control| r.pow_within(f, e, control))?))
        })
    }
    fn equals(&self, other: &NativePoly) -> PyResult<bool> {
        with_ring!(&self.ring, r => Ok(self.inner_of(r)? == &self.other_in(r, other)?))
    }
    fn is_zero(&self) -> PyResult<bool> {
        with_ring!(&self.ring, r => Ok(self.inner_of(r)?.is_zero()))
    }
    fn is_homogeneous(&self) -> PyResult<bool> {
        with_ring!(&self.ring, r => Ok(self.inner_of(r)?.is_homogeneous()))
    }
    fn format(&self) -> PyResult<String> {
        with_ring!(&self.ring, r => Ok(r.format(self.inner_of(r)?)))
    }
    fn degree(&self) -> PyResult<Option<u32>> {
        with_ring!(&self.ring, r => Ok(self.inner_of(r)?.degree()))
    }
    /// Terms as (exponent tuple, coefficient), decreasing in the ring's order.
    fn terms(&self, py: Python<'_>) -> PyResult<Vec<(Vec<u32>, PyObject)>> {
        with_ring!(&self.ring, r => self.inner_of(r)?.terms().iter()
            .map(|(m, c)| Ok((m.exponents().to_vec(), r.field.coefficient_to_py(py, c)?)))
            .collect())
    }
    /// Exponents of the leading monomial for the order of `ring` (None for zero).
    fn leading_monomial(&self, ring: &NativeSpace) -> PyResult<Option<Vec<u32>>> {
        with_ring!(&ring.ring, r => {
            let p = self.other_in(r, self)?;
            Ok(p.leading_monomial().map(|m| m.exponents().to_vec()))
        })
    }
    fn evaluate(&self, py: Python<'_>, point: Vec<Bound<'_, PyAny>>) -> PyResult<PyObject> {
        with_ring!(&self.ring, r => {
            let pt: PyResult<Vec<_>> = point.iter().map(|v| r.field.coefficient_from_py(v)).collect();
            let v = r.evaluate(self.inner_of(r)?, &pt?).py_err()?;
            r.field.coefficient_to_py(py, &v)
        })
    }
    /// Substitutes `images[i]` for variable i (None keeps the variable); long substitutions
    /// run without the GIL, interruptible, within the memory budget.
    fn substitute(
        &self,
        py: Python<'_>,
        images: Vec<Option<PyRef<'_, NativePoly>>>,
    ) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            if images.len() != r.nvars() {
                return Err(PyValueError::new_err("substitute needs one entry per variable"));
            }
            let imgs: PyResult<Vec<_>> = images.iter().enumerate().map(|(i, g)| match g {
                Some(g) => self.other_in(r, g),
                None => Ok(r.var(i)),
            }).collect();
            let (f, imgs) = (self.inner_of(r)?, imgs?);
            let cost = substitution_size(f, &imgs, r.nvars());
            Ok(self.wrap(long_run::run_sized(py, cost, self.memory, |control| r.substitute_within(f, &imgs, r, control))?))
        })
    }
}
