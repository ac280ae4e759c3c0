//! Field kinds beyond word-size prime fields: multi-precision primes, GF(p^k) and Q.
//! Coefficient conversion (Python side):
//! - big primes: `int` both ways (values in [0, p));
//! - Q: `int` or `fractions.Fraction` in, `Fraction` out;
//! - GF(p^k): the integer representation Σ c_i p^i of c_0 + c_1 a + ... (galois's convention),
//!   both ways: an `int` in [0, q), or a galois element of a field with the same modulus.
//!   (Ring constants such as `R(3)` or `f + 3` are integers; the Python layer reads them as text.)

use crate::dispatch::{AnyField, Kind};
use crate::space::NativeField;
use fibrewise_core::extension::{BinaryField, ExtensionField, Modulus, TableField};
use fibrewise_core::field::{BigPrimeField, RationalField};
use fibrewise_core::Field;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use pyo3::exceptions::{PyTypeError, PyValueError};
use pyo3::prelude::*;
use pyo3::types::{PyBool, PyInt};

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(field_from_modulus, m)?)?;
    m.add_function(wrap_pyfunction!(field_modulus, m)?)?;
    Ok(())
}

/// GF(p^k) on the modulus c_0 + c_1 a + ... + c_k a^k (GF(p) when k = 1): how a field class of
/// another library comes in.
#[pyfunction]
fn field_from_modulus(p: BigUint, coefficients: Vec<BigUint>) -> PyResult<NativeField> {
    let reduced: Vec<u64> = coefficients
        .iter()
        .map(|c| (c % &p).to_u64().unwrap_or(0))
        .collect();
    let field = AnyField::from_modulus(&p, reduced).map_err(crate::errors::to_py)?;
    Ok(NativeField { field })
}

/// The modulus coefficients c_0..c_k of a prime-power field, `None` for other fields.
#[pyfunction]
fn field_modulus(field: &NativeField) -> Option<Vec<u64>> {
    field.field.modulus().map(|m| m.coefficients().to_vec())
}

fn is_int(v: &Bound<'_, PyAny>) -> bool {
    v.is_instance_of::<PyInt>() && !v.is_instance_of::<PyBool>()
}

fn not_a_coefficient(spec: &str, v: &Bound<'_, PyAny>, expected: &str) -> PyErr {
    let ty = v
        .get_type()
        .name()
        .map(|n| n.to_string())
        .unwrap_or_default();
    PyTypeError::new_err(format!(
        "a coefficient of {spec} must be {expected}, not {ty}"
    ))
}

/// The residue of a Python int modulo p, as Python computes it (any size, sign).
fn int_mod(v: &Bound<'_, PyAny>, p: &BigUint) -> PyResult<BigUint> {
    v.rem(p.clone())?.extract()
}

macro_rules! big_prime_kind {
    ($n:literal) => {
        impl Kind for BigPrimeField<$n> {
            fn coefficient_to_py(&self, py: Python<'_>, c: &Self::Elem) -> PyResult<PyObject> {
                Ok(self.to_biguint(c).into_pyobject(py)?.into_any().unbind())
            }
            fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<Self::Elem> {
                if !is_int(v) {
                    return Err(not_a_coefficient(&self.spec(), v, "an int"));
                }
                Ok(self.from_biguint(&int_mod(v, self.modulus())?))
            }
        }
    };
}
big_prime_kind!(2);
big_prime_kind!(4);
big_prime_kind!(8);

impl Kind for RationalField {
    fn coefficient_to_py(&self, py: Python<'_>, c: &BigRational) -> PyResult<PyObject> {
        let fraction = py.import("fractions")?.getattr("Fraction")?;
        Ok(fraction
            .call1((c.numer().clone(), c.denom().clone()))?
            .unbind())
    }
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<BigRational> {
        if is_int(v) {
            return Ok(BigRational::from_integer(v.extract::<BigInt>()?));
        }
        let fraction = v.py().import("fractions")?.getattr("Fraction")?;
        if !v.is_instance(&fraction)? {
            return Err(not_a_coefficient("Q", v, "an int or a fractions.Fraction"));
        }
        let (num, den): (BigInt, BigInt) = (
            v.getattr("numerator")?.extract()?,
            v.getattr("denominator")?.extract()?,
        );
        Ok(BigRational::new(num, den))
    }
}

/// Σ c_i p^i.
fn integer_representation(p: u64, coefficients: &[u64]) -> BigUint {
    coefficients
        .iter()
        .rev()
        .fold(BigUint::zero(), |acc, &c| acc * p + c)
}

/// Coefficients c_0..c_(k-1) of the element given by its integer representation (an int or
/// a galois element), which must be below q.
fn coefficients_of(spec: &str, m: &Modulus, v: &Bound<'_, PyAny>) -> PyResult<Vec<u64>> {
    let p = m.characteristic();
    if let Ok(ty) = v.get_type().getattr("irreducible_poly") {
        // A galois element: its field must be this one, or its integer representation means
        // another element.
        let theirs: BigUint = v
            .py()
            .import("builtins")?
            .getattr("int")?
            .call1((ty,))?
            .extract()?;
        if theirs != integer_representation(p, m.coefficients()) {
            return Err(PyValueError::new_err(format!(
                "the element {} belongs to a field with another modulus than {spec}",
                v.str()?
            )));
        }
    }
    if v.is_instance_of::<PyBool>() {
        return Err(not_a_coefficient(
            spec,
            v,
            "an int or a galois element of the same field",
        ));
    }
    let index = v.py().import("operator")?.getattr("index")?;
    let mut code: BigUint = index
        .call1((v,))
        .map_err(|_| not_a_coefficient(spec, v, "an int or a galois element of the same field"))?
        .extract()
        .map_err(|_| {
            PyValueError::new_err(format!("a coefficient of {spec} cannot be negative"))
        })?;
    if code >= m.order() {
        return Err(PyValueError::new_err(format!(
            "{code} is not the integer representation of an element of {spec} (at most {})",
            m.order() - 1u32
        )));
    }
    let mut out = Vec::with_capacity(m.degree() as usize);
    for _ in 0..m.degree() {
        out.push((&code % p).to_u64().unwrap());
        code /= p;
    }
    Ok(out)
}

impl Kind for TableField {
    fn coefficient_to_py(&self, py: Python<'_>, c: &u32) -> PyResult<PyObject> {
        Ok(c.into_pyobject(py)?.into_any().unbind())
    }
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<u32> {
        Ok(self.encode(&coefficients_of(&self.spec(), self.modulus(), v)?))
    }
}

impl Kind for ExtensionField {
    fn coefficient_to_py(&self, py: Python<'_>, c: &Box<[u64]>) -> PyResult<PyObject> {
        let code = integer_representation(self.modulus().characteristic(), c);
        Ok(code.into_pyobject(py)?.into_any().unbind())
    }
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<Box<[u64]>> {
        Ok(self.from_coefficients(&coefficients_of(&self.spec(), self.modulus(), v)?))
    }
}

impl Kind for BinaryField {
    /// The bits are the integer representation.
    fn coefficient_to_py(&self, py: Python<'_>, c: &u64) -> PyResult<PyObject> {
        Ok(c.into_pyobject(py)?.into_any().unbind())
    }
    fn coefficient_from_py(&self, v: &Bound<'_, PyAny>) -> PyResult<u64> {
        let c = coefficients_of(&self.spec(), self.modulus(), v)?;
        Ok(c.iter().enumerate().fold(0, |acc, (i, &b)| acc | (b << i)))
    }
}
