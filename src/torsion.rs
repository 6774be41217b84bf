//! The torsion subgroup E(Q)_tors, found rigorously.
//!
//! Method (Silverman-Tate, Rational Points on Elliptic Curves, II.4-II.5;
//! Silverman, AEC VII.3): on the integral short model
//! `Y^2 = X^3 - 27 c4 X - 54 c6` every torsion point has integer coordinates
//! with `Y = 0` or `Y^2 | 4A^3 + 27B^2 = -2^8 3^12 Delta` (Nagell-Lutz). We
//! first bound the order by `gcd #E(F_p)` over good odd primes (reduction is
//! injective on torsion there, AEC VII.3.1), then try every admissible `Y`,
//! find the integer roots `X` of the cubic exactly, keep the points of finite
//! order (at most 12 by Mazur's theorem) and map them back to the input model.

use crate::arith::{is_prime_u64, valuation};
use crate::budget::Work;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, Sign};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::cmp::Ordering;

/// The torsion subgroup: its points, structure and generators.
///
/// ```
/// use twofold::{Curve, torsion::TorsionGroup};
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap(); // y^2 + y = x^3 - x^2 - 10x - 20: Z/5 (published table, Cremona 1997)
/// let t = TorsionGroup::compute(&e, &[11u32.into()]);
/// assert_eq!(t.order(), 5);
/// assert_eq!(t.invariants(), vec![5]);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct TorsionGroup {
    points: Vec<Point>,
    invariants: Vec<u32>,
    generators: Vec<Point>,
    orders: Vec<u32>,
}

impl TorsionGroup {
    /// Computes E(Q)_tors. `bad_primes` must contain every prime dividing
    /// the discriminant of `curve` (it is used to enumerate the square
    /// divisors in the Nagell-Lutz theorem); primes 2 and 3 are added here.
    ///
    /// # Panics
    ///
    /// If `bad_primes` misses a prime of the discriminant (a broken
    /// precondition); [`TorsionGroup::compute_within`] reports it as an error
    /// of kind [`ErrorKind::InvalidValue`] instead.
    pub fn compute(curve: &Curve, bad_primes: &[Natural]) -> TorsionGroup {
        match Self::compute_within(curve, bad_primes, &Work::unlimited()) {
            Ok(t) => t,
            // unlimited work never runs out, so only the precondition can fail
            Err(e) => panic!("TorsionGroup::compute: {e}"),
        }
    }

    /// As [`TorsionGroup::compute`], within the deadline and cancellation
    /// flag of `work`, and with a typed error for bad input.
    ///
    /// Errors: [`ErrorKind::InvalidValue`] when `bad_primes` misses a prime of
    /// the discriminant; [`ErrorKind::Budget`] when the work ran out before
    /// every Nagell-Lutz candidate was tried (the message says what was
    /// known then: the bound on the order from the reductions and the
    /// torsion points found so far).
    ///
    /// ```
    /// use twofold::{Curve, Work, torsion::TorsionGroup};
    /// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap(); // Z/5 (published table, Cremona 1997)
    /// let t = TorsionGroup::compute_within(&e, &[11u32.into()], &Work::unlimited()).unwrap();
    /// assert_eq!(t.order(), 5);
    /// assert!(TorsionGroup::compute_within(&e, &[], &Work::unlimited()).is_err());
    /// ```
    pub fn compute_within(curve: &Curve, bad_primes: &[Natural], work: &Work) -> Result<TorsionGroup, Error> {
        let bound = order_bound(curve);
        let mut points = vec![Point::Infinity];
        if bound > 1 {
            let candidates = nagell_lutz_points(curve, bad_primes, work, bound)?;
            for p in candidates {
                if let Some(n) = curve.torsion_order_of(&p) {
                    if bound % n as u64 == 0 && !points.contains(&p) {
                        points.push(p);
                    }
                }
            }
        }
        let (invariants, generators) = structure(curve, &points);
        let orders = points.iter().map(|p| curve.torsion_order_of(p).unwrap_or(0)).collect();
        Ok(TorsionGroup { points, invariants, generators, orders })
    }

    /// The order of the group.
    pub fn order(&self) -> usize {
        self.points.len()
    }
    /// All torsion points, the identity first.
    pub fn points(&self) -> &[Point] {
        &self.points
    }
    /// The invariant factors `[n]` (cyclic) or `[2, 2m]`; empty for the trivial group.
    pub fn invariants(&self) -> Vec<u32> {
        self.invariants.clone()
    }
    /// Generators matching [`TorsionGroup::invariants`].
    pub fn generators(&self) -> &[Point] {
        &self.generators
    }
    /// The points of order 2 (zero, one or three of them).
    pub fn two_torsion(&self) -> Vec<Point> {
        self.points
            .iter()
            .zip(&self.orders)
            .filter(|(_, &o)| o == 2)
            .map(|(p, _)| p.clone())
            .collect()
    }
    /// The orders of the points, in the order of [`TorsionGroup::points`].
    pub fn orders(&self) -> &[u32] {
        &self.orders
    }
}

