//! The web service over HTTP: routes, error paths, escaping, limits, headers.
//! Most tests hand requests straight to the router (`tower::ServiceExt::oneshot`);
//! the last ones go through a real socket on 127.0.0.1:0.

mod common;

use std::sync::OnceLock;
use std::time::Duration;

use axum::body::Body;
use axum::http::{header, HeaderMap, Method, Request, StatusCode};
use axum::Router;
use http_body_util::BodyExt;
use tokio::io::{AsyncReadExt, AsyncWriteExt};
use tower::ServiceExt;

use liftaudit::catalog::{self, tiers};
use liftaudit::claim::{self, demo};
use liftaudit::rules;
use liftaudit::sources;
use liftaudit::web;

/// One router for the whole file: building it checks every demo, which is
/// the slow part in a debug build.
fn app() -> Router {
    static APP: OnceLock<Router> = OnceLock::new();
    APP.get_or_init(|| web::app(web::AppState::load(web::Config::default())))
        .clone()
}

struct Answer {
    status: StatusCode,
    headers: HeaderMap,
    body: String,
}

impl Answer {
    fn json(&self) -> serde_json::Value {
        serde_json::from_str(&self.body).unwrap_or_else(|e| panic!("{e}: {}", self.body))
    }
}

async fn send(req: Request<Body>) -> Answer {
    let res = app().oneshot(req).await.expect("the router answers");
    let status = res.status();
    let headers = res.headers().clone();
    let bytes = res.into_body().collect().await.expect("body").to_bytes();
    Answer {
        status,
        headers,
        body: String::from_utf8_lossy(&bytes).into_owned(),
    }
}

async fn get(path: &str) -> Answer {
    send(Request::get(path).body(Body::empty()).unwrap()).await
}

async fn post(path: &str, content_type: &str, body: impl Into<Body>) -> Answer {
    send(
        Request::builder()
            .method(Method::POST)
            .uri(path)
            .header(header::CONTENT_TYPE, content_type)
            .body(body.into())
            .unwrap(),
    )
    .await
}

/// `application/x-www-form-urlencoded` (WHATWG URL standard) of some pairs.
fn urlencoded(pairs: &[(&str, &str)]) -> String {
    fn enc(s: &str) -> String {
        s.bytes()
            .map(|b| match b {
                b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'_' | b'.' | b'*' => {
                    (b as char).to_string()
                }
                b' ' => "+".to_string(),
                b => format!("%{b:02X}"),
            })
            .collect()
    }
    pairs
        .iter()
        .map(|(k, v)| format!("{}={}", enc(k), enc(v)))
        .collect::<Vec<_>>()
        .join("&")
}

const FORM: &str = "application/x-www-form-urlencoded";

fn hover_lamp() -> &'static demo::Demo {
    demo::find("hover-lamp").expect("the hover-lamp demo")
}

fn verdict_id_of(sheet: &str) -> &'static str {
    rules::run_all(&claim::parse_any(sheet).expect("sheet parses"))
        .verdict
        .id()
}

/// The overall verdict a verdict page states.
fn page_verdict(html: &str) -> Option<&str> {
    let at = html.find("data-verdict=\"")? + "data-verdict=\"".len();
    html[at..].split('"').next()
}

// ---- pages ----------------------------------------------------------------

#[tokio::test]
async fn the_form_lists_every_demo_as_a_preset_and_offers_the_blank_sheet() {
    let a = get("/").await;
    assert_eq!(a.status, StatusCode::OK);
    assert!(a.headers[header::CONTENT_TYPE]
        .to_str()
        .unwrap()
        .starts_with("text/html"));
    for d in demo::DEMOS {
        assert!(
            a.body
                .contains(&format!("href=\"/?demo={}#sheet\"", d.name)),
            "{}",
            d.name
        );
        assert!(a.body.contains(&format!("href=\"/demo/{}\"", d.name)));
    }
    assert!(a.body.contains("name=\"sheet\""));
    assert!(a.body.contains("enctype=\"multipart/form-data\""));
    assert!(a.body.contains("href=\"/sheet-template.toml\""));
}

#[tokio::test]
async fn the_blank_sheet_downloads_and_reads_as_a_claim() {
    let a = get("/sheet-template.toml").await;
    assert_eq!(a.status, StatusCode::OK);
    assert!(a.headers[header::CONTENT_DISPOSITION]
        .to_str()
        .unwrap()
        .starts_with("attachment"));
    let claim = claim::parse(&a.body, claim::Format::Toml).expect("the blank sheet parses");
    assert_eq!(claim.rotors.count, 4);
}

