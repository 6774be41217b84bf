//! Small numeric helpers: floating-point roots of the resolvent cubic,
//! integer square roots and square filters.

use malachite::base::num::arithmetic::traits::{CheckedSqrt, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Natural};

/// Nearest `f64` to an integer (infinite beyond the `f64` range).
pub(crate) fn to_f64(n: &Integer) -> f64 {
    f64::rounding_from(n, RoundingMode::Nearest).0
}

/// Nearest `f64` to `n / 2^shift`.
pub(crate) fn to_f64_scaled(n: &Integer, shift: u64) -> f64 {
    if shift == 0 {
        return to_f64(n);
    }
    // keep 64 significant bits before scaling
    let bits = significant_bits(n);
    if bits <= 64 {
        return to_f64(n) * (-(shift as f64)).exp2();
    }
    let drop = bits - 64;
    let top: Integer = n >> drop; // floor shift; relative error 2^-63
    to_f64(&top) * ((drop as f64) - (shift as f64)).exp2()
}

pub(crate) fn significant_bits(n: &Integer) -> u64 {
    use malachite::base::num::logic::traits::SignificantBits;
    n.unsigned_abs().significant_bits()
}

/// The real roots (ascending) of `t^3 - 3 i t + j` when it has three real
/// roots (`4i^3 > j^2`), or the single real root and the complex root with
/// positive imaginary part otherwise, each polished by Newton's method.
pub(crate) enum CubicRoots {
    Three([f64; 3]),
    One { real: f64, complex: (f64, f64) },
}

pub(crate) fn resolvent_roots(i: f64, j: f64, three_real: bool) -> CubicRoots {
    let f = |t: f64| (t * t - 3.0 * i) * t + j;
    let df = |t: f64| 3.0 * t * t - 3.0 * i;
    let polish = |mut t: f64| {
        for _ in 0..6 {
            let d = df(t);
            if d == 0.0 || !d.is_finite() {
                break;
            }
            let nt = t - f(t) / d;
            if !nt.is_finite() || (nt - t).abs() <= 1e-17 * t.abs() {
                t = if nt.is_finite() { nt } else { t };
                break;
            }
            // keep Newton from jumping to another root: accept only if |f| decreases
            if f(nt).abs() > f(t).abs() {
                break;
            }
            t = nt;
        }
        t
    };
    if three_real {
        let s = i.sqrt();
        let arg = (-j / (2.0 * i * s)).clamp(-1.0, 1.0);
        let th = arg.acos() / 3.0;
        let tau = std::f64::consts::TAU / 3.0;
        let mut r = [2.0 * s * th.cos(), 2.0 * s * (th - tau).cos(), 2.0 * s * (th + tau).cos()];
        for v in r.iter_mut() {
            *v = polish(*v);
        }
        // total order: a NaN (from non-finite input) sorts last instead of panicking
        r.sort_by(|a, b| a.total_cmp(b));
        CubicRoots::Three(r)
    } else {
        // Cardano: t = u + v, u^3 + v^3 = -j, u v = i
        let disc = j * j / 4.0 - i * i * i;
        let sq = disc.max(0.0).sqrt();
        // choose the larger-magnitude branch to avoid cancellation
        let w = if j > 0.0 { -j / 2.0 - sq } else { -j / 2.0 + sq };
        let u = w.cbrt();
        let t0 = if u == 0.0 { 0.0 } else { u + i / u };
        let r = polish(t0);
        let im = ((3.0 * r * r - 12.0 * i).max(0.0)).sqrt() / 2.0;
        CubicRoots::One { real: r, complex: (-r / 2.0, im) }
    }
}

/// Integer square root of a `u128` (floor).
pub(crate) fn isqrt_u128(n: u128) -> u128 {
    if n < 2 {
        return n;
    }
    let mut x = (n as f64).sqrt() as u128;
    // correct the float estimate
    while x.checked_mul(x).is_none_or(|v| v > n) {
        x -= 1;
    }
    while (x + 1).checked_mul(x + 1).is_some_and(|v| v <= n) {
        x += 1;
    }
    x
}

const fn residue_table<const M: usize>() -> [bool; M] {
    let mut t = [false; M];
    let mut k = 0;
    while k < M {
        t[(k * k) % M] = true;
        k += 1;
    }
    t
}

static SQ64: [bool; 64] = residue_table::<64>();
static SQ63: [bool; 63] = residue_table::<63>();
static SQ65: [bool; 65] = residue_table::<65>();
static SQ11: [bool; 11] = residue_table::<11>();

/// The square root of `n` when `n` is a perfect square.
#[inline]
pub(crate) fn sqrt_if_square_u128(n: u128) -> Option<u128> {
    if !SQ64[(n & 63) as usize] {
        return None;
    }
    let r = (n % (63 * 65 * 11)) as usize;
    if !SQ63[r % 63] || !SQ65[r % 65] || !SQ11[r % 11] {
        return None;
    }
    let s = isqrt_u128(n);
    (s * s == n).then_some(s)
}

