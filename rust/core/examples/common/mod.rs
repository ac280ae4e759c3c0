//! Measurements shared by the benchmark programs (each includes this module with `mod common;`).

/// CPU seconds this process has used so far (user + system, all threads), from
/// /proc/self/stat (Linux; clock ticks of 1/100 s); `None` elsewhere. On a machine shared with
/// other work, rates per CPU-second are the per-core rates.
pub fn cpu_seconds() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // Fields after the command name (which ends with ')'): utime and stime are the 12th and
    // 13th.
    let after_name = &stat[stat.rfind(')')? + 1..];
    let fields: Vec<&str> = after_name.split_whitespace().collect();
    let ticks: f64 = fields.get(11)?.parse::<f64>().ok()? + fields.get(12)?.parse::<f64>().ok()?;
    Some(ticks / 100.0)
}
