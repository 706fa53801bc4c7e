//! The OpenAPI document at `/api/v1/openapi.json` against the service itself:
//! it parses, names every API route the router has, and what the service
//! really answers (a report for each demo, the catalog, health, each kind of
//! error) fits the schema the document gives for that answer.
//!
//! The check is a small JSON Schema walker (the subset `utoipa` writes:
//! `$ref`, `type`, `properties`, `required`, `items`, `prefixItems`, `enum`,
//! `oneOf`, `minItems`, `minimum`), stricter than JSON Schema in one way: an
//! object key the schema does not name is a failure, so the document has to
//! describe everything the service sends.

use std::sync::OnceLock;

use axum::body::Body;
use axum::http::{header, Method, Request, StatusCode};
use axum::Router;
use http_body_util::BodyExt;
use serde_json::{json, Value};
use tower::ServiceExt;

use liftaudit::claim::demo;
use liftaudit::web;

fn app() -> Router {
    static APP: OnceLock<Router> = OnceLock::new();
    APP.get_or_init(|| web::app(web::AppState::load(web::Config::default())))
        .clone()
}

struct Answer {
    status: StatusCode,
    content_type: String,
    body: Value,
}

async fn send(method: Method, path: &str, content_type: Option<&str>, body: String) -> Answer {
    let mut req = Request::builder().method(method).uri(path);
    if let Some(t) = content_type {
        req = req.header(header::CONTENT_TYPE, t);
    }
    let res = app()
        .oneshot(req.body(Body::from(body)).unwrap())
        .await
        .expect("the router answers");
    let status = res.status();
    let content_type = res
        .headers()
        .get(header::CONTENT_TYPE)
        .map(|v| v.to_str().unwrap().to_string())
        .unwrap_or_default();
    let bytes = res.into_body().collect().await.unwrap().to_bytes();
    let body = serde_json::from_slice(&bytes).unwrap_or_else(|e| {
        panic!(
            "{path}: not JSON ({e}): {}",
            String::from_utf8_lossy(&bytes)
        )
    });
    Answer {
        status,
        content_type,
        body,
    }
}

async fn document() -> Value {
    let a = send(Method::GET, "/api/v1/openapi.json", None, String::new()).await;
    assert_eq!(a.status, StatusCode::OK);
    assert!(a.content_type.starts_with("application/json"));
    a.body
}

/// The schema the document gives for `method path` answering `status`.
fn response_schema<'d>(doc: &'d Value, method: &str, path: &str, status: u16) -> &'d Value {
    let op = &doc["paths"][path][method];
    assert!(op.is_object(), "the document has no {method} {path}");
    let schema = &op["responses"][status.to_string()]["content"]["application/json"]["schema"];
    assert!(
        schema.is_object(),
        "{method} {path} has no JSON schema for {status}"
    );
    schema
}

// ---- the checker ------------------------------------------------------------

/// Every way `value` departs from `schema`, with its JSON pointer.
fn violations(doc: &Value, schema: &Value, value: &Value) -> Vec<String> {
    let mut out = Vec::new();
    walk(doc, schema, value, "", &mut out);
    out
}

fn resolve<'d>(doc: &'d Value, schema: &'d Value) -> &'d Value {
    match schema.get("$ref").and_then(Value::as_str) {
        Some(r) => {
            let target = doc
                .pointer(r.trim_start_matches('#'))
                .unwrap_or_else(|| panic!("dangling $ref {r}"));
            resolve(doc, target)
        }
        None => schema,
    }
}

fn type_matches(name: &str, value: &Value) -> bool {
    match name {
        "object" => value.is_object(),
        "array" => value.is_array(),
        "string" => value.is_string(),
        "boolean" => value.is_boolean(),
        "null" => value.is_null(),
        // serde_json never holds a NaN or an infinity: a non-finite f64 is
        // written as null, which fails here.
        "number" => value.is_number(),
        "integer" => value.is_i64() || value.is_u64(),
        other => panic!("a type the checker does not know: {other}"),
    }
}

