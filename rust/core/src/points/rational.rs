//! The rational points over Q of a zero-dimensional system, exactly.
//!
//! Method (the primitive element route): from the grevlex basis, the radical (Seidenberg 1974)
//! gives a reduced quotient A = Q[x]/√I of dimension D, with D distinct points over the
//! algebraic closure. The linear forms u_c = x_1 + c·x_2 + ... + c^(n−1)·x_n for c = 0, 1, 2, ...
//! are tried in turn; all but at most (n − 1)·D(D − 1)/2 values of c separate the points, and a
//! separating u_c has a minimal polynomial m of degree D (Kronecker's primitive element). Then
//! x_i ≡ g_i(u_c) in A (the shape representation from Krylov sequences, Faugère and Mou 2011,
//! retried with another random functional in the rare unlucky case), and the rational points are
//! (g_1(t), ..., g_n(t)) for the rational roots t of m ([`crate::points::rational_roots`],
//! p-adic lifting). Each point is checked in every input polynomial before it is returned.
//!
//! The closed points over Q (the Galois orbits of the solutions) are the irreducible factors
//! m_j of m over Q (Berlekamp–Zassenhaus, [`crate::zerodim::irreducible`]): the orbit of m_j
//! has deg m_j solutions, its residue field is Q[t]/(m_j), and x_i = g_i(t) mod m_j there.
//! Each is checked by substituting these coordinates into every input polynomial modulo m_j.

use super::solve::check_point;
use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::error::{Error, Result};
use crate::field::RationalField;
use crate::groebner::order_change::shape::{shape_representation, ShapeRepresentation};
use crate::groebner::{groebner_basis, Engine};
use crate::order::MonomialOrder;
use crate::points::rational_roots::rational_roots;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use crate::univariate::{self, degree, Univariate};
use crate::zerodim::irreducible::irreducible_factors;
use crate::zerodim::maximal_rational::separating_candidate;
use crate::zerodim::radical::zero_dimensional_radical;
use crate::zerodim::Quotient;
use num_rational::BigRational;

/// The seed of the random functionals (the result does not depend on it).
const SEED: u64 = 0x0051_ab1e;
/// Random functionals tried per separating form: a failure has probability at most D/2^16 each.
const FUNCTIONAL_ATTEMPTS: usize = 8;

/// The points of V(gens) in Q^n, for a zero-dimensional system; sorted. An error for systems
/// of positive dimension (their rational points are not a finite list).
pub fn rational_points_over_q(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    engine: Engine,
    control: &Control,
) -> Result<Vec<Vec<BigRational>>> {
    let Some(shape) = separating_shape(ring, gens, engine, control)? else {
        return Ok(vec![]);
    };
    let mut points: Vec<Vec<BigRational>> = rational_roots(&shape.minimal_polynomial, control)?
        .iter()
        .map(|t| shape.point(&RationalField, t))
        .collect();
    for point in &points {
        check_point(ring, gens, point)?;
    }
    points.sort();
    Ok(points)
}

/// One closed point over Q: a Galois orbit of solutions over the algebraic closure.
#[derive(Clone, Debug)]
pub struct RationalClosedPoint {
    /// The number of solutions in the orbit, [Q(P) : Q] = deg of the minimal polynomial.
    pub degree: usize,
    /// The separating linear form u as pairs (variable, coefficient).
    pub form: Vec<(usize, BigRational)>,
    /// The minimal polynomial m of u at the point (monic, irreducible over Q): the residue
    /// field is Q[t]/(m).
    pub minimal_polynomial: Univariate<RationalField>,
    /// x_i = g_i(t) in Q[t]/(m), deg g_i < deg m, for every variable.
    pub coordinates: Vec<Univariate<RationalField>>,
}

impl RationalClosedPoint {
    /// The coordinates when the point is rational (degree 1).
    pub fn rational_point(&self) -> Option<Vec<BigRational>> {
        (self.degree == 1).then(|| {
            let t = -self.minimal_polynomial[0].clone();
            self.coordinates
                .iter()
                .map(|g| univariate::evaluate(&RationalField, g, &t))
                .collect()
        })
    }
}

/// The closed points of V(gens) over Q for a zero-dimensional system, by increasing degree.
pub fn closed_points_over_q(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    engine: Engine,
    control: &Control,
) -> Result<Vec<RationalClosedPoint>> {
    let Some(shape) = separating_shape(ring, gens, engine, control)? else {
        return Ok(vec![]);
    };
    let mut out = Vec::new();
    for m in irreducible_factors(&shape.minimal_polynomial, control)? {
        control.check()?;
        let coordinates: Vec<Univariate<RationalField>> = shape
            .coordinates
            .iter()
            .map(|g| univariate::remainder(&RationalField, g, &m))
            .collect();
        check_closed_point(ring, gens, &m, &coordinates)?;
        out.push(RationalClosedPoint {
            degree: m.len() - 1,
            form: shape.form.clone(),
            minimal_polynomial: m,
            coordinates,
        });
    }
    Ok(out)
}

