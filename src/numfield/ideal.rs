//! Fractional ideals of the maximal order in Hermite normal form on the
//! integral basis: products, sums, intersections, inverses, norms,
//! two-element forms, prime ideals above a rational prime and valuations.
//!
//! References: H. Cohen, GTM 138, §4.7 (ideals in HNF, Algorithms 4.7.7
//! and 4.8.21 for the inverse, here by the dual-lattice description of
//! `I^{-1} = {x : x I ⊂ O}`), §4.8.2 (valuations, Algorithm 4.8.17: an
//! element `beta` with `beta P ⊂ pO`, `beta ∉ pO`), §4.8.3 (Kummer-Dedekind,
//! Theorem 4.8.13) and §6.2 (decomposition through the `p`-radical; here the
//! primitive idempotents of `O/pO` come from the split algebra
//! `{x : x^p = x}`, as in Berlekamp's algorithm).

use super::field::{Element, NumberField};
use super::fp;
use super::linalg::{hnf, left_kernel_mod_p, mod_word};
use super::order::{mul_mod_p, pow_mod_p, radical, table_mod_p};
use crate::arith::{factor, inv_mod, mul_mod, FactorLimits};
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Gcd, Lcm, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// A non-zero fractional ideal: the Z-span of the rows of `hnf` (integer
/// coordinates on the integral basis, lower-triangular Hermite normal
/// form) divided by the positive integer `den`, in lowest terms.
///
/// ```
/// use malachite::{Integer, Rational};
/// use twofold::numfield::NumberField;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5)
/// // P = (2, 1 + sqrt -5): N(P) = 2, P^2 = (2), not principal (x^2 + 5y^2 = 2 has no solution)
/// let p = k.ideal_from_generators(&[k.rational(&Rational::from(2)), k.element(&z(&[1, 1])).unwrap()]).unwrap();
/// assert_eq!(p.norm(), Rational::from(2));
/// assert_eq!(k.ideal_pow(&p, 2).unwrap(), k.principal_ideal(&k.rational(&Rational::from(2))).unwrap());
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Ideal {
    hnf: Vec<Vec<Integer>>,
    den: Integer,
}

impl Ideal {
    /// The HNF rows of the numerator lattice.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i), basis 1, i
    /// let two = k.principal_ideal(&k.rational(&Rational::from(2))).unwrap();
    /// assert_eq!(two.hnf(), &[z(&[2, 0]), z(&[0, 2])][..]);
    /// ```
    pub fn hnf(&self) -> &[Vec<Integer>] {
        &self.hnf
    }
    /// The denominator.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// let half = k.principal_ideal(&k.rational(&Rational::from_signeds(1, 2))).unwrap(); // (1/2)
    /// assert_eq!(half.den(), &Integer::from(2));
    /// assert_eq!(half.hnf(), &[z(&[1, 0]), z(&[0, 1])][..]);
    /// ```
    pub fn den(&self) -> &Integer {
        &self.den
    }
    /// Whether the ideal is integral (contained in the maximal order).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// assert!(k.unit_ideal().is_integral());
    /// assert!(!k.principal_ideal(&k.rational(&Rational::from_signeds(1, 2))).unwrap().is_integral());
    /// ```
    pub fn is_integral(&self) -> bool {
        self.den == 1
    }
    /// The norm `[O : I]` (a rational number for fractional ideals).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// let p = k.principal_ideal(&k.element(&z(&[1, 1])).unwrap()).unwrap(); // (1 + i)
    /// assert_eq!(p.norm(), Rational::from(2));
    /// let half = k.principal_ideal(&k.rational(&Rational::from_signeds(1, 2))).unwrap();
    /// assert_eq!(half.norm(), Rational::from_signeds(1, 4));
    /// ```
    pub fn norm(&self) -> Rational {
        let n = self.hnf.len() as u64;
        let d = self.hnf.iter().enumerate().fold(Integer::ONE, |a, (i, r)| a * &r[i]);
        Rational::from_integers(d, (&self.den).pow(n))
    }
    /// The norm of the numerator lattice (an integer).
    pub(crate) fn num_norm(&self) -> Integer {
        self.hnf.iter().enumerate().fold(Integer::ONE, |a, (i, r)| a * &r[i])
    }
    /// The least positive rational in the ideal times... for integral
    /// ideals, the positive generator of `I ∩ Z` (the "minimum").
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5)
    /// let p = &k.primes_above(3).unwrap()[0].ideal; // a prime of norm 3: P ∩ Z = 3Z
    /// assert_eq!(p.minimum(), Rational::from(3));
    /// ```
    pub fn minimum(&self) -> Rational {
        Rational::from_integers(self.hnf[0][0].clone(), self.den.clone())
    }
    /// The Z-basis as elements.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// let two = k.principal_ideal(&k.rational(&Rational::from(2))).unwrap();
    /// assert_eq!(two.basis(&k), vec![k.rational(&Rational::from(2)), k.element(&z(&[0, 2])).unwrap()]);
    /// ```
    pub fn basis(&self, k: &NumberField) -> Vec<Element> {
        self.hnf.iter().map(|r| k.fraction(r, &self.den).unwrap_or_else(|_| k.one())).collect()
    }
    fn reduced(hnf_rows: Vec<Vec<Integer>>, den: Integer) -> Ideal {
        let mut g: Natural = (&den).unsigned_abs();
        for r in &hnf_rows {
            for x in r {
                g = g.gcd(x.unsigned_abs());
            }
        }
        if g == 1 {
            return Ideal { hnf: hnf_rows, den };
        }
        let gi = Integer::from(g);
        Ideal { hnf: hnf_rows.iter().map(|r| r.iter().map(|x| x / &gi).collect()).collect(), den: &den / &gi }
    }
}

