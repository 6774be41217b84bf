//! The first descent by 3-isogeny on `E_k: y^2 = x^3 + k` (j = 0).
//!
//! `phi: E_k -> E_{-27k}`, `(x, y) -> ((x^3 + 4k)/x^2, y (x^3 - 8k)/x^3)`,
//! has kernel `{O, (0, +-sqrt k)}`; its dual `phi^: E_{-27k} -> E_k` is the
//! same formula on `E_{-27k}` followed by `(x, y) -> (x/9, y/27)` from
//! `E_{729k}`. Each side of the pair is a curve `y^2 = x^3 + m` with its
//! descent map (Cohen, *Number Theory* Vol. I, GTM 239, §8.4; Top,
//! *Descent by 3-isogeny and 3-rank of quadratic fields*, Math. Comp. 57
//! (1991); both from memory):
//!
//! `delta_m: (x, y) -> y + sqrt m  in  A_m* / A_m*^3,  A_m = Q[t]/(t^2 - m)`,
//!
//! `O -> 1`. On `E_k` its kernel is `phi^(E_{-27k}(Q))`, so its image is
//! `E_k(Q)/phi^(E_{-27k}(Q))` inside the Selmer group `Sel^phi^`; on
//! `E_{-27k}` the kernel is `phi(E_k(Q))` and the image lies in `Sel^phi`.
//! Since `(y + sqrt m)(y - sqrt m) = x^3`, the image has norm in `Q*^3`.
//!
//! **The set S.** For `P = (a/e^2, b/e^3)` the ideals `(b +- e^3 sqrt m)`
//! have product `(a)^3` and any common prime divides `2 b` and
//! `2 e^3 sqrt m`, so it lies above `2m` (it cannot divide both `b` and
//! `e`): outside the primes above `2m` every valuation of `y + sqrt m` is
//! 0 mod 3. `2` is needed when `2` does not divide `m` (on `y^2 = x^3 + 1`,
//! `(2, 3)` gives `y + 1 = 4`). At a prime `p` not dividing `6m` the curve
//! has good reduction and `p != 3`, so the local image is the unramified
//! part, which every element of `A(S,3)` meets (Schaefer and Stoll, *How to
//! do a p-descent on an elliptic curve*, Trans. AMS 356 (2004), §3, from
//! memory). So `S = {2, 3} ∪ {p | m}` (the same for `m = k` and
//! `m = -27k`), the candidates are the classes of `A(S,3)` of norm a cube,
//! and the local conditions are tested at every `p` in `S`. The real place
//! imposes nothing: `H^1(R, M) = 0` for a module `M` of odd order (every
//! real number is a cube).
//!
//! **The algebra.** `m = d f^2`, `d` square-free. For `d != 1`, `A = K =
//! Q(sqrt d)` and the candidates come from `K(S,3)` (`numfield/cubeclasses.rs`)
//! as the kernel of the norm's valuations mod 3 at `S`. For `d = 1`
//! (`m = s^2`), `A = Q x Q`, the norm condition makes the second coordinate
//! the inverse of the first modulo cubes, and the group is `Q(S,3)` through
//! the first coordinate `y + s` (at `(0, -s)`: `1/(y - s)`); `-1` is a cube,
//! so `Q(S,3)` has the primes of `S` as basis.
//!
//! **The coverings.** For a class `alpha = a0 + a1 sqrt d` (integers) with
//! `N(alpha) = n^3`: `y + f sqrt d = alpha (u + v sqrt d)^3 / z^3` reads
//! `F_alpha(u, v) = f z^3` with `F_alpha = a1 u^3 + 3 a0 u^2 v + 3 a1 d u v^2
//! + a0 d v^3`, and `x = n (u^2 - d v^2)/z^2`, `y = Y_alpha(u, v)/z^3`,
//! `Y_alpha = a0 u^3 + 3 a1 d u^2 v + 3 a0 d u v^2 + a1 d^2 v^3` (the ring
//! `Z[sqrt d]`: over Q the choice of the order only changes coordinates by
//! GL2(Q)). Split case, class `a`: `y + s = a (u/z)^3`, `y - s = a^2 (v/z)^3`,
//! so `a u^3 - a^2 v^3 = 2 s z^3`, `x = a u v / z^2`, `y = a u^3/z^3 - s`.
//!
//! **Local solubility** of `F(u, v) = c z^3` over `Q_p`: a point exists iff
//! `F(u, v)/c` is a cube or zero for some `(u : v)` in `P^1(Q_p)`; see
//! [`locally_soluble`] for the search and its depth bound.
//!
//! **The rank.** From the exact sequence
//! `0 -> E(Q)[phi] -> E(Q)[3] -> E'(Q)[phi^] -> E'(Q)/phi E(Q) -> E(Q)/3E(Q)
//! -> E(Q)/phi^ E'(Q) -> 0` (Silverman, AEC X.4, Remark X.4.7 for the
//! 2-isogeny version; Schaefer-Stoll 2004 §2, from memory) and
//! `dim E(Q)/3E(Q) = r + dim E(Q)[3]`:
//! `r = dim E'(Q)/phi E(Q) + dim E(Q)/phi^ E'(Q) - dim E(Q)[phi] - dim E'(Q)[phi^]`,
//! so `r <= dim Sel^phi + dim Sel^phi^ - t` with `t = [k a square] +
//! [-3k a square]` (`E_k(Q)[phi]` is rational iff `k` is a square,
//! `E_{-27k}(Q)[phi^]` iff `-27k` is, that is `-3k`). Known points give
//! the lower bound `dim <delta(P)> + dim <delta'(P')> - t`.

// First stage of issue 16's 3-descent: used by its tests only until the
// pipeline runs it (DEVELOPERS.md, Known gaps).
#![cfg_attr(not(test), allow(dead_code))]

use crate::arith::{factor, mul_mod, pow_mod, FactorLimits};
use crate::budget::{Stage, Work};
use crate::numfield::poly;
use crate::numfield::{ClassGroupOptions, CubeClasses, NumberField};
use crate::{Curve, Point};
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{CheckedRoot, DivisibleBy, Gcd, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Integer, Natural, Rational};

/// Largest `|k|` accepted (the primes of `S` must be machine words and the
/// fields small enough for the class-group machinery).
pub(crate) const MAX_K_BITS: u64 = 62;

