//! Exhaustive search for the solutions of a Boolean system by Gray-code enumeration with
//! incremental evaluation (Bouillaguet, Chen, Cheng, Chou, Niederhagen, Shamir and Yang,
//! "Fast exhaustive search for polynomial systems in F2", 2010).
//!
//! The equations are bit-sliced: bit e of a word belongs to equation e, so one XOR updates the
//! values of 64 equations. Candidates are visited in Gray-code order, x_i = g_i ⊕ g_{i+1}
//! with g(i) = i ⊕ (i >> 1), so consecutive points differ in one variable k1 = ctz(i) and
//! F(g(i)) = F(g(i-1)) ⊕ D_{k1}F(g(i-1)), where D_k F(x) = F(x) ⊕ F(x ⊕ e_k). For a system of
//! degree d the derivatives D_{k1}...D_{kj}F along the lowest j set bits of i are themselves
//! walked in Gray-code order over the higher bits, so each is updated by one XOR with the next
//! deeper one, down to the constant d-th derivatives; for quadratic systems a candidate costs
//! two XORs. Systems with more than 64 equations are filtered: the first 64 are walked, and a
//! candidate that satisfies them is checked against the rest.
//!
//! Work is split over threads by fixing the highest variables (one Gray walk per value), and
//! every walk checks `control` and the other walks' stop request every 2^16 candidates.

use super::poly::{BoolPoly, BooleanRing};
use crate::control::Control;
use crate::error::{Error, Result};
use rayon::prelude::*;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// Most variables the search enumerates.
pub const MAX_VARIABLES: usize = 64;

/// Candidates per block between checks of `control` and of the stop flag.
const BLOCK: u64 = 1 << 16;

/// Largest derivative table (entries) a walk may use: (n + 1)^d words for degree d.
const MAX_TABLE: usize = 1 << 24;

/// What the search found: the solutions (bit v of a point is x_v), sorted, at most `limit` of
/// them; and how many there are when the search ran to the end (`None` when it stopped at the
/// limit).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Found {
    pub points: Vec<u64>,
    pub count: Option<u128>,
}

/// The system as monomial masks (bit v = x_v), one list per equation.
struct System {
    nvars: usize,
    equations: Vec<Vec<u64>>,
    degree: usize,
}

impl System {
    fn new(ring: &BooleanRing, gens: &[BoolPoly]) -> Result<Self> {
        if ring.nvars() > MAX_VARIABLES {
            return Err(Error::invalid(format!(
                "exhaustive search enumerates at most {MAX_VARIABLES} variables; the system has {}",
                ring.nvars()
            )));
        }
        let equations: Vec<Vec<u64>> = gens
            .iter()
            .filter(|g| !g.is_zero())
            .map(|g| g.monomials().map(|m| m[0]).collect())
            .collect();
        let degree = equations
            .iter()
            .flatten()
            .map(|m| m.count_ones() as usize)
            .max()
            .unwrap_or(0);
        Ok(System {
            nvars: ring.nvars(),
            equations,
            degree,
        })
    }

    /// Whether the equations after the first 64 vanish at `x`.
    fn rest_vanish(&self, x: u64) -> bool {
        self.equations
            .iter()
            .skip(64)
            .all(|eq| eq.iter().filter(|&&m| m & !x == 0).count() % 2 == 0)
    }
}

/// The derivative tables of one Gray walk over the variables x_0..x_{n-1}, the variables
/// above fixed to `high`.
struct Walk {
    n: usize,
    degree: usize,
    high: u64,
    /// F(0) on the first 64 equations.
    constant: u64,
    /// `levels[j - 1]` holds D_{k1}...D_{kj}F (k1 < ... < kj) at index k1 + s·k2 + s²·k3 ...,
    /// s = n + 1; index n stands for "no such bit" and holds zero.
    levels: Vec<Vec<u64>>,
}

fn gray(i: u64) -> u64 {
    i ^ (i >> 1)
}

