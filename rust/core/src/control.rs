//! Cooperative interruption and resource limits for long computations.
//!
//! Engines call [`Control::check`] often (once per reduction step or matrix row). The check is
//! cheap: a counter, and every few thousand calls a clock read; the caller's interrupt callback
//! (e.g. one that asks Python whether Ctrl-C was pressed) runs at most every `poll_interval`.

use crate::error::{Error, Result};
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::Mutex;
use std::time::{Duration, Instant};

type InterruptFn = Box<dyn Fn() -> bool + Send + Sync>;

/// Limits a caller may put on one computation; `None` means unlimited.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Limits {
    /// Highest total degree of S-pairs / matrix rows an engine may reach.
    pub max_degree: Option<u32>,
    /// Largest matrix (rows × columns) a linear-algebra engine may build.
    pub max_matrix_entries: Option<u64>,
    /// Number of worker threads (None: all cores).
    pub threads: Option<usize>,
}

pub struct Control {
    interrupt: Option<InterruptFn>,
    pub limits: Limits,
    calls: AtomicU64,
    stopped: AtomicBool,
    last_poll: Mutex<Instant>,
    poll_interval: Duration,
}

impl Default for Control {
    fn default() -> Self {
        Control::new()
    }
}

impl Control {
    /// No interruption, no limits.
    pub fn new() -> Self {
        Control {
            interrupt: None,
            limits: Limits::default(),
            calls: AtomicU64::new(0),
            stopped: AtomicBool::new(false),
            last_poll: Mutex::new(Instant::now()),
            poll_interval: Duration::from_millis(20),
        }
    }

    /// `interrupt` returns true when the computation must stop.
    pub fn with_interrupt(mut self, interrupt: impl Fn() -> bool + Send + Sync + 'static) -> Self {
        self.interrupt = Some(Box::new(interrupt));
        self
    }

    pub fn with_limits(mut self, limits: Limits) -> Self {
        self.limits = limits;
        self
    }

    /// Returns `Err(Interrupted)` once the interrupt callback has said stop.
    #[inline]
    pub fn check(&self) -> Result<()> {
        if self.stopped.load(Ordering::Relaxed) {
            return Err(Error::Interrupted);
        }
        let Some(interrupt) = &self.interrupt else {
            return Ok(());
        };
        // Reading the clock on every call would cost more than most callers' work.
        if self.calls.fetch_add(1, Ordering::Relaxed) % 256 != 0 {
            return Ok(());
        }
        let due = {
            let mut last = self.last_poll.lock().unwrap_or_else(|e| e.into_inner());
            if last.elapsed() >= self.poll_interval {
                *last = Instant::now();
                true
            } else {
                false
            }
        };
        if due && interrupt() {
            self.stopped.store(true, Ordering::Relaxed);
            return Err(Error::Interrupted);
        }
        Ok(())
    }

    /// Asks the computation to stop: the next [`Control::check`] returns `Interrupted`.
    pub fn request_stop(&self) {
        self.stopped.store(true, Ordering::Relaxed);
    }

    /// Raises `ResourceLimit` when `degree` is over the caller's maximum degree.
    pub fn check_degree(&self, degree: u32, step: usize) -> Result<()> {
        match self.limits.max_degree {
            Some(max) if degree > max => Err(Error::ResourceLimit(format!(
                "degree limit {max} exceeded: step {step} needs degree {degree}"
            ))),
            _ => Ok(()),
        }
    }

    /// Raises `ResourceLimit` when a rows × cols matrix is over the caller's maximum size.
    pub fn check_matrix(&self, rows: usize, cols: usize, step: usize) -> Result<()> {
        match self.limits.max_matrix_entries {
            Some(max) if (rows as u64) * (cols as u64) > max => Err(Error::ResourceLimit(format!(
                "matrix limit {max} entries exceeded: step {step} needs a {rows} x {cols} matrix"
            ))),
            _ => Ok(()),
        }
    }
}
