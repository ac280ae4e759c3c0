//! Core errors as Python exceptions: malformed text is `fibrewise.ParseError` (a `ValueError`
//! with `.line` and `.column`), other bad input `ValueError`, limits `fibrewise.ResourceLimit`,
//! interruption `KeyboardInterrupt`.

use fibrewise_core::Error;
use pyo3::exceptions::{PyKeyboardInterrupt, PyRuntimeError, PyValueError};
use pyo3::prelude::*;

pyo3::create_exception!(
    fibrewise,
    ResourceLimit,
    pyo3::exceptions::PyRuntimeError,
    "A computation went over a limit set by the caller (degree, matrix size)."
);

pyo3::create_exception!(
    fibrewise,
    ParseError,
    pyo3::exceptions::PyValueError,
    "Malformed text: `.line` and `.column` (1-based) locate the offending character and \
     `.message` says what is wrong."
);

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("ResourceLimit", m.py().get_type::<ResourceLimit>())?;
    m.add("ParseError", m.py().get_type::<ParseError>())
}

pub fn to_py(e: Error) -> PyErr {
    match e {
        Error::Parse {
            ref message,
            line,
            column,
        } => parse_error(&e.to_string(), message, line, column),
        Error::InvalidInput(_) | Error::Overflow(_) => PyValueError::new_err(e.to_string()),
        Error::ResourceLimit(m) => ResourceLimit::new_err(m),
        Error::Interrupted => PyKeyboardInterrupt::new_err("interrupted"),
    }
}

/// A `ParseError` carrying its position as attributes.
fn parse_error(text: &str, message: &str, line: usize, column: usize) -> PyErr {
    Python::with_gil(|py| {
        let err = ParseError::new_err(text.to_string());
        let value = err.value(py);
        let located = value
            .setattr("line", line)
            .and_then(|_| value.setattr("column", column))
            .and_then(|_| value.setattr("message", message));
        match located {
            Ok(()) => err,
            Err(e) => e,
        }
    })
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
