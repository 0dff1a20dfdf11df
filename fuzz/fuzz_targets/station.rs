//! Fuzz target `station`: the body is the library's fuzz entry point
//! `passbudget::config::fuzz_entry::station`, which `tests/suite/fuzz_replay.rs` also runs on the corpus.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    passbudget::config::fuzz_entry::station(data);
});