/// Which rational points the side curve's descent map sends where.
#[derive(Clone, Debug)]
pub(crate) enum SideAlgebra {
    /// `A = Q(sqrt d)`, `m = d f^2`, `d` square-free, not 1.
    Field {
        d: Integer,
        f: Integer,
        field: NumberField,
        classes: CubeClasses,
    },
    /// `A = Q x Q`, `m = s^2`, `s > 0`.
    Split { s: Integer },
}

/// An element `a + b sqrt d` of `Q(sqrt d)` (or, for `d` a square, of the
/// algebra through its first coordinate) with rational coordinates.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct QuadElt {
    pub(crate) a: Rational,
    pub(crate) b: Rational,
}

impl QuadElt {
    fn mul(&self, o: &QuadElt, d: &Integer) -> QuadElt {
        let dq = Rational::from(d.clone());
        QuadElt {
            a: &self.a * &o.a + dq * &self.b * &o.b,
            b: &self.a * &o.b + &self.b * &o.a,
        }
    }
    fn norm(&self, d: &Integer) -> Rational {
        &self.a * &self.a - Rational::from(d.clone()) * &self.b * &self.b
    }
}

/// A plane cubic covering `F(u, v) = c z^3` of a side curve with its map
/// to the curve: `x = X(u, v)/z^2`, `y = (Y(u, v) + y_shift z^3)/z^3`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct CubicCovering {
    /// `F` as `[f3, f2, f1, f0]`: `f3 u^3 + f2 u^2 v + f1 u v^2 + f0 v^3`.
    pub(crate) form: [Integer; 4],
    /// The constant `c`.
    pub(crate) c: Integer,
    /// `X` as `[x2, x1, x0]`: `x2 u^2 + x1 u v + x0 v^2`.
    pub(crate) x_form: [Integer; 3],
    /// `Y` like `form`.
    pub(crate) y_form: [Integer; 4],
    /// The constant added to `Y/z^3`.
    pub(crate) y_shift: Integer,
}

fn eval3(f: &[Integer; 4], u: &Rational, v: &Rational) -> Rational {
    let (u2, v2) = (u * u, v * v);
    Rational::from(f[0].clone()) * &u2 * u
        + Rational::from(f[1].clone()) * &u2 * v
        + Rational::from(f[2].clone()) * u * &v2
        + Rational::from(f[3].clone()) * &v2 * v
}

impl CubicCovering {
    /// Whether `(u, v, z)` lies on the covering.
    pub(crate) fn contains(&self, u: &Rational, v: &Rational, z: &Rational) -> bool {
        eval3(&self.form, u, v) == Rational::from(self.c.clone()) * z * z * z
    }

    /// The image on the side curve of a point with `z != 0` (`None` at `z = 0`,
    /// whose image is `O`).
    pub(crate) fn map(&self, u: &Rational, v: &Rational, z: &Rational) -> Option<Point> {
        if *z == 0u32 {
            return None;
        }
        let x = (Rational::from(self.x_form[0].clone()) * u * u
            + Rational::from(self.x_form[1].clone()) * u * v
            + Rational::from(self.x_form[2].clone()) * v * v)
            / (z * z);
        let y = eval3(&self.y_form, u, v) / (z * z * z) + Rational::from(self.y_shift.clone());
        Some(Point::Affine(x, y))
    }

    /// The discriminant of `F` (non-zero: the plane cubic is smooth).
    pub(crate) fn form_discriminant(&self) -> Integer {
        let [a, b, c, d] = &self.form;
        // b^2 c^2 - 4 a c^3 - 4 b^3 d - 27 a^2 d^2 + 18 a b c d
        b * b * c * c
            - Integer::from(4) * a * c * c * c
            - Integer::from(4) * b * b * b * d
            - Integer::from(27) * a * a * d * d
            + Integer::from(18) * a * b * c * d
    }
}

/// One side of the pair: the curve `y^2 = x^3 + m`, its algebra, the
/// candidates (classes of norm a cube) and the Selmer group.
#[derive(Clone, Debug)]
pub(crate) struct CubeSide {
    /// The curve's constant `m`.
    pub(crate) m: Integer,
    /// The primes of `S`.
    pub(crate) s_primes: Vec<u64>,
    /// The algebra `A_m`.
    pub(crate) algebra: SideAlgebra,
    /// Basis of the candidates: vectors in the coordinates of `A(S,3)`.
    pub(crate) candidates: Vec<Vec<u8>>,
    /// One integral representative per candidate basis vector.
    pub(crate) reps: Vec<QuadElt>,
    /// Basis of the Selmer group: coefficient vectors over `candidates`.
    pub(crate) selmer: Vec<Vec<u8>>,
    /// For a real quadratic field, a unit (`pell_unit`) whose cubes balance
    /// the representatives.
    unit: Option<QuadElt>,
}

/// The result of the descent on both sides.
#[derive(Clone, Debug)]
pub(crate) struct CubeDescent {
    /// `k` of `E_k: y^2 = x^3 + k`.
    pub(crate) k: Integer,
    /// `E_k` with the map `y + sqrt k`: its Selmer group is `Sel^phi^`.
    pub(crate) own: CubeSide,
    /// `E_{-27k}` with `y + sqrt(-27k)`: its Selmer group is `Sel^phi`.
    pub(crate) dual: CubeSide,
    /// `dim E_k(Q)[phi] + dim E_{-27k}(Q)[phi^]`.
    pub(crate) torsion_correction: usize,
    /// `dim Sel^phi + dim Sel^phi^ - torsion_correction`.
    pub(crate) rank_bound: usize,
    /// Whether a `K(S,3)` rests on Bach's bound (GRH).
    pub(crate) conditional_on_grh: bool,
}

fn budget_error() -> Error {
    Error::new(ErrorKind::Budget, "3-isogeny descent: budget exhausted")
}

fn rat_valuation(x: &Rational, p: u64) -> i64 {
    let pn = Natural::from(p);
    let val = |n: &Natural| -> i64 {
        let mut n = n.clone();
        let mut v = 0;
        while n != 0u32 && (&n).divisible_by(&pn) {
            n /= &pn;
            v += 1;
        }
        v
    };
    val(x.numerator_ref()) - val(x.denominator_ref())
}

/// Whether the integer `n` is a square (zero counts).
fn is_square(n: &Integer) -> bool {
    *n >= 0 && n.unsigned_abs_ref().checked_root(2u64).is_some()
}

