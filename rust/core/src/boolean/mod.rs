//! Boolean systems: polynomial equations over GF(2) whose solutions are sought in GF(2)^n, i.e.
//! the ideal I + (x_1^2 + x_1, ..., x_n^2 + x_n), worked in the Boolean ring
//! GF(2)[x] / (x_i^2 + x_i) where every polynomial is a sum of square-free monomials.
//!
//! - [`monomial`], [`poly`]: square-free monomials as bit sets and [`BooleanRing`] /
//!   [`BoolPoly`], with conversion from and to the general polynomials over GF(2) and parsing
//!   through the general reader.
//! - [`f4`] (with [`pairs`], [`symbolic`], [`linalg`]): reduced Boolean Gröbner bases; the field
//!   equations stay implicit and never appear in a basis unless asked for
//!   ([`BooleanBasis::with_field_equations`]).
//! - [`solutions`]: the number of solutions (standard monomials) and the points of a basis.
//! - [`exhaustive`]: Gray-code enumeration with bit-sliced incremental evaluation.
//! - [`hybrid`]: guess k variables, run the engine on the rest.
//! - [`choose`]: which method is cheapest, from a cost estimate, and why.
//!
//! What the results prove: a basis, a count or a list of solutions is exact (no probabilistic
//! step anywhere); the method choice is an estimate and only affects the time taken.

pub mod choose;
pub mod exhaustive;
pub mod f4;
pub mod hybrid;
pub mod linalg;
pub mod monomial;
pub mod pairs;
pub mod poly;
pub mod solutions;
pub mod symbolic;

#[cfg(test)]
mod tests;

pub use choose::{Choice, Estimates, Method};
pub use monomial::BoolOrder;
pub use poly::{BoolPoly, BooleanRing};

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::PrimeField;
use crate::groebner::Stats;
use crate::poly::Poly;
use monomial::Bits;
use num_bigint::BigUint;

/// Calls `$f::<W>(args)` with W the smallest supported word count that holds `$words` words.
macro_rules! by_width {
    ($words:expr, $f:ident ( $($arg:expr),* $(,)? )) => {
        match $words {
            1 => $f::<1>($($arg),*),
            2 => $f::<2>($($arg),*),
            3..=4 => $f::<4>($($arg),*),
            5..=8 => $f::<8>($($arg),*),
            _ => $f::<16>($($arg),*),
        }
    };
}

fn threads(control: &Control) -> usize {
    control
        .limits
        .threads
        .unwrap_or_else(rayon::current_num_threads)
        .max(1)
}

fn to_bits<const W: usize>(ring: &BooleanRing, gens: &[BoolPoly]) -> Result<Vec<Vec<Bits<W>>>> {
    gens.iter()
        .map(|g| {
            if g.words() != ring.words() {
                return Err(Error::invalid(
                    "a polynomial belongs to a Boolean ring with another number of variables",
                ));
            }
            Ok(g.to_bits::<W>())
        })
        .collect()
}

fn from_bits<const W: usize>(ring: &BooleanRing, polys: &[Vec<Bits<W>>]) -> Vec<BoolPoly> {
    polys
        .iter()
        .map(|p| BoolPoly::from_bits(ring.words(), p))
        .collect()
}

fn point<const W: usize>(nvars: usize, p: &Bits<W>) -> Vec<bool> {
    (0..nvars).map(|v| p.has_var(v)).collect()
}

/// A reduced Boolean Gröbner basis: G such that G with the field equations is the reduced
/// Gröbner basis of I + (x_i^2 + x_i) in the ring's order; sorted by decreasing leading
/// monomial; `[1]` when there are no solutions.
#[derive(Clone, Debug)]
pub struct BooleanBasis {
    pub ring: BooleanRing,
    pub polys: Vec<BoolPoly>,
    pub stats: Stats,
}

/// The reduced Boolean Gröbner basis of the ideal of `gens` (with the field equations).
pub fn basis(ring: &BooleanRing, gens: &[BoolPoly], control: &Control) -> Result<BooleanBasis> {
    fn run<const W: usize>(
        ring: &BooleanRing,
        gens: &[BoolPoly],
        control: &Control,
    ) -> Result<BooleanBasis> {
        let gens = to_bits::<W>(ring, gens)?;
        let (polys, stats) =
            control.on_threads(|| f4::compute(ring.order, ring.nvars(), &gens, control))?;
        Ok(BooleanBasis {
            ring: ring.clone(),
            polys: from_bits(ring, &polys),
            stats,
        })
    }
    by_width!(ring.words(), run(ring, gens, control))
}

impl BooleanBasis {
    /// Whether the system has no solution in GF(2)^n.
    pub fn is_unit(&self) -> bool {
        self.polys.len() == 1 && self.polys[0].is_one()
    }

