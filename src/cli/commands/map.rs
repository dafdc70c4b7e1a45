//! `glowgap map`: the two-junction efficiency map over a grid of top and bottom band gaps,
//! and its best point.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the grid
//! is `physics::stack::map::tandem_map` (the page's map), its ranges are checked by the
//! scenario's `check_gap_range`.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::options::{apply_common, connection, with_light_and_cell_options};
use crate::cli::shared::output::{connection_words, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::constants::ev;
use crate::physics::stack::map::{tandem_map, EfficiencyMap};
use crate::scenario::{check_gap_range, CellScenario};
use std::io::Write;

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "map",
        valued: with_light_and_cell_options!("top", "bottom", "connection"),
        flags: &["json", "csv", "best"],
        max_positional: 0,
    },
    about: "the two-junction efficiency map over top and bottom band gaps, and its best point",
    usage: "map --top FROM:TO:N --bottom FROM:TO:N [--connection C] [SOURCE AND CELL OPTIONS]\n\
            [--best] [--json | --csv]",
    docs: &[
        OptionDoc {
            name: "top",
            arg: "FROM:TO:N",
            text: "top-cell band gaps: FROM to TO eV (both included) in N points, N a whole\n\
                   number from 2 to 2001, required, e.g. 1.2:2.4:121",
        },
        OptionDoc {
            name: "bottom",
            arg: "FROM:TO:N",
            text: "bottom-cell band gaps, as --top, required, e.g. 0.5:1.5:121",
        },
        OptionDoc {
            name: "best",
            arg: "",
            text: "print only the grid's best point (the whole map is still computed)\n\
                   (default: the map, then its best point)",
        },
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON {\"top_ev\", \"bottom_ev\", \"efficiency\" (rows = top gaps, null\n\
                   where the top gap is not above the bottom one), \"best\"} (default: a summary)",
        },
        OptionDoc {
            name: "csv",
            arg: "",
            text: "print CSV, one line per grid point, top_ev,bottom_ev,efficiency, with a\n\
                   header line; empty efficiency where there is no stack (default: a summary)",
        },
    ],
    run,
};

/// The most points along one axis: 2001 x 2001 is four million stacks, about 32 MB of
/// efficiencies and a second or two on two cores; finer grids say nothing a refined
/// optimum (`glowgap optimize`) does not.
const MAX_AXIS_POINTS: usize = 2001;

/// One axis of the map: `n` gaps from `from_ev` to `to_ev` [eV], both ends included.
struct MapAxis {
    from_ev: f64,
    to_ev: f64,
    n: usize,
}

impl MapAxis {
    /// The gaps [eV]: from + (to - from) i / (n - 1), as the page's map axes.
    fn gaps_ev(&self) -> Vec<f64> {
        (0..self.n).map(|i| self.from_ev + (self.to_ev - self.from_ev) * i as f64 / (self.n - 1) as f64).collect()
    }
}

/// `--top FROM:TO:N` (or `--bottom`): checked with the scenario's gap-range check.
fn axis(p: &Parsed, name: &str, cell: &str, example: &str) -> Result<MapAxis, String> {
    let how = format!(
        "give --{name} FROM:TO:N, the {cell} band gaps from FROM to TO eV in N points, e.g. --{name} {example}"
    );
    let Some(text) = p.text(name) else {
        return Err(format!("'glowgap map' needs --{name}: {how}"));
    };
    let parts: Vec<&str> = text.split(':').map(str::trim).collect();
    let [from, to, n] = parts[..] else {
        return Err(format!("--{name} '{text}' is not FROM:TO:N; {how}"));
    };
    let number = |t: &str, what: &str| -> Result<f64, String> {
        t.parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| format!("--{name} '{text}': the {what} '{t}' is not a number; {how}"))
    };
    let (from_ev, to_ev, count) = (number(from, "FROM")?, number(to, "TO")?, number(n, "N")?);
    if !(count.fract() == 0.0 && (2.0..=MAX_AXIS_POINTS as f64).contains(&count)) {
        return Err(format!(
            "--{name} '{text}': N = {n} is not usable; give a whole number of points from 2 to {MAX_AXIS_POINTS}"
        ));
    }
    check_gap_range(&format!("{cell} band-gap range"), from_ev, to_ev)
        .map_err(|e| format!("--{name} '{text}': {e}"))?;
    Ok(MapAxis { from_ev, to_ev, n: count as usize })
}

