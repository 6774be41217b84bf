//! The L-series of an elliptic curve over Q at `s = 1`: special values
//! `L^{(r)}(E, 1)` for `r = 0..=3` with error bounds, the analytic rank, the
//! analytic order of Sha predicted by the Birch–Swinnerton-Dyer conjecture,
//! and the partial Euler products `∏_{q ≤ p} #E(F_q)/q` of the original
//! observation of Birch and Swinnerton-Dyer.
//!
//! # Method
//!
//! With `a_n` the Dirichlet coefficients (traces of Frobenius counted at the
//! good primes by [`PointCounter`], `±1` or `0` at the bad primes from the
//! reduction type, extended by the Hecke recursion and multiplicativity),
//! the functional equation `Λ(s) = w Λ(2 - s)` gives
//! `L^{(r)}(E, 1) = 2 r! Σ_{n≥1} (a_n / n) G_r(2πn / sqrt N)` when
//! `w = (-1)^r`, and `L^{(r)}(E, 1) = 0` when `w = -(-1)^r` (Cremona,
//! *Algorithms for Modular Elliptic Curves*, 2nd ed., §2.13; Dokchitser,
//! *Computing special values of motivic L-functions*, Experiment. Math. 13
//! (2004)). The functions `G_r` are evaluated in `f64` by a power series
//! below `x = 2` and a continued fraction above (see the source of
//! `gfun.rs` for both, with their error bounds).
//!
//! # Error bound
//!
//! Each [`SpecialValue`] carries `error`, the sum of
//!
//! * the truncation error: `|a_n| <= d(n) sqrt(n) <= 2n` (Hasse's bound,
//!   multiplicativity and `d(n) <= 2 sqrt(n)`) and `G_r(x) <= e^{-x}/x^r`
//!   (from `log y <= y - 1`) bound the tail after `M` terms by
//!   `4 r! e^{-(M+1)c} / (((M+1)c)^r (1 - e^{-c}))`, `c = 2π/sqrt N`; `M` is
//!   the least with this below [`TAIL_TARGET`];
//! * the error of each `G_r(x_n)` (series or continued fraction), times
//!   `|a_n|/n`;
//! * the effect of the rounding of `x_n = n c` (relative `4·2^-53`), bounded
//!   through `|x G_r'(x)| = |G_{r-1}(x)|` for `r >= 1` (`x e^{-x}` for `r = 0`);
//! * a few units of rounding per term and the error of compensated
//!   (Neumaier) summation.
//!
//! For values that are proofs (interval arithmetic, every rounding
//! directed, conductors up to `10^14`) see [`crate::lproof`]; this module
//! stays the fast path for the evidence and for orders 2 and 3.
//!
//! The bound is "rigorous-ish": it follows the operations in `f64` with the
//! standard model of rounding, but is not machine-checked interval
//! arithmetic. Measured in `tests/lseries.rs`: for conductors up to about
//! `10^7` the bounds stay below `2·10^-11` absolute (`10^-13`-`10^-14` for
//! `L(E, 1)`, `10^-12` for `L'`, `10^-11` for `L'''` of size 100), so
//! relative `10^-10` for every value above `0.2`.

mod coeffs;
mod gfun;

#[cfg(test)]
pub(crate) use coeffs::coefficients_from;
pub(crate) use coeffs::{coefficients_with, extend_coefficients_with};

use crate::arith::{factor_u64, primes_up_to};
use crate::budget::Work;
use crate::curve::{Curve, PointCounter};
use crate::error::{Error, ErrorKind};
use crate::local::{local_data, CurveData, Reduction};
use malachite::{Integer, Natural};

/// The truncation error allowed for each series (absolute).
///
/// ```
/// assert!(twofold::lseries::TAIL_TARGET < 1e-14);
/// ```
pub const TAIL_TARGET: f64 = 1e-15;

/// The largest conductor accepted by [`special_values`] (about
/// `5.5 sqrt(N)` coefficients are needed, each good prime costs `O(p)`, so
/// seconds at this size). The stated accuracy is checked up to `10^7`.
///
/// ```
/// assert_eq!(twofold::lseries::MAX_CONDUCTOR, 1_000_000_000);
/// ```
pub const MAX_CONDUCTOR: u64 = 1_000_000_000;

