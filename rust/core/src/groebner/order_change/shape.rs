//! Shape position from Krylov sequences (Faugère and Mou 2011, sparse FGLM; the rational
//! parametrization as in Bostan, Salvy and Schost 2003): for a zero-dimensional ideal I with
//! A = R/I of dimension D, a linear form ℓ and a random linear functional r on A, the sequence
//! s_k = r(ℓ^k) satisfies the linear recurrence of the minimal polynomial of ℓ; when the
//! recurrence found by Berlekamp–Massey (Massey 1969) has degree D, that polynomial f is the
//! minimal polynomial of ℓ, 1, ℓ, ..., ℓ^(D−1) is a basis of A, and every x_i ≡ g_i(ℓ) in A.
//! With S(T) = Σ_k s_k T^(−k−1) = N(T)/f(T) and S_i(T) = Σ_k r(x_i ℓ^k) T^(−k−1) = N_i(T)/f(T),
//! x_i ≡ g_i(ℓ) gives N_i ≡ g_i·N (mod f), and N is prime to f because f is the minimal
//! recurrence; so g_i = N_i·N^(−1) mod f. Only the products w ↦ M_ℓ^T·w (2D of them, on the
//! sparse multiplication matrices) and univariate arithmetic are needed: no dense matrix.
//!
//! For ℓ = the last variable x_n this is the reduced lex basis {f(x_n), x_i − g_i(x_n)} (the
//! shape lemma; Gianni and Mora 1989). For solving, ℓ is random: over GF(q) a random
//! ℓ = Σ c_i x_i separates the D points of a radical ideal with probability at least
//! 1 − D(D − 1)/(2q) (each pair of points is merged by a hyperplane of forms; Schwartz 1980,
//! Zippel 1979), and a random r then gives the full recurrence with probability at least
//! 1 − D/q (Wiedemann 1986); both bounds are weak for small q, where failures are retried and
//! the caller falls back to a method without randomness.

use crate::charpoly::berlekamp_massey;
use crate::charpoly::scalars::Generic;
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::groebner::quotient::Quotient;
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use crate::univariate::{self, gcd::inverse_mod, random_element, Univariate};

/// x_i ≡ g_i(ℓ) in A with f the minimal polynomial of ℓ, of degree dim A.
#[derive(Clone, Debug)]
pub struct ShapeRepresentation<F: Field> {
    /// ℓ as pairs (variable, coefficient).
    pub form: Vec<(usize, F::Elem)>,
    /// f, monic of degree dim A.
    pub minimal_polynomial: Univariate<F>,
    /// g_i for every variable, of degree < dim A.
    pub coordinates: Vec<Univariate<F>>,
}

impl<F: Field> ShapeRepresentation<F> {
    /// The point with ℓ = t, for a root t of f.
    pub fn point(&self, field: &F, t: &F::Elem) -> Vec<F::Elem> {
        self.coordinates
            .iter()
            .map(|g| univariate::evaluate(field, g, t))
            .collect()
    }
}

/// How many random functionals r are tried before giving up on a linear form.
fn attempts<F: Field>(field: &F) -> usize {
    if field.size_hint() < 65536.0 {
        3
    } else {
        1
    }
}

/// The shape representation for the linear form `form`, or `None` when the minimal polynomial
/// of ℓ has degree below dim A (or every tried functional was unlucky).
pub fn shape_representation<F: Field>(
    quotient: &Quotient<F>,
    form: &[(usize, F::Elem)],
    rng: &mut Rng,
    control: &Control,
) -> Result<Option<ShapeRepresentation<F>>> {
    let ring = &quotient.basis.ring;
    let field = &ring.field;
    let d = quotient.dimension();
    let one = sparse(field, &quotient.coordinates(&ring.one())?);
    let variables: Vec<Vec<(usize, F::Elem)>> = (0..ring.nvars())
        .map(|i| Ok(sparse(field, &quotient.coordinates(&ring.var(i))?)))
        .collect::<Result<_>>()?;
    for _ in 0..attempts(field) {
        let r: Vec<F::Elem> = (0..d).map(|_| random_element(field, rng)).collect();
        let (sequence, variable_sequences) =
            krylov_sequences(quotient, form, r, &one, &variables, control)?;
        let connection = berlekamp_massey(&Generic(field), &sequence);
        if connection.len() != d + 1 {
            continue;
        }
        let minimal: Univariate<F> = connection.into_iter().rev().collect();
        let numerator = numerator(field, &minimal, &sequence);
        let Some(inverse) = inverse_mod(field, &numerator, &minimal) else {
            continue;
        };
        let coordinates = variable_sequences
            .iter()
            .map(|s| {
                let n_i = self::numerator(field, &minimal, s);
                univariate::remainder(
                    field,
                    &univariate::multiply(field, &n_i, &inverse),
                    &minimal,
                )
            })
            .collect();
        return Ok(Some(ShapeRepresentation {
            form: form.to_vec(),
            minimal_polynomial: minimal,
            coordinates,
        }));
    }
    Ok(None)
}

