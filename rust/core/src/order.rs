//! Monomial orders: lex, graded lex, graded reverse lex, weight orders refined by a tie-break
//! order, and block (product) orders whose blocks are any partition of the variables.
//! Definitions as in Cox, Little and O'Shea, *Ideals, Varieties, and Algorithms* (1992), §2.2.

use crate::error::{Error, Result};
use crate::monomial::Monomial;
use std::cmp::Ordering;

#[derive(Clone, Debug, PartialEq, Eq)]
pub enum MonomialOrder {
    Lex,
    Grlex,
    Grevlex,
    /// Compare by the weighted degree first, then by `tie`. Weights are non-negative.
    Weight {
        weights: Vec<u64>,
        tie: Box<MonomialOrder>,
    },
    /// Compare block by block; each block orders its own variables (global indices).
    Block(Vec<OrderBlock>),
}

#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OrderBlock {
    pub order: MonomialOrder,
    pub vars: Vec<usize>,
}

impl MonomialOrder {
    /// Orders read by name: `lex`, `grlex`, `grevlex`.
    pub fn by_name(name: &str) -> Result<Self> {
        match name {
            "lex" => Ok(MonomialOrder::Lex),
            "grlex" => Ok(MonomialOrder::Grlex),
            "grevlex" => Ok(MonomialOrder::Grevlex),
            other => Err(Error::invalid(format!(
                "unknown monomial order '{other}': expected lex, grlex or grevlex"
            ))),
        }
    }

    /// Block order with the given blocks; they must partition 0..n.
    pub fn block(blocks: Vec<OrderBlock>, n: usize) -> Result<Self> {
        let mut seen = vec![false; n];
        for b in &blocks {
            if matches!(b.order, MonomialOrder::Block(_)) {
                return Err(Error::invalid(
                    "a block of a block order must be lex, grlex, grevlex or a weight order",
                ));
            }
            for &v in &b.vars {
                if v >= n || seen[v] {
                    return Err(Error::invalid(format!(
                        "block order: variable index {v} is out of range or in two blocks"
                    )));
                }
                seen[v] = true;
            }
            b.order.validate(b.vars.len())?;
        }
        if let Some(v) = seen.iter().position(|s| !s) {
            return Err(Error::invalid(format!(
                "block order: variable index {v} is in no block"
            )));
        }
        Ok(MonomialOrder::Block(blocks))
    }

    /// Elimination order: the variables `first` are greater than every monomial in the rest;
    /// each block is ordered by grevlex.
    pub fn elimination(first: &[usize], n: usize) -> Self {
        let rest: Vec<usize> = (0..n).filter(|v| !first.contains(v)).collect();
        let mut blocks = vec![];
        if !first.is_empty() {
            blocks.push(OrderBlock {
                order: MonomialOrder::Grevlex,
                vars: first.to_vec(),
            });
        }
        if !rest.is_empty() {
            blocks.push(OrderBlock {
                order: MonomialOrder::Grevlex,
                vars: rest,
            });
        }
        MonomialOrder::Block(blocks)
    }

    /// Checks that the order makes sense for `n` variables.
    pub fn validate(&self, n: usize) -> Result<()> {
        match self {
            MonomialOrder::Weight { weights, tie } => {
                if weights.len() != n {
                    return Err(Error::invalid(format!(
                        "weight order: {} weights for {n} variables",
                        weights.len()
                    )));
                }
                tie.validate(n)
            }
            MonomialOrder::Block(blocks) => MonomialOrder::block(blocks.clone(), n).map(|_| ()),
            _ => Ok(()),
        }
    }

    /// Whether a larger total degree always means a larger monomial.
    pub fn is_degree_compatible(&self) -> bool {
        match self {
            MonomialOrder::Grlex | MonomialOrder::Grevlex => true,
            MonomialOrder::Weight { weights, .. } => weights
                .first()
                .is_some_and(|w| *w > 0 && weights.iter().all(|v| v == w)),
            _ => false,
        }
    }

