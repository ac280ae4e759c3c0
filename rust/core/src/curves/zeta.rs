//! The zeta function of a smooth projective curve of genus g over GF(q) from its point counts
//! N_1, ..., N_g (Weil 1948): Z(T) = exp(Σ N_r T^r / r) = L(T) / ((1 − T)(1 − qT)) with L(T) =
//! Π (1 − α_i T) of degree 2g, L(0) = 1, and the functional equation q^g T^(2g) L(1/(qT)) = L(T),
//! so a_(2g−k) = q^(g−k) a_k and only a_1..a_g are unknown. The power sums of the α_i are
//! p_r = q^r + 1 − N_r; Newton's identities turn p_1..p_g into the elementary symmetric
//! functions, i.e. a_1..a_g, and back: N_r for every r follows from L. L(1) is the order of the
//! Jacobian over GF(q). Every L computed here is checked against Weil's bound
//! |a_k| ≤ C(2g, k) q^(k/2) (the Riemann hypothesis for curves, Weil 1948), which counts that are
//! not those of a smooth projective curve of genus g would break.

use crate::error::{Error, Result};
use num_bigint::BigInt;
use num_traits::{One, Signed, Zero};

/// The zeta function of a curve of genus `genus` over GF(q): its L-polynomial.
#[derive(Clone, Debug, PartialEq)]
pub struct Zeta {
    pub q: u64,
    pub genus: usize,
    /// a_0 = 1, a_1, ..., a_(2g): L(T) = Σ a_k T^k.
    pub l_polynomial: Vec<BigInt>,
}

impl Zeta {
    /// The zeta function from N_1, ..., N_g (exactly g counts).
    pub fn from_counts(q: u64, genus: usize, counts: &[u128]) -> Result<Zeta> {
        if counts.len() != genus {
            return Err(Error::invalid(format!(
                "the zeta function of a curve of genus {genus} needs N_1..N_{genus}, got {} counts",
                counts.len()
            )));
        }
        let power_sums: Vec<BigInt> = counts
            .iter()
            .enumerate()
            .map(|(i, &n)| q_power(q, i as u32 + 1) + 1 - BigInt::from(n))
            .collect();
        let elementary = elementary_from_power_sums(&power_sums)?;
        let mut l = vec![BigInt::zero(); 2 * genus + 1];
        for (k, e) in elementary.iter().enumerate() {
            let a = if k % 2 == 0 { e.clone() } else { -e };
            l[2 * genus - k] = &a * q_power(q, (genus - k) as u32);
            l[k] = a;
        }
        let zeta = Zeta {
            q,
            genus,
            l_polynomial: l,
        };
        zeta.check_weil_bound()?;
        Ok(zeta)
    }

    /// N_r = #C(GF(q^r)), for any r ≥ 1.
    pub fn points(&self, r: u32) -> BigInt {
        let e: Vec<BigInt> = self
            .l_polynomial
            .iter()
            .enumerate()
            .map(|(k, a)| if k % 2 == 0 { a.clone() } else { -a })
            .collect();
        let mut p: Vec<BigInt> = Vec::with_capacity(r as usize + 1);
        p.push(BigInt::zero());
        for k in 1..=r as usize {
            // p_k = Σ_{i=1}^{k−1} (−1)^(i−1) e_i p_(k−i) + (−1)^(k−1) k e_k.
            let mut s = BigInt::zero();
            for i in 1..k.min(e.len()) {
                let term = &e[i] * &p[k - i];
                s += if i % 2 == 1 { term } else { -term };
            }
            if let Some(ek) = e.get(k) {
                let term = ek * BigInt::from(k);
                s += if k % 2 == 1 { term } else { -term };
            }
            p.push(s);
        }
        q_power(self.q, r) + 1 - &p[r as usize]
    }

    /// L(1): the number of GF(q)-rational points of the Jacobian.
    pub fn jacobian_order(&self) -> BigInt {
        self.l_polynomial.iter().sum()
    }

    /// Whether q^g T^(2g) L(1/(qT)) = L(T), i.e. a_(2g−k) = q^(g−k) a_k for k ≤ g.
    pub fn satisfies_functional_equation(&self) -> bool {
        let g = self.genus;
        self.l_polynomial.len() == 2 * g + 1
            && (0..=g).all(|k| {
                self.l_polynomial[2 * g - k]
                    == &self.l_polynomial[k] * q_power(self.q, (g - k) as u32)
            })
    }

    /// |a_k| ≤ C(2g, k) q^(k/2) for every k, compared as a_k^2 ≤ C(2g, k)^2 q^k.
    fn check_weil_bound(&self) -> Result<()> {
        let two_g = 2 * self.genus;
        for (k, a) in self.l_polynomial.iter().enumerate() {
            let c = binomial(two_g, k);
            if a * a > &c * &c * q_power(self.q, k as u32) {
                return Err(Error::invalid(format!(
                    "the counts are not those of a smooth projective curve of genus {}: the coefficient a_{k} = {a} of L(T) breaks Weil's bound C({two_g}, {k}) q^({k}/2)",
                    self.genus
                )));
            }
        }
        Ok(())
    }
}

/// e_1..e_n from p_1..p_n by Newton's identities k e_k = Σ_{i=1}^k (−1)^(i−1) e_(k−i) p_i;
/// e_0 = 1 first.
fn elementary_from_power_sums(p: &[BigInt]) -> Result<Vec<BigInt>> {
    let mut e = vec![BigInt::one()];
    for k in 1..=p.len() {
        let mut s = BigInt::zero();
        for i in 1..=k {
            let term = &e[k - i] * &p[i - 1];
            s += if i % 2 == 1 { term } else { -term };
        }
        let k_big = BigInt::from(k);
        if !(&s % &k_big).is_zero() {
            return Err(Error::invalid(format!(
                "the counts are not those of a curve: Newton's identity gives the non-integer e_{k} = {s}/{k}"
            )));
        }
        e.push(s / k_big);
    }
    Ok(e)
}

/// q^e as a big integer.
pub fn q_power(q: u64, e: u32) -> BigInt {
    num_traits::pow(BigInt::from(q), e as usize)
}

/// ⌊√n⌋ for n ≥ 0.
pub fn floor_sqrt(n: &BigInt) -> BigInt {
    if n.is_negative() {
        return BigInt::zero();
    }
    n.sqrt()
}

fn binomial(n: usize, k: usize) -> BigInt {
    (0..k).fold(BigInt::one(), |acc, i| {
        acc * BigInt::from(n - i) / BigInt::from(i + 1)
    })
}