/// The nonzero entries of v.
fn sparse<F: Field>(field: &F, v: &[F::Elem]) -> Vec<(usize, F::Elem)> {
    v.iter()
        .enumerate()
        .filter(|(_, c)| !field.is_zero(c))
        .map(|(k, c)| (k, c.clone()))
        .collect()
}

/// The sequence r(ℓ^k), k < 2D, and for each variable the sequence r(x_i ℓ^k), k < D.
type Sequences<F> = (Vec<<F as Field>::Elem>, Vec<Vec<<F as Field>::Elem>>);

/// s_k = r(ℓ^k) for k < 2D and r(x_i ℓ^k) for k < D, from w_k = (M_ℓ^T)^k r.
fn krylov_sequences<F: Field>(
    quotient: &Quotient<F>,
    form: &[(usize, F::Elem)],
    r: Vec<F::Elem>,
    one: &[(usize, F::Elem)],
    variables: &[Vec<(usize, F::Elem)>],
    control: &Control,
) -> Result<Sequences<F>> {
    let field = &quotient.basis.ring.field;
    let d = quotient.dimension();
    let dot = |w: &[F::Elem], v: &[(usize, F::Elem)]| {
        v.iter().fold(field.zero(), |acc, (k, c)| {
            field.add(&acc, &field.mul(c, &w[*k]))
        })
    };
    let mut sequence = Vec::with_capacity(2 * d);
    let mut variable_sequences = vec![Vec::with_capacity(d); variables.len()];
    let mut w = r;
    for k in 0..2 * d {
        control.check()?;
        sequence.push(dot(&w, one));
        if k < d {
            for (s, v) in variable_sequences.iter_mut().zip(variables) {
                s.push(dot(&w, v));
            }
        }
        if k + 1 < 2 * d {
            w = quotient.transposed_times(form, &w, control)?;
        }
    }
    Ok((sequence, variable_sequences))
}

/// N(T) = polynomial part of f(T)·Σ_k s_k T^(−k−1): n_m = Σ_k f_(m+k+1) s_k, which is
/// coefficient m + D of the product of f and (s_(D−1), ..., s_1, s_0): one fast product.
fn numerator<F: Field>(field: &F, f: &[F::Elem], s: &[F::Elem]) -> Univariate<F> {
    let d = f.len() - 1;
    let reversed: Vec<F::Elem> = s[..d].iter().rev().cloned().collect();
    let product = univariate::multiply(field, f, &univariate::trimmed(field, reversed));
    univariate::trimmed(field, product.get(d..).unwrap_or(&[]).to_vec())
}

/// The reduced lex basis {f(x_n), x_i − g_i(x_n)} when the ideal is in shape position for the
/// last variable (the smallest in lex); `None` otherwise. `to` is the lex ring.
pub fn shape_lex_basis<F: Field>(
    quotient: &Quotient<F>,
    to: &Ring<F>,
    control: &Control,
) -> Result<Option<Vec<Poly<F>>>> {
    let field = &to.field;
    let n = to.nvars();
    let last = n - 1;
    let mut rng = Rng::new(0x1e7_5ba9e);
    let Some(shape) = shape_representation(quotient, &[(last, field.one())], &mut rng, control)?
    else {
        return Ok(None);
    };
    let in_last = |g: &Univariate<F>| {
        to.from_terms(
            g.iter()
                .enumerate()
                .map(|(e, c)| (Monomial::var_power(n, last, e as u32), c.clone())),
        )
    };
    let mut polys: Vec<Poly<F>> = (0..last)
        .map(|i| to.sub(&to.var(i), &in_last(&shape.coordinates[i])))
        .collect();
    polys.push(in_last(&shape.minimal_polynomial));
    Ok(Some(polys))
}
