//! Rational points of bounded height on a plane cubic `F(x, y, z) = 0`.
//!
//! The coverings of a 3-descent are plane cubics, and the generator of a
//! curve appears on them with coordinates about the cube root of those on
//! a 2-covering. A plain search tests about `H^2` pairs for the points of
//! height at most `H`; this one costs about `H` steps, by the lattice
//! method for points near a curve (N. D. Elkies, Rational points near
//! curves and small nonzero `|x^3 - y^2|` via lattice reduction, ANTS IV,
//! LNCS 1838, 2000):
//!
//! - the real curve is cut into arcs, in each of the three affine charts
//!   (the coordinate of largest absolute value set to 1) and for each of
//!   the two coordinates as parameter, keeping the arcs whose slope over
//!   the parameter is at most `5/4` (every point lies on such an arc in
//!   one of the six passes);
//! - a rational point `(x : y : z)` with `|z| <= H` on an arc of half
//!   width `w` around `(u, v)` with slope `s`, whose distance from the
//!   tangent line stays below `d`, is an integer vector in the box
//!   `|z| <= H`, `|x - u z| <= w H`, `|y - v z - s (x - u z)| <= d H`;
//! - the arcs are cut so that the box has volume below `1/10` (`d` is
//!   about the curvature times `w^2`, so `w` is about `1 / H`), so its
//!   lattice points lie in a plane: an LLL-reduced basis of `Z^3` in the
//!   box's norm and a Fincke-Pohst enumeration of the ball around the box
//!   give a handful of candidates, each tested with exact arithmetic.
//!
//! The box is computed in `f64`, enlarged by twice the measured deviation
//! plus the rounding of its coordinates (about `4e-16 (1 + |s|) H`), which
//! bounds heights to [`PLANE_MAX_HEIGHT`] = `2^24`. This makes the search
//! exhaustive up to floating-point effects that the margins are chosen to
//! cover; the tests compare it with [`search_plane_cubic_naive`], which
//! tries every triple. It is not a proof that no point was missed, and no
//! part of the library uses it as one: only the points found are used,
//! each checked exactly. Singular cubics are accepted, but a singular point
//! of the curve (a node, a cusp, an isolated real point) lies on no arc and
//! may be missed without the search knowing it; arcs that meet a region of
//! near-zero gradient are skipped and the search is then not reported
//! complete. The coverings of a descent are smooth.

use super::{SearchLimits, SearchOutcome};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::UnsignedAbs;
use malachite::base::num::basic::traits::Zero;
use malachite::Integer;
use std::sync::atomic::Ordering;
use std::time::Instant;

/// The largest height the plane-cubic searches accept; higher limits are
/// clamped to it and the search is then never reported complete.
///
/// ```
/// assert_eq!(twofold::search::PLANE_MAX_HEIGHT, 1 << 24);
/// ```
pub const PLANE_MAX_HEIGHT: u64 = 1 << 24;

/// The monomials of a ternary cubic in the order of its ten coefficients:
/// `x^3, x^2 y, x^2 z, x y^2, x y z, x z^2, y^3, y^2 z, y z^2, z^3`.
pub(crate) const MONOMIALS: [[usize; 3]; 10] = [
    [3, 0, 0],
    [2, 1, 0],
    [2, 0, 1],
    [1, 2, 0],
    [1, 1, 1],
    [1, 0, 2],
    [0, 3, 0],
    [0, 2, 1],
    [0, 1, 2],
    [0, 0, 3],
];

/// A point `(x : y : z)` of a plane cubic: coprime integers, the first
/// non-zero coordinate positive.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::PlanePoint;
/// let p = PlanePoint { x: Integer::from(2), y: Integer::from(-1), z: Integer::from(1) };
/// assert_eq!(p.height(), 2);
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct PlanePoint {
    /// The first coordinate.
    pub x: Integer,
    /// The second coordinate.
    pub y: Integer,
    /// The third coordinate.
    pub z: Integer,
}

impl PlanePoint {
    /// The naive height `max(|x|, |y|, |z|)` (saturating at `u64::MAX`).
    pub fn height(&self) -> u64 {
        [&self.x, &self.y, &self.z].iter().map(|c| u64::try_from(&c.unsigned_abs()).unwrap_or(u64::MAX)).max().unwrap_or(0)
    }

