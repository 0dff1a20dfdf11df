//! The one global allocator of the test binary: the system allocator, counting allocations
//! per thread. Tests run in parallel threads, so a per-thread count is not disturbed by the
//! allocations of other tests.

use std::alloc::{GlobalAlloc, Layout, System};
use std::cell::Cell;

struct Counting;

thread_local! {
    static ALLOCS: Cell<usize> = const { Cell::new(0) };
}

unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        // try_with: the thread-local may already be gone while a thread shuts down.
        let _ = ALLOCS.try_with(|c| c.set(c.get() + 1));
        unsafe { System.alloc(layout) }
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) }
    }
}

#[global_allocator]
static GLOBAL: Counting = Counting;

/// Number of allocations the calling thread has made so far.
pub fn thread_allocations() -> usize {
    ALLOCS.with(|c| c.get())
}

/// Runs `f` and returns its result with the number of allocations it made on this thread.
pub fn count_allocations<T>(f: impl FnOnce() -> T) -> (T, usize) {
    let before = thread_allocations();
    let out = f();
    (out, thread_allocations() - before)
}

/// The counter sees this thread's allocations (else the no-allocation checks could not fail),
/// and only this thread's: allocations on another thread leave it unchanged.
#[test]
fn counts_this_threads_allocations_only() {
    let (v, n) = count_allocations(|| std::hint::black_box(vec![1u8; 64]));
    assert_eq!(v.len(), 64);
    assert_eq!(n, 1);
    let (_, other) = count_allocations(|| {
        std::thread::scope(|s| {
            s.spawn(|| std::hint::black_box(vec![0u64; 1000]).len());
        })
    });
    // Spawning a thread allocates on this thread too (its handle); the other thread's 1000-element
    // vector is not counted here: check with a spawn that allocates nothing extra for comparison.
    let (_, baseline) = count_allocations(|| {
        std::thread::scope(|s| {
            s.spawn(|| 0usize);
        })
    });
    assert_eq!(other, baseline);
}
