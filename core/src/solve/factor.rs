//! Sparse factorisations of the tangent stiffness on one symbolic analysis.
//!
//! The fill-reducing ordering and the elimination tree (the symbolic analysis) depend only
//! on the pattern, so they are computed once per [`System`](super::system::System). Each
//! numeric factorisation is then either
//!
//! * `LLᵀ` (Cholesky) of `K + σI`, which exists exactly when `K + σI` is positive definite —
//!   the test the stability verdict is built on; or
//! * `LDLᵀ` without pivoting of `K + σI`, which also exists for most indefinite matrices and
//!   whose diagonal `D` has as many negative entries as `K + σI` has negative eigenvalues
//!   (Sylvester's law of inertia; the "Sturm sequence" count of finite-element practice, e.g.
//!   Bathe, *Finite Element Procedures*, §11.4.3). Path following uses it past limit points.

use std::sync::Arc;

use faer::dyn_stack::{MemBuffer, MemStack};
use faer::sparse::linalg::cholesky::{
    CholeskySymbolicParams, LdltRef, LltRef, SymbolicCholesky, SymbolicCholeskyRaw, SymmetricOrdering, factorize_symbolic_cholesky,
    supernodal,
};
use faer::sparse::{SparseColMatRef, SymbolicSparseColMatRef};
use faer::{Conj, Par, Side};

/// The symbolic analysis shared by every numeric factorisation of one pattern.
#[derive(Clone)]
pub struct Analysis {
    symbolic: Arc<SymbolicCholesky<usize>>,
}

impl Analysis {
    /// Analyses the upper-triangle pattern given column-compressed (`None` when `n = 0` or
    /// the analysis runs out of memory).
    pub fn new(n: usize, col_ptr: &[usize], row_idx: &[usize]) -> Option<Self> {
        if n == 0 {
            return None;
        }
        let pattern = SymbolicSparseColMatRef::new_checked(n, n, col_ptr, None, row_idx);
        let symbolic = factorize_symbolic_cholesky(pattern, Side::Upper, SymmetricOrdering::Amd, CholeskySymbolicParams::default()).ok()?;
        Some(Analysis {
            symbolic: Arc::new(symbolic),
        })
    }

    /// `LLᵀ` of the matrix with the analysed pattern and values `values` (upper triangle),
    /// or `None` when it is not positive definite.
    pub fn llt(&self, n: usize, col_ptr: &[usize], row_idx: &[usize], values: &[f64]) -> Option<Factor> {
        let sym = &*self.symbolic;
        let mut l = vec![0.0; sym.len_val()];
        let mat = SparseColMatRef::new(SymbolicSparseColMatRef::new_checked(n, n, col_ptr, None, row_idx), values);
        let mut mem = MemBuffer::try_new(sym.factorize_numeric_llt_scratch::<f64>(Par::Seq, Default::default())).ok()?;
        sym.factorize_numeric_llt(
            &mut l,
            mat,
            Side::Upper,
            Default::default(),
            Par::Seq,
            MemStack::new(&mut mem),
            Default::default(),
        )
        .ok()?;
        Some(Factor {
            symbolic: self.symbolic.clone(),
            values: l,
            kind: Kind::Llt,
            negative: 0,
            shift: 0.0,
        })
    }

    /// `LDLᵀ` (no pivoting) of the matrix, or `None` when a pivot is exactly zero.
    pub fn ldlt(&self, n: usize, col_ptr: &[usize], row_idx: &[usize], values: &[f64]) -> Option<Factor> {
        let sym = &*self.symbolic;
        let mut l = vec![0.0; sym.len_val()];
        let mat = SparseColMatRef::new(SymbolicSparseColMatRef::new_checked(n, n, col_ptr, None, row_idx), values);
        let mut mem = MemBuffer::try_new(sym.factorize_numeric_ldlt_scratch::<f64>(Par::Seq, Default::default())).ok()?;
        sym.factorize_numeric_ldlt(
            &mut l,
            mat,
            Side::Upper,
            Default::default(),
            Par::Seq,
            MemStack::new(&mut mem),
            Default::default(),
        )
        .ok()?;
        let d = ldlt_diagonal(sym, &l);
        if !d.iter().all(|v| v.is_finite() && *v != 0.0) {
            return None;
        }
        let negative = d.iter().filter(|v| **v < 0.0).count();
        Some(Factor {
            symbolic: self.symbolic.clone(),
            values: l,
            kind: Kind::Ldlt,
            negative,
            shift: 0.0,
        })
    }
}

