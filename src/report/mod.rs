//! The rank report: bounds, proven rank, points, Selmer data, Sha suspects,
//! local data, with a readable `Display` and a JSON rendering.

mod json;
mod evidence;
#[cfg(feature = "serde")]
mod serde_forms;

pub use json::error_json;
pub use evidence::{Evidence, Standing, Statement, EVIDENCE_MAX_CONDUCTOR};

use crate::curve::{Curve, Point};
use crate::local::LocalData;
use malachite::Integer;
use std::fmt;
use std::time::Duration;

/// Which descent routes ran.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub enum Route {
    /// Descent through a rational 2-isogeny only.
    Isogeny,
    /// Full 2-descent through quartic 2-coverings only.
    Quartic,
    /// Both routes, tightest bounds kept.
    IsogenyAndQuartic,
    /// No descent ran (for instance no rational 2-torsion before the quartic route exists).
    None,
}

impl Route {
    /// The short name used in reports.
    pub fn name(&self) -> &'static str {
        match self {
            Route::Isogeny => "2-isogeny",
            Route::Quartic => "quartic",
            Route::IsogenyAndQuartic => "2-isogeny+quartic",
            Route::None => "none",
        }
    }
}

/// A route that proved the rank.
///
/// ```
/// use twofold::report::ProofRoute;
/// assert_eq!(ProofRoute::Descent.name(), "descent");
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum ProofRoute {
    /// The lower and upper bounds of the 2-descent meet.
    Descent,
    /// The analytic rank is 0 or 1, proven by an enclosure of L(E,1) or
    /// L'(E,1) that excludes zero and the proven root number; the rank then
    /// equals it and Sha is finite (Gross-Zagier 1986, Kolyvagin 1988-1990,
    /// with the modularity of elliptic curves over Q: Wiles 1995,
    /// Taylor-Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001).
    Analytic,
}

impl ProofRoute {
    /// The short name used in reports and JSON.
    pub fn name(&self) -> &'static str {
        match self {
            ProofRoute::Descent => "descent",
            ProofRoute::Analytic => "analytic",
        }
    }
}

/// What the analytic route proved (see [`crate::lproof`]).
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct AnalyticProof {
    /// The global root number, proven by the functional-equation test in
    /// interval arithmetic (given modularity); `None` when the test did not
    /// separate the signs within the budget.
    pub root_number: Option<i8>,
    /// The enclosure of `L(E,1)` (root number +1) or `L'(E,1)` (root
    /// number -1), when computed.
    pub value: Option<crate::lproof::ProvenLValue>,
    /// The rank this proves: 0 or 1 when the enclosure excludes zero.
    pub rank: Option<usize>,
}

/// An everywhere locally soluble 2-covering with no rational point found:
/// a place where a non-trivial element of Sha could hide, or, once the rank
/// is proven and the covering lies outside the image of E(Q), a proven
/// non-trivial element of Sha\[2\] (`in_sha`).
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct ShaSuspect {
    /// Which route and which side produced it, e.g. `"2-isogeny T=(0, 0), E'"`.
    pub origin: String,
    /// The quartic `g` of the covering `y^2 = g(x, z)`, coefficients of
    /// `x^4, x^3 z, x^2 z^2, x z^3, z^4`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub quartic: [Integer; 5],
    /// The Selmer class, as a square-free integer `d` (isogeny route).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub class: Option<Integer>,
    /// The search height that found no point.
    pub searched_height: u64,
    /// Proven to represent a non-trivial element of Sha (the rank is proven
    /// and the Selmer classes outside the image of E(Q) are exactly these).
    pub in_sha: bool,
}

