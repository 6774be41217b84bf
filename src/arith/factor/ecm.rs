//! The elliptic curve method on Montgomery curves (Montgomery, Math. Comp.
//! 48 (1987); Suyama's parametrisation).

use super::*;

// ---------------------------------------------------------------------------
// The elliptic curve method on Montgomery curves B y^2 = x^3 + A x^2 + x.

/// `(digits of the factor aimed at, B1, curves)`: the usual schedule of
/// Silverman-Wagstaff ("A practical analysis of the elliptic curve
/// factoring algorithm", Math. Comp. 61 (1993)) as commonly tabulated.
pub(super) const ECM_LEVELS: [(u32, u64, u32); 8] = [
    (15, 2_000, 25),
    (20, 11_000, 90),
    (25, 50_000, 300),
    (30, 250_000, 700),
    (35, 1_000_000, 1_800),
    (40, 3_000_000, 5_100),
    (45, 11_000_000, 10_600),
    (50, 43_000_000, 19_300),
];

/// ECM with bounds `b1`, `b2` and a number of curves from Suyama's family.
#[derive(Clone, Copy, Debug)]
pub(super) struct Ecm {
    pub(super) b1: u64,
    pub(super) b2: u64,
    pub(super) curves: u32,
    pub(super) first_sigma: u64,
}

impl Ecm {
    pub(super) fn level(i: usize) -> Self {
        let (_, b1, curves) = ECM_LEVELS[i];
        Ecm { b1, b2: (100 * b1).min(400_000_000), curves, first_sigma: 6 + 1000 * i as u64 }
    }
}

impl Splitter for Ecm {
    fn split(&self, n: &Natural, budget: &Budget) -> Split {
        with_ring(n, self, budget)
    }
}

/// A point `(X : Z)` on the Kummer line.
#[derive(Clone, Debug)]
struct Pt<E> {
    x: E,
    z: E,
}

struct Curve<'r, R: ModRing> {
    ring: &'r R,
    a24: R::E,
}

impl<R: ModRing> Curve<'_, R> {
    /// Differential addition: `P + Q` from `P`, `Q` and `P - Q`.
    fn add(&self, p: &Pt<R::E>, q: &Pt<R::E>, diff: &Pt<R::E>) -> Pt<R::E> {
        let r = self.ring;
        let u = r.mul(&r.sub(&p.x, &p.z), &r.add(&q.x, &q.z));
        let v = r.mul(&r.add(&p.x, &p.z), &r.sub(&q.x, &q.z));
        let s = r.add(&u, &v);
        let d = r.sub(&u, &v);
        Pt { x: r.mul(&diff.z, &r.sqr(&s)), z: r.mul(&diff.x, &r.sqr(&d)) }
    }
    /// Doubling with `a24 = (A + 2)/4`.
    fn dbl(&self, p: &Pt<R::E>) -> Pt<R::E> {
        let r = self.ring;
        let s = r.sqr(&r.add(&p.x, &p.z));
        let d = r.sqr(&r.sub(&p.x, &p.z));
        let t = r.sub(&s, &d);
        Pt { x: r.mul(&s, &d), z: r.mul(&t, &r.add(&d, &r.mul(&self.a24, &t))) }
    }
    /// `k P` by the Montgomery ladder, `k >= 1`.
    fn mul(&self, k: u64, p: &Pt<R::E>) -> Pt<R::E> {
        if k == 1 {
            return p.clone();
        }
        let mut r0 = p.clone();
        let mut r1 = self.dbl(p);
        let top = 63 - k.leading_zeros();
        for i in (0..top).rev() {
            if (k >> i) & 1 == 1 {
                r0 = self.add(&r1, &r0, p);
                r1 = self.dbl(&r1);
            } else {
                r1 = self.add(&r1, &r0, p);
                r0 = self.dbl(&r0);
            }
        }
        r0
    }
}

pub(super) enum CurveResult {
    Factor(Natural),
    Nothing,
    Stopped,
}

/// Odd-number primality bitmap up to a bound, for stage 2.
pub(super) struct OddPrimeBits {
    bits: Vec<u64>,
    limit: u64,
}

impl OddPrimeBits {
    pub(super) fn new(limit: u64) -> Self {
        let len = (limit / 2 + 1) as usize;
        let mut bits = vec![u64::MAX; len.div_ceil(64)];
        bits[0] &= !1;
        let mut i = 1usize;
        while (2 * i + 1) * (2 * i + 1) <= limit as usize {
            if bits[i / 64] >> (i % 64) & 1 == 1 {
                let p = 2 * i + 1;
                let mut j = p * p / 2;
                while j < len {
                    bits[j / 64] &= !(1u64 << (j % 64));
                    j += p;
                }
            }
            i += 1;
        }
        OddPrimeBits { bits, limit }
    }
    fn is_prime(&self, x: u64) -> bool {
        x <= self.limit && x % 2 == 1 && {
            let i = (x / 2) as usize;
            self.bits[i / 64] >> (i % 64) & 1 == 1
        }
    }
}

impl RingTask for Ecm {
    type Out = Split;
    fn run<R: ModRing>(&self, ring: &R, budget: &Budget) -> Split {
        let primes = primes_up_to(self.b1);
        let stage2 = OddPrimeBits::new(self.b2 + 2310);
        for i in 0..self.curves as u64 {
            match ecm_curve(ring, self.first_sigma + i, self.b1, self.b2, &primes, &stage2, budget) {
                CurveResult::Factor(d) => return pair(ring.modulus(), d),
                CurveResult::Nothing => {}
                CurveResult::Stopped => return Split::Stopped,
            }
        }
        Split::NotFound
    }
}

