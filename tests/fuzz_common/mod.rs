//! The checks of the fuzz harness, shared by `tests/fuzz.rs` (short runs in
//! the regular test suite) and `examples/fuzz.rs` (long runs). Each check
//! takes its random input from a small deterministic generator, runs the
//! library under `catch_unwind`, and returns `Err(description)` on a
//! failure: a panic, a budget overrun (more than 1.5 times the budget plus
//! 50 ms), a reported point off the input curve, a lower bound above the
//! upper bound, or different bounds, Selmer dimensions, conductor or torsion
//! after a change of model. Invented data only: every input is random.

#![allow(dead_code)]

use malachite::{Integer, Natural, Rational};
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::time::{Duration, Instant};
use twofold::quartic::{covering_class, gl2z_decide, gl2z_equivalent, reduce, same_covering, Quartic};
use twofold::{analyse, Curve, ModelChange, RankOptions, RankReport};

/// A small deterministic generator (xorshift64*), so a failing case can be
/// replayed from its seed.
#[derive(Clone, Debug)]
pub struct Rng(pub u64);

impl Rng {
    /// A generator from a seed (any value).
    pub fn new(seed: u64) -> Rng {
        Rng(seed.wrapping_mul(0x9E37_79B9_7F4A_7C15) | 1)
    }
    /// The next 64 random bits.
    pub fn next(&mut self) -> u64 {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        x.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }
    /// Uniform in `0..n` (`n > 0`).
    pub fn below(&mut self, n: u64) -> u64 {
        self.next() % n.max(1)
    }
    /// Uniform in `lo..=hi`.
    pub fn range(&mut self, lo: i64, hi: i64) -> i64 {
        lo + self.below((hi - lo + 1) as u64) as i64
    }
    /// A random integer with up to `digits` decimal digits, either sign.
    pub fn integer(&mut self, digits: u32) -> Integer {
        let d = 1 + self.below(digits.max(1) as u64) as u32;
        let mut s = String::new();
        for k in 0..d {
            let c = if k == 0 { 1 + self.below(9) } else { self.below(10) };
            s.push(char::from(b'0' + c as u8));
        }
        let n: Integer = s.parse().unwrap_or_default();
        if self.below(2) == 0 {
            -n
        } else {
            n
        }
    }
}

/// Wall-clock limit a budgeted call may take: 1.5 times the budget plus 50 ms.
pub fn allowed(budget: Duration) -> Duration {
    budget.mul_f64(1.5) + Duration::from_millis(50)
}

/// CPU time of this process so far (user + system, from /proc/self/stat, in
/// clock ticks of 10 ms), or `None` where that file does not exist.
pub fn process_cpu() -> Option<Duration> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // the fields after the command name (which is in parentheses)
    let rest = &stat[stat.rfind(')')? + 2..];
    let f: Vec<&str> = rest.split_whitespace().collect();
    let (u, s): (u64, u64) = (f.get(11)?.parse().ok()?, f.get(12)?.parse().ok()?);
    Some(Duration::from_millis((u + s) * 10))
}

/// A call that took longer than allowed: a failure when its CPU time also
/// exceeds the allowance (the code did not stop in time), otherwise a wall
/// overrun caused by a loaded machine (the process was not running), which
/// is counted but not a failure. `Ok(true)` for such a load overrun.
pub fn judge_overrun(what: &str, wall: Duration, cpu: Option<Duration>, budget: Duration) -> Result<bool, String> {
    if wall <= allowed(budget) {
        return Ok(false);
    }
    match cpu {
        // 10 ms ticks: allow one tick of rounding
        Some(c) if c <= allowed(budget) + Duration::from_millis(10) => Ok(true),
        _ => Err(format!(
            "budget overrun on {what}: {:.3} s wall, {} CPU, for a budget of {:.3} s",
            wall.as_secs_f64(),
            cpu.map_or("unknown".to_string(), |c| format!("{:.3} s", c.as_secs_f64())),
            budget.as_secs_f64()
        )),
    }
}

