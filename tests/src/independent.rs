//! Checks of a solved state written from the member laws alone, sharing no code with the
//! solver: the out-of-balance force on the free directions, the dense tangent stiffness and
//! its eigenvalues (nalgebra's symmetric eigensolver), and an energy minimiser of its own.
//!
//! Member laws (shared REFERENCES §1, common practice): with current vector `d` from end a to
//! end b, `L = |d|`, the axial force is `N = EA (L − L0)/L0` for a cable or strut (a cable with
//! `L ≤ L0` carries nothing) and `N = k (L − L0)` for a spring; end b feels `−N d/L`, end a
//! `+N d/L` (internal forces `f_int` are their negatives), and the 3×3 tangent block is
//! `k_a ê êᵀ + (N/L)(I − ê êᵀ)`. A cable with a mass per length under gravity is an elastic
//! catenary, written here from Irvine's forward map with its own root finder (see `catenary`).

use nalgebra::{DMatrix, DVector, Matrix3, SymmetricEigen, Vector3};
use rigwright_core::{Equilibrium, MemberKind, Model};

/// Axial force and axial tangent of a member at length `l`.
fn law(kind: &MemberKind, l: f64) -> (f64, f64) {
    match *kind {
        MemberKind::Cable { ea, l0 } => {
            if l <= l0 {
                (0.0, 0.0)
            } else {
                (ea * (l - l0) / l0, ea / l0)
            }
        }
        MemberKind::Strut { ea, l0 } => (ea * (l - l0) / l0, ea / l0),
        MemberKind::Spring { k, l0 } => (k * (l - l0), k),
    }
}

/// Free directions of the model as (node, axis), in node order.
pub fn free_dofs(model: &Model) -> Vec<(usize, usize)> {
    let mut out = Vec::new();
    for (i, n) in model.nodes.iter().enumerate() {
        for a in 0..3 {
            if !n.support.fixed[a] {
                out.push((i, a));
            }
        }
    }
    out
}

fn vector(model: &Model, u: &[Vector3<f64>], a: usize, b: usize) -> Vector3<f64> {
    (model.nodes[b].position - model.nodes[a].position) + (u[b] - u[a])
}

/// Relative out-of-balance force on the free directions of case `case` at displacements `u`:
/// `‖f_int − f_ext‖ / max(‖f_ext‖, ‖Σ ‖member end force‖‖)` over the free directions.
pub fn residual(model: &Model, case: usize, u: &[Vector3<f64>]) -> f64 {
    let n = model.nodes.len();
    let mut f = vec![Vector3::zeros(); n];
    let mut mag = vec![Vector3::zeros(); n];
    for m in &model.members {
        let [a, b] = m.ends;
        let Some(r) = member_law(model, case, m, u) else { return f64::NAN };
        f[a] += r.end_a;
        f[b] += r.end_b;
        // Round-off in a component scales with the whole end force, not with that component
        // (a cable's end on a roller carries next to nothing along the roller).
        mag[a] += Vector3::repeat(r.end_a.norm());
        mag[b] += Vector3::repeat(r.end_b.norm());
    }
    let c = &model.cases[case];
    let mut ext = vec![Vector3::zeros(); n];
    for (i, node) in model.nodes.iter().enumerate() {
        ext[i] = model.gravity * (node.mass * c.gravity);
    }
    for (node, force) in &c.loads {
        ext[*node] += force;
    }
    let (mut r2, mut s2, mut e2) = (0.0f64, 0.0f64, 0.0f64);
    for (i, a) in free_dofs(model) {
        r2 += (f[i][a] - ext[i][a]).powi(2);
        s2 += mag[i][a].powi(2);
        e2 += ext[i][a].powi(2);
    }
    r2.sqrt() / s2.sqrt().max(e2.sqrt()).max(1e-12)
}

