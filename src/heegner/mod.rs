//! Generators of rank-one curves by the Heegner point method (issue 16).
//!
//! For a global minimal model `E` of conductor `N` with root number `-1`
//! and `L'(E, 1) != 0`, Gross and Zagier (Heegner points and derivatives of
//! L-series, Invent. Math. 84, 1986) together with Kolyvagin show that
//! `E(Q)` has rank one and that the trace of a Heegner point has infinite
//! order. The computation follows H. Cohen, A Course in Computational
//! Algebraic Number Theory (1993), §7.5, J. E. Cremona, Algorithms for
//! Modular Elliptic Curves (2nd ed., 1997), and M. Watkins, Some remarks on
//! Heegner point computations (2006):
//!
//! 1. a fundamental discriminant `D < -4` with every `p | N` split in
//!    `Q(sqrt D)` and `beta^2 = D mod 4N` ([`forms`]), chosen to keep the
//!    series short (`Σ A_i / sqrt|D|` small);
//! 2. one Heegner point `tau_i = (-B_i + sqrt D) / (2 A_i)` with `N | A_i`,
//!    `B_i = beta mod 2N`, per class of forms of discriminant `D`;
//! 3. the modular parametrisation `z(tau) = Σ a_n / n q^n` with the
//!    coefficients `a_n` of `L(E, s)` (counted here by baby-step giant-step,
//!    see `traces.rs`), summed over the `tau_i` in multiple precision;
//! 4. `z` reduced modulo the period lattice; if it is not on the real
//!    locus, its trace `z + conj(z)` to `E(Q)` is used; `x = ℘(z) - b2/12`
//!    by the q-expansion of `℘`, recognised as a rational by continued
//!    fractions, and the point checked **exactly** on the curve;
//! 5. the point divided by its index: the `k`-th parts `(z + log T + λ) / k`
//!    of the trace for `k <= max_divisor` (`T` running over the rational
//!    torsion, whose logarithms are found once per precision), small primes
//!    `l` dividing out the same way, then the saturation machinery of
//!    [`crate::heights`].
//!
//! The modular parametrisation lands on the optimal curve of the isogeny
//! class; for another member the values `m z` for small `m` are tried too
//! (the pull-back of the Néron differential is `m` times that of the
//! optimal curve). The Manin constant is taken to be 1 in the precision
//! guess only.
//!
//! # What is proven
//!
//! Every returned point is verified exactly on the input model and is of
//! infinite order (checked exactly). The numerical parts (the series, `℘`,
//! the precision guess from the Birch and Swinnerton-Dyer formula with Sha
//! assumed trivial) only propose candidates; a wrong guess costs time, not
//! correctness. The saturation of the returned generator is as described
//! in [`crate::heights::Saturation`] (exact p-saturation tests up to a
//! numerical index bound).
//!
//! # Example
//!
//! ```
//! use malachite::Natural;
//! use twofold::Curve;
//! use twofold::heegner::{point_of_rank_one, HeegnerOptions};
//! // y^2 + y = x^3 - x, conductor 37, rank 1 (Cremona, Table 1)
//! let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
//! let r = point_of_rank_one(&e, &Natural::from(37u32), &HeegnerOptions::default()).unwrap().unwrap();
//! assert!(e.contains(&r.generator));
//! // canonical height 0.0511114082 (from memory)
//! assert!((r.height - 0.0511114082).abs() < 1e-8);
//! ```

mod analytic;
mod class;
pub mod forms;
mod spend;
mod traces;
mod twist;
mod words;

use crate::budget::{RankOptions, Work};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::heights::real::{fi, to_f64, Cx};
use crate::heights::{canonical_height_of, height_difference_bound, mordell_weil_basis_of, PeriodLattice, Saturation, SaturationOptions};
use crate::local::{CurveData, LocalData};
use crate::torsion::TorsionGroup;
use crate::heights::elliptic::{recognise, torsion_shifts, Lattice};
use spend::{Halt, Spend};
use malachite::base::num::arithmetic::traits::Abs;
use malachite::{Float, Natural, Rational};
use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::{Duration, Instant};

pub use forms::{HeegnerData, QuadraticForm};

/// Budgets for [`point_of_rank_one`].
///
/// ```
/// use twofold::heegner::HeegnerOptions;
/// let o = HeegnerOptions::default();
/// assert!(o.max_precision >= 4096 && o.max_discriminants >= 1);
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct HeegnerOptions {
    /// Wall-clock limit for the whole computation (the caller's overall
    /// budget).
    pub time_limit: Option<Duration>,
    /// Limit on the CPU time of the calling thread (the step runs on that
    /// thread only), so that the machine's load does not decide whether a
    /// curve gets its point; `None` for no such cap. Where the thread's CPU
    /// clock cannot be read, it is counted in wall time.
    pub cpu_time_limit: Option<Duration>,
    /// Set to `true` from another thread to stop promptly.
    pub cancel: Option<Arc<AtomicBool>>,
    /// The largest working precision in bits (the precision starts from
    /// the guess of the Birch and Swinnerton-Dyer formula and doubles while
    /// recognition fails).
    pub max_precision: u64,
    /// How many discriminants to try before giving up (on the
    /// congruent-number curves for n = 205, 390, 438, 590 the first four
    /// give torsion traces, detected at the first precision).
    pub max_discriminants: usize,
    /// The most coefficients `a_n` to compute (memory: 8 bytes each).
    pub max_terms: usize,
    /// The largest multiplier `m` tried for `m z` on curves that are not
    /// the optimal member of their isogeny class.
    pub max_multiplier: u32,
    /// The largest `k` for which the `k`-th parts of the Heegner trace are
    /// tried before raising the precision (the trace is the index times a
    /// generator plus a torsion point, and its parts need fewer bits; on
    /// `y^2 = x^3 - n^2 x` for n = 543 and 965 it is 16).
    pub max_divisor: u64,
    /// Whether to use the twist route when the curve is the quadratic
    /// twist of a curve of smaller conductor (see the module
    /// documentation); the direct series is the fallback either way.
    pub use_twist: bool,
    /// Whether to run the series on the member of the isogeny class (odd
    /// degrees and 2-isogenies) whose generator the Birch and
    /// Swinnerton-Dyer formula predicts to be smallest, and carry its point
    /// back (`ĥ(φ P) = deg φ · ĥ(P)`): the series' length grows with the
    /// height to be recognised.
    pub use_isogeny_class: bool,
}

