//! The driver: LLL, index bound, saturation, and the summary type.

use super::canonical::{check_minimal, height_unchecked, naive_height};
use super::lattice::{combination, determinant, lll_unchecked};
use super::real::{fi, fz, ln, to_f64};
use super::saturation::{aux_limit, siksek_test, AuxPrimes, SiksekOutcome};
use crate::arith::primes_up_to;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::local::{CurveData, LocalData};
use crate::search::{search_curve, SearchLimits};
use crate::torsion::TorsionGroup;
use malachite::base::num::arithmetic::traits::Abs;
use malachite::{Float, Natural};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::Instant;

/// Budgets for [`mordell_weil_basis`], set with the `with_...` builders:
/// the largest naive height `max(|m|, k^2)` (for `x = m/k^2`) searched for
/// points of small height (default 200,000; the lower bound for heights of
/// non-torsion points, and the candidates for division by p), the largest
/// auxiliary prime q of Siksek's test (default 20,000; raised to about
/// `50 p log p` for the test at a large p, which needs `p | #E(F_q)`), the largest prime p
/// for which p-saturation is attempted (default 1,000; primes between it
/// and the index bound stay unproven), and a deadline and cancel flag
/// ([`SaturationOptions::within`] takes them from a `Work`), past which the
/// result is returned unproven.
///
/// ```
/// use twofold::{Curve, CurveData, Point, Work};
/// use twofold::heights::{mordell_weil_basis_of, SaturationOptions};
/// // y^2 + y = x^3 - x: (0,0) generates (Cremona 1997; from memory)
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let o = SaturationOptions::default().with_max_saturation_prime(1_000).with_max_aux_prime(20_000);
/// let b = mordell_weil_basis_of(&d, &[Point::from_ints(0, 0)], 96, &o).unwrap();
/// assert!(b.saturation.is_saturated());
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct SaturationOptions {
    /// The largest naive height `max(|m|, k^2)` (for `x = m/k^2`) searched
    /// for points of small height (the lower bound for heights of
    /// non-torsion points, and the candidates for division by p).
    pub(crate) max_search_height: u64,
    /// The largest auxiliary prime q used in Siksek's test (at a prime p
    /// with `50 p log p` above it, that bound instead: see
    /// `saturation::aux_limit`).
    pub(crate) max_aux_prime: u64,
    /// The largest prime p for which p-saturation is attempted; primes
    /// between this and the index bound stay unproven.
    pub(crate) max_saturation_prime: u64,
    /// Stop (with an unproven result) once this instant has passed.
    pub(crate) deadline: Option<Instant>,
    /// Stop (with an unproven result) once this flag is set.
    pub(crate) cancel: Option<Arc<AtomicBool>>,
}

impl SaturationOptions {
    /// Sets the largest naive height searched for small points.
    pub fn with_max_search_height(mut self, v: u64) -> Self {
        self.max_search_height = v;
        self
    }
    /// Sets the largest auxiliary prime of Siksek's test.
    pub fn with_max_aux_prime(mut self, v: u64) -> Self {
        self.max_aux_prime = v;
        self
    }
    /// Sets the largest prime p for which p-saturation is attempted.
    pub fn with_max_saturation_prime(mut self, v: u64) -> Self {
        self.max_saturation_prime = v;
        self
    }
    crate::budget::deadline_and_cancel_setters!();
    /// The default options within the deadline and cancellation flag of `work`.
    ///
    /// ```
    /// use twofold::{heights::SaturationOptions, Work};
    /// let o = SaturationOptions::within(&Work::unlimited());
    /// assert!(format!("{o:?}").contains("cancel: None"));
    /// ```
    pub fn within(work: &crate::budget::Work) -> SaturationOptions {
        SaturationOptions { deadline: work.deadline(), cancel: work.cancel_flag().cloned(), ..SaturationOptions::default() }
    }
    fn out_of_time(&self) -> bool {
        self.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed)) || self.deadline.is_some_and(|d| Instant::now() >= d)
    }
}

impl Default for SaturationOptions {
    fn default() -> Self {
        SaturationOptions { max_search_height: 200_000, max_aux_prime: 20_000, max_saturation_prime: 1_000, deadline: None, cancel: None }
    }
}

