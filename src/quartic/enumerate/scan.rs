//! The inner loops of the enumeration in machine words: the scanner over
//! `c` for fixed `(a, b)` in `i64` and `i128`, and the residue tables that
//! reject most values of `H` before the square test.

use super::super::numeric::{sqrt_if_square_u128, sqrt_if_square_u64};
use malachite::Integer;

/// The inner loop over `c` for fixed `a ≠ 0`, `b`, in one integer width:
/// `H = 8ac - 3b^2`, `27 R^2 = -H^3 + 48 I a^2 H - 64 J a^3`,
/// `d = (R - b^3 + 4abc)/(8a^2)`, `e = (I + 3bd - c^2)/(12a)`.
macro_rules! scanner {
    ($name:ident, $t:ty, $ut:ty, $sqrt:path) => {
        /// `false` when `stop` ended the scan early (looked at every 2^16 steps).
        pub(super) fn $name(a: $t, b: $t, clo: $t, chi: $t, ii: $t, jj: $t, filt: &ResidueFilter, hits: &mut Vec<[$t; 5]>, stop: &dyn Fn() -> bool) -> bool {
            let a2 = a * a;
            let t1 = 48 * ii * a2;
            let t0 = 64 * jj * a2 * a;
            let b3 = b * b * b;
            let m8a2 = 8 * a2;
            let a12 = 12 * a;
            let step = 8 * a;
            let mut h = 8 * a * clo - 3 * b * b;
            let mut base = 4 * a * b * clo - b3;
            let dbase = 4 * a * b;
            let mut c = clo;
            let mut res = filt.start(h as i128);
            while c <= chi {
                if (c - clo) & 0xFFFF == 0xFFFF && stop() {
                    return false;
                }
                let pass = filt.pass(&res);
                filt.advance(&mut res);
                if pass {
                let n = (t1 - h * h) * h - t0;
                if n >= 0 {
                    let m = n / 27;
                    if m * 27 == n {
                        if let Some(r) = $sqrt(m as $ut) {
                            let r = r as $t;
                            let cands = [r, -r];
                            let count = if r == 0 { 1 } else { 2 };
                            for &rr in &cands[..count] {
                                let dn = rr + base;
                                if dn % m8a2 != 0 {
                                    continue;
                                }
                                let d = dn / m8a2;
                                let en = ii + 3 * b * d - c * c;
                                if en % a12 == 0 {
                                    hits.push([a, b, c, d, en / a12]);
                                }
                            }
                        }
                    }
                }
                }
                h += step;
                base += dbase;
                c += 1;
            }
            true
        }
    };
}

/// Residue tables: for the moduli `27 m` with `m = 64, 35, 143`, whether
/// `N(H) ≡ 0 (mod 27)` and `N(H)/27` is a square modulo `m`, indexed by
/// `H mod 27m` (for a fixed `a`, `N` is a polynomial in `H`).
pub(super) struct ResidueFilter {
    tables: [Vec<bool>; 3],
    pub(super) moduli: [u64; 3],
    pub(super) steps: [u64; 3],
}

impl ResidueFilter {
    pub(super) fn new(a: &Integer, i: &Integer, j: &Integer) -> ResidueFilter {
        let ms = [64u64, 35, 143];
        let tables = ms.map(|m| {
            let modulus = 27 * m;
            let mi = Integer::from(modulus);
            let red = |x: Integer| -> u64 {
                let r = x % &mi;
                let r = if r < 0 { r + &mi } else { r };
                // 0 <= r < 27 * 143: always a u64
                u64::try_from(&r).unwrap_or(0)
            };
            let t1 = red(Integer::from(48) * i * a * a);
            let t0 = red(Integer::from(64) * j * a * a * a);
            let mut sq = vec![false; m as usize];
            for k in 0..m {
                sq[((k * k) % m) as usize] = true;
            }
            (0..modulus)
                .map(|h| {
                    let md = modulus;
                    let h3 = h * h % md * h % md;
                    let n = ((t1 * h) % md + 2 * md - h3 - t0) % md;
                    n % 27 == 0 && sq[(n / 27) as usize]
                })
                .collect::<Vec<bool>>()
        });
        let steps = ms.map(|m| {
            let modulus = Integer::from(27 * m);
            let r = (Integer::from(8) * a) % &modulus;
            let r = if r < 0 { r + modulus } else { r };
            // 0 <= r < 27 * 143: always a u64
            u64::try_from(&r).unwrap_or(0)
        });
        ResidueFilter { tables, moduli: ms.map(|m| 27 * m), steps }
    }

    /// A filter that passes everything (for short ranges, where building the
    /// tables would cost more than it saves).
    pub(super) fn trivial() -> ResidueFilter {
        ResidueFilter { tables: [vec![true], vec![true], vec![true]], moduli: [1; 3], steps: [0; 3] }
    }

    #[inline]
    pub(super) fn start(&self, h: i128) -> [u64; 3] {
        self.moduli.map(|m| h.rem_euclid(m as i128) as u64)
    }

    #[inline]
    pub(super) fn pass(&self, r: &[u64; 3]) -> bool {
        self.tables[0][r[0] as usize] && self.tables[1][r[1] as usize] && self.tables[2][r[2] as usize]
    }

    #[inline]
    pub(super) fn advance(&self, r: &mut [u64; 3]) {
        for k in 0..3 {
            r[k] += self.steps[k];
            if r[k] >= self.moduli[k] {
                r[k] -= self.moduli[k];
            }
        }
    }
}

scanner!(scan_i64, i64, u64, sqrt_if_square_u64);
scanner!(scan_i128, i128, u128, sqrt_if_square_u128);
