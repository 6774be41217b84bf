//! The independent check of a certificate.

use super::check::{
    eval4, f2_rank, invariants4, is_padic_square, is_prime_small, is_rational_square, legendre, padic_point_search,
    real_negative, split, square_class_vector, LocalAnswer, Model,
};
use super::check::{cubic_mod, cubic_rootless_somewhere, eval_cubic, legendre_u64, modq, pow_mod, small_primes};
use super::{AnalyticRecord, Certificate, IsogenyProof, LocalPoint, QuarticProof, SideProof};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{Gcd, Mod, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::fmt;

/// Node budget of the finite p-adic search for each insolubility claim.
const INSOLUBILITY_BUDGET: usize = 200_000;
/// How many good primes the character test of independence may use.
const CHARACTER_PRIMES: usize = 400;

/// Why a certificate was rejected or could not be read.
///
/// ```
/// use twofold::certificate::{Certificate, CertificateError};
/// match Certificate::from_text("not a certificate") {
///     Err(CertificateError::Malformed { line, .. }) => assert_eq!(line, 1),
///     other => panic!("{other:?}"),
/// }
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum CertificateError {
    /// The text could not be parsed.
    Malformed {
        /// The 1-based line number.
        line: usize,
        /// What was wrong.
        message: String,
    },
    /// A recorded fact is false, or a claimed bound is not supported by the record.
    Rejected(String),
}

impl fmt::Display for CertificateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CertificateError::Malformed { line, message } => write!(f, "malformed certificate, line {line}: {message}"),
            CertificateError::Rejected(m) => write!(f, "certificate rejected: {m}"),
        }
    }
}

impl std::error::Error for CertificateError {}

/// What an upper bound established by [`verify`] rests on.
///
/// ```
/// use twofold::certificate::UpperBoundBasis;
/// assert_ne!(UpperBoundBasis::IsogenySelmer, UpperBoundBasis::QuarticSelmerTrustingEnumeration);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum UpperBoundBasis {
    /// The Selmer groups of a 2-isogeny, recomputed from the local tables:
    /// every soluble class has a checked local point and every insoluble one
    /// was shown insoluble by the finite search (unless listed in `trusted`).
    IsogenySelmer,
    /// The full 2-Selmer group: the classes are checked (invariants, local
    /// points), the ruled-out quartics re-checked, but the completeness of the
    /// quartic enumeration is taken on trust.
    QuarticSelmerTrustingEnumeration,
    /// The analytic rank (0 or 1), from an enclosure of `L(E,1)` or
    /// `L'(E,1)` that excludes zero and the root number, both recomputed
    /// (Gross-Zagier, Kolyvagin, modularity).
    Analytic,
}

/// The outcome of [`verify`]: the bounds the certificate proves, and what
/// the check took on trust.
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// use twofold::certificate::{verify, Certificate, UpperBoundBasis};
/// // y^2 = x^3 - x: rank 0 (conductor 32 in the published table (Cremona 1997))
/// let e = Curve::from_coefficients([0, 0, 0, -1, 0]).unwrap();
/// let c = Certificate::from_report(&analyse(&e, &RankOptions::default()).unwrap()).unwrap();
/// let v = verify(&c).unwrap();
/// assert_eq!(v.rank(), Some(0));
/// assert_eq!(v.upper_bound_basis, Some(UpperBoundBasis::IsogenySelmer));
/// assert_eq!(v.two_torsion_dim, 2);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct VerifiedClaims {
    /// The lower bound for the rank established by the check.
    pub lower_bound: usize,
    /// Whether it reaches the certificate's claimed lower bound (always true
    /// for an accepted certificate with a claim).
    pub lower_bound_verified: bool,
    /// The best upper bound established, if any.
    pub upper_bound: Option<usize>,
    /// What that upper bound rests on.
    pub upper_bound_basis: Option<UpperBoundBasis>,
    /// dim `E(Q)[2]`.
    pub two_torsion_dim: usize,
    /// How many rational points were checked on their curves.
    pub points_checked: usize,
    /// How many local points were checked.
    pub local_points_checked: usize,
    /// How many insolubility claims were proved by the finite search.
    pub insolubility_proved: usize,
    /// How many Selmer classes (both routes) were shown to come from rational points.
    pub classes_explained: usize,
    /// Computations the check could not redo and took from the certificate.
    pub trusted: Vec<String>,
    /// Published theorems the conclusions rest on.
    pub theorems: Vec<String>,
    /// The rank proven by the analytic record, recomputed (0 or 1).
    pub analytic_rank: Option<usize>,
}

impl VerifiedClaims {
    /// The rank, when the established bounds meet.
    pub fn rank(&self) -> Option<usize> {
        (self.upper_bound == Some(self.lower_bound)).then_some(self.lower_bound)
    }

    /// Whether the established rank (bounds meet) needs nothing taken on trust.
    pub fn rank_fully_checked(&self) -> bool {
        self.rank().is_some() && self.trusted.is_empty()
    }
}

fn reject<T>(msg: impl Into<String>) -> Result<T, CertificateError> {
    Err(CertificateError::Rejected(msg.into()))
}

fn q(n: &Integer) -> Rational {
    Rational::from(n.clone())
}

fn as_integer(r: &Rational, what: &str) -> Result<Integer, CertificateError> {
    Integer::try_from(r.clone()).or_else(|_| reject(format!("{what} is not an integer")))
}

struct Ctx {
    trusted: Vec<String>,
    local_points: usize,
    insoluble: usize,
    points: usize,
    explained: usize,
}

impl Ctx {
    fn trust(&mut self, s: String) {
        if !self.trusted.contains(&s) {
            self.trusted.push(s);
        }
    }

    fn check_prime(&mut self, p: &Natural) -> Result<(), CertificateError> {
        match is_prime_small(p) {
            Some(true) => Ok(()),
            Some(false) => reject(format!("{p} is not prime")),
            None => {
                if crate::arith::is_probable_prime(p) {
                    self.trust(format!("{p} is prime (a BPSW probable prime; no primality proof)"));
                    Ok(())
                } else {
                    reject(format!("{p} is not prime"))
                }
            }
        }
    }