    fn from_primitive(p: [i64; 3]) -> PlanePoint {
        PlanePoint { x: Integer::from(p[0]), y: Integer::from(p[1]), z: Integer::from(p[2]) }
    }
}

fn bad(kind: ErrorKind, msg: impl Into<String>) -> Error {
    Error::new(kind, msg).in_stage("the plane-cubic search")
}

/// The form's coefficients as `i128`, or a typed error.
fn coefficients(form: &[Integer; 10]) -> Result<[i128; 10], Error> {
    let mut c = [0i128; 10];
    for (k, v) in form.iter().enumerate() {
        c[k] = i128::try_from(v).map_err(|_| bad(ErrorKind::TooLarge, format!("coefficient {v} of the cubic does not fit in 128 bits")))?;
    }
    if c.iter().all(|&v| v == 0) {
        return Err(bad(ErrorKind::InvalidValue, "the cubic form is zero"));
    }
    Ok(c)
}

/// `F(p) == 0`, exactly: in `i128` when no step overflows, else in
/// `Integer`.
fn vanishes(c: &[i128; 10], p: [i64; 3]) -> bool {
    let checked = || -> Option<i128> {
        let mut s = 0i128;
        for (k, e) in MONOMIALS.iter().enumerate() {
            let mut t = c[k];
            for (i, &ei) in e.iter().enumerate() {
                for _ in 0..ei {
                    t = t.checked_mul(i128::from(p[i]))?;
                }
            }
            s = s.checked_add(t)?;
        }
        Some(s)
    };
    match checked() {
        Some(s) => s == 0,
        None => {
            let mut s = Integer::ZERO;
            for (k, e) in MONOMIALS.iter().enumerate() {
                let mut t = Integer::from(c[k]);
                for (i, &ei) in e.iter().enumerate() {
                    for _ in 0..ei {
                        t *= Integer::from(p[i]);
                    }
                }
                s += t;
            }
            s == 0
        }
    }
}

fn gcd(a: i64, b: i64) -> i64 {
    let (mut a, mut b) = (a.unsigned_abs(), b.unsigned_abs());
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a as i64
}

/// The primitive representative with the first non-zero coordinate
/// positive (`None` for the zero vector).
fn normalised(p: [i64; 3]) -> Option<[i64; 3]> {
    let g = gcd(gcd(p[0], p[1]), p[2]);
    if g == 0 {
        return None;
    }
    let mut r = p.map(|v| v / g);
    if r.iter().find(|&&v| v != 0).is_some_and(|&v| v < 0) {
        r = r.map(|v| -v);
    }
    Some(r)
}

fn height_of(p: &[i64; 3]) -> u64 {
    p.iter().map(|v| v.unsigned_abs()).max().unwrap_or(0)
}

fn stop_now(limits: &SearchLimits) -> bool {
    limits.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed)) || limits.deadline.is_some_and(|d| Instant::now() >= d)
}

/// One pass: parameter coordinate `idx[0]`, solved coordinate `idx[1]`,
/// chart coordinate `idx[2]` set to 1. `coef[j][k]` multiplies `a^k b^j`.
struct Pass {
    coef: [[f64; 4]; 4],
    idx: [usize; 3],
}

impl Pass {
    fn new(c: &[i128; 10], idx: [usize; 3]) -> Pass {
        let scale = c.iter().map(|v| v.unsigned_abs()).max().unwrap_or(1) as f64;
        let mut coef = [[0.0; 4]; 4];
        for (k, e) in MONOMIALS.iter().enumerate() {
            coef[e[idx[1]]][e[idx[0]]] += c[k] as f64 / scale;
        }
        Pass { coef, idx }
    }

    /// The coefficients of `F(a, b, 1)` as a cubic in `b`.
    fn in_b(&self, a: f64) -> [f64; 4] {
        self.coef.map(|cj| ((cj[3] * a + cj[2]) * a + cj[1]) * a + cj[0])
    }

    fn value_and_slope(&self, a: f64, b: f64) -> (f64, f64, f64) {
        let r = self.in_b(a);
        let f = ((r[3] * b + r[2]) * b + r[1]) * b + r[0];
        let fb = (3.0 * r[3] * b + 2.0 * r[2]) * b + r[1];
        let mut fa = 0.0;
        let mut bj = 1.0;
        for cj in &self.coef {
            fa += ((3.0 * cj[3] * a + 2.0 * cj[2]) * a + cj[1]) * bj;
            bj *= b;
        }
        (f, fa, fb)
    }

