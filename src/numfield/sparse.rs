//! The relation matrix of the class group route for large fields:
//! structured sparse elimination with unit pivots, then the class group by
//! the Hermite normal form modulo a determinant and the integral kernel
//! (the units) by Cramer solutions and a kernel modulo that determinant.
//!
//! Structured Gaussian elimination (B. A. LaMacchia and A. M. Odlyzko,
//! "Solving large sparse linear systems over finite fields", CRYPTO 1990;
//! over Z with pivots `+-1` only, as in the class group algorithms of
//! Buchmann's school, see H. Cohen, GTM 193, §7.5): a column with an entry
//! `+-1` in some row is removed with that row, after the row has been
//! subtracted from the other rows of the column. This keeps the quotient
//! `Z^k / L` (the row `e_c = -(rest)` expresses the column by the others)
//! and maps the integral left kernel bijectively (a combination of the new
//! rows is one of the old rows), so neither the class group nor the units
//! change. Rows that become zero are units at once. Pivots are taken by
//! least fill-in (Markowitz cost), and the elimination stops when the cost
//! passes a limit: what is left is a small dense core.
//!
//! The core `M` (`m` rows, `n` columns, rank `n` wanted): `n` rows `B`
//! independent modulo a word prime, `D = det B` exactly (`modular.rs`),
//! `D Z^n ⊂ L`, so the Hermite form of all rows modulo `D` is the Hermite
//! form of `L` (Cohen GTM 138, Algorithm 2.4.8) and `h* = prod diag`. For
//! each other row `v_j` (`e` of them), `y_j B = D v_j` exactly; the integral
//! left kernel of `M` is `{((sum t_j y_j) / D, -t) : t in Z^e, sum t_j y_j = 0
//! mod D}`, and that condition is a kernel modulo `D`, read off a Hermite
//! form modulo `D` in `e + n` columns. Its `e` basis vectors are the units
//! handed to the unit lattice (their exponents have about the size of `D`,
//! not the thousands of bits an echelon with Euclid steps builds up).

use super::linalg::{hnf, hnf_mod_word};
use super::modular::{determinant, log2_row_length, ExactSolver};
use crate::arith::{inv_mod, is_prime_u64, mul_mod};
use malachite::base::num::arithmetic::traits::{Abs, DivisibleBy, Gcd, Mod, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::Integer;

/// A relation: sparse valuations (column, value) in increasing column
/// order, and its element as a product of stored elements (sparse, sorted).
#[derive(Clone, Debug)]
pub(crate) struct SparseRelation {
    pub(crate) v: Vec<(usize, i64)>,
    pub(crate) exps: Vec<(usize, i64)>,
}

/// `a + c b` for sparse sorted vectors; `None` on overflow.
fn axpy(a: &[(usize, i64)], c: i64, b: &[(usize, i64)]) -> Option<Vec<(usize, i64)>> {
    let mut out = Vec::with_capacity(a.len() + b.len());
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        if j >= b.len() || (i < a.len() && a[i].0 < b[j].0) {
            out.push(a[i]);
            i += 1;
        } else if i >= a.len() || b[j].0 < a[i].0 {
            out.push((b[j].0, c.checked_mul(b[j].1)?));
            j += 1;
        } else {
            let x = a[i].1.checked_add(c.checked_mul(b[j].1)?)?;
            if x != 0 {
                out.push((a[i].0, x));
            }
            i += 1;
            j += 1;
        }
    }
    Some(out)
}

/// What the elimination leaves.
pub(crate) struct Core {
    /// The original indices of the core columns.
    pub(crate) cols: Vec<usize>,
    /// The core rows, dense over `cols`.
    pub(crate) rows: Vec<Vec<i64>>,
    /// Their elements (products of stored elements).
    pub(crate) exps: Vec<Vec<(usize, i64)>>,
    /// Rows that became zero: units (and roots of unity).
    pub(crate) units: Vec<Vec<(usize, i64)>>,
    /// Columns left without any row (original indices): the relations do
    /// not have full rank, and more relations through these are wanted.
    pub(crate) empty_columns: Vec<usize>,
}

/// Largest fill-in (Markowitz cost `(rows of the column - 1) (entries of
/// the pivot row - 1)`) accepted for a pivot.
const MAX_COST: usize = 4000;