impl Walk {
    /// Specializes the first 64 equations at the fixed high variables and fills the tables:
    /// the entry of k1 < ... < kj is the derivative at g(i0 - 1), i0 = 2^k1 + ... + 2^kj, the
    /// point before the first step that uses it. For a monomial m ⊇ T, D_T m = the product of
    /// m \ T, so it adds its coefficients when m \ T lies in that point.
    fn new(system: &System, n: usize, high: u64) -> Result<Self> {
        let degree = system.degree.max(2);
        let s = n + 1;
        if s.checked_pow(degree as u32)
            .is_none_or(|size| size > MAX_TABLE)
        {
            return Err(Error::ResourceLimit(format!(
                "exhaustive search on a system of degree {} in {n} variables needs tables of \
                 {s}^{} words",
                system.degree, degree
            )));
        }
        let low_mask = if n == 64 { !0 } else { (1u64 << n) - 1 };
        let mut walk = Walk {
            n,
            degree,
            high,
            constant: 0,
            levels: (1..=degree).map(|j| vec![0u64; s.pow(j as u32)]).collect(),
        };
        for (e, eq) in system.equations.iter().take(64).enumerate() {
            let bit = 1u64 << e;
            for &m in eq {
                // A fixed variable set to 0 kills the monomial, set to 1 drops out of it.
                if m & !low_mask & !high != 0 {
                    continue;
                }
                walk.add_monomial(m & low_mask, bit);
            }
        }
        Ok(walk)
    }

    fn add_monomial(&mut self, m: u64, bit: u64) {
        if m == 0 {
            self.constant ^= bit;
            return;
        }
        let s = self.n as u64 + 1;
        let mut t = m;
        loop {
            // Every nonempty subset t of m.
            let before = gray(t - 1);
            if (m & !t) & !before == 0 {
                let (mut index, mut scale, mut rest) = (0u64, 1u64, t);
                while rest != 0 {
                    index += scale * rest.trailing_zeros() as u64;
                    scale *= s;
                    rest &= rest - 1;
                }
                self.levels[t.count_ones() as usize - 1][index as usize] ^= bit;
            }
            t = (t - 1) & m;
            if t == 0 {
                break;
            }
        }
    }

    /// Visits the 2^n points; `found(x)` is called with each point where the first 64
    /// equations vanish (high variables included) and returns false to stop the walk.
    fn run(
        self,
        control: &Control,
        stop: &AtomicBool,
        found: &mut impl FnMut(u64) -> bool,
    ) -> Result<()> {
        if self.constant == 0 && !found(self.high) {
            return Ok(());
        }
        if self.degree <= 2 {
            self.run_quadratic(control, stop, found)
        } else {
            self.run_general(control, stop, found)
        }
    }

    /// Degree ≤ 2: the first derivatives change by the constant second derivatives.
    fn run_quadratic(
        self,
        control: &Control,
        stop: &AtomicBool,
        found: &mut impl FnMut(u64) -> bool,
    ) -> Result<()> {
        // Fixed-size tables with stride 65, so that indices from trailing_zeros need no checks.
        let s = self.n + 1;
        let mut d1 = [0u64; 65];
        d1[..s].copy_from_slice(&self.levels[0]);
        let mut d2 = vec![0u64; 65 * 65].into_boxed_slice();
        for k1 in 0..s {
            for k2 in 0..s {
                d2[k1 + 65 * k2] = self.levels[1][k1 + s * k2];
            }
        }
        let d2: &[u64; 65 * 65] = (&*d2).try_into().expect("65 x 65 table");
        let top = 1u64 << self.n;
        let mut y = self.constant;
        // Steps come in pairs: an odd i flips x_0 (k1 = 0), whose derivative stays in a
        // register; the even i after it flips a higher variable.
        let mut d1_0 = d1[0];
        let high = self.high;
        in_blocks(top, control, stop, |start, end| {
            // Locals for the loop, so that the running values stay in registers.
            let (mut value, mut first) = (y, d1_0);
            for odd in (start..end).step_by(2) {
                let k2 = ((odd & (odd - 1)) | top).trailing_zeros() as usize;
                first ^= d2[65 * k2];
                value ^= first;
                if value == 0 && !found(gray(odd) | high) {
                    return false;
                }
                let even = odd + 1;
                if even == top {
                    break;
                }
                let k1 = even.trailing_zeros() as usize;
                let k2 = ((even & (even - 1)) | top).trailing_zeros() as usize;
                d1[k1] ^= d2[k1 + 65 * k2];
                value ^= d1[k1];
                if value == 0 && !found(gray(even) | high) {
                    return false;
                }
            }
            (y, d1_0) = (value, first);
            true
        })
    }

