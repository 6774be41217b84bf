//! Saturation: an upper bound for the index of the span of the points in
//! E(Q)/E(Q)_tors (from a lower bound for canonical heights of non-torsion
//! points and the regulator), then p-saturation for each prime p up to it
//! by Siksek's method (*Infinite descent on elliptic curves*, Rocky
//! Mountain J. Math. 25 (1995)): reduce the points modulo good primes q and
//! look at their images in E(F_q)/pE(F_q). When the images keep a kernel,
//! a point Q with pQ = (the suggested combination) + torsion is searched
//! among points of small naive height and, when found, replaces a
//! generator; every such Q is checked exactly.

use crate::arith::{inv_mod, is_prime_u64, jacobi_u64, sqrt_mod_prime};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::UnsignedAbs;
use malachite::{Integer, Rational};

/// A point of E(F_q): `None` is the point at infinity.
pub(crate) type ModPt = Option<(u64, u64)>;

/// A Weierstrass model reduced modulo a prime `q` (odd, below 2^32), with
/// the group law in machine words.
#[derive(Clone, Debug)]
pub(crate) struct ModCurve {
    pub(crate) q: u64,
    pub(crate) a: [u64; 5],
}

fn residue(n: &Integer, q: u64) -> u64 {
    let r = n.unsigned_abs() % malachite::Natural::from(q);
    let r = u64::try_from(&r).unwrap_or(0);
    if *n < 0u32 && r != 0 {
        q - r
    } else {
        r
    }
}

fn residue_q(x: &Rational, q: u64) -> Option<u64> {
    let n = residue(&Integer::from(x.numerator_ref().clone()), q);
    let d = residue(&Integer::from(x.denominator_ref().clone()), q);
    if *x < 0u32 {
        let n = if n == 0 { 0 } else { q - n };
        return inv_mod(d, q).map(|i| mm(n, i, q));
    }
    inv_mod(d, q).map(|i| mm(n, i, q))
}

#[inline]
fn mm(a: u64, b: u64, q: u64) -> u64 {
    ((a as u128 * b as u128) % q as u128) as u64
}
#[inline]
fn ad(a: u64, b: u64, q: u64) -> u64 {
    let s = a + b;
    if s >= q {
        s - q
    } else {
        s
    }
}
#[inline]
fn sb(a: u64, b: u64, q: u64) -> u64 {
    if a >= b {
        a - b
    } else {
        a + q - b
    }
}

impl ModCurve {
    pub fn new(curve: &Curve, q: u64) -> ModCurve {
        let a = curve.coefficients();
        ModCurve { q, a: [0, 1, 2, 3, 4].map(|i| residue(&a[i], q)) }
    }

    /// The reduction of a rational point (points with `q | den x` go to O).
    pub fn reduce(&self, p: &Point) -> ModPt {
        match p {
            Point::Infinity => None,
            Point::Affine(x, y) => {
                let xr = residue_q(x, self.q)?;
                let yr = residue_q(y, self.q)?;
                Some((xr, yr))
            }
        }
    }

    pub fn contains(&self, p: ModPt) -> bool {
        let q = self.q;
        let [a1, a2, a3, a4, a6] = self.a;
        match p {
            None => true,
            Some((x, y)) => {
                let lhs = ad(mm(y, ad(y, ad(mm(a1, x, q), a3, q), q), q), 0, q);
                let rhs = ad(mm(ad(mm(ad(x, a2, q), x, q), a4, q), x, q), a6, q);
                lhs == rhs
            }
        }
    }

    pub fn add(&self, p: ModPt, r: ModPt) -> ModPt {
        let q = self.q;
        let [a1, a2, a3, a4, _a6] = self.a;
        let ((x1, y1), (x2, y2)) = match (p, r) {
            (None, _) => return r,
            (_, None) => return p,
            (Some(a), Some(b)) => (a, b),
        };
        let lambda;
        if x1 == x2 {
            if ad(ad(y1, y2, q), ad(mm(a1, x2, q), a3, q), q) == 0 {
                return None;
            }
            let num = ad(sb(ad(mm(3, mm(x1, x1, q), q), mm(mm(2, a2, q), x1, q), q), mm(a1, y1, q), q), a4, q);
            let den = ad(ad(mm(2, y1, q), mm(a1, x1, q), q), a3, q);
            lambda = mm(num, inv_mod(den, q)?, q);
        } else {
            lambda = mm(sb(y2, y1, q), inv_mod(sb(x2, x1, q), q)?, q);
        }
        let nu = sb(y1, mm(lambda, x1, q), q);
        let x3 = sb(sb(sb(ad(mm(lambda, lambda, q), mm(a1, lambda, q), q), a2, q), x1, q), x2, q);
        let y3 = sb(sb(0, ad(mm(ad(lambda, a1, q), x3, q), nu, q), q), a3, q);
        Some((x3, y3))
    }

