//! Sparse multivariate polynomials and the ring that gives them meaning.
//!
//! A [`Poly`] is a list of terms sorted strictly decreasing in its ring's monomial order, with no
//! zero coefficients; all arithmetic goes through the [`Ring`], which knows the field, the
//! variable names and the order.

use crate::control::{check_memory_default, try_with_capacity, Control};
use crate::error::{Error, Result};
use crate::field::{Field, FieldIndexed};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use std::cmp::Ordering;
use std::collections::HashMap;

#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Poly<F: Field> {
    terms: Vec<(Monomial, F::Elem)>,
}

impl<F: Field> Poly<F> {
    pub fn zero() -> Self {
        Poly { terms: Vec::new() }
    }
    pub fn is_zero(&self) -> bool {
        self.terms.is_empty()
    }
    /// Terms in decreasing order.
    pub fn terms(&self) -> &[(Monomial, F::Elem)] {
        &self.terms
    }
    pub fn into_terms(self) -> Vec<(Monomial, F::Elem)> {
        self.terms
    }
    pub fn len(&self) -> usize {
        self.terms.len()
    }
    pub fn is_empty(&self) -> bool {
        self.terms.is_empty()
    }
    pub fn leading_monomial(&self) -> Option<&Monomial> {
        self.terms.first().map(|t| &t.0)
    }
    pub fn leading_coefficient(&self) -> Option<&F::Elem> {
        self.terms.first().map(|t| &t.1)
    }
    /// Total degree; `None` for the zero polynomial.
    pub fn degree(&self) -> Option<u32> {
        self.terms.iter().map(|t| t.0.degree()).max()
    }
    pub fn is_homogeneous(&self) -> bool {
        self.terms
            .windows(2)
            .all(|w| w[0].0.degree() == w[1].0.degree())
    }
    pub fn is_constant(&self) -> bool {
        self.terms.iter().all(|t| t.0.is_one())
    }
    /// A polynomial from terms already strictly decreasing in the intended order, none zero.
    pub fn from_sorted(terms: Vec<(Monomial, F::Elem)>) -> Self {
        Poly { terms }
    }
    /// The leading term and the rest (`self` must be nonzero).
    pub fn split_lead(&self) -> ((Monomial, F::Elem), Poly<F>) {
        (
            self.terms[0].clone(),
            Poly {
                terms: self.terms[1..].to_vec(),
            },
        )
    }
}

/// [`Poly`] as a family of types indexed by the field (for [`Field::as_rationals`]).
pub struct PolyOver;
impl FieldIndexed for PolyOver {
    type Of<F: Field> = Poly<F>;
}

/// [`Ring`] as a family of types indexed by the field (for [`Field::as_rationals`]).
pub struct RingOver;
impl FieldIndexed for RingOver {
    type Of<F: Field> = Ring<F>;
}

#[derive(Clone, Debug, PartialEq)]
pub struct Ring<F: Field> {
    pub field: F,
    names: Vec<String>,
    pub order: MonomialOrder,
}

fn is_identifier(s: &str) -> bool {
    let mut chars = s.chars();
    matches!(chars.next(), Some(c) if c.is_ascii_alphabetic() || c == '_')
        && chars.all(|c| c.is_ascii_alphanumeric() || c == '_')
}

impl<F: Field> Ring<F> {
    /// A polynomial ring over `field` in the named variables (ordered as given: x1 > x2 > ...).
    pub fn new(field: F, names: Vec<String>, order: MonomialOrder) -> Result<Self> {
        for (i, n) in names.iter().enumerate() {
            if !is_identifier(n) {
                return Err(Error::invalid(format!(
                    "variable name '{n}' is not an identifier ([A-Za-z_][A-Za-z0-9_]*)"
                )));
            }
            if names[..i].contains(n) {
                return Err(Error::invalid(format!("variable '{n}' is given twice")));
            }
            if field.generator_name() == Some(n.as_str()) {
                return Err(Error::invalid(format!(
                    "variable '{n}' clashes with the generator of {}",
                    field.spec()
                )));
            }
        }
        order.validate(names.len())?;
        Ok(Ring {
            field,
            names,
            order,
        })
    }

