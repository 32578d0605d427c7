//! Solving off the UI thread: requests go to a worker, the newest request wins: a newer
//! request cancels the solve in flight (between Newton iterations) and its outcome is dropped.
//!
//! Responsible for running `rigwright-core` solvers for the app (inline for small rigs, on a
//! worker thread for large ones) and handing back plain outcomes. Computes no mechanics itself.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{Receiver, Sender, channel};
use std::time::{Duration, Instant};

use rigwright_core::{Equilibrium, Model, NodeStiffness, Statics, Vec3, Warm};

/// Rigs with at most this many free degrees of freedom are solved inline (a few milliseconds).
pub const INLINE_DOFS: usize = 400;

/// What to solve.
#[derive(Clone)]
pub struct SolveRequest {
    /// Increases with every request; outcomes of older requests are dropped.
    pub generation: u64,
    pub model: Arc<Model>,
    pub case: usize,
    /// A nearby equilibrium of the same or a slightly edited model (warm start).
    pub warm: Option<Warm>,
    /// Hold this node at this position (Pull).
    pub hold: Option<(usize, Vec3)>,
    /// Also condense the tangent stiffness to this node (unheld solves only).
    pub stiffness_at: Option<usize>,
    /// Follow the rig past a limit point or bifurcation to where it snaps (asked for
    /// explicitly; off by default).
    pub follow: bool,
}

/// What came back.
pub struct SolveOutcome {
    pub generation: u64,
    pub model: Arc<Model>,
    pub case: usize,
    pub hold: Option<(usize, Vec3)>,
    /// The equilibrium, or the diagnostic why there is none.
    pub result: Result<Equilibrium, String>,
    /// Load factor of the limit point or bifurcation that stopped the solve, if that is why
    /// there is no equilibrium.
    pub critical: Option<f64>,
    pub stiffness: Option<Result<NodeStiffness, String>>,
    /// Wall time of the solve.
    pub elapsed: Duration,
}

/// The structure of the last solver (pattern and symbolic analysis), for the next solve of
/// a rig that differs only in positions, loads or member properties.
static STRUCTURE: std::sync::Mutex<Option<rigwright_core::solve::system::System>> = std::sync::Mutex::new(None);

/// Runs one request on the calling thread.
pub fn solve_now(req: &SolveRequest) -> SolveOutcome {
    solve_cancellable(req, None)
}

/// Runs one request on the calling thread; raising `cancel` abandons the solve.
fn solve_cancellable(req: &SolveRequest, cancel: Option<&Arc<AtomicBool>>) -> SolveOutcome {
    let start = Instant::now();

    let model = &*req.model;
    let warm = req.warm.as_ref().filter(|w| w.positions.len() == model.nodes.len());
    let held = req.hold.map(|(node, _)| node);
    // A drag changes positions, not the structure: reuse the last solver's pattern and
    // symbolic analysis when they fit.
    let cached = STRUCTURE.lock().ok().and_then(|mut c| c.take());
    let statics = match (cached, held) {
        (Some(s), _) => Statics::with_system(model, held, s),
        (None, Some(node)) => Statics::holding(model, node),
        (None, None) => Statics::new(model),
    };
    let mut statics = cancellable(statics, cancel);
    statics.settings.follow = req.follow;
    let (result, stiffness) = match req.hold {
        Some((_, at)) => (statics.solve_held(req.case, at, warm), None),
        None => {
            let result = statics.solve(req.case, warm);
            let stiffness = match (&result, req.stiffness_at) {
                (Ok(eq), Some(n)) if eq.stability.is_stable() => Some(statics.node_stiffness(eq, n).map_err(|e| e.to_string())),
                _ => None,
            };
            (result, stiffness)
        }
    };
    if let Ok(mut c) = STRUCTURE.lock() {
        *c = Some(statics.into_system());
    }
    SolveOutcome {
        generation: req.generation,
        model: req.model.clone(),
        case: req.case,
        hold: req.hold,
        critical: result.as_ref().err().and_then(|e| e.critical_load_factor()),
        result: result.map_err(|e| e.to_string()),
        stiffness,
        elapsed: start.elapsed(),
    }
}