impl Default for HeegnerOptions {
    fn default() -> Self {
        HeegnerOptions {
            time_limit: None,
            cpu_time_limit: None,
            cancel: None,
            max_precision: 16_384,
            max_discriminants: 12,
            max_terms: 60_000_000,
            max_multiplier: 4,
            max_divisor: 24,
            use_twist: true,
            use_isogeny_class: true,
        }
    }
}

impl HeegnerOptions {
    /// The time limit and cancel flag of a rank computation, other fields
    /// at their defaults.
    ///
    /// ```
    /// use std::time::Duration;
    /// use twofold::{RankOptions, heegner::HeegnerOptions};
    /// let o = HeegnerOptions::from_rank_options(&RankOptions::default().with_time_limit(Duration::from_secs(3)));
    /// assert_eq!(o.time_limit, Some(Duration::from_secs(3)));
    /// ```
    pub fn from_rank_options(o: &RankOptions) -> HeegnerOptions {
        HeegnerOptions { time_limit: o.time_limit, cancel: o.cancel.clone(), ..HeegnerOptions::default() }
    }

    /// The deadline (from `start` plus the time limit) and cancel flag as a
    /// work value, with the CPU-time cap counted from now on this thread.
    fn spend(&self, start: Instant) -> Spend {
        Spend::new(Work::until(self.time_limit.and_then(|d| start.checked_add(d)), self.cancel.clone()), self.cpu_time_limit)
    }
}

/// A generator of `E(Q)` modulo torsion found from a Heegner point.
///
/// ```
/// use malachite::Natural;
/// use twofold::Curve;
/// use twofold::heegner::{point_of_rank_one, HeegnerOptions};
/// // y^2 = x^3 - 25x: n = 5 is congruent; conductor 800 (Koblitz, ch. I)
/// let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
/// let r = point_of_rank_one(&e, &Natural::from(800u32), &HeegnerOptions::default()).unwrap().unwrap();
/// assert!(e.contains(&r.generator) && e.contains(&r.recognised_point));
/// assert!(r.discriminant < 0 && r.precision > 0);
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct HeegnerResult {
    /// A generator of `E(Q)` modulo torsion (saturated as `saturation`
    /// says), verified exactly on the curve, of infinite order.
    pub generator: Point,
    /// The rational point recognised first, verified exactly: a
    /// `divisor`-th part `(z + λ) / divisor` (`λ` a period) of the trace
    /// `z` of the Heegner points (or of twice the trace when only that is
    /// real); it is `± index · generator + torsion`.
    pub recognised_point: Point,
    /// `k` with `recognised_point = ± k generator + T`, `T` torsion,
    /// checked exactly; `None` if that check did not succeed.
    pub index: Option<u64>,
    /// The `k` with which `(z + λ) / k` gave `recognised_point`: the Heegner
    /// trace is (numerically) `k` times it up to torsion.
    pub divisor: u64,
    /// The multiplier `m` with which `m z` gave the point (1 on the optimal
    /// curve of the isogeny class).
    pub multiplier: u32,
    /// The discriminant `D` used.
    pub discriminant: i64,
    /// `beta` with `beta^2 = D mod 4N`.
    pub beta: i64,
    /// The class number of `D` (the number of Heegner points summed).
    pub class_number: usize,
    /// The working precision in bits that succeeded.
    pub precision: u64,
    /// The number of coefficients `a_n` computed.
    pub terms: usize,
    /// The canonical height of the generator (numerical; the normalisation
    /// of [`crate::heights`]).
    pub height: f64,
    /// `L'(E, 1) #E(Q)_tors^2 / (Ω ∏ c_p)`: the height of a generator that
    /// the Birch and Swinnerton-Dyer formula predicts if Sha is trivial.
    /// A heuristic guide for the precision only; `height / predicted_height`
    /// is `1 / #Sha` if the conjecture holds.
    pub predicted_height: f64,
    /// `L'(E, 1)` (numerical, with the error bound of [`crate::lseries`]).
    pub derivative: f64,
    /// The saturation status of `generator` (see [`Saturation`]).
    pub saturation: Saturation,
    /// The isogenous curve the series ran on and the degree of the isogeny
    /// that carried its point here (`None` when it ran on this curve).
    pub isogenous_curve: Option<(Curve, u64)>,
    /// Wall-clock time spent.
    pub elapsed: Duration,
}

