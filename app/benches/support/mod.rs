//! What the whole-process benches share.

/// CPU seconds (user + system) of this process's finished children: fields 16 and 17
/// (`cutime`, `cstime`, in clock ticks) of `/proc/self/stat` (Linux; `None` elsewhere).
pub fn children_cpu_seconds() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    let rest = &stat[stat.rfind(')')? + 2..];
    let fields: Vec<&str> = rest.split_whitespace().collect();
    // after the command name: field 3 is fields[0]; cutime is field 16, cstime field 17
    let cutime: f64 = fields.get(13)?.parse().ok()?;
    let cstime: f64 = fields.get(14)?.parse().ok()?;
    // the kernel's USER_HZ is 100 on every Linux build in common use
    Some((cutime + cstime) / 100.0)
}
