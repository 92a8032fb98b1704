//! Peak resident memory of this process, for reports.

/// The peak resident set size (VmHWM of /proc/self/status) in bytes; `None` where the
/// operating system does not provide it.
pub fn peak_memory_bytes() -> Option<u64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kib: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kib * 1024)
}
