//! One module per command: each turns its options into a configuration, runs the core,
//! and writes its reports.

pub mod bend;
pub mod calibrate;
pub mod check;
pub mod fab;
pub mod fit;
pub mod materials;
pub mod merge;
pub mod render;
pub mod review;
pub mod sweep;
pub mod view;