    /// A local point on `y^2 = g(x, z)` at `place`.
    fn check_local(&mut self, g: &[Integer; 5], w: &LocalPoint, place: &Place, what: &str) -> Result<(), CertificateError> {
        if w.place != *place {
            return reject(format!("{what}: local point recorded for the wrong place"));
        }
        if (&w.x).unsigned_abs().gcd((&w.z).unsigned_abs()) != 1u32 {
            return reject(format!("{what}: local point ({}, {}) is not primitive", w.x, w.z));
        }
        let val = eval4(g, &w.x, &w.z);
        let ok = match place {
            Place::Real => val > 0u32 && w.precision == 0,
            Place::Prime(p) => {
                let pi = Integer::from(p.clone());
                if val == 0u32 {
                    false
                } else {
                    let v = split(&val, &pi).0;
                    let need = if *p == 2u32 { v + 3 } else { v + 1 };
                    w.precision >= need && is_padic_square(&val, &pi)
                }
            }
        };
        if !ok {
            return reject(format!("{what}: ({}, {}) is not a local point at {}", w.x, w.z, place_name(place)));
        }
        self.local_points += 1;
        Ok(())
    }

    /// The claim that `y^2 = g(x, z)` has no point at `place`.
    fn check_insoluble(&mut self, g: &[Integer; 5], place: &Place, what: &str) -> Result<(), CertificateError> {
        let g_text = format!("[{}]", g.iter().map(|c| c.to_string()).collect::<Vec<_>>().join(","));
        match place {
            Place::Real => match real_negative(g) {
                Some(true) => self.insoluble += 1,
                Some(false) => return reject(format!("{what}: {g_text} takes positive real values")),
                None => self.trust(format!("{what}: {g_text} has no real point")),
            },
            Place::Prime(p) => match padic_point_search(g, &Integer::from(p.clone()), INSOLUBILITY_BUDGET) {
                LocalAnswer::NoPoint => self.insoluble += 1,
                LocalAnswer::HasPoint => return reject(format!("{what}: {g_text} does have a point over Q_{p}")),
                LocalAnswer::Undecided => self.trust(format!("{what}: {g_text} has no point over Q_{p}")),
            },
        }
        Ok(())
    }
}

pub(crate) fn place_name(p: &Place) -> String {
    match p {
        Place::Real => "R".to_string(),
        Place::Prime(p) => p.to_string(),
    }
}

/// The model `E'` obtained from `a` by `[u, r, s, t]` (Silverman, AEC, Table 3.1).
fn apply_change(a: &[Rational; 5], c: &[Rational; 4]) -> [Rational; 5] {
    let [a1, a2, a3, a4, a6] = a;
    let [u, r, s, t] = c;
    let two = Rational::from(2);
    let three = Rational::from(3);
    let u2 = u * u;
    let u3 = &u2 * u;
    let u4 = &u2 * &u2;
    let u6 = &u3 * &u3;
    [
        (a1 + &two * s) / u,
        (a2 - s * a1 + &three * r - s * s) / u2,
        (a3 + r * a1 + &two * t) / u3,
        (a4 - s * a3 + &two * r * a2 - (t + r * s) * a1 + &three * r * r - &two * s * t) / u4,
        (a6 + r * a4 + r * r * a2 + r * r * r - t * a3 - t * t - r * t * a1) / u6,
    ]
}

