//! Triangular changes of coordinates for Noether normalization, and the seeded random choices
//! that draw them.
//!
//! Every change used here has the form p_j = x_{s_j} + h_j(x_N): the parameters are chosen
//! variables x_{s_1..s_d} shifted by polynomials in the remaining variables N, which stay as
//! they are. Such a change is invertible (x_{s_j} = p_j - h_j(x_N)) and covers both the generic
//! linear parameters (every d-dimensional space of linear forms has a basis of this shape after
//! Gaussian elimination) and the iterated substitutions of Nagata (1962, *Local Rings*), whose
//! composition keeps this shape because each step only shifts the variables still to be
//! parameters by powers of a variable that stops being one.

use crate::control::Control;
use crate::error::Result;
use crate::field::{field_size, Field};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
pub use crate::rng::Rng;

/// Parameters p_j = x_{params[j]} + shifts[j], with `shifts[j]` a polynomial in the variables
/// `nonparams` only (indices of the original ring).
#[derive(Clone, Debug)]
pub struct Change<F: Field> {
    pub params: Vec<usize>,
    pub nonparams: Vec<usize>,
    pub shifts: Vec<Poly<F>>,
}

impl<F: Field> Change<F> {
    /// The parameters are the variables `params` themselves.
    pub fn variables(params: &[usize], n: usize) -> Self {
        Change {
            params: params.to_vec(),
            nonparams: complement(params, n),
            shifts: vec![Poly::zero(); params.len()],
        }
    }

    pub fn is_identity(&self) -> bool {
        self.shifts.iter().all(|h| h.is_zero())
    }

    /// Whether every shift is a linear form (so the parameters are linear forms).
    pub fn is_linear(&self) -> bool {
        self.shifts
            .iter()
            .all(|h| h.terms().iter().all(|(m, _)| m.degree() == 1))
    }

    /// Largest total degree of a parameter.
    pub fn parameter_degree(&self) -> u32 {
        self.shifts
            .iter()
            .filter_map(|h| h.degree())
            .max()
            .unwrap_or(1)
            .max(1)
    }

    /// The parameters p_j as polynomials in the original variables.
    pub fn parameters(&self, ring: &Ring<F>) -> Vec<Poly<F>> {
        self.params
            .iter()
            .zip(&self.shifts)
            .map(|(&s, h)| ring.add(&ring.var(s), h))
            .collect()
    }
}

/// Indices 0..n not in `set`, increasing.
pub fn complement(set: &[usize], n: usize) -> Vec<usize> {
    (0..n).filter(|i| !set.contains(i)).collect()
}

/// The ideal written in the coordinates of a change: a ring whose variables are the
/// non-parameters (original names) followed by the parameters, so that grevlex puts the
/// parameters last and the elimination order puts the non-parameters first.
#[derive(Clone, Debug)]
pub struct Coordinates<F: Field> {
    /// Ring in grevlex; [`Coordinates::elimination_ring`] gives the elimination order.
    pub ring: Ring<F>,
    /// Image of each original variable x_i: x_b for a non-parameter, p_j - h_j(x_N) for x_{s_j}.
    pub images: Vec<Poly<F>>,
    pub n_nonparams: usize,
}

impl<F: Field> Coordinates<F> {
    pub fn new(ring: &Ring<F>, change: &Change<F>) -> Result<Self> {
        let n = ring.nvars();
        let order: Vec<usize> = change
            .nonparams
            .iter()
            .chain(&change.params)
            .copied()
            .collect();
        let names = order.iter().map(|&i| ring.names()[i].clone()).collect();
        let target = Ring::new(ring.field.clone(), names, MonomialOrder::Grevlex)?;
        let mut position = vec![0; n];
        for (k, &i) in order.iter().enumerate() {
            position[i] = k;
        }
        // Shifts only involve non-parameters, whose image is their own variable.
        let renaming: Vec<Poly<F>> = (0..n).map(|i| target.var(position[i])).collect();
        let mut images: Vec<Poly<F>> = renaming.clone();
        for (&s, h) in change.params.iter().zip(&change.shifts) {
            let h_new = ring.substitute(h, &renaming, &target)?;
            images[s] = target.sub(&target.var(position[s]), &h_new);
        }
        Ok(Coordinates {
            ring: target,
            images,
            n_nonparams: change.nonparams.len(),
        })
    }

    /// The same variables with the non-parameters eliminated first (block order N >> T).
    pub fn elimination_ring(&self) -> Result<Ring<F>> {
        let first: Vec<usize> = (0..self.n_nonparams).collect();
        self.ring
            .with_order(MonomialOrder::elimination(&first, self.ring.nvars()))
    }

    /// The generators of the ideal in these coordinates, for `target` (this ring in some order).
    pub fn transform(
        &self,
        ring: &Ring<F>,
        gens: &[Poly<F>],
        target: &Ring<F>,
        control: &Control,
    ) -> Result<Vec<Poly<F>>> {
        gens.iter()
            .map(|g| ring.substitute_within(g, &self.images, target, control))
            .collect()
    }
}

/// Sparse unit-triangular linear change: each parameter x_{s_j} is shifted by c·x_b for one
/// variable b among `targets` (the non-parameters lacking a pure power), taken round-robin from
/// position `round`, with c a random nonzero field element.
pub fn sparse_linear<F: Field>(
    ring: &Ring<F>,
    params: &[usize],
    targets: &[usize],
    round: usize,
    rng: &mut Rng,
) -> Change<F> {
    let n = ring.nvars();
    let shifts = (0..params.len())
        .map(|j| {
            let b = targets[(j + round) % targets.len()];
            ring.scale(&ring.var(b), &rng.nonzero(&ring.field))
        })
        .collect();
    Change {
        params: params.to_vec(),
        nonparams: complement(params, n),
        shifts,
    }
}

