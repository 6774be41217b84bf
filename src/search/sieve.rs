//! The bit-parallel sieve shared by the quartic and the curve search.
//!
//! A [`Form`] is an integral polynomial `F(x, z) = sum c * x^i * z^j`; the
//! engine looks for coprime pairs `(x, z)` with `z >= 1` for which `F(x, z)`
//! is a perfect square, in shells of growing height
//! `max(|x|, z^weight)` (weight 1 for binary quartics, 2 for the
//! `x = m / k^2` parametrisation of a Weierstrass curve).
//!
//! For every modulus `q` (small primes and the prime powers 64, 27, 25, 49) the
//! table holds, for each residue `r` of `z` and each start offset `s`, the
//! 64-bit word whose bit `j` says whether `F(s + j, r)` is a square modulo
//! `q` (and `s + j`, `r` are not both divisible by the prime under `q`). A
//! word of 64 consecutive `x` then costs one load and one AND per modulus;
//! the moduli run most selective first and a word is dropped as soon as it
//! becomes zero. Survivors get the exact test.

use super::SearchLimits;
use crate::arith::gcd_u64;
use malachite::base::num::arithmetic::traits::{CheckedSqrt, Mod, UnsignedAbs};
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural};
use std::sync::atomic::Ordering;
use std::time::Instant;

/// Moduli tried for the sieve, with their primes; each must be at most 64
/// (the offset update works in bytes and the table build in small words).
/// Prime powers stand in for their primes.
const MODULI: [(u32, u32); 18] = [
    (64, 2),
    (27, 3),
    (25, 5),
    (49, 7),
    (11, 11),
    (13, 13),
    (17, 17),
    (19, 19),
    (23, 23),
    (29, 29),
    (31, 31),
    (37, 37),
    (41, 41),
    (43, 43),
    (47, 47),
    (53, 53),
    (59, 59),
    (61, 61),
];

/// Highest degree of either variable in a term of a sieved form.
pub(crate) const MAX_DEGREE: usize = 7;

/// Lanes of the per-word offset state (at least `MODULI.len()`).
const LANES: usize = 32;

/// Heights above this are clamped (the search could not finish anyway).
pub(crate) const MAX_HEIGHT: u64 = 1 << 31;

/// Height of the first shell; each later shell doubles it.
const FIRST_SHELL: u64 = 16;

/// Check the clock after about this many candidates.
const CLOCK_EVERY: u64 = 1 << 14;

/// An integral polynomial in two variables, as a list of terms `c x^i z^j`.
#[derive(Clone, Debug)]
pub(crate) struct Form {
    terms: Vec<(Integer, u32, u32)>,
}

impl Form {
    /// The form with the given terms (zero coefficients are dropped).
    ///
    /// Panics (internal precondition) if a variable has degree above
    /// [`MAX_DEGREE`] in some term.
    pub(crate) fn new(terms: Vec<(Integer, u32, u32)>) -> Form {
        assert!(terms.iter().all(|t| t.1 as usize <= MAX_DEGREE && t.2 as usize <= MAX_DEGREE));
        Form { terms: terms.into_iter().filter(|t| t.0 != Integer::ZERO).collect() }
    }

    /// The exact value at `(x, z)`.
    pub(crate) fn value(&self, x: &Integer, z: &Integer) -> Integer {
        let mut v = Integer::ZERO;
        for (c, i, j) in &self.terms {
            let mut t = c.clone();
            for _ in 0..*i {
                t *= x;
            }
            for _ in 0..*j {
                t *= z;
            }
            v += t;
        }
        v
    }

    /// The non-negative square root of the value at `(x, z)` if it is a
    /// perfect square, computed on Integers only.
    pub(crate) fn root_exact(&self, x: i64, z: u64) -> Option<Natural> {
        let v = self.value(&Integer::from(x), &Integer::from(z));
        if v < Integer::ZERO {
            return None;
        }
        v.unsigned_abs().checked_sqrt()
    }

