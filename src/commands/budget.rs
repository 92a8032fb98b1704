//! The memory budget of the process: `--memory-limit MIB`, by default a quarter of the
//! machine's memory (`MemTotal` of /proc/meminfo; 8 GiB when it cannot be read), a share
//! that stays safe on a machine shared with other work. It is handed
//! to the libraries (`cyclorb_field::set_memory_budget`), which estimate every large
//! allocation from the input (field tables, block spaces with their twists, products,
//! F-symbols) and refuse past the budget before allocating; the orbit store stops at it
//! with a partial result (exit 3).

use std::fs;

/// Used when /proc/meminfo cannot be read.
const FALLBACK_BYTES: u64 = 8 << 30;

/// The machine's memory in bytes, from /proc/meminfo.
fn machine_bytes() -> Option<u64> {
    let text = fs::read_to_string("/proc/meminfo").ok()?;
    let line = text.lines().find(|l| l.starts_with("MemTotal:"))?;
    let kib: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
    kib.checked_mul(1024)
}

/// The budget in bytes: the flag's MiB, else the default share of the machine.
pub fn budget_bytes(flag_mib: Option<u64>) -> u64 {
    match flag_mib {
        Some(mib) => mib.saturating_mul(1 << 20),
        None => machine_bytes().map_or(FALLBACK_BYTES, |b| b / 4),
    }
}

/// Set the process-wide budget from the command line.
pub fn install(flag_mib: Option<u64>) {
    cyclorb_field::set_memory_budget(budget_bytes(flag_mib));
}
