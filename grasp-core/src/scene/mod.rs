//! scene (in progress)
