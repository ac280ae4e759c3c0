//! The field kinds the bindings know, and dispatch from a runtime field kind to the generic core.
//!
//! The kinds come from the core's one list (`fibrewise_core::for_each_field_kind!`): the enums
//! here, their wrapping and the dispatch macros are generated from it. A new field kind needs
//! only its coefficient conversion (a `Kind` impl, in `field_kinds.rs`).

use fibrewise_core::{Field, Poly, PrimeField, Ring};
use pyo3::exceptions::PyTypeError;
use pyo3::prelude::*;
use std::sync::Arc;

/// The field kinds, as the core's field-spec reader produces them (`fibrewise_core::field_kind::AnyField`):
/// Prime (p < 2^63), BigPrime2/4/8 (larger primes on 2, 4, 8 limbs), Table (GF(p^k), q <= 2^16),
/// Binary (GF(2^k), 2^16 < q <= 2^64), Extension (other GF(p^k)), Rational (Q).
pub use fibrewise_core::field_kind::AnyField;

/// A ring shared by the space and its polynomials.
pub type SharedRing<F> = Arc<Ring<F>>;

fibrewise_core::field_kind_enum! {
    #[derive(Clone, Debug)]
    pub enum AnyRing of SharedRing
}

fibrewise_core::field_kind_enum! {
    #[derive(Clone, Debug)]
    pub enum AnyPoly of Poly
}

/// Runs `$body` with `$x` bound to the concrete field inside an `AnyField`.
macro_rules! with_field {
    ($f:expr, $x:ident => $body:expr) => {
        fibrewise_core::with_any_field!($f, $x => $body)
    };
}

/// Runs `$body` with `$x` bound to the concrete `Arc<Ring<F>>` inside an `AnyRing`.
macro_rules! with_ring {
    ($r:expr, $x:ident => $body:expr) => {{
        use $crate::dispatch::AnyRing;
        fibrewise_core::match_field_kind!(AnyRing, $r, $x => $body)
    }};
}

pub(crate) use {with_field, with_ring};

/// Moving a concrete field, ring or polynomial into the enums, and a polynomial out of them.
pub trait Wrap: Field {
    fn into_any(self) -> AnyField;
    fn wrap_ring(r: Arc<Ring<Self>>) -> AnyRing;
    fn wrap_poly(p: Poly<Self>) -> AnyPoly;
    fn unwrap_poly(p: &AnyPoly) -> Option<&Poly<Self>>;
}

macro_rules! wrap_impls {
    ([$($variant:ident: $field:ty),* $(,)?]) => {$(
        impl Wrap for $field {
            fn into_any(self) -> AnyField {
                AnyField::$variant(self)
            }
            fn wrap_ring(r: Arc<Ring<Self>>) -> AnyRing {
                AnyRing::$variant(r)
            }
            fn wrap_poly(p: Poly<Self>) -> AnyPoly {
                AnyPoly::$variant(p)
            }
            fn unwrap_poly(p: &AnyPoly) -> Option<&Poly<Self>> {
                match p {
                    AnyPoly::$variant(p) => Some(p),
                    _ => None,
                }
            }
        }
    )*};
}
fibrewise_core::for_each_field_kind!(wrap_impls);

/// What the bindings need of a field kind beyond wrapping: coefficient conversion.
pub trait Kind: Wrap {
    /// A coefficient as a Python object (int for prime fields).
    fn coefficient_to_py(&self, py: Python<'_>, c: &Self::Elem) -> PyResult<PyObject>;
    /// A Python number as a field element.
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<Self::Elem>;
    /// Rows of coefficients (points, matrix rows) as lists of Python objects.
    fn rows_to_py(&self, py: Python<'_>, rows: &[Vec<Self::Elem>]) -> PyResult<Vec<Vec<PyObject>>> {
        rows.iter()
            .map(|row| row.iter().map(|c| self.coefficient_to_py(py, c)).collect())
            .collect()
    }
}

impl Kind for PrimeField {
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

macro_rules! same_kind {
    ([$($variant:ident: $field:ty),* $(,)?]) => {
        /// Whether polynomials of the two rings can be combined (orders may differ).
        pub fn same_variables_and_field(a: &AnyRing, b: &AnyRing) -> bool {
            fn same<F: Field>(x: &Ring<F>, y: &Ring<F>) -> bool {
                x.field == y.field && x.names() == y.names()
            }
            match (a, b) {
                $((AnyRing::$variant(x), AnyRing::$variant(y)) => same(x, y),)*
                _ => false,
            }
        }
    };
}
fibrewise_core::for_each_field_kind!(same_kind);
