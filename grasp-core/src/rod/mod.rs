//! rod (in progress)