/// Nonlinear changes x_{s_j} + Σ_b x_b^{e_jb} with b among `targets` and exponents
/// 0 (absent) to `max_exponent`, smallest exponents first (by largest, then total exponent),
/// at least one exponent above 1, at most `limit` of them: Nagata's substitutions with the
/// small exponents that usually suffice tried before the large ones that always do.
pub fn small_powers<F: Field>(
    ring: &Ring<F>,
    params: &[usize],
    targets: &[usize],
    max_exponent: u32,
    limit: usize,
) -> Vec<Change<F>> {
    let n = ring.nvars();
    let slots = params.len() * targets.len();
    let base = u64::from(max_exponent) + 1;
    let Some(count) = u32::try_from(slots).ok().and_then(|s| base.checked_pow(s)) else {
        return Vec::new();
    };
    if count > ENUMERATION_LIMIT {
        return Vec::new();
    }
    let mut patterns: Vec<Vec<u32>> = (0..count)
        .map(|k| digits(k, base, slots).map(|e| e as u32).collect())
        .filter(|p: &Vec<u32>| p.iter().any(|&e| e > 1))
        .collect();
    patterns.sort_by_key(|p| (p.iter().copied().max(), p.iter().sum::<u32>()));
    patterns
        .into_iter()
        .take(limit)
        .map(|p| {
            let shifts = (0..params.len())
                .map(|j| {
                    let terms = targets.iter().enumerate().filter_map(|(k, &b)| {
                        let e = p[j * targets.len() + k];
                        (e > 0).then(|| (crate::Monomial::var_power(n, b, e), ring.field.one()))
                    });
                    ring.from_terms(terms)
                })
                .collect();
            Change {
                params: params.to_vec(),
                nonparams: complement(params, n),
                shifts,
            }
        })
        .collect()
}

/// Dense random linear change: each parameter is x_{s_j} plus a random combination of all
/// non-parameters.
pub fn dense_linear<F: Field>(ring: &Ring<F>, params: &[usize], rng: &mut Rng) -> Change<F> {
    let n = ring.nvars();
    let nonparams = complement(params, n);
    let shifts = params
        .iter()
        .map(|_| {
            let terms = nonparams.iter().map(|&b| {
                (
                    crate::Monomial::var_power(n, b, 1),
                    rng.nonzero(&ring.field),
                )
            });
            ring.from_terms(terms)
        })
        .collect();
    Change {
        params: params.to_vec(),
        nonparams,
        shifts,
    }
}

/// Most coefficient vectors enumerated before sorting by weight.
const ENUMERATION_LIMIT: u64 = 1 << 16;
/// Fields up to this size are enumerated; larger ones draw random linear forms, which succeed
/// with good probability there (Schwartz 1980, Zippel 1979).
pub const TINY_FIELD: u64 = 16;

/// Over a field of q ≤ [`TINY_FIELD`] elements with q^(d·(n - d)) small: the linear changes
/// x_{s_j} + Σ_b c_jb x_b, fewest nonzero coefficients c first and coefficients 1 before others
/// (the variables themselves left out), at most `limit` of them; `None` when the field is too large to enumerate.
pub fn enumerated_linear<F: Field>(
    ring: &Ring<F>,
    params: &[usize],
    limit: usize,
) -> Option<Vec<Change<F>>> {
    let n = ring.nvars();
    let nonparams = complement(params, n);
    let slots = params.len() * nonparams.len();
    let q = field_size(&ring.field).filter(|&q| q <= TINY_FIELD)?;
    let count = q.checked_pow(u32::try_from(slots).ok()?)?;
    if count > ENUMERATION_LIMIT {
        return None;
    }
    let elements = ring.field.small_elements(q as usize)?;
    let mut vectors: Vec<Vec<usize>> = (1..count)
        .map(|k| digits(k, q, slots).map(|x| x as usize).collect())
        .collect();
    // Fewest terms first, and among those the ones with coefficients 1 (index 1 is the
    // element 1): a scaled shift rarely succeeds where the unscaled one failed.
    vectors.sort_by_key(|v| {
        let weight = v.iter().filter(|&&x| x != 0).count();
        (weight, v.iter().filter(|&&x| x > 1).count())
    });
    let changes = vectors
        .into_iter()
        .take(limit)
        .map(|v| {
            let shifts = params
                .iter()
                .enumerate()
                .map(|(j, _)| {
                    let terms = nonparams.iter().enumerate().map(|(k, &b)| {
                        (
                            crate::Monomial::var_power(n, b, 1),
                            elements[v[j * nonparams.len() + k]].clone(),
                        )
                    });
                    ring.from_terms(terms)
                })
                .collect();
            Change {
                params: params.to_vec(),
                nonparams: nonparams.clone(),
                shifts,
            }
        })
        .collect();
    Some(changes)
}

/// The `len` lowest digits of k in base `base`, least significant first.
fn digits(mut k: u64, base: u64, len: usize) -> impl Iterator<Item = u64> {
    (0..len).map(move |_| {
        let digit = k % base;
        k /= base;
        digit
    })
}
