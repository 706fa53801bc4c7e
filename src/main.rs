//! The `liftaudit` command: `check` sheets from files or standard input,
//! `serve` the web pages. Exit codes of `check` follow the report contract.

use std::io::{IsTerminal, Read};
use std::process::ExitCode;

use clap::{Parser, Subcommand, ValueEnum};

use liftaudit::claim::{self, demo};
use liftaudit::report::{render_text, Report, Verdict};
use liftaudit::rules;

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
    let cli = Cli::parse();
    match cli.command {
        Command::Check {
            files,
            demo,
            format,
        } => check(&files, &demo, format),
    }
}

/// Reads one named input: a file path, or `-` for standard input.
fn read_input(name: &str) -> Result<String, String> {
    if name == "-" {
        let mut text = String::new();
        std::io::stdin()
            .read_to_string(&mut text)
            .map_err(|e| format!("standard input: {e}"))?;
        Ok(text)
    } else {
        std::fs::read_to_string(name).map_err(|e| format!("{name}: {e}"))
    }
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
    let mut reports: Vec<Report> = Vec::new();
    let mut bad = false;
    for (name, text) in inputs {
        let text = match text {
            Ok(t) => t,
            Err(e) => {
                eprintln!("liftaudit check: {e}");
                bad = true;
                continue;
            }
        };
        match claim::parse_any(&text) {
            Ok(claim) => reports.push(rules::run_all(&claim)),
            Err(e) => {
                eprintln!("{name}: the sheet was not accepted");
                for line in e.to_string().lines() {
                    eprintln!("  {line}");
                }
                bad = true;
            }
        }
    }
    match format {
        OutputFormat::Json if reports.len() == 1 => println!("{}", reports[0].to_json()),
        OutputFormat::Json => {
            let all: Vec<serde_json::Value> = reports
                .iter()
                .filter_map(|r| serde_json::to_value(r).ok())
                .collect();
            println!("{}", serde_json::to_string_pretty(&all).unwrap_or_default());
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
