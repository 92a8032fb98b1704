//! The memory budget of the process: `--memory-limit MIB`, by default a quarter of the
//! machine's memory (`MemTotal` of /proc/meminfo; 8 GiB when it cannot be read), a share
//! that stays safe on a machine shared with other work. It is handed
//! to the libraries (`cyclorb_field::set_memory_budget`), which estimate every large
//! allocation from the input (field tables, block spaces with their twists, products,
//! F-symbols) and refuse past the budget before allocating; the orbit store stops at it
//! with a partial result (exit 3).

/// Set the process-wide budget from the command line.
pub fn install(flag_mib: Option<u64>) {
    cyclorb_field::set_memory_budget(cyclorb_pipeline::runtime::budget_bytes(flag_mib));
}
