//! Shape position from Krylov sequences (Faugère and Mou 2011, sparse FGLM; the rational
//! parametrization as in Bostan, Salvy and Schost 2003): for a zero-dimensional ideal I with
//! A = R/I of dimension D, a linear form ℓ and a random linear functional r on A, the sequence
//! s_k = r(ℓ^k) satisfies the linear recurrence of the minimal polynomial of ℓ; when the
//! recurrence found by Berlekamp–Massey (Massey 1969) has degree D, that polynomial f is the
//! minimal polynomial of ℓ, 1, ℓ, ..., ℓ^(D−1) is a basis of A, and every x_i ≡ g_i(ℓ) in A.
//! With S(T) = Σ_k s_k T^(−k−1) = N(T)/f(T) and S_i(T) = Σ_k r(x_i ℓ^k) T^(−k−1) = N_i(T)/f(T),
//! x_i ≡ g_i(ℓ) gives N_i ≡ g_i·N (mod f), and N is prime to f because f is the minimal
//! recurrence; so g_i = N_i·N^(−1) mod f. Only products with the sparse matrix M_ℓ of
//! multiplication by ℓ (D passes, each giving M_ℓ^T·u and M_ℓ·v: the 2D terms are computed from
//! both ends, [`super::multiplication`]) and univariate arithmetic are needed: no dense matrix.
//!
//! For ℓ = the last variable x_n this is the reduced lex basis {f(x_n), x_i − g_i(x_n)} (the
//! shape lemma; Gianni and Mora 1989). For solving, ℓ is random: over GF(q) a random
//! ℓ = Σ c_i x_i separates the D points of a radical ideal with probability at least
//! 1 − D(D − 1)/(2q) (each pair of points is merged by a hyperplane of forms; Schwartz 1980,
//! Zippel 1979), and a random r then gives the full recurrence with probability at least
//! 1 − D/q (Wiedemann 1986); both bounds are weak for small q, where failures are retried and
//! the caller falls back to a method without randomness.

