//! Roots and complete factorization of univariate polynomials over finite fields: the roots in
//! GF(q) are the factors of degree 1, split off as gcd(x^q − x, f) (x^q by repeated squaring
//! modulo f, never written down) and separated by equal-degree factorization (Cantor and
//! Zassenhaus 1981); the complete factorization is squarefree, then distinct-degree, then
//! equal-degree factorization (the plan of von zur Gathen and Shoup 1992). Over a field not much
//! larger than the degree the roots are read off the values at every element instead
//! ([`super::all_values`]).

use super::all_values::{evaluation_is_cheaper, roots_by_evaluation, small_order};
use super::distinct_degree::linear_part;
use super::{
    degree, distinct_degree_factorization, equal_degree_factorization, squarefree_factorization,
    Univariate,
};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::rng::Rng;

/// The seed of the random splitting steps: the results do not depend on it, only the time.
const SPLITTING_SEED: u64 = 0x005e_ed0f_2007;

/// The distinct roots of f ≠ 0 in the (finite) field.
pub fn roots<F: Field>(field: &F, f: &[F::Elem], control: &Control) -> Result<Vec<F::Elem>> {
    let f = nonzero(field, f, "roots")?;
    if let Some(q) = small_order(field) {
        if degree::<F>(&f).is_some_and(|d| d > 0 && evaluation_is_cheaper(q, d)) {
            return roots_by_evaluation(field, &f, q, control);
        }
    }
    let linear = linear_part(field, &f, control)?;
    if degree::<F>(&linear).unwrap_or(0) == 0 {
        return Ok(vec![]);
    }
    let mut rng = Rng::new(SPLITTING_SEED);
    Ok(
        equal_degree_factorization(field, &linear, 1, &mut rng, control)?
            .into_iter()
            .map(|g| field.neg(&g[0]))
            .collect(),
    )
}

/// The factorization of f ≠ 0 into monic irreducible factors with multiplicities (the leading
/// coefficient of f left out), sorted by degree, then multiplicity.
pub fn factor<F: Field>(
    field: &F,
    f: &[F::Elem],
    control: &Control,
) -> Result<Vec<(Univariate<F>, usize)>> {
    let f = nonzero(field, f, "factor")?;
    let mut rng = Rng::new(SPLITTING_SEED);
    let mut out = Vec::new();
    for (part, multiplicity) in squarefree_factorization(field, &f) {
        for (same_degree, d) in distinct_degree_factorization(field, &part, control)? {
            for g in equal_degree_factorization(field, &same_degree, d, &mut rng, control)? {
                out.push((g, multiplicity));
            }
        }
    }
    out.sort_by_key(|(g, e)| (g.len(), *e));
    Ok(out)
}

fn nonzero<F: Field>(field: &F, f: &[F::Elem], what: &str) -> Result<Univariate<F>> {
    let f = super::trimmed(field, f.to_vec());
    if f.is_empty() {
        return Err(Error::invalid(format!(
            "{what} of the zero polynomial: every element is a root"
        )));
    }
    Ok(f)
}
