//! Enumeration of the `GL2(Z)`-classes of integral binary quartics with
//! given invariants `I`, `J` (the method of Birch and Swinnerton-Dyer, 1963,
//! with bounds derived below; cf. Cremona, *Algorithms for Modular Elliptic
//! Curves*, 2nd ed., 3.5, and Cremona, *Reduction of binary cubic and quartic
//! forms*, LMS J. Comput. Math. 2 (1999)).
//!
//! # The bounds
//!
//! Write `φ_k` for the roots of `F(φ) = φ^3 - 3Iφ + J` and `α_1..α_4` for the
//! roots of `g(x, 1)`. For the three pairings `{α_i α_j | α_k α_l}` of the
//! roots put `s = α_i + α_j - α_k - α_l`; then, for the matching root `φ`,
//!
//! ```text
//!   4aφ - H = 3 a^2 s^2 = 3 q_φ(1,0)^2,      4φ g - g_H = 3 q_φ^2,
//!   disc q_φ = (4/9) F'(φ),                    g = 3 (q_φ^2 - q_ψ^2) / (4(φ - ψ)).
//! ```
//!
//! Let `Q` be the positive definite covariant of the reduction module and
//! assume `Q = (A, B, C)` is Gauss-reduced, so `3A^2 ≤ |disc Q|`. For an
//! indefinite covariant `q` apolar to `Q` one has `|q(v)| ≤ sqrt(disc q / |disc Q|) Q(v)`.
//! Evaluating the identities above at `(1, 0)` gives, for a reduced form
//! (`φ_1 < φ_2 < φ_3` when all are real):
//!
//! * **four real roots** (`Q = q_{φ_2}`): `-(φ_2 - φ_1)/9 ≤ a ≤ (φ_3 - φ_2)/9` and
//!   `4aφ_2 - (4/9)|F'(φ_2)| ≤ H ≤ min(4aφ_1, 4aφ_3)`;
//! * **positive definite** (`Q = q_{φ_1}/i`): `0 < a ≤ (φ_3 - φ_1)/9` and
//!   `4aφ_2 ≤ H ≤ min(4aφ_3, 4aφ_1 + (4/9)F'(φ_1))`; negative definite forms are
//!   the negatives of the positive definite forms with invariants `(I, -J)`;
//! * **two real roots** (`Q = Re q_φ'`, `φ` the real root, `φ' = -φ/2 + iκ`):
//!   `(3φ - 2 sqrt(F'(φ)))/9 ≤ a ≤ (3φ + 2 sqrt(F'(φ)))/9` and
//!   `9a^2 - 2aφ - (4/9)κ^2 ≤ H ≤ 4aφ`.
//!
//! When `a = 0` the same identities give `3b^2 = -H ≤ (4/9)|F'(φ_2)|` (four real
//! roots) or `≤ (4/9)κ^2` (two real roots).
//!
//! `a`, `H` are invariant under `x ↦ x + kz` and `x ↦ -x`, which change `b` by
//! multiples of `4a` and flip its sign; so every class has a form with the
//! bounds above and `0 ≤ b ≤ 2|a|` (for `a = 0`: `b > 0`, `0 ≤ c < 3b`). Given
//! `a, b` and `H = 8ac - 3b^2`, the seminvariant `R` is determined up to sign by
//! the syzygy `27R^2 = -H^3 + 48Ia^2H - 64Ja^3`, then `d = (R - b^3 + 4abc)/(8a^2)`
//! and `e = (I + 3bd - c^2)/(12a)`. The search visits every integer point of
//! this box, so it is complete; duplicates are removed with the exact
//! equivalence test of the reduction module.
//!
//! # Order of the search
//!
//! For `a ≠ 0` the pairs `(b, c)` with `0 ≤ b ≤ 2|a|` and `H = 8ac - 3b^2` in
//! the `H`-interval correspond one to one to the pairs `(b, H)` with `H` in the
//! interval and `H ≡ -3b^2 (mod 8|a|)`; the syzygy value depends on `(a, H)`
//! only. The search therefore runs over the residue classes `-3b^2 mod 8|a|`
//! and, in each, over the `H` of the interval, tests `N(H)/27` for being a
//! square once (after exact residue tables modulo `27·64`, `27·35`, `27·143`,
//! which reject only values that are not integer squares), and tries every
//! `b` of the class. The set of candidates `(a, b, c)` examined is exactly the
//! one of the plain loop over `(a, b, c)` (kept in the tests as the reference
//! and compared with it), so completeness is unchanged; the work is one test
//! per admissible pair `(a, H)`. The total stays of order `|I|^{3/2}` (two real
//! roots: of order `φ^3/30` pairs), so invariants `I` beyond a few `10^5` with
//! `4I^3 < J^2` need a large [`SearchOptions::max_candidates`]. The remaining
//! duplicates are removed with the exact
//! equivalence test of the reduction module. Floating-point values of the
//! `φ_k` only set the box, which is widened by a safety margin.