/// `gcd` of `#E(F_p)` over the first good primes `p >= 3`, which the torsion
/// order divides (AEC VII.3.1). Uses up to 30 primes.
pub(crate) fn order_bound(curve: &Curve) -> u64 {
    let mut g = 0u64;
    let mut used = 0;
    let disc = curve.discriminant();
    let mut p = 3u64;
    while used < 30 && p < 2000 {
        if is_prime_u64(p) && valuation(disc, &Natural::from(p)) == Some(0) {
            g = crate::arith::gcd_u64(g, curve.count_points_mod(p));
            used += 1;
            if g == 1 {
                break;
            }
        }
        p += 2;
    }
    g
}

/// Nagell-Lutz candidates tried before the torsion computation looks at the
/// `Work` (well under a millisecond of work; 1,024 took 200 ms of wall time
/// on a loaded machine, past a cancel flag set before the start).
const TORSION_UNCHECKED: usize = 128;

/// The points with Nagell-Lutz coordinates on the short model, mapped back
/// to `curve` (a superset of the torsion). `bound` is the order bound, for
/// the message of a cut-short run.
fn nagell_lutz_points(curve: &Curve, bad_primes: &[Natural], work: &Work, bound: u64) -> Result<Vec<Point>, Error> {
    let a = Integer::from(-27) * curve.c4();
    let b = Integer::from(-54) * curve.c6();
    let d = Integer::from(4) * &a * &a * &a + Integer::from(27) * &b * &b;
    // exponents of d at its primes
    let mut primes: Vec<Natural> = bad_primes.to_vec();
    for q in [2u32, 3] {
        if !primes.contains(&Natural::from(q)) {
            primes.push(Natural::from(q));
        }
    }
    let mut rest = d.clone().abs();
    let mut ys: Vec<Integer> = vec![Integer::ONE];
    for p in &primes {
        let v = valuation(&d, p).unwrap_or(0);
        let pi = Integer::from(p.clone());
        for _ in 0..v {
            rest /= &pi;
        }
        let mut next = Vec::new();
        for y in &ys {
            let mut f = y.clone();
            for _ in 0..=v / 2 {
                next.push(f.clone());
                f *= &pi;
            }
        }
        ys = next;
    }
    if rest != Integer::ONE {
        return Err(Error::new(ErrorKind::InvalidValue, "the torsion subgroup needs every prime dividing the discriminant"));
    }
    ys.push(Integer::ZERO);
    let [a1, _, a3, _, _] = curve.coefficients();
    let b2 = &curve.b_invariants()[0];
    let sieve = CubicSieve::new(&a, &b);
    let mut out: Vec<Point> = Vec::new();
    let total = ys.len();
    for (k, y) in ys.into_iter().enumerate() {
        // the first candidates run unchecked (a few milliseconds at most), so
        // that every ordinary curve gets its torsion even on a spent budget;
        // beyond them the work is looked at every 16 candidates
        if k >= TORSION_UNCHECKED && k % 16 == 0 && work.exhausted() {
            let known = out.iter().filter(|p| curve.torsion_order_of(p).is_some()).count() + 1;
            return Err(Error::new(
                ErrorKind::Budget,
                format!(
                    "torsion subgroup not finished: its order divides {bound}; {known} torsion points found after {k} of {total} Nagell-Lutz candidates"
                ),
            ));
        }
        if !sieve.may_have_root(&y) {
            continue;
        }
        let c = &b - &y * &y;
        for x in integer_roots_depressed_cubic(&a, &c) {
            for yy in if y == 0 { vec![y.clone()] } else { vec![y.clone(), -y.clone()] } {
                // back to the input model: X = 36x + 3 b2, Y = 108 (2y + a1 x + a3)
                let xq = Rational::from_integers(&x - Integer::from(3) * b2, Integer::from(36));
                let eta = Rational::from_integers(yy.clone(), Integer::from(108));
                let yq = (eta - Rational::from(a1.clone()) * &xq - Rational::from(a3.clone())) / Rational::from(2);
                let pt = Point::Affine(xq, yq);
                if curve.contains(&pt) {
                    out.push(pt);
                }
            }
        }
    }
    Ok(out)
}

/// Small primes for the residue sieve of the Nagell-Lutz candidates.
const SIEVE_PRIMES: [u32; 24] = [5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61, 67, 71, 73, 79, 83, 89, 97, 101];

/// A necessary condition for `X^3 + a X + b - y^2` to have an integer root:
/// an integer root reduces to a root modulo every prime `p`, so
/// `y^2 - b` must be among the values `X^3 + a X` modulo `p` (an exact
/// filter: it rejects only candidates without an integer root; with many
/// bad primes the candidates number tens of thousands and the exact root
/// search costs about half a millisecond each).
struct CubicSieve {
    /// per prime: `p`, `b mod p`, and a bit mask of the values `X^3 + a X mod p`
    rows: Vec<(u32, u32, u128)>,
}