fn walk(doc: &Value, schema: &Value, value: &Value, at: &str, out: &mut Vec<String>) {
    let schema = resolve(doc, schema);
    if let Some(one_of) = schema.get("oneOf").and_then(Value::as_array) {
        let fits = one_of
            .iter()
            .filter(|s| violations(doc, s, value).is_empty())
            .count();
        if fits != 1 {
            out.push(format!("{at}: fits {fits} of the oneOf alternatives"));
        }
    }
    if let Some(t) = schema.get("type") {
        let names: Vec<&str> = match t {
            Value::String(s) => vec![s.as_str()],
            Value::Array(a) => a.iter().filter_map(Value::as_str).collect(),
            _ => panic!("{at}: odd type {t}"),
        };
        if !names.iter().any(|n| type_matches(n, value)) {
            out.push(format!("{at}: {value} is not {names:?}"));
            return;
        }
    }
    if let Some(allowed) = schema.get("enum").and_then(Value::as_array) {
        if !allowed.contains(value) {
            out.push(format!("{at}: {value} is not one of {allowed:?}"));
        }
    }
    if let (Some(min), Some(n)) = (
        schema.get("minimum").and_then(Value::as_f64),
        value.as_f64(),
    ) {
        if n < min {
            out.push(format!("{at}: {n} is below the minimum {min}"));
        }
    }
    if let Value::Object(map) = value {
        let properties = schema.get("properties").and_then(Value::as_object);
        for key in schema
            .get("required")
            .and_then(Value::as_array)
            .into_iter()
            .flatten()
            .filter_map(Value::as_str)
        {
            if !map.contains_key(key) {
                out.push(format!("{at}: the required key '{key}' is missing"));
            }
        }
        if let Some(properties) = properties {
            for (key, v) in map {
                match properties.get(key) {
                    Some(s) => walk(doc, s, v, &format!("{at}/{key}"), out),
                    None => out.push(format!("{at}: the key '{key}' is not in the document")),
                }
            }
        }
    }
    if let Value::Array(items) = value {
        if let Some(min) = schema.get("minItems").and_then(Value::as_u64) {
            if (items.len() as u64) < min {
                out.push(format!("{at}: {} items, fewer than {min}", items.len()));
            }
        }
        let prefix = schema
            .get("prefixItems")
            .and_then(Value::as_array)
            .map(Vec::as_slice)
            .unwrap_or(&[]);
        for (i, item) in items.iter().enumerate() {
            let here = format!("{at}/{i}");
            match (prefix.get(i), schema.get("items")) {
                (Some(s), _) => walk(doc, s, item, &here, out),
                (None, Some(Value::Bool(false))) => {
                    out.push(format!("{here}: more items than the tuple has"))
                }
                (None, Some(s)) if s.is_object() => walk(doc, s, item, &here, out),
                _ => {}
            }
        }
    }
}

// ---- the document -------------------------------------------------------------

/// The routes `web::app` declares, read from its source: `(method, path)` for
/// every route under `/api/` and `/healthz`. Reading the source keeps a new
/// route from slipping past the document unnoticed.
fn api_routes() -> Vec<(String, String)> {
    let source = include_str!("../src/web/mod.rs");
    let mut routes = Vec::new();
    for line in source.lines() {
        let Some(rest) = line.trim().strip_prefix(".route(\"") else {
            continue;
        };
        let Some((path, handler)) = rest.split_once('"') else {
            continue;
        };
        if !(path.starts_with("/api/") || path == "/healthz") {
            continue;
        }
        for method in ["get", "post", "put", "patch", "delete"] {
            if handler.contains(&format!("{method}(")) {
                routes.push((method.to_string(), path.to_string()));
            }
        }
    }
    routes
}

