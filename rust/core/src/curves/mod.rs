//! Curves over finite fields: smoothness, genus, point counts over every GF(q^r), the zeta
//! function and the order of the Jacobian.
//!
//! A [`Curve`] is read from equations ([`Curve::new`]) as one of two models:
//! - a projective curve in P^(n−1) cut out by homogeneous equations (one for a plane curve,
//!   n = 3; n − 2 for a complete intersection; more for other space curves such as the twisted
//!   cubic), or the projective closure of an affine plane curve; smooth when the Jacobian
//!   criterion says so ([`jacobian`]), its genus then by Plücker's formula or the arithmetic
//!   genus of the Hilbert polynomial ([`genus`]). That is the genus of the curve when it is
//!   connected: always for plane curves and complete intersections, assumed (not checked) for
//!   space curves given by more than n − 2 equations;
//! - a hyperelliptic model y² + h(x)y = f(x) in any characteristic, with its smooth projective
//!   model ([`hyperelliptic`]), whose plane closure may be singular at infinity.
//!
//! Everything else singular is out of the first edition's scope and refused with a message.
//! Counts over GF(q^r) go fibre by fibre ([`fibres`]) on an embedding of GF(q) into GF(q^r)
//! ([`embedding`]); space curves fibre by fibre over a projection onto one coordinate
//! ([`space_fibres`]). The zeta
//! function follows from N_1..N_g ([`zeta`], Weil 1948), and counts are compared with the
//! Hasse–Weil and Serre bounds ([`bounds`]).

pub mod binary_roots;
pub mod bounds;
pub mod embedding;
pub mod fibres;
pub mod frobenius_orbits;
pub mod genus;
pub mod hyperelliptic;
pub mod jacobian;
pub mod root_count;
pub mod space_fibres;
pub mod zeta;

#[cfg(test)]
mod tests;

use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::field_kind::AnyField;
use crate::groebner::{groebner_basis, Engine};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::points::closed::ClosedPoint;
use crate::points::extension::map_poly;
use crate::poly::{Poly, Ring};
use crate::univariate::{trimmed, Univariate};
use bounds::BoundCheck;
use embedding::{embedding, extension_of, PowerBasis};
use fibres::{check_fibre_cost, check_fibre_cost_within, count_fibred, FibredCurve};
use hyperelliptic::Hyperelliptic;
use num_bigint::BigInt;
use zeta::Zeta;

/// Most fibres (one per Frobenius orbit of the projection's values) a count of a curve in
/// P^n, n ≥ 3, goes through: each costs a specialised basis and its roots, tens of
/// microseconds.
pub const SPACE_CURVE_FIBRE_LIMIT: u128 = 1 << 22;

/// The model a curve is read as.
#[derive(Clone, Debug)]
pub enum Model<F: Field> {
    /// Homogeneous equations of a curve in P^(n−1), n ≥ 3 (one equation for a plane curve, n − 2
    /// for a complete intersection, or more). `closure_of_affine`: the equations are the closure of an affine plane curve
    /// whose last variable is the new homogenizing one.
    Projective {
        ring: Ring<F>,
        gens: Vec<Poly<F>>,
        closure_of_affine: bool,
    },
    /// y² + h(x)y = f(x) (the equation `equation` in the two variables of `ring`) and its
    /// smooth projective model.
    Hyperelliptic {
        ring: Ring<F>,
        equation: Poly<F>,
        model: Hyperelliptic<F>,
    },
}

/// A curve over a finite field GF(q), in one of the supported models.
#[derive(Clone, Debug)]
pub struct Curve<F: Field> {
    pub field: F,
    pub model: Model<F>,
    smooth: bool,
    /// The genus of the smooth projective model; `None` when out of scope (with the reason).
    genus: std::result::Result<usize, String>,
}