/// The rational cube root of `x`, if any.
fn rational_cube_root(x: &Rational) -> Option<Rational> {
    let n: Natural = x.numerator_ref().checked_root(3u64)?;
    let d: Natural = x.denominator_ref().checked_root(3u64)?;
    let r = Rational::from_naturals(n, d);
    Some(if *x < 0u32 { -r } else { r })
}

fn f3_add(a: &mut [u8], b: &[u8], c: u8) {
    for (x, y) in a.iter_mut().zip(b) {
        *x = (*x + c * y) % 3;
    }
}

/// F3 rank of a list of vectors.
pub(crate) fn f3_rank(rows: &[Vec<u8>]) -> usize {
    let Some(w) = rows.first().map(|r| r.len()) else {
        return 0;
    };
    rows.len() - crate::numfield::left_kernel_f3(rows, w).len()
}

impl CubeSide {
    /// Builds the side `y^2 = x^3 + m`: the algebra, `A(S,3)` and the
    /// candidates with representatives.
    fn new(m: &Integer, s_primes: &[u64], work: &Work) -> Result<CubeSide, Error> {
        let limits = FactorLimits::within(work);
        let fac = factor(m, &limits)?;
        let d = fac.squarefree_part();
        let f = Integer::from(fac.square_root_of_square_part());
        if d == 1 {
            let s = f;
            let n = s_primes.len();
            let candidates: Vec<Vec<u8>> = (0..n)
                .map(|i| (0..n).map(|j| u8::from(i == j)).collect())
                .collect();
            let reps = s_primes
                .iter()
                .map(|&p| QuadElt {
                    a: Rational::from(p),
                    b: Rational::ZERO,
                })
                .collect();
            return Ok(CubeSide {
                m: m.clone(),
                s_primes: s_primes.to_vec(),
                algebra: SideAlgebra::Split { s },
                candidates,
                reps,
                selmer: Vec::new(),
                unit: None,
            });
        }
        let field = NumberField::new(&[-d.clone(), Integer::ZERO, Integer::ONE])?;
        let mut opts = ClassGroupOptions::default();
        opts.deadline = work.deadline();
        opts.cancel = work.cancel_flag().cloned();
        let classes = field.cube_classes(s_primes, &opts)?;
        let n = classes.dimension();
        // the norm's valuations mod 3 at S, per basis element
        let mut basis_elts: Vec<QuadElt> = Vec::with_capacity(n);
        let mut rows: Vec<Vec<u8>> = Vec::with_capacity(n);
        for b in &classes.basis {
            if work.exhausted() {
                return Err(budget_error());
            }
            let e = b.expand(&field)?;
            let pb = field.to_power_basis(&e);
            let q = QuadElt {
                a: pb[0].clone(),
                b: pb.get(1).cloned().unwrap_or(Rational::ZERO),
            };
            let nm = q.norm(&d);
            rows.push(
                s_primes
                    .iter()
                    .map(|&p| rat_valuation(&nm, p).rem_euclid(3) as u8)
                    .collect(),
            );
            basis_elts.push(q);
        }
        let candidates = crate::numfield::left_kernel_f3(&rows, s_primes.len());
        let unit = if d > 0u32 {
            pell_unit(&d, 100_000)
        } else {
            None
        };
        let mut reps = Vec::with_capacity(candidates.len());
        for c in &candidates {
            let mut x = QuadElt {
                a: Rational::ONE,
                b: Rational::ZERO,
            };
            for (e, &ci) in basis_elts.iter().zip(c) {
                for _ in 0..ci {
                    x = x.mul(e, &d);
                }
            }
            let x = small_representative(&x, &limits);
            reps.push(match &unit {
                Some(eta) => balance(&x, &d, eta),
                None => x,
            });
        }
        Ok(CubeSide {
            m: m.clone(),
            s_primes: s_primes.to_vec(),
            algebra: SideAlgebra::Field {
                d,
                f,
                field,
                classes,
            },
            candidates,
            reps,
            selmer: Vec::new(),
            unit,
        })
    }

    /// The coordinates of `delta(P)` on the candidate basis.
    pub(crate) fn delta(&self, p: &Point, limits: &FactorLimits) -> Result<Vec<u8>, Error> {
        let n = self.candidates.len();
        let Point::Affine(x, y) = p else {
            return Ok(vec![0; n]);
        };
        if y * y != x * x * x + Rational::from(self.m.clone()) {
            return Err(Error::new(
                ErrorKind::InvalidValue,
                format!("({x}, {y}) is not on y^2 = x^3 + {}", self.m),
            ));
        }
        match &self.algebra {
            SideAlgebra::Split { s } => {
                let sq = Rational::from(s.clone());
                let t = y + &sq;
                let val = if t == 0u32 {
                    Rational::ONE / (y - &sq)
                } else {
                    t
                };
                // valuations outside S are 0 mod 3 (see the module doc)
                // valuations outside S are 0 mod 3 (see the module doc): checked
                // exactly, the S-part divided out leaves a rational cube
                let mut rest = val.clone();
                for &p in &self.s_primes {
                    let v = rat_valuation(&val, p);
                    rest /= Rational::from(p).pow(v);
                }
                if rational_cube_root(&rest).is_none() {
                    return Err(Error::internal(
                        "descent::cube_isogeny",
                        "y + s has a valuation not divisible by 3 outside S",
                    ));
                }
                Ok(self
                    .s_primes
                    .iter()
                    .map(|&p| rat_valuation(&val, p).rem_euclid(3) as u8)
                    .collect())
            }
            SideAlgebra::Field {
                f, field, classes, ..
            } => {
                let e = field.from_power_basis(&[y.clone(), Rational::from(f.clone())])?;
                // y + sqrt m lies in K(S,3) by the valuation argument of the
                // module doc, so its norm need not be factored
                let _ = limits;
                let c = classes.coordinates_unchecked(field, &e)?;
                match crate::numfield::solve_f3(&self.candidates, &c) {
                    Some(Ok(v)) => Ok(v),
                    _ => Err(Error::internal(
                        "descent::cube_isogeny",
                        "the image of a point is not a class of norm a cube",
                    )),
                }
            }
        }
    }