/// Re-checks a certificate with exact arithmetic, independently of the
/// code that produced it (see [`VerifiedClaims`] and the module
/// documentation). Checked:
///
/// * both models are non-singular and the recorded change maps the input
///   model onto the minimal one; the listed primes are prime and account
///   for the whole minimal discriminant (minimality at `p` is checked by
///   the sufficient condition `v(Δ) < 12`, `v(c4) < 4` or `v(c6) < 6`,
///   otherwise taken on trust);
/// * every point lies on its curve; torsion points have order at most 16;
///   dim `E(Q)[2]` is confirmed (the cubic has no further rational root);
/// * the points of infinite order are independent modulo torsion: their
///   images, with the torsion, under quadratic characters
///   `P -> (x(P) - r | q)` for roots `r` of the 2-division cubic modulo good
///   primes `q` (homomorphisms `E(Q) -> E(F_q) -> F_q*/F_q*^2`) span a space
///   of dimension `#points + dim E(Q)[2]`;
/// * isogeny route: the side models come from the minimal model and the
///   kernel point, every local table lists one representative of each
///   square class, soluble classes have local points (Hensel condition),
///   insoluble classes are proved insoluble by a finite p-adic search (or
///   an exact sign argument at R); the Selmer groups are recomputed from
///   the tables and must equal the recorded bases; the images of the
///   recorded points are recomputed as square classes and their span gives
///   the lower bound (Silverman-Tate III.6: `2^r = #α(E(Q)) #α'(E'(Q)) / 4`);
/// * quartic route: every class has invariants `(c4, 2 c6)` and a local
///   point at R, 2, 3 and every bad prime; the number of classes is
///   `2^dim`; every ruled-out quartic is re-checked at its place; every
///   recorded rational point on a class maps by the covering map
///   (covariants g4, g6) onto the recorded point of E.
///
/// Errors: [`CertificateError::Rejected`] when a recorded fact is false or
/// a claimed bound is not established.
pub fn verify(c: &Certificate) -> Result<VerifiedClaims, CertificateError> {
    let mut ctx = Ctx { trusted: vec![], local_points: 0, insoluble: 0, points: 0, explained: 0 };
    let mut theorems: Vec<String> = Vec::new();
    // ---- the curve ----
    let inp = Model::new(&c.input);
    let min = Model::new(&c.minimal);
    if inp.c4_c6_disc().2 == 0u32 {
        return reject("the input model is singular");
    }
    let (c4r, c6r, discr) = min.c4_c6_disc();
    if discr == 0u32 {
        return reject("the minimal model is singular");
    }
    if c.change[0] == 0u32 {
        return reject("the model change has u = 0");
    }
    if apply_change(&inp.a, &c.change) != min.a {
        return reject("the model change does not map the input model onto the minimal model");
    }
    let c4 = as_integer(&c4r, "c4")?;
    let c6 = as_integer(&c6r, "c6")?;
    let disc = as_integer(&discr, "the discriminant")?;
    let b2 = as_integer(&min.b_invariants()[0], "b2")?;
    let mut rest = disc.clone();
    // minimality matters only to the quartic route (its completeness theorem)
    let mut minimality_trust: Vec<String> = Vec::new();
    for (k, p) in c.primes.iter().enumerate() {
        if c.primes[..k].contains(p) {
            return reject(format!("the prime {p} is listed twice"));
        }
        ctx.check_prime(p)?;
        let pi = Integer::from(p.clone());
        let (v, u) = split(&rest, &pi);
        if v == 0 {
            return reject(format!("{p} does not divide the minimal discriminant"));
        }
        rest = u;
        let minimal_here = v < 12 || split(&c4, &pi).0 < 4 || split(&c6, &pi).0 < 6;
        if !minimal_here {
            minimality_trust.push(format!("the model is minimal at {p} (Tate's algorithm; needed by the quartic route)"));
        }
    }
    if (&rest).unsigned_abs() != 1u32 {
        return reject(format!("the listed primes leave the cofactor {rest} of the discriminant"));
    }
    // ---- torsion and dim `E(Q)[2]` ----
    let [a1, _, a3, _, _] = &min.a;
    let mut two_torsion = Vec::new();
    for (x, y) in &c.torsion {
        if !min.contains(x, y) {
            return reject(format!("the torsion point ({x}, {y}) is not on the minimal model"));
        }
        if min.small_order(&(x.clone(), y.clone()), 16).is_none() {
            return reject(format!("the point ({x}, {y}) is not a torsion point"));
        }
        ctx.points += 1;
        if Rational::from(2) * y + a1 * x + a3 == 0u32 {
            two_torsion.push(x.clone());
        }
    }
    let [b2q, b4q, b6q, _] = min.b_invariants();
    let t = match two_torsion.len() {
        3 => 2,
        1 => {
            let e1 = &two_torsion[0];
            let lin = &b2q + Rational::from(4) * e1;
            let cst = Rational::from(2) * &b4q + &b2q * e1 + Rational::from(4) * e1 * e1;
            if is_rational_square(&(&lin * &lin - Rational::from(16) * cst)) {
                return reject("E(Q)[2] has points missing from the torsion list");
            }
            1
        }
        0 => {
            let b = [&b2, &as_integer(&b4q, "b4")?, &as_integer(&b6q, "b6")?].map(|x| x.clone());
            if !cubic_rootless_somewhere(&b, &disc) {
                ctx.trust("E(Q)[2] is trivial (no prime with an irreducible 2-division cubic found)".to_string());
            }
            0
        }
        _ => return reject("the torsion list has an impossible number of points of order 2"),
    };
    // ---- points of infinite order ----
    let mut rows: Vec<(Rational, Rational)> = Vec::new();
    for p in &c.points {
        if !min.contains(&p.x, &p.y) {
            return reject(format!("the point ({}, {}) is not on the minimal model", p.x, p.y));
        }
        ctx.points += 1;
        rows.push((p.x.clone(), p.y.clone()));
    }
    rows.extend(c.torsion.iter().cloned());
    if rows.len() > 64 {
        return reject("too many points for the independence test");
    }
    let char_rank = character_rank(&rows, &c.minimal, &disc);
    let mut lower = char_rank.saturating_sub(t).min(c.points.len());
    if !c.points.is_empty() {
        theorems.push(
            "points with independent images in E(Q)/2E(Q) modulo torsion generate a subgroup of rank at least their number"
                .to_string(),
        );
    }
    // ---- isogeny routes ----
    let mut upper: Option<(usize, UpperBoundBasis)> = None;
    let keep_upper = |u: usize, b: UpperBoundBasis, upper: &mut Option<(usize, UpperBoundBasis)>| {
        let better = match upper {
            None => true,
            Some((v, vb)) => u < *v || (u == *v && *vb != UpperBoundBasis::IsogenySelmer && b == UpperBoundBasis::IsogenySelmer),
        };
        if better {
            *upper = Some((u, b));
        }
    };
    for (k, run) in c.isogeny.iter().enumerate() {
        let (lo, up) = verify_run(&mut ctx, &min, &c4, &c6, &b2, &c.primes, run, k)?;
        lower = lower.max(lo);
        if let Some(u) = up {
            keep_upper(u, UpperBoundBasis::IsogenySelmer, &mut upper);
        }
    }
    if !c.isogeny.is_empty() {
        theorems.push("the connecting maps of a 2-isogeny y^2 = x(x^2+ax+b) take values in the divisors of b, and the local conditions hold at primes not dividing 2bb' (Silverman-Tate III.5-6; Silverman AEC X.4)".to_string());
        theorems.push("2^rank = #α(E(Q)) #α'(E'(Q)) / 4 (Silverman-Tate III.6)".to_string());
    }
    // ---- the full 2-descent ----
    if let Some(qp) = &c.quartic {
        if let Some((u, enumeration)) = verify_quartic(&mut ctx, &min, &c4, &c6, &b2, &c.primes, t, qp)? {
            keep_upper(u, UpperBoundBasis::QuarticSelmerTrustingEnumeration, &mut upper);
            if upper.is_some_and(|b| b.1 == UpperBoundBasis::QuarticSelmerTrustingEnumeration) {
                ctx.trust(enumeration);
                for m in minimality_trust.drain(..) {
                    ctx.trust(m);
                }
            }
            theorems.push("every everywhere locally soluble 2-covering of a minimal model has an integral quartic model with invariants (c4, 2c6) (Cremona, Fisher and Stoll, Algebra and Number Theory 4, 2010)".to_string());
            theorems.push("y^2 = g(x,z) is soluble at odd primes not dividing its discriminant (Hasse-Weil bound and Hensel's lemma)".to_string());
        }
    }
    // ---- the analytic part ----
    let mut analytic_rank = None;
    if let Some(a) = &c.analytic {
        let r = verify_analytic(c, a)?;
        if lower > r {
            return reject(format!("the points give rank >= {lower} but the analytic record proves rank {r}"));
        }
        lower = r;
        keep_upper(r, UpperBoundBasis::Analytic, &mut upper);
        if upper.is_some_and(|u| u.0 < r) {
            return reject(format!("the descent's upper bound is below the analytic rank {r}"));
        }
        analytic_rank = Some(r);
        theorems.push(format!("a non-zero L(E,1) gives rank 0 and a non-zero L'(E,1) with root number -1 gives rank 1 ({})", a.theorem));
        theorems.push("the root number is the product of the local root numbers and -1 at the real place (Deligne); local formulas: Rohrlich 1993 for p >= 5, the multiplicative and potentially multiplicative cases, the twist and tame cases at 2 and 3".to_string());
    }
    // ---- the claims ----
    if let Some(cl) = c.rank_lower {
        if cl > lower {
            return reject(format!("the claimed lower bound {cl} is not established (only {lower})"));
        }
    }
    if let Some(cu) = c.rank_upper {
        match upper {
            Some((u, _)) if u <= cu => {}
            Some((u, _)) => return reject(format!("the claimed upper bound {cu} is below the established {u}")),
            None => return reject(format!("the claimed upper bound {cu} is not established")),
        }
    }
    if let Some((u, _)) = upper {
        if lower > u {
            return reject(format!("the established bounds contradict each other ({lower} > {u})"));
        }
    }
    Ok(VerifiedClaims {
        lower_bound: lower,
        lower_bound_verified: c.rank_lower.is_none_or(|l| l <= lower),
        upper_bound: upper.map(|u| u.0),
        upper_bound_basis: upper.map(|u| u.1),
        two_torsion_dim: t,
        points_checked: ctx.points,
        local_points_checked: ctx.local_points,
        insolubility_proved: ctx.insoluble,
        classes_explained: ctx.explained,
        trusted: ctx.trusted,
        theorems,
        analytic_rank,
    })
}