use super::core::{Quartic, RootType};
use super::numeric::{resolvent_roots, sqrt_if_square_u128, to_f64, CubicRoots};
use super::quick_box::ClassTest;
use super::reduction::{near_reduced_set, reduce_tau, size_key};
use crate::curve::Curve;
use crate::error::{Error, ErrorKind};
use malachite::Integer;
use std::collections::HashMap;

mod scan;
#[cfg(test)]
mod tests;

use scan::{scan_i128, scan_i64, ResidueFilter};

/// Options for [`quartics_with_invariants`].
///
/// ```
/// use malachite::Integer;
/// use twofold::quartic::{quartics_with_invariants, SearchOptions};
/// let opts = SearchOptions::default().with_negative_definite(false);
/// // I = 12, J = 0: leaving out the negative definite quartics never adds any
/// let (i, j) = (Integer::from(12), Integer::from(0));
/// let qs = quartics_with_invariants(&i, &j, &opts).unwrap();
/// assert!(qs.len() <= quartics_with_invariants(&i, &j, &SearchOptions::default()).unwrap().len());
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct SearchOptions {
    /// Also return negative definite quartics (never soluble over R). Default `true`.
    pub(crate) include_negative_definite: bool,
    /// Stop with an error of kind [`ErrorKind::Budget`] after this many
    /// candidates: pairs `(a, H)` tested (see the module documentation; for
    /// `a = 0`, pairs `(b, c)`). The budget is charged before each `a` is
    /// scanned. A search whose estimated size (from the same box, summed
    /// over `a` before searching) exceeds the limit is refused at once with
    /// the same error, so hopeless cases cost milliseconds. Default: no limit.
    pub(crate) max_candidates: Option<u64>,
    /// Stop with an error of kind [`ErrorKind::Budget`] once this instant
    /// has passed (checked about every million candidates). Default: none.
    pub(crate) deadline: Option<std::time::Instant>,
    /// Stop with an error of kind [`ErrorKind::Budget`] once this flag is
    /// set (checked as often as the deadline). Default: none.
    pub(crate) cancel: Option<std::sync::Arc<std::sync::atomic::AtomicBool>>,
}

impl SearchOptions {
    /// Also returns (or not) the negative definite quartics.
    pub fn with_negative_definite(mut self, v: bool) -> Self {
        self.include_negative_definite = v;
        self
    }
    /// Sets the candidate limit.
    pub fn with_max_candidates(mut self, v: u64) -> Self {
        self.max_candidates = Some(v);
        self
    }
    crate::budget::deadline_and_cancel_setters!();
    /// The default options held to the deadline and cancel flag of `work`.
    ///
    /// ```
    /// use twofold::{quartic::SearchOptions, Work};
    /// let o = SearchOptions::within(&Work::unlimited());
    /// assert!(format!("{o:?}").contains("deadline: None"));
    /// ```
    pub fn within(work: &crate::budget::Work) -> SearchOptions {
        SearchOptions { deadline: work.deadline(), cancel: work.cancel_flag().cloned(), ..SearchOptions::default() }
    }
}

impl Default for SearchOptions {
    fn default() -> Self {
        SearchOptions { include_negative_definite: true, max_candidates: None, deadline: None, cancel: None }
    }
}

struct Search<'a> {
    i: &'a Integer,
    j: &'a Integer,
    i128s: Option<(i128, i128)>,
    found: Vec<Quartic>,
    steps: u64,
    limit: Option<u64>,
    count_only: bool,
    /// use the reference loop over `(a, b, c)` (comparison tests only)
    reference: bool,
    deadline: Option<std::time::Instant>,
    cancel: Option<std::sync::Arc<std::sync::atomic::AtomicBool>>,
    next_check: u64,
    /// Candidates plus set-up work (the residue tables of each `a`): paces
    /// the deadline and cancellation checks, and is capped at four times the
    /// candidate limit so that set-up work cannot run unbounded.
    work: u64,
    /// In estimation mode: running estimates of the candidates and of the
    /// set-up work, accumulated instead of searching.
    estimate: Option<(f64, f64)>,
}

/// Units of `work` between two looks at the deadline and the cancellation
/// flag (2^20 let a cancelled search run on for up to 200 ms on the curves
/// of conductor 131670 under load; a look costs an atomic load and a clock
/// read, well under 0.1% at this spacing).
const CHECK_EVERY: u64 = 1 << 14;

impl<'a> Search<'a> {
    fn tick(&mut self, n: u64) -> Result<(), Error> {
        self.steps += n;
        self.work += n;
        if let Some(l) = self.limit {
            if self.steps > l {
                return Err(Error::new(ErrorKind::Budget, format!("quartic search exceeded {l} candidates")));
            }
        }
        self.check_clock()
    }

