//! Fuzz target `plan`: the body is the library's fuzz entry point
//! `passbudget::plan::fuzz_entry::plan`, which `tests/suite/fuzz_replay.rs` also runs on the corpus.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    passbudget::plan::fuzz_entry::plan(data);
});