/// What is known about the saturation of the generators' span.
///
/// `index_bound` rests on numerical heights (used with a relative safety
/// margin of 1e-6) and on the bound of [`local_height_bound`] for the
/// difference between the naive and the canonical height (exact at the
/// finite primes, numerical with a margin at infinity; Silverman's bound of
/// [`height_difference_bound`] only as a fallback); each p-saturation claim
/// in `proven` is exact (Siksek's test with exact reductions modulo primes).
///
/// ```ignore
/// // (an illustration only: the struct is non-exhaustive, so its values
/// // come from the library, never from a struct expression)
/// use twofold::heights::Saturation;
/// let s = Saturation { index_bound: Some(1), proven: vec![], unproven: vec![], untested_above: None, divisions: 0, note: String::new() };
/// assert!(s.is_saturated());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct Saturation {
    /// An upper bound B for the index of the span of the generators (and
    /// torsion) in its saturation; `None` when no bound was obtained.
    pub index_bound: Option<u64>,
    /// The primes p <= B at which p-saturation is proven.
    pub proven: Vec<u64>,
    /// The primes p <= B tried and left unproven.
    pub unproven: Vec<u64>,
    /// When set to `m`, every prime `p` with `m < p <= index_bound` is
    /// unproven as well (above the budget, not tried, not listed).
    pub untested_above: Option<u64>,
    /// How many times a generator was replaced by a p-th part.
    pub divisions: usize,
    /// A human-readable account (which step failed, budgets).
    pub note: String,
}

impl Saturation {
    /// No index bound was obtained (`note` says why).
    fn unbounded(divisions: usize, note: impl Into<String>) -> Saturation {
        Saturation { index_bound: None, proven: vec![], unproven: vec![], untested_above: None, divisions, note: note.into() }
    }

    /// Whether saturation at every prime up to the index bound is proven.
    pub fn is_saturated(&self) -> bool {
        self.index_bound.is_some() && self.unproven.is_empty() && self.untested_above.is_none()
    }
}

impl std::fmt::Display for Saturation {
    /// One sentence: "saturated at all primes <= B (proven; B numerical)",
    /// or the primes left open.
    ///
    /// ```ignore
    /// // (an illustration only: the struct is non-exhaustive, so its values
    /// // come from the library, never from a struct expression)
    /// use twofold::heights::Saturation;
    /// let s = Saturation { index_bound: Some(3), proven: vec![2, 3], unproven: vec![], untested_above: None, divisions: 0, note: String::new() };
    /// assert_eq!(s.to_string(), "saturated at all primes <= 3 (each proven by Siksek's test; the bound 3 is numerical with margins)");
    /// ```
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.index_bound {
            None => write!(f, "saturation not established: no index bound ({})", self.note.trim_end_matches("; ")),
            Some(b) if self.unproven.is_empty() && self.untested_above.is_none() => {
                if b < 2 {
                    write!(f, "saturated (index bound 1, numerical with margins)")
                } else {
                    write!(f, "saturated at all primes <= {b} (each proven by Siksek's test; the bound {b} is numerical with margins)")
                }
            }
            Some(b) => {
                let list: Vec<String> = self.unproven.iter().map(|p| p.to_string()).collect();
                write!(f, "index bound {b}; saturation unproven at p = {}", list.join(", "))?;
                if let Some(m) = self.untested_above {
                    write!(f, " and at every prime in ({m}, {b}]")?;
                }
                Ok(())
            }
        }
    }
}

/// A basis of a saturated subgroup of E(Q)/E(Q)_tors with its heights.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::{mordell_weil_basis, SaturationOptions};
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(); // y^2 + y = x^3 - x
/// let local = bad_primes_data(&e, &[Natural::from(37u32)]).unwrap();
/// let b = mordell_weil_basis(&e, &[Point::from_ints(1, 0)], &local, 64, &SaturationOptions::default()).unwrap();
/// // (1, 0) = 2 (0, 0) is not 2-saturated; it is replaced by a half.
/// assert!(b.saturation.is_saturated());
/// assert_eq!(b.saturation.divisions, 1);
/// assert!((b.regulator_f64() - 0.0511114082).abs() < 1e-8);
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct MordellWeilBasis {
    /// The (globally minimal) model the points lie on.
    pub curve: Curve,
    /// The generators, LLL-reduced for the height pairing, each verified
    /// exactly on the curve.
    pub generators: Vec<Point>,
    /// Their canonical heights (numerical).
    pub heights: Vec<Float>,
    /// The height pairing matrix (numerical).
    pub gram: Vec<Vec<Float>>,
    /// The regulator: the determinant of `gram` (numerical).
    pub regulator: Float,
    /// The saturation status (see [`Saturation`] for what is proven).
    pub saturation: Saturation,
    /// The number of input points dropped as dependent (each dependency
    /// checked exactly: the combination is a torsion point).
    pub dependencies_removed: usize,
    /// The precision in bits of the numerical values.
    pub precision: u64,
}