    fn clone_settings(&self) -> Search<'a> {
        Search {
            i: self.i,
            j: self.j,
            i128s: self.i128s,
            found: Vec::new(),
            steps: 0,
            limit: self.limit,
            count_only: self.count_only,
            reference: self.reference,
            deadline: self.deadline,
            cancel: self.cancel.clone(),
            next_check: 0,
            work: 0,
            estimate: None,
        }
    }

    /// The deadline and the cancellation flag, looked at every
    /// [`CHECK_EVERY`] units of `work`.
    fn check_clock(&mut self) -> Result<(), Error> {
        if self.work >= self.next_check {
            self.next_check = self.work.saturating_add(CHECK_EVERY);
            if self.cancel.as_ref().is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed)) {
                return Err(Error::new(ErrorKind::Budget, "quartic search cancelled"));
            }
            if self.deadline.is_some_and(|d| std::time::Instant::now() >= d) {
                return Err(Error::new(ErrorKind::Budget, "quartic search ran out of time"));
            }
        }
        Ok(())
    }

    /// Called once per value of `a`, before its box is scanned or
    /// estimated: charges one unit of set-up work (so that the deadline and
    /// the cancellation flag are looked at even when most boxes are empty or
    /// only estimated), and in estimation mode stops as soon as the running
    /// estimate already exceeds the candidate limit (the loop over `a` alone
    /// can be of length `|I|^{1/2}`).
    fn next_a(&mut self) -> Result<(), Error> {
        if let (Some((st, wk)), Some(l)) = (self.estimate, self.limit) {
            if too_big(st, wk, l) {
                return Err(refusal(st, l));
            }
        }
        self.setup_work(1)
    }

    /// Charges set-up work that is not a candidate (see `work`).
    fn setup_work(&mut self, n: u64) -> Result<(), Error> {
        self.work = self.work.saturating_add(n);
        if self.estimate.is_some() {
            return self.check_clock();
        }
        if let Some(l) = self.limit {
            if self.work > l.saturating_mul(4) {
                return Err(Error::new(ErrorKind::Budget, format!("quartic search exceeded its work limit (4 x {l})")));
            }
        }
        self.check_clock()
    }

    /// All forms with this `a ≠ 0`, `0 ≤ b ≤ 2|a|` and `H` in `[hlo, hhi]`.
    fn fixed_a(&mut self, a: i64, hlo: f64, hhi: f64) -> Result<(), Error> {
        if let Some((steps, work)) = self.estimate.as_mut() {
            // about half the residues -3b^2 mod 8|a| are distinct, each meeting
            // the H-interval (hhi - hlo)/(8|a|) times
            *steps += (hhi - hlo).max(0.0) / 16.0;
            *work += 2.0 * (a.abs() as f64) + 1.0;
            return Ok(());
        }
        let hmax = hlo.abs().max(hhi.abs()) + 8.0 * (a.abs() as f64) + 1.0;
        let af = a.abs() as f64;
        let (ii, jj) = self.i128s.unwrap_or((i128::MAX, i128::MAX));
        let est = hmax.powi(3) + 48.0 * (ii as f64).abs() * af * af * hmax + 64.0 * (jj as f64).abs() * af.powi(3);
        let fast = self.i128s.is_some() && est < 2f64.powi(120);
        // i64 arithmetic is safe when every intermediate stays below 2^62
        let small = fast && est < 2f64.powi(58) && (ii as f64).abs() < 2f64.powi(40);
        let work = (hhi - hlo) / 4.0;
        if fast && !self.reference {
            return self.fixed_a_by_h(a, hlo, hhi, ii, jj);
        }
        let filt = fast.then(|| if work > 20000.0 { ResidueFilter::new(&Integer::from(a), self.i, self.j) } else { ResidueFilter::trivial() });
        for b in 0..=2 * a.abs() {
            // one unit of set-up work per b: the clock is looked at even when
            // most ranges below are empty
            self.setup_work(1)?;
            let b2 = 3.0 * (b as f64) * (b as f64);
            let (lo, hi) = if a > 0 {
                (((hlo + b2) / (8.0 * a as f64)).ceil(), ((hhi + b2) / (8.0 * a as f64)).floor())
            } else {
                (((hhi + b2) / (8.0 * a as f64)).ceil(), ((hlo + b2) / (8.0 * a as f64)).floor())
            };
            if !(lo <= hi) {
                continue;
            }
            let (clo, chi) = (lo as i128, hi as i128);
            self.tick((chi - clo + 1) as u64)?;
            if self.count_only {
                continue;
            }
            if fast {
                // `filt` is Some whenever `fast` holds (built just above)
                let trivial = ResidueFilter::trivial();
                let f = filt.as_ref().unwrap_or(&trivial);
                if !self.scan_fast(a as i128, b as i128, clo, chi, ii, jj, small, f) {
                    return Err(self.stopped_error());
                }
            } else {
                for c in clo..=chi {
                    self.candidate_big(&Integer::from(a), &Integer::from(b), &Integer::from(c));
                }
            }
        }
        Ok(())
    }

    /// The same candidates as the loop over `(b, c)` in [`Search::fixed_a`],
    /// visited by `H` instead: for `a ≠ 0` the map `(b, c) ↦ (b, H = 8ac - 3b^2)`
    /// is a bijection from the pairs with `0 ≤ b ≤ 2|a|`, `H ∈ [hlo, hhi]`
    /// onto the pairs `(b, H)` with `H ∈ [hlo, hhi]` and `H ≡ -3b^2 (mod 8|a|)`
    /// (`c = (H + 3b^2)/(8a)` is then an integer). The syzygy value
    /// `N(H) = -H^3 + 48Ia^2H - 64Ja^3 = 27R^2` depends on `(a, H)` only, so it
    /// is tested once per `H` (after the residue filter, which only rejects
    /// `H` for which `N(H)/27` is not an integer square), and every `b` of the
    /// residue class of `H` is then tried with both signs of `R`, exactly as in
    /// the reference loop. Hence the set of forms found is the same; the
    /// work is one test per admissible `(a, H)` instead of one per `(a, b, c)`.
    fn fixed_a_by_h(&mut self, a: i64, hlo: f64, hhi: f64, ii: i128, jj: i128) -> Result<(), Error> {
        let hmin = hlo.ceil() as i128;
        let hmax = hhi.floor() as i128;
        if !(hlo.ceil() <= hhi.floor()) {
            return Ok(());
        }
        let aa = a as i128;
        let modulus = 8 * aa.abs();
        // the residue table below holds 2|a| + 1 pairs: charge it (and check
        // the clock) before allocating it
        if aa.abs() > MAX_TABLE_A {
            return Err(Error::new(ErrorKind::TooLarge, format!("quartic search box too large (leading coefficient up to {a})")));
        }
        self.setup_work((2 * aa.unsigned_abs() + 1) as u64)?;
        // residues -3b^2 mod 8|a| for 0 <= b <= 2|a|, grouped
        let mut pairs: Vec<(i128, i128)> = (0..=2 * aa.abs()).map(|b| ((-3 * b * b).rem_euclid(modulus), b)).collect();
        // grouping equal residues saves repeated square tests only when a
        // residue class meets the H-interval more than once; otherwise the
        // unsorted list (runs of length one) does the same work without the sort
        if hmax - hmin >= modulus {
            pairs.sort_unstable();
        }
        let count_in = |r: i128| -> u64 {
            let h0 = hmin + (r - hmin).rem_euclid(modulus);
            if h0 > hmax {
                0
            } else {
                ((hmax - h0) / modulus + 1) as u64
            }
        };
        let mut total = 0u64;
        let mut k = 0;
        while k < pairs.len() {
            let r = pairs[k].0;
            total += count_in(r);
            while k < pairs.len() && pairs[k].0 == r {
                k += 1;
            }
        }
        self.tick(total)?;
        if self.count_only {
            return Ok(());
        }
        let filt = if total > 4000 {
            let mut f = ResidueFilter::new(&Integer::from(a), self.i, self.j);
            if a < 0 {
                // step by 8|a| = -8a
                for t in 0..3 {
                    f.steps[t] = (f.moduli[t] - f.steps[t]) % f.moduli[t];
                }
            }
            f
        } else {
            ResidueFilter::trivial()
        };
        let a2 = aa * aa;
        let t1 = 48 * ii * a2;
        let t0 = 64 * jj * a2 * aa;
        let m8a2 = 8 * a2;
        let a12 = 12 * aa;
        let mut hits: Vec<[i128; 5]> = Vec::new();
        // the scan below can be long for one `a` (its work was charged in
        // one tick above): it looks at the clock itself
        let (deadline, cancel) = (self.deadline, self.cancel.clone());
        let stop = move || {
            cancel.as_ref().is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed))
                || deadline.is_some_and(|d| std::time::Instant::now() >= d)
        };
        let mut spin = 0u64;
        let mut k = 0;
        while k < pairs.len() {
            let r = pairs[k].0;
            let k0 = k;
            while k < pairs.len() && pairs[k].0 == r {
                k += 1;
            }
            let bs = &pairs[k0..k];
            let mut h = hmin + (r - hmin).rem_euclid(modulus);
            let mut res = filt.start(h);
            while h <= hmax {
                spin += 1;
                if spin & 0xFFFF == 0 && stop() {
                    return Err(self.stopped_error());
                }
                let pass = filt.pass(&res);
                filt.advance(&mut res);
                if pass {
                    let n = (t1 - h * h) * h - t0;
                    if n >= 0 && n % 27 == 0 {
                        if let Some(rt) = sqrt_if_square_u128((n / 27) as u128) {
                            let rt = rt as i128;
                            let cands = [rt, -rt];
                            let count = if rt == 0 { 1 } else { 2 };
                            for &(_, b) in bs {
                                let c = (h + 3 * b * b) / (8 * aa);
                                let base = 4 * aa * b * c - b * b * b;
                                for &rr in &cands[..count] {
                                    let dn = rr + base;
                                    if dn % m8a2 != 0 {
                                        continue;
                                    }
                                    let d = dn / m8a2;
                                    let en = ii + 3 * b * d - c * c;
                                    if en % a12 == 0 {
                                        hits.push([aa, b, c, d, en / a12]);
                                    }
                                }
                            }
                        }
                    }
                }
                h += modulus;
            }
        }
        for h in hits {
            self.push_checked(Quartic::from_coeffs(h.map(Integer::from)));
        }
        Ok(())
    }

    #[allow(clippy::too_many_arguments)]
    /// `false` when the deadline or the cancellation flag stopped the scan.
    fn scan_fast(&mut self, a: i128, b: i128, clo: i128, chi: i128, ii: i128, jj: i128, small: bool, filt: &ResidueFilter) -> bool {
        let (deadline, cancel) = (self.deadline, self.cancel.clone());
        let stop = move || {
            cancel.as_ref().is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed))
                || deadline.is_some_and(|d| std::time::Instant::now() >= d)
        };
        if small {
            let mut hits: Vec<[i64; 5]> = Vec::new();
            let done = scan_i64(a as i64, b as i64, clo as i64, chi as i64, ii as i64, jj as i64, filt, &mut hits, &stop);
            for h in hits {
                self.push_checked(Quartic::from_coeffs(h.map(Integer::from)));
            }
            done
        } else {
            let mut hits: Vec<[i128; 5]> = Vec::new();
            let done = scan_i128(a, b, clo, chi, ii, jj, filt, &mut hits, &stop);
            for h in hits {
                self.push_checked(Quartic::from_coeffs(h.map(Integer::from)));
            }
            done
        }
    }

    /// The error of a search stopped by the clock or the flag.
    fn stopped_error(&self) -> Error {
        if self.cancel.as_ref().is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed)) {
            Error::new(ErrorKind::Budget, "quartic search cancelled")
        } else {
            Error::new(ErrorKind::Budget, "quartic search ran out of time")
        }
    }

    fn candidate_big(&mut self, a: &Integer, b: &Integer, c: &Integer) {
        let i = self.i;
        let j = self.j;
        let h = Integer::from(8) * a * c - Integer::from(3) * b * b;
        let n = -(&h * &h * &h) + Integer::from(48) * i * a * a * &h - Integer::from(64) * j * a * a * a;
        if n < 0 || (&n % Integer::from(27)) != 0 {
            return;
        }
        let Some(r) = super::numeric::isqrt_exact(&(n / Integer::from(27))) else { return };
        let m8a2 = Integer::from(8) * a * a;
        let base = Integer::from(4) * a * b * c - b * b * b;
        let signs: Vec<Integer> = if r == 0 { vec![r.clone()] } else { vec![r.clone(), -r.clone()] };
        for rr in signs {
            let dn = rr + &base;
            if (&dn % &m8a2) != 0 {
                continue;
            }
            let d = dn / &m8a2;
            let en = i + Integer::from(3) * b * &d - c * c;
            let a12 = Integer::from(12) * a;
            if (&en % &a12) == 0 {
                let e = en / a12;
                self.push_checked(Quartic::new([a.clone(), b.clone(), c.clone(), d, e]));
            }
        }
    }

    /// Forms with `a = 0`: `b > 0`, `0 ≤ c < 3b`, `3 b^2 ≤ hbound`.
    fn zero_a(&mut self, hbound: f64) -> Result<(), Error> {
        let bmax = ((hbound.max(0.0) / 3.0).sqrt() * (1.0 + 1e-9) + 1e-6).floor() as i64;
        if let Some((steps, _)) = self.estimate.as_mut() {
            // the pairs (b, c) with 0 <= c < 3b
            *steps += 1.5 * (bmax as f64) * (bmax as f64 + 1.0);
            return Ok(());
        }
        for b in 1..=bmax {
            self.tick(3 * b as u64)?;
            if self.count_only {
                continue;
            }
            let bi = Integer::from(b);
            for c in 0..3 * b {
                let ci = Integer::from(c);
                let dn = &ci * &ci - self.i;
                let b3 = Integer::from(3 * b);
                if (&dn % &b3) != 0 {
                    continue;
                }
                let d = dn / b3;
                // J = 9bcd - 27 e b^2 - 2c^3
                let en = Integer::from(9) * &bi * &ci * &d - Integer::from(2) * &ci * &ci * &ci - self.j;
                let den = Integer::from(27 * b * b);
                if (&en % &den) != 0 {
                    continue;
                }
                let e = en / den;
                self.push_checked(Quartic::new([Integer::from(0), bi.clone(), ci, d, e]));
            }
        }
        Ok(())
    }

    fn push_checked(&mut self, g: Quartic) {
        if g.invariant_i() == *self.i && g.invariant_j() == *self.j {
            self.found.push(g);
        } else {
            debug_assert!(false, "syzygy violated for {g:?}");
        }
    }
}

