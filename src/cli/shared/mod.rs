//! What the commands share: the options of the light and the cell applied onto a scenario
//! (`options`), a place under a clear sky (`place`), data files and scenarios read from disk
//! (`files`), and the writers of tables and JSON (`output`), with the failure every command
//! returns and the description of a command.
//!
//! Architecture invariant: helpers import no command (`cli::commands`) and no help text
//! renderer; commands import helpers and never each other.

pub mod files;
pub mod options;
pub mod output;
pub mod place;

use super::args::{OptionDoc, Spec};

/// Why a command stopped.
pub enum Failure {
    /// bad input: one line for stderr
    Usage(String),
    /// stdout went away
    Output,
}

impl From<String> for Failure {
    fn from(s: String) -> Self {
        Failure::Usage(s)
    }
}

impl From<std::io::Error> for Failure {
    fn from(_: std::io::Error) -> Self {
        Failure::Output
    }
}

/// Where a command prints.
pub type Out<'a> = &'a mut dyn std::io::Write;

/// One command: what it accepts, how to call it, what it does, and the function that runs it.
pub struct Command {
    pub spec: Spec,
    /// one line saying what the command prints
    pub about: &'static str,
    /// the synopsis, without the leading `glowgap `; further lines are continuations
    pub usage: &'static str,
    /// help of the options this command alone has, or describes its own way; the others
    /// come from the shared descriptions ([`options::SHARED_DOCS`])
    pub docs: &'static [OptionDoc],
    pub run: fn(&[String], Out) -> Result<(), Failure>,
}