    pub fn mul(&self, p: ModPt, mut n: u64) -> ModPt {
        let mut acc = None;
        let mut base = p;
        while n > 0 {
            if n & 1 == 1 {
                acc = self.add(acc, base);
            }
            n >>= 1;
            if n > 0 {
                base = self.add(base, base);
            }
        }
        acc
    }

    /// Some points of E(F_q), by increasing x.
    fn points_from(&self, start: u64) -> impl Iterator<Item = (u64, u64)> + '_ {
        let q = self.q;
        let [a1, a2, a3, a4, a6] = self.a;
        let inv2 = inv_mod(2, q).unwrap_or(0);
        (start..q).filter_map(move |x| {
            let b = ad(mm(a1, x, q), a3, q);
            let rhs = ad(mm(ad(mm(ad(x, a2, q), x, q), a4, q), x, q), a6, q);
            let d = ad(mm(b, b, q), mm(4, rhs, q), q);
            if d != 0 && jacobi_u64(d, q) != 1 {
                return None;
            }
            let s = sqrt_mod_prime(d, q)?;
            Some((x, mm(sb(s, b, q), inv2, q)))
        })
    }

    /// The roots of `4x^3 + b2 x^2 + 2 b4 x + b6` modulo q.
    fn two_division_roots(&self, b: &[u64; 3]) -> Vec<u64> {
        let q = self.q;
        let (b2, b4, b6) = (b[0], b[1], b[2]);
        (0..q)
            .filter(|&x| ad(mm(ad(mm(ad(mm(4, x, q), b2, q), x, q), mm(2, b4, q), q), x, q), b6, q) == 0)
            .collect()
    }
}

/// The auxiliary primes of Siksek's test with their point counts: the odd
/// primes `q` of good reduction in increasing order, each `#E(F_q)`
/// counted once and shared by the tests at every p (a test at a large p
/// passes over about p primes before one has `p | #E(F_q)`).
pub(crate) struct AuxPrimes<'a> {
    curve: &'a Curve,
    counted: Vec<(u64, u64)>,
    next: u64,
}

