//! Cooperative interruption and resource limits for long computations.
//!
//! Engines call [`Control::check`] often (once per reduction step or matrix row). The check is
//! cheap: a counter, and every few thousand calls a clock read; the caller's interrupt callback
//! (e.g. one that asks Python whether Ctrl-C was pressed) runs at most every `poll_interval`.
//!
//! Time: a caller may give a computation a time limit ([`Limits::max_time`]); the clock is read
//! on the same schedule as the interrupt poll (a control's first check, then every 256), and
//! past the deadline every check (of this control and of its children) returns
//! [`Error::ResourceLimit`], so the computation stops as cleanly as on Ctrl-C, on its own
//! thread, as promptly (where each check covers much work, such as a block of matrix rows, the
//! 256 checks can take a good fraction of a second).
//!
//! Memory: a computation has a budget in bytes (by default a fraction of the machine's memory).
//! Every allocation whose size depends on the input is announced first with
//! [`Control::check_memory`] (or made through [`Control::try_vec`]), which ends the computation
//! in [`Error::ResourceLimit`] naming what was being built, instead of letting the allocation
//! abort the process or exhaust the machine.

use crate::error::{Error, Result};
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::{Arc, Mutex, OnceLock};
use std::time::{Duration, Instant};

type InterruptFn = Arc<dyn Fn() -> bool + Send + Sync>;

/// Limits a caller may put on one computation; `None` means unlimited.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Limits {
    /// Highest total degree of S-pairs / matrix rows an engine may reach.
    pub max_degree: Option<u32>,
    /// Largest matrix (rows × columns) a linear-algebra engine may build.
    pub max_matrix_entries: Option<u64>,
    /// Number of worker threads (None: all cores).
    pub threads: Option<usize>,
    /// Wall-clock time the computation may take, counted from when the control is made.
    pub max_time: Option<Duration>,
}

pub struct Control {
    interrupt: Option<InterruptFn>,
    pub limits: Limits,
    calls: AtomicU64,
    /// Shared with the children of this control, so that a stop reaches them all.
    stopped: Arc<AtomicBool>,
    last_poll: Mutex<Instant>,
    poll_interval: Duration,
    /// Bytes the big allocations of this computation may hold at once; `None`: no budget.
    memory_budget: Option<u64>,
    /// When the time limit runs out (shared with the children, which cannot extend it).
    deadline: Option<Deadline>,
}

/// The end of a time limit, and the limit itself for the message.
#[derive(Clone, Copy, Debug)]
struct Deadline {
    at: Instant,
    limit: Duration,
}

impl Deadline {
    /// `None` when the limit is so far off that the clock cannot represent it (no limit).
    fn after(limit: Duration) -> Option<Deadline> {
        Some(Deadline {
            at: Instant::now().checked_add(limit)?,
            limit,
        })
    }

    fn earlier(a: Option<Deadline>, b: Option<Deadline>) -> Option<Deadline> {
        match (a, b) {
            (Some(a), Some(b)) => Some(if b.at < a.at { b } else { a }),
            (a, b) => a.or(b),
        }
    }

    fn check(&self) -> Result<()> {
        if Instant::now() >= self.at {
            return Err(Error::ResourceLimit(format!(
                "time limit of {} exceeded",
                format_seconds(self.limit)
            )));
        }
        Ok(())
    }
}

/// A duration in seconds, to the millisecond, without trailing zeros ("0.25 s", "10 s").
fn format_seconds(d: Duration) -> String {
    let text = format!("{:.3}", d.as_secs_f64());
    format!("{} s", text.trim_end_matches('0').trim_end_matches('.'))
}

/// The fraction of the machine's memory a computation may use when its caller set no budget.
const DEFAULT_BUDGET_FRACTION: f64 = 0.75;

