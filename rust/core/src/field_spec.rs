//! Field specs read from text: the text that names a field (`GF(7)`, `GF(2^8)`, `GF(9)`, `Q`,
//! `GF(2^255-19)`, and `GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)` for GF(p^k) on a modulus other
//! than the default) read into [`AnyField`], and moduli written as polynomials in the generator
//! ([`Modulus::parse`]). Every field's `spec()` reads back to an equal field. A modulus may also
//! come separately ([`AnyField::with_modulus`]).
//!
//! This sits above the field layer (it parses polynomials with [`crate::parse`]), so the fields
//! themselves never read text.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::extension::Modulus;
use crate::extension::{check_generator_name, DEFAULT_GENERATOR};
use crate::field::bpsw;
use crate::field::{PrimeField, RationalField};
use crate::field_kind::{extension_field, prime_field, small_prime, AnyField};
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::Ring;
use num_bigint::BigUint;
use num_traits::ToPrimitive;

const SPEC_FORMS: &str = "GF(p), GF(p^k), GF(q), GF(p)[a]/(modulus) or Q";

impl AnyField {
    /// Reads a field spec (see the module doc); errors name what is wrong.
    pub fn parse(spec: &str) -> Result<Self> {
        AnyField::parse_with(spec, None, DEFAULT_GENERATOR)
    }

    /// The field named by `spec` (`GF(q)` or `GF(p^k)`, k ≥ 2) on the modulus written in `a`.
    pub fn with_modulus(spec: &str, modulus: &str) -> Result<Self> {
        AnyField::parse_with(spec, Some(modulus), DEFAULT_GENERATOR)
    }

    /// The field named by `spec`, on `modulus` when given (a text in `generator`), with its
    /// generator called `generator` in every polynomial text (`a` by default; only GF(p^k),
    /// k ≥ 2, has one). A spec `GF(p)[b]/(f)` names its generator itself.
    pub fn parse_with(spec: &str, modulus: Option<&str>, generator: &str) -> Result<Self> {
        AnyField::parse_within(spec, modulus, generator, &Control::new())
    }

    /// [`AnyField::parse_with`], stopping with `Interrupted` when `control` says so: the
    /// default modulus of a large GF(p^k) is a search over about k candidates.
    pub fn parse_within(
        spec: &str,
        modulus: Option<&str>,
        generator: &str,
        control: &Control,
    ) -> Result<Self> {
        let text = spec.trim();
        if text == "Q" || (!text.is_empty() && text.bytes().all(|b| b.is_ascii_digit())) {
            if modulus.is_some() || generator != DEFAULT_GENERATOR {
                return Err(Error::invalid(format!(
                    "field spec '{spec}': a modulus and a generator name belong to GF(p^k) with k >= 2"
                )));
            }
            if text == "Q" {
                return Ok(AnyField::Rational(RationalField));
            }
            return AnyField::from_order(spec, text, None, generator, control);
        }
        if let Some((base, name, quotient)) = quotient_form(text) {
            if modulus.is_some() || (generator != DEFAULT_GENERATOR && generator != name) {
                return Err(Error::invalid(format!(
                    "field spec '{spec}' already gives the modulus and the generator's name"
                )));
            }
            return AnyField::from_quotient(spec, base, quotient, name, control);
        }
        AnyField::from_order(spec, gf_inner(spec, text)?, modulus, generator, control)
    }

    /// `GF(p)[b]/(f)`: GF(p^k) with k the degree of f, generator b.
    fn from_quotient(
        spec: &str,
        base: &str,
        modulus: &str,
        generator: &str,
        control: &Control,
    ) -> Result<Self> {
        let prime = small_prime(spec, &parse_prime(spec, base)?)?;
        let modulus = Modulus::parse_within(prime, None, modulus, generator, control);
        extension_field(modulus.map_err(|e| prefixed(spec, e))?)
    }