fn panic_text(p: Box<dyn std::any::Any + Send>) -> String {
    p.downcast_ref::<&str>().map(|s| s.to_string()).or_else(|| p.downcast_ref::<String>().cloned()).unwrap_or_default()
}

// ---------------------------------------------------------------- text ----

const ALPHABET: &[&str] = &[
    "0", "1", "2", "3", "7", "9", "-", "+", "*", "/", "^", "x", "y", "=", "[", "]", ",", " ", "\t", "x^2", "x^3", "y^2",
    "xy", "z", "é", "∞", "\u{0}", "1/0", "00", "99999999999999999999", ".", "e", "(", ")", "\u{feff}",
];

const SEEDS: &[&str] = &[
    "[0,-1,1,-10,-20]",
    "y^2 + y = x^3 - x",
    "[0,1,1,-2,0]",
    "y^2 = x^3 - 36x",
    "[-1,0]",
    "y^2 + x*y + y = x^3 - x^2 - 10*x - 20",
    "[0,0,0,1/4,1/8]",
    "y^2 = x^3 - 1/16*x",
    "[1,-1,0,-314603520,2147876881280]",
];

/// Random text over a curve-like alphabet.
pub fn random_text(rng: &mut Rng) -> String {
    let n = rng.below(24) as usize;
    (0..n).map(|_| ALPHABET[rng.below(ALPHABET.len() as u64) as usize]).collect()
}

/// A valid curve text with a few random edits (insert, delete, replace, swap).
pub fn mutated_text(rng: &mut Rng) -> String {
    let mut s: Vec<char> = SEEDS[rng.below(SEEDS.len() as u64) as usize].chars().collect();
    for _ in 0..1 + rng.below(4) {
        let at = rng.below(s.len() as u64 + 1) as usize;
        match rng.below(4) {
            0 => {
                let t = ALPHABET[rng.below(ALPHABET.len() as u64) as usize];
                for (k, c) in t.chars().enumerate() {
                    s.insert(at + k, c);
                }
            }
            1 if at < s.len() => {
                s.remove(at);
            }
            2 if at < s.len() => {
                s[at] = ALPHABET[rng.below(ALPHABET.len() as u64) as usize].chars().next().unwrap_or(' ');
            }
            _ if at + 1 < s.len() => s.swap(at, at + 1),
            _ => {}
        }
    }
    s.into_iter().collect()
}

/// The parser on one text: no panic; when the integral parser accepts it,
/// the scaling parser accepts it too and gives the same curve unchanged.
pub fn check_parser(text: &str) -> Result<(), String> {
    let r = catch_unwind(|| {
        let plain = Curve::parse(text);
        let scaled = Curve::parse_scaled(text);
        let _ = twofold::curve::parse_coefficients(text);
        let _ = twofold::curve::parse_rational(text);
        (plain, scaled)
    });
    let (plain, scaled) = r.map_err(|p| format!("parser panicked on {text:?}: {}", panic_text(p)))?;
    if let Ok(c) = plain {
        match scaled {
            Ok((c2, ch)) if ch.is_identity() && c2 == c => {}
            other => return Err(format!("parsers disagree on {text:?}: {c:?} vs {other:?}")),
        }
    }
    Ok(())
}

/// The batch on a few lines of text (the rank example's line handling in
/// the library): exactly one item per line, in input order, no panic.
pub fn check_lines(lines: &[String], budget: Duration) -> Result<(), String> {
    let opts = twofold::BatchOptions::new(RankOptions::default().with_evidence(false).with_time_limit(budget))
        .with_threads(1);
    let out = catch_unwind(AssertUnwindSafe(|| twofold::analyse_batch(lines, &opts)))
        .map_err(|p| format!("batch panicked on {lines:?}: {}", panic_text(p)))?;
    let idx: Vec<usize> = out.items.iter().map(|i| i.index).collect();
    if idx != (0..lines.len()).collect::<Vec<_>>() {
        return Err(format!("batch gave items {idx:?} for {} lines", lines.len()));
    }
    for it in &out.items {
        if let Err(e) = &it.result {
            if e.message().contains("panicked") {
                return Err(format!("line {:?}: {e}", it.label));
            }
        }
    }
    Ok(())
}

