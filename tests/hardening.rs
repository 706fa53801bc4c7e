//! Hostile input, as a careless or malicious user would send it (issue 16):
//! slow bodies and idle connections over a real socket, with the service's
//! timeouts set short for the test; bounded error answers; every message
//! that names a mistake, word for word. Time bounds are in seconds with room
//! to spare, never a speed, so a slow machine cannot make them fail.

use std::net::SocketAddr;
use std::time::{Duration, Instant};

use tokio::io::{AsyncReadExt, AsyncWriteExt};
use tokio::net::TcpStream;

use liftaudit::claim::{self, Format};
use liftaudit::web;

/// The service on 127.0.0.1:0 with short timeouts, served as `liftaudit
/// serve` serves it (`web::serve_on`).
async fn spawn(config: web::Config) -> SocketAddr {
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0")
        .await
        .expect("bind 127.0.0.1:0");
    let addr = listener.local_addr().expect("local address");
    let router = web::app(web::AppState::load(config.clone()));
    tokio::spawn(async move {
        web::serve_on(listener, router, &config, std::future::pending()).await;
    });
    addr
}

fn short() -> web::Config {
    web::Config {
        request_timeout: Duration::from_secs(3),
        header_read_timeout: Duration::from_secs(1),
        body_timeout: Duration::from_secs(1),
        max_bodies_per_client: 8,
        ..web::Config::default()
    }
}

/// Everything the server sends until it closes the connection, or what came
/// within `wait` if it does not close it.
async fn read_all(stream: &mut TcpStream, wait: Duration) -> (String, bool) {
    let mut out = Vec::new();
    let mut buf = [0u8; 8192];
    let deadline = Instant::now() + wait;
    loop {
        let left = deadline.saturating_duration_since(Instant::now());
        match tokio::time::timeout(left, stream.read(&mut buf)).await {
            Ok(Ok(0)) | Ok(Err(_)) => return (String::from_utf8_lossy(&out).into_owned(), true),
            Ok(Ok(n)) => out.extend_from_slice(&buf[..n]),
            Err(_) => return (String::from_utf8_lossy(&out).into_owned(), false),
        }
    }
}

/// The head of a POST of a sheet of `length` bytes, with its first byte.
fn slow_post(length: usize) -> String {
    format!(
        "POST /api/v1/check HTTP/1.1\r\nHost: x\r\nContent-Type: application/toml\r\n\
         Content-Length: {length}\r\n\r\nt"
    )
}

async fn health_within(addr: SocketAddr, bound: Duration) -> Duration {
    let start = Instant::now();
    let mut s = TcpStream::connect(addr).await.unwrap();
    s.write_all(b"GET /healthz HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n")
        .await
        .unwrap();
    let (answer, _) = read_all(&mut s, bound).await;
    let took = start.elapsed();
    assert!(
        answer.starts_with("HTTP/1.1 200"),
        "{answer:?} after {took:?}"
    );
    assert!(took < bound, "/healthz took {took:?}");
    took
}

#[tokio::test]
async fn health_answers_within_two_seconds_while_a_hundred_slow_uploads_are_open() {
    let addr = spawn(web::Config {
        request_timeout: Duration::from_secs(10),
        body_timeout: Duration::from_secs(10),
        ..short()
    })
    .await;
    let mut uploads = Vec::new();
    for _ in 0..100 {
        let mut s = TcpStream::connect(addr).await.unwrap();
        s.write_all(slow_post(1000).as_bytes()).await.unwrap();
        uploads.push(s);
    }
    // The service stalled /healthz for the whole request timeout before (issue 16).
    health_within(addr, Duration::from_secs(2)).await;
    drop(uploads);
}

#[tokio::test]
async fn a_client_with_eight_bodies_in_progress_is_told_to_wait_for_the_ninth() {
    let addr = spawn(short()).await;
    let mut open = Vec::new();
    for _ in 0..8 {
        let mut s = TcpStream::connect(addr).await.unwrap();
        s.write_all(slow_post(1000).as_bytes()).await.unwrap();
        open.push(s);
    }
    // Give the server a moment to take the eight heads; 429 needs them counted.
    tokio::time::sleep(Duration::from_millis(300)).await;
    let mut ninth = TcpStream::connect(addr).await.unwrap();
    ninth.write_all(slow_post(1000).as_bytes()).await.unwrap();
    let (answer, _) = read_all(&mut ninth, Duration::from_secs(2)).await;
    assert!(answer.starts_with("HTTP/1.1 429"), "{answer}");
    assert!(
        answer.contains(
            r#"{"errors":[{"message":"This address already has 8 requests with a body in progress; wait for one to finish, then send this one again."}]}"#
        ),
        "{answer}"
    );
    drop(open);
}