    pub fn nvars(&self) -> usize {
        self.names.len()
    }
    pub fn names(&self) -> &[String] {
        &self.names
    }
    pub fn var_index(&self, name: &str) -> Option<usize> {
        self.names.iter().position(|n| n == name)
    }
    /// The same ring with another monomial order.
    pub fn with_order(&self, order: MonomialOrder) -> Result<Self> {
        Ring::new(self.field.clone(), self.names.clone(), order)
    }

    pub fn cmp(&self, a: &Monomial, b: &Monomial) -> Ordering {
        self.order.cmp(a, b)
    }

    pub fn constant(&self, c: F::Elem) -> Poly<F> {
        self.term(Monomial::one(self.nvars()), c)
    }
    pub fn one(&self) -> Poly<F> {
        self.constant(self.field.one())
    }
    pub fn term(&self, m: Monomial, c: F::Elem) -> Poly<F> {
        if self.field.is_zero(&c) {
            Poly::zero()
        } else {
            Poly {
                terms: vec![(m, c)],
            }
        }
    }
    pub fn var(&self, i: usize) -> Poly<F> {
        self.term(Monomial::var_power(self.nvars(), i, 1), self.field.one())
    }

    /// Builds a polynomial from terms in any order, adding like terms and dropping zeros.
    pub fn from_terms(&self, terms: impl IntoIterator<Item = (Monomial, F::Elem)>) -> Poly<F> {
        let mut acc: HashMap<Monomial, F::Elem> = HashMap::new();
        for (m, c) in terms {
            match acc.get_mut(&m) {
                Some(v) => *v = self.field.add(v, &c),
                None => {
                    acc.insert(m, c);
                }
            }
        }
        let mut terms: Vec<_> = acc
            .into_iter()
            .filter(|(_, c)| !self.field.is_zero(c))
            .collect();
        terms.sort_by(|a, b| self.cmp(&b.0, &a.0));
        Poly { terms }
    }

    /// The same polynomial sorted for this ring's order (e.g. coming from a ring with another order).
    pub fn adopt(&self, f: Poly<F>) -> Poly<F> {
        let mut terms = f.terms;
        terms.sort_by(|a, b| self.cmp(&b.0, &a.0));
        Poly { terms }
    }

    /// f + c·m·g, the workhorse of reduction: one merge of two sorted lists.
    pub fn add_scaled(
        &self,
        f: &Poly<F>,
        c: &F::Elem,
        m: &Monomial,
        g: &Poly<F>,
    ) -> Result<Poly<F>> {
        let mut out = Vec::with_capacity(f.len() + g.len());
        self.add_scaled_into(&f.terms, c, m, &g.terms, &mut out)?;
        Ok(Poly { terms: out })
    }

    /// f + c·m·g for sorted term lists, appended to `out`: the merge of [`Ring::add_scaled`]
    /// into a buffer the caller keeps, so that a loop of reduction steps allocates nothing once
    /// its two buffers are large enough.
    pub fn add_scaled_into(
        &self,
        f: &[(Monomial, F::Elem)],
        c: &F::Elem,
        m: &Monomial,
        g: &[(Monomial, F::Elem)],
        out: &mut Vec<(Monomial, F::Elem)>,
    ) -> Result<()> {
        out.reserve(f.len() + g.len());
        let shifted = |t: &(Monomial, F::Elem)| -> Result<(Monomial, F::Elem)> {
            Ok((t.0.mul(m)?, self.field.mul(&t.1, c)))
        };
        let (mut i, mut j) = (0, 0);
        let mut next_g = g.first().map(shifted).transpose()?;
        while let Some(b) = next_g.take() {
            let Some(a) = f.get(i) else {
                out.push(b);
                for t in &g[j + 1..] {
                    out.push(shifted(t)?);
                }
                return Ok(());
            };
            match self.cmp(&a.0, &b.0) {
                Ordering::Greater => {
                    out.push(a.clone());
                    i += 1;
                    next_g = Some(b);
                    continue;
                }
                Ordering::Less => out.push(b),
                Ordering::Equal => {
                    let s = self.field.add(&a.1, &b.1);
                    if !self.field.is_zero(&s) {
                        out.push((b.0, s));
                    }
                    i += 1;
                }
            }
            j += 1;
            next_g = g.get(j).map(shifted).transpose()?;
        }
        out.extend_from_slice(&f[i..]);
        Ok(())
    }

