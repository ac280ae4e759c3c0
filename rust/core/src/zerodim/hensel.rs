//! Lifting a factorization of an integer polynomial modulo a prime p to one modulo p^k
//! (Hensel's lemma, in the form used by Zassenhaus 1969, "On Hensel factorization I"): for
//! f ≡ g·h (mod p^j) with g monic and g, h coprime mod p, the corrections δg, δh with
//! f ≡ (g + p^j δg)(h + p^j δh) (mod p^(j+1)) solve h·δg + g·δh ≡ (f − g·h)/p^j (mod p), which
//! the Bézout relation s·g + t·h ≡ 1 (mod p) does uniquely with deg δg < deg g. One p-adic
//! digit per step (linear lifting); several factors are split off one at a time.

use crate::control::Control;
use crate::error::Result;
use crate::field::{Field, PrimeField};
use crate::univariate::{bezout, divide, multiply, subtract};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{ToPrimitive, Zero};

/// Integer polynomial, coefficient of x^i at index i.
pub type IntPoly = Vec<BigInt>;

/// The image of an integer polynomial modulo p (trailing zeros removed).
pub fn reduce_mod(f: &[BigInt], p: u64) -> Vec<u64> {
    let pb = BigInt::from(p);
    let mut out: Vec<u64> = f
        .iter()
        .map(|c| c.mod_floor(&pb).to_u64().expect("below p"))
        .collect();
    while out.last() == Some(&0) {
        out.pop();
    }
    out
}

fn lift_words(g: &[u64]) -> IntPoly {
    g.iter().map(|&c| BigInt::from(c)).collect()
}

pub fn multiply_integer(a: &[BigInt], b: &[BigInt]) -> IntPoly {
    if a.is_empty() || b.is_empty() {
        return vec![];
    }
    let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    out
}

/// Monic G_1..G_r modulo p^k, coefficients in [0, p^k), with f ≡ lc(f)·∏ G_i (mod p^k) and
/// G_i ≡ g_i (mod p), from monic pairwise coprime g_1..g_r with f ≡ lc(f)·∏ g_i (mod p);
/// p must not divide lc(f).
pub fn lift_factors(
    f: &[BigInt],
    factors: &[Vec<u64>],
    p: u64,
    k: u32,
    control: &Control,
) -> Result<Vec<IntPoly>> {
    let field = PrimeField::new(p)?;
    let modulus = BigInt::from(p).pow(k);
    let mut target: IntPoly = f.iter().map(|c| c.mod_floor(&modulus)).collect();
    let mut lifted = Vec::with_capacity(factors.len());
    for (i, g) in factors.iter().enumerate() {
        let lc = target.last().expect("nonzero").clone();
        if i + 1 == factors.len() {
            let inv = lc
                .modinv(&modulus)
                .expect("p does not divide the leading coefficient");
            lifted.push(
                target
                    .iter()
                    .map(|c| (c * &inv).mod_floor(&modulus))
                    .collect(),
            );
            break;
        }
        let lc_mod_p = field.from_i64((&lc % p).to_i64().expect("below p"));
        let rest = factors[i + 1..]
            .iter()
            .fold(vec![lc_mod_p], |acc, h| multiply(&field, &acc, h));
        let (lifted_g, lifted_h) = lift_pair(&field, &target, g, &rest, k, control)?;
        lifted.push(lifted_g);
        target = lifted_h;
    }
    Ok(lifted)
}

/// (G, H) modulo p^k with f ≡ G·H, G monic lifting g, H lifting h with lc(H) = lc(f).
fn lift_pair(
    field: &PrimeField,
    f: &[BigInt],
    g: &[u64],
    h: &[u64],
    k: u32,
    control: &Control,
) -> Result<(IntPoly, IntPoly)> {
    let p = field.word_modulus().expect("prime field");
    let t = bezout(field, g, h).1;
    let (mut big_g, mut big_h) = (lift_words(g), lift_words(h));
    *big_h.last_mut().expect("nonzero") = f.last().expect("nonzero").clone();
    let mut power = BigInt::from(p);
    for _ in 1..k {
        control.check()?;
        let product = multiply_integer(&big_g, &big_h);
        let error: IntPoly = (0..f.len())
            .map(|i| (&f[i] - product.get(i).cloned().unwrap_or_default()) / &power)
            .collect();
        let e = reduce_mod(&error, p);
        let delta_g = divide(field, &multiply(field, &t, &e), g).1;
        let delta_h = divide(
            field,
            &subtract(field, &e, &multiply(field, h, &delta_g)),
            g,
        )
        .0;
        for (i, c) in delta_g.iter().enumerate() {
            big_g[i] += &power * c;
        }
        for (i, c) in delta_h.iter().enumerate() {
            big_h[i] += &power * c;
        }
        power *= p;
    }
    let reduce = |v: IntPoly| v.into_iter().map(|c| c.mod_floor(&power)).collect();
    Ok((reduce(big_g), reduce(big_h)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lifts_reproduce_the_polynomial_modulo_p_to_the_k() {
        // x^2 - 2 ≡ (x - 3)(x + 3) (mod 7); the lift mod 7^6 gives ±√2 in the 7-adic integers,
        // whose square is 2 mod 7^6 (Hensel's lemma, any number theory text).
        let f: IntPoly = [-2, 0, 1].iter().map(|&c| BigInt::from(c)).collect();
        let lifted = lift_factors(&f, &[vec![4, 1], vec![3, 1]], 7, 6, &Control::new()).unwrap();
        let modulus = BigInt::from(7).pow(6);
        for g in &lifted {
            let root = (-&g[0]).mod_floor(&modulus);
            assert_eq!((&root * &root).mod_floor(&modulus), BigInt::from(2));
        }
        // Non-monic: 3x^3 + 2x + 5 mod 5 is x(3x^2 + 2) = 3·x·(x^2 + 4) (mod 5).
        let f: IntPoly = [5, 2, 0, 3].iter().map(|&c| BigInt::from(c)).collect();
        let lifted = lift_factors(&f, &[vec![0, 1], vec![4, 0, 1]], 5, 8, &Control::new()).unwrap();
        let modulus = BigInt::from(5).pow(8);
        let product = lifted
            .iter()
            .fold(vec![BigInt::from(3)], |acc, g| multiply_integer(&acc, g));
        let product: IntPoly = product.iter().map(|c| c.mod_floor(&modulus)).collect();
        assert_eq!(
            product,
            f.iter().map(|c| c.mod_floor(&modulus)).collect::<IntPoly>()
        );
    }
}