fn err(kind: ErrorKind, msg: impl Into<String>) -> Error {
    Error::new(kind, msg)
}

/// The curve invariants the search needs, computed once.
#[derive(Clone)]
struct Setup {
    n: u64,
    local: Vec<LocalData>,
    bad_ap: Vec<(u64, i64)>,
    torsion_order: u64,
    derivative: f64,
    predicted: f64,
    slack: f64,
}

/// The invariants of `curve`, a global minimal model of the curve that
/// `data` describes (its local data, conductor and reduction types hold for
/// every minimal model): nothing is factored and Tate's algorithm is not
/// run again.
fn setup(curve: &Curve, data: &CurveData, work: &Work) -> Result<Option<Setup>, Error> {
    let conductor = data.conductor();
    let n = u64::try_from(conductor)
        .ok()
        .filter(|&n| n > 0 && n <= crate::lseries::MAX_CONDUCTOR)
        .ok_or_else(|| err(ErrorKind::TooLarge, format!("conductor {conductor} out of range for the Heegner method")))?;
    let rn = crate::rootno::root_number_of(data, &crate::arith::FactorLimits::within(work))?;
    if rn.global != -1 {
        return Ok(None);
    }
    let local = data.local().to_vec();
    let bad_ap = data.bad_prime_traces()?;
    let v = crate::lseries::special_values_of(data, -1, 1, work)?;
    let d1 = &v[1];
    if d1.value.abs() <= 1000.0 * d1.error {
        // analytic rank >= 3 (numerically): the Heegner points are torsion
        return Ok(None);
    }
    let (torsion_order, scale) = bsd_scale(curve, &local)?;
    let predicted = d1.value * scale;
    let slack = height_difference_bound(curve).max(1.0);
    Ok(Some(Setup { n, local, bad_ap, torsion_order, derivative: d1.value, predicted, slack }))
}

/// The torsion order `T` and `T^2 / (Ω ∏ c_p)` of the global minimal model
/// `curve` with local data `local`: `L'(E, 1)` times this is the height of a
/// generator that the Birch and Swinnerton-Dyer formula predicts for rank
/// one and trivial Sha.
fn bsd_scale(curve: &Curve, local: &[LocalData]) -> Result<(u64, f64), Error> {
    let primes: Vec<Natural> = local.iter().map(|d| d.prime.clone()).collect();
    let torsion_order = TorsionGroup::compute(curve, &primes).order() as u64;
    let omega = PeriodLattice::compute(curve, 64)?.real_period_f64();
    let tam: u64 = local.iter().map(|d| u64::from(d.tamagawa)).product();
    let t = torsion_order as f64;
    Ok((torsion_order, t * t / (omega * tam as f64)))
}

/// The candidate discriminants for level `n`, cheapest series first.
///
/// The cost of the series for `D` is proportional to `Σ a / sqrt|D|` over
/// the reduced forms `[a, b, c]` of discriminant `D`: the least `A / N` in
/// the Heegner class `[n] c` is the least norm in the class `c` shifted by
/// the fixed ideal `n` of norm `N`, so the sum over all classes is the sum
/// of the first coefficients of the reduced forms. This ranks every
/// fundamental `D` with `|D| <= 20000` satisfying the Heegner hypothesis
/// without computing `beta`; the forms are then built for the best `count`.
///
/// ```
/// use twofold::heegner::heegner_discriminants;
/// // level 37: D = -7 and -11 fail (37 is inert there), D = -67 and -163 have h = 1
/// let d = heegner_discriminants(37, 3).unwrap();
/// assert!(d.iter().all(|h| h.forms.iter().all(|f| f.a % 37 == 0)));
/// ```
pub fn heegner_discriminants(n: u64, count: usize) -> Result<Vec<HeegnerData>, Error> {
    let primes: Vec<u64> = crate::arith::factor_u64(n)?.into_iter().map(|(p, _)| p).collect();
    let mut ranked: Vec<(f64, i64)> = Vec::new();
    for d in (5i64..=20_000).map(|k| -k) {
        if !forms::heegner_hypothesis(d, &primes) || !forms::is_fundamental(d) {
            continue;
        }
        let sum: i128 = forms::reduced_forms(d).iter().map(|f| f.a).sum();
        ranked.push((sum as f64 / ((-d) as f64).sqrt(), d));
    }
    ranked.sort_by(|a, b| a.0.partial_cmp(&b.0).unwrap_or(std::cmp::Ordering::Equal));
    let mut found = Vec::new();
    for &(_, d) in &ranked {
        if found.len() >= count {
            break;
        }
        if let Some(h) = forms::heegner_data(d, n)? {
            found.push(h);
        }
    }
    found.sort_by(|a, b| a.cost(n).partial_cmp(&b.cost(n)).unwrap_or(std::cmp::Ordering::Equal));
    Ok(found)
}

