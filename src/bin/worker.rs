//! Web worker program: runs the engine off the page's main thread.

#[cfg(target_arch = "wasm32")]
fn main() {
    reshuffle::web::worker::start();
}

#[cfg(not(target_arch = "wasm32"))]
fn main() {}
