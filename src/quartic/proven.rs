//! A proven `GL2(Z)`-equivalence test: the covariant point `τ(g)` enclosed in
//! a box by interval arithmetic, so that the finite set of candidate reduced
//! forms is provably complete.
//!
//! # Method
//!
//! The covariant point `τ(g)` (module [`super::reduction`]) is a rational
//! function of one root `φ` of the resolvent cubic `F(φ) = φ^3 - 3Iφ + J`
//! and of the coefficients of `g` and of its Hessian `g_H`. Writing
//! `P = 4φ g - g_H` (the square, up to a constant, of the quadratic
//! covariant `q_φ`) for a real root `φ`, the root of `q_φ = (A, B, C)` in the
//! upper half plane is
//!
//! ```text
//! Re τ = -P_1 / (4 P_0),      (Im τ)^2 = (8 P_0 P_2 - 3 P_1^2) / (16 P_0^2),
//! ```
//!
//! (from `P ∝ (A^2, 2AB, B^2 + 2AC, ..)`), and for the complex root `φ`
//! (two real roots of `g`) the real part `Q = Re q_φ` satisfies
//! `2·3Q^2 = K + Re P` with `K` the positive square root of the real form
//! `P·conj(P)`, so the same formulas apply to `(K + Re P)/2`. No square root
//! is needed for the test: every condition below is a polynomial condition
//! in `Re τ` and `(Im τ)^2`.
//!
//! The root `φ` is isolated exactly: brackets with dyadic end points whose
//! signs under `F` are computed in integers (three brackets with alternating
//! signs when `F` has three real roots, so each holds exactly one root and
//! their order names the root), then halved to the working precision. The
//! rest is interval arithmetic in malachite `Float` with every operation
//! rounded outwards, so the box contains the true `(Re τ, (Im τ)^2)`.
//!
//! # Why the candidate set is complete
//!
//! Let `F` be the closed fundamental domain `|Re τ| ≤ 1/2`, `|τ| ≥ 1` and
//! `F_ε` the same with `1/2 + ε` and `1 - ε`, `ε = 1/64`. If `τ ∈ F_ε` and
//! `γτ ∈ F` for `γ = [[a, b], [c, d]] ∈ SL2(Z)`, then `Im τ ≥ 0.838`,
//! `Im γτ ≥ √3/2` and `Im γτ = Im τ / |cτ + d|^2 ≤ 1 / (c^2 Im τ)` give
//! `|c| ≤ 1`; for `c = 0`, `|b| ≤ 1 + ε`; for `|c| = 1`,
//! `Im τ ≤ 1/Im γτ ≤ 1.155` and `(Re τ + d/c)^2 ≤ Im τ/Im γτ - (Im τ)^2 ≤ 0.63`
//! give `|d| ≤ 1`, the same argument for `γ^{-1}` gives `|a| ≤ 1`, and
//! `b = (ad - 1)/c` gives `|b| ≤ 2`. A matrix of determinant `-1` acts as
//! such a `γ` followed by the reflection `τ ↦ -conj(τ)`, which keeps `F` and
//! `F_ε`. So once the box of `τ(h)` lies in `F_ε`, every form `h∘N` with
//! `τ(h∘N) ∈ F` has `N ∈ GL2(Z)` with entries in `[-2, 2]`, and the interval
//! image of the box under `N` meets `F`: the candidate set, all such `N`
//! whose image box cannot be excluded from `F`, contains every exactly
//! reduced form of the class. Two classes are equal iff they share a
//! reduced form, so two quartics are `GL2(Z)`-equivalent iff their
//! candidate sets share a form, which is checked in integers; a shared form
//! gives the transformation, which is checked again by applying it.
//!
//! When the precision does not decide a step (a bracket whose signs are
//! not certain, a denominator interval containing zero, a box too wide for
//! `F_ε`), the precision is doubled; the enclosures converge because the
//! resolvent roots are simple (non-zero discriminant), so the loop ends.
//! The precision is capped only as a guard (`MAX_PREC` bits, far beyond any
//! input the library accepts), with an error, never an answer, past it.

use super::core::{mat_identity, mat_mul, Matrix, Quartic, RootType};
use super::numeric::significant_bits;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, DivRound, FloorSqrt};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode::{self, Ceiling, Floor, Nearest};
use malachite::{Float, Integer, Natural, Rational};
use std::cmp::Ordering;

