//! Every status code the service answers with is decided here.
//!
//! A sheet that is not TOML or JSON is the client's syntax error (400, RFC 9110
//! section 15.5.1) and says where; a sheet that parses but is wrong is
//! unprocessable content (422, RFC 9110 section 15.5.21) and names each field.
//! Internal errors are logged with their cause and shown only as a generic
//! page, so nothing about the server leaks to the client.

use std::any::Any;

use askama::Template;
use axum::body::Body;
use axum::extract::Request;
use axum::http::{header, StatusCode};
use axum::middleware::Next;
use axum::response::{Html, IntoResponse, Response};
use axum::Json;
use serde::Serialize;
use utoipa::ToSchema;

use crate::claim;

use super::view;

/// An error of an HTML page.
#[derive(Debug)]
pub enum Error {
    /// The sheet was refused; the API answers with the field paths.
    Sheet(claim::Error),
    /// A request we cannot read (not UTF-8, a broken form): 400 with the reason.
    BadRequest(String),
    /// A content type the endpoint does not read.
    UnsupportedMediaType(String),
    /// A body over [`super::BODY_LIMIT`].
    TooLarge,
    NotFound,
    /// A method the address does not take.
    MethodNotAllowed,
    /// A request not received within the time the service waits (408).
    Timeout,
    /// The client's address has this many bodies in progress already (429).
    TooManyBodies(usize),
    /// A refusal made by a layer of a library, restated with its status and
    /// its words (such as the router's answer to a path that is not UTF-8).
    Refused(StatusCode, String),
    /// Our fault: logged, never shown.
    Internal(String),
}

impl Error {
    pub fn internal(context: &str, cause: impl std::fmt::Display) -> Error {
        Error::Internal(format!("{context}: {cause}"))
    }

    /// The error an extractor's rejection stands for: too large stays 413,
    /// anything else is the client's malformed request.
    pub fn from_status(status: StatusCode, message: String) -> Error {
        if status == StatusCode::PAYLOAD_TOO_LARGE {
            Error::TooLarge
        } else {
            Error::BadRequest(message)
        }
    }

    /// The error a failed read of the body stands for: [`Error::Timeout`]
    /// when the body timeout cut it off (found among the `cause`'s sources),
    /// else as [`Error::from_status`].
    pub fn from_body_failure(
        status: StatusCode,
        message: String,
        cause: &(dyn std::error::Error + 'static),
    ) -> Error {
        let mut source = Some(cause);
        while let Some(e) = source {
            if e.is::<tower_http::timeout::TimeoutError>() {
                return Error::Timeout;
            }
            source = e.source();
        }
        Error::from_status(status, message)
    }

    /// This error answered as JSON (`json`) or as the error page.
    pub fn answer(self, json: bool) -> Response {
        if json {
            ApiError(self).into_response()
        } else {
            self.into_response()
        }
    }

    pub fn status(&self) -> StatusCode {
        match self {
            Error::Sheet(claim::Error::Syntax { .. }) | Error::BadRequest(_) => {
                StatusCode::BAD_REQUEST
            }
            Error::Sheet(claim::Error::Invalid(_)) => StatusCode::UNPROCESSABLE_ENTITY,
            Error::UnsupportedMediaType(_) => StatusCode::UNSUPPORTED_MEDIA_TYPE,
            Error::TooLarge => StatusCode::PAYLOAD_TOO_LARGE,
            Error::NotFound => StatusCode::NOT_FOUND,
            Error::MethodNotAllowed => StatusCode::METHOD_NOT_ALLOWED,
            Error::Timeout => StatusCode::REQUEST_TIMEOUT,
            Error::TooManyBodies(_) => StatusCode::TOO_MANY_REQUESTS,
            Error::Refused(status, _) => *status,
            Error::Internal(_) => StatusCode::INTERNAL_SERVER_ERROR,
        }
    }

    fn log(&self) {
        if let Error::Internal(cause) = self {
            tracing::error!(%cause, "internal error");
        }
    }

    /// The message a person may read: the cause for client errors, a generic
    /// line for ours.
    pub fn public_message(&self) -> String {
        match self {
            Error::Sheet(e) => e.to_string(),
            Error::BadRequest(m) | Error::UnsupportedMediaType(m) | Error::Refused(_, m) => {
                m.clone()
            }
            Error::TooLarge => format!(
                "The request is larger than {} KiB, the most this service reads.",
                super::BODY_LIMIT / 1024
            ),
            Error::NotFound => "There is no page at this address.".to_string(),
            Error::MethodNotAllowed => {
                "This address does not take that method; the Allow header lists the ones it does."
                    .to_string()
            }
            Error::Timeout => "The request did not arrive in time: its body came too slowly or \
                 stopped. Please send it again."
                .to_string(),
            Error::TooManyBodies(n) => format!(
                "This address already has {n} requests with a body in progress; \
                 wait for one to finish, then send this one again."
            ),
            Error::Internal(_) => {
                "Something went wrong on our side. The error has been logged; please try again."
                    .to_string()
            }
        }
    }
}

impl From<claim::Error> for Error {
    fn from(e: claim::Error) -> Error {
        Error::Sheet(e)
    }
}

impl From<askama::Error> for Error {
    fn from(e: askama::Error) -> Error {
        Error::internal("template", e)
    }
}

impl IntoResponse for Error {
    fn into_response(self) -> Response {
        self.log();
        let status = self.status();
        let page = view::ErrorPage::new(status, self.public_message());
        match page.render() {
            Ok(html) => (status, Html(html)).into_response(),
            Err(e) => {
                tracing::error!(error = %e, "error page does not render");
                (status, "error").into_response()
            }
        }
    }
}

/// The same errors, answered as JSON for `/api/...` and the downloads.
#[derive(Debug)]
pub struct ApiError(pub Error);

impl<E: Into<Error>> From<E> for ApiError {
    fn from(e: E) -> ApiError {
        ApiError(e.into())
    }
}

/// One entry of `{"errors": [...]}`: a field path for a refused field, a line
/// and column for a syntax error.
#[derive(Debug, Serialize, ToSchema)]
pub struct ErrorEntry {
    /// The dotted path of a refused field (`rotors.diameter`,
    /// `craft.parts[2].mass`); absent for an error of the whole request.
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = String, required = false)]
    pub field: Option<String>,
    pub message: String,
    /// Where a syntax error is, counted from 1; absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = u64, required = false, minimum = 1)]
    pub line: Option<usize>,
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = u64, required = false, minimum = 1)]
    pub column: Option<usize>,
}

