//! Running long core computations without the GIL, interruptible by Ctrl-C.
//!
//! The work runs as a job on the thread pool that the core's parallel loops use (rayon's global
//! pool, whose threads are started once and then parked), while the calling thread waits without
//! the GIL and, every 20 ms, lets Python handle pending signals: only the calling thread can, and
//! it stays free to do so even while the work runs parallel loops of its own. A
//! `KeyboardInterrupt` there asks the core to stop (through `Control`), and the work returns at
//! its next check. Handing a job to a parked pool thread costs a few microseconds where starting
//! a thread per call cost tens, which dominated calls on tiny systems. Calls from several Python
//! threads share the pool: as many run at once as it has threads, the others wait their turn
//! (a Ctrl-C meanwhile stops them as soon as they start). A panic in the work becomes a Python
//! exception instead of bringing down the interpreter.
//!
//! Every run has a memory budget: the caller's (a `Space` built with `memory=`), else the
//! core's default (a fraction of the machine's memory). Work that is certainly small (a few
//! thousand term operations, see [`run_sized`]) runs at once on the calling thread: handing it
//! to the pool would cost more than the work, and it ends long before a Ctrl-C could matter.

use crate::errors::{internal, to_py};
use fibrewise_core::control::{Control, Limits};
use fibrewise_core::Result;
use pyo3::prelude::*;
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::sync::{Condvar, Mutex};
use std::time::Duration;

/// How often the waiting thread lets Python look at pending signals.
const SIGNAL_POLL: Duration = Duration::from_millis(20);

type Outcome<T> = std::thread::Result<Result<T>>;

/// Work estimated at most this many term operations runs on the calling thread.
const SMALL_WORK: u64 = 20_000;

/// The control of one run: the caller's limits, and its memory budget if it set one.
fn control_for(limits: Limits, memory: Option<u64>) -> Control {
    let control = Control::new().with_limits(limits);
    match memory {
        Some(bytes) => control.with_memory_budget(bytes),
        None => control,
    }
}

/// A handle whose computations run within one memory budget: a space, and what is made from
/// it (curves, projections, Boolean spaces).
pub trait Budgeted {
    /// The memory budget in bytes (None: the core's default).
    fn memory_budget(&self) -> Option<u64>;

    /// `work` as a long run ([`run`]) with the default limits, within the handle's budget.
    fn run<T: Send>(
        &self,
        py: Python<'_>,
        work: impl FnOnce(&Control) -> Result<T> + Send,
    ) -> PyResult<T> {
        self.run_limited(py, Limits::default(), work)
    }

    /// `work` as a long run ([`run`]) with the caller's `limits`, within the handle's budget.
    fn run_limited<T: Send>(
        &self,
        py: Python<'_>,
        limits: Limits,
        work: impl FnOnce(&Control) -> Result<T> + Send,
    ) -> PyResult<T> {
        run(py, limits, self.memory_budget(), work)
    }
}

/// [`run`], or the work at once on the calling thread when `cost` (an estimate of its term
/// operations) says it is small.
pub fn run_sized<T: Send>(
    py: Python<'_>,
    cost: u64,
    memory: Option<u64>,
    work: impl FnOnce(&Control) -> Result<T> + Send,
) -> PyResult<T> {
    if cost <= SMALL_WORK {
        let control = control_for(Limits::default(), memory);
        return work(&control).map_err(to_py);
    }
    run(py, Limits::default(), memory, work)
}

pub fn run<T: Send>(
    py: Python<'_>,
    limits: Limits,
    memory: Option<u64>,
    work: impl FnOnce(&Control) -> Result<T> + Send,
) -> PyResult<T> {
    let control = control_for(limits, memory);
    let done: (Mutex<Option<Outcome<T>>>, Condvar) = (Mutex::new(None), Condvar::new());
    let mut interrupted = None;
    rayon::in_place_scope(|scope| {
        let (control, done) = (&control, &done);
        scope.spawn(move |_| {
            let outcome = catch_unwind(AssertUnwindSafe(|| work(control)));
            *done.0.lock().unwrap_or_else(|e| e.into_inner()) = Some(outcome);
            done.1.notify_all();
        });
        while !py.allow_threads(|| wait_for(done)) {
            if let Err(e) = py.check_signals() {
                control.request_stop();
                interrupted = Some(e);
            }
        }
    });
    let outcome = done.0.into_inner().unwrap_or_else(|e| e.into_inner());
    match (outcome, interrupted) {
        (_, Some(signal)) => Err(signal),
        (Some(Ok(result)), None) => result.map_err(to_py),
        (Some(Err(panic)), None) => Err(internal(panic_message(panic))),
        (None, None) => Err(internal(
            "the computation ended without a result".to_string(),
        )),
    }
}

/// Waits up to one signal-poll period for the outcome; true once it is there.
fn wait_for<T>(done: &(Mutex<Option<Outcome<T>>>, Condvar)) -> bool {
    let guard = done.0.lock().unwrap_or_else(|e| e.into_inner());
    let (guard, _) = done
        .1
        .wait_timeout_while(guard, SIGNAL_POLL, |outcome| outcome.is_none())
        .unwrap_or_else(|e| e.into_inner());
    guard.is_some()
}

fn panic_message(panic: Box<dyn std::any::Any + Send>) -> String {
    panic
        .downcast_ref::<String>()
        .cloned()
        .or_else(|| panic.downcast_ref::<&str>().map(|s| s.to_string()))
        .unwrap_or_else(|| "panic".into())
}