#[tokio::test]
async fn a_body_that_stops_is_answered_408_after_the_body_timeout() {
    let addr = spawn(short()).await;
    let mut s = TcpStream::connect(addr).await.unwrap();
    let start = Instant::now();
    s.write_all(slow_post(1000).as_bytes()).await.unwrap();
    let (answer, _) = read_all(&mut s, Duration::from_secs(6)).await;
    // Body timeout 1 s; the request timeout (3 s) is the latest it may come.
    assert!(
        start.elapsed() < Duration::from_secs(5),
        "{:?}",
        start.elapsed()
    );
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
    assert!(
        answer.contains(
            r#"{"errors":[{"message":"The request did not arrive in time: its body came too slowly or stopped. Please send it again."}]}"#
        ),
        "{answer}"
    );
}

#[tokio::test]
async fn a_body_trickled_a_byte_at_a_time_is_cut_off_by_the_request_timeout() {
    let addr = spawn(short()).await;
    let mut s = TcpStream::connect(addr).await.unwrap();
    let start = Instant::now();
    s.write_all(slow_post(1000).as_bytes()).await.unwrap();
    let (mut reader, mut writer) = s.into_split();
    // One byte every 0.3 s: never idle for the body timeout (1 s).
    let trickle = tokio::spawn(async move {
        for _ in 0..100 {
            tokio::time::sleep(Duration::from_millis(300)).await;
            if writer.write_all(b"#").await.is_err() {
                break;
            }
        }
    });
    let mut answer = Vec::new();
    let _ = tokio::time::timeout(Duration::from_secs(8), reader.read_to_end(&mut answer)).await;
    let answer = String::from_utf8_lossy(&answer);
    // The request timeout is 3 s; 8 s is the bound with room to spare.
    assert!(
        start.elapsed() < Duration::from_secs(8),
        "{:?}",
        start.elapsed()
    );
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
    trickle.abort();
}

#[tokio::test]
async fn a_connection_that_sends_nothing_is_closed_after_the_header_timeout() {
    let addr = spawn(short()).await;
    let mut s = TcpStream::connect(addr).await.unwrap();
    let start = Instant::now();
    let (_, closed) = read_all(&mut s, Duration::from_secs(5)).await;
    assert!(closed, "still open after 5 s");
    // Header-read timeout 1 s.
    assert!(
        start.elapsed() >= Duration::from_millis(900),
        "{:?}",
        start.elapsed()
    );
}

#[tokio::test]
async fn an_idle_keep_alive_connection_is_closed_after_the_header_timeout() {
    let addr = spawn(short()).await;
    let mut s = TcpStream::connect(addr).await.unwrap();
    s.write_all(b"GET /healthz HTTP/1.1\r\nHost: x\r\n\r\n")
        .await
        .unwrap();
    let start = Instant::now();
    let (answer, closed) = read_all(&mut s, Duration::from_secs(5)).await;
    assert!(answer.starts_with("HTTP/1.1 200"), "{answer}");
    assert!(closed, "an idle keep-alive connection still open after 5 s");
    assert!(
        start.elapsed() >= Duration::from_millis(900),
        "{:?}",
        start.elapsed()
    );
}

#[tokio::test]
async fn connections_past_the_cap_wait_until_one_closes() {
    let addr = spawn(web::Config {
        max_connections: 2,
        ..short()
    })
    .await;
    let a = TcpStream::connect(addr).await.unwrap();
    let b = TcpStream::connect(addr).await.unwrap();
    // The third is queued, not served, while two are open...
    let mut c = TcpStream::connect(addr).await.unwrap();
    c.write_all(b"GET /healthz HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n")
        .await
        .unwrap();
    let (early, _) = read_all(&mut c, Duration::from_millis(500)).await;
    assert_eq!(early, "", "served past the cap");
    // ...and served once the idle two are closed by the header timeout (1 s).
    let (answer, _) = read_all(&mut c, Duration::from_secs(5)).await;
    assert!(answer.starts_with("HTTP/1.1 200"), "{answer}");
    drop((a, b));
}

async fn raw(addr: SocketAddr, request: &str) -> String {
    let mut s = TcpStream::connect(addr).await.unwrap();
    s.write_all(request.as_bytes()).await.unwrap();
    read_all(&mut s, Duration::from_secs(5)).await.0
}