#[tokio::test]
async fn a_preset_round_trips_through_the_form_to_the_same_verdict_as_the_engine() {
    let d = hover_lamp();
    let form = get(&format!("/?demo={}", d.name)).await;
    assert_eq!(form.status, StatusCode::OK);
    // The sheet box holds the demo, HTML-escaped.
    assert!(
        form.body.contains("title = &#34;Floating desk lamp")
            || form.body.contains("title = &quot;Floating desk lamp")
    );

    let page = post(
        "/check",
        FORM,
        urlencoded(&[("from", "sheet"), ("sheet", d.text)]),
    )
    .await;
    assert_eq!(page.status, StatusCode::OK);
    assert_eq!(page_verdict(&page.body), Some(verdict_id_of(d.text)));
    // Both downloads post the page's one copy of the sheet.
    assert_eq!(page.body.matches("name=\"sheet\"").count(), 1);
    assert!(page.body.contains("action=\"/download/report.json\""));
    assert!(page.body.contains("formaction=\"/download/sheet.toml\""));
    let demo_page = get(&format!("/demo/{}", d.name)).await;
    assert_eq!(page_verdict(&demo_page.body), page_verdict(&page.body));
}

#[tokio::test]
async fn every_demo_page_shows_its_verdict_findings_links_and_cautions() {
    for d in demo::DEMOS {
        let claim = claim::parse_any(d.text).unwrap();
        let report = rules::run_all(&claim);
        let a = get(&format!("/demo/{}", d.name)).await;
        assert_eq!(a.status, StatusCode::OK, "{}", d.name);
        assert_eq!(
            page_verdict(&a.body),
            Some(report.verdict.id()),
            "{}",
            d.name
        );
        for f in &report.findings {
            assert!(
                a.body.contains(&format!("id=\"finding-{}\"", f.rule)),
                "{}",
                d.name
            );
            assert!(a
                .body
                .contains(&format!("href=\"/methods#rule-{}\"", f.rule)));
            for s in f.sources {
                assert!(
                    a.body.contains(&format!("href=\"/methods#source-{s}\"")),
                    "{s}"
                );
            }
        }
        for c in liftaudit::report::CAUTIONS {
            let start: String = c.chars().take(24).collect();
            assert!(a.body.contains(&start), "caution missing on {}", d.name);
        }
        // The rotor layout always comes from the sheet; no inline style or script.
        assert!(a.body.contains("id=\"fig-layout\""));
        // A claimed tolerance of rotor failure gets the stopped-rotor drawing.
        assert_eq!(
            a.body.contains("id=\"fig-failure\""),
            claim.claim.survives_rotor_failure > 0,
            "{}",
            d.name
        );
        assert!(a.body.matches("<svg xmlns").count() >= 1);
        assert!(!a.body.contains("style=\""), "inline style on {}", d.name);
        assert!(!a.body.contains("<script"), "script on {}", d.name);
        assert!(!a.body.contains("<style"), "style element on {}", d.name);
    }
}

#[tokio::test]
async fn a_demo_offers_its_report_and_sheet_for_download() {
    let d = hover_lamp();
    let report = get(&format!("/demo/{}/report.json", d.name)).await;
    assert_eq!(report.status, StatusCode::OK);
    assert_eq!(report.json()["schema"], "liftaudit.report/1");
    assert_eq!(report.json()["verdict"], verdict_id_of(d.text));
    let sheet = get(&format!("/demo/{}/sheet.toml", d.name)).await;
    assert_eq!(sheet.body, d.text);
    assert!(sheet.headers[header::CONTENT_DISPOSITION]
        .to_str()
        .unwrap()
        .contains("hover-lamp.toml"));
    assert_eq!(
        get("/demo/no-such-demo/report.json").await.status,
        StatusCode::NOT_FOUND
    );
}

