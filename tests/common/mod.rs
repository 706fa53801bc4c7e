//! Helpers shared by the integration tests that talk to a running service.

#![allow(dead_code)]

use std::net::SocketAddr;

use liftaudit::web;

/// Starts the service on a free port of 127.0.0.1 and returns its address.
/// The server runs until the test's runtime ends.
pub async fn spawn_app() -> SocketAddr {
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0")
        .await
        .expect("bind 127.0.0.1:0");
    let addr = listener.local_addr().expect("local address");
    let app = web::app(web::AppState::load(web::Config::default()));
    tokio::spawn(async move {
        axum::serve(listener, app).await.expect("server runs");
    });
    addr
}
