//! Local heights and the canonical height (Silverman, *Computing heights on
//! elliptic curves*, Math. Comp. 51 (1988)).
//!
//! Normalisation. We write `lambda_v` for the local heights *without* the
//! `log|Delta|_v / 6` term, scaled so that `hhat = sum_v lambda_v` satisfies
//! `hhat(P) - log max(|num x(P)|, den x(P)) = O(1)`; this is twice the
//! height of Silverman's 1988 paper and the normalisation in which the
//! regulator enters the Birch and Swinnerton-Dyer formula.
//!
//! * Archimedean: the unique continuous `lambda` on `E(R) - O` with
//!   `lambda(2P) = 4 lambda(P) - log|F(x(P))|`, `F = 4x^3 + b2 x^2 + 2 b4 x + b6`,
//!   and `lambda(P) - log|x(P)| -> 0` at `O`. It does not change under
//!   `x -> x + r` (with `u = 1`), so at each doubling step we may use either
//!   `1/x` or `1/(x + 1)` as the local parameter, whichever keeps it bounded
//!   by 2 (Silverman's device). The resulting series converges like `4^-n`.
//! * Non-archimedean, on a model minimal at `p`: `max(0, -v_p(x)) log p` on
//!   `E_0(Q_p)`, and on the other components the exact corrections of
//!   Silverman's Theorem 5.2 (rational multiples of `log p` computed from
//!   `v_p` of `psi_2`, `psi_3` and the discriminant), cross-checked against
//!   the Kodaira symbol from [`crate::local`].

use super::real::{fi, fq, fz, ln, ln_q, sqrt};
use crate::arith::valuation;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::local::{CurveData, Kodaira, LocalData};
use malachite::base::num::arithmetic::traits::Abs;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Float, Integer, Natural, Rational};

fn q(n: &Integer) -> Rational {
    Rational::from(n.clone())
}

/// `v_p` of a non-zero rational; `None` for zero.
pub(crate) fn val_q(x: &Rational, p: &Natural) -> Option<i64> {
    if *x == 0u32 {
        return None;
    }
    let n = valuation(&Integer::from(x.numerator_ref().clone()), p)? as i64;
    let d = valuation(&Integer::from(x.denominator_ref().clone()), p)? as i64;
    Some(n - d)
}

/// Checks that `local` describes `curve` as a globally minimal model (see
/// [`crate::local::check_minimal`]).
pub(crate) use crate::local::check_minimal;

