//! Curves over finite fields: conversion and dispatch to `fibrewise_core::curves`. A
//! `NativeCurve` holds the core's `Curve` for the field kind of its space; counts, zeta
//! functions and singular points run without the GIL and stop on Ctrl-C (`long_run`). Big
//! integers (L-polynomial coefficients, N_r, bounds) cross as Python ints.

use crate::basis::polys_in;
use crate::dispatch::{with_ring, Kind};
use crate::errors::to_py;
use crate::long_run::Budgeted;
use crate::solutions::closed_points_to_py;
use crate::space::{NativePoly, NativeSpace};
use fibrewise_core::curves::bounds::BoundCheck;
use fibrewise_core::curves::embedding::PowerBasis;
use fibrewise_core::curves::zeta::Zeta;
use fibrewise_core::curves::Curve;
use num_bigint::BigInt;
use pyo3::prelude::*;
use pyo3::types::PyDict;

pub fn register(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_class::<NativeCurve>()?;
    m.add_function(wrap_pyfunction!(curve_of, m)?)?;
    m.add_function(wrap_pyfunction!(zeta_points, m)?)?;
    Ok(())
}

fibrewise_core::field_kind_enum! {
    /// A curve over any field kind.
    // One value per Python handle, matched on every call: boxing the larger variants would
    // only add an indirection.
    #[allow(clippy::large_enum_variant)]
    enum AnyCurve of Curve
}

/// Runs `$body` with `$c` bound to the concrete `Curve<F>` inside an `AnyCurve`.
macro_rules! with_curve {
    ($curve:expr, $c:ident => $body:expr) => {
        fibrewise_core::match_field_kind!(AnyCurve, $curve, $c => $body)
    };
}

/// Wrapping a core curve of each field kind.
trait CurveKind: Kind + PowerBasis {
    fn wrap(curve: Curve<Self>) -> AnyCurve;
}

macro_rules! curve_kind {
    ([$($variant:ident: $field:ty),* $(,)?]) => {
        $(impl CurveKind for $field {
            fn wrap(curve: Curve<Self>) -> AnyCurve {
                AnyCurve::$variant(curve)
            }
        })*
    };
}
fibrewise_core::for_each_field_kind!(curve_kind);

/// A curve read from a system (see `fibrewise.curves`).
#[pyclass(frozen, module = "fibrewise._native")]
pub struct NativeCurve {
    curve: AnyCurve,
    /// The memory budget of the space the curve came from.
    memory: Option<u64>,
}

impl Budgeted for NativeCurve {
    fn memory_budget(&self) -> Option<u64> {
        self.memory
    }
}

/// The curve of the equations `gens` in `space`.
#[pyfunction]
fn curve_of(
    py: Python<'_>,
    space: &NativeSpace,
    gens: Vec<PyRef<'_, NativePoly>>,
) -> PyResult<NativeCurve> {
    with_ring!(&space.ring, r => {
        let gens = polys_in(space, r, &gens)?;
        let curve = space.run(py, |control| Curve::new(r, &gens, control))?;
        Ok(NativeCurve {
            curve: CurveKind::wrap(curve),
            memory: space.memory,
        })
    })
}

/// N_r from an L-polynomial.
#[pyfunction]
fn zeta_points(q: u64, genus: usize, l_polynomial: Vec<BigInt>, r: u32) -> PyResult<BigInt> {
    let zeta = Zeta {
        q,
        genus,
        l_polynomial,
    };
    if !zeta.satisfies_functional_equation() {
        return Err(pyo3::exceptions::PyValueError::new_err(
            "the coefficients do not satisfy the functional equation of an L-polynomial of that genus",
        ));
    }
    Ok(zeta.points(r))
}

#[pymethods]
impl NativeCurve {
    fn is_smooth(&self) -> bool {
        with_curve!(&self.curve, c => c.is_smooth())
    }

    /// The genus; ValueError (with the reason) for curves out of scope.
    fn genus(&self) -> PyResult<usize> {
        with_curve!(&self.curve, c => c.genus().map_err(to_py))
    }

    /// "hyperelliptic", "plane", "plane closure" (of an affine curve), "complete intersection"
    /// or "space curve" (more equations than a complete intersection).
    fn model(&self) -> &'static str {
        use fibrewise_core::curves::Model;
        with_curve!(&self.curve, c => match &c.model {
            Model::Hyperelliptic { .. } => "hyperelliptic",
            Model::Projective { closure_of_affine: true, .. } => "plane closure",
            Model::Projective { ring, .. } if ring.nvars() == 3 => "plane",
            Model::Projective { ring, gens, .. } if gens.len() + 2 == ring.nvars() => "complete intersection",
            Model::Projective { .. } => "space curve",
        })
    }

    /// The names of the coordinates of singular points.
    fn coordinate_names(&self) -> Vec<String> {
        with_curve!(&self.curve, c => c.ring().names().to_vec())
    }

    /// q, the size of the field of definition.
    fn q(&self) -> PyResult<u64> {
        with_curve!(&self.curve, c => c.q().map_err(to_py))
    }

    /// #C(GF(q^r)) on the smooth projective model.
    fn count_points(&self, py: Python<'_>, r: u32) -> PyResult<u128> {
        with_curve!(&self.curve, c => self.run(py, |control| c.count_points(r, control)))
    }

    /// (q, genus, L-polynomial coefficients a_0..a_2g).
    fn zeta(&self, py: Python<'_>) -> PyResult<(u64, usize, Vec<BigInt>)> {
        with_curve!(&self.curve, c => {
            let zeta = self.run(py, |control| c.zeta(control))?;
            Ok((zeta.q, zeta.genus, zeta.l_polynomial))
        })
    }

    /// Singular points with coordinates in GF(q), each a list of coefficients.
    fn singular_points(&self, py: Python<'_>) -> PyResult<Vec<Vec<PyObject>>> {
        with_curve!(&self.curve, c => {
            let points = self.run(py, |control| c.singular_points(control))?;
            c.field.rows_to_py(py, &points)
        })
    }

    /// The singular closed points: (degree, reduced lex basis of the maximal ideal) for each,
    /// by increasing degree, in the coordinates of `coordinate_names` with the lex order.
    fn singular_closed_points(&self, py: Python<'_>) -> PyResult<Vec<(usize, Vec<NativePoly>)>> {
        with_curve!(&self.curve, c => {
            let points = self.run(py, |control| c.singular_closed_points(control))?;
            Ok(closed_points_to_py(points, self.memory))
        })
    }

    /// N_r = `points` against the Hasse–Weil and Serre bounds, as a dict.
    fn check_bounds<'py>(
        &self,
        py: Python<'py>,
        r: u32,
        points: u128,
    ) -> PyResult<Bound<'py, PyDict>> {
        let check: BoundCheck =
            with_curve!(&self.curve, c => c.check_bounds(r, points).map_err(to_py))?;
        let d = PyDict::new(py);
        d.set_item("r", check.r)?;
        d.set_item("points", check.points)?;
        d.set_item("hasse_weil", check.hasse_weil)?;
        d.set_item("serre", check.serre)?;
        d.set_item("within", check.within)?;
        d.set_item("maximal", check.maximal)?;
        d.set_item("minimal", check.minimal)?;
        Ok(d)
    }
}
