//! Interval arithmetic on `f64` with outward rounding, and enclosures of the
//! constants and special functions the proven L-values need.
//!
//! # What the enclosures rest on
//!
//! IEEE 754 requires `+`, `-`, `*`, `/` and `sqrt` to be correctly rounded
//! (to nearest, the default mode, which Rust never changes). So the exact
//! result of one operation on two `f64` lies within half an ulp of the
//! computed one, hence in `[next_down(r), next_up(r)]`; every operation of
//! [`Interval`] widens its result that way (this also covers underflow to
//! subnormals or zero, where the error is at most half the smallest
//! subnormal, and overflow to infinity). Nothing else of the platform is
//! trusted: `exp`, `ln` and the exponential integral are computed here by
//! range reduction and series (or a continued fraction) whose truncation
//! error is bounded by a proven remainder and added to the interval.
//!
//! * `π` and `ln 2`: the `f64` constants of `std` are the correctly rounded
//!   values; which side of the true value they lie on is read off their
//!   exact binary expansion and the decimal digits `π = 3.14159265358979323846…`,
//!   `ln 2 = 0.69314718055994530941…` (Abramowitz and Stegun, *Handbook of
//!   Mathematical Functions*, 1964, Tables 1.1 and 4.1); the unit tests
//!   recheck this with exact rationals and by Machin's formula and the
//!   series `ln 2 = Σ 1/(k 2^k)` evaluated in this interval arithmetic.
//! * `exp x`: `x = k ln 2 + r`, `|r| <= 0.35`, Taylor series of degree 20
//!   with the Lagrange remainder `|r|^21/21! · e^{|r|}`, then `2^k` exactly.
//! * `ln x`: `x = 2^e m`, `m ∈ [1/√2, √2)`, `ln m = 2 atanh s`,
//!   `s = (m-1)/(m+1)`, `|s| <= 0.1716`, with the remainder of the series
//!   bounded by the geometric series of the omitted terms.
//! * `E_1(x) = ∫_x^∞ e^{-t} dt/t`: for `x <= 2` the convergent series
//!   `E_1(x) = -γ - ln x - Σ_{k≥1} (-x)^k/(k·k!)` (Abramowitz and Stegun
//!   5.1.11), alternating with decreasing terms for `x < 4`, so its
//!   remainder is at most the first omitted term; Euler's constant
//!   `γ = 0.57721566490153286060…` (A&S 6.1.3). For `x > 2` the continued
//!   fraction `E_1(x) = e^{-x} (1/(x+ 1/(1+ 1/(x+ 2/(1+ 2/(x+ …))))))` (A&S
//!   5.1.22): all its partial numerators and denominators are positive, so
//!   (by the determinant formula `f_n - f_{n-1} = (-1)^{n-1} a_1⋯a_n /
//!   (B_{n-1} B_n)` with `B_n > 0`) its convergents alternate around the
//!   value it converges to, and `E_1(x) e^x` lies between any two
//!   consecutive convergents (H. S. Wall, *Analytic Theory of Continued
//!   Fractions*, 1948, ch. III; T. J. Stieltjes, 1894). Both convergents
//!   are enclosed and their hull is the enclosure.
//!
//! ```
//! use twofold::enclosure::Interval;
//! let x = Interval::point(0.1);
//! let e = x.exp();
//! assert!(e.contains(0.1f64.exp()));
//! assert!(e.width() < 4e-15);
//! // E_1(1) = 0.21938393439552027368 (Abramowitz and Stegun, Table 5.1; from memory)
//! assert!(Interval::point(1.0).exp_integral_e1().contains(0.219_383_934_395_520_27));
//! ```

use std::ops::{Add, Div, Mul, Neg, Sub};

/// A closed interval `[lo, hi]` of reals with `f64` ends, `lo <= hi`
/// (infinite ends allowed). Every operation returns an interval that
/// contains the exact result for every choice of points in the operands.
///
/// ```
/// use twofold::enclosure::Interval;
/// let third = Interval::point(1.0) / Interval::point(3.0);
/// assert!(third.lo() < third.hi());
/// assert!((third * Interval::point(3.0)).contains(1.0));
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Interval {
    lo: f64,
    hi: f64,
}

#[inline]
fn down(x: f64) -> f64 {
    x.next_down()
}

#[inline]
fn up(x: f64) -> f64 {
    x.next_up()
}

