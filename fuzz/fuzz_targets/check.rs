//! The grasp check on small validated scenes at one pressure.
#![no_main]
libfuzzer_sys::fuzz_target!(|case: arcfinger_fuzz::CheckCase| arcfinger_fuzz::check(&case));
