//! Class group, regulator and fundamental units by relations (J. Buchmann,
//! "A subexponential algorithm for the determination of class groups and
//! regulators of algebraic number fields", Séminaire de Théorie des Nombres
//! Paris 1988-89, 1990; H. Cohen, GTM 138, §6.5).
//!
//! Relations are elements of small norm found in LLL-reduced ideals
//! (A. K. Lenstra, H. W. Lenstra, L. Lovász, "Factoring polynomials with
//! rational coefficients", Math. Ann. 261, 1982) whose norms factor over the
//! factor base. Each relation carries its valuation vector, its logarithmic
//! embedding and its expression as a product of the relation elements, so
//! units come out in compact (product) form. The relation lattice is kept
//! in echelon form by integer Euclid steps; a relation that reduces to zero
//! gives a unit. The result is accepted when `h* R*` agrees with the
//! analytic class number formula (residue of the Dedekind zeta function
//! estimated by an Euler product) to better than a factor 1.5: since
//! `h* R*` is a positive integer multiple of `h R`, this pins down `h R`,
//! *provided* the Euler product is that accurate (a numerical estimate, not
//! a proof) and the factor base generates the class group (true under GRH
//! for the bound of E. Bach, "Explicit bounds for primality testing and
//! related problems", Math. Comp. 55, 1990; unconditional for the Minkowski
//! bound).

use super::field::{Element, NumberField};
use super::ideal::{Ideal, PrimeIdeal};
use super::linalg::{mod_word, smith_invariants};
use super::precise::{PreciseLogs, MAX_LOG_BITS};
use super::wide::WideProduct;
use super::relations::{base_bound, Found, RelationSearch};
use super::sparse;
use crate::arith::{mul_mod, primes_up_to};
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::DivRound;
use malachite::base::num::basic::traits::{NegativeOne, One, Zero};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Rational};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::Instant;

/// Primes up to this bound enter the Euler product of the zeta residue.
pub(crate) const EULER_PRODUCT_LIMIT: u64 = 100_000;

/// The factor base always holds the prime ideals of norm up to this
/// (more generators than the bound needs: relations come easier).
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::{ClassGroupOptions, NumberField, MIN_FACTOR_BASE_BOUND};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // Q(i): Minkowski's bound 4/pi is below it, the factor base still reaches it
/// let cg = NumberField::new(&z(&[1, 0, 1])).unwrap().class_group(&ClassGroupOptions::default()).unwrap();
/// assert!(cg.bound >= MIN_FACTOR_BASE_BOUND && cg.factor_base.iter().all(|p| p.norm() <= cg.bound as u128));
/// ```
pub const MIN_FACTOR_BASE_BOUND: u64 = 50;

/// Rounds of relation search before [`NumberField::class_group`] gives up
/// with [`ErrorKind::Budget`] (each round reduces one ideal).
pub const MAX_ROUNDS: usize = 3000;

/// Which bound the factor base rests on.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::{ClassGroupOptions, NumberField};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// use twofold::numfield::FactorBaseBound;
/// // |d| = 23: Minkowski's bound 1.2 is below Bach's 12 (log 23)^2 = 118 (hand computation)
/// let cg = NumberField::new(&z(&[-1, -1, 0, 1])).unwrap().class_group(&ClassGroupOptions::default()).unwrap();
/// assert_eq!(cg.bound_kind, FactorBaseBound::Minkowski);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum FactorBaseBound {
    /// The Minkowski bound: every class contains an ideal of norm at most
    /// it (unconditional).
    Minkowski,
    /// Bach's bound `12 (log |d_K|)^2`: the prime ideals below it generate
    /// the class group if the generalised Riemann hypothesis holds.
    BachGrh,
}

/// Options for [`NumberField::class_group`].
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::{ClassGroupOptions, NumberField};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// let opts = ClassGroupOptions::default().with_deadline(std::time::Instant::now());
/// // a spent deadline: the class group stops with a budget error
/// let e = NumberField::new(&z(&[56789, 1234, 0, 1])).unwrap().class_group(&opts).unwrap_err();
/// assert_eq!(e.kind(), &twofold::ErrorKind::Budget);
/// ```
#[derive(Clone, Debug, Default)]
#[non_exhaustive]
pub struct ClassGroupOptions {
    /// Use the Minkowski bound even when it is large (unconditional result,
    /// up to the Euler product check).
    pub unconditional: bool,
    /// Stop with [`ErrorKind::Budget`] after this instant.
    pub deadline: Option<Instant>,
    /// Stop with [`ErrorKind::Budget`] once set.
    pub cancel: Option<Arc<AtomicBool>>,
    /// Which linear algebra the class group uses (tests compare both).
    pub(crate) route: Route,
}

/// The linear algebra of [`NumberField::class_group`].
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(not(test), allow(dead_code))]
pub(crate) enum Route {
    /// By the size of the discriminant: [`Route::Kernel`] from
    /// [`KERNEL_ROUTE_DIGITS`] digits on.
    #[default]
    Auto,
    /// The incremental exact echelon (small fields).
    Echelon,
    /// Sparse elimination, Hermite form modulo a determinant and the
    /// integral kernel (`sparse.rs`).
    Kernel,
}

/// From this many decimal digits of `|d_K|` on, [`Route::Auto`] takes the
/// kernel route.
pub(crate) const KERNEL_ROUTE_DIGITS: f64 = 12.0;

impl ClassGroupOptions {
    /// Uses (or not) the Minkowski bound even when it is large.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// use twofold::numfield::FactorBaseBound;
    /// // t^3 + 301t + 5003 (d about -7.8e8): Bach's bound is the smaller; on request Minkowski's
    /// let k = NumberField::new(&z(&[5003, 301, 0, 1])).unwrap();
    /// let cg = k.class_group(&ClassGroupOptions::default().with_unconditional(true)).unwrap();
    /// assert_eq!(cg.bound_kind, FactorBaseBound::Minkowski);
    /// assert!(cg.generation_bound as f64 >= k.minkowski_bound().floor());
    /// ```
    pub fn with_unconditional(mut self, v: bool) -> Self {
        self.unconditional = v;
        self
    }
    crate::budget::deadline_and_cancel_setters!();
}

/// A unit (or S-unit) as a product `prod base_i^exp_i` of field elements
/// with integer exponents, never expanded unless asked.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::{ClassGroupOptions, NumberField};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// use twofold::numfield::CompactProduct;
/// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap();
/// let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
/// let u: &CompactProduct = &cg.units[0]; // a fundamental unit, +-(2^(1/3) - 1)^(+-1) (R = 1.3473...)
/// assert_eq!(k.norm(&u.expand(&k).unwrap()).numerator_ref(), &1u32);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct CompactProduct {
    /// The factors and their exponents.
    pub factors: Vec<(Element, i64)>,
}

impl CompactProduct {
    /// The product as an explicit element (its size can be huge: the
    /// height is the sum of `|exp| h(base)`).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(sqrt 2): the fundamental unit is +-(1 + sqrt 2)^(+-1), norm -1
    /// let k = NumberField::new(&z(&[-2, 0, 1])).unwrap();
    /// let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
    /// let u = cg.units[0].expand(&k).unwrap();
    /// assert_eq!(k.norm(&u), malachite::Rational::from(-1));
    /// let s = k.add(&k.one(), &k.generator());
    /// let inv = k.inv(&s).unwrap();
    /// let minus = |a: &twofold::numfield::Element| k.sub(&k.sub(a, a), a);
    /// assert!([s.clone(), minus(&s), inv.clone(), minus(&inv)].contains(&u));
    /// ```
    pub fn expand(&self, k: &NumberField) -> Result<Element, Error> {
        let mut r = k.one();
        for (b, e) in &self.factors {
            r = k.mul(&r, &k.pow(b, *e)?);
        }
        Ok(r)
    }
    /// The logarithmic embedding `sum exp_i log|sigma(base_i)|` (f64).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(sqrt 2): log(1 + sqrt 2) = asinh(1) at one place, minus it at the other
    /// let k = NumberField::new(&z(&[-2, 0, 1])).unwrap();
    /// let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
    /// let l = cg.units[0].log_embedding(&k);
    /// assert!((l[0] + l[1]).abs() < 1e-12 && (l[0].abs() - 1f64.asinh()).abs() < 1e-12);
    /// ```
    pub fn log_embedding(&self, k: &NumberField) -> Vec<f64> {
        let mut v = vec![0.0; k.r1 + k.r2];
        for (b, e) in &self.factors {
            for (x, l) in v.iter_mut().zip(k.log_embedding(b)) {
                *x += *e as f64 * l;
            }
        }
        v
    }
}