    /// Newton's method for `b` on `F(a, b, 1) = 0` from `b`.
    fn on_curve(&self, a: f64, mut b: f64) -> Option<f64> {
        for _ in 0..6 {
            let (f, _, fb) = self.value_and_slope(a, b);
            if fb == 0.0 || !fb.is_finite() {
                return None;
            }
            let step = f / fb;
            b -= step;
            if step.abs() <= 1e-16 * (1.0 + b.abs()) {
                break;
            }
        }
        b.is_finite().then_some(b)
    }
}

/// The real roots of `r[3] b^3 + r[2] b^2 + r[1] b + r[0]` (approximate;
/// the caller polishes them by Newton's method).
fn real_roots(r: [f64; 4], out: &mut Vec<f64>) {
    out.clear();
    let scale = r.iter().fold(0.0f64, |m, x| m.max(x.abs()));
    if scale == 0.0 {
        return;
    }
    if r[3].abs() < 1e-13 * scale {
        if r[2].abs() < 1e-13 * scale {
            if r[1].abs() >= 1e-13 * scale {
                out.push(-r[0] / r[1]);
            }
            return;
        }
        let disc = r[1] * r[1] - 4.0 * r[2] * r[0];
        if disc >= 0.0 {
            let s = disc.sqrt();
            out.push((-r[1] + s) / (2.0 * r[2]));
            out.push((-r[1] - s) / (2.0 * r[2]));
        }
        return;
    }
    let (b, c, d) = (r[2] / r[3], r[1] / r[3], r[0] / r[3]);
    let p = c - b * b / 3.0;
    let q = 2.0 * b * b * b / 27.0 - b * c / 3.0 + d;
    let disc = q * q / 4.0 + p * p * p / 27.0;
    if disc > 0.0 {
        let s = disc.sqrt();
        out.push((-q / 2.0 + s).cbrt() + (-q / 2.0 - s).cbrt() - b / 3.0);
    } else {
        let m = (-p / 3.0).sqrt();
        if m == 0.0 {
            out.push(-b / 3.0);
            return;
        }
        let phi = ((-q / 2.0) / (m * m * m)).clamp(-1.0, 1.0).acos();
        for k in 0..3 {
            out.push(2.0 * m * ((phi + 2.0 * std::f64::consts::PI * k as f64) / 3.0).cos() - b / 3.0);
        }
    }
}

/// An arc: centre `(u, v)`, slope `s`, half width `w` in `u`, and the
/// bound `d` on its distance from the tangent line (in `v`).
#[derive(Clone, Copy)]
struct Arc {
    u: f64,
    v: f64,
    s: f64,
    w: f64,
    d: f64,
}

/// The box coordinates of the integer vector `(a, b, c)` (local names:
/// parameter, solved, chart), each in `[-1, 1]` inside the box.
#[inline]
fn image(arc: &Arc, h: f64, p: [i64; 3]) -> [f64; 3] {
    let (a, b, c) = (p[0] as f64, p[1] as f64, p[2] as f64);
    let da = a - arc.u * c;
    let db = b - arc.v * c - arc.s * da;
    [c / h, da / (arc.w * h), db / (arc.d * h)]
}

#[inline]
fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

/// Gram-Schmidt of the images of `basis`: `(mu, |b*|^2)`.
#[inline]
fn gram_schmidt(arc: &Arc, h: f64, basis: &[[i64; 3]; 3]) -> ([[f64; 3]; 3], [f64; 3]) {
    let img = basis.map(|b| image(arc, h, b));
    let mut star = [[0.0; 3]; 3];
    let mut norm = [0.0; 3];
    let mut mu = [[0.0; 3]; 3];
    for i in 0..3 {
        star[i] = img[i];
        for j in 0..i {
            mu[i][j] = dot(img[i], star[j]) / norm[j];
            for t in 0..3 {
                star[i][t] -= mu[i][j] * star[j][t];
            }
        }
        norm[i] = dot(star[i], star[i]);
    }
    (mu, norm)
}

