//! Natural frequencies and mode shapes about an equilibrium: `K_T φ = ω² M φ`.
//!
//! With `M = diag(m)` possibly singular (massless nodes), write `y = M^½ φ`. Then
//! `B y = ω⁻² y` with `B = M^½ K_T⁻¹ M^½`, symmetric and positive semi-definite when `K_T` is
//! positive definite; its largest eigenvalues give the lowest frequencies, and
//! `φ = ω² K_T⁻¹ M^½ y` recovers the full shape, massless degrees of freedom included, already
//! mass-normalised (`φᵀ M φ = yᵀ y = 1`). Applying `B` costs one solve with the sparse
//! Cholesky factor of `K_T`.
//!
//! Small rigs form `B` densely and use a symmetric eigensolver (all modes). Large rigs use a
//! block Lanczos iteration with full reorthogonalisation (Golub & Van Loan, *Matrix
//! Computations*, 4th ed., §10.3.6): the block of 4 vectors keeps repeated frequencies of
//! symmetric rigs, which a single-vector iteration can miss, and every Ritz pair is returned
//! only once its residual passes a convergence test.

use nalgebra::{DMatrix, SymmetricEigen};
use serde::Serialize;

use crate::model::Vec3;
use crate::solve::factor::Factor;
use crate::solve::stability::{Definiteness, verdict_at};
use crate::solve::system::Part;
use crate::solve::{Equilibrium, Statics};
use crate::watch::Watch;

use super::subdivide::{CableLinks, Subdivision, auto_links, each_links, subdivide};

/// Largest number of massive DOFs solved with the dense eigensolver.
const DENSE_LIMIT: usize = 600;
/// The frequency range that sets the cables' links spans at least this many modes, so that
/// asking for fewer modes gives the same ones.
const AUTO_RANGE_MODES: usize = 12;
/// Block size of the Lanczos iteration.
const BLOCK: usize = 4;

/// One natural mode.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Mode {
    /// Natural frequency (Hz).
    pub frequency_hz: f64,
    /// Period (s).
    pub period_s: f64,
    /// Circular frequency ω (rad/s).
    pub omega: f64,
    /// Mass-normalised shape, one vector per node (zero at held directions).
    pub shape: Vec<Vec3>,
    /// Effective modal mass along x, y, z (kg): `(φᵀ M r)²` with `r` the unit rigid
    /// translation.
    pub effective_mass: [f64; 3],
    /// Share of the mode's kinetic energy in the inner joints of sagging cables cut into links
    /// (0 to 1; 0 when no cable was): near 1, a mode of the cables themselves.
    pub cable_share: f64,
}

/// The lowest modes of a rig, ordered by frequency.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Modes {
    pub modes: Vec<Mode>,
    /// Total mass free to move along x, y, z (kg), for comparing effective masses.
    pub mobile_mass: [f64; 3],
    /// The sagging cables cut into links so that their own mass vibrates (empty: none, or
    /// each cable's mass lumped at its ends).
    pub cables: Vec<Subdivision>,
    /// Why the cables' own modes were left out, when they were.
    pub note: Option<String>,
}

/// Why no modes could be computed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ModeError {
    /// The equilibrium is not stable, so it has no natural frequencies.
    #[error("no natural frequencies about a state that is not stable: {0}")]
    NotStable(String),
    /// Every direction of every node is held.
    #[error("nothing is free to vibrate: every node is held in every direction")]
    NothingFree,
    /// No node has mass in a free direction.
    #[error("no mass can move: give the free nodes a mass (kg)")]
    NoMass,
    /// The computation was stopped through its [`Watch`].
    #[error("the mode computation was stopped")]
    Stopped,
    /// The iteration did not converge.
    #[error("the eigenvalue iteration did not converge for {0} mode(s); ask for fewer modes")]
    NotConverged(usize),
}

/// The lowest `count` modes about equilibrium `eq` (found with `statics`, without a held
/// node).
pub fn modes(statics: &Statics, eq: &Equilibrium, count: usize) -> Result<Modes, ModeError> {
    modes_watched(statics, eq, count, &Watch::new())
}