/// The body of every JSON error: at least one entry.
#[derive(Debug, Serialize, ToSchema)]
pub struct ErrorBody {
    #[schema(min_items = 1)]
    pub errors: Vec<ErrorEntry>,
}

impl ErrorBody {
    pub fn of(error: &Error) -> ErrorBody {
        let message_only = |message: String| ErrorEntry {
            field: None,
            message,
            line: None,
            column: None,
        };
        let errors = match error {
            Error::Sheet(claim::Error::Invalid(fields)) => fields
                .iter()
                .map(|f| ErrorEntry {
                    field: Some(f.field.clone()),
                    message: f.message.clone(),
                    line: None,
                    column: None,
                })
                .collect(),
            Error::Sheet(claim::Error::Syntax {
                format,
                line,
                column,
                message,
            }) => vec![ErrorEntry {
                field: None,
                message: format!("not valid {format}: {message}"),
                line: Some(*line),
                column: Some(*column),
            }],
            other => vec![message_only(other.public_message())],
        };
        ErrorBody { errors }
    }
}

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        self.0.log();
        (self.0.status(), Json(ErrorBody::of(&self.0))).into_response()
    }
}

/// Paths whose errors are answered as JSON ([`ApiError`]): the API and the downloads.
pub fn answers_json(path: &str) -> bool {
    path.starts_with("/api/") || path.starts_with("/download/")
}

/// The most of a library's plain-text refusal that is read to restate it.
const REFUSAL_TEXT_LIMIT: usize = 4096;

