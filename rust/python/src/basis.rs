//! Gröbner bases and normal forms: conversion and dispatch to `fibrewise_core::groebner`.

use crate::convert::limits;
use crate::dispatch::{with_ring, Kind};
use crate::long_run;
use crate::ring::{NativePoly, NativeRing};
use fibrewise_core::groebner::{groebner_basis as core_basis, reduce::normal_form, Engine, Stats};
use fibrewise_core::{Poly, Ring};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use pyo3::types::{PyDict, PyList};

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(groebner_basis, m)?)?;
    m.add_function(wrap_pyfunction!(normal_form_of, m)?)?;
    Ok(())
}

pub fn engine_by_name(name: &str) -> PyResult<Engine> {
    match name {
        "buchberger" => Ok(Engine::Buchberger),
        "f4" => Ok(Engine::F4),
        "f4-sampled" => Ok(Engine::F4Sampled),
        "f4-signature" => Ok(Engine::F4Signature),
        "auto" => Ok(Engine::default()),
        other => Err(PyValueError::new_err(format!(
            "unknown engine '{other}': expected auto, f4, f4-sampled, f4-signature or buchberger"
        ))),
    }
}

/// The polynomials as elements of `ring` (sorted for its order).
pub fn polys_in<F: Kind>(
    ring: &NativeRing,
    r: &Ring<F>,
    polys: &[PyRef<'_, NativePoly>],
) -> PyResult<Vec<Poly<F>>> {
    let _ = ring;
    polys.iter().map(|p| p.other_in(r, p)).collect()
}

pub fn stats_to_py<'py>(py: Python<'py>, stats: &Stats) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("engine", &stats.engine)?;
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

/// Reduced Gröbner basis of `gens` for the order of `ring`; returns (basis, stats dict).
#[pyfunction]
#[pyo3(signature = (ring, gens, engine="auto", max_degree=None, max_matrix=None, threads=None))]
fn groebner_basis<'py>(
    py: Python<'py>,
    ring: &NativeRing,
    gens: Vec<PyRef<'py, NativePoly>>,
    engine: &str,
    max_degree: Option<u32>,
    max_matrix: Option<u64>,
    threads: Option<usize>,
) -> PyResult<(Vec<NativePoly>, Bound<'py, PyDict>)> {
    let engine = engine_by_name(engine)?;
    let limits = limits(max_degree, max_matrix, threads)?;
    with_ring!(&ring.ring, r => {
        let gens = polys_in(ring, r, &gens)?;
        let gb = long_run::run(py, limits, |control| core_basis(r, &gens, engine, control))?;
        let polys = gb.polys.into_iter().map(|p| ring.poly(p)).collect();
        Ok((polys, stats_to_py(py, &gb.stats)?))
    })
}

/// Normal form of `f` modulo `basis` (a Gröbner basis for the order of `ring`).
#[pyfunction]
fn normal_form_of(
    ring: &NativeRing,
    basis: Vec<PyRef<'_, NativePoly>>,
    f: PyRef<'_, NativePoly>,
) -> PyResult<NativePoly> {
    with_ring!(&ring.ring, r => {
        let basis = polys_in(ring, r, &basis)?;
        let f = f.other_in(r, &f)?;
        let nf = normal_form(r, &f, &basis).map_err(crate::errors::to_py)?;
        Ok(ring.poly(nf))
    })
}