impl<F: PowerBasis> Curve<F> {
    /// The curve defined by `gens` in the space of `ring`: homogeneous equations in three or more
    /// variables as a projective curve, anything else as an affine plane curve.
    pub fn new(ring: &Ring<F>, gens: &[Poly<F>], control: &Control) -> Result<Self> {
        if ring.field.order().is_none() {
            return Err(Error::invalid(format!(
                "curves are studied over finite fields, not {}",
                ring.field.spec()
            )));
        }
        let gens: Vec<Poly<F>> = gens.iter().filter(|g| !g.is_zero()).cloned().collect();
        if gens.is_empty() {
            return Err(Error::invalid(
                "no nonzero equation: the whole space is not a curve",
            ));
        }
        let homogeneous = gens.iter().all(|g| g.is_homogeneous());
        if homogeneous && ring.nvars() >= 3 {
            return Self::projective(ring, gens, false, control);
        }
        if ring.nvars() != 2 {
            return Err(Error::invalid(format!(
                "an affine curve is read in the plane (two variables), not in {} variables{}",
                ring.nvars(),
                if homogeneous {
                    ""
                } else {
                    "; give a space curve by the homogeneous equations of its projective closure"
                }
            )));
        }
        Self::affine_plane(ring, &gens, control)
    }

    fn projective(
        ring: &Ring<F>,
        gens: Vec<Poly<F>>,
        closure_of_affine: bool,
        control: &Control,
    ) -> Result<Self> {
        let n = ring.nvars();
        let r = ring.with_order(MonomialOrder::Grevlex)?;
        let adopted: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
        let gb = groebner_basis(&r, &adopted, Engine::Auto, control)?;
        let dimension = krull_dimension(n, &gb.leading_monomials());
        if dimension != 2 {
            return Err(Error::invalid(format!(
                "not a curve: the equations define a projective set of dimension {} in P^{}",
                dimension - 1,
                n - 1
            )));
        }
        let gens = if n == 3 {
            if gb.polys.len() != 1 {
                return Err(Error::invalid(
                    "a plane curve is given by one equation; these equations do not generate a principal ideal",
                ));
            }
            vec![gb.polys[0].clone()]
        } else {
            // n − 2 equations: a complete intersection (connected, Hartshorne 1977, III.7.8);
            // more: a curve whose connectedness the genus below assumes.
            adopted
        };
        let smooth = jacobian::is_smooth(&r, &gens, true, control)?;
        let genus = if !smooth {
            Err(Self::singular_refusal())
        } else if n == 3 {
            Ok(genus::plane_curve_genus(gens[0].degree().unwrap_or(0)))
        } else {
            usize::try_from(genus::arithmetic_genus(&gb, control)?).map_err(|_| {
                "the arithmetic genus is negative: the curve is not connected".to_string()
            })
        };
        Ok(Curve {
            field: ring.field.clone(),
            model: Model::Projective {
                ring: r,
                gens,
                closure_of_affine,
            },
            smooth,
            genus,
        })
    }

    fn affine_plane(ring: &Ring<F>, gens: &[Poly<F>], control: &Control) -> Result<Self> {
        let r = ring.with_order(MonomialOrder::Grevlex)?;
        let adopted: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
        let gb = groebner_basis(&r, &adopted, Engine::Auto, control)?;
        let dimension = krull_dimension(2, &gb.leading_monomials());
        if dimension != 1 || gb.polys.len() != 1 {
            return Err(Error::invalid(format!(
                "not a plane curve: the equations define a set of dimension {dimension}{}",
                if dimension == 1 {
                    " that is not cut out by one equation"
                } else {
                    ""
                }
            )));
        }
        let equation = gb.polys[0].clone();
        if let Some(model) = Hyperelliptic::recognise(&r, &equation) {
            let affine_smooth =
                jacobian::is_smooth(&r, std::slice::from_ref(&equation), false, control)?;
            let smooth = affine_smooth && model.smooth_at_infinity(&r.field);
            return Ok(Curve {
                field: ring.field.clone(),
                smooth,
                genus: if smooth {
                    Ok(model.genus)
                } else {
                    Err(Self::singular_refusal())
                },
                model: Model::Hyperelliptic {
                    ring: r,
                    equation,
                    model,
                },
            });
        }
        let (closure_ring, closure) = homogenize(&r, &equation)?;
        Self::projective(&closure_ring, vec![closure], true, control)
    }

    fn singular_refusal() -> String {
        "the curve is singular: the first edition handles singular curves only through the \
         smooth model of a hyperelliptic equation y^2 + h(x)*y = f(x) (smooth in the affine plane)"
            .into()
    }

    /// Whether the model is smooth (for a hyperelliptic equation: its smooth projective model,
    /// i.e. the affine curve and its points at infinity in the chart u = 1/x).
    pub fn is_smooth(&self) -> bool {
        self.smooth
    }

    /// The genus of the smooth projective curve; an error saying why for singular models.
    pub fn genus(&self) -> Result<usize> {
        self.genus.clone().map_err(Error::invalid)
    }