/// The precision (bits) beyond which the test gives up with an error.
const MAX_PREC: u64 = 1 << 22;

/// `ε` of the enlarged domain `F_ε` (see the module documentation).
pub(super) const EPS: f64 = 1.0 / 64.0;

/// A closed interval `[lo, hi]` of `Float`s; every operation rounds outwards.
#[derive(Clone, Debug)]
struct Iv {
    lo: Float,
    hi: Float,
}

fn min_f(a: Float, b: Float) -> Float {
    if b < a {
        b
    } else {
        a
    }
}

fn max_f(a: Float, b: Float) -> Float {
    if b > a {
        b
    } else {
        a
    }
}

impl Iv {
    fn int(n: &Integer, prec: u64) -> Iv {
        Iv {
            lo: Float::from_integer_prec_round(n.clone(), prec, Floor).0,
            hi: Float::from_integer_prec_round(n.clone(), prec, Ceiling).0,
        }
    }
    fn rat(q: &Rational, prec: u64) -> Iv {
        Iv {
            lo: Float::from_rational_prec_round(q.clone(), prec, Floor).0,
            hi: Float::from_rational_prec_round(q.clone(), prec, Ceiling).0,
        }
    }
    fn small(n: i64, prec: u64) -> Iv {
        Iv::int(&Integer::from(n), prec)
    }
    fn add(&self, o: &Iv, prec: u64) -> Iv {
        Iv {
            lo: self.lo.clone().add_prec_round(o.lo.clone(), prec, Floor).0,
            hi: self.hi.clone().add_prec_round(o.hi.clone(), prec, Ceiling).0,
        }
    }
    fn sub(&self, o: &Iv, prec: u64) -> Iv {
        Iv {
            lo: self.lo.clone().sub_prec_round(o.hi.clone(), prec, Floor).0,
            hi: self.hi.clone().sub_prec_round(o.lo.clone(), prec, Ceiling).0,
        }
    }
    fn mul(&self, o: &Iv, prec: u64) -> Iv {
        let pairs = [(&self.lo, &o.lo), (&self.lo, &o.hi), (&self.hi, &o.lo), (&self.hi, &o.hi)];
        let down = pairs.map(|(x, y)| x.clone().mul_prec_round(y.clone(), prec, Floor).0);
        let up = pairs.map(|(x, y)| x.clone().mul_prec_round(y.clone(), prec, Ceiling).0);
        let [d0, d1, d2, d3] = down;
        let [u0, u1, u2, u3] = up;
        Iv { lo: min_f(min_f(d0, d1), min_f(d2, d3)), hi: max_f(max_f(u0, u1), max_f(u2, u3)) }
    }
    fn sqr(&self, prec: u64) -> Iv {
        let m = self.mul(self, prec);
        if self.lo <= 0u32 && self.hi >= 0u32 {
            Iv { lo: Float::ZERO, hi: m.hi }
        } else {
            m
        }
    }
    /// `self / o`, or `None` when `o` contains zero.
    fn div(&self, o: &Iv, prec: u64) -> Option<Iv> {
        if !o.excludes_zero() {
            return None;
        }
        let pairs = [(&self.lo, &o.lo), (&self.lo, &o.hi), (&self.hi, &o.lo), (&self.hi, &o.hi)];
        let down = pairs.map(|(x, y)| x.clone().div_prec_round(y.clone(), prec, Floor).0);
        let up = pairs.map(|(x, y)| x.clone().div_prec_round(y.clone(), prec, Ceiling).0);
        let [d0, d1, d2, d3] = down;
        let [u0, u1, u2, u3] = up;
        Some(Iv { lo: min_f(min_f(d0, d1), min_f(d2, d3)), hi: max_f(max_f(u0, u1), max_f(u2, u3)) })
    }
    /// The square root of an interval known (mathematically) to hold a
    /// non-negative value; a negative lower end from rounding is cut at 0.
    fn sqrt_nonneg(&self, prec: u64) -> Option<Iv> {
        if self.hi < 0u32 {
            return None;
        }
        let lo = if self.lo > 0u32 { self.lo.clone().sqrt_prec_round(prec, Floor).0 } else { Float::ZERO };
        Some(Iv { lo, hi: self.hi.clone().sqrt_prec_round(prec, Ceiling).0 })
    }
    fn excludes_zero(&self) -> bool {
        self.lo > 0u32 || self.hi < 0u32
    }
    fn positive(&self) -> bool {
        self.lo > 0u32
    }
    fn width(&self) -> f64 {
        f64::rounding_from(&(self.hi.clone() - self.lo.clone()), Ceiling).0
    }
    fn mid(&self) -> f64 {
        f64::rounding_from(&((self.hi.clone() + self.lo.clone()) >> 1u32), Nearest).0
    }
    fn finite(&self) -> bool {
        self.lo.is_finite() && self.hi.is_finite()
    }
}