#[tokio::test]
async fn a_submitted_sheet_comes_back_as_report_and_sheet_downloads() {
    let d = hover_lamp();
    let report = post(
        "/download/report.json",
        FORM,
        urlencoded(&[("sheet", d.text)]),
    )
    .await;
    assert_eq!(report.status, StatusCode::OK);
    assert_eq!(report.json()["verdict"], verdict_id_of(d.text));
    let sheet = post(
        "/download/sheet.toml",
        FORM,
        urlencoded(&[("sheet", d.text)]),
    )
    .await;
    assert_eq!(sheet.body, d.text);
    assert!(sheet.headers[header::CONTENT_DISPOSITION]
        .to_str()
        .unwrap()
        .starts_with("attachment"));
}

#[tokio::test]
async fn an_uploaded_file_is_checked_like_a_pasted_sheet() {
    let d = hover_lamp();
    let boundary = "liftaudit-test-boundary";
    let body = format!(
        "--{b}\r\nContent-Disposition: form-data; name=\"sheet\"\r\n\r\n\r\n\
         --{b}\r\nContent-Disposition: form-data; name=\"sheet\"; filename=\"lamp.toml\"\r\n\
         Content-Type: application/toml\r\n\r\n{text}\r\n\
         --{b}\r\nContent-Disposition: form-data; name=\"from\"\r\n\r\nsheet\r\n--{b}--\r\n",
        b = boundary,
        text = d.text
    );
    let a = post(
        "/check",
        &format!("multipart/form-data; boundary={boundary}"),
        body,
    )
    .await;
    assert_eq!(a.status, StatusCode::OK, "{}", a.body);
    assert_eq!(page_verdict(&a.body), Some(verdict_id_of(d.text)));
}

/// A multipart form body: (field name, file name if a file, content).
fn multipart(parts: &[(&str, Option<&str>, &str)]) -> (String, String) {
    let b = "liftaudit-test-boundary";
    let mut body = String::new();
    for (name, file, content) in parts {
        body += &format!("--{b}\r\nContent-Disposition: form-data; name=\"{name}\"");
        if let Some(file) = file {
            body += &format!("; filename=\"{file}\"\r\nContent-Type: application/toml");
        }
        body += &format!("\r\n\r\n{content}\r\n");
    }
    body += &format!("--{b}--\r\n");
    (format!("multipart/form-data; boundary={b}"), body)
}

#[tokio::test]
async fn several_uploaded_sheets_are_refused_with_their_names() {
    let d = hover_lamp();
    let (kind, body) = multipart(&[
        ("sheet", Some("lamp.toml"), d.text),
        ("sheet", Some("quad.toml"), d.text),
        ("from", None, "sheet"),
    ]);
    let a = post("/check", &kind, body).await;
    assert_eq!(a.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        a.body.contains(
            "2 sheet files were uploaded (lamp.toml, quad.toml); upload one file at a time."
        ),
        "{}",
        a.body
    );
}

#[tokio::test]
async fn a_file_beside_a_filled_sheet_box_is_the_one_checked_and_the_page_says_so() {
    let d = hover_lamp();
    let other = crate_demo("classroom-quad");
    let (kind, body) = multipart(&[
        ("sheet", None, other),
        ("sheet", Some("lamp.toml"), d.text),
        ("from", None, "sheet"),
    ]);
    let a = post("/check", &kind, body).await;
    assert_eq!(a.status, StatusCode::OK, "{}", a.body);
    assert_eq!(page_verdict(&a.body), Some(verdict_id_of(d.text)));
    assert!(
        a.body.contains("The uploaded file &#39;lamp.toml&#39; was checked; the sheet pasted in the box was not used."),
        "{}",
        a.body
    );
}

fn crate_demo(name: &str) -> &'static str {
    demo::find(name).expect("a demo of that name").text
}