/// The square root of `n` when `n` is a perfect square (`n < 2^62`).
#[inline]
pub(crate) fn sqrt_if_square_u64(n: u64) -> Option<u64> {
    if !SQ64[(n & 63) as usize] {
        return None;
    }
    let r = (n % (63 * 65 * 11)) as usize;
    if !SQ63[r % 63] || !SQ65[r % 65] || !SQ11[r % 11] {
        return None;
    }
    let mut s = (n as f64).sqrt() as u64;
    while s * s > n {
        s -= 1;
    }
    while (s + 1) * (s + 1) <= n {
        s += 1;
    }
    (s * s == n).then_some(s)
}

/// The square root of a non-negative integer when it is a perfect square.
pub(crate) fn isqrt_exact(n: &Integer) -> Option<Integer> {
    if *n < 0 {
        return None;
    }
    let m: Natural = n.unsigned_abs();
    m.checked_sqrt().map(Integer::from)
}

/// All integer roots of a non-zero integer polynomial (coefficients from the
/// constant term up), exactly and at any size, sorted.
///
/// Method: every real root lies in `(-B, B)` with Cauchy's bound
/// `B = 1 + max |c_k / c_n|`. Between two consecutive real points where the
/// derivative changes sign the polynomial is monotone, so it has at most one
/// root there, found by bisection over the integers (a sign test at each
/// step). The sign changes of the derivative are bracketed between
/// consecutive integers in the same way, recursively (degree 1: exact
/// division). Cost: `O(deg^2 log B)` evaluations; no floating point, so no
/// size limit and no root is missed.
pub(crate) fn integer_roots(poly: &[Integer]) -> Vec<Integer> {
    let p = trimmed(poly);
    let mut out = Vec::new();
    if p.len() < 2 {
        return out;
    }
    let b = cauchy_bound(p);
    // monotone pieces: split at both neighbours of every sign change of p'
    let mut pts: Vec<Integer> = vec![-b.clone(), b.clone()];
    for k in sign_changes(&derivative(p)) {
        if k > -b.clone() && k < b {
            pts.push(k.clone());
        }
        let k1 = k + Integer::ONE;
        if k1 > -b.clone() && k1 < b {
            pts.push(k1);
        }
    }
    pts.sort();
    pts.dedup();
    for w in pts.windows(2) {
        if let Some(r) = root_in_monotone(p, &w[0], &w[1]) {
            if !out.contains(&r) {
                out.push(r);
            }
        }
    }
    out.sort();
    out
}

fn trimmed(p: &[Integer]) -> &[Integer] {
    let mut n = p.len();
    while n > 0 && p[n - 1] == 0 {
        n -= 1;
    }
    &p[..n]
}

fn derivative(p: &[Integer]) -> Vec<Integer> {
    p.iter().enumerate().skip(1).map(|(k, c)| c * Integer::from(k as u64)).collect()
}

fn eval_at(p: &[Integer], t: &Integer) -> Integer {
    let mut acc = Integer::ZERO;
    for c in p.iter().rev() {
        acc = acc * t + c;
    }
    acc
}

/// A bound on the absolute values of all roots (Fujiwara's bound,
/// `|z| <= 2 max_k |c_k / c_n|^{1/(n-k)}`, M. Fujiwara, Tohoku Math. J. 10
/// (1916)), rounded up to an integer and increased by 2 so that the roots lie
/// strictly inside `(-B, B)`.
fn cauchy_bound(p: &[Integer]) -> Integer {
    use malachite::base::num::arithmetic::traits::CeilingRoot;
    let n = p.len() - 1;
    let lead = (&p[n]).unsigned_abs();
    let mut m = Natural::ZERO;
    for (k, c) in p[..n].iter().enumerate() {
        // ceil(|c_k| / |c_n|), then its ceiling (n - k)-th root
        let q: Natural = (c.unsigned_abs_ref() + &lead - Natural::ONE) / &lead;
        let r = q.ceiling_root((n - k) as u64);
        if r > m {
            m = r;
        }
    }
    Integer::from(m) * Integer::from(2) + Integer::from(2)
}

/// For a monotone polynomial on `[u, v]`: its integer root there, if any.
fn root_in_monotone(p: &[Integer], u: &Integer, v: &Integer) -> Option<Integer> {
    let (fu, fv) = (eval_at(p, u), eval_at(p, v));
    if fu == 0 {
        return Some(u.clone());
    }
    if fv == 0 {
        return Some(v.clone());
    }
    if (fu > 0) == (fv > 0) {
        return None;
    }
    let (k, fk) = bisect(p, u, v, fu > 0);
    (fk == 0).then_some(k)
}