/// A generator of `E(Q)` for a global minimal model `minimal` of conductor
/// `conductor` with root number `-1` and `L'(E, 1) != 0`, by the Heegner
/// point method (see the module documentation).
///
/// Returns `Ok(None)` when the method does not apply (root number `+1`, or
/// `L'(E, 1)` numerically zero) or when no point was recognised within the
/// precision and discriminant budgets; an error of kind
/// [`ErrorKind::Budget`] when the time limit passed or the work was
/// cancelled, [`ErrorKind::TooLarge`] for conductors above
/// [`crate::lseries::MAX_CONDUCTOR`] or series longer than
/// [`HeegnerOptions::max_terms`], [`ErrorKind::InvalidValue`] if the
/// conductor is not that of the curve or the model is not minimal.
///
/// Cost: the series has about `0.22 bits Σ A_i / sqrt|D|` terms (`A_i` a
/// multiple of `N`), each a complex product at the working precision, and
/// the coefficients cost `O(p^{1/4})` group operations per prime.
pub fn point_of_rank_one(minimal: &Curve, conductor: &Natural, opts: &HeegnerOptions) -> Result<Option<HeegnerResult>, Error> {
    let start = Instant::now();
    let budget = opts.spend(start);
    let data = CurveData::new(minimal, budget.work())?;
    if data.minimal().discriminant() != minimal.discriminant() {
        return Err(err(ErrorKind::InvalidValue, format!("the model {minimal} is not minimal")));
    }
    if data.conductor() != conductor {
        return Err(err(ErrorKind::InvalidValue, format!("the conductor of the curve is {}, not {conductor}", data.conductor())));
    }
    // the search runs on the data's minimal model (which may differ from
    // `minimal` by a change of minimal models); carry its points back
    Ok(point_on_model(&data, opts, start, &budget)?.map(|mut r| {
        r.generator = data.to_input(&r.generator);
        r.recognised_point = data.to_input(&r.recognised_point);
        r
    }))
}

/// [`point_of_rank_one`] for a curve whose data is known: the search runs
/// on the global minimal model of `data`, with its conductor, local data
/// and root number read from `data` (nothing is factored or recomputed).
/// The generator lies on [`CurveData::minimal`]; [`CurveData::to_input`]
/// carries it to the model the caller gave. Errors as there.
///
/// ```
/// use twofold::{Curve, CurveData, Work};
/// use twofold::heegner::{point_of_rank_one_of, HeegnerOptions};
/// // y^2 + y = x^3 - x, conductor 37, rank 1 (Cremona 1997, Table 1)
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let r = point_of_rank_one_of(&d, &HeegnerOptions::default()).unwrap().unwrap();
/// assert!(d.minimal().contains(&r.generator) && !r.generator.is_infinity());
/// ```
pub fn point_of_rank_one_of(data: &CurveData, opts: &HeegnerOptions) -> Result<Option<HeegnerResult>, Error> {
    let start = Instant::now();
    point_on_model(data, opts, start, &opts.spend(start))
}

/// The search on the global minimal model of the curve of `data`, or on an
/// isogenous curve whose generator is predicted to be smaller (see
/// [`class`]).
fn point_on_model(data: &CurveData, opts: &HeegnerOptions, start: Instant, budget: &Spend) -> Result<Option<HeegnerResult>, Error> {
    let Some(s) = setup(data.minimal(), data, budget.work())? else { return Ok(None) };
    if opts.use_isogeny_class {
        if let Some(r) = class::point_through_class(data, &s, opts, start, budget)? {
            return Ok(Some(r));
        }
    }
    point_with_setup(data, &s, opts, start, budget)
}

/// The twist route (where it applies), then the direct series, on the
/// minimal model of `data` with its invariants `s`.
fn point_with_setup(data: &CurveData, s: &Setup, opts: &HeegnerOptions, start: Instant, budget: &Spend) -> Result<Option<HeegnerResult>, Error> {
    let minimal = data.minimal();
    if opts.use_twist {
        if let Some(t) = twist::smallest_twist(minimal, s.n)? {
            check_twist(minimal, s, &t)?;
            if let Some(r) = search(data, s, opts, budget, start, Some(&t))? {
                return Ok(Some(r));
            }
        }
    }
    search(data, s, opts, budget, start, None)
}

/// `a_p(E) = χ_d(p) a_p(E0)` for the primes below 300: the twist route
/// rests on it; a mismatch is an internal error.
fn check_twist(curve: &Curve, s: &Setup, t: &twist::Twist) -> Result<(), Error> {
    let never = || false;
    let a = traces::dirichlet_coefficients_fast(curve, &s.bad_ap, 300, &never);
    let b = traces::dirichlet_coefficients_fast(&t.base, &t.base_bad, 300, &never);
    let (Some(a), Some(b)) = (a, b) else { return Err(Error::internal("the Heegner twist route", "coefficients not computed")) };
    for p in 2..=300u64 {
        if crate::arith::is_prime_u64(p) {
            let chi = i64::from(crate::arith::kronecker_i64(t.d, p));
            if a[p as usize] != chi * b[p as usize] {
                return Err(Error::internal(
                    "the Heegner twist route",
                    format!("a_{p} = {} is not χ({p}) a_{p} = {} for the twist by {}", a[p as usize], chi * b[p as usize], t.d),
                ));
            }
        }
    }
    Ok(())
}

