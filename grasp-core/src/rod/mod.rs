//! The finger as a discretised planar rod (in progress).