/// A value `L^{(r)}(E, 1)` with an error bound.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::special_values};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (Cremona 1997, Table 1): w = +1, conductor 11
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let v = special_values(&e, &Natural::from(11u32), 1, 1).unwrap();
/// assert!((v[0].value - 0.2538418608559).abs() < 1e-12); // L(E, 1) (from memory)
/// assert!(v[0].error < 1e-13);
/// assert!(v[1].by_sign && v[1].value == 0.0); // L'(E, 1) = 0 as w = +1
/// ```
#[derive(Clone, Debug, PartialEq)]
pub struct SpecialValue {
    /// The order `r` of the derivative.
    pub order: usize,
    /// The computed `L^{(r)}(E, 1)` (not divided by `r!`).
    pub value: f64,
    /// A bound on `|value - L^{(r)}(E, 1)|` (see the module documentation).
    pub error: f64,
    /// The number of terms `M` of the series summed (0 when `by_sign`).
    pub terms: usize,
    /// `true` when the value is zero exactly by the sign of the functional
    /// equation (`w = -(-1)^r`); then `value = error = 0`.
    pub by_sign: bool,
}

/// What an analytic rank rests on.
///
/// ```
/// use twofold::lseries::RankBasis;
/// assert_ne!(RankBasis::NonZeroValue, RankBasis::NumericalZeros);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub enum RankBasis {
    /// Rank 0 or 1: the lower value (if any) vanishes by the sign of the
    /// functional equation, and `L^{(r)}(E, 1)` is bounded away from zero
    /// by the computed value and its error bound. This proves the analytic
    /// rank, subject to the error bound being right (numerical analysis in
    /// `f64`, not interval arithmetic) and to the root number passed in.
    NonZeroValue,
    /// Rank 2 or 3: some lower derivative of the right parity is zero only
    /// to the accuracy reached (`|value| <= error`). Numerical: it does not
    /// prove that it vanishes.
    NumericalZeros,
}

impl RankBasis {
    /// A sentence saying what an analytic rank with this basis rests on, for
    /// reports.
    ///
    /// ```
    /// use twofold::lseries::RankBasis;
    /// assert!(RankBasis::NumericalZeros.statement().starts_with("numerical"));
    /// ```
    pub fn statement(&self) -> &'static str {
        match self {
            RankBasis::NonZeroValue => {
                "proven up to the numerical error bound: the lower value vanishes by the sign of the functional \
                 equation and the leading value is bounded away from zero"
            }
            RankBasis::NumericalZeros => "numerical: the lower derivatives are zero to the accuracy reached",
        }
    }
}

/// The analytic rank with the values it was read from.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::{analytic_rank, RankBasis}};
/// // y^2 + y = x^3 - x (Cremona 1997, Table 1): rank 1, w = -1
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let a = analytic_rank(&e, &Natural::from(37u32), -1).unwrap();
/// assert_eq!((a.rank, a.basis), (1, RankBasis::NonZeroValue));
/// assert!((a.leading.value - 0.3059997738340).abs() < 1e-12); // L'(E, 1) (from memory)
/// ```
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct AnalyticRank {
    /// The order of vanishing of `L(E, s)` at `s = 1` (see `basis`).
    pub rank: usize,
    /// `L^{(rank)}(E, 1)`.
    pub leading: SpecialValue,
    /// The values of order `0..=rank`.
    pub values: Vec<SpecialValue>,
    /// What the statement rests on.
    pub basis: RankBasis,
}

impl AnalyticRank {
    /// `L^{(r)}(E, 1) / r!` and its error bound, the leading Taylor
    /// coefficient that enters the BSD formula.
    ///
    /// ```
    /// use malachite::Natural;
    /// use twofold::{Curve, lseries::analytic_rank};
    /// // y^2 + y = x^3 + x^2 - 2x (Cremona 1997, Table 1): rank 2; L''(E,1)/2 = 0.7593165002 (from memory)
    /// let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
    /// let (c, err) = analytic_rank(&e, &Natural::from(389u32), 1).unwrap().leading_coefficient();
    /// assert!((c - 0.7593165002).abs() < 1e-9 && err < 1e-12);
    /// ```
    pub fn leading_coefficient(&self) -> (f64, f64) {
        let f = [1.0, 1.0, 2.0, 6.0][self.rank];
        (self.leading.value / f, self.leading.error / f)
    }
}