// -------------------------------------------------------------- curves ----

/// A random curve with coefficients of up to `digits` digits (`a1, a3` in
/// `{0, 1}`, `a2` in `{-1, 0, 1}`, as in reduced models, half the time; any
/// small values otherwise). `None` for a singular choice.
pub fn random_curve(rng: &mut Rng, digits: u32) -> Option<Curve> {
    let small = |rng: &mut Rng| Integer::from(rng.range(-3, 3));
    let (a1, a2, a3) = if rng.below(2) == 0 {
        (Integer::from(rng.range(0, 1)), Integer::from(rng.range(-1, 1)), Integer::from(rng.range(0, 1)))
    } else {
        (small(rng), small(rng), small(rng))
    };
    Curve::new([a1, a2, a3, rng.integer(digits), rng.integer(digits)]).ok()
}

/// A random integral change of model: `u` in `{1, -1, 1/2, -1/3}` (scaling
/// by `1/k` keeps integral models integral), `r, s, t` small.
pub fn random_change(rng: &mut Rng) -> ModelChange {
    let u = [Rational::from(1), Rational::from(-1), Rational::from_signeds(1, 2), Rational::from_signeds(-1, 3)]
        [rng.below(4) as usize]
        .clone();
    let mut v = || Rational::from(rng.range(-5, 5));
    let (r, s, t) = (v(), v(), v());
    ModelChange::new(u, r, s, t).unwrap_or_else(|_| ModelChange::identity())
}

/// What one curve check saw.
#[derive(Clone, Debug, Default)]
pub struct CurveStats {
    /// Reports with both bounds equal.
    pub proven: usize,
    /// Reports cut short (`budget_exhausted`).
    pub cut_short: usize,
    /// Calls that returned an error (for example a discriminant that
    /// could not be factored in time).
    pub errors: usize,
    /// Pairs compared after a change of model.
    pub compared: usize,
    /// The longest call (wall clock).
    pub slowest: Duration,
    /// Calls over 1.5 x budget + 50 ms in wall time but not in CPU time
    /// (the machine was loaded; not a failure).
    pub load_overruns: usize,
}

fn timed_analyse(
    c: &Curve,
    opts: &RankOptions,
    budget: Duration,
    stats: &mut CurveStats,
) -> Result<(Result<RankReport, twofold::Error>, Duration), String> {
    let cpu0 = process_cpu();
    let t = Instant::now();
    let r = catch_unwind(AssertUnwindSafe(|| analyse(c, opts))).map_err(|p| format!("analyse panicked on {c:?}: {}", panic_text(p)))?;
    let el = t.elapsed();
    let cpu = process_cpu().zip(cpu0).map(|(a, b)| a.saturating_sub(b));
    if judge_overrun(&format!("{:?}", c.coefficients()), el, cpu, budget)? {
        stats.load_overruns += 1;
    }
    Ok((r, el))
}

fn check_report(c: &Curve, r: &RankReport) -> Result<(), String> {
    for p in r.points.iter().chain(&r.torsion_points) {
        if !c.contains(p) {
            return Err(format!("point {p:?} not on the input curve {:?}", c.coefficients()));
        }
    }
    if let (Some(l), Some(u)) = (r.rank_lower, r.rank_upper) {
        if l > u {
            return Err(format!("lower bound {l} above upper bound {u} on {:?}", c.coefficients()));
        }
    }
    Ok(())
}

