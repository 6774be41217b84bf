//! The height pairing, the regulator and LLL reduction of a list of points
//! with respect to the canonical height.

use super::canonical::height_unchecked;
use super::real::to_f64;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::local::LocalData;
use malachite::base::num::basic::traits::Zero;
use malachite::Float;

/// `sum_j c_j P_j` on `curve` (exact).
pub(crate) fn combination(curve: &Curve, points: &[Point], coeffs: &[i64]) -> Point {
    let mut acc = Point::Infinity;
    for (p, &c) in points.iter().zip(coeffs) {
        if c != 0 {
            acc = curve.add(&acc, &curve.multiple(p, c));
        }
    }
    acc
}

/// The height pairing matrix `<P_i, P_j> = (h(P_i + P_j) - h(P_i) - h(P_j)) / 2`
/// (numerical, about `prec` bits). The curve must be the globally minimal
/// model described by `local`.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::{height_pairing_matrix, float_to_f64};
/// // y^2 + y = x^3 + x^2 - 2x with (0,0) and (1,0) (published tables, Cremona 1997)
/// let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
/// let local = bad_primes_data(&e, &[Natural::from(389u32)]).unwrap();
/// let g = height_pairing_matrix(&e, &local, &[Point::from_ints(0, 0), Point::from_ints(1, 0)], 64).unwrap();
/// assert!(float_to_f64(&g[0][0]) > 0.0 && float_to_f64(&g[0][1]).abs() < float_to_f64(&g[0][0]));
/// ```
pub fn height_pairing_matrix(curve: &Curve, local: &[LocalData], points: &[Point], prec: u64) -> Result<Vec<Vec<Float>>, Error> {
    super::canonical::check_minimal(curve, local)?;
    pairing_unchecked(curve, local, points, prec)
}

pub(crate) fn pairing_unchecked(curve: &Curve, local: &[LocalData], points: &[Point], prec: u64) -> Result<Vec<Vec<Float>>, Error> {
    let n = points.len();
    let h: Vec<Float> = points.iter().map(|p| height_unchecked(curve, local, p, prec)).collect::<Result<_, _>>()?;
    let mut g = vec![vec![Float::ZERO; n]; n];
    let half = Float::from(0.5f64);
    for i in 0..n {
        g[i][i] = h[i].clone();
        for j in 0..i {
            let s = height_unchecked(curve, local, &curve.add(&points[i], &points[j]), prec)?;
            let v = (s - &h[i] - &h[j]) * &half;
            g[i][j] = v.clone();
            g[j][i] = v;
        }
    }
    Ok(g)
}

/// The determinant of a symmetric matrix by Gaussian elimination with
/// partial pivoting in Float.
pub(crate) fn determinant(m: &[Vec<Float>]) -> Float {
    let n = m.len();
    let mut a: Vec<Vec<Float>> = m.to_vec();
    let mut det = Float::from(1u32);
    for c in 0..n {
        let mut piv = c;
        for r in c + 1..n {
            if to_f64(&a[r][c]).abs() > to_f64(&a[piv][c]).abs() {
                piv = r;
            }
        }
        if a[piv][c] == 0u32 {
            return Float::ZERO;
        }
        if piv != c {
            a.swap(piv, c);
            det = -det;
        }
        det *= &a[c][c];
        for r in c + 1..n {
            let f = &a[r][c] / &a[c][c];
            for k in c..n {
                let t = &f * &a[c][k];
                a[r][k] -= t;
            }
        }
    }
    det
}

/// The regulator `det <P_i, P_j>` of a list of points (numerical; zero up
/// to rounding when they are dependent modulo torsion).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::{regulator, float_to_f64};
/// // y^2 + y = x^3 + x^2 - 2x: regulator 0.152460177943... (from memory)
/// let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
/// let local = bad_primes_data(&e, &[Natural::from(389u32)]).unwrap();
/// let r = regulator(&e, &local, &[Point::from_ints(0, 0), Point::from_ints(1, 0)], 64).unwrap();
/// assert!((float_to_f64(&r) - 0.152460177943).abs() < 1e-9);
/// ```
pub fn regulator(curve: &Curve, local: &[LocalData], points: &[Point], prec: u64) -> Result<Float, Error> {
    Ok(determinant(&height_pairing_matrix(curve, local, points, prec)?))
}

/// The result of [`lll_reduce`].
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, Point};
/// use twofold::local::bad_primes_data;
/// use twofold::heights::lll_reduce;
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let local = bad_primes_data(&e, &[Natural::from(37u32)]).unwrap();
/// let p = Point::from_ints(0, 0);
/// let out = lll_reduce(&e, &local, &[e.multiple(&p, 3), e.multiple(&p, 5)], 64).unwrap();
/// // 3P and 5P generate the same group as P; one relation is torsion.
/// assert_eq!(out.points.len(), 1);
/// assert_eq!(out.relations.len(), 1);
/// assert!(out.points[0] == p || out.points[0] == e.negate(&p));
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct LllReduction {
    /// The reduced basis (independent modulo torsion), LLL-reduced for the
    /// height pairing (delta = 0.99).
    pub points: Vec<Point>,
    /// The unimodular transformation: row `i` gives the coefficients of the
    /// `i`-th new point in terms of the input points; the first
    /// `points.len()` rows are the basis, the others combinations that are
    /// torsion points (checked exactly).
    pub transformation: Vec<Vec<i64>>,
    /// The relations found: input combinations that are torsion (checked
    /// exactly, not numerically), i.e. the dependencies removed.
    pub relations: Vec<Vec<i64>>,
    /// The height pairing matrix of `points` (numerical).
    pub gram: Vec<Vec<Float>>,
}

