//! Noether normalization, certificate checks and integrality: conversion and dispatch to
//! `fibrewise_core::normalization` and `fibrewise_core::integrality`.

use crate::basis::polys_in;
use crate::dispatch::with_ring;
use crate::long_run::Budgeted;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::integrality;
use fibrewise_core::normalization::{self, CertificateText};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use pyo3::types::PyDict;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(check_certificate, m)?)?;
    m.add_function(wrap_pyfunction!(integral_equation, m)?)?;
    m.add_function(wrap_pyfunction!(is_finite_over, m)?)?;
    Ok(())
}

pub(crate) fn text_to_py<'py>(
    py: Python<'py>,
    t: &CertificateText,
) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("dimension", t.dimension)?;
    d.set_item("parameters", &t.parameters)?;
    d.set_item("parameter_symbols", &t.parameter_symbols)?;
    d.set_item("coordinates", &t.coordinates)?;
    d.set_item("coordinate_symbols", &t.coordinate_symbols)?;
    d.set_item("inverse", &t.inverse)?;
    d.set_item("equations", &t.equations)?;
    d.set_item("module_generators", &t.module_generators)?;
    d.set_item("rank", t.rank)?;
    d.set_item("strategy", &t.strategy)?;
    d.set_item("homogeneous", t.homogeneous)?;
    Ok(d)
}

/// One entry of a certificate dict, with a message naming the key when it is missing or wrong.
fn entry<'py, T: FromPyObject<'py>>(
    d: &Bound<'py, PyDict>,
    key: &str,
    default: Option<T>,
) -> PyResult<T> {
    match d.get_item(key)? {
        Some(v) => v.extract().map_err(|_| {
            PyValueError::new_err(format!("certificate entry '{key}' has the wrong type"))
        }),
        None => default
            .ok_or_else(|| PyValueError::new_err(format!("certificate entry '{key}' is missing"))),
    }
}

fn text_from_py(d: &Bound<'_, PyDict>) -> PyResult<CertificateText> {
    Ok(CertificateText {
        dimension: entry(d, "dimension", None)?,
        parameters: entry(d, "parameters", None)?,
        parameter_symbols: entry(d, "parameter_symbols", None)?,
        coordinates: entry(d, "coordinates", None)?,
        coordinate_symbols: entry(d, "coordinate_symbols", None)?,
        inverse: entry(d, "inverse", None)?,
        equations: entry(d, "equations", None)?,
        module_generators: entry(d, "module_generators", None)?,
        rank: entry(d, "rank", None)?,
        strategy: entry(d, "strategy", Some(String::new()))?,
        homogeneous: entry(d, "homogeneous", Some(false))?,
    })
}

/// Problems found checking a certificate dict against the ideal (empty when it holds).
#[pyfunction]
fn check_certificate<'py>(
    py: Python<'py>,
    space: &NativeSpace,
    gens: Vec<PyRef<'py, NativePoly>>,
    certificate: &Bound<'py, PyDict>,
) -> PyResult<Vec<String>> {
    let text = text_from_py(certificate)?;
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        space.run(py, |control| normalization::check_certificate(r, &gens, &text, control))
    })
}

/// The least-degree monic relation of `f` over k[over] modulo the ideal: (symbols, coefficient
/// texts [1, c_{m-1}, ..., c_0]), or None when f is not integral.
#[pyfunction]
fn integral_equation<'py>(
    py: Python<'py>,
    space: &NativeSpace,
    gens: Vec<PyRef<'py, NativePoly>>,
    f: PyRef<'py, NativePoly>,
    over: Vec<PyRef<'py, NativePoly>>,
) -> PyResult<Option<(Vec<String>, Vec<String>)>> {
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let over = polys_in(space, r, &over)?;
        let f = f.other_in(r, &f)?;
        let eq = space.run(py, |control| {
            integrality::integral_equation(r, &gens, &f, &over, control)
        })?;
        Ok(eq.map(|e| {
            let texts = e.coefficients.iter().map(|c| e.symbols.format(c)).collect();
            (e.symbols.names().to_vec(), texts)
        }))
    })
}

/// Whether R/I is a finitely generated module over k[over].
#[pyfunction]
fn is_finite_over<'py>(
    py: Python<'py>,
    space: &NativeSpace,
    gens: Vec<PyRef<'py, NativePoly>>,
    over: Vec<PyRef<'py, NativePoly>>,
) -> PyResult<bool> {
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let over = polys_in(space, r, &over)?;
        space.run(py, |control| integrality::is_finite_over(r, &gens, &over, control))
    })
}