/// The largest `|a|` whose residue table (`2|a| + 1` pairs of `i128`) the
/// search builds: beyond it the box is far too large to finish anyway (its
/// candidates number at least `|a|^3`), and the table would need gigabytes.
const MAX_TABLE_A: i128 = 1 << 26;

/// Whether an estimated search (`st` candidates, `wk` set-up work) is beyond
/// the candidate limit `l`. The estimate runs about 1.5 times below the true
/// count on the tables' large cases, so a search predicted beyond the limit
/// would end at the limit anyway, after the whole budget.
fn too_big(st: f64, wk: f64, l: u64) -> bool {
    1.6 * st > l as f64 || st + wk > 4.0 * l as f64
}

fn refusal(st: f64, l: u64) -> Error {
    Error::new(ErrorKind::Budget, format!("quartic search would take about {st:.2e} candidates, beyond the limit of {l}"))
}

fn int_range(lo: f64, hi: f64, scale: f64) -> (i64, i64) {
    let tol = 1e-7 * (1.0 + scale);
    ((lo - tol).ceil() as i64, (hi + tol).floor() as i64)
}

fn widen(lo: f64, hi: f64, scale: f64) -> (f64, f64) {
    let tol = 1e-7 * (1.0 + lo.abs() + hi.abs() + scale) + 1e-6;
    (lo - tol, hi + tol)
}