/// Dense tangent stiffness on the free directions at displacements `u` (N/m), with a cable
/// whose tension is below a billionth of the largest member force or nodal load counted slack:
/// at zero tension it resists stretching but not slackening, so its one-sided stiffness cannot
/// make a state stable (common practice for tension-only members).
pub fn tangent(model: &Model, case: usize, u: &[Vector3<f64>]) -> DMatrix<f64> {
    let laws: Vec<Option<MemberLaw>> = model.members.iter().map(|m| member_law(model, case, m, u)).collect();
    let members = laws.iter().flatten().map(|r| r.tension.abs()).fold(0.0, f64::max);
    let mut loads = 0.0f64;
    for c in &model.cases {
        for (i, node) in model.nodes.iter().enumerate() {
            let mut f = model.gravity * (node.mass * c.gravity);
            for (n, force) in &c.loads {
                if *n == i {
                    f += force;
                }
            }
            loads = loads.max(f.norm());
        }
    }
    let floor = 1e-9 * members.max(loads);
    let dofs = free_dofs(model);
    let mut index = vec![[None; 3]; model.nodes.len()];
    for (k, &(i, a)) in dofs.iter().enumerate() {
        index[i][a] = Some(k);
    }
    let mut k = DMatrix::zeros(dofs.len(), dofs.len());
    for (m, r) in model.members.iter().zip(&laws) {
        let [a, b] = m.ends;
        let Some(r) = r else {
            k.fill(f64::NAN);
            return k;
        };
        if matches!(m.kind, MemberKind::Cable { .. }) && !r.sagging && r.tension <= floor {
            continue;
        }
        let block = r.block;
        for (p, sp) in [(a, 1.0), (b, -1.0)] {
            for (q, sq) in [(a, 1.0), (b, -1.0)] {
                for i in 0..3 {
                    for j in 0..3 {
                        if let (Some(r), Some(c)) = (index[p][i], index[q][j]) {
                            k[(r, c)] += sp * sq * block[(i, j)];
                        }
                    }
                }
            }
        }
    }
    k
}

/// Lowest eigenvalue of the dense tangent and the largest entry magnitude (N/m).
pub fn lowest_eigenvalue(model: &Model, case: usize, u: &[Vector3<f64>]) -> (f64, f64) {
    let k = tangent(model, case, u);
    if k.iter().any(|x| x.is_nan()) {
        return (f64::NAN, f64::NAN);
    }
    if k.nrows() == 0 {
        return (f64::INFINITY, 0.0);
    }
    let scale = k.abs().max();
    let eig = SymmetricEigen::new(k).eigenvalues;
    (eig.iter().copied().fold(f64::INFINITY, f64::min), scale)
}

/// Displacements of an equilibrium.
pub fn displacements(eq: &Equilibrium) -> Vec<Vector3<f64>> {
    eq.nodes.iter().map(|n| n.displacement).collect()
}

/// The promise every "stable" answer must keep, checked without the solver's code: relative
/// residual on the free directions at most `1e-8`, and a dense tangent whose lowest eigenvalue
/// exceeds `1e-14` of its largest entry (the solver's verdict demands `1e-13`; the gap
/// allows for the eigensolver's own round-off). Returns a description of what fails.
pub fn check_stable_answer(model: &Model, case: usize, eq: &Equilibrium) -> Result<(), String> {
    let u = displacements(eq);
    let r = residual(model, case, &u);
    if r.is_nan() || r > 1e-8 {
        return Err(format!("relative residual {r:.3e} from the member laws"));
    }
    let (low, scale) = lowest_eigenvalue(model, case, &u);
    if low.is_nan() || low <= 1e-14 * scale {
        return Err(format!(
            "lowest tangent eigenvalue {low:.3e} N/m against {scale:.3e} N/m: not positive definite"
        ));
    }
    Ok(())
}

/// Total potential `Σ U − fᵀu` of case `case` at `u` (J).
pub fn potential(model: &Model, case: usize, u: &[Vector3<f64>]) -> f64 {
    let mut e = 0.0;
    for m in &model.members {
        e += member_law(model, case, m, u).map_or(f64::NAN, |r| r.energy);
    }
    let c = &model.cases[case];
    for (i, node) in model.nodes.iter().enumerate() {
        e -= (model.gravity * (node.mass * c.gravity)).dot(&u[i]);
    }
    for (node, force) in &c.loads {
        e -= force.dot(&u[*node]);
    }
    e
}

