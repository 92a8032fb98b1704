//! What the program needs from the operating system: stop signals (here, since a host
//! such as Python keeps its own) and the process's resident memory (the pipeline's
//! runtime module, shared with the Python module).

mod signal;

pub use cyclorb_pipeline::runtime::{peak_memory_bytes, resident_memory_bytes};
pub use signal::install_stop_handler;
