//! Wall-clock limits for long computations.
//!
//! Every solver is bounded in iterations, but a scene from a pull request can multiply
//! them (many objects, a fine sweep) into hours. A command that can run long does its
//! work on a worker thread and waits for it at most its time limit plus a grace period;
//! past that it gives up with exit code 3 (the result is unknown) and writes nothing, so
//! the previous reports stay as they were. The solver is also handed the deadline itself
//! (`CheckSettings::deadline`), so that it can stop cleanly and report what it did not
//! finish; the wait here is the backstop that holds whatever the solver does.

use std::sync::mpsc;
use std::time::Duration;

use crate::error::AppError;

/// Default time limit of `check` (s): ten minutes, twenty times the demo scene's check.
pub const DEFAULT_TIME_LIMIT_S: f64 = 600.0;

/// Longest time limit accepted (s): one day.
pub const MAX_TIME_LIMIT_S: f64 = 86_400.0;

/// The time limit given as `flag SECONDS`, checked.
///
/// # Errors
/// [`AppError::Input`] for a value that is not a positive number of seconds of at most
/// [`MAX_TIME_LIMIT_S`].
pub fn time_limit(flag: &str, seconds: f64) -> Result<Duration, AppError> {
    if seconds.is_finite() && seconds > 0.0 && seconds <= MAX_TIME_LIMIT_S {
        Ok(Duration::from_secs_f64(seconds))
    } else {
        Err(AppError::input(format!(
            "{flag}: must be a number of seconds above 0 and at most {MAX_TIME_LIMIT_S} (one day), got {seconds}"
        )))
    }
}

/// How long the backstop waits past the solver's own deadline, for the solver to end its
/// current step and report: a tenth of the limit, between 10 ms and 30 s.
pub fn grace(limit: Duration) -> Duration {
    (limit / 10).clamp(Duration::from_millis(10), Duration::from_secs(30))
}

/// Runs `work` on a worker thread and waits for it at most `wait`. `None` when it has
/// not finished by then; the worker is then abandoned (it ends with the process).
///
/// # Errors
/// [`AppError::Io`] when no thread can be started. A panic of the worker is resumed on
/// the calling thread.
pub fn run_within<T: Send + 'static>(
    wait: Duration,
    work: impl FnOnce() -> T + Send + 'static,
) -> Result<Option<T>, AppError> {
    let (tx, rx) = mpsc::channel();
    let handle = std::thread::Builder::new()
        .name("arcfinger-solve".into())
        .spawn(move || {
            // the receiver is gone only when the wait has already given up
            let _ = tx.send(work());
        })
        .map_err(|e| AppError::io("starting the solver thread", e))?;
    match rx.recv_timeout(wait) {
        Ok(v) => Ok(Some(v)),
        Err(mpsc::RecvTimeoutError::Timeout) => Ok(None),
        Err(mpsc::RecvTimeoutError::Disconnected) => match handle.join() {
            Err(panic) => std::panic::resume_unwind(panic),
            // sent nothing and ended without a panic: cannot happen, the closure always sends
            Ok(()) => Ok(None),
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn limits_are_checked() {
        assert_eq!(time_limit("--time-limit", 2.5).unwrap(), Duration::from_millis(2500));
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY, 1e9] {
            let e = time_limit("--time-limit", bad).unwrap_err();
            assert_eq!(e.exit_code(), 2);
            assert!(e.to_string().starts_with("--time-limit: must be a number of seconds above 0"), "{e}");
        }
        assert_eq!(grace(Duration::from_millis(50)), Duration::from_millis(10));
        assert_eq!(grace(Duration::from_secs(100)), Duration::from_secs(10));
        assert_eq!(grace(Duration::from_secs(3600)), Duration::from_secs(30));
    }

    #[test]
    fn work_that_finishes_returns_its_value() {
        assert_eq!(run_within(Duration::from_secs(60), || 6 * 7).unwrap(), Some(42));
    }

    /// A worker that never finishes (it waits on a channel nobody sends to) is abandoned
    /// after the wait: the caller gets `None` instead of hanging.
    #[test]
    fn work_that_does_not_finish_is_abandoned() {
        let (_keep, never) = mpsc::channel::<()>();
        let got = run_within(Duration::from_millis(20), move || never.recv().is_ok()).unwrap();
        assert_eq!(got, None);
    }

    #[test]
    #[should_panic(expected = "worker failed")]
    fn a_panic_of_the_worker_is_not_swallowed() {
        let _ = run_within(Duration::from_secs(60), || -> u8 { panic!("worker failed") });
    }
}
