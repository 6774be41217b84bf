//! Exact linear algebra over Z by several primes: the determinant of a
//! square relation matrix `B` and the integer solutions `y` of
//! `y B = det(B) v` (Cramer's rule: `y_j` is the determinant of `B` with
//! row `j` replaced by `v`), each computed modulo word-size primes and put
//! together by the Chinese remainder theorem up to Hadamard's bound
//! (H. Cohen, GTM 138, §2.2.6 and §2.4.3: modular determinants and the
//! Hermite normal form modulo the determinant). The elimination skips
//! zero multipliers, so sparse relation rows cost little until fill-in.
//!
//! Nothing here is probabilistic: the number of primes is chosen so that
//! their product exceeds twice Hadamard's bound on the result, and the
//! caller checks `y B = D v` exactly all the same.
//!
//! Used by the kernel route of the class group (`sparse.rs`): the
//! determinant of `n` independent core rows and the Cramer solutions for
//! the other rows, from which the integral kernel is read modulo `det B`.
#![cfg_attr(not(test), allow(dead_code))]

use crate::arith::{inv_mod, is_prime_u64, mul_mod};
use malachite::base::num::arithmetic::traits::Mod;
use malachite::base::num::logic::traits::SignificantBits;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::Integer;

/// Primes just below `2^62`, largest first.
fn word_primes(count: usize) -> Vec<u64> {
    let mut out = Vec::with_capacity(count);
    let mut p = (1u64 << 62) - 1;
    while out.len() < count {
        if is_prime_u64(p) {
            out.push(p);
        }
        p -= 2;
    }
    out
}

/// `log2` of the Euclidean length of an integer row (at least 0).
pub(crate) fn log2_row_length(v: &[i64]) -> f64 {
    let s: f64 = v.iter().map(|&x| (x as f64) * (x as f64)).sum();
    (s.max(1.0)).log2() / 2.0
}

/// The LU factorisation of `B` modulo one prime (row operations only:
/// `L B = U` with `U` upper triangular up to the row order `perm`).
struct Factored {
    p: u64,
    /// `U`: row `k` holds the pivot row for column `k`.
    u: Vec<Vec<u64>>,
    /// The multipliers, column by column: `(target row, source row, factor)`
    /// in the order they were applied, on the original row numbering.
    ops: Vec<(usize, usize, u64)>,
    /// `perm[k]`: the original row used as pivot for column `k`.
    perm: Vec<usize>,
    det: u64,
}

fn factor(b: &[Vec<i64>], p: u64) -> Option<Factored> {
    let n = b.len();
    let mut a: Vec<Vec<u64>> = b.iter().map(|r| r.iter().map(|&x| x.rem_euclid(p as i64) as u64).collect()).collect();
    let mut used = vec![false; n];
    let mut perm = Vec::with_capacity(n);
    let mut ops = Vec::new();
    let mut det = 1u64;
    for c in 0..n {
        let piv = (0..n).find(|&i| !used[i] && a[i][c] != 0)?;
        used[piv] = true;
        perm.push(piv);
        det = mul_mod(det, a[piv][c], p);
        let inv = inv_mod(a[piv][c], p)?;
        let prow = a[piv].clone();
        for (i, row) in a.iter_mut().enumerate() {
            if used[i] || row[c] == 0 {
                continue;
            }
            let f = mul_mod(row[c], inv, p);
            for j in c..n {
                if prow[j] != 0 {
                    row[j] = (row[j] + p - mul_mod(f, prow[j], p)) % p;
                }
            }
            ops.push((i, piv, f));
        }
    }
    // the sign of the row permutation (pivot of column k is row perm[k])
    let mut seen = vec![false; n];
    let mut odd = false;
    for s in 0..n {
        if seen[s] {
            continue;
        }
        let mut len = 0;
        let mut t = s;
        while !seen[t] {
            seen[t] = true;
            t = perm[t];
            len += 1;
        }
        odd ^= len % 2 == 0;
    }
    if odd {
        det = (p - det) % p;
    }
    let u = perm.iter().map(|&i| a[i].clone()).collect();
    Some(Factored { p, u, ops, perm, det })
}

