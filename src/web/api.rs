//! The JSON API and the downloads.
//!
//! `POST /api/v1/check` answers with the report of the `liftaudit.report/1`
//! contract; `GET /api/v1/catalog` with the built-in data the rules use.

use axum::body::Bytes;
use axum::extract::rejection::FormRejection;
use axum::extract::{FromRequest, Path, Request, State};
use axum::http::{header, HeaderValue};
use axum::response::{IntoResponse, Response};
use axum::{Form, Json};
use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::catalog::{self, tiers};
use crate::claim::{self, Format};
use crate::report::Report;
use crate::rules;

use super::error::{ApiError, Error, ErrorBody};
use super::openapi::ClaimSheet;
use super::SharedState;

/// The blank sheet offered for download: every field, the optional ones
/// commented out.
pub const SHEET_TEMPLATE: &str = include_str!("../../static/claim-sheet.toml");

/// The sheet format a request's Content-Type names; an error for a type we
/// do not read. No type, or plain text, is told by the text itself. Media
/// types are compared without regard to case (RFC 9110 section 8.3.1).
fn format_of(content_type: Option<&HeaderValue>, body: &str) -> Result<Format, Error> {
    let Some(value) = content_type else {
        return Ok(claim::sniff(body));
    };
    let essence = super::media_type(value).to_ascii_lowercase();
    match essence.as_str() {
        "application/toml" | "text/toml" | "application/x-toml" => Ok(Format::Toml),
        "application/json" => Ok(Format::Json),
        // A structured syntax suffix (RFC 6838 section 4.2.8): "+json" is JSON.
        t if t.ends_with("+json") => Ok(Format::Json),
        "text/plain" | "" => Ok(claim::sniff(body)),
        other => Err(Error::UnsupportedMediaType(format!(
            "'{other}' is not a sheet format; send application/json or application/toml"
        ))),
    }
}

/// The body as text.
fn body_text(bytes: &Bytes) -> Result<&str, Error> {
    std::str::from_utf8(bytes).map_err(|_| Error::BadRequest("the body is not UTF-8 text".into()))
}

fn json_response(json: impl IntoResponse, attachment: Option<&str>) -> Response {
    let mut response = (
        [(
            header::CONTENT_TYPE,
            HeaderValue::from_static("application/json"),
        )],
        json,
    )
        .into_response();
    if let Some(name) = attachment {
        set_attachment(&mut response, name);
    }
    response
}

/// Marks a response as a file to save. `name` is ours (a demo name or a
/// fixed word), never user text, so it needs no quoting beyond the quotes.
fn set_attachment(response: &mut Response, name: &str) {
    if let Ok(v) = HeaderValue::from_str(&format!("attachment; filename=\"{name}\"")) {
        response
            .headers_mut()
            .insert(header::CONTENT_DISPOSITION, v);
    }
}

fn report_of(text: &str, format: Format) -> Result<Report, Error> {
    let claim = claim::parse(text, format)?;
    Ok(rules::run_all(&claim))
}

/// `POST /api/v1/check`: a sheet in, the report out.
#[utoipa::path(
    post,
    path = "/api/v1/check",
    operation_id = "check",
    summary = "Check a claim sheet",
    description = "Reads a claim sheet (DESIGN \"Claim sheet v1\"), as JSON or as TOML, runs every \
        rule and answers with the report (`liftaudit.report/1`). Without a Content-Type, or with \
        text/plain, the format is told by the text: `{` starts JSON, anything else is TOML.",
    request_body(
        description = "The claim sheet; JSON and TOML have the same shape.",
        content(
            (ClaimSheet = "application/json"),
            (String = "application/toml"),
        ),
    ),
    responses(
        (status = 200, description = "The report on the sheet", body = Report),
        (status = 400, description = "Not well-formed JSON or TOML (with line and column), or not UTF-8", body = ErrorBody),
        (status = 408, description = "The body did not arrive in time (it paused too long, or the whole request took too long)", body = ErrorBody),
        (status = 413, description = "The body is larger than 1 MiB", body = ErrorBody),
        (status = 415, description = "A Content-Type that is not a sheet format, or a compressed body (Content-Encoding)", body = ErrorBody),
        (status = 422, description = "Well-formed, but fields are missing, unknown, in the wrong unit or out of range; one entry per field (at most 50, then one that counts the rest)", body = ErrorBody),
        (status = 429, description = "This client address already has the most requests with a body in progress", body = ErrorBody),
    ),
)]
pub async fn check(request: Request) -> Result<Response, ApiError> {
    let content_type = request.headers().get(header::CONTENT_TYPE).cloned();
    let bytes = Bytes::from_request(request, &())
        .await
        .map_err(|e| Error::from_body_failure(e.status(), e.body_text(), &e))?;
    let text = body_text(&bytes)?;
    let format = format_of(content_type.as_ref(), text)?;
    let report = report_of(text, format)?;
    // Compact, as serde_json writes it from the derived `Serialize`: the
    // indented form of [`Report::to_json`] is for the files people open.
    Ok(Json(report).into_response())
}

