//! The `glowgap` command line: scriptable access to the physics core.
//!
//! Every failure is one line on stderr that says what is wrong and what is accepted, and
//! exit code 2. Results go to stdout as an aligned table, JSON or CSV.

mod args;
mod commands;

use std::io::Write;

pub const USAGE: &str = "\
glowgap: detailed-balance limits of solar cells

usage:
  glowgap cell  --gap EV [SOURCE AND CELL OPTIONS] [--json | --link]
  glowgap sweep --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--best] [--json | --csv]
  glowgap eval  LINK|FILE|- [--json]      figures of a share link or scenario file (- = stdin)

source and cell options:
  --spectrum SPEC        am1.5g (default) | am1.5d | am0 | blackbody:K | file:PATH
  --spectrum-axis UNIT   axis unit of a spectrum file without a header: nm | um | eV | cm-1
  --spectrum-values UNIT value unit of a spectrum file, e.g. W/m2/nm or photons/m2/s/eV
  --spectrum-column N    which value column of a multi-column file (1 = first after the axis)
  --concentration X      suns, 1 (default) up to the sun-disc limit (about 46,239)
  --cell-temp K          cell temperature, default 300
  --ere F                external radiative efficiency in (0, 1], default 1
  --emission SIDE        front (default, perfect back mirror) | both
  --approx MODEL         exact (default, generalized Planck) | boltzmann

--link prints the scenario's share-link fragment (#g1.…) to append to the app's address.

These are detailed-balance limits, not predictions of a real device.
";

/// Run the command line with `args` (without the program name); returns the exit code.
pub fn run(args: &[String]) -> i32 {
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match commands::dispatch(args, &mut out) {
        Ok(()) => {
            let _ = out.flush();
            0
        }
        Err(commands::Failure::Usage(msg)) => {
            let _ = out.flush();
            eprintln!("glowgap: {}", one_line(&msg));
            2
        }
        Err(commands::Failure::Output) => 0, // stdout closed (e.g. piped into head): not an error
    }
}

fn one_line(msg: &str) -> String {
    msg.replace(['\n', '\r'], " ")
}