/// The class group and unit group of a number field.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::{ClassGroupOptions, NumberField};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // Q(sqrt -23): h = 3 (Gauss's class numbers; the forms x^2 + xy + 6y^2, 2x^2 +- xy + 3y^2)
/// let cg = NumberField::new(&z(&[6, 1, 1])).unwrap().class_group(&ClassGroupOptions::default()).unwrap();
/// assert_eq!((cg.class_number.clone(), cg.structure.clone()), (Integer::from(3), vec![Integer::from(3)]));
/// assert_eq!((cg.regulator, cg.roots_of_unity, cg.units.len()), (1.0, 2, 0));
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct ClassGroup {
    /// Cyclic factors `d_1 | d_2 | ...` (all > 1); empty for class number 1.
    pub structure: Vec<Integer>,
    /// The class number `h = prod d_i`.
    pub class_number: Integer,
    /// The regulator (f64, relative error about 1e-10 for small fields).
    pub regulator: f64,
    /// Fundamental units in compact form (unit rank `r1 + r2 - 1` of
    /// them), when every exponent fits in 64 bits; empty otherwise (see
    /// `unit_products`).
    pub units: Vec<CompactProduct>,
    /// The fundamental units as products with exponents of any size
    /// (always `r1 + r2 - 1` of them; the same units as `units` when that
    /// is not empty).
    pub unit_products: Vec<WideProduct>,
    /// The number `w` of roots of unity.
    pub roots_of_unity: u32,
    /// A generator of the roots of unity.
    pub torsion_generator: Element,
    /// The factor base: all prime ideals of norm at most `bound` (at least 30).
    pub factor_base: Vec<PrimeIdeal>,
    /// Norm bound of the factor base: the relations are collected over the
    /// prime ideals of norm at most this (plus those of `S`).
    pub bound: u64,
    /// Every prime ideal of norm at most this was shown to have its class in
    /// the subgroup generated by the factor base (the Minkowski or Bach
    /// bound, see `bound_kind`).
    pub generation_bound: u64,
    /// Which bound guarantees that the factor base generates the class group.
    pub bound_kind: FactorBaseBound,
    /// `h R` over the Euler-product estimate of the analytic class number
    /// formula (close to 1 when accepted).
    pub analytic_ratio: f64,
    /// The relation lattice in echelon form (rows over the factor base).
    #[cfg_attr(not(test), allow(dead_code))]
    pub(crate) echelon: Vec<Vec<Integer>>,
}

struct Row {
    /// valuations on the factor base (exact: Hermite entries of a lattice
    /// not yet of full rank can be large)
    v: Vec<Integer>,
    logs: Vec<f64>,
    /// exact exponents (no overflow: they grow along the elimination)
    exps: Vec<(usize, Integer)>,
    /// bound on the f64 error of `logs`
    err: f64,
}

fn combine(a: &[(usize, Integer)], ca: &Integer, b: &[(usize, Integer)], cb: &Integer) -> Vec<(usize, Integer)> {
    let mut out: Vec<(usize, Integer)> = Vec::with_capacity(a.len() + b.len());
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        let (idx, val) = if j >= b.len() || (i < a.len() && a[i].0 < b[j].0) {
            let r = (a[i].0, &a[i].1 * ca);
            i += 1;
            r
        } else if i >= a.len() || b[j].0 < a[i].0 {
            let r = (b[j].0, &b[j].1 * cb);
            j += 1;
            r
        } else {
            let r = (a[i].0, &a[i].1 * ca + &b[j].1 * cb);
            i += 1;
            j += 1;
            r
        };
        if val != 0 {
            out.push((idx, val));
        }
    }
    out
}

/// Exact exponents from the relation search's word-size ones.
fn wide(exps: &[(usize, i64)]) -> Vec<(usize, Integer)> {
    exps.iter().map(|&(i, e)| (i, Integer::from(e))).collect()
}

impl Row {
    /// self <- ca self + cb other
    fn lin(&self, ca: &Integer, other: &Row, cb: &Integer) -> Row {
        let v = self.v.iter().zip(&other.v).map(|(x, y)| {
            if *y == 0u32 { x * ca } else if *x == 0u32 { y * cb } else { x * ca + y * cb }
        }).collect();
        let fa = f64::rounding_from(ca, RoundingMode::Nearest).0;
        let fb = f64::rounding_from(cb, RoundingMode::Nearest).0;
        let logs = self.logs.iter().zip(&other.logs).map(|(x, y)| fa * x + fb * y).collect();
        let exps = combine(&self.exps, ca, &other.exps, cb);
        let err = fa.abs() * self.err + fb.abs() * other.err;
        Row { v, logs, exps, err }
    }

    /// `-self`.
    fn negated(&self) -> Row {
        Row { v: self.v.iter().map(|x| -x).collect(), logs: self.logs.iter().map(|x| -x).collect(), exps: self.exps.iter().map(|(i, e)| (*i, -e)).collect(), err: self.err }
    }

    /// `self - q other` for a unit (zero valuations) and any integer `q`;
    /// the logs are left for [`refresh`].
    fn minus_multiple(&self, q: &Integer, other: &Row) -> Row {
        let exps = combine(&self.exps, &Integer::ONE, &other.exps, &-q);
        Row { v: self.v.clone(), logs: self.logs.clone(), exps, err: f64::INFINITY }
    }
}

/// Rational approximation `p/q`, `q <= qmax`, within `tol` (continued fractions).
fn rational_approx(x: f64, qmax: i64, tol: f64) -> Option<(i64, i64)> {
    let (mut h0, mut h1, mut k0, mut k1) = (0i64, 1i64, 1i64, 0i64);
    let mut y = x;
    for _ in 0..40 {
        let a = y.floor();
        if a.abs() > 1e15 {
            return None;
        }
        let ai = a as i64;
        let h2 = ai.checked_mul(h1)?.checked_add(h0)?;
        let k2 = ai.checked_mul(k1)?.checked_add(k0)?;
        if k2 > qmax {
            return None;
        }
        if (x - h2 as f64 / k2 as f64).abs() < tol {
            return Some((h2, k2));
        }
        h0 = h1;
        h1 = h2;
        k0 = k1;
        k1 = k2;
        let frac = y - a;
        if frac.abs() < 1e-300 {
            return None;
        }
        y = 1.0 / frac;
    }
    None
}

/// The unit lattice of log vectors (first `r` coordinates), with compact forms.
struct UnitLattice {
    r: usize,
    basis: Vec<Row>,
    /// Exponent vectors of products found to be roots of unity (a few,
    /// the shortest kept), to shorten the units' exponents at the end.
    torsion: Vec<Vec<(usize, Integer)>>,
}

/// How many torsion exponent vectors [`UnitLattice`] keeps.
const TORSION_POOL: usize = 40;

fn exp_bits(e: &[(usize, Integer)]) -> u64 {
    use malachite::base::num::logic::traits::SignificantBits;
    e.iter().map(|(_, x)| x.significant_bits()).sum()
}

impl UnitLattice {
    /// Least-squares coordinates of `u` on the current basis (normal equations).
    fn coords(&self, u: &[f64]) -> Option<Vec<f64>> {
        let m = self.basis.len();
        let r = self.r;
        let mut a: Vec<Vec<f64>> = (0..m).map(|i| {
            let bi = &self.basis[i].logs[..r];
            let mut row: Vec<f64> = (0..m).map(|j| dot(bi, &self.basis[j].logs[..r])).collect();
            row.push(dot(bi, u));
            row
        }).collect();
        for c in 0..m {
            let p = (c..m).max_by(|&i, &j| a[i][c].abs().partial_cmp(&a[j][c].abs()).unwrap_or(std::cmp::Ordering::Equal))?;
            a.swap(p, c);
            if a[c][c].abs() < 1e-300 {
                return None;
            }
            for i in 0..m {
                if i != c {
                    let f = a[i][c] / a[c][c];
                    for j in c..=m {
                        a[i][j] -= f * a[c][j];
                    }
                }
            }
        }
        Some((0..m).map(|i| a[i][m] / a[i][i]).collect())
    }

