//! section (in progress)
