//! Python bindings of fibrewise-core. This crate only converts between Python objects and core
//! types, dispatches on the field kind, releases the GIL for long work and maps errors; every
//! algorithm lives in the core.

use pyo3::prelude::*;

mod convert;
mod dispatch;
mod errors;
mod ideal;
mod invariants;
mod long_run;
mod ring;

#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    errors::register(m)?;
    m.add_class::<ring::NativeField>()?;
    m.add_class::<ring::NativeRing>()?;
    m.add_class::<ring::NativePoly>()?;
    ideal::register(m)?;
    invariants::register(m)?;
    Ok(())
}