/// `statics`, abandoned when `cancel` is raised.
fn cancellable<'m>(statics: Statics<'m>, cancel: Option<&Arc<AtomicBool>>) -> Statics<'m> {
    match cancel {
        Some(flag) => statics.cancel_with(flag.clone()),
        None => statics,
    }
}

/// Free degrees of freedom of a model, roughly (free axes of all nodes).
pub fn free_dofs(model: &Model) -> usize {
    model.nodes.iter().map(|n| n.support.fixed.iter().filter(|f| !**f).count()).sum()
}

/// Sends requests to a worker thread and collects the newest outcome.
pub struct Solver {
    to_worker: Sender<(SolveRequest, Arc<AtomicBool>)>,
    /// Cancel flag of the last request sent to the worker.
    in_flight: Option<Arc<AtomicBool>>,
    from_worker: Receiver<SolveOutcome>,
    /// Generation of the newest request sent.
    pub latest: u64,
    /// A request is on the worker and not answered yet.
    pub busy: bool,
}

impl Solver {
    /// Starts the worker. `wake` is called after each outcome (to repaint the window).
    pub fn new(wake: impl Fn() + Send + 'static) -> Self {
        let (to_worker, requests) = channel::<(SolveRequest, Arc<AtomicBool>)>();
        let (answers, from_worker) = channel::<SolveOutcome>();
        std::thread::Builder::new()
            .name("rigwright-solver".into())
            .spawn(move || {
                while let Ok(mut req) = requests.recv() {
                    // Drop stale requests: only the newest one matters.
                    while let Ok(newer) = requests.try_recv() {
                        req = newer;
                    }
                    let (req, cancel) = req;
                    if cancel.load(Ordering::Relaxed) {
                        continue;
                    }
                    let outcome = solve_cancellable(&req, Some(&cancel));
                    // Cancelled (or finished as it was cancelled): a newer request is coming.
                    if cancel.load(Ordering::Relaxed) {
                        continue;
                    }
                    if answers.send(outcome).is_err() {
                        break;
                    }
                    wake();
                }
            })
            .expect("the solver thread starts");
        Solver {
            to_worker,
            in_flight: None,
            from_worker,
            latest: 0,
            busy: false,
        }
    }

    /// Submits a request; small rigs are solved at once and the outcome returned.
    pub fn submit(&mut self, mut req: SolveRequest) -> Option<SolveOutcome> {
        self.latest += 1;
        req.generation = self.latest;
        // Whatever the worker is solving is stale now.
        if let Some(flag) = self.in_flight.take() {
            flag.store(true, Ordering::Relaxed);
        }
        if free_dofs(&req.model) <= INLINE_DOFS {
            self.busy = false;
            return Some(solve_now(&req));
        }
        self.busy = true;
        // If the worker is gone the request is solved here instead.
        let flag = Arc::new(AtomicBool::new(false));
        match self.to_worker.send((req, flag.clone())) {
            Ok(()) => {
                self.in_flight = Some(flag);
                None
            }
            Err(e) => {
                self.busy = false;
                Some(solve_now(&e.0.0))
            }
        }
    }

    /// The newest outcome from the worker that is not stale, if any arrived.
    pub fn poll(&mut self) -> Option<SolveOutcome> {
        let mut newest = None;
        while let Ok(o) = self.from_worker.try_recv() {
            if o.generation == self.latest {
                self.busy = false;
            }
            newest = Some(o);
        }
        newest
    }
}

/// Condensed tangent stiffness at `node` of a solved equilibrium, on the calling thread.
pub fn stiffness_now(model: &Model, eq: &Equilibrium, node: usize) -> Option<NodeStiffness> {
    Statics::new(model).node_stiffness(eq, node).ok()
}