    /// The value modulo `q` at residues `x`, `z` below `q <= 64`, with the
    /// coefficients reduced in `cq` and `pw[t][i] = t^i mod q`; every product
    /// `cq * pw * pw` is below `2^18`, so one reduction at the end suffices.
    fn value_mod(&self, cq: &[u64], pw: &[[u64; MAX_DEGREE + 1]], x: u64, z: u64, q: u64) -> u64 {
        let mut v = 0u64;
        for (k, &(_, i, j)) in self.terms.iter().enumerate() {
            v += cq[k] * pw[x as usize][i as usize] * pw[z as usize][j as usize];
        }
        v % q
    }

    /// The weighted degree `D` with `F(l^w x, l z) = l^D F(x, z)`, if the form
    /// is weighted homogeneous for the weight `w`.
    fn weighted_degree(&self, w: u32) -> Option<u32> {
        let d = self.terms.first().map(|t| t.1 * w + t.2)?;
        self.terms.iter().all(|t| t.1 * w + t.2 == d).then_some(d)
    }
}

/// Word-sized evaluation of a form, valid while every partial sum stays
/// below `2^126` in absolute value for the heights searched.
struct FastForm {
    terms: Vec<(i128, u32, u32)>,
}

impl FastForm {
    /// The fast evaluator if `sum |c| X^i Z^j < 2^126`.
    fn new(form: &Form, xmax: u64, zmax: u64) -> Option<FastForm> {
        let (xm, zm) = (Integer::from(xmax), Integer::from(zmax));
        let mut bound = Integer::ZERO;
        let mut terms = Vec::with_capacity(form.terms.len());
        for (c, i, j) in &form.terms {
            let mut t = Integer::from(c.unsigned_abs_ref().clone());
            for _ in 0..*i {
                t *= &xm;
            }
            for _ in 0..*j {
                t *= &zm;
            }
            bound += t;
            terms.push((i128::try_from(c).ok()?, *i, *j));
        }
        if bound < (Integer::from(1u32) << 126u32) {
            Some(FastForm { terms })
        } else {
            None
        }
    }

    #[inline]
    fn root(&self, x: i64, z: u64) -> Option<Natural> {
        let (x, z) = (x as i128, z as i128);
        let mut v: i128 = 0;
        for &(c, i, j) in &self.terms {
            let mut t = c;
            for _ in 0..i {
                t *= x;
            }
            for _ in 0..j {
                t *= z;
            }
            v += t;
        }
        if v < 0 {
            return None;
        }
        let r = (v as u128).isqrt();
        (r * r == v as u128).then(|| Natural::from(r))
    }
}

/// A modulus being considered: its density of admissible pairs and the
/// patterns of the rows not derived from others (the rest are zero).
struct Candidate {
    q: u32,
    p: u32,
    density: f64,
    rows: Vec<u64>,
}

/// Moduli kept whatever the height.
const MIN_MODULI: usize = 6;

/// One sieve modulus: `q`, the step `64 mod q` and where its rows start.
#[derive(Clone, Copy, Debug)]
struct Modulus {
    q: u32,
    base: usize,
}

/// How a run ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) struct RunReport {
    pub(crate) complete: bool,
    pub(crate) height_reached: u64,
    pub(crate) candidates: u64,
}

/// Deadline and cancellation watcher.
pub(crate) struct Clock<'a> {
    limits: &'a SearchLimits,
    since: u64,
}

impl<'a> Clock<'a> {
    pub(crate) fn new(limits: &'a SearchLimits) -> Self {
        Clock { limits, since: 0 }
    }

    /// Whether to stop, after `work` more candidates.
    #[inline]
    pub(crate) fn expired(&mut self, work: u64) -> bool {
        if let Some(c) = &self.limits.cancel {
            if c.load(Ordering::Relaxed) {
                return true;
            }
        }
        self.since += work;
        if self.since >= CLOCK_EVERY {
            self.since = 0;
            if let Some(d) = self.limits.deadline {
                return Instant::now() >= d;
            }
        }
        false
    }

