//! Dimension, Hilbert series, zero-dimensional invariants and point counts: conversion and
//! dispatch to `fibrewise_core::{dimension, hilbert, zerodim, points}`.
//!
//! Functions taking `basis` expect the reduced Gröbner basis of the ideal for the order of
//! `space` (the Python `System` passes its cached basis), so no basis is computed twice.

use crate::basis::{engine_by_name, polys_in};
use crate::dispatch::{with_ring, Kind};
use crate::errors::IntoPy;
use crate::long_run::Budgeted;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::groebner::{ReducedBasis, Stats};
use fibrewise_core::hilbert::{series_of_basis, HilbertSeries};
use fibrewise_core::zerodim::{
    maximal, quotient_dimension as core_vs_dimension, radical, Quotient,
};
use fibrewise_core::{dimension, points, Ring};
use pyo3::prelude::*;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(krull_dimension, m)?)?;
    m.add_function(wrap_pyfunction!(independent_variables, m)?)?;
    m.add_function(wrap_pyfunction!(is_degree_compatible, m)?)?;
    m.add_function(wrap_pyfunction!(hilbert_series, m)?)?;
    m.add_function(wrap_pyfunction!(hilbert_polynomial, m)?)?;
    m.add_function(wrap_pyfunction!(regularity_index, m)?)?;
    m.add_function(wrap_pyfunction!(quotient_dimension, m)?)?;
    m.add_function(wrap_pyfunction!(standard_monomials, m)?)?;
    m.add_function(wrap_pyfunction!(multiplication_matrix, m)?)?;
    m.add_function(wrap_pyfunction!(count_solutions, m)?)?;
    m.add_function(wrap_pyfunction!(is_closed_point, m)?)?;
    m.add_function(wrap_pyfunction!(closed_point_degree, m)?)?;
    m.add_function(wrap_pyfunction!(count_points, m)?)?;
    Ok(())
}

