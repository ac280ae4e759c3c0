//! The rational numbers QQ, exactly: elements are fractions of unbounded integers in lowest
//! terms with a positive denominator (num-rational's `BigRational`; a well-kept, small crate:
//! unbounded division and gcd are not worth rewriting).
//!
//! Gröbner bases over QQ are computed by the multi-modular method
//! ([`crate::groebner::modular`]); plain field arithmetic here serves parsing, printing,
//! evaluation and the final verification of a lifted basis.

use super::{Field, FieldIndexed};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

#[derive(Clone, Debug, PartialEq, Default)]
pub struct RationalField;

impl RationalField {
    pub fn new() -> Self {
        RationalField
    }
}

impl Field for RationalField {
    type Elem = BigRational;

    fn zero(&self) -> BigRational {
        BigRational::zero()
    }
    fn one(&self) -> BigRational {
        BigRational::one()
    }
    fn is_zero(&self, a: &BigRational) -> bool {
        a.is_zero()
    }
    fn is_one(&self, a: &BigRational) -> bool {
        a.is_one()
    }
    fn add(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a + b
    }
    fn sub(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a - b
    }
    fn neg(&self, a: &BigRational) -> BigRational {
        -a
    }
    fn mul(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a * b
    }
    fn inv(&self, a: &BigRational) -> Option<BigRational> {
        (!a.is_zero()).then(|| a.recip())
    }
    fn from_i64(&self, v: i64) -> BigRational {
        BigRational::from_integer(BigInt::from(v))
    }
    fn from_decimal(&self, digits: &str) -> BigRational {
        BigRational::from_integer(digits.parse().unwrap_or_default())
    }
    fn characteristic(&self) -> String {
        "0".into()
    }
    fn order(&self) -> Option<String> {
        None
    }
    fn spec(&self) -> String {
        "Q".into()
    }
    /// `3`, `-3/4`: the parser reads `3/4*x` as (3/4)·x.
    fn format(&self, a: &BigRational) -> String {
        a.to_string()
    }
    /// 0, 1, −1, 2, −2, ...: small integers first, as linear changes of coordinates want.
    fn element_from_index(&self, i: u64) -> BigRational {
        let magnitude = BigInt::from(i.div_ceil(2));
        BigRational::from_integer(if i.is_multiple_of(2) {
            -magnitude
        } else {
            magnitude
        })
    }
    fn size_hint(&self) -> f64 {
        f64::INFINITY
    }
    fn characteristic_u64(&self) -> Option<u64> {
        Some(0)
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        None
    }
    fn pth_root(&self, _a: &BigRational) -> Option<BigRational> {
        None
    }

    fn as_rationals<W: FieldIndexed>(value: &W::Of<Self>) -> Option<&W::Of<RationalField>> {
        Some(value)
    }
    fn from_rationals<W: FieldIndexed>(value: W::Of<RationalField>) -> Option<W::Of<Self>> {
        Some(value)
    }
}

/// Least common multiple of the denominators and gcd of the numerators of `coeffs`: the
/// factor that turns them into coprime integers.
pub fn integer_scale(coeffs: &[&BigRational]) -> BigRational {
    use num_integer::Integer;
    let (mut den, mut num) = (BigInt::one(), BigInt::zero());
    for c in coeffs {
        den = den.lcm(c.denom());
        num = num.gcd(c.numer());
    }
    if num.is_zero() {
        return BigRational::one();
    }
    BigRational::new(den, num.abs())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;
    use crate::poly::Ring;
    use proptest::prelude::*;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(n.into(), d.into())
    }

    proptest! {
        #[test]
        fn field_axioms(a in -1000i64..1000, b in 1i64..1000, c in -1000i64..1000, d in 1i64..1000) {
            let f = RationalField;
            let (x, y) = (q(a, b), q(c, d));
            prop_assert_eq!(f.mul(&x, &y), q(a * c, b * d));
            prop_assert_eq!(f.add(&x, &y), q(a * d + c * b, b * d));
            prop_assert!(f.is_zero(&f.add(&x, &f.neg(&x))));
            if a != 0 {
                prop_assert!(f.is_one(&f.mul(&x, &f.inv(&x).unwrap())));
            }
        }
    }

    #[test]
    fn enumeration_is_zero_one_minus_one_two_minus_two() {
        let f = RationalField;
        let first: Vec<String> = (0..6).map(|i| f.format(&f.element_from_index(i))).collect();
        assert_eq!(first, ["0", "1", "-1", "2", "-2", "3"]);
    }

    #[test]
    fn fractions_print_and_read_back() {
        let r = Ring::new(
            RationalField,
            vec!["x".into(), "y".into()],
            MonomialOrder::Grevlex,
        )
        .unwrap();
        let f = parse_poly(&r, "3/4*x^2 - 6/8*y + 1000000000000000000000000000001/3").unwrap();
        let text = r.format(&f);
        assert_eq!(text, "3/4*x^2 - 3/4*y + 1000000000000000000000000000001/3");
        assert_eq!(parse_poly(&r, &text).unwrap(), f);
        assert!(parse_poly(&r, "x/0").is_err());
    }

    #[test]
    fn integer_scale_clears_denominators_and_content() {
        let cs = [q(3, 4), q(-9, 2), q(6, 1)];
        let s = integer_scale(&cs.iter().collect::<Vec<_>>());
        // lcm(4, 2, 1) = 4; numerators 3, −18, 24 have gcd 3: scale 4/3 gives 1, −6, 8.
        assert_eq!(s, q(4, 3));
    }
}
