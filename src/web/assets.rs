//! Static files, built into the binary so `liftaudit serve` runs from any
//! directory. They change only with a release, so browsers may keep them a
//! day (RFC 9111 `max-age`).

use axum::extract::Path;
use axum::http::{header, HeaderValue};
use axum::response::{IntoResponse, Response};

use super::error::Error;

const FILES: &[(&str, &str, &str)] = &[
    (
        "style.css",
        "text/css; charset=utf-8",
        include_str!("../../static/style.css"),
    ),
    (
        "icon.svg",
        "image/svg+xml",
        include_str!("../../static/icon.svg"),
    ),
    (
        "claim-sheet.toml",
        "application/toml; charset=utf-8",
        include_str!("../../static/claim-sheet.toml"),
    ),
];

const CACHE: &str = "public, max-age=86400";

/// `GET /static/{file}`.
pub async fn serve(Path(file): Path<String>) -> Result<Response, Error> {
    let (_, content_type, body) = FILES
        .iter()
        .find(|(name, _, _)| *name == file)
        .ok_or(Error::NotFound)?;
    Ok((
        [
            (header::CONTENT_TYPE, HeaderValue::from_static(content_type)),
            (header::CACHE_CONTROL, HeaderValue::from_static(CACHE)),
        ],
        *body,
    )
        .into_response())
}
