//! Degrees of freedom, the sparse tangent-stiffness pattern, assembly and factorisation.
//!
//! The upper triangle of `K_T` over the free degrees of freedom is stored column-compressed.
//! Its pattern depends only on which nodes members join and which directions are held, so it
//! is built once; each Newton iteration scatters member blocks into the same value slots and
//! the sparse Cholesky factorisation reuses one symbolic analysis (fill-reducing ordering and
//! elimination tree) for every numeric factorisation.

use faer::Side;
use faer::linalg::solvers::Solve;
use faer::sparse::linalg::solvers::{Llt, SymbolicLlt};
use faer::sparse::{SparseColMatRef, SymbolicSparseColMatRef};
use nalgebra::Matrix3;

use crate::model::{Model, Vec3};

/// Which part of the tangent stiffness to assemble.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Part {
    /// `K_E + K_G`.
    Total,
    /// `Σ k_a ê êᵀ` only.
    Elastic,
    /// `Σ (N/L)(I − ê êᵀ)` only.
    Geometric,
}

/// Map from (node, axis) to a free degree-of-freedom number.
#[derive(Debug, Clone, PartialEq)]
pub struct DofMap {
    pub dof: Vec<[Option<usize>; 3]>,
    pub count: usize,
}

impl DofMap {
    /// Free DOFs of `model`, with the node `held` (if any) treated as fully held.
    pub fn new(model: &Model, held: Option<usize>) -> Self {
        let mut count = 0;
        let dof = model
            .nodes
            .iter()
            .enumerate()
            .map(|(i, n)| {
                let mut d = [None; 3];
                for (axis, slot) in d.iter_mut().enumerate() {
                    if !n.support.fixed[axis] && held != Some(i) {
                        *slot = Some(count);
                        count += 1;
                    }
                }
                d
            })
            .collect();
        DofMap { dof, count }
    }

    /// Every free DOF as (node, axis, dof number), in node order.
    pub fn free(&self) -> impl Iterator<Item = (usize, usize, usize)> + '_ {
        self.dof
            .iter()
            .enumerate()
            .flat_map(|(n, d)| d.iter().enumerate().filter_map(move |(a, s)| s.map(|k| (n, a, k))))
    }

    /// (node, axis) of free DOF `k`.
    pub fn locate(&self, k: usize) -> (usize, usize) {
        for (n, d) in self.dof.iter().enumerate() {
            for (a, slot) in d.iter().enumerate() {
                if *slot == Some(k) {
                    return (n, a);
                }
            }
        }
        panic!("dof {k} out of range")
    }
}

/// Sparse pattern of the upper triangle, with scatter maps and the symbolic factorisation.
pub struct System {
    pub dofs: DofMap,
    col_ptr: Vec<usize>,
    row_idx: Vec<usize>,
    /// Per member: (local row 0..6, local col 0..6, value slot) for entries with row ≤ col.
    scatter: Vec<Vec<(u8, u8, usize)>>,
    /// Value slot of each diagonal entry.
    diag: Vec<usize>,
    symbolic: Option<SymbolicLlt<usize>>,
}

/// A numeric factorisation of `K + σ I`.
pub struct Factor {
    llt: Llt<usize, f64>,
    /// The shift σ that was added (N/m).
    pub shift: f64,
}

impl Factor {
    /// Solves `(K + σI) x = b` in place.
    pub fn solve_in_place(&self, b: &mut [f64]) {
        let n = b.len();
        let mat = faer::MatMut::from_column_major_slice_mut(b, n, 1);
        self.llt.solve_in_place(mat);
    }

    /// Solves for `ncols` right-hand sides stored column-major in `b`, in place. Large systems
    /// with several right-hand sides share the columns out among the machine's threads: the
    /// triangular solves are limited by reading the factor from memory, and two threads
    /// reading it at once finish sooner than one thread with all the columns (measured with
    /// `cargo run --release -p rigwright-core --example solve_timing`).
    pub fn solve_columns_in_place(&self, b: &mut [f64], ncols: usize) {
        let n = b.len() / ncols.max(1);
        debug_assert_eq!(b.len(), n * ncols, "right-hand sides of equal length");
        let threads = if n >= PARALLEL_SOLVE_MIN_DOFS && ncols >= 2 {
            std::thread::available_parallelism().map_or(1, |t| t.get())
        } else {
            1
        };
        self.solve_split(b, ncols, threads);
    }