    /// Moves each unit's exponent vector by the lattice the torsion
    /// vectors span (integral LLL, then nearest plane), keeping the new
    /// vector when it is shorter and its log embedding agrees (the unit
    /// changes by a root of unity only).
    fn shorten(&mut self, src: &mut LogSource, stop: &dyn Fn() -> bool) {
        if self.torsion.is_empty() {
            return;
        }
        let m = src.elems.len();
        let dense = |e: &[(usize, Integer)]| -> Vec<Integer> {
            let mut v = vec![Integer::ZERO; m];
            for (i, x) in e {
                v[*i] = x.clone();
            }
            v
        };
        let tors: Vec<Vec<Integer>> = self.torsion.iter().map(|t| dense(t)).collect();
        for i in 0..self.basis.len() {
            if self.basis[i].exps.iter().all(|(_, x)| i64::try_from(x).is_ok()) || stop() {
                continue;
            }
            let (_, t) = super::lattice::reduce_and_shorten(tors.clone(), dense(&self.basis[i].exps), stop);
            let exps: Vec<(usize, Integer)> = t.into_iter().enumerate().filter(|(_, x)| *x != 0u32).collect();
            if exp_bits(&exps) >= exp_bits(&self.basis[i].exps) {
                continue;
            }
            let mut nu = Row { v: self.basis[i].v.clone(), logs: self.basis[i].logs.clone(), exps, err: 0.0 };
            if refresh(&mut nu, src) {
                let close = nu.logs.iter().zip(&self.basis[i].logs).all(|(a, b)| (a - b).abs() <= 1e3 * (nu.err + self.basis[i].err) + 1e-9 * b.abs());
                if close {
                    self.basis[i] = nu;
                }
            }
        }
    }

    fn det(&self) -> f64 {
        let r = self.r;
        let mut a: Vec<Vec<f64>> = (0..r).map(|i| (0..r).map(|j| self.basis[i].logs[j]).collect()).collect();
        let mut d = 1.0;
        for c in 0..r {
            let Some(p) = (c..r).max_by(|&i, &j| a[i][c].abs().partial_cmp(&a[j][c].abs()).unwrap_or(std::cmp::Ordering::Equal)) else { return 0.0 };
            if p != c {
                a.swap(p, c);
                d = -d;
            }
            d *= a[c][c];
            if a[c][c] == 0.0 {
                return 0.0;
            }
            for i in c + 1..r {
                let f = a[i][c] / a[c][c];
                for j in c..r {
                    a[i][j] -= f * a[c][j];
                }
            }
        }
        d.abs()
    }

    /// Adds a unit `u` dependent on a full basis whose index in the
    /// lattice with `u` is large or not readable in f64: LLL of the `r + 1`
    /// log vectors (f64) with the transformation applied to the exponents
    /// and the logs recomputed exactly from them, repeated until the
    /// shortest vector is a root of unity (a Euclid algorithm in `R^r`, each
    /// step gaining what f64 can see). The lattice spanned never changes
    /// (unimodular steps); false, with the old basis kept, when precision
    /// or the step limit stops it.
    fn merge(&mut self, u: Row, src: &mut LogSource) -> bool {
        let full = self.basis.len() == self.r;
        let old_det = if full { self.det() } else { 0.0 };
        let copy = |x: &Row| Row { v: x.v.clone(), logs: x.logs.clone(), exps: x.exps.clone(), err: x.err };
        let old: Vec<Row> = self.basis.iter().map(copy).collect();
        if !self.merge_steps(u, src) {
            self.basis = old;
            return false;
        }
        // the lattice only grows: the new covolume divides the old one by a
        // positive integer, read with the logs' accuracy; anything else (an
        // f64 LLL step misled by rounding noise, a vector of huge logs
        // taken for a root of unity) leaves the old basis in place
        let (new_det, q) = if full && self.basis.len() == self.r {
            let d = self.det();
            (d, old_det / d)
        } else {
            (1.0, 1.0)
        };
        let accurate = self.basis.iter().all(|b| b.err.is_finite() && b.logs[..self.r].iter().all(|x| x.is_finite()) && b.err < 1e-6 * b.logs[..self.r].iter().map(|x| x * x).sum::<f64>().sqrt().max(1.0));
        if !(accurate && new_det > 0.0 && q >= 1.0 - 1e-6 && (q - q.round()).abs() < 1e-4 * q) {
            self.basis = old;
            return false;
        }
        self.reduce_basis(src);
        true
    }

    /// LLL-reduces a full basis (f64 LLL of its independent log vectors,
    /// the transformation applied to the exponents, the logs recomputed
    /// from them), so that the coordinates of the next unit on it are well
    /// conditioned: on a skew basis (vectors of length 1e3 spanning a
    /// covolume of 383) the normal equations lost eight digits and the
    /// exact rational coordinates were not recognised. The step is
    /// unimodular: a recomputed covolume that differs keeps the old basis.
    fn reduce_basis(&mut self, src: &mut LogSource) {
        let r = self.r;
        if r < 2 || self.basis.len() != r {
            return;
        }
        let vecs: Vec<Vec<f64>> = self.basis.iter().map(|x| x.logs[..r].to_vec()).collect();
        let t = lll_f64(&vecs);
        if t.iter().enumerate().all(|(i, row)| row.iter().enumerate().all(|(j, c)| *c == i64::from(i == j))) {
            return;
        }
        let before = self.det();
        let mut next: Vec<Row> = Vec::with_capacity(r);
        for trow in &t {
            let mut acc = Row { v: Vec::new(), logs: vec![0.0; self.basis[0].logs.len()], exps: Vec::new(), err: 0.0 };
            for (c, row) in trow.iter().zip(&self.basis) {
                if *c != 0 {
                    acc.exps = combine(&acc.exps, &Integer::ONE, &row.exps, &Integer::from(*c));
                }
            }
            if !refresh(&mut acc, src) {
                return;
            }
            next.push(acc);
        }
        let old = std::mem::replace(&mut self.basis, next);
        let after = self.det();
        if !(after.is_finite() && (after - before).abs() <= 1e-6 * before) {
            self.basis = old;
        }
    }

    /// The steps of [`UnitLattice::merge`]; false when precision or the
    /// step limit stops them (the basis may then be left half-done: the
    /// caller restores it).
    fn merge_steps(&mut self, u: Row, src: &mut LogSource) -> bool {
        let r = self.r;
        let norm = |x: &Row| x.logs[..r].iter().map(|y| y * y).sum::<f64>().sqrt();
        let copy = |x: &Row| Row { v: x.v.clone(), logs: x.logs.clone(), exps: x.exps.clone(), err: x.err };
        let mut rows: Vec<Row> = self.basis.iter().map(copy).collect();
        rows.push(u);
        for _ in 0..200 {
            let vecs: Vec<Vec<f64>> = rows.iter().map(|x| x.logs[..r].to_vec()).collect();
            let t = lll_f64(&vecs);
            let mut next: Vec<Row> = Vec::with_capacity(rows.len());
            for trow in &t {
                let mut acc = Row { v: Vec::new(), logs: vec![0.0; rows[0].logs.len()], exps: Vec::new(), err: 0.0 };
                for (c, row) in trow.iter().zip(&rows) {
                    if *c != 0 {
                        acc.exps = combine(&acc.exps, &Integer::ONE, &row.exps, &Integer::from(*c));
                    }
                }
                if !refresh(&mut acc, src) {
                    return false;
                }
                next.push(acc);
            }
            next.sort_by(|a, b| norm(a).total_cmp(&norm(b)));
            if norm(&next[0]) < (1e3 * next[0].err).max(1e-9) {
                next.remove(0);
                self.basis = next;
                return true;
            }
            let before: f64 = rows.iter().map(norm).product();
            let after: f64 = next.iter().map(norm).product();
            rows = next;
            if after.partial_cmp(&before) != Some(std::cmp::Ordering::Less) && t.iter().enumerate().all(|(i, row)| row.iter().enumerate().all(|(j, c)| *c == i64::from(i == j))) {
                return false;
            }
        }
        false
    }

