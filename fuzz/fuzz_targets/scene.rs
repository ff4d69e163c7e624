//! Scene text through parsing and validation, then the cheap solver set-up.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| arcfinger_fuzz::scene(data));