    /// The representative of the class with coordinates `w` on the
    /// candidate basis.
    pub(crate) fn representative(&self, w: &[u8], limits: &FactorLimits) -> QuadElt {
        let d = match &self.algebra {
            SideAlgebra::Field { d, .. } => d.clone(),
            SideAlgebra::Split { .. } => Integer::ZERO,
        };
        let mut x = QuadElt {
            a: Rational::ONE,
            b: Rational::ZERO,
        };
        for (e, &wi) in self.reps.iter().zip(w) {
            for _ in 0..wi {
                x = x.mul(e, &d);
            }
        }
        let x = small_representative(&x, limits);
        match (&self.unit, &self.algebra) {
            (Some(eta), SideAlgebra::Field { d, .. }) => balance(&x, d, eta),
            _ => x,
        }
    }

    /// The covering of the class with coordinates `w`.
    pub(crate) fn covering(&self, w: &[u8], limits: &FactorLimits) -> Result<CubicCovering, Error> {
        let alpha = self.representative(w, limits);
        covering_of(&self.algebra, &alpha)
    }

    /// The Selmer group: the candidates whose coverings are soluble at every
    /// prime of `S` (the real place imposes nothing).
    fn compute_selmer(&mut self, work: &Work) -> Result<(), Error> {
        let limits = FactorLimits::within(work);
        let n = self.candidates.len();
        let mut space: Vec<Vec<u8>> = (0..n)
            .map(|i| (0..n).map(|j| u8::from(i == j)).collect())
            .collect();
        for &p in &self.s_primes.clone() {
            let mut found: Vec<Vec<u8>> = Vec::new();
            let dim = space.len();
            // every line of the current space, skipping those in the span found
            let total = 3usize.checked_pow(dim as u32).ok_or_else(|| {
                Error::new(
                    ErrorKind::TooLarge,
                    "3-isogeny descent: too many candidates",
                )
            })?;
            if dim > 12 {
                return Err(Error::new(
                    ErrorKind::TooLarge,
                    format!("3-isogeny descent: {dim} candidate dimensions at p = {p}"),
                ));
            }
            for idx in 1..total {
                if work.exhausted() {
                    return Err(budget_error());
                }
                let coef: Vec<u8> = (0..dim)
                    .map(|i| (idx / 3usize.pow(i as u32) % 3) as u8)
                    .collect();
                // one per line: first non-zero coefficient 1
                if coef.iter().find(|&&c| c != 0) != Some(&1) {
                    continue;
                }
                let mut w = vec![0u8; n];
                for (b, &c) in space.iter().zip(&coef) {
                    f3_add(&mut w, b, c);
                }
                let mut with = found.clone();
                with.push(w.clone());
                if f3_rank(&with) == found.len() {
                    continue;
                }
                let cov = self.covering(&w, &limits)?;
                if locally_soluble(&cov.form, &cov.c, p, work)? {
                    found.push(w);
                }
            }
            space = found;
        }
        self.selmer = space;
        Ok(())
    }
}

/// `ln |x|` of a non-zero integer of any size.
fn ln_abs_big(x: &Integer) -> f64 {
    use malachite::base::num::arithmetic::traits::ShrRound;
    use malachite::base::rounding_modes::RoundingMode;
    let n = x.unsigned_abs_ref();
    let bits = n.significant_bits();
    let shift = bits.saturating_sub(64);
    let top = u64::try_from(&n.shr_round(shift, RoundingMode::Floor).0).unwrap_or(u64::MAX);
    (top as f64).ln() + shift as f64 * std::f64::consts::LN_2
}

/// A unit `x + y sqrt d` of `Z[sqrt d]`, `d > 1` square-free, `x, y > 0`:
/// the least solution of `x^2 - d y^2 = +-1` by the continued fraction of
/// `sqrt d` (a power of the fundamental unit of the maximal order, with
/// exponent 1 or 3). `None` past `max_steps` partial quotients.
fn pell_unit(d: &Integer, max_steps: usize) -> Option<QuadElt> {
    use malachite::base::num::arithmetic::traits::FloorSqrt;
    let a0 = Integer::from(d.unsigned_abs_ref().floor_sqrt());
    let (mut m, mut q, mut a) = (Integer::ZERO, Integer::ONE, a0.clone());
    let (mut p_prev, mut p) = (Integer::ONE, a0.clone());
    let (mut q_prev, mut qq) = (Integer::ZERO, Integer::ONE);
    for _ in 0..max_steps {
        let nm = &p * &p - d * &qq * &qq;
        if nm == 1u32 || nm == -1i32 {
            return Some(QuadElt {
                a: Rational::from(p),
                b: Rational::from(qq),
            });
        }
        m = &q * &a - &m;
        q = (d - &m * &m) / &q;
        a = (&a0 + &m) / &q;
        let np = &a * &p + &p_prev;
        let nq = &a * &qq + &q_prev;
        p_prev = std::mem::replace(&mut p, np);
        q_prev = std::mem::replace(&mut qq, nq);
    }
    None
}

/// `x` times the cube of a power of the unit `eta` (class unchanged) with
/// its two real embeddings balanced: `|sigma_1| ~ |sigma_2|` up to a factor
/// `eta^3` (integral `x`).
fn balance(x: &QuadElt, d: &Integer, eta: &QuadElt) -> QuadElt {
    let Ok(a) = Integer::try_from(&x.a) else {
        return x.clone();
    };
    let Ok(b) = Integer::try_from(&x.b) else {
        return x.clone();
    };
    let nm = &a * &a - d * &b * &b;
    if b == 0u32 || nm == 0u32 {
        return x.clone();
    }
    // the embedding without cancellation, |a| + |b| sqrt d, the other
    // through the norm
    let (la, lb) = (ln_abs_big(&a), ln_abs_big(&b) + 0.5 * ln_abs_big(d));
    let l_big = if a == 0u32 {
        lb
    } else {
        la.max(lb) + (-(la - lb).abs()).exp().ln_1p()
    };
    let l_small = ln_abs_big(&nm) - l_big;
    // ln|sigma_1| - ln|sigma_2|, sigma_1 = a + b sqrt d
    let same_sign = (a >= 0) == (b >= 0);
    let diff = if same_sign {
        l_big - l_small
    } else {
        l_small - l_big
    };
    let r = ln_abs_big(&(Integer::try_from(&eta.a).unwrap_or(Integer::ONE) * Integer::from(2)));
    if !(r > 0.0) || !diff.is_finite() {
        return x.clone();
    }
    // eta^(3j) moves ln|sigma_1| - ln|sigma_2| by 6 j ln(eta)
    let j = (-diff / (6.0 * r)).round();
    if j == 0.0 || !j.is_finite() || j.abs() > 1e6 {
        return x.clone();
    }
    let base = if j > 0.0 {
        eta.clone()
    } else {
        // eta^-1 = +-conj(eta): the sign is a cube
        QuadElt {
            a: eta.a.clone(),
            b: -eta.b.clone(),
        }
    };
    let mut out = x.clone();
    for _ in 0..(3 * j.abs() as u64) {
        out = out.mul(&base, d);
    }
    out
}

