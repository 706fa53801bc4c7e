//! The HTML pages: the form, the verdict, the methods, not found.

use std::collections::HashMap;

use askama::Template;
use axum::body::Bytes;
use axum::extract::{FromRequest, Multipart, Path, Query, Request, State};
use axum::http::{header, StatusCode, Uri};
use axum::response::{Html, IntoResponse, Response};

use crate::claim::{self, demo};
use crate::rules;

use super::error::{ApiError, Error};
use super::form::{self, FormView};
use super::view::{DemoLink, Downloads, IndexPage, MethodsPage, VerdictPage};
use super::SharedState;

fn index_page(state: &SharedState, form: FormView, picked: Option<&'static str>) -> IndexPage {
    IndexPage {
        form,
        demos: state.demos.iter().map(DemoLink::of).collect(),
        picked,
    }
}

/// `GET /`: the claim form; `?demo=name` puts a demo's sheet in the sheet box.
pub async fn index(
    State(state): State<SharedState>,
    Query(query): Query<HashMap<String, String>>,
) -> Result<Html<String>, Error> {
    let (sheet, picked) = match query.get("demo") {
        Some(name) => {
            let d = state.demo(name).ok_or(Error::NotFound)?;
            (d.demo.text.to_string(), Some(d.demo.name))
        }
        None => (String::new(), None),
    };
    let page = index_page(&state, FormView::with_sheet(sheet), picked);
    Ok(Html(page.render()?))
}

const FORM_TYPE: &str = "application/x-www-form-urlencoded";
const MULTIPART_TYPE: &str = "multipart/form-data";

/// What the form sends: the pressed button (`from`), the sheet box or upload,
/// and the fields.
pub struct Submission {
    pub from: Option<String>,
    pub sheet: String,
    pub fields: HashMap<String, String>,
    /// The sheet files uploaded (name and text), empty ones left out.
    pub files: Vec<(String, String)>,
}

/// A failed read of the request body as the error it stands for.
fn body_failure<E: std::error::Error + 'static>(status: StatusCode, text: String, e: &E) -> Error {
    Error::from_body_failure(status, text, e)
}

impl<S: Send + Sync> FromRequest<S> for Submission {
    type Rejection = Error;

    /// Reads either encoding a browser sends: multipart (the form, which can
    /// upload a file) or urlencoded (a form without the upload, or curl).
    /// Media types are compared without regard to case (RFC 9110 section 8.3.1).
    async fn from_request(req: Request, state: &S) -> Result<Submission, Error> {
        let media_type = req
            .headers()
            .get(header::CONTENT_TYPE)
            .map(|v| super::media_type(v).to_ascii_lowercase());
        let mut sub = Submission {
            from: None,
            sheet: String::new(),
            fields: HashMap::new(),
            files: Vec::new(),
        };
        match media_type.as_deref() {
            Some(MULTIPART_TYPE) => {
                let mut parts = Multipart::from_request(req, state)
                    .await
                    .map_err(|e| body_failure(e.status(), e.body_text(), &e))?;
                while let Some(part) = parts
                    .next_field()
                    .await
                    .map_err(|e| body_failure(e.status(), e.body_text(), &e))?
                {
                    let name = part.name().unwrap_or("").to_string();
                    let file_name = part.file_name().map(str::to_string);
                    let bytes = part
                        .bytes()
                        .await
                        .map_err(|e| body_failure(e.status(), e.body_text(), &e))?;
                    let text = String::from_utf8(bytes.to_vec()).map_err(|_| {
                        Error::BadRequest(format!("the field '{name}' is not UTF-8 text"))
                    })?;
                    match (name.as_str(), file_name) {
                        ("sheet", Some(file)) => {
                            if !text.trim().is_empty() {
                                sub.files.push((file, text));
                            }
                        }
                        ("sheet", None) => sub.sheet = text,
                        ("from", _) => sub.from = Some(text),
                        _ => {
                            sub.fields.insert(name, text);
                        }
                    }
                }
            }
            Some(FORM_TYPE) => {
                let body = Bytes::from_request(req, state)
                    .await
                    .map_err(|e| body_failure(e.status(), e.body_text(), &e))?;
                // Split and decoded as the WHATWG URL standard says (section 5.1):
                // `+` is a space, `%XX` a byte, U+FFFD for what is not UTF-8.
                for (name, value) in form_urlencoded::parse(&body) {
                    match &*name {
                        "sheet" => sub.sheet = value.into_owned(),
                        "from" => sub.from = Some(value.into_owned()),
                        _ => {
                            sub.fields.insert(name.into_owned(), value.into_owned());
                        }
                    }
                }
            }
            _ => {
                return Err(Error::BadRequest(format!(
                    "Form requests must have `Content-Type: {FORM_TYPE}` or `{MULTIPART_TYPE}`"
                )))
            }
        }
        Ok(sub)
    }
}

/// The form refused with one message at the sheet box (422).
fn sheet_refused(state: &SharedState, sheet: String, message: String) -> Result<Response, Error> {
    let page = index_page(state, FormView::sheet_refused(sheet, vec![message]), None);
    Ok((StatusCode::UNPROCESSABLE_ENTITY, Html(page.render()?)).into_response())
}