    /// The field of order `order` (`q` or `p^k`), optionally on a given modulus text.
    fn from_order(
        spec: &str,
        order: &str,
        modulus: Option<&str>,
        generator: &str,
        control: &Control,
    ) -> Result<Self> {
        let number = |t: &str| -> Result<BigUint> {
            let t = t.trim();
            if t.is_empty() || !t.bytes().all(|b| b.is_ascii_digit()) {
                return Err(Error::invalid(format!(
                    "unknown field spec '{spec}': '{t}' is not a positive integer (expected {SPEC_FORMS})"
                )));
            }
            Ok(t.parse().expect("digits"))
        };
        let evaluated;
        if !order
            .chars()
            .all(|c| c.is_ascii_digit() || "+-*^() ".contains(c))
        {
            return Err(Error::invalid(format!(
                "unknown field spec '{spec}': expected {SPEC_FORMS}"
            )));
        }
        let order = if order.contains(['+', '-', '*', '(']) || order.matches('^').count() > 1 {
            evaluated = integer_expression(spec, order)?.to_string();
            evaluated.as_str()
        } else {
            order
        };
        let (p, k) = match order.split_once('^') {
            Some((base, exp)) => {
                let p = number(base)?;
                let k = number(exp)?.to_u32().filter(|&k| k >= 1).ok_or_else(|| {
                    Error::invalid(format!(
                        "field spec '{spec}': the exponent must be between 1 and 2^32 - 1"
                    ))
                })?;
                if !bpsw::is_probable_prime(&p) {
                    return Err(Error::invalid(format!(
                        "field spec '{spec}': {p} is not a prime{}",
                        factor_note(&p)
                    )));
                }
                (p, k)
            }
            None => {
                let q = number(order)?;
                bpsw::prime_power(&q).ok_or_else(|| {
                    let elements = if q == BigUint::from(1u32) { "element" } else { "elements" };
                    Error::invalid(format!(
                        "field spec '{spec}': {q} is not a prime{} nor a prime power, so no field has {q} {elements}",
                        factor_note(&q)
                    ))
                })?
            }
        };
        match (k, modulus) {
            (1, None) if generator == DEFAULT_GENERATOR => prime_field(&p),
            (1, _) => Err(Error::invalid(format!(
                "field spec '{spec}': a modulus and a generator name are given only for GF(p^k) with k >= 2"
            ))),
            (_, Some(text)) => {
                let base = small_prime(spec, &p)?;
                let modulus = Modulus::parse_within(base, Some(k), text, generator, control);
                extension_field(modulus.map_err(|e| prefixed(spec, e))?)
            }
            (_, None) => {
                let base = small_prime(spec, &p)?;
                let modulus = Modulus::first_irreducible_within(base, k, control)?
                    .with_generator(generator);
                extension_field(modulus.map_err(|e| prefixed(spec, e))?)
            }
        }
    }
}

impl Modulus {
    /// The modulus written in `a` (e.g. `a^8+a^4+a^3+a+1`); its degree must be `k` if given.
    pub fn parse(base: PrimeField, k: Option<u32>, text: &str) -> Result<Self> {
        Modulus::parse_in(base, k, text, DEFAULT_GENERATOR)
    }

    /// The modulus written in the generator `name`, which the field then keeps as its
    /// generator's name.
    pub fn parse_in(base: PrimeField, k: Option<u32>, text: &str, name: &str) -> Result<Self> {
        Modulus::parse_within(base, k, text, name, &Control::new())
    }

    /// [`Modulus::parse_in`], stopping with `Interrupted` when `control` says so.
    pub fn parse_within(
        base: PrimeField,
        k: Option<u32>,
        text: &str,
        name: &str,
        control: &Control,
    ) -> Result<Self> {
        check_generator_name(name)?;
        let ring = Ring::new(base.clone(), vec![name.to_string()], MonomialOrder::Lex)?;
        let f = parse_poly(&ring, text).map_err(|e| match e {
            Error::Parse {
                message, column, ..
            } => Error::invalid(format!("modulus '{text}': column {column}: {message}")),
            other => other,
        })?;
        let degree = f.degree().unwrap_or(0) as usize;
        if let Some(k) = k {
            if degree != k as usize {
                return Err(Error::invalid(format!(
                    "modulus '{text}' has degree {degree}, but the field needs degree {k}"
                )));
            }
        }
        let mut coeffs = vec![0u64; degree + 1];
        for (m, c) in f.terms() {
            coeffs[m.exponents()[0] as usize] = *c;
        }
        Modulus::new_within(base, coeffs, control)?.with_generator(name)
    }
}

fn prefixed(spec: &str, e: Error) -> Error {
    match e {
        Error::InvalidInput(m) => Error::invalid(format!("field spec '{spec}': {m}")),
        other => other,
    }
}

/// ` (it is divisible by d)` when a small factor is known.
fn factor_note(n: &BigUint) -> String {
    match bpsw::small_factor(n) {
        Some(d) => format!(" (it is divisible by {d})"),
        None => String::new(),
    }
}

/// Results of field-size expressions above this many bits are refused before they are built.
const MAX_EXPRESSION_BITS: u64 = 4096;