/// The default memory budget: three quarters of the machine's memory where it can be read
/// (Linux: /proc/meminfo), else none.
pub fn default_memory_budget() -> Option<u64> {
    static BUDGET: OnceLock<Option<u64>> = OnceLock::new();
    *BUDGET.get_or_init(|| {
        let info = std::fs::read_to_string("/proc/meminfo").ok()?;
        let line = info.lines().find(|l| l.starts_with("MemTotal:"))?;
        let kib: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
        Some((kib as f64 * 1024.0 * DEFAULT_BUDGET_FRACTION) as u64)
    })
}

/// `ResourceLimit` for an allocation of `bytes` for `what` over `budget`.
fn over_budget(bytes: u64, what: &str, budget: u64) -> Error {
    Error::ResourceLimit(format!(
        "memory budget of {} exceeded: {what} needs about {}",
        format_bytes(budget),
        format_bytes(bytes)
    ))
}

/// Bytes in the largest unit that keeps a number ≥ 1 (binary units, as memory is counted).
pub fn format_bytes(bytes: u64) -> String {
    const UNITS: [&str; 5] = ["bytes", "KiB", "MiB", "GiB", "TiB"];
    let mut value = bytes as f64;
    let mut unit = 0;
    while value >= 1024.0 && unit + 1 < UNITS.len() {
        value /= 1024.0;
        unit += 1;
    }
    if unit == 0 {
        format!("{bytes} bytes")
    } else {
        format!("{value:.1} {}", UNITS[unit])
    }
}

/// The memory check for code that has no [`Control`] (polynomial arithmetic called directly):
/// against the default budget.
pub fn check_memory_default(bytes: u64, what: &str) -> Result<()> {
    match default_memory_budget() {
        Some(budget) if bytes > budget => Err(over_budget(bytes, what, budget)),
        _ => Ok(()),
    }
}