impl Interval {
    /// The whole real line (the result of an operation outside its domain).
    pub const ENTIRE: Interval = Interval { lo: f64::NEG_INFINITY, hi: f64::INFINITY };

    /// The interval `[x, x]` for a finite `x`; `ENTIRE` for NaN.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// assert_eq!(Interval::point(2.5).lo(), 2.5);
    /// ```
    #[inline]
    pub fn point(x: f64) -> Interval {
        if x.is_nan() {
            Interval::ENTIRE
        } else {
            Interval { lo: x, hi: x }
        }
    }

    /// `[lo, hi]`; `ENTIRE` if an end is NaN or `lo > hi`.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// assert!(Interval::new(1.0, 2.0).contains(1.5));
    /// assert_eq!(Interval::new(2.0, 1.0), Interval::ENTIRE);
    /// ```
    #[inline]
    pub fn new(lo: f64, hi: f64) -> Interval {
        if lo.is_nan() || hi.is_nan() || lo > hi {
            Interval::ENTIRE
        } else {
            Interval { lo, hi }
        }
    }

    /// An enclosure of the integer `n` (exact below `2^53`).
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// assert_eq!(Interval::from_i64(7), Interval::point(7.0));
    /// assert!(Interval::from_i64((1 << 60) + 1).width() > 0.0);
    /// ```
    #[inline]
    pub fn from_i64(n: i64) -> Interval {
        let f = n as f64;
        if n.unsigned_abs() <= 1 << 53 {
            Interval { lo: f, hi: f }
        } else {
            Interval { lo: down(f), hi: up(f) }
        }
    }

    /// The lower end.
    #[inline]
    pub fn lo(&self) -> f64 {
        self.lo
    }

    /// The upper end.
    #[inline]
    pub fn hi(&self) -> f64 {
        self.hi
    }

    /// `hi - lo` (rounded up).
    #[inline]
    pub fn width(&self) -> f64 {
        up(self.hi - self.lo)
    }

    /// The midpoint (rounded; for display only).
    pub fn mid(&self) -> f64 {
        0.5 * self.lo + 0.5 * self.hi
    }

    /// Whether `x` lies in the interval.
    #[inline]
    pub fn contains(&self, x: f64) -> bool {
        self.lo <= x && x <= self.hi
    }

    /// Whether 0 is outside the interval: then the enclosed value is proven
    /// non-zero.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// assert!(Interval::new(1e-30, 1.0).excludes_zero());
    /// assert!(!Interval::new(0.0, 1.0).excludes_zero());
    /// ```
    #[inline]
    pub fn excludes_zero(&self) -> bool {
        self.lo > 0.0 || self.hi < 0.0
    }

    /// The smallest interval containing both.
    #[inline]
    pub fn hull(&self, other: &Interval) -> Interval {
        Interval { lo: self.lo.min(other.lo), hi: self.hi.max(other.hi) }
    }

    /// Whether the two intervals share a point.
    #[inline]
    pub fn overlaps(&self, other: &Interval) -> bool {
        self.lo <= other.hi && other.lo <= self.hi
    }

    /// `[-m, m]`, for an error bound `m >= 0`.
    #[inline]
    pub fn symmetric(m: f64) -> Interval {
        Interval::new(-m, m)
    }

    /// The largest absolute value of a point (an upper bound for `|x|`).
    #[inline]
    pub fn mag(&self) -> f64 {
        self.lo.abs().max(self.hi.abs())
    }

    /// The square root (IEEE 754 makes `sqrt` correctly rounded); `ENTIRE`
    /// if the interval reaches below 0.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// let r = Interval::point(2.0).sqrt();
    /// assert!(r.contains(std::f64::consts::SQRT_2) && (r * r).contains(2.0));
    /// ```
    pub fn sqrt(&self) -> Interval {
        if self.lo < 0.0 {
            return Interval::ENTIRE;
        }
        Interval { lo: down(self.lo.sqrt()).max(0.0), hi: up(self.hi.sqrt()) }
    }

    /// `x` times the exact power of two `2^k` (exact unless it over- or
    /// underflows, which the rounding covers).
    fn scale2(&self, k: i32) -> Interval {
        let mut out = *self;
        let mut k = k;
        while k != 0 {
            let step = k.clamp(-1000, 1000);
            let f = f64::from_bits(((step + 1023) as u64) << 52);
            out = out * Interval::point(f);
            k -= step;
        }
        out
    }