/// `F(m / 2^k) · 2^{3k}` for `F(t) = t^3 - 3It + J`, exactly.
fn resolvent_at(m: &Integer, k: u64, i: &Integer, j: &Integer) -> Integer {
    let m2 = m * m;
    (&m2 * m) - Integer::from(3) * i * m * (Integer::ONE << (2 * k)) + j * (Integer::ONE << (3 * k))
}

pub(super) fn sign_at(m: &Integer, k: u64, i: &Integer, j: &Integer) -> Ordering {
    resolvent_at(m, k, i, j).cmp(&Integer::ZERO)
}

/// A bracket `[lo, hi] / 2^k` of one root of `F`, with `F(lo) < 0 < F(hi)`
/// or `F(lo) > 0 > F(hi)` (strict), or a degenerate bracket at an exact
/// root. Halved until its width is at most `2^{scale - prec}`, where
/// `2^scale` is about the size of the roots (`max(|I|^{1/2}, |J|^{1/3})`).
pub(super) fn refine(lo: Integer, hi: Integer, k: u64, i: &Integer, j: &Integer, prec: u64) -> (Integer, Integer, u64) {
    let top = (significant_bits(i) / 2).max(significant_bits(j) / 3) as i64 + 2;
    let lo_sign = sign_at(&lo, k, i, j);
    if lo_sign == Ordering::Equal {
        return (lo.clone(), lo, k);
    }
    // the scale at which a bracket of width 2 is narrow enough
    let target = prec as i64 + 2 - top;
    let width_now = significant_bits(&(&hi - &lo)) as i64 - k as i64;
    if width_now > top - prec as i64 && target > k as i64 {
        if let Some(b) = newton_bracket(&lo, &hi, k, i, j, target as u64) {
            return b;
        }
    }
    bisect(lo, hi, k, i, j, top - prec as i64, lo_sign)
}

/// Halve `[lo, hi] / 2^k` (with `lo_sign` the sign of `F` at `lo`) until
/// its width is at most `2^width_exp`.
fn bisect(mut lo: Integer, mut hi: Integer, mut k: u64, i: &Integer, j: &Integer, width_exp: i64, lo_sign: Ordering) -> (Integer, Integer, u64) {
    loop {
        let width = &hi - &lo;
        // width / 2^k <= 2^width_exp
        if (significant_bits(&width) as i64) - (k as i64) <= width_exp {
            return (lo, hi, k);
        }
        lo <<= 1u32;
        hi <<= 1u32;
        k += 1;
        let mid: Integer = (&lo + &hi) >> 1u32;
        match sign_at(&mid, k, i, j) {
            Ordering::Equal => return (mid.clone(), mid, k),
            s if s == lo_sign => lo = mid,
            _ => hi = mid,
        }
    }
}