    /// The normal forms of `fs` (no monomial divisible by a leading monomial of the basis).
    pub fn normal_forms(&self, fs: &[BoolPoly], control: &Control) -> Result<Vec<BoolPoly>> {
        fn run<const W: usize>(
            b: &BooleanBasis,
            fs: &[BoolPoly],
            control: &Control,
        ) -> Result<Vec<BoolPoly>> {
            if b.is_unit() {
                return Ok(vec![b.ring.zero(); fs.len()]);
            }
            let basis = to_bits::<W>(&b.ring, &b.polys)?;
            let fs = to_bits::<W>(&b.ring, fs)?;
            let reducers =
                symbolic::Reducers::new(&basis, &vec![true; basis.len()], b.ring.nvars());
            let out = symbolic::normal_forms(&fs, &reducers, b.ring.order, control)?;
            Ok(from_bits(&b.ring, &out))
        }
        by_width!(self.ring.words(), run(self, fs, control))
    }

    pub fn normal_form(&self, f: &BoolPoly, control: &Control) -> Result<BoolPoly> {
        Ok(self
            .normal_forms(std::slice::from_ref(f), control)?
            .remove(0))
    }

    /// Whether `f` vanishes on every solution (lies in the ideal with the field equations).
    pub fn contains(&self, f: &BoolPoly, control: &Control) -> Result<bool> {
        Ok(self.normal_form(f, control)?.is_zero())
    }

    /// The number of solutions in GF(2)^n: the number of standard monomials.
    pub fn count_solutions(&self, control: &Control) -> Result<BigUint> {
        fn run<const W: usize>(b: &BooleanBasis, control: &Control) -> Result<BigUint> {
            let leads: Vec<Bits<W>> = b
                .polys
                .iter()
                .map(|p| Bits::from_slice(p.leading_monomial().expect("nonzero")))
                .collect();
            solutions::count_standard(&leads, b.ring.nvars(), control)
        }
        by_width!(self.ring.words(), run(self, control))
    }

    /// The solutions (at most `limit`), each a value per variable, in increasing order of the
    /// number with bit v = x_v.
    pub fn points(&self, limit: Option<usize>, control: &Control) -> Result<Vec<Vec<bool>>> {
        fn run<const W: usize>(
            b: &BooleanBasis,
            limit: Option<usize>,
            control: &Control,
        ) -> Result<Vec<Vec<bool>>> {
            let basis = to_bits::<W>(&b.ring, &b.polys)?;
            let n = b.ring.nvars();
            let points = solutions::points(b.ring.order, n, basis, limit, control)?;
            Ok(points.iter().map(|p| point(n, p)).collect())
        }
        by_width!(self.ring.words(), run(self, limit, control))
    }

    /// The reduced Gröbner basis of I + (x_v^2 + x_v) in GF(2)[x] (for a caller that asks to
    /// see the field equations): the basis as general polynomials, with x_v^2 + x_v for every
    /// variable that is not a leading monomial (when x_v + c is in the basis, x_v^2 + x_v =
    /// (x_v + c)(x_v + c + 1) is redundant), sorted by decreasing leading monomial; `[1]` for
    /// the unit ideal.
    pub fn with_field_equations(&self) -> Result<Vec<Poly<PrimeField>>> {
        let general = self.ring.general_ring();
        let mut out = self
            .polys
            .iter()
            .map(|p| self.ring.to_poly(general, p))
            .collect::<Result<Vec<_>>>()?;
        if self.is_unit() {
            return Ok(out);
        }
        let linear_lead = |v: usize| {
            let x = Bits::<16>::var(v);
            self.polys
                .iter()
                .any(|p| Bits::<16>::from_slice(p.leading_monomial().expect("nonzero")) == x)
        };
        for v in (0..self.ring.nvars()).filter(|&v| !linear_lead(v)) {
            let x = general.var(v);
            out.push(general.add(&general.mul(&x, &x)?, &x));
        }
        out.sort_by(|a, b| {
            let lead = |p: &Poly<PrimeField>| p.leading_monomial().expect("nonzero").clone();
            general.cmp(&lead(b), &lead(a))
        });
        Ok(out)
    }
}

/// The cheapest method for `gens` by the cost estimate of [`choose`], on the threads `control`
/// allows.
pub fn choose_method(ring: &BooleanRing, gens: &[BoolPoly], control: &Control) -> Choice {
    let degrees: Vec<u32> = gens.iter().filter_map(|g| g.degree()).collect();
    choose::choose(ring.nvars(), &degrees, threads(control))
}

