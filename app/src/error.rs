//! Outcomes and errors of a command, and the exit codes they map to (DESIGN 4.1).

use std::fmt;

/// How a command that ran to the end came out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Outcome {
    /// Every check passed (exit 0).
    Pass,
    /// Some check failed (exit 1).
    Fail,
}

impl Outcome {
    /// Process exit code.
    pub fn exit_code(self) -> u8 {
        match self {
            Self::Pass => 0,
            Self::Fail => 1,
        }
    }
}

/// Why a command could not produce its result.
#[derive(Debug)]
pub enum AppError {
    /// Bad input or usage: a scene, data file or argument (exit 2). The message names the
    /// file, line:column or field path, and what was expected.
    Input(String),
    /// Reading or writing a file failed (exit 2).
    Io {
        /// What was being done, with the path.
        context: String,
        /// The OS error.
        source: std::io::Error,
    },
    /// A solver did not converge (exit 3).
    NotConverged(String),
}

impl AppError {
    /// An input error from anything printable.
    pub fn input(msg: impl fmt::Display) -> Self {
        Self::Input(msg.to_string())
    }
    /// An I/O error with its context.
    pub fn io(context: impl fmt::Display, source: std::io::Error) -> Self {
        Self::Io { context: context.to_string(), source }
    }
    /// Process exit code.
    pub fn exit_code(&self) -> u8 {
        match self {
            Self::Input(_) | Self::Io { .. } => 2,
            Self::NotConverged(_) => 3,
        }
    }
    /// Writing to a closed pipe (`arcfinger ... | head`): exit quietly.
    pub fn is_broken_pipe(&self) -> bool {
        matches!(self, Self::Io { source, .. } if source.kind() == std::io::ErrorKind::BrokenPipe)
    }
}

impl fmt::Display for AppError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::Input(m) => f.write_str(m),
            Self::Io { context, source } => write!(f, "{context}: {source}"),
            Self::NotConverged(m) => write!(f, "solver did not converge: {m}"),
        }
    }
}

impl std::error::Error for AppError {}

/// The grasp check refused its input (a setting out of range, geometry the solvers
/// cannot take): bad input, exit 2. Non-convergence is not an error of the check but an
/// outcome inside its report.
impl From<grasp_core::check::CheckError> for AppError {
    fn from(e: grasp_core::check::CheckError) -> Self {
        Self::Input(format!("grasp check: {e}"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Exit codes of DESIGN 4.1.
    #[test]
    fn exit_codes_follow_the_contract() {
        assert_eq!(Outcome::Pass.exit_code(), 0);
        assert_eq!(Outcome::Fail.exit_code(), 1);
        assert_eq!(AppError::input("x").exit_code(), 2);
        assert_eq!(AppError::io("x", std::io::Error::other("y")).exit_code(), 2);
        assert_eq!(AppError::NotConverged("x".into()).exit_code(), 3);
        let e = AppError::from(grasp_core::check::CheckError::BadSetting("elements 3 < 40".into()));
        assert_eq!(
            (e.exit_code(), e.to_string().as_str()),
            (2, "grasp check: invalid setting: elements 3 < 40")
        );
    }
}
