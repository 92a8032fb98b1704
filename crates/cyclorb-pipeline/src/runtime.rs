//! What a run needs to know about the process and the machine: resident memory (now and at
//! its peak, for reports and progress) the default memory budget and the most worker threads accepted. Linux reads
//! /proc; elsewhere the figures are `None` and the budget falls back to a fixed size.

/// Most worker threads accepted: more gain nothing on any machine this program targets, and
/// a thread the system cannot start would end the process.
pub const MAX_THREADS: usize = 256;

/// The peak resident set size (VmHWM of /proc/self/status) in bytes; `None` where the
/// operating system does not provide it.
pub fn peak_memory_bytes() -> Option<u64> {
    status_bytes("VmHWM:")
}

/// The resident set size now (VmRSS of /proc/self/status) in bytes; `None` where the
/// operating system does not provide it.
pub fn resident_memory_bytes() -> Option<u64> {
    status_bytes("VmRSS:")
}

/// A `KEY: N kB` line of /proc/self/status, in bytes.
fn status_bytes(key: &str) -> Option<u64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with(key))?;
    let kib: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kib * 1024)
}

/// Give freed heap pages back to the system (glibc's `malloc_trim`) and reset the
/// peak-resident-memory counter (Linux: 5 written to /proc/self/clear_refs sets VmHWM to
/// the current resident size), so each run reports its own peak rather than the largest
/// of the sweep so far. Where either is unavailable the peak is the process's.
pub fn reset_peak_memory() {
    #[cfg(all(target_os = "linux", target_env = "gnu"))]
    {
        extern "C" {
            /// `int malloc_trim(size_t pad)` from the C library.
            fn malloc_trim(pad: usize) -> i32;
        }
        // SAFETY: malloc_trim only returns free pages of the allocator to the system.
        unsafe {
            malloc_trim(0);
        }
    }
    let _ = std::fs::write("/proc/self/clear_refs", "5");
}

/// Used when /proc/meminfo cannot be read.
const FALLBACK_BYTES: u64 = 8 << 30;

/// The machine's memory in bytes, from /proc/meminfo.
fn machine_bytes() -> Option<u64> {
    let text = std::fs::read_to_string("/proc/meminfo").ok()?;
    let line = text.lines().find(|l| l.starts_with("MemTotal:"))?;
    let kib: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
    kib.checked_mul(1024)
}

/// The budget in bytes: `mib` when given, else a quarter of the machine's memory (a share
/// that stays safe on a machine shared with other work).
pub fn budget_bytes(mib: Option<u64>) -> u64 {
    match mib {
        Some(mib) => mib.saturating_mul(1 << 20),
        None => machine_bytes().map_or(FALLBACK_BYTES, |b| b / 4),
    }
}