    /// An enclosure of `e^x` (see the module documentation for the method).
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// let e = Interval::new(-1.0, 1.0).exp();
    /// assert!(e.contains((-1.0f64).exp()) && e.contains(1.0f64.exp()));
    /// ```
    pub fn exp(&self) -> Interval {
        if self.lo.is_nan() || self.hi.is_nan() {
            return Interval::ENTIRE;
        }
        let lo = exp_point(self.lo).lo;
        let hi = exp_point(self.hi).hi;
        Interval { lo: lo.max(0.0), hi }
    }

    /// An enclosure of `ln x`; `ENTIRE` unless `lo > 0`.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// assert!(Interval::point(10.0).ln().contains(10.0f64.ln()));
    /// ```
    pub fn ln(&self) -> Interval {
        if !(self.lo > 0.0) {
            return Interval::ENTIRE;
        }
        let lo = ln_point(self.lo).lo;
        let hi = ln_point(self.hi).hi;
        Interval { lo, hi }
    }

    /// An enclosure of the exponential integral `E_1(x) = ∫_x^∞ e^{-t} dt / t`
    /// for `x > 0` (decreasing, so the ends map to the ends); `ENTIRE`
    /// unless `lo > 0`. See the module documentation for the method.
    ///
    /// ```
    /// use twofold::enclosure::Interval;
    /// // E_1(5) = 1.14829559127533e-3 (Abramowitz and Stegun, Table 5.1;
    /// // rechecked by an independent multiple-precision evaluation)
    /// let e = Interval::point(5.0).exp_integral_e1();
    /// assert!((e.mid() - 1.14829559127533e-3).abs() < 1e-16);
    /// assert!(e.lo() <= 1.14829559127533e-3 * (1.0 + 1e-14) && 1.14829559127533e-3 * (1.0 - 1e-14) <= e.hi());
    /// ```
    pub fn exp_integral_e1(&self) -> Interval {
        if !(self.lo > 0.0) || self.hi.is_nan() {
            return Interval::ENTIRE;
        }
        let hi = e1_point(self.lo).hi;
        let lo = if self.hi.is_infinite() { 0.0 } else { e1_point(self.hi).lo };
        Interval { lo: lo.max(0.0), hi }
    }

    /// `E_1` on a narrow interval `x > 0` with one evaluation: the value at
    /// `lo`, widened downwards by `(hi - lo) e^{-lo}/lo`, a bound for the
    /// decrease of `E_1` (whose derivative is `-e^{-t}/t`) over `[lo, hi]`.
    pub(crate) fn exp_integral_e1_narrow(&self) -> Interval {
        if !(self.lo > 0.0) || !self.hi.is_finite() {
            return self.exp_integral_e1();
        }
        let at = e1_point(self.lo);
        let w = self.width();
        if w == 0.0 {
            return at;
        }
        let slope = up(exp_point(-self.lo).hi / self.lo);
        Interval { lo: down(at.lo - up(w * slope)).max(0.0), hi: at.hi }
    }
}

impl Add for Interval {
    type Output = Interval;
    #[inline]
    fn add(self, o: Interval) -> Interval {
        Interval { lo: down(self.lo + o.lo), hi: up(self.hi + o.hi) }
    }
}

impl Sub for Interval {
    type Output = Interval;
    #[inline]
    fn sub(self, o: Interval) -> Interval {
        Interval { lo: down(self.lo - o.hi), hi: up(self.hi - o.lo) }
    }
}

impl Neg for Interval {
    type Output = Interval;
    #[inline]
    fn neg(self) -> Interval {
        Interval { lo: -self.hi, hi: -self.lo }
    }
}

impl Mul for Interval {
    type Output = Interval;
    #[inline]
    fn mul(self, o: Interval) -> Interval {
        let (a, b, c, d) = (self.lo, self.hi, o.lo, o.hi);
        if a >= 0.0 && c >= 0.0 {
            return sanitize(down(a * c).max(0.0), up(b * d));
        }
        let p = [a * c, a * d, b * c, b * d];
        let lo = p.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = p.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        if p.iter().any(|v| v.is_nan()) {
            return Interval::ENTIRE;
        }
        sanitize(down(lo), up(hi))
    }
}

