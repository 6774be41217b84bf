//! Proven values at `s = 1` of the L-function of an elliptic curve over Q,
//! and a proven global root number, in interval arithmetic.
//!
//! # What the results rest on
//!
//! * **Modularity**: `L(E, s)` is the L-function of a weight-2 newform of
//!   level `N`, the conductor (A. Wiles, "Modular elliptic curves and
//!   Fermat's Last Theorem", Ann. of Math. 141, 1995; R. Taylor and
//!   A. Wiles, same volume, 1995; C. Breuil, B. Conrad, F. Diamond and
//!   R. Taylor, "On the modularity of elliptic curves over Q", J. AMS 14,
//!   2001). Hence `Λ(s) = N^{s/2} (2π)^{-s} Γ(s) L(E, s)` continues to C and
//!   `Λ(s) = w Λ(2 - s)` with `w = ±1`.
//! * **The exact coefficients**: `a_p` at good primes is counted exactly
//!   (by the character sum of [`crate::curve::PointCounter`] below a
//!   threshold, by Mestre's baby-step giant-step above it, which proves its
//!   answer by Lagrange's and Hasse's theorems, see `trace.rs`), `a_p` at
//!   bad primes is `±1` or `0` from the reduction type, and the `a_n` follow
//!   by the Hecke recursion and multiplicativity. The conductor passed in is
//!   checked against Tate's algorithm prime by prime.
//! * **The series** (J. E. Cremona, *Algorithms for Modular Elliptic
//!   Curves*, 2nd ed., 1997, §2.13): with `c = 2π/sqrt(N)`,
//!   if `w = +1`, `L(E, 1) = 2 Σ_{n≥1} (a_n/n) e^{-cn}`;
//!   if `w = -1`, `L(E, 1) = 0` and `L'(E, 1) = 2 Σ_{n≥1} (a_n/n) E_1(cn)`.
//!   The sign `w` itself from the functional equation of the theta series
//!   `F(y) = Σ a_n e^{-c n y}`: `F(1/t) = w t^2 F(t)` for every `t > 0`
//!   (Mellin inversion of the functional equation; Cremona §2.11).
//! * **The tail**: `|a_n| <= d(n) sqrt(n) <= 2n` (Hasse's bound at primes,
//!   the Hecke recursion, and the divisor pairing `d(n) <= 2 sqrt(n)`), so
//!   after `M` terms the series for `L(E, 1)` changes by at most
//!   `4 e^{-c(M+1)} / (1 - e^{-c})`, the one for `L'(E, 1)` by at most
//!   `4 e^{-c(M+1)} / (c (M+1) (1 - e^{-c}))` (from `E_1(x) <= e^{-x}/x`,
//!   Abramowitz and Stegun 5.1.19), and `F(y)` by at most
//!   `2 (M+1) x^{M+1} / (1-x)^2` with `x = e^{-cy}`.
//! * **Interval arithmetic** ([`crate::enclosure`]): every term, weight and
//!   bound is enclosed with outward rounding; `exp`, `E_1`, `π` are our own
//!   enclosures with proven remainders.
//!
//! An enclosure that excludes 0 is a proof that the value is non-zero. With
//! `w = +1` and `L(E, 1) != 0` the rank is 0; with `w = -1` and
//! `L'(E, 1) != 0` the rank is 1; in both cases Sha is finite (B. Gross and
//! D. Zagier, "Heegner points and derivatives of L-series", Invent. Math.
//! 84, 1986; V. Kolyvagin, 1988 and 1990; with modularity as above, and a
//! non-vanishing of an auxiliary quadratic twist proven by Bump–Friedberg–
//! Hoffstein and Murty–Murty, 1990).

mod stream;
mod trace;

pub(crate) use trace::TraceOracle;

use crate::arith::FactorLimits;
use crate::curve::Curve;
use crate::enclosure::{pi, Interval, ScaledE1Taylor};
use crate::error::{Error, ErrorKind};
use malachite::Natural;
use std::sync::atomic::Ordering;
use std::time::Instant;
use stream::{CoefficientSource, Stop};

