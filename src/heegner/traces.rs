//! Frobenius traces `a_p` for many primes by baby-step giant-step on the
//! group `E(F_p)` (Shanks' method with Mestre's use of the quadratic twist;
//! H. Cohen, A Course in Computational Algebraic Number Theory, 1993,
//! Algorithm 7.4.12 and the remarks after it), and the Dirichlet
//! coefficients `a_n` built from them.
//!
//! The O(p) character sum of [`crate::curve::PointCounter`] is used below
//! [`SMALL_PRIME`]; above it a random point `P` of `E` or of its twist has
//! `#E(F_p) P = O` with `#E(F_p)` in the Hasse interval of width `4 sqrt p`,
//! found in `O(p^{1/4})` group operations. Orders of points on `E` and on
//! the twist are combined until exactly one value of the interval is
//! compatible with both; if that has not happened after a fixed number of
//! points the character sum decides. So every returned trace is exact.

use crate::arith::primes_up_to;
use crate::curve::{Curve, PointCounter};
use malachite::base::num::arithmetic::traits::Mod;
use malachite::Integer;

/// Primes below this are counted by the character sum.
pub(crate) const SMALL_PRIME: u64 = 800;

#[inline]
fn mulm(a: u64, b: u64, p: u64) -> u64 {
    // p < 2^32, so the product fits a word
    a * b % p
}

#[inline]
fn addm(a: u64, b: u64, p: u64) -> u64 {
    let s = a + b;
    if s >= p {
        s - p
    } else {
        s
    }
}

#[inline]
fn subm(a: u64, b: u64, p: u64) -> u64 {
    if a >= b {
        a - b
    } else {
        a + p - b
    }
}

fn invm(a: u64, p: u64) -> u64 {
    // p < 2^32: the remainders fit 32-bit words (cheaper divisions)
    let (mut r0, mut r1) = (p as u32, a as u32);
    let (mut t0, mut t1) = (0i64, 1i64);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - i64::from(q) * t1);
    }
    t0.rem_euclid(p as i64) as u64
}

/// An affine point on `y^2 = x^3 + a x + b` over `F_p`, or `None` for O.
type Pt = Option<(u64, u64)>;

#[derive(Clone, Copy)]
struct ShortCurve {
    a: u64,
    p: u64,
}

impl ShortCurve {
    fn add(&self, u: Pt, v: Pt) -> Pt {
        let p = self.p;
        let (x1, y1) = match u {
            None => return v,
            Some(t) => t,
        };
        let (x2, y2) = match v {
            None => return u,
            Some(t) => t,
        };
        let lam = if x1 == x2 {
            if addm(y1, y2, p) == 0 {
                return None;
            }
            // (3 x^2 + a) / (2 y)
            let num = addm(mulm(3, mulm(x1, x1, p), p), self.a, p);
            mulm(num, invm(addm(y1, y1, p), p), p)
        } else {
            mulm(subm(y2, y1, p), invm(subm(x2, x1, p), p), p)
        };
        let x3 = subm(subm(mulm(lam, lam, p), x1, p), x2, p);
        let y3 = subm(mulm(lam, subm(x1, x3, p), p), y1, p);
        Some((x3, y3))
    }

    fn mul(&self, u: Pt, mut n: u64) -> Pt {
        let mut acc: Pt = None;
        let mut base = u;
        while n > 0 {
            if n & 1 == 1 {
                acc = self.add(acc, base);
            }
            base = self.add(base, base);
            n >>= 1;
        }
        acc
    }

