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
//! least fill-in (Markowitz cost) from a heap, among the light columns
//! only (a column with more than `HEAVY_WEIGHT` rows is heavy: never a
//! pivot, its row list not kept, as in structured Gaussian elimination),
//! with the column weights kept exactly as rows change and the costs
//! recomputed only for columns whose rows changed; the elimination stops
//! when the least cost passes a limit: what is left is a small dense core.
//! The state is kept between solves (`Elimination`): relations found
//! later are reduced by the pivots taken so far, in their order.
//!
//! The core `M` (`m` rows, `n` columns, rank `n` wanted): `n` rows `B`
//! independent modulo a word prime, `D = det B` exactly (`modular.rs`),
//! `D Z^n ⊂ L`, so the Hermite form of all rows modulo `D` is the Hermite
//! form of `L` (Cohen GTM 138, Algorithm 2.4.8) and `h* = prod diag`. The
//! modulus is made smaller for free: the Cramer solutions `y_j` of a few
//! other rows hold the determinants of `B` with one row replaced, each a
//! multiple of `det L`, and their gcd with `D` is one too. The caller may
//! ask for the Hermite form of `B` and some other rows only (a sublattice,
//! of index `h* / h`, which its check of `h* R` against the Euler product
//! rejects unless it is `L`). For
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

/// A column with more rows than this is heavy: never a pivot, and its row
/// list is not kept (structured Gaussian elimination; a pivot there would
/// need a row of at most `1 + MAX_COST / HEAVY_WEIGHT` entries).
const HEAVY_WEIGHT: usize = 400;

/// `a + f b` for sparse sorted vectors into `out` (cleared first); `false`
/// on overflow.
fn axpy_into(out: &mut Vec<(usize, i64)>, a: &[(usize, i64)], f: i64, b: &[(usize, i64)]) -> bool {
    out.clear();
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        if j >= b.len() || (i < a.len() && a[i].0 < b[j].0) {
            out.push(a[i]);
            i += 1;
        } else if i >= a.len() || b[j].0 < a[i].0 {
            let Some(x) = f.checked_mul(b[j].1) else {
                return false;
            };
            out.push((b[j].0, x));
            j += 1;
        } else {
            let Some(x) = f.checked_mul(b[j].1).and_then(|y| a[i].1.checked_add(y)) else {
                return false;
            };
            if x != 0 {
                out.push((a[i].0, x));
            }
            i += 1;
            j += 1;
        }
    }
    true
}

/// The state of a structured elimination, kept between solves: relations
/// added later are reduced by the pivots taken so far (in their order, so
/// each pivot column is gone after its own step) and the elimination goes
/// on from there, instead of starting again from the first relation.
pub(crate) struct Elimination {
    ncols: usize,
    rows: Vec<Option<SparseRelation>>,
    /// Exact number of rows through each column.
    w: Vec<usize>,
    heavy: Vec<bool>,
    /// Rows through each light column (may hold stale entries).
    col_rows: Vec<Vec<usize>>,
    alive: Vec<bool>,
    units: Vec<Vec<(usize, i64)>>,
    /// The pivots in the order taken: (column, the pivot row as used).
    pivots: Vec<(usize, SparseRelation)>,
    /// How many relations of the caller's list were added.
    pub(crate) added: usize,
    scratch_v: Vec<(usize, i64)>,
    scratch_e: Vec<(usize, i64)>,
}

impl Elimination {
    pub(crate) fn new(ncols: usize) -> Elimination {
        Elimination {
            ncols,
            rows: Vec::new(),
            w: vec![0; ncols],
            heavy: vec![false; ncols],
            col_rows: vec![Vec::new(); ncols],
            alive: vec![true; ncols],
            units: Vec::new(),
            pivots: Vec::new(),
            added: 0,
            scratch_v: Vec::new(),
            scratch_e: Vec::new(),
        }
    }

