pub mod enclosure;