    /// A check that always reads the clock.
    pub(crate) fn expired_now(&mut self) -> bool {
        self.since = CLOCK_EVERY;
        self.expired(0)
    }
}

/// The sieve tables for one form.
pub(crate) struct Sieve {
    form: Form,
    weight: u32,
    moduli: Vec<Modulus>,
    /// Per lane: the modulus (1 for unused lanes).
    lane_q: [u8; LANES],
    /// Per lane: `64 mod q`.
    lane_step: [u8; LANES],
    table: Vec<u64>,
}

impl Sieve {
    /// Build the tables for `form`, whose rows `z` have height `z^weight`,
    /// for a search up to `height` (which decides how many moduli pay for
    /// their tables).
    pub(crate) fn new(form: Form, weight: u32, height: u64) -> Sieve {
        // Phase 1: for each modulus, the admissible residues of the rows that
        // are not derived from others, and the density. The form is weighted
        // homogeneous, F(u^w x, u z) = u^D F(x, z); when D is even, u^D is a
        // square and for r = p^a u with u a unit mod q the row of r is the
        // row of p^a permuted: ok_r[u^w t] = ok_{p^a}[t]. Then only the rows
        // 0 and p^a need evaluating.
        let homogeneous = form.weighted_degree(weight).is_some_and(|d| d % 2 == 0);
        let max_deg = form.terms.iter().map(|t| t.1.max(t.2) as usize).max().unwrap_or(0);
        let mut found: Vec<Candidate> = Vec::with_capacity(MODULI.len());
        for &(q, p) in MODULI.iter() {
            let (qu, pu) = (q as u64, p as u64);
            let qn = Integer::from(q);
            let cq: Vec<u64> = form
                .terms
                .iter()
                // invariant: a residue mod q < 2^64 is in [0, q) and fits a u64
                .map(|(c, _, _)| u64::try_from(&c.mod_op(&qn)).expect("residue below q"))
                .collect();
            let mut pw = [[1u64; MAX_DEGREE + 1]; 64];
            for (t, row) in pw.iter_mut().enumerate().take(q as usize) {
                for i in 1..=max_deg {
                    row[i] = row[i - 1] * t as u64 % qu;
                }
            }
            let mut is_sq = 0u64;
            let mut mult_p = 0u64;
            for y in 0..qu {
                is_sq |= 1 << (y * y % qu);
                mult_p |= ((y % pu == 0) as u64) << y;
            }
            let row_pattern = |r: u64| -> u64 {
                let mut pat = 0u64;
                let r_mult = (mult_p >> r) & 1 == 1;
                for t in 0..qu {
                    let coprime = !(r_mult && (mult_p >> t) & 1 == 1);
                    let ok = coprime && (is_sq >> form.value_mod(&cq, &pw, t, r, qu)) & 1 == 1;
                    pat |= (ok as u64) << t;
                }
                pat
            };
            let mut rows = vec![0u64; q as usize];
            let mut ones = 0u64;
            if homogeneous {
                // rows 1, p, p^2, ... below q, and 0
                let mut pa = 1u64;
                while pa < qu {
                    rows[pa as usize] = row_pattern(pa);
                    let count = (qu / pa) - (qu / pa / pu); // r < q with v_p(r) = a
                    ones += count * rows[pa as usize].count_ones() as u64;
                    pa *= pu;
                }
                rows[0] = row_pattern(0);
                ones += rows[0].count_ones() as u64;
            } else {
                for r in 0..qu {
                    rows[r as usize] = row_pattern(r);
                    ones += rows[r as usize].count_ones() as u64;
                }
            }
            let density = ones as f64 / (qu * qu) as f64;
            if density <= 0.999 {
                found.push(Candidate { q, p, density, rows });
            }
        }
        // invariant: densities are quotients of small positive counts, never NaN
        found.sort_by(|a, b| a.density.partial_cmp(&b.density).expect("densities are finite"));

        // Phase 2: build the rotated words for the most selective moduli,
        // while the exact tests a modulus saves outweigh its table.
        let rows_searched = if weight == 1 { height } else { height.isqrt() };
        let mut survivors = (rows_searched as f64) * (2 * height + 1) as f64;
        let exact_cost = if FastForm::new(&form, height, rows_searched).is_some() { 30.0 } else { 300.0 };
        let mut table = Vec::new();
        let mut moduli = Vec::new();
        for c in found {
            let q = c.q as u64;
            let gain = survivors * (1.0 - c.density) * exact_cost;
            if moduli.len() >= MIN_MODULI && gain < (q * q) as f64 {
                break;
            }
            survivors *= c.density;
            let base = table.len();
            table.reserve(q as usize * q as usize);
            for r in 0..q {
                let mut pat = if !homogeneous || r == 0 {
                    c.rows[r as usize] as u128
                } else {
                    // r = p^a u: scatter the row of p^a by u^w.
                    let (mut pa, mut u) = (1u64, r);
                    while u % c.p as u64 == 0 {
                        pa *= c.p as u64;
                        u /= c.p as u64;
                    }
                    let mut step = 1u64;
                    for _ in 0..weight {
                        step = step * u % q;
                    }
                    let (mut pat, mut idx, mut bits) = (0u64, 0u64, c.rows[pa as usize]);
                    for _ in 0..q {
                        pat |= (bits & 1) << idx;
                        bits >>= 1;
                        idx += step;
                        if idx >= q {
                            idx -= q;
                        }
                    }
                    pat as u128
                };
                // Repeat the period up to 128 bits; the word for offset s is
                // then bits s .. s + 64.
                let mut len = q;
                while len < 128 {
                    pat |= pat << len;
                    len *= 2;
                }
                table.extend((0..q).map(|s| (pat >> s) as u64));
            }
            moduli.push(Modulus { q: c.q, base });
        }
        let mut lane_q = [1u8; LANES];
        let mut lane_step = [0u8; LANES];
        for (i, m) in moduli.iter().enumerate() {
            lane_q[i] = m.q as u8;
            lane_step[i] = (64 % m.q) as u8;
        }
        Sieve { form, weight, moduli, lane_q, lane_step, table }
    }

