//! actuator (in progress)
