//! A small seeded pseudo-random generator, SplitMix64 (Steele, Lea and Flood 2014): every random
//! choice of the core goes through it, so a seed reproduces a whole run. Field elements are
//! drawn by [`crate::field::random`], one layer up.

#[derive(Clone, Debug)]
pub struct Rng(u64);

impl Rng {
    /// A generator whose stream depends on `seed` (mixed with a constant, so that small seeds
    /// such as 0 and 1 start far apart in the stream).
    pub fn new(seed: u64) -> Self {
        Rng(seed ^ 0x6a09_e667_f3bc_c908)
    }

    /// A generator started at `state` exactly: the first output is that of state + γ.
    pub fn with_state(state: u64) -> Self {
        Rng(state)
    }

    /// A generator seeded from the process's entropy (the operating system's random source, as
    /// drawn by the standard library for its hash maps), for runs that must not be predictable.
    pub fn from_entropy() -> Self {
        use std::hash::{BuildHasher, Hasher};
        let mut hasher = std::collections::hash_map::RandomState::new().build_hasher();
        hasher.write_u64(0x243f_6a88_85a3_08d3);
        Rng::new(hasher.finish())
    }

    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }

    /// Uniform in 0..n (n > 0), exactly: draws in the incomplete top block of 2^64 are rejected.
    pub fn below(&mut self, n: u64) -> u64 {
        debug_assert!(n > 0);
        let zone = u64::MAX - (u64::MAX % n + 1) % n;
        loop {
            let x = self.next_u64();
            if x <= zone {
                return x % n;
            }
        }
    }

    /// Uniform in 0..n for n > 0 given as little-endian limbs (any length), exactly: the top
    /// limb is drawn under the bit length of n and draws ≥ n are rejected (fewer than half).
    pub fn below_limbs(&mut self, n: &[u64]) -> Vec<u64> {
        let top = n.iter().rposition(|&w| w != 0).expect("n > 0");
        let mask = u64::MAX >> n[top].leading_zeros();
        loop {
            let mut x: Vec<u64> = (0..top).map(|_| self.next_u64()).collect();
            x.push(self.next_u64() & mask);
            let below = x.iter().rev().cmp(n[..=top].iter().rev()) == std::cmp::Ordering::Less;
            if below {
                return x;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::Rng;

    #[test]
    fn below_is_in_range_and_hits_every_value() {
        let mut rng = Rng::new(7);
        let mut seen = [0usize; 5];
        for _ in 0..5000 {
            seen[rng.below(5) as usize] += 1;
        }
        // Each value expected 1000 times; 800 is more than 6 standard deviations below.
        assert!(seen.iter().all(|&k| k > 800), "{seen:?}");
        assert_eq!(rng.below(1), 0);
        assert!((0..100).all(|_| rng.below(u64::MAX) < u64::MAX));
    }

    #[test]
    fn entropy_seeds_differ() {
        let (a, b) = (
            Rng::from_entropy().next_u64(),
            Rng::from_entropy().next_u64(),
        );
        assert_ne!(a, b);
    }
}