/// `analyse` on `c` and on a random change of model of `c`, each under
/// `budget`: no panic, the budget held, points on the input curve,
/// `lower <= upper`, and, when neither run was cut short, the same bounds,
/// Selmer dimensions, conductor and torsion.
pub fn check_curve(c: &Curve, rng: &mut Rng, budget: Duration, evidence: bool, stats: &mut CurveStats) -> Result<(), String> {
    let opts = RankOptions::default().with_evidence(evidence).with_time_limit(budget);
    let (r1, t1) = timed_analyse(c, &opts, budget, stats)?;
    stats.slowest = stats.slowest.max(t1);
    let ch = random_change(rng);
    let Ok(c2) = c.apply_change(&ch) else { return Ok(()) };
    let (r2, t2) = timed_analyse(&c2, &opts, budget, stats)?;
    stats.slowest = stats.slowest.max(t2);
    let mut done = Vec::new();
    for (curve, r) in [(c, &r1), (&c2, &r2)] {
        match r {
            Ok(r) => {
                check_report(curve, r)?;
                if r.budget_exhausted {
                    stats.cut_short += 1;
                }
                if r.rank().is_some() {
                    stats.proven += 1;
                }
                done.push(r);
            }
            Err(_) => stats.errors += 1,
        }
    }
    if let [a, b] = done[..] {
        if !a.budget_exhausted && !b.budget_exhausted {
            stats.compared += 1;
            let key = |r: &RankReport| {
                let single_kernel = r.torsion.first().is_some_and(|t| t % 2 == 0) && r.torsion.len() == 1;
                (
                    r.rank_lower,
                    r.rank_upper,
                    r.two_selmer_dim,
                    r.conductor.clone(),
                    r.torsion.clone(),
                    if single_kernel { r.isogeny_selmer_dims } else { None },
                )
            };
            if key(a) != key(b) {
                return Err(format!(
                    "change of model {ch:?} changed the report of {:?}: {:?} vs {:?}",
                    c.coefficients(),
                    key(a),
                    key(b)
                ));
            }
        }
    }
    Ok(())
}

// ------------------------------------------------------------ quartics ----

/// A random quartic with coefficients of up to `digits` digits.
pub fn random_quartic(rng: &mut Rng, digits: u32) -> Quartic {
    Quartic::new(std::array::from_fn(|_| rng.integer(digits)))
}

/// A random matrix with small entries: unimodular when `unimodular`, else
/// of non-zero determinant.
fn random_matrix(rng: &mut Rng, unimodular: bool) -> [[Integer; 2]; 2] {
    loop {
        let (a, b, c, d) = (rng.range(-4, 4), rng.range(-4, 4), rng.range(-4, 4), rng.range(-4, 4));
        let det = a * d - b * c;
        if (unimodular && det.abs() == 1) || (!unimodular && det != 0) {
            return [[Integer::from(a), Integer::from(b)], [Integer::from(c), Integer::from(d)]];
        }
    }
}

/// The public quartic functions on a random quartic: no panic; a quartic
/// defines the same covering as itself and as its transforms (by any
/// rational matrix of non-zero determinant, and times a square); a
/// unimodular transform is `GL2(Z)`-equivalent; reduction keeps the
/// invariants. (Returns `Ok(false)`; the flag is kept for callers that
/// counted `GL2(Z)` misses separately.)
pub fn check_quartic(g: &Quartic, rng: &mut Rng) -> Result<bool, String> {
    let m = random_matrix(rng, false);
    let u = random_matrix(rng, true);
    let k = Integer::from(rng.range(1, 5));
    let r = catch_unwind(AssertUnwindSafe(|| {
        if g.discriminant() == 0 {
            let _ = covering_class(g);
            let _ = same_covering(g, g);
            let _ = reduce(g);
            return Ok(false);
        }
        let h = g.transform(&m);
        let h = Quartic::new(h.coeffs().map(|c| c * &k * &k));
        if !same_covering(g, g) {
            return Err(format!("same_covering(g, g) is false for {:?}", g.coeffs()));
        }
        if !same_covering(g, &h) {
            return Err(format!("same_covering is false for {:?} and its transform by {m:?} times {k}^2", g.coeffs()));
        }
        let c = covering_class(g).map_err(|e| format!("covering_class failed on {:?}: {e}", g.coeffs()))?;
        if !c.same_as(&c) {
            return Err(format!("covering_class(g).same_as(itself) is false for {:?}", g.coeffs()));
        }
        let (red, _) = reduce(g);
        if red.invariant_i() != g.invariant_i() || red.invariant_j() != g.invariant_j() {
            return Err(format!("reduction changed the invariants of {:?}", g.coeffs()));
        }
        let gu = g.transform(&u);
        if !gl2z_equivalent(g, &gu) {
            return Err(format!("gl2z_equivalent is false for {:?} and its transform by the unimodular {u:?}", g.coeffs()));
        }
        Ok(false)
    }));
    r.map_err(|p| format!("quartic functions panicked on {:?}: {}", g.coeffs(), panic_text(p)))?
}