/// The integer vectors in the ball of radius `sqrt(3.15)` around the
/// arc's box (which contains the box), into `out`.
fn candidates(arc: &Arc, h: f64, out: &mut Vec<[i64; 3]>) {
    out.clear();
    // LLL (delta 0.99); the images are recomputed from the integer vectors
    // after every change, so rounding does not accumulate
    let mut basis: [[i64; 3]; 3] = [[0, 0, 1], [1, 0, 0], [0, 1, 0]];
    let mut k = 1;
    let mut rounds = 0;
    while k < 3 && rounds < 400 {
        rounds += 1;
        let (mu, norm) = gram_schmidt(arc, h, &basis);
        let mut reduced = false;
        for j in (0..k).rev() {
            let q = mu[k][j].round();
            if q != 0.0 && q.is_finite() && q.abs() < 1e15 {
                let qi = q as i64;
                for t in 0..3 {
                    basis[k][t] = basis[k][t].saturating_sub(qi.saturating_mul(basis[j][t]));
                }
                reduced = true;
                break;
            }
        }
        if reduced {
            continue;
        }
        if norm[k] >= (0.99 - mu[k][k - 1] * mu[k][k - 1]) * norm[k - 1] {
            k += 1;
        } else {
            basis.swap(k, k - 1);
            k = (k - 1).max(1);
        }
    }
    let (mu, norm) = gram_schmidt(arc, h, &basis);
    if norm.iter().any(|n| !(n.is_finite() && *n > 0.0)) {
        return;
    }
    let r2 = 3.15;
    let m2 = (r2 / norm[2]).sqrt().floor() as i64;
    for c2 in -m2..=m2 {
        let l2 = (c2 * c2) as f64 * norm[2];
        let centre1 = -(c2 as f64) * mu[2][1];
        let w1 = ((r2 - l2) / norm[1]).max(0.0).sqrt();
        for c1 in (centre1 - w1).ceil() as i64..=(centre1 + w1).floor() as i64 {
            let t1 = c1 as f64 - centre1;
            let l1 = l2 + t1 * t1 * norm[1];
            if l1 > r2 {
                continue;
            }
            let centre0 = -(c1 as f64) * mu[1][0] - (c2 as f64) * mu[2][0];
            let w0 = ((r2 - l1) / norm[0]).max(0.0).sqrt();
            for c0 in (centre0 - w0).ceil() as i64..=(centre0 + w0).floor() as i64 {
                if (c0, c1, c2) == (0, 0, 0) {
                    continue;
                }
                let mut p = [0i64; 3];
                for (t, pt) in p.iter_mut().enumerate() {
                    *pt = c0.saturating_mul(basis[0][t]).saturating_add(c1.saturating_mul(basis[1][t])).saturating_add(c2.saturating_mul(basis[2][t]));
                }
                out.push(p);
            }
        }
    }
}

/// The state of one search at one height.
struct Shell<'a> {
    c: &'a [i128; 10],
    limits: &'a SearchLimits,
    h: f64,
    bound: u64,
    found: Vec<[i64; 3]>,
    tested: u64,
    degenerate: bool,
    stopped: bool,
    roots: Vec<f64>,
    stack: Vec<(f64, f64, f64)>,
    cand: Vec<[i64; 3]>,
}

