//! The quotient algebra R/I of a zero-dimensional ideal as a finite-dimensional k-vector space.
//!
//! The standard monomials (those outside the leading ideal) form a k-basis of R/I
//! (Macaulay 1927; Cox, Little, O'Shea 1992, §5.3), normal forms give coordinates on it, and
//! multiplication by an element is a matrix on that basis (the setting of Stickelberger's
//! theorem; Cox, Little, O'Shea, *Using Algebraic Geometry* 1998, §2.4). Minimal polynomials of
//! elements come from the first linear dependence among their powers. It sits with the engines
//! because the change of order ([`super::order_change`]) works in it; the questions asked of it
//! (radical, maximality, points) are answered one layer up, in [`crate::zerodim`].

use super::ReducedBasis;
use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::echelon::Echelon;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::monomial::Monomial;
use crate::monomial_ideal::monomial_ideal_series;
use crate::poly::Poly;
use crate::univariate::Univariate;
use std::collections::HashMap;
use std::sync::OnceLock;

/// An error unless the basis describes a zero-dimensional (or the unit) ideal.
pub fn require_zero_dimensional<F: Field>(gb: &ReducedBasis<F>, what: &str) -> Result<()> {
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
pub fn quotient_dimension<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Result<u128> {
    require_zero_dimensional(gb, "quotient_dimension")?;
    let series = monomial_ideal_series(gb.ring.nvars(), &gb.leading_monomials(), false, control)?;
    Ok(series.degree()? as u128)
}

/// A sparse vector: (coordinate index, nonzero value).
pub(crate) type SparseColumn<F> = Vec<(usize, <F as Field>::Elem)>;

/// R/I for zero-dimensional I with its monomial basis. Elements are coordinate vectors;
/// products are computed from the (sparse) matrices of multiplication by the variables, built
/// on first use from the normal forms of the border monomials x_i·b.
pub struct Quotient<F: Field> {
    pub basis: ReducedBasis<F>,
    monomials: Vec<Monomial>,
    index: HashMap<Monomial, usize>,
    /// For b_j ≠ 1: (i, k) with b_j = x_i · b_k (k < j, as the list is increasing).
    parents: Vec<Option<(usize, usize)>>,
    variable_columns: OnceLock<Vec<Vec<SparseColumn<F>>>>,
    /// Per variable, its columns read off the basis when that needs no arithmetic
    /// ([`Quotient::read_columns`]); `None` inside when it does.
    read_columns: Vec<OnceLock<Option<Vec<SparseColumn<F>>>>>,
}

impl<F: Field> Quotient<F> {
    /// Lists the standard monomials by a search upward from 1 (they form an order ideal).
    pub fn new(basis: ReducedBasis<F>, control: &Control) -> Result<Self> {
        require_zero_dimensional(&basis, "the quotient R/I")?;
        let n = basis.ring.nvars();
        let leads = basis.leading_monomials();
        let is_standard = |m: &Monomial| !leads.iter().any(|l| l.divides(m));
        let mut monomials = Vec::new();
        let mut seen = std::collections::HashSet::new();
        let one = Monomial::one(n);
        if is_standard(&one) {
            seen.insert(one.clone());
            monomials.push(one);
        }
        let mut next = 0;
        while next < monomials.len() {
            control.check()?;
            let m = monomials[next].clone();
            next += 1;
            for i in 0..n {
                let up = m.mul(&Monomial::var_power(n, i, 1))?;
                if !seen.contains(&up) && is_standard(&up) {
                    seen.insert(up.clone());
                    monomials.push(up);
                }
            }
        }
        let ring = &basis.ring;
        monomials.sort_by(|a, b| ring.cmp(a, b));
        let index: HashMap<Monomial, usize> = monomials
            .iter()
            .enumerate()
            .map(|(k, m)| (m.clone(), k))
            .collect();
        let parents = monomials
            .iter()
            .map(|b| {
                let i = b.exponents().iter().position(|&e| e > 0)?;
                Some((i, index[&b.div(&Monomial::var_power(n, i, 1))]))
            })
            .collect();
        Ok(Quotient {
            basis,
            monomials,
            index,
            parents,
            variable_columns: OnceLock::new(),
            read_columns: (0..n).map(|_| OnceLock::new()).collect(),
        })
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

    /// For the j-th standard monomial b_j ≠ 1, some (i, k) with b_j = x_i · b_k and k < j.
    pub fn parent(&self, j: usize) -> Option<(usize, usize)> {
        self.parents[j]
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

    /// Columns of multiplication by each variable: x_i·b_j is a standard monomial (a unit
    /// column) or a border monomial.
    fn variable_columns(&self, control: &Control) -> Result<&Vec<Vec<SparseColumn<F>>>> {
        if let Some(columns) = self.variable_columns.get() {
            return Ok(columns);
        }
        let ring = &self.basis.ring;
        let n = ring.nvars();
        let border = self.border_normal_forms(control)?;
        let mut all = Vec::with_capacity(n);
        for i in 0..n {
            let x = Monomial::var_power(n, i, 1);
            let mut columns = Vec::with_capacity(self.dimension());
            for b in &self.monomials {
                let up = b.mul(&x)?;
                columns.push(match self.index.get(&up) {
                    Some(&k) => vec![(k, ring.field.one())],
                    None => border[&up].clone(),
                });
            }
            all.push(columns);
        }
        Ok(self.variable_columns.get_or_init(|| all))
    }

    /// Columns of multiplication by x_i read off the basis without arithmetic, when every
    /// x_i·b_j is standard (a unit column) or a leading monomial of the basis (the basis
    /// element's tail, negated): the usual case for the smallest variable of a grevlex basis
    /// (Faugère and Mou 2011), which then needs none of the other variables' border normal
    /// forms. `None` when some x_i·b_j is a proper multiple of a leading monomial.
    fn read_columns(&self, i: usize, control: &Control) -> Result<Option<&Vec<SparseColumn<F>>>> {
        if let Some(columns) = self.read_columns[i].get() {
            return Ok(columns.as_ref());
        }
        let ring = &self.basis.ring;
        let field = &ring.field;
        let x = Monomial::var_power(ring.nvars(), i, 1);
        let by_lead: HashMap<&Monomial, &Poly<F>> = self
            .basis
            .polys
            .iter()
            .filter_map(|g| Some((g.leading_monomial()?, g)))
            .collect();
        let mut columns = Vec::with_capacity(self.dimension());
        for b in &self.monomials {
            control.check()?;
            let up = b.mul(&x)?;
            if let Some(&k) = self.index.get(&up) {
                columns.push(vec![(k, field.one())]);
                continue;
            }
            let Some(g) = by_lead.get(&up) else {
                return Ok(self.read_columns[i].get_or_init(|| None).as_ref());
            };
            let lead = field
                .inv(&g.terms()[0].1)
                .expect("nonzero leading coefficient");
            let minus_lead = field.neg(&lead);
            columns.push(
                g.terms()[1..]
                    .iter()
                    .map(|(m, c)| (self.index[m], field.mul(c, &minus_lead)))
                    .collect(),
            );
        }
        Ok(self.read_columns[i].get_or_init(|| Some(columns)).as_ref())
    }

    /// The columns of multiplication by x_i: read off the basis when possible, else from the
    /// border normal forms of all variables.
    pub(crate) fn columns_of(&self, i: usize, control: &Control) -> Result<&Vec<SparseColumn<F>>> {
        match self.read_columns(i, control)? {
            Some(columns) => Ok(columns),
            None => Ok(&self.variable_columns(control)?[i]),
        }
    }

    /// Normal forms of the border monomials x_i·b (b standard, x_i·b not), in increasing order
    /// as in the FGLM algorithm (Faugère, Gianni, Lazard, Mora 1993): a leading monomial of the
    /// basis reduces in one step; any other border monomial m has a border divisor m / x_j, and
    /// NF(m) = x_j · NF(m / x_j) is a combination of x_j·b_k for smaller standard b_k, each
    /// standard or an earlier border monomial. No division algorithm on long polynomials.
    fn border_normal_forms(&self, control: &Control) -> Result<HashMap<Monomial, SparseColumn<F>>> {
        let ring = &self.basis.ring;
        let field = &ring.field;
        let n = ring.nvars();
        let variables: Vec<Monomial> = (0..n).map(|i| Monomial::var_power(n, i, 1)).collect();
        let mut monomials: Vec<Monomial> = Vec::new();
        for b in &self.monomials {
            for x in &variables {
                let up = b.mul(x)?;
                if !self.index.contains_key(&up) {
                    monomials.push(up);
                }
            }
        }
        monomials.sort_by(|a, b| ring.cmp(a, b));
        monomials.dedup();
        let leads: std::collections::HashSet<Monomial> =
            self.basis.leading_monomials().into_iter().collect();
        let mut border: HashMap<Monomial, SparseColumn<F>> =
            HashMap::with_capacity(monomials.len());
        for m in monomials {
            control.check()?;
            let smaller = (0..n)
                .find(|&j| m.exponents()[j] > 0 && border.contains_key(&m.div(&variables[j])));
            let column = match smaller {
                Some(j) if !leads.contains(&m) => {
                    let mut dense = vec![field.zero(); self.dimension()];
                    for (k, c) in &border[&m.div(&variables[j])] {
                        let up = self.monomials[*k].mul(&variables[j])?;
                        match self.index.get(&up) {
                            Some(&t) => dense[t] = field.add(&dense[t], c),
                            None => {
                                for (t, d) in &border[&up] {
                                    dense[*t] = field.add(&dense[*t], &field.mul(c, d));
                                }
                            }
                        }
                    }
                    dense
                        .into_iter()
                        .enumerate()
                        .filter(|(_, c)| !field.is_zero(c))
                        .collect()
                }
                _ => {
                    let nf = self.basis.reduce(&ring.term(m.clone(), field.one()))?;
                    nf.into_terms()
                        .into_iter()
                        .map(|(t, c)| (self.index[&t], c))
                        .collect()
                }
            };
            border.insert(m, column);
        }
        Ok(border)
    }

    /// x_i · v.
    fn times_variable(&self, columns: &[SparseColumn<F>], v: &[F::Elem]) -> Vec<F::Elem> {
        let field = &self.basis.ring.field;
        let mut out = vec![field.zero(); v.len()];
        for (j, vj) in v.iter().enumerate() {
            if field.is_zero(vj) {
                continue;
            }
            for (k, c) in &columns[j] {
                out[*k] = field.add(&out[*k], &field.mul(vj, c));
            }
        }
        out
    }

    /// x_i · v, for v given by its coordinates.
    pub fn times_variable_coordinates(
        &self,
        i: usize,
        v: &[F::Elem],
        control: &Control,
    ) -> Result<Vec<F::Elem>> {
        Ok(self.times_variable(&self.variable_columns(control)?[i], v))
    }

    /// The products b_j · v for every standard monomial b_j (the columns of multiplication by
    /// v), each from an earlier one by one variable.
    pub fn multiples(&self, v: &[F::Elem], control: &Control) -> Result<Vec<Vec<F::Elem>>> {
        let columns = self.variable_columns(control)?;
        let mut out: Vec<Vec<F::Elem>> = Vec::with_capacity(self.dimension());
        for parent in &self.parents {
            control.check()?;
            let w = match parent {
                None => v.to_vec(),
                Some((i, k)) => self.times_variable(&columns[*i], &out[*k]),
            };
            out.push(w);
        }
        Ok(out)
    }

    /// Σ_j a_j · w_j for vectors w_j (a combination of the multiples of some element).
    pub fn combine(&self, a: &[F::Elem], w: &[Vec<F::Elem>]) -> Vec<F::Elem> {
        let field = &self.basis.ring.field;
        let mut out = vec![field.zero(); self.dimension()];
        for (aj, wj) in a.iter().zip(w) {
            if field.is_zero(aj) {
                continue;
            }
            for (o, x) in out.iter_mut().zip(wj) {
                *o = field.add(o, &field.mul(aj, x));
            }
        }
        out
    }

    /// The product a·c in R/I.
    pub fn multiply(
        &self,
        a: &[F::Elem],
        c: &[F::Elem],
        control: &Control,
    ) -> Result<Vec<F::Elem>> {
        Ok(self.combine(a, &self.multiples(c, control)?))
    }

    /// v^e in R/I, e as little-endian 64-bit limbs, by square-and-multiply.
    pub fn power(
        &self,
        v: &[F::Elem],
        exponent: &[u64],
        control: &Control,
    ) -> Result<Vec<F::Elem>> {
        let mut acc = self.coordinates(&self.basis.ring.one())?;
        let base_multiples = self.multiples(v, control)?;
        for k in (0..exponent.len() * 64).rev() {
            acc = self.multiply(&acc, &acc, control)?;
            if exponent[k / 64] >> (k % 64) & 1 == 1 {
                acc = self.combine(&acc, &base_multiples);
            }
        }
        Ok(acc)
    }

    /// The matrix of multiplication by f: entry (i, j) is the coefficient of the i-th standard
    /// monomial in f·b_j (column j holds the image of the j-th basis monomial).
    pub fn multiplication_matrix(
        &self,
        f: &Poly<F>,
        control: &Control,
    ) -> Result<Vec<Vec<F::Elem>>> {
        let columns = self.multiples(&self.coordinates(f)?, control)?;
        let d = self.dimension();
        Ok((0..d)
            .map(|i| columns.iter().map(|col| col[i].clone()).collect())
            .collect())
    }

    /// The monic minimal polynomial of f in R/I: the first dependence among 1, f, f^2, ...
    pub fn minimal_polynomial(&self, f: &Poly<F>, control: &Control) -> Result<Univariate<F>> {
        let ring = &self.basis.ring;
        let mut echelon = Echelon::new(ring.field.clone());
        let f_multiples = self.multiples(&self.coordinates(f)?, control)?;
        let mut power = self.coordinates(&ring.one())?;
        loop {
            control.check()?;
            if let Some(relation) = echelon.add(power.clone()) {
                return Ok(relation);
            }
            power = self.combine(&power, &f_multiples);
        }
    }
}