/// Structured elimination of `rels` over `ncols` columns (see the module
/// text). `stop` is polled once per pivot.
pub(crate) fn eliminate(rels: &[SparseRelation], ncols: usize, stop: &dyn Fn() -> bool) -> Core {
    let mut rows: Vec<Option<SparseRelation>> = rels.iter().cloned().map(Some).collect();
    let mut col_rows: Vec<Vec<usize>> = vec![Vec::new(); ncols];
    for (i, r) in rels.iter().enumerate() {
        for &(c, _) in &r.v {
            col_rows[c].push(i);
        }
    }
    let mut alive = vec![true; ncols];
    let mut units = Vec::new();
    // per column the cheapest pivot (cost, row), recomputed only for the
    // columns whose rows changed since (dirty)
    let mut col_best: Vec<Option<(usize, usize)>> = vec![None; ncols];
    let mut dirty = vec![true; ncols];
    loop {
        if stop() {
            break;
        }
        // the pivot of least cost: a column, a row with +-1 there
        for c in 0..ncols {
            if !alive[c] || !dirty[c] {
                continue;
            }
            dirty[c] = false;
            // drop stale entries (rows gone, or no longer touching c) and,
            // in the same pass, find the shortest row with +-1 at c: the
            // cost (w - 1) (length - 1) grows with the length for a fixed
            // column, ties to the lowest row number (the lists are not sorted)
            let mut shortest: Option<(usize, usize)> = None; // (length, row)
            col_rows[c].retain(|&i| {
                let Some(r) = rows[i].as_ref() else {
                    return false;
                };
                let Ok(pos) = r.v.binary_search_by_key(&c, |x| x.0) else {
                    return false;
                };
                if r.v[pos].1.abs() == 1 && shortest.is_none_or(|b| (r.v.len(), i) < b) {
                    shortest = Some((r.v.len(), i));
                }
                true
            });
            let w = col_rows[c].len();
            col_best[c] = shortest.map(|(len, i)| ((w - 1) * (len - 1), i));
        }
        let mut best: Option<(usize, usize, usize)> = None; // (cost, col, row)
        for c in 0..ncols {
            if let (true, Some((cost, i))) = (alive[c], col_best[c]) {
                if best.is_none_or(|b| cost < b.0) {
                    best = Some((cost, c, i));
                }
            }
        }
        let Some((cost, c, piv)) = best else { break };
        if cost > MAX_COST {
            break;
        }
        let Some(prow) = rows[piv].take() else { break };
        for &(cc, _) in &prow.v {
            dirty[cc] = true;
        }
        let sgn = prow.v[prow.v.binary_search_by_key(&c, |x| x.0).unwrap_or(0)].1;
        let others: Vec<usize> = col_rows[c].iter().copied().filter(|&i| i != piv).collect();
        for s in others {
            let Some(row) = rows[s].take() else { continue };
            let Ok(pos) = row.v.binary_search_by_key(&c, |x| x.0) else {
                rows[s] = Some(row);
                continue;
            };
            for &(cc, _) in &row.v {
                dirty[cc] = true;
            }
            let a = row.v[pos].1;
            // row - a sgn prow has zero at c (sgn^2 = 1)
            let f = -a * sgn;
            let (Some(v), Some(exps)) = (axpy(&row.v, f, &prow.v), axpy(&row.exps, f, &prow.exps))
            else {
                continue;
            };
            if v.is_empty() {
                if !exps.is_empty() {
                    units.push(exps);
                }
                continue;
            }
            // the row is listed already under the columns it had
            for &(cc, _) in &v {
                if row.v.binary_search_by_key(&cc, |x| x.0).is_err() {
                    col_rows[cc].push(s);
                }
            }
            rows[s] = Some(SparseRelation { v, exps });
        }
        alive[c] = false;
        col_rows[c].clear();
    }
    let cols: Vec<usize> = (0..ncols).filter(|&c| alive[c]).collect();
    let mut index = vec![usize::MAX; ncols];
    for (j, &c) in cols.iter().enumerate() {
        index[c] = j;
    }
    let mut hit = vec![false; cols.len()];
    let mut dense = Vec::new();
    let mut exps = Vec::new();
    for r in rows.into_iter().flatten() {
        let mut d = vec![0i64; cols.len()];
        for &(c, x) in &r.v {
            if index[c] != usize::MAX {
                d[index[c]] = x;
                hit[index[c]] = true;
            }
        }
        dense.push(d);
        exps.push(r.exps);
    }
    let empty_columns: Vec<usize> = (0..cols.len())
        .filter(|&j| !hit[j])
        .map(|j| cols[j])
        .collect();
    Core {
        cols,
        rows: dense,
        exps,
        units,
        empty_columns,
    }
}