/// Search over the integers of `[lo, hi]` for a polynomial that is monotone
/// there, with sign `lo_positive` at `lo` and the other sign at `hi`: an
/// integer where it vanishes (with value 0), or the `k` with a sign change in
/// `(k, k + 1)` (with `p(k)`).
///
/// Newton steps with a bisection safeguard (the bracket always holds the
/// sign change; a Newton point outside it, or a step after which the bracket
/// did not halve, is replaced by the midpoint). Every answer rests on exact
/// signs at integer points, so the speed-up cannot change the result.
fn bisect(p: &[Integer], lo: &Integer, hi: &Integer, lo_positive: bool) -> (Integer, Integer) {
    use malachite::base::num::arithmetic::traits::DivRound;
    let dp = derivative(p);
    let (mut lo, mut hi) = (lo.clone(), hi.clone());
    let mut flo = eval_at(p, &lo);
    let mut t: Integer = split_point(&lo, &hi);
    let mut last_width = &hi - &lo;
    while &hi - &lo > 1 {
        let ft = eval_at(p, &t);
        if ft == 0 {
            return (t, ft);
        }
        let below = (ft > 0) == lo_positive; // the sign change is above t
        if below {
            lo = t.clone();
            flo = ft.clone();
        } else {
            hi = t.clone();
        }
        // Newton's point from t, and its neighbour towards the sign change,
        // so that a converged step closes the bracket at once
        let width = &hi - &lo;
        if width <= 1 {
            break;
        }
        let halved = width.clone() * Integer::from(2) <= last_width;
        last_width = width;
        let d = eval_at(&dp, &t);
        let mut next = None;
        if halved && d != 0 {
            let (step, _) = ft.div_round(d, RoundingMode::Nearest);
            let c = &t - step;
            if c > lo && c < hi {
                next = Some(c);
            }
        }
        t = match next {
            Some(c) if c != t => c,
            // Newton stays at t: the sign change is next to it
            Some(_) => {
                let nb = if below { &t + Integer::ONE } else { &t - Integer::ONE };
                if nb > lo && nb < hi {
                    nb
                } else {
                    split_point(&lo, &hi)
                }
            }
            None => split_point(&lo, &hi),
        };
    }
    (lo, flo)
}

/// A point strictly between `lo` and `hi` (`hi - lo >= 2`): 0 when the
/// interval straddles it, the geometric mean (a power of 2) when the ends
/// differ by more than a factor 4, else the midpoint. Roots of very
/// different sizes are so located in `O(log log B)` steps instead of
/// `O(log B)`.
fn split_point(lo: &Integer, hi: &Integer) -> Integer {
    let mid = || -> Integer { (lo + hi) >> 1u32 };
    if *lo < 0 && *hi > 0 {
        return Integer::ZERO;
    }
    let (a, b, neg) = if *lo >= 0 { (lo.clone(), hi.clone(), false) } else { (-hi.clone(), -lo.clone(), true) };
    // 0 <= a < b
    if b > (&a + Integer::ONE) * Integer::from(4) {
        let e = (significant_bits(&a) + significant_bits(&b)) / 2;
        let g = Integer::ONE << e;
        if g > a && g < b {
            return if neg { -g } else { g };
        }
    }
    mid()
}