/// The largest conductor accepted by the proven routines (the coefficient
/// table holds `a_p` for `p` up to about `6.5 sqrt(N)`). Measured for the
/// root-number test on wild curves y^2 = x^3 + 2x + k (tests/lproof_reach.rs,
/// one run each on a machine at load average 7-8): conductor 1.0e13 in 85 s
/// with 3.4e7 coefficients and 36 MB peak memory, 1.0e14 in 316 s with
/// 1.1e8 coefficients and 111 MB (the `a_p` table takes one byte per
/// coefficient); at 1.0e15 the 3.7e8 coefficients needed exceed the
/// table's limit of 2.6e8 and the test is refused.
///
/// ```
/// assert_eq!(twofold::lproof::PROOF_MAX_CONDUCTOR, 100_000_000_000_000);
/// ```
pub const PROOF_MAX_CONDUCTOR: u64 = 100_000_000_000_000;

/// The truncation error aimed at when choosing the number of terms (the
/// bound actually used is recomputed rigorously for the terms summed).
///
/// ```
/// assert!(twofold::lproof::TAIL_GOAL <= 1e-12);
/// ```
pub const TAIL_GOAL: f64 = 1e-12;

/// A proven enclosure of `L(E, 1)` (order 0) or `L'(E, 1)` (order 1).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_l_value};
/// // y^2 + y = x^3 - x^2 - 10x - 20, conductor 11, root number +1:
/// // L(E, 1) = 0.2538418608559106 (from memory)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let v = prove_l_value(&e, &Natural::from(11u32), 1, &FactorLimits::default()).unwrap();
/// assert_eq!(v.order, 0);
/// assert!(v.low <= 0.2538418608559106 && 0.2538418608559106 <= v.high);
/// assert!(v.nonzero_proven() && v.complete && v.high - v.low < 1e-11);
/// ```
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct ProvenLValue {
    /// 0 for `L(E, 1)` (root number `+1`), 1 for `L'(E, 1)` (root number `-1`).
    pub order: u8,
    /// A lower bound for the value.
    pub low: f64,
    /// An upper bound for the value.
    pub high: f64,
    /// The number of terms `M` of the series summed.
    pub terms: u64,
    /// The proven bound on the omitted terms `n > M` (included in
    /// `[low, high]`).
    pub tail_bound: f64,
    /// `false` when the budget ended the sum early: the enclosure is still
    /// proven (its tail bound starts where the sum stopped), only wider.
    pub complete: bool,
}

impl ProvenLValue {
    /// Whether the enclosure excludes 0, i.e. the value is proven non-zero.
    pub fn nonzero_proven(&self) -> bool {
        self.low > 0.0 || self.high < 0.0
    }

    /// `[low, high]` as decimal strings that enclose `[low, high]` (each the
    /// shortest decimal of the neighbouring `f64` outwards, so the decimal
    /// interval contains the binary one).
    ///
    /// ```ignore
    /// // (an illustration only: values of this non-exhaustive struct come
    /// // from the library's proven L-value routines)
    /// use twofold::lproof::ProvenLValue;
    /// let v = ProvenLValue { order: 0, low: 0.25, high: 0.5, terms: 1, tail_bound: 0.0, complete: true };
    /// let (l, h) = v.decimal_bounds();
    /// assert!(l.parse::<f64>().unwrap() < 0.25 && h.parse::<f64>().unwrap() > 0.5);
    /// ```
    pub fn decimal_bounds(&self) -> (String, String) {
        (format!("{}", self.low.next_down()), format!("{}", self.high.next_up()))
    }

    /// The enclosure as an [`Interval`].
    pub fn interval(&self) -> Interval {
        Interval::new(self.low, self.high)
    }
}