fn basis_of<F: Kind>(
    space: &NativeSpace,
    r: &Ring<F>,
    basis: &[PyRef<'_, NativePoly>],
) -> PyResult<ReducedBasis<F>> {
    Ok(ReducedBasis {
        ring: r.clone(),
        polys: polys_in(space, r, basis)?,
        stats: Stats::default(),
    })
}

/// Runs `$call` (an expression in the reduced basis `$gb` and the `$control` of the run) on the
/// basis given as native polynomials of `space`, with the GIL released, as a long run.
macro_rules! on_basis {
    ($py:expr, $space:expr, $basis:expr, |$gb:ident, $control:ident| $call:expr) => {
        with_ring!(&$space.ring, r => {
            let $gb = basis_of($space, r, &$basis)?;
            $space.run($py, |$control| $call)
        })
    };
}

fn leading_monomials<F: Kind>(
    space: &NativeSpace,
    r: &Ring<F>,
    basis: &[PyRef<'_, NativePoly>],
) -> PyResult<Vec<fibrewise_core::Monomial>> {
    Ok(basis_of(space, r, basis)?.leading_monomials())
}

/// Krull dimension of R/I from the basis; -1 for the unit ideal.
#[pyfunction]
#[pyo3(name = "dimension")]
fn krull_dimension(space: &NativeSpace, basis: Vec<PyRef<'_, NativePoly>>) -> PyResult<i64> {
    with_ring!(&space.ring, r => Ok(dimension::krull_dimension(r.nvars(), &leading_monomials(space, r, &basis)?)))
}

/// Names of a maximal independent set of variables; `None` for the unit ideal.
#[pyfunction]
fn independent_variables(
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<Option<Vec<String>>> {
    with_ring!(&space.ring, r => {
        let set = dimension::independent_variables(r.nvars(), &leading_monomials(space, r, &basis)?);
        Ok(set.map(|s| s.into_iter().map(|i| r.names()[i].clone()).collect()))
    })
}

/// Whether the ring's order compares total degrees first (needed for affine Hilbert series).
#[pyfunction]
fn is_degree_compatible(space: &NativeSpace) -> bool {
    with_ring!(&space.ring, r => r.order.is_degree_compatible())
}

/// (numerator, denominator exponent, affine) of the Hilbert series of R/I.
#[pyfunction]
#[pyo3(name = "hilbert")]
fn hilbert_series(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<(Vec<i128>, u32, bool)> {
    let s = on_basis!(py, space, basis, |gb, control| series_of_basis(
        &gb, control
    ))?;
    Ok((s.numerator, s.denominator_exponent, s.affine))
}

fn series(numerator: Vec<i128>, denominator_exponent: u32) -> HilbertSeries {
    HilbertSeries {
        numerator,
        denominator_exponent,
        affine: false,
    }
}

/// Hilbert polynomial coefficients (numerator, denominator), constant term first.
#[pyfunction]
fn hilbert_polynomial(
    numerator: Vec<i128>,
    denominator_exponent: u32,
) -> PyResult<Vec<(i128, i128)>> {
    series(numerator, denominator_exponent)
        .polynomial()
        .py_err()
}

/// Least s0 from which the Hilbert function equals the Hilbert polynomial.
#[pyfunction]
fn regularity_index(numerator: Vec<i128>, denominator_exponent: u32) -> PyResult<u64> {
    series(numerator, denominator_exponent)
        .regularity_index()
        .py_err()
}

#[pyfunction]
fn quotient_dimension(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<u128> {
    on_basis!(py, space, basis, |gb, control| core_vs_dimension(
        &gb, control
    ))
}

/// Exponent vectors of the standard monomials, increasing in the ring's order.
#[pyfunction]
fn standard_monomials(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<Vec<Vec<u32>>> {
    let monomials = on_basis!(py, space, basis, |gb, control| {
        Quotient::new(gb, control).map(|q| q.standard_monomials().to_vec())
    })?;
    Ok(monomials.iter().map(|m| m.exponents().to_vec()).collect())
}

/// Matrix of multiplication by `f` on the standard monomials; column j is the image of the j-th.
#[pyfunction]
fn multiplication_matrix(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
    f: PyRef<'_, NativePoly>,
) -> PyResult<Vec<Vec<PyObject>>> {
    with_ring!(&space.ring, r => {
        let gb = basis_of(space, r, &basis)?;
        let f = f.other_in(r, &f)?;
        let matrix = space.run(py, |control| {
            Quotient::new(gb, control)?.multiplication_matrix(&f, control)
        })?;
        r.field.rows_to_py(py, &matrix)
    })
}

/// Number of distinct solutions over the algebraic closure (zero-dimensional ideals).
#[pyfunction]
#[pyo3(signature = (space, basis, engine="auto"))]
fn count_solutions(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
    engine: &str,
) -> PyResult<u128> {
    let engine = engine_by_name(engine)?;
    on_basis!(py, space, basis, |gb, control| radical::count_solutions(
        &gb, engine, control
    ))
}

#[pyfunction]
fn is_closed_point(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<bool> {
    on_basis!(py, space, basis, |gb, control| maximal::is_maximal(
        &gb, control
    ))
}

#[pyfunction]
fn closed_point_degree(
    py: Python<'_>,
    space: &NativeSpace,
    basis: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<u128> {
    on_basis!(py, space, basis, |gb, control| {
        maximal::residue_field_degree(&gb, control)
    })
}

/// Points of V(gens) with coordinates in the finite field: affine, or projective.
#[pyfunction]
#[pyo3(signature = (space, gens, projective=false, engine="auto"))]
fn count_points(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
    projective: bool,
    engine: &str,
) -> PyResult<u128> {
    let engine = engine_by_name(engine)?;
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        space.run(py, |control| {
            if projective {
                points::count_projective_points(r, &gens, engine, control)
            } else {
                points::count_affine_points(r, &gens, engine, control)
            }
        })
    })
}