    pub fn add(&self, f: &Poly<F>, g: &Poly<F>) -> Poly<F> {
        let one = Monomial::one(self.nvars());
        self.add_scaled(f, &self.field.one(), &one, g)
            .expect("multiplying by 1 cannot overflow")
    }
    pub fn sub(&self, f: &Poly<F>, g: &Poly<F>) -> Poly<F> {
        let one = Monomial::one(self.nvars());
        let m1 = self.field.neg(&self.field.one());
        self.add_scaled(f, &m1, &one, g)
            .expect("multiplying by 1 cannot overflow")
    }
    pub fn neg(&self, f: &Poly<F>) -> Poly<F> {
        Poly {
            terms: f
                .terms
                .iter()
                .map(|(m, c)| (m.clone(), self.field.neg(c)))
                .collect(),
        }
    }
    pub fn scale(&self, f: &Poly<F>, c: &F::Elem) -> Poly<F> {
        if self.field.is_zero(c) {
            return Poly::zero();
        }
        Poly {
            terms: f
                .terms
                .iter()
                .map(|(m, a)| (m.clone(), self.field.mul(a, c)))
                .collect(),
        }
    }
    /// c·m·f (order is preserved by multiplication with a monomial).
    pub fn mul_term(&self, f: &Poly<F>, c: &F::Elem, m: &Monomial) -> Result<Poly<F>> {
        if self.field.is_zero(c) {
            return Ok(Poly::zero());
        }
        let terms: Result<Vec<_>> = f
            .terms
            .iter()
            .map(|(a, x)| Ok((a.mul(m)?, self.field.mul(x, c))))
            .collect();
        Ok(Poly { terms: terms? })
    }
    pub fn mul(&self, f: &Poly<F>, g: &Poly<F>) -> Result<Poly<F>> {
        self.mul_checked(f, g, None)
    }

    /// f·g under the memory budget of `control`, interruptible.
    pub fn mul_within(&self, f: &Poly<F>, g: &Poly<F>, control: &Control) -> Result<Poly<F>> {
        self.mul_checked(f, g, Some(control))
    }

    fn mul_checked(&self, f: &Poly<F>, g: &Poly<F>, control: Option<&Control>) -> Result<Poly<F>> {
        let (small, large) = if f.len() <= g.len() { (f, g) } else { (g, f) };
        let count = small.len().saturating_mul(large.len());
        let what = format!(
            "a product of polynomials with {} and {} terms",
            f.len(),
            g.len()
        );
        check_bytes::<F>(count as u64, &what, control)?;
        let mut products = try_with_capacity(count, &what)?;
        for (m, c) in &small.terms {
            if let Some(control) = control {
                control.check()?;
            }
            for (n, d) in &large.terms {
                products.push((m.mul(n)?, self.field.mul(c, d)));
            }
        }
        Ok(self.from_terms(products))
    }

    pub fn pow(&self, f: &Poly<F>, e: u64) -> Result<Poly<F>> {
        self.pow_checked(f, e, None)
    }

    /// f^e under the memory budget of `control`, interruptible.
    pub fn pow_within(&self, f: &Poly<F>, e: u64, control: &Control) -> Result<Poly<F>> {
        self.pow_checked(f, e, Some(control))
    }

