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

use std::collections::HashMap;
use std::future::Future;
use std::net::{IpAddr, SocketAddr};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use axum::body::Bytes;
use axum::extract::{ConnectInfo, DefaultBodyLimit, Request, State};
use axum::http::{header, HeaderName, HeaderValue, StatusCode};
use axum::middleware::Next;
use axum::response::Response;
use axum::routing::{get, post};
use axum::Router;
use hyper::body::Incoming;
use hyper::server::conn::http1;
use hyper_util::rt::{TokioIo, TokioTimer};
use hyper_util::server::graceful::GracefulShutdown;
use hyper_util::service::TowerToHyperService;
use tokio::sync::Semaphore;
use tower::limit::GlobalConcurrencyLimitLayer;
use tower::{ServiceBuilder, ServiceExt};
use tower_http::catch_panic::CatchPanicLayer;
use tower_http::limit::RequestBodyLimitLayer;
use tower_http::set_header::SetResponseHeaderLayer;
use tower_http::timeout::{RequestBodyTimeoutLayer, TimeoutLayer};

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
    /// Longest a request may take, its body included, before it is answered 408.
    pub request_timeout: Duration,
    /// Longest a connection may take to send a whole request head, counted
    /// from when it opens or its last answer went out: an idle keep-alive
    /// connection is closed after it.
    pub header_read_timeout: Duration,
    /// Longest wait between two pieces of a request body before it is answered 408.
    pub body_timeout: Duration,
    /// Requests handled at once (`/healthz` and `/static/` aside); more wait their turn.
    pub max_concurrent: usize,
    /// Connections open at once; more wait in the listen queue.
    pub max_connections: usize,
    /// Requests with a body that one client address may have in progress at
    /// once; more are answered 429.
    pub max_bodies_per_client: usize,
}

