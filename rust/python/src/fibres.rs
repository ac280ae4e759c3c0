//! Fibre-by-fibre points over parameters: conversion and dispatch to
//! `fibrewise_core::points::fibres`. The parametric basis is computed once
//! (`parametric_basis`, polynomials of the joint ring k[x, t]) and handed back for each run of
//! fibres, so that a lazy enumeration in Python specialises it without computing it again.

use crate::basis::{engine_by_name, polys_in};
use crate::dispatch::{with_ring, Kind};
use crate::errors::to_py;
use crate::long_run::Budgeted;
use crate::solutions::native_polys;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::points::fibres::{joint_ring, ParametricBasis};
use fibrewise_core::{MonomialOrder, Poly, Ring};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(parametric_basis, m)?)?;
    m.add_function(wrap_pyfunction!(fibre_points, m)?)?;
    m.add_function(wrap_pyfunction!(fibre_at, m)?)?;
    Ok(())
}

/// The reduced basis of I + (t_j - p_j) for the block order eliminating the variables, as
/// polynomials of the joint ring (the variables, then one new name per parameter).
#[pyfunction]
#[pyo3(signature = (space, gens, parameters, engine="auto"))]
fn parametric_basis(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    parameters: Vec<PyRef<'_, NativePoly>>,
    engine: &str,
) -> PyResult<Vec<NativePoly>> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let (gens, parameters) = (polys_in(space, r, &gens)?, polys_in(space, r, &parameters)?);
        let parametric = space.run(py, |control| {
            ParametricBasis::new(r, &gens, &parameters, engine, control)
        })?;
        Ok(native_polys(parametric.joint, parametric.basis, space.memory))
    })
}

/// The points over the fibres first..first + count (index i: the parameter values whose element
/// indices are the base-q digits of i), at most `limit`: (points, index of the first fibre not
/// enumerated, number of non-generic fibres).
#[pyfunction]
#[pyo3(signature = (space, gens, parameters, basis, first, count, limit=None, engine="auto"))]
#[allow(clippy::too_many_arguments)]
fn fibre_points(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    parameters: Vec<PyRef<'_, NativePoly>>,
    basis: Vec<PyRef<'_, NativePoly>>,
    first: u64,
    count: u64,
    limit: Option<usize>,
    engine: &str,
) -> PyResult<(Vec<Vec<PyObject>>, u64, u64)> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let parametric = rebuilt(space, r, &gens, &parameters, &basis)?;
        let run = space.run(py, |control| {
            parametric.fibres(first, count, limit, engine, control)
        })?;
        Ok((r.field.rows_to_py(py, &run.points)?, run.next, run.non_generic))
    })
}

/// The points of the fibre over `values` (a point of k^d) and whether it was generic.
#[pyfunction]
#[pyo3(signature = (space, gens, parameters, basis, values, engine="auto"))]
fn fibre_at(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    parameters: Vec<PyRef<'_, NativePoly>>,
    basis: Vec<PyRef<'_, NativePoly>>,
    values: Vec<Bound<'_, PyAny>>,
    engine: &str,
) -> PyResult<(Vec<Vec<PyObject>>, bool)> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let parametric = rebuilt(space, r, &gens, &parameters, &basis)?;
        let values = values
            .iter()
            .map(|v| r.field.coefficient_from_py(v))
            .collect::<PyResult<Vec<_>>>()?;
        let fibre = space.run(py, |control| {
            parametric.fibre(&values, engine, control)
        })?;
        Ok((r.field.rows_to_py(py, &fibre.points)?, fibre.generic))
    })
}

/// The parametric basis from the polynomials `parametric_basis` returned.
fn rebuilt<F: Kind>(
    space: &NativeSpace,
    r: &Ring<F>,
    gens: &[PyRef<'_, NativePoly>],
    parameters: &[PyRef<'_, NativePoly>],
    basis: &[PyRef<'_, NativePoly>],
) -> PyResult<ParametricBasis<F>> {
    let (gens, parameters) = (polys_in(space, r, gens)?, polys_in(space, r, parameters)?);
    let joint = joint_ring(
        &r.with_order(MonomialOrder::Grevlex).map_err(to_py)?,
        parameters.len(),
    )
    .map_err(to_py)?;
    let basis = basis
        .iter()
        .map(|p| {
            let same = with_ring!(&p.ring, o => o.names() == joint.names());
            if !same {
                return Err(PyValueError::new_err(
                    "the parametric basis belongs to other parameters",
                ));
            }
            Ok(p.inner::<F>()?.clone())
        })
        .collect::<PyResult<Vec<Poly<F>>>>()?;
    ParametricBasis::from_basis(r, basis, &gens, &parameters).map_err(to_py)
}