    /// Square and multiply, after two checks that need no arithmetic: the degree of f^e must fit
    /// an exponent, and the number of terms it can have must fit the memory budget.
    fn pow_checked(&self, f: &Poly<F>, mut e: u64, control: Option<&Control>) -> Result<Poly<F>> {
        if e == 0 {
            return Ok(self.one());
        }
        let degree = u64::from(f.degree().unwrap_or(0));
        if degree.saturating_mul(e) > u64::from(u32::MAX) {
            return Err(Error::Overflow(format!(
                "a polynomial of degree {degree} to the power {e} has degree above 2^32 - 1"
            )));
        }
        let terms = power_size(f, e);
        let what = format!("a polynomial of {} terms to the power {e}", f.len());
        check_bytes::<F>(terms, &what, control)?;
        let mut base = f.clone();
        let mut acc = self.one();
        while e > 0 {
            if let Some(control) = control {
                control.check()?;
            }
            if e & 1 == 1 {
                acc = self.mul_checked(&acc, &base, control)?;
            }
            e >>= 1;
            if e > 0 {
                base = self.mul_checked(&base, &base, control)?;
            }
        }
        Ok(acc)
    }
    /// f divided by its leading coefficient (zero stays zero).
    pub fn monic(&self, f: &Poly<F>) -> Poly<F> {
        match f.leading_coefficient() {
            Some(c) if !self.field.is_one(c) => self.scale(f, &self.field.inv(c).expect("nonzero")),
            _ => f.clone(),
        }
    }

    pub fn evaluate(&self, f: &Poly<F>, point: &[F::Elem]) -> Result<F::Elem> {
        if point.len() != self.nvars() {
            return Err(Error::invalid(format!(
                "evaluation point has {} coordinates for {} variables",
                point.len(),
                self.nvars()
            )));
        }
        let mut acc = self.field.zero();
        for (m, c) in &f.terms {
            let mut v = c.clone();
            for (x, e) in point.iter().zip(m.exponents()) {
                if *e > 0 {
                    v = self.field.mul(&v, &self.field.pow(x, *e as u64));
                }
            }
            acc = self.field.add(&acc, &v);
        }
        Ok(acc)
    }

    /// Replaces each variable i by `images[i]` (a polynomial of the ring `target`), by Horner-free
    /// term expansion with cached powers.
    pub fn substitute(&self, f: &Poly<F>, images: &[Poly<F>], target: &Ring<F>) -> Result<Poly<F>> {
        self.substitute_checked(f, images, target, None)
    }

    /// The same under the memory budget of `control`, interruptible.
    pub fn substitute_within(
        &self,
        f: &Poly<F>,
        images: &[Poly<F>],
        target: &Ring<F>,
        control: &Control,
    ) -> Result<Poly<F>> {
        self.substitute_checked(f, images, target, Some(control))
    }

    fn substitute_checked(
        &self,
        f: &Poly<F>,
        images: &[Poly<F>],
        target: &Ring<F>,
        control: Option<&Control>,
    ) -> Result<Poly<F>> {
        if images.len() != self.nvars() {
            return Err(Error::invalid("substitution needs one image per variable"));
        }
        let terms = substitution_size(f, images, target.nvars());
        check_bytes::<F>(terms, "a substitution", control)?;
        // Powers up to this exponent are cached (x·x^k from x^k); higher ones are computed by
        // squaring, so that x^(2^32 - 1) never fills a cache with 2^32 powers.
        const CACHED: u32 = 64;
        let mut powers: Vec<Vec<Poly<F>>> = images
            .iter()
            .map(|g| vec![target.one(), g.clone()])
            .collect();
        let mut acc = Poly::zero();
        for (m, c) in &f.terms {
            if let Some(control) = control {
                control.check()?;
            }
            let mut t = target.constant(c.clone());
            for (i, &e) in m.exponents().iter().enumerate() {
                if e == 0 {
                    continue;
                }
                if e > CACHED {
                    let power = target.pow_checked(&images[i], u64::from(e), control)?;
                    t = target.mul_checked(&t, &power, control)?;
                    continue;
                }
                while powers[i].len() <= e as usize {
                    let next =
                        target.mul_checked(powers[i].last().unwrap(), &images[i], control)?;
                    powers[i].push(next);
                }
                t = target.mul_checked(&t, &powers[i][e as usize], control)?;
            }
            acc = target.add(&acc, &t);
        }
        Ok(acc)
    }

