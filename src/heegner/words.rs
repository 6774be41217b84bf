//! Signed fixed-point numbers in machine words for the modular series.
//!
//! A number is a two's complement integer of `k` little-endian 64-bit
//! limbs, the top limb the integer part and the `k - 1` lower limbs the
//! fraction: value `x / 2^(64 (k - 1))` with `x` in `[-2^(64k-1), 2^(64k-1))`.
//! Products are truncated (at most `k` units of the last place below the
//! exact product), sums exact; sums and products are carry chains without
//! a comparison or a branch on the signs, and nothing allocates, so the
//! Horner loop of the series runs in registers and on the stack. The
//! partial sums of the series stay below `2^63` in absolute value
//! (`|a_n / n| <= 2` and `|q| < 1`), far inside the integer limb.

use malachite::base::num::arithmetic::traits::UnsignedAbs;
use malachite::{Integer, Natural};

/// The most limbs a number has (1 integer limb and 16 fraction limbs,
/// 1024 bits after the point).
pub(crate) const MAX_LIMBS: usize = 17;

/// A signed fixed-point number (see the module documentation).
#[derive(Clone, Copy, Debug)]
pub(crate) struct Word<const K: usize> {
    limbs: [u64; K],
}

/// `-x` modulo `2^(64 K)`.
#[inline]
fn negate<const K: usize>(x: &[u64; K]) -> [u64; K] {
    let mut out = [0u64; K];
    let mut carry = true;
    for i in 0..K {
        let (s, c) = (!x[i]).overflowing_add(u64::from(carry));
        out[i] = s;
        carry = c;
    }
    out
}

impl<const K: usize> Word<K> {
    pub(crate) const ZERO: Word<K> = Word { limbs: [0; K] };

    #[inline]
    fn is_negative(&self) -> bool {
        self.limbs[K - 1] >> 63 == 1
    }

    /// `x / 2^(64 (k - 1))` from an integer `x`; `None` if it does not fit.
    pub(crate) fn from_scaled(x: &Integer) -> Option<Word<K>> {
        let n: Natural = x.unsigned_abs();
        let limbs = n.to_limbs_asc();
        if limbs.len() > K || (limbs.len() == K && limbs[K - 1] >> 63 == 1) {
            return None;
        }
        let mut mag = [0u64; K];
        mag[..limbs.len()].copy_from_slice(&limbs);
        Some(Word { limbs: if *x < 0u32 { negate(&mag) } else { mag } })
    }

    /// The integer `x` with `self = x / 2^(64 (k - 1))`.
    pub(crate) fn to_scaled(&self) -> Integer {
        if self.is_negative() {
            -Integer::from(Natural::from_limbs_asc(&negate(&self.limbs)))
        } else {
            Integer::from(Natural::from_limbs_asc(&self.limbs))
        }
    }

    /// `a / n` truncated towards zero (`n >= 1`).
    #[inline]
    pub(crate) fn ratio(a: i64, n: u64) -> Word<K> {
        let k = K;
        let mut mag = [0u64; K];
        let top = a.unsigned_abs();
        if n < 1 << 32 {
            // two 32-bit digits per limb; each quotient of `rem 2^32 / n`
            // (below 2^32, as `rem < n`) estimated from below with the
            // word reciprocal `v = floor((2^64 - 1) / n) > 2^64/n - 2`
            // (off by at most two) and corrected by the exact remainder:
            // one division per call, none per digit
            let mut rem = top % n;
            mag[k - 1] = top / n;
            let v = u64::MAX / n;
            for i in (0..k - 1).rev() {
                let mut limb = 0u64;
                for _ in 0..2 {
                    let num = rem << 32;
                    let mut q = ((u128::from(num) * u128::from(v)) >> 64) as u64;
                    // q n <= num and num - q n < 3n
                    let mut r = num - q * n;
                    while r >= n {
                        q += 1;
                        r -= n;
                    }
                    limb = (limb << 32) | q;
                    rem = r;
                }
                mag[i] = limb;
            }
        } else {
            let n = u128::from(n);
            let mut rem = u128::from(top) % n;
            mag[k - 1] = (u128::from(top) / n) as u64;
            for i in (0..k - 1).rev() {
                let cur = rem << 64;
                mag[i] = (cur / n) as u64;
                rem = cur % n;
            }
        }
        Word { limbs: if a < 0 { negate(&mag) } else { mag } }
    }
}

