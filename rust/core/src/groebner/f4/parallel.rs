//! Work spread over the rayon pool of the current F4 run, or kept on the calling thread when the
//! caller asked for one thread or there is too little work to repay waking the pool.

use crate::control::Control;
use rayon::prelude::*;

/// `work` on every item with a per-thread scratch from `init`, in order: in parallel when there
/// are at least `min_parallel` items and more than one thread is allowed, sequentially otherwise.
#[inline(never)] // one call per phase; kept visible to profilers
pub fn map_items<T: Sync, D, R: Send>(
    items: &[T],
    min_parallel: usize,
    control: &Control,
    init: impl Fn() -> D + Sync + Send,
    work: impl Fn(&mut D, &T) -> R + Sync + Send,
) -> Vec<R> {
    if items.len() >= min_parallel.max(2) && control.limits.threads != Some(1) {
        items
            .par_iter()
            .map_init(&init, |scratch, item| work(scratch, item))
            .collect()
    } else {
        let mut scratch = init();
        items.iter().map(|item| work(&mut scratch, item)).collect()
    }
}