fn search_three_real(s: &mut Search<'_>, r: [f64; 3], i: f64, positive_definite_only: bool) -> Result<(), Error> {
    let [p1, p2, p3] = r;
    let scale = p1.abs().max(p3.abs()).max(i.abs().sqrt());
    let sc2 = scale * scale;
    if !positive_definite_only {
        // four real roots
        let fp2 = (p2 - p1) * (p3 - p2); // |F'(φ_2)|
        let (alo, ahi) = int_range(-(p2 - p1) / 9.0, (p3 - p2) / 9.0, scale);
        for a in alo..=ahi {
            s.next_a()?;
            let af = a as f64;
            if a == 0 {
                s.zero_a(4.0 / 9.0 * fp2 * (1.0 + 1e-9) + 1e-6)?;
                continue;
            }
            let (hlo, hhi) = widen(4.0 * af * p2 - 4.0 / 9.0 * fp2, (4.0 * af * p1).min(4.0 * af * p3), sc2);
            s.fixed_a(a, hlo, hhi)?;
        }
    }
    // positive definite
    let fp1 = (p2 - p1) * (p3 - p1);
    let (_, ahi) = int_range(0.0, (p3 - p1) / 9.0, scale);
    for a in 1..=ahi {
        s.next_a()?;
        let af = a as f64;
        let (hlo, hhi) = widen(4.0 * af * p2, (4.0 * af * p3).min(4.0 * af * p1 + 4.0 / 9.0 * fp1), sc2);
        s.fixed_a(a, hlo, hhi)?;
    }
    Ok(())
}