/// Integers `k` such that every real point where `q` changes sign lies in
/// `[k, k + 1]` for one of them (more points are harmless).
fn sign_changes(q: &[Integer]) -> Vec<Integer> {
    let q = trimmed(q);
    let mut out = Vec::new();
    match q.len() {
        0 | 1 => return out,
        2 => {
            // c0 + c1 t: the root -c0/c1, rounded down
            use malachite::base::num::arithmetic::traits::DivRound;
            let (t, _) = (-q[0].clone()).div_round(q[1].clone(), RoundingMode::Floor);
            out.push(t);
            return out;
        }
        _ => {}
    }
    let b = cauchy_bound(q);
    let mut pts: Vec<Integer> = vec![-b.clone(), b.clone()];
    for k in sign_changes(&derivative(q)) {
        let k1 = &k + Integer::ONE;
        for x in [k, k1] {
            if x > -b.clone() && x < b {
                pts.push(x);
            }
        }
    }
    pts.sort();
    pts.dedup();
    for w in pts.windows(2) {
        if &w[1] - &w[0] == 1 {
            // a piece between the neighbours of a sign change of q' need not
            // be monotone (q may cross zero twice inside): report it whole
            out.push(w[0].clone());
            continue;
        }
        // on a longer piece q is monotone: one sign change at most
        let (fu, fv) = (eval_at(q, &w[0]), eval_at(q, &w[1]));
        if fu == 0 {
            out.push(w[0].clone());
        }
        if fv == 0 {
            out.push(w[1].clone());
        }
        if fu != 0 && fv != 0 && (fu > 0) != (fv > 0) {
            out.push(bisect(q, &w[0], &w[1], fu > 0).0);
        }
        // a zero at an end point is a possible sign change on either side
        if fu == 0 {
            out.push(&w[0] - Integer::ONE);
        }
    }
    out.sort();
    out.dedup();
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn isqrt_matches_brute_force() {
        for n in 0u128..5000 {
            let s = isqrt_u128(n);
            assert!(s * s <= n && (s + 1) * (s + 1) > n);
            assert_eq!(sqrt_if_square_u128(n).is_some(), s * s == n);
            assert_eq!(sqrt_if_square_u64(n as u64).is_some(), s * s == n);
        }
        for k in [1u128 << 60, (1u128 << 63) - 1, 3_037_000_499, 1u128 << 62] {
            assert_eq!(sqrt_if_square_u128(k * k), Some(k));
            assert_eq!(sqrt_if_square_u128(k * k + 1), None);
            if k < (1 << 31) {
                assert_eq!(sqrt_if_square_u64((k * k) as u64), Some(k as u64));
                assert_eq!(sqrt_if_square_u64((k * k - 1) as u64), None);
            }
        }
    }

    #[test]
    fn integer_roots_exact_against_brute_force() {
        // products of linear factors (with repeats and a quadratic without
        // real roots), checked against a scan of every integer in the
        // Cauchy bound: an independent second computation
        let mut seed = 7u64;
        let mut rnd = |m: i64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % (2 * m as u64 + 1)) as i64 - m
        };
        for _ in 0..400 {
            let deg = 1 + (rnd(2).unsigned_abs() as usize);
            let mut p = vec![Integer::from(rnd(3).max(1))];
            for _ in 0..deg {
                let r = rnd(30);
                // multiply by (t - r)
                let mut q = vec![Integer::ZERO; p.len() + 1];
                for (k, c) in p.iter().enumerate() {
                    q[k + 1] += c;
                    q[k] -= c * Integer::from(r);
                }
                p = q;
            }
            if rnd(1) == 0 {
                // times t^2 + t + 5 (no real roots), or plus a constant
                let mut q = vec![Integer::ZERO; p.len() + 2];
                for (k, c) in p.iter().enumerate() {
                    q[k] += c * Integer::from(5);
                    q[k + 1] += c;
                    q[k + 2] += c;
                }
                p = q;
            } else if rnd(1) == 0 {
                p[0] += Integer::from(rnd(50));
            }
            let brute: Vec<Integer> = (-200i64..=200).map(Integer::from).filter(|t| eval_at(&p, t) == 0).collect();
            assert_eq!(integer_roots(&p), brute, "{p:?}");
        }
        // 100-digit roots far beyond f64 (a scaled cubic t^3 - 3It + J with roots r, s, -(r + s))
        let r: Integer = "1234567890123456789012345678901234567890123456789012345678901234567890123456789012345678901234567890".parse().unwrap();
        let s2: Integer = -Integer::from(987654321) * &r + Integer::from(17);
        let t = -(&r + &s2);
        let e2 = &r * &s2 + &r * &t + &s2 * &t;
        let e3 = &r * &s2 * &t;
        let p = [-e3, e2, Integer::ZERO, Integer::ONE];
        let mut want = vec![r.clone(), s2.clone(), t.clone()];
        want.sort();
        assert_eq!(integer_roots(&p), want);
        // a double root (no sign change) is still found
        let p = [Integer::from(4), Integer::from(-4), Integer::ONE]; // (t - 2)^2
        assert_eq!(integer_roots(&p), vec![Integer::from(2)]);
    }

    #[test]
    fn cubic_roots_are_roots() {
        for (i, j) in [(48.0, -432.0), (73.0, -1190.0), (-12.0, 0.0), (0.0, 54.0), (1e10, 3.0e14)] {
            let three = 4.0 * i * i * i > j * j;
            match resolvent_roots(i, j, three) {
                CubicRoots::Three(r) => {
                    for t in r {
                        assert!(((t * t - 3.0 * i) * t + j).abs() <= 1e-9 * (1.0 + t.abs().powi(3) + (3.0 * i * t).abs()));
                    }
                    assert!(r[0] <= r[1] && r[1] <= r[2]);
                }
                CubicRoots::One { real, complex } => {
                    let t = real;
                    assert!(((t * t - 3.0 * i) * t + j).abs() <= 1e-9 * (1.0 + t.abs().powi(3) + j.abs()));
                    // sum of roots is zero
                    assert!((t + 2.0 * complex.0).abs() <= 1e-12 * (1.0 + t.abs()));
                }
            }
        }
    }
}