/// The smallest `e >= 1` (up to 24) with `e Λ0 / g(χ) ⊂ Λ(E)`, numerically
/// (`Λ0` the lattice of the base curve): the twisted series is known
/// modulo `Λ0 / g(χ)` (up to the index of `Λ0` in the optimal lattice, met
/// by the further multipliers).
fn twist_multiplier(t: &twist::Twist, lat: &Lattice, bits: u64) -> Result<Option<u32>, Error> {
    let pl = PeriodLattice::compute(&t.base, bits)?;
    let g = crate::heights::real::sqrt(&fi(t.d.abs(), bits), bits);
    let over_g = |re: &Float, im: &Float| -> Cx {
        if t.d > 0 {
            Cx::new(re / &g, im / &g)
        } else {
            // (re + i im) / (i sqrt|d|) = (im - i re) / sqrt|d|
            Cx::new(im / &g, -(re / &g))
        }
    };
    let v1 = over_g(&pl.omega1, &Float::from(0u32));
    let v2 = over_g(&pl.omega2_re, &pl.omega2_im);
    let (a1, b1) = lat.coordinates(&v1);
    let (a2, b2) = lat.coordinates(&v2);
    let c = [to_f64(&a1), to_f64(&b1), to_f64(&a2), to_f64(&b2)];
    Ok((1..=24u32).find(|&e| c.iter().all(|x| ((x * e as f64) - (x * e as f64).round()).abs() < 1e-9)))
}

/// `Σ_plus z0 - Σ_minus z0` over the twisted evaluation points, the
/// Atkin-Lehner moved ones through `z0(τ) = ε (z0(W τ) - c)` (see
/// [`twist::twisted_forms`]).
fn twisted_sum(coeffs: &[i64], p: &twist::TwistPoints, disc: i64, t: &twist::Twist, bits: u64, budget: &Spend) -> Result<Cx, Error> {
    let wp = bits + 32;
    let zero = || Cx::real(fi(0, wp));
    let sum = |f: &[forms::QuadraticForm]| -> Result<Cx, Error> {
        if f.is_empty() {
            Ok(zero())
        } else {
            analytic::modular_sum(coeffs, f, disc, bits, budget)
        }
    };
    let mut total = sum(&p.plus)?.sub(&sum(&p.minus)?);
    let moved = p.plus_w.len() as i64 - p.minus_w.len() as i64;
    if !p.plus_w.is_empty() || !p.minus_w.is_empty() {
        let w = sum(&p.plus_w)?.sub(&sum(&p.minus_w)?);
        let eps = -i64::from(t.base_sign);
        let mut part = if eps > 0 { w } else { Cx::new(-&w.re, -&w.im) };
        if eps < 0 && moved != 0 {
            // c = 2 z0(i / sqrt N0); ε (Σ z0(Wτ) - (#plus_w - #minus_w) c)
            let n0 = t.base_conductor as i128;
            let c = analytic::modular_sum(coeffs, &[forms::QuadraticForm { a: n0, b: 0, c: 1 }], -4 * t.base_conductor as i64, bits, budget)?;
            let k = fi(2 * moved, wp);
            part = part.add(&Cx::new(&c.re * &k, &c.im * &k));
        }
        total = total.add(&part);
    }
    Ok(total)
}

/// The Heegner forms `forms` of level `n`, each replaced by the form of
/// least first coefficient among its `Γ0(n)`-orbit and the orbit of its
/// image under the Atkin-Lehner involution `W_n: τ -> -1/(n τ)` (the form
/// `[C n, -B, A / n]`, see [`twist::atkin_lehner`]). The newform is an
/// eigenform of `W_n` with eigenvalue `ε = -w` (Atkin and Lehner 1970), and
/// the Heegner route runs only for root number `w = -1`, so `ε = +1` and
/// `z(W_n τ) = z(τ) + c` with the constant `c = 0` (take `τ` the fixed
/// point `i / sqrt n`): the series at the image has the same value modulo
/// the period lattice and needs fewer terms when its first coefficient is
/// smaller (its point lies higher in the upper half plane).
fn nearer_to_infinity(forms: &[forms::QuadraticForm], n: u64) -> Vec<forms::QuadraticForm> {
    let n = i128::from(n);
    forms
        .iter()
        .map(|f| match twist::atkin_lehner(f, n).and_then(|w| twist::raised(&w, n)) {
            Some(w) if w.a < f.a && w.discriminant() == f.discriminant() => w,
            _ => *f,
        })
        .collect()
}

/// The evaluation points of the Heegner sum with each class paired with its
/// conjugate: for the Heegner form `f = [A, B, C]` (`N | A`,
/// `B = beta mod 2N`) the point `σ` of `[C N, B, A / N]` is `W_N(-conj τ)`
/// (`τ` the root of `f`), so `z(σ) = z(-conj τ) = conj z(τ)` (the
/// Atkin-Lehner sign is `+1` with the constant 0, see [`nearer_to_infinity`],
/// and the `a_n` are real). That form is again a Heegner form for `beta`,
/// and Heegner forms for one `beta` are equivalent under `Γ0(N)` exactly
/// when they are under SL2(Z) (Gross, Kohnen and Zagier, Heegner points
/// and derivatives of L-series II, Math. Ann. 278 (1987), §I.1), so the
/// class listed for its reduced form has the value `conj z(τ)` modulo the
/// periods. The two values of a pair sum to `2 Re z(τ)`: one series per
/// pair, at whichever of the two points (each moved by
/// [`nearer_to_infinity`]) has the smaller first coefficient; a class
/// paired with itself is summed whole. Falls back to every form whole when
/// the pairing is not an involution of the list (never seen; overflow).
fn paired_evaluations(forms: &[forms::QuadraticForm], n: u64) -> Vec<analytic::Evaluation> {
    let moved = nearer_to_infinity(forms, n);
    let whole = || moved.iter().map(|&f| analytic::Evaluation::whole(f)).collect();
    let n128 = i128::from(n);
    let reduced: Vec<forms::QuadraticForm> = forms.iter().map(|f| f.reduced()).collect();
    let mut partner = Vec::with_capacity(forms.len());
    for f in forms {
        let Some(a) = f.c.checked_mul(n128) else { return whole() };
        if f.a % n128 != 0 {
            return whole();
        }
        let g = forms::QuadraticForm { a, b: f.b, c: f.a / n128 }.reduced();
        match reduced.iter().position(|r| *r == g) {
            Some(j) => partner.push(j),
            None => return whole(),
        }
    }
    if (0..forms.len()).any(|i| partner[partner[i]] != i) {
        return whole();
    }
    let mut out = Vec::with_capacity(forms.len());
    for (i, &j) in partner.iter().enumerate() {
        if j == i {
            out.push(analytic::Evaluation::whole(moved[i]));
        } else if i < j {
            let form = if moved[j].a < moved[i].a { moved[j] } else { moved[i] };
            out.push(analytic::Evaluation { form, twice_real: true });
        }
    }
    out
}