    /// Every `m` in `[lo, hi]` with `m P = O`, pushed to `hits`, by baby
    /// steps `jP` (`1 <= j <= s`) and giant steps of `2s + 1` over the
    /// whole interval.
    fn multiples_in(&self, pt: Pt, lo: u64, hi: u64, baby: &mut Vec<(u64, u64, u64)>, hits: &mut Vec<u64>) {
        hits.clear();
        let w = hi - lo;
        let s = (((w + 1) as f64 / 2.0).sqrt().ceil() as u64).max(1);
        baby.clear();
        let mut q = pt;
        let mut small: Option<u64> = None;
        for j in 1..=s {
            match q {
                None => {
                    small = Some(j);
                    break;
                }
                Some((x, y)) => baby.push((x, y, j)),
            }
            q = self.add(q, pt);
        }
        if small.is_none() {
            baby.sort_unstable();
            // a repeated x means jP = ±j'P: small order
            for k in 1..baby.len() {
                if baby[k].0 == baby[k - 1].0 {
                    let (j1, j2) = (baby[k].2, baby[k - 1].2);
                    small = Some(if baby[k].1 == baby[k - 1].1 { j1.abs_diff(j2) } else { j1 + j2 });
                    break;
                }
            }
        }
        if let Some(mult) = small {
            let ord = self.order_from_multiple(pt, mult.max(1));
            let mut m = lo.div_ceil(ord) * ord;
            while m <= hi {
                hits.push(m);
                m += ord;
            }
            return;
        }
        let step = self.mul(pt, 2 * s + 1);
        let mut centre = lo + s;
        let mut r = self.mul(pt, centre);
        while centre <= hi + s {
            match r {
                None => {
                    if centre >= lo && centre <= hi {
                        hits.push(centre);
                    }
                }
                Some((x, y)) => {
                    if let Ok(i) = baby.binary_search_by(|e| e.0.cmp(&x)) {
                        let (_, by, j) = baby[i];
                        // r = ±jP
                        let m = if by == y { centre - j } else { centre + j };
                        if m >= lo && m <= hi {
                            hits.push(m);
                        }
                    }
                }
            }
            r = self.add(r, step);
            centre += 2 * s + 1;
        }
    }

    /// The exact order of `pt`, given a multiple `m` of it.
    fn order_from_multiple(&self, pt: Pt, m: u64) -> u64 {
        let mut ord = m;
        let mut rest = m;
        let mut f = 2u64;
        let mut primes = Vec::new();
        while f * f <= rest {
            if rest % f == 0 {
                primes.push(f);
                while rest % f == 0 {
                    rest /= f;
                }
            }
            f += if f == 2 { 1 } else { 2 };
        }
        if rest > 1 {
            primes.push(rest);
        }
        for l in primes {
            while ord % l == 0 && self.mul(pt, ord / l).is_none() {
                ord /= l;
            }
        }
        ord
    }
}

fn residue(n: &Integer, p: u64) -> u64 {
    let r: Integer = n.mod_op(Integer::from(p));
    u64::try_from(&r).unwrap_or(0)
}

/// Counts `#E(F_p)` for good primes `5 <= p < 2^32` by baby-step
/// giant-step, with the character sum as the fallback and below
/// [`SMALL_PRIME`].
pub(crate) struct TraceCounter {
    c4: Integer,
    c6: Integer,
    slow: PointCounter,
    baby: Vec<(u64, u64, u64)>,
    hits: Vec<u64>,
}

impl TraceCounter {
    pub(crate) fn new(curve: &Curve) -> TraceCounter {
        TraceCounter { c4: curve.c4().clone(), c6: curve.c6().clone(), slow: PointCounter::new(curve), baby: Vec::new(), hits: Vec::new() }
    }

    /// `a_p = p + 1 - #E(F_p)` at a prime `p` of good reduction (`p < 2^32`).
    pub(crate) fn trace(&mut self, p: u64) -> i64 {
        if p < SMALL_PRIME {
            return self.slow.trace(p);
        }
        // y^2 = x^3 - 27 c4 x - 54 c6 over F_p (p > 3), isomorphic to E
        let a = mulm(p - 27 % p, residue(&self.c4, p), p);
        let b = mulm(p - 54 % p, residue(&self.c6, p), p);
        let root = (p as f64).sqrt();
        let lo = (p as f64 + 1.0 - 2.0 * root).ceil().max(1.0) as u64;
        let hi = (p as f64 + 1.0 + 2.0 * root).floor() as u64;
        // candidates for #E(F_p): intersect the multiples found on E and,
        // reflected by n -> 2p + 2 - n, on the twist
        let mut cand: Option<Vec<u64>> = None;
        let mut x0 = 0u64;
        for _ in 0..40 {
            x0 += 1;
            if x0 >= p {
                break;
            }
            let f = addm(addm(mulm(mulm(x0, x0, p), x0, p), mulm(a, x0, p), p), b, p);
            if f == 0 {
                continue;
            }
            let chi = crate::arith::jacobi_u64(f, p);
            // f y^2 = x^3 + a x + b carries (x0, 1); scaled: Y^2 = X^3 + a f^2 X + b f^3
            let f2 = mulm(f, f, p);
            let curve = ShortCurve { a: mulm(a, f2, p), p };
            let pt = Some((mulm(f, x0, p), f2));
            curve.multiples_in(pt, lo, hi, &mut self.baby, &mut self.hits);
            if chi != 1 {
                for h in self.hits.iter_mut() {
                    *h = 2 * p + 2 - *h;
                }
            }
            let next: Vec<u64> = match cand.take() {
                None => self.hits.clone(),
                Some(c) => c.into_iter().filter(|n| self.hits.contains(n)).collect(),
            };
            if next.len() == 1 {
                return p as i64 + 1 - next[0] as i64;
            }
            if next.is_empty() {
                break; // impossible for a correct count: fall back
            }
            cand = Some(next);
        }
        self.slow.trace(p)
    }
}