/// A smaller representative of the class of `x`: integral coordinates, the
/// cubes of the primes below 1000 dividing both removed.
fn small_representative(x: &QuadElt, limits: &FactorLimits) -> QuadElt {
    // x = (A + B sqrt d)/D ~ (A + B sqrt d) D^2 modulo cubes
    let signed = |r: &Rational| -> Integer {
        let n = Integer::from(r.numerator_ref().clone());
        if *r < 0u32 {
            -n
        } else {
            n
        }
    };
    let da = Integer::from(x.a.denominator_ref().clone());
    let db = Integer::from(x.b.denominator_ref().clone());
    let dd = &da * &db;
    let d2 = &dd * &dd;
    let mut a = signed(&x.a) * &db * &d2;
    let mut b = signed(&x.b) * &da * &d2;
    // the cubes of primes below 1000 dividing both (trial division only: a
    // factorisation of the content could cost more than the whole descent)
    let _ = limits;
    let mut g = Integer::from((&a).unsigned_abs().gcd((&b).unsigned_abs()));
    if g > 1u32 {
        let mut cube = Integer::ONE;
        for p in crate::arith::primes_up_to(1000) {
            let pi = Integer::from(p);
            let mut e = 0u64;
            while g != 0u32 && (&g).divisible_by(&pi) {
                g /= &pi;
                e += 1;
            }
            cube *= pi.pow(e / 3 * 3);
            if g == 1u32 {
                break;
            }
        }
        a /= &cube;
        b /= &cube;
    }
    QuadElt {
        a: Rational::from(a),
        b: Rational::from(b),
    }
}

fn covering_of(algebra: &SideAlgebra, alpha: &QuadElt) -> Result<CubicCovering, Error> {
    let not_int = || {
        Error::internal(
            "descent::cube_isogeny",
            "a class representative is not integral",
        )
    };
    let a0 = Integer::try_from(&alpha.a).map_err(|_| not_int())?;
    let a1 = Integer::try_from(&alpha.b).map_err(|_| not_int())?;
    let three = Integer::from(3);
    let cov = match algebra {
        SideAlgebra::Field { d, f, .. } => {
            let nm = alpha.norm(d);
            let n = rational_cube_root(&nm).ok_or_else(|| {
                Error::internal(
                    "descent::cube_isogeny",
                    "a candidate whose norm is not a cube",
                )
            })?;
            let n = Integer::try_from(&n).map_err(|_| not_int())?;
            CubicCovering {
                form: [a1.clone(), &three * &a0, &three * &a1 * d, &a0 * d],
                c: f.clone(),
                x_form: [n.clone(), Integer::ZERO, -(n * d)],
                y_form: [a0.clone(), &three * &a1 * d, &three * &a0 * d, &a1 * d * d],
                y_shift: Integer::ZERO,
            }
        }
        SideAlgebra::Split { s } => {
            let a = a0;
            if a == 0u32 {
                return Err(not_int());
            }
            CubicCovering {
                form: [a.clone(), Integer::ZERO, Integer::ZERO, -(&a * &a)],
                c: Integer::from(2) * s,
                x_form: [Integer::ZERO, a.clone(), Integer::ZERO],
                y_form: [a, Integer::ZERO, Integer::ZERO, Integer::ZERO],
                y_shift: -s.clone(),
            }
        }
    };
    if cov.form_discriminant() == 0u32 {
        return Err(Error::internal(
            "descent::cube_isogeny",
            "a covering with a singular binary form",
        ));
    }
    Ok(cov)
}

/// `v_p(n)` and the unit part of a non-zero integer.
fn split_valuation(n: &Integer, p: &Integer) -> (u64, Integer) {
    let mut n = n.clone();
    let mut v = 0;
    while n != 0u32 && (&n).divisible_by(p) {
        n /= p;
        v += 1;
    }
    (v, n)
}

/// Whether `unit * p^v` (`unit` prime to `p`) is a cube in `Q_p`.
fn is_padic_cube(v: i64, unit: &Integer, p: u64) -> bool {
    if v.rem_euclid(3) != 0 {
        return false;
    }
    if p == 3 {
        let r = u64::try_from(&unit.mod_op_ref(9)).unwrap_or(0);
        return r == 1 || r == 8;
    }
    if p % 3 == 2 {
        return true;
    }
    let r = u64::try_from(&unit.mod_op_ref(p as i64)).unwrap_or(0);
    pow_mod(r, (p - 1) / 3, p) == 1
}

trait ModOpRef {
    fn mod_op_ref(&self, m: i64) -> Integer;
}

impl ModOpRef for Integer {
    fn mod_op_ref(&self, m: i64) -> Integer {
        use malachite::base::num::arithmetic::traits::Mod;
        self.mod_op(Integer::from(m))
    }
}