/// A fast path for [`refine`]: Newton's method on dyadic numbers `m / 2^kk`
/// from a floating-point root, the scale doubling with the correct bits,
/// ending at scale `target`. Only the answer's check is trusted: the bracket
/// `[m - 1, m + 1] / 2^target` is returned when `F` takes strictly opposite
/// signs (or zero) at its ends, computed exactly, and it lies inside the given
/// bracket `[lo, hi] / 2^k`, so it holds the same root. `None` sends the
/// caller to bisection.
fn newton_bracket(lo: &Integer, hi: &Integer, k: u64, i: &Integer, j: &Integer, target: u64) -> Option<(Integer, Integer, u64)> {
    use super::numeric::{resolvent_roots, to_f64, CubicRoots};
    if k > 1000 || target > MAX_PREC {
        return None;
    }
    let scale = 2f64.powi(-(k as i32));
    let (lo_f, hi_f) = (to_f64(lo) * scale, to_f64(hi) * scale);
    let (i_f, j_f) = (to_f64(i), to_f64(j));
    let roots: Vec<f64> = match resolvent_roots(i_f, j_f, 4.0 * i_f * i_f * i_f > j_f * j_f) {
        CubicRoots::Three(r) => r.to_vec(),
        CubicRoots::One { real, .. } => vec![real],
    };
    let mid = (lo_f + hi_f) / 2.0;
    let guess = roots.into_iter().filter(|r| r.is_finite() && lo_f <= *r && *r <= hi_f).next().unwrap_or(mid);
    if !guess.is_finite() {
        return None;
    }
    let e: i64 = if guess.abs() < 1e-300 { 0 } else { guess.abs().log2().ceil() as i64 };
    let mut kk: u64 = (40 - e).clamp(0, target as i64) as u64;
    let mut m = Integer::rounding_from(guess * 2f64.powi(kk as i32), RoundingMode::Nearest).0;
    let three = Integer::from(3);
    let mut last = false;
    for _ in 0..64 {
        // one Newton step at scale kk: m -= F(x) 2^{3kk} / (F'(x) 2^{2kk})
        let fm = resolvent_at(&m, kk, i, j);
        let dm = &three * (&m * &m) - &three * i * (Integer::ONE << (2 * kk));
        if dm == 0u32 {
            return None;
        }
        let (q, _) = fm.div_round(&dm, RoundingMode::Nearest);
        m -= q;
        if last {
            break;
        }
        if kk >= target {
            last = true;
            continue;
        }
        let next = (2 * kk as i64 + e - 4).max(kk as i64 + 1).min(target as i64) as u64;
        m <<= next - kk;
        kk = next;
    }
    if kk != target || !last {
        return None;
    }
    let (a, b) = (&m - Integer::ONE, &m + Integer::ONE);
    // inside the given bracket (scales kk >= k)
    let shift = kk - k;
    if a < (lo << shift) || b > (hi << shift) {
        return None;
    }
    let (sa, sb) = (sign_at(&a, kk, i, j), sign_at(&b, kk, i, j));
    match (sa, sb) {
        (Ordering::Equal, _) => Some((a.clone(), a, kk)),
        (_, Ordering::Equal) => Some((b.clone(), b, kk)),
        (x, y) if x != y => Some((a, b, kk)),
        _ => None,
    }
}

/// Exact brackets of the three real roots of `F` (when `4I^3 > J^2`), in
/// ascending order: `[-2s', -s']`, `[-s, s]`, `[s', 2s']` with
/// `s ≤ √I ≤ s' = s + 2^-k`, accepted once `F(-s') > 0`, `F(-s) > 0`,
/// `F(s) < 0`, `F(s') < 0` hold (then, with `F(-2s') < 0 < F(2s')`, each bracket
/// holds exactly one root: three sign changes for a cubic).
pub(super) fn three_brackets(i: &Integer, j: &Integer) -> Option<[(Integer, Integer, u64); 3]> {
    let mut k = 8u64;
    while k < MAX_PREC {
        let scaled = Natural::try_from(i << (2 * k)).ok()?;
        let s = Integer::from(scaled.floor_sqrt());
        let s1 = &s + Integer::ONE;
        let ok = sign_at(&-&s1, k, i, j) == Ordering::Greater
            && sign_at(&-&s, k, i, j) == Ordering::Greater
            && sign_at(&s, k, i, j) == Ordering::Less
            && sign_at(&s1, k, i, j) == Ordering::Less
            && sign_at(&(Integer::from(-2) * &s1), k, i, j) == Ordering::Less
            && sign_at(&(Integer::from(2) * &s1), k, i, j) == Ordering::Greater;
        if ok {
            return Some([(Integer::from(-2) * &s1, -&s1, k), (-&s, s.clone(), k), (s1.clone(), Integer::from(2) * &s1, k)]);
        }
        k *= 2;
    }
    None
}

/// The single real root of `F` (when `4I^3 < J^2`): `F(-R) < 0 < F(R)` for
/// `R = 1 + 3|I| + |J|` (Cauchy's bound).
pub(super) fn one_bracket(i: &Integer, j: &Integer) -> (Integer, Integer, u64) {
    let r = Integer::ONE + Integer::from(3) * i.abs() + j.abs();
    (-&r, r, 0)
}

