//! Parse, check and render for each demo claim (criterion). Target: a whole
//! check, every rule included, under 50 microseconds median. The page bench
//! is the verdict page a posted sheet gets: its view, drawings and HTML.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;

use askama::Template;
use liftaudit::claim::{self, demo};
use liftaudit::report::render_text;
use liftaudit::rules;
use liftaudit::web::view::{Downloads, VerdictPage};

fn engine(c: &mut Criterion) {
    for d in demo::DEMOS {
        let claim = claim::parse_any(d.text).expect("demo parses");
        let report = rules::run_all(&claim);
        c.bench_function(&format!("parse/{}", d.name), |b| {
            b.iter(|| claim::parse_any(black_box(d.text)))
        });
        let json = json_sheet(d.text);
        assert_eq!(claim::parse_any(&json), Ok(claim.clone()), "{}", d.name);
        c.bench_function(&format!("parse-json/{}", d.name), |b| {
            b.iter(|| claim::parse_any(black_box(&json)))
        });
        c.bench_function(&format!("check/{}", d.name), |b| {
            b.iter(|| rules::run_all(black_box(&claim)))
        });
        for rule in rules::REGISTRY {
            c.bench_function(&format!("rule/{}/{}", rule.id, d.name), |b| {
                b.iter(|| (rule.check)(black_box(&claim)))
            });
        }
        c.bench_function(&format!("render-json/{}", d.name), |b| {
            b.iter(|| black_box(&report).to_json())
        });
        c.bench_function(&format!("render-json-compact/{}", d.name), |b| {
            b.iter(|| serde_json::to_vec(black_box(&report)))
        });
        c.bench_function(&format!("render-text/{}", d.name), |b| {
            b.iter(|| render_text(black_box(&report), false))
        });
        // The page as POST /check builds it: the control analysis comes with
        // the report from the rules.
        let checked = rules::check(&claim);
        c.bench_function(&format!("render-page/{}", d.name), |b| {
            b.iter(|| {
                let downloads = Downloads {
                    demo: None,
                    sheet: d.text.to_string(),
                    note: None,
                };
                VerdictPage::new(
                    black_box(&report),
                    &claim,
                    checked.control.as_ref(),
                    downloads,
                )
                .render()
            })
        });
    }
}

/// The same sheet as JSON text, for timing the JSON reader.
fn json_sheet(toml_text: &str) -> String {
    let value: serde_json::Value = toml::from_str(toml_text).expect("demo is TOML");
    serde_json::to_string_pretty(&value).expect("JSON text")
}

criterion_group!(benches, engine);
criterion_main!(benches);
