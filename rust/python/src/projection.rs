//! Finite projections with lazy equations: conversion and dispatch to
//! `fibrewise_core::normalization::project`. `finite_projection_lazy` returns the summary (every
//! claim but the monic equations) at once, and a handle that computes the equations on first
//! use, from the basis that proved finiteness.

use crate::basis::polys_in;
use crate::dispatch::{with_ring, Kind};
use crate::long_run;
use crate::normalization::text_to_py;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::control::Limits;
use fibrewise_core::field::{
    BigPrimeField, BinaryField, ExtensionField, RationalField, TableField,
};
use fibrewise_core::normalization::{self, Options, Projection, Request};
use fibrewise_core::PrimeField;
use pyo3::prelude::*;
use pyo3::types::PyDict;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(finite_projection_lazy, m)?)?;
    m.add_class::<NativeProjection>()?;
    Ok(())
}

/// A projection over any field kind.
// One value per Python handle, matched on every call: boxing the larger variants would only add
// an indirection.
#[allow(clippy::large_enum_variant)]
enum AnyProjection {
    Prime(Projection<PrimeField>),
    BigPrime2(Projection<BigPrimeField<2>>),
    BigPrime4(Projection<BigPrimeField<4>>),
    BigPrime8(Projection<BigPrimeField<8>>),
    Table(Projection<TableField>),
    Binary(Projection<BinaryField>),
    Extension(Projection<ExtensionField>),
    Rational(Projection<RationalField>),
}

/// Wrapping a concrete projection into [`AnyProjection`].
trait ProjectionKind: Kind {
    fn wrap_projection(p: Projection<Self>) -> AnyProjection;
}

macro_rules! projection_kind {
    ($($field:ty => $variant:ident),*) => {$(
        impl ProjectionKind for $field {
            fn wrap_projection(p: Projection<Self>) -> AnyProjection {
                AnyProjection::$variant(p)
            }
        }
    )*};
}

projection_kind!(
    PrimeField => Prime,
    BigPrimeField<2> => BigPrime2,
    BigPrimeField<4> => BigPrime4,
    BigPrimeField<8> => BigPrime8,
    TableField => Table,
    BinaryField => Binary,
    ExtensionField => Extension,
    RationalField => Rational
);

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
        let memory = self.memory;
        match &self.projection {
            AnyProjection::Prime(p) => equations_of(py, p, memory),
            AnyProjection::BigPrime2(p) => equations_of(py, p, memory),
            AnyProjection::BigPrime4(p) => equations_of(py, p, memory),
            AnyProjection::BigPrime8(p) => equations_of(py, p, memory),
            AnyProjection::Table(p) => equations_of(py, p, memory),
            AnyProjection::Binary(p) => equations_of(py, p, memory),
            AnyProjection::Extension(p) => equations_of(py, p, memory),
            AnyProjection::Rational(p) => equations_of(py, p, memory),
        }
    }
}

fn equations_of<F: Kind>(
    py: Python<'_>,
    projection: &Projection<F>,
    memory: Option<u64>,
) -> PyResult<Vec<Vec<String>>> {
    long_run::run(py, Limits::default(), memory, |control| {
        equation_texts(projection, control)
    })
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
        let projection = long_run::run(py, Limits::default(), space.memory, |control| {
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
