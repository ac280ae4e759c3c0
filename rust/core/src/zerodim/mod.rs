//! Zero-dimensional ideals: R/I as a finite-dimensional k-vector space.
//!
//! The standard monomials (those outside the leading ideal) form a k-basis of R/I
//! (Macaulay 1927; Cox, Little, O'Shea 1992, §5.3), normal forms give coordinates on it, and
//! multiplication by an element is a matrix on that basis (the setting of Stickelberger's
//! theorem; Cox, Little, O'Shea, *Using Algebraic Geometry* 1998, §2.4). Minimal polynomials of
//! elements come from the first linear dependence among their powers.
//!
//! - [`radical`]: the radical and the number of distinct solutions (Seidenberg 1974).
//! - [`maximal`]: whether R/I is a field, and its degree over k.

pub mod linear;
pub mod maximal;
pub mod radical;
pub mod univariate;

use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::GroebnerBasis;
use crate::hilbert::monomial_ideal_series;
use crate::monomial::Monomial;
use crate::poly::Poly;
use linear::Echelon;
use std::collections::HashMap;
use univariate::Univariate;

/// An error unless the basis describes a zero-dimensional (or the unit) ideal.
pub fn require_zero_dimensional<F: Field>(gb: &GroebnerBasis<F>, what: &str) -> Result<()> {
    let d = krull_dimension(gb.ring.nvars(), &gb.leading_monomials());
    if d > 0 {
        return Err(Error::invalid(format!(
            "{what} needs a zero-dimensional ideal; this ideal has dimension {d}, so R/I is infinite-dimensional"
        )));
    }
    Ok(())
}

/// dim_k R/I for zero-dimensional I (0 for the unit ideal), counted through the Hilbert series of
/// the leading ideal, so that the standard monomials are never listed.
pub fn vector_space_dimension<F: Field>(gb: &GroebnerBasis<F>, control: &Control) -> Result<u128> {
    require_zero_dimensional(gb, "vector_space_dimension")?;
    let series = monomial_ideal_series(gb.ring.nvars(), &gb.leading_monomials(), false, control)?;
    Ok(series.degree()? as u128)
}

/// R/I for zero-dimensional I with its monomial basis.
pub struct Quotient<F: Field> {
    pub basis: GroebnerBasis<F>,
    monomials: Vec<Monomial>,
    index: HashMap<Monomial, usize>,
}

impl<F: Field> Quotient<F> {
    /// Lists the standard monomials by a search upward from 1 (they form an order ideal).
    pub fn new(basis: GroebnerBasis<F>, control: &Control) -> Result<Self> {
        require_zero_dimensional(&basis, "the quotient R/I")?;
        let n = basis.ring.nvars();
        let leads = basis.leading_monomials();
        let is_standard = |m: &Monomial| !leads.iter().any(|l| l.divides(m));
        let mut monomials = Vec::new();
        let mut index = HashMap::new();
        let one = Monomial::one(n);
        if is_standard(&one) {
            index.insert(one.clone(), 0);
            monomials.push(one);
        }
        let mut next = 0;
        while next < monomials.len() {
            control.check()?;
            let m = monomials[next].clone();
            next += 1;
            for i in 0..n {
                let up = m.mul(&Monomial::var_power(n, i, 1))?;
                if !index.contains_key(&up) && is_standard(&up) {
                    index.insert(up.clone(), monomials.len());
                    monomials.push(up);
                }
            }
        }
        let ring = &basis.ring;
        monomials.sort_by(|a, b| ring.cmp(a, b));
        let index = monomials.iter().enumerate().map(|(k, m)| (m.clone(), k)).collect();
        Ok(Quotient { basis, monomials, index })
    }

    pub fn dimension(&self) -> usize {
        self.monomials.len()
    }

    /// The standard monomials, increasing in the ring's order (1 first).
    pub fn standard_monomials(&self) -> &[Monomial] {
        &self.monomials
    }

    /// Index of a standard monomial in [`Quotient::standard_monomials`].
    pub fn position(&self, m: &Monomial) -> Option<usize> {
        self.index.get(m).copied()
    }

    /// Coordinates of f mod I on the standard monomials.
    pub fn coordinates(&self, f: &Poly<F>) -> Result<Vec<F::Elem>> {
        let field = &self.basis.ring.field;
        let mut v = vec![field.zero(); self.dimension()];
        for (m, c) in self.basis.reduce(f)?.into_terms() {
            v[self.index[&m]] = c;
        }
        Ok(v)
    }

    /// The polynomial with coordinates `v`.
    pub fn element(&self, v: &[F::Elem]) -> Poly<F> {
        let ring = &self.basis.ring;
        ring.from_terms(self.monomials.iter().cloned().zip(v.iter().cloned()))
    }

    /// The matrix of multiplication by f: entry (i, j) is the coefficient of the i-th standard
    /// monomial in f·b_j (column j holds the image of the j-th basis monomial).
    pub fn multiplication_matrix(&self, f: &Poly<F>, control: &Control) -> Result<Vec<Vec<F::Elem>>> {
        let ring = &self.basis.ring;
        let field = &ring.field;
        let d = self.dimension();
        let mut matrix = vec![vec![field.zero(); d]; d];
        for (j, b) in self.monomials.iter().enumerate() {
            control.check()?;
            let image = self.coordinates(&ring.mul_term(f, &field.one(), b)?)?;
            for (i, c) in image.into_iter().enumerate() {
                matrix[i][j] = c;
            }
        }
        Ok(matrix)
    }

    /// The monic minimal polynomial of f in R/I: the first dependence among 1, f, f^2, ...
    pub fn minimal_polynomial(&self, f: &Poly<F>, control: &Control) -> Result<Univariate<F>> {
        let ring = &self.basis.ring;
        let mut echelon = Echelon::new(ring.field.clone());
        let f = self.basis.reduce(f)?;
        let mut power = self.basis.reduce(&ring.one())?;
        loop {
            control.check()?;
            if let Some(relation) = echelon.add(self.coordinates(&power)?) {
                return Ok(relation);
            }
            power = self.basis.reduce(&ring.mul(&power, &f)?)?;
        }
    }
}

#[cfg(test)]
mod tests;