/// [`modes`] that stops early with [`ModeError::Stopped`] when `watch` is stopped (checked
/// before the factorisation and between Lanczos blocks) and counts Lanczos blocks on it.
/// Sagging cables are subdivided as [`CableLinks::Auto`] says.
pub fn modes_watched(statics: &Statics, eq: &Equilibrium, count: usize, watch: &Watch) -> Result<Modes, ModeError> {
    modes_with(statics, eq, count, CableLinks::Auto, watch)
}

/// The lowest `count` modes with each sagging cable cut into links for its own mass to
/// vibrate ([`subdivide`](super::subdivide)): the modes of the rig with its cables' own modes
/// among them. The shapes are given at the original nodes; [`Modes::cables`] lists the links
/// used, and [`Modes::note`] says when the subdivided rig could not be used (its modes are
/// then those with each cable's mass lumped at its ends).
pub fn modes_with(statics: &Statics, eq: &Equilibrium, count: usize, links: CableLinks, watch: &Watch) -> Result<Modes, ModeError> {
    let model = statics.model();
    if !eq.stability.is_stable() || !model.members.iter().any(|m| m.sags()) || links == CableLinks::Each(1) {
        return modes_lumped(statics, eq, count, watch);
    }
    let Some(case) = model.case_index(&eq.case) else {
        return modes_lumped(statics, eq, count, watch);
    };
    if model.case_gravity(case).norm() == 0.0 {
        return modes_lumped(statics, eq, count, watch);
    }
    let per_member: Vec<usize> = match links {
        CableLinks::Each(n) => each_links(model, n),
        CableLinks::Auto => {
            // The frequency range from the modes with the cables' mass at their ends; when
            // those are fewer than asked for (or none: a span between anchors), unknown.
            // At least the lowest 12, so that asking for fewer modes gives the same ones.
            let wanted = count.max(AUTO_RANGE_MODES);
            let highest = match modes_lumped(statics, eq, wanted, watch) {
                Ok(l) if l.modes.len() >= wanted => l.modes.last().map_or(f64::NAN, |m| m.frequency_hz),
                Err(ModeError::Stopped) => return Err(ModeError::Stopped),
                _ => f64::NAN,
            };
            auto_links(model, eq, highest)
        }
    };
    let sub = subdivide(model, eq, case, &per_member);
    if sub.cables.is_empty() {
        return modes_lumped(statics, eq, count, watch);
    }
    let mut finer = Statics::new(&sub.model);
    finer.settings = statics.settings.clone();
    let fallback = |why: String| -> Result<Modes, ModeError> {
        let mut m = modes_lumped(statics, eq, count, watch)?;
        m.note = Some(format!(
            "the cables' own modes are left out (each cable's mass is lumped at its ends): {why}"
        ));
        Ok(m)
    };
    let eq2 = match finer.solve(case, Some(&sub.warm)) {
        Ok(e) if e.stability.is_stable() => e,
        Ok(e) => return fallback(format!("the rig with its cables cut into links is {}", e.stability.describe())),
        Err(e) => return fallback(format!("the rig with its cables cut into links has no equilibrium: {e}")),
    };
    let mut ms = match modes_lumped(&finer, &eq2, count, watch) {
        Ok(m) => m,
        Err(ModeError::Stopped) => return Err(ModeError::Stopped),
        Err(e) => return fallback(e.to_string()),
    };
    let original = model.nodes.len();
    let masses = sub.model.dynamic_masses();
    for mode in &mut ms.modes {
        // φ is mass-normalised: Σ m φ² = 1 over all joints.
        let inner: f64 = mode.shape[original..]
            .iter()
            .zip(&masses[original..])
            .map(|(v, m)| m * v.norm_squared())
            .sum();
        mode.cable_share = inner.clamp(0.0, 1.0);
        mode.shape.truncate(original);
    }
    ms.cables = sub.cables;
    Ok(ms)
}