    /// q, the size of the field of definition; an error when q ≥ 2^64 (no count is in reach).
    pub fn q(&self) -> Result<u64> {
        q_of(&self.field)
    }

    /// The ring the model's coordinates live in (projective coordinates for projective models).
    pub fn ring(&self) -> &Ring<F> {
        match &self.model {
            Model::Projective { ring, .. } | Model::Hyperelliptic { ring, .. } => ring,
        }
    }

    /// The equations of the model in [`Curve::ring`]: the projective equations, or the one
    /// hyperelliptic equation.
    fn equations(&self) -> &[Poly<F>] {
        match &self.model {
            Model::Projective { gens, .. } => gens,
            Model::Hyperelliptic { equation, .. } => std::slice::from_ref(equation),
        }
    }

    /// Whether the model's points are projective (else affine points of the plane).
    pub fn is_projective(&self) -> bool {
        matches!(self.model, Model::Projective { .. })
    }

    /// The singular points with coordinates in GF(q): projective points (first nonzero
    /// coordinate 1) of a projective model, affine points of a hyperelliptic equation (whose
    /// smooth model may also be singular at infinity: see [`Curve::is_smooth`]).
    pub fn singular_points(&self, control: &Control) -> Result<Vec<Vec<F::Elem>>> {
        let projective = self.is_projective();
        jacobian::rational_singular_points(self.ring(), self.equations(), projective, control)
    }

    /// The singular closed points: each Galois orbit of singular points over the algebraic
    /// closure once, with its degree and the maximal ideal (a lex triangular set) whose
    /// solutions in GF(q^degree) are its points; projective points in the chart of their
    /// first nonzero coordinate (set to 1), affine points for a hyperelliptic equation (as in
    /// [`Curve::singular_points`]).
    pub fn singular_closed_points(&self, control: &Control) -> Result<Vec<ClosedPoint<F>>> {
        let projective = self.is_projective();
        jacobian::singular_closed_points(self.ring(), self.equations(), projective, control)
    }

    /// #C(GF(q^r)) on the smooth projective model, r ≥ 1.
    pub fn count_points(&self, r: u32, control: &Control) -> Result<u128> {
        if r == 0 {
            return Err(Error::invalid(
                "points are counted over GF(q^r) with r >= 1",
            ));
        }
        self.genus()?;
        self.check_cost(r)?;
        if r == 1 {
            let field = self.field.clone();
            return self.count_over(&field, r, |c| c.clone(), control);
        }
        match extension_of(&self.field, r)? {
            AnyField::Table(e) => {
                self.count_over(&e, r, embedding(&self.field, &e, control)?, control)
            }
            AnyField::Binary(e) => {
                self.count_over(&e, r, embedding(&self.field, &e, control)?, control)
            }
            AnyField::Extension(e) => {
                self.count_over(&e, r, embedding(&self.field, &e, control)?, control)
            }
            other => Err(Error::invalid(format!(
                "GF(q^{r}) over {} came out as {}, not an extension field",
                self.field.spec(),
                other.spec()
            ))),
        }
    }

    /// An error when counting over GF(q^r) is out of reach.
    fn check_cost(&self, r: u32) -> Result<()> {
        let q = self.q()?;
        match &self.model {
            Model::Projective { ring, .. } if ring.nvars() > 3 => check_fibre_cost_within(
                q,
                r,
                SPACE_CURVE_FIBRE_LIMIT,
                &format!("zero-dimensional systems in {} variables", ring.nvars()),
            )
            .map(|_| ()),
            Model::Projective { gens, .. } => {
                check_fibre_cost(q, r, gens[0].degree().unwrap_or(0) as usize).map(|_| ())
            }
            Model::Hyperelliptic { .. } => check_fibre_cost(q, r, 2).map(|_| ()),
        }
    }