    #[inline]
    pub fn cmp(&self, a: &Monomial, b: &Monomial) -> Ordering {
        match self {
            MonomialOrder::Lex => lex(a.exponents(), b.exponents()),
            MonomialOrder::Grlex => a
                .degree()
                .cmp(&b.degree())
                .then_with(|| lex(a.exponents(), b.exponents())),
            MonomialOrder::Grevlex => a
                .degree()
                .cmp(&b.degree())
                .then_with(|| revlex(a.exponents(), b.exponents())),
            _ => self.cmp_on(a.exponents(), b.exponents(), None),
        }
    }

    /// Comparison of the monomials whose exponents are x(0), ..., x(n - 1) and y(0), ...,
    /// y(n - 1): for exponents computed on the fly (a quotient times a monomial, say) without
    /// building either monomial (lex, grlex and grevlex; other orders build both).
    pub fn cmp_by(&self, n: usize, x: impl Fn(usize) -> u32, y: impl Fn(usize) -> u32) -> Ordering {
        let degree = |f: &dyn Fn(usize) -> u32| (0..n).map(|v| u64::from(f(v))).sum::<u64>();
        let first_difference = |vars: &mut dyn Iterator<Item = usize>, flip: bool| {
            vars.map(|v| {
                if flip {
                    y(v).cmp(&x(v))
                } else {
                    x(v).cmp(&y(v))
                }
            })
            .find(|o| o.is_ne())
            .unwrap_or(Ordering::Equal)
        };
        match self {
            MonomialOrder::Lex => first_difference(&mut (0..n), false),
            MonomialOrder::Grlex => degree(&x)
                .cmp(&degree(&y))
                .then_with(|| first_difference(&mut (0..n), false)),
            MonomialOrder::Grevlex => degree(&x)
                .cmp(&degree(&y))
                .then_with(|| first_difference(&mut (0..n).rev(), true)),
            _ => {
                let (a, b): (Vec<u32>, Vec<u32>) =
                    ((0..n).map(&x).collect(), (0..n).map(&y).collect());
                self.cmp_on(&a, &b, None)
            }
        }
    }

    /// Comparison restricted to the variables `vars` (all when `None`).
    fn cmp_on(&self, a: &[u32], b: &[u32], vars: Option<&[usize]>) -> Ordering {
        let n = vars.map_or(a.len(), |v| v.len());
        let at = |e: &[u32], i: usize| vars.map_or(e[i], |v| e[v[i]]);
        let lex_on = || {
            (0..n)
                .map(|i| at(a, i).cmp(&at(b, i)))
                .find(|o| o.is_ne())
                .unwrap_or(Ordering::Equal)
        };
        let revlex_on = || {
            (0..n)
                .rev()
                .map(|i| at(b, i).cmp(&at(a, i)))
                .find(|o| o.is_ne())
                .unwrap_or(Ordering::Equal)
        };
        let deg = |e: &[u32]| (0..n).map(|i| at(e, i) as u64).sum::<u64>();
        match self {
            MonomialOrder::Lex => lex_on(),
            MonomialOrder::Grlex => deg(a).cmp(&deg(b)).then_with(lex_on),
            MonomialOrder::Grevlex => deg(a).cmp(&deg(b)).then_with(revlex_on),
            MonomialOrder::Weight { weights, tie } => {
                let w = |e: &[u32]| {
                    (0..n)
                        .map(|i| weights[i] as u128 * at(e, i) as u128)
                        .sum::<u128>()
                };
                w(a).cmp(&w(b)).then_with(|| tie.cmp_on(a, b, vars))
            }
            MonomialOrder::Block(blocks) => blocks
                .iter()
                .map(|blk| match vars {
                    // Blocks never nest, so at the top level a block's own indices are global.
                    None => blk.order.cmp_on(a, b, Some(&blk.vars)),
                    Some(v) => {
                        let idx: Vec<usize> = blk.vars.iter().map(|&j| v[j]).collect();
                        blk.order.cmp_on(a, b, Some(&idx))
                    }
                })
                .find(|o| o.is_ne())
                .unwrap_or(Ordering::Equal),
        }
    }
}

#[inline]
fn lex(a: &[u32], b: &[u32]) -> Ordering {
    a.cmp(b)
}