    /// Height of row `z`.
    #[inline]
    fn row_height(&self, z: u64) -> u64 {
        if self.weight == 1 {
            z
        } else {
            z.saturating_mul(z)
        }
    }

    /// Largest row `z` with `z^weight <= h`.
    fn max_row(&self, h: u64) -> u64 {
        if self.weight == 1 {
            h
        } else {
            h.isqrt()
        }
    }

    /// Offsets `x mod q` per lane.
    fn offsets(&self, x: i64) -> [u8; LANES] {
        let mut s = [0u8; LANES];
        for (i, m) in self.moduli.iter().enumerate() {
            s[i] = x.rem_euclid(m.q as i64) as u8;
        }
        s
    }

    /// Scan `x` in `[x_lo, x_lo + len)` on the row whose table rows are
    /// `rows`; `hit(x)` gets every survivor and returns true to stop. Returns
    /// the number of candidates covered when stopped early.
    #[inline]
    fn scan<F: FnMut(i64) -> bool>(
        &self,
        rows: &[&[u64]; LANES],
        start: &[u8; LANES],
        x_lo: i64,
        len: u64,
        hit: &mut F,
    ) -> Option<u64> {
        if len == 0 {
            return None;
        }
        let k = self.moduli.len();
        let rows = &rows[..k];
        let mut s = *start;
        let nw = len.div_ceil(64);
        let tail = len - 64 * (nw - 1);
        let tail_mask = if tail == 64 { !0u64 } else { (1u64 << tail) - 1 };
        for w in 0..nw {
            let mut c = if w + 1 == nw { tail_mask } else { !0u64 };
            for (i, row) in rows.iter().enumerate() {
                c &= row[s[i] as usize];
                if c == 0 {
                    break;
                }
            }
            for i in 0..LANES {
                let t = s[i] + self.lane_step[i];
                s[i] = t.min(t.wrapping_sub(self.lane_q[i]));
            }
            while c != 0 {
                let j = c.trailing_zeros() as u64;
                c &= c - 1;
                if hit(x_lo + (w * 64 + j) as i64) {
                    return Some(w * 64 + j + 1);
                }
            }
        }
        None
    }

