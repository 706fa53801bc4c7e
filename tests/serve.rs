//! The `liftaudit serve` process: it comes up quickly with every demo loaded
//! and stops cleanly on SIGTERM (the signal service managers send).

#![cfg(unix)]

use std::io::{BufRead, BufReader, Read, Write};
use std::net::TcpStream;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use liftaudit::claim::demo;

#[test]
fn serve_starts_with_every_demo_and_stops_on_sigterm() {
    let started = Instant::now();
    let mut child = Command::new(env!("CARGO_BIN_EXE_liftaudit"))
        .args(["serve", "--addr", "127.0.0.1:0"])
        .env("NO_COLOR", "1")
        .env("RUST_LOG", "info")
        .stdout(Stdio::piped())
        .stderr(Stdio::null())
        .spawn()
        .expect("liftaudit serve starts");
    let stdout = child.stdout.take().expect("stdout");
    let mut lines = BufReader::new(stdout).lines();
    let addr = loop {
        let line = match lines.next() {
            Some(Ok(l)) => l,
            _ => {
                let _ = child.kill();
                panic!("serve ended before it listened");
            }
        };
        if let Some(rest) = line.split("listening on http://").nth(1) {
            break rest.trim_end_matches('/').to_string();
        }
    };
    let ready = started.elapsed();
    // Issue 3 asks for "well under a second"; the bound leaves room for a busy CI machine.
    assert!(ready < Duration::from_secs(3), "ready after {ready:?}");
    eprintln!("serve was ready after {ready:?} on {addr}");

    let mut stream = TcpStream::connect(&addr).expect("connect");
    stream
        .write_all(b"GET /healthz HTTP/1.1\r\nHost: t\r\nConnection: close\r\n\r\n")
        .expect("write");
    let mut answer = String::new();
    stream.read_to_string(&mut answer).expect("read");
    assert!(answer.starts_with("HTTP/1.1 200"), "{answer}");
    assert!(
        answer.contains(&format!("\"demos\":{}", demo::DEMOS.len())),
        "{answer}"
    );

    let status = Command::new("kill")
        .args(["-TERM", &child.id().to_string()])
        .status()
        .expect("kill runs");
    assert!(status.success());
    let deadline = Instant::now() + Duration::from_secs(10);
    let exit = loop {
        if let Some(s) = child.try_wait().expect("wait") {
            break s;
        }
        if Instant::now() > deadline {
            let _ = child.kill();
            panic!("serve did not stop within 10 s of SIGTERM");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    assert!(exit.success(), "serve exited with {exit}");
}