    /// A relation's row in the present state: reduced by every pivot so
    /// far; `None` when an entry leaves a word (the relation is dropped).
    fn reduce(&mut self, rel: &SparseRelation) -> Option<SparseRelation> {
        let mut row = rel.clone();
        for (c, prow) in &self.pivots {
            let Ok(pos) = row.v.binary_search_by_key(c, |x| x.0) else {
                continue;
            };
            let sgn = prow.v[prow.v.binary_search_by_key(c, |x| x.0).ok()?].1;
            let f = -row.v[pos].1 * sgn;
            if !(axpy_into(&mut self.scratch_v, &row.v, f, &prow.v)
                && axpy_into(&mut self.scratch_e, &row.exps, f, &prow.exps))
            {
                return None;
            }
            std::mem::swap(&mut row.v, &mut self.scratch_v);
            std::mem::swap(&mut row.exps, &mut self.scratch_e);
            if row.v.is_empty() {
                break;
            }
        }
        Some(row)
    }

    /// Adds the relations `rels[self.added..]` (reduced by the pivots so far).
    pub(crate) fn add(&mut self, rels: &[SparseRelation]) {
        for rel in &rels[self.added.min(rels.len())..] {
            let Some(row) = self.reduce(rel) else {
                continue;
            };
            if row.v.is_empty() {
                if !row.exps.is_empty() {
                    self.units.push(row.exps);
                }
                continue;
            }
            let s = self.rows.len();
            for &(c, _) in &row.v {
                self.w[c] += 1;
                if !self.heavy[c] {
                    if self.w[c] > HEAVY_WEIGHT {
                        self.heavy[c] = true;
                        self.col_rows[c] = Vec::new();
                    } else {
                        self.col_rows[c].push(s);
                    }
                }
            }
            self.rows.push(Some(row));
        }
        self.added = rels.len();
    }

    /// Pivots of least Markowitz cost among the light columns, from a heap,
    /// costs recomputed only for the columns whose rows changed, until the
    /// least cost passes [`MAX_COST`]. `stop` is polled once per pivot.
    pub(crate) fn run(&mut self, stop: &dyn Fn() -> bool) {
        let ncols = self.ncols;
        let Elimination {
            rows,
            w,
            heavy,
            col_rows,
            alive,
            units,
            pivots,
            scratch_v,
            scratch_e,
            ..
        } = self;
        // per light column the cheapest pivot (cost, row), recomputed only
        // for the columns whose rows changed since (dirty)
        let mut col_best: Vec<Option<(usize, usize)>> = vec![None; ncols];
        let mut dirty = vec![true; ncols];
        let mut dirty_list: Vec<usize> = (0..ncols).collect();
        let mut heap: std::collections::BinaryHeap<std::cmp::Reverse<(usize, usize, usize)>> =
            std::collections::BinaryHeap::new();
        let mut list: Vec<usize> = Vec::new();
        loop {
            if stop() {
                break;
            }
            for &c in &dirty_list {
                dirty[c] = false;
                if !alive[c] || heavy[c] {
                    continue;
                }
                // drop stale entries (rows gone, or no longer touching c)
                // and, in the same pass, find the shortest row with +-1 at
                // c: the cost (w - 1) (length - 1) grows with the length
                // for a fixed column, ties to the lowest row number
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
                // w[c] counts each row once (a list may hold a row twice
                // when it left the column and came back)
                col_best[c] = shortest.map(|(len, i)| ((w[c].max(1) - 1) * (len - 1), i));
                if let Some((cost, i)) = col_best[c] {
                    heap.push(std::cmp::Reverse((cost, c, i)));
                }
            }
            dirty_list.clear();
            // the pivot of least cost (ties to the lowest column)
            let mut best = None;
            while let Some(std::cmp::Reverse((cost, c, i))) = heap.pop() {
                if alive[c] && !heavy[c] && col_best[c] == Some((cost, i)) {
                    best = Some((cost, c, i));
                    break;
                }
            }
            let Some((cost, c, piv)) = best else { break };
            if cost > MAX_COST {
                break;
            }
            let Some(prow) = rows[piv].take() else { break };
            for &(cc, _) in &prow.v {
                w[cc] -= 1;
                if !dirty[cc] {
                    dirty[cc] = true;
                    dirty_list.push(cc);
                }
            }
            let sgn = prow.v[prow.v.binary_search_by_key(&c, |x| x.0).unwrap_or(0)].1;
            list.clear();
            list.extend(col_rows[c].iter().copied().filter(|&i| i != piv));
            for &s in &list {
                let Some(mut row) = rows[s].take() else {
                    continue;
                };
                let Ok(pos) = row.v.binary_search_by_key(&c, |x| x.0) else {
                    rows[s] = Some(row);
                    continue;
                };
                let a = row.v[pos].1;
                // row - a sgn prow has zero at c (sgn^2 = 1)
                let f = -a * sgn;
                let ok = axpy_into(scratch_v, &row.v, f, &prow.v)
                    && axpy_into(scratch_e, &row.exps, f, &prow.exps);
                // the weights, lists and dirty marks: columns of the old
                // row that went, columns of the new row that came
                let (old, new) = (&row.v, if ok { &scratch_v[..] } else { &[][..] });
                let (mut i, mut j) = (0, 0);
                while i < old.len() || j < new.len() {
                    let cc;
                    if j >= new.len() || (i < old.len() && old[i].0 < new[j].0) {
                        cc = old[i].0;
                        w[cc] -= 1;
                        i += 1;
                    } else if i >= old.len() || new[j].0 < old[i].0 {
                        cc = new[j].0;
                        w[cc] += 1;
                        if !heavy[cc] {
                            if w[cc] > HEAVY_WEIGHT {
                                heavy[cc] = true;
                                col_rows[cc] = Vec::new();
                            } else {
                                col_rows[cc].push(s);
                            }
                        }
                        j += 1;
                    } else {
                        cc = old[i].0;
                        i += 1;
                        j += 1;
                    }
                    if !dirty[cc] {
                        dirty[cc] = true;
                        dirty_list.push(cc);
                    }
                }
                if !ok {
                    // an entry past a word: the relation is dropped
                    continue;
                }
                if scratch_v.is_empty() {
                    if !scratch_e.is_empty() {
                        units.push(scratch_e.clone());
                    }
                    continue;
                }
                std::mem::swap(&mut row.v, scratch_v);
                std::mem::swap(&mut row.exps, scratch_e);
                rows[s] = Some(row);
            }
            alive[c] = false;
            col_rows[c] = Vec::new();
            pivots.push((c, prow));
        }
    }