/// The outcome of the functional-equation test for the root number.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_root_number};
/// // y^2 + y = x^3 - x, conductor 37: w = -1 (rank 1)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let r = prove_root_number(&e, &Natural::from(37u32), &FactorLimits::default()).unwrap();
/// assert_eq!(r.sign, Some(-1));
/// assert!(r.same_sign_gap.contains(0.0) && r.other_sign_gap.excludes_zero());
/// ```
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct RootNumberProof {
    /// The proven global root number, or `None` when the budget ended first
    /// or the accuracy reached did not separate the signs.
    pub sign: Option<i8>,
    /// The `t > 1` (an exact binary fraction) of the last test.
    pub t: f64,
    /// An enclosure of `F(1/t) - sign·t^2 F(t)` (contains 0); for `sign =
    /// None`, of `F(1/t) - t^2 F(t)`.
    pub same_sign_gap: Interval,
    /// An enclosure of `F(1/t) + sign·t^2 F(t)`, which excludes 0 when the
    /// sign is proven (so `-sign` is impossible).
    pub other_sign_gap: Interval,
    /// The number of coefficients summed.
    pub terms: u64,
    /// `false` when the budget ended the test.
    pub complete: bool,
}

/// The analytic route to the rank: the proven root number and the proven
/// leading value of the right parity.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_analytic_rank};
/// // y^2 + y = x^3 - x (conductor 37): rank 1 by Gross-Zagier-Kolyvagin
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let a = prove_analytic_rank(&e, &Natural::from(37u32), &FactorLimits::default()).unwrap();
/// assert_eq!(a.rank, Some(1));
/// let v = a.value.unwrap();
/// assert!(v.low <= 0.3059997738340523 && 0.3059997738340523 <= v.high); // L'(E,1) (from memory)
/// ```
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct AnalyticRankProof {
    /// The root number test.
    pub root_number: RootNumberProof,
    /// `L(E, 1)` if the root number is `+1`, `L'(E, 1)` if `-1` (`None`
    /// when the root number was not proven or the budget ended before).
    pub value: Option<ProvenLValue>,
    /// The rank, proven (0 or 1) when the value is proven non-zero;
    /// `None` otherwise (analytic rank 2 or more, or not decided).
    pub rank: Option<u8>,
}

fn bad(kind: ErrorKind, msg: impl Into<String>) -> Error {
    Error::new(kind, msg)
}

fn stopper(limits: &FactorLimits) -> impl Fn() -> bool + '_ {
    move || {
        limits.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed))
            || limits.deadline.is_some_and(|d| Instant::now() >= d)
    }
}

/// The conductor as a word after the checks, and the source of coefficients.
fn setup(minimal: &Curve, conductor: &Natural) -> Result<(u64, CoefficientSource), Error> {
    let n = u64::try_from(conductor)
        .ok()
        .filter(|&n| n <= PROOF_MAX_CONDUCTOR)
        .ok_or_else(|| bad(ErrorKind::TooLarge, format!("conductor {conductor} above the limit {PROOF_MAX_CONDUCTOR}")))?;
    if n == 0 {
        return Err(bad(ErrorKind::InvalidValue, "the conductor is positive"));
    }
    let bad_ap = crate::lseries::bad_primes(minimal, n)?;
    Ok((n, CoefficientSource::new(minimal, bad_ap)))
}

/// `2π / sqrt(N)` enclosed.
fn step(n: u64) -> Interval {
    Interval::point(2.0) * pi() / Interval::from_i64(n as i64).sqrt()
}

/// `e^{-c n}` for consecutive `n`, refreshed from `exp` every
/// [`REFRESH`] steps so that the relative width stays near `REFRESH` ulps.
const REFRESH: usize = 256;

fn weight_at(c: Interval, n: u64) -> Interval {
    (-(c * Interval::point(n as f64))).exp()
}

