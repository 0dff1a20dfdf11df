//! Fuzz target `tle`: the body is the library's fuzz entry point
//! `passbudget::orbit::fuzz_entry::tle`, which `tests/fuzz_replay.rs` also runs on the corpus.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    passbudget::orbit::fuzz_entry::tle(data);
});
