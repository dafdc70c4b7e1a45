//! Measured tables the user brings to the radiator: an emissivity (or absorptance, or
//! reflectance) of the surface, and a zenith transmittance of the sky. A file that cannot be
//! used changes nothing; the reason, with its line, is shown next to its control.

use crate::view::controls::Control;
use leptos::prelude::*;

use crate::app::import::read_then;
use crate::app::radiator::state::RadiatorState;
use crate::app::state::Ctx;
use crate::formats::emissivity_csv::{parse_emissivity_csv, parse_transmittance_csv, OpticalHints, OpticalTable};
use crate::formats::TableKind;
use crate::scenario::radiator::{EmissivityTable, EmitterSpec, SkySpec, TransmittanceTable};
use crate::view::hints::page_message;
use crate::view::tables::stem;

/// Make `apply(table)` the scenario's, or say under `hook` why the file cannot be used.
fn use_table(
    ctx: Ctx,
    hook: Control,
    file_name: &str,
    parsed: Result<OpticalTable, String>,
    what: &str,
    apply: impl FnOnce(&mut crate::scenario::Scenario, OpticalTable),
) -> bool {
    match parsed {
        Ok(t) => {
            if ctx.edit(hook, move |s| apply(s, t)) {
                ctx.status.set(Some(format!("Loaded '{file_name}' as the {what}.")));
                true
            } else {
                if let Some(msg) = ctx.errors.with_untracked(|e| e.get(&hook).cloned()) {
                    ctx.set_error(
                        hook,
                        format!(
                            "'{file_name}' was read but cannot be used: {msg} The previous {what} is still in use."
                        ),
                    );
                }
                false
            }
        }
        Err(e) => {
            ctx.set_error(hook, format!("'{file_name}' was not loaded — {e}. Fix the file and load it again; the previous {what} is still in use."));
            false
        }
    }
}

/// Read a measured emissivity file and make it the profile.
pub fn open_emissivity(ctx: Ctx, rad: RadiatorState, file: web_sys::File) {
    read_then(file, move |name, text| use_emissivity_text(ctx, rad, &name, text));
}

pub fn use_emissivity_text(ctx: Ctx, rad: RadiatorState, file_name: &str, text: Result<String, String>) {
    let parsed = text.and_then(|t| {
        parse_emissivity_csv(&t, &OpticalHints::default(), &stem(file_name))
            .map_err(|e| page_message(&e, TableKind::Emissivity))
    });
    let used = use_table(ctx, Control::EmissivityFile, file_name, parsed, "emissivity profile", |s, t| {
        s.radiator.emitter =
            EmitterSpec::Table(EmissivityTable { name: t.name, wavelength_m: t.wavelength_m, emissivity: t.values });
    });
    if used {
        rad.selected.set(None);
        ctx.clear_error(Control::EmissivityEditor);
    }
}

/// Read a zenith transmittance file and make it the sky.
pub fn open_sky(ctx: Ctx, file: web_sys::File) {
    read_then(file, move |name, text| {
        let parsed = text.and_then(|t| {
            parse_transmittance_csv(&t, &OpticalHints::default(), &stem(&name))
                .map_err(|e| page_message(&e, TableKind::Transmittance))
        });
        if use_table(ctx, Control::SkyFile, &name, parsed, "sky transmittance", |s, t| {
            s.radiator.sky = SkySpec::Table(TransmittanceTable {
                name: t.name,
                wavelength_m: t.wavelength_m,
                transmittance: t.values,
            });
        }) {
            ctx.clear_error(Control::Sky);
        }
    });
}
