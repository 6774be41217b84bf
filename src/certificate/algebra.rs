//! The record of the descent over the algebra `A = Q[X]/(f)`
//! (`f(X) = X^3 + b2 X^2 + 8 b4 X + 16 b6` of the minimal model, `X = 4x`;
//! see [`crate::descent::algebra`]): the candidate basis and the Selmer
//! basis as explicit elements of `A`, the local points whose images span
//! each local image, and the number-field data (discriminant, the bound up
//! to which prime ideals were shown to lie in the factor base's class
//! subgroup, whether that bound is Bach's and so rests on GRH).
//!
//! Also the exact arithmetic of `A` that the builder and the verifier
//! share: products and the characteristic polynomial of the
//! multiplication map.

use super::verify::place_name;
use crate::error::Error;
use crate::descent::algebra::AlgebraShape;
use crate::report::RankReport;
use crate::solubility::Place;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::fmt::Write;
use std::str::FromStr;

/// An element `a0 + a1 X + a2 X^2` of `A = Q[X]/(f)`.
pub type AlgebraElement = [Rational; 3];

/// One candidate basis element: the element and the primes outside `S`
/// that divide its norm (where the verifier checks that its valuations
/// are even).
///
/// ```
/// use malachite::Rational;
/// use twofold::certificate::AlgebraCandidate;
/// let c = AlgebraCandidate { element: [Rational::from(-1), Rational::from(0), Rational::from(0)], outside: vec![] };
/// assert!(c.outside.is_empty());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct AlgebraCandidate {
    /// The element of `A`.
    pub element: AlgebraElement,
    /// The primes not in `S` dividing the norm's numerator or denominator.
    pub outside: Vec<Natural>,
}

/// The local image at one place: its dimension and the `X`-coordinates of
/// rational points of `Y^2 = f(X)` over `Q_v` whose images, with those of
/// the rational points of order 2, span it.
///
/// ```
/// use twofold::certificate::AlgebraLocal;
/// use twofold::solubility::Place;
/// let l = AlgebraLocal { place: Place::Real, dim: 0, witnesses: vec![] };
/// assert_eq!(l.dim, 0);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct AlgebraLocal {
    /// The place.
    pub place: Place,
    /// The claimed dimension of the image of `E(Q_v)/2E(Q_v)`.
    pub dim: usize,
    /// `X` with `f(X)` a non-zero square in `Q_v`.
    pub witnesses: Vec<Rational>,
}

/// The record of the descent over `Q[X]/(f)` (see the module documentation).
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// use twofold::certificate::{verify, Certificate};
/// // y^2 = x^3 - 36x: rank 1, Sel^2 of dimension 3 (the congruent number 6; published table, Cremona 1997)
/// let e = Curve::from_coefficients([0, 0, 0, -36, 0]).unwrap();
/// let cert = Certificate::from_report(&analyse(&e, &RankOptions::default()).unwrap()).unwrap();
/// let a = cert.algebra.as_ref().unwrap();
/// assert_eq!((a.selmer_dim, a.two_torsion_dim), (3, 2));
/// assert_eq!(verify(&cert).unwrap().rank(), Some(1));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct AlgebraRecord {
    /// How `A` splits.
    pub shape: AlgebraShape,
    /// `[c0, c1, c2]` of `f(X) = X^3 + c2 X^2 + c1 X + c0`.
    pub cubic: [Integer; 3],
    /// The finite primes of `S`.
    pub primes: Vec<Natural>,
    /// A basis of the candidate group (see
    /// [`crate::descent::algebra::AlgebraDescent::candidates`]).
    pub candidates: Vec<AlgebraCandidate>,
    /// The basis of `Sel^2(E)`: a bit mask over the candidates and the
    /// product it stands for.
    pub selmer: Vec<(u64, AlgebraElement)>,
    /// The claimed `dim Sel^2(E)`.
    pub selmer_dim: usize,
    /// The claimed `dim E(Q)[2]`.
    pub two_torsion_dim: usize,
    /// The local images at the real place and at every prime of `S`.
    pub local: Vec<AlgebraLocal>,
    /// The discriminant of the number field behind the candidates.
    pub field_discriminant: Option<Integer>,
    /// The bound up to which prime ideals were shown to lie in the factor
    /// base's class subgroup.
    pub generation_bound: Option<u64>,
    /// Whether that bound is Bach's (the candidates then rest on GRH).
    pub conditional_on_grh: bool,
}