impl MordellWeilBasis {
    /// The height normalisation used: `hhat(P) = lim h(x(nP))/n^2` with
    /// `h(a/b) = log max(|a|, |b|)`, the one of the Birch and
    /// Swinnerton-Dyer formula (twice that of some older texts).
    pub const NORMALISATION: &'static str =
        "hhat(P) = lim_n log max(|num x(nP)|, den x(nP)) / n^2 (BSD normalisation; (0,0) on y^2+y=x^3-x has height 0.0511...)";

    /// The regulator as an f64.
    pub fn regulator_f64(&self) -> f64 {
        to_f64(&self.regulator)
    }
}

/// Silverman's lower bound: `hhat(P) >= h(x(P)) - bound` for all P in our
/// normalisation, with `bound = h(j)/4 + log|Delta|/6 + 1.946` (Silverman,
/// Math. Comp. 55 (1990), Theorem 1, doubled; constants from memory).
pub fn height_difference_bound(curve: &Curve) -> f64 {
    let j = curve.j_invariant();
    let hj = to_f64(&naive_height(&j, 64));
    let ld = to_f64(&ln(&fz(&curve.discriminant().abs(), 64), 64));
    hj / 4.0 + ld / 6.0 + 1.946
}

/// A bound `B` with `hhat(P) >= h(x(P)) - B` for every P on the globally
/// minimal model `curve`, from the local decomposition of the canonical
/// height: at each bad prime the largest correction `alpha_p log p` allowed
/// by the Kodaira symbol and the Tamagawa number (0 when `c_p = 1`), which is
/// exact; at infinity `log 2 - (1/3) log inf G` with
/// `G(x) = max(|num(x)|, |F(x)|/2) / max(|x|, 3/2)^4` over the real locus,
/// where each term of the series for the archimedean local height is at
/// least `log G`. The infimum is taken on a dense grid in f64 and divided
/// by 2 for safety (numerical with a margin, not a proof).
pub fn local_height_bound(curve: &Curve, local: &[LocalData]) -> f64 {
    finite_height_bound(local) + archimedean_height_bound(curve)
}

/// The archimedean part of [`local_height_bound`]: the whole bound for
/// points that meet the identity component of the Néron model at every
/// bad prime (their finite local corrections are 0).
fn archimedean_height_bound(curve: &Curve) -> f64 {
    2f64.ln() - archimedean_log_inf(curve) / 3.0
}

/// The finite part of [`local_height_bound`] (exact).
fn finite_height_bound(local: &[LocalData]) -> f64 {
    use crate::local::{Kodaira, Reduction};
    let mut b = 0f64;
    for d in local {
        if d.tamagawa <= 1 {
            continue;
        }
        let alpha = match d.kodaira {
            Kodaira::In(n) => {
                let n = f64::from(n);
                if d.reduction == Reduction::SplitMultiplicative {
                    (n / 2.0).floor() * (n - (n / 2.0).floor()) / n
                } else {
                    n / 4.0
                }
            }
            Kodaira::III => 0.5,
            Kodaira::IV => 2.0 / 3.0,
            Kodaira::I0Star => 1.0,
            Kodaira::InStar(n) => (f64::from(n) + 4.0) / 4.0,
            Kodaira::IVStar => 4.0 / 3.0,
            Kodaira::IIIStar => 1.5,
            _ => 0.0,
        };
        b += alpha * to_f64(&ln(&fz(&malachite::Integer::from(d.prime.clone()), 64), 64));
    }
    b
}