fn bracket_iv(b: &(Integer, Integer, u64), prec: u64) -> Iv {
    let den = Integer::ONE << b.2;
    let lo = Rational::from_integers(b.0.clone(), den.clone());
    let hi = Rational::from_integers(b.1.clone(), den);
    Iv { lo: Iv::rat(&lo, prec).lo, hi: Iv::rat(&hi, prec).hi }
}

/// The box `(Re τ, (Im τ)^2)` of `τ(g)`, or `Ok(None)` when the precision
/// does not decide it; an error for zero discriminant.
fn tau_box(g: &Quartic, prec: u64) -> Result<Option<(Iv, Iv)>, Error> {
    let rt = g.root_type().ok_or_else(|| Error::new(ErrorKind::InvalidValue, "a quartic of zero discriminant has no covariant point"))?;
    let (i, j) = (g.invariant_i(), g.invariant_j());
    let gc = g.coeff_refs();
    let gh = g.hessian();
    let hc = gh.coeff_refs();
    let gi: Vec<Iv> = gc.iter().take(3).map(|c| Iv::int(c, prec)).collect();
    let hi_: Vec<Iv> = hc.iter().take(3).map(|c| Iv::int(c, prec)).collect();
    let four = Iv::small(4, prec);
    let p: [Iv; 3] = if rt == RootType::TwoReal {
        let (lo, hi, k) = one_bracket(&i, &j);
        let b = refine(lo, hi, k, &i, &j, prec);
        let r = bracket_iv(&b, prec);
        // κ^2 = 3r^2/4 - 3I, φ = -r/2 + iκ
        let k2 = Iv::small(3, prec).mul(&r.sqr(prec), prec).div(&four, prec).and_then(|x| Some(x.sub(&Iv::small(3, prec).mul(&Iv::int(&i, prec), prec), prec)));
        let Some(k2) = k2 else { return Ok(None) };
        if !k2.positive() {
            return Ok(None);
        }
        let Some(kappa) = k2.sqrt_nonneg(prec) else { return Ok(None) };
        // Re P_n = -2r g_n - H_n, Im P_n = 4κ g_n, n = 0, 1, 2
        let two_r = Iv::small(2, prec).mul(&r, prec);
        let re: Vec<Iv> = (0..3).map(|n| Iv::small(0, prec).sub(&two_r.mul(&gi[n], prec), prec).sub(&hi_[n], prec)).collect();
        let im: Vec<Iv> = (0..3).map(|n| four.mul(&kappa, prec).mul(&gi[n], prec)).collect();
        // m_n: coefficients of P·conj(P) (n = 0, 1, 2)
        let dot = |a: usize, b: usize| re[a].mul(&re[b], prec).add(&im[a].mul(&im[b], prec), prec);
        let m0 = re[0].sqr(prec).add(&im[0].sqr(prec), prec);
        let m1 = Iv::small(2, prec).mul(&dot(0, 1), prec);
        let m2 = Iv::small(2, prec).mul(&dot(0, 2), prec).add(&re[1].sqr(prec).add(&im[1].sqr(prec), prec), prec);
        let Some(k0) = m0.sqrt_nonneg(prec) else { return Ok(None) };
        let two_k0 = Iv::small(2, prec).mul(&k0, prec);
        let Some(k1) = m1.div(&two_k0, prec) else { return Ok(None) };
        let Some(k2) = m2.sub(&k1.sqr(prec), prec).div(&two_k0, prec) else { return Ok(None) };
        [k0.add(&re[0], prec), k1.add(&re[1], prec), k2.add(&re[2], prec)]
    } else {
        let Some(brackets) = three_brackets(&i, &j) else { return Ok(None) };
        let idx = match rt {
            RootType::FourReal => 1,
            RootType::PositiveDefinite => 0,
            _ => 2,
        };
        let [b0, b1, b2] = brackets;
        let b = match idx {
            0 => b0,
            1 => b1,
            _ => b2,
        };
        let b = refine(b.0, b.1, b.2, &i, &j, prec);
        let phi = bracket_iv(&b, prec);
        let f4 = four.mul(&phi, prec);
        [0, 1, 2].map(|n| f4.mul(&gi[n], prec).sub(&hi_[n], prec))
    };
    // Re τ = -P1 / (4 P0), (Im τ)^2 = (8 P0 P2 - 3 P1^2) / (16 P0^2)
    let Some(x) = Iv::small(0, prec).sub(&p[1], prec).div(&four.mul(&p[0], prec), prec) else { return Ok(None) };
    let num = Iv::small(8, prec).mul(&p[0].mul(&p[2], prec), prec).sub(&Iv::small(3, prec).mul(&p[1].sqr(prec), prec), prec);
    let Some(y2) = num.div(&Iv::small(16, prec).mul(&p[0].sqr(prec), prec), prec) else { return Ok(None) };
    if !x.finite() || !y2.finite() {
        return Ok(None);
    }
    if y2.hi <= 0u32 {
        return Err(Error::internal("quartic::proven", format!("the covariant of {g:?} is not definite")));
    }
    if !y2.positive() {
        return Ok(None);
    }
    Ok(Some((x, y2)))
}