/// `x + y`, exact.
#[inline]
pub(crate) fn add<const K: usize>(x: &Word<K>, y: &Word<K>) -> Word<K> {
    let mut out = [0u64; K];
    let mut carry = false;
    for (o, (a, b)) in out.iter_mut().zip(x.limbs.iter().zip(&y.limbs)) {
        let (s, c1) = a.overflowing_add(*b);
        let (s, c2) = s.overflowing_add(u64::from(carry));
        *o = s;
        carry = c1 | c2;
    }
    Word { limbs: out }
}

/// `x - y`, exact.
#[inline]
pub(crate) fn sub<const K: usize>(x: &Word<K>, y: &Word<K>) -> Word<K> {
    let mut out = [0u64; K];
    let mut borrow = false;
    for (o, (a, b)) in out.iter_mut().zip(x.limbs.iter().zip(&y.limbs)) {
        let (s, c1) = a.overflowing_sub(*b);
        let (s, c2) = s.overflowing_sub(u64::from(borrow));
        *o = s;
        borrow = c1 | c2;
    }
    Word { limbs: out }
}

/// `x y` truncated to the fixed point (at most `k` units of the last place
/// below the exact product).
///
/// With `X`, `Y` the limbs read as unsigned and `s_x`, `s_y` the signs,
/// `x = X - s_x 2^(64k)`, so that modulo `2^(64k)`
/// `x y / 2^(64(k-1)) = X Y / 2^(64(k-1)) - s_x Y 2^64 - s_y X 2^64`:
/// the top of the unsigned product, less the operands shifted by one limb
/// under sign masks.
#[inline]
pub(crate) fn mul<const K: usize>(x: &Word<K>, y: &Word<K>) -> Word<K> {
    // product of the limbs without the columns below k - 2 (their carries
    // are dropped: at most k units of the last place), then limbs
    // k-1 .. 2k-2
    let k = K;
    let (xs, ys) = (&x.limbs, &y.limbs);
    let mut out = [0u64; K];
    // product scanning: the accumulator a0 + a1 2^64 + a2 2^128 holds a column
    let (mut a0, mut a1, mut a2) = (0u64, 0u64, 0u64);
    for c in k.saturating_sub(2)..=(2 * k - 2) {
        for i in c.saturating_sub(k - 1)..=c.min(k - 1) {
            let t = u128::from(xs[i]) * u128::from(ys[c - i]);
            let (sum, carry) = ((u128::from(a1) << 64) | u128::from(a0)).overflowing_add(t);
            a0 = sum as u64;
            a1 = (sum >> 64) as u64;
            a2 += u64::from(carry);
        }
        if c + 1 >= k {
            out[c + 1 - k] = a0;
        }
        (a0, a1, a2) = (a1, a2, 0);
    }
    // the sign corrections, as masks
    let mx = 0u64.wrapping_sub(xs[k - 1] >> 63);
    let my = 0u64.wrapping_sub(ys[k - 1] >> 63);
    let mut borrow = false;
    for i in 1..K {
        let (s, c1) = out[i].overflowing_sub(ys[i - 1] & mx);
        let (s, c2) = s.overflowing_sub(u64::from(borrow));
        out[i] = s;
        borrow = c1 | c2;
    }
    let mut borrow = false;
    for i in 1..K {
        let (s, c1) = out[i].overflowing_sub(xs[i - 1] & my);
        let (s, c2) = s.overflowing_sub(u64::from(borrow));
        out[i] = s;
        borrow = c1 | c2;
    }
    Word { limbs: out }
}

/// A complex number of two [`Word`]s.
#[derive(Clone, Copy, Debug)]
pub(crate) struct CWord<const K: usize> {
    pub(crate) re: Word<K>,
    pub(crate) im: Word<K>,
}

/// A fixed multiplier `q` prepared for [`CWord::mul_by`]: `q.re + q.im`
/// kept for the three-product form.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Multiplier<const K: usize> {
    q: CWord<K>,
    sum: Word<K>,
}

impl<const K: usize> Multiplier<K> {
    pub(crate) fn new(q: CWord<K>) -> Multiplier<K> {
        Multiplier { q, sum: add(&q.re, &q.im) }
    }
}

impl<const K: usize> CWord<K> {
    pub(crate) const ZERO: CWord<K> = CWord { re: Word::ZERO, im: Word::ZERO };

