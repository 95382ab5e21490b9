//! The `diptych` binary: with no subcommand it opens the desktop window; the subcommands
//! are the command-line interface of DESIGN §5.4. Exit codes: 0 success, 2 bad input
//! (message on stderr), 1 internal error.

#[cfg(feature = "gui")]
mod app;
mod cli;

use std::process::ExitCode;

fn main() -> ExitCode {
    // An internal fault must end with exit code 1 and a short message, not a trace dump
    // that looks like the user's mistake.
    std::panic::set_hook(Box::new(|info| {
        eprintln!("diptych: internal error: {info}");
    }));
    match std::panic::catch_unwind(cli::main) {
        Ok(code) => code,
        Err(_) => ExitCode::from(1),
    }
}