/// The series, in one of two forms: the Heegner points of level `N` with
/// the coefficients of `E`, or the twisted sum with those of the base.
enum Series {
    Direct(Vec<analytic::Evaluation>),
    Twisted { points: twist::TwistPoints, disc: i64, n0: u64 },
}

impl Series {
    fn terms(&self, h: &HeegnerData, bits: u64) -> usize {
        let (forms, disc): (Vec<&forms::QuadraticForm>, i64) = match self {
            Series::Direct(f) => (f.iter().map(|e| &e.form).collect(), h.discriminant),
            Series::Twisted { points, disc, .. } => (points.all().collect(), *disc),
        };
        let fixed_point = match self {
            // the constant of the Atkin-Lehner move: z0(i / sqrt N0), D = -4 N0
            Series::Twisted { n0, .. } => analytic::terms_needed(*n0 as f64, 4.0 * *n0 as f64, bits),
            Series::Direct(_) => 1,
        };
        forms.iter().map(|f| analytic::terms_needed(f.a as f64, (-disc) as f64, bits)).max().unwrap_or(1).max(fixed_point)
    }

    fn total_terms(&self, h: &HeegnerData, bits: u64) -> usize {
        let (forms, disc): (Vec<&forms::QuadraticForm>, i64) = match self {
            Series::Direct(f) => (f.iter().map(|e| &e.form).collect(), h.discriminant),
            Series::Twisted { points, disc, .. } => (points.all().collect(), *disc),
        };
        forms.iter().map(|f| analytic::terms_needed(f.a as f64, (-disc) as f64, bits)).sum()
    }
}