fn archimedean_log_inf(curve: &Curve) -> f64 {
    let bv: Vec<f64> = curve.b_invariants().iter().map(|c| c.to_string().parse::<f64>().unwrap_or(f64::INFINITY)).collect();
    let (b2, b4, b6, b8) = (bv[0], bv[1], bv[2], bv[3]);
    if !bv.iter().all(|v| v.is_finite()) {
        return f64::NEG_INFINITY;
    }
    let f = |x: f64| ((4.0 * x + b2) * x + 2.0 * b4) * x + b6;
    let num = |x: f64| ((x * x - b4) * x - 2.0 * b6) * x - b8;
    let g = |x: f64| {
        let m = x.abs().max(1.5);
        (num(x).abs().max(f(x).abs() / 2.0)).ln() - 4.0 * m.ln()
    };
    // Real locus: F(x) >= 0. Scan x = tan(theta) style over a wide range.
    let scale = 1.0 + bv.iter().map(|v| v.abs()).fold(0f64, f64::max).sqrt();
    let steps = 200_000;
    let mut inf = 0f64; // the limit at infinity is log 1 = 0
    for i in 0..=steps {
        let th = -std::f64::consts::FRAC_PI_2 + std::f64::consts::PI * (i as f64 + 0.5) / (steps as f64 + 1.0);
        let x = scale * th.tan();
        if f(x) >= 0.0 {
            let v = g(x);
            if v < inf {
                inf = v;
            }
        }
    }
    inf - 2f64.ln()
}

/// The least common multiple of the Tamagawa numbers (saturating).
fn tamagawa_lcm(local: &[LocalData]) -> u64 {
    local.iter().fold(1u64, |acc, d| {
        let c = u64::from(d.tamagawa.max(1));
        let g = crate::arith::gcd_u64(acc, c);
        acc.saturating_mul(c / g)
    })
}

/// `gamma_r^r`, the r-th power of Hermite's constant, exactly for r <= 8
/// (from memory: 1, 4/3, 2, 4, 8, 64/3, 64, 256) and Hermite's bound
/// `(4/3)^(r(r-1)/2)` above.
fn hermite_power(r: usize) -> f64 {
    const T: [f64; 9] = [1.0, 1.0, 4.0 / 3.0, 2.0, 4.0, 8.0, 64.0 / 3.0, 64.0, 256.0];
    if r <= 8 {
        T[r]
    } else {
        (4f64 / 3.0).powf((r * (r - 1)) as f64 / 2.0)
    }
}

/// Points of naive height at most `height`, with a completeness flag.
fn small_points(curve: &Curve, height: u64, options: &SaturationOptions) -> (Vec<Point>, bool) {
    let limits = SearchLimits { deadline: options.deadline, cancel: options.cancel.clone(), ..SearchLimits::new(height) };
    let out = search_curve(curve, &limits);
    let pts = out.points.into_iter().map(|(x, y)| Point::Affine(x, y)).filter(|p| curve.contains(p)).collect();
    (pts, out.complete)
}

/// From a list of points on the globally minimal model `curve` (bad primes
/// described by `local`, e.g. from [`crate::local::bad_primes_data`]):
/// removes dependencies, LLL-reduces, bounds the saturation index and
/// proves p-saturation up to it where the budgets allow, dividing points by
/// p when the test finds them divisible. Numerical values at about
/// `precision` bits.
///
/// Errors: kind [`ErrorKind::InvalidValue`] when a point is not on the
/// curve or `local` does not describe a minimal model of it.
pub fn mordell_weil_basis(
    curve: &Curve,
    points: &[Point],
    local: &[LocalData],
    precision: u64,
    options: &SaturationOptions,
) -> Result<MordellWeilBasis, Error> {
    // the minimality check of `local` (no factoring, no Tate's algorithm)
    let data = CurveData::from_parts(curve, curve, &crate::curve::ModelChange::identity(), local)?;
    mordell_weil_basis_of(&data, points, precision, options)
}

