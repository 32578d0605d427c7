//! Result values: plain data the app draws and the sheet prints.

use serde::Serialize;

use crate::element::MemberClass;
use crate::model::Vec3;

/// Whether an equilibrium is a usable answer.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum Stability {
    /// The tangent stiffness is positive definite: a stable equilibrium.
    Stable,
    /// The tangent stiffness is singular to working precision (its lowest eigenvalue is below
    /// 1e-13 of its largest entry, or zero): `node` can move along `direction` with no
    /// restoring force. A neutral state is never a stable answer.
    Mechanism { node: String, direction: [f64; 3] },
    /// The tangent stiffness has a negative eigenvalue (N/m): the rig would buckle or snap,
    /// most strongly at `node` along `direction`.
    Unstable {
        node: String,
        direction: [f64; 3],
        eigenvalue: f64,
    },
}

impl Stability {
    pub fn is_stable(&self) -> bool {
        matches!(self, Stability::Stable)
    }

    /// One sentence for users.
    pub fn describe(&self) -> String {
        let d = |v: &[f64; 3]| format!("({:.3}, {:.3}, {:.3})", v[0], v[1], v[2]);
        match self {
            Stability::Stable => "stable equilibrium".into(),
            Stability::Mechanism { node, direction } => format!(
                "neutral (a mechanism): node `{node}` can move along {} with no restoring force, the lowest tangent stiffness being zero to working precision; add a member, a support or pretension there",
                d(direction)
            ),
            Stability::Unstable {
                node,
                direction,
                eigenvalue,
            } => format!(
                "unstable equilibrium (lowest tangent stiffness {eigenvalue:.4e} N/m): node `{node}` would move along {}; brace it or reduce the compression",
                d(direction)
            ),
        }
    }
}

/// Result for one node.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NodeResult {
    pub id: String,
    /// Equilibrium position (m).
    pub position: Vec3,
    /// Displacement from the drawn position (m).
    pub displacement: Vec3,
    /// Force the support exerts on the rig (N), for supported nodes; zero on free axes.
    pub reaction: Option<Vec3>,
}

/// Result for one member.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberResult {
    pub id: String,
    pub kind: MemberClass,
    /// Axial force (N), tension positive.
    pub force: f64,
    /// Current length (m).
    pub length: f64,
    /// Unstressed (cable, strut) or free (spring) length (m).
    pub unstressed_length: f64,
    /// Engineering strain `(L − L0)/L0`; for a zero-free-length spring, the stretch (m).
    pub strain: f64,
    /// True for a slack cable.
    pub slack: bool,
    /// For a cable that sags under its own weight: its tensions, sag and curve. Its `force` is
    /// then its largest tension and its `strain` the mean strain.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sag: Option<SagResult>,
}

/// What a cable that sags under its own weight (an elastic catenary) does in an equilibrium.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SagResult {
    /// Tension at end a and at end b (N); the larger is the member's force.
    pub tension_a: f64,
    pub tension_b: f64,
    /// Horizontal component of the tension, the same all along (N).
    pub horizontal: f64,
    /// Largest distance of the cable from its chord (m).
    pub sag: f64,
    /// Vertical distance below the chord half-way across the horizontal span (m).
    pub mid_span_sag: f64,
    /// Angle of the cable above the horizontal where it leaves end a, and where it meets end b
    /// (rad; positive rising towards b).
    pub angle_a: f64,
    pub angle_b: f64,
    /// Length of the stretched cable along its curve (m).
    pub stretched_length: f64,
    /// Weight of the cable in this load case (N).
    pub weight: f64,
    /// The curve, end a to end b (m), for drawing.
    pub curve: Vec<Vec3>,
}

/// A node held at a prescribed position, and the force needed to hold it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Hold {
    pub node: usize,
    /// Where it is held (m).
    pub position: Vec3,
    /// Force the hand applies to hold it there (N); the rig's restoring force is its negative.
    pub force: Vec3,
}

/// How an equilibrium was reached: whether it lies on the load path from the unloaded rig.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "route", rename_all = "snake_case")]
pub enum Route {
    /// Followed the load from the unloaded (pretension-only) equilibrium to the full load in
    /// load steps, every state on the way stable: the state the rig reaches as it is loaded.
    /// `from` is the load factor the path starts at: 0, or a small load (1e-3) when the
    /// unloaded rig is a mechanism that the first bit of load engages (a node hanging on
    /// unstressed cables), its state there found by energy minimisation from the drawn
    /// geometry.
    LoadPath { from: f64 },
    /// The unloaded rig is a mechanism (or has no unloaded equilibrium), so the full load was
    /// applied at once and the equilibrium found by energy minimisation from the drawn
    /// geometry (a trust-region Newton method). It is an equilibrium under the full load, but
    /// the load path to it is not traced.
    GlobalStart,
    /// Asked for explicitly: the load path lost stability at load factor `critical` (a
    /// limit point, a bifurcation, or an unstable start), and the rig was followed to the
    /// stable equilibrium it moves to: a state on another branch than the load path.
    Followed {
        /// Load factor at which the load path lost stability (None when the start itself was
        /// unstable).
        critical: Option<f64>,
        /// What was crossed: "limit point", "bifurcation" or "unstable start".
        crossed: String,
    },
}