#[tokio::test]
async fn every_error_under_the_api_is_the_json_errors_body_and_elsewhere_the_error_page() {
    let addr = spawn(short()).await;
    let close = "Host: x\r\nConnection: close\r\n";
    for (request, status) in [
        (format!("GET /api/v1/nope HTTP/1.1\r\n{close}\r\n"), "404"),
        (format!("GET /api/v1/check HTTP/1.1\r\n{close}\r\n"), "405"),
        (format!("GET /api/v1/%FF%FE HTTP/1.1\r\n{close}\r\n"), "404"),
        (
            format!("POST /api/v1/check HTTP/1.1\r\n{close}Content-Encoding: gzip\r\nContent-Length: 2\r\n\r\n{{}}"),
            "415",
        ),
    ] {
        let answer = raw(addr, &request).await;
        assert!(answer.starts_with(&format!("HTTP/1.1 {status}")), "{request}: {answer}");
        assert!(answer.contains("content-type: application/json"), "{request}: {answer}");
        assert!(answer.contains(r#"{"errors":[{"message":""#), "{request}: {answer}");
    }
    for (request, status) in [
        (
            format!("GET /demo/no-such-demo HTTP/1.1\r\n{close}\r\n"),
            "404",
        ),
        (
            format!("GET /demo/no-such-demo/report.json HTTP/1.1\r\n{close}\r\n"),
            "404",
        ),
        (format!("GET /demo/%FF HTTP/1.1\r\n{close}\r\n"), "400"),
        (format!("DELETE /methods HTTP/1.1\r\n{close}\r\n"), "405"),
    ] {
        let answer = raw(addr, &request).await;
        assert!(
            answer.starts_with(&format!("HTTP/1.1 {status}")),
            "{request}: {answer}"
        );
        assert!(
            answer.contains("content-type: text/html"),
            "{request}: {answer}"
        );
        assert!(
            answer.contains(&format!("<h1>{status}")),
            "{request}: {answer}"
        );
    }
}

#[tokio::test]
async fn a_gzip_body_is_refused_with_415_naming_the_coding() {
    let addr = spawn(short()).await;
    let answer = raw(
        addr,
        "POST /api/v1/check HTTP/1.1\r\nHost: x\r\nConnection: close\r\nContent-Type: application/json\r\n\
         Content-Encoding: GZIP\r\nContent-Length: 2\r\n\r\n{}",
    )
    .await;
    assert!(answer.starts_with("HTTP/1.1 415"), "{answer}");
    assert!(answer.contains("accept-encoding: identity"), "{answer}");
    assert!(
        answer.contains(
            r#"{"errors":[{"message":"the body is sent in the content coding 'gzip', which this service does not read; send it uncompressed, without a Content-Encoding header"}]}"#
        ),
        "{answer}"
    );
}

#[tokio::test]
async fn a_megabyte_of_unknown_keys_gets_an_answer_of_a_few_kilobytes() {
    let addr = spawn(short()).await;
    let mut sheet = String::from("title = \"t\"\n");
    let mut i = 0;
    while sheet.len() < 1_000_000 {
        sheet.push_str(&format!("k{i} = 1\n"));
        i += 1;
    }
    let request = format!(
        "POST /api/v1/check HTTP/1.1\r\nHost: x\r\nConnection: close\r\nContent-Type: application/toml\r\n\
         Content-Length: {}\r\n\r\n{sheet}",
        sheet.len()
    );
    let answer = raw(addr, &request).await;
    assert!(
        answer.starts_with("HTTP/1.1 422"),
        "{}",
        &answer[..200.min(answer.len())]
    );
    // 50 entries and the count of the rest; the list was 13.8 MB (issue 16).
    assert!(answer.len() < 10_000, "{} bytes", answer.len());
    let more = i + 2 - 50; // the unknown keys and the missing craft and rotors
    assert!(
        answer.contains(&format!(
            r#"{{"field":"(sheet)","message":"and {more} more errors"}}"#
        )),
        "{answer}"
    );
}

/// The message of the one field error a sheet gets.
fn refusal(sheet: &str) -> (String, String) {
    match claim::parse(sheet, Format::Toml) {
        Err(claim::Error::Invalid(errors)) => {
            assert_eq!(errors.len(), 1, "{errors:?}");
            (errors[0].field.clone(), errors[0].message.clone())
        }
        other => panic!("expected one field error, got {other:?}"),
    }
}

fn sheet_with(table: &str, line: &str) -> String {
    let mut craft = "mass = \"300 g\"".to_string();
    let mut rotors = "count = 4\ndiameter = \"5 in\"".to_string();
    let mut extra = String::new();
    match table {
        "craft" => craft = line.to_string(),
        "rotors" => rotors = format!("{rotors}\n{line}"),
        other => extra = format!("[{other}]\n{line}\n"),
    }
    format!("title = \"t\"\n[craft]\n{craft}\n[rotors]\n{rotors}\n{extra}")
}

fn accepted(table: &str, line: &str) -> claim::Claim {
    claim::parse(&sheet_with(table, line), Format::Toml).unwrap_or_else(|e| panic!("{line}: {e}"))
}

#[test]
fn a_comma_decimal_is_told_to_use_a_decimal_point() {
    assert_eq!(
        refusal(&sheet_with("craft", "mass = \"0,3 kg\"")),
        (
            "craft.mass".to_string(),
            "'0,3 kg' has a comma in its number; use a decimal point (0.3, not 0,3) and no thousands separator".to_string()
        )
    );
}

#[test]
fn the_minus_sign_fullwidth_digits_and_the_celsius_sign_read_as_meant() {
    // U+2212 MINUS SIGN; fullwidth digits and U+2103 DEGREE CELSIUS by NFKC
    // (Unicode Standard Annex 15): -5 degC is 268.15 K (ISO 80000-5).
    let c = accepted("conditions", "temperature = \"\u{2212}5 \u{2103}\"");
    let t = c.conditions.temperature.unwrap().value;
    assert!((t - 268.15).abs() < 1e-9, "{t}");
    let c = accepted("craft", "mass = \"\u{ff13}\u{ff10}\u{ff10} g\"");
    assert!((c.craft.mass.value - 0.3).abs() < 1e-12);
}

#[test]
fn scientific_notation_reads_in_the_size_field() {
    let c = accepted(
        "craft",
        "mass = \"300 g\"\nsize = \"1.6e2 x 8e1 x 2.2e1 mm\"",
    );
    let size = c.craft.size.unwrap();
    assert!((size.length.value - 0.16).abs() < 1e-12);
    assert!((size.height.value - 0.022).abs() < 1e-12);
}

#[test]
fn a_whole_count_written_with_a_fraction_is_taken_and_a_broken_one_refused() {
    assert_eq!(accepted("rotors", "").rotors.count, 4);
    let c = claim::parse(
        "title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\ncount = 4.0\ndiameter = \"5 in\"",
        Format::Toml,
    )
    .unwrap();
    assert_eq!(c.rotors.count, 4);
    let sheet =
        "title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\ncount = 4.5\ndiameter = \"5 in\"";
    assert_eq!(
        refusal(sheet),
        (
            "rotors.count".to_string(),
            "must be a whole number, got 4.50, which is not whole".to_string()
        )
    );
}

#[test]
fn an_integer_beyond_range_is_named_too_large_and_not_printed_rounded() {
    let json = r#"{"title": "t", "craft": {"mass": "300 g"}, "rotors": {"count": 99999999999999999999, "diameter": "5 in"}}"#;
    match claim::parse(json, Format::Json) {
        Err(claim::Error::Invalid(errors)) => assert_eq!(
            errors[0].message,
            "is too large: must be a whole number from 1 to 64"
        ),
        other => panic!("{other:?}"),
    }
    let toml = "title = \"t\"\n[rotors]\ncount = 99999999999999999999\n";
    match claim::parse(toml, Format::Toml) {
        Err(claim::Error::Syntax { line, message, .. }) => {
            assert_eq!(line, 3);
            assert_eq!(
                message,
                "the whole number 99999999999999999999 is too large (TOML whole numbers run from -9223372036854775808 to 9223372036854775807)"
            );
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn a_duplicate_toml_key_is_named() {
    match claim::parse(
        "title = \"t\"\n[craft]\nmass = \"1 g\"\n\"mass\" = \"2 g\"\n",
        Format::Toml,
    ) {
        Err(claim::Error::Syntax { message, .. }) => {
            assert_eq!(message, "duplicate key `\"mass\"`")
        }
        other => panic!("{other:?}"),
    }
    match claim::parse("title = \"a\"\ntitle = \"b\"\n", Format::Toml) {
        Err(claim::Error::Syntax { line, message, .. }) => {
            assert_eq!(line, 2);
            assert_eq!(message, "duplicate key `title`");
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn units_in_another_case_words_and_plurals_read_as_meant() {
    // Each against its definition: 1 in = 25.4 mm, 1 ft = 0.3048 m (1959
    // agreement), 1 kn = 1852 m/h, 1 mph = 0.44704 m/s, 1 lb = 0.45359237 kg,
    // 1 lbf = 0.45359237 kg x 9.80665 m/s^2 (standard gravity).
    let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * b.abs().max(1.0);
    for (table, line, expect) in [
        ("craft", "mass = \"0.3 KG\"", 0.3),
        ("craft", "mass = \"2 lbs\"", 2.0 * 0.453_592_37),
        ("rotors", "arm = \"70 MM\"", 0.07),
        ("rotors", "arm = \"5 in.\"", 0.127),
        ("rotors", "arm = \"5-inch\"", 0.127),
        ("rotors", "arm = \"1 foot\"", 0.3048),
        ("rotors", "arm = \"0.2 feet\"", 0.2 * 0.3048),
        ("rotors", "arm = \"0.1 metres\"", 0.1),
        ("rotors", "max_power = \"4 watts\"", 4.0),
        (
            "rotors",
            "max_thrust = \"0.1 lbf\"",
            0.1 * 0.453_592_37 * 9.806_65,
        ),
        ("claim", "flight_time = \"12 minutes\"", 720.0),
        ("claim", "flight_time = \"90 seconds\"", 90.0),
        ("conditions", "wind = \"10 knots\"", 10.0 * 1852.0 / 3600.0),
        ("conditions", "wind = \"10 MPH\"", 4.4704),
        ("battery", "capacity = \"600 mAH\"", 2160.0),
        ("sensing", "loop_rate = \"1 KHz\"", 1000.0),
    ] {
        let c = accepted(table, line);
        let got = match line.split(' ').next().unwrap() {
            "mass" => c.craft.mass.value,
            "arm" => c.rotors.arm.unwrap().value,
            "max_power" => c.rotors.max_power.unwrap().value,
            "max_thrust" => c.rotors.max_thrust.unwrap().value,
            "flight_time" => c.claim.flight_time.unwrap().value,
            "wind" => c.conditions.wind.value,
            "capacity" => c.battery.unwrap().capacity.unwrap().value,
            "loop_rate" => c.sensing.loop_rate.unwrap().value,
            other => panic!("{other}"),
        };
        assert!(close(got, expect), "{line}: {got} against {expect}");
    }
}

#[test]
fn a_unit_two_units_share_but_for_case_is_refused_naming_both() {
    assert_eq!(
        refusal(&sheet_with("rotors", "max_power = \"5 mw\"")),
        (
            "rotors.max_power".to_string(),
            "the unit 'mw' in '5 mw' could be mW (milliwatt) or MW (megawatt); write it in the case of the unit meant".to_string()
        )
    );
}

#[test]
fn fifteen_c_as_a_temperature_says_both_readings() {
    assert_eq!(
        refusal(&sheet_with("conditions", "temperature = \"15 C\"")),
        (
            "conditions.temperature".to_string(),
            "'15 C' could be a temperature (15 degC) or a discharge rate (15 C); write a temperature as '15 degC'".to_string()
        )
    );
    // A discharge rate keeps its usual spelling.
    let c = accepted("battery", "max_discharge = \"15 C\"");
    assert_eq!(c.battery.unwrap().max_discharge, Some(15.0));
}

#[test]
fn a_byte_order_mark_before_json_is_read_as_before_toml() {
    let json = "\u{feff}{\"title\": \"t\", \"craft\": {\"mass\": \"300 g\"}, \"rotors\": {\"count\": 4, \"diameter\": \"5 in\"}}";
    assert_eq!(claim::sniff(json), Format::Json);
    assert!(claim::parse_any(json).is_ok());
    let toml = format!("\u{feff}{}", sheet_with("rotors", ""));
    assert!(claim::parse_any(&toml).is_ok());
}

/// classroom-quad with a tiny stated power: the control analysis had no
/// usable column and panicked (issue 16), a 500 from the service and exit
/// 101 from the command.
fn crash_sheet() -> String {
    let d = liftaudit::claim::demo::find("classroom-quad").unwrap();
    d.text
        .replace("[rotors]\n", "[rotors]\nmax_power = \"1e-200 W\"\n")
}

#[tokio::test]
async fn the_crash_sheet_gets_a_report_or_field_errors_never_a_server_error() {
    use tower::ServiceExt;
    let sheet = crash_sheet();
    assert!(sheet.contains("max_power = \"1e-200 W\""));
    let app = web::app(web::AppState::load(web::Config::default()));
    let request = axum::http::Request::post("/api/v1/check")
        .header("content-type", "application/toml")
        .body(axum::body::Body::from(sheet))
        .unwrap();
    let status = app.oneshot(request).await.unwrap().status();
    assert!(!status.is_server_error(), "{status}");
}
