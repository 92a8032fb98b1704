//! Clean stops on Ctrl-C (SIGINT) and SIGTERM: the handler only sets a flag that the engine
//! polls between chunks, so a run ends with a consistent partial result and checkpoint.
//!
//! The C function `signal` is declared here directly (no extra crate). The handler is
//! async-signal-safe: an atomic load, an atomic store, and `signal` itself (which POSIX lists
//! as safe) to restore the default action, so a second Ctrl-C ends the process at once.

use std::sync::atomic::{AtomicBool, AtomicPtr, Ordering};
use std::sync::Arc;

/// The flag the handler sets (a leaked `Arc`, alive for the rest of the process).
static STOP_FLAG: AtomicPtr<AtomicBool> = AtomicPtr::new(std::ptr::null_mut());

#[cfg(unix)]
mod sys {
    /// SIGINT on Linux and the BSDs.
    pub(super) const SIGINT: i32 = 2;
    /// SIGTERM on Linux and the BSDs.
    pub(super) const SIGTERM: i32 = 15;
    /// The default action (SIG_DFL).
    pub(super) const DEFAULT_ACTION: usize = 0;
    /// The error return of `signal` (SIG_ERR = (void (*)(int)) -1).
    pub(super) const SIGNAL_ERROR: usize = usize::MAX;

    extern "C" {
        /// `sighandler_t signal(int signum, sighandler_t handler)` from the C library.
        pub(super) fn signal(signum: i32, handler: usize) -> usize;
    }
}

#[cfg(unix)]
extern "C" fn on_stop_signal(signum: i32) {
    let flag = STOP_FLAG.load(Ordering::SeqCst);
    if !flag.is_null() {
        // SAFETY: the pointer comes from `Arc::into_raw` and is never released.
        unsafe { (*flag).store(true, Ordering::SeqCst) };
    }
    // SAFETY: `signal` is async-signal-safe; restoring the default makes a second signal fatal.
    unsafe { sys::signal(signum, sys::DEFAULT_ACTION) };
}

/// Make SIGINT and SIGTERM set `flag` (and nothing else). Call once per process; a later call
/// redirects the signals to its own flag.
#[cfg(unix)]
pub fn install_stop_handler(flag: &Arc<AtomicBool>) -> std::io::Result<()> {
    let raw = Arc::into_raw(Arc::clone(flag)) as *mut AtomicBool;
    STOP_FLAG.store(raw, Ordering::SeqCst);
    for signum in [sys::SIGINT, sys::SIGTERM] {
        let handler = on_stop_signal as extern "C" fn(i32) as usize;
        // SAFETY: installing a handler that only touches atomics and `signal`.
        if unsafe { sys::signal(signum, handler) } == sys::SIGNAL_ERROR {
            return Err(std::io::Error::last_os_error());
        }
    }
    Ok(())
}

/// Signals are not hooked on this platform; a run stops only by its limits.
#[cfg(not(unix))]
pub fn install_stop_handler(_flag: &Arc<AtomicBool>) -> std::io::Result<()> {
    Err(std::io::Error::new(
        std::io::ErrorKind::Unsupported,
        "stop signals are only hooked on Unix",
    ))
}

#[cfg(all(test, unix))]
mod tests {
    use super::*;

    #[test]
    fn sigterm_sets_the_stop_flag() {
        extern "C" {
            /// `int raise(int sig)` from the C library: deliver a signal to this thread.
            fn raise(sig: i32) -> i32;
        }
        let flag = Arc::new(AtomicBool::new(false));
        install_stop_handler(&flag).unwrap();
        // SAFETY: the installed handler only sets the flag (and restores the default action).
        assert_eq!(unsafe { raise(15) }, 0);
        assert!(flag.load(Ordering::SeqCst));
    }
}