/// The modes with every sagging cable's mass lumped half at each end.
fn modes_lumped(statics: &Statics, eq: &Equilibrium, count: usize, watch: &Watch) -> Result<Modes, ModeError> {
    if !eq.stability.is_stable() {
        return Err(ModeError::NotStable(eq.stability.describe()));
    }
    let model = statics.model();
    let sys = statics.system();
    if sys.size() == 0 {
        return Err(ModeError::NothingFree);
    }
    let disp = eq.displacements();
    let gravity = statics.gravity_of(eq);
    let k = sys.assemble(model, &disp, &gravity, Part::Total);
    if watch.stopped() {
        return Err(ModeError::Stopped);
    }
    // The one stability verdict: a neutral state has a zero frequency, never a number.
    if verdict_at(sys, model, &disp, &gravity).0 != Definiteness::Positive {
        return Err(ModeError::NotStable(statics.stability_at(&disp, &gravity).describe()));
    }
    let factor = sys
        .factor(&k, 0.0)
        .ok_or_else(|| ModeError::NotStable("tangent stiffness is not positive definite".into()))?;
    let n = sys.size();
    // Diagonal mass per free DOF.
    let mut mass = vec![0.0; n];
    let mut mobile_mass = [0.0; 3];
    let masses = model.dynamic_masses();
    for (node, a, i) in sys.dofs.free() {
        mass[i] = masses[node];
        mobile_mass[a] += masses[node];
    }
    let massive: Vec<usize> = (0..n).filter(|&i| mass[i] > 0.0).collect();
    if massive.is_empty() {
        return Err(ModeError::NoMass);
    }
    let count = count.min(massive.len());
    let sqrt_m: Vec<f64> = mass.iter().map(|m| m.sqrt()).collect();
    // B y = M^½ K⁻¹ M^½ y, with y living on the massive DOFs only.
    // B Y for a block Y (columns on the massive DOFs), one multi-column solve.
    let apply = |y: &DMatrix<f64>| -> DMatrix<f64> {
        let c = y.ncols();
        let mut full = DMatrix::zeros(n, c);
        for (j, &i) in massive.iter().enumerate() {
            for col in 0..c {
                full[(i, col)] = sqrt_m[i] * y[(j, col)];
            }
        }
        factor.solve_columns_in_place(full.as_mut_slice(), c);
        DMatrix::from_fn(massive.len(), c, |j, col| sqrt_m[massive[j]] * full[(massive[j], col)])
    };
    let pairs = if massive.len() <= DENSE_LIMIT {
        dense_pairs(&apply, massive.len(), count)
    } else {
        lanczos_pairs(&apply, massive.len(), count, watch)?
    };
    let pairs: Vec<(f64, Vec<f64>)> = pairs.into_iter().filter(|(mu, _)| *mu > 0.0).collect();
    let shapes = shapes_from(&factor, &massive, &sqrt_m, n, &pairs);
    let out = pairs
        .into_iter()
        .zip(shapes)
        .map(|((mu, _), phi)| {
            let omega2 = 1.0 / mu;
            let omega = omega2.sqrt();
            let mut shape = vec![Vec3::zeros(); model.nodes.len()];
            let mut participation = [0.0; 3];
            for (node, a, i) in sys.dofs.free() {
                shape[node][a] = phi[i];
                participation[a] += mass[i] * phi[i];
            }
            // A fixed sign: the largest component positive.
            let (imax, _) = phi
                .iter()
                .enumerate()
                .fold((0, 0.0f64), |b, (i, v)| if v.abs() > b.1 { (i, v.abs()) } else { b });
            if phi[imax] < 0.0 {
                shape.iter_mut().for_each(|s| *s = -*s);
            }
            let frequency_hz = omega / std::f64::consts::TAU;
            Mode {
                frequency_hz,
                period_s: 1.0 / frequency_hz,
                omega,
                shape,
                effective_mass: participation.map(|p| p * p),
                cable_share: 0.0,
            }
        })
        .collect();
    Ok(Modes {
        modes: out,
        mobile_mass,
        cables: Vec::new(),
        note: None,
    })
}