#[tokio::test]
async fn the_document_is_openapi_3_1_and_names_every_api_route() {
    let doc = document().await;
    assert!(doc["openapi"].as_str().unwrap().starts_with("3.1"));
    assert_eq!(doc["info"]["version"], env!("CARGO_PKG_VERSION"));
    let routes = api_routes();
    assert!(
        routes.len() >= 4,
        "the route scan found too few: {routes:?}"
    );
    for (method, path) in &routes {
        assert!(
            doc["paths"][path][method]["responses"]["200"].is_object(),
            "{method} {path} is served but not in the document"
        );
    }
    let documented: usize = doc["paths"]
        .as_object()
        .unwrap()
        .values()
        .map(|item| item.as_object().unwrap().len())
        .sum();
    assert_eq!(
        documented,
        routes.len(),
        "the document names a route the router lacks"
    );

    let check = &doc["paths"]["/api/v1/check"]["post"];
    for status in ["200", "400", "413", "415", "422"] {
        assert!(check["responses"][status].is_object(), "no {status}");
    }
    let content = &check["requestBody"]["content"];
    assert_eq!(content["application/toml"]["schema"]["type"], "string");
    let sheet = resolve(&doc, &content["application/json"]["schema"]);
    assert_eq!(sheet["type"], "object");
    assert_eq!(sheet["required"], json!(["title", "craft", "rotors"]));
}

#[tokio::test]
async fn the_report_schema_says_what_the_contract_says() {
    let doc = document().await;
    let schemas = &doc["components"]["schemas"];
    assert_eq!(
        schemas["Verdict"]["enum"],
        json!([
            "consistent",
            "doubtful",
            "implausible",
            "impossible",
            "not-assessed"
        ])
    );
    assert_eq!(
        schemas["Tier"]["enum"],
        json!(["physical-limit", "best-practice", "typical"])
    );
    assert_eq!(
        schemas["Report"]["properties"]["schema"]["enum"],
        json!(["liftaudit.report/1"])
    );
    let rule_ids: Vec<&str> = liftaudit::rules::REGISTRY.iter().map(|r| r.id).collect();
    assert_eq!(
        schemas["Finding"]["properties"]["rule"]["enum"],
        json!(rule_ids)
    );
    assert!(schemas["Finding"]["properties"]["sources"]["items"]["enum"]
        .as_array()
        .is_some_and(|ids| ids.len() == liftaudit::sources::SOURCES.len()));
    let figure = &schemas["Figure"];
    assert_eq!(figure["properties"]["value"]["type"], "number");
    let required = figure["required"].as_array().unwrap();
    assert!(
        !required.contains(&json!("tier")),
        "a tier-free figure has no tier key"
    );
    assert!(
        figure["properties"]["tier"]["$ref"].is_string(),
        "a tier, when present, is a Tier and never null"
    );
}

#[tokio::test]
async fn every_demo_report_fits_the_report_schema() {
    let doc = document().await;
    let schema = response_schema(&doc, "post", "/api/v1/check", 200);
    let mut tier_free = 0;
    for d in demo::DEMOS {
        let a = send(
            Method::POST,
            "/api/v1/check",
            Some("application/toml"),
            d.text.into(),
        )
        .await;
        assert_eq!(a.status, StatusCode::OK, "{}", d.name);
        assert!(a.content_type.starts_with("application/json"));
        let wrong = violations(&doc, schema, &a.body);
        assert!(wrong.is_empty(), "{}: {wrong:#?}", d.name);
        tier_free += a.body["findings"]
            .as_array()
            .unwrap()
            .iter()
            .flat_map(|f| f["figures"].as_array().unwrap())
            .filter(|f| f.get("tier").is_none())
            .count();
    }
    assert!(tier_free > 0, "no demo shows a figure without a tier");
}

