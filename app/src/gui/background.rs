//! A computation on its own thread, polled once per frame, so the window never waits for it.
//!
//! Dropping or replacing a [`Background`] abandons its result; the thread finishes on its own
//! (the core's solvers all have iteration caps).

use std::sync::mpsc::{Receiver, TryRecvError, channel};
use std::time::Instant;

/// A result being computed on another thread.
pub struct Background<K, T> {
    /// What the result belongs to (e.g. a document revision).
    pub key: K,
    pub started: Instant,
    rx: Receiver<T>,
}

impl<K: PartialEq, T: Send + 'static> Background<K, T> {
    /// Starts `work` on a new thread.
    pub fn spawn(key: K, work: impl FnOnce() -> T + Send + 'static) -> Self {
        let (tx, rx) = channel();
        std::thread::spawn(move || {
            // The receiver may be gone (the result was abandoned); nothing to do then.
            let _ = tx.send(work());
        });
        Background {
            key,
            started: Instant::now(),
            rx,
        }
    }

    /// The result when it is ready; `Some(Err(..))` if the thread died without one.
    pub fn poll(&self) -> Option<Result<T, String>> {
        match self.rx.try_recv() {
            Ok(v) => Some(Ok(v)),
            Err(TryRecvError::Empty) => None,
            Err(TryRecvError::Disconnected) => Some(Err("the computation stopped without a result".into())),
        }
    }
}