/// Everything twofold proved about one curve.
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// // y^2 = x^3 - 25x: n = 5 is a congruent number, rank 1 (OEIS A003273)
/// let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// assert_eq!(r.rank(), Some(1));
/// for p in &r.points { assert!(e.contains(p)); }
/// ```
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct RankReport {
    /// The curve as given.
    pub input: Curve,
    /// The global minimal model in reduced form.
    pub minimal: Curve,
    /// The conductor.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub conductor: Integer,
    /// Local data at every bad prime.
    pub local: Vec<LocalData>,
    /// Invariant factors of E(Q)_tors (empty for the trivial group).
    pub torsion: Vec<u32>,
    /// Torsion points on the input model.
    pub torsion_points: Vec<Point>,
    /// Whether `torsion` and `torsion_points` are the whole torsion
    /// subgroup. `false` only when the budget ran out during the torsion
    /// step: then `torsion` is empty, every later stage (which rests on the
    /// torsion) was skipped, no rank bound is given, `budget_exhausted` is
    /// set and an unfinished statement in `evidence` says what was known
    /// (the bound on the order). The JSON form then has `"torsion": null`.
    #[cfg_attr(feature = "serde", serde(default = "crate::report::known_by_default"))]
    pub torsion_known: bool,
    /// Proven lower bound for the rank (by any route).
    pub rank_lower: Option<usize>,
    /// Proven upper bound for the rank (by any route).
    pub rank_upper: Option<usize>,
    /// The bounds the 2-descent proved on its own (independent points found;
    /// Selmer groups), before any other route.
    pub descent_bounds: (Option<usize>, Option<usize>),
    /// The routes that proved the rank (empty while it is open); when two
    /// routes ran they agreed, or the analysis stopped with an internal
    /// error.
    pub rank_proven_by: Vec<ProofRoute>,
    /// The analytic route, when it ran: the proven root number (if the
    /// functional-equation test separated the signs), the enclosure of
    /// `L(E,1)` or `L'(E,1)`, and the rank it proves (0 or 1) when the
    /// enclosure excludes zero.
    pub analytic: Option<AnalyticProof>,
    /// The root number stage as it ran once for this report (local
    /// formulas, the twist transfer or the functional-equation test: see
    /// [`crate::rootno::root_number_of`]), with the local root numbers and
    /// the conductor: set when the evidence or the certificate was asked
    /// for and the stage finished. The evidence states it and the
    /// certificate records its local factors from here. The global sign
    /// settled over every route (2-Selmer parity included) is
    /// [`Evidence::root_number`].
    #[cfg_attr(feature = "serde", serde(default))]
    pub root_number: Option<crate::rootno::RootNumber>,
    /// The proven dimension over F2 of Sha(E)\[2\] (its order is
    /// `2^sha2_dim`): `dim Sel^2(E) - rank - dim E(Q)[2]`, known once the rank
    /// is proven and Sel^2(E) computed.
    pub sha2_dim: Option<usize>,
    /// For each 2-isogeny `φ: E → E'` of `isogeny_runs` (same order), the
    /// proven dimensions over F2 of `Sha(E)[φ]` and `Sha(E')[φ']`, known
    /// once the rank is proven and the points found fill both descent
    /// images; empty otherwise.
    pub isogeny_sha_dims: Vec<(usize, usize)>,
    /// Routes that ran.
    pub route: Route,
    /// Selmer dimensions (dim over E of divisors of b, dim over E' of divisors of b') of
    /// the isogeny route that gave the best upper bound.
    pub isogeny_selmer_dims: Option<(usize, usize)>,
    /// Points of infinite order on the input model, independent modulo torsion.
    pub points: Vec<Point>,
    /// Why the points are independent.
    pub independence: String,
    /// Coverings where Sha could hide.
    pub sha_suspects: Vec<ShaSuspect>,
    /// dim Sel^2(E) over F2 (including the image of E(Q)\[2\]), from the full 2-descent.
    pub two_selmer_dim: Option<usize>,
    /// Every 2-isogeny descent that ran (one per rational 2-torsion point),
    /// with its Selmer groups, local images and witnesses.
    pub isogeny_runs: Vec<crate::descent::isogeny::IsogenyDescent>,
    /// The full 2-descent, when it ran (on the curve of `descent_curve` when
    /// that is set; its points are then already carried to the minimal model).
    pub full_descent: Option<crate::descent::full::FullDescent>,
    /// The descent over the algebra `Q[X]/(f)`, when it ran (today on curves
    /// with a rational point of order 2): `Sel^2(E)` with its local images.
    pub algebra_descent: Option<crate::descent::algebra::AlgebraDescent>,
    /// When the quartic descent ran on a curve isogenous to this one by an
    /// isogeny of odd degree (a smaller `c4` makes the enumeration cheaper):
    /// that curve (minimal, reduced) and the degree. Sel^2, `E(Q)[2]` and the
    /// rank are the same for both curves.
    pub descent_curve: Option<(Curve, u64)>,
    /// Root number, heights, saturation, periods, L-values and the Birch and
    /// Swinnerton-Dyer quotient, each statement with its standing; `None`
    /// when [`crate::RankOptions::evidence`] is off or the budget ran out.
    pub evidence: Option<Evidence>,
    /// The certificate of the rank proof in its text form
    /// ([`crate::certificate::Certificate::to_text`]; read it back with
    /// `Certificate::from_text` and re-check it with
    /// [`crate::certificate::verify`]), when [`crate::RankOptions::certificate`]
    /// is set.
    pub certificate: Option<String>,
    /// The change of model from the input model to the minimal one.
    pub change: crate::ModelChange,
    /// Whether the budget ran out before the computation finished.
    pub budget_exhausted: bool,
    /// Wall-clock time spent.
    pub elapsed: Duration,
}

/// The serde default of [`RankReport::torsion_known`] (reports written
/// before the field existed had the whole torsion subgroup).
#[cfg(feature = "serde")]
pub(crate) fn known_by_default() -> bool {
    true
}

