//! What a report says beyond the rank bounds, with the standing of each
//! statement: the root number and parity, a Mordell-Weil basis with heights
//! and its saturation, the real period, Tamagawa numbers, the analytic rank
//! and the analytic order of Sha from the Birch and Swinnerton-Dyer formula.

use crate::curve::Point;
use crate::heights::Saturation;
use malachite::Natural;

/// How far a statement in a report is established.
///
/// ```
/// use twofold::report::Standing;
/// let s = Standing::Conditional("the Birch and Swinnerton-Dyer conjecture".into());
/// assert_eq!(s.label(), "conditional");
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum Standing {
    /// Proven: exact computation resting only on theorems.
    Proven,
    /// True if the named conjecture or hypothesis holds.
    Conditional(String),
    /// A floating-point value or a numerical observation, without a proven
    /// error bound (the text says how it was checked).
    Numerical,
    /// Not a claim about the curve: a stage that did not finish (its budget
    /// ran out, the input was too large for it, or it failed), and why.
    Unfinished,
}

impl Standing {
    /// `"proven"`, `"conditional"`, `"numerical"` or `"unfinished"`.
    pub fn label(&self) -> &'static str {
        match self {
            Standing::Proven => "proven",
            Standing::Conditional(_) => "conditional",
            Standing::Numerical => "numerical",
            Standing::Unfinished => "unfinished",
        }
    }
}

/// One statement of a report and its standing.
///
/// ```
/// use twofold::{analyse, Curve, RankOptions, Standing};
/// // y^2 = x^3 - x: rank 0, torsion Z/2 x Z/2
/// let e = Curve::from_coefficients([0, 0, 0, -1, 0]).unwrap();
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// let ev = r.evidence.as_ref().unwrap();
/// for s in &ev.statements {
///     // each statement prints as "[standing] claim"
///     assert!(s.to_string().starts_with('[') && s.to_string().ends_with(s.claim.as_str()));
/// }
/// assert!(ev.statements.iter().any(|s| s.standing == Standing::Proven));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct Statement {
    /// The statement, in words.
    pub claim: String,
    /// Its standing.
    pub standing: Standing,
}

impl std::fmt::Display for Statement {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match &self.standing {
            Standing::Conditional(on) => write!(f, "[conditional on {on}] {}", self.claim),
            s => write!(f, "[{}] {}", s.label(), self.claim),
        }
    }
}

/// The arithmetic beyond the rank bounds (see the module documentation).
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// // y^2 + y = x^3 - x (published tables, Cremona 1997): rank 1, generator (0, 0), regulator 0.0511114082 (from memory)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// let ev = r.evidence.as_ref().unwrap();
/// assert_eq!(ev.root_number, Some(-1));
/// assert!((ev.regulator.unwrap() - 0.0511114082).abs() < 1e-8);
/// assert_eq!(ev.generators.as_ref().unwrap().len(), 1);
/// ```
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct Evidence {
    /// The global root number w(E).
    pub root_number: Option<i8>,
    /// A basis of E(Q) modulo torsion on the input model: set only when the
    /// rank is proven and the points are saturated at every prime up to the
    /// index bound (each prime proven by Siksek's test; the bound itself rests
    /// on floating-point heights with safety margins, see `statements`).
    pub generators: Option<Vec<Point>>,
    /// Independent points (input model), LLL-reduced and saturated as far as
    /// proven (see `saturation`); equal to `generators` when that is set.
    pub reduced_points: Vec<Point>,
    /// Canonical heights of `reduced_points` (numerical; the normalisation
    /// of `heights::MordellWeilBasis::NORMALISATION`).
    pub heights: Vec<f64>,
    /// The regulator of `reduced_points` (numerical; 1 for rank 0).
    pub regulator: Option<f64>,
    /// What is proven about the saturation of `reduced_points`.
    pub saturation: Option<Saturation>,
    /// The real period Omega of the minimal model, counted over the
    /// connected components of E(R) (numerical).
    pub real_period: Option<f64>,
    /// The Tamagawa number at each bad prime (proven: Tate's algorithm).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub tamagawa: Vec<(Natural, u32)>,
    /// The analytic rank (see `statements` for its standing).
    pub vanishing_order: Option<usize>,
    /// `L^(r)(E, 1) / r!` at the analytic rank r (numerical, with the error
    /// bound in `statements`).
    pub leading_value: Option<f64>,
    /// The analytic order of Sha from the Birch and Swinnerton-Dyer formula
    /// (conditional on it; numerical).
    pub sha_bsd_estimate: Option<f64>,
    /// Every statement with its standing.
    pub statements: Vec<Statement>,
}

/// Reports compute L-values up to this conductor (about 60 ms there; the
/// cost grows linearly with the conductor, so larger ones are left to
/// explicit calls of [`crate::lseries::analytic_rank`]).
///
/// ```
/// assert_eq!(twofold::report::EVIDENCE_MAX_CONDUCTOR, 10_000_000);
/// ```
pub const EVIDENCE_MAX_CONDUCTOR: u64 = 10_000_000;