/// A vector with room for `len` items, or `ResourceLimit` naming `what` when the allocator
/// refuses it (the request is larger than the machine can give).
pub fn try_with_capacity<T>(len: usize, what: &str) -> Result<Vec<T>> {
    let mut v = Vec::new();
    v.try_reserve_exact(len).map_err(|_| {
        let bytes = (len as u64).saturating_mul(std::mem::size_of::<T>() as u64);
        Error::ResourceLimit(format!(
            "out of memory: {what} needs about {}",
            format_bytes(bytes)
        ))
    })?;
    Ok(v)
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
            stopped: Arc::new(AtomicBool::new(false)),
            last_poll: Mutex::new(Instant::now()),
            poll_interval: Duration::from_millis(20),
            memory_budget: default_memory_budget(),
            deadline: None,
        }
    }

    /// A control for one part of this computation with other limits (e.g. a degree bound on a
    /// trial basis that may be abandoned): the same interruption, stop flag, memory budget and
    /// deadline (a time limit in `limits` can only bring the deadline closer).
    pub fn child(&self, limits: Limits) -> Control {
        let own = limits.max_time.and_then(Deadline::after);
        Control {
            deadline: Deadline::earlier(self.deadline, own),
            interrupt: self.interrupt.clone(),
            limits,
            calls: AtomicU64::new(0),
            stopped: Arc::clone(&self.stopped),
            last_poll: Mutex::new(Instant::now()),
            poll_interval: self.poll_interval,
            memory_budget: self.memory_budget,
        }
    }

    /// A budget of `bytes` for the big allocations of this computation.
    pub fn with_memory_budget(mut self, bytes: u64) -> Self {
        self.memory_budget = Some(bytes);
        self
    }

    pub fn memory_budget(&self) -> Option<u64> {
        self.memory_budget
    }

    /// The one call before a big allocation: `ResourceLimit` when `bytes` for `what` (e.g.
    /// "a 120000 x 450000 matrix at step 7") would exceed the memory budget.
    pub fn check_memory(&self, bytes: u64, what: &str) -> Result<()> {
        match self.memory_budget {
            Some(budget) if bytes > budget => Err(over_budget(bytes, what, budget)),
            _ => Ok(()),
        }
    }

    /// A vector with room for `len` items of `T`, after [`Control::check_memory`], made with a
    /// fallible allocation: never an abort.
    pub fn try_vec<T>(&self, len: usize, what: &str) -> Result<Vec<T>> {
        let bytes = (len as u64).saturating_mul(std::mem::size_of::<T>() as u64);
        self.check_memory(bytes, what)?;
        try_with_capacity(len, what)
    }

    /// `interrupt` returns true when the computation must stop.
    pub fn with_interrupt(mut self, interrupt: impl Fn() -> bool + Send + Sync + 'static) -> Self {
        self.interrupt = Some(Arc::new(interrupt));
        self
    }

    /// The caller's limits; a time limit starts counting now.
    pub fn with_limits(mut self, limits: Limits) -> Self {
        self.deadline = limits.max_time.and_then(Deadline::after);
        self.limits = limits;
        self
    }

    /// Runs `work` in a pool of `limits.threads` threads, so that its parallel loops use that
    /// many; in the caller's pool when the limit is unset.
    pub fn on_threads<T: Send>(&self, work: impl FnOnce() -> Result<T> + Send) -> Result<T> {
        match self.limits.threads {
            None => work(),
            Some(0) => Err(Error::invalid("thread count must be at least 1")),
            Some(n) => rayon::ThreadPoolBuilder::new()
                .num_threads(n)
                .build()
                .map_err(|e| Error::invalid(format!("cannot start {n} worker threads: {e}")))?
                .install(work),
        }
    }

    /// Returns `Err(Interrupted)` once the interrupt callback has said stop, and
    /// `Err(ResourceLimit)` once the time limit has run out.
    #[inline]
    pub fn check(&self) -> Result<()> {
        if self.stopped.load(Ordering::Relaxed) {
            return Err(Error::Interrupted);
        }
        if self.interrupt.is_none() && self.deadline.is_none() {
            return Ok(());
        }
        // Reading the clock on every call would cost more than most callers' work.
        if !self
            .calls
            .fetch_add(1, Ordering::Relaxed)
            .is_multiple_of(256)
        {
            return Ok(());
        }
        if let Some(deadline) = &self.deadline {
            deadline.check()?;
        }
        let Some(interrupt) = &self.interrupt else {
            return Ok(());
        };
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

#[cfg(test)]
mod tests {
    use super::*;

    fn limited(max_time: Duration) -> Control {
        Control::new().with_limits(Limits {
            max_time: Some(max_time),
            ..Default::default()
        })
    }

    #[test]
    fn a_spent_time_limit_stops_the_next_check_with_resource_limit() {
        let control = limited(Duration::ZERO);
        let err = control.check().unwrap_err();
        assert!(
            matches!(err, Error::ResourceLimit(ref m) if m == "time limit of 0 s exceeded"),
            "{err}"
        );
        // the children share the deadline, also with limits of their own
        let child = control.child(Limits {
            max_degree: Some(3),
            ..Default::default()
        });
        assert!(matches!(child.check(), Err(Error::ResourceLimit(_))));
    }

    #[test]
    fn a_distant_time_limit_lets_the_work_go_on() {
        let control = limited(Duration::from_secs(3600));
        for _ in 0..10_000 {
            control.check().unwrap();
        }
        // a child cannot push the deadline further away, only bring it closer
        let longer = control.child(Limits {
            max_time: Some(Duration::MAX),
            ..Default::default()
        });
        assert!(longer.check().is_ok());
        let shorter = control.child(Limits {
            max_time: Some(Duration::ZERO),
            ..Default::default()
        });
        assert!(shorter.check().is_err() && control.check().is_ok());
    }

    #[test]
    fn seconds_are_written_without_trailing_zeros() {
        assert_eq!(format_seconds(Duration::from_millis(250)), "0.25 s");
        assert_eq!(format_seconds(Duration::from_secs(10)), "10 s");
        assert_eq!(format_seconds(Duration::from_millis(1500)), "1.5 s");
    }
}