impl Shell<'_> {
    fn run(&mut self) {
        const PASSES: [[usize; 3]; 6] = [[0, 1, 2], [1, 0, 2], [0, 2, 1], [2, 0, 1], [1, 2, 0], [2, 1, 0]];
        let step = 0.5 / self.h;
        let steps = (2.0 / step).ceil() as u64;
        for idx in PASSES {
            let pass = Pass::new(self.c, idx);
            for i in 0..steps {
                if i % 4096 == 0 && stop_now(self.limits) {
                    self.stopped = true;
                    return;
                }
                let u = -1.0 + (i as f64 + 0.5) * step;
                let mut roots = std::mem::take(&mut self.roots);
                real_roots(pass.in_b(u), &mut roots);
                for (i, &v0) in roots.iter().enumerate() {
                    if v0.abs() <= 1.0 + 1e-6 {
                        // half the distance to the nearest other root: Newton's
                        // method may not leave it (two close branches, as near
                        // a node, must not merge into one)
                        let iso = roots.iter().enumerate().filter(|&(j, _)| j != i).map(|(_, &r)| 0.5 * (r - v0).abs()).fold(f64::INFINITY, f64::min);
                        self.arcs_from(&pass, u, v0, 0.5 * step, iso);
                    }
                }
                self.roots = roots;
                if self.stopped {
                    return;
                }
            }
        }
    }

    /// The arcs around `(u, v0)` of half width `w`, cut until their boxes
    /// are small, and their lattice points.
    fn arcs_from(&mut self, pass: &Pass, u: f64, v0: f64, w: f64, iso: f64) {
        let v = match pass.on_curve(u, v0) {
            Some(v) if (v - v0).abs() < iso => v,
            _ => {
                self.degenerate = true;
                v0
            }
        };
        let (_, fa, fb) = pass.value_and_slope(u, v);
        if fb == 0.0 || (fa / fb).abs() > 1.25 {
            return;
        }
        self.stack.clear();
        self.stack.push((u, v, w));
        while let Some((uc, vc, w)) = self.stack.pop() {
            let Some(arc) = self.arc(pass, uc, vc, w) else {
                // Newton's method left the branch or met a vanishing
                // gradient: shorter arcs, down to a floor
                if w * self.h < 1e-3 {
                    self.degenerate = true;
                } else {
                    let q = 0.5 * w;
                    self.stack.push((uc - q, vc, q));
                    self.stack.push((uc + q, vc, q));
                }
                continue;
            };
            let h3 = self.h * self.h * self.h;
            if arc.w * arc.d * h3 > 0.1 {
                if w * self.h < 1e-3 {
                    self.degenerate = true;
                    continue;
                }
                let q = 0.5 * w;
                self.stack.push((uc - q, vc - arc.s * q, q));
                self.stack.push((uc + q, vc + arc.s * q, q));
                continue;
            }
            let mut cand = std::mem::take(&mut self.cand);
            candidates(&arc, self.h, &mut cand);
            for &p in &cand {
                self.tested += 1;
                let mut q = [0i64; 3];
                for t in 0..3 {
                    q[pass.idx[t]] = p[t];
                }
                if let Some(r) = normalised(q) {
                    if height_of(&r) <= self.bound && vanishes(self.c, r) {
                        self.found.push(r);
                        if self.limits.first_only {
                            self.stopped = true;
                        }
                    }
                }
            }
            self.cand = cand;
            if self.stopped {
                return;
            }
        }
    }

    /// The arc at `(u, v)` of half width `w`: slope, and the distance bound
    /// from the deviation at `±w/2` and `±w` (doubled) plus the rounding of
    /// the box coordinates.
    fn arc(&self, pass: &Pass, u: f64, v0: f64, w: f64) -> Option<Arc> {
        let v = pass.on_curve(u, v0)?;
        if (v - v0).abs() > 2.0 * w + 1e-12 {
            return None;
        }
        let (_, fa, fb) = pass.value_and_slope(u, v);
        let grad = fa.abs() + fb.abs();
        if !(grad > 1e-9) || fb == 0.0 {
            return None;
        }
        let s = -fa / fb;
        let mut dev = 0.0f64;
        let mut devs = [0.0f64; 4];
        for (k, t) in [-w, -0.5 * w, 0.5 * w, w].into_iter().enumerate() {
            let vt = pass.on_curve(u + t, v + s * t)?;
            let e = (vt - v - s * t).abs();
            if !(e.is_finite()) || e > 0.5 * w * (1.0 + s.abs()) + 1e-12 {
                return None;
            }
            devs[k] = e;
            dev = dev.max(e);
        }
        // a curved arc deviates about four times more at w than at w/2; a
        // far smaller ratio means a Newton run jumped to another branch
        // (or an inflection, which is harmless): the arc is cut then
        for (half, full) in [(devs[1], devs[0]), (devs[2], devs[3])] {
            if full > 1e-13 && half > 0.0 && full < 1.5 * half {
                return None;
            }
        }
        // a floor on the thickness: on a (nearly) straight arc the box would
        // be so thin that the reduced basis in f64 loses the lattice points
        // (a line component of a reducible cubic was missed so); with
        // `d >= 0.01 / H^2` its volume stays below 1/10 and the scales within
        // a factor 100 H^2
        let d = (2.0 * dev + 4e-15 * (2.0 + s.abs())).max(0.01 / (self.h * self.h));
        Some(Arc { u, v, s, w, d })
    }
}

fn finish(mut found: Vec<[i64; 3]>, complete: bool, height_reached: u64, tested: u64) -> SearchOutcome<PlanePoint> {
    found.sort_by_key(|p| (height_of(p), *p));
    found.dedup();
    SearchOutcome { points: found.into_iter().map(PlanePoint::from_primitive).collect(), complete, height_reached, candidates_tested: tested }
}