    /// `self q` with three real products (Gauss):
    /// `(a + bi)(c + di) = ac - bd + ((a + b)(c + d) - ac - bd) i`.
    #[inline]
    pub(crate) fn mul_by(&self, m: &Multiplier<K>) -> CWord<K> {
        let ac = mul(&self.re, &m.q.re);
        let bd = mul(&self.im, &m.q.im);
        let s = add(&self.re, &self.im);
        let t = mul(&s, &m.sum);
        CWord { re: sub(&ac, &bd), im: sub(&sub(&t, &ac), &bd) }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn val<const K: usize>(w: &Word<K>) -> f64 {
        let q = malachite::Rational::from(w.to_scaled()) / malachite::Rational::from(Integer::from(1u32) << (64 * (K as u64 - 1)));
        crate::heights::real::to_f64(&malachite::Float::from_rational_prec(q, 200).0)
    }

    fn check<const K: usize>() {
        let a = Word::<K>::ratio(-7, 3);
        let b = Word::<K>::ratio(5, 11);
        let big = Word::<K>::ratio(3, 5_000_000_000);
        assert!((val(&a) + 7.0 / 3.0).abs() < 1e-15);
        assert!((val(&big) - 3.0 / 5e9).abs() < 1e-18);
        assert!((val(&add(&a, &b)) - (-7.0 / 3.0 + 5.0 / 11.0)).abs() < 1e-15);
        assert!((val(&sub(&b, &a)) - (5.0 / 11.0 + 7.0 / 3.0)).abs() < 1e-15);
        assert!((val(&mul(&a, &b)) - (-35.0 / 33.0)).abs() < 1e-15);
        let z = CWord { re: a, im: b };
        let q = Multiplier::new(CWord { re: b, im: a });
        let p = z.mul_by(&q);
        // (a + bi)(b + ai) = ab - ab + (a^2 + b^2) i
        assert!(val(&p.re).abs() < 1e-15);
        let s2 = 49.0 / 9.0 + 25.0 / 121.0;
        assert!((val(&p.im) - s2).abs() < 1e-14);
    }

    #[test]
    fn arithmetic_matches_f64() {
        check::<2>();
        check::<3>();
        check::<5>();
        check::<9>();
        check::<17>();
    }

    /// The quotient digits of [`Word::ratio`] (word reciprocal, corrected)
    /// equal the exact `floor(|a| 2^(64 (K-1)) / n)` from malachite (an
    /// independent second computation), for `n` from 1 to just below
    /// 2^32 and `|a|` up to 2^20, both signs.
    #[test]
    fn ratios_are_exact_truncations() {
        let mut state = 0x853c_49e6_748f_ea9bu64;
        let mut next = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state
        };
        let mut ns: Vec<u64> = (1..2000).collect();
        ns.extend([(1u64 << 32) - 1, (1 << 32) - 5, (1 << 31) + 1, 4_294_967_291, 65_537, 11_154_873]);
        ns.extend((0..3000).map(|i| 1 + (next() >> (32 + i % 32))));
        for n in ns {
            let a = (next() % (1 << 21)) as i64 - (1 << 20);
            let w = Word::<5>::ratio(a, n);
            let exact = (Integer::from(a.unsigned_abs()) << 256u64) / Integer::from(n);
            let exact = if a < 0 { -exact } else { exact };
            assert_eq!(w.to_scaled(), exact, "{a} / {n}");
        }
    }

    /// Exact against malachite integers at 4 limbs: products within a few
    /// units of the last place below, sums exact.
    #[test]
    fn products_are_truncations() {
        let x = Integer::from(3u32) << 190u64;
        let x = x + Integer::from(123_456_789u64) + (Integer::from(u64::MAX) << 64u64);
        let y = -(Integer::from(5u32) << 150u64) - Integer::from(987u32) - (Integer::from(u64::MAX - 5) << 70u64);
        let (wx, wy) = (Word::<4>::from_scaled(&x).unwrap(), Word::<4>::from_scaled(&y).unwrap());
        for (a, b) in [(&x, &y), (&y, &x), (&x, &x), (&y, &y)] {
            let (wa, wb) = (Word::<4>::from_scaled(a).unwrap(), Word::<4>::from_scaled(b).unwrap());
            let exact = (a * b) >> 192u64; // floor
            let got = mul(&wa, &wb).to_scaled();
            let diff = got - exact;
            assert!(diff <= 0u32 && diff >= -4i32, "{diff}");
        }
        assert_eq!(add(&wx, &wy).to_scaled(), &x + &y);
        assert_eq!(sub(&wx, &wy).to_scaled(), &x - &y);
    }
}