/// An energy minimiser of the test's own: a trust-region Newton method on the dense tangent
/// with the exact subproblem solved through its eigendecomposition (Nocedal & Wright,
/// *Numerical Optimization*, 2nd ed., §4.3, including the "hard case" step along the lowest
/// eigenvector), from the drawn geometry. Returns displacements of a state with a
/// positive-definite tangent that no round-off can explain (lowest eigenvalue above 1e-6 of
/// the largest entry at relative residual ≤ 1e-9, or above 1e-11 at ≤ 1e-12), or `None`.
pub fn minimise(model: &Model, case: usize) -> Option<Vec<Vector3<f64>>> {
    let dofs = free_dofs(model);
    let n = dofs.len();
    let extent = model.extent();
    let mut u = vec![Vector3::zeros(); model.nodes.len()];
    if n == 0 {
        return None;
    }
    let gradient = |u: &[Vector3<f64>]| -> DVector<f64> {
        let nn = model.nodes.len();
        let mut f = vec![Vector3::zeros(); nn];
        for m in &model.members {
            let [a, b] = m.ends;
            match member_law(model, case, m, u) {
                Some(r) => {
                    f[a] += r.end_a;
                    f[b] += r.end_b;
                }
                None => f[a] += Vector3::repeat(f64::NAN),
            }
        }
        let c = &model.cases[case];
        for (i, node) in model.nodes.iter().enumerate() {
            f[i] -= model.gravity * (node.mass * c.gravity);
        }
        for (node, force) in &c.loads {
            f[*node] -= force;
        }
        DVector::from_iterator(n, dofs.iter().map(|&(i, a)| f[i][a]))
    };
    let apply = |u: &[Vector3<f64>], p: &DVector<f64>| -> Vec<Vector3<f64>> {
        let mut t = u.to_vec();
        for (k, &(i, a)) in dofs.iter().enumerate() {
            t[i][a] += p[k];
        }
        t
    };
    let mut radius = 0.1 * extent;
    for _ in 0..3000 {
        let g = gradient(&u);
        let k = tangent(model, case, &u);
        let scale = k.abs().max().max(1e-300);
        if !g.iter().all(|x| x.is_finite()) || u.iter().any(|x| x.norm() > 1e3 * extent) {
            return None;
        }
        let res = residual(model, case, &u);
        if res <= 1e-9 {
            // Stable beyond doubt, or converged so far that no force left over from the
            // iteration (≤ 1e-12 of the scale) can be what stiffens the state.
            let low = SymmetricEigen::new(k.clone()).eigenvalues.min();
            if low > 1e-6 * scale || (res <= 1e-12 && low > 1e-11 * scale) {
                return Some(u);
            }
            if low > 0.0 && res > 1e-12 {
                // Polish before judging a soft state.
                let eig = SymmetricEigen::new(k.clone());
                let gq = eig.eigenvectors.transpose() * &g;
                let c = DVector::from_iterator(n, (0..n).map(|i| -gq[i] / eig.eigenvalues[i]));
                let p = &eig.eigenvectors * c;
                let trial = apply(&u, &p);
                if residual(model, case, &trial) < res {
                    u = trial;
                    continue;
                }
            }
            // A saddle: leave it along its direction of negative curvature.
            let eig = SymmetricEigen::new(k);
            let (imin, _) = eig.eigenvalues.argmin();
            let v = eig.eigenvectors.column(imin).into_owned();
            let p1 = apply(&u, &(&v * (0.01 * extent)));
            let p2 = apply(&u, &(&v * (-0.01 * extent)));
            let e0 = potential(model, case, &u);
            let (e1, e2) = (potential(model, case, &p1), potential(model, case, &p2));
            if e1.min(e2) >= e0 - 1e-12 * e0.abs() {
                return None;
            }
            u = if e1 < e2 { p1 } else { p2 };
            continue;
        }
        // Exact trust-region step through the eigendecomposition K = Q Λ Qᵀ.
        let eig = SymmetricEigen::new(k.clone());
        let q = &eig.eigenvectors;
        let lam = &eig.eigenvalues;
        let gq = q.transpose() * &g;
        let step = |mu: f64| -> DVector<f64> {
            let c = DVector::from_iterator(n, (0..n).map(|i| -gq[i] / (lam[i] + mu)));
            q * c
        };
        let lmin = lam.min();
        let mut p = if lmin > 1e-12 * scale {
            step(0.0)
        } else {
            DVector::from_element(n, f64::INFINITY)
        };
        if p.norm().is_nan() || p.norm() > radius {
            // Bisection on μ > −λ_min for ‖p(μ)‖ = radius.
            let mut lo = (-lmin).max(0.0);
            let mut hi = lo + g.norm() / radius + scale;
            for _ in 0..200 {
                let mid = 0.5 * (lo + hi);
                if step(mid).norm() > radius { lo = mid } else { hi = mid }
            }
            p = step(hi);
            if p.norm() < 0.5 * radius && lmin < 0.0 {
                // Hard case: add the lowest eigenvector to reach the boundary.
                let (imin, _) = lam.argmin();
                let v = q.column(imin).into_owned();
                let t = (radius * radius - p.norm_squared()).max(0.0).sqrt();
                p += v * t;
            }
        }
        let predicted = -(g.dot(&p) + 0.5 * (p.transpose() * &k * &p)[(0, 0)]);
        let trial = apply(&u, &p);
        let (e0, e1) = (potential(model, case, &u), potential(model, case, &trial));
        let rho = if predicted > 0.0 { (e0 - e1) / predicted } else { -1.0 };
        let noise = 1e-12 * (e0.abs() + e1.abs());
        if rho > 1e-4 || ((e0 - e1).abs() <= noise && gradient(&trial).norm() < g.norm()) {
            u = trial;
            if rho > 0.75 && p.norm() > 0.9 * radius {
                radius *= 2.0;
            }
        } else {
            radius *= 0.25;
        }
        if rho < 0.25 {
            radius = radius.min(0.5 * p.norm());
        }
        if radius < 1e-14 * extent {
            return None;
        }
    }
    None
}

