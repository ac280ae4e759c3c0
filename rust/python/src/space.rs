//! Native field, space and polynomial handles. Python's `fibrewise.Field`, `Space` and
//! `Polynomial` wrap these. A space is k^n with named coordinates and a monomial order; its
//! polynomials live in the core's `Ring`.

use crate::convert::order_from_py;
use crate::dispatch::{
    parse_field_spec, same_variables_and_field, with_field, with_modulus, with_ring, AnyField,
    AnyPoly, AnyRing, Kind,
};
use crate::errors::{internal, IntoPy};
use fibrewise_core::parse::parse_poly;
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
    /// The field named by `spec`; with `modulus`, GF(p^k) on that modulus (text in `a`).
    #[new]
    #[pyo3(signature = (spec, modulus=None))]
    fn new(spec: &str, modulus: Option<&str>) -> PyResult<Self> {
        let field = match modulus {
            None => parse_field_spec(spec)?,
            Some(text) => with_modulus(spec, text)?,
        };
        Ok(NativeField { field })
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
}

fn new_ring<F: Kind>(field: &F, names: Vec<String>, order: &Bound<'_, PyAny>) -> PyResult<AnyRing> {
    let order = order_from_py(order, names.len())?;
    Ok(F::wrap_ring(Arc::new(
        Ring::new(field.clone(), names, order).py_err()?,
    )))
}

impl NativeSpace {
    pub fn poly<F: Kind>(&self, p: Poly<F>) -> NativePoly {
        NativePoly {
            ring: self.ring.clone(),
            poly: F::wrap_poly(p),
        }
    }
}

#[pymethods]
impl NativeSpace {
    #[new]
    fn new(field: &NativeField, names: Vec<String>, order: &Bound<'_, PyAny>) -> PyResult<Self> {
        let ring = with_field!(&field.field, f => new_ring(f, names, order)?);
        Ok(NativeSpace { ring })
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
        Ok(NativeSpace { ring })
    }
    fn parse(&self, text: &str) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.poly(parse_poly(r, text).py_err()?)))
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

/// Moving a concrete field back into the enum (for `NativeSpace::field`).
pub(crate) trait IntoAny {
    fn into_any(self) -> AnyField;
}
impl IntoAny for fibrewise_core::PrimeField {
    fn into_any(self) -> AnyField {
        AnyField::Prime(self)
    }
}

#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativePoly {
    pub ring: AnyRing,
    pub poly: AnyPoly,
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
    fn mul(&self, other: &NativePoly) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.mul(self.inner_of(r)?, &self.other_in(r, other)?).py_err()?)))
    }
    fn neg(&self) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.neg(self.inner_of(r)?))))
    }
    fn pow(&self, e: u64) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => Ok(self.wrap(r.pow(self.inner_of(r)?, e).py_err()?)))
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
    /// Substitutes `images[i]` for variable i (None keeps the variable).
    fn substitute(&self, images: Vec<Option<PyRef<'_, NativePoly>>>) -> PyResult<NativePoly> {
        with_ring!(&self.ring, r => {
            if images.len() != r.nvars() {
                return Err(PyValueError::new_err("substitute needs one entry per variable"));
            }
            let imgs: PyResult<Vec<_>> = images.iter().enumerate().map(|(i, g)| match g {
                Some(g) => self.other_in(r, g),
                None => Ok(r.var(i)),
            }).collect();
            Ok(self.wrap(r.substitute(self.inner_of(r)?, &imgs?, r).py_err()?))
        })
    }
}