/// A value is called non-zero when it exceeds its error bound this many times.
const CLEARLY: f64 = 1000.0;

fn bad(kind: ErrorKind, msg: impl Into<String>) -> Error {
    Error::new(kind, msg)
}

/// `(G_1(x), error)` of the f64 path, for the cross-checks of
/// [`crate::enclosure`].
#[cfg(test)]
pub(crate) fn g_values_for_tests(x: f64) -> (f64, f64) {
    let g = gfun::g_values(x);
    (g.value[1], g.error[1])
}

/// The Dirichlet coefficients `a_0 = 0, a_1, ..., a_m` of `L(E, s)` for a
/// global minimal model `curve` of conductor `conductor` (the traces by
/// baby-step giant-step in the group of points: about 5 µs a prime near
/// 10^7).
///
/// Errors ([`ErrorKind::InvalidValue`]): the conductor is not that of the
/// curve (an exponent disagrees with Tate's algorithm), or the model is not
/// minimal at some prime not dividing the conductor. [`ErrorKind::TooLarge`]
/// above [`MAX_CONDUCTOR`] or for `m >= 2^32`.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::dirichlet_coefficients};
/// // y^2 + y = x^3 - x^2 - 10x - 20: q - 2q^2 - q^3 + 2q^4 + q^5 + 2q^6 - 2q^7 (Cremona, §2.8; from memory)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let a = dirichlet_coefficients(&e, &Natural::from(11u32), 7).unwrap();
/// assert_eq!(a, vec![0, 1, -2, -1, 2, 1, 2, -2]);
/// ```
pub fn dirichlet_coefficients(curve: &Curve, conductor: &Natural, m: usize) -> Result<Vec<i64>, Error> {
    let n = checked_conductor(conductor)?;
    if m as u64 >= 1 << 32 {
        return Err(bad(ErrorKind::TooLarge, "coefficients only below 2^32"));
    }
    let bad_ap = bad_primes(curve, n)?;
    // the traces by baby-step giant-step above a small threshold (exact:
    // the exact count wherever the search is undecided)
    let mut oracle = crate::lproof::TraceOracle::new(curve);
    // invariant: the closure always returns Some, so coefficients_with never stops early
    Ok(coefficients_with(&mut |p| Some(oracle.trace(p)), &bad_ap, m).expect("the trace oracle never stops"))
}

fn checked_conductor(conductor: &Natural) -> Result<u64, Error> {
    let n = u64::try_from(conductor)
        .ok()
        .filter(|&n| n <= MAX_CONDUCTOR)
        .ok_or_else(|| bad(ErrorKind::TooLarge, format!("conductor {conductor} above the limit {MAX_CONDUCTOR}")))?;
    if n == 0 {
        return Err(bad(ErrorKind::InvalidValue, "the conductor is positive"));
    }
    Ok(n)
}

/// `(p, a_p)` at the primes dividing the conductor, after checking the
/// conductor exponents and that the model has good reduction elsewhere.
pub(crate) fn bad_primes(curve: &Curve, n: u64) -> Result<Vec<(u64, i64)>, Error> {
    let f = factor_u64(n)?;
    let mut out = Vec::new();
    let mut disc = curve.discriminant().clone();
    for &(p, e) in &f {
        let d = local_data(curve, &Natural::from(p))?;
        if d.conductor_exponent != e {
            return Err(bad(
                ErrorKind::InvalidValue,
                format!("the conductor exponent at {p} is {}, not {e}", d.conductor_exponent),
            ));
        }
        let ap = match d.reduction {
            Reduction::SplitMultiplicative => 1,
            Reduction::NonSplitMultiplicative => -1,
            Reduction::Additive => 0,
            Reduction::Good => {
                return Err(bad(ErrorKind::InvalidValue, format!("{p} divides the conductor but the reduction is good")))
            }
        };
        let pi = Integer::from(p);
        while &disc % &pi == 0 {
            disc /= &pi;
        }
        out.push((p, ap));
    }
    if disc != 1 && disc != -1 {
        return Err(bad(
            ErrorKind::InvalidValue,
            format!(
                "the discriminant has the factor {disc} prime to the conductor {n}: the model is not minimal there, \
                 or the conductor is wrong"
            ),
        ));
    }
    Ok(out)
}