#[tokio::test]
async fn a_refused_sheet_comes_back_in_the_form_with_each_field_error() {
    let sheet = "title = \"Bad one\"\n[craft]\nmass = \"55 mm\"\n[rotors]\ncount = 2\ndiameter = \"55 g\"\n";
    let a = post(
        "/check",
        FORM,
        urlencoded(&[("from", "sheet"), ("sheet", sheet)]),
    )
    .await;
    assert_eq!(a.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(a.body.contains("craft.mass: expected a mass"), "{}", a.body);
    assert!(a.body.contains("rotors.diameter: expected a length"));
    // The sheet is kept, escaped, in its box.
    assert!(
        a.body.contains("mass = &#34;55 mm&#34;") || a.body.contains("mass = &quot;55 mm&quot;")
    );
}

#[tokio::test]
async fn a_sheet_that_is_not_toml_comes_back_with_its_line_and_column() {
    let a = post(
        "/check",
        FORM,
        urlencoded(&[("sheet", "title = \"x\"\n[craft\n")]),
    )
    .await;
    assert_eq!(a.status, StatusCode::BAD_REQUEST);
    assert!(a.body.contains("line 2"), "{}", a.body);
    let empty = post(
        "/check",
        FORM,
        urlencoded(&[("from", "sheet"), ("sheet", "  ")]),
    )
    .await;
    assert_eq!(empty.status, StatusCode::UNPROCESSABLE_ENTITY);
}

#[tokio::test]
async fn the_fields_make_a_sheet_and_their_errors_sit_beside_them() {
    let good = post(
        "/check",
        FORM,
        urlencoded(&[
            ("from", "fields"),
            ("title", "Field-built quad"),
            ("craft.mass", "250 g"),
            ("rotors.count", "4"),
            ("rotors.layout", "quad-x"),
            ("rotors.motor", "brushless-1404"),
            ("rotors.diameter", "76 mm"),
            ("sensing.gyroscope", "yes"),
        ]),
    )
    .await;
    assert_eq!(good.status, StatusCode::OK, "{}", good.body);
    assert!(good.body.contains("Field-built quad"));
    assert!(page_verdict(&good.body).is_some());

    let bad = post(
        "/check",
        FORM,
        urlencoded(&[
            ("from", "fields"),
            ("title", "Kept title"),
            ("craft.mass", "heavy"),
            ("rotors.count", "4"),
        ]),
    )
    .await;
    assert_eq!(bad.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(bad.body.contains("id=\"craft-mass-error\""), "{}", bad.body);
    assert!(bad.body.contains("value=\"Kept title\""));
    assert!(bad.body.contains("value=\"heavy\""));
}

#[tokio::test]
async fn a_hostile_title_is_escaped_everywhere_it_is_shown() {
    let hostile = "<script>alert('x')</script><img src=x onerror=alert(1)>";
    let sheet = format!(
        "title = \"{hostile}\"\nsource = \"</textarea><b>bold</b>\"\n[craft]\nmass = \"300 g\"\n[rotors]\ncount = 4\n"
    );
    let page = post("/check", FORM, urlencoded(&[("sheet", &sheet)])).await;
    assert_eq!(page.status, StatusCode::OK, "{}", page.body);
    assert!(!page.body.contains("<script>alert"));
    assert!(!page.body.contains("<img src=x"));
    assert!(!page.body.contains("</textarea><b>"));
    // Askama writes numeric character references (HTML 5.2 section 8.1.4).
    assert!(page
        .body
        .contains("<h1>&#60;script&#62;alert(&#39;x&#39;)&#60;/script&#62;"));

    // Kept in the form after a refusal, the text still cannot close the box.
    let refused = format!("{sheet}\n[nonsense]\nx = 1\n");
    let form = post("/check", FORM, urlencoded(&[("sheet", &refused)])).await;
    assert_eq!(form.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(!form.body.contains("</textarea><b>"));
    assert!(!form.body.contains("<script>alert"));
}

#[tokio::test]
async fn the_methods_page_prints_every_rule_tier_row_and_source_with_anchors() {
    let a = get("/methods").await;
    assert_eq!(a.status, StatusCode::OK);
    assert!(!rules::REGISTRY.is_empty());
    for r in rules::REGISTRY {
        assert!(
            a.body.contains(&format!("id=\"rule-{}\"", r.id)),
            "{}",
            r.id
        );
        assert!(a.body.contains(r.title));
    }
    for row in tiers::TABLE {
        assert!(
            a.body.contains(&format!("id=\"tier-{}\"", row.key)),
            "{}",
            row.key
        );
    }
    for s in sources::SOURCES {
        assert!(
            a.body.contains(&format!("id=\"source-{}\"", s.id)),
            "{}",
            s.id
        );
    }
}

#[tokio::test]
async fn unknown_paths_get_a_real_404_page_and_json_under_the_api() {
    let a = get("/no/such/page").await;
    assert_eq!(a.status, StatusCode::NOT_FOUND);
    assert!(a.body.contains("<h1>404"), "{}", a.body);
    assert!(get("/demo/no-such-demo").await.status == StatusCode::NOT_FOUND);
    assert!(get("/?demo=no-such-demo").await.status == StatusCode::NOT_FOUND);
    assert!(get("/static/secret.txt").await.status == StatusCode::NOT_FOUND);
    let api = get("/api/v2/check").await;
    assert_eq!(api.status, StatusCode::NOT_FOUND);
    assert!(api.json()["errors"][0]["message"].is_string());
}

#[tokio::test]
async fn a_method_an_address_does_not_take_is_405_with_its_allow_and_a_body() {
    // RFC 9110 section 15.5.6: a 405 carries Allow.
    let api = get("/api/v1/check").await;
    assert_eq!(api.status, StatusCode::METHOD_NOT_ALLOWED);
    assert!(api.headers[header::ALLOW]
        .to_str()
        .unwrap()
        .contains("POST"));
    assert!(api.json()["errors"][0]["message"].is_string());
    let page = post("/methods", "text/plain", "x").await;
    assert_eq!(page.status, StatusCode::METHOD_NOT_ALLOWED);
    assert!(page.headers.contains_key(header::ALLOW));
    assert!(page.body.contains("<h1>405"), "{}", page.body);
}

#[tokio::test]
async fn health_and_static_files_answer_with_cache_headers() {
    let h = get("/healthz").await;
    assert_eq!(h.status, StatusCode::OK);
    assert_eq!(h.json()["status"], "ok");
    assert_eq!(h.json()["demos"], demo::DEMOS.len());
    let css = get("/static/style.css").await;
    assert_eq!(css.status, StatusCode::OK);
    assert!(css.headers[header::CONTENT_TYPE]
        .to_str()
        .unwrap()
        .starts_with("text/css"));
    assert!(css.headers[header::CACHE_CONTROL]
        .to_str()
        .unwrap()
        .contains("max-age="));
}

#[tokio::test]
async fn every_answer_carries_the_security_headers() {
    let big = "x".repeat(web::BODY_LIMIT + 1);
    let answers = [
        get("/").await,
        get("/no/such/page").await,
        post("/api/v1/check", "application/json", "{").await,
        post("/api/v1/check", "application/toml", big).await,
    ];
    for a in answers {
        let csp = a.headers[header::CONTENT_SECURITY_POLICY].to_str().unwrap();
        assert!(csp.contains("frame-ancestors 'none'"), "{}", a.status);
        assert!(csp.contains("script-src 'self'") && !csp.contains("unsafe-inline"));
        assert_eq!(a.headers[header::X_CONTENT_TYPE_OPTIONS], "nosniff");
        assert!(a.headers.contains_key(header::REFERRER_POLICY));
    }
}

#[tokio::test]
async fn the_router_serves_the_state_it_is_handed() {
    // A state built here, with no demos: the router answers from it alone.
    let state = web::AppState {
        config: web::Config::default(),
        demos: Vec::new(),
        openapi: axum::body::Bytes::from_static(b"{}"),
    };
    let router = web::app(state);
    let health = router
        .clone()
        .oneshot(Request::get("/healthz").body(Body::empty()).unwrap())
        .await
        .unwrap();
    let bytes = health.into_body().collect().await.unwrap().to_bytes();
    let v: serde_json::Value = serde_json::from_slice(&bytes).unwrap();
    assert_eq!(v["demos"], 0);
    let page = router
        .oneshot(
            Request::get(format!("/demo/{}", hover_lamp().name))
                .body(Body::empty())
                .unwrap(),
        )
        .await
        .unwrap();
    assert_eq!(page.status(), StatusCode::NOT_FOUND);
}

// ---- API ------------------------------------------------------------------

#[tokio::test]
async fn the_api_checks_a_toml_sheet_and_a_json_sheet_alike() {
    let d = hover_lamp();
    let toml_answer = post("/api/v1/check", "application/toml", d.text).await;
    assert_eq!(toml_answer.status, StatusCode::OK);
    let from_toml = toml_answer.json();
    assert_eq!(from_toml["schema"], "liftaudit.report/1");
    assert_eq!(from_toml["verdict"], verdict_id_of(d.text));

    let value: toml::Value = toml::from_str(d.text).unwrap();
    let json_sheet = serde_json::to_string(&value).unwrap();
    let json_answer = post("/api/v1/check", "application/json", json_sheet).await;
    assert_eq!(json_answer.status, StatusCode::OK, "{}", json_answer.body);
    assert_eq!(json_answer.json(), from_toml);
}

#[tokio::test]
async fn the_api_names_each_refused_field() {
    let a = post(
        "/api/v1/check",
        "application/json",
        r#"{"title": "t", "craft": {"mass": "55 mm"}, "rotors": {"count": 2}, "extra": 1}"#,
    )
    .await;
    assert_eq!(a.status, StatusCode::UNPROCESSABLE_ENTITY);
    let fields: Vec<String> = a.json()["errors"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["field"].as_str().unwrap_or("").to_string())
        .collect();
    assert!(fields.iter().any(|f| f == "craft.mass"), "{fields:?}");
    assert!(fields.iter().any(|f| f == "extra"), "{fields:?}");
}

#[tokio::test]
async fn broken_json_or_toml_is_a_bad_request_with_line_and_column() {
    let a = post(
        "/api/v1/check",
        "application/json",
        "{\n  \"title\": \"t\",\n  oops\n}",
    )
    .await;
    assert_eq!(a.status, StatusCode::BAD_REQUEST);
    assert_eq!(a.json()["errors"][0]["line"], 3);
    assert!(a.json()["errors"][0]["column"].as_u64().is_some());
    let t = post("/api/v1/check", "application/toml", "title = \n").await;
    assert_eq!(t.status, StatusCode::BAD_REQUEST);
    assert_eq!(t.json()["errors"][0]["line"], 1);
}

#[tokio::test]
async fn the_api_refuses_other_media_types_and_bytes_that_are_not_text() {
    let a = post("/api/v1/check", "image/png", "x").await;
    assert_eq!(a.status, StatusCode::UNSUPPORTED_MEDIA_TYPE);
    let b = post(
        "/api/v1/check",
        "application/toml",
        vec![0xff_u8, 0xfe, 0x00],
    )
    .await;
    assert_eq!(b.status, StatusCode::BAD_REQUEST);
    assert!(b.json()["errors"][0]["message"]
        .as_str()
        .unwrap()
        .contains("UTF-8"));
}

#[tokio::test]
async fn bodies_over_one_mebibyte_are_refused_with_413() {
    let big = format!("title = \"{}\"", "x".repeat(web::BODY_LIMIT));
    assert_eq!(
        post("/api/v1/check", "application/toml", big.clone())
            .await
            .status,
        StatusCode::PAYLOAD_TOO_LARGE
    );
    let form = urlencoded(&[("sheet", &big)]);
    assert_eq!(
        post("/check", FORM, form).await.status,
        StatusCode::PAYLOAD_TOO_LARGE
    );
    // Just under the limit is read (and refused for what it says, not its size).
    let under = format!("title = \"{}\"", "x".repeat(1000));
    assert_ne!(
        post("/api/v1/check", "application/toml", under)
            .await
            .status,
        StatusCode::PAYLOAD_TOO_LARGE
    );
}

#[tokio::test]
async fn the_catalog_lists_motors_chemistries_and_the_tier_table() {
    let a = get("/api/v1/catalog").await;
    assert_eq!(a.status, StatusCode::OK);
    let v = a.json();
    assert_eq!(v["motors"].as_array().unwrap().len(), catalog::MOTORS.len());
    assert_eq!(v["motors"][0]["id"], catalog::MOTORS[0].id);
    assert!(v["motors"][0]["basis"]["kind"].is_string());
    assert_eq!(
        v["chemistries"].as_array().unwrap().len(),
        catalog::CHEMISTRIES.len()
    );
    let tier_ids: Vec<&str> = v["tiers"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| t["id"].as_str().unwrap())
        .collect();
    assert_eq!(tier_ids, ["physical-limit", "best-practice", "typical"]);
    let table = v["tier_table"].as_array().unwrap();
    assert_eq!(table.len(), tiers::TABLE.len());
    assert_eq!(table[0]["values"].as_array().unwrap().len(), 3);
}

#[tokio::test]
async fn hostile_requests_never_get_a_server_error() {
    let sheets = [
        "",
        "\u{0}\u{0}",
        "{",
        "[[[[[[[[[[",
        "title = 1e999",
        "title = \"t\"\n[craft]\nmass = \"1e308 kg\"\n[rotors]\ncount = 4",
        "title = \"t\"\n[craft]\nmass = \"NaN g\"\n[rotors]\ncount = 99999999999",
        "title = \"t\"\n[craft]\nmass = \"-5 g\"\n[rotors]\ncount = -1\nlayout = \"custom\"",
        "{\"title\": \"t\", \"craft\": {\"mass\": \"300 g\"}, \"rotors\": {\"count\": 4, \"at\": [1, 2]}}",
        "title = \"\u{202e}\u{fffd}\"\n[craft]\nmass = \"0.000001 g\"\n[rotors]\ncount = 64\ndiameter = \"5 m\"",
    ];
    for s in sheets {
        for (path, ct) in [
            ("/api/v1/check", "application/toml"),
            ("/api/v1/check", "application/json"),
        ] {
            let a = post(path, ct, s.to_string()).await;
            assert!(
                a.status.is_success() || a.status.is_client_error(),
                "{} for {s:?}",
                a.status
            );
        }
        let a = post("/check", FORM, urlencoded(&[("sheet", s)])).await;
        assert!(
            a.status.is_success() || a.status.is_client_error(),
            "{} for {s:?}",
            a.status
        );
    }
    let a = post("/check", "multipart/form-data; boundary=x", "--x\r\nbroken").await;
    assert!(a.status.is_client_error(), "{}", a.status);
}

// ---- over a real socket ---------------------------------------------------

async fn raw(addr: std::net::SocketAddr, request: &[u8]) -> String {
    let mut stream = tokio::net::TcpStream::connect(addr).await.expect("connect");
    stream.write_all(request).await.expect("write");
    let mut out = Vec::new();
    let _ = tokio::time::timeout(Duration::from_secs(5), stream.read_to_end(&mut out)).await;
    String::from_utf8_lossy(&out).into_owned()
}

#[tokio::test]
async fn a_real_socket_serves_the_form_and_refuses_a_declared_oversize_body_early() {
    let addr = common::spawn_app().await;
    let page = raw(
        addr,
        b"GET / HTTP/1.1\r\nHost: t\r\nConnection: close\r\n\r\n",
    )
    .await;
    assert!(page.starts_with("HTTP/1.1 200"), "{page}");
    assert!(page
        .to_ascii_lowercase()
        .contains("x-content-type-options: nosniff"));

    // Content-Length over the limit: answered 413 without the body being sent.
    let head = format!(
        "POST /api/v1/check HTTP/1.1\r\nHost: t\r\nContent-Type: application/toml\r\nContent-Length: {}\r\nConnection: close\r\n\r\n",
        2 * web::BODY_LIMIT
    );
    let answer = raw(addr, head.as_bytes()).await;
    assert!(answer.starts_with("HTTP/1.1 413"), "{answer}");
    // ... with the JSON errors body the OpenAPI document gives for 413, as a
    // body that is read and found too long gets.
    let lower = answer.to_ascii_lowercase();
    assert!(lower.contains("content-type: application/json"), "{answer}");
    let body = answer.split("\r\n\r\n").nth(1).unwrap_or("");
    let v: serde_json::Value =
        serde_json::from_str(body).unwrap_or_else(|e| panic!("{e}: {answer}"));
    assert!(v["errors"][0]["message"].as_str().unwrap().contains("KiB"));

    // The form gets the error page, not a line of plain text.
    let head = format!(
        "POST /check HTTP/1.1\r\nHost: t\r\nContent-Type: {FORM}\r\nContent-Length: {}\r\nConnection: close\r\n\r\n",
        2 * web::BODY_LIMIT
    );
    let page = raw(addr, head.as_bytes()).await;
    assert!(page.starts_with("HTTP/1.1 413"), "{page}");
    assert!(
        page.to_ascii_lowercase()
            .contains("content-type: text/html"),
        "{page}"
    );
    assert!(page.contains("<h1>413"), "{page}");
}

#[tokio::test]
async fn a_request_that_stalls_is_cut_off_by_the_timeout() {
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let addr = listener.local_addr().unwrap();
    let config = web::Config {
        request_timeout: Duration::from_millis(300),
        ..web::Config::default()
    };
    tokio::spawn(async move { axum::serve(listener, web::app(web::AppState::load(config))).await });
    // Promises 100 bytes of body and sends 10.
    let answer = raw(
        addr,
        b"POST /api/v1/check HTTP/1.1\r\nHost: t\r\nContent-Type: application/toml\r\nContent-Length: 100\r\n\r\ntitle = \"x",
    )
    .await;
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
}