#[tokio::test]
async fn every_request_example_in_the_document_is_checked() {
    let doc = document().await;
    let schema = response_schema(&doc, "post", "/api/v1/check", 200);
    let content = &doc["paths"]["/api/v1/check"]["post"]["requestBody"]["content"];
    for media in ["application/json", "application/toml"] {
        let examples = content[media]["examples"].as_object().unwrap();
        assert_eq!(examples.len(), demo::DEMOS.len(), "{media}");
        for (name, example) in examples {
            let body = match &example["value"] {
                Value::String(text) => text.clone(),
                sheet => sheet.to_string(),
            };
            let a = send(Method::POST, "/api/v1/check", Some(media), body).await;
            assert_eq!(a.status, StatusCode::OK, "{media} {name}: {}", a.body);
            assert!(violations(&doc, schema, &a.body).is_empty(), "{name}");
        }
    }
}

#[tokio::test]
async fn the_catalog_and_health_fit_their_schemas() {
    let doc = document().await;
    for path in ["/api/v1/catalog", "/healthz"] {
        let a = send(Method::GET, path, None, String::new()).await;
        assert_eq!(a.status, StatusCode::OK);
        let wrong = violations(&doc, response_schema(&doc, "get", path, 200), &a.body);
        assert!(wrong.is_empty(), "{path}: {wrong:#?}");
    }
}

#[tokio::test]
async fn each_kind_of_refusal_fits_the_errors_schema_of_its_status() {
    let doc = document().await;
    let big = format!("title = \"{}\"", "x".repeat(web::BODY_LIMIT));
    let cases: [(&str, String, u16); 5] = [
        ("application/json", "{\n  oops".into(), 400),
        ("application/toml", "title = \n".into(), 400),
        ("application/toml", big, 413),
        ("image/png", "x".into(), 415),
        (
            "application/json",
            r#"{"title": "t", "extra": 1}"#.into(),
            422,
        ),
    ];
    for (media, body, status) in cases {
        let a = send(Method::POST, "/api/v1/check", Some(media), body).await;
        assert_eq!(a.status.as_u16(), status, "{media}: {}", a.body);
        assert!(a.content_type.starts_with("application/json"));
        let schema = response_schema(&doc, "post", "/api/v1/check", status);
        let wrong = violations(&doc, schema, &a.body);
        assert!(wrong.is_empty(), "{status}: {wrong:#?}");
    }
}

#[tokio::test]
async fn the_checker_refuses_what_the_document_does_not_allow() {
    let doc = document().await;
    let schema = response_schema(&doc, "post", "/api/v1/check", 200);
    let sheet = demo::DEMOS[0].text.to_string();
    let good = send(
        Method::POST,
        "/api/v1/check",
        Some("application/toml"),
        sheet,
    )
    .await
    .body;
    assert!(violations(&doc, schema, &good).is_empty());

    let spoil = |pointer: &str, to: Option<Value>| {
        let mut v = good.clone();
        let (parent, key) = pointer.rsplit_once('/').unwrap();
        let obj = v.pointer_mut(parent).unwrap().as_object_mut().unwrap();
        match to {
            Some(x) => obj.insert(key.to_string(), x),
            None => obj.remove(key),
        };
        v
    };
    let bad = [
        spoil("/findings/0/figures/0/value", Some(Value::Null)), // a NaN, as serde_json writes it
        spoil("/findings/0/figures/0/tier", Some(Value::Null)),
        spoil("/findings/0/figures/0/tier", Some(json!("PhysicalLimit"))),
        spoil("/verdict", Some(json!("not_assessed"))),
        spoil("/findings/0/rule", Some(json!("no-such-rule"))),
        spoil("/findings/0/headline", None),
        spoil("/schema", Some(json!("liftaudit.report/2"))),
        spoil("/extra", Some(json!(1))),
    ];
    for (i, v) in bad.iter().enumerate() {
        assert!(
            !violations(&doc, schema, v).is_empty(),
            "spoiled report {i} passed the checker"
        );
    }
}
