//! Linear algebra over Z, Q and F_p for the small matrices of the module:
//! Hermite normal form (modulo a known multiple of the determinant),
//! Smith invariants, Bareiss determinants, rational solves, kernels mod p.
//!
//! Matrices are `Vec` of rows. The Hermite normal form here is the
//! *row-style lower-triangular* one: row `i` has zeros after column `i`,
//! positive diagonal, and entries left of a diagonal entry reduced into
//! `0..diagonal` of their column.
//!
//! Reference: H. Cohen, GTM 138, §2.4 (Algorithms 2.4.5, 2.4.8 and 2.4.14)
//! and §2.2 (Bareiss, Algorithm 2.2.6).

use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{DivRound, Mod, Sign, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Rational};
use std::cmp::Ordering;

/// Floor division of integers (`b != 0`).
pub(crate) fn fdiv(a: &Integer, b: &Integer) -> Integer {
    a.div_round(b, RoundingMode::Floor).0
}

/// Hermite normal form of the lattice spanned by `gens` (rows of length
/// `n`), which must have rank `n`. If `modulus` is `Some(d)`, then `d Z^n`
/// must lie in the lattice (it is then used to keep entries below `d`).
pub(crate) fn hnf(gens: &[Vec<Integer>], n: usize, modulus: Option<&Integer>) -> Result<Vec<Vec<Integer>>, Error> {
    let d = modulus.map(|d| d.unsigned_abs()).map(Integer::from);
    let mut work: Vec<Vec<Integer>> = gens.iter().filter(|r| r.iter().any(|x| *x != 0)).cloned().collect();
    if let Some(d) = &d {
        for r in work.iter_mut() {
            for x in r.iter_mut() {
                *x = (&*x).mod_op(d);
            }
        }
    }
    let mut piv: Vec<Option<Vec<Integer>>> = vec![None; n];
    for col in (0..n).rev() {
        if let Some(d) = &d {
            let mut e = vec![Integer::ZERO; n];
            e[col] = d.clone();
            work.push(e);
        }
        // Euclid on column `col`
        loop {
            let mut best: Option<usize> = None;
            for (i, r) in work.iter().enumerate() {
                if r[col] != 0 && best.is_none_or(|b| (&r[col]).unsigned_abs() < (&work[b][col]).unsigned_abs()) {
                    best = Some(i);
                }
            }
            let Some(b) = best else { break };
            let pivot = work[b].clone();
            let mut others = 0;
            for (i, r) in work.iter_mut().enumerate() {
                if i == b || r[col] == 0 {
                    continue;
                }
                let q = fdiv(&r[col], &pivot[col]);
                for j in 0..=col {
                    let t = &q * &pivot[j];
                    r[j] -= t;
                }
                if r[col] != 0 {
                    others += 1;
                }
            }
            if others == 0 {
                let mut p = work.swap_remove(b);
                if p[col] < 0 {
                    for x in p.iter_mut() {
                        *x = -&*x;
                    }
                }
                piv[col] = Some(p);
                break;
            }
        }
        work.retain(|r| r[..col].iter().any(|x| *x != 0));
        if let Some(d) = &d {
            for r in work.iter_mut() {
                for x in r.iter_mut() {
                    *x = (&*x).mod_op(d);
                }
            }
            if let Some(p) = piv[col].as_mut() {
                for x in p[..col].iter_mut() {
                    *x = (&*x).mod_op(d);
                }
            }
            work.retain(|r| r[..col].iter().any(|x| *x != 0));
        }
        if piv[col].is_none() {
            return Err(Error::new(ErrorKind::InvalidValue, "lattice of deficient rank"));
        }
    }
    let mut h: Vec<Vec<Integer>> = piv.into_iter().map(|r| r.unwrap_or_default()).collect();
    // size-reduce below the diagonal, from the right
    for i in 0..n {
        for j in (0..i).rev() {
            let q = fdiv(&h[i][j], &h[j][j]);
            if q != 0 {
                let rj = h[j].clone();
                for k in 0..=j {
                    let t = &q * &rj[k];
                    h[i][k] -= t;
                }
            }
        }
    }
    Ok(h)
}


