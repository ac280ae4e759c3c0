//! Work spread over the rayon pool of the current F4 run, or kept on the calling thread when the
//! caller asked for one thread or there is too little work to repay waking the pool.

use crate::control::Control;
use rayon::prelude::*;
use std::sync::atomic::{AtomicUsize, Ordering};

/// Items a worker takes at a time, per thread and item count: small enough that the workers
/// finish together, large enough that the shared counter is rarely touched.
const SHARES_PER_THREAD: usize = 32;

/// `work` on every item with a per-thread scratch from `init`, results in the items' order: in
/// parallel when there are at least `min_parallel` items and more than one thread is allowed,
/// sequentially otherwise. In parallel, each worker takes the next few items from a shared
/// counter until none are left (items given by decreasing cost then balance best), and builds
/// its scratch once.
#[inline(never)] // one call per phase; kept visible to profilers
pub fn map_items<T: Sync, D, R: Send>(
    items: &[T],
    min_parallel: usize,
    control: &Control,
    init: impl Fn() -> D + Sync + Send,
    work: impl Fn(&mut D, &T) -> R + Sync + Send,
) -> Vec<R> {
    if items.len() < min_parallel.max(2) || control.limits.threads == Some(1) {
        let mut scratch = init();
        return items.iter().map(|item| work(&mut scratch, item)).collect();
    }
    let threads = rayon::current_num_threads();
    let take = (items.len() / (threads * SHARES_PER_THREAD)).max(1);
    let next = AtomicUsize::new(0);
    let pieces: Vec<Vec<(usize, R)>> = (0..threads)
        .into_par_iter()
        .map(|_| {
            let mut scratch = init();
            let mut done = Vec::new();
            loop {
                let start = next.fetch_add(take, Ordering::Relaxed);
                if start >= items.len() {
                    return done;
                }
                let end = (start + take).min(items.len());
                for (i, item) in items.iter().enumerate().take(end).skip(start) {
                    done.push((i, work(&mut scratch, item)));
                }
            }
        })
        .collect();
    let mut results: Vec<Option<R>> = (0..items.len()).map(|_| None).collect();
    for (i, r) in pieces.into_iter().flatten() {
        results[i] = Some(r);
    }
    results
        .into_iter()
        .map(|r| r.expect("every item is taken once"))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_item_once_in_order_with_one_scratch_per_worker() {
        let pool = rayon::ThreadPoolBuilder::new()
            .num_threads(2)
            .build()
            .unwrap();
        let control = Control::new();
        for n in [0usize, 1, 2, 3, 63, 64, 65, 1000, 4097] {
            let items: Vec<u64> = (0..n as u64).collect();
            let scratches = AtomicUsize::new(0);
            let out = pool.install(|| {
                map_items(
                    &items,
                    2,
                    &control,
                    || scratches.fetch_add(1, Ordering::Relaxed),
                    |_, &i| i * i,
                )
            });
            let squares: Vec<u64> = (0..n as u64).map(|i| i * i).collect();
            assert_eq!(out, squares, "{n} items");
            assert!(scratches.into_inner() <= 2, "{n} items");
        }
    }
}