/// The value of an integer expression such as `2^255-19` (`+ - * ^`, parentheses; `^` binds
/// tightest and to the right), for field sizes written as expressions.
fn integer_expression(spec: &str, text: &str) -> Result<BigUint> {
    let bad = |what: &str| Error::invalid(format!("field spec '{spec}': {what}"));
    let tokens: Vec<char> = text.chars().filter(|c| !c.is_whitespace()).collect();
    let mut pos = 0;
    let value = expression_sum(&tokens, &mut pos, &bad)?;
    if pos != tokens.len() {
        return Err(bad(&format!(
            "unexpected '{}' in the field size",
            tokens[pos]
        )));
    }
    Ok(value)
}

type Bad<'a> = &'a dyn Fn(&str) -> Error;

fn expression_sum(t: &[char], pos: &mut usize, bad: Bad) -> Result<BigUint> {
    let mut acc = expression_product(t, pos, bad)?;
    while let Some(&op @ ('+' | '-')) = t.get(*pos) {
        *pos += 1;
        let rhs = expression_product(t, pos, bad)?;
        acc = if op == '+' {
            acc + rhs
        } else if rhs <= acc {
            acc - rhs
        } else {
            return Err(bad("the field size is negative"));
        };
    }
    Ok(acc)
}

fn expression_product(t: &[char], pos: &mut usize, bad: Bad) -> Result<BigUint> {
    let mut acc = expression_power(t, pos, bad)?;
    while t.get(*pos) == Some(&'*') {
        *pos += 1;
        acc *= expression_power(t, pos, bad)?;
        if acc.bits() > MAX_EXPRESSION_BITS {
            return Err(bad("the field size is too large"));
        }
    }
    Ok(acc)
}

fn expression_power(t: &[char], pos: &mut usize, bad: Bad) -> Result<BigUint> {
    let base = expression_atom(t, pos, bad)?;
    if t.get(*pos) != Some(&'^') {
        return Ok(base);
    }
    *pos += 1;
    let exponent = expression_power(t, pos, bad)?;
    let small = exponent
        .to_u64()
        .filter(|&e| e.saturating_mul(base.bits()) <= MAX_EXPRESSION_BITS);
    match small {
        Some(e) => Ok(base.pow(e as u32)),
        None if base <= BigUint::from(1u8) => Ok(base),
        None => Err(bad("the field size is too large")),
    }
}

fn expression_atom(t: &[char], pos: &mut usize, bad: Bad) -> Result<BigUint> {
    if t.get(*pos) == Some(&'(') {
        *pos += 1;
        let inner = expression_sum(t, pos, bad)?;
        if t.get(*pos) != Some(&')') {
            return Err(bad("missing ')' in the field size"));
        }
        *pos += 1;
        return Ok(inner);
    }
    let start = *pos;
    while t.get(*pos).is_some_and(|c| c.is_ascii_digit()) {
        *pos += 1;
    }
    if start == *pos {
        return Err(bad("expected a number in the field size"));
    }
    Ok(t[start..*pos]
        .iter()
        .collect::<String>()
        .parse()
        .expect("digits"))
}

/// The text inside `GF(...)`.
fn gf_inner<'a>(spec: &str, text: &'a str) -> Result<&'a str> {
    text.strip_prefix("GF(")
        .and_then(|t| t.strip_suffix(')'))
        .map(str::trim)
        .ok_or_else(|| {
            Error::invalid(format!(
                "unknown field spec '{spec}': expected {SPEC_FORMS}"
            ))
        })
}

/// `GF(p)[a]/(f)` split into the text of p and the text of f.
/// `GF(p)[b]/(f)` as (`GF(p)`, `b`, `f`).
fn quotient_form(text: &str) -> Option<(&str, &str, &str)> {
    let (base, rest) = text.split_once('[')?;
    let (name, modulus) = rest.split_once(']')?;
    let modulus = modulus.trim().strip_prefix('/')?.trim();
    let modulus = modulus.strip_prefix('(')?.strip_suffix(')')?;
    Some((base.trim(), name.trim(), modulus))
}

