//! The independent check of a certificate.

//!
//! One file per record kind: [`curve`] (the models, the primes, torsion and
//! the points of infinite order), [`isogeny`] (the 2-isogeny runs),
//! [`quartic`] (the full 2-descent), [`analytic`] (the analytic record).
//! The exact arithmetic they share lives in `super::check`.

mod algebra;
mod analytic;
mod curve;
mod isogeny;
mod quartic;

use super::check::{eval4, is_padic_square, is_prime_small, padic_point_search, real_negative, split, LocalAnswer};
use super::{Certificate, LocalPoint};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{Gcd, UnsignedAbs};
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
#[non_exhaustive]
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
#[non_exhaustive]
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
    /// The full 2-Selmer group from the descent over `Q[X]/(f)`: local
    /// images, norms, valuations and the F2 linear algebra recomputed; the
    /// completeness of `K(S,2)` (class group and units) taken on trust
    /// where `A` has a factor of degree 2 or 3.
    AlgebraSelmer,
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

pub(super) fn reject<T>(msg: impl Into<String>) -> Result<T, CertificateError> {
    Err(CertificateError::Rejected(msg.into()))
}

pub(super) fn q(n: &Integer) -> Rational {
    Rational::from(n.clone())
}

pub(super) fn as_integer(r: &Rational, what: &str) -> Result<Integer, CertificateError> {
    Integer::try_from(r.clone()).or_else(|_| reject(format!("{what} is not an integer")))
}

pub(super) struct Ctx {
    trusted: Vec<String>,
    local_points: usize,
    insoluble: usize,
    points: usize,
    explained: usize,
}

impl Ctx {
    pub(super) fn trust(&mut self, s: String) {
        if !self.trusted.contains(&s) {
            self.trusted.push(s);
        }
    }

    pub(super) fn check_prime(&mut self, p: &Natural) -> Result<(), CertificateError> {
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
    pub(super) fn check_local(&mut self, g: &[Integer; 5], w: &LocalPoint, place: &Place, what: &str) -> Result<(), CertificateError> {
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
    pub(super) fn check_insoluble(&mut self, g: &[Integer; 5], place: &Place, what: &str) -> Result<(), CertificateError> {
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
///   (covariants g4, g6) onto the recorded point of E;
/// * the descent over `Q[X]/(f)`: see the `algebra` checks (the cubic of
///   the minimal model, `S`, even valuations of the candidates outside `S`,
///   the local points and the dimensions of the local images, the norms,
///   and the Selmer group recomputed by F2 linear algebra).
///
/// Errors: [`CertificateError::Rejected`] when a recorded fact is false or
/// a claimed bound is not established.
pub fn verify(c: &Certificate) -> Result<VerifiedClaims, CertificateError> {
    let mut ctx = Ctx { trusted: vec![], local_points: 0, insoluble: 0, points: 0, explained: 0 };
    let mut theorems: Vec<String> = Vec::new();
    let mut checked = curve::check_curve(&mut ctx, c)?;
    let t = curve::two_torsion_dim(&mut ctx, c, &checked)?;
    let mut lower = curve::points_lower_bound(&mut ctx, c, &checked, t)?;
    let mut minimality_trust = std::mem::take(&mut checked.minimality_trust);
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
        let (lo, up) = isogeny::verify_run(&mut ctx, &checked, &c.primes, run, k)?;
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
        if let Some((u, enumeration)) = quartic::verify_quartic(&mut ctx, &checked, &c.primes, t, qp)? {
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
    // ---- the descent over Q[X]/(f) ----
    if let Some(ar) = &c.algebra {
        if let Some((u, trust)) = algebra::verify_algebra(&mut ctx, &checked, c, t, ar)? {
            keep_upper(u, UpperBoundBasis::AlgebraSelmer, &mut upper);
            if upper.is_some_and(|b| b.1 == UpperBoundBasis::AlgebraSelmer) {
                for s in trust {
                    ctx.trust(s);
                }
            }
        }
        theorems.push("the map X - theta sends E(Q)/2E(Q) into the square-norm classes of Q[X]/(f) unramified outside 2 and the primes of disc(f), and the image of E(Q_v) has dimension dim E(Q_v)[2] + [v = 2] - [v real] (Cassels, Lectures on Elliptic Curves, ch. 15; Schaefer-Stoll 2004; Silverman AEC X.1)".to_string());
    }
    // ---- the analytic part ----
    let mut analytic_rank = None;
    if let Some(a) = &c.analytic {
        let r = analytic::verify_analytic(c, a)?;
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