/// Whether `F(u, v) = c z^3` has a point over `Q_p` (`F` with non-zero
/// discriminant, `c != 0`).
///
/// A point exists iff `g(t)/c` is a cube or zero for some `t` in `Z_p`,
/// for one of the two charts `g(t) = F(1, t)` and `g(t) = F(p t, 1)`
/// (together they cover `P^1(Q_p)`). Each chart is searched by residue
/// classes `t0 + p^m Z_p`, with `e = v(g(t0))`, `d = v(g'(t0))`:
/// - `g(t0) = 0` or `e > 2 d`: `g` has a root in the class (Hensel), a
///   point with `z = 0`;
/// - the non-constant part of `h(x) = g(t0 + p^m x)` has valuation at
///   least `e + s` (`s = 2` at 3, else 1; always so once `m >= e + s`):
///   every value on the class is `g(t0)` times an element of
///   `1 + p^s Z_p`, a cube, so the class is decided by the cube test of
///   `g(t0)/c`;
/// - else its `p` subclasses are searched.
///
/// Depth bound: `Res(g, g') = A g + B g'` with `A, B` in `Z[t]`, so
/// `min(e, d) <= R = v_p(Res(g, g'))`; a class not taken by Hensel has
/// `e <= 2 d`, hence `e <= 2R`, and it is decided at depth `2R + s`. A
/// class still open beyond that is an internal error. This tree is what
/// runs at `p = 3` (3 subclasses per level). For `p != 3` the same
/// classes are walked as polynomials (`Chart::soluble`): the class
/// `t0 + p^(m-1) Z_p` as `g(t0 + p^(m-1) j)` with its content divided out,
/// whose unit values mod `p` decide their subclasses at once (a unit's
/// cube class is read mod `p`), so only the (at most 3) roots mod `p` are
/// followed: one scan of the residues per level at most, `O(p)` word
/// operations, whatever the depth.
pub(crate) fn locally_soluble(
    form: &[Integer; 4],
    c: &Integer,
    p: u64,
    work: &Work,
) -> Result<bool, Error> {
    locally_soluble_by(form, c, p, work, ChartRoute::Auto)
}

fn locally_soluble_by(
    form: &[Integer; 4],
    c: &Integer,
    p: u64,
    work: &Work,
    route: ChartRoute,
) -> Result<bool, Error> {
    if *c == 0u32 {
        return Err(Error::new(ErrorKind::InvalidValue, "a covering with c = 0"));
    }
    let pi = Integer::from(p);
    let (vc, cu) = split_valuation(c, &pi);
    // chart 1: g(t) = F(1, t) = f3 + f2 t + f1 t^2 + f0 t^3 (low to high)
    let g1 = vec![
        form[0].clone(),
        form[1].clone(),
        form[2].clone(),
        form[3].clone(),
    ];
    // chart 2: g(t) = F(p t, 1) = f0 + f1 p t + f2 p^2 t^2 + f3 p^3 t^3
    let g2 = vec![
        form[3].clone(),
        &form[2] * &pi,
        &form[1] * &pi * &pi,
        &form[0] * &pi * &pi * &pi,
    ];
    for g in [g1, g2] {
        if chart_soluble_by(&g, vc as i64, &cu, p, work, route)? {
            return Ok(true);
        }
    }
    Ok(false)
}

/// How a chart is searched: the polynomial walk for `p != 3` and the
/// residue tree for `p = 3`, or the tree at every `p` (the tests' reference).
#[derive(Clone, Copy, PartialEq, Eq)]
enum ChartRoute {
    Auto,
    TreeOnly,
}

fn chart_soluble_by(
    g: &[Integer],
    vc: i64,
    cu: &Integer,
    p: u64,
    work: &Work,
    route: ChartRoute,
) -> Result<bool, Error> {
    let pi = Integer::from(p);
    // divide out the p-part of the content: the cube test of g/c is unchanged
    // when both are divided by p^j
    let mut g: Vec<Integer> = g.to_vec();
    let mut vc = vc;
    while g.iter().any(|x| *x != 0u32) && g.iter().all(|x| x.divisible_by(&pi)) {
        for x in g.iter_mut() {
            *x /= &pi;
        }
        vc -= 1;
    }
    let deg = poly::degree(&g)
        .ok_or_else(|| Error::internal("descent::cube_isogeny", "a chart polynomial is zero"))?;
    let s: u32 = if p == 3 { 2 } else { 1 };
    if deg == 0 {
        let (e, u) = split_valuation(&g[0], &pi);
        return Ok(is_padic_cube(
            e as i64 - vc,
            &(u * cu_inverse_class(cu, p)),
            p,
        ));
    }
    let dg = poly::derivative(&g);
    let res = poly::resultant(&g, &dg);
    if res == 0u32 {
        return Err(Error::internal(
            "descent::cube_isogeny",
            "a chart polynomial with a repeated root",
        ));
    }
    let (r, _) = split_valuation(&res, &pi);
    let max_depth = 2 * r as u32 + s;
    let cinv = cu_inverse_class(cu, p);
    if p != 3 && route == ChartRoute::Auto {
        let chart = Chart {
            orig: &g,
            cinv: &cinv,
            p,
            max_depth,
        };
        return chart.soluble(&g, &Integer::ZERO, vc, 1, work);
    }
    let mut stack: Vec<(Integer, u32)> = (0..p).map(|t| (Integer::from(t), 1)).collect();
    while let Some((t0, m)) = stack.pop() {
        if work.exhausted() {
            return Err(budget_error());
        }
        let val = poly::eval(&g, &t0);
        if val == 0u32 {
            return Ok(true);
        }
        let (e, u) = split_valuation(&val, &pi);
        let dv = poly::eval(&dg, &t0);
        if dv != 0u32 {
            let (dd, _) = split_valuation(&dv, &pi);
            if e > 2 * dd {
                return Ok(true);
            }
        }
        // every value on the class is g(t0) (1 + p^s Z_p) once the
        // non-constant part of h(x) = g(t0 + p^m x) has valuation at least
        // e + s (always once m >= e + s)
        let step = (&pi).pow(u64::from(m));
        let h = taylor_shift(&g, &t0, &step);
        let nu = h[1..]
            .iter()
            .filter(|c| **c != 0u32)
            .map(|c| split_valuation(c, &pi).0)
            .min()
            .unwrap_or(u64::MAX);
        if nu >= e + u64::from(s) {
            if is_padic_cube(e as i64 - vc, &(u * &cinv), p) {
                return Ok(true);
            }
            continue;
        }
        if m > max_depth {
            return Err(Error::internal(
                "descent::cube_isogeny",
                "a residue class left open beyond the depth bound",
            ));
        }
        for j in 0..p {
            stack.push((&t0 + Integer::from(j) * &step, m + 1));
        }
    }
    Ok(false)
}