/// A random unimodular matrix with entries of up to about `digits` digits:
/// a product of elementary moves `x -> x + t z`, `z -> z + t x` with random
/// `t`, and a random sign or swap (determinant +-1 by construction).
pub fn random_unimodular(rng: &mut Rng, digits: u32) -> [[Integer; 2]; 2] {
    let mut m = [[Integer::from(1), Integer::from(0)], [Integer::from(0), Integer::from(1)]];
    let moves = 2 + rng.below(4);
    let per = (digits as u64 / moves).max(1) as u32;
    for k in 0..moves {
        let t = rng.integer(per);
        // m <- m * [[1, t], [0, 1]] or m * [[1, 0], [t, 1]]
        if k % 2 == 0 {
            let (a, c) = (m[0][0].clone(), m[1][0].clone());
            m[0][1] += &a * &t;
            m[1][1] += &c * &t;
        } else {
            let (b, d) = (m[0][1].clone(), m[1][1].clone());
            m[0][0] += &b * &t;
            m[1][0] += &d * &t;
        }
    }
    match rng.below(3) {
        0 => m.swap(0, 1),
        1 => {
            for x in m[0].iter_mut() {
                *x = -x.clone();
            }
        }
        _ => {}
    }
    m
}

/// A random quartic and a moved copy by a random unimodular matrix with
/// entries of up to `matrix_digits` digits: `same_covering` and
/// `gl2z_decide` must say "equivalent", and the matrix `gl2z_decide` returns
/// must map one onto the other exactly; no panic. Returns `Ok(true)` when
/// `gl2z_decide` gave up with a typed error (counted apart, not a failure).
pub fn check_gl2z_pair(g: &Quartic, rng: &mut Rng, matrix_digits: u32) -> Result<bool, String> {
    let u = random_unimodular(rng, matrix_digits);
    let v = random_unimodular(rng, matrix_digits);
    let r = catch_unwind(AssertUnwindSafe(|| {
        let (gu, gv) = (g.transform(&u), g.transform(&v));
        if g.discriminant() == 0 {
            let _ = same_covering(&gu, &gv);
            let _ = gl2z_decide(&gu, &gv);
            return Ok(false);
        }
        if !same_covering(&gu, &gv) {
            return Err(format!("same_covering is false for {:?} moved by {u:?} and by {v:?}", g.coeffs()));
        }
        match gl2z_decide(&gu, &gv) {
            Ok(Some(m)) if gu.transform(&m) == gv => Ok(false),
            Ok(Some(m)) => Err(format!("gl2z_decide returned {m:?}, which does not map {:?} onto {:?}", gu.coeffs(), gv.coeffs())),
            Ok(None) => Err(format!("gl2z_decide says inequivalent for {:?} moved by {u:?} and by {v:?}", g.coeffs())),
            Err(_) => Ok(true),
        }
    }));
    r.map_err(|p| format!("gl2z test panicked on {:?}: {}", g.coeffs(), panic_text(p)))?
}

