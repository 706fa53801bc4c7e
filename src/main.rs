//! The `liftaudit` command: `check` sheets from files or standard input,
//! `serve` the web pages. Exit codes of `check` follow the report contract.

use std::io::{IsTerminal, Read};
use std::net::SocketAddr;
use std::process::ExitCode;
use std::time::Duration;

use clap::{Parser, Subcommand, ValueEnum};

use liftaudit::claim::{self, demo};
use liftaudit::report::{render_text, Report, Verdict};
use liftaudit::rules;
use liftaudit::web;

/// Exit code for a sheet that could not be read (sysexits EX_DATAERR-style, per the contract).
const BAD_INPUT: u8 = 64;

#[derive(Parser)]
#[command(
    name = "liftaudit",
    version,
    about = "Checks the physical plausibility of claims about small flying machines"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run the web service: the claim form, verdict pages and the JSON API.
    Serve {
        /// Address to listen on.
        #[arg(long, default_value = "127.0.0.1:8080")]
        addr: SocketAddr,
        /// Seconds a request may take, its body included, before it is answered 408.
        #[arg(long, default_value_t = 10)]
        request_timeout: u64,
        /// Seconds a connection may take to send a request head; an idle
        /// keep-alive connection is closed after them.
        #[arg(long, default_value_t = 10)]
        header_timeout: u64,
        /// Seconds a request body may pause before it is answered 408.
        #[arg(long, default_value_t = 5)]
        body_timeout: u64,
        /// Connections open at once; more wait in the listen queue.
        #[arg(long, default_value_t = 1024)]
        max_connections: usize,
    },
    /// Check claim sheets (TOML or JSON; `-` reads standard input).
    Check {
        /// Sheet files; `-` for standard input.
        files: Vec<String>,
        /// Check a built-in demo claim by name (see `--demo list`).
        #[arg(long)]
        demo: Vec<String>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = OutputFormat::Text)]
        format: OutputFormat,
    },
}

#[derive(Clone, Copy, ValueEnum)]
enum OutputFormat {
    Text,
    Json,
}

fn main() -> ExitCode {
    // A usage error exits 64 (bad input), not clap's 2, which here means
    // "implausible"; help and the version are not errors.
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            let _ = e.print();
            return if e.use_stderr() {
                ExitCode::from(BAD_INPUT)
            } else {
                ExitCode::SUCCESS
            };
        }
    };
    match cli.command {
        Command::Serve {
            addr,
            request_timeout,
            header_timeout,
            body_timeout,
            max_connections,
        } => serve(
            addr,
            web::Config {
                request_timeout: Duration::from_secs(request_timeout.max(1)),
                header_read_timeout: Duration::from_secs(header_timeout.max(1)),
                body_timeout: Duration::from_secs(body_timeout.max(1)),
                max_connections: max_connections.max(1),
                ..web::Config::default()
            },
        ),
        Command::Check {
            files,
            demo,
            format,
        } => check(&files, &demo, format),
    }
}

/// Runs the service until Ctrl-C or SIGTERM; logs one line per request
/// (`RUST_LOG` overrides the `info` level).
fn serve(addr: SocketAddr, config: web::Config) -> ExitCode {
    tracing_subscriber::fmt()
        .with_ansi(std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none())
        .with_env_filter(
            tracing_subscriber::EnvFilter::try_from_default_env()
                .unwrap_or_else(|_| tracing_subscriber::EnvFilter::new("info")),
        )
        .init();
    let runtime = match tokio::runtime::Runtime::new() {
        Ok(rt) => rt,
        Err(e) => {
            eprintln!("liftaudit serve: cannot start the runtime: {e}");
            return ExitCode::FAILURE;
        }
    };
    match runtime.block_on(web::serve(addr, config)) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("liftaudit serve: cannot serve on {addr}: {e}");
            ExitCode::FAILURE
        }
    }
}

