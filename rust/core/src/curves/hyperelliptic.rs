//! Hyperelliptic models y² + h(x)y = f(x), in every characteristic (h = 0 allowed in odd
//! characteristic), and their smooth projective model: the affine curve glued to the chart at
//! infinity v² + H(u)v = F(u), u = 1/x, v = y/x^(g+1), H(u) = u^(g+1) h(1/u),
//! F(u) = u^(2g+2) f(1/u) (Menezes, Wu and Zuccherato 1996). The plane closure of such a curve
//! is singular at infinity once deg f ≥ 4; the smooth model is not, and its points at infinity
//! are the roots of v² + h_(g+1) v − f_(2g+2). The model is smooth at infinity when the
//! chart's equation and its two partial derivatives have no common zero with u = 0, a gcd of
//! univariate polynomials in v.

use super::genus::hyperelliptic_genus;
use crate::field::Field;
use crate::poly::{Poly, Ring};
use crate::univariate::{self, derivative, gcd, trimmed, Univariate};

/// y² + h(x)y = f(x) on the variables `x` and `y` (indices in the ring).
#[derive(Clone, Debug)]
pub struct Hyperelliptic<F: Field> {
    pub x: usize,
    pub y: usize,
    pub h: Univariate<F>,
    pub f: Univariate<F>,
    pub genus: usize,
}

impl<F: Field> Hyperelliptic<F> {
    /// The model, when the equation reads c·y² + h(x)·y − f(x) with c a nonzero constant in one
    /// of the two variables (the second one tried first) and defines a curve (g ≥ 0).
    pub fn recognise(ring: &Ring<F>, equation: &Poly<F>) -> Option<Self> {
        if ring.nvars() != 2 {
            return None;
        }
        [(0, 1), (1, 0)]
            .into_iter()
            .find_map(|(x, y)| Self::with_variables(ring, equation, x, y))
    }

    fn with_variables(ring: &Ring<F>, equation: &Poly<F>, x: usize, y: usize) -> Option<Self> {
        let field = &ring.field;
        let mut columns: [Univariate<F>; 3] = Default::default();
        for (m, c) in equation.terms() {
            let (ex, ey) = (m.exponents()[x] as usize, m.exponents()[y] as usize);
            let column = columns.get_mut(ey)?;
            if column.len() <= ex {
                column.resize(ex + 1, field.zero());
            }
            column[ex] = field.add(&column[ex], c);
        }
        let [c0, c1, c2] = columns.map(|c| trimmed(field, c));
        if c2.len() != 1 {
            return None;
        }
        let inverse = field.inv(&c2[0])?;
        let h = univariate::scale(field, &c1, &inverse);
        let f = univariate::scale(field, &c0, &field.neg(&inverse));
        let genus = hyperelliptic_genus(univariate::degree::<F>(&h), univariate::degree::<F>(&f));
        (genus >= 0).then(|| Hyperelliptic {
            x,
            y,
            h,
            f,
            genus: genus as usize,
        })
    }

    /// v² + h_(g+1) v − f_(2g+2): its roots are the points at infinity of the smooth model.
    pub fn infinity_polynomial(&self, field: &F) -> Univariate<F> {
        let g = self.genus;
        let coefficient = |p: &Univariate<F>, i: usize| p.get(i).cloned().unwrap_or(field.zero());
        vec![
            field.neg(&coefficient(&self.f, 2 * g + 2)),
            coefficient(&self.h, g + 1),
            field.one(),
        ]
    }

    /// Whether the chart at infinity is smooth at u = 0: no common root of G(0, v),
    /// ∂G/∂v(0, v) = 2v + h_(g+1) and ∂G/∂u(0, v) = h_g v − f_(2g+1), for
    /// G = v² + H(u)v − F(u).
    pub fn smooth_at_infinity(&self, field: &F) -> bool {
        let g = self.genus;
        let coefficient = |p: &Univariate<F>, i: usize| p.get(i).cloned().unwrap_or(field.zero());
        let at_zero = self.infinity_polynomial(field);
        let d_v = derivative(field, &at_zero);
        let d_u = trimmed(
            field,
            vec![
                field.neg(&coefficient(&self.f, 2 * g + 1)),
                coefficient(&self.h, g),
            ],
        );
        let common = gcd(field, &gcd(field, &at_zero, &d_v), &d_u);
        common.len() == 1
    }

    /// The columns c_0 = −f, c_1 = h, c_2 = 1 of y² + h y − f, mapped by `embed`.
    pub fn columns<E: Field>(
        &self,
        target: &E,
        embed: &impl Fn(&F::Elem) -> E::Elem,
    ) -> Vec<Univariate<E>> {
        let map = |p: &Univariate<F>| trimmed(target, p.iter().map(embed).collect());
        vec![
            univariate::scale(target, &map(&self.f), &target.neg(&target.one())),
            map(&self.h),
            vec![target.one()],
        ]
    }
}