/// The least `M` (by an `f64` search) with `bound(M) <= TAIL_GOAL`.
fn terms_for(bound: &dyn Fn(u64) -> f64, goal: f64) -> u64 {
    let (mut lo, mut hi) = (1u64, 2u64);
    while bound(hi) > goal {
        lo = hi;
        hi *= 2;
        if hi > 1 << 40 {
            return hi;
        }
    }
    while hi - lo > 1 {
        let mid = (lo + hi) / 2;
        if bound(mid) > goal {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    hi
}

/// Proven tail bounds after `m` terms (upper ends of intervals).
fn tail_value(c: Interval, m: u64, order: u8) -> f64 {
    let m1 = Interval::point((m + 1) as f64);
    let e = weight_at(c, m + 1);
    let one_minus = Interval::point(1.0) - (-c).exp();
    let four = Interval::point(4.0);
    let t = if order == 0 { four * e / one_minus } else { four * e / (c * m1 * one_minus) };
    t.hi()
}

fn theta_tail(c: Interval, m: u64) -> f64 {
    let m1 = Interval::point((m + 1) as f64);
    let x_m1 = weight_at(c, m + 1);
    let one_minus = Interval::point(1.0) - (-c).exp();
    (Interval::point(2.0) * m1 * x_m1 / (one_minus * one_minus)).hi()
}

fn l_terms(c: f64, order: u8) -> u64 {
    let one_minus = -(-c).exp_m1();
    terms_for(&|m| {
        let x = (m + 1) as f64 * c;
        let base = 4.0 * (-x).exp() / one_minus;
        if order == 0 {
            base
        } else {
            base / x
        }
    }, TAIL_GOAL)
}

fn theta_terms(c: f64, goal: f64) -> u64 {
    let one_minus = -(-c).exp_m1();
    terms_for(&|m| 2.0 * (m + 1) as f64 * (-((m + 1) as f64) * c).exp() / (one_minus * one_minus), goal)
}

/// Sums `2 Σ a_n/n G(cn)` with `G = exp(-x)` (order 0) or `E_1` (order 1).
fn l_value_from(src: &mut CoefficientSource, n: u64, order: u8, limits: &FactorLimits) -> Result<ProvenLValue, Error> {
    let c = step(n);
    let m = l_terms(c.mid(), order);
    if m > stream::MAX_TERMS {
        return Err(bad(ErrorKind::TooLarge, format!("{m} terms needed, above the table limit")));
    }
    let q = (-c).exp();
    let mut total = Interval::point(0.0);
    let stop = stopper(limits);
    let mut sink = |lo: u64, a: &[i64]| {
        let mut i = 0usize;
        while i < a.len() {
            let end = (i + REFRESH).min(a.len());
            let mut block = Interval::point(0.0);
            if order == 0 {
                let mut w = weight_at(c, lo + i as u64);
                for (j, &an) in a.iter().enumerate().take(end).skip(i) {
                    if an != 0 {
                        let k = Interval::point((lo + j as u64) as f64);
                        block = block + Interval::from_i64(an) * w / k;
                    }
                    w = w * q;
                }
            } else {
                let n0 = lo + i as u64;
                let x0 = c * Interval::point(n0 as f64);
                let span = (end - i - 1) as f64;
                let taylor = if x0.lo() >= 2.0 { ScaledE1Taylor::new(x0, (c * Interval::point(span)).hi()) } else { None };
                match taylor {
                    Some(t) => {
                        // E_1(x_n) = e^{-x_n} C(x_n), e^{-x_n} by the ratio q
                        let mut w = weight_at(c, n0);
                        for (j, &an) in a.iter().enumerate().take(end).skip(i) {
                            if an != 0 {
                                let kf = (lo + j as u64) as f64;
                                let delta = c * Interval::point((j - i) as f64);
                                let g = w * t.eval(delta);
                                block = block + Interval::from_i64(an) * g / Interval::point(kf);
                            }
                            w = w * q;
                        }
                    }
                    None => {
                        for (j, &an) in a.iter().enumerate().take(end).skip(i) {
                            if an != 0 {
                                let kf = (lo + j as u64) as f64;
                                let x = c * Interval::point(kf);
                                let g = x.exp_integral_e1_narrow();
                                block = block + Interval::from_i64(an) * g / Interval::point(kf);
                            }
                        }
                    }
                }
            }
            total = total + block;
            i = end;
        }
    };
    let (reached, complete) = match src.run(m, &stop, &mut sink) {
        Ok(r) => (r, true),
        Err((Stop::Budget, r)) => (r, false),
    };
    let tail = tail_value(c, reached, order);
    let v = Interval::point(2.0) * (total + Interval::symmetric(tail / 2.0));
    Ok(ProvenLValue { order, low: v.lo(), high: v.hi(), terms: reached, tail_bound: tail, complete })
}

/// A proven enclosure of `L(E, 1)` (when `root_number = 1`) or `L'(E, 1)`
/// (when `root_number = -1`) for a global minimal model `minimal` with its
/// conductor; see the module documentation for what it rests on. The root
/// number must be proven (by [`prove_root_number`] or the local formulas of
/// [`crate::rootno`]); a wrong one gives an enclosure of a series that is
/// not the L-value.
///
/// Cost: `M ≈ 41 sqrt(N) / 2π` terms (one sieve pass plus `a_p` for every
/// prime up to `M`, by baby-step giant-step above a threshold); order 1
/// adds one `E_1` per term. The budget (`limits`) is checked between
/// segments of `2^15` terms; when it ends, the enclosure so far is
/// returned with `complete = false`.
///
/// Errors: [`ErrorKind::InvalidValue`] for a root number other than `±1`,
/// a conductor that does not match the curve or a model that is not
/// minimal; [`ErrorKind::TooLarge`] above [`PROOF_MAX_CONDUCTOR`].
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_l_value};
/// // y^2 + y = x^3 - x (conductor 37, root number -1): L'(E, 1) = 0.3059997738340523 (from memory)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let v = prove_l_value(&e, &Natural::from(37u32), -1, &FactorLimits::default()).unwrap();
/// assert!(v.order == 1 && v.low <= 0.3059997738340523 && 0.3059997738340523 <= v.high);
/// assert!(prove_l_value(&e, &Natural::from(38u32), -1, &FactorLimits::default()).is_err());
/// ```
pub fn prove_l_value(minimal: &Curve, conductor: &Natural, root_number: i8, limits: &FactorLimits) -> Result<ProvenLValue, Error> {
    let order = match root_number {
        1 => 0,
        -1 => 1,
        _ => return Err(bad(ErrorKind::InvalidValue, format!("a root number is 1 or -1, not {root_number}"))),
    };
    let (n, mut src) = setup(minimal, conductor)?;
    l_value_from(&mut src, n, order, limits)
}

/// The values of `t` tried in turn (exact binary fractions) with the tail
/// aimed at: a loose tail first (the wrong sign is off by `2|F(1/t)|`,
/// rarely tiny), a tight one if that does not separate the signs.
const TS: [(f64, f64); 6] = [(1.0625, 1e-8), (1.125, 1e-8), (1.25, 1e-8), (1.125, 1e-13), (1.375, 1e-13), (1.5, 1e-13)];

fn root_number_from(src: &mut CoefficientSource, n: u64, limits: &FactorLimits) -> Result<RootNumberProof, Error> {
    let c = step(n);
    let stop = stopper(limits);
    let mut last = None;
    for (t, goal) in TS {
        let ti = Interval::point(t);
        let c_small = c / ti; // F(1/t)
        let c_large = c * ti; // F(t)
        let m = theta_terms(c_small.mid(), goal);
        if m > stream::MAX_TERMS {
            return Err(bad(ErrorKind::TooLarge, format!("{m} terms needed, above the table limit")));
        }
        let (qs, ql) = ((-c_small).exp(), (-c_large).exp());
        let (mut fs, mut fl) = (Interval::point(0.0), Interval::point(0.0));
        let mut sink = |lo: u64, a: &[i64]| {
            let mut i = 0usize;
            while i < a.len() {
                let end = (i + REFRESH).min(a.len());
                let mut ws = weight_at(c_small, lo + i as u64);
                let mut wl = weight_at(c_large, lo + i as u64);
                let (mut bs, mut bl) = (Interval::point(0.0), Interval::point(0.0));
                for &an in &a[i..end] {
                    if an != 0 {
                        let ai = Interval::from_i64(an);
                        bs = bs + ai * ws;
                        bl = bl + ai * wl;
                    }
                    ws = ws * qs;
                    wl = wl * ql;
                }
                fs = fs + bs;
                fl = fl + bl;
                i = end;
            }
        };
        let (reached, complete) = match src.run(m, &stop, &mut sink) {
            Ok(r) => (r, true),
            Err((Stop::Budget, r)) => (r, false),
        };
        let fs = fs + Interval::symmetric(theta_tail(c_small, reached));
        let fl = fl + Interval::symmetric(theta_tail(c_large, reached));
        let t2fl = ti * ti * fl;
        let plus = fs - t2fl; // 0 if w = +1
        let minus = fs + t2fl; // 0 if w = -1
        let sign = match (plus.excludes_zero(), minus.excludes_zero()) {
            (true, true) => {
                return Err(bad(
                    ErrorKind::InvalidValue,
                    format!(
                        "internal inconsistency: the functional equation fails for both signs at t = {t} \
                         (F(1/t) in {fs:?}, t^2 F(t) in {t2fl:?}); wrong conductor or coefficients (conductor {n})"
                    ),
                ))
            }
            (true, false) => Some(-1),
            (false, true) => Some(1),
            (false, false) => None,
        };
        let (same, other) = if sign == Some(-1) { (minus, plus) } else { (plus, minus) };
        let proof = RootNumberProof { sign, t, same_sign_gap: same, other_sign_gap: other, terms: reached, complete };
        if sign.is_some() || !complete {
            return Ok(proof);
        }
        last = Some(proof);
    }
    // invariant: the loop above runs at least once and sets last on every pass that does not return
    Ok(last.expect("at least one t"))
}

/// The global root number proven by the functional equation
/// `F(1/t) = w t^2 F(t)` of `F(y) = Σ a_n e^{-2π n y / sqrt N}` (Cremona,
/// §2.11), both sides enclosed in interval arithmetic with the proven tail
/// `2 (M+1) x^{M+1}/(1-x)^2`: when the enclosure of `F(1/t) - t^2 F(t)`
/// excludes 0, `w = +1` is impossible, so `w = -1`, and symmetrically. A
/// proof given modularity (Wiles; Taylor–Wiles; Breuil–Conrad–Diamond–
/// Taylor) and the exact conductor (checked here against Tate's algorithm).
/// Several `t` are tried if the first does not separate the signs.
///
/// The budget is checked between segments of coefficients; when it ends
/// the result has `sign = None`, `complete = false` ("cut short").
///
/// Errors as for [`prove_l_value`]; [`ErrorKind::InvalidValue`] if both
/// signs are excluded (a wrong conductor or a bug, reported, never
/// answered).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_root_number};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (conductor 11): w = +1
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// assert_eq!(prove_root_number(&e, &Natural::from(11u32), &FactorLimits::default()).unwrap().sign, Some(1));
/// ```
pub fn prove_root_number(minimal: &Curve, conductor: &Natural, limits: &FactorLimits) -> Result<RootNumberProof, Error> {
    let (n, mut src) = setup(minimal, conductor)?;
    root_number_from(&mut src, n, limits)
}

/// [`prove_root_number`] for callers that already have the bad primes
/// with their `a_p` (and have checked the conductor).
pub(crate) fn root_number_with_bad(minimal: &Curve, n: u64, bad_ap: Vec<(u64, i64)>, limits: &FactorLimits) -> Result<RootNumberProof, Error> {
    if n > PROOF_MAX_CONDUCTOR {
        return Err(bad(ErrorKind::TooLarge, format!("conductor {n} above the limit {PROOF_MAX_CONDUCTOR}")));
    }
    let mut src = CoefficientSource::new(minimal, bad_ap);
    root_number_from(&mut src, n, limits)
}

/// The root number by [`prove_root_number`], then the leading value of its
/// parity by [`prove_l_value`], sharing the table of `a_p` (the second pass
/// costs only the sieve and the series). `rank` is `Some(0)` or `Some(1)`
/// exactly when the value is proven non-zero: then the rank of `E(Q)` is
/// proven (Gross–Zagier 1986 and Kolyvagin 1988/1990 with modularity; see
/// the module documentation).
///
/// Errors as for [`prove_root_number`].
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, arith::FactorLimits, lproof::prove_analytic_rank};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (conductor 11): rank 0
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// assert_eq!(prove_analytic_rank(&e, &Natural::from(11u32), &FactorLimits::default()).unwrap().rank, Some(0));
/// ```
pub fn prove_analytic_rank(minimal: &Curve, conductor: &Natural, limits: &FactorLimits) -> Result<AnalyticRankProof, Error> {
    let (n, mut src) = setup(minimal, conductor)?;
    let root = root_number_from(&mut src, n, limits)?;
    let Some(w) = root.sign else {
        return Ok(AnalyticRankProof { root_number: root, value: None, rank: None });
    };
    let value = l_value_from(&mut src, n, if w == 1 { 0 } else { 1 }, limits)?;
    let rank = value.nonzero_proven().then_some(value.order);
    Ok(AnalyticRankProof { root_number: root, value: Some(value), rank })
}