/// Rechecks the analytic record: the conductor and the root number with its
/// local factors recomputed from the minimal model and the listed primes,
/// and the enclosure recomputed from the curve; the recorded enclosure must
/// meet the recomputed one and exclude zero. Returns the rank it proves.
fn verify_analytic(c: &Certificate, a: &AnalyticRecord) -> Result<usize, CertificateError> {
    let failed = |what: &str, e: crate::error::Error| CertificateError::Rejected(format!("{what}: {e}"));
    let curve = crate::curve::Curve::new(c.minimal.clone()).map_err(|e| failed("the minimal model", e))?;
    let data = crate::local::CurveData::with_known_primes(&curve, &c.primes).map_err(|e| failed("the local data", e))?;
    if *data.conductor() != a.conductor {
        return reject(format!("the recorded conductor {} is not the conductor {}", a.conductor, data.conductor()));
    }
    let rn = crate::rootno::root_number_of(&data, &crate::arith::FactorLimits::default()).map_err(|e| failed("the root number", e))?;
    if rn.global != a.root_number {
        return reject(format!("the recorded root number {} is not the root number {}", a.root_number, rn.global));
    }
    if rn.local != a.local_root_numbers {
        return reject("the recorded local root numbers differ from the recomputed ones");
    }
    let order = if rn.global == 1 { 0u8 } else { 1 };
    if a.order != order {
        return reject(format!("the recorded order {} does not match the root number {}", a.order, rn.global));
    }
    let (low, high) = match (a.low.parse::<f64>(), a.high.parse::<f64>()) {
        (Ok(l), Ok(h)) if l <= h => (l, h),
        _ => return reject("the recorded enclosure is not an interval"),
    };
    if low <= 0.0 && high >= 0.0 {
        return reject("the recorded enclosure does not exclude zero");
    }
    let proof = crate::lproof::prove_analytic_rank_of(&data, &crate::budget::Work::unlimited())
        .map_err(|e| failed("the L-value recomputation", e))?;
    if proof.root_number.sign != Some(rn.global) {
        return reject("the functional-equation test does not reproduce the root number");
    }
    let Some(v) = proof.value else { return reject("the L-value was not recomputed") };
    if v.order != order || !v.nonzero_proven() {
        return reject("the recomputed enclosure does not exclude zero");
    }
    // both are enclosures of the same number (the recorded ends are decimal,
    // read to the nearest f64: allow one ulp)
    if low.next_down() > v.high || high.next_up() < v.low {
        return reject(format!("the recorded enclosure [{}, {}] misses the recomputed [{}, {}]", a.low, a.high, v.low, v.high));
    }
    Ok(usize::from(order))
}

/// The F2 rank of the images of `rows` under the quadratic characters
/// at good odd primes.
fn character_rank(rows: &[(Rational, Rational)], coefficients: &[Integer; 5], disc: &Integer) -> usize {
    if rows.is_empty() {
        return 0;
    }
    let m = Model::new(coefficients);
    let [b2, b4, b6, _] = m.b_invariants();
    // invariant: b2, b4, b6 are integer polynomials in integral coefficients
    let b = [b2, b4, b6].map(|x| Integer::try_from(x).expect("integral model"));
    let mut columns: Vec<u64> = Vec::new();
    let mut used = 0;
    for q in small_primes(u64::MAX) {
        if used >= CHARACTER_PRIMES || f2_rank(&columns) == rows.len() {
            break;
        }
        if disc.mod_op(Integer::from(q)) == 0u32 {
            continue;
        }
        used += 1;
        let f = cubic_mod(&b, q);
        // f'(x) = 12 x^2 + 2 b2 x + 2 b4
        let fp = |x: u64| -> u64 {
            let qq = q as u128;
            let x = x as u128;
            ((12 * x % qq * x + 2 * f[1] as u128 * x + f[2] as u128) % qq) as u64
        };
        let roots: Vec<u64> = if q < 5000 { (0..q).filter(|&x| eval_cubic(&f, x, q) == 0).collect() } else { vec![] };
        for r in roots {
            let mut col = 0u64;
            for (i, (x, _)) in rows.iter().enumerate() {
                let (n, d) = x.to_numerator_and_denominator();
                let dq = modq(&Integer::from(d), q);
                if dq == 0 {
                    continue; // reduces to the point at infinity
                }
                let nq = if *x < 0u32 { modq(&-Integer::from(n), q) } else { modq(&Integer::from(n), q) };
                let inv = pow_mod(dq, q - 2, q);
                let xm = (nq as u128 * inv as u128 % q as u128) as u64;
                let val = if xm == r { legendre_u64(fp(r), q) } else { legendre_u64((xm + q - r) % q, q) };
                if val == -1 {
                    col |= 1 << i;
                }
            }
            columns.push(col);
        }
    }
    f2_rank(&columns)
}