/// [`mordell_weil_basis`] for a curve whose data is known: `points` lie on
/// the global minimal model [`CurveData::minimal`], whose minimality the
/// value guarantees (nothing is checked again at run time).
///
/// ```
/// use twofold::{Curve, CurveData, Point, Work};
/// use twofold::heights::{mordell_weil_basis_of, SaturationOptions};
/// // y^2 + y = x^3 - x: (0,0) generates, regulator 0.0511114082 (Cremona 1997, Table 3; from memory)
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let b = mordell_weil_basis_of(&d, &[Point::from_ints(0, 0)], 96, &SaturationOptions::default()).unwrap();
/// assert!((b.regulator_f64() - 0.0511114082).abs() < 1e-9);
/// ```
pub fn mordell_weil_basis_of(data: &CurveData, points: &[Point], precision: u64, options: &SaturationOptions) -> Result<MordellWeilBasis, Error> {
    let (curve, local) = (data.minimal(), data.local());
    for p in points {
        if !curve.contains(p) {
            return Err(Error::new(ErrorKind::InvalidValue, format!("the point {p} is not on the curve")));
        }
    }
    let prec = precision.max(32);
    let primes: Vec<Natural> = local.iter().map(|d| d.prime.clone()).collect();
    let torsion = TorsionGroup::compute(curve, &primes);
    let tors_gens: Vec<(Point, u32)> = torsion
        .generators()
        .iter()
        .map(|g| (g.clone(), curve.torsion_order_of(g).unwrap_or(1)))
        .collect();
    let is_torsion = |p: &Point| p.is_infinity() || curve.torsion_order_of(p).is_some();
    let input_count = points.len();
    let mut gens: Vec<Point> = points.to_vec();
    let mut divisions = 0usize;
    let mut dependencies_removed;
    // The local bound is derived in this crate (exact at the finite primes,
    // a sampled infimum with a margin at infinity); Silverman's bound, whose
    // constants are quoted from memory, is only the fallback when the local
    // one cannot be evaluated in f64.
    let bloc = local_height_bound(curve, local);
    let bdiff = if bloc.is_finite() { bloc } else { height_difference_bound(curve) };
    let mut rounds = 0;
    loop {
        rounds += 1;
        let red = lll_unchecked(curve, local, &gens, prec)?;
        gens = red.points;
        dependencies_removed = input_count.saturating_sub(gens.len());
        let gram = red.gram;
        let heights: Vec<Float> = (0..gens.len()).map(|i| gram[i][i].clone()).collect();
        let regulator = if gens.is_empty() { fi(1, prec) } else { determinant(&gram) };
        let r = gens.len();
        let finish = |sat: Saturation, gens: Vec<Point>| MordellWeilBasis {
            curve: curve.clone(),
            generators: gens,
            heights: heights.clone(),
            gram: gram.clone(),
            regulator: regulator.clone(),
            saturation: sat,
            dependencies_removed,
            precision: prec,
        };
        if r == 0 {
            let sat = Saturation { index_bound: Some(1), proven: vec![], unproven: vec![], untested_above: None, divisions, note: "no points of infinite order".into() };
            return Ok(finish(sat, gens));
        }
        // Lower bound lambda for heights of non-torsion points.
        let hmin = heights.iter().map(to_f64).fold(f64::INFINITY, f64::min);
        let max_l = (options.max_search_height as f64).ln();
        let mut l = (bdiff + hmin).min(max_l);
        let mut note = String::new();
        if l - bdiff <= 0.0 {
            l = max_l;
        }
        // When the search cannot pass the difference bound, the points
        // that meet the identity component at every bad prime (E^gr) need
        // only the archimedean part `binf`; `c P` lies there for every P,
        // `c` the lcm of the Tamagawa numbers (each kills its component
        // group), so `hhat(P) >= lambda_gr / c^2` (the reduction to E^gr
        // as in J. E. Cremona and S. Siksek, Computing a lower bound for
        // the canonical height on elliptic curves over Q, ANTS VII, 2006).
        let via_gr = l - bdiff <= 0.0 && bloc.is_finite();
        let (binf, c) = (archimedean_height_bound(curve), tamagawa_lcm(local));
        if via_gr {
            l = (binf + (c * c) as f64 * hmin).min(max_l);
        }
        let t = if via_gr { l - binf } else { l - bdiff };
        if t <= 0.0 || c > 1_000 {
            let sat = Saturation::unbounded(divisions, format!("search height too small for a height lower bound (difference bound {bdiff:.3}, archimedean part {binf:.3})"));
            return Ok(finish(sat, gens));
        }
        let hsearch = l.exp().floor() as u64;
        let (found, complete) = small_points(curve, hsearch, options);
        if !complete {
            let sat = Saturation::unbounded(divisions, "point search for the height lower bound did not finish");
            return Ok(finish(sat, gens));
        }
        let mut lambda = t;
        for q in &found {
            if !is_torsion(q) {
                let h = to_f64(&height_unchecked(curve, local, q, 64)?);
                lambda = lambda.min(h);
            }
        }
        if via_gr {
            lambda /= (c * c) as f64;
            note.push_str(&format!("lambda from the points on the identity components (archimedean bound {binf:.3}, Tamagawa lcm {c}); "));
        }
        let lambda = lambda * (1.0 - 1e-6);
        let reg = to_f64(&regulator) * (1.0 + 1e-6);
        let bound2 = hermite_power(r) * reg / lambda.powi(r as i32);
        if !bound2.is_finite() || bound2 > 1e30 {
            let sat = Saturation::unbounded(divisions, format!("index bound not finite (lambda = {lambda:e}, Reg = {reg:e})"));
            return Ok(finish(sat, gens));
        }
        let bound = bound2.max(1.0).sqrt().floor() as u64;
        let untested_above = (bound > options.max_saturation_prime).then_some(options.max_saturation_prime);
        note.push_str(&format!(
            "index^2 <= gamma_{r}^{r} Reg / lambda^{r} with lambda = {lambda:.6} (search to naive height {hsearch}, difference bound {bdiff:.3}); "
        ));
        let mut proven = Vec::new();
        let mut unproven = Vec::new();
        let mut replaced = false;
        let mut aux = AuxPrimes::new(curve);
        for p in primes_up_to(bound.min(options.max_saturation_prime)) {
            let mut vecs = gens.clone();
            for (g, o) in &tors_gens {
                if u64::from(*o) % p == 0 {
                    vecs.push(g.clone());
                }
            }
            match siksek_test(curve, &vecs, p, aux_limit(p, options.max_aux_prime), &mut aux, &|| options.out_of_time())? {
                SiksekOutcome::Saturated { primes_used } => {
                    proven.push(p);
                    note.push_str(&format!("p = {p}: proven with {primes_used} auxiliary primes; "));
                }
                SiksekOutcome::OutOfTime => {
                    unproven.push(p);
                    note.push_str(&format!("p = {p}: out of time; "));
                }
                SiksekOutcome::Kernel(v) => {
                    match divide(curve, local, &gens, &vecs, &v, p, bdiff, &torsion, options)? {
                        Some((j, qpt)) => {
                            gens[j] = qpt;
                            divisions += 1;
                            replaced = true;
                            note.push_str(&format!("p = {p}: divided a combination by {p}; "));
                            break;
                        }
                        None => {
                            unproven.push(p);
                            note.push_str(&format!("p = {p}: images stay dependent and no p-th part was found; "));
                        }
                    }
                }
            }
        }
        if replaced && rounds < 64 {
            continue;
        }
        let sat = Saturation { index_bound: Some(bound), proven, unproven, untested_above, divisions, note };
        return Ok(finish(sat, gens));
    }
}

