//! Bufferwright page entry point: mounts the Leptos application.

fn main() {
    app::start();
}
