//! The web service: the claim form, the verdict page, the JSON API and the
//! methods page.
//!
//! The layer only parses, calls [`rules::run_all`] and renders; it holds no
//! physics. Pages are askama templates fed by the view models in [`view`];
//! figures are SVG drawn on the server ([`figures`]) so the page works without
//! JavaScript and prints as it shows. Every status code is decided in
//! [`error`]; handlers use `?`.

mod api;
mod assets;
pub mod error;
pub mod figures;
pub mod form;
pub mod layout;
pub mod openapi;
mod pages;
pub mod view;

use std::net::SocketAddr;
use std::sync::Arc;
use std::time::{Duration, Instant};

use axum::body::Bytes;
use axum::extract::{DefaultBodyLimit, Request};
use axum::http::{header, HeaderName, HeaderValue, StatusCode};
use axum::middleware::Next;
use axum::response::Response;
use axum::routing::{get, post};
use axum::Router;
use tower::limit::GlobalConcurrencyLimitLayer;
use tower::ServiceBuilder;
use tower_http::catch_panic::CatchPanicLayer;
use tower_http::limit::RequestBodyLimitLayer;
use tower_http::set_header::SetResponseHeaderLayer;
use tower_http::timeout::TimeoutLayer;

use crate::claim::{self, demo, Claim};
use crate::report::Report;
use crate::rules;

/// Bodies above this are refused with 413 before they are read (issue 3).
pub const BODY_LIMIT: usize = 1024 * 1024;

/// Content-Security-Policy: scripts and styles only from our own files, never
/// inline (CSP Level 3); no framing (`frame-ancestors`, which supersedes
/// X-Frame-Options); forms post only to us.
pub const CSP: &str = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; \
     font-src 'self'; connect-src 'self'; form-action 'self'; base-uri 'none'; frame-ancestors 'none'";

/// Tunables of the service; [`Config::default`] is what `liftaudit serve` uses.
#[derive(Debug, Clone)]
pub struct Config {
    /// Longest a request may take before it is answered 408.
    pub request_timeout: Duration,
    /// Requests handled at once; more wait their turn.
    pub max_concurrent: usize,
}

impl Default for Config {
    fn default() -> Config {
        Config {
            request_timeout: Duration::from_secs(10),
            max_concurrent: 64,
        }
    }
}

/// A demo claim read, checked and rendered once at start-up.
pub struct LoadedDemo {
    pub demo: &'static demo::Demo,
    pub claim: Claim,
    pub report: Report,
    /// The demo's verdict page, rendered once: it depends on nothing but
    /// the demo. `None` only if rendering failed: the page is then rendered
    /// per request and answers the error as any page would.
    pub page: Option<Bytes>,
}

/// What every handler shares: the tunables, the demos ready to show, and
/// the OpenAPI document, written once. Built outside [`app`] (by [`serve`]
/// and by the tests) so that a test can hand the router a state of its own.
pub struct AppState {
    pub config: Config,
    pub demos: Vec<LoadedDemo>,
    pub openapi: axum::body::Bytes,
}

impl AppState {
    /// Reads and checks every built-in demo. A demo that does not parse is
    /// logged and left out rather than stopping the service; a unit test
    /// keeps all of them parsing.
    pub fn load(config: Config) -> AppState {
        let demos = demo::DEMOS
            .iter()
            .filter_map(|d| match claim::parse(d.text, claim::Format::Toml) {
                Ok(claim) => {
                    let checked = rules::check(&claim);
                    let page = match pages::demo_page(d, &claim, &checked) {
                        Ok(html) => Some(Bytes::from(html)),
                        Err(e) => {
                            tracing::error!(demo = d.name, error = %e, "demo page does not render");
                            None
                        }
                    };
                    Some(LoadedDemo {
                        demo: d,
                        claim,
                        report: checked.report,
                        page,
                    })
                }
                Err(e) => {
                    tracing::error!(demo = d.name, error = %e, "demo sheet does not parse");
                    None
                }
            })
            .collect();
        let openapi = serde_json::to_string_pretty(&openapi::document())
            .unwrap_or_default()
            .into();
        AppState {
            config,
            demos,
            openapi,
        }
    }

    pub fn demo(&self, name: &str) -> Option<&LoadedDemo> {
        self.demos.iter().find(|d| d.demo.name == name)
    }
}

pub type SharedState = Arc<AppState>;