/// The prime p of `GF(p)` (or of a plain number).
fn parse_prime(spec: &str, base: &str) -> Result<BigUint> {
    let inner = gf_inner(spec, base).unwrap_or(base);
    let p: BigUint = inner
        .parse()
        .map_err(|_| Error::invalid(format!("field spec '{spec}': '{inner}' is not a prime")))?;
    if !bpsw::is_probable_prime(&p) {
        return Err(Error::invalid(format!(
            "field spec '{spec}': {p} is not a prime{}",
            factor_note(&p)
        )));
    }
    Ok(p)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn err(spec: &str) -> String {
        AnyField::parse(spec).unwrap_err().to_string()
    }

    #[test]
    fn specs_read_back() {
        for (spec, kind, canonical) in [
            ("7", "Prime", "GF(7)"),
            ("GF(65521)", "Prime", "GF(65521)"),
            ("GF(2^8)", "Table", "GF(2^8)"),
            ("GF(9)", "Table", "GF(3^2)"),
            (" GF( 3^2 ) ", "Table", "GF(3^2)"),
            ("GF(2^16)", "Table", "GF(2^16)"),
            ("GF(2^17)", "Binary", "GF(2^17)"),
            ("GF(2^64)", "Binary", "GF(2^64)"),
            ("GF(2^65)", "Extension", "GF(2^65)"),
            ("GF(3^11)", "Extension", "GF(3^11)"),
            (
                "GF(2)[a]/(a^8+a^4+a^3+a^2+1)",
                "Table",
                "GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)",
            ),
            ("GF(2) [a] / (a^8+a^4+a^3+a+1)", "Table", "GF(2^8)"),
            ("GF(3)[a]/(a^2 + 1)", "Table", "GF(3^2)"),
            (
                "GF(9223372036854775837)",
                "BigPrime2",
                "GF(9223372036854775837)",
            ),
            (
                "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
                "BigPrime4",
                "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
            ),
            ("Q", "Rational", "Q"),
        ] {
            let f = AnyField::parse(spec).unwrap();
            assert!(format!("{f:?}").starts_with(kind), "{spec}: {f:?}");
            assert_eq!(f.spec(), canonical, "{spec}");
            assert_eq!(AnyField::parse(&f.spec()).unwrap(), f, "{spec}");
        }
        let f = AnyField::parse("GF(3^5)").unwrap();
        assert_eq!(
            (f.characteristic(), f.order(), f.degree()),
            ("3".into(), Some("243".into()), 5)
        );
        assert_eq!(AnyField::parse("Q").unwrap().order(), None);
        // Sizes written as expressions: 2^255 - 19 is the prime of Curve25519 (from memory).
        let p25519 = AnyField::parse("GF(2^255-19)").unwrap();
        assert_eq!(
            p25519.spec(),
            "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)"
        );
        assert_eq!(
            AnyField::parse("GF((2^3 + 1) * 1)").unwrap().spec(),
            "GF(3^2)"
        );
        assert_eq!(AnyField::parse("GF(2^2^2)").unwrap().spec(), "GF(2^4)");
        let f = AnyField::with_modulus("GF(2^8)", "a^8+a^4+a^3+a^2+1").unwrap();
        assert_eq!(f.spec(), "GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)");
        assert_eq!(
            AnyField::with_modulus("GF(256)", "a^8+a^4+a^3+a+1")
                .unwrap()
                .spec(),
            "GF(2^8)"
        );
    }

    #[test]
    fn bad_specs_say_what_is_wrong() {
        assert!(
            err("GF(12)").contains("12 is not a prime (it is divisible by 2) nor a prime power"),
            "{}",
            err("GF(12)")
        );
        assert!(
            err("GF(6^2)").contains("6 is not a prime"),
            "{}",
            err("GF(6^2)")
        );
        assert!(err("GF(1)").contains("not a prime"), "{}", err("GF(1)"));
        assert!(
            err("GF(2)[a]/(a^8+1)").contains("reducible over GF(2)"),
            "{}",
            err("GF(2)[a]/(a^8+1)")
        );
        let wrong_degree = AnyField::with_modulus("GF(2^8)", "a^5+a^2+1").unwrap_err();
        assert!(
            wrong_degree.to_string().contains("degree 5"),
            "{wrong_degree}"
        );
        let prime = AnyField::with_modulus("GF(7)", "a+1").unwrap_err();
        assert!(prime.to_string().contains("only for GF(p^k)"), "{prime}");
        assert!(err("GF(4)[a]/(a^2+a+1)").contains("4 is not a prime"));
        assert!(err("GF(2^8, modulus='a^8+1')").contains("unknown field spec"));
        assert!(err("QQ").contains("unknown field spec 'QQ'"));
        assert!(err("GF(2-3)").contains("negative"), "{}", err("GF(2-3)"));
        assert!(err("GF(2^100000-1)").contains("too large"));
        assert!(err("GF(2^255-20)").contains("is not a prime"));
        assert!(
            err("GF((2+1)").contains("missing ')'"),
            "{}",
            err("GF((2+1)")
        );
        assert!(err("ZZ").contains("unknown field spec 'ZZ'"));
        assert!(err("GF(x)").contains("unknown field spec 'GF(x)'"));
        assert!(err("GF(2^0)").contains("exponent"));
        let big =
            "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949^2)";
        assert!(err(big).contains("need p < 2^63"), "{}", err(big));
        assert!(err(
            "GF(57896044618658097711785492504343953926634992332820282019728792003956564819951)"
        )
        .contains("is not a prime"));
    }
}