/// The class group data of a core of full rank, set up for kernels.
pub(crate) struct CoreSolution {
    /// The Hermite form of the row lattice (over the core columns).
    pub(crate) hermite: Vec<Vec<Integer>>,
    /// `n` independent rows `B` (indices into the core).
    sel: Vec<usize>,
    /// The other rows, sparsest first.
    pub(crate) others: Vec<usize>,
    solver: Option<ExactSolver>,
    /// `|det B|`.
    d: Integer,
}

/// A word prime for the rank test.
const RANK_PRIME: u64 = (1 << 61) - 1;

/// Rows of `m` independent modulo [`RANK_PRIME`], greedily in the order
/// of `order` (at most `n` of them).
fn independent_rows(m: &[Vec<i64>], order: &[usize], n: usize) -> Vec<usize> {
    let p = RANK_PRIME;
    debug_assert!(is_prime_u64(p));
    let mut basis: Vec<(usize, Vec<u64>)> = Vec::new(); // (pivot column, normalised row)
    let mut chosen = Vec::new();
    for &i in order {
        if chosen.len() == n {
            break;
        }
        let mut v: Vec<u64> = m[i]
            .iter()
            .map(|&x| x.rem_euclid(p as i64) as u64)
            .collect();
        for (pc, b) in &basis {
            let f = v[*pc];
            if f != 0 {
                for (x, y) in v.iter_mut().zip(b) {
                    if *y != 0 {
                        *x = (*x + p - mul_mod(f, *y, p)) % p;
                    }
                }
            }
        }
        if let Some(pc) = v.iter().position(|&x| x != 0) {
            let inv = inv_mod(v[pc], p).unwrap_or(0);
            for x in v.iter_mut() {
                *x = mul_mod(*x, inv, p);
            }
            basis.push((pc, v));
            chosen.push(i);
        }
    }
    chosen
}

/// The Hermite form of the core and the set-up of its kernel; `None` when
/// the rows do not have full rank (more relations needed) or `stop` says so.
pub(crate) fn solve_core(core: &Core, stop: &dyn Fn() -> bool) -> Option<CoreSolution> {
    let n = core.cols.len();
    let m = core.rows.len();
    if !core.empty_columns.is_empty() || m < n {
        return None;
    }
    // sparsest rows first: short rows make a well-conditioned B and short kernel vectors
    let mut order: Vec<usize> = (0..m).collect();
    order.sort_by(|&a, &b| {
        log2_row_length(&core.rows[a]).total_cmp(&log2_row_length(&core.rows[b]))
    });
    if n == 0 {
        // every column eliminated: trivial class group, every row is a kernel vector
        return Some(CoreSolution {
            hermite: Vec::new(),
            sel: Vec::new(),
            others: order,
            solver: None,
            d: Integer::ONE,
        });
    }
    let sel = independent_rows(&core.rows, &order, n);
    if sel.len() < n || stop() {
        return None;
    }
    let others: Vec<usize> = order.into_iter().filter(|i| !sel.contains(i)).collect();
    let extra = others
        .iter()
        .map(|&i| log2_row_length(&core.rows[i]))
        .fold(0.0, f64::max);
    let solver = ExactSolver::new(sel.iter().map(|&i| core.rows[i].clone()).collect(), extra)?;
    let d = solver.det.clone().abs();
    if d == 0u32 || stop() {
        return None;
    }
    let hermite = core_hermite(core, &sel, &d, stop)?;
    Some(CoreSolution {
        hermite,
        sel,
        others,
        solver: Some(solver),
        d,
    })
}

/// Further choices of `n` independent rows for [`lattice_multiple`].
const EXTRA_DETERMINANTS: usize = 3;

