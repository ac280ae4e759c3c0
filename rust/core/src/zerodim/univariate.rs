//! Dense univariate polynomials (coefficient of x^i at index i) and their squarefree part,
//! correct in positive characteristic: where the derivative vanishes identically the polynomial
//! is a p-th power and p-th roots of the coefficients are taken (finite fields are perfect).

use crate::field::Field;

pub type Univariate<F> = Vec<<F as Field>::Elem>;

pub fn trim<F: Field>(field: &F, p: &mut Univariate<F>) {
    while p.last().is_some_and(|c| field.is_zero(c)) {
        p.pop();
    }
}

/// Degree; `None` for zero.
pub fn degree<F: Field>(p: &Univariate<F>) -> Option<usize> {
    p.len().checked_sub(1)
}

pub fn monic<F: Field>(field: &F, p: &Univariate<F>) -> Univariate<F> {
    match p.last() {
        Some(lc) => {
            let inv = field.inv(lc).expect("nonzero leading coefficient");
            p.iter().map(|c| field.mul(c, &inv)).collect()
        }
        None => vec![],
    }
}

pub fn derivative<F: Field>(field: &F, p: &Univariate<F>) -> Univariate<F> {
    let mut d: Univariate<F> = p
        .iter()
        .enumerate()
        .skip(1)
        .map(|(i, c)| field.mul(c, &field.from_i64(i as i64)))
        .collect();
    trim(field, &mut d);
    d
}

/// (quotient, remainder) of a by b ≠ 0.
pub fn divide<F: Field>(
    field: &F,
    a: &Univariate<F>,
    b: &Univariate<F>,
) -> (Univariate<F>, Univariate<F>) {
    let db = degree::<F>(b).expect("division by zero polynomial");
    let inv = field.inv(&b[db]).expect("nonzero");
    let mut r = a.clone();
    let mut q = vec![field.zero(); a.len().saturating_sub(db)];
    while degree::<F>(&r).is_some_and(|dr| dr >= db) {
        let dr = r.len() - 1;
        let c = field.mul(&r[dr], &inv);
        for (i, bi) in b.iter().enumerate() {
            r[dr - db + i] = field.sub(&r[dr - db + i], &field.mul(&c, bi));
        }
        q[dr - db] = c;
        trim(field, &mut r);
    }
    trim(field, &mut q);
    (q, r)
}

/// Monic greatest common divisor (Euclid).
pub fn gcd<F: Field>(field: &F, a: &Univariate<F>, b: &Univariate<F>) -> Univariate<F> {
    let (mut a, mut b) = (a.clone(), b.clone());
    while !b.is_empty() {
        let r = divide(field, &a, &b).1;
        a = b;
        b = r;
    }
    monic(field, &a)
}

pub fn multiply<F: Field>(field: &F, a: &Univariate<F>, b: &Univariate<F>) -> Univariate<F> {
    if a.is_empty() || b.is_empty() {
        return vec![];
    }
    let mut out = vec![field.zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] = field.add(&out[i + j], &field.mul(x, y));
        }
    }
    out
}

/// a − b.
pub fn subtract<F: Field>(field: &F, a: &Univariate<F>, b: &Univariate<F>) -> Univariate<F> {
    let mut out: Univariate<F> = (0..a.len().max(b.len()))
        .map(|i| match (a.get(i), b.get(i)) {
            (Some(x), Some(y)) => field.sub(x, y),
            (Some(x), None) => x.clone(),
            (None, Some(y)) => field.neg(y),
            (None, None) => unreachable!(),
        })
        .collect();
    trim(field, &mut out);
    out
}

/// (s, t) with s·a + t·b = gcd(a, b) monic, deg s < deg b and deg t < deg a (extended Euclid).
pub fn bezout<F: Field>(
    field: &F,
    a: &Univariate<F>,
    b: &Univariate<F>,
) -> (Univariate<F>, Univariate<F>) {
    let (mut r0, mut r1) = (a.clone(), b.clone());
    let (mut s0, mut s1) = (vec![field.one()], vec![]);
    let (mut t0, mut t1) = (vec![], vec![field.one()]);
    while !r1.is_empty() {
        let (q, r) = divide(field, &r0, &r1);
        let s2 = subtract(field, &s0, &multiply(field, &q, &s1));
        let t2 = subtract(field, &t0, &multiply(field, &q, &t1));
        (r0, r1, s0, s1, t0, t1) = (r1, r, s1, s2, t1, t2);
    }
    let inv = field
        .inv(r0.last().expect("not both zero"))
        .expect("nonzero");
    let scale = |p: Univariate<F>| p.iter().map(|c| field.mul(c, &inv)).collect();
    (scale(s0), scale(t0))
}