/// The non-archimedean local height at `d.prime` as an exact rational
/// multiple of `log p`: returns `c` with `lambda_p(P) = c log p`.
/// The model must be minimal at p.
pub(crate) fn nonarch_coefficient(curve: &Curve, d: &LocalData, x: &Rational, y: &Rational) -> Result<Rational, Error> {
    let p = &d.prime;
    let vx = val_q(x, p).unwrap_or(0);
    if vx < 0 {
        return Ok(Rational::from(-vx));
    }
    let [a1, a2, _a3, a4, _] = curve.coefficients();
    let [b2, b4, b6, b8] = curve.b_invariants();
    let a3 = &curve.coefficients()[2];
    let dfdx = Rational::from(3) * x * x + Rational::from(2) * q(a2) * x + q(a4) - q(a1) * y;
    let psi2 = Rational::from(2) * y + q(a1) * x + q(a3);
    let va = val_q(&dfdx, p).unwrap_or(i64::MAX);
    let vb = val_q(&psi2, p).unwrap_or(i64::MAX);
    if va <= 0 || vb <= 0 {
        return Ok(Rational::ZERO);
    }
    let bad = |why: &str| {
        Error::new(
            ErrorKind::InvalidValue,
            format!("local height at {p}: {why} (Kodaira {}, point ({x}, {y}))", d.kodaira),
        )
    };
    let alpha: Rational = match d.kodaira {
        Kodaira::In(n) => {
            let nn = i64::from(n);
            if valuation(curve.discriminant(), p).unwrap_or(0) != n {
                return Err(bad("discriminant valuation differs from the Kodaira symbol"));
            }
            // M = min(v(psi2), N/2); alpha = M (N - M) / N.
            let m = if 2 * vb >= nn { Rational::from_signeds(nn, 2) } else { Rational::from(vb) };
            &m * (Rational::from(nn) - &m) / Rational::from(nn)
        }
        Kodaira::I0 | Kodaira::II | Kodaira::IIStar => {
            return Err(bad("singular reduction on a type with one component"));
        }
        _ => {
            let psi3 = Rational::from(3) * x * x * x * x + q(b2) * x * x * x + Rational::from(3) * q(b4) * x * x
                + Rational::from(3) * q(b6) * x
                + q(b8);
            let vc = val_q(&psi3, p).unwrap_or(i64::MAX);
            if vb == i64::MAX && vc == i64::MAX {
                return Err(bad("psi2 and psi3 both vanish"));
            }
            if vc >= 3 * vb {
                Rational::from_signeds(2 * vb, 3)
            } else {
                Rational::from_signeds(vc, 4)
            }
        }
    };
    // Cross-check with the Kodaira symbol: the possible corrections
    // (Silverman 1988, Table/Theorem 5.2; Cremona-Prickett-Siksek 2006).
    let ok = match d.kodaira {
        Kodaira::In(_) => alpha > 0u32,
        Kodaira::III => alpha == Rational::from_signeds(1, 2),
        Kodaira::IV => alpha == Rational::from_signeds(2, 3),
        Kodaira::I0Star => alpha == 1u32,
        Kodaira::InStar(n) => alpha == 1u32 || alpha == Rational::from_signeds(i64::from(n) + 4, 4),
        Kodaira::IVStar => alpha == Rational::from_signeds(4, 3),
        Kodaira::IIIStar => alpha == Rational::from_signeds(3, 2),
        _ => false,
    };
    if !ok {
        return Err(bad(&format!("correction {alpha} not allowed for this Kodaira symbol")));
    }
    Ok(-alpha)
}

/// The archimedean local height of the affine point with x-coordinate `x`
/// (normalisation of the module documentation), to about `prec` bits.
pub(crate) fn archimedean(curve: &Curve, x: &Rational, prec: u64) -> Result<Float, Error> {
    let [b2, b4, b6, b8] = curve.b_invariants();
    let hb = [b2, b4, b6, b8].iter().map(|b| b.significant_bits()).max().unwrap_or(1) + 3;
    // Terms: the tail after n steps is at most 4^-n times a bound of size
    // O(log H); take prec/2 + log2(hb) + 8 terms.
    let terms = prec / 2 + 64 - u64::from(hb.leading_zeros()) + 8;
    let wp = prec + terms + 2 * hb + 64;
    let (b2, b4, b6, b8) = (fz(b2, wp), fz(b4, wp), fz(b6, wp), fz(b8, wp));
    let two = fi(2, wp);
    let four = fi(4, wp);
    let one = fi(1, wp);
    let half = Float::from(0.5f64);
    let f_of = |x: &Float| -> Float { ((&four * x + &b2) * x + &two * &b4) * x + &b6 };
    let num_of = |x: &Float| -> Float { ((x * x - &b4) * x - &two * &b6) * x - &b8 };
    let mut xn = fq(x, wp);
    let shift = |x: &Float| -> bool { x.clone().abs() < half };
    let mut s = shift(&xn);
    let xs0 = if s { &xn + &one } else { xn.clone() };
    // lambda = log|xs0| + sum_n 4^-(n+1) log a_n with bounded a_n > 0.
    // Nested fourth roots v_n = a_n v_{n+1}^(1/4) turn the sum into one
    // logarithm: lambda = log(|xs0| v_0^(1/4)).
    let mut ratios: Vec<Float> = Vec::with_capacity(terms as usize);
    for _ in 0..terms {
        let f = f_of(&xn);
        if f == 0u32 {
            return Err(Error::new(ErrorKind::InvalidValue, "archimedean height: a 2-torsion point in the orbit"));
        }
        let num = num_of(&xn);
        let xnext = &num / &f;
        let snext = shift(&xnext);
        let top = if snext { &num + &f } else { num };
        let xs = if s { &xn + &one } else { xn.clone() };
        // |top / xs^4|: a bounded ratio since |xs| >= 1/2.
        let xs2 = &xs * &xs;
        ratios.push((top / (&xs2 * &xs2)).abs());
        xn = xnext;
        s = snext;
    }
    let mut v = fi(1, wp);
    for a in ratios.iter().rev() {
        v = a * sqrt(&sqrt(&v, wp), wp);
    }
    let total = ln(&(xs0.abs() * sqrt(&sqrt(&v, wp), wp)), wp);
    if !total.is_finite() {
        return Err(Error::new(ErrorKind::InvalidValue, "archimedean height did not converge"));
    }
    Ok(total)
}

