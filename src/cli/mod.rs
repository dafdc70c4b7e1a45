//! The `glowgap` command line: scriptable access to the physics core.
//!
//! Every failure is one line on stderr that says what is wrong and what is accepted, and
//! exit code 2. Results go to stdout as an aligned table, JSON or CSV.

mod args;
mod commands;
mod cool;
mod stack;

use std::io::Write;

pub const USAGE: &str = "\
glowgap: detailed-balance limits of solar cells

usage:
  glowgap cell  --gap EV [SOURCE AND CELL OPTIONS] [--json | --link]
  glowgap sweep --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--best] [--json | --csv]
  glowgap eval  LINK|FILE|- [--json] [--radiator | --stack]   figures of a share link or
                         scenario file (- = stdin; --radiator or --stack: that part, not its cell)
  glowgap cool  [RADIATOR OPTIONS] [--json | --link]   radiative cooling balance of a surface
  glowgap stack --gaps EV,EV[,...] [--connection C] [SOURCE AND CELL OPTIONS] [--json | --link]
  glowgap optimize --junctions N [--connection C] [--fix EV [--fix-at any|top|bottom]]
                 [--from EV --to EV] [SOURCE AND CELL OPTIONS] [--json]
  glowgap mismatch --test-eqe file:PATH --ref-eqe file:PATH --spectrum SPEC [--reference SPEC] [--json]
  glowgap losses --gap EV | --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--json | --csv]

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

stacks and measured cells (glowgap stack, optimize, mismatch, losses; cell):
  --gaps EV,EV,...       2 to 6 band gaps, top cell first (strictly descending)
  --connection C         series (default, two-terminal) | independent (multi-terminal)
  --junctions N          1 to 6 for the optimizer; --fix EV holds one gap (e.g. 1.12 for Si)
  --eqe file:PATH        cell: a measured EQE (header with units: wavelength_nm,eqe_percent;
                         fraction, %, A/W or mA/W); Jsc, J0 and Voc by reciprocity
  --urbach MEV           cell: an exponential absorption tail below the gap (Urbach energy)
  --measured-voc V       cell with --eqe/--urbach: the ERE and Voc loss a measured Voc implies
  --reference SPEC       mismatch: the reference spectrum, default am1.5g

radiator options (glowgap cool):
  --emitter EMIT         blackbody (default) | grey:EPS | window:L1-L2[,in=EPS,out=EPS,edge=UM]
                         | points:UM=EPS,UM=EPS,... (linear on a log axis) | file:PATH
                         (wavelengths in um; files: emissivity, absorptance or reflectance)
  --solar EPS|EMIT       a separate profile for the solar band, below --solar-below UM (default 4)
  --cutoff DEG[:EPS]     angular cut-off: EPS (default 0) beyond DEG from the normal
  --sky SKY              box (default, open 8-13 um) | space (3 K) | clear:pwv=CM | clear:dew=C | file:PATH
                         (file: zenith transmittance; slant paths follow t^(1/cos theta))
  --ambient K            ambient air temperature, default 300
  --surface K            surface temperature, default ambient
  --sun SPEC|none        none (default, night) | am1.5g | am1.5d | am0 | blackbody:K | file:PATH
  --sun-zenith DEG       sun's zenith angle, default 0 (sets the absorptance's direction)
  --sun-scale X          factor on the sun's irradiance, default 1
  --hc W_PER_M2K         convection/conduction coefficient from the air, default 0
  --curve FROM:TO:STEP   also print P_net(T) over that range (K)
  --emitter-axis UNIT, --emitter-values KIND, --emitter-column N, and --sky-axis,
  --sky-values, --sky-column: units and column of data files without a header
  (--spectrum-axis, --spectrum-values, --spectrum-column: the same for --sun file:PATH)

--link prints the scenario's share-link fragment (#g1.…) to append to the app's address.

These are detailed-balance limits, not predictions of a real device. The cooling balance is
idealized too. Sunlit and hot surfaces can burn; roof and building work follows local codes
and licensed practice.
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
