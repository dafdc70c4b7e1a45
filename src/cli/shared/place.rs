//! A place under a cloudless sky from command-line options: `--lat`, `--lon` and the other
//! keys of the scenario's `clearsky:` text (`--elevation`, `--pwv`, `--sky-model` ...), one
//! option per key with the key's own name, so every command that takes a place (`sun`,
//! `yield`) and the `clearsky:` light source share one parser ([`PlaceSpec::set`]) and one
//! set of checks ([`PlaceSpec::to_site`]). Messages name the option the user typed.
//!
//! Architecture invariant: values are parsed and checked by the scenario's own `PlaceSpec`,
//! never by range checks of their own; this module only words the scenario's messages as
//! this command line's options.

use crate::cli::args::{OptionDoc, Parsed};
use crate::scenario::place::PlaceSpec;

/// The place's option names, each equal to its `clearsky:` key, in the order of the help.
pub const PLACE_KEYS: &[&str] = &[
    "lat",
    "lon",
    "elevation",
    "pressure",
    "air-temp",
    "delta-t",
    "tilt",
    "azimuth",
    "pwv",
    "ozone",
    "aod500",
    "angstrom",
    "albedo",
    "sky-model",
];

/// A command's valued options: `lat`, `lon`, then `extra`, then the other place keys
/// (`M` must be `N + PLACE_KEYS.len()`), e.g.
/// `const VALUED: [&str; PLACE_KEYS.len() + 1] = place_keys_with(["time"]);`.
pub const fn place_keys_with<const N: usize, const M: usize>(extra: [&'static str; N]) -> [&'static str; M] {
    assert!(M == N + PLACE_KEYS.len(), "M must be N + PLACE_KEYS.len()");
    let mut out = [""; M];
    let (mut i, mut k) = (0, 0);
    while i < PLACE_KEYS.len() {
        if i == 2 {
            while k < N {
                out[2 + k] = extra[k];
                k += 1;
            }
        }
        out[if i < 2 { i } else { i + N }] = PLACE_KEYS[i];
        i += 1;
    }
    out
}

const PLACE_DOCS: &[OptionDoc] = &[
    OptionDoc { name: "lat", arg: "DEG", text: "latitude in degrees, north positive, -90 to 90, required" },
    OptionDoc { name: "lon", arg: "DEG", text: "longitude in degrees, east positive, -180 to 180, required" },
    OptionDoc {
        name: "elevation",
        arg: "M",
        text: "height above sea level in metres, -500 to 9000, default 0; also sets the pressure\n\
               by the standard atmosphere unless --pressure is given",
    },
    OptionDoc {
        name: "pressure",
        arg: "HPA",
        text: "surface air pressure in hPa, 10 to 1200 (default: the standard atmosphere at\n\
               --elevation, 1013.25 at sea level)",
    },
    OptionDoc {
        name: "air-temp",
        arg: "C",
        text: "air temperature in deg C for the refraction of the sun's position, default 12",
    },
    OptionDoc {
        name: "delta-t",
        arg: "S",
        text: "TT - UT1 in seconds (default: the Espenak & Meeus polynomials for the date)",
    },
    OptionDoc {
        name: "tilt",
        arg: "DEG",
        text: "tilt of the receiving plane from horizontal in degrees, 0 to 180, default 0",
    },
    OptionDoc {
        name: "azimuth",
        arg: "DEG",
        text: "direction the plane faces, clockwise from north in degrees, 0 to 360,\n\
               default 180 (south-facing)",
    },
    OptionDoc { name: "pwv", arg: "CM", text: "precipitable water in cm, 0 to 15, default 1.4" },
    OptionDoc { name: "ozone", arg: "ATM_CM", text: "ozone column in atm-cm, 0 to 1, default 0.3" },
    OptionDoc { name: "aod500", arg: "TAU", text: "aerosol optical depth at 500 nm, 0 to 5, default 0.1" },
    OptionDoc { name: "angstrom", arg: "ALPHA", text: "Angstrom exponent of the aerosol, -1 to 4, default 1.14" },
    OptionDoc { name: "albedo", arg: "A", text: "ground albedo, 0 to 1, default 0.2" },
    OptionDoc {
        name: "sky-model",
        arg: "MODEL",
        text: "diffuse sky light on a tilted plane, per wavelength: isotropic | hay-davies\n\
               (default)",
    },
];

/// The help of the place's options (the same names as [`PLACE_KEYS`]).
pub fn place_options() -> &'static [OptionDoc] {
    PLACE_DOCS
}

