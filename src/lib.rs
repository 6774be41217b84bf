//! twofold: Mordell-Weil ranks of elliptic curves over Q by 2-descent, with
//! proofs where possible and an honest account of what stays open.
//!
//! # From a curve to a proven rank
//!
//! ```
//! use twofold::{analyse, Curve, RankOptions};
//! // y^2 + y = x^3 - 7x + 6, conductor 5077: rank 3 (Cremona 1997, Table 1 lists it)
//! let e = Curve::parse("y^2 + y = x^3 - 7*x + 6").unwrap();
//! let r = analyse(&e, &RankOptions::default()).unwrap();
//! assert_eq!(r.conductor.to_string(), "5077");
//! assert_eq!((r.rank_lower, r.rank_upper), (Some(3), Some(3)));
//! assert_eq!(r.rank(), Some(3)); // proven: the bounds meet
//! assert!(r.points.iter().all(|p| e.contains(p))); // three independent points, checked exactly
//! println!("{r}");
//! ```
//!
//! When the bounds do not meet, [`RankReport::rank`] is `None` and
//! [`RankReport::sha_suspects`] lists the everywhere locally soluble
//! coverings where no point was found: the places where Sha could hide.
//! Many curves at once go through [`batch::analyse_batch`], which keeps the
//! input order and runs on every core.
//!
//! # The main types
//!
//! - [`Curve`]: an integral Weierstrass model with its invariants; built from
//!   a-invariants ([`Curve::from_coefficients`]) or text ([`Curve::parse`],
//!   [`Curve::parse_scaled`] for rational models). [`Point`] is a rational
//!   point with the group law on the curve; [`ModelChange`] a change of model.
//! - [`RankOptions`] (in [`budget`]): search heights (a first height and the
//!   ceiling the adaptive search may raise it to), a per-curve time limit, a
//!   cancellation flag, a progress callback and the enumeration cap.
//!   [`analyse`] turns them into one [`Work`] (deadline, cancel flag,
//!   progress) that every stage receives.
//! - [`CurveData`]: the curve with its global minimal model, the change to
//!   it, the bad primes, the local data at each and the conductor, built
//!   once ([`analyse_data`] takes one you built yourself, e.g. with
//!   [`CurveData::with_known_primes`] for a discriminant too hard to factor).
//! - [`analyse`] returns a [`RankReport`]: minimal model, conductor, local
//!   data ([`local::LocalData`], with its [`local::Kodaira`] symbol), torsion,
//!   proven rank bounds and the routes that proved the rank
//!   ([`report::ProofRoute`]), the proven order of Sha\[2\] when the rank
//!   and Sel^2 are known, independent points on the input model, the
//!   [`Route`] taken, Selmer dimensions, the isogeny descents
//!   ([`descent::isogeny::IsogenyDescent`]) and the full 2-descent
//!   ([`descent::full::FullDescent`]) with their local witnesses, and the
//!   [`ShaSuspect`]s. Its [`RankReport::evidence`] ([`report::Evidence`])
//!   adds the root number, a saturated basis with heights and regulator,
//!   the real period, Tamagawa numbers, the analytic rank and the analytic
//!   order of Sha, each statement tagged [`report::Standing`] (proven,
//!   conditional on what, or numerical). It prints readably (`Display`) and
//!   as one JSON line ([`RankReport::to_json`]).
//! - [`certificate`]: the record of a rank proof built from a report, its
//!   text form, and [`certificate::verify`], an independent exact re-check.
//! - [`isogeny`]: rational isogenies of odd prime degree and the odd part of
//!   the isogeny class (the quartic descent runs on the member with the
//!   smallest `c4`); [`heights`]: periods, canonical heights, regulators,
//!   LLL and saturation; [`lseries`]: `L^(k)(E,1)`, analytic rank and the
//!   Birch and Swinnerton-Dyer quotient (f64, hand-derived error bounds);
//!   [`lproof`]: `L(E,1)`, `L'(E,1)` and the root number proven in interval
//!   arithmetic ([`enclosure`]) up to conductor `10^13`, the analytic route
//!   to a proven rank 0 or 1.
//! - [`batch`]: [`analyse_batch`] over an iterator of curves or text lines
//!   ([`CurveInput`]), with [`BatchOptions`] (threads, observer), giving a
//!   [`BatchOutcome`] of [`batch::BatchItem`]s and a [`batch::BatchSummary`].
//! - Building blocks, usable on their own: [`arith`] (word arithmetic,
//!   factorisation, Hilbert symbols), [`torsion`], [`solubility`] (local
//!   solubility with witnesses), [`search`] (sieved point search),
//!   [`quartic`] (binary quartics and 2-coverings), [`rootno`] (root numbers),
//!   [`numfield`] (quadratic and cubic fields: maximal orders, ideals, class
//!   groups, units and the groups `K(S,2)` for the descent over `Q[x]/(f)`).
//! - [`Error`] with its [`ErrorKind`]: every failure is one of these.
//!
//! # Cargo features
//!
//! - `parallel` (default): batch runs on several threads (std scoped
//!   threads; no extra dependency). Without it batches run on the calling
//!   thread; results are the same either way.
//! - `serde`: `Serialize`/`Deserialize` for every result type, integers and
//!   rationals as decimal strings (schema in `docs/schema.md`; helpers in
//!   `decimal_serde`).
//!
//! # Performance
//!
//! Curves of small conductor take well under a millisecond to a few hundred
//! milliseconds each (the 572 curves of conductor up to 162 take 4 to 7 s
//! of CPU in all, depending on the machine's load). The costs that grow are factoring the discriminant (SIQS
//! beyond 40 digits or so) and the quartic enumeration of the full
//! 2-descent, about `|c4|^(3/2)` (run on the odd-isogenous curve with the
//! smallest `c4`); it stops at [`RankOptions::max_quartic_candidates`] (a
//! search estimated beyond it is refused at once) and the report then has
//! no quartic upper bound. The evidence costs little at small conductor (an
//! L-series at conductor 10^7 takes about 60 ms); turn it off with
//! [`RankOptions::evidence`] for the fastest sweeps. Batches scale with the
//! cores (1.92x on two, see README.md).
//!
//! # Budgets and cancellation
//!
//! [`RankOptions::time_limit`] bounds the wall-clock time of one curve and
//! [`RankOptions::cancel`] stops it from another thread. Either way the
//! report keeps what was proven before (`budget_exhausted` is set; a rank is
//! never called proven unless the bounds meet), or, if the discriminant
//! could not be factored in time, the result is an error of kind
//! [`ErrorKind::FactorBudget`]. In a batch the time limit applies per curve
//! and the cancel flag to the whole batch.
//!
//! # Untrusted input
//!
//! Text input is bounded ([`curve::MAX_INPUT_LEN`]) and parsed without
//! panics; bad input is an [`Error`] ([`ErrorKind::Parse`],
//! [`ErrorKind::Singular`], [`ErrorKind::TooLarge`]). Huge coefficients make
//! factoring and the enumeration expensive, not wrong: give untrusted
//! curves a time limit. Every reported point is verified exactly on the
//! input model, and internal consistency failures are errors, not answers.
//! Deserialised reports (feature `serde`) are data, not proofs: the curve
//! models are re-checked for a non-zero discriminant, nothing else is.
#![forbid(unsafe_code)]
#![deny(missing_docs)]

pub mod arith;
pub mod batch;
pub mod budget;
pub mod certificate;
pub mod curve;
#[cfg(feature = "serde")]
pub(crate) mod decimal_serde;
pub mod descent;
pub mod enclosure;
pub mod heegner;
pub mod heights;
pub mod isogeny;
pub mod local;
pub mod lproof;
pub mod lseries;
pub mod numfield;
mod pipeline;
pub mod quartic;
pub mod report;
pub mod rootno;
pub mod search;
pub mod solubility;
pub mod torsion;
mod error;

pub use batch::{analyse_batch, BatchOptions, BatchOutcome, CurveInput};
pub use budget::{RankOptions, Stage, Work};
pub use curve::{Curve, ModelChange, Point};
pub use error::{Error, ErrorKind};
pub use local::CurveData;
pub use pipeline::{analyse, analyse_data};
pub use report::{RankReport, Route, ShaSuspect};