    /// Polynomial text that [`crate::parse::parse_poly`] reads back to the same polynomial.
    pub fn format(&self, f: &Poly<F>) -> String {
        if f.is_zero() {
            return "0".into();
        }
        let mut out = String::new();
        for (k, (m, c)) in f.terms.iter().enumerate() {
            let text = self.field.format(c);
            let (negative, magnitude) = match text.strip_prefix('-') {
                Some(rest) if is_atom(rest) => (true, rest.to_string()),
                _ => (false, text),
            };
            if k == 0 {
                if negative {
                    out.push('-');
                }
            } else {
                out.push_str(if negative { " - " } else { " + " });
            }
            let magnitude = if is_atom(&magnitude) {
                magnitude
            } else {
                format!("({magnitude})")
            };
            if m.is_one() {
                out.push_str(&magnitude);
            } else if magnitude == "1" {
                out.push_str(&m.format(&self.names));
            } else {
                out.push_str(&magnitude);
                out.push('*');
                out.push_str(&m.format(&self.names));
            }
        }
        out
    }
}

/// Announces `terms` terms of polynomials over F for `what` to the memory budget.
fn check_bytes<F: Field>(terms: u64, what: &str, control: Option<&Control>) -> Result<()> {
    let bytes = terms.saturating_mul(std::mem::size_of::<(Monomial, F::Elem)>() as u64);
    match control {
        Some(control) => control.check_memory(bytes, what),
        None => check_memory_default(bytes, what),
    }
}

/// The number of monomials of degree at most `degree` in `n` variables, C(n + degree, n),
/// saturating at u64::MAX.
pub fn monomials_up_to(n: usize, degree: u64) -> u64 {
    let mut count: u128 = 1;
    for k in 1..=n as u128 {
        match count.checked_mul(u128::from(degree) + k) {
            Some(product) if product / k <= u128::from(u64::MAX) => count = product / k,
            _ => return u64::MAX,
        }
    }
    count as u64
}

/// The variables that occur in f.
fn support<F: Field>(f: &Poly<F>) -> usize {
    let n = f.terms.first().map_or(0, |(m, _)| m.nvars());
    (0..n)
        .filter(|&i| f.terms.iter().any(|(m, _)| m.exponents()[i] > 0))
        .count()
}

/// An upper bound on the number of terms of f^e: at most C(|f| + e - 1, e) products of e terms,
/// and at most the monomials of degree e·deg f in the variables of f.
pub fn power_size<F: Field>(f: &Poly<F>, e: u64) -> u64 {
    if f.len() <= 1 {
        return f.len() as u64;
    }
    let by_degree = monomials_up_to(
        support(f),
        e.saturating_mul(u64::from(f.degree().unwrap_or(0))),
    );
    let by_products = {
        // C(e + |f| - 1, |f| - 1), saturating.
        let mut count: u128 = 1;
        for k in 1..f.len() as u128 {
            match count.checked_mul(u128::from(e) + k) {
                Some(product) if product / k <= u128::from(u64::MAX) => count = product / k,
                _ => return by_degree,
            }
        }
        count as u64
    };
    by_degree.min(by_products)
}

