//! Work split over the machine's cores: an order-preserving map over scoped threads. Used for
//! fields of many declarations; below a few dozen items it runs on the calling thread, where
//! starting threads would cost more than it saves.

use std::num::NonZeroUsize;

/// Items per thread below which the work stays on one thread.
const MIN_ITEMS_PER_THREAD: usize = 16;

/// How many threads to use: `jobs` when given, else the cores the machine offers.
pub fn threads(jobs: Option<usize>) -> usize {
    jobs.unwrap_or_else(|| std::thread::available_parallelism().map_or(1, NonZeroUsize::get))
        .max(1)
}

/// `f` applied to every item, results in the items' order, on up to `threads` threads.
pub fn map<'a, T: Sync, R: Send>(
    items: &'a [T],
    threads: usize,
    f: impl Fn(&'a T) -> R + Sync,
) -> Vec<R> {
    let threads = threads.min(items.len() / MIN_ITEMS_PER_THREAD).max(1);
    if threads == 1 {
        return items.iter().map(&f).collect();
    }
    let chunk = items.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let handles: Vec<_> = items
            .chunks(chunk)
            .map(|part| scope.spawn(|| part.iter().map(&f).collect::<Vec<R>>()))
            .collect();
        handles
            .into_iter()
            .flat_map(|h| {
                h.join()
                    .unwrap_or_else(|panic| std::panic::resume_unwind(panic))
            })
            .collect()
    })
}

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
    fn few_items_stay_on_one_thread_and_give_the_same_answer() {
        let items = [1, 2, 3];
        assert_eq!(map(&items, 8, |x| x + 1), vec![2, 3, 4]);
    }
}