impl Div for Interval {
    type Output = Interval;
    #[inline]
    fn div(self, o: Interval) -> Interval {
        if !(o.lo > 0.0 || o.hi < 0.0) {
            return Interval::ENTIRE;
        }
        let (a, b, c, d) = (self.lo, self.hi, o.lo, o.hi);
        if a >= 0.0 && c > 0.0 {
            return sanitize(down(a / d).max(0.0), up(b / c));
        }
        let p = [a / c, a / d, b / c, b / d];
        if p.iter().any(|v| v.is_nan()) {
            return Interval::ENTIRE;
        }
        let lo = p.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = p.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        sanitize(down(lo), up(hi))
    }
}

#[inline]
fn sanitize(lo: f64, hi: f64) -> Interval {
    if lo.is_nan() || hi.is_nan() {
        Interval::ENTIRE
    } else {
        Interval { lo, hi }
    }
}

/// `C(x) = e^x E_1(x) = ∫_0^∞ e^{-xu} du/(1+u)` near a base point `x0 >= 2`
/// by its Taylor polynomial, for many nearby arguments at the cost of one
/// continued fraction. `C' = C - 1/x` gives the coefficients
/// `d_{k+1} = (d_k - (-1)^k x0^{-k-1}) / (k+1)`, and `C` is completely
/// monotone with `|C^{(k)}(x)| <= k!/x^{k+1}`, so the remainder after
/// degree `K` at `x0 + δ` is at most `δ^{K+1} / x0^{K+2}`.
#[derive(Clone, Debug)]
pub(crate) struct ScaledE1Taylor {
    coef: Vec<Interval>,
    /// `δ_max^{K+1} / x0_lo^{K+2}` (upper bound).
    remainder: f64,
}

impl ScaledE1Taylor {
    /// An expansion at `x0` (an interval, `x0.lo >= 2`) valid for
    /// `0 <= δ <= delta_max`, or `None` if `delta_max / x0` is too large for
    /// a degree up to 40 to reach `1e-18` relative.
    pub(crate) fn new(x0: Interval, delta_max: f64) -> Option<ScaledE1Taylor> {
        if !(x0.lo >= 2.0) || !x0.hi.is_finite() {
            return None;
        }
        let ratio = up(delta_max / x0.lo);
        if ratio > 0.5 {
            return None;
        }
        // degree: ratio^{K+1} <= 1e-18
        let mut k = 1usize;
        let mut r = ratio;
        while r > 1e-18 && k < 40 {
            r = up(r * ratio);
            k += 1;
        }
        if r > 1e-18 {
            return None;
        }
        // C(x0): decreasing, so between C(hi) and C(lo)
        let c_at = e1_scaled_cf(x0.lo).hull(&e1_scaled_cf(x0.hi));
        let inv = Interval::point(1.0) / x0;
        let mut coef = Vec::with_capacity(k + 1);
        coef.push(c_at);
        let mut pw = inv; // x0^{-k-1}
        for j in 0..k {
            let prev = coef[j];
            let t = if j % 2 == 0 { prev - pw } else { prev + pw };
            coef.push(t / Interval::point((j + 1) as f64));
            pw = pw * inv;
        }
        // remainder δ^{K+1}/x0^{K+2} = (δ/x0)^{K+1} / x0
        let remainder = up(r / x0.lo);
        Some(ScaledE1Taylor { coef, remainder })
    }

    /// `C(x0 + δ)` for an enclosure `δ` of the offset (`0 <= δ <= delta_max`).
    #[inline]
    pub(crate) fn eval(&self, delta: Interval) -> Interval {
        let mut acc = self.coef[self.coef.len() - 1];
        for c in self.coef[..self.coef.len() - 1].iter().rev() {
            acc = *c + acc * delta;
        }
        acc + Interval::symmetric(self.remainder)
    }
}

/// `π`: `std::f64::consts::PI = 3.141592653589793115997963…` is below
/// `π = 3.14159265358979323846…` and the next `f64` above it
/// (A&S Table 1.1; checked in the unit tests with exact rationals and by
/// Machin's formula).
///
/// ```
/// use twofold::enclosure::pi;
/// assert!(pi().contains(std::f64::consts::PI) && pi().width() < 1e-15);
/// ```
pub fn pi() -> Interval {
    Interval { lo: std::f64::consts::PI, hi: up(std::f64::consts::PI) }
}

/// `ln 2`: `std::f64::consts::LN_2 = 0.693147180559945286226…` is below
/// `ln 2 = 0.69314718055994530941…` (A&S Table 4.1; checked in the unit
/// tests).
///
/// ```
/// use twofold::enclosure::ln2;
/// assert!(ln2().contains(std::f64::consts::LN_2));
/// ```
pub fn ln2() -> Interval {
    Interval { lo: std::f64::consts::LN_2, hi: up(std::f64::consts::LN_2) }
}