/// An error unless every generator vanishes at x_i = g_i(t) in Q[t]/(m).
fn check_closed_point(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    m: &[BigRational],
    coordinates: &[Univariate<RationalField>],
) -> Result<()> {
    let field = &RationalField;
    let modulo = univariate::Modulo::new(field, m);
    for (k, g) in gens.iter().enumerate() {
        let mut value: Univariate<RationalField> = vec![];
        for (monomial, c) in g.terms() {
            let mut term = vec![c.clone()];
            for (i, &e) in monomial.exponents().iter().enumerate() {
                if e > 0 {
                    let power = modulo.power(
                        &modulo.reduce(&coordinates[i]),
                        &[u64::from(e)],
                        &Control::new(),
                    )?;
                    term = modulo.multiply(&term, &power);
                }
            }
            value = univariate::add(field, &value, &term);
        }
        if !value.is_empty() {
            return Err(Error::invalid(format!(
                "internal check failed: a closed point with minimal polynomial {} does not satisfy equation {} ({})",
                univariate::format(field, m, "t"),
                k + 1,
                ring.format(g)
            )));
        }
    }
    Ok(())
}

/// A shape representation x_i ≡ g_i(u) of Q[x]/√I for a separating linear form u, in the
/// variables of `ring`; `None` for the unit ideal (no points at all).
pub fn separating_shape(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    engine: Engine,
    control: &Control,
) -> Result<Option<ShapeRepresentation<RationalField>>> {
    let r = ring.with_order(MonomialOrder::Grevlex)?;
    let adopted: Vec<Poly<RationalField>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
    let gb = groebner_basis(&r, &adopted, engine, control)?;
    if gb.is_unit_ideal() {
        return Ok(None);
    }
    if krull_dimension(r.nvars(), &gb.leading_monomials()) > 0 {
        return Err(Error::invalid(
            "rational points over Q: the system has infinitely many solutions over the algebraic closure (positive dimension); only zero-dimensional systems are solved over Q",
        ));
    }
    let radical = zero_dimensional_radical(&gb, engine, control)?;
    let quotient = Quotient::new(radical, control)?;
    let d = quotient.dimension();
    let n = r.nvars() as u64;
    let last = n.saturating_sub(1) * (d as u64 * (d as u64).saturating_sub(1) / 2);
    let mut rng = Rng::new(SEED);
    for c in 0..=last {
        control.check()?;
        let u = separating_candidate(&r, c);
        let m = quotient.minimal_polynomial(&u, control)?;
        if degree::<RationalField>(&m) != Some(d) {
            continue;
        }
        let form = linear_form(&u);
        for _ in 0..FUNCTIONAL_ATTEMPTS {
            if let Some(shape) = shape_representation(&quotient, &form, &mut rng, control)? {
                return Ok(Some(shape));
            }
        }
    }
    Err(Error::invalid(
        "rational points over Q: no linear form separated the points of the reduced quotient, which the primitive element theorem rules out",
    ))
}