/// Tries to find Q with p Q = sum v_i vecs_i + t (t torsion), exactly; on
/// success returns the index j of a generator with v_j = 1 (after scaling)
/// that Q may replace.
#[allow(clippy::too_many_arguments)]
fn divide(
    curve: &Curve,
    local: &[LocalData],
    gens: &[Point],
    vecs: &[Point],
    v: &[u64],
    p: u64,
    bdiff: f64,
    torsion: &TorsionGroup,
    options: &SaturationOptions,
) -> Result<Option<(usize, Point)>, Error> {
    let r = gens.len();
    let Some(j) = (0..r).find(|&i| !v[i].is_multiple_of(p)) else { return Ok(None) };
    let inv = crate::arith::inv_mod(v[j] % p, p).unwrap_or(1);
    let coeffs: Vec<i64> = v
        .iter()
        .map(|&c| {
            let c = ((c as u128 * inv as u128) % p as u128) as i64;
            if 2 * c > p as i64 {
                c - p as i64
            } else {
                c
            }
        })
        .collect();
    let g = combination(curve, vecs, &coeffs);
    let hg = to_f64(&height_unchecked(curve, local, &g, 64)?);
    let target = hg / (p * p) as f64;
    if let Some(q) = divide_by_logarithm(curve, &g, p, target + bdiff.max(0.0) + 1.0, torsion, options)? {
        return Ok(Some((j, q)));
    }
    let l = target + bdiff + 1e-6;
    if l > (options.max_search_height as f64).ln() {
        return Ok(None);
    }
    let (found, _) = small_points(curve, l.exp().floor() as u64, options);
    for qpt in found {
        let h = to_f64(&height_unchecked(curve, local, &qpt, 64)?);
        if (h - target).abs() > 1e-6 * (1.0 + target) {
            continue;
        }
        let pq = curve.multiple(&qpt, p as i64);
        let diff = curve.add(&pq, &curve.negate(&g));
        if torsion.points().contains(&diff) {
            return Ok(Some((j, qpt)));
        }
    }
    Ok(None)
}