/// The schema id of `GET /api/v1/catalog`.
pub const CATALOG_SCHEMA: &str = "liftaudit.catalog/1";

/// The shape of `GET /api/v1/catalog`.
#[derive(Serialize, ToSchema)]
#[schema(as = Catalog)]
pub struct CatalogBody {
    /// `liftaudit.catalog/1`.
    schema: &'static str,
    motors: &'static [catalog::MotorClass],
    chemistries: &'static [catalog::Chemistry],
    /// The assumption tiers, most generous first.
    tiers: Vec<TierEntry>,
    #[schema(value_type = Vec<tiers::Row>)]
    tier_table: &'static [&'static tiers::Row],
}

#[derive(Serialize, ToSchema)]
pub struct TierEntry {
    id: tiers::Tier,
    label: &'static str,
}

/// `GET /api/v1/catalog`: motor classes, chemistries, tiers and their table.
#[utoipa::path(
    get,
    path = "/api/v1/catalog",
    operation_id = "catalog",
    summary = "The built-in data the rules use",
    responses(
        (status = 200, description = "Motor classes, battery chemistries, the tiers and the tier table, each value with its basis", body = CatalogBody),
    ),
)]
pub async fn catalog() -> Json<CatalogBody> {
    Json(CatalogBody {
        schema: CATALOG_SCHEMA,
        motors: catalog::MOTORS,
        chemistries: catalog::CHEMISTRIES,
        tiers: tiers::Tier::ALL
            .iter()
            .map(|&t| TierEntry {
                id: t,
                label: t.label(),
            })
            .collect(),
        tier_table: tiers::TABLE,
    })
}

/// The shape of `GET /healthz`.
#[derive(Serialize, ToSchema)]
pub struct Health {
    /// Always `ok`: a service that answers is up.
    status: &'static str,
    engine: &'static str,
    /// Demo claims loaded at start-up.
    demos: usize,
    /// Rules in the registry.
    rules: usize,
}

/// `GET /healthz`: up, with the demos loaded.
#[utoipa::path(
    get,
    path = "/healthz",
    operation_id = "healthz",
    summary = "Liveness, with the demos and rules loaded",
    responses((status = 200, description = "The service is up", body = Health)),
)]
pub async fn healthz(State(state): State<SharedState>) -> Json<Health> {
    Json(Health {
        status: "ok",
        engine: crate::report::ENGINE,
        demos: state.demos.len(),
        rules: rules::REGISTRY.len(),
    })
}

/// `GET /demo/{name}/report.json`.
pub async fn demo_report(
    State(state): State<SharedState>,
    Path(name): Path<String>,
) -> Result<Response, Error> {
    let d = state.demo(&name).ok_or(Error::NotFound)?;
    let file = format!("{}-report.json", d.demo.name);
    Ok(json_response(d.report.to_json(), Some(&file)))
}