    /// Adds a unit; returns false if precision did not allow it.
    fn add(&mut self, mut u: Row, src: &mut LogSource) -> bool {
        if !refresh(&mut u, src) {
            return false;
        }
        // size-reduce by the current basis (integral parts of the
        // coordinates); a log far larger than the basis (a kernel vector
        // with huge exponents) takes several passes, each gaining the
        // relative accuracy of the f64 coordinates
        for _ in 0..64 {
            if self.basis.is_empty() {
                break;
            }
            let Some(x) = self.coords(&u.logs[..self.r]) else { return false };
            if x.iter().all(|xi| xi.abs() < 0.5) {
                break;
            }
            for (xi, b) in x.iter().zip(&self.basis) {
                let q = xi.round();
                if q != 0.0 {
                    if !q.is_finite() {
                        return false;
                    }
                    let qi = Integer::rounding_from(q, RoundingMode::Exact).0;
                    let mut nu = u.minus_multiple(&qi, b);
                    if !refresh(&mut nu, src) {
                        return false;
                    }
                    u = nu;
                }
            }
        }
        let norm: f64 = u.logs.iter().take(self.r).map(|x| x * x).sum::<f64>().sqrt();
        if norm < (1e3 * u.err).max(1e-9) {
            // a root of unity: keep its exponents if short enough
            if !u.exps.is_empty() {
                let b = exp_bits(&u.exps);
                if self.torsion.len() < TORSION_POOL {
                    self.torsion.push(u.exps);
                } else if let Some((i, _)) = self.torsion.iter().enumerate().map(|(i, t)| (i, exp_bits(t))).max_by_key(|x| x.1).filter(|x| x.1 > b) {
                    self.torsion[i] = u.exps;
                }
            }
            return true;
        }
        if self.basis.is_empty() {
            self.basis.push(u);
            return true;
        }
        let Some(x) = self.coords(&u.logs[..self.r]) else { return false };
        let mut res: Vec<f64> = u.logs[..self.r].to_vec();
        for (xi, b) in x.iter().zip(&self.basis) {
            for (rj, bj) in res.iter_mut().zip(&b.logs[..self.r]) {
                *rj -= xi * bj;
            }
        }
        if dot(&res, &res).sqrt() > 1e-6 * norm {
            if self.basis.len() < self.r {
                self.basis.push(u);
                self.reduce_basis(src);
                return true;
            }
            return false;
        }
        let bmin = self.basis.iter().map(|b| dot(&b.logs[..self.r], &b.logs[..self.r]).sqrt()).fold(f64::INFINITY, f64::min);
        let berr = self.basis.iter().map(|b| b.err).fold(0.0, f64::max);
        let tol = (1e3 * (u.err + berr) / bmin).max(1e-12);
        if tol > 1e-4 {
            return self.merge(u, src);
        }
        let mut fr = Vec::with_capacity(self.r);
        let mut den = 1i64;
        for &xi in &x {
            let Some((p, q)) = rational_approx(xi, 1000, tol) else { return self.merge(u, src) };
            fr.push((p, q));
            den = num_integer_lcm(den, q);
        }
        if den == 1 {
            return true;
        }
        // integer generators in units of b/den: den e_i for b_i, den x for u
        let r = self.basis.len();
        let mut gens: Vec<(Vec<i64>, Row)> = Vec::new();
        for (i, b) in self.basis.drain(..).enumerate() {
            let mut c = vec![0i64; r];
            c[i] = den;
            gens.push((c, b));
        }
        gens.push((fr.iter().map(|&(p, q)| p * (den / q)).collect(), u));
        // echelon by Euclid on coordinates
        let mut out: Vec<Row> = Vec::new();
        for col in 0..r {
            loop {
                let mut idx: Vec<usize> = (0..gens.len()).filter(|&i| gens[i].0[col] != 0).collect();
                if idx.len() <= 1 {
                    if let Some(&i) = idx.first() {
                        let (_, row) = gens.swap_remove(i);
                        out.push(row);
                    }
                    break;
                }
                idx.sort_by_key(|&i| gens[i].0[col].abs());
                let piv = idx[0];
                let (pc, prow) = (gens[piv].0.clone(), Row { v: gens[piv].1.v.clone(), logs: gens[piv].1.logs.clone(), exps: gens[piv].1.exps.clone(), err: gens[piv].1.err });
                for &i in &idx[1..] {
                    let q = gens[i].0[col].div_euclid(pc[col]);
                    let c: Vec<i64> = gens[i].0.iter().zip(&pc).map(|(a, b)| a - q * b).collect();
                    let row = gens[i].1.lin(&Integer::ONE, &prow, &Integer::from(-q));
                    gens[i] = (c, row);
                }
            }
        }
        for b in out.iter_mut() {
            if !refresh(b, src) {
                return false;
            }
        }
        self.basis = out;
        self.reduce_basis(src);
        true
    }
}

/// The number of roots in F_p of the monic cubic `f` (constant term
/// first) of discriminant `disc` (mod p, non-zero): one when `disc` is not
/// a square (Stickelberger: the Frobenius is an odd permutation of the
/// roots), else three or none as `x^p = x` modulo `f` or not.
pub(crate) fn cubic_root_count(f: &[u64], disc: u64, p: u64) -> usize {
    if p == 2 {
        return (0..2u64).filter(|&x| (f[0] + f[1] * x + f[2] * x + x) % 2 == 0).count();
    }
    if crate::arith::jacobi_u64(disc, p) == -1 {
        return 1;
    }
    // x^p mod (f, p), polynomials of degree < 3 as [c0, c1, c2]
    if p < 1 << 32 && f.iter().all(|&c| c < p) {
        return if super::fp::pow_linear_mod_cubic(0, p, [f[0], f[1], f[2]], p) == [0, 1, 0] { 3 } else { 0 };
    }
    let mulm = |a: [u64; 3], b: [u64; 3]| -> [u64; 3] {
        let mut c = [0u64; 5];
        for i in 0..3 {
            for j in 0..3 {
                c[i + j] = (c[i + j] + mul_mod(a[i], b[j], p)) % p;
            }
        }
        // x^3 = -(f0 + f1 x + f2 x^2)
        for d in (3..5).rev() {
            let t = c[d];
            if t != 0 {
                c[d] = 0;
                for k in 0..3 {
                    c[d - 3 + k] = (c[d - 3 + k] + p - mul_mod(t, f[k], p)) % p;
                }
            }
        }
        [c[0], c[1], c[2]]
    };
    let (mut r, mut b, mut e) = ([1u64, 0, 0], [0u64, 1, 0], p);
    while e > 0 {
        if e & 1 == 1 {
            r = mulm(r, b);
        }
        b = mulm(b, b);
        e >>= 1;
    }
    if r == [0, 1, 0] { 3 } else { 0 }
}

/// Where the logs of the relation elements come from: their f64 logs and
/// error bounds (`table`), and the elements themselves for logs at higher
/// precision ([`PreciseLogs`]).
struct LogSource<'a> {
    k: &'a NumberField,
    table: &'a [(Vec<f64>, f64)],
    elems: &'a [Element],
    precise: &'a mut PreciseLogs,
}

/// Recomputes the logarithmic embedding of a product from the net
/// exponents of its factors: in f64 when the error bound (the sum of
/// `|e_i|` times the factors' error bounds) stays below `1e-9`, else with
/// logs at the precision the exponents need. False only when that
/// precision would pass [`MAX_LOG_BITS`].
fn refresh(u: &mut Row, src: &mut LogSource) -> bool {
    let m = u.logs.len();
    let mut logs = vec![0.0f64; m];
    let mut err = 0.0f64;
    let mut mag = 0.0f64;
    for (i, e) in &u.exps {
        let (l, er) = &src.table[*i];
        let ef = f64::rounding_from(e, RoundingMode::Nearest).0;
        let mut size = 1.0f64;
        for (x, y) in logs.iter_mut().zip(l) {
            *x += ef * y;
            size = size.max(y.abs());
        }
        mag += ef.abs() * size;
        err += ef.abs() * er;
    }
    err += 4.0 * f64::EPSILON * mag * m as f64;
    if err < 1e-9 {
        u.logs = logs;
        u.err = err;
        return true;
    }
    if !mag.is_finite() {
        return false;
    }
    // absolute error about mag 2^-prec: 60 bits below 1 are plenty
    let prec = mag.max(1.0).log2().ceil() as u64 + 64;
    if prec > MAX_LOG_BITS {
        return false;
    }
    u.logs = src.precise.combination(src.k, src.elems, &u.exps, prec);
    u.err = mag * 2f64.powi(-(prec as i32) + 8) + 4.0 * f64::EPSILON * u.logs.iter().map(|x| x.abs()).fold(1.0, f64::max);
    true
}