    /// Run the search up to `limits.height` (already clamped to
    /// [`MAX_HEIGHT`] by the caller as `height`), over the pairs of height
    /// above `from` only (those up to `from` were searched before: the
    /// shells then double from `from`). `on_point(x, z, root)` is
    /// called for every coprime pair whose value is a square, and returns true
    /// to stop the search.
    pub(crate) fn run<P: FnMut(i64, u64, Natural) -> bool>(
        &self,
        from: u64,
        height: u64,
        clock: &mut Clock<'_>,
        on_point: &mut P,
    ) -> RunReport {
        let mut report = RunReport { complete: false, height_reached: from.min(height), candidates: 0 };
        if height == 0 || from >= height {
            report.complete = true;
            return report;
        }
        let fast = FastForm::new(&self.form, height, self.max_row(height));
        let k = self.moduli.len();
        let mut h0 = from;
        let mut h = if from == 0 { height.min(FIRST_SHELL) } else { height.min(2 * from) };
        loop {
            let lo_start = self.offsets(-(h as i64));
            let hi_start = self.offsets(h0 as i64 + 1);
            let mut zres = [0u8; LANES];
            for (i, m) in self.moduli.iter().enumerate() {
                zres[i] = (1 % m.q) as u8;
            }
            let mut rows: [&[u64]; LANES] = [&[]; LANES];
            for z in 1..=self.max_row(h) {
                if clock.expired(0) {
                    return report;
                }
                for i in 0..k {
                    let m = self.moduli[i];
                    let b = m.base + zres[i] as usize * m.q as usize;
                    rows[i] = &self.table[b..b + m.q as usize];
                }
                let mut test = |x: i64| -> bool {
                    if gcd_u64(x.unsigned_abs(), z) != 1 {
                        return false;
                    }
                    let root = match &fast {
                        Some(f) => f.root(x, z),
                        None => self.form.root_exact(x, z),
                    };
                    match root {
                        Some(r) => on_point(x, z, r),
                        None => false,
                    }
                };
                let mut covered = 0u64;
                let intervals: [(i64, u64, &[u8; LANES]); 2] = if self.row_height(z) > h0 {
                    [(-(h as i64), 2 * h + 1, &lo_start), (0, 0, &hi_start)]
                } else {
                    [(-(h as i64), h - h0, &lo_start), (h0 as i64 + 1, h - h0, &hi_start)]
                };
                for (x_lo, len, start) in intervals {
                    if let Some(done) = self.scan(&rows, start, x_lo, len, &mut test) {
                        report.candidates += covered + done;
                        return report;
                    }
                    covered += len;
                }
                report.candidates += covered;
                if clock.expired(covered) {
                    return report;
                }
                for i in 0..k {
                    zres[i] += 1;
                    if zres[i] as u32 == self.moduli[i].q {
                        zres[i] = 0;
                    }
                }
            }
            report.height_reached = h;
            if h == height {
                report.complete = true;
                return report;
            }
            h0 = h;
            h = height.min(2 * h);
        }
    }