/// Degenerate and extreme quartics: a square factor (zero discriminant),
/// a zero form, huge coefficients (hundreds of digits), a leading
/// coefficient zero; every quartic function must return (any answer, or a
/// typed error), never panic.
pub fn check_degenerate_quartic(rng: &mut Rng, digits: u32) -> Result<(), String> {
    let kind = rng.below(4);
    let g = match kind {
        0 => {
            // (r x - s z)^2 (p x^2 + q x z + t z^2): zero discriminant
            let (r, s) = (rng.integer(digits / 4 + 1), rng.integer(digits / 4 + 1));
            let (p, q, t) = (rng.integer(digits / 2 + 1), rng.integer(digits / 2 + 1), rng.integer(digits / 2 + 1));
            let l = [&r * &r, Integer::from(-2) * &r * &s, &s * &s];
            let m = [p, q, t];
            let mut c: [Integer; 5] = std::array::from_fn(|_| Integer::from(0));
            for i in 0..3 {
                for j in 0..3 {
                    c[i + j] += &l[i] * &m[j];
                }
            }
            Quartic::new(c)
        }
        1 => Quartic::new(std::array::from_fn(|_| Integer::from(0))),
        2 => random_quartic(rng, 200 + digits * 3),
        _ => {
            let mut c: [Integer; 5] = std::array::from_fn(|_| rng.integer(digits));
            c[0] = Integer::from(0);
            Quartic::new(c)
        }
    };
    let h = g.transform(&random_unimodular(rng, 4));
    let r = catch_unwind(AssertUnwindSafe(|| {
        let _ = same_covering(&g, &h);
        let _ = same_covering(&g, &g);
        let _ = gl2z_decide(&g, &h);
        let _ = gl2z_equivalent(&g, &g);
        if let Ok(c) = covering_class(&g) {
            let _ = c.same_as(&c);
        }
        let _ = reduce(&g);
    }));
    r.map_err(|p| format!("quartic functions panicked on the degenerate {:?} (kind {kind}): {}", g.coeffs(), panic_text(p)))
}

// ------------------------------------------------------------- numbers ----

/// Factorisation and the probable-prime test of a random number under a
/// deadline: no panic, the deadline held, a factorisation multiplies back;
/// and a few word-size functions on random arguments.
pub fn check_numbers(rng: &mut Rng, digits: u32, budget: Duration) -> Result<(), String> {
    let n = rng.integer(digits);
    let limits = twofold::arith::FactorLimits::default().with_deadline(Instant::now() + budget);
    let cpu0 = process_cpu();
    let t = Instant::now();
    let r = catch_unwind(AssertUnwindSafe(|| {
        let f = twofold::arith::factor(&n, &limits);
        let p = twofold::arith::is_probable_prime_within(&Natural::try_from(&n).unwrap_or_default(), &limits);
        (f, p)
    }))
    .map_err(|p| format!("factor panicked on {n}: {}", panic_text(p)))?;
    let cpu = process_cpu().zip(cpu0).map(|(a, b)| a.saturating_sub(b));
    judge_overrun(&format!("factor({n})"), t.elapsed(), cpu, budget)?;
    if let Ok(f) = &r.0 {
        if f.product() != n {
            return Err(format!("factorisation of {n} does not multiply back"));
        }
    }
    let (a, m) = (rng.next() as i64, rng.next() | 1);
    catch_unwind(|| {
        let _ = twofold::arith::kronecker_i64(a, m);
        let _ = twofold::arith::jacobi_u64(a.unsigned_abs(), m);
        let _ = twofold::arith::valuation(&Integer::from(a), &Natural::from(m.max(2)));
        let _ = twofold::arith::is_prime_u64(m);
        let _ = twofold::arith::factor_u64(m);
    })
    .map_err(|p| format!("word functions panicked on ({a}, {m}): {}", panic_text(p)))?;
    Ok(())
}
