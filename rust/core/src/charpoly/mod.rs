//! The characteristic polynomial det(x·Id - A) of a square matrix over a polynomial ring k[T].
//!
//! Two methods. When the field has more elements than the degree of the coefficients in each
//! t_i, by evaluation and interpolation: the coefficient of x^k is a polynomial in T whose degree
//! is bounded from the entries' degrees ([`bounds`]); evaluate A on a grid of that size, take the
//! characteristic polynomial of each scalar matrix as the minimal polynomial of a projected
//! Krylov sequence (Berlekamp–Massey, [`krylov`]) when that has full degree, else by reduction
//! to Hessenberg form ([`hessenberg`]), and interpolate one variable at a time (Newton's divided
//! differences, [`interpolation`]). A field with too few elements for the points interpolates
//! in an extension ([`super::zech`]). Otherwise, by Berkowitz's division-free algorithm
//! ([`berkowitz`]) directly over k[T], which works in every characteristic, GF(2) included.

mod berkowitz;
mod bounds;
mod hessenberg;
mod interpolation;
mod krylov;
pub mod scalars;
#[cfg(test)]
mod tests;
pub mod zech;

pub(crate) use krylov::berlekamp_massey;

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::poly::{Poly, Ring};
use berkowitz::berkowitz;
use bounds::{interpolation_grid, Grid};
use interpolation::interpolate_in;
use scalars::{Generic, Words};
use zech::ZechExtension;

/// Coefficients [1, c_{r-1}, ..., c_0] of det(x·Id - A) = x^r + c_{r-1} x^{r-1} + ... + c_0,
/// for an r × r matrix `a` (rows of equal length r) over `ring`.
pub fn characteristic_polynomial<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let Some(grid) = interpolation_grid(ring, a) else {
        return berkowitz(ring, a, control);
    };
    let points = grid.bounds.iter().max().map_or(1, |&b| b + 1);
    let q = crate::field::field_size(&ring.field).unwrap_or(u64::MAX);
    if points <= q {
        return by_interpolation(ring, a, &grid, control);
    }
    // Too few elements for the points: interpolate in an extension of the field.
    match ZechExtension::new(&ring.field, points, control)? {
        Some(large) => interpolate_in(&large, ring, a, &grid, control),
        None => berkowitz(ring, a, control),
    }
}

/// Interpolation in machine words when the field is a word-size prime field, else in the
/// field's own arithmetic: the same loops either way.
fn by_interpolation<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    grid: &Grid,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    match Words::new(&ring.field) {
        Some(words) => interpolate_in(&words, ring, a, grid, control),
        None => interpolate_in(&Generic(&ring.field), ring, a, grid, control),
    }
}