fn nontrivial(g: Natural, n: &Natural) -> Option<Natural> {
    (g > 1u32 && g < *n).then_some(g)
}

/// One curve of Suyama's family: stage 1 to `b1`, standard continuation to `b2`.
pub(super) fn ecm_curve<R: ModRing>(
    ring: &R,
    sigma: u64,
    b1: u64,
    b2: u64,
    primes: &[u64],
    stage2: &OddPrimeBits,
    budget: &Budget,
) -> CurveResult {
    let n = ring.modulus();
    let r = ring;
    // u = sigma^2 - 5, v = 4 sigma, x0 = u^3, z0 = v^3,
    // (A + 2)/4 = (v - u)^3 (3u + v) / (16 u^3 v).
    let s = r.from_u64(sigma);
    let u = r.sub(&r.sqr(&s), &r.from_u64(5));
    let v = r.mul(&r.from_u64(4), &s);
    let u3 = r.mul(&r.sqr(&u), &u);
    let v3 = r.mul(&r.sqr(&v), &v);
    let vmu = r.sub(&v, &u);
    let num = r.mul(&r.mul(&r.sqr(&vmu), &vmu), &r.add(&r.mul(&r.from_u64(3), &u), &v));
    let den = r.mul(&r.mul(&r.from_u64(16), &u3), &v);
    let den_n = r.to_natural(&den);
    if den_n == 0u32 {
        return CurveResult::Nothing; // sigma hit a bad value modulo n itself
    }
    let inv = match (&den_n).mod_inverse(n) {
        Some(i) => i,
        None => {
            return match nontrivial(den_n.gcd(n), n) {
                Some(d) => CurveResult::Factor(d),
                None => CurveResult::Nothing,
            };
        }
    };
    let curve = Curve { ring: r, a24: r.mul(&num, &r.from_natural(&inv)) };
    let mut p = Pt { x: u3, z: v3 };
    // Stage 1: multiply by every prime power up to b1.
    for (i, &q) in primes.iter().enumerate() {
        let mut qk = q;
        while qk <= b1 / q {
            qk *= q;
        }
        p = curve.mul(qk, &p);
        if i % 512 == 511 && budget.stop() {
            return CurveResult::Stopped;
        }
    }
    let g = r.gcd_n(&p.z);
    if g != 1u32 {
        return match nontrivial(g, n) {
            Some(d) => CurveResult::Factor(d),
            None => CurveResult::Nothing,
        };
    }
    if b2 <= b1 {
        return CurveResult::Nothing;
    }
    // Stage 2 (baby-step giant-step standard continuation, Montgomery 1987):
    // a prime q = mD +- j is caught when x(mD P) = x(j P) modulo a prime.
    const D: u64 = 2310;
    let mut baby: Vec<(u64, Pt<R::E>)> = Vec::new();
    let p2 = curve.dbl(&p);
    let mut prev = p.clone(); // j = 1
    let mut cur = curve.add(&p2, &p, &p); // j = 3
    if gcd_u64(1, D) == 1 {
        baby.push((1, prev.clone()));
    }
    let mut j = 3;
    while j < D / 2 {
        if gcd_u64(j, D) == 1 {
            baby.push((j, cur.clone()));
        }
        let next = curve.add(&cur, &p2, &prev);
        prev = cur;
        cur = next;
        j += 2;
    }
    let mut acc = r.one();
    let mut m0 = b1 / D;
    if m0 == 0 {
        // m = 0: the giant point is the identity (1 : 0), so the cross
        // product reduces to Z_j, which vanishes mod p iff j P = 0 mod p.
        for (j, bp) in &baby {
            if *j > b1 && *j <= b2 && stage2.is_prime(*j) {
                acc = r.mul(&acc, &bp.z);
            }
        }
        m0 = 1;
    }
    let dp = curve.mul(D, &p);
    let mut rm = curve.mul(m0 * D, &p);
    let mut rm_prev = curve.mul((m0 - 1).max(1) * D, &p);
    let mut first = m0 == 1; // then rm_prev is not (m0 - 1) D P
    let mut m = m0;
    while m * D <= b2 + D {
        for (j, bp) in &baby {
            let lo = m * D - j;
            let hi = m * D + j;
            if (lo > b1 && lo <= b2 && stage2.is_prime(lo)) || (hi > b1 && hi <= b2 && stage2.is_prime(hi)) {
                let t = r.sub(&r.mul(&rm.x, &bp.z), &r.mul(&bp.x, &rm.z));
                acc = r.mul(&acc, &t);
            }
        }
        let next = if first {
            first = false;
            curve.dbl(&rm) // m0 = 1: 2 D P
        } else {
            curve.add(&rm, &dp, &rm_prev)
        };
        rm_prev = rm;
        rm = next;
        m += 1;
        if m % 64 == 0 && budget.stop() {
            return CurveResult::Stopped;
        }
    }
    match nontrivial(r.gcd_n(&acc), n) {
        Some(d) => CurveResult::Factor(d),
        None => CurveResult::Nothing,
    }
}