fn search_two_real(s: &mut Search<'_>, phi: f64, kappa: f64, i: f64) -> Result<(), Error> {
    let scale = phi.abs().max(kappa).max(i.abs().sqrt());
    let sc2 = scale * scale;
    let fp = 2.25 * phi * phi + kappa * kappa; // F'(φ) = |φ - φ'|^2
    let k2 = 4.0 / 9.0 * kappa * kappa;
    let sq = fp.sqrt();
    let (alo, ahi) = int_range((3.0 * phi - 2.0 * sq) / 9.0, (3.0 * phi + 2.0 * sq) / 9.0, scale);
    for a in alo..=ahi {
        s.next_a()?;
        let af = a as f64;
        if a == 0 {
            s.zero_a(k2 * (1.0 + 1e-9) + 1e-6)?;
            continue;
        }
        let (hlo, hhi) = widen(9.0 * af * af - 2.0 * af * phi - k2, 4.0 * af * phi, sc2);
        s.fixed_a(a, hlo, hhi)?;
    }
    Ok(())
}

/// How the raw search runs: the production path is `Mode::default()`; the
/// tests pass the other modes explicitly (no hidden switch).
#[derive(Clone, Copy, Default)]
struct Mode {
    /// only count the candidates (cost survey in the tests)
    count_only: bool,
    /// use the reference loop over `(a, b, c)` (comparison tests)
    reference: bool,
}

