//! `glowgap`: natively, the command line; compiled to wasm32, the browser app.

#[cfg(not(target_arch = "wasm32"))]
fn main() {
    let args: Vec<String> = std::env::args_os().skip(1).map(|a| a.to_string_lossy().into_owned()).collect();
    let code = glowgap::cli::run(&args);
    // Developer knob for the memory benchmark: report the peak resident set size.
    if std::env::var_os("GLOWGAP_REPORT_PEAK_MEMORY").is_some() {
        if let Ok(status) = std::fs::read_to_string("/proc/self/status") {
            if let Some(line) = status.lines().find(|l| l.starts_with("VmHWM:")) {
                eprintln!("glowgap: peak memory {}", line.trim_start_matches("VmHWM:").trim());
            }
        }
    }
    std::process::exit(code);
}

#[cfg(target_arch = "wasm32")]
fn main() {
    // the stack panel's gap search loads this module in a background worker, where there
    // is no page to mount
    if web_sys::window().is_some() {
        glowgap::app::start();
    }
}
