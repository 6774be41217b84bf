//! Small numeric helpers: floating-point roots of the resolvent cubic,
//! integer square roots and square filters.

use malachite::base::num::arithmetic::traits::{CheckedSqrt, UnsignedAbs};
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
