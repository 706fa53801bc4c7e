//! The `liftaudit` command: `serve` runs the web service, `check` reads
//! claim sheets and prints their reports.

use std::io::{IsTerminal, Read};
use std::net::SocketAddr;
use std::process::ExitCode;

use clap::{Parser, Subcommand, ValueEnum};

use liftaudit::claim;
use liftaudit::report::{self, Verdict};
use liftaudit::rules;
use liftaudit::web;

/// Exit code for a sheet that cannot be read (BSD sysexits EX_DATAERR is 65;
/// DESIGN fixes 64 for bad input of any kind).
const BAD_INPUT: u8 = 64;

#[derive(Parser)]
#[command(name = "liftaudit", version, about = "Checks the physical plausibility of claims about small flying machines")]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run the web service.
    Serve {
        /// Address to listen on.
        #[arg(long, default_value = "127.0.0.1:8080")]
        addr: SocketAddr,
    },
    /// Check claim sheets (TOML or JSON; `-` reads standard input).
    Check {
        #[arg(required = true)]
        files: Vec<String>,
        #[arg(long, value_enum, default_value_t = Output::Text)]
        format: Output,
    },
}

#[derive(Clone, Copy, ValueEnum)]
enum Output {
    Text,
    Json,
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        Command::Serve { addr } => serve(addr),
        Command::Check { files, format } => check(&files, format),
    }
}

fn serve(addr: SocketAddr) -> ExitCode {
    tracing_subscriber::fmt()
        .with_env_filter(
            tracing_subscriber::EnvFilter::try_from_default_env()
                .unwrap_or_else(|_| tracing_subscriber::EnvFilter::new("info")),
        )
        .init();
    let runtime = match tokio::runtime::Runtime::new() {
        Ok(rt) => rt,
        Err(e) => {
            eprintln!("liftaudit: cannot start the runtime: {e}");
            return ExitCode::FAILURE;
        }
    };
    match runtime.block_on(web::serve(addr, web::Config::default())) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("liftaudit: cannot serve on {addr}: {e}");
            ExitCode::FAILURE
        }
    }
}

fn read_input(file: &str) -> std::io::Result<String> {
    if file == "-" {
        let mut text = String::new();
        std::io::stdin().read_to_string(&mut text)?;
        Ok(text)
    } else {
        std::fs::read_to_string(file)
    }
}

fn check(files: &[String], format: Output) -> ExitCode {
    let color = std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none();
    let mut worst: Option<Verdict> = None;
    let mut bad_input = false;
    for file in files {
        let text = match read_input(file) {
            Ok(t) => t,
            Err(e) => {
                eprintln!("{file}: cannot read: {e}");
                bad_input = true;
                continue;
            }
        };
        let claim = match claim::parse_any(&text) {
            Ok(c) => c,
            Err(claim::Error::Invalid(errors)) => {
                for e in errors {
                    eprintln!("{file}: {e}");
                }
                bad_input = true;
                continue;
            }
            Err(e) => {
                eprintln!("{file}: {e}");
                bad_input = true;
                continue;
            }
        };
        let report = rules::run_all(&claim);
        match format {
            Output::Json => println!("{}", report.to_json()),
            Output::Text => println!("{}", report::render_text(&report, color)),
        }
        worst = Some(match worst {
            Some(w) => Verdict::worst([w, report.verdict]),
            None => report.verdict,
        });
    }
    if bad_input {
        return ExitCode::from(BAD_INPUT);
    }
    ExitCode::from(worst.map_or(BAD_INPUT, |v| v.exit_code()))
}