/// `φ = ω² K⁻¹ M^½ y` on all free DOFs for every pair `(1/ω², y)`, in one multi-column solve.
fn shapes_from(factor: &Factor, massive: &[usize], sqrt_m: &[f64], n: usize, pairs: &[(f64, Vec<f64>)]) -> Vec<Vec<f64>> {
    let c = pairs.len();
    if c == 0 {
        return Vec::new();
    }
    let mut full = vec![0.0; n * c];
    for (col, (_, y)) in pairs.iter().enumerate() {
        for (j, &i) in massive.iter().enumerate() {
            full[col * n + i] = sqrt_m[i] * y[j];
        }
    }
    factor.solve_columns_in_place(&mut full, c);
    pairs
        .iter()
        .enumerate()
        .map(|(col, (mu, _))| full[col * n..(col + 1) * n].iter().map(|v| v / mu).collect())
        .collect()
}

/// All eigenpairs of the dense `B`, largest first, keeping `count`.
fn dense_pairs(apply: &dyn Fn(&DMatrix<f64>) -> DMatrix<f64>, m: usize, count: usize) -> Vec<(f64, Vec<f64>)> {
    let b = apply(&DMatrix::identity(m, m));
    let b = (&b + b.transpose()) * 0.5;
    let eig = SymmetricEigen::new(b);
    let mut idx: Vec<usize> = (0..m).collect();
    idx.sort_by(|&i, &j| eig.eigenvalues[j].total_cmp(&eig.eigenvalues[i]));
    idx.into_iter()
        .take(count)
        .map(|i| (eig.eigenvalues[i], eig.eigenvectors.column(i).iter().copied().collect()))
        .collect()
}

/// Largest `count` eigenpairs of `B` by block Lanczos with full reorthogonalisation.
///
/// The Krylov basis `V` grows one block at a time; from a minimum size on, the Ritz pairs are
/// checked every other block and the iteration stops as soon as the wanted ones have
/// converged: ‖B x − θ x‖ = ‖β_last s_last‖ ≤ 1e-7 θ_max (Golub & Van Loan §10.3); the eigenvalue error is of the order of the residual squared over the gap, far below what a frequency needs.
fn lanczos_pairs(
    apply: &dyn Fn(&DMatrix<f64>) -> DMatrix<f64>,
    m: usize,
    count: usize,
    watch: &Watch,
) -> Result<Vec<(f64, Vec<f64>)>, ModeError> {
    let b = BLOCK.min(m);
    let max_blocks = (m / b).clamp(1, 400);
    let min_blocks = ((count + 8) / b + 2).min(max_blocks);
    // Deterministic, well-spread start block.
    let start = DMatrix::from_fn(m, b, |i, j| (((i + 1) * (j + 3) * 2654435761usize) % 1000) as f64 / 1000.0 - 0.5);
    // Basis and block-tridiagonal matrix grow as needed (doubling).
    let mut v = DMatrix::zeros(m, 2 * min_blocks * b);
    v.columns_mut(0, b).copy_from(&qr_block(start).0);
    let mut t = DMatrix::zeros(2 * min_blocks * b, 2 * min_blocks * b);
    let mut beta_prev: Option<DMatrix<f64>> = None;
    let mut unconverged = count;
    let threads = threads_for(m);
    for k in 0..max_blocks {
        if watch.stopped() {
            return Err(ModeError::Stopped);
        }
        watch.advance();
        let q = v.columns(k * b, b).into_owned();
        let mut w = apply(&q);
        if let Some(bp) = &beta_prev {
            subtract(&v, (k - 1) * b..k * b, &bp.transpose(), &mut w, threads);
        }
        let a = inner(&v, k * b..(k + 1) * b, &w, threads);
        subtract(&v, k * b..(k + 1) * b, &a, &mut w, threads);
        // Full reorthogonalisation against the whole basis; a second pass only when the first
        // removed most of a column ("twice is enough", Parlett, *The Symmetric Eigenvalue
        // Problem*, §6.9).
        let before: Vec<f64> = w.column_iter().map(|c| c.norm()).collect();
        let c = inner(&v, 0..(k + 1) * b, &w, threads);
        subtract(&v, 0..(k + 1) * b, &c, &mut w, threads);
        if w.column_iter().zip(&before).any(|(c, n0)| c.norm() < 0.7 * n0) {
            let c = inner(&v, 0..(k + 1) * b, &w, threads);
            subtract(&v, 0..(k + 1) * b, &c, &mut w, threads);
        }
        let a = (&a + a.transpose()) * 0.5;
        t.view_mut((k * b, k * b), (b, b)).copy_from(&a);
        let (qn, beta) = qr_block(w);
        let used = k + 1;
        if used >= min_blocks {
            let (pairs, left) = ritz_pairs(&t, &v, &beta, used * b, b, count);
            unconverged = left;
            if left == 0 {
                return Ok(pairs);
            }
        }
        if used == max_blocks {
            break;
        }
        if (k + 2) * b > v.ncols() {
            let cols = (2 * v.ncols()).min(max_blocks * b);
            v = v.resize_horizontally(cols, 0.0);
            t = t.resize(cols, cols, 0.0);
        }
        t.view_mut(((k + 1) * b, k * b), (b, b)).copy_from(&beta);
        t.view_mut((k * b, (k + 1) * b), (b, b)).copy_from(&beta.transpose());
        beta_prev = Some(beta);
        v.columns_mut((k + 1) * b, b).copy_from(&qn);
    }
    Err(ModeError::NotConverged(unconverged))
}