/// Whether the box certainly lies in `F_ε`.
fn inside_enlarged(x: &Iv, y2: &Iv, prec: u64) -> bool {
    let half = Float::from(0.5 + EPS);
    let r2 = x.sqr(prec).add(y2, prec);
    let bound = Float::from((1.0 - EPS) * (1.0 - EPS));
    x.hi <= half && x.lo >= -half && r2.lo >= bound
}

/// The box of `τ(h∘N)` from that of `τ(h)`: `N^{-1}τ` (reflected into the
/// upper half plane), as `(Re, |.|^2)`.
fn act_box(n: &[[i64; 2]; 2], x: &Iv, y2: &Iv, prec: u64) -> Option<(Iv, Iv)> {
    let [[a, b], [c, d]] = *n;
    let (a, b, c, d) = (Iv::small(a, prec), Iv::small(b, prec), Iv::small(c, prec), Iv::small(d, prec));
    // w = (dτ - b) / (-cτ + a); with τ = x + iy:
    // Re w = ((dx - b)(a - cx) - dc y^2) / D, |w|^2 = ((dx - b)^2 + d^2 y^2) / D,
    // D = (a - cx)^2 + c^2 y^2
    let u = d.mul(x, prec).sub(&b, prec);
    let v = a.sub(&c.mul(x, prec), prec);
    let den = v.sqr(prec).add(&c.sqr(prec).mul(y2, prec), prec);
    let re = u.mul(&v, prec).sub(&d.mul(&c, prec).mul(y2, prec), prec).div(&den, prec)?;
    let ab2 = u.sqr(prec).add(&d.sqr(prec).mul(y2, prec), prec).div(&den, prec)?;
    Some((re, ab2))
}

/// Whether the box `(re, |w|^2)` may meet the closed domain `F`.
fn may_meet_domain(re: &Iv, ab2: &Iv) -> bool {
    let half = Float::from(0.5);
    !(re.lo > half || re.hi < -half || ab2.hi < 1u32)
}

/// [`act_box`] and [`may_meet_domain`] in `f64` interval arithmetic (the
/// box rounded outwards first): `false` only when the image provably misses
/// `F`.
pub(super) fn may_meet_domain_f64(n: &[[i64; 2]; 2], xi: crate::enclosure::Interval, yi: crate::enclosure::Interval) -> bool {
    use crate::enclosure::Interval as R;
    let sq = sq_f64;
    let [[a, b], [c, d]] = *n;
    let (a, b, c, d) = (R::from_i64(a), R::from_i64(b), R::from_i64(c), R::from_i64(d));
    let u = d * xi - b;
    let v = a - c * xi;
    let den = sq(v) + sq(c) * yi;
    let re = (u * v - d * c * yi) / den;
    let ab2 = (sq(u) + sq(d) * yi) / den;
    !(re.lo() > 0.5 || re.hi() < -0.5 || ab2.hi() < 1.0)
}

/// The square of an `f64` interval (non-negative also when it straddles 0).
pub(super) fn sq_f64(v: crate::enclosure::Interval) -> crate::enclosure::Interval {
    use crate::enclosure::Interval as R;
    let far = v.lo().abs().max(v.hi().abs());
    let near = if v.lo() > 0.0 || v.hi() < 0.0 { v.lo().abs().min(v.hi().abs()) } else { 0.0 };
    R::new((R::point(near) * R::point(near)).lo(), (R::point(far) * R::point(far)).hi())
}

/// The bracket `[lo, hi] / 2^k` as an `f64` interval rounded outwards.
pub(super) fn bracket_f64(b: &(Integer, Integer, u64), prec: u64) -> crate::enclosure::Interval {
    outward_f64(&bracket_iv(b, prec))
}

