//! Fuzz target `omm_kvn`: the body is the library's fuzz entry point
//! `passbudget::orbit::fuzz_entry::omm_kvn`, which `tests/fuzz_replay.rs` also runs on the corpus.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    passbudget::orbit::fuzz_entry::omm_kvn(data);
});