fn num_integer_lcm(a: i64, b: i64) -> i64 {
    let (mut x, mut y) = (a, b);
    while y != 0 {
        let t = x % y;
        x = y;
        y = t;
    }
    a / x * b
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// LLL reduction (delta = 0.99) of real vectors, returning the integer
/// transformation: row `i` of the result gives the combination of the
/// inputs forming reduced vector `i`.
pub(crate) fn lll_f64(vecs: &[Vec<f64>]) -> Vec<Vec<i64>> {
    let n = vecs.len();
    let mut b: Vec<Vec<f64>> = vecs.to_vec();
    let mut t: Vec<Vec<i64>> = (0..n).map(|i| (0..n).map(|j| i64::from(i == j)).collect()).collect();
    let gso = |b: &[Vec<f64>]| -> (Vec<Vec<f64>>, Vec<Vec<f64>>) {
        let mut bs: Vec<Vec<f64>> = Vec::new();
        let mut mu = vec![vec![0.0; n]; n];
        for i in 0..n {
            let mut v = b[i].clone();
            for j in 0..i {
                mu[i][j] = dot(&b[i], &bs[j]) / dot(&bs[j], &bs[j]).max(1e-300);
                for (x, y) in v.iter_mut().zip(&bs[j]) {
                    *x -= mu[i][j] * y;
                }
            }
            bs.push(v);
        }
        (bs, mu)
    };
    let mut k = 1;
    let mut guard = 0;
    while k < n && guard < 10_000 {
        guard += 1;
        for j in (0..k).rev() {
            let (_, mu) = gso(&b);
            let q = mu[k][j].round();
            if q != 0.0 {
                let qi = q as i64;
                for c in 0..b[k].len() {
                    b[k][c] -= q * b[j][c];
                }
                for c in 0..n {
                    t[k][c] -= qi * t[j][c];
                }
            }
        }
        let (bs, mu) = gso(&b);
        if dot(&bs[k], &bs[k]) >= (0.99 - mu[k][k - 1] * mu[k][k - 1]) * dot(&bs[k - 1], &bs[k - 1]) {
            k += 1;
        } else {
            b.swap(k, k - 1);
            t.swap(k, k - 1);
            k = k.max(2) - 1;
        }
    }
    t
}

impl NumberField {
    /// The Minkowski bound `sqrt|d| (4/pi)^r2 n!/n^n`.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(i): sqrt 4 (4/pi) 2!/2^2 = 4/pi
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap();
    /// assert!((k.minkowski_bound() - 4.0 / std::f64::consts::PI).abs() < 1e-12);
    /// ```
    pub fn minkowski_bound(&self) -> f64 {
        let d = f64::rounding_from(&self.disc, RoundingMode::Nearest).0.abs();
        let n = self.n as i32;
        let fact: f64 = (1..=self.n).map(|i| i as f64).product();
        d.sqrt() * (4.0 / std::f64::consts::PI).powi(self.r2 as i32) * fact / (n as f64).powi(n)
    }

    /// Bach's bound `12 (log |d_K|)^2` (generates the class group under GRH).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-1, -1, 0, 1])).unwrap(); // d = -23
    /// assert!((k.bach_bound() - 12.0 * 23f64.ln().powi(2)).abs() < 1e-9);
    /// ```
    pub fn bach_bound(&self) -> f64 {
        let d = f64::rounding_from(&self.disc, RoundingMode::Nearest).0.abs();
        12.0 * d.ln().powi(2)
    }

    /// The number of roots of unity and a generator (degree 2 and 3 only).
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(sqrt -3): the sixth roots of unity; Q(2^(1/3)): only +-1
    /// let k = NumberField::new(&z(&[1, 1, 1])).unwrap(); // x^2 + x + 1
    /// let (w, zeta) = k.roots_of_unity();
    /// assert_eq!(w, 6);
    /// assert_eq!(k.pow(&zeta, 6).unwrap(), k.one());
    /// assert_ne!(k.pow(&zeta, 3).unwrap(), k.one());
    /// assert_eq!(NumberField::new(&z(&[-2, 0, 0, 1])).unwrap().roots_of_unity().0, 2);
    /// ```
    pub fn roots_of_unity(&self) -> (u32, Element) {
        let w: u32 = if self.r1 > 0 { 2 } else if self.disc == -4 { 4 } else if self.disc == -3 { 6 } else { 2 };
        if w == 2 {
            return (2, self.rational(&Rational::from(-1)));
        }
        for a in -1i64..=1 {
            for b in -1i64..=1 {
                let x = self.element(&[Integer::from(a), Integer::from(b)]).unwrap_or_else(|_| self.one());
                let xw = self.pow(&x, i64::from(w)).unwrap_or_else(|_| self.one());
                let xh = self.pow(&x, i64::from(w / 2)).unwrap_or_else(|_| self.one());
                if xw == self.one() && xh != self.one() && (w != 6 || self.pow(&x, 3).map(|c| c != self.one()).unwrap_or(false) && self.pow(&x, 2).map(|c| c != self.one()).unwrap_or(false)) {
                    return (w, x);
                }
            }
        }
        (2, self.rational(&Rational::from(-1)))
    }

    /// The Euler-product estimate of `h R = w sqrt|d| res / (2^r1 (2 pi)^r2)`
    /// over the primes up to `x`.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(sqrt -5): h R = 2 (R = 1 for imaginary quadratic fields)
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
    /// assert!((k.analytic_class_number_formula(100_000).unwrap() - 2.0).abs() < 0.1);
    /// ```
    pub fn analytic_class_number_formula(&self, x: u64) -> Result<f64, Error> {
        let mut logres = 0.0f64;
        let fpoly: Vec<Integer> = self.poly.clone();
        for p in primes_up_to(x) {
            let pf = p as f64;
            let mut l = (1.0 - 1.0 / pf).ln();
            if mod_word(&self.poly_disc, p) == 0 {
                for q in self.primes_above(p)? {
                    l -= (1.0 - 1.0 / (q.norm() as f64)).ln();
                }
            } else {
                let nr = if self.n == 2 {
                    // quadratic: the Kronecker symbol of the polynomial discriminant
                    (1 + crate::arith::kronecker(&self.poly_disc, &Integer::from(p))) as usize
                } else {
                    let fp_: Vec<u64> = fpoly.iter().map(|c| mod_word(c, p)).collect();
                    cubic_root_count(&fp_, mod_word(&self.poly_disc, p), p)
                };
                // degree pattern from the number of roots (n <= 3)
                let degs: Vec<u32> = match (self.n, nr) {
                    (2, 2) => vec![1, 1],
                    (2, _) => vec![2],
                    (3, 3) => vec![1, 1, 1],
                    (3, 1) => vec![1, 2],
                    _ => vec![3],
                };
                for f in degs {
                    l -= (1.0 - pf.powi(-(f as i32))).ln();
                }
            }
            logres += l;
        }
        let (w, _) = self.roots_of_unity();
        let d = f64::rounding_from(&self.disc, RoundingMode::Nearest).0.abs();
        Ok(w as f64 * d.sqrt() * logres.exp() / (2f64.powi(self.r1 as i32) * (2.0 * std::f64::consts::PI).powi(self.r2 as i32)))
    }

    /// All prime ideals of norm at most `b`, sorted by norm.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(i): (1 + i) of norm 2, 5 = (2 + i)(2 - i), 3 inert of norm 9
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap();
    /// let norms: Vec<u128> = k.primes_up_to_norm(10).unwrap().iter().map(|p| p.norm()).collect();
    /// assert_eq!(norms, vec![2, 5, 5, 9]);
    /// ```
    pub fn primes_up_to_norm(&self, b: u64) -> Result<Vec<PrimeIdeal>, Error> {
        let mut out = Vec::new();
        for p in primes_up_to(b) {
            for q in self.primes_above(p)? {
                if q.norm() <= b as u128 {
                    out.push(q);
                }
            }
        }
        out.sort_by_key(|q| q.norm());
        Ok(out)
    }

    /// LLL-reduced Z-basis of an ideal for the quadratic form T2.
    ///
    /// ```
    /// use malachite::{Integer, Rational};
    /// use twofold::numfield::NumberField;
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[1, 0, 1])).unwrap(); // Q(i)
    /// // the ideal (5) has the basis 5, 5i; nothing shorter: each vector has norm 25
    /// let five = k.principal_ideal(&k.rational(&Rational::from(5))).unwrap();
    /// let b = k.reduced_basis(&five);
    /// assert_eq!(b.len(), 2);
    /// assert!(b.iter().all(|x| k.ideal_contains(&five, x) && k.norm(x) == Rational::from(25)));
    /// ```
    pub fn reduced_basis(&self, i: &Ideal) -> Vec<Element> {
        let basis = i.basis(self);
        let vecs: Vec<Vec<f64>> = basis.iter().map(|e| self.minkowski(e)).collect();
        let t = lll_f64(&vecs);
        t.iter().map(|row| {
            let mut acc = self.rational(&Rational::ZERO);
            for (c, b) in row.iter().zip(&basis) {
                if *c != 0 {
                    acc = self.add(&acc, &self.mul(&self.rational(&Rational::from(*c)), b));
                }
            }
            acc
        }).collect()
    }

    /// The class group, regulator and fundamental units (degree 2 and 3).
    ///
    /// Conditional statements: the factor base generates the class group
    /// unconditionally for [`FactorBaseBound::Minkowski`] and under GRH for
    /// [`FactorBaseBound::BachGrh`]; in both cases the final check that
    /// `h R` is not a proper divisor of the computed `h* R*` uses an
    /// Euler-product estimate of the zeta residue (numerical).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap(); // Q(sqrt -5): h = 2
    /// let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
    /// assert_eq!(cg.structure, vec![Integer::from(2)]);
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3)): unit 2^(1/3) - 1, R = 1.3473...
    /// let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
    /// assert!((cg.regulator - 1.347_377_6).abs() < 1e-6);
    /// ```
    pub fn class_group(&self, opts: &ClassGroupOptions) -> Result<ClassGroup, Error> {
        self.class_group_with(opts, &[])
    }

    /// As [`NumberField::class_group`], with the prime ideals above the given
    /// rational primes added to the factor base (for S-units).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// // Q(sqrt -5), h = 2, with the primes above 3 added to the factor base
    /// let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
    /// let cg = k.class_group_with(&ClassGroupOptions::default(), &[3]).unwrap();
    /// assert_eq!(cg.class_number, Integer::from(2));
    /// assert!(cg.factor_base.iter().filter(|p| p.p == 3).count() == 2);
    /// ```
    pub fn class_group_with(&self, opts: &ClassGroupOptions, extra_primes: &[u64]) -> Result<ClassGroup, Error> {
        let digits = super::relations::ln_abs(&self.disc) / std::f64::consts::LN_10;
        let kernel = match opts.route {
            Route::Kernel => true,
            Route::Echelon => false,
            Route::Auto => digits >= KERNEL_ROUTE_DIGITS,
        };
        if kernel {
            self.class_group_by_kernel(opts, extra_primes)
        } else {
            self.class_group_by_echelon(opts, extra_primes)
        }
    }

    /// The bound up to which the prime ideals must be shown to lie in the
    /// group the factor base generates: Minkowski's (unconditional) when the
    /// caller asks for it or when it is the smaller, else Bach's (GRH);
    /// [`ErrorKind::TooLarge`] above 1e8.
    pub(crate) fn generation_bound(&self, opts: &ClassGroupOptions) -> Result<(u64, FactorBaseBound), Error> {
        let mink = self.minkowski_bound();
        let bach = self.bach_bound();
        let (bound, kind) = if opts.unconditional || mink <= bach { (mink, FactorBaseBound::Minkowski) } else { (bach, FactorBaseBound::BachGrh) };
        if bound > 1e8 {
            return Err(Error::new(ErrorKind::TooLarge, format!("factor base bound {bound:.3e} too large")));
        }
        Ok((bound.floor() as u64, kind))
    }

    fn class_group_by_echelon(&self, opts: &ClassGroupOptions, extra_primes: &[u64]) -> Result<ClassGroup, Error> {
        self.echelon_route(opts, extra_primes, false).map(|(cg, _)| cg)
    }

    /// The echelon route; with `s_last` the columns of the prime ideals
    /// above `extra_primes` (S') come last in the echelon, so that the
    /// pivot rows at those columns are supported on S' and span the
    /// relations with zero valuation outside S' (Cohen GTM 193 §7.4). They
    /// are returned as (valuations on S', in factor-base order; the
    /// element as a product of relation elements).
    pub(crate) fn echelon_route(&self, opts: &ClassGroupOptions, extra_primes: &[u64], s_last: bool) -> Result<(ClassGroup, SPart), Error> {
        let stop = || opts.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed)) || opts.deadline.is_some_and(|d| Instant::now() >= d);
        let budget = || Error::new(ErrorKind::Budget, "class group: budget exhausted");
        let (gen_bound, kind) = self.generation_bound(opts)?;
        let b0 = base_bound(self).min(gen_bound).max(MIN_FACTOR_BASE_BOUND);
        let mut rels = RelationSearch::new(self, b0, gen_bound, extra_primes, &stop)?;
        let kfb = rels.fb.len();
        // column of each factor-base ideal: with `s_last`, those above
        // `extra_primes` last (in factor-base order)
        let in_s = |q: &PrimeIdeal| s_last && extra_primes.contains(&q.p);
        let mut perm = vec![0usize; kfb];
        let mut next_col = 0usize;
        for pass in [false, true] {
            for (j, q) in rels.fb.iter().enumerate() {
                if in_s(q) == pass {
                    perm[j] = next_col;
                    next_col += 1;
                }
            }
        }
        let ns = rels.fb.iter().filter(|q| in_s(q)).count();
        let r = self.r1 + self.r2 - 1;
        let (w, zeta) = self.roots_of_unity();
        let target = self.analytic_class_number_formula(EULER_PRODUCT_LIMIT)?;
        if stop() {
            return Err(budget());
        }
        let mut pivots: Vec<Option<Row>> = (0..kfb).map(|_| None).collect();
        let mut units = UnitLattice { r, basis: Vec::new(), torsion: Vec::new() };
        let mut by_vector: std::collections::HashMap<Vec<i64>, usize> = std::collections::HashMap::new();
        let mut history: Vec<(Vec<(usize, Integer)>, Vec<f64>, f64)> = Vec::new();
        let mut precise = PreciseLogs::new();
        let mut round = 0usize;
        let max_rounds = MAX_ROUNDS + 40 * kfb;
        let mut ratio: f64;
        let mut found: Vec<Found> = Vec::new();
        loop {
            round += 1;
            rels.round(round, max_rounds, &stop, "class group", &mut found)?;
            for fnd in found.drain(..) {
                let Found { exps, v, logs, err } = fnd;
                let exps = wide(&exps);
                let mut src = LogSource { k: self, table: &rels.table, elems: &rels.elems, precise: &mut precise };
                // two relations with the same valuation vector give a unit of small height
                if let Some(&j) = by_vector.get(&v) {
                    let (jexps, jlogs, jerr) = &history[j];
                    let ulogs: Vec<f64> = logs.iter().zip(jlogs).map(|(a, b)| a - b).collect();
                    let uexps = combine(&exps, &Integer::ONE, jexps, &Integer::NEGATIVE_ONE);
                    units.add(Row { v: vec![Integer::ZERO; kfb], logs: ulogs, exps: uexps, err: err + jerr }, &mut src);
                } else {
                    by_vector.insert(v.clone(), history.len());
                    history.push((exps.clone(), logs.clone(), err));
                }
                let mut pv = vec![Integer::ZERO; kfb];
                for (j, x) in v.into_iter().enumerate() {
                    pv[perm[j]] = Integer::from(x);
                }
                let row = Row { v: pv, logs, exps, err };
                if let Some(u) = insert_relation(&mut pivots, row) {
                    units.add(u, &mut src);
                }
            }
            // complete?
            if pivots.iter().all(|p| p.is_some()) && units.basis.len() == r {
                let h: f64 = pivots.iter().enumerate().map(|(i, p)| p.as_ref().map_or(0.0, |p| f64::rounding_from(&p.v[i], RoundingMode::Nearest).0.abs())).product();
                let reg = if r == 0 { 1.0 } else { units.det() };
                ratio = h * reg / target;
                if ratio < 1.5 {
                    break;
                }
            }
        }
        if ratio < 0.6 {
            return Err(Error::new(ErrorKind::InvalidValue, format!("h R below the analytic estimate (ratio {ratio}): inconsistent data")));
        }
        // every prime ideal up to the generation bound lies in the subgroup generated by the base
        rels.verify_all(&stop)?;
        let rel_elems = &rels.elems;
        let mat: Vec<Vec<Integer>> = pivots.iter().map(|p| p.as_ref().map(|p| p.v.clone()).unwrap_or_default()).collect();
        let structure = smith_invariants(&mat);
        let class_number = structure.iter().fold(Integer::ONE, |a, d| a * d);
        {
            let mut src = LogSource { k: self, table: &rels.table, elems: &rels.elems, precise: &mut precise };
            units.shorten(&mut src, &stop);
        }
        let unit_products: Vec<WideProduct> = units.basis.iter().map(|u| WideProduct::new(u.exps.iter().map(|(i, e)| (rel_elems[*i].clone(), e.clone())).collect())).collect();
        let unit_list: Vec<CompactProduct> = unit_products.iter().map(WideProduct::to_compact).collect::<Option<Vec<_>>>().unwrap_or_default();
        let regulator = if r == 0 { 1.0 } else { units.det() };
        // the S' part: pivot rows at the last `ns` columns
        let s_part: SPart = pivots[kfb - ns..].iter().flatten().map(|p| {
            let elem = WideProduct::new(p.exps.iter().map(|(i, e)| (rel_elems[*i].clone(), e.clone())).collect());
            (p.v[kfb - ns..].to_vec(), elem)
        }).collect();
        // the echelon handed out in factor-base column order
        let echelon: Vec<Vec<Integer>> = mat.iter().map(|row| {
            if row.is_empty() {
                return Vec::new();
            }
            (0..kfb).map(|j| row[perm[j]].clone()).collect()
        }).collect();
        let cg = ClassGroup {
            structure,
            class_number,
            regulator,
            units: unit_list,
            unit_products,
            roots_of_unity: w,
            torsion_generator: zeta,
            factor_base: rels.fb,
            bound: b0,
            generation_bound: gen_bound,
            bound_kind: kind,
            analytic_ratio: ratio,
            echelon,
        };
        Ok((cg, s_part))
    }
}