/// A prime ideal `P` above `p`: ramification index `e`, residue degree `f`,
/// the two-element form `P = pO + gen O`, and an element `anti` with
/// `anti P ⊂ pO`, `anti ∉ pO` used for valuations.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::NumberField;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // 5 = (2 + i)(2 - i) splits in Q(i): two primes with e = f = 1
/// let k = NumberField::new(&z(&[1, 0, 1])).unwrap();
/// let ps = k.primes_above(5).unwrap();
/// assert_eq!(ps.iter().map(|p| (p.p, p.e, p.f)).collect::<Vec<_>>(), vec![(5, 1, 1), (5, 1, 1)]);
/// assert!(ps.iter().all(|p| k.ideal_contains(&p.ideal, &p.gen)));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct PrimeIdeal {
    /// The rational prime below.
    pub p: u64,
    /// Ramification index.
    pub e: u32,
    /// Residue degree: `N(P) = p^f`.
    pub f: u32,
    /// The ideal in HNF.
    pub ideal: Ideal,
    /// Second generator: `P = pO + gen O`.
    pub gen: Element,
    pub(crate) anti: Element,
}

impl PrimeIdeal {
    /// `N(P) = p^f` (as u128; fields here have degree at most 3).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // 3 is inert in Q(i) (3 = 3 mod 4): one prime of norm 9
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap();
    /// assert_eq!(k.primes_above(3).unwrap()[0].norm(), 9);
    /// ```
    pub fn norm(&self) -> u128 {
        (self.p as u128).pow(self.f)
    }
}

fn lcm_den(a: &Integer, b: &Integer) -> Integer {
    Integer::from((a.unsigned_abs()).lcm(b.unsigned_abs()))
}

impl NumberField {
    /// The ideal generated by the Z-span of `gens` (integer coordinates on
    /// the integral basis) over `den`, which must be an O-module of rank n:
    /// it is *not* closed under multiplication here; use
    /// [`NumberField::ideal_from_generators`] for ideal generators.
    fn lattice(&self, gens: &[Vec<Integer>], den: Integer, modulus: Option<&Integer>) -> Result<Ideal, Error> {
        Ok(Ideal::reduced(hnf(gens, self.n, modulus)?, den))
    }

    /// The unit ideal `O`.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
    /// let o = k.unit_ideal();
    /// assert_eq!(o.norm(), Rational::from(1));
    /// let p = &k.primes_above(2).unwrap()[0].ideal;
    /// assert_eq!(&k.ideal_product(p, &o).unwrap(), p);
    /// ```
    pub fn unit_ideal(&self) -> Ideal {
        let n = self.n;
        Ideal { hnf: (0..n).map(|i| (0..n).map(|j| Integer::from(u8::from(i == j))).collect()).collect(), den: Integer::ONE }
    }

    /// The principal ideal `aO` (`a != 0`).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5)
    /// let i = k.principal_ideal(&k.rational(&Rational::from(6))).unwrap();
    /// assert_eq!(i.norm(), Rational::from(36));
    /// ```
    pub fn principal_ideal(&self, a: &Element) -> Result<Ideal, Error> {
        if a.is_zero() {
            return Err(Error::new(ErrorKind::InvalidValue, "the zero ideal is not a fractional ideal"));
        }
        let m = self.mult_matrix(a);
        let nm = self.norm_num(a);
        self.lattice(&m, a.den().clone(), Some(&nm))
    }

    /// The ideal generated (as an O-module) by the given elements.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// // (2, 1 + i) = (1 + i), since 2 = -i (1 + i)^2
    /// let i = k.ideal_from_generators(&[k.rational(&Rational::from(2)), k.element(&z(&[1, 1])).unwrap()]).unwrap();
    /// assert_eq!(i, k.principal_ideal(&k.element(&z(&[1, 1])).unwrap()).unwrap());
    /// ```
    pub fn ideal_from_generators(&self, gens: &[Element]) -> Result<Ideal, Error> {
        let mut acc: Option<Ideal> = None;
        for g in gens {
            if g.is_zero() {
                continue;
            }
            let i = self.principal_ideal(g)?;
            acc = Some(match acc {
                None => i,
                Some(a) => self.ideal_sum(&a, &i)?,
            });
        }
        acc.ok_or_else(|| Error::new(ErrorKind::InvalidValue, "no non-zero generator"))
    }