/// The p-th part of `g` through the elliptic logarithm: a point `Q` with
/// `p Q - g` torsion whose x-coordinate has naive height at most `height`
/// (nats), found among the real points `(log g + log T + λ) / p`, `λ` in
/// the period lattice (J. E. Cremona, Algorithms for Modular Elliptic
/// Curves, 2nd ed., 1997, §3.5-3.6 for the elliptic logarithm and the
/// division of points; the group law as in Silverman and Tate, Rational
/// Points on Elliptic Curves, 1992). The precision, `3 height / log 2 + 64`
/// bits, is enough for continued fractions to find `x(Q) = m / d^2`; every
/// candidate is checked exactly. `None` when no such point was found
/// (which proves nothing), also when `height` asks for more than 40,000
/// bits or the budget runs out.
fn divide_by_logarithm(curve: &Curve, g: &Point, p: u64, height: f64, torsion: &TorsionGroup, options: &SaturationOptions) -> Result<Option<Point>, Error> {
    use super::elliptic::{torsion_shifts, Uniformisation};
    let bits = (3.0 * height / std::f64::consts::LN_2) as u64 + 64;
    if !height.is_finite() || bits > 40_000 || options.out_of_time() {
        return Ok(None);
    }
    let u = Uniformisation::new(curve, bits)?;
    let tors: Vec<Point> = torsion.points().to_vec();
    let logs = if (tors.len() as u64).is_multiple_of(p) {
        let b2 = malachite::Rational::from(curve.b_invariants()[0].clone());
        torsion_shifts(curve, &tors, u.lattice(), &b2, u.precision())
    } else {
        vec![]
    };
    Ok(u.divide(curve, g, p, &tors, &logs, height, &|| options.out_of_time()))
}

/// Siksek's p-saturation test on its own: `Ok(true)` when the span of
/// `points` and E(Q)_tors is proven p-saturated (exact), `Ok(false)` when
/// the images in `E(F_q)/pE(F_q)` for the good primes `q <= max_aux_prime`
/// tried stay dependent (then some combination is probably divisible by p;
/// nothing is proven). `points` must be independent modulo torsion for a
/// `true` answer to mean anything beyond their span: the test proves that
/// no point outside the span has its p-th multiple inside.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::is_p_saturated;
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(); // y^2 + y = x^3 - x
/// let local = bad_primes_data(&e, &[Natural::from(37u32)]).unwrap();
/// let p = Point::from_ints(0, 0);
/// assert!(is_p_saturated(&e, &local, &[p.clone()], 2, 10_000).unwrap());
/// assert!(!is_p_saturated(&e, &local, &[e.multiple(&p, 2)], 2, 10_000).unwrap());
/// ```
pub fn is_p_saturated(curve: &Curve, local: &[LocalData], points: &[Point], p: u64, max_aux_prime: u64) -> Result<bool, Error> {
    check_minimal(curve, local)?;
    if !crate::arith::is_prime_u64(p) {
        return Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not prime")));
    }
    for pt in points {
        if !curve.contains(pt) {
            return Err(Error::new(ErrorKind::InvalidValue, format!("the point {pt} is not on the curve")));
        }
    }
    let primes: Vec<Natural> = local.iter().map(|d| d.prime.clone()).collect();
    let torsion = TorsionGroup::compute(curve, &primes);
    let mut vecs = points.to_vec();
    for g in torsion.generators() {
        if u64::from(curve.torsion_order_of(g).unwrap_or(1)) % p == 0 {
            vecs.push(g.clone());
        }
    }
    let mut aux = AuxPrimes::new(curve);
    Ok(matches!(siksek_test(curve, &vecs, p, max_aux_prime.min(1 << 31), &mut aux, &|| false)?, SiksekOutcome::Saturated { .. }))
}