/// Tall blocks with at least this many rows are shared out among the machine's threads.
const PARALLEL_ROWS: usize = 5000;

/// Threads for products over `m` rows: the machine's (at most 8) for tall blocks, else one.
/// The products of the tall, thin basis with a block are limited by reading the basis from
/// memory, which two threads do faster than one.
fn threads_for(m: usize) -> usize {
    if m >= PARALLEL_ROWS {
        std::thread::available_parallelism().map_or(1, |t| t.get()).min(8)
    } else {
        1
    }
}

/// Contiguous row ranges, from row 0, splitting `m` rows among `threads`.
fn row_ranges(m: usize, threads: usize) -> Vec<std::ops::Range<usize>> {
    let threads = threads.max(1);
    let rows = m.div_ceil(threads).max(1);
    (0..threads)
        .map(|t| (t * rows).min(m)..((t + 1) * rows).min(m))
        .filter(|r| !r.is_empty())
        .collect()
}

/// `V[:, cols]ᵀ w`, summed over row ranges computed in parallel.
fn inner(v: &DMatrix<f64>, cols: std::ops::Range<usize>, w: &DMatrix<f64>, threads: usize) -> DMatrix<f64> {
    let (m, b) = w.shape();
    let basis = faer::MatRef::from_column_major_slice(&v.as_slice()[m * cols.start..m * cols.end], m, cols.len());
    let block = faer::MatRef::from_column_major_slice(w.as_slice(), m, b);
    let part = |r: std::ops::Range<usize>| basis.subrows(r.start, r.len()).transpose() * block.subrows(r.start, r.len());
    let ranges = row_ranges(m, threads);
    let parts: Vec<faer::Mat<f64>> = if ranges.len() <= 1 {
        vec![part(0..m)]
    } else {
        std::thread::scope(|s| {
            let handles: Vec<_> = ranges.into_iter().map(|r| s.spawn(move || part(r))).collect();
            handles.into_iter().map(|h| h.join().expect("inner product thread")).collect()
        })
    };
    DMatrix::from_fn(cols.len(), b, |i, j| parts.iter().map(|p| p[(i, j)]).sum())
}

/// `w ← w − V[:, cols] c`, over row ranges in parallel.
fn subtract(v: &DMatrix<f64>, cols: std::ops::Range<usize>, c: &DMatrix<f64>, w: &mut DMatrix<f64>, threads: usize) {
    let (m, b) = w.shape();
    let basis = faer::MatRef::from_column_major_slice(&v.as_slice()[m * cols.start..m * cols.end], m, cols.len());
    let coef = faer::MatRef::from_column_major_slice(c.as_slice(), cols.len(), b);
    let update = |r: std::ops::Range<usize>, dst: faer::MatMut<'_, f64>| {
        faer::linalg::matmul::matmul(dst, faer::Accum::Add, basis.subrows(r.start, r.len()), coef, -1.0, faer::Par::Seq);
    };
    let ranges = row_ranges(m, threads);
    let mut rest = faer::MatMut::from_column_major_slice_mut(w.as_mut_slice(), m, b);
    if ranges.len() <= 1 {
        update(0..m, rest);
        return;
    }
    std::thread::scope(|s| {
        for r in ranges {
            let (head, tail) = rest.split_at_row_mut(r.len());
            rest = tail;
            s.spawn(move || update(r, head));
        }
    });
}

