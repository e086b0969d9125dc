//! Work split over the machine's cores: an order-preserving map over scoped threads. Used for
//! fields of many declarations; below a few dozen items it runs on the calling thread, where
//! starting threads would cost more than it saves.

use std::num::NonZeroUsize;
use std::sync::atomic::{AtomicUsize, Ordering};

/// Items per thread below which the work stays on one thread.
const MIN_ITEMS_PER_THREAD: usize = 16;

/// How many threads to use: `jobs` when given, else the cores the machine offers.
pub fn threads(jobs: Option<usize>) -> usize {
    jobs.unwrap_or_else(|| std::thread::available_parallelism().map_or(1, NonZeroUsize::get))
        .max(1)
}

/// `f` applied to every item, results in the items' order, on up to `threads` threads.
/// Threads take the next few items as they finish their last (so an uneven mix of items,
/// such as engines of different classes, keeps every thread busy to the end) and the results
/// are put back in order.
pub fn map<'a, T: Sync, R: Send>(
    items: &'a [T],
    threads: usize,
    f: impl Fn(&'a T) -> R + Sync,
) -> Vec<R> {
    let threads = threads.min(items.len() / MIN_ITEMS_PER_THREAD).max(1);
    if threads == 1 {
        return items.iter().map(&f).collect();
    }
    let next = AtomicUsize::new(0);
    let take = || {
        let mut done = Vec::new();
        loop {
            let start = next.fetch_add(ITEMS_PER_TAKE, Ordering::Relaxed);
            if start >= items.len() {
                return done;
            }
            let end = (start + ITEMS_PER_TAKE).min(items.len());
            done.push((start, items[start..end].iter().map(&f).collect::<Vec<R>>()));
        }
    };
    let mut parts: Vec<(usize, Vec<R>)> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads).map(|_| scope.spawn(take)).collect();
        handles
            .into_iter()
            .flat_map(|h| {
                h.join()
                    .unwrap_or_else(|panic| std::panic::resume_unwind(panic))
            })
            .collect()
    });
    parts.sort_unstable_by_key(|(start, _)| *start);
    parts.into_iter().flat_map(|(_, done)| done).collect()
}

/// Items a thread takes at a time: few, so the threads finish together; more than one, so
/// they seldom meet at the counter.
const ITEMS_PER_TAKE: usize = 4;

#[cfg(test)]
mod tests {
    use super::map;

    #[test]
    fn results_keep_the_order_of_the_items() {
        let items: Vec<u64> = (0..1000).collect();
        let squares = map(&items, 4, |x| x * x);
        assert_eq!(squares, items.iter().map(|x| x * x).collect::<Vec<_>>());
    }

    #[test]
    fn uneven_work_on_many_threads_keeps_the_order_of_the_items() {
        let items: Vec<u64> = (0..501).collect();
        let slow_then_fast = |x: &u64| {
            if *x < 20 {
                std::thread::sleep(std::time::Duration::from_millis(2));
            }
            x + 1
        };
        let expected: Vec<u64> = (1..502).collect();
        for threads in [2, 3, 7] {
            assert_eq!(
                map(&items, threads, slow_then_fast),
                expected,
                "{threads} threads"
            );
        }
    }

    #[test]
    fn few_items_stay_on_one_thread_and_give_the_same_answer() {
        let items = [1, 2, 3];
        assert_eq!(map(&items, 8, |x| x + 1), vec![2, 3, 4]);
    }
}
