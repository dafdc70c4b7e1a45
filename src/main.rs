//! `glowgap`: natively, the command line; compiled to wasm32, the browser app.

#[cfg(not(target_arch = "wasm32"))]
fn main() {
    let args: Vec<String> = std::env::args_os().skip(1).map(|a| a.to_string_lossy().into_owned()).collect();
    std::process::exit(glowgap::cli::run(&args));
}

#[cfg(target_arch = "wasm32")]
fn main() {
    glowgap::app::start();
}