    /// Solves with the columns shared out among at most `threads` threads.
    fn solve_split(&self, b: &mut [f64], ncols: usize, threads: usize) {
        let n = b.len() / ncols.max(1);
        let threads = threads.clamp(1, ncols.max(1));
        if threads == 1 || n == 0 {
            self.llt.solve_in_place(faer::MatMut::from_column_major_slice_mut(b, n, ncols));
            return;
        }
        let per = ncols.div_ceil(threads);
        std::thread::scope(|scope| {
            for chunk in b.chunks_mut(n * per) {
                let cols = chunk.len() / n;
                scope.spawn(move || self.llt.solve_in_place(faer::MatMut::from_column_major_slice_mut(chunk, n, cols)));
            }
        });
    }
}

/// Systems with at least this many DOFs solve several right-hand sides on several threads.
const PARALLEL_SOLVE_MIN_DOFS: usize = 5000;

/// Values assembled at one configuration.
pub struct Evaluation {
    /// Strain energy minus load potential (J), relative to the drawn geometry.
    pub energy: f64,
    /// Out-of-balance force `f_int − λ f_ext` on free DOFs (N).
    pub residual: Vec<f64>,
    /// Scale for relative residuals: the larger of the full case load's norm and the norm of
    /// nodal member-force magnitudes (N).
    pub scale: f64,
}

impl System {
    pub fn new(model: &Model, dofs: DofMap) -> Self {
        let n = dofs.count;
        let mut cols: Vec<Vec<usize>> = (0..n).map(|j| vec![j]).collect();
        let member_dofs: Vec<[Option<usize>; 6]> = model
            .members
            .iter()
            .map(|m| {
                let [a, b] = m.ends;
                let (da, db) = (dofs.dof[a], dofs.dof[b]);
                [da[0], da[1], da[2], db[0], db[1], db[2]]
            })
            .collect();
        for md in &member_dofs {
            for gi in md.iter().flatten() {
                for gj in md.iter().flatten() {
                    if gi <= gj {
                        cols[*gj].push(*gi);
                    }
                }
            }
        }
        let mut col_ptr = Vec::with_capacity(n + 1);
        let mut row_idx = Vec::new();
        col_ptr.push(0);
        for c in &mut cols {
            c.sort_unstable();
            c.dedup();
            row_idx.extend_from_slice(c);
            col_ptr.push(row_idx.len());
        }
        let slot = |i: usize, j: usize| -> usize {
            let rows = &row_idx[col_ptr[j]..col_ptr[j + 1]];
            col_ptr[j] + rows.binary_search(&i).expect("entry in pattern")
        };
        let scatter = member_dofs
            .iter()
            .map(|md| {
                let mut s = Vec::new();
                for (li, gi) in md.iter().enumerate() {
                    for (lj, gj) in md.iter().enumerate() {
                        if let (Some(gi), Some(gj)) = (gi, gj)
                            && gi <= gj
                        {
                            s.push((li as u8, lj as u8, slot(*gi, *gj)));
                        }
                    }
                }
                s
            })
            .collect();
        let diag = (0..n).map(|j| slot(j, j)).collect();
        let symbolic = if n == 0 {
            None
        } else {
            SymbolicLlt::try_new(pattern_view(n, &col_ptr, &row_idx), Side::Upper).ok()
        };
        System {
            dofs,
            col_ptr,
            row_idx,
            scatter,
            diag,
            symbolic,
        }
    }

    /// Number of free DOFs.
    pub fn size(&self) -> usize {
        self.dofs.count
    }

    /// Number of stored upper-triangle entries.
    pub fn nonzeros(&self) -> usize {
        self.row_idx.len()
    }