/// Extended gcd of words: `(g, u, v)` with `u a + v b = g = gcd(a, b)`
/// (`|u| <= b / g`, `|v| <= a / g`, so both fit in `i64` for `a, b < 2^63`).
fn xgcd_word(a: u64, b: u64) -> (u64, i64, i64) {
    let (mut r0, mut r1) = (a as i128, b as i128);
    let (mut s0, mut s1) = (1i128, 0i128);
    let (mut t0, mut t1) = (0i128, 1i128);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (s0, s1) = (s1, s0 - q * s1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    (r0 as u64, s0 as i64, t0 as i64)
}

/// `(u x + v y) mod r` in `0..r` for `x, y < r < 2^62`, `|u|, |v| < 2^63`:
/// in `i64` when everything is below `2^31`, else in `i128`.
#[inline]
fn lin_mod(u: i64, x: u64, v: i64, y: u64, r: u64) -> u64 {
    if r < (1 << 31) && u.unsigned_abs() < (1 << 31) && v.unsigned_abs() < (1 << 31) {
        (u * x as i64 + v * y as i64).rem_euclid(r as i64) as u64
    } else {
        (u as i128 * x as i128 + v as i128 * y as i128).rem_euclid(r as i128) as u64
    }
}

/// The Hermite normal form (the convention of [`hnf`]: row `i` has its
/// pivot at `i`, entries left of it reduced into `0..h[i][i]`) of the
/// lattice spanned by the integer rows `gens` (length `n`), which must
/// contain `d Z^n`, `0 < d < 2^62`: H. Cohen, GTM 138, Algorithm 2.4.8
/// (the Hermite form modulo `D`, the modulus divided by each pivot found),
/// in machine words. The class group's relation cores, whose lattice
/// index is small beside their determinants.
pub(crate) fn hnf_mod_word(gens: &[Vec<i64>], n: usize, d: u64) -> Vec<Vec<u64>> {
    debug_assert!(d > 0 && d < (1 << 62));
    let mut r = d;
    let mut work: Vec<Vec<u64>> = gens
        .iter()
        .map(|g| g.iter().map(|&x| x.rem_euclid(d as i64) as u64).collect::<Vec<u64>>())
        .filter(|g| g.iter().any(|&x| x != 0))
        .collect();
    let mut h: Vec<Vec<u64>> = vec![Vec::new(); n];
    for col in (0..n).rev() {
        // Euclid on column `col` between a pivot row and each other row
        let mut piv: Option<usize> = None;
        for i in 0..work.len() {
            if work[i][col] == 0 {
                continue;
            }
            let Some(pi) = piv else {
                piv = Some(i);
                continue;
            };
            let (a, b) = (work[pi][col], work[i][col]);
            let (lo, hi) = if pi < i { (pi, i) } else { (i, pi) };
            let (first, second) = work.split_at_mut(hi);
            let (p, w) = if pi < i { (&mut first[lo], &mut second[0]) } else { (&mut second[0], &mut first[lo]) };
            if b % a == 0 {
                // w -= (b / a) p
                let q = ((b / a) % r) as i64;
                for j in 0..=col {
                    if p[j] != 0 {
                        w[j] = lin_mod(1, w[j], -q, p[j], r);
                    }
                }
            } else {
                let (g, u, v) = xgcd_word(a, b);
                let (a1, b1) = ((a / g) as i64, (b / g) as i64);
                for j in 0..=col {
                    let (x, y) = (p[j], w[j]);
                    if x == 0 && y == 0 {
                        continue;
                    }
                    p[j] = lin_mod(u, x, v, y, r);
                    w[j] = lin_mod(a1, y, -b1, x, r);
                }
            }
        }
        // the pivot: gcd with r (r e_col lies in the lattice)
        let x = piv.map_or(0, |pi| work[pi][col]);
        let (g, u, _) = xgcd_word(x, r);
        let mut row = vec![0u64; n];
        if let Some(pi) = piv {
            let u = u.rem_euclid(r as i64);
            for j in 0..col {
                row[j] = lin_mod(u, work[pi][j], 0, 0, r);
            }
            work.swap_remove(pi);
        }
        row[col] = g;
        h[col] = row;
        r /= g;
        for w in work.iter_mut() {
            for x in w[..col].iter_mut() {
                *x %= r;
            }
        }
        work.retain(|w| w[..col].iter().any(|&x| x != 0));
    }
    // size reduction below the diagonal, modulo d (d e_k lies in the lattice)
    for i in 0..n {
        for j in (0..i).rev() {
            let q = h[i][j] / h[j][j];
            if q != 0 {
                let q = (q % d) as i64;
                for k in 0..=j {
                    let y = h[j][k];
                    h[i][k] = lin_mod(1, h[i][k], -q, y, d);
                }
            }
        }
    }
    h
}

/// Product of the diagonal of a triangular matrix.
#[cfg(test)]
pub(crate) fn diag_product(h: &[Vec<Integer>]) -> Integer {
    h.iter().enumerate().fold(Integer::ONE, |acc, (i, r)| acc * &r[i])
}

/// Determinant of a square integer matrix by Bareiss' fraction-free elimination.
pub(crate) fn det(m: &[Vec<Integer>]) -> Integer {
    let n = m.len();
    if n == 0 {
        return Integer::ONE;
    }
    let mut a: Vec<Vec<Integer>> = m.to_vec();
    let mut sign = Integer::ONE;
    let mut prev = Integer::ONE;
    for k in 0..n - 1 {
        if a[k][k] == 0 {
            match (k + 1..n).find(|&i| a[i][k] != 0) {
                Some(i) => {
                    a.swap(i, k);
                    sign = -sign;
                }
                None => return Integer::ZERO,
            }
        }
        for i in k + 1..n {
            for j in k + 1..n {
                let v = (&a[i][j] * &a[k][k] - &a[i][k] * &a[k][j]) / &prev;
                a[i][j] = v;
            }
        }
        prev = a[k][k].clone();
    }
    sign * &a[n - 1][n - 1]
}

/// Solves `x M = b` over Q for square invertible `M` (row vector `x`);
/// `None` if `M` is singular.
pub(crate) fn solve_left(m: &[Vec<Rational>], b: &[Rational]) -> Option<Vec<Rational>> {
    let n = m.len();
    // x M = b  <=>  M^T x^T = b^T
    let mut a: Vec<Vec<Rational>> = (0..n).map(|i| {
        let mut row: Vec<Rational> = (0..n).map(|j| m[j][i].clone()).collect();
        row.push(b[i].clone());
        row
    }).collect();
    for c in 0..n {
        let p = (c..n).find(|&i| a[i][c] != 0)?;
        a.swap(p, c);
        let inv = Rational::ONE / &a[c][c];
        for x in a[c].iter_mut() {
            *x *= &inv;
        }
        for i in 0..n {
            if i != c && a[i][c] != 0 {
                let f = a[i][c].clone();
                for j in c..=n {
                    let t = &f * &a[c][j];
                    a[i][j] -= t;
                }
            }
        }
    }
    Some(a.into_iter().map(|r| r[n].clone()).collect())
}

/// Left kernel mod p: a basis of `{x : x A = 0}` for the `m x k` matrix `A`
/// over F_p (entries already reduced), as rows of length `m`.
pub(crate) fn left_kernel_mod_p(a: &[Vec<u64>], k: usize, p: u64) -> Vec<Vec<u64>> {
    use crate::arith::{inv_mod, mul_mod};
    let m = a.len();
    // augmented [A | I], row reduce on the first k columns
    let mut rows: Vec<Vec<u64>> = a.iter().enumerate().map(|(i, r)| {
        let mut v = r.clone();
        v.resize(k, 0);
        v.extend((0..m).map(|j| u64::from(i == j)));
        v
    }).collect();
    let mut r0 = 0;
    for c in 0..k {
        let Some(pr) = (r0..m).find(|&i| rows[i][c] != 0) else { continue };
        rows.swap(pr, r0);
        let inv = inv_mod(rows[r0][c], p).unwrap_or(1);
        for x in rows[r0].iter_mut() {
            *x = mul_mod(*x, inv, p);
        }
        let pivot = rows[r0].clone();
        for (i, row) in rows.iter_mut().enumerate() {
            if i != r0 && row[c] != 0 {
                let f = row[c];
                for (x, &y) in row.iter_mut().zip(&pivot) {
                    *x = (*x + p - mul_mod(f, y, p)) % p;
                }
            }
        }
        r0 += 1;
    }
    rows[r0..].iter().map(|r| r[k..].to_vec()).collect()
}

/// Rank of a matrix over F_p.
#[cfg(test)]
pub(crate) fn rank_mod_p(a: &[Vec<u64>], p: u64) -> usize {
    let k = a.first().map_or(0, |r| r.len());
    a.len() - left_kernel_mod_p(a, k, p).len()
}

/// The Smith invariants `d_1 | d_2 | ... ` (those > 1 only) of a square
/// non-singular integer matrix.
pub(crate) fn smith_invariants(m: &[Vec<Integer>]) -> Vec<Integer> {
    let n = m.len();
    let mut a: Vec<Vec<Integer>> = m.to_vec();
    let mut out = Vec::new();
    for t in 0..n {
        loop {
            // pivot: smallest non-zero in the remaining block
            let mut best: Option<(usize, usize)> = None;
            for i in t..n {
                for j in t..n {
                    if a[i][j] != 0 && best.is_none_or(|(bi, bj)| (&a[i][j]).unsigned_abs() < (&a[bi][bj]).unsigned_abs()) {
                        best = Some((i, j));
                    }
                }
            }
            let Some((bi, bj)) = best else {
                out.push(Integer::ZERO);
                break;
            };
            a.swap(t, bi);
            for r in a.iter_mut() {
                r.swap(t, bj);
            }
            let mut done = true;
            for i in t + 1..n {
                if a[i][t] != 0 {
                    let q = fdiv(&a[i][t], &a[t][t]);
                    let rt = a[t].clone();
                    for j in t..n {
                        let v = &q * &rt[j];
                        a[i][j] -= v;
                    }
                    if a[i][t] != 0 {
                        done = false;
                    }
                }
            }
            for j in t + 1..n {
                if a[t][j] != 0 {
                    let q = fdiv(&a[t][j], &a[t][t]);
                    for i in t..n {
                        let v = &q * &a[i][t];
                        a[i][j] -= v;
                    }
                    if a[t][j] != 0 {
                        done = false;
                    }
                }
            }
            if !done {
                continue;
            }
            // divisibility condition
            let d = a[t][t].clone();
            let mut bad = None;
            'o: for i in t + 1..n {
                for j in t + 1..n {
                    if (&a[i][j]).mod_op(&d) != 0 {
                        bad = Some(i);
                        break 'o;
                    }
                }
            }
            if let Some(i) = bad {
                for j in t..n {
                    let v = a[i][j].clone();
                    a[t][j] += v;
                }
                continue;
            }
            out.push(d.unsigned_abs().into());
            break;
        }
    }
    out.sort_by(|x: &Integer, y: &Integer| match (x.sign(), y.sign()) {
        (Ordering::Equal, _) | (_, Ordering::Equal) => y.sign().cmp(&x.sign()),
        _ => x.cmp(y),
    });
    out.into_iter().filter(|d| *d != 1).collect()
}

