//! Which method solves a Boolean system fastest, from a cost estimate: exhaustive search, the
//! Gröbner engine, or a hybrid that guesses k variables and runs the engine on the rest
//! (Bettale, Faugère and Perret 2009).
//!
//! - Exhaustive search costs 2^n candidates at a measured rate per thread (see the benchmark
//!   `bench_boolean`), more for systems of higher degree.
//! - The engine is estimated as if the system were semi-regular: its degree of regularity D is
//!   the index of the first non-positive coefficient of (1 + t)^n / Π (1 + t^{d_i}) (Bardet,
//!   Faugère, Salvy and Yang 2005), and its cost that of eliminating a dense Macaulay matrix whose
//!   columns are the M monomials of degree ≤ D: M^3 / 64 word operations, divided by the factor
//!   the Four Russians tables gain. The constants are fitted to measured runs on random systems.
//! - The hybrid with k guessed variables costs 2^k engine runs on n - k variables.
//!
//! A cost estimate is not a proof: structured systems (ciphers) are often far easier for the
//! engine than the semi-regular estimate says, and the caller can override the choice.

use std::fmt;

/// Candidates per second per thread of the quadratic Gray-code walk (measured: see
/// `bench/RESULTS.md`); systems of degree d walk about d - 1 times slower.
pub const EXHAUSTIVE_RATE: f64 = 5.0e8;

/// Word operations per second of the engine's elimination, fitted to the engine's measured
/// times on random quadratic systems with m = 2n (bench `bench_boolean`).
pub const ENGINE_RATE: f64 = 1.0e10;

/// Seconds one engine run costs at least (setting up, a few small matrices), measured on
/// systems of a few variables.
pub const ENGINE_RUN: f64 = 5.0e-5;

/// Seconds (a day) beyond which an estimate no longer decides: when every method is estimated
/// to take longer, the engine is chosen, since it alone can profit from structure (sparse
/// equations, linear ones, the layers of a cipher) that the random-system estimate ignores,
/// while exhaustive search and the hybrid's 2^k runs cost what they cost whatever the system.
pub const HORIZON: f64 = 86_400.0;

/// A method for solving a Boolean system.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Let the cost estimate decide.
    Auto,
    /// Gray-code enumeration of all 2^n points (n ≤ 64).
    Exhaustive,
    /// The Boolean Gröbner engine, then the points of its basis.
    Basis,
    /// Guess `guess` variables (the last ones; `None`: the estimate's best number), run the
    /// engine on each of the 2^guess specialized systems.
    Hybrid { guess: Option<usize> },
}

impl Method {
    /// Methods by name: `auto`, `exhaustive`, `basis`, `hybrid`, `hybrid:K`.
    pub fn by_name(name: &str) -> crate::Result<Self> {
        match name {
            "auto" => Ok(Method::Auto),
            "exhaustive" => Ok(Method::Exhaustive),
            "basis" => Ok(Method::Basis),
            "hybrid" => Ok(Method::Hybrid { guess: None }),
            other => match other.strip_prefix("hybrid:").map(str::parse::<usize>) {
                Some(Ok(k)) => Ok(Method::Hybrid { guess: Some(k) }),
                _ => Err(crate::Error::invalid(format!(
                    "unknown method '{other}': expected auto, exhaustive, basis, hybrid or hybrid:K"
                ))),
            },
        }
    }

    pub fn name(&self) -> &'static str {
        match self {
            Method::Auto => "auto",
            Method::Exhaustive => "exhaustive",
            Method::Basis => "basis",
            Method::Hybrid { .. } => "hybrid",
        }
    }
}

/// Estimated seconds of each method (`None`: not applicable).
#[derive(Clone, Debug, PartialEq)]
pub struct Estimates {
    pub exhaustive: Option<f64>,
    pub basis: f64,
    pub hybrid: Option<f64>,
    /// Variables the best hybrid guesses.
    pub hybrid_guess: usize,
    /// The engine's degree of regularity under the semi-regular assumption.
    pub degree: u32,
}

/// The method chosen, why, and the estimates behind it.
#[derive(Clone, Debug, PartialEq)]
pub struct Choice {
    /// Exhaustive, Basis or Hybrid with its guess count (never Auto).
    pub method: Method,
    /// One or two sentences a user can read.
    pub reason: String,
    pub estimates: Estimates,
}

impl fmt::Display for Choice {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.method.name(), self.reason)
    }
}

/// Coefficients of (1 + t)^n / Π (1 + t^{d_i}) up to degree `up_to`, as floats (they can be
/// huge).
fn series(n: usize, degrees: &[u32], up_to: usize) -> Vec<f64> {
    let mut c: Vec<f64> = (0..=up_to).map(|d| binomial(n, d)).collect();
    for &d in degrees {
        let d = d as usize;
        if d == 0 {
            continue;
        }
        // Divide by 1 + t^d: c_k -= c_{k-d}, in increasing k.
        for k in d..=up_to {
            c[k] -= c[k - d];
        }
    }
    c
}

fn binomial(n: usize, k: usize) -> f64 {
    if k > n {
        return 0.0;
    }
    (0..k).fold(1.0, |acc, i| acc * (n - i) as f64 / (i + 1) as f64)
}

/// The degree of regularity of a semi-regular Boolean system: the first degree whose
/// coefficient is not positive (n + 1 when there is none).
pub fn regularity_degree(n: usize, degrees: &[u32]) -> u32 {
    let c = series(n, degrees, n + 1);
    (0..=n + 1).find(|&d| c[d] <= 0.0).unwrap_or(n + 1) as u32
}