/// The S' part of the echelon: per prime ideal of S', the valuations on
/// S' and the generator as a product of relation elements.
pub(crate) type SPart = Vec<(Vec<Integer>, WideProduct)>;

/// Whether pivot rows are size-reduced above the diagonal (Hermite form).
/// Measured both ways: without it the valuations grow and so do the
/// quotients of the Euclid steps, and the exponents grow faster still
/// (1e16: 785 bits after 100 rounds against 18).
const HERMITE_REDUCE: bool = true;

/// Inserts a relation into the echelon; returns the zero-reduced row (a unit) if any.
fn insert_relation(pivots: &mut [Option<Row>], mut row: Row) -> Option<Row> {
    let k = pivots.len();
    for col in 0..k {
        if row.v[col] == 0u32 {
            continue;
        }
        match pivots[col].take() {
            None => {
                if row.v[col] < 0u32 {
                    row = row.negated();
                }
                if HERMITE_REDUCE {
                    reduce_row(pivots, &mut row, col + 1);
                }
                pivots[col] = Some(row);
                return None;
            }
            Some(mut p) => {
                // Euclid between the pivot and the row on column col
                while row.v[col] != 0u32 {
                    let q = (&p.v[col]).div_round(&row.v[col], RoundingMode::Floor).0;
                    let np = p.lin(&Integer::ONE, &row, &-q);
                    p = row;
                    row = np;
                }
                if p.v[col] < 0u32 {
                    p = p.negated();
                }
                if HERMITE_REDUCE {
                    reduce_row(pivots, &mut p, col + 1);
                    reduce_row(pivots, &mut row, col + 1);
                }
                pivots[col] = Some(p);
            }
        }
    }
    Some(row)
}

