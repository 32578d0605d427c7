//! The sparse tangent-stiffness pattern, assembly and factorisation.
//!
//! The upper triangle of `K_T` over the free degrees of freedom is stored column-compressed.
//! Its pattern depends only on which nodes members join and which directions are held, so it
//! is built once; each Newton iteration scatters member blocks into the same value slots and
//! every numeric factorisation reuses one symbolic analysis (fill-reducing ordering and
//! elimination tree).
//!
//! The state is the *displacement* `u` of every node from its drawn position `X`, and a
//! member's current vector is formed as `(X_b − X_a) + (u_b − u_a)`. The drawn chord
//! `X_b − X_a` is the same floating-point number at every evaluation and exact when the rig is
//! translated (the two coordinates are close, so their difference rounds exactly), and the
//! displacements carry full precision however far the rig sits from the origin: results do not
//! depend on where the origin is.

use nalgebra::Matrix3;

use crate::element::response::{Response, load_rate, respond};

pub use super::dofs::DofMap;
use super::factor::{Analysis, Factor};
use crate::model::{Member, Model, Vec3};

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

/// Sparse pattern of the upper triangle, with scatter maps and the symbolic factorisation.
#[derive(Clone)]
pub struct System {
    pub dofs: DofMap,
    /// End nodes of every member, for [`System::fits`].
    ends: Vec<[usize; 2]>,
    col_ptr: Vec<usize>,
    row_idx: Vec<usize>,
    /// Per member: (local row 0..6, local col 0..6, value slot) for entries with row ≤ col.
    scatter: Vec<Vec<(u8, u8, usize)>>,
    /// Value slot of each diagonal entry.
    diag: Vec<usize>,
    analysis: Option<Analysis>,
}

/// Values assembled at one configuration.
pub struct Evaluation {
    /// Strain energy minus load potential (J), relative to the drawn geometry.
    pub energy: f64,
    /// Out-of-balance force `f_int − λ f_ext` on free DOFs (N).
    pub residual: Vec<f64>,
    /// Scale for relative residuals (N): the larger of the norm of the full case load on the
    /// free directions and the norm of the nodal member-force magnitudes on them. Loads on
    /// held directions go to the supports and never enlarge it.
    pub scale: f64,
    /// Sum of the magnitudes of the terms of the potential (J): strain energy plus
    /// `|λ fᵢ uᵢ|`, the size round-off in `energy` is relative to.
    pub energy_scale: f64,
}

/// Internal forces at one configuration.
pub struct Internal {
    /// Internal nodal force `f_int` on every node (N).
    pub force: Vec<Vec3>,
    /// Sum of the magnitudes of member-force components at every node (N), for scales.
    pub magnitude: Vec<Vec3>,
    /// Strain energy (J).
    pub energy: f64,
}

/// Current vector from end a to end b of `m` at displacements `disp` (m).
#[inline]
pub fn member_vector(model: &Model, m: &Member, disp: &[Vec3]) -> Vec3 {
    let [a, b] = m.ends;
    (model.nodes[b].position - model.nodes[a].position) + (disp[b] - disp[a])
}

/// Current length of every member (m).
pub fn member_lengths(model: &Model, disp: &[Vec3]) -> Vec<f64> {
    model.members.iter().map(|m| member_vector(model, m, disp).norm()).collect()
}

/// The response of member `m` at displacements `disp` under gravitational acceleration
/// `gravity` (m/s², the case's times the load factor), or `None` when it has collapsed.
#[inline]
pub fn member_response(model: &Model, m: &Member, disp: &[Vec3], gravity: &Vec3) -> Option<Response> {
    respond(
        &m.kind,
        m.mass_per_length,
        &member_vector(model, m, disp),
        gravity,
        &disp[m.ends[0]],
    )
}

/// The loads of one load case at full load: the nodal forces (the weights of the node masses
/// and the point loads, N) and the gravitational acceleration that weighs the cables which sag
/// under their own weight (m/s²). Both scale with the load factor.
#[derive(Debug, Clone, PartialEq)]
pub struct Loading {
    pub nodal: Vec<Vec3>,
    pub gravity: Vec3,
}

impl Loading {
    /// The loading of case `case` of `model`.
    pub fn of(model: &Model, case: usize) -> Self {
        Loading {
            nodal: model.case_forces(case),
            gravity: model.case_gravity(case),
        }
    }

