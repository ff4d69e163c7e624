//! kinematics (in progress)