/// One member's end forces (internal, `f_int`), its energy and its 3×3 tangent block, and the
/// force to judge slackness by, from the laws alone. A cable with mass per length under a
/// nonzero gravity is an elastic catenary (below); every other member is straight.
struct MemberLaw {
    end_a: Vector3<f64>,
    end_b: Vector3<f64>,
    energy: f64,
    block: Matrix3<f64>,
    tension: f64,
    sagging: bool,
}

fn member_law(model: &Model, case: usize, m: &rigwright_core::Member, u: &[Vector3<f64>]) -> Option<MemberLaw> {
    let [a, b] = m.ends;
    let d = vector(model, u, a, b);
    let g = model.gravity * model.cases[case].gravity;
    if let MemberKind::Cable { ea, l0 } = m.kind
        && m.mass_per_length > 0.0
        && g.norm() > 0.0
    {
        let w = m.mass_per_length * g.norm();
        let up = -g / g.norm();
        let base = (model.nodes[a].position + u[a]).dot(&up);
        return catenary(&d, &up, w, ea, l0, base);
    }
    let l = d.norm();
    let (force, ka) = law(&m.kind, l);
    let e = d / l;
    let eet = e * e.transpose();
    let stretch = l - m.kind.rest_length();
    let energy = match m.kind {
        MemberKind::Cable { .. } if stretch <= 0.0 => 0.0,
        _ => 0.5 * m.kind.rate() * stretch * stretch,
    };
    Some(MemberLaw {
        end_a: -e * force,
        end_b: e * force,
        energy,
        block: eet * ka + (Matrix3::identity() - eet) * (force / l),
        tension: force,
        sagging: false,
    })
}

