//! The field kinds the bindings know, and dispatch from a runtime field kind to the generic core.
//!
//! Adding a field kind: one variant in each enum, one `Kind` impl, one arm in each macro.

use fibrewise_core::{Field, Poly, PrimeField, Ring};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use std::sync::Arc;

#[derive(Clone, Debug, PartialEq)]
pub enum AnyField {
    Prime(PrimeField),
}

#[derive(Clone, Debug)]
pub enum AnyRing {
    Prime(Arc<Ring<PrimeField>>),
}

#[derive(Clone, Debug)]
pub enum AnyPoly {
    Prime(Poly<PrimeField>),
}

/// Runs `$body` with `$x` bound to the concrete field inside an `AnyField`.
macro_rules! with_field {
    ($f:expr, $x:ident => $body:expr) => {
        match $f {
            $crate::dispatch::AnyField::Prime($x) => $body,
        }
    };
}

/// Runs `$body` with `$x` bound to the concrete `Arc<Ring<F>>` inside an `AnyRing`.
macro_rules! with_ring {
    ($r:expr, $x:ident => $body:expr) => {
        match $r {
            $crate::dispatch::AnyRing::Prime($x) => $body,
        }
    };
}

pub(crate) use {with_field, with_ring};

/// What the bindings need of a field kind: wrapping into the enums and coefficient conversion.
pub trait Kind: Field {
    fn wrap_ring(r: Arc<Ring<Self>>) -> AnyRing;
    fn wrap_poly(p: Poly<Self>) -> AnyPoly;
    fn unwrap_poly(p: &AnyPoly) -> Option<&Poly<Self>>;
    /// A coefficient as a Python object (int for prime fields).
    fn coefficient_to_py(&self, py: Python<'_>, c: &Self::Elem) -> PyResult<PyObject>;
    /// A Python number as a field element.
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<Self::Elem>;
}

impl Kind for PrimeField {
    fn wrap_ring(r: Arc<Ring<Self>>) -> AnyRing {
        AnyRing::Prime(r)
    }
    fn wrap_poly(p: Poly<Self>) -> AnyPoly {
        AnyPoly::Prime(p)
    }
    #[allow(unreachable_patterns)]
    fn unwrap_poly(p: &AnyPoly) -> Option<&Poly<Self>> {
        match p {
            AnyPoly::Prime(p) => Some(p),
            _ => None,
        }
    }
    fn coefficient_to_py(&self, py: Python<'_>, c: &u64) -> PyResult<PyObject> {
        Ok(c.into_pyobject(py)?.into_any().unbind())
    }
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<u64> {
        if v.is_instance_of::<pyo3::types::PyBool>() || !v.is_instance_of::<pyo3::types::PyInt>() {
            return Err(PyValueError::new_err(format!(
                "a coefficient of {} must be an int, not {}",
                self.spec(),
                v.get_type().name()?
            )));
        }
        // Python's % gives the residue in [0, p) for ints of any size.
        v.rem(self.modulus())?.extract()
    }
}

/// Whether polynomials of the two rings can be combined (orders may differ).
#[allow(unreachable_patterns)]
pub fn same_variables_and_field(a: &AnyRing, b: &AnyRing) -> bool {
    match (a, b) {
        (AnyRing::Prime(x), AnyRing::Prime(y)) => x.field == y.field && x.names() == y.names(),
        _ => false,
    }
}

/// Field spec strings of prime fields: `7`, `GF(7)`, `GF(65521)`.
pub fn parse_field_spec(spec: &str) -> PyResult<AnyField> {
    let s = spec.trim();
    let inner = s.strip_prefix("GF(").and_then(|r| r.strip_suffix(')')).unwrap_or(s).trim();
    let p: u64 = inner.parse().map_err(|_| {
        PyValueError::new_err(format!("unknown field spec '{spec}': expected a prime such as 7 or 'GF(7)'"))
    })?;
    PrimeField::new(p).map(AnyField::Prime).map_err(crate::errors::to_py)
}
