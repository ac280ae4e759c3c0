//! fibrewise-core: exact polynomial algebra over fields given by the [`field::Field`] trait.
//!
//! Pure Rust; knows nothing of Python. Layout: one algorithm per module.
//! - [`field`]: the `Field` trait and concrete fields: GF(p) for word-size and multi-precision
//!   primes, GF(p^k), the rationals Q, all kinds in [`field::AnyField`]; [`field_spec`] reads
//!   field specs and moduli from text.
//! - [`monomial`], [`order`], [`poly`], [`parse`]: exponent vectors, monomial orders,
//!   sparse polynomials and the polynomial text syntax; [`monomial_ideal`]: Hilbert series of
//!   monomial ideals.
//! - [`groebner`]: Gröbner basis engines and what is computed from a basis (normal forms,
//!   membership, ideal comparison).
//! - [`dimension`], [`hilbert`], [`zerodim`], [`points`]: invariants read off a basis: Krull
//!   dimension, Hilbert series and degree, the finite-dimensional quotient of a zero-dimensional
//!   ideal (radical, maximality), and point counts over finite fields ([`frobenius`]).
//! - [`normalization`], [`integrality`]: Noether normalization with a checkable certificate;
//!   integrality and finiteness over subalgebras.
//! - [`control`]: interruption and resource limits for long computations.
//! - [`systems`]: standard benchmark systems (cyclic, katsura, eco, noon, random quadratics).

pub mod boolean;
pub mod charpoly;
pub mod control;
pub mod curves;
pub mod dimension;
pub mod echelon;
pub mod error;
pub mod extension;
pub mod field;
pub mod field_kind;
pub mod field_spec;
pub mod frobenius;
pub mod groebner;
pub mod hilbert;
pub mod integrality;
pub mod monomial;
pub mod monomial_ideal;
pub mod normalization;
pub mod order;
pub mod parse;
pub mod points;
pub mod poly;
pub mod rng;
pub mod symbols;
pub mod systems;
pub mod univariate;
pub mod vector_unit;
pub mod zerodim;

#[cfg(test)]
mod test_support;

pub use control::Control;
pub use error::{Error, Result};
pub use field::{Field, PrimeField};
pub use monomial::Monomial;
pub use order::MonomialOrder;
pub use poly::{Poly, Ring};