/// The interval rounded outwards to `f64` end points.
fn outward_f64(v: &Iv) -> crate::enclosure::Interval {
    crate::enclosure::Interval::new(f64::rounding_from(&v.lo, Floor).0, f64::rounding_from(&v.hi, Ceiling).0)
}

fn start_prec(h: &Quartic) -> u64 {
    // enough for most forms (the box need only fit in `F_ε`, margin 1/64,
    // after the cancellation in `P = 4φg - g_H`, about `2·bits`); the loop
    // doubles it where it does not decide
    let bits = h.coeff_refs().iter().map(|c| significant_bits(c)).max().unwrap_or(0);
    64 + 2 * bits
}

/// A form `h = g∘m` whose covariant point provably lies in `F_ε`, with the
/// box of `τ(h)` and the precision that gave it.
fn proven_reduction(g: &Quartic) -> Result<(Quartic, Matrix, Iv, Iv, u64), Error> {
    // fast start: the floating-point reduction (exact moves, so h = g∘m
    // whatever its accuracy); its answer is only a starting point
    let (mut h, mut m) = match super::reduction::reduce_tau(g) {
        Some((h, m, _)) => (h, m),
        None => (g.clone(), mat_identity()),
    };
    let mut prec = start_prec(&h);
    let mut moves = 0u32;
    loop {
        if prec > MAX_PREC {
            return Err(Error::internal("quartic::proven", format!("the covariant point of {g:?} was not enclosed within {MAX_PREC} bits")));
        }
        let Some((x, y2)) = tau_box(&h, prec)? else {
            prec *= 2;
            continue;
        };
        if inside_enlarged(&x, &y2, prec) {
            return Ok((h, m, x, y2, prec));
        }
        if x.width() > 1e-4 || y2.width() > 1e-4 {
            prec *= 2;
            continue;
        }
        moves += 1;
        if moves > 100_000 {
            return Err(Error::internal("quartic::proven", format!("the reduction of {g:?} did not end")));
        }
        let (xm, y2m) = (x.mid(), y2.mid());
        let tm: Matrix = if xm.abs() > 0.5 + EPS / 2.0 {
            let n = Integer::rounding_from(xm, RoundingMode::Nearest).0;
            [[Integer::ONE, n], [Integer::ZERO, Integer::ONE]]
        } else if xm * xm + y2m < (1.0 - EPS / 2.0) * (1.0 - EPS / 2.0) {
            [[Integer::ZERO, Integer::ONE], [-Integer::ONE, Integer::ZERO]]
        } else {
            prec *= 2;
            continue;
        };
        h = h.transform(&tm);
        m = mat_mul(&m, &tm);
        prec = prec.max(start_prec(&h));
    }
}

/// Every form `g∘M` (with `M`) whose covariant point may lie in the closed
/// fundamental domain: a set that provably contains every reduced form of
/// the `GL2(Z)`-class of `g` (see the module documentation). An error for
/// zero discriminant.
pub(crate) fn candidate_set(g: &Quartic) -> Result<Vec<(Quartic, Matrix)>, Error> {
    let (h, m, x, y2, prec) = proven_reduction(g)?;
    let mut out: Vec<(Quartic, Matrix)> = Vec::new();
    let (xi, yi) = (outward_f64(&x), outward_f64(&y2));
    let tight = xi.hi() - xi.lo() < 1e-12 && yi.hi() - yi.lo() < 1e-12 * yi.hi().max(1.0);
    for n in super::reduction::neighbours() {
        // a quick rigorous filter first: the box rounded outwards to f64
        // intervals (crate::enclosure, outward rounding); only a candidate
        // it cannot exclude is checked again at full precision
        if !may_meet_domain_f64(n, xi, yi) {
            continue;
        }
        if tight {
            // the f64 box is already narrow: the full-precision image could
            // exclude only forms whose image lies within rounding of the
            // boundary; keeping them keeps the set complete (a superset)
            let c = candidate(&h, &m, n);
            if !out.iter().any(|(f, _)| *f == c.0) {
                out.push(c);
            }
            continue;
        }
        let Some((re, ab2)) = act_box(n, &x, &y2, prec) else {
            // a denominator interval with zero cannot occur (D ≥ c^2 (Im τ)^2 > 0
            // or D = a^2 = 1); keep the candidate to stay complete
            out.push(candidate(&h, &m, n));
            continue;
        };
        if may_meet_domain(&re, &ab2) {
            let c = candidate(&h, &m, n);
            if !out.iter().any(|(f, _)| *f == c.0) {
                out.push(c);
            }
        }
    }
    Ok(out)
}