/// Raw search (with duplicates) for `(i, j)`; positive definite forms only
/// from the definite part when `positive_definite_only`.
fn raw_search(
    i: &Integer,
    j: &Integer,
    positive_definite_only: bool,
    steps: &mut u64,
    opts: &SearchOptions,
    mode: Mode,
) -> Result<Vec<Quartic>, Error> {
    let limit = opts.max_candidates;
    let delta = Integer::from(4) * i * i * i - j * j;
    let fi = to_f64(i);
    let fj = to_f64(j);
    if !fi.is_finite() || !fj.is_finite() || fi.abs() > 1e60 || fj.abs() > 1e90 {
        return Err(Error::new(ErrorKind::TooLarge, "invariants too large for the quartic search"));
    }
    let i128s = match (i128::try_from(i), i128::try_from(j)) {
        (Ok(a), Ok(b)) if a.unsigned_abs() < (1u128 << 100) && b.unsigned_abs() < (1u128 << 120) => Some((a, b)),
        _ => None,
    };
    let mut s = Search {
        i,
        j,
        i128s,
        found: Vec::new(),
        steps: *steps,
        limit,
        count_only: mode.count_only,
        reference: mode.reference,
        deadline: opts.deadline,
        cancel: opts.cancel.clone(),
        next_check: 0,
        work: 0,
        estimate: None,
    };
    // refuse at once a search that would clearly exceed the limit
    if let Some(l) = limit {
        if !mode.reference {
            // the estimate keeps the deadline and the cancellation flag, and
            // stops as soon as it passes the limit (see `Search::next_a`)
            let mut e = Search { estimate: Some((0.0, 0.0)), found: Vec::new(), ..s.clone_settings() };
            if delta > 0 {
                if let CubicRoots::Three(r) = resolvent_roots(fi, fj, true) {
                    search_three_real(&mut e, r, fi, positive_definite_only)?;
                }
            } else if !positive_definite_only {
                if let CubicRoots::One { real, complex } = resolvent_roots(fi, fj, false) {
                    search_two_real(&mut e, real, complex.1, fi)?;
                }
            }
            let (st, wk) = e.estimate.unwrap_or((0.0, 0.0));
            if too_big(st, wk, l) {
                return Err(refusal(st, l));
            }
        }
    }
    // the box comes from floating-point roots: refuse (never search a wrong
    // box) when they are not finite
    let not_finite = || Error::new(ErrorKind::TooLarge, "the resolvent roots of the quartic search are not finite in f64");
    if delta > 0 {
        match resolvent_roots(fi, fj, true) {
            CubicRoots::Three(r) if r.iter().all(|v| v.is_finite()) => search_three_real(&mut s, r, fi, positive_definite_only)?,
            // resolvent_roots(.., true) always gives three roots
            _ => return Err(not_finite()),
        }
    } else if !positive_definite_only {
        match resolvent_roots(fi, fj, false) {
            CubicRoots::One { real, complex } if real.is_finite() && complex.1.is_finite() => {
                search_two_real(&mut s, real, complex.1, fi)?
            }
            // resolvent_roots(.., false) always gives one real root
            _ => return Err(not_finite()),
        }
    }
    *steps = s.steps;
    Ok(s.found)
}

/// One representative of every `GL2(Z)`-class of integral binary quartics
/// with invariants exactly `(i, j)`; `4i^3 - j^2` must be non-zero.
///
/// The representatives are reduced (see [`reduce`](super::reduce)) and sorted
/// by coefficient size. The search box and its proof of completeness are
/// described in the module documentation (BSD 1963; Cremona 1997 3.5;
/// Cremona, LMS JCM 2 (1999)). Errors: [`ErrorKind::InvalidValue`] for zero
/// discriminant, [`ErrorKind::TooLarge`] for invariants beyond the
/// floating-point range used for the box, [`ErrorKind::Budget`] when
/// `opts.max_candidates` is exceeded.
///
/// ```
/// use malachite::Integer;
/// use twofold::quartic::quartics_with_invariants;
/// // y^2 + y = x^3 - x (published tables, Cremona 1997): c4 = 48, c6 = -216, so (I, J) = (48, -432).
/// let list = quartics_with_invariants(&Integer::from(48), &Integer::from(-432), &Default::default()).unwrap();
/// assert!(list.iter().all(|g| g.invariant_i() == 48 && g.invariant_j() == -432));
/// assert!(!list.is_empty());
/// ```
pub fn quartics_with_invariants(i: &Integer, j: &Integer, opts: &SearchOptions) -> Result<Vec<Quartic>, Error> {
    let delta = Integer::from(4) * i * i * i - j * j;
    if delta == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, format!("4I^3 - J^2 = 0 for (I, J) = ({i}, {j})")));
    }
    if (&delta % Integer::from(27)) != 0 {
        return Ok(Vec::new());
    }
    let mut steps = 0u64;
    let mut found = raw_search(i, j, false, &mut steps, opts, Mode::default())?;
    if opts.include_negative_definite && delta > 0 {
        let nj = -j.clone();
        let neg = raw_search(i, &nj, true, &mut steps, opts, Mode::default())?;
        for g in neg {
            let h = Quartic::new(g.coeffs().map(|c| -c));
            if h.root_type() == Some(RootType::NegativeDefinite) {
                found.push(h);
            }
        }
    }
    if !opts.include_negative_definite {
        found.retain(|g| g.root_type() != Some(RootType::NegativeDefinite));
    }
    distinct_classes(found)
}