impl Route {
    /// One sentence for users, or `None` for the plain load path.
    pub fn describe(&self) -> Option<String> {
        match self {
            Route::LoadPath { .. } => None,
            Route::GlobalStart => Some(
                "the unloaded rig is a mechanism, so this equilibrium was found by energy minimisation from the drawn geometry under the full load"
                    .into(),
            ),
            Route::Followed { critical, crossed } => Some(match critical {
                Some(c) => format!(
                    "followed past a {crossed} at load factor {}: this state is on another branch than the load path (it snapped through)",
                    sig6(*c)
                ),
                None => format!("the drawn state is an {crossed}; followed to the stable state the rig moves to"),
            }),
        }
    }
}

/// `x` with six significant digits, without an exponent for ordinary load factors.
pub fn sig6(x: f64) -> String {
    if x == 0.0 || !x.is_finite() {
        return format!("{x}");
    }
    let magnitude = x.abs().log10().floor() as i32;
    if (-4..6).contains(&magnitude) {
        let decimals = (5 - magnitude).max(0) as usize;
        format!("{x:.decimals$}")
    } else {
        format!("{x:.5e}")
    }
}

/// A nearby state to start a solve from (a drag, a Sweep, a Pull): the node positions of an
/// equilibrium of this or a slightly different rig, and the route by which that equilibrium
/// was reached. A warm solve that converges at once from it lies on the same branch, so it
/// inherits the route.
#[derive(Debug, Clone, PartialEq)]
pub struct Warm {
    /// Node positions (m), in model order.
    pub positions: Vec<Vec3>,
    pub route: Route,
}

impl From<&Equilibrium> for Warm {
    fn from(eq: &Equilibrium) -> Self {
        Warm {
            positions: eq.positions(),
            route: eq.route.clone(),
        }
    }
}

/// A solved equilibrium of one load case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Equilibrium {
    pub case: String,
    pub nodes: Vec<NodeResult>,
    pub members: Vec<MemberResult>,
    /// Newton iterations over all load steps.
    pub iterations: usize,
    /// Load steps taken (1 when the full load converged at once).
    pub load_steps: usize,
    /// Final relative residual `‖f_int − f_ext‖ / scale`.
    pub residual: f64,
    pub stability: Stability,
    pub hold: Option<Hold>,
    /// How it was reached.
    pub route: Route,
}

impl Equilibrium {
    /// Node positions (m), in model order.
    pub fn positions(&self) -> Vec<Vec3> {
        self.nodes.iter().map(|n| n.position).collect()
    }

    /// Node displacements from the drawn geometry (m), in model order: the solver's own state,
    /// exact to round-off however far the rig lies from the origin.
    pub fn displacements(&self) -> Vec<Vec3> {
        self.nodes.iter().map(|n| n.displacement).collect()
    }
}

/// A principal stiffness and its direction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Principal {
    /// Stiffness (N/m).
    pub value: f64,
    /// Unit direction (global axes).
    pub direction: Vec3,
}

/// Tangent stiffness condensed to one node's free directions: the force per unit displacement
/// of that node when every other free node is allowed to re-equilibrate.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NodeStiffness {
    pub node: String,
    /// Free axes of the node (0 = x, 1 = y, 2 = z), the rows and columns of the matrices.
    pub axes: Vec<usize>,
    /// Condensed tangent stiffness `K_T` (N/m), row-major.
    pub total: Vec<Vec<f64>>,
    /// Elastic part (N/m); `elastic + geometric = total`.
    pub elastic: Vec<Vec<f64>>,
    /// Geometric part (N/m).
    pub geometric: Vec<Vec<f64>>,
    /// Principal stiffnesses, smallest first.
    pub principal: Vec<Principal>,
}

impl NodeStiffness {
    /// Stiffness along unit direction `d`: `dᵀ K d` over the free axes (N/m).
    pub fn along(&self, d: &Vec3) -> f64 {
        let mut s = 0.0;
        for (i, &ai) in self.axes.iter().enumerate() {
            for (j, &aj) in self.axes.iter().enumerate() {
                s += d[ai] * self.total[i][j] * d[aj];
            }
        }
        s
    }
}