/// The least `M` with the truncation bound of the module documentation
/// below [`TAIL_TARGET`] for every order up to `max_order`.
fn terms_needed(c: f64, max_order: usize) -> usize {
    let one_minus = -(-c).exp_m1();
    let fact = [1.0, 1.0, 2.0, 6.0];
    let tail = |m: usize| -> f64 {
        let x = (m as f64 + 1.0) * c;
        (0..=max_order).map(|r| 4.0 * fact[r] * (-x).exp() / (x.powi(r as i32) * one_minus)).fold(0.0, f64::max)
    };
    // x_M >= log(4 * 6 / (TAIL * (1 - e^-c))) / ... : start low and double, then bisect
    let (mut lo, mut hi) = (1usize, 2usize);
    while tail(hi) > TAIL_TARGET {
        lo = hi;
        hi *= 2;
    }
    while hi - lo > 1 {
        let mid = (lo + hi) / 2;
        if tail(mid) > TAIL_TARGET {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    hi
}

/// Neumaier's compensated sum.
#[derive(Clone, Copy, Default)]
struct CompensatedSum {
    sum: f64,
    comp: f64,
    abs: f64,
}

impl CompensatedSum {
    fn add(&mut self, v: f64) {
        let t = self.sum + v;
        if self.sum.abs() >= v.abs() {
            self.comp += (self.sum - t) + v;
        } else {
            self.comp += (v - t) + self.sum;
        }
        self.sum = t;
        self.abs += v.abs();
    }
    fn value(&self) -> f64 {
        self.sum + self.comp
    }
}

/// `L^{(r)}(E, 1)` for `r = 0..=max_order` (`max_order <= 3`), for a global
/// minimal model `curve` with its conductor and global root number `w`
/// (from [`crate::rootno::root_number`]). Values of the wrong parity are
/// zero by the functional equation and marked [`SpecialValue::by_sign`];
/// the others are summed in one pass over the coefficients.
///
/// Errors: [`ErrorKind::InvalidValue`] for `w` not `±1`, `max_order > 3`,
/// or an inconsistent conductor or non-minimal model (see
/// [`dirichlet_coefficients`]); [`ErrorKind::TooLarge`] above
/// [`MAX_CONDUCTOR`].
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::special_values};
/// // y^2 + y = x^3 - 7x + 6 = [0,0,1,-7,6] (Cremona 1997, Table 1): rank 3, w = -1;
/// // L'''(E, 1)/3! = 1.7318 (from memory)
/// let e = Curve::from_coefficients([0, 0, 1, -7, 6]).unwrap();
/// let v = special_values(&e, &Natural::from(5077u32), -1, 3).unwrap();
/// assert!(v[1].value.abs() <= v[1].error);
/// assert!((v[3].value / 6.0 - 1.7318).abs() < 1e-3);
/// ```
pub fn special_values(curve: &Curve, conductor: &Natural, w: i8, max_order: usize) -> Result<Vec<SpecialValue>, Error> {
    check_order_and_sign(w, max_order)?;
    let n = checked_conductor(conductor)?;
    let bad_ap = bad_primes(curve, n)?;
    values_from(curve, n, &bad_ap, w, max_order, &Work::unlimited())
}

/// [`special_values`] for a curve whose data is known (the minimal model,
/// the conductor and the reduction types come from `data`, nothing is
/// checked again), held to the deadline and cancel flag of `work`: the
/// point counts look at it every 64 primes and the sum every 4096 terms,
/// and both stop with an error of kind [`ErrorKind::Budget`].
///
/// ```
/// use twofold::{Curve, CurveData, Work, lseries::special_values_of};
/// // y^2 + y = x^3 - x (conductor 37, rank 1, Cremona 1997, Table 1): L(E,1) = 0 by the sign
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let v = special_values_of(&d, -1, 1, &Work::unlimited()).unwrap();
/// assert!(v[0].by_sign && v[1].value > 0.3);
/// ```
pub fn special_values_of(data: &CurveData, w: i8, max_order: usize, work: &Work) -> Result<Vec<SpecialValue>, Error> {
    check_order_and_sign(w, max_order)?;
    let n = checked_conductor(data.conductor())?;
    values_from(data.minimal(), n, &data.bad_prime_traces()?, w, max_order, work)
}

/// [`analytic_rank`] for a curve whose data is known, within `work` (see
/// [`special_values_of`]).
pub fn analytic_rank_of(data: &CurveData, w: i8, work: &Work) -> Result<AnalyticRank, Error> {
    rank_from_values(&special_values_of(data, w, 3, work)?)
}

/// How many terms of the sum pass between two looks at the deadline and the
/// cancel flag.
pub(crate) const WORK_CHECK_EVERY: usize = 4096;

/// How many point counts pass between two looks at the deadline and the
/// cancel flag: each count costs `O(p)`, so 4096 of them near `p = 40,000`
/// took about 0.2 s on an idle core and several times that under load; a look
/// costs one clock read, negligible beside 64 counts.
const PRIMES_BETWEEN_CHECKS: usize = 64;

fn check_order_and_sign(w: i8, max_order: usize) -> Result<(), Error> {
    if w != 1 && w != -1 {
        return Err(bad(ErrorKind::InvalidValue, format!("a root number is 1 or -1, not {w}")));
    }
    if max_order > 3 {
        return Err(bad(ErrorKind::InvalidValue, format!("derivatives up to order 3 only, not {max_order}")));
    }
    Ok(())
}

fn cut_short() -> Error {
    bad(ErrorKind::Budget, "the L-series was stopped by the deadline or the cancel flag")
}

/// The sums of [`special_values`] once the conductor and the traces at the
/// bad primes are known.
fn values_from(curve: &Curve, n: u64, bad_ap: &[(u64, i64)], w: i8, max_order: usize, work: &Work) -> Result<Vec<SpecialValue>, Error> {
    let c = 2.0 * std::f64::consts::PI / (n as f64).sqrt();
    let m = terms_needed(c, max_order);
    let mut counter = PointCounter::new(curve);
    let mut counted = 0usize;
    let mut trace = |p: u64| {
        counted += 1;
        if counted % PRIMES_BETWEEN_CHECKS == 0 && work.exhausted() {
            return None;
        }
        Some(counter.trace(p))
    };
    let a = coefficients_with(&mut trace, bad_ap, m).ok_or_else(cut_short)?;
    let wanted: Vec<bool> = (0..=max_order).map(|r| if r % 2 == 0 { w == 1 } else { w == -1 }).collect();
    let eps = f64::EPSILON / 2.0;
    let mut sums = [CompensatedSum::default(); 4];
    let mut term_err = [0.0f64; 4];
    for (k, &an) in a.iter().enumerate().skip(1) {
        if k % WORK_CHECK_EVERY == 0 && work.exhausted() {
            return Err(cut_short());
        }
        if an == 0 {
            continue;
        }
        let x = k as f64 * c;
        let g = gfun::g_values(x);
        let coef = an as f64 / k as f64;
        let ac = coef.abs();
        for r in 0..=max_order {
            if !wanted[r] {
                continue;
            }
            let t = coef * g.value[r];
            sums[r].add(t);
            // |x G_r'(x)| = |G_{r-1}(x)| (r >= 1), x G_0(x) (r = 0)
            let slope = if r == 0 { x * g.value[0] } else { g.value[r - 1] };
            term_err[r] += ac * (g.error[r] + 4.0 * eps * slope) + 3.0 * eps * t.abs();
        }
    }
    let fact = [1.0, 1.0, 2.0, 6.0];
    let one_minus = -(-c).exp_m1();
    let xm = (m as f64 + 1.0) * c;
    let mut out = Vec::new();
    for r in 0..=max_order {
        if !wanted[r] {
            out.push(SpecialValue { order: r, value: 0.0, error: 0.0, terms: 0, by_sign: true });
            continue;
        }
        let s = &sums[r];
        let tail = 4.0 * fact[r] * (-xm).exp() / (xm.powi(r as i32) * one_minus);
        let sum_err = 2.0 * eps * s.value().abs() + 4.0 * (m as f64) * eps * eps * s.abs;
        let scale = 2.0 * fact[r];
        let value = scale * s.value();
        let error = scale * (term_err[r] + sum_err + tail) + eps * value.abs();
        out.push(SpecialValue { order: r, value, error, terms: m, by_sign: false });
    }
    Ok(out)
}

/// The analytic rank from values of orders `0, 1, 2, ...` (as returned by
/// [`special_values`]): the first order whose value is not zero by the sign
/// and exceeds 1000 times its error bound, provided every lower value of
/// the right parity lies within its error bound of zero.
///
/// Errors: [`ErrorKind::Budget`] when some value is neither (the accuracy
/// does not decide), [`ErrorKind::TooLarge`] when every value given is zero
/// to the accuracy reached (rank above the orders computed).
///
/// ```
/// use twofold::lseries::{rank_from_values, SpecialValue, RankBasis};
/// let v = |order, value, error| SpecialValue { order, value, error, terms: 10, by_sign: false };
/// let zero = SpecialValue { order: 1, value: 0.0, error: 0.0, terms: 0, by_sign: true };
/// let a = rank_from_values(&[v(0, 1e-16, 1e-14), zero, v(2, 1.5, 1e-14)]).unwrap();
/// assert_eq!((a.rank, a.basis), (2, RankBasis::NumericalZeros));
/// assert!(rank_from_values(&[v(0, 1e-12, 1e-14)]).is_err());
/// ```
pub fn rank_from_values(values: &[SpecialValue]) -> Result<AnalyticRank, Error> {
    let mut numerical = false;
    for (r, v) in values.iter().enumerate() {
        if v.order != r {
            return Err(bad(ErrorKind::InvalidValue, "values must be given in order 0, 1, 2, ..."));
        }
        if v.by_sign {
            continue;
        }
        if v.value.abs() > CLEARLY * v.error {
            let basis = if numerical { RankBasis::NumericalZeros } else { RankBasis::NonZeroValue };
            return Ok(AnalyticRank { rank: r, leading: v.clone(), values: values[..=r].to_vec(), basis });
        }
        if v.value.abs() <= v.error {
            numerical = true;
            continue;
        }
        return Err(bad(
            ErrorKind::Budget,
            format!("L^({r})(E, 1) = {:e} with error bound {:e} is neither clearly zero nor clearly not", v.value, v.error),
        ));
    }
    Err(bad(
        ErrorKind::TooLarge,
        format!("all values up to order {} vanish to the accuracy reached: analytic rank (numerically) above it", values.len().saturating_sub(1)),
    ))
}

/// The analytic rank (at most 3) of a global minimal model `curve` with
/// its conductor and root number `w`: [`special_values`] up to order 3
/// read by [`rank_from_values`]. Errors as there.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::{analytic_rank, RankBasis}};
/// // y^2 + y = x^3 - 7x + 6 (Cremona 1997, Table 1): analytic rank 3, read numerically
/// let e = Curve::from_coefficients([0, 0, 1, -7, 6]).unwrap();
/// let a = analytic_rank(&e, &Natural::from(5077u32), -1).unwrap();
/// assert_eq!((a.rank, a.basis), (3, RankBasis::NumericalZeros));
/// ```
pub fn analytic_rank(curve: &Curve, conductor: &Natural, w: i8) -> Result<AnalyticRank, Error> {
    rank_from_values(&special_values(curve, conductor, w, 3)?)
}

/// The inputs of the Birch–Swinnerton-Dyer formula, as plain numbers.
///
/// ```
/// use twofold::lseries::{bsd_sha, BsdInputs};
/// // y^2 + y = x^3 - x^2 - 10x - 20: L(E,1) = 0.2538418608559, Omega = 1.26920930427955 (one real
/// // component), c_11 = 5, #E(Q)_tors = 5 (published tables, Cremona 1997; from memory)
/// let s = bsd_sha(&BsdInputs {
///     rank: 0, leading: 0.2538418608559, leading_error: 1e-13, torsion_order: 5,
///     omega: 1.26920930427955, regulator: 1.0, tamagawa_product: 5, relative_error: 1e-13,
/// }).unwrap();
/// assert_eq!(s.nearest, 1);
/// ```
#[derive(Clone, Debug, PartialEq)]
pub struct BsdInputs {
    /// The (analytic) rank `r`.
    pub rank: usize,
    /// `L^{(r)}(E, 1) / r!`.
    pub leading: f64,
    /// A bound on the error of `leading`.
    pub leading_error: f64,
    /// `#E(Q)_tors`.
    pub torsion_order: u64,
    /// The real period times the number of real components (`Ω_E` of the
    /// formula, of a global minimal model).
    pub omega: f64,
    /// The regulator of a basis of `E(Q)` modulo torsion (`1` for rank 0),
    /// with the canonical height normalised as in the conjecture.
    pub regulator: f64,
    /// `∏ c_p` over the bad primes.
    pub tamagawa_product: u64,
    /// A bound on the relative error of `omega · regulator`.
    pub relative_error: f64,
}

/// The analytic order of Sha with an error bound.
///
/// ```ignore
/// // (an illustration only: the struct is non-exhaustive, so its values
/// // come from the library, never from a struct expression)
/// use twofold::lseries::ShaEstimate;
/// let s = ShaEstimate { value: 4.0000001, error: 1e-6, nearest: 4, is_square: true };
/// assert!(s.is_square);
/// ```
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct ShaEstimate {
    /// `L^{(r)}(E,1)/r! · #E(Q)_tors^2 / (Ω · Reg · ∏ c_p)`: the order of Sha
    /// **if** the Birch–Swinnerton-Dyer conjecture holds (conditional).
    pub value: f64,
    /// A bound on the error of `value` from the errors of the inputs.
    pub error: f64,
    /// The nearest integer to `value`.
    pub nearest: u64,
    /// Whether `nearest` is a perfect square (as the order of Sha must be
    /// when finite, by the Cassels–Tate pairing).
    pub is_square: bool,
}

/// The analytic order of Sha, `L^{(r)}(E,1)/r! · #T^2 / (Ω · Reg · ∏ c_p)`,
/// conditional on the Birch–Swinnerton-Dyer conjecture (it is the order of
/// Sha only if the conjecture holds).
///
/// Errors ([`ErrorKind::InvalidValue`]): non-positive or non-finite
/// `omega` or `regulator`, zero torsion order or Tamagawa product, negative
/// error bounds.
///
/// ```
/// use twofold::lseries::{bsd_sha, BsdInputs};
/// // y^2 + y = x^3 - x: L'(E,1) = 0.3059997738340, Omega = 5.98691729246392 (two real
/// // components), Reg = 0.0511114082399688, c_37 = 1, trivial torsion
/// // (published tables, Cremona 1997; from memory)
/// let s = bsd_sha(&BsdInputs {
///     rank: 1, leading: 0.3059997738340, leading_error: 1e-13, torsion_order: 1,
///     omega: 5.98691729246392, regulator: 0.0511114082399688, tamagawa_product: 1, relative_error: 1e-13,
/// }).unwrap();
/// assert!((s.value - 1.0).abs() < 1e-10 && s.nearest == 1 && s.is_square);
/// ```
pub fn bsd_sha(inputs: &BsdInputs) -> Result<ShaEstimate, Error> {
    let i = inputs;
    let ok = |v: f64| v.is_finite() && v > 0.0;
    if !ok(i.omega) || !ok(i.regulator) || i.torsion_order == 0 || i.tamagawa_product == 0 {
        return Err(bad(ErrorKind::InvalidValue, "omega, regulator, torsion order and Tamagawa product must be positive"));
    }
    if !(i.leading.is_finite() && i.leading_error >= 0.0 && i.relative_error >= 0.0) {
        return Err(bad(ErrorKind::InvalidValue, "the leading value and the error bounds must be finite and non-negative"));
    }
    let t = i.torsion_order as f64;
    let denom = i.omega * i.regulator * i.tamagawa_product as f64;
    let factor = t * t / denom;
    let value = i.leading * factor;
    let eps = f64::EPSILON;
    let error = i.leading_error * factor + value.abs() * (i.relative_error * 1.01 + 8.0 * eps);
    let nearest = value.round().max(0.0) as u64;
    let root = (nearest as f64).sqrt().round() as u64;
    let is_square = root * root == nearest;
    Ok(ShaEstimate { value, error, nearest, is_square })
}

/// The partial Euler products of the original observation of Birch and
/// Swinnerton-Dyer, with a fitted slope.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::euler_product_growth};
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(); // y^2 + y = x^3 - x, rank 1
/// let g = euler_product_growth(&e, &Natural::from(37u32), 2000).unwrap();
/// assert_eq!(g.points.len(), 302); // primes below 2000 except 37
/// assert!(g.slope > 0.3 && g.slope < 2.0);
/// ```
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct EulerProductGrowth {
    /// `(log p, log ∏_{q ≤ p, q good} #E(F_q)/q)` at every good prime `p`
    /// up to the bound.
    pub points: Vec<(f64, f64)>,
    /// The least-squares slope of `log ∏` against `log log p` over the
    /// points with `p >= FIT_FROM` (the conjecture's heuristic: `∏ ~ C (log p)^r`,
    /// so the slope should approach the rank `r`, slowly and noisily). NaN
    /// when fewer than two primes from `FIT_FROM` on are in range.
    pub slope: f64,
    /// The intercept of the same fit (NaN with the slope).
    pub intercept: f64,
}

/// The fit of [`EulerProductGrowth`] uses primes from here on.
///
/// ```
/// assert_eq!(twofold::lseries::FIT_FROM, 100);
/// ```
pub const FIT_FROM: u64 = 100;

/// The partial products `∏_{q ≤ p, q ∤ N} #E(F_q)/q` for all primes `p` up
/// to `bound` (at most `10^8`), for a global minimal model `curve` of
/// conductor `conductor`, with the least-squares fit of `log ∏` against
/// `log log p` (see [`EulerProductGrowth`]). Errors as in
/// [`dirichlet_coefficients`], and [`ErrorKind::TooLarge`] for a bound
/// above `10^8`.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, lseries::euler_product_growth};
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap(); // y^2 + y = x^3 - x^2 - 10x - 20, rank 0
/// let g = euler_product_growth(&e, &Natural::from(11u32), 5000).unwrap();
/// assert!(g.slope.abs() < 0.5);
/// ```
pub fn euler_product_growth(curve: &Curve, conductor: &Natural, bound: u64) -> Result<EulerProductGrowth, Error> {
    if bound > 100_000_000 {
        return Err(bad(ErrorKind::TooLarge, "prime bound above 10^8"));
    }
    let n = checked_conductor(conductor)?;
    let bad_ap = bad_primes(curve, n)?;
    let mut counter = PointCounter::new(curve);
    let mut log_prod = 0.0f64;
    let mut points = Vec::new();
    let (mut sx, mut sy, mut sxx, mut sxy, mut cnt) = (0.0f64, 0.0f64, 0.0f64, 0.0f64, 0.0f64);
    for p in primes_up_to(bound) {
        if bad_ap.iter().any(|&(q, _)| q == p) {
            continue;
        }
        let np = counter.count(p) as f64;
        log_prod += (np / p as f64).ln();
        let lp = (p as f64).ln();
        points.push((lp, log_prod));
        if p >= FIT_FROM {
            let x = lp.ln();
            sx += x;
            sy += log_prod;
            sxx += x * x;
            sxy += x * log_prod;
            cnt += 1.0;
        }
    }
    let det = cnt * sxx - sx * sx;
    let (slope, intercept) = if cnt >= 2.0 && det > 0.0 {
        let s = (cnt * sxy - sx * sy) / det;
        (s, (sy - s * sx) / cnt)
    } else {
        (f64::NAN, f64::NAN)
    };
    Ok(EulerProductGrowth { points, slope, intercept })
}