/// F2 coordinates of a non-zero integer in `Q_v*/Q_v*^2`: 1 bit at R,
/// (valuation, non-residue) at odd p, (valuation, -1, 5) at 2.
fn local_coords(d: &Integer, place: &Place) -> u8 {
    match place {
        Place::Real => (*d < 0u32) as u8,
        Place::Prime(p) => {
            let pi = Integer::from(p.clone());
            let (v, u) = split(d, &pi);
            if *p == 2u32 {
                // invariant: a residue mod 8 is in [0, 8) and fits a u64
                let r = u64::try_from(&u.mod_op(Integer::from(8))).expect("reduced");
                ((v % 2) as u8) | (((r % 4) == 3) as u8) << 1 | ((r == 3 || r == 5) as u8) << 2
            } else {
                ((v % 2) as u8) | ((legendre(&u, &pi) == -1) as u8) << 1
            }
        }
    }
}

/// The side model's point moved to the minimal model.
fn side_to_minimal(min: &Model, b2: &Integer, x0: &Integer, u: &Integer, x: &Rational, y: &Rational) -> (Rational, Rational) {
    let [a1, _, a3, _, _] = &min.a;
    let uq = q(u);
    let big_x = &uq * &uq * x + q(x0);
    let big_y = &uq * &uq * &uq * y;
    let ex = (big_x - q(&(Integer::from(3) * b2))) / Rational::from(36);
    let ey = (big_y / Rational::from(108) - a1 * &ex - a3) / Rational::from(2);
    (ex, ey)
}

#[allow(clippy::too_many_arguments)]
fn verify_run(
    ctx: &mut Ctx,
    min: &Model,
    c4: &Integer,
    c6: &Integer,
    b2: &Integer,
    primes: &[Natural],
    run: &IsogenyProof,
    k: usize,
) -> Result<(usize, Option<usize>), CertificateError> {
    let what = format!("2-isogeny run {k}");
    let (xt, yt) = &run.kernel;
    let [a1, _, a3, _, _] = &min.a;
    if !min.contains(xt, yt) || Rational::from(2) * yt + a1 * xt + a3 != 0u32 {
        return reject(format!("{what}: the kernel point is not a point of order 2"));
    }
    let x0 = &run.x0;
    if Rational::from(36) * xt + q(&(Integer::from(3) * b2)) != q(x0) {
        return reject(format!("{what}: x0 does not belong to the kernel point"));
    }
    if x0 * x0 * x0 - Integer::from(27) * c4 * x0 - Integer::from(54) * c6 != 0u32 || run.u == 0u32 {
        return reject(format!("{what}: x0 is not a root of X^3 - 27 c4 X - 54 c6"));
    }
    let [se, sp] = &run.sides;
    let u2 = &run.u * &run.u;
    if &se.a * &u2 != Integer::from(3) * x0 || &se.b * &u2 * &u2 != Integer::from(3) * x0 * x0 - Integer::from(27) * c4 {
        return reject(format!("{what}: the side model does not come from the minimal model"));
    }
    if sp.a != Integer::from(-2) * &se.a || sp.b != &se.a * &se.a - Integer::from(4) * &se.b {
        return reject(format!("{what}: the isogenous side is not y^2 = x(x^2 - 2a x + a^2 - 4b)"));
    }
    if se.b == 0u32 || sp.b == 0u32 {
        return reject(format!("{what}: a side model is singular"));
    }
    let bb = &se.b * &sp.b;
    let mut dims = [0usize; 2];
    let mut sels: [Option<usize>; 2] = [None, None];
    for (side_k, side) in run.sides.iter().enumerate() {
        let what = format!("{what}, side {}", if side_k == 0 { "E" } else { "E'" });
        let (dim, sel) = verify_side(ctx, side, &bb, primes, &what)?;
        dims[side_k] = dim;
        sels[side_k] = sel;
        // the recorded points, moved to the minimal model
        for img in &side.images {
            let on_e = if side_k == 0 {
                (img.x.clone(), img.y.clone())
            } else {
                if img.x == 0u32 {
                    continue;
                }
                let x2 = &img.x * &img.x;
                (
                    &img.y * &img.y / (Rational::from(4) * &x2),
                    &img.y * (q(&sp.b) - &x2) / (Rational::from(8) * &x2),
                )
            };
            let side_model = Model::new(&[Integer::ZERO, se.a.clone(), Integer::ZERO, se.b.clone(), Integer::ZERO]);
            if !side_model.contains(&on_e.0, &on_e.1) {
                return reject(format!("{what}: the image of ({}, {}) under the dual isogeny is off E", img.x, img.y));
            }
            let (ex, ey) = side_to_minimal(min, b2, x0, &run.u, &on_e.0, &on_e.1);
            if !min.contains(&ex, &ey) {
                return reject(format!("{what}: ({}, {}) does not map onto the minimal model", img.x, img.y));
            }
        }
    }
    let lower = (dims[0] + dims[1]).saturating_sub(2);
    if run.lower > lower {
        return reject(format!("{what}: the claimed lower bound {} exceeds the recomputed {lower}", run.lower));
    }
    let upper = match sels {
        [Some(s), Some(t)] => Some((s + t).checked_sub(2).ok_or_else(|| CertificateError::Rejected(format!("{what}: Selmer groups too small")))?),
        _ => None,
    };
    if upper != run.upper {
        return reject(format!("{what}: the claimed upper bound {:?} differs from the recomputed {upper:?}", run.upper));
    }
    Ok((lower, upper))
}

