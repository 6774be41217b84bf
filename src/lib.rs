//! twofold: Mordell-Weil ranks of elliptic curves over Q by 2-descent, with
//! proofs where possible and an honest account of what stays open.
//!
//! Give it a curve; it returns proven lower and upper bounds for the rank,
//! independent points checked exactly on your model, and for every further
//! claim (root number, regulator, analytic rank, Sha) what it rests on.
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
//!
//! # What is where
//!
//! | you want | look at |
//! |---|---|
//! | the rank of one curve | [`analyse`] -> [`RankReport`] (bounds, [`RankReport::rank`], points, Selmer dimensions, [`ShaSuspect`]s, [`Evidence`]) |
//! | many curves, on every core | [`analyse_batch`], [`analyse_batch_with`], [`BatchOptions`] -> [`BatchItem`], [`BatchSummary`] |
//! | limits: heights, time, cancel, progress | [`RankOptions`] (builders `with_...`), turned into one [`Work`] per analysis |
//! | what went wrong | [`Error`] and its [`ErrorKind`]: bad input, budget, or an internal inconsistency |
//! | the curve and its local data, built once | [`Curve`], [`Point`], [`ModelChange`], [`CurveData`], [`LocalData`] ([`Kodaira`] symbol, Tamagawa number, [`Reduction`]); module [`local`] (Tate's algorithm, conductor, minimal models) |
//! | torsion | [`TorsionGroup`] ([`torsion`]) |
//! | the descents on their own | [`descent::isogeny`] ([`IsogenyDescent`]), [`descent::full`] ([`FullDescent`]), [`descent::algebra`]; binary quartics and 2-coverings in [`quartic`]; local solubility with witnesses in [`solubility`] |
//! | points | [`search`] (sieved search on coverings and on `E`), [`heegner`] (Heegner points for analytic rank one) |
//! | heights, regulator, saturation | [`heights`] (periods, canonical heights, LLL, `mordell_weil_basis`) |
//! | L-values and root numbers | [`lseries`] (f64 with error bounds, BSD quotient), [`lproof`] (proven by interval arithmetic, [`enclosure`]), [`rootno`] ([`RootNumber`]) |
//! | a proof someone else can check | [`Certificate`] and [`verify`] -> [`VerifiedClaims`] |
//! | odd isogenies | [`isogeny`] (the odd part of the isogeny class) |
//! | number fields | [`numfield`] (maximal orders, ideals, class groups, units, `K(S,2)`) |
//! | integers | [`arith`] (factorisation, primality, residue symbols, Hilbert symbols) |
//!
//! Everything else (enumeration kernels, sieves, scan loops, word-size
//! helpers, caches) is private to the crate.
//!
//! # The report in more detail
//!
//! - [`Curve`] is an integral Weierstrass model with its invariants, built
//!   from a-invariants ([`Curve::from_coefficients`]) or text
//!   ([`Curve::parse`], [`Curve::parse_scaled`] for rational models).
//! - [`CurveData`] is the curve with its global minimal model, the change to
//!   it, the bad primes, the local data at each and the conductor;
//!   [`analyse_data`] takes one you built yourself (e.g. with
//!   [`CurveData::with_known_primes`] for a discriminant too hard to factor).
//! - [`RankReport`] holds the minimal model, conductor, local data, torsion,
//!   proven rank bounds and the routes that proved the rank ([`ProofRoute`]),
//!   the proven order of Sha\[2\] when the rank and Sel^2 are known,
//!   independent points on the input model, the [`Route`] taken, Selmer
//!   dimensions, the isogeny descents and the full 2-descent with their
//!   local witnesses, and the Sha suspects. Its [`RankReport::evidence`]
//!   adds the root number, a saturated basis with heights and regulator, the
//!   real period, Tamagawa numbers, the analytic rank and the analytic order
//!   of Sha, each [`Statement`] tagged with its [`Standing`] (proven,
//!   conditional on what, or numerical). It prints readably (`Display`) and
//!   as one JSON line ([`RankReport::to_json`]).
//! - Result types are `#[non_exhaustive]`: read their fields, but they are
//!   built only by the crate, so new fields are not breaking changes.
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

// The entry points and the result types, flat at the root.
pub use batch::{analyse_batch, analyse_batch_with, analyse_text, BatchItem, BatchObserver, BatchOptions, BatchOutcome, BatchProgress, BatchSummary, CurveInput};
pub use budget::{RankOptions, Stage, Work};
pub use certificate::{verify, Certificate, CertificateError, VerifiedClaims};
pub use curve::{Curve, ModelChange, Point};
pub use descent::full::FullDescent;
pub use descent::isogeny::IsogenyDescent;
pub use error::{Error, ErrorKind};
pub use local::{CurveData, Kodaira, LocalData, Reduction};
pub use pipeline::{analyse, analyse_data};
pub use report::{AnalyticProof, Evidence, ProofRoute, RankReport, Route, ShaSuspect, Standing, Statement};
pub use rootno::RootNumber;
pub use heegner::{HeegnerOptions, HeegnerResult};
pub use quartic::Quartic;
pub use solubility::{LocalWitness, Place};
pub use torsion::TorsionGroup;
