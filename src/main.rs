//! The `spreadplan` binary: parse, dispatch, exit code. All work is in the
//! library; all printing is in `cli`.

mod cli;

use std::process::ExitCode;

use clap::Parser;

fn main() -> ExitCode {
    let args = cli::Cli::parse();
    match cli::dispatch(args) {
        Ok(()) => ExitCode::SUCCESS,
        Err(err) => {
            if is_broken_pipe(&err) {
                return ExitCode::SUCCESS;
            }
            #[allow(clippy::print_stderr)]
            {
                eprintln!("error: {}", one_line(&err));
            }
            ExitCode::from(2)
        }
    }
}

/// The error and its causes on one line, skipping a cause whose text the
/// message before it already ends with (typed errors that show their
/// source in their own message).
fn one_line(err: &anyhow::Error) -> String {
    let mut msg = String::new();
    let mut last = String::new();
    for cause in err.chain() {
        let text = cause.to_string();
        if !last.ends_with(&text) {
            if !msg.is_empty() {
                msg.push_str(": ");
            }
            msg.push_str(&text);
        }
        last = text;
    }
    msg
}

fn is_broken_pipe(err: &anyhow::Error) -> bool {
    err.chain().any(|c| {
        c.downcast_ref::<std::io::Error>()
            .is_some_and(|e| e.kind() == std::io::ErrorKind::BrokenPipe)
    })
}