    /// The dense core of the present state (the state is kept).
    pub(crate) fn core(&self) -> Core {
        let ncols = self.ncols;
        let cols: Vec<usize> = (0..ncols).filter(|&c| self.alive[c]).collect();
        let mut index = vec![usize::MAX; ncols];
        for (j, &c) in cols.iter().enumerate() {
            index[c] = j;
        }
        let mut hit = vec![false; cols.len()];
        let mut dense = Vec::new();
        let mut exps = Vec::new();
        for r in self.rows.iter().flatten() {
            let mut d = vec![0i64; cols.len()];
            for &(c, x) in &r.v {
                if index[c] != usize::MAX {
                    d[index[c]] = x;
                    hit[index[c]] = true;
                }
            }
            dense.push(d);
            exps.push(r.exps.clone());
        }
        let empty_columns: Vec<usize> = (0..cols.len())
            .filter(|&j| !hit[j])
            .map(|j| cols[j])
            .collect();
        Core {
            cols,
            rows: dense,
            exps,
            units: self.units.clone(),
            empty_columns,
        }
    }
}

/// Structured elimination of `rels` over `ncols` columns in one go (see
/// the module text and [`Elimination`]).
#[cfg(test)]
pub(crate) fn eliminate(rels: &[SparseRelation], ncols: usize, stop: &dyn Fn() -> bool) -> Core {
    let mut e = Elimination::new(ncols);
    e.add(rels);
    e.run(stop);
    e.core()
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
    /// The Hermite form is of some of the rows only (a sublattice).
    pub(crate) partial: bool,
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
pub(crate) fn solve_core(
    core: &Core,
    hermite_rows: Option<usize>,
    stop: &dyn Fn() -> bool,
) -> Option<CoreSolution> {
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
            partial: false,
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
    // determinants of other row choices for free: `y_j B = D v_j` gives,
    // by Cramer's rule, `y_j[i] = det(B with row i replaced by v_j)`; each
    // non-zero one is a multiple of `det L`, so their gcd with `D` is one too
    let mut g = d.clone();
    for &j in others.iter().take(CRAMER_DETERMINANTS) {
        if g < (1u64 << 31) || stop() {
            break;
        }
        let Some(y) = solver.solve(&core.rows[j], log2_row_length(&core.rows[j])) else {
            break;
        };
        for x in &y {
            if *x != 0u32 {
                g = Integer::from(g.unsigned_abs().gcd(x.unsigned_abs()));
            }
        }
    }
    // the Hermite form of B and the sparsest other rows only, when asked:
    // a sublattice of L, of index h* / h; the caller's check of h* R
    // against the Euler product tells whether it is L
    let rows: Vec<usize> = match hermite_rows {
        Some(k) if n + k < m => sel.iter().chain(others.iter().take(k)).copied().collect(),
        _ => (0..m).collect(),
    };
    let partial = rows.len() < m;
    let hermite = core_hermite(core, &rows, &sel, &g, stop)?;
    Some(CoreSolution {
        hermite,
        sel,
        others,
        solver: Some(solver),
        d,
        partial,
    })
}

/// Cramer solutions of other rows whose entries enter the multiple of
/// `det L` before the Hermite form (`solve_core`).
const CRAMER_DETERMINANTS: usize = 4;

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
    rows: &[usize],
    sel: &[usize],
    d: &Integer,
    stop: &dyn Fn() -> bool,
) -> Option<Vec<Vec<Integer>>> {
    let n = core.cols.len();
    let g = if *d < (1u64 << 62) {
        d.clone()
    } else {
        lattice_multiple(core, sel, d, stop)
    };
    if stop() {
        return None;
    }
    let gens: Vec<Vec<i64>> = rows.iter().map(|&i| core.rows[i].clone()).collect();
    if let Ok(w) = u64::try_from(&g) {
        if w < (1 << 62) {
            let h = hnf_mod_word(&gens, n, w);
            return Some(
                h.into_iter()
                    .map(|r| r.into_iter().map(Integer::from).collect())
                    .collect(),
            );
        }
    }
    let gens: Vec<Vec<Integer>> = gens
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
            for split in [false, true] {
                // in one go, and in two batches with the state kept between
                // (the second batch reduced by the first batch's pivots)
                let core = if split {
                    let mut e = Elimination::new(ncols);
                    e.add(&rels[..nrows / 2]);
                    e.run(&|| false);
                    e.add(&rels);
                    e.run(&|| false);
                    e.core()
                } else {
                    eliminate(&rels, ncols, &|| false)
                };
                assert!(core.cols.len() <= ncols);
                let Some(prep) = solve_core(&core, None, &|| false) else {
                    panic!("trial {trial} split {split}: full rank but no solution")
                };
                let sol_kernel = prep.kernel(&core, usize::MAX, &|| false).unwrap();
                let sol = &prep;
                let h_core = sol
                    .hermite
                    .iter()
                    .enumerate()
                    .fold(Integer::ONE, |a, (i, r)| a * &r[i]);
                assert_eq!(h_core, h_full, "trial {trial} split {split}");
                // the Hermite form of B alone: a sublattice, its index a
                // multiple of h
                if let Some(part) = solve_core(&core, Some(0), &|| false) {
                    let h_part = part
                        .hermite
                        .iter()
                        .enumerate()
                        .fold(Integer::ONE, |a, (i, r)| a * &r[i]);
                    assert!(
                        (&h_part).divisible_by(&h_full),
                        "trial {trial} split {split}"
                    );
                    assert_eq!(
                        part.partial,
                        core.rows.len() > core.cols.len(),
                        "trial {trial}"
                    );
                }
                // kernel rank: nrows - ncols in all
                assert_eq!(
                    sol_kernel.len() + core.units.len(),
                    nrows - ncols,
                    "trial {trial} split {split}"
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
                        assert_eq!(s, 0, "trial {trial} split {split}");
                    }
                }
            }
        }
    }
}