use super::multiplication::MultiplicationMatrix;
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
    let one = quotient.coordinates(&ring.one())?;
    let variables: Vec<Vec<(usize, F::Elem)>> = (0..ring.nvars())
        .map(|i| Ok(sparse(field, &quotient.coordinates(&ring.var(i))?)))
        .collect::<Result<_>>()?;
    let matrix = MultiplicationMatrix::of_form(
        field,
        d,
        form,
        |i| Ok(quotient.columns_of(i, control)?.as_slice()),
        control,
    )?;
    for _ in 0..attempts(field) {
        let r: Vec<F::Elem> = (0..d).map(|_| random_element(field, rng)).collect();
        let (sequence, variable_sequences) =
            krylov_sequences(&matrix, r, &one, &variables, control)?;
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

/// s_k = r(ℓ^k) for k < 2D and r(x_i ℓ^k) for k < D, with M = M_ℓ, from both ends: with
/// u_m = (M^T)^m r and v_m = M^m·1, s_(2m) = u_m·v_m and s_(2m+1) = u_(m+1)·v_m, and
/// r(x_i ℓ^m) = u_m·x_i; each step m < D is one pass over M ([`MultiplicationMatrix`]).
fn krylov_sequences<F: Field>(
    matrix: &MultiplicationMatrix<F>,
    r: Vec<F::Elem>,
    one: &[F::Elem],
    variables: &[Vec<(usize, F::Elem)>],
    control: &Control,
) -> Result<Sequences<F>> {
    let field = matrix.field();
    let d = matrix.dimension();
    let sparse_dot = |w: &[F::Elem], v: &[(usize, F::Elem)]| {
        v.iter().fold(field.zero(), |acc, (k, c)| {
            field.add(&acc, &field.mul(c, &w[*k]))
        })
    };
    let dense_dot = |a: &[F::Elem], b: &[F::Elem]| {
        a.iter().zip(b).fold(field.zero(), |acc, (x, y)| {
            field.add(&acc, &field.mul(x, y))
        })
    };
    let mut sequence = Vec::with_capacity(2 * d);
    let mut variable_sequences = vec![Vec::with_capacity(d); variables.len()];
    let (mut u, mut v) = (r, one.to_vec());
    for _ in 0..d {
        for (s, x) in variable_sequences.iter_mut().zip(variables) {
            s.push(sparse_dot(&u, x));
        }
        let (next_u, next_v) = matrix.both_products(&u, &v, control)?;
        sequence.push(dense_dot(&u, &v));
        sequence.push(dense_dot(&next_u, &v));
        (u, v) = (next_u, next_v);
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field_kind::AnyField;
    use crate::groebner::{groebner_basis, Engine};
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;

    /// The sequences of [`krylov_sequences`] the direct way: w_k = (M_ℓ^T)^k r by one
    /// transposed product per step, s_k = w_k·1 and r(x_i ℓ^k) = w_k·x_i.
    fn one_ended_sequences<F: Field>(
        quotient: &Quotient<F>,
        form: &[(usize, F::Elem)],
        r: Vec<F::Elem>,
        one: &[F::Elem],
        variables: &[Vec<(usize, F::Elem)>],
    ) -> Sequences<F> {
        let field = &quotient.basis.ring.field;
        let d = quotient.dimension();
        let dot = |w: &[F::Elem], v: &[(usize, F::Elem)]| {
            v.iter().fold(field.zero(), |s, (k, c)| {
                field.add(&s, &field.mul(c, &w[*k]))
            })
        };
        let mut w = r;
        let mut sequence = Vec::new();
        let mut variable_sequences = vec![Vec::new(); variables.len()];
        for k in 0..2 * d {
            sequence.push(dot(&w, &sparse(field, one)));
            if k < d {
                for (s, x) in variable_sequences.iter_mut().zip(variables) {
                    s.push(dot(&w, x));
                }
            }
            let mut next = vec![field.zero(); d];
            for (i, c) in form {
                let columns = quotient.columns_of(*i, &Control::new()).unwrap();
                for (o, column) in next.iter_mut().zip(columns) {
                    *o = field.add(o, &field.mul(c, &dot(&w, column)));
                }
            }
            w = next;
        }
        (sequence, variable_sequences)
    }

    #[test]
    fn sequences_from_both_ends_agree_with_the_one_ended_sequences() {
        // A system of our own with 9 = 3·3 solutions over the algebraic closure (Bézout's
        // bound), over a word prime (residue kernel), a prime beyond 2^32 and GF(9); for the
        // last variable and for a random linear form.
        let equations = ["x^3 - y*z - 1", "y^3 + x - 2*z", "z - x*y + y"];
        for spec in ["GF(32003)", "GF(2305843009213693951)", "GF(9)"] {
            let any = AnyField::parse(spec).unwrap();
            crate::with_any_field!(any, field => {
                let names: Vec<String> = ["x", "y", "z"].iter().map(|s| s.to_string()).collect();
                let ring = Ring::new(field.clone(), names, MonomialOrder::Grevlex).unwrap();
                let gens: Vec<_> = equations.iter().map(|e| parse_poly(&ring, e).unwrap()).collect();
                let control = Control::new();
                let gb = groebner_basis(&ring, &gens, Engine::default(), &control).unwrap();
                let quotient = Quotient::new(gb, &control).unwrap();
                assert_eq!(quotient.dimension(), 9, "{spec}");
                let mut rng = Rng::new(5);
                let one = quotient.coordinates(&ring.one()).unwrap();
                let variables: Vec<_> = (0..3)
                    .map(|i| sparse(&field, &quotient.coordinates(&ring.var(i)).unwrap()))
                    .collect();
                let forms = [
                    vec![(2, field.one())],
                    (0..3).map(|i| (i, random_element(&field, &mut rng))).collect(),
                ];
                for form in &forms {
                    let r: Vec<_> = (0..9).map(|_| random_element(&field, &mut rng)).collect();
                    let matrix = MultiplicationMatrix::of_form(
                        &field,
                        9,
                        form,
                        |i| Ok(quotient.columns_of(i, &control)?.as_slice()),
                        &control,
                    )
                    .unwrap();
                    let got = krylov_sequences(&matrix, r.clone(), &one, &variables, &control).unwrap();
                    let expected = one_ended_sequences(&quotient, form, r, &one, &variables);
                    assert!(got == expected, "{spec}, form of {} terms", form.len());
                }
            });
        }
    }
}