/// The chart search for `p != 3` on the class `t0 + p^(m-1) Z_p`, written as
/// `g(j)`, `j` in `Z_p` (`g` the chart polynomial after the substitutions
/// `t = t0 + p^(m-1) j`): after dividing out the content (`vc` follows),
/// the `j` with `g(j)` a unit mod `p` are decided by `g(j) mod p` (for
/// `p != 3` a unit's cube class is read mod `p`); at a root `r` of `g` mod
/// `p` either Hensel's lemma gives a root (a point with `z = 0`) or the
/// search goes on with `g(r + p j)`. Only the (at most 3) roots mod `p`
/// are followed, so a level costs one scan of the residues at most
/// (`p = 1 mod 3`: until a cube is met; up to `2^20` residues, beyond which
/// a prime without a witness gives [`ErrorKind::TooLarge`]). The depth is
/// bounded as in [`locally_soluble`].
struct Chart<'a> {
    /// The chart polynomial after its content was divided out.
    orig: &'a [Integer],
    cinv: &'a Integer,
    p: u64,
    max_depth: u32,
}

impl Chart<'_> {
    fn soluble(
        &self,
        g: &[Integer],
        t0: &Integer,
        vc: i64,
        m: u32,
        work: &Work,
    ) -> Result<bool, Error> {
        let (cinv, p, max_depth) = (self.cinv, self.p, self.max_depth);
        if work.exhausted() {
            return Err(budget_error());
        }
        if m > max_depth {
            return Err(Error::internal(
                "descent::cube_isogeny",
                "a residue class left open beyond the depth bound",
            ));
        }
        let pi = Integer::from(p);
        let mut g: Vec<Integer> = g.to_vec();
        let mut vc = vc;
        if g.iter().all(|x| *x == 0u32) {
            return Ok(true);
        }
        while g.iter().all(|x| x.divisible_by(&pi)) {
            for x in g.iter_mut() {
                *x /= &pi;
            }
            vc -= 1;
        }
        let gw: Vec<u64> = g
            .iter()
            .map(|x| u64::try_from(&x.mod_op_ref(p as i64)).unwrap_or(0))
            .collect();
        let cw = u64::try_from(&cinv.mod_op_ref(p as i64)).unwrap_or(0);
        let eval_w = |t: u64| {
            gw.iter()
                .rev()
                .fold(0u64, |acc, &cf| (mul_mod(acc, t, p) + cf) % p)
        };
        let top = gw.iter().rposition(|&x| x != 0).unwrap_or(0);
        // the unit values: cube class of g(j)/c
        if vc.rem_euclid(3) == 0 {
            if p % 3 == 2 {
                // every unit is a cube; a non-root exists (degree <= 3 < p, not zero mod p)
                if (0..p.min(4)).any(|t| eval_w(t) != 0) {
                    return Ok(true);
                }
            } else {
                let cube_at = |t: u64| {
                    let v = eval_w(t);
                    v != 0 && pow_mod(mul_mod(v, cw, p), (p - 1) / 3, p) == 1
                };
                // g = lambda (t - r)^e mod p with e = deg (or constant): the unit
                // values lie in one cube class when e = 0 or 3
                let limit = p.min(1 << 20);
                let mut t = 0u64;
                let mut hit = false;
                while t < limit {
                    if t % 4096 == 0 && work.exhausted() {
                        return Err(budget_error());
                    }
                    if cube_at(t) {
                        hit = true;
                        break;
                    }
                    t += 1;
                }
                if hit {
                    return Ok(true);
                }
                if limit < p && !(top == 0 || is_cube_of_linear(&gw, p)) {
                    return Err(Error::new(
                        ErrorKind::TooLarge,
                        format!("3-isogeny descent: no cube among 2^20 residues mod {p}"),
                    ));
                }
            }
        }
        if top == 0 {
            return Ok(false);
        }
        // the roots mod p; Hensel's lemma on the chart polynomial itself at
        // t = t0 + p^(m-1) r (what the depth bound is proven for)
        let dg = poly::derivative(self.orig);
        let scale = pi.clone().pow(u64::from(m - 1));
        for r in crate::numfield::fp::roots(&gw, p) {
            let ri = Integer::from(r);
            let t = t0 + &scale * &ri;
            let val = poly::eval(self.orig, &t);
            if val == 0u32 {
                return Ok(true);
            }
            let dv = poly::eval(&dg, &t);
            if dv != 0u32 {
                let (e, _) = split_valuation(&val, &pi);
                let (dd, _) = split_valuation(&dv, &pi);
                if e > 2 * dd {
                    return Ok(true);
                }
            }
            // h(j) = g(r + p j) = orig(t + p^m j) / p^(content so far)
            let h = taylor_shift(&g, &ri, &pi);
            if self.soluble(&h, &t, vc, m + 1, work)? {
                return Ok(true);
            }
        }
        Ok(false)
    }
}

/// Whether the polynomial over F_p (low to high, degree 3 exactly) is
/// `lambda (t - r)^3`.
fn is_cube_of_linear(gw: &[u64], p: u64) -> bool {
    if gw.len() < 4 || gw[3] == 0 || p == 3 {
        return false;
    }
    // lambda (t - r)^3 = lambda (t^3 - 3 r t^2 + 3 r^2 t - r^3)
    let lam = gw[3];
    let Some(li) = crate::arith::inv_mod(lam, p) else {
        return false;
    };
    let Some(i3) = crate::arith::inv_mod(3 % p, p) else {
        return false;
    };
    let r = mul_mod(mul_mod(p - gw[2] % p, li, p), i3, p);
    let r2 = mul_mod(r, r, p);
    let r3 = mul_mod(r2, r, p);
    gw[1] % p == mul_mod(lam, mul_mod(3, r2, p), p) && gw[0] % p == mul_mod(lam, (p - r3) % p, p)
}

/// `g(r + q j)` as a polynomial in `j` (low to high).
fn taylor_shift(g: &[Integer], r: &Integer, q: &Integer) -> Vec<Integer> {
    let n = g.len();
    let mut out = vec![Integer::ZERO; n];
    // binomial expansion of sum g_k (r + q j)^k
    for (k, gk) in g.iter().enumerate() {
        if *gk == 0u32 {
            continue;
        }
        let mut binom = Integer::ONE;
        for i in 0..=k {
            // C(k, i) r^(k-i) q^i
            let term = &binom * r.pow((k - i) as u64) * q.pow(i as u64) * gk;
            out[i] += term;
            binom = binom * Integer::from((k - i) as u64) / Integer::from((i + 1) as u64);
        }
    }
    out
}

/// An integer in the class of `1/cu` modulo cubes of `p`-adic units (`cu`
/// prime to `p`): `cu^2` (as `cu^3` is a cube).
fn cu_inverse_class(cu: &Integer, _p: u64) -> Integer {
    cu * cu
}