/// Estimated seconds of the engine on n variables (one thread).
pub fn engine_seconds(n: usize, degrees: &[u32]) -> (f64, u32) {
    let d = regularity_degree(n, degrees);
    let columns: f64 = (0..=d as usize).map(|k| binomial(n, k)).sum();
    (ENGINE_RUN + columns.powi(3) / 64.0 / 8.0 / ENGINE_RATE, d)
}

/// Estimated seconds of exhaustive search on n variables with `threads` threads.
pub fn exhaustive_seconds(n: usize, degree: u32, threads: usize) -> Option<f64> {
    (n <= super::exhaustive::MAX_VARIABLES).then(|| {
        let slowdown = f64::from(degree.max(2) - 1);
        2f64.powi(n as i32) * slowdown / EXHAUSTIVE_RATE / threads as f64
    })
}

/// The cheapest method for a system of the given equation degrees in n variables on `threads`
/// threads, with the reason.
pub fn choose(n: usize, degrees: &[u32], threads: usize) -> Choice {
    let max_degree = degrees.iter().copied().max().unwrap_or(0);
    let exhaustive = exhaustive_seconds(n, max_degree, threads);
    let (basis, degree) = engine_seconds(n, degrees);
    // The hybrid guesses at most `MAX_GUESS` variables (2^k engine runs whatever the system).
    let hybrid = (1..n.min(super::hybrid::MAX_GUESS + 1))
        .map(|k| {
            let (one, _) = engine_seconds(n - k, degrees);
            (k, 2f64.powi(k as i32) * one / threads as f64)
        })
        .min_by(|a, b| a.1.total_cmp(&b.1));
    let estimates = Estimates {
        exhaustive,
        basis,
        hybrid: hybrid.map(|h| h.1),
        hybrid_guess: hybrid.map_or(0, |h| h.0),
        degree,
    };
    let best_hybrid = hybrid.map_or(f64::INFINITY, |h| h.1);
    let best_exhaustive = exhaustive.unwrap_or(f64::INFINITY);
    let (method, what) = if best_exhaustive.min(basis).min(best_hybrid) > HORIZON {
        (
            Method::Basis,
            format!(
                "the Gröbner engine: every method would take over a day on a random system of \
                 this shape (the engine {}, reaching degree {degree}), and the engine alone \
                 can profit from structure the estimate does not see",
                seconds(basis)
            ),
        )
    } else if best_exhaustive <= basis.min(best_hybrid) {
        (
            Method::Exhaustive,
            format!(
                "exhaustive search of 2^{n} points, {}",
                seconds(best_exhaustive)
            ),
        )
    } else if basis <= best_hybrid {
        (
            Method::Basis,
            format!(
                "the Gröbner engine, reaching degree {degree} if the system behaves like a random \
                 one, {}",
                seconds(basis)
            ),
        )
    } else {
        let k = estimates.hybrid_guess;
        (
            Method::Hybrid { guess: Some(k) },
            format!(
                "guessing {k} variables and running the engine 2^{k} times, {}",
                seconds(best_hybrid)
            ),
        )
    };
    let mut others = Vec::new();
    if method != Method::Exhaustive {
        others.push(match exhaustive {
            Some(s) => format!("exhaustive search {}", seconds(s)),
            None => "exhaustive search impossible beyond 64 variables".to_string(),
        });
    }
    if method != Method::Basis {
        others.push(format!("engine alone {}", seconds(basis)));
    }
    if !matches!(method, Method::Hybrid { .. }) {
        if let Some((k, s)) = hybrid {
            others.push(format!("best hybrid (guess {k}) {}", seconds(s)));
        }
    }
    Choice {
        method,
        reason: format!("{what}; estimated {}", others.join(", ")),
        estimates,
    }
}

fn seconds(s: f64) -> String {
    if s < 1e-3 {
        "under a millisecond".into()
    } else if s < 100.0 {
        format!("about {s:.3} s")
    } else if s < 1e7 {
        format!("about {s:.0} s")
    } else {
        format!("about {s:.1e} s")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Bardet, Faugère, Salvy and Yang (2005) tabulate the degree of regularity of semi-regular
    /// quadratic Boolean systems; from the series definition (worked by hand, the coefficient
    /// of t^d being Σ_k (-1)^k C(m+k-1, k) C(n, d-2k)): n = 20, m = 40 gives c_3 = 1140 - 800 =
    /// 340 > 0 and c_4 = 4845 - 7600 + 820 < 0, so D = 4; n = 30, m = 60 gives c_4 = 27405 -
    /// 26100 + 1830 = 3135 > 0 and c_5 < 0, so D = 5.
    #[test]
    fn regularity_degrees_of_quadratic_systems() {
        assert_eq!(regularity_degree(20, &[2; 40]), 4);
        assert_eq!(regularity_degree(30, &[2; 60]), 5);
        // One quadric in 3 variables: (1 + 3t + 3t^2 + t^3)(1 - t^2 + ...) = 1 + 3t + 2t^2 - 2t^3 ...
        assert_eq!(regularity_degree(3, &[2]), 3);
    }

    /// The hybrid's 2^k engine runs are certain, whatever the system: the estimate never
    /// proposes more guesses than the hybrid accepts.
    #[test]
    fn the_hybrid_guesses_at_most_its_limit() {
        let c = choose(200, &[2; 400], 2);
        assert!(c.estimates.hybrid_guess <= crate::boolean::hybrid::MAX_GUESS);
        assert!(c.estimates.hybrid_guess >= 1);
    }

    #[test]
    fn method_names() {
        assert_eq!(
            Method::by_name("hybrid:5").unwrap(),
            Method::Hybrid { guess: Some(5) }
        );
        assert!(Method::by_name("guess").is_err());
    }
}
