//! The field kinds the bindings know, and dispatch from a runtime field kind to the generic core.
//!
//! Adding a field kind: one variant in each enum, one `Kind` impl, one arm in each macro.

use fibrewise_core::field::{
    BigPrimeField, BinaryField, ExtensionField, RationalField, TableField,
};
use fibrewise_core::{Field, Poly, PrimeField, Ring};
use pyo3::exceptions::PyTypeError;
use pyo3::prelude::*;
use std::sync::Arc;

/// The field kinds, as the core's field-spec reader produces them (`fibrewise_core::field::AnyField`):
/// Prime (p < 2^63), BigPrime2/4/8 (larger primes on 2, 4, 8 limbs), Table (GF(p^k), q <= 2^16),
/// Binary (GF(2^k), 2^16 < q <= 2^64), Extension (other GF(p^k)), Rational (Q).
pub use fibrewise_core::field::AnyField;

#[derive(Clone, Debug)]
pub enum AnyRing {
    Prime(Arc<Ring<PrimeField>>),
    BigPrime2(Arc<Ring<BigPrimeField<2>>>),
    BigPrime4(Arc<Ring<BigPrimeField<4>>>),
    BigPrime8(Arc<Ring<BigPrimeField<8>>>),
    Table(Arc<Ring<TableField>>),
    Binary(Arc<Ring<BinaryField>>),
    Extension(Arc<Ring<ExtensionField>>),
    Rational(Arc<Ring<RationalField>>),
}

#[derive(Clone, Debug)]
pub enum AnyPoly {
    Prime(Poly<PrimeField>),
    BigPrime2(Poly<BigPrimeField<2>>),
    BigPrime4(Poly<BigPrimeField<4>>),
    BigPrime8(Poly<BigPrimeField<8>>),
    Table(Poly<TableField>),
    Binary(Poly<BinaryField>),
    Extension(Poly<ExtensionField>),
    Rational(Poly<RationalField>),
}

/// Runs `$body` with `$x` bound to the concrete field inside an `AnyField`.
macro_rules! with_field {
    ($f:expr, $x:ident => $body:expr) => {
        fibrewise_core::with_any_field!($f, $x => $body)
    };
}

/// Runs `$body` with `$x` bound to the concrete `Arc<Ring<F>>` inside an `AnyRing`.
macro_rules! with_ring {
    ($r:expr, $x:ident => $body:expr) => {
        match $r {
            $crate::dispatch::AnyRing::Prime($x) => $body,
            $crate::dispatch::AnyRing::BigPrime2($x) => $body,
            $crate::dispatch::AnyRing::BigPrime4($x) => $body,
            $crate::dispatch::AnyRing::BigPrime8($x) => $body,
            $crate::dispatch::AnyRing::Table($x) => $body,
            $crate::dispatch::AnyRing::Binary($x) => $body,
            $crate::dispatch::AnyRing::Extension($x) => $body,
            $crate::dispatch::AnyRing::Rational($x) => $body,
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
            return Err(PyTypeError::new_err(format!(
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
pub fn same_variables_and_field(a: &AnyRing, b: &AnyRing) -> bool {
    fn same<F: Field>(x: &Ring<F>, y: &Ring<F>) -> bool {
        x.field == y.field && x.names() == y.names()
    }
    match (a, b) {
        (AnyRing::Prime(x), AnyRing::Prime(y)) => same(x, y),
        (AnyRing::BigPrime2(x), AnyRing::BigPrime2(y)) => same(x, y),
        (AnyRing::BigPrime4(x), AnyRing::BigPrime4(y)) => same(x, y),
        (AnyRing::BigPrime8(x), AnyRing::BigPrime8(y)) => same(x, y),
        (AnyRing::Table(x), AnyRing::Table(y)) => same(x, y),
        (AnyRing::Binary(x), AnyRing::Binary(y)) => same(x, y),
        (AnyRing::Extension(x), AnyRing::Extension(y)) => same(x, y),
        (AnyRing::Rational(x), AnyRing::Rational(y)) => same(x, y),
        _ => false,
    }
}