/// Group forms (all with the same invariants) into `GL2(Z)`-classes and
/// return the smallest reduced form of each class.
pub(crate) fn distinct_classes(forms: Vec<Quartic>) -> Result<Vec<Quartic>, Error> {
    let mut class_of: HashMap<Quartic, usize> = HashMap::new();
    let mut parent: Vec<usize> = Vec::new();
    fn find(p: &mut Vec<usize>, mut x: usize) -> usize {
        while p[x] != x {
            p[x] = p[p[x]];
            x = p[x];
        }
        x
    }
    let mut members: Vec<Vec<Quartic>> = Vec::new();
    // what the class test shares between the forms (same invariants)
    let mut shared: Option<ClassTest> = None;
    for g in forms {
        if class_of.contains_key(&g) {
            continue;
        }
        // a cheap exact step first: the floating-point reduction moves `g` by
        // integer matrices, so its result `h` is exactly equivalent to `g`
        // (`h = g∘M`, `det M = ±1`, whatever the rounding did); if `h` is
        // already known, `g` joins that class without the proven candidate
        // set. Completeness is untouched: every class met for the first time
        // still goes through `near_reduced_set`, which holds all reduced forms
        // of that class, so two forms of one class always end up joined.
        let fast = reduce_tau(&g).map(|(h, _, _)| h);
        if let Some(k) = fast.as_ref().and_then(|h| class_of.get(h)).copied() {
            class_of.insert(g, k);
            continue;
        }
        // `h` is exactly equivalent to `g` and already reduced, so its
        // proven set is the same and its reduction is not run a second time;
        // the word path (`quick_box`, f64 intervals with outward rounding)
        // decides most forms, the multiple-precision path the rest
        let start = fast.as_ref().unwrap_or(&g);
        let test = shared.get_or_insert_with(|| ClassTest::new(&start.invariant_i(), &start.invariant_j()));
        let forms_here: Vec<Quartic> = match test.candidate_forms(start) {
            Some(v) => v,
            None => near_reduced_set(start)
                .ok_or_else(|| Error::new(ErrorKind::TooLarge, format!("floating-point reduction failed for {g:?}")))?
                .into_iter()
                .map(|x| x.0)
                .collect(),
        };
        let id = parent.len();
        parent.push(id);
        members.push(Vec::new());
        // the found form itself (and its floating-point reduction) is
        // recorded (to skip repeats) but is not a candidate representative
        class_of.entry(g).or_insert(id);
        if let Some(h) = fast {
            class_of.entry(h).or_insert(id);
        }
        for f in forms_here {
            if let Some(&k) = class_of.get(&f) {
                let (ra, rb) = (find(&mut parent, k), find(&mut parent, id));
                if ra != rb {
                    parent[ra] = rb;
                }
            } else {
                class_of.insert(f.clone(), id);
            }
            members[id].push(f);
        }
    }
    let mut best: HashMap<usize, Quartic> = HashMap::new();
    for id in 0..parent.len() {
        let root = find(&mut parent, id);
        for f in &members[id] {
            // representatives are taken among the near-reduced forms only
            let entry = best.entry(root).or_insert_with(|| f.clone());
            if size_key(f) < size_key(entry) {
                *entry = f.clone();
            }
        }
    }
    let mut out: Vec<Quartic> = best.into_values().collect();
    out.sort_by_key(size_key);
    Ok(out)
}

/// The invariant pairs `(I, J)` whose quartics cover every everywhere
/// locally soluble 2-covering of `curve`.
///
/// For a model with invariants `c4`, `c6` the Jacobian of a quartic with
/// invariants `(c4, 2c6)` is `Y^2 = X^3 - 27c4 X - 54c6`, isomorphic to the
/// curve. Cremona, Fisher and Stoll (*Minimisation and reduction of 2-, 3- and
/// 4-coverings of elliptic curves*, Algebra & Number Theory 4 (2010)) show that
/// a 2-covering that is soluble over `Q_p` has a `Z_p`-integral model
/// `y^2 + P(x,z) y = Q(x,z)` of level 0 when the model of `E` is minimal at
/// `p`; the integral binary quartic `P^2 + 4Q` then has invariants exactly
/// `(c4, 2c6)`, and since `Z` is a principal ideal domain these local models
/// glue to a global one. The older bound of Birch and Swinnerton-Dyer (1963)
/// (also used in Cremona 1997, 3.5) allowed the 2-adic scaling
/// `(2^4 c4, 2^6 · 2c6)` as well; [`covering_invariants_conservative`] returns
/// both pairs (the second search is about 64 times longer). The model passed
/// must be minimal (at least at the primes where it matters); this function
/// does not check that.
///
/// ```
/// use twofold::{Curve, quartic::covering_invariants};
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let v = covering_invariants(&e);
/// assert_eq!(v[0], (48.into(), (-432).into()));
/// ```
pub fn covering_invariants(curve: &Curve) -> Vec<(Integer, Integer)> {
    vec![(curve.c4().clone(), Integer::from(2) * curve.c6())]
}

/// The pairs `(c4, 2c6)` and `(16 c4, 128 c6)`: the invariants allowed by the
/// bound of Birch and Swinnerton-Dyer (1963) (see [`covering_invariants`]).
///
/// ```
/// use twofold::{Curve, quartic::covering_invariants_conservative};
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// assert_eq!(covering_invariants_conservative(&e)[1], (768.into(), (-27648).into()));
/// ```
pub fn covering_invariants_conservative(curve: &Curve) -> Vec<(Integer, Integer)> {
    vec![
        (curve.c4().clone(), Integer::from(2) * curve.c6()),
        (Integer::from(16) * curve.c4(), Integer::from(128) * curve.c6()),
    ]
}