/// A multiple of the lattice's index `det L` smaller than `d = det B`:
/// the gcd of `d` and the determinants of other independent row choices
/// (each is `det L` times its own index in `L`, and those indices rarely
/// share a factor; the gcd is an integral combination of the
/// determinants, so it times `Z^n` lies in `L` too). Stops once the gcd
/// fits in a word.
fn lattice_multiple(core: &Core, sel: &[usize], d: &Integer, stop: &dyn Fn() -> bool) -> Integer {
    let n = core.cols.len();
    let m = core.rows.len();
    let mut g = d.clone();
    let mut state = 0x9e37_79b9_7f4a_7c15u64 ^ m as u64;
    for _ in 0..EXTRA_DETERMINANTS {
        if g < (1u64 << 31) || stop() {
            break;
        }
        // a random order, the rows of B last
        let mut order: Vec<usize> = (0..m).filter(|i| !sel.contains(i)).collect();
        for i in (1..order.len()).rev() {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            order.swap(i, (state % (i as u64 + 1)) as usize);
        }
        order.extend_from_slice(sel);
        let other = independent_rows(&core.rows, &order, n);
        if other.len() < n {
            break;
        }
        let rows: Vec<Vec<i64>> = other.iter().map(|&i| core.rows[i].clone()).collect();
        let d2 = determinant(&rows).abs();
        if d2 != 0u32 {
            g = Integer::from(g.unsigned_abs().gcd(d2.unsigned_abs()));
        }
    }
    g
}

/// The Hermite form of all core rows: modulo a small multiple of the
/// index ([`lattice_multiple`]), in words where it fits (`linalg.rs`
/// `hnf_mod_word`), else with multiprecision entries.
fn core_hermite(
    core: &Core,
    sel: &[usize],
    d: &Integer,
    stop: &dyn Fn() -> bool,
) -> Option<Vec<Vec<Integer>>> {
    let n = core.cols.len();
    let g = lattice_multiple(core, sel, d, stop);
    if stop() {
        return None;
    }
    if let Ok(w) = u64::try_from(&g) {
        if w < (1 << 62) {
            let h = hnf_mod_word(&core.rows, n, w);
            return Some(
                h.into_iter()
                    .map(|r| r.into_iter().map(Integer::from).collect())
                    .collect(),
            );
        }
    }
    let gens: Vec<Vec<Integer>> = core
        .rows
        .iter()
        .map(|r| r.iter().map(|&x| Integer::from(x)).collect())
        .collect();
    hnf(&gens, n, Some(&g)).ok()
}

impl CoreSolution {
    /// A basis of the integral left kernel of the rows `B` and the first
    /// `count` other rows: per vector, (core row, coefficient), checked
    /// exactly. `None` when `stop` says so (or on an internal failure).
    pub(crate) fn kernel(
        &self,
        core: &Core,
        count: usize,
        stop: &dyn Fn() -> bool,
    ) -> Option<Vec<Vec<(usize, Integer)>>> {
        let n = core.cols.len();
        let others = &self.others[..count.min(self.others.len())];
        let e = others.len();
        let Some(solver) = &self.solver else {
            return Some(others.iter().map(|&i| vec![(i, Integer::ONE)]).collect());
        };
        let sel = &self.sel;
        let d = &self.d;
        // y_j B = det(B) v_j for the other rows
        let mut ys: Vec<Vec<Integer>> = Vec::with_capacity(e);
        for &i in others {
            ys.push(solver.solve(&core.rows[i], log2_row_length(&core.rows[i]))?);
        }
        let mut kernel = Vec::new();
        if e == 0 {
            return Some(kernel);
        }
        // T = {t in Z^e : sum t_j y_j = 0 mod D}: rows [e_j | y_j] in e + n columns, modulo D
        let gens: Vec<Vec<Integer>> = ys
            .iter()
            .enumerate()
            .map(|(j, y)| {
                let mut g = vec![Integer::ZERO; e + n];
                g[j] = Integer::ONE;
                for (c, x) in y.iter().enumerate() {
                    g[e + c] = x.mod_op(d);
                }
                g
            })
            .collect();
        let h = hnf(&gens, e + n, Some(d)).ok()?;
        let det_signed = &solver.det;
        for t in h.iter().take(e) {
            if stop() {
                return None;
            }
            let mut vecx: Vec<(usize, Integer)> = Vec::new();
            // x on B: (sum t_j y_j) / det (the solver's signed determinant); -t on the others
            let mut s = vec![Integer::ZERO; n];
            for (tj, y) in t[..e].iter().zip(&ys) {
                if *tj != 0u32 {
                    for (a, b) in s.iter_mut().zip(y) {
                        *a += tj * b;
                    }
                }
            }
            for (idx, a) in sel.iter().zip(s) {
                if !(&a).divisible_by(det_signed) {
                    return None;
                }
                let q = a / det_signed;
                if q != 0u32 {
                    vecx.push((*idx, q));
                }
            }
            for (tj, &i) in t[..e].iter().zip(others) {
                if *tj != 0u32 {
                    vecx.push((i, -tj));
                }
            }
            vecx.sort_by_key(|x| x.0);
            // exact check: x M = 0
            for c in 0..n {
                let mut acc = Integer::ZERO;
                for (i, x) in &vecx {
                    let a = core.rows[*i][c];
                    if a != 0 {
                        acc += x * Integer::from(a);
                    }
                }
                if acc != 0u32 {
                    return None;
                }
            }
            kernel.push(vecx);
        }
        Some(kernel)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rnd_state(seed: u64) -> impl FnMut() -> u64 {
        let mut s = seed;
        move || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        }
    }