/// The Dirichlet coefficients `a_0 = 0, a_1, ..., a_m` of `L(E, s)` from the
/// traces at the good primes and `bad = [(p, a_p)]` (`a_p` in `{-1, 0, 1}`)
/// at the primes dividing the conductor, by the Hecke recursion at prime
/// powers and multiplicativity.
pub(crate) fn dirichlet_coefficients_fast(
    curve: &Curve,
    bad: &[(u64, i64)],
    m: usize,
    stop: &dyn Fn() -> bool,
) -> Option<Vec<i64>> {
    let mut counter = TraceCounter::new(curve);
    let mut ap = vec![0i64; m + 1];
    let mut is_bad = vec![false; m + 1];
    for &(p, v) in bad {
        if (p as usize) <= m {
            ap[p as usize] = v;
            is_bad[p as usize] = true;
        }
    }
    let primes = primes_up_to(m as u64);
    for (i, &p) in primes.iter().enumerate() {
        if i % 1024 == 1023 && stop() {
            return None;
        }
        if !is_bad[p as usize] {
            ap[p as usize] = counter.trace(p);
        }
    }
    let mut spf = vec![0u32; m + 1];
    for &p in &primes {
        let p = p as usize;
        let mut k = p;
        while k <= m {
            if spf[k] == 0 {
                spf[k] = p as u32;
            }
            k += p;
        }
    }
    let mut a = vec![0i64; m + 1];
    if m >= 1 {
        a[1] = 1;
    }
    for n in 2..=m {
        let p = spf[n] as usize;
        if p == n {
            a[n] = ap[p];
            continue;
        }
        let mut q = n / p;
        let mut pk = p;
        while q % p == 0 {
            q /= p;
            pk *= p;
        }
        a[n] = if q > 1 {
            a[pk] * a[q]
        } else if is_bad[p] {
            ap[p] * a[n / p]
        } else {
            ap[p] * a[n / p] - (p as i64) * a[n / p / p]
        };
    }
    Some(a)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The fast traces agree with the character sum (an independent second
    /// computation) at every prime from 800 to 20000 on a few curves.
    #[test]
    fn fast_traces_match_character_sums() {
        for c in [[0, 0, 1, -1, 0], [0, 0, 0, -25, 0], [1, -1, 1, -29, 53], [0, 1, 1, -2, 0]] {
            let e = Curve::from_coefficients(c).unwrap();
            let disc = e.discriminant().clone();
            let mut fast = TraceCounter::new(&e);
            let mut slow = PointCounter::new(&e);
            for p in primes_up_to(20_000).into_iter().filter(|&p| p >= SMALL_PRIME) {
                if residue(&disc, p) == 0 {
                    continue;
                }
                assert_eq!(fast.trace(p), slow.trace(p), "{c:?} at {p}");
            }
        }
    }
}

#[cfg(test)]
mod timing {
    use super::*;
    #[test]
    #[ignore]
    fn coefficient_timing() {
        let e = Curve::from_coefficients([0, 0, 0, 6, 1]).unwrap();
        for m in [100_000usize, 250_000, 1_000_000] {
            let t = std::time::Instant::now();
            let a = dirichlet_coefficients_fast(&e, &[(2, 0), (3, 0), (11, 1)], m, &|| false).unwrap();
            eprintln!("{m}: {:?} ({})", t.elapsed(), a[m]);
        }
    }
}