/// The whole service as a router over `state`, with its security and
/// resource layers (their limits from `state.config`).
pub fn app(state: AppState) -> Router {
    let config = state.config.clone();
    let state: SharedState = Arc::new(state);

    let routes = Router::new()
        .route("/", get(pages::index))
        .route("/check", post(pages::check))
        .route("/demo/{name}", get(pages::demo))
        .route("/demo/{name}/report.json", get(api::demo_report))
        .route("/demo/{name}/sheet.toml", get(api::demo_sheet))
        .route("/download/report.json", post(api::download_report))
        .route("/download/sheet.toml", post(api::download_sheet))
        .route("/sheet-template.toml", get(api::sheet_template))
        .route("/methods", get(pages::methods))
        .route("/api/v1/check", post(api::check))
        .route("/api/v1/catalog", get(api::catalog))
        .route("/api/v1/openapi.json", get(openapi::openapi_json))
        .route("/healthz", get(api::healthz))
        .route("/static/{file}", get(assets::serve))
        .fallback(pages::not_found)
        .with_state(state);

    let headers = ServiceBuilder::new()
        .layer(SetResponseHeaderLayer::overriding(
            header::CONTENT_SECURITY_POLICY,
            HeaderValue::from_static(CSP),
        ))
        .layer(SetResponseHeaderLayer::overriding(
            header::X_CONTENT_TYPE_OPTIONS,
            HeaderValue::from_static("nosniff"),
        ))
        .layer(SetResponseHeaderLayer::overriding(
            header::REFERRER_POLICY,
            HeaderValue::from_static("no-referrer"),
        ))
        .layer(SetResponseHeaderLayer::overriding(
            header::X_FRAME_OPTIONS,
            HeaderValue::from_static("DENY"),
        ))
        .layer(SetResponseHeaderLayer::if_not_present(
            HeaderName::from_static("permissions-policy"),
            HeaderValue::from_static("camera=(), microphone=(), geolocation=()"),
        ));

    routes.layer(
        ServiceBuilder::new()
            .layer(axum::middleware::from_fn(access_log))
            .layer(headers)
            .layer(axum::middleware::from_fn(error::restate_bare_refusals))
            .layer(RequestBodyLimitLayer::new(BODY_LIMIT))
            .layer(CatchPanicLayer::custom(error::panic_response))
            .layer(TimeoutLayer::with_status_code(
                StatusCode::REQUEST_TIMEOUT,
                config.request_timeout,
            ))
            .layer(GlobalConcurrencyLimitLayer::new(config.max_concurrent))
            .layer(DefaultBodyLimit::max(BODY_LIMIT)),
    )
}

/// The media type of a Content-Type value, without its parameters and the
/// space around it (RFC 9110 section 8.3.1), as sent: compare it without
/// regard to case. A value that is not visible ASCII gives "".
fn media_type(value: &HeaderValue) -> &str {
    value
        .to_str()
        .unwrap_or("")
        .split(';')
        .next()
        .unwrap_or("")
        .trim()
}

/// One log line per request, when its answer is ready: method, path,
/// status and time taken, at error level for a 5xx.
async fn access_log(request: Request, next: Next) -> Response {
    let start = Instant::now();
    let method = request.method().clone();
    let uri = request.uri().clone();
    let response = next.run(request).await;
    let status = response.status().as_u16();
    let micros = start.elapsed().as_micros() as u64;
    if response.status().is_server_error() {
        tracing::error!(%method, path = uri.path(), status, micros, "answered");
    } else {
        tracing::info!(%method, path = uri.path(), status, micros, "answered");
    }
    response
}

/// Runs the service on `addr` until Ctrl-C or SIGTERM, then finishes the
/// requests in flight.
pub async fn serve(addr: SocketAddr, config: Config) -> std::io::Result<()> {
    let listener = tokio::net::TcpListener::bind(addr).await?;
    let local = listener.local_addr()?;
    let state = AppState::load(config);
    tracing::info!(demos = state.demos.len(), "demo claims loaded");
    let router = app(state);
    tracing::info!("liftaudit listening on http://{local}/");
    axum::serve(listener, router)
        .with_graceful_shutdown(shutdown_signal())
        .await
}

async fn shutdown_signal() {
    let ctrl_c = async {
        if let Err(e) = tokio::signal::ctrl_c().await {
            tracing::error!(error = %e, "cannot listen for Ctrl-C");
            std::future::pending::<()>().await;
        }
    };
    #[cfg(unix)]
    let terminate = async {
        use tokio::signal::unix::{signal, SignalKind};
        match signal(SignalKind::terminate()) {
            Ok(mut s) => {
                s.recv().await;
            }
            Err(e) => {
                tracing::error!(error = %e, "cannot listen for SIGTERM");
                std::future::pending::<()>().await;
            }
        }
    };
    #[cfg(not(unix))]
    let terminate = std::future::pending::<()>();
    tokio::select! {
        () = ctrl_c => {},
        () = terminate => {},
    }
    tracing::info!("shutting down: finishing requests in flight");
}