/// `x y` in `A = Q[X]/(f)`, `f = X^3 + c2 X^2 + c1 X + c0`.
pub(crate) fn times(f: &[Integer; 3], x: &AlgebraElement, y: &AlgebraElement) -> AlgebraElement {
    let mut p = vec![Rational::ZERO; 5];
    for i in 0..3 {
        for j in 0..3 {
            p[i + j] += &x[i] * &y[j];
        }
    }
    // X^k = -(c2 X^(k-1) + c1 X^(k-2) + c0 X^(k-3)) for k = 4, 3
    for k in [4usize, 3] {
        let top = std::mem::replace(&mut p[k], Rational::ZERO);
        if top != 0u32 {
            for (s, c) in f.iter().enumerate() {
                p[k - 3 + s] -= &top * Rational::from(c.clone());
            }
        }
    }
    [p[0].clone(), p[1].clone(), p[2].clone()]
}

/// `(e1, e2, e3)`: the trace, the second symmetric function and the norm of
/// `x` (the characteristic polynomial is `Z^3 - e1 Z^2 + e2 Z - e3`), from
/// the matrix of multiplication by `x` on `1, X, X^2`.
pub(crate) fn symmetric(f: &[Integer; 3], x: &AlgebraElement) -> [Rational; 3] {
    let one = Rational::ONE;
    let z = Rational::ZERO;
    let cols = [
        x.clone(),
        times(f, x, &[z.clone(), one.clone(), z.clone()]),
        times(f, x, &[z.clone(), z, one]),
    ];
    let m = |i: usize, j: usize| &cols[j][i];
    let trace = m(0, 0) + m(1, 1) + m(2, 2);
    let minor = |a: usize, b: usize| m(a, a) * m(b, b) - m(a, b) * m(b, a);
    let e2 = minor(0, 1) + minor(0, 2) + minor(1, 2);
    let det = m(0, 0) * (m(1, 1) * m(2, 2) - m(1, 2) * m(2, 1)) - m(0, 1) * (m(1, 0) * m(2, 2) - m(1, 2) * m(2, 0))
        + m(0, 2) * (m(1, 0) * m(2, 1) - m(1, 1) * m(2, 0));
    [trace, e2, det]
}

/// The product of the candidates in `mask`.
pub(crate) fn product_of(f: &[Integer; 3], candidates: &[AlgebraElement], mask: u64) -> AlgebraElement {
    let one = [Rational::ONE, Rational::ZERO, Rational::ZERO];
    candidates.iter().enumerate().filter(|(j, _)| mask >> j & 1 == 1).fold(one, |acc, (_, c)| times(f, &acc, c))
}

/// The algebra record of a report whose algebra route ran (`None`
/// otherwise): read from the report, except the primes outside `S` of each
/// candidate's norm (factored here; the norms are products of factor-base
/// primes).
pub(crate) fn algebra_record(report: &RankReport) -> Result<Option<AlgebraRecord>, Error> {
    let Some(a) = &report.algebra_descent else { return Ok(None) };
    let mut candidates = Vec::with_capacity(a.candidates.len());
    for c in &a.candidates {
        let norm = symmetric(&a.cubic, c)[2].clone();
        let mut outside = Vec::new();
        for part in [norm.to_numerator(), norm.to_denominator()] {
            if part == 1u32 {
                continue;
            }
            let fac = crate::arith::factor(&Integer::from(part), &crate::arith::FactorLimits::default())?;
            for (p, _) in fac.factors() {
                if !a.primes.contains(p) && !outside.contains(p) {
                    outside.push(p.clone());
                }
            }
        }
        outside.sort();
        candidates.push(AlgebraCandidate { element: c.clone(), outside });
    }
    let elements: Vec<AlgebraElement> = a.candidates.clone();
    let selmer = a.selmer_masks.iter().map(|&m| (m, product_of(&a.cubic, &elements, m))).collect();
    Ok(Some(AlgebraRecord {
        shape: a.shape,
        cubic: a.cubic.clone(),
        primes: a.primes.clone(),
        candidates,
        selmer,
        selmer_dim: a.selmer_dim,
        two_torsion_dim: a.two_torsion_dim,
        local: a.local_images.iter().map(|l| AlgebraLocal { place: l.place.clone(), dim: l.dim, witnesses: l.witnesses.clone() }).collect(),
        field_discriminant: a.field_discriminant.clone(),
        generation_bound: a.generation_bound,
        conditional_on_grh: a.conditional_on_grh,
    }))
}

fn shape_name(s: AlgebraShape) -> &'static str {
    match s {
        AlgebraShape::ThreeRational => "rational3",
        AlgebraShape::RationalTimesQuadratic => "rational-quadratic",
        AlgebraShape::Cubic => "cubic",
    }
}

fn words<T: ToString>(xs: &[T]) -> String {
    xs.iter().map(|x| x.to_string()).collect::<Vec<_>>().join(" ")
}