impl CubicSieve {
    fn new(a: &Integer, b: &Integer) -> CubicSieve {
        let rows = SIEVE_PRIMES
            .iter()
            .filter_map(|&p| {
                let (am, bm) = (residue(a, p)? as u64, residue(b, p)?);
                let pp = p as u64;
                let mut mask = 0u128;
                for x in 0..pp {
                    mask |= 1u128 << ((x * x % pp * x + am * x) % pp);
                }
                Some((p, bm, mask))
            })
            .collect();
        CubicSieve { rows }
    }

    /// `false` only when `X^3 + a X + b - y^2` has no root modulo some sieve prime.
    fn may_have_root(&self, y: &Integer) -> bool {
        self.rows.iter().all(|&(p, bm, mask)| {
            let Some(yy) = residue(y, p) else { return true };
            let (yy, pp) = (yy as u64, p as u64);
            // X^3 + a X = y^2 - b (mod p)
            let want = (yy * yy % pp + pp - bm as u64) % pp;
            mask >> want & 1 == 1
        })
    }
}

/// `n mod p` in `0..p` (`None` cannot happen: the residue of a positive
/// modulus lies in `0..p`; the callers then let the candidate through).
fn residue(n: &Integer, p: u32) -> Option<u32> {
    use malachite::base::num::arithmetic::traits::Mod;
    let r = n.mod_op(Integer::from(p));
    u32::try_from(&r).ok()
}

fn cubic(x: &Integer, a: &Integer, c: &Integer) -> Integer {
    x * x * x + a * x + c
}

/// All integer roots of `x^3 + a x + c`, exactly (bisection on the monotone
/// pieces between the critical points).
pub(crate) fn integer_roots_depressed_cubic(a: &Integer, c: &Integer) -> Vec<Integer> {
    let bound = Integer::ONE + a.clone().abs() + c.clone().abs();
    let mut cuts = vec![-bound.clone()];
    if *a < 0 {
        // critical points at +-sqrt(-a/3); integer neighbours suffice as cut points
        let s = Integer::from(malachite::base::num::arithmetic::traits::FloorSqrt::floor_sqrt(
            // invariant: a < 0 in this branch, so -a/3 >= 0
            Natural::try_from(-a.clone() / Integer::from(3)).unwrap(),
        ));
        cuts.push(-(&s) - Integer::ONE);
        cuts.push(-(&s));
        cuts.push(s.clone());
        cuts.push(s + Integer::ONE);
    }
    cuts.push(bound);
    cuts.sort();
    cuts.dedup();
    let mut roots = Vec::new();
    for w in cuts.windows(2) {
        let (lo, hi) = (&w[0], &w[1]);
        for end in [lo, hi] {
            if cubic(end, a, c) == 0 && !roots.contains(end) {
                roots.push(end.clone());
            }
        }
        let (flo, fhi) = (cubic(lo, a, c).sign(), cubic(hi, a, c).sign());
        if flo == Ordering::Equal || fhi == Ordering::Equal || flo == fhi {
            continue;
        }
        // f is monotone on [lo, hi] except possibly within one unit of a cut
        let (mut l, mut h) = (lo.clone(), hi.clone());
        while &h - &l > 1 {
            let m: Integer = (&l + &h) >> 1u32;
            let fm = cubic(&m, a, c).sign();
            if fm == Ordering::Equal {
                l = m.clone();
                h = m;
                break;
            }
            if fm == flo { l = m } else { h = m }
        }
        for cand in [l, h] {
            if cubic(&cand, a, c) == 0 && !roots.contains(&cand) {
                roots.push(cand);
            }
        }
    }
    roots.sort();
    roots
}

fn structure(curve: &Curve, points: &[Point]) -> (Vec<u32>, Vec<Point>) {
    let n = points.len() as u32;
    if n == 1 {
        return (vec![], vec![]);
    }
    let order = |p: &Point| curve.torsion_order_of(p).unwrap_or(0);
    let twos: Vec<&Point> = points.iter().filter(|p| order(p) == 2).collect();
    // invariant: points holds at least the identity (checked non-empty above)
    let best = points.iter().max_by_key(|p| order(p)).unwrap().clone();
    if twos.len() == 3 {
        let m = order(&best);
        // a 2-torsion point outside <best>
        let span: Vec<Point> = (0..m as i64).map(|k| curve.multiple(&best, k)).collect();
        // invariant: with three points of order 2 the cyclic <best> holds only one of them
        let other = twos.iter().find(|t| !span.contains(t)).map(|t| (*t).clone()).unwrap();
        (vec![2, m], vec![other, best])
    } else {
        (vec![n], vec![best])
    }
}
