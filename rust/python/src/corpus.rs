//! The standard benchmark systems (cyclic, katsura, eco, noon) of `fibrewise_core::systems`, as
//! variable names and equation texts: the one corpus the core's tests, the Python tests and the
//! benchmarks all read.

use fibrewise_core::systems;
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(standard_system, m)?)?;
    Ok(())
}

/// Largest size accepted: far past anything a benchmark solves, small enough that the text of
/// the equations (O(n^2) terms each) stays a few megabytes.
const MAX_SIZE: usize = 1000;

/// `(variables, equations)` of the benchmark system `name`-`n`.
#[pyfunction]
fn standard_system(name: &str, n: usize) -> PyResult<(Vec<String>, Vec<String>)> {
    if !(1..=MAX_SIZE).contains(&n) {
        return Err(PyValueError::new_err(format!(
            "standard_system: size n must be between 1 and {MAX_SIZE}, got {n}"
        )));
    }
    let system = match name {
        "cyclic" => systems::cyclic(n),
        "katsura" => systems::katsura(n),
        "eco" if n >= 2 => systems::eco(n),
        "noon" if n >= 2 => systems::noon(n),
        "eco" | "noon" => {
            return Err(PyValueError::new_err(format!(
                "standard_system: {name}-n needs n >= 2, got {n}"
            )))
        }
        _ => {
            return Err(PyValueError::new_err(format!(
                "standard_system: unknown system {name:?} (cyclic, katsura, eco, noon)"
            )))
        }
    };
    Ok((system.vars, system.equations))
}
