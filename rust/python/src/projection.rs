//! Finite projections with lazy equations: conversion and dispatch to
//! `fibrewise_core::normalization::project`. `finite_projection_lazy` returns the summary (every
//! claim but the monic equations) at once, and a handle that computes the equations on first
//! use, from the basis that proved finiteness.

use crate::basis::polys_in;
use crate::dispatch::{with_ring, Kind};
use crate::long_run::Budgeted;
use crate::normalization::text_to_py;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::normalization::{self, Options, Projection, Request};
use pyo3::prelude::*;
use pyo3::types::PyDict;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(finite_projection_lazy, m)?)?;
    m.add_class::<NativeProjection>()?;
    Ok(())
}

fibrewise_core::field_kind_enum! {
    /// A projection over any field kind.
    // One value per Python handle, matched on every call: boxing the larger variants would
    // only add an indirection.
    #[allow(clippy::large_enum_variant)]
    enum AnyProjection of Projection
}

/// Wrapping a concrete projection into [`AnyProjection`].
trait ProjectionKind: Kind {
    fn wrap_projection(p: Projection<Self>) -> AnyProjection;
}

macro_rules! projection_kind {
    ([$($variant:ident: $field:ty),* $(,)?]) => {$(
        impl ProjectionKind for $field {
            fn wrap_projection(p: Projection<Self>) -> AnyProjection {
                AnyProjection::$variant(p)
            }
        }
    )*};
}
fibrewise_core::for_each_field_kind!(projection_kind);

/// The monic equations of a projection as texts in the parameter symbols.
fn equation_texts<F: Kind>(
    projection: &Projection<F>,
    control: &fibrewise_core::Control,
) -> fibrewise_core::Result<Vec<Vec<String>>> {
    let symbols = &projection.summary().parameter_ring;
    Ok(projection
        .equations(control)?
        .iter()
        .map(|e| e.iter().map(|c| symbols.format(c)).collect())
        .collect())
}

/// The handle of a projection whose equations are computed on first use.
#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativeProjection {
    projection: AnyProjection,
    memory: Option<u64>,
}

#[pymethods]
impl NativeProjection {
    /// For every variable, the coefficient texts [1, c_{m-1}, ..., c_0] of its monic equation;
    /// without the GIL, interruptible.
    fn equations(&self, py: Python<'_>) -> PyResult<Vec<Vec<String>>> {
        fibrewise_core::match_field_kind!(AnyProjection, &self.projection, p => {
            self.run(py, |control| equation_texts(p, control))
        })
    }
}

impl Budgeted for NativeProjection {
    fn memory_budget(&self) -> Option<u64> {
        self.memory
    }
}

/// The summary of a finite projection of the ideal of `gens` (the keys of
/// `FiniteProjection.to_dict()`, with `equations` empty) and the handle that computes its
/// equations. `grevlex_basis`: the reduced grevlex basis when the caller has it (trusted).
#[pyfunction]
#[pyo3(signature = (space, gens, strategy="auto", seed=0, grevlex_basis=None))]
fn finite_projection_lazy<'py>(
    py: Python<'py>,
    space: &NativeSpace,
    gens: Vec<PyRef<'py, NativePoly>>,
    strategy: &str,
    seed: u64,
    grevlex_basis: Option<Vec<PyRef<'py, NativePoly>>>,
) -> PyResult<(Bound<'py, PyDict>, NativeProjection)> {
    let request = Request::from_name(strategy).map_err(crate::errors::to_py)?;
    let options = Options { request, seed };
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let basis = grevlex_basis.map(|b| polys_in(space, r, &b)).transpose()?;
        let projection = space.run(py, |control| {
            normalization::project(r, &gens, basis, &options, control)
        })?;
        let summary = text_to_py(py, &projection.summary().to_text())?;
        let handle = NativeProjection {
            projection: ProjectionKind::wrap_projection(projection),
            memory: space.memory,
        };
        Ok((summary, handle))
    })
}