impl Default for Config {
    fn default() -> Config {
        Config {
            request_timeout: Duration::from_secs(10),
            header_read_timeout: Duration::from_secs(10),
            body_timeout: Duration::from_secs(5),
            max_concurrent: 64,
            max_connections: 1024,
            max_bodies_per_client: 8,
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

    // Every route that does work waits for one of `max_concurrent` turns;
    // liveness and the fixed files do not, so that a flood of slow uploads
    // cannot stall them.
    let limited = Router::new()
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
        .layer(GlobalConcurrencyLimitLayer::new(
            config.max_concurrent.max(1),
        ));
    let routes = Router::new()
        .route("/healthz", get(api::healthz))
        .route("/static/{file}", get(assets::serve))
        .merge(limited)
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

    let bodies = BodiesInProgress::new(config.max_bodies_per_client);
    routes.layer(
        ServiceBuilder::new()
            .layer(axum::middleware::from_fn(access_log))
            .layer(headers)
            .layer(axum::middleware::from_fn(error::restate_bare_refusals))
            .layer(axum::middleware::from_fn(error::refuse_content_codings))
            .layer(axum::middleware::from_fn_with_state(
                bodies,
                limit_bodies_per_client,
            ))
            .layer(RequestBodyLimitLayer::new(BODY_LIMIT))
            .layer(CatchPanicLayer::custom(error::panic_response))
            .layer(TimeoutLayer::with_status_code(
                StatusCode::REQUEST_TIMEOUT,
                config.request_timeout,
            ))
            .layer(RequestBodyTimeoutLayer::new(config.body_timeout))
            .layer(DefaultBodyLimit::max(BODY_LIMIT)),
    )
}

/// How many requests with a body each client address has in progress; the
/// address is the one [`serve_on`] puts on each request as [`ConnectInfo`].
#[derive(Clone)]
struct BodiesInProgress {
    limit: usize,
    counts: Arc<Mutex<HashMap<IpAddr, usize>>>,
}

/// One request's place in [`BodiesInProgress`], given back when it is dropped.
struct BodyTurn {
    counts: Arc<Mutex<HashMap<IpAddr, usize>>>,
    ip: IpAddr,
}

impl BodiesInProgress {
    fn new(limit: usize) -> BodiesInProgress {
        BodiesInProgress {
            limit: limit.max(1),
            counts: Arc::default(),
        }
    }

    /// A turn for `ip`, unless it has `limit` bodies in progress already.
    fn take(&self, ip: IpAddr) -> Option<BodyTurn> {
        let mut counts = self.counts.lock().unwrap_or_else(|e| e.into_inner());
        let count = counts.entry(ip).or_insert(0);
        if *count >= self.limit {
            return None;
        }
        *count += 1;
        Some(BodyTurn {
            counts: Arc::clone(&self.counts),
            ip,
        })
    }
}

impl Drop for BodyTurn {
    fn drop(&mut self) {
        let mut counts = self.counts.lock().unwrap_or_else(|e| e.into_inner());
        if let Some(count) = counts.get_mut(&self.ip) {
            *count = count.saturating_sub(1);
            if *count == 0 {
                counts.remove(&self.ip);
            }
        }
    }
}

/// Whether a request's head announces a body (RFC 9112 section 6.3).
fn has_body(request: &Request) -> bool {
    let headers = request.headers();
    headers.contains_key(header::TRANSFER_ENCODING)
        || headers
            .get(header::CONTENT_LENGTH)
            .is_some_and(|v| v.as_bytes() != b"0")
}

/// Answers 429 to a request with a body from an address that has
/// `max_bodies_per_client` of them in progress, so that one client trickling
/// bodies cannot take every turn; the turn is held until the answer is ready,
/// which is after the body has been read.
async fn limit_bodies_per_client(
    State(bodies): State<BodiesInProgress>,
    request: Request,
    next: Next,
) -> Response {
    let peer = request
        .extensions()
        .get::<ConnectInfo<SocketAddr>>()
        .map(|c| c.0.ip());
    let turn = match peer {
        Some(ip) if has_body(&request) => match bodies.take(ip) {
            Some(turn) => Some(turn),
            None => {
                let json = error::answers_json(request.uri().path());
                return error::Error::TooManyBodies(bodies.limit).answer(json);
            }
        },
        _ => None,
    };
    let response = next.run(request).await;
    drop(turn);
    response
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
    let config = state.config.clone();
    let router = app(state);
    tracing::info!("liftaudit listening on http://{local}/");
    serve_on(listener, router, &config, shutdown_signal()).await;
    Ok(())
}

/// Serves `router` on `listener` until `shutdown` is ready, then finishes
/// the connections in flight. HTTP/1.1 through hyper's connection builder
/// with tokio's timer, so that a connection that sends no whole request head
/// within `config.header_read_timeout` (a new one, or one idle between
/// requests) is closed; at most `config.max_connections` are open at once,
/// the rest wait in the listen queue. Each request carries its client's
/// address as [`ConnectInfo`].
pub async fn serve_on(
    listener: tokio::net::TcpListener,
    router: Router,
    config: &Config,
    shutdown: impl Future<Output = ()>,
) {
    let open = Arc::new(Semaphore::new(config.max_connections.max(1)));
    let graceful = GracefulShutdown::new();
    let mut http = http1::Builder::new();
    http.timer(TokioTimer::new())
        .header_read_timeout(config.header_read_timeout);
    tokio::pin!(shutdown);
    loop {
        let permit = tokio::select! {
            permit = Arc::clone(&open).acquire_owned() => match permit {
                Ok(permit) => permit,
                Err(_) => break,
            },
            () = &mut shutdown => break,
        };
        let (stream, peer) = tokio::select! {
            accepted = listener.accept() => match accepted {
                Ok(pair) => pair,
                Err(e) => {
                    // Out of file descriptors, or a connection reset before
                    // it was taken: wait a moment rather than spin.
                    tracing::warn!(error = %e, "cannot accept a connection");
                    tokio::time::sleep(Duration::from_millis(50)).await;
                    continue;
                }
            },
            () = &mut shutdown => break,
        };
        let service = router
            .clone()
            .map_request(move |mut request: Request<Incoming>| {
                request.extensions_mut().insert(ConnectInfo(peer));
                request
            });
        let connection = graceful
            .watch(http.serve_connection(TokioIo::new(stream), TowerToHyperService::new(service)));
        tokio::spawn(async move {
            if let Err(e) = connection.await {
                tracing::debug!(error = %e, %peer, "connection ended");
            }
            drop(permit);
        });
    }
    drop(listener);
    graceful.shutdown().await;
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
