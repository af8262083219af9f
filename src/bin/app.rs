//! Browser front end program.

#[cfg(target_arch = "wasm32")]
fn main() {
    reshuffle::web::app::start();
}

#[cfg(not(target_arch = "wasm32"))]
fn main() {}
