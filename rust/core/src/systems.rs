//! Standard benchmark systems of polynomial equations, generated as text (variable names and one
//! polynomial per equation) so they can be read into any ring with [`crate::parse::parse_poly`],
//! or directly as polynomials with [`System::polys`]. Definitions:
//! - cyclic-n: the cyclic n-roots problem (Björck and Fröberg 1991);
//! - katsura-n: the magnetism model of Katsura (1990), n + 1 unknowns u_0..u_n;
//! - eco-n: the economic model of Morgan (1987);
//! - noon-n: the neural network model of Noonburg (1989), with coefficient 1.1 scaled to integers;
//! - random quadratic: m dense quadrics in n variables with pseudo-random coefficients;
//! - random sparse: small systems of a few random terms each, of our own making, for the
//!   suites of lex and elimination bases (one generator for their tests and benchmarks).

use crate::error::Result;
use crate::field::Field;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;

/// Variable names and equations (each polynomial = 0) of a system.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct System {
    pub name: String,
    pub vars: Vec<String>,
    pub equations: Vec<String>,
}

impl System {
    /// The equations read in `ring` (which must have the system's variables).
    pub fn polys<F: Field>(&self, ring: &Ring<F>) -> Result<Vec<Poly<F>>> {
        self.equations.iter().map(|e| parse_poly(ring, e)).collect()
    }
}

fn names(prefix: &str, range: std::ops::Range<usize>) -> Vec<String> {
    range.map(|i| format!("{prefix}{i}")).collect()
}

/// cyclic-n: for k = 1..n-1, the sum over i of x_i x_{i+1} ... x_{i+k-1} (indices mod n), and
/// x_0 ... x_{n-1} - 1.
pub fn cyclic(n: usize) -> System {
    let vars = names("x", 0..n);
    let mut equations: Vec<String> = (1..n)
        .map(|k| {
            let terms: Vec<String> = (0..n)
                .map(|i| {
                    (0..k)
                        .map(|j| vars[(i + j) % n].clone())
                        .collect::<Vec<_>>()
                        .join("*")
                })
                .collect();
            terms.join(" + ")
        })
        .collect();
    equations.push(format!("{} - 1", vars.join("*")));
    System {
        name: format!("cyclic-{n}"),
        vars,
        equations,
    }
}

/// katsura-n: unknowns u_0..u_n with u_{-l} = u_l and u_l = 0 for |l| > n;
/// sum over l = -n..n of u_l = 1, and for m = 0..n-1: sum over l = -n..n of u_l u_{m-l} = u_m.
pub fn katsura(n: usize) -> System {
    let vars = names("u", 0..n + 1);
    let n = n as i64;
    let u = |l: i64| -> Option<&String> {
        vars.get(l.unsigned_abs() as usize).filter(|_| l.abs() <= n)
    };
    let mut equations = Vec::new();
    let linear: Vec<String> = (-n..=n).filter_map(|l| u(l).cloned()).collect();
    equations.push(format!("{} - 1", linear.join(" + ")));
    for m in 0..n {
        let products: Vec<String> = (-n..=n)
            .filter_map(|l| Some(format!("{}*{}", u(l)?, u(m - l)?)))
            .collect();
        equations.push(format!("{} - {}", products.join(" + "), vars[m as usize]));
    }
    System {
        name: format!("katsura-{n}"),
        vars,
        equations,
    }
}

/// eco-n: unknowns x_1..x_n; for k = 1..n-1: (x_k + sum_{i=1}^{n-k-1} x_i x_{i+k}) x_n - k,
/// and x_1 + ... + x_{n-1} + 1.
pub fn eco(n: usize) -> System {
    let vars = names("x", 1..n + 1);
    let x = |i: usize| vars[i - 1].clone();
    let mut equations: Vec<String> = (1..n)
        .map(|k| {
            let mut inner = vec![x(k)];
            inner.extend((1..n - k).map(|i| format!("{}*{}", x(i), x(i + k))));
            format!("({})*{} - {k}", inner.join(" + "), x(n))
        })
        .collect();
    let linear: Vec<String> = (1..n).map(x).collect();
    equations.push(format!("{} + 1", linear.join(" + ")));
    System {
        name: format!("eco-{n}"),
        vars,
        equations,
    }
}

/// noon-n: for i = 1..n, x_i (sum_{j ≠ i} x_j^2) - 1.1 x_i + 1, written times 10 to keep
/// integer coefficients: 10 x_i (sum_{j ≠ i} x_j^2) - 11 x_i + 10.
pub fn noon(n: usize) -> System {
    let vars = names("x", 1..n + 1);
    let equations = (0..n)
        .map(|i| {
            let squares: Vec<String> = (0..n)
                .filter(|&j| j != i)
                .map(|j| format!("{}^2", vars[j]))
                .collect();
            format!(
                "10*{v}*({}) - 11*{v} + 10",
                squares.join(" + "),
                v = vars[i]
            )
        })
        .collect();
    System {
        name: format!("noon-{n}"),
        vars,
        equations,
    }
}

