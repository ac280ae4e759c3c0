//! Points over an extension field: a system over GF(q) read over GF(q^r) ⊇ GF(q) and solved
//! there. GF(q) = GF(p)[a]/(m) embeds into GF(q^r) by sending a to a root of m in GF(q^r) (any
//! root: the roots are the conjugates of one of them, so the embeddings differ by a power of
//! Frobenius, which fixes GF(q) and permutes the points of the system); the root comes from
//! [`crate::univariate::roots`] over the large field. The points of a closed point P of degree d
//! in its residue field k(P) = GF(q^d) are its rational points over GF(q^d).

use super::solve::rational_points;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::extension::Modulus;
use crate::field::Field;
use crate::groebner::Engine;
use crate::poly::{Poly, Ring};

/// The image of the generator a of GF(p^k) = GF(p)[a]/(m) in a field `target` of
/// characteristic p containing GF(p^k): a root of m there; an error if m has no root (then
/// `target` does not contain GF(p^k)).
pub fn generator_image<E: Field>(
    modulus: &Modulus,
    target: &E,
    control: &Control,
) -> Result<E::Elem> {
    let m: Vec<E::Elem> = modulus
        .coefficients()
        .iter()
        .map(|&c| target.from_i64(c as i64))
        .collect();
    crate::univariate::roots(target, &m, control)?
        .into_iter()
        .next()
        .ok_or_else(|| {
            Error::invalid(format!(
                "{} does not contain {}: the modulus {} has no root there",
                target.spec(),
                modulus.spec(),
                modulus.text()
            ))
        })
}

/// The element Σ c_i γ^i of `target` for coefficients c_i over GF(p) and γ the image of the
/// generator.
pub fn embed_coefficients<E: Field>(
    target: &E,
    coefficients: &[u64],
    generator: &E::Elem,
) -> E::Elem {
    coefficients.iter().rev().fold(target.zero(), |acc, &c| {
        target.add(&target.mul(&acc, generator), &target.from_i64(c as i64))
    })
}

/// f with every coefficient mapped by `embed`, as a polynomial of `to` (same variables).
pub fn map_poly<F: Field, E: Field>(
    f: &Poly<F>,
    to: &Ring<E>,
    embed: &impl Fn(&F::Elem) -> E::Elem,
) -> Poly<E> {
    to.from_terms(f.terms().iter().map(|(m, c)| (m.clone(), embed(c))))
}

/// The points of V(gens) with coordinates in `target` ⊇ GF(q), each coefficient mapped into
/// `target` by `embed` (a field embedding; see [`generator_image`]).
pub fn points_over<F: Field, E: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    target: E,
    embed: impl Fn(&F::Elem) -> E::Elem,
    limit: Option<usize>,
    engine: Engine,
    control: &Control,
) -> Result<Vec<Vec<E::Elem>>> {
    let to = Ring::new(target, ring.names().to_vec(), ring.order.clone())?;
    let mapped: Vec<Poly<E>> = gens.iter().map(|g| map_poly(g, &to, &embed)).collect();
    rational_points(&to, &mapped, limit, engine, control)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::extension::{ExtensionField, TableField};
    use crate::field::PrimeField;
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;
    use crate::points::closed::closed_points;

    #[test]
    fn gf4_embeds_into_gf16_and_points_over_the_extension_are_the_closed_points() {
        // x^2 + x + 1 over GF(2) has no rational root and one closed point of degree 2, whose
        // two points lie in GF(4) ⊂ GF(16) (x^(q^n) − x factorization, Lidl and Niederreiter
        // 1983, from memory).
        let gf2 = PrimeField::new(2).unwrap();
        let ring = Ring::new(gf2, vec!["x".into(), "y".into()], MonomialOrder::Grevlex).unwrap();
        let gens = vec![
            parse_poly(&ring, "x^2 + x + 1").unwrap(),
            parse_poly(&ring, "y - x^3").unwrap(),
        ];
        let gf16 =
            TableField::new(Modulus::first_irreducible(PrimeField::new(2).unwrap(), 4).unwrap())
                .unwrap();
        let points = points_over(
            &ring,
            &gens,
            gf16.clone(),
            |c| gf16.from_i64(*c as i64),
            None,
            Engine::F4,
            &Control::new(),
        )
        .unwrap();
        assert_eq!(points.len(), 2);
        for p in &points {
            // y = x^3 = 1 for a primitive cube root of unity.
            assert!(gf16.is_one(&p[1]));
        }
        let closed = closed_points(&ring, &gens, Engine::F4, &Control::new()).unwrap();
        assert_eq!(closed.iter().map(|p| p.degree).collect::<Vec<_>>(), vec![2]);
        // The generator of GF(9) = GF(3)[a]/(a^2 + 1) goes to a root of a^2 + 1 in GF(3^4), and
        // the embedding respects products: (1 + a)^2 = 2a.
        let gf9 = Modulus::first_irreducible(PrimeField::new(3).unwrap(), 2).unwrap();
        let big = ExtensionField::with_default_modulus(3, 4).unwrap();
        let gamma = generator_image(&gf9, &big, &Control::new()).unwrap();
        let one_plus = embed_coefficients(&big, &[1, 1], &gamma);
        assert_eq!(
            big.mul(&one_plus, &one_plus),
            embed_coefficients(&big, &[0, 2], &gamma)
        );
        assert!(generator_image(
            &gf9,
            &ExtensionField::with_default_modulus(3, 3).unwrap(),
            &Control::new()
        )
        .is_err());
    }
}
