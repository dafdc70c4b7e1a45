//! The help texts: the overview (`glowgap help`) and one page per command
//! (`glowgap help COMMAND`, `glowgap COMMAND --help`), built from each command's description
//! so that the options a command parses and the options its help lists are one list.
//!
//! Architecture invariant: every help text is assembled here from `Command` descriptions and
//! option docs written once (a command's own in its module, shared ones in
//! `shared::options::SHARED_DOCS`, a place's in `shared::place::place_options`); no option's
//! text is written twice.

use super::args::OptionDoc;
use super::commands::ALL;
use super::shared::options::SHARED_DOCS;
use super::shared::place::place_options;
use super::shared::Command;

const TITLE: &str = "glowgap: detailed-balance limits of solar cells, stacks and radiators";

const CAUTIONS: &str = "\
These are detailed-balance limits, not predictions of a real device. The cooling balance is
idealized too. Sunlit and hot surfaces can burn; roof and building work follows local codes
and licensed practice.
";

/// Column where option texts start.
const TEXT_COLUMN: usize = 25;

/// The overview: every command's synopsis and what it prints.
pub fn overview() -> String {
    let mut s = format!("{TITLE}\n\nusage:\n");
    for c in ALL {
        push_usage(&mut s, c);
        s.push_str(&format!("      {}\n", c.about));
    }
    s.push_str(
        "\n'glowgap help COMMAND' or 'glowgap COMMAND --help' lists a command's options with their units\n\
         and defaults. SOURCE AND CELL OPTIONS: --spectrum, --spectrum-axis, --spectrum-values,\n\
         --spectrum-column, --concentration, --cell-temp, --ere, --emission, --approx.\n\
         RADIATOR OPTIONS: see 'glowgap help cool'. --link prints the scenario's share-link fragment\n\
         (#g1.…) to append to the app's address.\n\n",
    );
    s.push_str(CAUTIONS);
    s
}

/// The help of one command: synopsis, then every option it accepts with units and defaults.
pub fn command_help(c: &Command) -> String {
    let mut s = format!("glowgap {}: {}\n\nusage:\n", c.spec.command, c.about);
    push_usage(&mut s, c);
    if c.spec.max_positional > 0 {
        s.push_str("\nLINK is a share link (or its #g1.… fragment), FILE a scenario file, - standard input.\n");
    }
    s.push_str("\noptions:\n");
    for name in c.spec.options() {
        match option_doc(c, name) {
            Some(doc) => push_option(&mut s, doc),
            None => s.push_str(&format!("  --{name}\n")),
        }
    }
    push_option(&mut s, &OptionDoc { name: "help", arg: "", text: "print this help (also -h)" });
    s.push('\n');
    s.push_str(CAUTIONS);
    s
}

/// The doc of option `name` of `c`: the command's own, else the shared one.
pub fn option_doc(c: &Command, name: &str) -> Option<&'static OptionDoc> {
    c.docs.iter().chain(SHARED_DOCS).chain(place_options()).find(|d| d.name == name)
}

fn push_usage(s: &mut String, c: &Command) {
    for (i, line) in c.usage.lines().enumerate() {
        let lead = if i == 0 { "  glowgap " } else { "            " };
        s.push_str(lead);
        s.push_str(line.trim());
        s.push('\n');
    }
}

fn push_option(s: &mut String, doc: &OptionDoc) {
    let head = if doc.arg.is_empty() { format!("  --{}", doc.name) } else { format!("  --{} {}", doc.name, doc.arg) };
    s.push_str(&head);
    let mut lines = doc.text.lines();
    if head.chars().count() + 1 < TEXT_COLUMN {
        s.push_str(&" ".repeat(TEXT_COLUMN - head.chars().count()));
    } else {
        s.push('\n');
        s.push_str(&" ".repeat(TEXT_COLUMN));
    }
    s.push_str(lines.next().unwrap_or("").trim());
    s.push('\n');
    for line in lines {
        s.push_str(&" ".repeat(TEXT_COLUMN));
        s.push_str(line.trim());
        s.push('\n');
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_option_of_every_command_has_a_doc() {
        for c in ALL {
            for name in c.spec.options() {
                assert!(option_doc(c, name).is_some(), "glowgap {}: --{name} has no help", c.spec.command);
            }
        }
    }

    #[test]
    fn every_doc_is_used_and_states_a_default_or_that_it_is_required() {
        for c in ALL {
            for d in c.docs {
                assert!(
                    c.spec.options().any(|o| o == d.name),
                    "glowgap {}: --{} is not accepted",
                    c.spec.command,
                    d.name
                );
            }
            for name in c.spec.valued {
                let text = option_doc(c, name).map(|d| d.text).unwrap_or_default();
                let says = ["default", "required", "; or give", "of the table", "of a table"];
                assert!(says.iter().any(|w| text.contains(w)), "glowgap {} --{name}: {text}", c.spec.command);
            }
        }
        for d in SHARED_DOCS.iter().chain(place_options()) {
            assert!(ALL.iter().any(|c| c.spec.options().any(|o| o == d.name)), "--{} is used by no command", d.name);
        }
    }

    #[test]
    fn texts_are_aligned_and_short() {
        for c in ALL {
            for line in command_help(c).lines() {
                assert!(line.chars().count() <= 110, "{line}");
            }
        }
        let mut s = String::new();
        push_option(&mut s, &OptionDoc { name: "x", arg: "Y", text: "a\nb" });
        assert_eq!(s, format!("  --x Y{}a\n{}b\n", " ".repeat(TEXT_COLUMN - 7), " ".repeat(TEXT_COLUMN)));
    }
}
