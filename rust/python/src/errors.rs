//! Core errors as Python exceptions: bad input is `ValueError` (with the column for text),
//! limits are `fibrewise.ResourceLimit`, interruption is `KeyboardInterrupt`.

use fibrewise_core::Error;
use pyo3::exceptions::{PyKeyboardInterrupt, PyRuntimeError, PyValueError};
use pyo3::prelude::*;

pyo3::create_exception!(
    fibrewise,
    ResourceLimit,
    pyo3::exceptions::PyRuntimeError,
    "A computation went over a limit set by the caller (degree, matrix size)."
);

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("ResourceLimit", m.py().get_type::<ResourceLimit>())
}

pub fn to_py(e: Error) -> PyErr {
    match e {
        Error::Parse { .. } | Error::InvalidInput(_) | Error::Overflow(_) => {
            PyValueError::new_err(e.to_string())
        }
        Error::ResourceLimit(m) => ResourceLimit::new_err(m),
        Error::Interrupted => PyKeyboardInterrupt::new_err("interrupted"),
    }
}

/// Result conversion used throughout the bindings.
pub trait IntoPy<T> {
    fn py_err(self) -> PyResult<T>;
}

impl<T> IntoPy<T> for Result<T, Error> {
    fn py_err(self) -> PyResult<T> {
        self.map_err(to_py)
    }
}

pub fn internal(msg: impl Into<String>) -> PyErr {
    PyRuntimeError::new_err(format!("fibrewise internal error: {}", msg.into()))
}
