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
                eprintln!("error: {err:#}");
            }
            ExitCode::from(2)
        }
    }
}

fn is_broken_pipe(err: &anyhow::Error) -> bool {
    err.chain().any(|c| {
        c.downcast_ref::<std::io::Error>()
            .is_some_and(|e| e.kind() == std::io::ErrorKind::BrokenPipe)
    })
}