/// Checks one side; returns (dim of the span of the known images, Selmer dimension if complete).
fn verify_side(
    ctx: &mut Ctx,
    side: &SideProof,
    bb: &Integer,
    primes: &[Natural],
    what: &str,
) -> Result<(usize, Option<usize>), CertificateError> {
    let (a, b) = (&side.a, &side.b);
    let model = Model::new(&[Integer::ZERO, a.clone(), Integer::ZERO, b.clone(), Integer::ZERO]);
    // the places and the primes of b
    let place_primes: Vec<Natural> =
        side.local.iter().filter_map(|t| if let Place::Prime(p) = &t.place { Some(p.clone()) } else { None }).collect();
    // the primes of b are among those of 6 Δ (disc of the side model = 16 b^2 (a^2 - 4b))
    let mut side_primes: Vec<Integer> = Vec::new();
    for p in place_primes.iter().chain(primes).cloned().chain([Natural::from(2u32), Natural::from(3u32)]) {
        let p = Integer::from(p);
        if p > 1u32 && b.mod_op(&p) == 0u32 && !side_primes.contains(&p) {
            side_primes.push(p);
        }
    }
    side_primes.sort();
    if side_primes.len() > 62 {
        return reject(format!("{what}: too many primes"));
    }
    // images of torsion, T and the recorded points
    let mut span: Vec<u64> = Vec::new();
    let vec_of = |r: &Rational| square_class_vector(r, &side_primes);
    let alpha = |x: &Rational| if *x == 0u32 { q(b) } else { x.clone() };
    span.push(vec_of(&q(b)).ok_or_else(|| CertificateError::Rejected(format!("{what}: b has primes outside the places")))?);
    for (x, y) in &side.torsion {
        if !model.contains(x, y) || model.small_order(&(x.clone(), y.clone()), 16).is_none() {
            return reject(format!("{what}: ({x}, {y}) is not a torsion point of the side model"));
        }
        ctx.points += 1;
        span.push(vec_of(&alpha(x)).ok_or_else(|| CertificateError::Rejected(format!("{what}: torsion image outside the divisors of b")))?);
    }
    for img in &side.images {
        if !model.contains(&img.x, &img.y) {
            return reject(format!("{what}: the point ({}, {}) is not on the side model", img.x, img.y));
        }
        ctx.points += 1;
        let v = vec_of(&alpha(&img.x)).ok_or_else(|| CertificateError::Rejected(format!("{what}: image outside the divisors of b")))?;
        if Some(v) != vec_of(&q(&img.class)) {
            return reject(format!("{what}: the image of ({}, {}) is not the class {}", img.x, img.y, img.class));
        }
        span.push(v);
        ctx.explained += 1;
    }
    let dim = f2_rank(&span);
    let Some(claimed) = side.selmer_dim else { return Ok((dim, None)) };
    // the places must be R, 2 and every prime of b b'
    if !side.local.iter().any(|t| t.place == Place::Real) || !place_primes.contains(&Natural::from(2u32)) {
        return reject(format!("{what}: the local tables miss R or 2"));
    }
    let mut rest = bb.clone();
    for p in &place_primes {
        ctx.check_prime(p)?;
        rest = split(&rest, &Integer::from(p.clone())).1;
    }
    if (&rest).unsigned_abs() != 1u32 {
        return reject(format!("{what}: a prime of b b' has no local table"));
    }
    // the basis -1, primes of b, and the Selmer conditions
    let n = side_primes.len() + 1;
    let basis: Vec<Integer> = std::iter::once(Integer::from(-1)).chain(side_primes.iter().cloned()).collect();
    let mut conditions: Vec<u64> = Vec::new();
    for table in &side.local {
        let bits = match &table.place {
            Place::Real => 1,
            Place::Prime(p) if *p == 2u32 => 3,
            _ => 2,
        };
        let mut seen: Vec<u8> = Vec::new();
        let mut soluble: Vec<u8> = Vec::new();
        for (c, w) in &table.soluble {
            if *c == 0u32 {
                return reject(format!("{what}: zero class"));
            }
            let g = [c * c * c, Integer::ZERO, a * c * c, Integer::ZERO, b * c];
            ctx.check_local(&g, w, &table.place, &format!("{what}, class {c}"))?;
            soluble.push(local_coords(c, &table.place));
            seen.push(local_coords(c, &table.place));
        }
        for c in &table.insoluble {
            if *c == 0u32 {
                return reject(format!("{what}: zero class"));
            }
            let g = [c * c * c, Integer::ZERO, a * c * c, Integer::ZERO, b * c];
            ctx.check_insoluble(&g, &table.place, &format!("{what}, class {c}"))?;
            seen.push(local_coords(c, &table.place));
        }
        let mut sorted = seen.clone();
        sorted.sort_unstable();
        sorted.dedup();
        if sorted.len() != seen.len() || seen.len() != 1 << bits {
            return reject(format!("{what}: the table at {} does not list each square class once", place_name(&table.place)));
        }
        for &x in &soluble {
            for &y in &soluble {
                if !soluble.contains(&(x ^ y)) {
                    return reject(format!("{what}: the local image at {} is not a group", place_name(&table.place)));
                }
            }
        }
        let coords: Vec<u8> = basis.iter().map(|d| local_coords(d, &table.place)).collect();
        for f in 1u8..(1 << bits) {
            if soluble.iter().all(|&s| (f & s).count_ones() % 2 == 0) {
                let row = coords.iter().enumerate().fold(0u64, |acc, (i, &cc)| acc | (((f & cc).count_ones() % 2) as u64) << i);
                conditions.push(row);
            }
        }
    }
    let sel_dim = n - f2_rank(&conditions);
    if sel_dim != claimed {
        return reject(format!("{what}: the Selmer group has dimension {sel_dim}, not the claimed {claimed}"));
    }
    // the recorded basis: in the Selmer group, independent, complete
    let mut vs = Vec::new();
    for class in &side.classes {
        let Some(d) = &class.label else { return reject(format!("{what}: a class without its integer")) };
        let v = square_class_vector(&q(d), &side_primes).ok_or_else(|| CertificateError::Rejected(format!("{what}: class {d} is not a divisor of b")))?;
        // bit 0 of the vector is the sign, then the primes: the same order as `basis`
        if conditions.iter().any(|row| (row & v).count_ones() % 2 == 1) {
            return reject(format!("{what}: class {d} fails a local condition"));
        }
        if *d == 0u32 || b.mod_op(d) != 0u32 {
            return reject(format!("{what}: class {d} does not divide b"));
        }
        let g = [d.clone(), Integer::ZERO, a.clone(), Integer::ZERO, b / d];
        if class.quartic != g {
            return reject(format!("{what}: the covering of class {d} is not d M^4 + a M^2 e^2 + (b/d) e^4"));
        }
        for table in &side.local {
            let Some(w) = class.local_points.iter().find(|w| w.place == table.place) else {
                return reject(format!("{what}: class {d} has no local point at {}", place_name(&table.place)));
            };
            ctx.check_local(&g, w, &table.place, &format!("{what}, covering of {d}"))?;
        }
        vs.push(v);
    }
    if vs.len() != sel_dim || f2_rank(&vs) != sel_dim {
        return reject(format!("{what}: the recorded classes are not a basis of the Selmer group (dimension {sel_dim})"));
    }
    if dim > sel_dim {
        return reject(format!("{what}: the images of points exceed the Selmer group"));
    }
    Ok((dim, Some(sel_dim)))
}