/// Reads one named input, a file path or `-` for standard input, up to the
/// service's body limit: a longer input (`/dev/zero`, `yes |`) is refused as
/// soon as the limit is passed, without reading on.
fn read_input(name: &str) -> Result<String, String> {
    let shown = if name == "-" { "standard input" } else { name };
    let limit = web::BODY_LIMIT;
    let mut bytes = Vec::new();
    let read = if name == "-" {
        std::io::stdin()
            .lock()
            .take(limit as u64 + 1)
            .read_to_end(&mut bytes)
    } else {
        std::fs::File::open(name).and_then(|f| f.take(limit as u64 + 1).read_to_end(&mut bytes))
    };
    read.map_err(|e| format!("{shown}: {e}"))?;
    if bytes.len() > limit {
        return Err(format!(
            "{shown}: longer than {} KiB, the most a sheet may be",
            limit / 1024
        ));
    }
    String::from_utf8(bytes).map_err(|_| format!("{shown}: not UTF-8 text"))
}

/// What `--format json` prints for a sheet that was not checked.
#[derive(serde::Serialize)]
struct Refused {
    file: String,
    #[serde(flatten)]
    errors: web::error::ErrorBody,
}

fn check(files: &[String], demos: &[String], format: OutputFormat) -> ExitCode {
    if demos.iter().any(|d| d == "list") {
        for d in demo::DEMOS {
            println!("{:24} {}", d.name, d.shows());
        }
        return ExitCode::SUCCESS;
    }
    if files.is_empty() && demos.is_empty() {
        eprintln!(
            "liftaudit check: give at least one sheet file, `-` for standard input, or --demo NAME"
        );
        return ExitCode::from(BAD_INPUT);
    }
    let mut inputs: Vec<(String, Result<String, String>)> = Vec::new();
    for name in demos {
        let text = demo::find(name).map(|d| d.text.to_string()).ok_or_else(|| {
            let known: Vec<&str> = demo::DEMOS.iter().map(|d| d.name).collect();
            format!("no demo claim '{name}'; known: {}", known.join(", "))
        });
        inputs.push((format!("demo {name}"), text));
    }
    for name in files {
        inputs.push((name.clone(), read_input(name)));
    }

    let color = std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none();
    let several = inputs.len() > 1;
    // One element per input, in order: a report, or the input's errors.
    let mut outcomes: Vec<Result<Report, Refused>> = Vec::new();
    for (name, text) in inputs {
        let refused = |error: web::error::Error| Refused {
            file: name.clone(),
            errors: web::error::ErrorBody::of(&error),
        };
        let text = match text {
            Ok(t) => t,
            Err(e) => {
                eprintln!("liftaudit check: {e}");
                outcomes.push(Err(refused(web::error::Error::BadRequest(e))));
                continue;
            }
        };
        match claim::parse_any(&text) {
            Ok(claim) => outcomes.push(Ok(rules::run_all(&claim))),
            Err(e) => {
                eprintln!("{name}: the sheet was not accepted");
                for line in e.to_string().lines() {
                    eprintln!("  {line}");
                }
                outcomes.push(Err(refused(web::error::Error::Sheet(e))));
            }
        }
    }
    let bad = outcomes.iter().any(Result::is_err);
    let reports: Vec<&Report> = outcomes.iter().filter_map(|o| o.as_ref().ok()).collect();
    match format {
        OutputFormat::Json if several => {
            let all: Vec<serde_json::Value> = outcomes
                .iter()
                .filter_map(|o| match o {
                    Ok(report) => serde_json::to_value(report).ok(),
                    Err(refused) => serde_json::to_value(refused).ok(),
                })
                .collect();
            println!("{}", serde_json::to_string_pretty(&all).unwrap_or_default());
        }
        OutputFormat::Json => {
            for r in &reports {
                println!("{}", r.to_json());
            }
        }
        OutputFormat::Text => {
            for (i, r) in reports.iter().enumerate() {
                if i > 0 {
                    println!("\n{}\n", "=".repeat(72));
                }
                print!("{}", render_text(r, color));
            }
        }
    }
    if bad {
        return ExitCode::from(BAD_INPUT);
    }
    ExitCode::from(Verdict::worst(reports.iter().map(|r| r.verdict)).exit_code())
}