/// Euler's constant `γ = 0.57721566490153286060…` (A&S 6.1.3): the `f64`
/// `0.5772156649015329 = 0.57721566490153286554…` is above it, so the
/// enclosure is that and the `f64` below (checked in the unit tests with
/// exact rationals, and independently through `E_1`, whose series uses `γ`
/// and whose continued fraction does not).
///
/// ```
/// use twofold::enclosure::euler_gamma;
/// assert!(euler_gamma().contains(0.5772156649015329));
/// ```
pub fn euler_gamma() -> Interval {
    const G: f64 = 0.577_215_664_901_532_9;
    Interval { lo: down(G), hi: G }
}

/// `1/n!` enclosures for the Taylor series of `exp`.
fn exp_point(x: f64) -> Interval {
    if x > 709.0 {
        // e^709 < f64::MAX < e^710; monotone.
        if x >= 710.0 {
            return Interval { lo: f64::MAX, hi: f64::INFINITY };
        }
    }
    if x < -745.0 {
        let t = exp_point(-745.0);
        return Interval { lo: 0.0, hi: t.hi };
    }
    if x == 0.0 {
        return Interval::point(1.0);
    }
    let k = (x / std::f64::consts::LN_2).round();
    let r = Interval::point(x) - Interval::point(k) * ln2();
    let rm = r.mag();
    debug_assert!(rm <= 0.36, "range reduction of exp: |r| = {rm}");
    // Taylor polynomial of degree 20 by Horner: 1 + r(1 + r/2(1 + r/3(...)))
    const DEG: usize = 20;
    let one = Interval::point(1.0);
    let mut p = one;
    for j in (1..=DEG).rev() {
        p = one + r * p / Interval::point(j as f64);
    }
    // Lagrange remainder: |r|^{21}/21! e^{|r|} <= |r|^21 / 21! * 2 for |r| <= 0.5
    let fact21 = 5.109_094_217_170_944e19_f64; // 21! = 51090942171709440000 exactly
    let rem = if rm <= 0.5 { up(up(rm.powi(21)) * 2.0 / down(fact21)) * 1.01 } else { f64::INFINITY };
    let p = p + Interval::symmetric(rem);
    p.scale2(k as i32)
}

fn ln_point(x: f64) -> Interval {
    if x == 1.0 {
        return Interval::point(0.0);
    }
    if x.is_infinite() {
        return Interval { lo: 709.0, hi: f64::INFINITY };
    }
    let (mut m, mut e) = {
        let mut y = x;
        let mut shift = 0i32;
        if y < f64::MIN_POSITIVE {
            y *= 2f64.powi(60); // exact
            shift = -60;
        }
        let bits = y.to_bits();
        let ex = ((bits >> 52) & 0x7ff) as i32 - 1023;
        let mant = f64::from_bits((bits & ((1u64 << 52) - 1)) | (1023u64 << 52)); // in [1, 2)
        (mant, ex + shift)
    };
    if m > std::f64::consts::SQRT_2 {
        m *= 0.5; // exact
        e += 1;
    }
    let mi = Interval::point(m);
    let one = Interval::point(1.0);
    let s = (mi - one) / (mi + one);
    let s2 = s * s;
    let sm = s.mag();
    // 2 Σ_{k=0}^{K} s^{2k+1}/(2k+1); remainder <= 2 |s|^{2K+3} / ((2K+3)(1 - s^2))
    const K: usize = 16;
    let mut acc = Interval::point(0.0);
    for k in (0..=K).rev() {
        acc = Interval::point(1.0) / Interval::point((2 * k + 1) as f64) + s2 * acc;
    }
    let series = Interval::point(2.0) * s * acc;
    let rem = if sm < 0.2 { up(2.0 * up(sm.powi(2 * K as i32 + 3)) / down((2 * K + 3) as f64 * (1.0 - 0.04))) } else { f64::INFINITY };
    let lnm = series + Interval::symmetric(rem);
    Interval::from_i64(e as i64) * ln2() + lnm
}

/// The depth of the continued fraction for `E_1` at `x > 2`: enough for
/// about `1e-16` relative in most cases; the enclosure is valid at any depth.
fn e1_depth(x: f64) -> usize {
    2 * ((140.0 / x).ceil() as usize + 14)
}