#[allow(clippy::too_many_arguments)]
fn search(
    data: &CurveData,
    s: &Setup,
    opts: &HeegnerOptions,
    budget: &Spend,
    start: Instant,
    tw: Option<&twist::Twist>,
) -> Result<Option<HeegnerResult>, Error> {
    let minimal = data.minimal();
    // more candidates than are tried: the plans are ranked by the length
    // of their series once the evaluation points are chosen
    let wanted = opts.max_discriminants.max(1);
    let discs = heegner_discriminants(s.n, wanted * 4)?;
    let mut plans: Vec<(HeegnerData, Series)> = Vec::new();
    for h in discs {
        let series = match tw {
            None => Series::Direct(paired_evaluations(&h.forms, s.n)),
            Some(t) => match twist::twisted_forms(&h.forms, t.d, t.base_conductor) {
                Some(points) => Series::Twisted { points, disc: h.discriminant * t.d * t.d, n0: t.base_conductor },
                None => continue,
            },
        };
        plans.push((h, series));
    }
    if tw.is_some() {
        // the total length of the twisted series decides (a few points
        // near cusps not equivalent to infinity under Γ0(N0) dominate it)
        plans.sort_by_key(|(h, p)| p.total_terms(h, 100));
    } else {
        // the longest series sets the number of coefficients (about 1 µs
        // each near 10^7), the total the work of the sums (about 0.2 µs a
        // term at 900 bits): rank by both at a common precision
        plans.sort_by_key(|(h, p)| p.terms(h, 512) + p.total_terms(h, 512) / 5);
    }
    plans.truncate(wanted);
    let mut coeffs: Vec<i64> = Vec::new();
    let primes: Vec<Natural> = s.local.iter().map(|d| d.prime.clone()).collect();
    let tors: Vec<Point> = TorsionGroup::compute(minimal, &primes).points().to_vec();
    let b2 = Rational::from(minimal.b_invariants()[0].clone());
    for (h, series) in &plans {
        let mut mult_base = 1u32;
        // bits for x = a/d^2 of height about hhat + slack, with the loss
        // near the pole of ℘ (see the module documentation)
        let mut target_height = s.predicted.max(0.5) + s.slack;
        let mut tried_torsion = false;
        loop {
            if budget.exhausted() {
                return Err(err(ErrorKind::Budget, "time budget spent in the Heegner point search"));
            }
            let bits = ((target_height / std::f64::consts::LN_2) * 2.6 + 24.0).ceil() as u64;
            let bits = bits.min(opts.max_precision.max(64));
            let bits = match series {
                Series::Direct(f) => bits.max(analytic::double_double_capacity(&f.iter().map(|e| e.form).collect::<Vec<_>>(), h.discriminant)),
                Series::Twisted { .. } => bits,
            };
            let m = series.terms(h, bits);
            let h = &*h;
            if m > opts.max_terms {
                return Err(err(ErrorKind::TooLarge, format!("the series needs {m} coefficients, above the limit {}", opts.max_terms)));
            }
            let (curve_for_coeffs, bad) = match tw {
                Some(t) => (&t.base, &t.base_bad),
                None => (minimal, &s.bad_ap),
            };
            if coeffs.len() < m + 1 {
                // extended in place: the points are counted only at the new primes
                traces::extend_dirichlet_coefficients(&mut coeffs, curve_for_coeffs, bad, m, &|| budget.exhausted())
                    .ok_or_else(|| err(ErrorKind::Budget, "time budget spent on the coefficients"))?;
            }
            let pl = PeriodLattice::compute(minimal, bits + 32)?;
            let lat = Lattice::new(&pl, bits + 32);
            let z = match series {
                Series::Direct(f) => analytic::modular_sum_at(&coeffs, f, h.discriminant, bits, budget)?,
                Series::Twisted { points, disc, .. } => {
                    // invariant: Series::Twisted is only built when a twist `tw` was found
                    let t = tw.expect("twisted series without a twist");
                    if mult_base == 1 {
                        match twist_multiplier(t, &lat, bits.max(128))? {
                            Some(e) => mult_base = e,
                            None => break,
                        }
                    }
                    let diff = twisted_sum(&coeffs, points, *disc, t, bits, budget)?;
                    let wp = bits + 32;
                    let g = crate::heights::real::sqrt(&fi(t.d.abs(), wp), wp);
                    if t.d > 0 {
                        Cx::new(&diff.re / &g, &diff.im / &g)
                    } else {
                        Cx::new(&diff.im / &g, -(&diff.re / &g))
                    }
                }
            };
            if !tried_torsion {
                tried_torsion = true;
                if lat.is_near_torsion(&z, bits / 2, 12 * mult_base as i64) {
                    break; // this D gives a torsion point: next discriminant
                }
            }
            let wp = bits + 32;
            let all_shifts = torsion_shifts(minimal, &tors, &lat, &b2, bits);
            for mult in (1..=opts.max_multiplier.max(1)).map(|k| k * mult_base) {
                let zm = Cx::new(&z.re * fi(mult as i64, wp), &z.im * fi(mult as i64, wp));
                let zt = match lat.on_real_locus(&zm, bits / 3) {
                    Some(w) => w,
                    None => Cx::real(&zm.re * fi(2, wp)),
                };
                if lat.is_near_torsion(&zt, bits / 2, 1) {
                    continue;
                }
                // the trace is (index) times a generator up to torsion: try
                // its k-th parts (zt + i w1 + j w2) / k on the real locus,
                // which need fewer bits than the trace itself
                for k in divisors_to_try(opts.max_divisor) {
                    // k R = trace + T with T rational torsion: the parts
                    // (trace + log T + λ) / k; only needed when k and the
                    // torsion order have a common factor (else T = k T')
                    let shifts = if crate::arith::gcd_u64(k, tors.len() as u64) > 1 { &all_shifts[..] } else { &all_shifts[..1] };
                    for zs in shifts.iter().map(|t| zt.add(t)) {
                        for (i, j) in (0..k).flat_map(|i| (0..k).map(move |j| (i, j))) {
                            if budget.exhausted() {
                                return Err(err(ErrorKind::Budget, "time budget spent recognising the point"));
                            }
                            let w = lat.shifted(&zs, i as i64, j as i64);
                            let w = Cx::new(&w.re / fi(k as i64, wp), &w.im / fi(k as i64, wp));
                            let Some(zr) = lat.on_real_locus(&w, bits / 3) else { continue };
                            if lat.is_near_torsion(&zr, bits / 2, 1) {
                                continue;
                            }
                            let p = lat.weierstrass_p(&zr);
                            let x = &p.re - Float::from_rational_prec_ref(&b2, wp).0 / fi(12, wp);
                            if let Some(pt) = recognise(minimal, &x, bits) {
                                let (q, _) = divide_out(minimal, &tors, &all_shifts, &lat, &b2, zr, pt.clone(), bits, budget);
                                let class_number = h.forms.len();
                                return finish(data, s, h, class_number, pt, q, mult, k, bits, coeffs.len() - 1, budget, start).map(Some);
                            }
                        }
                    }
                }
            }
            if bits >= opts.max_precision {
                break;
            }
            target_height *= 2.0;
        }
    }
    Ok(None)
}

/// The `k` whose `k`-th parts of the trace are tried: every `k <= max`,
/// then `2^a` and `3 * 2^a` up to `8 max` (with Sha of order 4 the trace
/// was 64 times the generator on y^2 = x^3 - 959^2 x).
fn divisors_to_try(max: u64) -> impl Iterator<Item = u64> {
    let max = max.max(1);
    let extra = (5..16).flat_map(|a| [1u64 << a, 3u64 << (a - 1)]).filter(move |&k| k > max && k <= 8 * max);
    (1..=max).chain(extra)
}

