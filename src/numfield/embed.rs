//! Embeddings into R and C with proven precision: enclosures of the roots
//! of the defining polynomial and of `sigma_i(a)` in interval arithmetic
//! with outward rounding ([`crate::enclosure::Interval`]).
//!
//! The roots: for an approximation `z` of a root of the monic `f` of degree
//! `n` with `f'(z) != 0`, some root lies in the disc of radius
//! `n |f(z) / f'(z)|` about `z` (as `f'/f = sum 1/(z - r_i)`, so
//! `|f'(z)/f(z)| <= n / min |z - r_i|`); `f(z)` and `f'(z)` are evaluated
//! exactly in rationals (an `f64` is a dyadic rational). When the `n` discs
//! (the conjugates of the complex approximations included) are pairwise
//! disjoint, each holds exactly one root, and the disc about a real
//! approximation holds a real root (it is symmetric about the real axis, so
//! a non-real root in it would bring its conjugate). Otherwise the result is
//! an error of kind [`ErrorKind::TooLarge`] (the f64 approximations cannot
//! separate the roots), never an enclosure that might be wrong.

use super::field::{rat_f64, Element, NumberField};
use crate::enclosure::Interval;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::Square;
use malachite::base::num::basic::traits::Zero;
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Rational};

/// An interval holding the rational `x`.
fn enclose(x: &Rational) -> Interval {
    let v = rat_f64(x);
    Interval::new(v.next_down(), v.next_up())
}

/// `p(z)` for `p` with integer coefficients (constant term first) at the
/// complex rational `z = (x, y)`, exactly.
fn eval_exact(p: &[Integer], x: &Rational, y: &Rational) -> (Rational, Rational) {
    let (mut sr, mut si) = (Rational::ZERO, Rational::ZERO);
    for c in p.iter().rev() {
        let nr = &sr * x - &si * y + Rational::from(c.clone());
        let ni = &sr * y + &si * x;
        sr = nr;
        si = ni;
    }
    (sr, si)
}

impl NumberField {
    /// Proven enclosures `(re, im)` of the roots of the defining polynomial,
    /// in the order of [`NumberField::roots`] (r1 real ones, whose imaginary
    /// part is exactly 0, then one of each complex pair).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let roots = k.proven_roots().unwrap();
    /// let (re, im) = roots[0];
    /// assert!(re.contains(2f64.cbrt()) && re.width() < 1e-12 && im.lo() == 0.0 && im.hi() == 0.0);
    /// ```
    pub fn proven_roots(&self) -> Result<Vec<(Interval, Interval)>, Error> {
        let n = self.n;
        let deriv: Vec<Integer> = self.poly.iter().enumerate().skip(1).map(|(j, c)| c * Integer::from(j as u64)).collect();
        // every approximation, the conjugates of complex ones included
        let mut all: Vec<(f64, f64)> = self.roots.clone();
        for &(re, im) in &self.roots[self.r1..] {
            all.push((re, -im));
        }
        let exact = |v: f64| Rational::try_from(v).map_err(|_| Error::new(ErrorKind::TooLarge, "a root approximation is not finite"));
        let mut radii: Vec<Rational> = Vec::with_capacity(all.len());
        let mut radii_f64 = Vec::with_capacity(all.len());
        for &(re, im) in &all {
            let (x, y) = (exact(re)?, exact(im)?);
            let (fr, fi) = eval_exact(&self.poly, &x, &y);
            let (dr, di) = eval_exact(&deriv, &x, &y);
            let den = (&dr).square() + (&di).square();
            if den == 0 {
                return Err(Error::new(ErrorKind::TooLarge, "the derivative vanishes at a root approximation"));
            }
            let r2 = Rational::from(n as u64 * n as u64) * ((&fr).square() + (&fi).square()) / den;
            // an f64 at least the radius: sqrt of an upper bound of its square, rounded up
            let up = f64::rounding_from(&r2, RoundingMode::Ceiling).0;
            let rho = Interval::point(up).sqrt().hi();
            if !rho.is_finite() {
                return Err(Error::new(ErrorKind::TooLarge, "a root's error radius is not finite"));
            }
            radii.push(exact(rho)?);
            radii_f64.push(rho);
        }
        // pairwise disjoint discs: |z_i - z_j| > rho_i + rho_j, exactly
        for i in 0..all.len() {
            for j in i + 1..all.len() {
                let dx = exact(all[i].0)? - exact(all[j].0)?;
                let dy = exact(all[i].1)? - exact(all[j].1)?;
                if (&dx).square() + (&dy).square() <= (&radii[i] + &radii[j]).square() {
                    return Err(Error::new(ErrorKind::TooLarge, "the root approximations do not separate the roots"));
                }
            }
        }
        let disc = |c: f64, r: f64| Interval::point(c) + Interval::new(-r, r);
        Ok(self
            .roots
            .iter()
            .zip(&radii_f64)
            .enumerate()
            .map(|(i, (&(re, im), &r))| (disc(re, r), if i < self.r1 { Interval::point(0.0) } else { disc(im, r) }))
            .collect())
    }

    /// Proven enclosures `(re, im)` of the embeddings `sigma_i(a)`, in the
    /// order of [`NumberField::embeddings`]: Horner's rule on the power-basis
    /// coordinates of `a` in complex interval arithmetic over the enclosures
    /// of [`NumberField::proven_roots`].
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let t = k.generator();
    /// let u = k.sub(&t, &k.one()); // the unit 2^(1/3) - 1
    /// let e = k.proven_embeddings(&u).unwrap();
    /// assert!(e[0].0.contains(2f64.cbrt() - 1.0));
    /// ```
    pub fn proven_embeddings(&self, a: &Element) -> Result<Vec<(Interval, Interval)>, Error> {
        let roots = self.proven_roots()?;
        let c: Vec<Interval> = self.to_power_basis(a).iter().map(enclose).collect();
        Ok(roots
            .iter()
            .map(|&(re, im)| {
                let (mut sr, mut si) = (Interval::point(0.0), Interval::point(0.0));
                for &cj in c.iter().rev() {
                    let nr = sr * re - si * im + cj;
                    let ni = sr * im + si * re;
                    sr = nr;
                    si = ni;
                }
                (sr, si)
            })
            .collect())
    }
}