/// `e^x E_1(x)` for `x >= 2` from two consecutive convergents of A&S 5.1.22,
/// evaluated by the forward recurrence `A_j = b_j A_{j-1} + a_j A_{j-2}`
/// (same for `B`) in interval arithmetic; every quantity is positive.
fn e1_scaled_cf(x: f64) -> Interval {
    let mut depth = e1_depth(x);
    loop {
        let r = e1_cf_at_depth(x, depth);
        if r.width() <= depth as f64 * 1e-15 * r.hi || depth > 4000 {
            return r;
        }
        depth *= 2;
    }
}

fn e1_cf_at_depth(x: f64, depth: usize) -> Interval {
    let xi = Interval::point(x);
    let one = Interval::point(1.0);
    // convergent 0: A = 0, B = 1; "convergent -1": A = 1, B = 0
    let (mut a_prev, mut a_cur) = (one, Interval::point(0.0));
    let (mut b_prev, mut b_cur) = (Interval::point(0.0), one);
    let mut last = Interval::ENTIRE;
    let mut cur = Interval::ENTIRE;
    for j in 1..=depth {
        let num = if j == 1 { one } else { Interval::point((j / 2) as f64) };
        let den = if j % 2 == 1 { xi } else { one };
        let a_next = den * a_cur + num * a_prev;
        let b_next = den * b_cur + num * b_prev;
        a_prev = a_cur;
        a_cur = a_next;
        b_prev = b_cur;
        b_cur = b_next;
        if b_cur.hi > 1e200 {
            // rescale all four by 2^-600 (exact scaling up to rounding, covered)
            a_prev = a_prev.scale2(-600);
            a_cur = a_cur.scale2(-600);
            b_prev = b_prev.scale2(-600);
            b_cur = b_cur.scale2(-600);
        }
        if j + 1 >= depth {
            last = cur;
            cur = a_cur / b_cur;
        }
    }
    cur.hull(&last)
}

fn e1_point(x: f64) -> Interval {
    if x <= 2.0 {
        e1_series(x)
    } else {
        exp_point(-x) * e1_scaled_cf(x)
    }
}