/// `(g4, g6)` at `(x, z)`: the Hessian-type quartic covariant
/// `(3b^2 - 8ac) x^4 + 4(bc - 6ad) x^3 z + 2(2c^2 - 24ae - 3bd) x^2 z^2 + 4(cd - 6be) x z^3 + (3d^2 - 8ce) z^4`
/// and the sextic covariant, with the syzygy `27 g6^2 = g4^3 - 48 I g^2 g4 - 64 J g^3`.
pub(crate) fn covariants_at(g: &[Integer; 5], x: &Integer, z: &Integer) -> (Integer, Integer) {
    let [a, b, c, d, e] = g;
    let i = |v: i64| Integer::from(v);
    let g4 = [
        i(3) * b * b - i(8) * a * c,
        i(4) * (b * c - i(6) * a * d),
        i(2) * (i(2) * c * c - i(24) * a * e - i(3) * b * d),
        i(4) * (c * d - i(6) * b * e),
        i(3) * d * d - i(8) * c * e,
    ];
    let g6 = [
        b * b * b + i(8) * a * a * d - i(4) * a * b * c,
        i(2) * (i(16) * a * a * e + i(2) * a * b * d - i(4) * a * c * c + b * b * c),
        i(5) * (i(8) * a * b * e + b * b * d - i(4) * a * c * d),
        i(20) * (b * b * e - a * d * d),
        -(i(5) * (i(8) * a * d * e + b * d * d - i(4) * b * c * e)),
        -(i(2) * (i(16) * a * e * e + i(2) * b * d * e - i(4) * c * c * e + c * d * d)),
        -(d * d * d + i(8) * b * e * e - i(4) * c * d * e),
    ];
    let ev = |cs: &[Integer]| -> Integer {
        let n = cs.len() - 1;
        let mut acc = Integer::ZERO;
        let mut xp = vec![Integer::ONE];
        let mut zp = vec![Integer::ONE];
        for k in 1..=n {
            xp.push(&xp[k - 1] * x);
            zp.push(&zp[k - 1] * z);
        }
        for (k, cc) in cs.iter().enumerate() {
            acc += cc * &xp[n - k] * &zp[k];
        }
        acc
    };
    (ev(&g4), ev(&g6))
}