/// Reverse lex tie-break of grevlex: the monomial with the smaller exponent in the last
/// variable where they differ is the larger.
#[inline]
fn revlex(a: &[u32], b: &[u32]) -> Ordering {
    for i in (0..a.len()).rev() {
        if a[i] != b[i] {
            return b[i].cmp(&a[i]);
        }
    }
    Ordering::Equal
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn mono(e: &[u32]) -> Monomial {
        Monomial::from_exponents(e.to_vec()).unwrap()
    }

    fn orders() -> Vec<MonomialOrder> {
        vec![
            MonomialOrder::Lex,
            MonomialOrder::Grlex,
            MonomialOrder::Grevlex,
            MonomialOrder::Weight {
                weights: vec![1, 2, 3],
                tie: Box::new(MonomialOrder::Grevlex),
            },
            MonomialOrder::elimination(&[1], 3),
            MonomialOrder::block(
                vec![
                    OrderBlock {
                        order: MonomialOrder::Lex,
                        vars: vec![2, 0],
                    },
                    OrderBlock {
                        order: MonomialOrder::Grlex,
                        vars: vec![1],
                    },
                ],
                3,
            )
            .unwrap(),
        ]
    }

    #[test]
    fn textbook_examples() {
        // Cox–Little–O'Shea §2.2: x y^2 z^3 ... examples: with x > y > z,
        // lex: x y^2 > y^3 z^4; grlex: x^2 y^3 z... use the classic pairs.
        let (a, b) = (mono(&[1, 2, 0]), mono(&[0, 3, 4]));
        assert_eq!(MonomialOrder::Lex.cmp(&a, &b), Ordering::Greater);
        let (a, b) = (mono(&[1, 2, 4]), mono(&[1, 1, 5]));
        assert_eq!(MonomialOrder::Grlex.cmp(&a, &b), Ordering::Greater);
        let (a, b) = (mono(&[4, 7, 1]), mono(&[4, 2, 3]));
        assert_eq!(MonomialOrder::Grevlex.cmp(&a, &b), Ordering::Greater);
        let (a, b) = (mono(&[1, 5, 2]), mono(&[4, 1, 3]));
        assert_eq!(MonomialOrder::Grevlex.cmp(&a, &b), Ordering::Greater);
    }

    #[test]
    fn bad_blocks_are_rejected() {
        let b = |vars: Vec<usize>| OrderBlock {
            order: MonomialOrder::Lex,
            vars,
        };
        assert!(MonomialOrder::block(vec![b(vec![0]), b(vec![0, 1])], 2).is_err());
        assert!(MonomialOrder::block(vec![b(vec![0])], 2)
            .unwrap_err()
            .to_string()
            .contains("in no block"));
    }

    proptest! {
        /// Comparing exponents given as functions is comparing the monomials they make.
        #[test]
        fn comparison_by_exponent_functions_agrees(a in proptest::collection::vec(0u32..6, 3),
                                                   b in proptest::collection::vec(0u32..6, 3)) {
            for o in orders() {
                prop_assert_eq!(o.cmp_by(3, |v| a[v], |v| b[v]), o.cmp(&mono(&a), &mono(&b)));
            }
        }

        /// Total order, compatible with multiplication, and 1 is least (a well-order on N^n).
        #[test]
        fn order_axioms(a in proptest::collection::vec(0u32..6, 3),
                        b in proptest::collection::vec(0u32..6, 3),
                        c in proptest::collection::vec(0u32..6, 3)) {
            let (a, b, c) = (mono(&a), mono(&b), mono(&c));
            for o in orders() {
                prop_assert_eq!(o.cmp(&a, &b), o.cmp(&b, &a).reverse());
                prop_assert_eq!(o.cmp(&a, &b) == Ordering::Equal, a == b);
                prop_assert_eq!(o.cmp(&a, &b), o.cmp(&a.mul(&c).unwrap(), &b.mul(&c).unwrap()));
                prop_assert_ne!(o.cmp(&Monomial::one(3), &a), Ordering::Greater);
                if o.cmp(&a, &b).is_lt() && o.cmp(&b, &c).is_lt() {
                    prop_assert!(o.cmp(&a, &c).is_lt());
                }
            }
        }
    }
}