/// `-γ - ln x + Σ_{k=1}^{K} (-1)^{k+1} x^k / (k k!)` with the alternating
/// remainder, for `0 < x <= 2`.
fn e1_series(x: f64) -> Interval {
    let xi = Interval::point(x);
    let mut sum = Interval::point(0.0);
    let mut pw = Interval::point(1.0); // x^k / k!
    let mut k = 1usize;
    let rem;
    loop {
        let kf = Interval::point(k as f64);
        pw = pw * xi / kf;
        let term = pw / kf;
        if k > 2 && term.hi < 1e-18 {
            rem = term.hi;
            break;
        }
        sum = if k % 2 == 1 { sum + term } else { sum - term };
        k += 1;
    }
    -euler_gamma() - xi.ln() + sum + Interval::symmetric(rem)
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::rational::Rational;
    use malachite::base::num::conversion::traits::ExactFrom;

    fn exact(x: f64) -> Rational {
        Rational::exact_from(x)
    }

    fn dec(s: &str) -> Rational {
        // s = "d.ddd" -> rational
        let (i, f) = s.split_once('.').unwrap();
        let num: malachite::Integer = format!("{i}{f}").parse().unwrap();
        let den: malachite::Natural = format!("1{}", "0".repeat(f.len())).parse().unwrap();
        Rational::from_integers(num, malachite::Integer::from(den))
    }

    #[test]
    fn constants_are_on_the_stated_sides() {
        // π, ln 2, γ to 20 decimals (A&S Tables 1.1, 4.1 and 6.1.3); a
        // truncated decimal d satisfies d < value < d + 10^-20.
        let eps = dec("0.00000000000000000001");
        let cases = [(pi(), "3.14159265358979323846"), (ln2(), "0.69314718055994530941"), (euler_gamma(), "0.57721566490153286060")];
        for (iv, d) in cases {
            let d = dec(d);
            assert!(exact(iv.lo()) < d, "{d}");
            assert!(exact(iv.hi()) > &d + &eps, "{d}");
        }
    }

    #[test]
    fn machin_and_log_series_agree_with_the_constants() {
        // π = 16 atan(1/5) - 4 atan(1/239) (Machin), atan by its alternating series
        fn atan_inv(n: f64) -> Interval {
            let x = Interval::point(1.0) / Interval::point(n);
            let x2 = x * x;
            let mut pw = x;
            let mut sum = Interval::point(0.0);
            for k in 0..40 {
                let t = pw / Interval::point((2 * k + 1) as f64);
                sum = if k % 2 == 0 { sum + t } else { sum - t };
                pw = pw * x2;
            }
            sum + Interval::symmetric(pw.hi) // alternating remainder
        }
        let machin = Interval::point(16.0) * atan_inv(5.0) - Interval::point(4.0) * atan_inv(239.0);
        assert!(machin.overlaps(&pi()) && machin.width() < 1e-13, "{machin:?}");
        // ln 2 = Σ 1/(k 2^k), remainder <= 2^{-K}/K
        let mut s = Interval::point(0.0);
        for k in 1..=60 {
            s = s + Interval::point(1.0) / Interval::point(k as f64 * 2f64.powi(k));
        }
        s = s + Interval::new(0.0, 2f64.powi(-60));
        assert!(s.overlaps(&ln2()), "{s:?}");
    }

    #[test]
    fn exp_and_ln_contain_std_values_and_high_precision() {
        let mut x = -700.0f64;
        while x < 700.0 {
            for &y in &[x, x + 0.123456789, -x * 1e-3, x * 1e-9] {
                let e = Interval::point(y).exp();
                let s = y.exp();
                // std's exp is not trusted, but should be within an ulp or two
                assert!(e.lo() <= s.next_up().next_up() && s.next_down().next_down() <= e.hi(), "exp {y}: {e:?} vs {s}");
                assert!(e.width() <= 8.0 * f64::EPSILON * s.max(f64::MIN_POSITIVE) * (1.0 + y.abs()), "exp {y}: {e:?}");
                if y > 0.0 {
                    let l = Interval::point(y).ln();
                    let t = y.ln();
                    assert!(l.lo() <= t.next_up() && t.next_down() <= l.hi(), "ln {y}: {l:?} vs {t}");
                    assert!(l.width() <= 1e-14 * t.abs().max(1e-300) + 1e-300 || l.width() < 1e-15, "ln {y}: {l:?}");
                }
            }
            x += 3.7;
        }
        assert!(Interval::point(1e-310).ln().contains(1e-310f64.ln()));
        assert!(Interval::point(-800.0).exp().contains(0.0));
        assert_eq!(Interval::point(0.0).ln(), Interval::ENTIRE);
    }

    #[test]
    fn exp_and_ln_against_multiple_precision() {
        use malachite::base::rounding_modes::RoundingMode;
        use malachite::float::Float;
        // e^x and ln x in 200-bit arithmetic from their series, as an
        // independent second computation (Float's own arithmetic).
        fn float_exp(x: f64) -> Float {
            // e^x = (e^{x/2^20})^{2^20}, series to 40 terms
            let prec = 256u64;
            let y = Float::from_rational_prec_round(exact(x) / Rational::from(1u64 << 20), prec, RoundingMode::Nearest).0;
            let mut term = Float::from_unsigned_prec(1u32, prec).0;
            let mut sum = term.clone();
            for k in 1..40u32 {
                term = Float::mul_prec(term, y.clone(), prec).0;
                term = Float::div_prec(term, Float::from_unsigned_prec(k, prec).0, prec).0;
                sum = Float::add_prec(sum, term.clone(), prec).0;
            }
            for _ in 0..20 {
                sum = Float::mul_prec(sum.clone(), sum, prec).0;
            }
            sum
        }
        for x in [-30.5, -3.0, -0.7, 0.001, 0.3, 1.0, 2.5, 17.25] {
            let f = float_exp(x);
            let lo = Float::from(Interval::point(x).exp().lo());
            let hi = Float::from(Interval::point(x).exp().hi());
            // the 256-bit value carries relative error ~ 2^-230: far inside an ulp
            assert!(lo <= f && f <= hi, "x = {x}");
        }
    }

    #[test]
    fn e1_series_and_fraction_agree_and_contain_known_values() {
        // series at x <= 2 vs continued fraction: force both at 1.5..2
        for i in 0..20 {
            let x = 1.2 + 0.04 * i as f64;
            let s = e1_series(x);
            let c = exp_point(-x) * e1_cf_at_depth(x, 400);
            assert!(s.overlaps(&c), "x = {x}: {s:?} {c:?}");
            assert!(s.width() < 3e-14 && c.width() < 1e-13, "x = {x}: {s:?} {c:?}");
        }
        // A&S Table 5.1 (from memory): E_1(0.5) = 0.5597735947761608, E_1(2) = 0.04890051070806112,
        // x e^x E_1(x) at x = 10: 0.9156333393978808
        assert!(Interval::point(0.5).exp_integral_e1().overlaps(&(Interval::symmetric(1e-15) + Interval::point(0.559_773_594_776_160_8))));
        assert!(Interval::point(2.0).exp_integral_e1().overlaps(&(Interval::symmetric(1e-16) + Interval::point(0.048_900_510_708_061_12))));
        let ten = Interval::point(10.0) * Interval::point(10.0).exp() * Interval::point(10.0).exp_integral_e1();
        assert!(ten.overlaps(&(Interval::symmetric(1e-15) + Interval::point(0.915_633_339_397_880_8))), "{ten:?}");
        // bounds of A&S 5.1.19: 1/2 ln(1 + 2/x) < e^x E_1(x) < ln(1 + 1/x)
        for x in [0.01, 0.3, 1.0, 3.0, 12.0, 40.0, 300.0] {
            let v = Interval::point(x).exp() * Interval::point(x).exp_integral_e1();
            assert!(v.lo() < (1.0 + 1.0 / x).ln() * (1.0 + 1e-12) && v.hi() > 0.5 * (1.0 + 2.0 / x).ln() * (1.0 - 1e-12), "x = {x}");
            assert!(v.width() < 1e-14 * (x + 10.0) * v.hi(), "x = {x}: {v:?}");
        }
    }

    #[test]
    fn taylor_expansion_of_the_scaled_e1_matches_the_fraction() {
        for x0 in [2.0, 3.5, 10.0, 33.0] {
            let t = ScaledE1Taylor::new(Interval::point(x0), 0.05).unwrap();
            for j in 0..=10 {
                let d = 0.005 * j as f64;
                let x = x0 + d; // rounded; compare with the enclosure at the rounded point
                let direct = e1_scaled_cf(x);
                let via = t.eval(Interval::point(x) - Interval::point(x0));
                assert!(via.overlaps(&direct), "x0 = {x0}, d = {d}: {via:?} {direct:?}");
                assert!(via.width() < 3e-13 * via.hi(), "{via:?}");
            }
        }
        assert!(ScaledE1Taylor::new(Interval::point(2.0), 1.5).is_none());
    }

    proptest::proptest! {
        /// The enclosures contain std's values (not trusted, but within an
        /// ulp or two) at random points.
        #[test]
        fn random_points_contain_std_values(x in -700.0f64..700.0, y in 1e-300f64..1e300, z in 0.001f64..600.0) {
            let e = Interval::point(x).exp();
            let s = x.exp();
            proptest::prop_assert!(e.lo() <= s.next_up().next_up() && s.next_down().next_down() <= e.hi());
            let l = Interval::point(y).ln();
            let t = y.ln();
            proptest::prop_assert!(l.lo() <= t.next_up() && t.next_down() <= l.hi());
            // E_1 against the f64 G_1 of lseries (its own series and continued
            // fraction with a hand-derived error bound): an independent computation
            let g = crate::lseries::g_values_for_tests(z);
            let v = Interval::point(z).exp_integral_e1();
            proptest::prop_assert!(v.lo() <= g.0 + g.1 && g.0 - g.1 <= v.hi(), "z = {}: {:?} vs {:?}", z, v, g);
        }
    }

    #[test]
    fn arithmetic_is_outward() {
        let a = Interval::point(0.1);
        let b = Interval::point(0.2);
        let s = a + b;
        assert!(exact(s.lo()) <= exact(0.1) + exact(0.2) && exact(0.1) + exact(0.2) <= exact(s.hi()));
        let p = a * b;
        assert!(exact(p.lo()) <= exact(0.1) * exact(0.2) && exact(0.1) * exact(0.2) <= exact(p.hi()));
        let q = a / b;
        assert!(exact(q.lo()) <= exact(0.1) / exact(0.2) && exact(0.1) / exact(0.2) <= exact(q.hi()));
        assert_eq!(Interval::point(1.0) / Interval::new(-1.0, 1.0), Interval::ENTIRE);
        assert!((Interval::new(-2.0, 3.0) * Interval::new(-5.0, 1.0)).contains(-15.0));
        assert!((Interval::new(-2.0, 3.0) * Interval::new(-5.0, 1.0)).contains(10.0));
    }
}