/// Ritz pairs from the first `dim` basis vectors, largest first, and how many of the first
/// `count` have not converged.
fn ritz_pairs(
    t: &DMatrix<f64>,
    v: &DMatrix<f64>,
    last_beta: &DMatrix<f64>,
    dim: usize,
    b: usize,
    count: usize,
) -> (Vec<(f64, Vec<f64>)>, usize) {
    let eig = SymmetricEigen::new(t.view((0, 0), (dim, dim)).into_owned());
    let mut idx: Vec<usize> = (0..dim).collect();
    idx.sort_by(|&i, &j| eig.eigenvalues[j].total_cmp(&eig.eigenvalues[i]));
    let top = eig.eigenvalues[idx[0]].abs().max(1e-300);
    let wanted: Vec<usize> = idx.iter().take(count).copied().collect();
    let unconverged = wanted
        .iter()
        .filter(|&&i| {
            let tail = eig.eigenvectors.column(i).rows(dim - b, b).into_owned();
            (last_beta * tail).norm() > 1e-7 * top
        })
        .count();
    if unconverged > 0 {
        return (Vec::new(), unconverged);
    }
    // Ritz vectors V S, formed only once every wanted pair has converged, in one product.
    let m = v.nrows();
    let basis = faer::MatRef::from_column_major_slice(&v.as_slice()[..m * dim], m, dim);
    let s = DMatrix::from_fn(dim, wanted.len(), |r, j| eig.eigenvectors[(r, wanted[j])]);
    let y = basis * faer::MatRef::from_column_major_slice(s.as_slice(), dim, wanted.len());
    let pairs = wanted
        .iter()
        .enumerate()
        .map(|(j, &i)| {
            let mut y: Vec<f64> = y.col(j).iter().copied().collect();
            let nrm = y.iter().map(|x| x * x).sum::<f64>().sqrt();
            y.iter_mut().for_each(|x| *x /= nrm);
            (eig.eigenvalues[i], y)
        })
        .collect();
    (pairs, unconverged)
}

/// Thin Householder QR of an m×b block: (Q with orthonormal columns, R upper triangular).
fn qr_block(w: DMatrix<f64>) -> (DMatrix<f64>, DMatrix<f64>) {
    let qr = w.qr();
    (qr.q(), qr.r())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The products split over rows agree with nalgebra's own, for uneven splits too.
    #[test]
    fn products_split_over_threads_match_the_plain_products() {
        let (m, cols, b) = (101, 7, 4);
        let v = DMatrix::from_fn(m, cols, |i, j| ((i * 7 + j * 13) % 17) as f64 - 8.0);
        let w = DMatrix::from_fn(m, b, |i, j| ((i * 3 + j * 5) % 11) as f64 * 0.5 - 2.0);
        let c = DMatrix::from_fn(5, b, |i, j| (i + 2 * j) as f64 - 3.0);
        let plain_inner = v.columns(1, 5).transpose() * &w;
        let mut plain_w = w.clone();
        plain_w -= v.columns(1, 5) * &c;
        for threads in [1, 2, 3, 8, 200] {
            assert!((inner(&v, 1..6, &w, threads) - &plain_inner).amax() < 1e-12, "{threads} threads");
            let mut split = w.clone();
            subtract(&v, 1..6, &c, &mut split, threads);
            assert!((split - &plain_w).amax() < 1e-12, "{threads} threads");
        }
        let ranges = row_ranges(10, 3);
        assert_eq!(ranges, vec![0..4, 4..8, 8..10]);
    }
}
