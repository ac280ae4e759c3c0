//! Running long core computations without the GIL, interruptible by Ctrl-C.
//!
//! The work runs on a scoped worker thread while the calling thread waits without the GIL and,
//! every few milliseconds, lets Python handle pending signals. A `KeyboardInterrupt` there asks
//! the core to stop (through `Control`), and the worker returns at its next check. A panic in the
//! worker becomes a Python exception instead of bringing down the interpreter.

use crate::errors::{internal, to_py};
use fibrewise_core::control::{Control, Limits};
use fibrewise_core::Result;
use pyo3::prelude::*;
use std::sync::{Condvar, Mutex};
use std::time::Duration;

pub fn run<T: Send>(
    py: Python<'_>,
    limits: Limits,
    work: impl FnOnce(&Control) -> Result<T> + Send,
) -> PyResult<T> {
    let control = Control::new().with_limits(limits);
    let done = (Mutex::new(false), Condvar::new());
    let outcome = std::thread::scope(|scope| {
        let (control, done_ref) = (&control, &done);
        let worker = scope.spawn(move || {
            // Signal completion even when `work` panics, so the waiting loop ends.
            struct Finish<'a>(&'a (Mutex<bool>, Condvar));
            impl Drop for Finish<'_> {
                fn drop(&mut self) {
                    *self.0 .0.lock().unwrap_or_else(|e| e.into_inner()) = true;
                    self.0 .1.notify_all();
                }
            }
            let _finish = Finish(done_ref);
            work(control)
        });
        let mut interrupted = None;
        loop {
            let finished = py.allow_threads(|| {
                let guard = done.0.lock().unwrap_or_else(|e| e.into_inner());
                let (guard, _) = done
                    .1
                    .wait_timeout_while(guard, Duration::from_millis(20), |d| !*d)
                    .unwrap_or_else(|e| e.into_inner());
                *guard
            });
            if finished {
                break;
            }
            if let Err(e) = py.check_signals() {
                control.request_stop();
                interrupted = Some(e);
            }
        }
        let joined = py.allow_threads(|| worker.join());
        (joined, interrupted)
    });
    match outcome {
        (_, Some(signal)) => Err(signal),
        (Ok(result), None) => result.map_err(to_py),
        (Err(panic), None) => {
            let msg = panic
                .downcast_ref::<String>()
                .cloned()
                .or_else(|| panic.downcast_ref::<&str>().map(|s| s.to_string()))
                .unwrap_or_else(|| "panic".into());
            Err(internal(msg))
        }
    }
}