impl Factored {
    /// `y` with `y B = w` modulo `p`.
    fn solve_left(&self, w: &[u64]) -> Vec<u64> {
        let n = self.u.len();
        let p = self.p;
        // y B = w: with L B = U (L the product of the row operations),
        // y = z L where z U = w (U's rows in pivot order, upper triangular)
        let mut z = vec![0u64; n];
        let mut r = w.to_vec();
        for k in 0..n {
            let inv = inv_mod(self.u[k][k], p).unwrap_or(0);
            z[k] = mul_mod(r[k], inv, p);
            if z[k] != 0 {
                for j in k + 1..n {
                    if self.u[k][j] != 0 {
                        r[j] = (r[j] + p - mul_mod(z[k], self.u[k][j], p)) % p;
                    }
                }
            }
        }
        // z is indexed by column k, i.e. by row perm[k] of the reduced matrix
        let mut y = vec![0u64; n];
        for (k, &row) in self.perm.iter().enumerate() {
            y[row] = z[k];
        }
        // y_reduced = y_orig L^-1 ... undo: reduced row i = row i - f row src,
        // so y_orig[src] -= f y_red[i] for each op, in reverse order
        for &(i, src, f) in self.ops.iter().rev() {
            if y[i] != 0 {
                y[src] = (y[src] + p - mul_mod(f, y[i], p)) % p;
            }
        }
        y
    }
}

/// `det B mod p` by elimination in words.
fn det_mod_p(b: &[Vec<i64>], p: u64) -> u64 {
    let n = b.len();
    let mut a: Vec<Vec<u64>> = b.iter().map(|r| r.iter().map(|&x| x.rem_euclid(p as i64) as u64).collect()).collect();
    let mut det = 1u64;
    for c in 0..n {
        let Some(piv) = (c..n).find(|&i| a[i][c] != 0) else { return 0 };
        if piv != c {
            a.swap(piv, c);
            det = (p - det) % p;
        }
        det = mul_mod(det, a[c][c], p);
        let inv = inv_mod(a[c][c], p).unwrap_or(0);
        let (top, rest) = a.split_at_mut(c + 1);
        let prow = &top[c];
        for row in rest.iter_mut() {
            if row[c] == 0 {
                continue;
            }
            let f = mul_mod(row[c], inv, p);
            for j in c..n {
                if prow[j] != 0 {
                    row[j] = (row[j] + p - mul_mod(f, prow[j], p)) % p;
                }
            }
        }
    }
    det
}

/// The exact determinant of a square integer matrix, by word primes and
/// the Chinese remainder theorem up to twice Hadamard's bound.
pub(crate) fn determinant(rows: &[Vec<i64>]) -> Integer {
    let bits: f64 = rows.iter().map(|r| log2_row_length(r)).sum::<f64>() + 2.0;
    let count = (bits / 61.0).ceil() as usize + 1;
    let primes = word_primes(count);
    let dets: Vec<u64> = primes.iter().map(|&p| det_mod_p(rows, p)).collect();
    let modulus = primes.iter().fold(Integer::ONE, |m, &p| m * Integer::from(p));
    crt(&dets, &primes, &modulus)
}

/// A square integer matrix `B` (rows) with its exact determinant, set up
/// to solve `y B = det(B) v` exactly.
pub(crate) struct ExactSolver {
    rows: Vec<Vec<i64>>,
    factored: Vec<Factored>,
    modulus: Integer,
    /// `log2` of the product of the row lengths of `B`.
    log2_hadamard: f64,
    /// The determinant.
    pub(crate) det: Integer,
}

/// The symmetric residue of `x` modulo `m`.
fn symmetric(x: Integer, m: &Integer) -> Integer {
    let r = x.mod_op(m);
    if &r + &r > *m { r - m } else { r }
}

/// Chinese remaindering of `residues[i] mod primes[i]`, symmetric.
fn crt(residues: &[u64], primes: &[u64], modulus: &Integer) -> Integer {
    let mut x = Integer::ZERO;
    let mut m = Integer::ONE;
    for (&r, &p) in residues.iter().zip(primes) {
        // x' = x + m t with x + m t = r (mod p)
        let mp = crate::numfield::linalg::mod_word(&m, p);
        let xp = crate::numfield::linalg::mod_word(&x, p);
        let t = mul_mod((r + p - xp) % p, inv_mod(mp, p).unwrap_or(0), p);
        x += &m * Integer::from(t);
        m *= Integer::from(p);
    }
    symmetric(x, modulus)
}

/// Bits that bound `2 |y_j| + 1` for `y = v adj(B)` (see `ExactSolver::new`).
fn solution_bits(log2_hadamard: f64, v_log2: f64, n: usize) -> f64 {
    log2_hadamard + v_log2 + 0.5 * (n.max(1) as f64).log2() + 4.0
}