/// `x mod p` in `0..p` as a word, for a word-sized modulus `p > 0`.
/// Horner over the limbs of `|x|` from the top, in `u128`: no allocation
/// (the character and residue loops call it for every coordinate).
pub(crate) fn mod_word(x: &Integer, p: u64) -> u64 {
    debug_assert!(p > 0);
    let m = p as u128;
    let r = x.unsigned_abs_ref().limbs().rev().fold(0u128, |r, limb| ((r << 64) | limb as u128) % m) as u64;
    if r != 0 && *x < 0 {
        p - r
    } else {
        r
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&x| Integer::from(x)).collect()
    }

    #[test]
    fn word_hermite_form_agrees_with_the_multiprecision_one() {
        // two ways: Cohen 2.4.8 in words against the Euclidean Hermite form
        // over Z (modulus None), on random integer matrices of full rank,
        // with the modulus a multiple of the determinant (small and large)
        let mut s = 12345u64;
        let mut rnd = move || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        };
        let mut tried = 0;
        for trial in 0..200 {
            let n = 1 + trial % 9;
            let m = n + (trial % 4);
            let rows: Vec<Vec<i64>> = (0..m)
                .map(|_| (0..n).map(|_| if rnd() % 3 == 0 { 0 } else { (rnd() % 13) as i64 - 6 }).collect())
                .collect();
            let gens: Vec<Vec<Integer>> = rows.iter().map(|r| r.iter().map(|&x| Integer::from(x)).collect()).collect();
            let Ok(full) = hnf(&gens, n, None) else { continue };
            let h: Integer = diag_product(&full);
            let Ok(hw) = u64::try_from(&h) else { continue };
            for mult in [1u64, 7, 1 << 20, 1_000_003 * 999_983] {
                let Some(d) = hw.checked_mul(mult).filter(|&d| d < (1 << 62)) else { continue };
                let word = hnf_mod_word(&rows, n, d);
                let as_int: Vec<Vec<Integer>> = word.iter().map(|r| r.iter().map(|&x| Integer::from(x)).collect()).collect();
                assert_eq!(as_int, full, "trial {trial}, d = {d}");
                tried += 1;
            }
        }
        assert!(tried > 300, "{tried}");
    }

    #[test]
    fn word_residues_agree_with_the_multiprecision_remainder() {
        // two ways: the limb-wise Horner residue against malachite's `mod_op`
        let mut s = 0x9e37_79b9_7f4a_7c15u64;
        let mut next = || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        };
        for k in 0..2000 {
            let mut x = Integer::from(next());
            for _ in 0..(k % 5) {
                x = x * Integer::from(next()) + Integer::from(next() >> (k % 64));
            }
            if k % 2 == 1 {
                x = -x;
            }
            for p in [2u64, 3, 65537, u64::MAX - 58, 1 + (next() >> 1), (1 << 63) + 29] {
                let want: Integer = (&x).mod_op(Integer::from(p));
                assert_eq!(Integer::from(mod_word(&x, p)), want, "{x} mod {p}");
            }
        }
        assert_eq!(mod_word(&Integer::ZERO, 7), 0);
        assert_eq!(mod_word(&Integer::from(-14), 7), 0);
        assert_eq!(mod_word(&Integer::from(-15), 7), 6);
    }

    #[test]
    fn hnf_known_and_modular_agree() {
        // lattice spanned by (2,0),(1,3),(0,6): index 6 = |det| of any basis; worked by hand:
        // HNF rows (2,0), (a,3) with a in 0..2, (1,3) in lattice -> a = 1
        let g = vec![z(&[2, 0]), z(&[1, 3]), z(&[0, 6])];
        let h = hnf(&g, 2, None).unwrap();
        assert_eq!(h, vec![z(&[2, 0]), z(&[1, 3])]);
        let h2 = hnf(&g, 2, Some(&Integer::from(6))).unwrap();
        assert_eq!(h, h2);
        // random 3x3: det(HNF) = |det|, and HNF mod |det| is the same
        let mut s = 12345u64;
        for _ in 0..200 {
            let mut m = Vec::new();
            for _ in 0..3 {
                let mut r = Vec::new();
                for _ in 0..3 {
                    s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
                    r.push(Integer::from((s >> 33) as i64 % 21 - 10));
                }
                m.push(r);
            }
            let d = det(&m);
            if d == 0 {
                assert!(hnf(&m, 3, None).is_err());
                continue;
            }
            let h = hnf(&m, 3, None).unwrap();
            assert_eq!(diag_product(&h), Integer::from((&d).unsigned_abs()));
            assert_eq!(hnf(&m, 3, Some(&d)).unwrap(), h);
        }
    }

    #[test]
    fn smith_known() {
        // diag(2,3) ~ diag(1,6) (Chinese remainder theorem)
        let m = vec![z(&[2, 0]), z(&[0, 3])];
        assert_eq!(smith_invariants(&m), z(&[6]));
        let m = vec![z(&[2, 0, 0]), z(&[0, 4, 0]), z(&[0, 0, 4])];
        assert_eq!(smith_invariants(&m), z(&[2, 4, 4]));
    }

    /// The Smith invariants against the determinantal divisors: the product
    /// `d_1 ... d_k` of the first `k` invariants is the gcd of all `k x k`
    /// minors (H. J. S. Smith 1861; Cohen GTM 138, §2.4.4), on random
    /// non-singular 3 x 3 and 4 x 4 matrices, brute force over the minors.
    #[test]
    fn smith_invariants_are_the_quotients_of_determinantal_divisors() {
        use malachite::base::num::arithmetic::traits::Gcd;
        fn subsets(n: usize, k: usize) -> Vec<Vec<usize>> {
            (0u32..(1 << n)).filter(|m| m.count_ones() as usize == k).map(|m| (0..n).filter(|i| m >> i & 1 == 1).collect()).collect()
        }
        let mut seed = 0x2545f4914f6cdd1du64;
        let mut tried = 0;
        for n in [3usize, 4] {
            let mut done = 0;
            while done < 60 {
                let m: Vec<Vec<Integer>> = (0..n)
                    .map(|_| {
                        (0..n)
                            .map(|_| {
                                seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
                                // small entries, many with common factors
                                Integer::from(((seed >> 33) % 13) as i64 - 6) * Integer::from(1 + ((seed >> 50) % 3) as i64)
                            })
                            .collect()
                    })
                    .collect();
                tried += 1;
                if det(&m) == 0 {
                    continue;
                }
                done += 1;
                let inv = smith_invariants(&m);
                let mut full = vec![Integer::from(1); n - inv.len()];
                full.extend(inv.iter().cloned());
                for w in full.windows(2) {
                    assert_eq!(&w[1] % &w[0], 0, "{full:?} not a divisor chain");
                }
                let mut prod = Integer::from(1);
                for k in 1..=n {
                    prod *= &full[k - 1];
                    let mut g = malachite::Natural::from(0u32);
                    for rows in subsets(n, k) {
                        for cols in subsets(n, k) {
                            let sub: Vec<Vec<Integer>> = rows.iter().map(|&r| cols.iter().map(|&c| m[r][c].clone()).collect()).collect();
                            g = g.gcd((&det(&sub)).unsigned_abs());
                        }
                    }
                    assert_eq!(Integer::from(g), prod, "k = {k}: {m:?} gives {full:?}");
                }
            }
        }
        assert!(tried >= 120);
    }

    #[test]
    fn kernel_mod_p_is_kernel() {
        let a = vec![vec![1u64, 2], vec![2, 4], vec![0, 1]];
        let k = left_kernel_mod_p(&a, 2, 7);
        assert_eq!(k.len(), 1);
        assert_eq!(k[0], vec![5, 1, 0]); // -2*row0 + row1 = 0
        assert_eq!(rank_mod_p(&a, 7), 2);
    }
}