/// The place of `p`: `--lat` and `--lon` required, every other key defaulted by
/// `PlaceSpec::default()`, checked as a whole by the scenario.
pub fn place_from_args(p: &Parsed, command: &str) -> Result<PlaceSpec, String> {
    let mut place = PlaceSpec::default();
    for key in ["lat", "lon"] {
        if p.text(key).is_none() {
            let (what, e) =
                if key == "lat" { ("latitude in degrees", "45.5") } else { ("longitude in degrees", "7.2") };
            return Err(format!("'glowgap {command}' needs --{key}: the {what}, e.g. --{key} {e}"));
        }
    }
    for key in PLACE_KEYS {
        if let Some(v) = p.text(key) {
            place.set(key, v).map_err(|e| format!("--{key}: {e}"))?;
        }
    }
    place.to_site().map_err(|e| option_message(&e, "--", ""))?;
    Ok(place)
}

/// The key of `PlaceSpec` that a message of its checks is about, if one can be told.
pub fn key_of_message(message: &str) -> Option<&'static str> {
    const WORDS: &[(&str, &str)] = &[
        ("latitude", "lat"),
        ("longitude", "lon"),
        ("elevation", "elevation"),
        ("precipitable water", "pwv"),
        ("pressure", "pressure"),
        ("air temperature", "air-temp"),
        ("delta T", "delta-t"),
        ("azimuth", "azimuth"),
        ("tilt", "tilt"),
        ("ozone", "ozone"),
        ("aerosol optical depth", "aod500"),
        ("Angstrom", "angstrom"),
        ("albedo", "albedo"),
        ("sky model", "sky-model"),
    ];
    WORDS.iter().find(|(w, _)| message.contains(w)).map(|(_, k)| *k)
}

/// A message of the place's checks with the option in front: `{before}{key}{after}: ...`
/// (e.g. `--lat: the latitude 95 deg ...`, or `--day lat=: ...`).
pub fn option_message(message: &str, before: &str, after: &str) -> String {
    match key_of_message(message) {
        Some(key) => format!("{before}{key}{after}: {message}"),
        None => message.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::place::PlaceSpec;

    #[test]
    fn every_check_of_a_place_names_its_key() {
        let bad: &[(&str, &str)] = &[
            ("lat", "95"),
            ("lon", "200"),
            ("elevation", "20000"),
            ("pressure", "5"),
            ("air-temp", "99"),
            ("delta-t", "1e6"),
            ("tilt", "200"),
            ("azimuth", "400"),
            ("pwv", "-1"),
            ("pwv", "20"),
            ("ozone", "3"),
            ("aod500", "9"),
            ("angstrom", "7"),
            ("albedo", "2"),
        ];
        for (key, value) in bad {
            let mut p = PlaceSpec::default();
            assert!(p.set(key, value).unwrap());
            let e = p.to_site().unwrap_err();
            assert_eq!(key_of_message(&e), Some(*key), "{key}={value}: {e}");
        }
        assert!(PlaceSpec::default().set("sky-model", "flat").unwrap_err().contains("sky model"));
        for d in place_options() {
            assert!(PLACE_KEYS.contains(&d.name), "{}", d.name);
        }
        assert_eq!(place_options().len(), PLACE_KEYS.len());
        let keys: [&str; 16] = place_keys_with(["time", "date"]);
        assert_eq!(&keys[..4], &["lat", "lon", "time", "date"]);
        assert_eq!(&keys[4..], &PLACE_KEYS[2..]);
    }
}