    /// Any degree: along the lowest d set bits k1 < ... < kd of i, each derivative is updated
    /// by the next deeper one (deepest first), then F by the first.
    fn run_general(
        mut self,
        control: &Control,
        stop: &AtomicBool,
        found: &mut impl FnMut(u64) -> bool,
    ) -> Result<()> {
        let (d, s) = (self.degree, self.n + 1);
        let top = 1u64 << self.n;
        let mut y = self.constant;
        let mut k = vec![0usize; d];
        let mut index = vec![0usize; d];
        let high = self.high;
        let levels = &mut self.levels;
        in_blocks(top, control, stop, |start, end| {
            for i in start..end {
                let mut rest = i;
                let mut scale = 1;
                for j in 0..d {
                    k[j] = (rest | top).trailing_zeros() as usize;
                    rest &= rest.wrapping_sub(1);
                    index[j] = if j == 0 {
                        k[0]
                    } else {
                        index[j - 1] + scale * k[j]
                    };
                    scale *= s;
                }
                for j in (1..d).rev() {
                    let deeper = levels[j][index[j]];
                    levels[j - 1][index[j - 1]] ^= deeper;
                }
                y ^= levels[0][index[0]];
                if y == 0 && !found(gray(i) | high) {
                    return false;
                }
            }
            true
        })
    }
}

/// Runs `block` on the steps 1..top in blocks of [`BLOCK`] (each starting at an odd step),
/// checking `control` and the other walks' stop request between blocks; `block` returns false
/// to end the walk.
fn in_blocks(
    top: u64,
    control: &Control,
    stop: &AtomicBool,
    mut block: impl FnMut(u64, u64) -> bool,
) -> Result<()> {
    let mut start = 1u64;
    while start < top {
        let end = (start + BLOCK).min(top);
        if !block(start, end) {
            return Ok(());
        }
        start = end;
        control.check()?;
        if stop.load(Ordering::Relaxed) {
            return Ok(());
        }
    }
    Ok(())
}

/// Bits fixed to split the work: enough walks for every thread to get several, none shorter
/// than 2^20 candidates.
fn split_bits(n: usize) -> usize {
    n.saturating_sub(20).min(6)
}

/// All solutions of the system in GF(2)^n (at most `limit` kept; `count_only`: none kept, only
/// counted), on the threads of the current rayon pool.
pub fn search(
    ring: &BooleanRing,
    gens: &[BoolPoly],
    limit: Option<usize>,
    count_only: bool,
    control: &Control,
) -> Result<Found> {
    let system = System::new(ring, gens)?;
    let n = system.nvars;
    let fixed = split_bits(n);
    let walked = n - fixed;
    let stop = AtomicBool::new(false);
    let kept = AtomicUsize::new(0);
    let limit = if count_only { None } else { limit };
    let chunks: Vec<Result<(Vec<u64>, u128)>> = (0..1u64 << fixed)
        .into_par_iter()
        .map(|chunk| {
            let walk = Walk::new(&system, walked, chunk << walked)?;
            let mut points = Vec::new();
            let mut count = 0u128;
            walk.run(control, &stop, &mut |x| {
                if !system.rest_vanish(x) {
                    return true;
                }
                count += 1;
                if count_only {
                    return true;
                }
                if let Some(limit) = limit {
                    if kept.fetch_add(1, Ordering::Relaxed) >= limit {
                        stop.store(true, Ordering::Relaxed);
                        return false;
                    }
                }
                points.push(x);
                true
            })?;
            Ok((points, count))
        })
        .collect();
    let mut points = Vec::new();
    let mut count = 0u128;
    for chunk in chunks {
        let (p, c) = chunk?;
        points.extend(p);
        count += c;
    }
    points.sort_unstable();
    let stopped = stop.load(Ordering::Relaxed);
    if let Some(limit) = limit {
        points.truncate(limit);
    }
    Ok(Found {
        points,
        count: (!stopped).then_some(count),
    })
}
