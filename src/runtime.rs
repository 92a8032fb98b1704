//! What the program needs from the operating system and the libraries do not: stop signals
//! and the process's resident memory.

mod memory;
mod signal;

pub use memory::{peak_memory_bytes, reset_peak_memory, resident_memory_bytes};
pub use signal::install_stop_handler;