/// Some refusals are made outside our handlers, with bodies of their own:
/// `RequestBodyLimitLayer` answers a body whose declared length is over the
/// limit with plain text, the router answers a method a route does not take
/// (405) with nothing and a path it cannot read (400) with plain text, the
/// timeout answers 408 with nothing and the panic guard 500 with plain text.
/// This gives every such answer (any status from 400 up, in plain text or
/// without a body type) the body of every other error: the JSON errors body
/// under `/api/` and for the downloads (as the OpenAPI document says), the
/// error page elsewhere. A 405 keeps its `Allow`.
pub async fn restate_bare_refusals(request: Request, next: Next) -> Response {
    let json = answers_json(request.uri().path());
    let response = next.run(request).await;
    let status = response.status();
    let plain_text = response
        .headers()
        .get(header::CONTENT_TYPE)
        .is_none_or(|v| v.as_bytes().starts_with(b"text/plain"));
    if status.as_u16() < 400 || !plain_text {
        return response;
    }
    let allow = response.headers().get(header::ALLOW).cloned();
    let error = match status {
        StatusCode::PAYLOAD_TOO_LARGE => Error::TooLarge,
        StatusCode::METHOD_NOT_ALLOWED => Error::MethodNotAllowed,
        StatusCode::REQUEST_TIMEOUT => Error::Timeout,
        StatusCode::NOT_FOUND => Error::NotFound,
        // Already logged with its cause by `panic_response`.
        StatusCode::INTERNAL_SERVER_ERROR => Error::Internal("a handler panicked".into()),
        _ => {
            let text = axum::body::to_bytes(response.into_body(), REFUSAL_TEXT_LIMIT)
                .await
                .map(|b| String::from_utf8_lossy(&b).trim().to_string())
                .unwrap_or_default();
            let text = if text.is_empty() {
                status
                    .canonical_reason()
                    .unwrap_or("The request was refused")
                    .to_string()
            } else {
                text
            };
            Error::Refused(status, text)
        }
    };
    let mut restated = error.answer(json);
    if let Some(allow) = allow {
        restated.headers_mut().insert(header::ALLOW, allow);
    }
    restated
}

/// Refuses a request body in a content coding (RFC 9110 section 8.4), such
/// as gzip: the service reads sheets as they are. 415 names the coding and
/// `Accept-Encoding: identity` says what is read (RFC 9110 section 12.5.3).
pub async fn refuse_content_codings(request: Request, next: Next) -> Response {
    let coding = request.headers().get(header::CONTENT_ENCODING).map(|v| {
        String::from_utf8_lossy(v.as_bytes())
            .trim()
            .to_ascii_lowercase()
    });
    match coding {
        Some(coding) if !coding.is_empty() && coding != "identity" => {
            let json = answers_json(request.uri().path());
            let mut response = Error::UnsupportedMediaType(format!(
                "the body is sent in the content coding '{coding}', which this service does not \
                 read; send it uncompressed, without a Content-Encoding header"
            ))
            .answer(json);
            response.headers_mut().insert(
                header::ACCEPT_ENCODING,
                header::HeaderValue::from_static("identity"),
            );
            response
        }
        _ => next.run(request).await,
    }
}

/// The answer to a handler that panicked: logged, and a plain 500 that says
/// nothing of the cause. Rules must not panic; this is the last guard.
pub fn panic_response(cause: Box<dyn Any + Send + 'static>) -> Response<Body> {
    let message = cause
        .downcast_ref::<String>()
        .map(String::as_str)
        .or_else(|| cause.downcast_ref::<&str>().copied())
        .unwrap_or("(no message)");
    tracing::error!(panic = message, "a handler panicked");
    let mut response = Response::new(Body::from(
        "Something went wrong on our side. The error has been logged.",
    ));
    *response.status_mut() = StatusCode::INTERNAL_SERVER_ERROR;
    response.headers_mut().insert(
        header::CONTENT_TYPE,
        header::HeaderValue::from_static("text/plain; charset=utf-8"),
    );
    response
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_refused_field_is_unprocessable_and_broken_syntax_is_a_bad_request() {
        let invalid = Error::Sheet(claim::Error::Invalid(vec![claim::FieldError {
            field: "craft.mass".into(),
            message: "is required".into(),
        }]));
        assert_eq!(invalid.status(), StatusCode::UNPROCESSABLE_ENTITY);
        let body = serde_json::to_value(ErrorBody::of(&invalid)).unwrap();
        assert_eq!(body["errors"][0]["field"], "craft.mass");

        let syntax = Error::Sheet(claim::Error::Syntax {
            format: claim::Format::Json,
            line: 3,
            column: 7,
            message: "expected value".into(),
        });
        assert_eq!(syntax.status(), StatusCode::BAD_REQUEST);
        let body = serde_json::to_value(ErrorBody::of(&syntax)).unwrap();
        assert_eq!(
            (
                body["errors"][0]["line"].as_u64(),
                body["errors"][0]["column"].as_u64()
            ),
            (Some(3), Some(7))
        );
    }

    #[test]
    fn an_internal_error_never_shows_its_cause() {
        let e = Error::internal("template", "secret path /etc/x");
        assert_eq!(e.status(), StatusCode::INTERNAL_SERVER_ERROR);
        assert!(!e.public_message().contains("secret"));
    }
}