    #[test]
    fn elimination_keeps_the_group_and_the_kernel() {
        // two ways: the class group order (Hermite diagonal of the core)
        // against the Hermite form of the whole matrix, and the kernel
        // vectors, mapped back through the rows' products, against x M = 0
        // on the original matrix
        let mut rnd = rnd_state(777);
        for trial in 0..30 {
            let ncols = 5 + trial % 20;
            let nrows = ncols + 3 + trial % 5;
            let mut rels = Vec::new();
            for i in 0..nrows {
                let mut v: Vec<(usize, i64)> = Vec::new();
                for c in 0..ncols {
                    if rnd() % 4 == 0 {
                        let x = [1i64, -1, 1, 2, -2, 3][(rnd() % 6) as usize];
                        v.push((c, x));
                    }
                }
                if i < ncols {
                    // every column hit at least once
                    if !v.iter().any(|x| x.0 == i) {
                        v.push((i, 1 + (rnd() % 3) as i64));
                        v.sort_by_key(|x| x.0);
                    }
                }
                rels.push(SparseRelation {
                    v,
                    exps: vec![(i, 1)],
                });
            }
            let dense: Vec<Vec<Integer>> = rels
                .iter()
                .map(|r| {
                    let mut d = vec![Integer::ZERO; ncols];
                    for &(c, x) in &r.v {
                        d[c] = Integer::from(x);
                    }
                    d
                })
                .collect();
            let Ok(full) = hnf(&dense, ncols, None) else {
                continue;
            };
            let h_full = full
                .iter()
                .enumerate()
                .fold(Integer::ONE, |a, (i, r)| a * &r[i]);
            let core = eliminate(&rels, ncols, &|| false);
            assert!(core.cols.len() <= ncols);
            let Some(prep) = solve_core(&core, &|| false) else {
                panic!("trial {trial}: full rank but no solution")
            };
            let sol_kernel = prep.kernel(&core, usize::MAX, &|| false).unwrap();
            let sol = &prep;
            let h_core = sol
                .hermite
                .iter()
                .enumerate()
                .fold(Integer::ONE, |a, (i, r)| a * &r[i]);
            assert_eq!(h_core, h_full, "trial {trial}");
            // kernel rank: nrows - ncols in all
            assert_eq!(
                sol_kernel.len() + core.units.len(),
                nrows - ncols,
                "trial {trial}"
            );
            let mut vectors: Vec<Vec<(usize, Integer)>> = core
                .units
                .iter()
                .map(|u| u.iter().map(|&(i, x)| (i, Integer::from(x))).collect())
                .collect();
            for kv in &sol_kernel {
                let mut acc: Vec<Integer> = vec![Integer::ZERO; nrows];
                for (ci, x) in kv {
                    for &(i, e) in &core.exps[*ci] {
                        acc[i] += x * Integer::from(e);
                    }
                }
                vectors.push(
                    acc.into_iter()
                        .enumerate()
                        .filter(|(_, x)| *x != 0u32)
                        .collect(),
                );
            }
            for vec in vectors {
                assert!(!vec.is_empty());
                for c in 0..ncols {
                    let s: Integer = vec.iter().map(|(i, x)| x * &dense[*i][c]).sum();
                    assert_eq!(s, 0, "trial {trial}");
                }
            }
        }
    }
}