    /// The count over `target` = GF(q^r), coefficients mapped by `embed`.
    fn count_over<E: Field>(
        &self,
        target: &E,
        r: u32,
        embed: impl Fn(&F::Elem) -> E::Elem,
        control: &Control,
    ) -> Result<u128> {
        let fibred = match &self.model {
            Model::Projective { ring, gens, .. } if ring.nvars() > 3 => {
                // Names of our own: the curve's may clash with the generator's name of GF(q^r).
                let names = (0..ring.nvars()).map(|i| format!("_x{i}")).collect();
                let to = Ring::new(target.clone(), names, ring.order.clone())?;
                let mapped: Vec<Poly<E>> = gens.iter().map(|g| map_poly(g, &to, &embed)).collect();
                return space_fibres::count_by_projection(&to, &mapped, self.q()?, r, control);
            }
            Model::Projective { gens, .. } => plane_fibres(target, &gens[0], &embed),
            Model::Hyperelliptic { model, .. } => FibredCurve {
                columns: model.columns(target, &embed),
                at_infinity: trimmed(
                    target,
                    model
                        .infinity_polynomial(&self.field)
                        .iter()
                        .map(&embed)
                        .collect(),
                ),
                extra_point: false,
            },
        };
        count_fibred(target, &fibred, self.q()?, r, control)
    }

    /// The zeta function, from N_1..N_g.
    pub fn zeta(&self, control: &Control) -> Result<Zeta> {
        let g = self.genus()?;
        if g > 0 {
            self.check_cost(g as u32)?;
        }
        let counts = (1..=g as u32)
            .map(|r| self.count_points(r, control))
            .collect::<Result<Vec<u128>>>()?;
        Zeta::from_counts(self.q()?, g, &counts)
    }

    /// N_r = `points` over GF(q^r) against the Hasse–Weil and Serre bounds.
    pub fn check_bounds(&self, r: u32, points: u128) -> Result<BoundCheck> {
        Ok(bounds::check_bounds(
            self.q()?,
            r,
            self.genus()?,
            BigInt::from(points),
        ))
    }
}

/// q for a finite field with fewer than 2^64 elements; an error otherwise.
fn q_of<F: Field>(field: &F) -> Result<u64> {
    match crate::field::field_size(field) {
        None => Err(Error::invalid(format!(
            "curves are counted over finite fields, not {}",
            field.spec()
        ))),
        Some(u64::MAX) => Err(Error::ResourceLimit(format!(
            "{} has 2^64 elements or more: counting points fibre by fibre is out of reach there \
             (point counting for large fields is not available in this edition)",
            field.spec()
        ))),
        Some(q) => Ok(q),
    }
}

/// The plane curve F(x, y, z) = 0 fibred over x on the chart z = 1; at infinity (z = 0) the
/// points (1 : y : 0) with F(1, y, 0) = 0, and (0 : 1 : 0) when F(0, 1, 0) = 0.
fn plane_fibres<F: Field, E: Field>(
    target: &E,
    f: &Poly<F>,
    embed: &impl Fn(&F::Elem) -> E::Elem,
) -> FibredCurve<E> {
    let degree = f.degree().unwrap_or(0) as usize;
    let mut columns: Vec<Univariate<E>> = vec![vec![]; degree + 1];
    let mut at_infinity: Univariate<E> = vec![target.zero(); degree + 1];
    let mut y_top = false;
    for (m, c) in f.terms() {
        let [a, b, z] = [0, 1, 2].map(|i| m.exponents()[i] as usize);
        let column = &mut columns[b];
        if column.len() <= a {
            column.resize(a + 1, target.zero());
        }
        let c = embed(c);
        column[a] = target.add(&column[a], &c);
        if z == 0 {
            at_infinity[b] = target.add(&at_infinity[b], &c);
            y_top |= a == 0;
        }
    }
    FibredCurve {
        columns: columns.into_iter().map(|c| trimmed(target, c)).collect(),
        at_infinity: trimmed(target, at_infinity),
        extra_point: !y_top,
    }
}

/// The projective closure of an affine plane curve: the ring with a new last variable and the
/// homogenized equation.
fn homogenize<F: Field>(ring: &Ring<F>, equation: &Poly<F>) -> Result<(Ring<F>, Poly<F>)> {
    let mut names = ring.names().to_vec();
    let fresh = ["z", "w", "t", "h_"]
        .into_iter()
        .find(|name| !names.iter().any(|n| n == name))
        .expect("two names cannot take four");
    names.push(fresh.to_string());
    let closure = Ring::new(ring.field.clone(), names, MonomialOrder::Grevlex)?;
    let degree = equation.degree().unwrap_or(0);
    let terms = equation
        .terms()
        .iter()
        .map(|(m, c)| {
            let mut exps = m.exponents().to_vec();
            exps.push(degree - m.degree());
            Ok((Monomial::from_exponents(exps)?, c.clone()))
        })
        .collect::<Result<Vec<_>>>()?;
    Ok((closure.clone(), closure.from_terms(terms)))
}