/// [`prove_analytic_rank`] for a curve whose data is known: the minimal
/// model, the conductor and the reduction type at each bad prime come from
/// `data` (no factoring, no second run of Tate's algorithm), and the work's
/// deadline and cancel flag bound the sums.
///
/// ```
/// use twofold::{Curve, CurveData, Work, lproof::prove_analytic_rank_of};
/// // y^2 + y = x^3 - x (conductor 37): rank 1
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// assert_eq!(prove_analytic_rank_of(&d, &Work::unlimited()).unwrap().rank, Some(1));
/// ```
pub fn prove_analytic_rank_of(data: &crate::local::CurveData, work: &crate::budget::Work) -> Result<AnalyticRankProof, Error> {
    let n = u64::try_from(data.conductor())
        .ok()
        .filter(|&n| n <= PROOF_MAX_CONDUCTOR)
        .ok_or_else(|| bad(ErrorKind::TooLarge, format!("conductor {} above the limit {PROOF_MAX_CONDUCTOR}", data.conductor())))?;
    let bad_ap = data.bad_prime_traces()?;
    let limits = FactorLimits::within(work);
    let mut src = CoefficientSource::new(data.minimal(), bad_ap);
    let root = root_number_from(&mut src, n, &limits)?;
    let Some(w) = root.sign else {
        return Ok(AnalyticRankProof { root_number: root, value: None, rank: None });
    };
    let value = l_value_from(&mut src, n, if w == 1 { 0 } else { 1 }, &limits)?;
    let rank = value.nonzero_proven().then_some(value.order);
    Ok(AnalyticRankProof { root_number: root, value: Some(value), rank })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tails_are_proven_upper_bounds() {
        // compare the closed forms with direct sums of the majorants
        for cf in [0.3, 0.01, 0.002] {
            let c = Interval::point(cf);
            let m = l_terms(cf, 0);
            let direct: f64 = ((m + 1)..(m + 400_000)).map(|k| 4.0 * (-(k as f64) * cf).exp()).sum();
            assert!(direct <= tail_value(c, m, 0) && tail_value(c, m, 0) <= 1.1 * TAIL_GOAL, "{cf}");
            let m1 = l_terms(cf, 1);
            let direct1: f64 = ((m1 + 1)..(m1 + 400_000)).map(|k| 4.0 * (-(k as f64) * cf).exp() / (k as f64 * cf)).sum();
            assert!(direct1 <= tail_value(c, m1, 1), "{cf}");
            let mt = theta_terms(cf, TAIL_GOAL);
            let direct_t: f64 = ((mt + 1)..(mt + 400_000)).map(|k| 2.0 * k as f64 * (-(k as f64) * cf).exp()).sum();
            assert!(direct_t <= theta_tail(c, mt), "{cf}");
        }
    }
}