/// a·b mod m.
pub fn multiply_mod<F: Field>(
    field: &F,
    a: &Univariate<F>,
    b: &Univariate<F>,
    m: &Univariate<F>,
) -> Univariate<F> {
    divide(field, &multiply(field, a, b), m).1
}

/// a^e mod m, by square-and-multiply.
pub fn power_mod<F: Field>(
    field: &F,
    a: &Univariate<F>,
    mut e: u64,
    m: &Univariate<F>,
) -> Univariate<F> {
    let mut base = divide(field, a, m).1;
    let mut acc = divide(field, &vec![field.one()], m).1;
    while e > 0 {
        if e & 1 == 1 {
            acc = multiply_mod(field, &acc, &base, m);
        }
        base = multiply_mod(field, &base, &base, m);
        e >>= 1;
    }
    acc
}

/// The polynomial g with g^p = w, for w a p-th power in characteristic p.
fn pth_root_polynomial<F: Field>(field: &F, w: &Univariate<F>, p: usize) -> Univariate<F> {
    w.iter()
        .step_by(p)
        .map(|c| field.pth_root(c).expect("positive characteristic"))
        .collect()
}

/// The monic squarefree part (product of the distinct monic irreducible factors) of p ≠ 0.
///
/// f = ∏ g_j^{e_j}: u = f / gcd(f, f') is the product of the g_j with p ∤ e_j; removing those
/// from gcd(f, f') leaves ∏_{p | e_j} g_j^{e_j}, a p-th power whose root is handled recursively.
pub fn squarefree_part<F: Field>(field: &F, f: &Univariate<F>) -> Univariate<F> {
    if degree::<F>(f).unwrap_or(0) == 0 {
        return vec![field.one()];
    }
    let df = derivative(field, f);
    let p = field.characteristic_u64().unwrap_or(0) as usize;
    if df.is_empty() {
        return squarefree_part(field, &pth_root_polynomial(field, f, p));
    }
    let mut w = gcd(field, f, &df);
    let u = divide(field, f, &w).0;
    loop {
        let g = gcd(field, &w, &u);
        if degree::<F>(&g).unwrap_or(0) == 0 {
            break;
        }
        w = divide(field, &w, &g).0;
    }
    let rest = if degree::<F>(&w).unwrap_or(0) == 0 {
        vec![field.one()]
    } else {
        squarefree_part(field, &pth_root_polynomial(field, &w, p))
    };
    monic(field, &multiply(field, &u, &rest))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;

    fn expand(f: &PrimeField, factors: &[(&[u64], usize)]) -> Vec<u64> {
        let mut acc = vec![1];
        for (g, e) in factors {
            for _ in 0..*e {
                acc = multiply(f, &acc, &g.to_vec());
            }
        }
        acc
    }

    #[test]
    fn squarefree_part_in_characteristic_p() {
        // Over GF(3): (x + 1)^3 (x^2 + 1)^2 x^6 has squarefree part (x + 1)(x^2 + 1)x; the
        // derivative of (x + 1)^3 x^6 vanishes, which a characteristic-0 method would mishandle.
        let f = PrimeField::new(3).unwrap();
        let poly = expand(&f, &[(&[1, 1], 3), (&[1, 0, 1], 2), (&[0, 1], 6)]);
        let expected = expand(&f, &[(&[1, 1], 1), (&[1, 0, 1], 1), (&[0, 1], 1)]);
        assert_eq!(squarefree_part(&f, &poly), expected);
        let p_power = expand(&f, &[(&[1, 1], 3), (&[0, 1], 6)]);
        assert_eq!(
            squarefree_part(&f, &p_power),
            expand(&f, &[(&[1, 1], 1), (&[0, 1], 1)])
        );
        // x^9 - x over GF(3) is squarefree (it is the product of x - a over GF(9) ⊃ GF(3)).
        let mut frob = vec![0; 10];
        frob[9] = 1;
        frob[1] = 2;
        assert_eq!(squarefree_part(&f, &frob), frob);
    }
}