/// The canonical height of `point` on the globally minimal model `curve`,
/// whose bad primes are described by `local` (from
/// [`crate::local::bad_primes_data`]), to about `prec` bits (numerical:
/// the archimedean part is a convergent series evaluated in floating point;
/// the non-archimedean part is an exact rational combination of logarithms).
/// Torsion points (detected exactly) get height exactly 0.
///
/// Normalisation: `hhat(P) = lim h(x(nP)) / n^2` with
/// `h(a/b) = log max(|a|, |b|)`, so that (0, 0) on `y^2 + y = x^3 - x`
/// has height 0.0511114082... (the normalisation of the Birch and
/// Swinnerton-Dyer formula).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::canonical_height;
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let local = bad_primes_data(&e, &[Natural::from(37u32)]).unwrap();
/// let h = canonical_height(&e, &local, &Point::from_ints(0, 0), 64).unwrap();
/// // 0.0511114082... for the generator of y^2 + y = x^3 - x (from memory)
/// assert!((twofold::heights::float_to_f64(&h) - 0.0511114082).abs() < 1e-9);
/// ```
pub fn canonical_height(curve: &Curve, local: &[LocalData], point: &Point, prec: u64) -> Result<Float, Error> {
    check_minimal(curve, local)?;
    height_unchecked(curve, local, point, prec)
}

/// [`canonical_height`] of a point on the global minimal model
/// [`CurveData::minimal`] (minimal by construction: nothing is checked
/// again at run time).
///
/// ```
/// use twofold::{Curve, CurveData, Point, Work};
/// use twofold::heights::{canonical_height_of, float_to_f64};
/// // the generator (0,0) of y^2 + y = x^3 - x: 0.0511114082... (from memory)
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let h = canonical_height_of(&d, &Point::from_ints(0, 0), 64).unwrap();
/// assert!((float_to_f64(&h) - 0.0511114082).abs() < 1e-9);
/// ```
pub fn canonical_height_of(data: &CurveData, point: &Point, prec: u64) -> Result<Float, Error> {
    height_unchecked(data.minimal(), data.local(), point, prec)
}

pub(crate) fn height_unchecked(curve: &Curve, local: &[LocalData], point: &Point, prec: u64) -> Result<Float, Error> {
    Ok(local_parts(curve, local, point, prec)?.total(prec))
}

/// The decomposition of a canonical height into local heights (see the
/// module documentation for the normalisation).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::{local_heights, float_to_f64};
/// // y^2 + y = x^3 - x: (0,0) is integral with good reduction everywhere but 37, where it
/// // lies on E_0 (type I1), so all of its height is archimedean.
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let local = bad_primes_data(&e, &[Natural::from(37u32)]).unwrap();
/// let l = local_heights(&e, &local, &Point::from_ints(0, 0), 64).unwrap();
/// assert!(l.bad_primes.iter().all(|(_, c)| *c == 0u32));
/// assert_eq!(l.good_denominator, 1u32);
/// assert!((float_to_f64(&l.archimedean) - 0.0511114082).abs() < 1e-9);
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct LocalHeights {
    /// The archimedean local height (numerical).
    pub archimedean: Float,
    /// For each bad prime p of the local data, the exact rational `c` with
    /// `lambda_p = c log p`.
    pub bad_primes: Vec<(Natural, Rational)>,
    /// The part of the denominator of x(P) prime to the bad primes: the good
    /// primes contribute `log good_denominator` in total.
    pub good_denominator: Natural,
}

