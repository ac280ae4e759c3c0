//! Reduced Gröbner bases and normal forms: conversion and dispatch to `fibrewise_core::groebner`.

use crate::convert::{limits, with_time_limit};
use crate::dispatch::{with_ring, Kind};
use crate::long_run::Budgeted;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::groebner::{groebner_basis as core_basis, Engine, Stats};
use fibrewise_core::normalization::division;
use fibrewise_core::{Poly, Ring};
use pyo3::prelude::*;
use pyo3::types::{PyDict, PyList};

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(reduced_basis, m)?)?;
    m.add_function(wrap_pyfunction!(normal_form, m)?)?;
    Ok(())
}

pub fn engine_by_name(name: &str) -> PyResult<Engine> {
    Engine::from_name(name).map_err(crate::errors::to_py)
}

/// The polynomials as elements of `r`, the ring of `space` (sorted for its order).
pub fn polys_in<F: Kind>(
    space: &NativeSpace,
    r: &Ring<F>,
    polys: &[PyRef<'_, NativePoly>],
) -> PyResult<Vec<Poly<F>>> {
    let _ = space;
    polys.iter().map(|p| p.other_in(r, p)).collect()
}

pub fn stats_to_py<'py>(py: Python<'py>, stats: &Stats) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("engine", &stats.engine)?;
    d.set_item("choice", &stats.choice)?;
    d.set_item("seconds", stats.seconds)?;
    d.set_item("zero_reductions", stats.zero_reductions)?;
    d.set_item("max_degree", stats.max_degree())?;
    let steps = PyList::empty(py);
    for s in &stats.steps {
        let e = PyDict::new(py);
        e.set_item("degree", s.degree)?;
        e.set_item("pairs", s.pairs)?;
        e.set_item("rows", s.rows)?;
        e.set_item("columns", s.columns)?;
        e.set_item("nonzeros", s.nonzeros)?;
        e.set_item("new_elements", s.new_elements)?;
        e.set_item("seconds_symbolic", s.seconds_symbolic)?;
        e.set_item("seconds_linear_algebra", s.seconds_linear_algebra)?;
        steps.append(e)?;
    }
    d.set_item("steps", steps)?;
    Ok(d)
}

/// Reduced Gröbner basis of `gens` for the order of `space`; returns (basis, stats dict).
#[pyfunction]
#[pyo3(signature = (space, gens, engine="auto", max_degree=None, max_matrix=None, threads=None, max_seconds=None))]
#[allow(clippy::too_many_arguments)] // the keyword arguments of System.basis, passed through
fn reduced_basis<'py>(
    py: Python<'py>,
    space: &NativeSpace,
    gens: Vec<PyRef<'py, NativePoly>>,
    engine: &str,
    max_degree: Option<u32>,
    max_matrix: Option<u64>,
    threads: Option<usize>,
    max_seconds: Option<f64>,
) -> PyResult<(Vec<NativePoly>, Bound<'py, PyDict>)> {
    let engine = engine_by_name(engine)?;
    let limits = with_time_limit(limits(max_degree, max_matrix, threads)?, max_seconds)?;
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let gb = space.run_limited(py, limits, |control| core_basis(r, &gens, engine, control))?;
        let polys = gb.polys.into_iter().map(|p| space.poly(p)).collect();
        Ok((polys, stats_to_py(py, &gb.stats)?))
    })
}

/// Normal form of `f` modulo `basis` (a Gröbner basis for the order of `space`), by heap
/// division; without the GIL and interruptible (its cost cannot be told from the sizes:
/// x^(2^24) is one term).
#[pyfunction]
fn normal_form(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
    f: PyRef<'_, NativePoly>,
) -> PyResult<NativePoly> {
    with_ring!(&space.ring, r => {
        let basis = polys_in(space, r, &basis)?;
        let f = f.other_in(r, &f)?;
        let nf = space.run(py, |control| division::normal_form(r, &f, &basis, control))?;
        Ok(space.poly(nf))
    })
}