    /// Gathers the free-DOF vector from node positions.
    pub fn gather(&self, pos: &[Vec3]) -> Vec<f64> {
        let mut x = vec![0.0; self.size()];
        for (n, d) in self.dofs.dof.iter().enumerate() {
            for a in 0..3 {
                if let Some(k) = d[a] {
                    x[k] = pos[n][a];
                }
            }
        }
        x
    }

    /// Adds `alpha · dx` (free-DOF vector) to node positions.
    pub fn add_scaled(&self, pos: &mut [Vec3], dx: &[f64], alpha: f64) {
        for (n, d) in self.dofs.dof.iter().enumerate() {
            for a in 0..3 {
                if let Some(k) = d[a] {
                    pos[n][a] += alpha * dx[k];
                }
            }
        }
    }

    /// Internal nodal forces `f_int` (N) on every node, and the energy and scale terms.
    /// Returns `None` when a member has collapsed to zero length.
    pub fn internal(model: &Model, pos: &[Vec3]) -> Option<(Vec<Vec3>, Vec<Vec3>, f64)> {
        let mut f = vec![Vec3::zeros(); pos.len()];
        let mut abs = vec![Vec3::zeros(); pos.len()];
        let mut energy = 0.0;
        for m in &model.members {
            let [a, b] = m.ends;
            let d = pos[b] - pos[a];
            let l = d.norm();
            if !(l > 0.0 && l.is_finite()) {
                return None;
            }
            let s = m.kind.state(l);
            let fe = d * (s.force / l);
            f[a] -= fe;
            f[b] += fe;
            let fa = fe.abs();
            abs[a] += fa;
            abs[b] += fa;
            energy += s.energy;
        }
        Some((f, abs, energy))
    }

    /// Energy, residual and scale at `pos` under `lambda` × the load vector `load`.
    pub fn evaluate(&self, model: &Model, pos: &[Vec3], load: &[Vec3], lambda: f64) -> Option<Evaluation> {
        let (f, abs, mut energy) = Self::internal(model, pos)?;
        let mut residual = vec![0.0; self.size()];
        let mut scale2 = 0.0;
        let mut load2 = 0.0;
        for (n, d) in self.dofs.dof.iter().enumerate() {
            let du = pos[n] - model.nodes[n].position;
            energy -= lambda * load[n].dot(&du);
            for a in 0..3 {
                // The full case load sets the scale even part-way along the load path.
                load2 += (lambda.max(1.0) * load[n][a]).powi(2);
                if let Some(k) = d[a] {
                    residual[k] = f[n][a] - lambda * load[n][a];
                    scale2 += abs[n][a].powi(2);
                }
            }
        }
        if !energy.is_finite() {
            return None;
        }
        let scale = scale2.sqrt().max(load2.sqrt()).max(1e-9);
        Some(Evaluation { energy, residual, scale })
    }