/// The linear form u as pairs (variable, coefficient).
fn linear_form(u: &Poly<RationalField>) -> Vec<(usize, BigRational)> {
    u.terms()
        .iter()
        .filter_map(|(m, c)| m.pure_power_variable().map(|i| (i, c.clone())))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::Field;
    use crate::parse::parse_poly;

    /// The rational points of the system, each as "x, y, ..." in the field's notation.
    fn points_of(vars: &[&str], equations: &[&str]) -> Vec<String> {
        let names = vars.iter().map(|s| s.to_string()).collect();
        let ring = Ring::new(RationalField, names, MonomialOrder::Grevlex).unwrap();
        let gens: Vec<_> = equations
            .iter()
            .map(|t| parse_poly(&ring, t).unwrap())
            .collect();
        let mut texts = rational_points_over_q(&ring, &gens, Engine::Buchberger, &Control::new())
            .unwrap()
            .iter()
            .map(|p| {
                p.iter()
                    .map(|c| RationalField.format(c))
                    .collect::<Vec<_>>()
                    .join(", ")
            })
            .collect::<Vec<String>>();
        // Compared as sorted texts, whatever order the solver lists them in.
        texts.sort();
        texts
    }

    #[test]
    fn rational_points_agree_with_sympy() {
        // All four by hand: x + y = ±3 and x·y = 2.
        assert_eq!(
            points_of(&["x", "y"], &["x^2 + y^2 - 5", "x*y - 2"]),
            ["-1, -2", "-2, -1", "1, 2", "2, 1"]
        );
        // katsura-2: 4 solutions over the algebraic closure, the rational ones (1/5, 0, 2/5) and
        // (1, 0, 0) (computed with sympy 1.14, `solve`).
        assert_eq!(
            points_of(
                &["x", "y", "z"],
                &[
                    "x^2 + y^2 + z^2 - x",
                    "2*x*y + 2*y*z - y",
                    "x + 2*y + 2*z - 1"
                ]
            ),
            ["1, 0, 0", "1/5, 0, 2/5"]
        );
        // 6x^3 − 5x^2 − 2x + 1 = (x − 1)(2x + 1)(3x − 1) (computed with sympy 1.14, `factor`).
        assert_eq!(
            points_of(&["x", "y"], &["6*x^3 - 5*x^2 - 2*x + 1", "3*y - 2*x^2 - 1"]),
            ["-1/2, 1/2", "1, 1", "1/3, 11/27"]
        );
        // x^2·y = 2, x·y^2 = 4x − y: four solutions, none rational (computed with sympy 1.14).
        assert!(points_of(&["x", "y"], &["x^2*y - 2", "x*y^2 - 4*x + y"]).is_empty());
        // √2 is irrational; a double point counts once.
        assert!(points_of(&["x", "y"], &["x^2 - 2", "y - x"]).is_empty());
        assert_eq!(points_of(&["x", "y"], &["x^2", "y - x - 1"]), ["0, 1"]);
        // The unit ideal has no points.
        assert!(points_of(&["x"], &["x", "x - 1"]).is_empty());
    }

    /// (degree, coefficients of the minimal polynomial from the constant term up) of each closed
    /// point.
    fn closed_of(vars: &[&str], equations: &[&str]) -> Vec<(usize, String)> {
        let names = vars.iter().map(|s| s.to_string()).collect();
        let ring = Ring::new(RationalField, names, MonomialOrder::Grevlex).unwrap();
        let gens: Vec<_> = equations
            .iter()
            .map(|t| parse_poly(&ring, t).unwrap())
            .collect();
        let points =
            closed_points_over_q(&ring, &gens, Engine::Buchberger, &Control::new()).unwrap();
        let rational =
            rational_points_over_q(&ring, &gens, Engine::Buchberger, &Control::new()).unwrap();
        let mut from_closed: Vec<_> = points.iter().filter_map(|p| p.rational_point()).collect();
        from_closed.sort();
        assert_eq!(
            from_closed, rational,
            "the degree-1 closed points are the rational points"
        );
        points
            .iter()
            .map(|p| {
                let coefficients: Vec<String> =
                    p.minimal_polynomial.iter().map(|c| c.to_string()).collect();
                (p.degree, coefficients.join(" "))
            })
            .collect()
    }

    #[test]
    fn closed_points_over_q_are_the_galois_orbits() {
        // x = y = ±√2: one orbit of degree 2, u = x with minimal polynomial t^2 − 2.
        assert_eq!(
            closed_of(&["x", "y"], &["x^2 - 2", "y - x"]),
            [(2, "-2 0 1".to_string())]
        );
        // katsura-2: two rational solutions and a conjugate pair (computed with sympy 1.14,
        // `solve`: 4 solutions, 2 rational).
        let degrees: Vec<usize> = closed_of(
            &["x", "y", "z"],
            &[
                "x^2 + y^2 + z^2 - x",
                "2*x*y + 2*y*z - y",
                "x + 2*y + 2*z - 1",
            ],
        )
        .iter()
        .map(|(d, _)| *d)
        .collect();
        assert_eq!(degrees, [1, 1, 2]);
        // Four rational points: four closed points of degree 1.
        assert_eq!(
            closed_of(&["x", "y"], &["x^2 + y^2 - 5", "x*y - 2"]).len(),
            4
        );
        // x^4 + 4 = (x^2 − 2x + 2)(x^2 + 2x + 2): two orbits of degree 2 (Sophie Germain).
        let sophie = closed_of(&["x"], &["x^4 + 4"]);
        assert_eq!(
            sophie,
            [(2, "2 -2 1".to_string()), (2, "2 2 1".to_string())]
        );
    }

    #[test]
    fn positive_dimension_over_q_is_a_clear_error() {
        let ring = Ring::new(
            RationalField,
            vec!["x".into(), "y".into()],
            MonomialOrder::Grevlex,
        )
        .unwrap();
        let gens = vec![parse_poly(&ring, "x - y").unwrap()];
        let err =
            rational_points_over_q(&ring, &gens, Engine::Buchberger, &Control::new()).unwrap_err();
        assert!(err.to_string().contains("positive dimension"), "{err}");
    }
}