/// `GET /demo/{name}/sheet.toml`.
pub async fn demo_sheet(
    State(state): State<SharedState>,
    Path(name): Path<String>,
) -> Result<Response, Error> {
    let d = state.demo(&name).ok_or(Error::NotFound)?;
    Ok(toml_file(
        d.demo.text.to_string(),
        &format!("{}.toml", d.demo.name),
    ))
}

fn toml_file(text: String, name: &str) -> Response {
    let mut response = (
        [(
            header::CONTENT_TYPE,
            HeaderValue::from_static("application/toml; charset=utf-8"),
        )],
        text,
    )
        .into_response();
    set_attachment(&mut response, name);
    response
}

/// `GET /sheet-template.toml`: the blank sheet.
pub async fn sheet_template() -> Response {
    toml_file(SHEET_TEMPLATE.to_string(), "claim-sheet.toml")
}

/// A download's form that could not be read, as the error it stands for.
fn form_failure(e: FormRejection) -> Error {
    Error::from_body_failure(e.status(), e.body_text(), &e)
}

/// The form the verdict page posts to get its downloads.
#[derive(Deserialize)]
pub struct SheetForm {
    sheet: String,
}

/// `POST /download/report.json`: the report of a posted sheet, as a file.
pub async fn download_report(
    form: Result<Form<SheetForm>, FormRejection>,
) -> Result<Response, ApiError> {
    let Form(form) = form.map_err(form_failure)?;
    let report = report_of(&form.sheet, claim::sniff(&form.sheet))?;
    Ok(json_response(
        report.to_json(),
        Some("liftaudit-report.json"),
    ))
}

/// `POST /download/sheet.toml`: the posted sheet back, as a file.
pub async fn download_sheet(
    form: Result<Form<SheetForm>, FormRejection>,
) -> Result<Response, ApiError> {
    let Form(form) = form.map_err(form_failure)?;
    if form.sheet.trim().is_empty() {
        return Err(Error::BadRequest("the sheet is empty".into()).into());
    }
    Ok(match claim::sniff(&form.sheet) {
        Format::Toml => toml_file(form.sheet, "claim-sheet.toml"),
        Format::Json => json_response(form.sheet, Some("claim-sheet.json")),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn format(content_type: Option<&str>, body: &str) -> Result<Format, String> {
        let value = content_type.map(|t| HeaderValue::from_str(t).unwrap());
        format_of(value.as_ref(), body).map_err(|e| match e {
            Error::UnsupportedMediaType(message) => message,
            other => format!("{other:?}"),
        })
    }

    #[test]
    fn media_types_are_read_without_regard_to_case_or_parameters() {
        // RFC 9110 section 8.3.1: type, subtype and parameter names are
        // case-insensitive; parameters follow a semicolon. Structured syntax
        // suffixes (RFC 6838 section 4.2.8): "+json" is JSON.
        for t in [
            "application/json",
            "Application/JSON; charset=utf-8",
            "application/ld+json",
            "APPLICATION/VND.EXAMPLE+JSON",
            " application/json ;q=1",
        ] {
            assert_eq!(format(Some(t), "title = 'x'"), Ok(Format::Json), "{t}");
        }
        for t in [
            "application/toml",
            "TEXT/TOML",
            "application/x-toml; charset=utf-8",
        ] {
            assert_eq!(format(Some(t), "{}"), Ok(Format::Toml), "{t}");
        }
        // No type, plain text or an empty one: the text tells.
        for t in [
            None,
            Some("text/plain"),
            Some("Text/Plain; charset=utf-8"),
            Some(""),
        ] {
            assert_eq!(format(t, "{\"title\": 1}"), Ok(Format::Json), "{t:?}");
            assert_eq!(format(t, "title = 'x'"), Ok(Format::Toml), "{t:?}");
        }
    }

    #[test]
    fn another_media_type_is_refused_by_its_name_in_lower_case() {
        for t in ["image/png", "IMAGE/PNG; x=1", "json"] {
            let message = format(Some(t), "{}").unwrap_err();
            let name = t.split(';').next().unwrap().to_ascii_lowercase();
            assert!(
                message.contains(&format!("'{name}' is not a sheet format")),
                "{message}"
            );
        }
    }
}
