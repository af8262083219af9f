//! The native `reshuffle` command. See `reshuffle help`.

#[cfg(not(target_arch = "wasm32"))]
fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let code = reshuffle::cli::main_with(&args, &mut std::io::stdout(), &mut std::io::stderr());
    std::process::exit(code);
}

#[cfg(target_arch = "wasm32")]
fn main() {}
