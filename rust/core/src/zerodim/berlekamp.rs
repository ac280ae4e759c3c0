//! The monic irreducible factors of a squarefree univariate polynomial over a small finite field,
//! by Berlekamp's algorithm (Berlekamp 1967, "Factoring polynomials over finite fields"): the
//! polynomials v with v^q ≡ v (mod f) form a subalgebra of GF(q)[x]/(f) of dimension the number
//! r of irreducible factors (the kernel of Frobenius − identity), and since
//! v^q − v = ∏_{s ∈ GF(q)} (v − s), the gcds of a factor with v − s split it. Deterministic: it
//! tries every s, so it is meant for small q (the primes the rational factorization uses).

use crate::control::Control;
use crate::echelon::kernel;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::univariate::{degree, divide, gcd, monic, subtract, Modulo, Univariate};

/// Largest field this splitting is used for (it tries every element).
const ELEMENT_LIMIT: usize = 1 << 16;

/// The monic irreducible factors of a squarefree f of degree ≥ 1 (any order).
pub fn factor_squarefree<F: Field>(
    field: &F,
    f: &Univariate<F>,
    control: &Control,
) -> Result<Vec<Univariate<F>>> {
    let f = monic(field, f);
    let n = degree::<F>(&f)
        .filter(|&n| n >= 1)
        .ok_or_else(|| Error::invalid("factoring needs a polynomial of positive degree"))?;
    let elements = field.small_elements(ELEMENT_LIMIT).ok_or_else(|| {
        Error::invalid("Berlekamp's splitting needs a finite field of at most 2^16 elements")
    })?;
    let algebra = fixed_subalgebra(field, &f, n, elements.len() as u64, control)?;
    let mut factors = vec![f];
    for v in &algebra {
        if factors.len() == algebra.len() {
            break;
        }
        let mut split = Vec::with_capacity(algebra.len());
        for h in factors {
            control.check()?;
            if degree::<F>(&h) == Some(1) {
                split.push(h);
                continue;
            }
            for s in &elements {
                let shifted = subtract(field, v, std::slice::from_ref(s));
                let g = gcd(field, &h, &shifted);
                if degree::<F>(&g).unwrap_or(0) > 0 {
                    split.push(g);
                }
            }
        }
        factors = split;
    }
    Ok(factors)
}

/// A basis of {v : deg v < n, v^q ≡ v mod f}: the kernel of Q − I, where row i of Q holds the
/// coefficients of x^(iq) mod f (the Berlekamp matrix).
fn fixed_subalgebra<F: Field>(
    field: &F,
    f: &Univariate<F>,
    n: usize,
    q: u64,
    control: &Control,
) -> Result<Vec<Univariate<F>>> {
    let modulo = Modulo::new(field, f);
    let x_q = modulo.x_power(&[q], control)?;
    let mut power = vec![field.one()];
    // Column i of the kernel matrix is (x^(iq) mod f) − x^i; rows index coefficients.
    let mut matrix = vec![vec![field.zero(); n]; n];
    for i in 0..n {
        control.check()?;
        for (j, row) in matrix.iter_mut().enumerate() {
            let c = power.get(j).cloned().unwrap_or_else(|| field.zero());
            row[i] = if i == j {
                field.sub(&c, &field.one())
            } else {
                c
            };
        }
        power = modulo.multiply(&power, &x_q);
    }
    let mut basis = kernel(field, matrix, n);
    for v in &mut basis {
        crate::univariate::trim(field, v);
    }
    debug_assert!(basis.iter().all(|v| divide(
        field,
        &subtract(
            field,
            &modulo.power(v, &[q], control).expect("not interrupted"),
            v
        ),
        f
    )
    .1
    .is_empty()));
    Ok(basis)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::univariate::multiply;

    fn factor(p: u64, f: &[u64]) -> Vec<Vec<u64>> {
        let field = PrimeField::new(p).unwrap();
        let mut out = factor_squarefree(&field, &f.to_vec(), &Control::new()).unwrap();
        out.sort();
        out
    }

    #[test]
    fn factors_multiply_back_and_have_the_known_degrees() {
        // x^4 + 1 ≡ x^4 - 4 = (x^2 - 2)(x^2 + 2) mod 5, and ±2 are not squares mod 5.
        assert_eq!(
            factor(5, &[1, 0, 0, 0, 1]),
            vec![vec![2, 0, 1], vec![3, 0, 1]]
        );
        // x^4 - 10x^2 + 1 (the minimal polynomial of √2 + √3) splits modulo every prime into
        // factors of degree at most 2, since one of 2, 3, 6 is a square mod p (classical).
        for p in [7u64, 11, 13] {
            let field_p = PrimeField::new(p).unwrap();
            let f = vec![1, 0, p - 10 % p, 0, 1];
            let factors = factor(p, &f);
            assert!(factors.iter().all(|g| g.len() <= 3), "mod {p}: {factors:?}");
            let product = factors
                .iter()
                .fold(vec![1], |acc, g| multiply(&field_p, &acc, g));
            assert_eq!(product, f);
        }
        // x^2 + 1 is irreducible mod 7 (7 ≡ 3 mod 4) and x^3 - 2 mod 7 has no root (cubes mod 7
        // are 0, ±1), so it is irreducible too (Ireland and Rosen, ch. 5 and 9, from memory).
        assert_eq!(factor(7, &[1, 0, 1]), vec![vec![1, 0, 1]]);
        assert_eq!(factor(7, &[5, 0, 0, 1]), vec![vec![5, 0, 0, 1]]);
    }
}
