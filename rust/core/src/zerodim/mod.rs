//! Zero-dimensional ideals: what R/I is, beyond its vector space (which is
//! [`crate::groebner::quotient`], with the engines, since the change of order works in it).
//!
//! - [`fglm`]: the reduced basis for another order (Faugère, Gianni, Lazard, Mora 1993), and
//!   [`shape`]: lex bases in shape position and points from Krylov sequences (Faugère and Mou
//!   2011); both live in [`crate::groebner::order_change`] and are named here as well.
//! - [`radical`]: the radical and the number of distinct solutions (Seidenberg 1974).
//! - [`maximal`]: whether R/I is a field, and its degree over k; over QQ by a primitive element
//!   ([`maximal_rational`]) and an exact irreducibility test ([`irreducible`], with
//!   [`berlekamp`] and [`hensel`]).

pub mod berlekamp;
pub mod hensel;
pub mod irreducible;
pub mod maximal;
pub mod maximal_rational;
pub mod radical;

pub use crate::groebner::order_change::{fglm, shape};
pub use crate::groebner::quotient::{quotient_dimension, require_zero_dimensional, Quotient};

#[cfg(test)]
mod tests;