impl RankReport {
    /// Which descent gave `two_selmer_dim`: `"quartic"` (the enumeration of
    /// quartic 2-coverings), `"algebra"` (the descent over `Q[X]/(f)`),
    /// `"quartic+algebra"` (both, and they agree), or `None` (an algebra
    /// descent conditional on GRH gives no proven `Sel^2`).
    pub fn two_selmer_route(&self) -> Option<&'static str> {
        let quartic = self.full_descent.as_ref().is_some_and(|f| f.selmer_dim.is_some());
        match (quartic, self.algebra_descent.as_ref().is_some_and(|a| !a.conditional_on_grh)) {
            (true, true) => Some("quartic+algebra"),
            (true, false) => Some("quartic"),
            (false, true) => Some("algebra"),
            (false, false) => None,
        }
    }
    /// The rank, when the bounds meet.
    pub fn rank(&self) -> Option<usize> {
        match (self.rank_lower, self.rank_upper) {
            (Some(l), Some(u)) if l == u => Some(l),
            _ => None,
        }
    }

    /// Renders the report as one line of JSON (see README.md for the fields).
    pub fn to_json(&self, input_text: &str) -> String {
        json::report_json(self, input_text)
    }
}

impl fmt::Display for RankReport {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(f, "E: {}", self.input)?;
        if self.minimal == self.input {
            writeln!(f, "  the input model is globally minimal")?;
        } else {
            writeln!(f, "  globally minimal model: {}", self.minimal)?;
        }
        writeln!(f, "  conductor N = {}", self.conductor)?;
        for l in &self.local {
            writeln!(
                f,
                "    at p = {}: {}, {}, exponent {}, Tamagawa number {}",
                l.prime, l.kodaira, l.reduction, l.conductor_exponent, l.tamagawa
            )?;
        }
        let tors = if self.torsion.is_empty() {
            "trivial".to_string()
        } else {
            self.torsion.iter().map(|n| format!("Z/{n}")).collect::<Vec<_>>().join(" x ")
        };
        writeln!(f, "  E(Q)_tors = {tors}")?;
        let show = |b: Option<usize>| b.map(|x| x.to_string()).unwrap_or_else(|| "?".into());
        match self.rank() {
            Some(r) => {
                let by: Vec<&str> = self
                    .rank_proven_by
                    .iter()
                    .map(|p| match p {
                        ProofRoute::Descent => "the descent bounds meet",
                        ProofRoute::Analytic => "analytic rank proven (Gross-Zagier, Kolyvagin)",
                    })
                    .collect();
                writeln!(f, "  rank E(Q) = {r}, proven: {} (descent route: {})", by.join("; and "), self.route.name())?
            }
            None => writeln!(
                f,
                "  {} <= rank E(Q) <= {}, not proven (route: {})",
                show(self.rank_lower),
                show(self.rank_upper),
                self.route.name()
            )?,
        }
        if let Some(s) = self.two_selmer_dim {
            writeln!(f, "  dim Sel^2(E) = {s} (E(Q)[2] included; by {})", self.two_selmer_route().unwrap_or("?"))?;
            if let Some((c, d)) = &self.descent_curve {
                writeln!(f, "    (quartic descent run on the {d}-isogenous curve {c}, whose Sel^2 is isomorphic)")?;
            }
        }
        if let Some(d) = self.sha2_dim {
            writeln!(f, "  #Sha(E)[2] = {}, proven (dim Sel^2(E) - rank - dim E(Q)[2])", 1u64 << d.min(63))?;
        }
        for (d, e) in &self.isogeny_sha_dims {
            writeln!(f, "  2-isogeny E -> E': dim Sha(E)[phi] = {d}, dim Sha(E')[phi'] = {e}, proven")?;
        }
        if let Some((s, t)) = self.isogeny_selmer_dims {
            writeln!(f, "  2-isogeny Selmer groups of dimensions {s} and {t}")?;
        }
        if !self.points.is_empty() {
            let list: Vec<String> = self.points.iter().map(|p| p.to_string()).collect();
            writeln!(f, "  points found: {}", list.join(", "))?;
            writeln!(f, "    independent: {}", self.independence)?;
        }
        for s in &self.sha_suspects {
            let g = crate::quartic::Quartic::new(s.quartic.clone());
            if s.in_sha {
                writeln!(f, "  y^2 = {g} ({}) is a non-trivial element of Sha: everywhere locally soluble, proven to have no rational point", s.origin)?;
            } else {
                writeln!(
                    f,
                    "  Sha could hide in y^2 = {g} ({}): everywhere locally soluble, no point with height <= {}",
                    s.origin, s.searched_height
                )?;
            }
        }
        if let Some(ev) = &self.evidence {
            if let Some(g) = &ev.generators {
                if !g.is_empty() {
                    let list: Vec<String> = g.iter().map(|p| p.to_string()).collect();
                    writeln!(f, "  generators: {} (with the torsion, a basis of E(Q))", list.join(", "))?;
                }
            }
            writeln!(f, "  what is known, and on what it rests:")?;
            for st in &ev.statements {
                writeln!(f, "    {st}")?;
            }
        }
        if self.budget_exhausted {
            writeln!(f, "  the budget ran out: the bounds above are what was proven before it did")?;
        }
        write!(f, "  ({} ms)", self.elapsed.as_millis())
    }
}
