//! What the benches share: CPU time from /proc/self/stat.

/// User + system CPU seconds so far, from /proc/self/stat (Linux; ticks of USER_HZ = 100,
/// the fixed unit of that file): of this process, or (`children`) of its waited-for child
/// processes, their own children included once waited for. `None` elsewhere.
pub fn cpu_seconds(children: bool) -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // after the command name (in parentheses): utime and stime are fields 14 and 15 of the
    // line, cutime and cstime 16 and 17, the 12th to 15th after the name
    let rest = &stat[stat.rfind(')')? + 1..];
    let fields: Vec<&str> = rest.split_whitespace().collect();
    let first = if children { 13 } else { 11 };
    let ticks: u64 =
        fields.get(first)?.parse::<u64>().ok()? + fields.get(first + 1)?.parse::<u64>().ok()?;
    Some(ticks as f64 / 100.0)
}