/// An upper bound on the number of terms of f with x_i replaced by `images[i]`: each term x^α
/// gives at most Π |image_i|^α_i terms, and the result has at most the monomials of its degree
/// in `n` variables.
pub fn substitution_size<F: Field>(f: &Poly<F>, images: &[Poly<F>], n: usize) -> u64 {
    let mut degree = 0u64;
    let mut products = 0u64;
    for (m, _) in &f.terms {
        let mut term_degree = 0u64;
        let mut count = 1u64;
        for (&e, image) in m.exponents().iter().zip(images) {
            let image_degree = u64::from(image.degree().unwrap_or(0));
            term_degree = term_degree.saturating_add(u64::from(e).saturating_mul(image_degree));
            count = count.saturating_mul((image.len() as u64).max(1).saturating_pow(e));
        }
        degree = degree.max(term_degree);
        products = products.saturating_add(count);
    }
    products.min(monomials_up_to(n, degree))
}

/// A coefficient text that needs no parentheses after a sign or before `*`.
fn is_atom(s: &str) -> bool {
    !s.is_empty() && !s.contains([' ', '+', '-'])
}

#[cfg(test)]
mod tests {
    use crate::control::Control;
    use crate::error::Error;
    use crate::field::Field;
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;
    use crate::rng::Rng;
    use crate::test_support::{random_poly, ring_32003};

    /// Powers whose result cannot exist are refused before anything is allocated (an API fuzz
    /// run found `f ** 2**32` aborting the interpreter on a failed allocation): a degree above
    /// 2^32 - 1 is an overflow, a result beyond the memory budget a resource limit.
    #[test]
    fn huge_powers_are_refused_before_allocating() {
        let ring = ring_32003(&["x", "y", "z"], MonomialOrder::Grevlex);
        let f = parse_poly(&ring, "x + y + z + 1").unwrap();
        assert!(matches!(ring.pow(&f, 1 << 32), Err(Error::Overflow(_))));
        // (x + y + z + 1)^3000 has C(3003, 3), about 4.5e9, terms: far beyond 64 MiB.
        let budget = Control::new().with_memory_budget(64 << 20);
        let err = ring.pow_within(&f, 3000, &budget).unwrap_err();
        assert!(matches!(err, Error::ResourceLimit(_)), "{err}");
    }

    /// The merge agrees with the plain sum of f and the shifted, scaled terms of g (like terms
    /// added, zeros dropped, sorted anew by `from_terms`), for two orders, cancellations
    /// included (g = f shifted by 1 with c = -1), and appends after what `out` held.
    #[test]
    fn add_scaled_agrees_with_the_sum_of_terms() {
        let mut rng = Rng::new(2026);
        for order in [MonomialOrder::Grevlex, MonomialOrder::Lex] {
            let ring = ring_32003(&["x", "y", "z", "w"], order);
            for round in 0..300 {
                let (f_len, g_len) = (rng.below(12) as usize, rng.below(12) as usize);
                let f = random_poly(&ring, &mut rng, f_len, 4);
                let g = if round % 5 == 0 {
                    f.clone()
                } else {
                    random_poly(&ring, &mut rng, g_len, 3)
                };
                let m = random_poly(&ring, &mut rng, 1, 2)
                    .leading_monomial()
                    .cloned()
                    .unwrap_or_else(|| crate::monomial::Monomial::one(4));
                let c = if round % 5 == 0 {
                    32002
                } else {
                    rng.below(32003)
                };
                let shifted = g
                    .terms()
                    .iter()
                    .map(|(n, d)| (n.mul(&m).unwrap(), ring.field.mul(d, &c)));
                let expected = ring.from_terms(f.terms().iter().cloned().chain(shifted));
                assert_eq!(ring.add_scaled(&f, &c, &m, &g).unwrap(), expected);
                let prefix = ring.one().into_terms();
                let mut out = prefix.clone();
                ring.add_scaled_into(f.terms(), &c, &m, g.terms(), &mut out)
                    .unwrap();
                assert_eq!(out[..1], prefix[..]);
                assert_eq!(out[1..], expected.terms()[..]);
            }
        }
    }
}