impl LocalHeights {
    /// The canonical height: the sum of the local heights.
    pub fn total(&self, prec: u64) -> Float {
        let wp = prec + 16;
        let mut h = self.archimedean.clone();
        for (p, c) in &self.bad_primes {
            if *c != 0u32 {
                h += fq(c, wp) * ln_q(&Rational::from(p.clone()), wp);
            }
        }
        if self.good_denominator != Natural::ONE {
            h += ln_q(&Rational::from(self.good_denominator.clone()), wp);
        }
        h
    }
}

/// The local heights of a non-torsion point (torsion points and O give
/// all-zero parts) on the globally minimal model `curve`; see
/// [`canonical_height`] for the conditions and [`LocalHeights`].
pub fn local_heights(curve: &Curve, local: &[LocalData], point: &Point, prec: u64) -> Result<LocalHeights, Error> {
    check_minimal(curve, local)?;
    local_parts(curve, local, point, prec)
}

fn local_parts(curve: &Curve, local: &[LocalData], point: &Point, prec: u64) -> Result<LocalHeights, Error> {
    let zero = || LocalHeights { archimedean: Float::ZERO, bad_primes: Vec::new(), good_denominator: Natural::ONE };
    if !curve.contains(point) {
        return Err(Error::new(ErrorKind::InvalidValue, format!("the point {point} is not on the curve")));
    }
    let (x, y) = match point {
        Point::Infinity => return Ok(zero()),
        Point::Affine(x, y) => (x, y),
    };
    // On an integral model a torsion point has 4x integral (Silverman, AEC
    // VIII.7.1 and its exercise for general Weierstrass equations), so the
    // exact order search is needed only when the denominator divides 4.
    let d = x.denominator_ref();
    if (*d == 1u32 || *d == 2u32 || *d == 4u32) && curve.torsion_order_of(point).is_some() {
        return Ok(zero());
    }
    let wp = prec + 16;
    let archimedean = archimedean(curve, x, wp)?;
    let mut den = x.denominator_ref().clone();
    let mut bad_primes = Vec::with_capacity(local.len());
    for d in local {
        let c = nonarch_coefficient(curve, d, x, y)?;
        while den != 0u32 && (&den % &d.prime) == 0u32 {
            den /= &d.prime;
        }
        bad_primes.push((d.prime.clone(), c));
    }
    Ok(LocalHeights { archimedean, bad_primes, good_denominator: den })
}

/// The canonical height of a point on any integral model: moves the point
/// to a globally minimal model (found at the given primes, which must
/// include every prime dividing the discriminant of `curve`) and calls
/// [`canonical_height`]. Canonical heights do not depend on the model.
///
/// ```
/// use malachite::{Natural, Rational};
/// use twofold::{Curve, ModelChange, Point};
/// use twofold::heights::{canonical_height_on_model, float_to_f64};
/// // y^2 + y = x^3 - x scaled by u = 1/2: x = x'/4, y = y'/8 (a non-minimal model).
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let c = ModelChange::new(Rational::from_signeds(1, 2), Rational::from(0), Rational::from(0), Rational::from(0)).unwrap();
/// let big = e.apply_change(&c).unwrap();
/// let (x, y) = c.map_point(&(Rational::from(0), Rational::from(0))).unwrap();
/// let primes = [2u32, 37].map(Natural::from);
/// let h = canonical_height_on_model(&big, &primes, &Point::Affine(x, y), 64).unwrap();
/// assert!((float_to_f64(&h) - 0.0511114082).abs() < 1e-9);
/// ```
pub fn canonical_height_on_model(curve: &Curve, primes: &[Natural], point: &Point, prec: u64) -> Result<Float, Error> {
    let data = CurveData::with_known_primes(curve, primes)?;
    canonical_height_of(&data, &data.to_minimal(point)?, prec)
}

/// The naive (logarithmic) height `log max(|a|, b)` of `x = a/b`.
pub fn naive_height(x: &Rational, prec: u64) -> Float {
    let a = Rational::from(x.numerator_ref().clone());
    let b = Rational::from(x.denominator_ref().clone());
    let m = if a > b { a } else { b };
    if m == 0u32 {
        return Float::ZERO;
    }
    ln_q(&m, prec)
}