fn candidate(h: &Quartic, m: &Matrix, n: &[[i64; 2]; 2]) -> (Quartic, Matrix) {
    let nm: Matrix = [[Integer::from(n[0][0]), Integer::from(n[0][1])], [Integer::from(n[1][0]), Integer::from(n[1][1])]];
    (h.transform(&nm), mat_mul(m, &nm))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn brackets_of_a_split_resolvent() {
        // F = (t + 7)(t - 2)(t - 5) = t^3 - 39 t + 70: I = 13, J = 70
        let (i, j) = (Integer::from(13), Integer::from(70));
        let b = three_brackets(&i, &j).unwrap();
        for (bk, root) in b.iter().zip([-7i64, 2, 5]) {
            let (lo, hi, k) = refine(bk.0.clone(), bk.1.clone(), bk.2, &i, &j, 60);
            let r = Rational::from(root);
            let den = Integer::ONE << k;
            assert!(Rational::from_integers(lo, den.clone()) <= r && r <= Rational::from_integers(hi, den));
        }
    }

    #[test]
    fn newton_brackets_hold_the_root_bisection_finds() {
        // resolvents with three real roots and with one, small and large
        // invariants; the Newton bracket must overlap the bisection bracket
        // of the same root (each holds exactly that root) and meet the width
        let (mut tried, mut hits) = (0, 0);
        for (i, j) in [(13i64, 70i64), (1, 0), (7, -3), (100003, 12345), (3, 100), (48, -1000), (123456789, 987654321)] {
            let (i, j) = (Integer::from(i), Integer::from(j));
            let brackets: Vec<(Integer, Integer, u64)> = match three_brackets(&i, &j) {
                Some(b) if Integer::from(4) * &i * &i * &i > &j * &j => b.to_vec(),
                _ => vec![one_bracket(&i, &j)],
            };
            let top = (significant_bits(&i) / 2).max(significant_bits(&j) / 3) as i64 + 2;
            for prec in [60u64, 100, 300] {
                for (lo, hi, k) in &brackets {
                    let target = (prec as i64 + 2 - top) as u64;
                    tried += 1;
                    let Some((a, b, kk)) = newton_bracket(lo, hi, *k, &i, &j, target) else { continue };
                    hits += 1;
                    let lo_sign = sign_at(lo, *k, &i, &j);
                    let (c, d, kb) = bisect(lo.clone(), hi.clone(), *k, &i, &j, top - prec as i64, lo_sign);
                    let (ra, rb) = (Rational::from_integers(a, Integer::ONE << kk), Rational::from_integers(b, Integer::ONE << kk));
                    let (rc, rd) = (Rational::from_integers(c, Integer::ONE << kb), Rational::from_integers(d, Integer::ONE << kb));
                    assert!(ra <= rd && rc <= rb, "i = {i}, j = {j}, prec = {prec}");
                    use malachite::base::num::arithmetic::traits::PowerOf2;
                    assert!(&rb - &ra <= <Rational as PowerOf2<i64>>::power_of_2(top - prec as i64), "width at prec {prec}");
                }
            }
        }
        // the fast path is taken (it may decline, never mislead)
        assert!(hits * 10 >= tried * 9, "{hits} of {tried}");
    }

    #[test]
    fn tau_of_symmetric_forms_is_i() {
        // forms fixed by (x, z) -> (z, -x) have τ = i (as in the reduction tests)
        for g in [[1, 0, 0, 0, -1], [1, 0, 0, 0, 1], [1, 0, -5, 0, 1], [1, 0, 3, 0, 1], [-1, 0, 1, 0, -1]] {
            let (x, y2) = tau_box(&Quartic::from_coeffs(g), 128).unwrap().unwrap();
            assert!(x.lo <= 0u32 && x.hi >= 0u32 && x.width() < 1e-20, "{g:?}");
            assert!(y2.lo <= 1u32 && y2.hi >= 1u32 && y2.width() < 1e-20, "{g:?}");
        }
    }
}