/// Reduces the entries of `row` at columns `from..` modulo the pivots there
/// (Hermite size reduction, keeping coefficients small).
fn reduce_row(pivots: &[Option<Row>], row: &mut Row, from: usize) {
    for j in from..pivots.len() {
        if let Some(pj) = &pivots[j] {
            let d = &pj.v[j];
            if *d > 0u32 && (row.v[j] < 0u32 || row.v[j] >= *d) {
                let q = (&row.v[j]).div_round(d, RoundingMode::Floor).0;
                *row = row.lin(&Integer::ONE, pj, &-q);
            }
        }
    }
}



/// Relations beyond the number of columns before the kernel route first
/// solves (more are added when the rank or `h R` says so).
const KERNEL_EXCESS: usize = 24;

/// Kernel vectors of the core tried first, plus two per unit rank
/// (doubled while `h R` does not match).
const KERNEL_FIRST: usize = 4;

/// Relations through the aimed column after which a first targeted round
/// of the kernel route stops its line scan (`RelationSearch::targeted_enough`).
const TARGETED_ENOUGH: usize = 10;

/// Rows beside `B` in the first Hermite form of the core (`sparse.rs`
/// `solve_core`): a sublattice, accepted only when `h* R` matches.
const HERMITE_EXTRA_ROWS: usize = 256;

/// Targeted attempts per column without a relation (or left without a
/// row by the elimination) before the search gives up aiming at it.
const TARGETED_ATTEMPTS: usize = 12;

/// Attempts at a column emptied by the elimination: the count is set back
/// to at most this, so each emptying buys a few more aimed rounds.
const TARGETED_RETRIES: usize = 8;