/// Irvine's elastic catenary (*Cable Structures*, MIT Press 1981, ch. 1; from memory, shared
/// REFERENCES §2), written here from the published forward map: with the tension at end a
/// having horizontal component `H` and vertical component `V` along the cable towards b,
///   `x = H L0/EA + (H/w)[asinh(V_b/H) − asinh(V/H)]`, `V_b = V + w L0`,
///   `z = (V L0 + w L0²/2)/EA + (H/w)[√(1+(V_b/H)²) − √(1+(V/H)²)]`.
/// `(H, V)` for the chord are found by a damped Newton method on this map from the initial
/// guess of Peyrot & Goulois (1979, J. Struct. Div. ASCE 105(ST5); from memory); the in-plane
/// tangent is the inverse of the map's Jacobian (the flexibility), the out-of-plane one `H/l_x`.
/// Energy: `∫ T²/(2EA) ds + w ∫ z ds` plus the weight at the height `base` of end a.
fn catenary(d: &Vector3<f64>, up: &Vector3<f64>, w: f64, ea: f64, l0: f64, base: f64) -> Option<MemberLaw> {
    let lz = d.dot(up);
    let hvec = d - up * lz;
    let lx = hvec.norm();
    if lx <= 1e-9 * d.norm() {
        return Some(vertical_cable(lz, up, w, ea, l0, base));
    }
    let horiz = hvec / lx;
    let map = |h: f64, v: f64| -> ((f64, f64), [[f64; 2]; 2]) {
        let vb = v + w * l0;
        let (ra, rb) = ((1.0 + (v / h).powi(2)).sqrt(), (1.0 + (vb / h).powi(2)).sqrt());
        let x = h * l0 / ea + h / w * ((vb / h).asinh() - (v / h).asinh());
        let z = (v * l0 + 0.5 * w * l0 * l0) / ea + h / w * (rb - ra);
        // Derivatives with respect to H and V (V_b moves with V).
        let dx_dh = l0 / ea + ((vb / h).asinh() - (v / h).asinh()) / w - (vb / rb - v / ra) / (w * h);
        let dx_dv = (1.0 / rb - 1.0 / ra) / w;
        let dz_dh = (rb - ra) / w - ((vb / h).powi(2) / rb - (v / h).powi(2) / ra) / w;
        let dz_dv = l0 / ea + (vb / (h * rb) - v / (h * ra)) / w;
        ((x, z), [[dx_dh, dx_dv], [dz_dh, dz_dv]])
    };
    // Initial guess (Peyrot & Goulois).
    let chord2 = lx * lx + lz * lz;
    let lam = if l0 * l0 <= chord2 {
        0.2
    } else {
        (3.0 * ((l0 * l0 - lz * lz) / (lx * lx) - 1.0)).sqrt().max(1e-6)
    };
    let mut h = (w * lx / (2.0 * lam)).abs().max(1e-300);
    let mut v = 0.5 * w * (lz / lam.tanh() - l0);
    let size = l0.max(chord2.sqrt());
    // Converged at 1e-14 of the size, or where round-off in the map stops the progress
    // (within 1e-11 of the size; the map's own round-off is about 1e-14 of its largest term).
    let mut converged = false;
    let mut stalls = 0;
    for _ in 0..300 {
        let ((x, z), j) = map(h, v);
        let (rx, rz) = (x - lx, z - lz);
        let before = (rx * rx + rz * rz).sqrt();
        if before <= 1e-14 * size || (before <= 1e-11 * size && stalls >= 3) {
            converged = true;
            break;
        }
        let det = j[0][0] * j[1][1] - j[0][1] * j[1][0];
        let dh = -(j[1][1] * rx - j[0][1] * rz) / det;
        let dv = -(-j[1][0] * rx + j[0][0] * rz) / det;
        // Damped: keep H positive, shrink until the mismatch falls.
        let mut t = 1.0;
        loop {
            let (hn, vn) = (h + t * dh, v + t * dv);
            if hn > 0.0 {
                let ((xn, zn), _) = map(hn, vn);
                let after = ((xn - lx).powi(2) + (zn - lz).powi(2)).sqrt();
                if after < before || t < 1e-6 {
                    if after > 0.5 * before {
                        stalls += 1;
                    }
                    h = hn;
                    v = vn;
                    break;
                }
            }
            t *= 0.5;
            if t < 1e-12 {
                return None;
            }
        }
    }
    if !converged {
        return None;
    }
    let ((_, _), j) = map(h, v);
    let det = j[0][0] * j[1][1] - j[0][1] * j[1][0];
    // Stiffness in the (horizontal, up) plane: inverse of the flexibility.
    let k = [[j[1][1] / det, -j[0][1] / det], [-j[1][0] / det, j[0][0] / det]];
    let lateral = up.cross(&horiz);
    let mut block = lateral * lateral.transpose() * (h / lx);
    let basis = [horiz, *up];
    for (p, bp) in basis.iter().enumerate() {
        for (q, bq) in basis.iter().enumerate() {
            block += bp * bq.transpose() * k[p][q];
        }
    }
    let vb = v + w * l0;
    let strain = (h * h * l0 + (vb.powi(3) - v.powi(3)) / (3.0 * w)) / (2.0 * ea);
    let prim = |s: f64| 0.5 * (s * (1.0 + s * s).sqrt() + s.asinh());
    let int_z = (0.5 * v * l0 * l0 + w * l0.powi(3) / 6.0) / ea
        + h / w * (h / w * (prim(vb / h) - prim(v / h)) - l0 * (1.0 + (v / h).powi(2)).sqrt());
    let energy = strain + w * int_z + w * l0 * base;
    Some(MemberLaw {
        end_a: -(horiz * h + up * v),
        end_b: horiz * h + up * vb,
        energy,
        block,
        tension: h.hypot(v).max(h.hypot(vb)),
        sagging: true,
    })
}

