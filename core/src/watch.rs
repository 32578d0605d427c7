//! Following and stopping a long computation from another thread.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// A handle shared between a long computation and whoever waits for it: the waiter can ask
/// the computation to stop and read how many steps it has finished. Clones share the same
/// state. The computations that take one check it between steps (a load case, a Sweep value,
/// a Lanczos block, a Newton iteration) and return early once it is stopped.
#[derive(Debug, Clone, Default)]
pub struct Watch {
    stop: Arc<AtomicBool>,
    done: Arc<AtomicUsize>,
}

impl Watch {
    /// A fresh handle: not stopped, no steps done.
    pub fn new() -> Self {
        Self::default()
    }

    /// Asks the computation to stop at its next check.
    pub fn stop(&self) {
        self.stop.store(true, Ordering::Relaxed);
    }

    /// Whether [`Watch::stop`] was called.
    pub fn stopped(&self) -> bool {
        self.stop.load(Ordering::Relaxed)
    }

    /// A handle for a part of the work: stopped together with this one, but counting its
    /// own steps (a Sweep counts values, the modes inside each value count Lanczos blocks).
    pub fn child(&self) -> Watch {
        Watch {
            stop: Arc::clone(&self.stop),
            done: Arc::new(AtomicUsize::new(0)),
        }
    }

    /// The stop flag itself, for [`Statics::cancel_with`](crate::Statics::cancel_with).
    pub fn flag(&self) -> Arc<AtomicBool> {
        Arc::clone(&self.stop)
    }

    /// Records one more finished step.
    pub fn advance(&self) {
        self.done.fetch_add(1, Ordering::Relaxed);
    }

    /// Steps finished so far.
    pub fn done(&self) -> usize {
        self.done.load(Ordering::Relaxed)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clones_share_the_stop_flag_and_the_count() {
        let w = Watch::new();
        let other = w.clone();
        assert!(!other.stopped());
        w.advance();
        w.advance();
        w.stop();
        assert!(other.stopped());
        assert!(other.flag().load(Ordering::Relaxed));
        assert_eq!(other.done(), 2);
        let part = w.child();
        part.advance();
        assert_eq!((part.done(), w.done()), (1, 2), "a child counts on its own");
        assert!(part.stopped(), "and stops with its parent");
    }

    /// A 20×20 net has 972 free DOFs, enough for the Lanczos path of the modes.
    fn net() -> crate::Project {
        crate::gallery::cable_net(20, 1.0, 1e6, 2000.0, 2.0)
    }

    #[test]
    fn modes_count_lanczos_blocks_and_stop_when_asked() {
        use crate::dynamics::{ModeError, modes_watched};
        let model = net().validate().unwrap();
        let statics = crate::Statics::new(&model);
        let eq = statics.solve(0, None).unwrap();
        let w = Watch::new();
        assert!(modes_watched(&statics, &eq, 4, &w).is_ok());
        assert!(w.done() > 0, "blocks counted");
        let stopped = Watch::new();
        stopped.stop();
        assert_eq!(modes_watched(&statics, &eq, 4, &stopped), Err(ModeError::Stopped));
    }

    #[test]
    fn a_sweep_counts_its_values_and_a_stopped_one_returns_what_it_finished() {
        use crate::sizing::{Catalogue, Output, sweep_watched};
        let p = net();
        let param = "member:x1_5:pretension".parse().unwrap();
        let out = [Output::PeakTension, Output::LowestFrequency];
        let w = Watch::new();
        let r = sweep_watched(&p, &Catalogue::default(), None, &param, (1000.0, 3000.0, 3), &out, &w).unwrap();
        assert_eq!((r.rows.len(), w.done()), (3, 3), "values counted, not the Lanczos blocks inside");
        assert!(r.rows.iter().all(|row| row.iter().all(Option::is_some)));
        let stopped = Watch::new();
        stopped.stop();
        let r = sweep_watched(&p, &Catalogue::default(), None, &param, (1000.0, 3000.0, 3), &out, &stopped).unwrap();
        assert!(r.rows.is_empty() && r.values.is_empty());
    }

    #[test]
    fn a_stopped_check_leaves_the_cases_unsolved_and_says_so() {
        use crate::sizing::{Catalogue, check_project_watched};
        let stopped = Watch::new();
        stopped.stop();
        let report = check_project_watched(&net(), &Catalogue::default(), &stopped).unwrap();
        assert!(!report.passes());
        let w = Watch::new();
        check_project_watched(&net(), &Catalogue::default(), &w).unwrap();
        assert_eq!(w.done(), 1, "one load case solved");
    }
}
