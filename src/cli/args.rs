//! A small, strict option parser: `--name value` or `--name=value`, flags without values,
//! and one error line for anything unexpected; and the description of a command (its
//! options and their help) that the parser and the help share.
//!
//! Architecture invariant: imports nothing of the cli; a command's [`Spec`] is the one list
//! of the options it parses and the options its help describes.

use std::collections::BTreeMap;

/// The options of one command after parsing.
#[derive(Debug, Default)]
pub struct Parsed {
    values: BTreeMap<String, String>,
    flags: Vec<String>,
    pub positional: Vec<String>,
}

/// What a command accepts.
pub struct Spec {
    pub command: &'static str,
    /// options that take a value, without the leading dashes
    pub valued: &'static [&'static str],
    /// options that take no value
    pub flags: &'static [&'static str],
    /// how many positional arguments at most
    pub max_positional: usize,
}

/// The help of one option: `--name ARG  text`. `text` states the unit and the default (or
/// that the option is required); further lines of `text` are indented under the first.
#[derive(Clone, Copy)]
pub struct OptionDoc {
    /// without the leading dashes
    pub name: &'static str,
    /// the value's placeholder, empty for a flag
    pub arg: &'static str,
    pub text: &'static str,
}

impl Spec {
    /// Every option, valued first, without dashes.
    pub fn options(&self) -> impl Iterator<Item = &'static str> {
        self.valued.iter().chain(self.flags.iter()).copied()
    }

    fn accepted(&self) -> String {
        let mut all: Vec<String> = self.valued.iter().map(|v| format!("--{v}")).collect();
        all.extend(self.flags.iter().map(|f| format!("--{f}")));
        all.join(", ")
    }

    pub fn parse(&self, args: &[String]) -> Result<Parsed, String> {
        let mut out = Parsed::default();
        let mut i = 0;
        while i < args.len() {
            let a = &args[i];
            if let Some(body) = a.strip_prefix("--") {
                let (name, inline) = match body.split_once('=') {
                    Some((n, v)) => (n, Some(v.to_string())),
                    None => (body, None),
                };
                if self.flags.contains(&name) {
                    if inline.is_some() {
                        return Err(format!("'glowgap {}': --{name} takes no value", self.command));
                    }
                    out.flags.push(name.to_string());
                } else if self.valued.contains(&name) {
                    let v = match inline {
                        Some(v) => v,
                        None => {
                            i += 1;
                            match args.get(i) {
                                Some(v) if !v.starts_with("--") => v.clone(),
                                _ => {
                                    return Err(format!(
                                        "'glowgap {}': --{name} needs a value, e.g. --{name} {}",
                                        self.command,
                                        example_for(name)
                                    ))
                                }
                            }
                        }
                    };
                    if out.values.insert(name.to_string(), v).is_some() {
                        return Err(format!("'glowgap {}': --{name} is given twice; give it once", self.command));
                    }
                } else {
                    return Err(format!(
                        "'glowgap {}': unknown option '--{name}'; accepted: {}",
                        self.command,
                        self.accepted()
                    ));
                }
            } else if out.positional.len() < self.max_positional {
                out.positional.push(a.clone());
            } else {
                return Err(format!(
                    "'glowgap {}': unexpected argument '{a}'; options start with --, accepted: {}",
                    self.command,
                    self.accepted()
                ));
            }
            i += 1;
        }
        Ok(out)
    }
}

fn example_for(name: &str) -> &'static str {
    match name {
        "gap" => "1.34",
        "from" => "0.5",
        "to" => "3.0",
        "step" => "0.01",
        "spectrum" => "am1.5g",
        "concentration" => "1",
        "cell-temp" => "300",
        "ere" => "1",
        "emission" => "front",
        "approx" => "exact",
        "temp" => "1500",
        "luminescent-coupling" => "0.3",
        "doping" => "1e15",
        _ => "VALUE",
    }
}

/// A value as typed, in quotes, shortened to 40 characters and its length (a value can be
/// thousands of characters long).
fn shorten(s: &str) -> String {
    const MAX: usize = 40;
    let n = s.chars().count();
    if n <= MAX {
        format!("'{s}'")
    } else {
        format!("'{}...' ({n} characters)", s.chars().take(MAX).collect::<String>())
    }
}

impl Parsed {
    pub fn flag(&self, name: &str) -> bool {
        self.flags.iter().any(|f| f == name)
    }

    pub fn text(&self, name: &str) -> Option<&str> {
        self.values.get(name).map(|s| s.as_str())
    }

    /// A number option; `what` and `unit` make the error message.
    pub fn number(&self, name: &str, what: &str, unit: &str) -> Result<Option<f64>, String> {
        match self.values.get(name) {
            None => Ok(None),
            Some(s) => {
                let shown = shorten(s);
                let v: f64 = s.trim().parse().map_err(|_| {
                    format!(
                        "--{name} {shown} is not a number; give the {what} ({unit}), e.g. --{name} {}",
                        example_for(name)
                    )
                })?;
                if !v.is_finite() {
                    let written_out =
                        s.trim().trim_start_matches(['+', '-']).starts_with(|c: char| c.is_ascii_digit() || c == '.');
                    let why = if written_out {
                        "is out of range (too large for any setting)"
                    } else {
                        "is not a finite number"
                    };
                    return Err(format!(
                        "--{name} {shown} {why}; give the {what} ({unit}), e.g. --{name} {}",
                        example_for(name)
                    ));
                }
                Ok(Some(v))
            }
        }
    }

    pub fn required_number(&self, name: &str, what: &str, unit: &str, command: &str) -> Result<f64, String> {
        self.number(name, what, unit)?.ok_or_else(|| {
            format!("'glowgap {command}' needs --{name}: the {what} ({unit}), e.g. --{name} {}", example_for(name))
        })
    }
}
