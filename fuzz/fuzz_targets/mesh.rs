//! Mesh file bytes (STL or OBJ) as the object of a fixed scene.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| arcfinger_fuzz::mesh(data));