/// The diagonal `D` of an `LDLᵀ` factor, in the factor's (permuted) order.
fn ldlt_diagonal(sym: &SymbolicCholesky<usize>, values: &[f64]) -> Vec<f64> {
    match sym.raw() {
        SymbolicCholeskyRaw::Simplicial(s) => {
            let factor = s.factor();
            let col_ptr = factor.col_ptr();
            let row_idx = factor.row_idx();
            (0..s.nrows())
                .map(|j| (col_ptr[j]..col_ptr[j + 1]).find(|&k| row_idx[k] == j).map_or(0.0, |k| values[k]))
                .collect()
        }
        SymbolicCholeskyRaw::Supernodal(s) => {
            let f = supernodal::SupernodalLdltRef::new(s, values);
            let mut d = Vec::with_capacity(s.nrows());
            for k in 0..s.n_supernodes() {
                let m = f.supernode(k).val();
                for j in 0..m.ncols() {
                    d.push(m[(j, j)]);
                }
            }
            d
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Kind {
    Llt,
    Ldlt,
}

/// A numeric factorisation of `K + σI`.
#[derive(Clone)]
pub struct Factor {
    symbolic: Arc<SymbolicCholesky<usize>>,
    values: Vec<f64>,
    kind: Kind,
    negative: usize,
    /// The shift σ that was added (N/m).
    pub shift: f64,
}

impl Factor {
    /// Number of negative eigenvalues of `K + σI` (always 0 for a Cholesky factor).
    pub fn negative_eigenvalues(&self) -> usize {
        self.negative
    }

    /// True for a Cholesky factor (the matrix is positive definite).
    pub fn is_cholesky(&self) -> bool {
        self.kind == Kind::Llt
    }

    /// Solves `(K + σI) x = b` in place.
    pub fn solve_in_place(&self, b: &mut [f64]) {
        let n = b.len();
        self.solve_block(b, n, 1);
    }

    fn solve_block(&self, b: &mut [f64], n: usize, ncols: usize) {
        let sym = &*self.symbolic;
        let rhs = faer::MatMut::from_column_major_slice_mut(b, n, ncols);
        let mut mem = MemBuffer::new(sym.solve_in_place_scratch::<f64>(ncols, Par::Seq));
        let stack = MemStack::new(&mut mem);
        match self.kind {
            Kind::Llt => LltRef::new(sym, &self.values).solve_in_place_with_conj(Conj::No, rhs, Par::Seq, stack),
            Kind::Ldlt => LdltRef::new(sym, &self.values).solve_in_place_with_conj(Conj::No, rhs, Par::Seq, stack),
        }
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
    pub(crate) fn solve_split(&self, b: &mut [f64], ncols: usize, threads: usize) {
        let n = b.len() / ncols.max(1);
        let threads = threads.clamp(1, ncols.max(1));
        if n == 0 {
            return;
        }
        if threads == 1 {
            self.solve_block(b, n, ncols);
            return;
        }
        let per = ncols.div_ceil(threads);
        std::thread::scope(|scope| {
            for chunk in b.chunks_mut(n * per) {
                let cols = chunk.len() / n;
                scope.spawn(move || self.solve_block(chunk, n, cols));
            }
        });
    }
}

/// Systems with at least this many DOFs solve several right-hand sides on several threads.
const PARALLEL_SOLVE_MIN_DOFS: usize = 5000;
