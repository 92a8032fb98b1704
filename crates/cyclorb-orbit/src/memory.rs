//! Resident memory of this process (now and at its peak), for reports and progress.

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