    /// The product `IJ`, from the `n^2` products of basis elements, in HNF
    /// modulo `N(I) N(J)` (Cohen GTM 138, §4.7.1).
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5), O = Z[sqrt -5]
    /// // 2 ramifies: (2) = P^2 with P = (2, 1 + sqrt -5) not principal
    /// // (the classic example of unique factorisation of ideals, not of elements)
    /// let p = k.primes_above(2).unwrap();
    /// assert_eq!((p.len(), p[0].e, p[0].f), (1, 2, 1));
    /// let two = k.principal_ideal(&k.rational(&Rational::from(2))).unwrap();
    /// assert_eq!(k.ideal_product(&p[0].ideal, &p[0].ideal).unwrap(), two);
    /// ```
    pub fn ideal_product(&self, a: &Ideal, b: &Ideal) -> Result<Ideal, Error> {
        let n = self.n;
        let mut gens = Vec::with_capacity(n * n);
        for x in &a.hnf {
            for y in &b.hnf {
                let mut r = vec![Integer::ZERO; n];
                for i in 0..n {
                    if x[i] == 0 {
                        continue;
                    }
                    for j in 0..n {
                        if y[j] == 0 {
                            continue;
                        }
                        let c = &x[i] * &y[j];
                        for k in 0..n {
                            if self.table[i][j][k] != 0 {
                                r[k] += &c * &self.table[i][j][k];
                            }
                        }
                    }
                }
                gens.push(r);
            }
        }
        let d = a.num_norm() * b.num_norm();
        self.lattice(&gens, &a.den * &b.den, Some(&d))
    }

    /// The sum `I + J`.
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5), O = Z[sqrt -5]
    /// // (2) + (3) = O: coprime ideals
    /// let two = k.principal_ideal(&k.rational(&Rational::from(2))).unwrap();
    /// let three = k.principal_ideal(&k.rational(&Rational::from(3))).unwrap();
    /// assert_eq!(k.ideal_sum(&two, &three).unwrap(), k.unit_ideal());
    /// ```
    pub fn ideal_sum(&self, a: &Ideal, b: &Ideal) -> Result<Ideal, Error> {
        let l = lcm_den(&a.den, &b.den);
        let sa = &l / &a.den;
        let sb = &l / &b.den;
        let mut gens: Vec<Vec<Integer>> = a.hnf.iter().map(|r| r.iter().map(|x| x * &sa).collect()).collect();
        gens.extend(b.hnf.iter().map(|r| r.iter().map(|x| x * &sb).collect::<Vec<_>>()));
        let na = a.num_norm() * (&sa).pow(self.n as u64);
        let nb = b.num_norm() * (&sb).pow(self.n as u64);
        let d = Integer::from(na.unsigned_abs().gcd(nb.unsigned_abs()));
        self.lattice(&gens, l, Some(&d))
    }

    /// The inverse `I^{-1} = {x in K : x I ⊂ O}`, as the dual of the lattice
    /// spanned by the columns of the multiplication matrices of a basis of `I`.
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5), O = Z[sqrt -5]
    /// let p = &k.primes_above(2).unwrap()[0].ideal; // P = (2, 1 + sqrt -5), N(P) = 2
    /// let inv = k.ideal_inverse(p).unwrap();
    /// assert_eq!(inv.norm(), Rational::from_signeds(1, 2));
    /// assert_eq!(k.ideal_product(p, &inv).unwrap(), k.unit_ideal());
    /// ```
    pub fn ideal_inverse(&self, a: &Ideal) -> Result<Ideal, Error> {
        let n = self.n;
        // columns of [M_1 | ... | M_n] as rows
        let mut cols: Vec<Vec<Integer>> = Vec::with_capacity(n * n);
        for g in &a.hnf {
            let e = Element::new_reduced(g.clone(), Integer::ONE);
            let m = self.mult_matrix(&e);
            for c in 0..n {
                cols.push((0..n).map(|i| m[i][c].clone()).collect());
            }
        }
        let h = hnf(&cols, n, None)?;
        // dual basis: rows of (H^{-1})^T, H lower triangular
        let hq: Vec<Vec<Rational>> = h.iter().map(|r| r.iter().map(|x| Rational::from(x.clone())).collect()).collect();
        let mut inv = vec![vec![Rational::ZERO; n]; n];
        for c in 0..n {
            // solve H y = e_c (column c of H^{-1}), forward substitution
            let mut y = vec![Rational::ZERO; n];
            for i in 0..n {
                let mut s = if i == c { Rational::ONE } else { Rational::ZERO };
                for j in 0..i {
                    s -= &hq[i][j] * &y[j];
                }
                y[i] = s / &hq[i][i];
            }
            for i in 0..n {
                inv[i][c] = y[i].clone();
            }
        }
        // rows of (H^{-1})^T are the columns of H^{-1}
        let rows: Vec<Vec<Rational>> = (0..n).map(|c| (0..n).map(|i| inv[i][c].clone()).collect()).collect();
        let mut l = Natural::ONE;
        for r in &rows {
            for q in r {
                l = l.lcm(q.denominator_ref());
            }
        }
        let lq = Rational::from(l.clone());
        let gens: Vec<Vec<Integer>> = rows.iter().map(|r| r.iter().map(|q| Integer::try_from(q * &lq).unwrap_or_default()).collect()).collect();
        let li = Integer::from(l);
        // I^{-1} (times den of I) contains O, so l Z^n lies in the numerator lattice
        let inv_num = self.lattice(&gens, li.clone(), Some(&li))?;
        // account for the denominator of a: (L/d)^{-1} = d L^{-1}
        let scaled: Vec<Vec<Integer>> = inv_num.hnf.iter().map(|r| r.iter().map(|x| x * &a.den).collect()).collect();
        Ok(Ideal::reduced(scaled, inv_num.den))
    }

    /// The intersection `I ∩ J = (I^{-1} + J^{-1})^{-1}` (all ideals of the
    /// maximal order are invertible).
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5), O = Z[sqrt -5]
    /// // 3 splits: (3) = Q Q' with Q = (3, 1 + sqrt -5), Q' = (3, 1 - sqrt -5)
    /// let q = k.primes_above(3).unwrap();
    /// assert_eq!(q.len(), 2);
    /// let meet = k.ideal_intersection(&q[0].ideal, &q[1].ideal).unwrap();
    /// let three = k.principal_ideal(&k.rational(&Rational::from(3))).unwrap();
    /// assert_eq!(meet, three);
    /// ```
    pub fn ideal_intersection(&self, a: &Ideal, b: &Ideal) -> Result<Ideal, Error> {
        let s = self.ideal_sum(&self.ideal_inverse(a)?, &self.ideal_inverse(b)?)?;
        self.ideal_inverse(&s)
    }

    /// `I^e` for any integer `e` (square and multiply; negative powers via the inverse).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5)
    /// let p = &k.primes_above(2).unwrap()[0].ideal; // P^2 = (2)
    /// assert_eq!(k.ideal_pow(p, 2).unwrap(), k.principal_ideal(&k.rational(&Rational::from(2))).unwrap());
    /// assert_eq!(k.ideal_pow(p, -3).unwrap().norm(), Rational::from_signeds(1, 8));
    /// assert_eq!(k.ideal_pow(p, 0).unwrap(), k.unit_ideal());
    /// ```
    pub fn ideal_pow(&self, a: &Ideal, e: i64) -> Result<Ideal, Error> {
        let mut base = if e < 0 { self.ideal_inverse(a)? } else { a.clone() };
        let mut e = e.unsigned_abs();
        let mut r = self.unit_ideal();
        while e > 0 {
            if e & 1 == 1 {
                r = self.ideal_product(&r, &base)?;
            }
            e >>= 1;
            if e > 0 {
                base = self.ideal_product(&base, &base)?;
            }
        }
        Ok(r)
    }

    /// Whether `a` lies in the ideal.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// let p = k.principal_ideal(&k.element(&z(&[1, 1])).unwrap()).unwrap(); // (1 + i)
    /// assert!(k.ideal_contains(&p, &k.rational(&Rational::from(2))));
    /// assert!(k.ideal_contains(&p, &k.element(&z(&[3, 5])).unwrap())); // 3 + 5i = (1 + i)(4 + i)
    /// assert!(!k.ideal_contains(&p, &k.one()));
    /// ```
    pub fn ideal_contains(&self, i: &Ideal, a: &Element) -> bool {
        // a = c / d in I = L / e  <=>  c e / d in L
        let v: Vec<Rational> = a.coords().iter().map(|c| Rational::from_integers(c * &i.den, a.den().clone())).collect();
        if v.iter().any(|q| *q.denominator_ref() != 1) {
            return false;
        }
        let vi: Vec<Integer> = v.into_iter().map(|q| Integer::try_from(q).unwrap_or_default()).collect();
        super::order::lattice_coords(&i.hnf, &vi).is_some()
    }

    /// A two-element form of an integral ideal: `(a, alpha)` with
    /// `I = aO + alpha O`, `a` the minimum of `I`. Searches small
    /// combinations of the HNF basis and checks each candidate exactly
    /// (Cohen GTM 138, Algorithm 4.7.10 in spirit).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5)
    /// let p = &k.primes_above(3).unwrap()[0].ideal;
    /// let (a, alpha) = k.two_elements(p).unwrap();
    /// assert_eq!(a, 3);
    /// let again = k.ideal_from_generators(&[k.rational(&Rational::from(a)), alpha]).unwrap();
    /// assert_eq!(&again, p);
    /// ```
    pub fn two_elements(&self, i: &Ideal) -> Result<(Integer, Element), Error> {
        if !i.is_integral() {
            return Err(Error::new(ErrorKind::InvalidValue, "two-element form of a non-integral ideal"));
        }
        let a = i.hnf[0][0].clone();
        let ai = self.rational(&Rational::from(a.clone()));
        let n = self.n;
        let mut state = 0x9e3779b97f4a7c15u64;
        for attempt in 0..2000u32 {
            let mut c = vec![Integer::ZERO; n];
            for (r, row) in i.hnf.iter().enumerate() {
                let w: i64 = if attempt < 4 && r + 1 == n { 1 } else {
                    state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
                    ((state >> 33) % (3 + 2 * u64::from(attempt / 50))) as i64 - (1 + i64::from(attempt / 50))
                };
                for k in 0..n {
                    c[k] += Integer::from(w) * &row[k];
                }
            }
            let alpha = Element::new_reduced(c, Integer::ONE);
            if alpha.is_zero() {
                continue;
            }
            if self.ideal_from_generators(&[ai.clone(), alpha.clone()])? == *i {
                return Ok((a, alpha));
            }
        }
        Err(Error::new(ErrorKind::Budget, "no two-element form found in the search"))
    }

    /// The prime ideals above the prime `p < 2^63`, sorted by residue degree,
    /// by Kummer-Dedekind when `p` does not divide `[O_K : Z[theta]]`, else
    /// by [`NumberField::primes_above_general`]. Checks `sum e_i f_i = n`.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let ef: Vec<(u32, u32)> = k.primes_above(5).unwrap().iter().map(|p| (p.e, p.f)).collect();
    /// assert_eq!(ef, vec![(1, 1), (1, 2)]); // x^3 - 2 = (x - 3)(x^2 + 3x + 9) mod 5
    /// assert_eq!(k.primes_above(3).unwrap().iter().map(|p| (p.e, p.f)).collect::<Vec<_>>(), vec![(3, 1)]);
    /// ```
    pub fn primes_above(&self, p: u64) -> Result<Vec<PrimeIdeal>, Error> {
        if !crate::arith::is_prime_u64(p) || p >= 1 << 63 {
            return Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not a prime below 2^63")));
        }
        if mod_word(&self.index(), p) != 0 {
            self.primes_above_kummer(p)
        } else {
            self.primes_above_general(p)
        }
    }

    /// The prime ideals of degree one above a prime `p` that does not divide
    /// `disc(f)` (so `p` is unramified and prime to the index), built
    /// without any Hermite reduction: for a root `r` of `f` mod `p`,
    /// `P = pO + (theta - r)O` is the kernel of `O -> F_p`, `w_i -> w_i(r)`,
    /// whose Hermite form has rows `(p, 0, ..)` and `(-w_i(r) mod p, .., 1, ..)`
    /// (this needs `w_0 = 1`, true of the integral bases built here), and
    /// `anti = (f / (x - r))(theta)` lies in every other prime above `p` but
    /// not in `P`. Also returns whether these are all the primes above `p`
    /// (no factor of degree 2 or 3). `None` when `p` divides `disc(f)` or
    /// the basis does not start with 1.
    pub(crate) fn primes_above_degree_one(&self, p: u64) -> Result<Option<(Vec<PrimeIdeal>, bool)>, Error> {
        let n = self.n;
        if mod_word(&self.poly_disc, p) == 0 || !(self.basis.rows[0][0] == self.basis.den && self.basis.rows[0][1..].iter().all(|c| *c == 0)) {
            return Ok(None);
        }
        let den = &self.basis.den;
        let Some(dinv) = inv_mod(mod_word(den, p), p) else { return Ok(None) };
        let fp_: Vec<u64> = self.poly.iter().map(|c| mod_word(c, p)).collect();
        let roots = fp::roots(&fp_, p);
        let mut out = Vec::with_capacity(roots.len());
        for &r in &roots {
            let mut rows = vec![vec![Integer::ZERO; n]; n];
            rows[0][0] = Integer::from(p);
            for i in 1..n {
                let mut acc = 0u64;
                let mut rp = 1u64;
                for c in &self.basis.rows[i] {
                    acc = (acc + mul_mod(mod_word(c, p), rp, p)) % p;
                    rp = mul_mod(rp, r, p);
                }
                let wi = mul_mod(acc, dinv, p);
                rows[i][0] = Integer::from((p - wi) % p);
                rows[i][i] = Integer::ONE;
            }
            let ideal = Ideal { hnf: rows, den: Integer::ONE };
            let mut gq = vec![Rational::ZERO; n];
            gq[0] = Rational::from(-Integer::from(r));
            gq[1] = Rational::ONE;
            let gen = self.from_power_basis(&gq)?;
            // synthetic division of f by x - r mod p: the quotient's coefficients
            let mut q = vec![0u64; n];
            let mut carry = 0u64;
            for j in (0..n).rev() {
                // coefficient of x^j in the quotient = f_{j+1} + r * (coefficient of x^{j+1})
                carry = (fp_[j + 1] + mul_mod(r, carry, p)) % p;
                q[j] = carry;
            }
            let aq: Vec<Rational> = q.iter().map(|&c| Rational::from(c)).collect();
            let anti = self.from_power_basis(&aq)?;
            out.push(PrimeIdeal { p, e: 1, f: 1, ideal, gen, anti });
        }
        Ok(Some((out, roots.len() == n)))
    }

    /// Kummer-Dedekind: `f = prod g_i^e_i mod p` gives `P_i = pO + g_i(theta)O`,
    /// valid when `p` does not divide the index (Cohen GTM 138, Thm 4.8.13).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // x^3 - 2 = (x - 3)(x^2 + 3x + 9) mod 5 (3^3 = 27 = 2 mod 5): f = 1 and 2
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap();
    /// let mut f: Vec<u32> = k.primes_above_kummer(5).unwrap().iter().map(|p| p.f).collect();
    /// f.sort();
    /// assert_eq!(f, vec![1, 2]);
    /// // x^2 + 3: 2 divides the index [O : Z[sqrt -3]] = 2, Kummer-Dedekind does not apply
    /// assert!(NumberField::new(&z(&[3, 0, 1])).unwrap().primes_above_kummer(2).is_err());
    /// ```
    pub fn primes_above_kummer(&self, p: u64) -> Result<Vec<PrimeIdeal>, Error> {
        if mod_word(&self.index(), p) == 0 {
            return Err(Error::new(ErrorKind::InvalidValue, "p divides the index: Kummer-Dedekind does not apply"));
        }
        let fp_: Vec<u64> = self.poly.iter().map(|c| mod_word(c, p)).collect();
        let fac = fp::factor_small(&fp_, p).ok_or_else(|| Error::new(ErrorKind::TooLarge, "degree above 3"))?;
        let mut out = Vec::new();
        for (g, e) in fac {
            // g(theta), with theta^n replaced through f when deg g = n
            let full = g.len() == self.n + 1;
            let gq: Vec<Rational> = (0..self.n).map(|j| {
                let c = Integer::from(g.get(j).copied().unwrap_or(0));
                Rational::from(if full { c - &self.poly[j] } else { c })
            }).collect();
            let gen = self.from_power_basis(&gq)?;
            let pe = self.rational(&Rational::from(p));
            let ideal = self.ideal_from_generators(&[pe, gen.clone()])?;
            let f = (g.len() - 1) as u32;
            let anti = self.anti_uniformizer(&ideal, p)?;
            out.push(PrimeIdeal { p, e, f, ideal, gen, anti });
        }
        self.check_decomposition(&out)?;
        Ok(out)
    }

    /// The decomposition for any `p`: primitive idempotents of `O/pO` from
    /// the split subalgebra `{x : x^p = x}`, then `P_i = rad_p + (1 - e_i)O`,
    /// `f_i` from the norm, `e_i = v_{P_i}(p)`.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Dedekind's field x^3 - x^2 - 2x - 8: 2 divides the index of every
    /// // Z[alpha] yet splits completely (Cohen GTM 138, §6.1, from memory)
    /// let k = NumberField::new(&z(&[-8, -2, -1, 1])).unwrap();
    /// let ps = k.primes_above_general(2).unwrap();
    /// assert_eq!(ps.iter().map(|p| (p.e, p.f)).collect::<Vec<_>>(), vec![(1, 1); 3]);
    /// ```
    pub fn primes_above_general(&self, p: u64) -> Result<Vec<PrimeIdeal>, Error> {
        let n = self.n;
        let tp = table_mod_p(&self.table, p);
        // split subalgebra
        let rows: Vec<Vec<u64>> = (0..n).map(|i| {
            let mut x = vec![0u64; n];
            x[i] = 1;
            let mut y = pow_mod_p(&x, p, &tp, p);
            y[i] = (y[i] + p - 1) % p;
            y
        }).collect();
        let split = left_kernel_mod_p(&rows, n, p);
        let one: Vec<u64> = (0..n).map(|i| u64::from(i == 0)).collect();
        let mut idem: Vec<Vec<u64>> = vec![one.clone()];
        for b in &split {
            // minimal polynomial of b: first dependency among 1, b, b^2, ...
            let mut pows = vec![one.clone()];
            let mu = loop {
                let next = mul_mod_p(pows.last().unwrap_or(&one), b, &tp, p);
                pows.push(next);
                let ker = left_kernel_mod_p(&pows, n, p);
                if let Some(v) = ker.into_iter().find(|v| *v.last().unwrap_or(&0) != 0) {
                    break v;
                }
                if pows.len() > n + 1 {
                    return Err(Error::new(ErrorKind::InvalidValue, "no minimal polynomial found"));
                }
            };
            let rts = fp::roots(&mu, p);
            let mut lag = Vec::new();
            for &c in &rts {
                let mut l = one.clone();
                for &c2 in &rts {
                    if c2 == c {
                        continue;
                    }
                    let inv = inv_mod((c + p - c2) % p, p).unwrap_or(0);
                    let mut t = b.clone();
                    t[0] = (t[0] + p - c2) % p;
                    for x in t.iter_mut() {
                        *x = mul_mod(*x, inv, p);
                    }
                    l = mul_mod_p(&l, &t, &tp, p);
                }
                lag.push(l);
            }
            let mut next = Vec::new();
            for e in &idem {
                for l in &lag {
                    let el = mul_mod_p(e, l, &tp, p);
                    if el.iter().any(|&x| x != 0) {
                        next.push(el);
                    }
                }
            }
            idem = next;
        }
        let rad = radical(&self.table, p)?;
        let pz = Integer::from(p);
        let mut out = Vec::new();
        for e in &idem {
            let mut ome: Vec<u64> = e.iter().map(|&x| (p - x) % p).collect();
            ome[0] = (ome[0] + 1) % p;
            let mut gens = rad.clone();
            for j in 0..n {
                let mut w = vec![0u64; n];
                w[j] = 1;
                gens.push(mul_mod_p(&ome, &w, &tp, p).into_iter().map(Integer::from).collect());
            }
            let ideal = self.lattice(&gens, Integer::ONE, Some(&pz))?;
            let nrm = ideal.num_norm();
            let mut f = 0u32;
            let mut t = nrm.clone();
            while t > 1 {
                t /= &pz;
                f += 1;
            }
            let anti = self.anti_uniformizer(&ideal, p)?;
            let pe = self.rational(&Rational::from(p));
            let mut pr = PrimeIdeal { p, e: 0, f, ideal: ideal.clone(), gen: pe.clone(), anti };
            pr.e = self.valuation(&pe, &pr)? as u32;
            let (_, g) = self.two_elements_prime(&ideal, p)?;
            pr.gen = g;
            out.push(pr);
        }
        out.sort_by(|a, b| a.f.cmp(&b.f).then(a.e.cmp(&b.e)).then(a.ideal.hnf.cmp(&b.ideal.hnf)));
        self.check_decomposition(&out)?;
        Ok(out)
    }

    fn two_elements_prime(&self, i: &Ideal, p: u64) -> Result<(Integer, Element), Error> {
        // I = pO + alpha O; the minimum of I is p
        let (a, alpha) = self.two_elements(i)?;
        if a != p {
            return Err(Error::new(ErrorKind::InvalidValue, "prime ideal with minimum other than p"));
        }
        Ok((a, alpha))
    }

    fn check_decomposition(&self, ps: &[PrimeIdeal]) -> Result<(), Error> {
        let s: u32 = ps.iter().map(|q| q.e * q.f).sum();
        if s as usize != self.n {
            return Err(Error::new(ErrorKind::InvalidValue, format!("decomposition check failed: sum e f = {s}")));
        }
        Ok(())
    }

    /// An element `beta` of `p P^{-1}` not in `pO`.
    fn anti_uniformizer(&self, ideal: &Ideal, p: u64) -> Result<Element, Error> {
        let inv = self.ideal_inverse(ideal)?;
        let pz = Integer::from(p);
        for r in &inv.hnf {
            // p * r / den
            let c: Vec<Rational> = r.iter().map(|x| Rational::from_integers(x * &pz, inv.den.clone())).collect();
            if c.iter().any(|q| *q.denominator_ref() != 1) {
                return Err(Error::new(ErrorKind::InvalidValue, "p P^{-1} not integral"));
            }
            let ci: Vec<Integer> = c.into_iter().map(|q| Integer::try_from(q).unwrap_or_default()).collect();
            if ci.iter().any(|x| mod_word(x, p) != 0) {
                return Ok(Element::new_reduced(ci, Integer::ONE));
            }
        }
        Err(Error::new(ErrorKind::InvalidValue, "no anti-uniformizer (P = O?)"))
    }

    /// `v_P(a)` for non-zero `a` (Cohen GTM 138, Algorithm 4.8.17).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i): 2 = -i (1 + i)^2
    /// let p2 = &k.primes_above(2).unwrap()[0];
    /// assert_eq!(k.valuation(&k.rational(&Rational::from_signeds(8, 3)), p2).unwrap(), 6);
    /// ```
    pub fn valuation(&self, a: &Element, pr: &PrimeIdeal) -> Result<i64, Error> {
        if a.is_zero() {
            return Err(Error::new(ErrorKind::InvalidValue, "valuation of zero"));
        }
        let pz = Integer::from(pr.p);
        // denominator part
        let mut d = a.den().clone();
        let mut vd = 0i64;
        while mod_word(&d, pr.p) == 0 {
            d /= &pz;
            vd += 1;
        }
        let mut x = Element::new_reduced(a.coords().to_vec(), Integer::ONE);
        let mut v = 0i64;
        loop {
            // x beta / p integral?
            let y = self.mul(&x, &pr.anti);
            if y.coords().iter().all(|c| mod_word(c, pr.p) == 0) {
                x = Element::new_reduced(y.coords().iter().map(|c| c / &pz).collect(), Integer::ONE);
                v += 1;
            } else {
                break;
            }
        }
        Ok(v - vd * i64::from(pr.e))
    }

    /// `v_P(I)`: the least valuation of a Z-basis element.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i): (2) = (1 + i)^2
    /// let p = &k.primes_above(2).unwrap()[0];
    /// let eight = k.principal_ideal(&k.rational(&Rational::from(8))).unwrap();
    /// assert_eq!(k.ideal_valuation(&eight, p).unwrap(), 6);
    /// ```
    pub fn ideal_valuation(&self, i: &Ideal, pr: &PrimeIdeal) -> Result<i64, Error> {
        let mut best: Option<i64> = None;
        for r in &i.hnf {
            let e = Element::new_reduced(r.clone(), Integer::ONE);
            if e.is_zero() {
                continue;
            }
            let v = self.valuation(&e, pr)?;
            best = Some(best.map_or(v, |b| b.min(v)));
        }
        let pz = Integer::from(pr.p);
        let mut d = i.den.clone();
        let mut vd = 0i64;
        while mod_word(&d, pr.p) == 0 {
            d /= &pz;
            vd += 1;
        }
        Ok(best.unwrap_or(0) - vd * i64::from(pr.e))
    }

    /// The factorisation of a fractional ideal into prime ideals (factoring
    /// its norm's numerator and denominator within `limits`).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// use twofold::arith::FactorLimits;
    /// // (6) = P2^2 P3 P3' in Q(sqrt -5) (2 ramifies, 3 splits: -5 = 1 mod 3)
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
    /// let six = k.principal_ideal(&k.rational(&Rational::from(6))).unwrap();
    /// let mut fac: Vec<(u64, i64)> = k.factor_ideal(&six, &FactorLimits::default()).unwrap().iter().map(|(p, e)| (p.p, *e)).collect();
    /// fac.sort();
    /// assert_eq!(fac, vec![(2, 2), (3, 1), (3, 1)]);
    /// ```
    pub fn factor_ideal(&self, i: &Ideal, limits: &FactorLimits) -> Result<Vec<(PrimeIdeal, i64)>, Error> {
        let nrm = i.norm();
        let mut primes: Vec<Natural> = Vec::new();
        for part in [Integer::from(nrm.numerator_ref().clone()), Integer::from(nrm.denominator_ref().clone()), i.den.clone()] {
            if part > 1 {
                primes.extend(factor(&part, limits)?.primes().cloned());
            }
        }
        primes.sort();
        primes.dedup();
        let mut out = Vec::new();
        for p in primes {
            let p = u64::try_from(&p).map_err(|_| Error::new(ErrorKind::TooLarge, "prime above 2^63 in an ideal norm"))?;
            for pr in self.primes_above(p)? {
                let v = self.ideal_valuation(i, &pr)?;
                if v != 0 {
                    out.push((pr, v));
                }
            }
        }
        Ok(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn degree_one_primes_agree_with_the_general_route() {
        // two ways: the Hermite-free construction against Kummer-Dedekind / the
        // general decomposition (same ideals, same valuations of test elements)
        for f in [z(&[-1, -1, 0, 1]), z(&[7, 3, 0, 1]), z(&[-5, 0, 1]), z(&[13, -4, 2, 1]), z(&[56789, 1234, 0, 1]), z(&[-10, 0, 0, 1])] {
            let k = NumberField::new(&f).unwrap();
            for p in crate::arith::primes_up_to(400) {
                let Some((light, complete)) = k.primes_above_degree_one(p).unwrap() else {
                    assert_eq!(mod_word(&k.poly_disc, p), 0, "{f:?} {p}");
                    continue;
                };
                let full = k.primes_above(p).unwrap();
                let deg1: Vec<&PrimeIdeal> = full.iter().filter(|q| q.f == 1).collect();
                assert_eq!(light.len(), deg1.len(), "{f:?} {p}");
                assert_eq!(complete, deg1.len() == full.len());
                for q in &light {
                    let same = deg1.iter().find(|d| d.ideal == q.ideal).unwrap_or_else(|| panic!("{f:?} {p}: ideal not found"));
                    for x in [k.generator(), k.add(&k.generator(), &k.one()), k.mul(&k.generator(), &k.generator()), q.gen.clone(), k.mul(&q.gen, &q.gen)] {
                        if x.is_zero() {
                            continue;
                        }
                        assert_eq!(k.valuation(&x, q).unwrap(), k.valuation(&x, same).unwrap(), "{f:?} {p}");
                    }
                }
            }
        }
    }

    fn fields() -> Vec<NumberField> {
        [
            z(&[5, 0, 1]), z(&[-5, 0, 1]), z(&[1, 0, 1]), z(&[3, 1, 1]), z(&[-10, 0, 0, 1]), z(&[1, -3, -1, 1]),
            z(&[-1, -1, 0, 1]), z(&[-8, -2, -1, 1]) /* Dedekind: 2 splits completely, a common index divisor */, z(&[-12, 0, 0, 1]), z(&[28, 0, -7, 1]) /* 7^2 | disc */,
        ].iter().map(|f| NumberField::new(f).unwrap()).collect()
    }

    #[test]
    fn decomposition_laws_and_two_methods() {
        for k in fields() {
            for p in crate::arith::primes_up_to(60) {
                let ps = k.primes_above(p).unwrap();
                // product of P^e is pO
                let mut prod = k.unit_ideal();
                for q in &ps {
                    assert_eq!(q.ideal.norm(), Rational::from(q.norm() as u64));
                    prod = k.ideal_product(&prod, &k.ideal_pow(&q.ideal, q.e as i64).unwrap()).unwrap();
                    // two-element form generates P
                    let g = k.ideal_from_generators(&[k.rational(&Rational::from(p)), q.gen.clone()]).unwrap();
                    assert_eq!(g, q.ideal);
                    // valuations at the primes above p of p: e for P, and gen has valuation 1 or more
                    for q2 in &ps {
                        let v = k.valuation(&k.rational(&Rational::from(p)), q2).unwrap();
                        assert_eq!(v, q2.e as i64);
                        assert_eq!(k.ideal_valuation(&q.ideal, q2).unwrap(), i64::from(q == q2));
                    }
                }
                assert_eq!(prod, k.principal_ideal(&k.rational(&Rational::from(p))).unwrap());
                // the general method agrees with Kummer-Dedekind where both apply
                if mod_word(&k.index(), p) != 0 {
                    let mut a: Vec<Ideal> = k.primes_above_kummer(p).unwrap().into_iter().map(|q| q.ideal).collect();
                    let mut b: Vec<Ideal> = k.primes_above_general(p).unwrap().into_iter().map(|q| q.ideal).collect();
                    a.sort_by(|x, y| x.hnf.cmp(&y.hnf));
                    b.sort_by(|x, y| x.hnf.cmp(&y.hnf));
                    assert_eq!(a, b, "p={p}");
                }
            }
        }
    }

    #[test]
    fn ideal_laws() {
        let mut s = 5u64;
        let mut rnd = || {
            s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((s >> 33) % 15) as i64 - 7
        };
        for k in fields() {
            let n = k.degree();
            for _ in 0..15 {
                let mut el = || loop {
                    let e = k.element(&(0..n).map(|_| Integer::from(rnd())).collect::<Vec<_>>()).unwrap();
                    if !e.is_zero() {
                        return e;
                    }
                };
                let (a, b, c) = (el(), el(), el());
                let i = k.ideal_from_generators(&[a.clone(), b.clone()]).unwrap();
                let j = k.principal_ideal(&c).unwrap();
                // N(IJ) = N(I) N(J); (c) has norm |N(c)|
                { use malachite::base::num::arithmetic::traits::Abs; assert_eq!(j.norm(), k.norm(&c).abs()); }
                let ij = k.ideal_product(&i, &j).unwrap();
                assert_eq!(ij.norm(), i.norm() * j.norm());
                // I I^{-1} = O
                let ii = k.ideal_inverse(&i).unwrap();
                assert_eq!(k.ideal_product(&i, &ii).unwrap(), k.unit_ideal());
                // I ∩ J contains IJ, and N(I ∩ J) N(I + J) = N(I) N(J) (Dedekind domains: lcm * gcd)
                let cap = k.ideal_intersection(&i, &j).unwrap();
                let cup = k.ideal_sum(&i, &j).unwrap();
                assert_eq!(cap.norm() * cup.norm(), i.norm() * j.norm());
                assert_eq!(k.ideal_sum(&cap, &ij).unwrap(), cap);
                // two-element form
                let (m, alpha) = k.two_elements(&i).unwrap();
                assert_eq!(k.ideal_from_generators(&[k.rational(&Rational::from(m)), alpha]).unwrap(), i);
                // factorisation reconstructs the ideal
                let fac = k.factor_ideal(&i, &FactorLimits::default()).unwrap();
                let mut prod = k.unit_ideal();
                for (q, e) in &fac {
                    prod = k.ideal_product(&prod, &k.ideal_pow(&q.ideal, *e).unwrap()).unwrap();
                }
                assert_eq!(prod, i);
            }
        }
    }
}
