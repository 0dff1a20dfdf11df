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