    /// Gravitational acceleration at load factor `lambda`.
    pub fn gravity_at(&self, lambda: f64) -> Vec3 {
        self.gravity * lambda
    }
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
        let analysis = Analysis::new(n, &col_ptr, &row_idx);
        System {
            dofs,
            ends: model.members.iter().map(|m| m.ends).collect(),
            col_ptr,
            row_idx,
            scatter,
            diag,
            analysis,
        }
    }

    /// True when this structure is the one [`System::new`] would build for `model` with
    /// node `held` held: the same free directions and the same member ends.
    pub fn fits(&self, model: &Model, held: Option<usize>) -> bool {
        self.ends.len() == model.members.len()
            && self.ends.iter().zip(&model.members).all(|(e, m)| *e == m.ends)
            && self.dofs == DofMap::new(model, held)
    }

    /// Number of free DOFs.
    pub fn size(&self) -> usize {
        self.dofs.count
    }

    /// Number of stored upper-triangle entries.
    pub fn nonzeros(&self) -> usize {
        self.row_idx.len()
    }

    /// Gathers the free-DOF vector from per-node vectors (displacements, velocities, …).
    pub fn gather(&self, per_node: &[Vec3]) -> Vec<f64> {
        self.dofs.free().map(|(n, a, _)| per_node[n][a]).collect()
    }

    /// Per-node vectors from a free-DOF vector (zero on held directions).
    pub fn scatter_nodes(&self, x: &[f64], nodes: usize) -> Vec<Vec3> {
        let mut out = vec![Vec3::zeros(); nodes];
        for (n, a, k) in self.dofs.free() {
            out[n][a] = x[k];
        }
        out
    }

    /// Adds `alpha · dx` (free-DOF vector) to per-node displacements.
    pub fn add_scaled(&self, disp: &mut [Vec3], dx: &[f64], alpha: f64) {
        for (n, a, k) in self.dofs.free() {
            disp[n][a] += alpha * dx[k];
        }
    }

    /// Internal nodal forces, force magnitudes and energy at displacements `disp` under
    /// gravitational acceleration `gravity` (for the cables that sag). Returns `None` when a
    /// member has collapsed to zero length or a value overflows.
    pub fn internal(model: &Model, disp: &[Vec3], gravity: &Vec3) -> Option<Internal> {
        let mut force = vec![Vec3::zeros(); disp.len()];
        let mut magnitude = vec![Vec3::zeros(); disp.len()];
        let mut energy = 0.0;
        for m in &model.members {
            let [a, b] = m.ends;
            let r = member_response(model, m, disp, gravity)?;
            force[a] += r.end_a;
            force[b] += r.end_b;
            magnitude[a] += r.end_a.abs();
            magnitude[b] += r.end_b.abs();
            energy += r.energy;
        }
        energy.is_finite().then_some(Internal { force, magnitude, energy })
    }

    /// Energy, residual and scale at displacements `disp` under `lambda` × the load `load`.
    pub fn evaluate(&self, model: &Model, disp: &[Vec3], loading: &Loading, lambda: f64) -> Option<Evaluation> {
        let Internal {
            force,
            magnitude,
            mut energy,
        } = Self::internal(model, disp, &loading.gravity_at(lambda))?;
        let load = &loading.nodal;
        let mut residual = vec![0.0; self.size()];
        let mut scale2 = 0.0;
        let mut load2 = 0.0;
        let mut energy_scale = energy.abs();
        for (n, a, k) in self.dofs.free() {
            let work = lambda * load[n][a] * disp[n][a];
            energy -= work;
            energy_scale += work.abs();
            residual[k] = force[n][a] - lambda * load[n][a];
            scale2 += magnitude[n][a].powi(2);
            // The full case load sets the scale even part-way along the load path.
            load2 += (lambda.abs().max(1.0) * load[n][a]).powi(2);
        }
        if !(energy.is_finite() && residual.iter().all(|r| r.is_finite())) {
            return None;
        }
        let scale = scale2.sqrt().max(load2.sqrt()).max(1e-12);
        Some(Evaluation {
            energy,
            residual,
            scale,
            energy_scale,
        })
    }

    /// Assembles the chosen part of the tangent stiffness at `disp` under gravitational
    /// acceleration `gravity` (the case's times the load factor) into upper-triangle values.
    pub fn assemble(&self, model: &Model, disp: &[Vec3], gravity: &Vec3, part: Part) -> Vec<f64> {
        self.assemble_members(model, disp, gravity, part, None)
    }

    /// The tangent the stability verdict judges: as [`System::assemble`] with [`Part::Total`],
    /// but a straight cable whose tension is at most `floor` (N) counts as slack. A cable at
    /// zero tension resists being stretched but not being slackened, so it cannot make a state
    /// stable in the direction that slackens it; its one-sided stiffness is left out.
    pub fn assemble_for_verdict(&self, model: &Model, disp: &[Vec3], gravity: &Vec3, floor: f64) -> Vec<f64> {
        self.assemble_members(model, disp, gravity, Part::Total, Some(floor))
    }

    /// [`assemble_for_verdict`](Self::assemble_for_verdict) with the floor of
    /// [`slack_floor`](Self::slack_floor), each member's response computed once for both.
    pub fn assemble_verdict_tangent(&self, model: &Model, disp: &[Vec3], gravity: &Vec3) -> Vec<f64> {
        let responses: Vec<Option<Response>> = model.members.iter().map(|m| member_response(model, m, disp, gravity)).collect();
        let members = responses.iter().flatten().map(|r| r.force.abs()).fold(0.0, f64::max);
        let loads = (0..model.cases.len())
            .flat_map(|c| model.case_forces(c))
            .map(|f| f.norm())
            .fold(0.0, f64::max);
        self.scatter_responses(model, responses.into_iter(), Part::Total, Some(1e-9 * members.max(loads)))
    }

    fn assemble_members(&self, model: &Model, disp: &[Vec3], gravity: &Vec3, part: Part, floor: Option<f64>) -> Vec<f64> {
        let responses = model.members.iter().zip(&self.scatter).map(|(m, scatter)| {
            if scatter.is_empty() {
                None
            } else {
                member_response(model, m, disp, gravity)
            }
        });
        self.scatter_responses(model, responses, part, floor)
    }

    /// Adds each member's tangent block (its `part`) into the stored matrix, leaving out
    /// straight cables at or below `floor` (N) when given.
    fn scatter_responses(
        &self,
        model: &Model,
        responses: impl Iterator<Item = Option<Response>>,
        part: Part,
        floor: Option<f64>,
    ) -> Vec<f64> {
        let mut values = vec![0.0; self.nonzeros()];
        for ((m, scatter), r) in model.members.iter().zip(&self.scatter).zip(responses) {
            if scatter.is_empty() {
                continue;
            }
            let Some(r) = r else {
                continue;
            };
            if let Some(floor) = floor
                && r.sag.is_none()
                && matches!(m.kind, crate::element::MemberKind::Cable { .. })
                && r.force <= floor
            {
                continue;
            }
            let k: Matrix3<f64> = match part {
                Part::Total => r.elastic + r.geometric,
                Part::Elastic => r.elastic,
                Part::Geometric => r.geometric,
            };
            for &(li, lj, s) in scatter {
                let (li, lj) = (li as usize, lj as usize);
                let sign = if (li < 3) == (lj < 3) { 1.0 } else { -1.0 };
                values[s] += sign * k[(li % 3, lj % 3)];
            }
        }
        values
    }

    /// Rate of change of the residual's load with the load factor on the free DOFs (N):
    /// the nodal load, less how the internal forces of sagging cables change as their weight
    /// grows (zero for rigs without them). The right-hand side of load-path tangents.
    pub fn load_rate(&self, model: &Model, disp: &[Vec3], loading: &Loading, lambda: f64) -> Vec<f64> {
        let mut rate = loading.nodal.clone();
        for m in &model.members {
            if m.mass_per_length > 0.0 && matches!(m.kind, crate::element::MemberKind::Cable { .. }) {
                let (ra, rb) = load_rate(&m.kind, m.mass_per_length, &member_vector(model, m, disp), &loading.gravity, lambda);
                rate[m.ends[0]] -= ra;
                rate[m.ends[1]] -= rb;
            }
        }
        self.gather(&rate)
    }

    /// Tension below which a cable counts as slack for the verdict (N): a billionth of the
    /// larger of the largest member force and the largest nodal load of any case — the
    /// resolution of forces at the solver's tolerance.
    pub fn slack_floor(model: &Model, disp: &[Vec3], gravity: &Vec3) -> f64 {
        let members = model
            .members
            .iter()
            .filter_map(|m| member_response(model, m, disp, gravity))
            .map(|r| r.force.abs())
            .fold(0.0, f64::max);
        let loads = (0..model.cases.len())
            .flat_map(|c| model.case_forces(c))
            .map(|f| f.norm())
            .fold(0.0, f64::max);
        1e-9 * members.max(loads)
    }

    /// Largest diagonal entry magnitude (N/m), at least 1e-300.
    pub fn max_diagonal(&self, values: &[f64]) -> f64 {
        self.diag.iter().map(|&s| values[s].abs()).fold(1e-300, f64::max)
    }

    /// Largest entry magnitude (N/m), at least 1e-300: the norm the stability verdict
    /// compares eigenvalues with.
    pub fn max_entry(&self, values: &[f64]) -> f64 {
        values.iter().map(|v| v.abs()).fold(1e-300, f64::max)
    }

    fn shifted<'v>(&self, values: &'v [f64], shift: f64, buf: &'v mut Vec<f64>) -> &'v [f64] {
        if shift == 0.0 {
            return values;
        }
        buf.clear();
        buf.extend_from_slice(values);
        for &s in &self.diag {
            buf[s] += shift;
        }
        buf
    }

    /// Cholesky factorisation of `K + σ I`, or `None` if it is not positive definite.
    pub fn factor(&self, values: &[f64], shift: f64) -> Option<Factor> {
        let analysis = self.analysis.as_ref()?;
        let mut buf = Vec::new();
        let vals = self.shifted(values, shift, &mut buf);
        let mut f = analysis.llt(self.size(), &self.col_ptr, &self.row_idx, vals)?;
        f.shift = shift;
        Some(f)
    }

    /// `LDLᵀ` factorisation of `K + σ I` for a matrix that may be indefinite (its inertia is
    /// [`Factor::negative_eigenvalues`]), or `None` at a zero pivot.
    pub fn factor_indefinite(&self, values: &[f64], shift: f64) -> Option<Factor> {
        let analysis = self.analysis.as_ref()?;
        let mut buf = Vec::new();
        let vals = self.shifted(values, shift, &mut buf);
        if let Some(mut f) = analysis.llt(self.size(), &self.col_ptr, &self.row_idx, vals) {
            f.shift = shift;
            return Some(f);
        }
        let mut f = analysis.ldlt(self.size(), &self.col_ptr, &self.row_idx, vals)?;
        f.shift = shift;
        Some(f)
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

    fn net() -> (Model, System, Vec<Vec3>) {
        let model = crate::gallery::cable_net(6, 1.0, 1e6, 500.0, 1.0).validate().unwrap();
        let sys = System::new(&model, DofMap::new(&model, None));
        let disp = vec![Vec3::zeros(); model.nodes.len()];
        (model, sys, disp)
    }

    /// Shared out among threads (evenly or not), the columns solve to the same answers as in
    /// one call.
    #[test]
    fn columns_split_over_threads_solve_as_in_one_call() {
        let (model, sys, disp) = net();
        let factor = sys
            .factor(&sys.assemble(&model, &disp, &Vec3::zeros(), Part::Total), 0.0)
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
        let k = sys.dense(&sys.assemble(&model, &disp, &Vec3::zeros(), Part::Total));
        let x = nalgebra::DMatrix::from_column_slice(n, ncols, &one);
        let b = nalgebra::DMatrix::from_column_slice(n, ncols, &rhs);
        assert!((k * x - &b).amax() < 1e-9 * b.amax());
    }

    /// The `LDLᵀ` factor of an indefinite matrix solves it and counts its negative
    /// eigenvalues as nalgebra's symmetric eigensolver does (Sylvester's law of inertia).
    #[test]
    fn indefinite_factor_solves_and_counts_negative_eigenvalues() {
        let (model, sys, disp) = net();
        let k = sys.assemble(&model, &disp, &Vec3::zeros(), Part::Total);
        let dense = sys.dense(&k);
        let eig = nalgebra::SymmetricEigen::new(dense.clone()).eigenvalues;
        let mut sorted: Vec<f64> = eig.iter().copied().collect();
        sorted.sort_by(f64::total_cmp);
        // Shifts between eigenvalues give every inertia from 0 to a dozen.
        for count in [0usize, 1, 3, 12] {
            let shift = if count == 0 {
                0.5 * sorted[0]
            } else {
                0.5 * (sorted[count - 1] + sorted[count])
            };
            let f = sys.factor_indefinite(&k, -shift).expect("no zero pivot");
            assert_eq!(f.negative_eigenvalues(), count, "shift {shift}");
            let n = sys.size();
            let b: Vec<f64> = (0..n).map(|i| ((i * 5) % 11) as f64 - 5.0).collect();
            let mut x = b.clone();
            f.solve_in_place(&mut x);
            let shifted = &dense - nalgebra::DMatrix::identity(n, n) * shift;
            let r = shifted * nalgebra::DVector::from_column_slice(&x) - nalgebra::DVector::from_column_slice(&b);
            assert!(
                r.amax() < 1e-8 * b.iter().fold(0.0f64, |m, v| m.max(v.abs())),
                "count {count}: {}",
                r.amax()
            );
        }
    }
}
