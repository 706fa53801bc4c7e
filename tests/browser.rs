//! End to end in a real browser: headless Chromium, driven over WebDriver by
//! chromedriver, opens the form, picks a preset, submits it and finds the
//! verdict and the drawings. Needs Debian's `chromium` and `chromium-driver`;
//! without them the test says so and passes, unless `CI` is set, where it fails.

mod common;

use std::io::Write;
use std::net::TcpListener;
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

use fantoccini::{ClientBuilder, Locator};
use liftaudit::claim::{self, demo};
use liftaudit::rules;

const CHROMIUM: &str = "/usr/bin/chromium";

/// The chromedriver process, killed when the test ends however it ends.
struct Driver(Child);

impl Drop for Driver {
    fn drop(&mut self) {
        let _ = self.0.kill();
        let _ = self.0.wait();
    }
}

fn find_on_path(name: &str) -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|dir| dir.join(name))
            .find(|p| p.is_file())
    })
}

fn free_port() -> u16 {
    TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .map(|a| a.port())
        .expect("a free port")
}

fn wait_for_port(port: u16, within: Duration) -> bool {
    let start = Instant::now();
    while start.elapsed() < within {
        if std::net::TcpStream::connect(("127.0.0.1", port)).is_ok() {
            return true;
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    false
}

/// The target directory: cargo gives integration tests `target/tmp`.
fn target_dir() -> PathBuf {
    Path::new(env!("CARGO_TARGET_TMPDIR"))
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("target"))
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_preset_picked_in_a_real_browser_shows_its_verdict_and_drawings() {
    let (Some(chromedriver), true) = (find_on_path("chromedriver"), Path::new(CHROMIUM).exists())
    else {
        let msg = "\n*** BROWSER TEST NOT RUN: chromedriver or /usr/bin/chromium is missing.\n\
                   *** Install them with: apt-get install -y chromium chromium-driver\n";
        // Straight to the stderr handle: libtest captures `eprintln!` of a
        // passing test, and a skip must be seen.
        let _ = writeln!(std::io::stderr(), "{msg}");
        assert!(std::env::var_os("CI").is_none(), "{msg}");
        return;
    };

    let addr = common::spawn_app().await;
    let port = free_port();
    let _driver = Driver(
        Command::new(chromedriver)
            .arg(format!("--port={port}"))
            .stdout(Stdio::null())
            .stderr(Stdio::null())
            .spawn()
            .expect("chromedriver starts"),
    );
    assert!(
        wait_for_port(port, Duration::from_secs(15)),
        "chromedriver does not listen on {port}"
    );

    let profile = Path::new(env!("CARGO_TARGET_TMPDIR")).join(format!("chromium-{port}"));
    let caps = serde_json::json!({
        "goog:chromeOptions": {
            "binary": CHROMIUM,
            "args": [
                "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                "--no-first-run", "--disable-background-networking",
                "--disable-component-update", "--disable-sync",
                "--disable-dev-shm-usage", "--window-size=1280,1000",
                format!("--user-data-dir={}", profile.display()),
            ]
        }
    });
    let caps = match caps {
        serde_json::Value::Object(map) => map,
        _ => unreachable!("a JSON object literal"),
    };
    let client = ClientBuilder::new(hyper_util::client::legacy::connect::HttpConnector::new())
        .capabilities(caps)
        .connect(&format!("http://127.0.0.1:{port}"))
        .await
        .expect("a WebDriver session");

    let result = drive(&client, &format!("http://{addr}")).await;
    let _ = client.close().await;
    let _ = std::fs::remove_dir_all(&profile);
    result.expect("the browser run");
}

async fn drive(client: &fantoccini::Client, base: &str) -> Result<(), fantoccini::error::CmdError> {
    let name = "hover-lamp";
    let d = demo::find(name).expect("the hover-lamp demo");
    let expected = rules::run_all(&claim::parse_any(d.text).expect("demo parses")).verdict;

    client.goto(&format!("{base}/")).await?;
    // The stylesheet loads under the page's Content-Security-Policy.
    let background = client
        .execute(
            "return getComputedStyle(document.body).backgroundColor;",
            vec![],
        )
        .await?;
    assert_eq!(background, "rgb(244, 241, 232)", "style.css did not apply");

    client
        .find(Locator::Id(&format!("preset-{name}")))
        .await?
        .click()
        .await?;
    let sheet = client
        .wait()
        .at_most(Duration::from_secs(10))
        .for_element(Locator::Id("sheet"))
        .await?;
    let text = sheet.prop("value").await?.unwrap_or_default();
    assert!(
        text.contains("[rotors]"),
        "the preset did not fill the sheet box: {text}"
    );

    client
        .find(Locator::Id("check-sheet"))
        .await?
        .click()
        .await?;
    let word = client
        .wait()
        .at_most(Duration::from_secs(10))
        .for_element(Locator::Css(".verdict-head [data-verdict]"))
        .await?;
    assert_eq!(word.text().await?.to_lowercase(), expected.label());
    assert_eq!(
        word.attr("data-verdict").await?.as_deref(),
        Some(expected.id())
    );

    let drawings = client
        .find_all(Locator::Css("figure.drawing-box svg.drawing"))
        .await?;
    assert!(drawings.len() >= 3, "only {} drawings", drawings.len());
    for id in ["fig-forces", "fig-thrust", "fig-energy", "fig-layout"] {
        let svg = client.find(Locator::Css(&format!("#{id} svg"))).await?;
        let width: f64 = client
            .execute(
                "return arguments[0].getBoundingClientRect().width;",
                vec![serde_json::to_value(&svg).expect("element as JSON")],
            )
            .await?
            .as_f64()
            .unwrap_or(0.0);
        assert!(width > 100.0, "{id} is drawn {width} px wide");
    }

    // Both downloads post the page's one copy of the sheet: the form's own
    // action, and the second button's formaction.
    let form = client
        .execute(
            "const f = document.querySelector('form.download-forms'); \
             return [f.action, f.querySelector('button[formaction]').formAction, f.elements['sheet'].value];",
            vec![],
        )
        .await?;
    let form: Vec<String> = serde_json::from_value(form).expect("three strings");
    assert!(form[0].ends_with("/download/report.json"), "{}", form[0]);
    assert!(form[1].ends_with("/download/sheet.toml"), "{}", form[1]);
    assert!(form[2].contains("[rotors]"), "{}", form[2]);

    let out = target_dir().join("screenshots");
    std::fs::create_dir_all(&out).expect("screenshot directory");
    let height = client
        .execute("return document.documentElement.scrollHeight;", vec![])
        .await?
        .as_u64()
        .unwrap_or(2000)
        .min(8000) as u32;
    client.set_window_size(1280, height).await?;
    let png = client.screenshot().await?;
    let path = out.join("verdict-hover-lamp.png");
    std::fs::write(&path, png).expect("write screenshot");
    let _ = writeln!(std::io::stderr(), "screenshot: {}", path.display());

    // The same page at phone width lays out without sideways scrolling.
    client.set_window_size(390, 900).await?;
    let overflow = client
        .execute(
            "return document.documentElement.scrollWidth - document.documentElement.clientWidth;",
            vec![],
        )
        .await?
        .as_i64()
        .unwrap_or(0);
    assert!(
        overflow <= 0,
        "the page scrolls sideways by {overflow} px on a phone"
    );
    let height = client
        .execute("return document.documentElement.scrollHeight;", vec![])
        .await?
        .as_u64()
        .unwrap_or(2000)
        .min(12000) as u32;
    client.set_window_size(390, height).await?;
    let png = client.screenshot().await?;
    std::fs::write(out.join("verdict-hover-lamp-phone.png"), png).expect("write screenshot");
    Ok(())
}