/// `glowgap map --top FROM:TO:N --bottom FROM:TO:N [--connection C] [SOURCE AND CELL OPTIONS]
/// [--best] [--json | --csv]`
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a < b) on purpose: it also refuses NaN
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap map': choose one of --json and --csv".into()));
    }
    let top = axis(&p, "top", "top cell's", "1.2:2.4:121")?;
    let bottom = axis(&p, "bottom", "bottom cell's", "0.5:1.5:121")?;
    if !(bottom.from_ev < top.to_ev) {
        return Err(Failure::Usage(format!(
            "--top {}-{} eV and --bottom {}-{} eV: no top gap is above a bottom gap, so the map has no stack; \
             give a bottom range that starts below the top range's end",
            top.from_ev, top.to_ev, bottom.from_ev, bottom.to_ev
        )));
    }
    let wiring = connection(&p)?;
    let mut sc = CellScenario::default();
    apply_common(&p, &mut sc)?;
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let (top_ev, bottom_ev) = (top.gaps_ev(), bottom.gaps_ev());
    let to_j = |g: &[f64]| -> Vec<f64> { g.iter().map(|&e| ev(e)).collect() };
    let map = tandem_map(&setup.light, &setup.cell, wiring.into(), &to_j(&top_ev), &to_j(&bottom_ev));
    let grid = Grid { top_ev: &top_ev, bottom_ev: &bottom_ev, map: &map };
    let best = grid.best();
    let mut buf = std::io::BufWriter::with_capacity(1 << 16, out);
    if p.flag("json") {
        grid.write_json(&mut buf, best, p.flag("best"))?;
    } else if p.flag("csv") {
        grid.write_csv(&mut buf, best, p.flag("best"))?;
    } else {
        let (t, b, e) = best;
        writeln!(buf, "{:<28} {:.4} eV / {:.4} eV, {:.3} %", "Best grid point", t, b, e * 100.0)?;
        if !p.flag("best") {
            writeln!(buf, "{:<28} {}", "Source", setup.light.source.name())?;
            writeln!(buf, "{:<28} {}", "Connection", connection_words(wiring))?;
            for (label, a) in [("Top gaps", &top), ("Bottom gaps", &bottom)] {
                writeln!(buf, "{:<28} {} to {} eV, {} points", label, a.from_ev, a.to_ev, a.n)?;
            }
            writeln!(buf, "{:<28} {} of {} grid points", "Stacks (top above bottom)", grid.stacks(), top.n * bottom.n)?;
        }
    }
    buf.flush()?;
    Ok(())
}

/// The computed map with its axes as given [eV].
struct Grid<'a> {
    top_ev: &'a [f64],
    bottom_ev: &'a [f64],
    map: &'a EfficiencyMap,
}

impl Grid<'_> {
    /// Whether (row i, column k) is a stack: the bottom gap below the top gap.
    fn is_stack(&self, i: usize, k: usize) -> bool {
        self.bottom_ev[k] < self.top_ev[i]
    }

    fn stacks(&self) -> usize {
        self.top_ev.iter().map(|&t| self.bottom_ev.iter().filter(|&&b| b < t).count()).sum()
    }

    /// The best stack of the grid: (top [eV], bottom [eV], efficiency); the first on a tie.
    fn best(&self) -> (f64, f64, f64) {
        let nb = self.bottom_ev.len();
        let mut best = (f64::NAN, f64::NAN, f64::NEG_INFINITY);
        for (idx, &e) in self.map.efficiency.iter().enumerate() {
            let (i, k) = (idx / nb, idx % nb);
            if e > best.2 && self.is_stack(i, k) {
                best = (self.top_ev[i], self.bottom_ev[k], e);
            }
        }
        best
    }

    fn write_json(&self, w: &mut impl Write, best: (f64, f64, f64), only_best: bool) -> std::io::Result<()> {
        let num = |w: &mut dyn Write, x: f64| serde_json::to_writer(w, &x).map_err(std::io::Error::other);
        write!(w, "{{")?;
        if !only_best {
            for (key, values) in [("top_ev", self.top_ev), ("bottom_ev", self.bottom_ev)] {
                write!(w, "\"{key}\":[")?;
                for (k, &v) in values.iter().enumerate() {
                    if k > 0 {
                        write!(w, ",")?;
                    }
                    num(w, v)?;
                }
                write!(w, "],")?;
            }
            write!(w, "\"efficiency\":[")?;
            let nb = self.bottom_ev.len();
            for (i, row) in self.map.efficiency.chunks(nb).enumerate() {
                write!(w, "{}[", if i > 0 { "," } else { "" })?;
                for (k, &e) in row.iter().enumerate() {
                    if k > 0 {
                        write!(w, ",")?;
                    }
                    if self.is_stack(i, k) {
                        num(w, e)?;
                    } else {
                        write!(w, "null")?;
                    }
                }
                write!(w, "]")?;
            }
            write!(w, "],")?;
        }
        write!(w, "\"best\":{{\"top_ev\":")?;
        num(w, best.0)?;
        write!(w, ",\"bottom_ev\":")?;
        num(w, best.1)?;
        write!(w, ",\"efficiency\":")?;
        num(w, best.2)?;
        writeln!(w, "}}}}")
    }

    fn write_csv(&self, w: &mut impl Write, best: (f64, f64, f64), only_best: bool) -> std::io::Result<()> {
        writeln!(w, "top_ev,bottom_ev,efficiency")?;
        if only_best {
            return writeln!(w, "{},{},{}", best.0, best.1, best.2);
        }
        let nb = self.bottom_ev.len();
        for (idx, &e) in self.map.efficiency.iter().enumerate() {
            let (i, k) = (idx / nb, idx % nb);
            if self.is_stack(i, k) {
                writeln!(w, "{},{},{}", self.top_ev[i], self.bottom_ev[k], e)?;
            } else {
                writeln!(w, "{},{},", self.top_ev[i], self.bottom_ev[k])?;
            }
        }
        Ok(())
    }
}
