//! The commands, one module each. Each builds a scenario from its options, lets the scenario
//! check itself, runs the physics and prints through `cli::shared`.
//!
//! Architecture invariant: a command imports `cli::args` and `cli::shared`, never another
//! command; this registry is the only list of commands (dispatch and help read it).

mod absorber;
mod blackbody;
mod cell;
mod cool;
mod energy;
mod eval;
mod film;
mod losses;
mod map;
mod mismatch;
mod optimize;
mod stack;
mod sun;
mod sweep;
mod tpv;

use super::shared::Command;

/// Every command, in the order the overview lists them.
pub const ALL: &[&Command] = &[
    &cell::COMMAND,
    &sweep::COMMAND,
    &eval::COMMAND,
    &cool::COMMAND,
    &stack::COMMAND,
    &optimize::COMMAND,
    &mismatch::COMMAND,
    &losses::COMMAND,
    &map::COMMAND,
    &blackbody::COMMAND,
    &tpv::COMMAND,
    &absorber::COMMAND,
    &film::COMMAND,
    &sun::COMMAND,
    &energy::COMMAND,
];

/// The command called `name`.
pub fn find(name: &str) -> Option<&'static Command> {
    ALL.iter().copied().find(|c| c.spec.command == name)
}