/// `POST /check`: the verdict page for the sheet, or the form again with
/// the input kept and every error beside what it is about.
pub async fn check(
    State(state): State<SharedState>,
    mut sub: Submission,
) -> Result<Response, Error> {
    if sub.files.len() > 1 {
        let names: Vec<&str> = sub.files.iter().map(|(name, _)| name.as_str()).collect();
        let message = format!(
            "{} sheet files were uploaded ({}); upload one file at a time.",
            names.len(),
            names.join(", ")
        );
        return sheet_refused(&state, sub.sheet, message);
    }
    // An uploaded file is checked rather than the sheet box; the page says so
    // when the box held a sheet too.
    let mut note = None;
    if let Some((name, text)) = sub.files.pop() {
        if !sub.sheet.trim().is_empty() && sub.sheet != text {
            note = Some(format!(
                "The uploaded file '{name}' was checked; the sheet pasted in the box was not used."
            ));
        }
        sub.sheet = text;
    }
    // Enter in a text input presses the first button (`from=sheet`), so an
    // empty sheet box with filled fields means the fields.
    let fields_filled = sub.fields.values().any(|v| !v.trim().is_empty());
    let use_fields =
        sub.from.as_deref() == Some("fields") || (sub.sheet.trim().is_empty() && fields_filled);
    if use_fields {
        let refused = |errors: &[claim::FieldError], status| -> Result<Response, Error> {
            let page = index_page(&state, FormView::fields_refused(&sub.fields, errors), None);
            Ok((status, Html(page.render()?)).into_response())
        };
        let sheet = match form::sheet_from_fields(&sub.fields) {
            Ok(sheet) => sheet,
            Err(errors) => return refused(&errors, StatusCode::UNPROCESSABLE_ENTITY),
        };
        return match claim::parse(&sheet, claim::Format::Toml) {
            Ok(c) => verdict(
                &c,
                Downloads {
                    demo: None,
                    sheet,
                    note: None,
                },
            ),
            Err(claim::Error::Invalid(errors)) => {
                refused(&errors, StatusCode::UNPROCESSABLE_ENTITY)
            }
            Err(e) => Err(Error::internal("the form made a sheet that is not TOML", e)),
        };
    }
    if sub.sheet.trim().is_empty() {
        return sheet_refused(
            &state,
            String::new(),
            "The sheet is empty: paste a claim sheet, upload one, or fill in the fields below and use their button.".into(),
        );
    }
    match claim::parse_any(&sub.sheet) {
        Ok(c) => verdict(
            &c,
            Downloads {
                demo: None,
                sheet: sub.sheet,
                note,
            },
        ),
        Err(e) => {
            let status = Error::Sheet(e.clone()).status();
            let errors = match e {
                claim::Error::Invalid(fields) => fields.iter().map(|f| f.to_string()).collect(),
                syntax => vec![syntax.to_string()],
            };
            let page = index_page(&state, FormView::sheet_refused(sub.sheet, errors), None);
            Ok((status, Html(page.render()?)).into_response())
        }
    }
}

/// The verdict page of a claim: the rules run once for the report and the
/// control analysis the rotor drawings read.
fn verdict(claim: &claim::Claim, downloads: Downloads) -> Result<Response, Error> {
    let checked = rules::check(claim);
    let page = VerdictPage::new(&checked.report, claim, checked.control.as_ref(), downloads);
    Ok(Html(page.render()?).into_response())
}

/// A demo's verdict page, as [`AppState::load`](super::AppState::load)
/// renders it once.
pub fn demo_page(
    d: &'static demo::Demo,
    claim: &claim::Claim,
    checked: &rules::Checked,
) -> Result<String, askama::Error> {
    let downloads = Downloads {
        demo: Some(d.name),
        sheet: d.text.to_string(),
        note: None,
    };
    VerdictPage::new(&checked.report, claim, checked.control.as_ref(), downloads).render()
}

/// `GET /demo/{name}`: a demo's verdict page, checked and rendered at
/// start-up.
pub async fn demo(
    State(state): State<SharedState>,
    Path(name): Path<String>,
) -> Result<Response, Error> {
    let d = state.demo(&name).ok_or(Error::NotFound)?;
    match &d.page {
        Some(html) => Ok(Html(html.clone()).into_response()),
        // Only when the page did not render at start-up: check it again to show why.
        None => Ok(Html(demo_page(d.demo, &d.claim, &rules::check(&d.claim))?).into_response()),
    }
}

/// `GET /methods`: rules, tier table, sources.
pub async fn methods() -> Result<Html<String>, Error> {
    Ok(Html(MethodsPage::new().render()?))
}

/// Anything else: a real 404, as JSON under `/api/`.
pub async fn not_found(uri: Uri) -> Response {
    if uri.path().starts_with("/api/") {
        ApiError(Error::NotFound).into_response()
    } else {
        Error::NotFound.into_response()
    }
}