    /// The moduli in the order used (for tests and tuning).
    #[cfg(test)]
    pub(crate) fn moduli(&self) -> Vec<u32> {
        self.moduli.iter().map(|m| m.q).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn quartic_form(c: [i64; 5]) -> Form {
        Form::new(c.iter().enumerate().map(|(k, &v)| (Integer::from(v), 4 - k as u32, k as u32)).collect())
    }

    /// Every table bit against a direct evaluation mod q.
    fn check_table(form: &Form, weight: u32) {
        let sv = Sieve::new(form.clone(), weight, 1 << 20);
        assert!(!sv.moduli.is_empty());
        for m in &sv.moduli {
            let q = m.q as u64;
            let p = MODULI.iter().find(|e| e.0 == m.q).unwrap().1 as u64;
            let squares: Vec<u64> = (0..q).map(|y| y * y % q).collect();
            for r in 0..q {
                for s in 0..q {
                    let w = sv.table[m.base + (r * q + s) as usize];
                    for j in 0..64u64 {
                        let t = (s + j) % q;
                        let v = form.value(&Integer::from(t), &Integer::from(r)).mod_op(Integer::from(q));
                        let v = u64::try_from(&v).unwrap();
                        let want = squares.contains(&v) && !(t % p == 0 && r % p == 0);
                        assert_eq!((w >> j) & 1 == 1, want, "q={q} r={r} s={s} j={j}");
                    }
                }
            }
        }
    }

    #[test]
    fn table_words_match_direct_residues() {
        check_table(&quartic_form([3, -2, 5, 7, -11]), 1);
        check_table(&quartic_form([-34, 0, 0, 0, 2]), 1);
        // The form of y^2 + y = x^3 - x: 4 m^3 - 4 m k^4 + k^6 (weight 2).
        let curve = Form::new(vec![(Integer::from(4), 3, 0), (Integer::from(-4), 1, 4), (Integer::from(1), 0, 6)]);
        check_table(&curve, 2);
        // Not weighted homogeneous: every row computed directly.
        let mixed = Form::new(vec![(Integer::from(1), 3, 0), (Integer::from(5), 1, 1), (Integer::from(-7), 0, 0)]);
        assert!(mixed.weighted_degree(1).is_none());
        check_table(&mixed, 1);
    }

    #[test]
    fn moduli_sorted_and_useless_ones_dropped() {
        // x^2 z^2 is a square everywhere, so only the coprimality rule removes
        // residues: density 1 - 1/p^2, above 0.999 exactly for p >= 37.
        let sv = Sieve::new(quartic_form([0, 0, 1, 0, 0]), 1, 1 << 20);
        assert_eq!(sv.moduli(), vec![64, 27, 25, 49, 11, 13, 17, 19, 23, 29, 31]);
        // In general the densities come out non-decreasing.
        let sv = Sieve::new(quartic_form([2, 0, 0, 0, -34]), 1, 1 << 20);
        let dens: Vec<f64> = sv
            .moduli
            .iter()
            .map(|m| {
                // bit 0 of the word for offset s is the residue s itself
                let q = m.q as usize;
                let ones: u64 = sv.table[m.base..m.base + q * q].iter().map(|w| w & 1).sum();
                ones as f64 / (q * q) as f64
            })
            .collect();
        assert!(dens.len() >= 10);
        assert!(dens.windows(2).all(|d| d[0] <= d[1]), "{dens:?}");
    }

    #[test]
    fn fast_form_agrees_with_integers() {
        let form = quartic_form([123456789, -987654321, 5, 7, -1 << 40]);
        let fast = FastForm::new(&form, 1000, 1000).unwrap();
        for x in -50..50i64 {
            for z in 0..20u64 {
                assert_eq!(fast.root(x * 17, z * 31), form.root_exact(x * 17, z * 31));
            }
        }
        // Too large for the word path.
        assert!(FastForm::new(&quartic_form([1 << 62, 0, 0, 0, 1]), 1 << 20, 1 << 20).is_none());
    }
}

