//! Reduction modulo a prime of good reduction: `#E(F_p)` and `a_p`.

use super::Curve;
use malachite::base::num::arithmetic::traits::Mod;
use malachite::Integer;

fn residue(n: &Integer, p: u64) -> u64 {
    let r: Integer = n.mod_op(Integer::from(p));
    u64::try_from(&r).expect("residue fits a word")
}

impl Curve {
    /// The number of points of the reduction modulo `p`, `#E~(F_p)`, counted
    /// exactly, including the point at infinity. For a prime of bad reduction
    /// this counts the points of the singular cubic (the non-singular ones
    /// plus the singular point), which callers rarely want.
    ///
    /// Cost: O(p) word operations (a table of squares mod p); meant for
    /// `p < 10^7`. Panics if `p` is not below 2^32 (a documented precondition).
    ///
    /// ```
    /// use twofold::Curve;
    /// // y^2 + y = x^3 - x^2 - 10x - 20 (11a1 in Cremona's table): a_2 = -2, a_3 = -1
    /// let e = Curve::from_ainvs([0, -1, 1, -10, -20]).unwrap();
    /// assert_eq!(e.count_points_mod(2), 5);
    /// assert_eq!(e.count_points_mod(3), 5);
    /// ```
    pub fn count_points_mod(&self, p: u64) -> u64 {
        assert!(p >= 2 && p < (1 << 32), "count_points_mod needs a prime below 2^32");
        let a: Vec<u64> = self.ainvs().iter().map(|c| residue(c, p)).collect();
        if p == 2 {
            let mut n = 1;
            for x in 0..2u64 {
                for y in 0..2u64 {
                    let lhs = (y * y + a[0] * x * y + a[2] * y) % 2;
                    let rhs = (x * x * x + a[1] * x * x + a[3] * x + a[4]) % 2;
                    if lhs == rhs {
                        n += 1;
                    }
                }
            }
            return n;
        }
        // 4 * (y^2 + a1 x y + a3 y) = (2y + a1 x + a3)^2 - ..., so count
        // solutions of eta^2 = f(x) = 4x^3 + b2 x^2 + 2 b4 x + b6.
        let b: Vec<u64> = self.binvs().iter().map(|c| residue(c, p)).collect();
        let (b2, b4, b6) = (b[0], b[1], b[2]);
        let two_b4 = (2 * b4) % p;
        // chi[v] = number of square roots of v, minus one (Legendre symbol)
        let mut is_sq = vec![false; p as usize];
        for t in 1..=(p / 2) {
            is_sq[((t * t) % p) as usize] = true;
        }
        let mut total: i64 = 0;
        for x in 0..p {
            let f = ((((4 * x % p) + b2) % p * x % p + two_b4) % p * x % p + b6) % p;
            total += if f == 0 { 0 } else if is_sq[f as usize] { 1 } else { -1 };
        }
        (p as i64 + 1 + total) as u64
    }

    /// The trace of Frobenius `a_p = p + 1 - #E(F_p)` at a prime `p`.
    ///
    /// ```
    /// use twofold::Curve;
    /// let e = Curve::from_ainvs([0, 0, 1, -1, 0]).unwrap(); // 37a1, Cremona's table
    /// assert_eq!(e.trace_of_frobenius(2), -2);
    /// assert_eq!(e.trace_of_frobenius(3), -3);
    /// assert_eq!(e.trace_of_frobenius(5), -2);
    /// ```
    pub fn trace_of_frobenius(&self, p: u64) -> i64 {
        p as i64 + 1 - self.count_points_mod(p) as i64
    }
}