impl<'a> AuxPrimes<'a> {
    pub(crate) fn new(curve: &'a Curve) -> AuxPrimes<'a> {
        AuxPrimes { curve, counted: Vec::new(), next: 5 }
    }

    /// The `i`-th good prime `q >= 5` and `#E(F_q)`, if it is at most
    /// `max_q` (`None` past it).
    fn get(&mut self, i: usize, max_q: u64) -> Option<(u64, u64)> {
        while self.counted.len() <= i {
            let q = self.next;
            if q > max_q {
                return None;
            }
            self.next += 2;
            if !is_prime_u64(q) || residue(self.curve.discriminant(), q) == 0 {
                continue;
            }
            self.counted.push((q, self.curve.count_points_mod(q)));
        }
        self.counted.get(i).copied().filter(|(q, _)| *q <= max_q)
    }
}

/// The largest auxiliary prime Siksek's test at `p` may use: at least
/// `floor`, and for large `p` about `50 p log p`. A usable `q` needs
/// `p | #E(F_q)`, which holds for about one prime in `p`, and `q > p/4` at
/// least (Hasse), so below `X` there are about `X / (p log X)` of them: at
/// `50 p log p` some 25, against none to a few below a fixed 20,000 for `p`
/// in the hundreds (p = 569, 631 on [1,1,1,-103184897,5669933385215]).
pub(crate) fn aux_limit(p: u64, floor: u64) -> u64 {
    let scaled = (50.0 * p as f64 * (p as f64).ln()).ceil() as u64;
    floor.max(scaled).min(1 << 31)
}

/// Rows of the map G -> E(F_q)/pE(F_q) for one prime q with `n = #E(F_q)`
/// (each row a linear functional with values in F_p), or `None` when q is
/// not usable for p.
fn functionals(curve: &Curve, q: u64, n: u64, p: u64, pts: &[Point]) -> Option<Vec<Vec<u64>>> {
    let mc = ModCurve::new(curve, q);
    if !n.is_multiple_of(p) {
        return None;
    }
    let red: Vec<ModPt> = pts.iter().map(|pt| mc.reduce(pt)).collect();
    if red.iter().any(|r| !mc.contains(*r)) {
        return None;
    }
    let cyclic;
    if p == 2 {
        let b = curve.b_invariants();
        let bb = [residue(&b[0], q), residue(&b[1], q), residue(&b[2], q)];
        let roots = mc.two_division_roots(&bb);
        match roots.len() {
            1 => cyclic = true,
            3 => {
                // Kummer map E(F_q)/2 -> (F_q*/F_q*^2)^2, injective over a
                // finite field: P -> (x - e1, x - e2), with the usual values
                // at the 2-torsion points.
                let (e1, e2, e3) = (roots[0], roots[1], roots[2]);
                let chi = |v: u64| -> u64 { u64::from(jacobi_u64(v, q) == -1) };
                let mut rows = vec![Vec::new(), Vec::new()];
                for r in &red {
                    let (c1, c2) = match r {
                        None => (0, 0),
                        Some((x, _)) => {
                            let x = *x;
                            if x == e1 {
                                (chi(mm(sb(e1, e2, q), sb(e1, e3, q), q)), chi(sb(e1, e2, q)))
                            } else if x == e2 {
                                (chi(sb(e2, e1, q)), chi(mm(sb(e2, e1, q), sb(e2, e3, q), q)))
                            } else {
                                (chi(sb(x, e1, q)), chi(sb(x, e2, q)))
                            }
                        }
                    };
                    rows[0].push(c1);
                    rows[1].push(c2);
                }
                return Some(rows);
            }
            _ => return None,
        }
    } else {
        // E(F_q)[p] = Z/p x Z/p forces p | q - 1 (Weil pairing), so the
        // Sylow p-subgroup is cyclic when q != 1 mod p.
        cyclic = q % p != 1;
    }
    let m = n / p;
    let g = if cyclic {
        mc.points_from(0).map(|pt| mc.mul(Some(pt), m)).find(|r| r.is_some())?
    } else if p == 2 {
        return None;
    } else {
        // q = 1 mod p: the Sylow p-subgroup S may still be cyclic. If it is
        // not (S = Z/p^a x Z/p^b, b >= 1), then n/p = m' p^(a+b-1) with
        // a + b - 1 >= a kills E(F_q); so one point with (n/p) P != O
        // proves S cyclic, and the functional below applies.
        match mc.points_from(0).take(24).map(|pt| mc.mul(Some(pt), m)).find(|r| r.is_some()) {
            Some(g) => g,
            None => return noncyclic_functionals(&mc, n, p, &red),
        }
    };
    // Cyclic Sylow p-subgroup S: P -> (n/p) P has kernel pE(F_q) and lands in
    // S[p] = <g>; the functional is the discrete logarithm to base g.
    let mut row = Vec::with_capacity(red.len());
    for r in &red {
        let t = mc.mul(*r, m);
        let mut acc: ModPt = None;
        let mut found = None;
        for k in 0..p {
            if acc == t {
                found = Some(k);
                break;
            }
            acc = mc.add(acc, g);
        }
        row.push(found?);
    }
    Some(vec![row])
}

/// Functionals `E(F_q) -> F_p` vanishing on `pE(F_q)` when the Sylow
/// p-subgroup `S` is not cyclic (`S = Z/p^a x Z/p^b`, `a >= b >= 1`, so
/// `p | q - 1`), for odd `p <= 50`. With `n = p^k m`, `p ∤ m`: the
/// p-parts `m R` of up to 24 points give `g1` of the largest order `p^a`
/// and `g2` of the largest order modulo `<g1>`, `p^j`; when `a + j = k`
/// the two generate `S` (exactly: `|<g1, g2>| = p^(a+j) = |S|`), so `S`
/// has exponent `p^a`, and `psi(P) = p^(a-1) m P` is a homomorphism to
/// `<psi(g1), psi(g2)>`, of order `p` or `p^2`, that kills `pE(F_q)`. The
/// functionals are the coordinates of `psi(P)` in that basis (a table of
/// its `p^2` elements). `None` when the samples do not generate `S` (the
/// prime q is then skipped: nothing is claimed from it).
fn noncyclic_functionals(mc: &ModCurve, n: u64, p: u64, red: &[ModPt]) -> Option<Vec<Vec<u64>>> {
    if p > 50 {
        return None;
    }
    let (mut k, mut m) = (0u32, n);
    while m % p == 0 {
        m /= p;
        k += 1;
    }
    let order_exp = |r: ModPt| -> u32 {
        let (mut e, mut t) = (0u32, r);
        while t.is_some() && e <= k {
            t = mc.mul(t, p);
            e += 1;
        }
        e
    };
    let samples: Vec<ModPt> = mc.points_from(0).take(24).map(|pt| mc.mul(Some(pt), m)).collect();
    let (g1, a) = samples.iter().map(|&r| (r, order_exp(r))).max_by_key(|s| s.1)?;
    if a == 0 || a > k {
        return None;
    }
    let pa = p.checked_pow(a)?;
    if pa > 1 << 16 {
        // (the table of <g1> would be large; such q are skipped)
        return None;
    }
    let mut cyc = std::collections::HashSet::with_capacity(pa as usize);
    let mut acc: ModPt = None;
    for _ in 0..pa {
        cyc.insert(acc);
        acc = mc.add(acc, g1);
    }
    let order_mod = |r: ModPt| -> u32 {
        let (mut j, mut t) = (0u32, r);
        while !cyc.contains(&t) && j <= k {
            t = mc.mul(t, p);
            j += 1;
        }
        j
    };
    let (g2, j) = samples.iter().map(|&r| (r, order_mod(r))).max_by_key(|s| s.1)?;
    if a + j != k {
        return None;
    }
    let lift = m.checked_mul(p.checked_pow(a - 1)?)?;
    let h1 = mc.mul(g1, p.pow(a - 1));
    let h2 = mc.mul(g2, p.pow(a - 1));
    let mut line = std::collections::HashMap::new();
    let mut acc: ModPt = None;
    for u in 0..p {
        line.insert(acc, u);
        acc = mc.add(acc, h1);
    }
    let one_dim = line.contains_key(&h2);
    let mut table = std::collections::HashMap::new();
    let mut row_start: ModPt = None;
    for v in 0..(if one_dim { 1 } else { p }) {
        let mut acc = row_start;
        for u in 0..p {
            table.insert(acc, (u, v));
            acc = mc.add(acc, h1);
        }
        row_start = mc.add(row_start, h2);
    }
    let mut rows = vec![Vec::with_capacity(red.len()); if one_dim { 1 } else { 2 }];
    for r in red {
        let (u, v) = *table.get(&mc.mul(*r, lift))?;
        rows[0].push(u);
        if !one_dim {
            rows[1].push(v);
        }
    }
    Some(rows)
}

/// Echelon form over F_p, for incremental rank computation.
#[derive(Clone, Debug)]
pub(crate) struct Echelon {
    p: u64,
    rows: Vec<(usize, Vec<u64>)>,
}

impl Echelon {
    pub fn new(p: u64) -> Echelon {
        Echelon { p, rows: Vec::new() }
    }
    pub fn rank(&self) -> usize {
        self.rows.len()
    }
    pub fn insert(&mut self, mut v: Vec<u64>) {
        let p = self.p;
        for (piv, r) in &self.rows {
            let c = v[*piv] % p;
            if c != 0 {
                for (vi, ri) in v.iter_mut().zip(r) {
                    *vi = (*vi + p - mm(c, *ri, p)) % p;
                }
            }
        }
        if let Some(piv) = v.iter().position(|&c| c % p != 0) {
            let inv = inv_mod(v[piv], p).unwrap_or(1);
            for c in v.iter_mut() {
                *c = mm(*c, inv, p);
            }
            for (_, r) in self.rows.iter_mut() {
                let c = r[piv];
                if c != 0 {
                    for (ri, vi) in r.iter_mut().zip(&v) {
                        *ri = (*ri + p - mm(c, *vi, p)) % p;
                    }
                }
            }
            self.rows.push((piv, v));
        }
    }
    /// A non-zero vector of the kernel (the row space's annihilator), if any.
    pub fn kernel_vector(&self, s: usize) -> Option<Vec<u64>> {
        let p = self.p;
        let pivots: Vec<usize> = self.rows.iter().map(|(c, _)| *c).collect();
        let free = (0..s).find(|c| !pivots.contains(c))?;
        let mut v = vec![0u64; s];
        v[free] = 1;
        for (piv, r) in &self.rows {
            v[*piv] = (p - r[free] % p) % p;
        }
        Some(v)
    }
}

/// The outcome of the Siksek test at one prime p.
pub(crate) enum SiksekOutcome {
    /// The images have full rank: p-saturated (proven).
    Saturated { primes_used: usize },
    /// After the allowed primes q, this combination stayed in the kernel.
    Kernel(Vec<u64>),
    /// Time ran out.
    OutOfTime,
}

/// Runs Siksek's test for p on the list `pts` (generators modulo torsion
/// followed by the torsion generators whose order p divides).
pub(crate) fn siksek_test(
    curve: &Curve,
    pts: &[Point],
    p: u64,
    max_q: u64,
    aux: &mut AuxPrimes,
    out_of_time: &dyn Fn() -> bool,
) -> Result<SiksekOutcome, Error> {
    let s = pts.len();
    if s == 0 {
        return Ok(SiksekOutcome::Saturated { primes_used: 0 });
    }
    let mut ech = Echelon::new(p);
    let mut used = 0usize;
    let mut since_growth = 0usize;
    for i in 0.. {
        if i % 64 == 0 && out_of_time() {
            return Ok(SiksekOutcome::OutOfTime);
        }
        let Some((q, n)) = aux.get(i, max_q) else { break };
        if q == p || !n.is_multiple_of(p) {
            continue;
        }
        if out_of_time() {
            return Ok(SiksekOutcome::OutOfTime);
        }
        let Some(rows) = functionals(curve, q, n, p, pts) else { continue };
        used += 1;
        let before = ech.rank();
        for r in rows {
            ech.insert(r);
        }
        if ech.rank() == s {
            return Ok(SiksekOutcome::Saturated { primes_used: used });
        }
        if ech.rank() == before {
            since_growth += 1;
        } else {
            since_growth = 0;
        }
        if since_growth >= 12 + 2 * s {
            break;
        }
    }
    match ech.kernel_vector(s) {
        Some(v) => Ok(SiksekOutcome::Kernel(v)),
        None => Err(Error::new(ErrorKind::InvalidValue, "Siksek test: inconsistent echelon form")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The non-cyclic functionals on y^2 + y = x^3 - x (conductor 37,
    /// rank 1, generator (0,0); Cremona 1997, Table 1): at the primes
    /// q = 1 mod 3 where E(F_q) has full 3-torsion they are found, they
    /// vanish on 3 (0,0) (a homomorphism that kills 3E(F_q)), and together
    /// they do not all vanish on (0,0).
    #[test]
    fn noncyclic_functionals_kill_multiples() {
        let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
        let g = Point::from_ints(0, 0);
        let pts = [g.clone(), e.multiple(&g, 3), e.multiple(&g, 7)];
        let (mut used, mut seen_nonzero) = (0, false);
        for q in (5..20_000u64).filter(|&q| q != 37 && q % 3 == 1 && is_prime_u64(q)) {
            let mc = ModCurve::new(&e, q);
            let n = e.count_points_mod(q);
            if n % 9 != 0 {
                continue;
            }
            // only where the Sylow 3-subgroup is not cyclic
            if mc.points_from(0).take(24).any(|pt| mc.mul(Some(pt), n / 3).is_some()) {
                continue;
            }
            let red: Vec<ModPt> = pts.iter().map(|p| mc.reduce(p)).collect();
            let Some(rows) = noncyclic_functionals(&mc, n, 3, &red) else { continue };
            used += 1;
            for r in &rows {
                assert_eq!(r[1], 0, "q = {q}");
                assert_eq!(r[2], (7 * r[0]) % 3, "q = {q}");
                seen_nonzero |= r[0] != 0;
            }
        }
        assert!(used >= 3, "{used}");
        assert!(seen_nonzero);
    }
}