fn overflow() -> Error {
    Error::new(ErrorKind::TooLarge, "LLL coefficients overflow i64")
}

/// LLL reduction (Lenstra-Lenstra-Lovász, delta = 0.99) of a list of points
/// for the canonical height pairing, with removal of dependencies
/// (modified LLL): a combination whose height vanishes numerically is
/// accepted as a relation only after checking exactly that it is a torsion
/// point; otherwise an error of kind [`ErrorKind::InvalidValue`] asks for
/// more precision. Torsion input points are removed at once.
pub fn lll_reduce(curve: &Curve, local: &[LocalData], points: &[Point], prec: u64) -> Result<LllReduction, Error> {
    super::canonical::check_minimal(curve, local)?;
    lll_unchecked(curve, local, points, prec)
}

pub(crate) fn lll_unchecked(curve: &Curve, local: &[LocalData], points: &[Point], prec: u64) -> Result<LllReduction, Error> {
    let n = points.len();
    if n == 0 {
        return Ok(LllReduction { points: vec![], transformation: vec![], relations: vec![], gram: vec![] });
    }
    let g0f = pairing_unchecked(curve, local, points, prec)?;
    let g0: Vec<Vec<f64>> = g0f.iter().map(|r| r.iter().map(to_f64).collect()).collect();
    let scale = (0..n).map(|i| g0[i][i]).fold(0f64, f64::max).max(1e-300);
    let tol = scale * 1e-12;
    // Active basis: rows of u (coefficients in the inputs).
    let mut u: Vec<Vec<i64>> = (0..n).map(|i| (0..n).map(|j| i64::from(i == j)).collect()).collect();
    let mut relations: Vec<Vec<i64>> = Vec::new();
    let gram = |u: &Vec<Vec<i64>>| -> Vec<Vec<f64>> {
        let m = u.len();
        let mut g = vec![vec![0f64; m]; m];
        for a in 0..m {
            for b in 0..m {
                let mut s = 0f64;
                for i in 0..n {
                    if u[a][i] == 0 {
                        continue;
                    }
                    for j in 0..n {
                        s += u[a][i] as f64 * u[b][j] as f64 * g0[i][j];
                    }
                }
                g[a][b] = s;
            }
        }
        g
    };
    let check_zero = |u: &mut Vec<Vec<i64>>, k: usize, relations: &mut Vec<Vec<i64>>| -> Result<bool, Error> {
        let pt = combination(curve, points, &u[k]);
        if pt.is_infinity() || curve.torsion_order_of(&pt).is_some() {
            relations.push(u.remove(k));
            Ok(true)
        } else {
            Err(Error::new(
                ErrorKind::InvalidValue,
                "LLL: a combination has numerically zero height but is not torsion; raise the precision",
            ))
        }
    };
    let mut k = 1usize;
    let mut steps = 0u64;
    // Remove initial zero vectors.
    let mut i = 0;
    while i < u.len() {
        if gram(&u)[i][i] < tol {
            check_zero(&mut u, i, &mut relations)?;
        } else {
            i += 1;
        }
    }
    while k < u.len() {
        steps += 1;
        if steps > 100_000 {
            return Err(Error::new(ErrorKind::InvalidValue, "LLL did not terminate (precision too low?)"));
        }
        let g = gram(&u);
        if g[k][k] < tol {
            check_zero(&mut u, k, &mut relations)?;
            k = k.max(1);
            continue;
        }
        // Gram-Schmidt from the Gram matrix.
        let m = u.len();
        let mut mu = vec![vec![0f64; m]; m];
        let mut bb = vec![0f64; m];
        for a in 0..=k {
            for b in 0..a {
                let mut s = g[a][b];
                for c in 0..b {
                    s -= mu[b][c] * mu[a][c] * bb[c];
                }
                mu[a][b] = if bb[b] > tol { s / bb[b] } else { 0.0 };
            }
            let mut s = g[a][a];
            for c in 0..a {
                s -= mu[a][c] * mu[a][c] * bb[c];
            }
            bb[a] = s;
        }
        // Size reduction of b_k.
        let mut changed = false;
        for j in (0..k).rev() {
            if bb[j] <= tol {
                continue;
            }
            let r = mu[k][j].round();
            if r != 0.0 {
                if r.abs() > 1e15 {
                    return Err(overflow());
                }
                let r = r as i64;
                for c in 0..n {
                    u[k][c] = u[k][c].checked_sub(r.checked_mul(u[j][c]).ok_or_else(overflow)?).ok_or_else(overflow)?;
                }
                for c in 0..j {
                    mu[k][c] -= r as f64 * mu[j][c];
                }
                mu[k][j] -= r as f64;
                changed = true;
            }
        }
        if changed {
            let g = gram(&u);
            if g[k][k] < tol {
                check_zero(&mut u, k, &mut relations)?;
                k = k.max(1);
                continue;
            }
            let mut s = g[k][k];
            for c in 0..k {
                s -= mu[k][c] * mu[k][c] * bb[c];
            }
            bb[k] = s;
        }
        if bb[k] < (0.99 - mu[k][k - 1] * mu[k][k - 1]) * bb[k - 1] {
            u.swap(k, k - 1);
            k = if k > 1 { k - 1 } else { 1 };
        } else {
            k += 1;
        }
    }
    let basis: Vec<Point> = u.iter().map(|c| combination(curve, points, c)).collect();
    let gram = pairing_unchecked(curve, local, &basis, prec)?;
    let mut transformation = u.clone();
    transformation.extend(relations.iter().cloned());
    Ok(LllReduction { points: basis, transformation, relations, gram })
}