impl NumberField {
    /// The class group route for large fields (`sparse.rs`): relations
    /// collected in bulk, structured elimination with unit pivots, the
    /// class group by the Hermite form modulo a determinant, the units
    /// from a basis of the integral kernel of the core. Accepted, as the
    /// echelon route, when `h* R*` agrees with the Euler product.
    fn class_group_by_kernel(&self, opts: &ClassGroupOptions, extra_primes: &[u64]) -> Result<ClassGroup, Error> {
        let stop = || opts.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed)) || opts.deadline.is_some_and(|d| Instant::now() >= d);
        let budget = || Error::new(ErrorKind::Budget, "class group: budget exhausted");
        let (gen_bound, kind) = self.generation_bound(opts)?;
        let b0 = base_bound(self).min(gen_bound).max(MIN_FACTOR_BASE_BOUND);
        let mut rels = RelationSearch::new(self, b0, gen_bound, extra_primes, &stop)?;
        rels.primitive_only = true;
        // few relations per aimed column while columns are missing; all a
        // line scan meets once h* R shows relations missing (`sparse.rs`)
        rels.targeted_enough = TARGETED_ENOUGH;
        let kfb = rels.fb.len();
        let r = self.r1 + self.r2 - 1;
        let m = self.r1 + self.r2;
        let (w, zeta) = self.roots_of_unity();
        let target = self.analytic_class_number_formula(EULER_PRODUCT_LIMIT)?;
        if stop() {
            return Err(budget());
        }
        let mut all: Vec<sparse::SparseRelation> = Vec::new();
        let mut hits = vec![0usize; kfb];
        let push = |f: Found, all: &mut Vec<sparse::SparseRelation>, hits: &mut Vec<usize>| {
            let v: Vec<(usize, i64)> = f.v.iter().enumerate().filter(|(_, x)| **x != 0).map(|(i, x)| (i, *x)).collect();
            for &(c, _) in &v {
                hits[c] += 1;
            }
            let mut exps = f.exps;
            exps.sort_by_key(|x| x.0);
            all.push(sparse::SparseRelation { v, exps });
        };
        for p in rels.column_primes() {
            if let Some(f) = rels.free_relation(p)? {
                push(f, &mut all, &mut hits);
            }
        }
        let mut found: Vec<Found> = Vec::new();
        // relations from a log sieve over a + b theta first (cubic fields)
        rels.sieve_collect(kfb + KERNEL_EXCESS, &stop, &mut found)?;
        // many relations from the sieve: the rounds aim at the columns it missed from the start
        let sieved = found.len() >= kfb / 2;
        for f in found.drain(..) {
            push(f, &mut all, &mut hits);
        }
        let max_rounds = MAX_ROUNDS + 40 * kfb;
        let mut round = 0usize;
        let mut attempts = vec![0usize; kfb];
        let mut cursor = 0usize;
        let mut want = kfb + KERNEL_EXCESS;
        let mut elim = sparse::Elimination::new(kfb);
        // the core's Hermite form from B and this many other rows at
        // first, from all rows once that falls short
        let mut hermite_rows = Some(HERMITE_EXTRA_ROWS);
        let mut precise = PreciseLogs::new();
        let (solution, units, ratio, core, count) = loop {
            while all.len() < want || hits.contains(&0) {
                round += 1;
                let aim = if (sieved || round > kfb + 1) && round.is_multiple_of(2) {
                    // a column without a relation, else (more relations
                    // wanted: the generic rounds find few in large fields)
                    // the next column in turn
                    (0..kfb).map(|i| (cursor + i) % kfb).find(|&j| hits[j] == 0 && attempts[j] < TARGETED_ATTEMPTS).or_else(|| {
                        (0..kfb).map(|i| (cursor + i) % kfb).find(|&j| sieved && attempts[j] < TARGETED_ATTEMPTS)
                    })
                } else {
                    None
                };
                match aim {
                    Some(j) => {
                        attempts[j] += 1;
                        cursor = j + 1;
                        if round > max_rounds {
                            return Err(Error::new(ErrorKind::Budget, "class group: too many rounds of relation search"));
                        }
                        rels.targeted_round(j, attempts[j], &stop, "class group", &mut found)?;
                    }
                    None => rels.round(round, max_rounds, &stop, "class group", &mut found)?,
                }
                for f in found.drain(..) {
                    push(f, &mut all, &mut hits);
                }
            }
            elim.add(&all);
            elim.run(&stop);
            let core = elim.core();
            if stop() {
                return Err(budget());
            }
            let Some(sol) = sparse::solve_core(&core, hermite_rows, &stop) else {
                if stop() {
                    return Err(budget());
                }
                // a column whose rows all went with eliminated pivots: aim
                // the search at it (a relation through it is what is missing)
                for &c in &core.empty_columns {
                    hits[c] = 0;
                    attempts[c] = attempts[c].min(TARGETED_RETRIES);
                }
                want = all.len() + 8 + kfb / 16;
                continue;
            };
            let h: f64 = sol.hermite.iter().enumerate().map(|(i, row)| f64::rounding_from(&row[i], RoundingMode::Nearest).0).product();
            // kernels of B and a growing number of the other rows, until h R matches
            // the units the elimination found (rows that became zero:
            // short products) first, kernel vectors of the core only when
            // those fall short
            let mut count = 0;
            let mut accepted = None;
            let mut last_reg: Option<f64> = None;
            loop {
                let Some(kernel) = sol.kernel(&core, count, &stop) else {
                    if stop() {
                        return Err(budget());
                    }
                    break;
                };
                let mut src = LogSource { k: self, table: &rels.table, elems: &rels.elems, precise: &mut precise };
                let mut cands: Vec<Row> = Vec::new();
                for exps in core.units.iter().map(|u| wide(u)).chain(kernel.iter().map(|kv| {
                    let mut exps: Vec<(usize, Integer)> = Vec::new();
                    for (ci, x) in kv {
                        exps = combine(&exps, &Integer::ONE, &wide(&core.exps[*ci]), x);
                    }
                    exps
                })) {
                    let mut row = Row { v: Vec::new(), logs: vec![0.0; m], exps, err: f64::INFINITY };
                    if refresh(&mut row, &mut src) {
                        cands.push(row);
                    }
                }
                if stop() {
                    return Err(budget());
                }
                // smallest logs first, so the later ones are near multiples
                // of the basis; the refused ones are offered again
                let norm = |u: &Row| u.logs.iter().take(r).map(|x| x * x).sum::<f64>();
                cands.sort_by(|a, b| norm(a).total_cmp(&norm(b)));
                let mut units = UnitLattice { r, basis: Vec::new(), torsion: Vec::new() };
                for _pass in 0..3 {
                    let mut refused = Vec::new();
                    for u in cands.drain(..) {
                        let keep = Row { v: Vec::new(), logs: u.logs.clone(), exps: u.exps.clone(), err: u.err };
                        if !units.add(u, &mut src) {
                            refused.push(keep);
                        }
                    }
                    if refused.is_empty() {
                        break;
                    }
                    cands = refused;
                }
                if units.basis.len() == r {
                    let reg = if r == 0 { 1.0 } else { units.det() };
                    let ratio = h * reg / target;
                    if ratio < 1.5 {
                        accepted = Some((units, ratio));
                        break;
                    }
                }
                if count >= sol.others.len() {
                    break;
                }
                // a full unit lattice that more kernel vectors did not
                // change: h* is what is too large, more relations are needed
                if units.basis.len() == r && r > 0 {
                    let reg = units.det();
                    if last_reg.is_some_and(|x| (x - reg).abs() < 1e-9 * reg) {
                        break;
                    }
                    last_reg = Some(reg);
                }
                count = if count == 0 { KERNEL_FIRST + 2 * r } else { 2 * count }.min(sol.others.len());
            }
            if let Some((units, ratio)) = accepted {
                break (sol, units, ratio, core, count);
            }
            if sol.partial {
                hermite_rows = None;
                continue;
            }
            rels.targeted_enough = usize::MAX;
            want = all.len() + 8 + kfb / 2;
        };
        if ratio < 0.6 {
            return Err(Error::new(ErrorKind::InvalidValue, format!("h R below the analytic estimate (ratio {ratio}): inconsistent data")));
        }
        rels.verify_all(&stop)?;
        let structure = smith_invariants(&solution.hermite);
        let class_number = structure.iter().fold(Integer::ONE, |a, d| a * d);
        let mut units = units;
        {
            let mut src = LogSource { k: self, table: &rels.table, elems: &rels.elems, precise: &mut precise };
            units.shorten(&mut src, &stop);
            // exponents past a word: more kernel vectors (roots of unity
            // now, the lattice being full) to shorten them by
            let long = |units: &UnitLattice| units.basis.iter().any(|u| u.exps.iter().any(|(_, x)| i64::try_from(x).is_err()));
            let more = KERNEL_EXCESS.max(2 * count).min(solution.others.len());
            if long(&units) && more > count {
                let Some(kernel) = solution.kernel(&core, more, &stop) else {
                    return Err(budget());
                };
                for kv in &kernel {
                    let mut exps: Vec<(usize, Integer)> = Vec::new();
                    for (ci, x) in kv {
                        exps = combine(&exps, &Integer::ONE, &wide(&core.exps[*ci]), x);
                    }
                    let row = Row { v: Vec::new(), logs: vec![0.0; m], exps, err: f64::INFINITY };
                    units.add(row, &mut src);
                }
                units.shorten(&mut src, &stop);
            }
        }
        let rel_elems = &rels.elems;
        let unit_products: Vec<WideProduct> = units.basis.iter().map(|u| WideProduct::new(u.exps.iter().map(|(i, e)| (rel_elems[*i].clone(), e.clone())).collect())).collect();
        let unit_list: Vec<CompactProduct> = unit_products.iter().map(WideProduct::to_compact).collect::<Option<Vec<_>>>().unwrap_or_default();
        let regulator = if r == 0 { 1.0 } else { units.det() };
        Ok(ClassGroup {
            structure,
            class_number,
            regulator,
            units: unit_list,
            unit_products,
            roots_of_unity: w,
            torsion_generator: zeta,
            factor_base: rels.fb,
            bound: b0,
            generation_bound: gen_bound,
            bound_kind: kind,
            analytic_ratio: ratio,
            echelon: solution.hermite,
        })
    }
}

#[cfg(test)]
mod route_tests {
    use super::*;

    fn field(a: i64, b: i64) -> NumberField {
        NumberField::new(&[Integer::from(b), Integer::from(a), Integer::ZERO, Integer::ONE]).unwrap()
    }

    #[test]
    fn both_routes_agree() {
        // two ways: the echelon route and the kernel route (sparse
        // elimination, Hermite form modulo the determinant, integral
        // kernel) give the same class group and regulator
        for (a, b) in [(1, -1), (10, 13), (31, -57), (-103, 7), (1234, 56789), (-3001, 5077), (6007, 203017)] {
            let k = field(a, b);
            let mut o1 = ClassGroupOptions::default();
            o1.route = Route::Echelon;
            let mut o2 = ClassGroupOptions::default();
            o2.route = Route::Kernel;
            let c1 = k.class_group(&o1).unwrap();
            let c2 = k.class_group(&o2).unwrap();
            assert_eq!(c1.structure, c2.structure, "x^3 + {a} x + {b}");
            assert!((c1.regulator - c2.regulator).abs() < 1e-6 * c1.regulator, "x^3 + {a} x + {b}: R {} against {}", c1.regulator, c2.regulator);
            for u in &c2.unit_products {
                assert!(u.is_unit(&k));
            }
        }
    }
}
