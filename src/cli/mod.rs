//! The `glowgap` command line: scriptable access to the physics core.
//!
//! Every failure is one line on stderr that says what is wrong and what is accepted, and
//! exit code 2. Results go to stdout as an aligned table, JSON or CSV. `glowgap help`, and
//! `glowgap help COMMAND` or `glowgap COMMAND --help`, print the help (exit 0).
//!
//! Layout: `args` (the option parser), `shared` (helpers every command uses: options onto
//! the scenario, data files, writers, `Failure`), `commands` (one module per command and the
//! registry), `help` (texts built from the registry).
//!
//! Architecture invariant: commands import `args` and `shared`, never each other; `shared`
//! imports no command; only this module and `help` read the registry.

mod args;
mod commands;
mod help;
mod shared;

use shared::{Failure, Out};
use std::io::Write;

/// Run the command line with `args` (without the program name); returns the exit code.
pub fn run(args: &[String]) -> i32 {
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match dispatch(args, &mut out) {
        Ok(()) => {
            let _ = out.flush();
            0
        }
        Err(Failure::Usage(msg)) => {
            let _ = out.flush();
            eprintln!("glowgap: {}", one_line(&msg));
            2
        }
        Err(Failure::Output) => 0, // stdout closed (e.g. piped into head): not an error
    }
}

/// The names a user can type first, for messages.
fn command_names() -> String {
    let mut names: Vec<&str> = commands::ALL.iter().map(|c| c.spec.command).collect();
    names.extend(["help", "version"]);
    names.join(", ")
}

fn is_help(a: &str) -> bool {
    a == "--help" || a == "-h"
}

fn dispatch(args: &[String], out: Out) -> Result<(), Failure> {
    let Some(cmd) = args.first() else {
        write!(out, "{}", help::overview())?;
        return Err(Failure::Usage("no command given; try 'glowgap cell --gap 1.34' or 'glowgap help'".into()));
    };
    let rest = &args[1..];
    match cmd.as_str() {
        "help" | "--help" | "-h" => match rest.first() {
            None => {
                write!(out, "{}", help::overview())?;
                Ok(())
            }
            Some(name) => match commands::find(name) {
                Some(c) => {
                    write!(out, "{}", help::command_help(c))?;
                    Ok(())
                }
                None => Err(Failure::Usage(format!(
                    "there is no command '{name}' to help with; commands are: {}",
                    command_names()
                ))),
            },
        },
        "version" | "--version" | "-V" => {
            writeln!(out, "glowgap {}", env!("CARGO_PKG_VERSION"))?;
            Ok(())
        }
        name => match commands::find(name) {
            Some(c) if rest.iter().any(|a| is_help(a)) => {
                write!(out, "{}", help::command_help(c))?;
                Ok(())
            }
            Some(c) => (c.run)(rest, out),
            None => Err(Failure::Usage(format!("unknown command '{name}'; commands are: {}", command_names()))),
        },
    }
}

fn one_line(msg: &str) -> String {
    msg.replace(['\n', '\r'], " ")
}
