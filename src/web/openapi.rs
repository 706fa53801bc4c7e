//! The OpenAPI 3.1 document of the JSON API, `GET /api/v1/openapi.json`.
//!
//! The document is generated from the types the service really sends
//! (`utoipa` derives on [`Report`], the catalog types and [`ErrorBody`]) and
//! from the handlers' `#[utoipa::path]` attributes, so it cannot drift from
//! them by hand. [`document`] then narrows a few strings to the values the
//! engine can produce, read from the registries themselves (rule ids, source
//! ids, schema ids), and adds every demo claim as a request example. It is
//! built once at start-up; the handler hands out the same text.

use axum::extract::State;
use axum::http::{header, HeaderValue};
use axum::response::{IntoResponse, Response};
use serde_json::{json, Value};
use utoipa::{OpenApi, ToSchema};

use crate::catalog::{self, tiers};
use crate::claim::demo;
use crate::report::{self, Figure, Finding, Report, Verdict};
use crate::{rules, sources};

use super::api;
use super::error::{ErrorBody, ErrorEntry};
use super::SharedState;

/// A claim sheet as JSON (DESIGN "Claim sheet v1"): the same shape as the
/// TOML sheet. Quantities are strings with units ("310 g", "55 mm", "15 min");
/// the service reads the sheet field by field and answers 422 with the path
/// of each field it refuses, so the tables are described here, not repeated.
#[derive(ToSchema)]
#[allow(dead_code)] // describes a request body; the sheet is read by `claim`
pub struct ClaimSheet {
    /// What the claim is about, shown as the report's title.
    title: String,
    /// Where the claim comes from, free text.
    #[schema(required = false)]
    source: String,
    /// `mass` (or a `parts` list of `{name, mass, count}`), `size` ("L x W x H").
    #[schema(value_type = Object)]
    craft: Value,
    /// `count`, `layout`, `arm`, `diameter`, `mount`, `tilt_range`, `height`,
    /// `motor` (a catalog class) or `drive`, `max_thrust`, `max_power`; `spins`;
    /// `at` (a list of rotors placed by hand, for `layout = "custom"`).
    #[schema(value_type = Object)]
    rotors: Value,
    /// `chemistry`, `cells`, `capacity`, `mass`, `max_discharge`.
    #[schema(value_type = Object, required = false)]
    battery: Value,
    /// `flight_time`, `hover_tilt`, `hands_free`, `position_hold`,
    /// `survives_rotor_failure`.
    #[schema(value_type = Object, required = false)]
    claim: Value,
    /// `gyroscope`, `accelerometer`, `barometer`, `position`, `loop_rate`.
    #[schema(value_type = Object, required = false)]
    sensing: Value,
    /// `altitude`, `temperature`, `wind`.
    #[schema(value_type = Object, required = false)]
    conditions: Value,
}

#[derive(OpenApi)]
#[openapi(
    info(
        title = "liftaudit",
        description = "Physics plausibility screen for claims about small flying machines: \
            a claim sheet in, a verdict with every finding, its figures per assumption tier \
            and their sources out.",
        license(name = "MIT", identifier = "MIT"),
    ),
    paths(api::check, api::catalog, openapi_json, api::healthz),
    components(schemas(
        Report,
        Finding,
        Figure,
        Verdict,
        tiers::Tier,
        ErrorBody,
        ErrorEntry,
        ClaimSheet,
        catalog::MotorClass,
        catalog::Chemistry,
        catalog::Basis,
        catalog::Drive,
        tiers::Row,
    ))
)]
struct ApiDoc;

/// The document as JSON, with the strings narrowed to what the engine can
/// send and the demo claims as request examples.
pub fn document() -> Value {
    let mut doc = serde_json::to_value(ApiDoc::openapi()).unwrap_or_else(|e| {
        tracing::error!(error = %e, "the OpenAPI document does not serialize");
        json!({})
    });
    let schemas = "/components/schemas";
    let rule_ids: Vec<&str> = rules::REGISTRY.iter().map(|r| r.id).collect();
    let source_ids: Vec<&str> = sources::SOURCES.iter().map(|s| s.id).collect();
    let narrow = [
        ("Report/properties/schema", json!([report::SCHEMA])),
        ("Report/properties/engine", json!([report::ENGINE])),
        ("Finding/properties/rule", json!(rule_ids)),
        ("Finding/properties/sources/items", json!(source_ids)),
        ("Catalog/properties/schema", json!([api::CATALOG_SCHEMA])),
        ("Health/properties/status", json!(["ok"])),
    ];
    for (at, values) in narrow {
        if let Some(Value::Object(schema)) = doc.pointer_mut(&format!("{schemas}/{at}")) {
            schema.insert("enum".into(), values);
        }
    }

    let mut as_json = serde_json::Map::new();
    let mut as_toml = serde_json::Map::new();
    for d in demo::DEMOS {
        let example = |value: Value| json!({ "summary": d.shows(), "value": value });
        if let Ok(sheet) = toml::from_str::<Value>(d.text) {
            as_json.insert(d.name.into(), example(sheet));
        }
        as_toml.insert(d.name.into(), example(Value::String(d.text.into())));
    }
    let body = "/paths/~1api~1v1~1check/post/requestBody/content";
    for (media, examples) in [
        ("application~1json", as_json),
        ("application~1toml", as_toml),
    ] {
        if let Some(Value::Object(content)) = doc.pointer_mut(&format!("{body}/{media}")) {
            content.insert("examples".into(), Value::Object(examples));
        }
    }
    doc
}

/// `GET /api/v1/openapi.json`: this document.
#[utoipa::path(
    get,
    path = "/api/v1/openapi.json",
    operation_id = "openapi",
    summary = "This OpenAPI document",
    responses((status = 200, description = "The OpenAPI 3.1 document of the JSON API", body = Object)),
)]
pub async fn openapi_json(State(state): State<SharedState>) -> Response {
    (
        [(
            header::CONTENT_TYPE,
            HeaderValue::from_static("application/json"),
        )],
        state.openapi.clone(),
    )
        .into_response()
}