impl ExactSolver {
    /// Sets up `B`; `extra_log2` is a bound on `log2 |v|` for the right-hand
    /// sides to come. `None` if `B` is singular.
    pub(crate) fn new(rows: Vec<Vec<i64>>, extra_log2: f64) -> Option<ExactSolver> {
        let log2_hadamard: f64 = rows.iter().map(|r| log2_row_length(r)).sum();
        // y = D v B^-1 = v adj(B): the cofactors are (n-1)-minors, at most
        // H = prod |b_i| (Hadamard; rows of length >= 1), so |y_j| <=
        // |v|_1 H <= sqrt(n) |v| H; the determinant is at most H. (The
        // result is checked exactly in `solve` all the same.)
        let bits = solution_bits(log2_hadamard, extra_log2, rows.len());
        let mut factored = Vec::new();
        let mut modulus = Integer::ONE;
        let mut tried = 0;
        for p in word_primes(((bits / 61.0).ceil() as usize + 1) * 2 + 8) {
            if (modulus.significant_bits() as f64) > bits + 2.0 {
                break;
            }
            tried += 1;
            match factor(&rows, p) {
                Some(f) => {
                    modulus *= Integer::from(p);
                    factored.push(f);
                }
                None => {
                    // singular modulo p: singular over Q unless p divides the determinant
                    if tried > 3 && factored.is_empty() {
                        return None;
                    }
                }
            }
        }
        if (modulus.significant_bits() as f64) <= bits + 2.0 {
            return None;
        }
        let dets: Vec<u64> = factored.iter().map(|f| f.det).collect();
        let primes: Vec<u64> = factored.iter().map(|f| f.p).collect();
        let det = crt(&dets, &primes, &modulus);
        if det == 0 {
            return None;
        }
        Some(ExactSolver { rows, factored, modulus, log2_hadamard, det })
    }

    /// `y` with `y B = det(B) v`, checked exactly; `None` when `v` is
    /// longer than promised.
    pub(crate) fn solve(&self, v: &[i64], v_log2: f64) -> Option<Vec<Integer>> {
        if solution_bits(self.log2_hadamard, v_log2, self.rows.len()) > self.modulus.significant_bits() as f64 {
            return None;
        }
        let n = self.rows.len();
        let mut res: Vec<Vec<u64>> = vec![Vec::with_capacity(self.factored.len()); n];
        for f in &self.factored {
            let p = f.p;
            let dp = crate::numfield::linalg::mod_word(&self.det, p);
            let w: Vec<u64> = v.iter().map(|&x| mul_mod(x.rem_euclid(p as i64) as u64, dp, p)).collect();
            for (j, yj) in f.solve_left(&w).into_iter().enumerate() {
                res[j].push(yj);
            }
        }
        let primes: Vec<u64> = self.factored.iter().map(|f| f.p).collect();
        let y: Vec<Integer> = res.iter().map(|r| crt(r, &primes, &self.modulus)).collect();
        // exact check: sum y_j B_j = D v
        for c in 0..n {
            let mut s = Integer::ZERO;
            for (yj, row) in y.iter().zip(&self.rows) {
                if row[c] != 0 {
                    s += yj * Integer::from(row[c]);
                }
            }
            if s != &self.det * Integer::from(v[c]) {
                return None;
            }
        }
        Some(y)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numfield::linalg::det;

    #[test]
    fn plain_determinant_agrees_with_bareiss() {
        // two ways: word primes and CRT against Bareiss' exact elimination
        let mut s = 99u64;
        for n in 1..12usize {
            for _ in 0..5 {
                let rows: Vec<Vec<i64>> = (0..n)
                    .map(|_| {
                        (0..n)
                            .map(|_| {
                                s ^= s << 13;
                                s ^= s >> 7;
                                s ^= s << 17;
                                (s % 41) as i64 - 20
                            })
                            .collect()
                    })
                    .collect();
                let big: Vec<Vec<Integer>> = rows.iter().map(|r| r.iter().map(|&x| Integer::from(x)).collect()).collect();
                assert_eq!(determinant(&rows), det(&big));
            }
        }
    }

    #[test]
    fn modular_determinant_and_solutions_agree_with_bareiss() {
        // two ways: the multi-prime determinant against Bareiss' exact
        // elimination, and y B = D v checked by integer arithmetic
        let mut s = 12345u64;
        let mut rnd = || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        };
        for n in [1usize, 2, 3, 5, 8, 20] {
            for _ in 0..5 {
                let b: Vec<Vec<i64>> = (0..n).map(|_| (0..n).map(|_| if rnd() % 3 == 0 { (rnd() % 11) as i64 - 5 } else { 0 }).collect()).collect();
                let bi: Vec<Vec<Integer>> = b.iter().map(|r| r.iter().map(|&x| Integer::from(x)).collect()).collect();
                let d = det(&bi);
                match ExactSolver::new(b.clone(), 10.0) {
                    None => assert_eq!(d, 0),
                    Some(es) => {
                        assert_eq!(es.det, d);
                        let v: Vec<i64> = (0..n).map(|_| (rnd() % 21) as i64 - 10).collect();
                        let y = es.solve(&v, log2_row_length(&v)).unwrap();
                        for c in 0..n {
                            let s: Integer = y.iter().zip(&bi).map(|(a, r)| a * &r[c]).sum();
                            assert_eq!(s, &d * Integer::from(v[c]));
                        }
                    }
                }
            }
        }
    }
}