/// The points `(x : y : z)` with `max(|x|, |y|, |z|) <= limits.height` on
/// the plane cubic with coefficients `form` (monomials `x^3, x^2 y, x^2 z,
/// x y^2, x y z, x z^2, y^3, y^2 z, y z^2, z^3`), each checked exactly, by
/// the lattice method described in the module documentation.
///
/// The search runs in shells of doubling height from 16, so a search
/// stopped by its deadline or cancellation reports the last shell it
/// finished in `height_reached`; `candidates_tested` counts the lattice
/// points tested. `complete` is false when the search stopped early, the
/// height was clamped to [`PLANE_MAX_HEIGHT`], or an arc met a singular
/// point of the curve.
///
/// Errors: [`ErrorKind::InvalidValue`] for the zero form,
/// [`ErrorKind::TooLarge`] for a coefficient beyond 128 bits.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::{search_plane_cubic, SearchLimits};
/// // x^3 + y^3 = 7 z^3: (2 : -1 : 1), (4 : 5 : 3), (17 : -73 : -38), ...
/// let mut f = [0i64; 10];
/// (f[0], f[6], f[9]) = (1, 1, -7);
/// let out = search_plane_cubic(&f.map(Integer::from), &SearchLimits::new(100)).unwrap();
/// assert!(out.complete);
/// let hs: Vec<u64> = out.points.iter().map(|p| p.height()).collect();
/// assert_eq!(hs, vec![1, 2, 2, 5, 5, 73, 73]);
/// ```
pub fn search_plane_cubic(form: &[Integer; 10], limits: &SearchLimits) -> Result<SearchOutcome<PlanePoint>, Error> {
    let c = coefficients(form)?;
    let (target, clamped) = if limits.height > PLANE_MAX_HEIGHT { (PLANE_MAX_HEIGHT, true) } else { (limits.height, false) };
    let mut found: Vec<[i64; 3]> = Vec::new();
    let mut tested = 0u64;
    let mut reached = 0u64;
    let mut degenerate = false;
    let mut bound = target.min(16);
    loop {
        let mut shell = Shell {
            c: &c,
            limits,
            h: bound.max(1) as f64,
            bound,
            found: Vec::new(),
            tested: 0,
            degenerate: false,
            stopped: false,
            roots: Vec::with_capacity(3),
            stack: Vec::with_capacity(64),
            cand: Vec::with_capacity(16),
        };
        shell.run();
        tested += shell.tested;
        degenerate |= shell.degenerate;
        found.extend(shell.found.iter().copied());
        if shell.stopped {
            return Ok(finish(found, false, reached, tested));
        }
        reached = bound;
        if bound >= target {
            break;
        }
        bound = (bound * 2).min(target);
    }
    Ok(finish(found, !clamped && !degenerate, reached, tested))
}

/// [`search_plane_cubic`] by trying every primitive triple of height at
/// most `limits.height` (the independent check of tests and benchmarks;
/// about `4 H^3` evaluations, so heights above 1000 are refused with
/// [`ErrorKind::TooLarge`]). `candidates_tested` counts the triples.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::{search_plane_cubic_naive, SearchLimits};
/// let mut f = [0i64; 10];
/// (f[0], f[6], f[9]) = (1, 1, -7);
/// let out = search_plane_cubic_naive(&f.map(Integer::from), &SearchLimits::new(10)).unwrap();
/// assert_eq!(out.points.len(), 5);
/// ```
pub fn search_plane_cubic_naive(form: &[Integer; 10], limits: &SearchLimits) -> Result<SearchOutcome<PlanePoint>, Error> {
    let c = coefficients(form)?;
    if limits.height > 1000 {
        return Err(bad(ErrorKind::TooLarge, format!("height {} above 1000 for the plain plane-cubic search", limits.height)));
    }
    let h = limits.height as i64;
    let mut found = Vec::new();
    let mut tested = 0u64;
    for x in 0..=h {
        if stop_now(limits) {
            return Ok(finish(found, false, 0, tested));
        }
        for y in -h..=h {
            for z in -h..=h {
                let p = [x, y, z];
                if normalised(p) != Some(p) {
                    continue;
                }
                tested += 1;
                if vanishes(&c, p) {
                    found.push(p);
                    if limits.first_only {
                        return Ok(finish(found, false, 0, tested));
                    }
                }
            }
        }
    }
    Ok(finish(found, true, limits.height, tested))
}