/// A cable on a vertical chord (`H = 0`), from the same laws with no horizontal tension: the
/// tension at `s` is `|V + w s|` and the rise `dz/ds = sgn(V + w s)(1 + |V + w s|/EA)`, so the
/// rise of b over a is piecewise linear in `V` and is solved in closed form — taut with its
/// lower end pulling (`V ≥ 0` or `V_b ≤ 0`), or hanging in a loop below both ends. Across the
/// chord `x = H ∫(1/T + 1/EA) ds`, so the stiffness there is `1/(|ln(V_b/V)|/w + L0/EA)`,
/// and zero where the tension vanishes along the cable (a loop, or a free lower end).
fn vertical_cable(lz: f64, up: &Vector3<f64>, w: f64, ea: f64, l0: f64, base: f64) -> MemberLaw {
    let self_stretch = w * l0 * l0 / (2.0 * ea);
    // V ≥ 0: the whole cable rises from a; V_b ≤ 0: the whole cable falls from a.
    let rising = (lz - l0 - self_stretch) * ea / l0;
    let falling = (lz + l0 - self_stretch) * ea / l0;
    let (v, axial) = if rising >= 0.0 {
        (rising, ea / l0)
    } else if falling <= -w * l0 {
        (falling, ea / l0)
    } else {
        let rate = 1.0 / (2.0 / w + l0 / ea);
        ((lz - l0 - self_stretch) * rate, rate)
    };
    let vb = v + w * l0;
    // Tension below a millionth of the weight counts as vanishing (an equilibrium's residual
    // leaves a free end that much tension).
    let tol = 1e-6 * w * l0;
    let across = if v > tol || vb < -tol {
        1.0 / ((vb / v).abs().ln().abs() / w + l0 / ea)
    } else {
        0.0
    };
    let block = *up * up.transpose() * axial + (Matrix3::identity() - *up * up.transpose()) * across;
    let s0 = (-v / w).clamp(0.0, l0);
    let int_z = (0.5 * v * l0 * l0 + w * l0.powi(3) / 6.0) / ea + 0.5 * l0 * l0 - 2.0 * s0 * l0 + s0 * s0;
    let strain = (vb.powi(3) - v.powi(3)) / (6.0 * w * ea);
    MemberLaw {
        end_a: -*up * v,
        end_b: *up * vb,
        energy: strain + w * int_z + w * l0 * base,
        block,
        tension: v.abs().max(vb.abs()),
        sagging: true,
    }
}