/// The 3-isogeny descent on `y^2 = x^3 + k`: both sides, their Selmer
/// groups and the rank bound. `k` non-zero with `|k| < 2^62`; the primes of
/// `S` are those of `6k`. Honours the `Work`.
pub(crate) fn cube_isogeny_descent(k: &Integer, work: &Work) -> Result<CubeDescent, Error> {
    if *k == 0u32 {
        return Err(Error::new(ErrorKind::Singular, "y^2 = x^3 + 0 is singular"));
    }
    if k.unsigned_abs_ref().significant_bits() > MAX_K_BITS {
        return Err(Error::new(
            ErrorKind::TooLarge,
            "3-isogeny descent: |k| beyond 2^62",
        ));
    }
    if work.exhausted() {
        return Err(budget_error());
    }
    work.report(Stage::Solubility, "3-isogeny descent");
    let limits = FactorLimits::within(work);
    let fac = factor(k, &limits).map_err(|e| if work.exhausted() { budget_error() } else { e })?;
    let mut s_primes: Vec<u64> = vec![2, 3];
    for p in fac.primes() {
        let p = u64::try_from(p)
            .map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of k beyond 64 bits"))?;
        s_primes.push(p);
    }
    s_primes.sort_unstable();
    s_primes.dedup();
    let kd = Integer::from(-27) * k;
    let mut own = CubeSide::new(k, &s_primes, work)?;
    let mut dual = CubeSide::new(&kd, &s_primes, work)?;
    own.compute_selmer(work)?;
    dual.compute_selmer(work)?;
    let torsion_correction =
        usize::from(is_square(k)) + usize::from(is_square(&(Integer::from(-3) * k)));
    let total = own.selmer.len() + dual.selmer.len();
    let rank_bound = total.checked_sub(torsion_correction).ok_or_else(|| {
        Error::internal(
            "descent::cube_isogeny",
            "the Selmer groups are smaller than the rational kernels",
        )
    })?;
    let grh = |s: &CubeSide| matches!(&s.algebra, SideAlgebra::Field { classes, .. } if classes.conditional_on_grh());
    let conditional_on_grh = grh(&own) || grh(&dual);
    Ok(CubeDescent {
        k: k.clone(),
        own,
        dual,
        torsion_correction,
        rank_bound,
        conditional_on_grh,
    })
}

/// `phi: E_k -> E_{-27k}`.
pub(crate) fn phi(k: &Integer, p: &Point) -> Point {
    match p {
        Point::Infinity => Point::Infinity,
        Point::Affine(x, y) => {
            if *x == 0u32 {
                return Point::Infinity;
            }
            let kq = Rational::from(k.clone());
            let x2 = x * x;
            let x3 = &x2 * x;
            let nx = (&x3 + Rational::from(4) * &kq) / &x2;
            let ny = y * (&x3 - Rational::from(8) * &kq) / &x3;
            Point::Affine(nx, ny)
        }
    }
}

/// `phi^: E_{-27k} -> E_k`.
pub(crate) fn phi_hat(k: &Integer, p: &Point) -> Point {
    match phi(&(Integer::from(-27) * k), p) {
        Point::Infinity => Point::Infinity,
        Point::Affine(x, y) => Point::Affine(x / Rational::from(9), y / Rational::from(27)),
    }
}

/// The curve `y^2 = x^3 + m`.
pub(crate) fn side_curve(m: &Integer) -> Result<Curve, Error> {
    Curve::new([
        Integer::ZERO,
        Integer::ZERO,
        Integer::ZERO,
        Integer::ZERO,
        m.clone(),
    ])
}

impl CubeDescent {
    /// The lower bound from points on both curves: `dim <delta(P)> +
    /// dim <delta'(P')> - t` (each point checked on its curve).
    pub(crate) fn lower_bound(
        &self,
        own_points: &[Point],
        dual_points: &[Point],
        limits: &FactorLimits,
    ) -> Result<usize, Error> {
        let mut a: Vec<Vec<u8>> = Vec::new();
        for p in own_points {
            a.push(self.own.delta(p, limits)?);
        }
        let mut b: Vec<Vec<u8>> = Vec::new();
        for p in dual_points {
            b.push(self.dual.delta(p, limits)?);
        }
        let ra = if a.is_empty() { 0 } else { f3_rank(&a) };
        let rb = if b.is_empty() { 0 } else { f3_rank(&b) };
        Ok((ra + rb).saturating_sub(self.torsion_correction))
    }
}

/// An exact cube root `u + v sqrt d` of `beta` in `Q(sqrt d)` (`d` not a
/// square), if `beta` is a cube: `N(gamma) = n`, `t = Tr(gamma)` is a
/// rational root of `t^3 - 3 n t - 2 b0` (from `gamma^3 = (t^2 - n) gamma
/// - t n`), then `v = b1/(t^2 - n)`; checked exactly.
pub(crate) fn cube_root_in_field(beta: &QuadElt, d: &Integer) -> Option<QuadElt> {
    let n = rational_cube_root(&beta.norm(d))?;
    let cube = |g: &QuadElt| g.mul(g, d).mul(g, d);
    if beta.b == 0u32 {
        let r = rational_cube_root(&beta.a)?;
        return Some(QuadElt {
            a: r,
            b: Rational::ZERO,
        });
    }
    // t^3 - 3n t - 2 b0 with integer coefficients
    let coeffs = [
        -Rational::from(2) * &beta.a,
        -Rational::from(3) * &n,
        Rational::ZERO,
        Rational::ONE,
    ];
    let den = coeffs.iter().fold(Integer::ONE, |acc, c| {
        let dd = Integer::from(c.denominator_ref().clone());
        let g = Integer::from((&acc).unsigned_abs().gcd((&dd).unsigned_abs()));
        acc * dd / g
    });
    let ints: Vec<Integer> = coeffs
        .iter()
        .map(|c| Integer::try_from(&(c * Rational::from(den.clone()))).unwrap_or(Integer::ZERO))
        .collect();
    for t in poly::rational_roots(&ints).ok()? {
        let t2n = &t * &t - &n;
        if t2n == 0u32 {
            continue;
        }
        let g = QuadElt {
            a: &t / Rational::from(2),
            b: &beta.b / t2n,
        };
        if cube(&g) == *beta {
            return Some(g);
        }
    }
    None
}

#[cfg(test)]
mod tests;