/// m dense quadratic polynomials in n variables (every monomial of degree ≤ 2), coefficients
/// pseudo-random integers in [0, 2^31) from `seed`, so generic over any large field.
pub fn random_quadratic(n: usize, m: usize, seed: u64) -> System {
    let vars = names("x", 0..n);
    let mut rng = Rng::with_state(seed);
    let mut next = || rng.next_u64() >> 33;
    let mut monomials: Vec<String> = Vec::new();
    for i in 0..n {
        for j in i..n {
            monomials.push(format!("{}*{}", vars[i], vars[j]));
        }
    }
    monomials.extend(vars.iter().cloned());
    monomials.push("1".into());
    let equations = (0..m)
        .map(|_| {
            monomials
                .iter()
                .map(|t| format!("{}*{t}", next()))
                .collect::<Vec<_>>()
                .join(" + ")
        })
        .collect();
    System {
        name: format!("random-quadratic-{n}-{m}"),
        vars,
        equations,
    }
}

/// The shape of a random sparse system: unknowns, equations, terms per equation and the
/// highest exponent of a variable in a term.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct SparseShape {
    pub unknowns: usize,
    pub equations: usize,
    pub terms: usize,
    pub max_exponent: u32,
}

/// A system of `shape.equations` polynomials in `shape.unknowns` variables, each with 1 to
/// `shape.terms` terms whose exponents are at most `shape.max_exponent`, and pseudo-random
/// coefficients in [1, 2^31) from `seed`.
pub fn random_sparse(shape: SparseShape, seed: u64) -> System {
    let vars = names("x", 0..shape.unknowns);
    let mut rng = Rng::new(seed);
    let equations = (0..shape.equations)
        .map(|_| {
            let count = 1 + rng.below(shape.terms as u64) as usize;
            let terms: Vec<String> = (0..count)
                .map(|_| {
                    let coefficient = 1 + (rng.next_u64() >> 33);
                    let factors: Vec<String> = vars
                        .iter()
                        .filter_map(|v| match rng.below(u64::from(shape.max_exponent) + 1) {
                            0 => None,
                            1 => Some(v.clone()),
                            e => Some(format!("{v}^{e}")),
                        })
                        .collect();
                    std::iter::once(coefficient.to_string())
                        .chain(factors)
                        .collect::<Vec<_>>()
                        .join("*")
                })
                .collect();
            terms.join(" + ")
        })
        .collect();
    System {
        name: format!(
            "random-sparse-{}-{}-{seed}",
            shape.unknowns, shape.equations
        ),
        vars,
        equations,
    }
}

/// The suite of small random systems for lex and elimination bases: case `k` of 200, in two to
/// four unknowns, exponents at most two, seeded by `k`.
pub fn lex_suite_case(k: u64) -> System {
    let shape = SparseShape {
        unknowns: 2 + (k % 3) as usize,
        equations: 2 + (k / 3 % 2) as usize,
        terms: 4,
        max_exponent: 2,
    };
    random_sparse(shape, 1000 + k)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shapes_of_the_systems() {
        let c = cyclic(3);
        assert_eq!(
            c.equations,
            vec!["x0 + x1 + x2", "x0*x1 + x1*x2 + x2*x0", "x0*x1*x2 - 1"]
        );
        let k = katsura(2);
        assert_eq!(k.vars, vec!["u0", "u1", "u2"]);
        assert_eq!(k.equations[0], "u2 + u1 + u0 + u1 + u2 - 1");
        assert_eq!(k.equations.len(), 3);
        let e = eco(3);
        assert_eq!(
            e.equations,
            vec!["(x1 + x1*x2)*x3 - 1", "(x2)*x3 - 2", "x1 + x2 + 1"]
        );
        assert_eq!(
            noon(2).equations,
            vec!["10*x1*(x2^2) - 11*x1 + 10", "10*x2*(x1^2) - 11*x2 + 10"]
        );
        let q = random_quadratic(3, 4, 1);
        assert_eq!(q.equations.len(), 4);
        assert_eq!(q.equations[0].matches('+').count(), 9);
        assert_ne!(q.equations[0], q.equations[1]);
        let shape = SparseShape {
            unknowns: 3,
            equations: 2,
            terms: 4,
            max_exponent: 2,
        };
        let sparse = random_sparse(shape, 5);
        assert_eq!(sparse.equations.len(), 2);
        assert!(sparse.equations.iter().all(|e| e.matches('+').count() < 4));
        assert!(!sparse.equations.iter().any(|e| e.contains("^3")));
        assert_eq!(sparse, random_sparse(shape, 5));
    }
}