/// Divides the verified point `pt` (with real elliptic logarithm `z`) by
/// small primes `l` as often as possible: the candidates for `Q` with
/// `l Q = ± pt + T` have logarithms `(z + i w1 + j w2) / l`; those on the
/// real locus are mapped by `℘`, recognised, and `l Q` is compared with
/// `± pt + T` exactly (T running over the rational torsion). Returns the
/// final point and the product of the primes divided out.
#[allow(clippy::too_many_arguments)]
fn divide_out(curve: &Curve, tors: &[Point], tors_shifts: &[Cx], lat: &Lattice, b2: &Rational, z: Cx, pt: Point, bits: u64, budget: &Spend) -> (Point, u64) {
    let wp = lat.precision();
    let (mut cur, mut zc, mut k) = (pt, z, 1u64);
    'primes: for l in [2u64, 3, 5, 7, 11, 13] {
        // l Q = ± cur + T: the candidates (z + log T + λ) / l; the shift by
        // log T matters only when l divides the torsion order
        let shifts = if (tors.len() as u64).is_multiple_of(l) { tors_shifts } else { &tors_shifts[..1] };
        loop {
            if budget.exhausted() {
                break 'primes;
            }
            let mut found = None;
            'cand: for s in shifts {
                let zs = zc.add(s);
                for (i, j) in (0..l).flat_map(|i| (0..l).map(move |j| (i, j))) {
                    let w = lat.shifted(&zs, i as i64, j as i64);
                    let w = Cx::new(&w.re / fi(l as i64, wp), &w.im / fi(l as i64, wp));
                    let Some(wr) = lat.on_real_locus(&w, bits / 3) else { continue };
                    let p = lat.weierstrass_p(&wr);
                    let x = &p.re - Float::from_rational_prec_ref(b2, wp).0 / fi(12, wp);
                    let Some(q) = recognise(curve, &x, bits) else { continue };
                    let lq = curve.multiple(&q, l as i64);
                    let neg = curve.negate(&cur);
                    let hit = lq == cur || lq == neg || tors.iter().any(|t| {
                        let s = curve.add(&lq, t);
                        s == cur || s == neg
                    });
                    if hit {
                        found = Some((q, wr));
                        break 'cand;
                    }
                }
            }
            match found {
                Some((q, wr)) => {
                    cur = q;
                    zc = wr;
                    k *= l;
                }
                None => break,
            }
        }
    }
    (cur, k)
}

#[allow(clippy::too_many_arguments)]
fn finish(
    data: &CurveData,
    s: &Setup,
    h: &HeegnerData,
    class_number: usize,
    pt: Point,
    divided: Point,
    mult: u32,
    divisor: u64,
    bits: u64,
    terms: usize,
    budget: &Spend,
    start: Instant,
) -> Result<HeegnerResult, Error> {
    let curve = data.minimal();
    let sat_opts = SaturationOptions::within(budget.work());
    let prec = 128u64.max(bits / 4);
    let basis = mordell_weil_basis_of(data, std::slice::from_ref(&divided), prec, &sat_opts)?;
    let generator = basis.generators.first().cloned().ok_or_else(|| err(ErrorKind::InvalidValue, "the point found is torsion"))?;
    if !curve.contains(&generator) || curve.torsion_order_of(&generator).is_some() {
        return Err(err(ErrorKind::InvalidValue, "internal check failed: the generator is not a point of infinite order"));
    }
    let hg = canonical_height_of(data, &generator, prec)?;
    let hp = canonical_height_of(data, &pt, prec)?;
    let ratio = to_f64(&(&hp / &hg));
    let k = ratio.sqrt().round();
    let index = if k >= 1.0 && k < 1e9 {
        let k = k as i64;
        let kg = curve.multiple(&generator, k);
        let torsion = TorsionGroup::compute(curve, &s.local.iter().map(|d| d.prime.clone()).collect::<Vec<_>>());
        let ok = torsion.points().iter().any(|t| {
            let a = curve.add(&kg, t);
            a == pt || a == curve.negate(&pt)
        }) || kg == pt
            || kg == curve.negate(&pt);
        ok.then_some(k as u64)
    } else {
        None
    };
    let _ = s.torsion_order;
    Ok(HeegnerResult {
        generator,
        recognised_point: pt,
        index,
        multiplier: mult,
        divisor,
        discriminant: h.discriminant,
        beta: h.beta,
        class_number,
        precision: bits,
        terms,
        height: to_f64(&hg),
        predicted_height: s.predicted,
        derivative: s.derivative,
        saturation: basis.saturation,
        isogenous_curve: None,
        elapsed: start.elapsed(),
    })
}

impl Lattice {
    /// Whether `k z` is within `2^-tol_bits` (in lattice coordinates) of a
    /// lattice point for some `1 <= k <= max_k`: `z` is then (numerically)
    /// a torsion point.
    pub(crate) fn is_near_torsion(&self, z: &Cx, tol_bits: u64, max_k: i64) -> bool {
        let (s, t) = self.coordinates(z);
        let tol = 2f64.powi(-(tol_bits.min(1000) as i32));
        (1..=max_k).any(|k| {
            let kf = fi(k, self.precision());
            let a = &s * &kf;
            let b = &t * &kf;
            let da = (&a - fi(round_f(&a), self.precision())).abs();
            let db = (&b - fi(round_f(&b), self.precision())).abs();
            to_f64(&da) < tol && to_f64(&db) < tol
        })
    }
}

fn round_f(x: &Float) -> i64 {
    let v = to_f64(x);
    if v.is_finite() && v.abs() < 1e15 {
        v.round() as i64
    } else {
        0
    }
}

#[cfg(test)]
mod tests;
