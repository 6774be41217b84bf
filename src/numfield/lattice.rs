//! Exact lattice reduction of integer vectors: the integral LLL algorithm
//! (H. Cohen, GTM 138, Algorithm 2.6.7, after de Weger), which keeps the
//! Gram-Schmidt data as the integers `d_i` (Gram determinants) and
//! `lambda_ij = d_j mu_ij`, so no rational arithmetic and no rounding
//! error; and size reduction of one more vector against the reduced basis
//! (Babai's nearest plane: the reduction steps from the last basis vector
//! down to the first).
//!
//! Used to shorten the exponent vectors of units: the exponent vectors of
//! products equal to roots of unity form a lattice, and a unit's vector
//! may be moved by any of its elements.

use malachite::base::num::arithmetic::traits::{Abs, DivRound};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::rounding_modes::RoundingMode;
use malachite::Integer;

fn dot(a: &[Integer], b: &[Integer]) -> Integer {
    let mut s = Integer::ZERO;
    for (x, y) in a.iter().zip(b) {
        if *x != 0u32 && *y != 0u32 {
            s += x * y;
        }
    }
    s
}

fn axpy(a: &mut [Integer], q: &Integer, b: &[Integer]) {
    for (x, y) in a.iter_mut().zip(b) {
        if *y != 0u32 {
            *x -= q * y;
        }
    }
}

/// The integral LLL state (indices from 1, as in Cohen's statement).
struct Lll {
    b: Vec<Vec<Integer>>,
    d: Vec<Integer>,
    lam: Vec<Vec<Integer>>,
}

impl Lll {
    /// Gram-Schmidt data of vector `k` against `1..k` (step 2); false
    /// when it depends on them (`d_k = 0`).
    fn gso(&mut self, k: usize) -> bool {
        for j in 1..=k {
            let mut u = dot(&self.b[k], &self.b[j]);
            for i in 1..j {
                u = (&self.d[i] * u - &self.lam[k][i] * &self.lam[j][i]) / &self.d[i - 1];
            }
            if j < k {
                self.lam[k][j] = u;
            } else {
                if u == 0u32 {
                    return false;
                }
                self.d[k] = u;
            }
        }
        true
    }

    fn red(&mut self, k: usize, l: usize) {
        let two = Integer::from(2);
        if &two * (&self.lam[k][l]).abs() > self.d[l] {
            let q = (&self.lam[k][l]).div_round(&self.d[l], RoundingMode::Nearest).0;
            let bl = self.b[l].clone();
            axpy(&mut self.b[k], &q, &bl);
            self.lam[k][l] -= &q * &self.d[l];
            for i in 1..l {
                let t = &q * &self.lam[l][i];
                self.lam[k][i] -= t;
            }
        }
    }

    fn swap(&mut self, k: usize, kmax: usize) {
        self.b.swap(k, k - 1);
        for j in 1..k - 1 {
            let t = self.lam[k][j].clone();
            self.lam[k][j] = self.lam[k - 1][j].clone();
            self.lam[k - 1][j] = t;
        }
        let lam = self.lam[k][k - 1].clone();
        let bb = (&self.d[k - 2] * &self.d[k] + &lam * &lam) / &self.d[k - 1];
        for i in k + 1..=kmax {
            let t = self.lam[i][k].clone();
            self.lam[i][k] = (&self.d[k] * &self.lam[i][k - 1] - &lam * &t) / &self.d[k - 1];
            self.lam[i][k - 1] = (&bb * &t + &lam * &self.lam[i][k]) / &self.d[k];
        }
        self.d[k - 1] = bb;
    }
}

/// LLL-reduces (delta = 3/4) the independent vectors among `vecs` (a
/// vector depending on the ones before it is left out), then size-reduces
/// `target` against them; returns the reduced basis and the new target
/// (`target` minus a lattice vector).
pub(crate) fn reduce_and_shorten(vecs: Vec<Vec<Integer>>, target: Vec<Integer>, stop: &dyn Fn() -> bool) -> (Vec<Vec<Integer>>, Vec<Integer>) {
    let n = vecs.len();
    let mut st = Lll { b: Vec::with_capacity(n + 2), d: vec![Integer::ONE; n + 2], lam: vec![vec![Integer::ZERO; n + 2]; n + 2] };
    st.b.push(Vec::new());
    let mut kmax = 0;
    for v in vecs {
        // incremental: add the vector, keep it if independent, then reduce
        st.b.push(v);
        let k0 = kmax + 1;
        if !st.gso(k0) {
            st.b.pop();
            continue;
        }
        kmax = k0;
        let mut k = k0.max(2);
        while k <= kmax && kmax >= 2 {
            if stop() {
                break;
            }
            st.red(k, k - 1);
            let lhs = &st.d[k] * &st.d[k - 2] * Integer::from(4);
            let rhs = Integer::from(3) * &st.d[k - 1] * &st.d[k - 1] - Integer::from(4) * &st.lam[k][k - 1] * &st.lam[k][k - 1];
            if lhs < rhs {
                st.swap(k, kmax);
                k = (k - 1).max(2);
            } else {
                for l in (1..k - 1).rev() {
                    st.red(k, l);
                }
                k += 1;
            }
        }
    }
    // the target, vector kmax + 1: its data, then nearest plane
    let t = kmax + 1;
    st.b.push(target);
    // (a target in the span of the basis has d_t = 0; its lambdas are set all the same)
    let _ = st.gso(t);
    for l in (1..t).rev() {
        st.red(t, l);
    }
    let target = st.b.pop().unwrap_or_default();
    st.b.remove(0);
    (st.b, target)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&x| Integer::from(x)).collect()
    }

    #[test]
    fn reduces_a_skewed_basis_and_keeps_the_lattice() {
        // two ways: the reduced basis is short (it holds the known short vectors of
        // the lattice Z (1,0,0) + Z (0,1,0) + Z (0,0,1) written skewed), and the
        // target moves by a lattice vector only (its residue mod the lattice is kept)
        let b = vec![z(&[1, 1000003, 0]), z(&[0, 1, 1000033]), z(&[0, 0, 1])];
        let (red, t) = reduce_and_shorten(b, z(&[5_000_000_017, -3, 9_999_999_991]), &|| false);
        assert_eq!(red.len(), 3);
        for v in &red {
            assert_eq!(v.iter().map(|x| x.clone().abs()).max().unwrap(), 1);
        }
        assert!(t.iter().all(|x| *x == 0u32));
        // a lattice of index 7 in Z^2: the target keeps its class mod the lattice
        let b = vec![z(&[7, 0]), z(&[123456, 1])];
        let (_, t) = reduce_and_shorten(b, z(&[100_000_000_003, 55]), &|| false);
        assert!(t.iter().all(|x| x.clone().abs() <= 4));
        // v - t must lie in the lattice {(x, y): x = 123456 y mod 7}
        let dx = Integer::from(100_000_000_003i64) - &t[0];
        let dy = Integer::from(55) - &t[1];
        assert_eq!((dx - Integer::from(123456) * dy) % Integer::from(7), 0);
    }
}