/// The text lines of the record (see [`super::Certificate::to_text`]):
///
/// ```text
/// algebra shape c0 c1 c2 selmer_dim two_torsion_dim grh field_disc bound
///   alg_s p1 p2 ...
///   alg_cand a0 a1 a2 q1 q2 ...      (q: primes outside S of the norm)
///   alg_sel mask a0 a1 a2
///   alg_local place dim X1 X2 ...
/// ```
pub(super) fn write_lines(out: &mut String, a: &AlgebraRecord) {
    let opt = |x: Option<String>| x.unwrap_or_else(|| "-".to_string());
    let _ = writeln!(
        out,
        "algebra {} {} {} {} {} {}",
        shape_name(a.shape),
        words(&a.cubic),
        a.selmer_dim,
        a.two_torsion_dim,
        u8::from(a.conditional_on_grh),
        format_args!("{} {}", opt(a.field_discriminant.as_ref().map(|d| d.to_string())), opt(a.generation_bound.map(|b| b.to_string())))
    );
    let _ = writeln!(out, "alg_s {}", words(&a.primes));
    for c in &a.candidates {
        let _ = writeln!(out, "alg_cand {} {}", words(&c.element), words(&c.outside));
    }
    for (m, e) in &a.selmer {
        let _ = writeln!(out, "alg_sel {m} {}", words(e));
    }
    for l in &a.local {
        let _ = writeln!(out, "alg_local {} {} {}", place_name(&l.place), l.dim, words(&l.witnesses));
    }
}

fn read<T: FromStr>(s: &str) -> Result<T, String> {
    T::from_str(s).map_err(|_| format!("cannot read the number {s:?}"))
}

fn three(f: &[&str]) -> Result<AlgebraElement, String> {
    if f.len() < 3 {
        return Err("expected three rationals".into());
    }
    Ok([read(f[0])?, read(f[1])?, read(f[2])?])
}

/// Whether `head` names a line of the algebra record.
pub(super) fn is_algebra_line(head: &str) -> bool {
    matches!(head, "algebra" | "alg_s" | "alg_cand" | "alg_sel" | "alg_local")
}

/// Reads one line of the record (`head` and its fields).
pub(super) fn read_line(rec: &mut Option<AlgebraRecord>, head: &str, f: &[&str]) -> Result<(), String> {
    if head == "algebra" {
        if rec.is_some() {
            return Err("a second algebra record".into());
        }
        if f.len() != 9 {
            return Err(format!("expected 9 fields, found {}", f.len()));
        }
        let shape = match f[0] {
            "rational3" => AlgebraShape::ThreeRational,
            "rational-quadratic" => AlgebraShape::RationalTimesQuadratic,
            "cubic" => AlgebraShape::Cubic,
            other => return Err(format!("unknown algebra shape {other:?}")),
        };
        let opt_int = |s: &str| if s == "-" { Ok(None) } else { read::<Integer>(s).map(Some) };
        let opt_u64 = |s: &str| if s == "-" { Ok(None) } else { read::<u64>(s).map(Some) };
        *rec = Some(AlgebraRecord {
            shape,
            cubic: [read(f[1])?, read(f[2])?, read(f[3])?],
            primes: vec![],
            candidates: vec![],
            selmer: vec![],
            selmer_dim: read(f[4])?,
            two_torsion_dim: read(f[5])?,
            local: vec![],
            conditional_on_grh: match f[6] {
                "0" => false,
                "1" => true,
                _ => return Err("the GRH flag is 0 or 1".into()),
            },
            field_discriminant: opt_int(f[7])?,
            generation_bound: opt_u64(f[8])?,
        });
        return Ok(());
    }
    let r = rec.as_mut().ok_or_else(|| format!("a {head} line outside the algebra record"))?;
    match head {
        "alg_s" => r.primes = f.iter().map(|s| read(s)).collect::<Result<_, _>>()?,
        "alg_cand" => r.candidates.push(AlgebraCandidate {
            element: three(f)?,
            outside: f[3..].iter().map(|s| read(s)).collect::<Result<_, _>>()?,
        }),
        "alg_sel" => {
            if f.len() != 4 {
                return Err("expected a mask and three rationals".into());
            }
            r.selmer.push((read(f[0])?, three(&f[1..])?));
        }
        "alg_local" => {
            if f.len() < 2 {
                return Err("expected a place and a dimension".into());
            }
            let place = if f[0] == "R" { Place::Real } else { Place::Prime(read(f[0])?) };
            r.local.push(AlgebraLocal { place, dim: read(f[1])?, witnesses: f[2..].iter().map(|s| read(s)).collect::<Result<_, _>>()? });
        }
        other => return Err(format!("unknown record {other:?}")),
    }
    Ok(())
}