    /// Assembles the chosen part of the tangent stiffness at `pos` into upper-triangle values.
    pub fn assemble(&self, model: &Model, pos: &[Vec3], part: Part) -> Vec<f64> {
        let mut values = vec![0.0; self.nonzeros()];
        for (m, scatter) in model.members.iter().zip(&self.scatter) {
            let [a, b] = m.ends;
            let d = pos[b] - pos[a];
            let l = d.norm();
            if l.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
                continue;
            }
            let (ke, kg) = m.kind.tangent_blocks(&(d / l), l);
            let k: Matrix3<f64> = match part {
                Part::Total => ke + kg,
                Part::Elastic => ke,
                Part::Geometric => kg,
            };
            for &(li, lj, s) in scatter {
                let (li, lj) = (li as usize, lj as usize);
                let sign = if (li < 3) == (lj < 3) { 1.0 } else { -1.0 };
                values[s] += sign * k[(li % 3, lj % 3)];
            }
        }
        values
    }

    /// Largest diagonal entry magnitude (N/m), at least 1e-300.
    pub fn max_diagonal(&self, values: &[f64]) -> f64 {
        self.diag.iter().map(|&s| values[s].abs()).fold(1e-300, f64::max)
    }

    /// Cholesky factorisation of `K + σ I`, or `None` if it is not positive definite.
    pub fn factor(&self, values: &[f64], shift: f64) -> Option<Factor> {
        let symbolic = self.symbolic.as_ref()?;
        let shifted;
        let vals: &[f64] = if shift != 0.0 {
            let mut v = values.to_vec();
            for &s in &self.diag {
                v[s] += shift;
            }
            shifted = v;
            &shifted
        } else {
            values
        };
        let n = self.size();
        let sym = pattern_view(n, &self.col_ptr, &self.row_idx);
        let mat = SparseColMatRef::new(sym, vals);
        Llt::try_new_with_symbolic(symbolic.clone(), mat, Side::Upper)
            .ok()
            .map(|llt| Factor { llt, shift })
    }

    /// `y = K x` for the symmetric matrix stored as its upper triangle.
    pub fn mul(&self, values: &[f64], x: &[f64]) -> Vec<f64> {
        let mut y = vec![0.0; x.len()];
        for j in 0..self.size() {
            let range = self.col_ptr[j]..self.col_ptr[j + 1];
            for (&i, &v) in self.row_idx[range.clone()].iter().zip(&values[range]) {
                y[i] += v * x[j];
                if i != j {
                    y[j] += v * x[i];
                }
            }
        }
        y
    }

    /// Dense copy of the full symmetric matrix (for small systems and tests).
    pub fn dense(&self, values: &[f64]) -> nalgebra::DMatrix<f64> {
        let n = self.size();
        let mut k = nalgebra::DMatrix::zeros(n, n);
        for j in 0..n {
            let range = self.col_ptr[j]..self.col_ptr[j + 1];
            for (&i, &v) in self.row_idx[range.clone()].iter().zip(&values[range]) {
                k[(i, j)] = v;
                k[(j, i)] = v;
            }
        }
        k
    }
}

fn pattern_view<'a>(n: usize, col_ptr: &'a [usize], row_idx: &'a [usize]) -> SymbolicSparseColMatRef<'a, usize> {
    SymbolicSparseColMatRef::new_checked(n, n, col_ptr, None, row_idx)
}

impl System {
    /// Adds `diag[k]` to diagonal entry `k` of stored values.
    pub fn add_to_diagonal(&self, values: &mut [f64], diag: &[f64]) {
        for (&s, d) in self.diag.iter().zip(diag) {
            values[s] += d;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Shared out among threads (evenly or not), the columns solve to the same answers as in
    /// one call.
    #[test]
    fn columns_split_over_threads_solve_as_in_one_call() {
        let model = crate::gallery::cable_net(6, 1.0, 1e6, 500.0, 1.0).validate().unwrap();
        let sys = System::new(&model, DofMap::new(&model, None));
        let pos: Vec<Vec3> = model.nodes.iter().map(|n| n.position).collect();
        let factor = sys
            .factor(&sys.assemble(&model, &pos, Part::Total), 0.0)
            .expect("positive definite");
        let (n, ncols) = (sys.size(), 5);
        let rhs: Vec<f64> = (0..n * ncols).map(|i| ((i * 7) % 13) as f64 - 6.0).collect();
        let mut one = rhs.clone();
        factor.solve_split(&mut one, ncols, 1);
        for threads in [2, 3, 5, 9] {
            let mut split = rhs.clone();
            factor.solve_split(&mut split, ncols, threads);
            let worst = split.iter().zip(&one).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max);
            let size = one.iter().map(|v| v.abs()).fold(0.0, f64::max);
            assert!(worst <= 1e-12 * size, "{threads} threads: {worst}");
        }
        // And the answer solves the system: K x = b, column by column.
        let k = sys.dense(&sys.assemble(&model, &pos, Part::Total));
        let x = nalgebra::DMatrix::from_column_slice(n, ncols, &one);
        let b = nalgebra::DMatrix::from_column_slice(n, ncols, &rhs);
        assert!((k * x - &b).amax() < 1e-9 * b.amax());
    }
}