#[allow(clippy::too_many_arguments)]
fn verify_quartic(
    ctx: &mut Ctx,
    min: &Model,
    c4: &Integer,
    c6: &Integer,
    b2: &Integer,
    primes: &[Natural],
    t: usize,
    qp: &QuarticProof,
) -> Result<Option<(usize, String)>, CertificateError> {
    let what = "quartic route";
    if qp.two_torsion_dim != t {
        return reject(format!("{what}: dim `E(Q)[2]` is {t}, not {}", qp.two_torsion_dim));
    }
    // the curve the quartics cover: the minimal model, or an odd-degree
    // isogenous curve (its discriminant must use only the listed primes,
    // as isogenous curves have the same bad primes)
    let other: Option<(Model, u64)> = match &qp.descent_curve {
        None => None,
        Some((a, d)) => {
            if *d % 2 == 0 || *d < 3 {
                return reject(format!("{what}: the descent curve's isogeny degree {d} is not odd"));
            }
            let m = Model::new(a);
            let (_, _, disc) = m.c4_c6_disc();
            if disc == 0u32 {
                return reject(format!("{what}: the descent curve is singular"));
            }
            let mut rest = as_integer(&disc, "the descent curve's discriminant")?;
            for p in primes {
                let pz = Integer::from(p.clone());
                while (&rest % &pz) == 0u32 {
                    rest /= &pz;
                }
            }
            if rest != 1u32 && rest != -1i32 {
                return reject(format!("{what}: the descent curve has a bad prime that the curve does not have"));
            }
            Some((m, *d))
        }
    };
    let (other_c4, other_c6, other_b2);
    let (min, c4, c6, b2) = match &other {
        None => (min, c4, c6, b2),
        Some((m, _)) => {
            let (k4, k6, _) = m.c4_c6_disc();
            other_c4 = as_integer(&k4, "c4")?;
            other_c6 = as_integer(&k6, "c6")?;
            other_b2 = as_integer(&m.b_invariants()[0], "b2")?;
            (m, &other_c4, &other_c6, &other_b2)
        }
    };
    let j = Integer::from(2) * c6;
    let mut places = vec![Place::Real, Place::Prime(Natural::from(2u32)), Place::Prime(Natural::from(3u32))];
    for p in primes {
        let pl = Place::Prime(p.clone());
        if !places.contains(&pl) {
            places.push(pl);
        }
    }
    let [a1, _, a3, _, _] = &min.a;
    for (n, class) in qp.classes.iter().enumerate() {
        let g = &class.quartic;
        if invariants4(g) != (c4.clone(), j.clone()) {
            return reject(format!("{what}: class {n} does not have invariants (c4, 2 c6)"));
        }
        for pl in &places {
            let Some(w) = class.local_points.iter().find(|w| w.place == *pl) else {
                return reject(format!("{what}: class {n} has no local point at {}", place_name(pl)));
            };
            ctx.check_local(g, w, pl, &format!("{what}, class {n}"))?;
        }
        if let Some(l) = &class.lift {
            if l.y == 0u32 || eval4(g, &l.x, &l.z) != &l.y * &l.y {
                return reject(format!("{what}: the rational point on class {n} is not on its covering"));
            }
            let (g4, g6) = covariants_at(g, &l.x, &l.z);
            let y2 = q(&l.y) * q(&l.y);
            let big_x = Rational::from(3) * q(&g4) / (Rational::from(4) * &y2);
            let big_y = Rational::from(27) * q(&g6) / (Rational::from(8) * &y2 * q(&l.y));
            let (px, py) = &l.image;
            if !min.contains(px, py) {
                return reject(format!("{what}: the image point of class {n} is not on the minimal model"));
            }
            let ex = Rational::from(36) * px + q(&(Integer::from(3) * b2));
            let ey = Rational::from(108) * (Rational::from(2) * py + a1 * px + a3);
            if big_x != ex || (big_y != ey && big_y != -ey) {
                return reject(format!("{what}: the covering map does not send the point on class {n} to the recorded point"));
            }
            ctx.points += 1;
            ctx.explained += 1;
        }
    }
    for (g, pl) in &qp.ruled_out {
        if invariants4(g) != (c4.clone(), j.clone()) {
            return reject(format!("{what}: a ruled-out quartic does not have invariants (c4, 2 c6)"));
        }
        if !places.contains(pl) {
            return reject(format!("{what}: a quartic is ruled out at an unexpected place"));
        }
        ctx.check_insoluble(g, pl, &format!("{what}, ruled out"))?;
    }
    let Some(s) = qp.selmer_dim else {
        if qp.upper.is_some() {
            return reject(format!("{what}: an upper bound without a Selmer dimension"));
        }
        return Ok(None);
    };
    if s >= usize::BITS as usize || qp.classes.len() != 1usize << s {
        return reject(format!("{what}: {} classes listed for a Selmer group of dimension {s}", qp.classes.len()));
    }
    if s < t {
        return reject(format!("{what}: the Selmer group is smaller than E(Q)[2]"));
    }
    if qp.upper != Some(s - t) {
        return reject(format!("{what}: the claimed upper bound {:?} is not dim Sel^2 - dim `E(Q)[2]` = {}", qp.upper, s - t));
    }
    let accounted = qp.classes.len() + qp.ruled_out.len();
    if qp.enumerated < accounted {
        return reject(format!("{what}: more quartics recorded than enumerated"));
    }
    let mut enumeration = format!(
        "{what}: the enumeration of GL2(Z)-classes of quartics with invariants (c4, 2c6) is complete ({} classes), and the {} everywhere locally soluble ones not listed are equivalent to listed classes",
        qp.enumerated,
        qp.enumerated - accounted
    );
    if let Some((m, d)) = &other {
        enumeration.push_str(&format!(
            "; the quartics cover the curve {:?}, which is isogenous to the minimal model by an isogeny of odd degree {d} (so Sel^2 and E(Q)[2] agree; the isogeny is not re-checked here)",
            m.a
        ));
    }
    Ok(Some((s - t, enumeration)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn syzygy_of_the_covariants() {
        // 27 g6^2 = g4^3 - 48 I g^2 g4 - 64 J g^3 (Cremona, Classical invariants and
        // 2-descent, J. Symbolic Comput. 31 (2001), from memory), checked at sample points
        for coeffs in [[1i64, 0, -5, 0, 4], [2, 1, -3, 5, 1], [-3, 7, 2, -1, 6], [1, 2, 3, 4, 5]] {
            let g = coeffs.map(Integer::from);
            let (i, j) = invariants4(&g);
            for (x, z) in [(1i64, 0i64), (0, 1), (2, 3), (-5, 7)] {
                let (x, z) = (Integer::from(x), Integer::from(z));
                let (g4, g6) = covariants_at(&g, &x, &z);
                let gv = eval4(&g, &x, &z);
                let lhs = Integer::from(27) * &g6 * &g6;
                let rhs = &g4 * &g4 * &g4 - Integer::from(48) * &i * &gv * &gv * &g4 - Integer::from(64) * &j * &gv * &gv * &gv;
                assert_eq!(lhs, rhs, "{coeffs:?}");
            }
        }
    }

    #[test]
    fn model_change_formula_matches_the_curve_module() {
        let e = crate::Curve::from_coefficients([1, -1, 1, -7, 3]).unwrap();
        let ch = crate::ModelChange::new(Rational::from(2), Rational::from(3), Rational::from(-1), Rational::from(5)).unwrap();
        let f = e.apply_change(&ch).map(|c| c.coefficients().clone().map(Rational::from));
        let ours = apply_change(&e.coefficients().clone().map(Rational::from), &[ch.u, ch.r, ch.s, ch.t]);
        match f {
            Ok(theirs) => assert_eq!(ours, theirs),
            Err(_) => assert!(ours.iter().any(|a| a.to_numerator_and_denominator().1 != 1u32)),
        }
    }
}