/// Solutions of a Boolean system and how they were found.
#[derive(Clone, Debug)]
pub struct Solutions {
    /// The points (at most the limit), each a value per variable, in increasing order of the
    /// number with bit v = x_v.
    pub points: Vec<Vec<bool>>,
    /// How many solutions there are; `None` when the search stopped at the limit.
    pub count: Option<BigUint>,
    /// The method used and why.
    pub choice: Choice,
    /// The engine's statistics when the method was `Basis`.
    pub stats: Option<Stats>,
}

/// The solutions of `gens` in GF(2)^n (at most `limit`) by `method` (`Auto`: the estimate's
/// choice, reported in the result).
pub fn solve(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    method: Method,
    limit: Option<usize>,
    control: &Control,
) -> Result<Solutions> {
    run_method(ring, gens, method, limit, false, control)
}

/// The number of solutions of `gens` in GF(2)^n by `method` (no points are kept).
pub fn count(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    method: Method,
    control: &Control,
) -> Result<Solutions> {
    run_method(ring, gens, method, None, true, control)
}

/// Most points a call returns when the caller set no limit (a list of 2^26 points takes over
/// 2 GB as vectors of booleans); more raise `ResourceLimit`.
pub const MAX_POINTS: usize = 1 << 26;

fn run_method(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    method: Method,
    limit: Option<usize>,
    count_only: bool,
    control: &Control,
) -> Result<Solutions> {
    let unlimited = limit.is_none() && !count_only;
    let limit = if unlimited {
        Some(MAX_POINTS + 1)
    } else {
        limit
    };
    let found = run_limited(ring, gens, method, limit, count_only, control)?;
    if unlimited && found.points.len() > MAX_POINTS {
        return Err(too_many_points());
    }
    Ok(found)
}

fn too_many_points() -> Error {
    Error::ResourceLimit(format!(
        "the system has more than {MAX_POINTS} solutions: ask for a count or set a limit"
    ))
}

fn run_limited(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    method: Method,
    limit: Option<usize>,
    count_only: bool,
    control: &Control,
) -> Result<Solutions> {
    let choice = resolve_method(ring, gens, method, control);
    control.on_threads(|| match choice.method {
        Method::Exhaustive => {
            let found = exhaustive::search(ring, gens, limit, count_only, control)?;
            let points = found
                .points
                .iter()
                .map(|&x| point(ring.nvars(), &Bits::<1>([x])))
                .collect();
            Ok(Solutions {
                points,
                count: found.count.map(BigUint::from),
                choice,
                stats: None,
            })
        }
        Method::Basis => {
            let b = basis(ring, gens, control)?;
            let count = b.count_solutions(control)?;
            if limit == Some(MAX_POINTS + 1) && count > BigUint::from(MAX_POINTS) {
                // Too many to list: the error without the enumeration.
                return Err(too_many_points());
            }
            let points = if count_only {
                Vec::new()
            } else {
                b.points(limit, control)?
            };
            let complete = limit.is_none_or(|l| BigUint::from(l) >= count);
            Ok(Solutions {
                points,
                count: complete.then_some(count),
                choice,
                stats: Some(b.stats),
            })
        }
        Method::Hybrid { guess } => {
            let k = guess
                .unwrap_or(choice.estimates.hybrid_guess)
                .min(ring.nvars());
            let guessed: Vec<usize> = (ring.nvars() - k..ring.nvars()).collect();
            by_width!(
                ring.words(),
                run_hybrid(ring, gens, &guessed, limit, count_only, choice, control)
            )
        }
        Method::Auto => unreachable!("resolve never returns Auto"),
    })
}

fn run_hybrid<const W: usize>(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    guessed: &[usize],
    limit: Option<usize>,
    count_only: bool,
    choice: Choice,
    control: &Control,
) -> Result<Solutions> {
    let bits = to_bits::<W>(ring, gens)?;
    let n = ring.nvars();
    let found = hybrid::solve(ring.order, n, &bits, guessed, limit, count_only, control)?;
    Ok(Solutions {
        points: found.points.iter().map(|p| point(n, p)).collect(),
        count: found.count,
        choice,
        stats: None,
    })
}

/// The concrete method for a request: the estimate's choice for `Auto`, otherwise the request
/// with the estimate's reasoning noted.
pub fn resolve_method(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    method: Method,
    control: &Control,
) -> Choice {
    let estimate = choose_method(ring, gens, control);
    match method {
        Method::Auto => estimate,
        requested => {
            let method = match requested {
                Method::Hybrid { guess: None } => Method::Hybrid {
                    guess: Some(estimate.estimates.hybrid_guess),
                },
                other => other,
            };
            Choice {
                method,
                reason: format!(
                    "requested by the caller (the estimate would choose {})",
                    estimate
                ),
                estimates: estimate.estimates,
            }
        }
    }
}
