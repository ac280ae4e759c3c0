//! Python bindings of fibrewise-core. This crate only converts between Python objects and core
//! types, dispatches on the field kind, releases the GIL for long work and maps errors; every
//! algorithm lives in the core.

use pyo3::prelude::*;

mod basis;
mod boolean;
mod convert;
mod corpus;
mod curves;
mod dispatch;
mod errors;
mod fibres;
mod field_kinds;
mod invariants;
mod long_run;
mod normalization;
mod projection;
mod solutions;
mod space;

#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    errors::register(m)?;
    m.add_class::<space::NativeField>()?;
    m.add_class::<space::NativeSpace>()?;
    m.add_class::<space::NativePoly>()?;
    // The names the front ends accept, from the core's one list of each.
    m.add(
        "ENGINE_NAMES",
        fibrewise_core::groebner::ENGINE_NAMES.to_vec(),
    )?;
    m.add(
        "STRATEGY_NAMES",
        fibrewise_core::normalization::STRATEGY_NAMES.to_vec(),
    )?;
    basis::register(m)?;
    corpus::register(m)?;
    curves::register(m)?;
    boolean::register(m)?;
    fibres::register(m)?;
    field_kinds::register(m)?;
    invariants::register(m)?;
    normalization::register(m)?;
    projection::register(m)?;
    solutions::register(m)?;
    Ok(())
}
