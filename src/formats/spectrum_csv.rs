//! A spectrum from a delimited text table.
//!
//! # Layout
//!
//! The layout of every data file (see [`super::table`]: one point per line, the spectral
//! coordinate in column 0, values in the following columns, commas, semicolons, tabs or
//! spaces, `#` comments, an optional header line). A header's names may carry units, e.g.
//! `wavelength_nm,irradiance_W_m2_nm`, `Wavelength (nm), Irradiance (W m-2 nm-1)` or
//! `lambda [um]; E [W/m^2/um]` (see [`super::units`]). Explicit [`ColumnHints`] override
//! whatever the header says.
//!
//! # Conversion
//!
//! The axis keeps its kind (a wavelength file gives a wavelength spectrum) and both axis and
//! values are only rescaled into SI: the value unit must be a density per a unit of the same
//! kind as the axis (per nm or per um on a wavelength axis, per eV on an energy axis, per
//! cm^-1 on a wavenumber axis). Scaling the axis by `a` and the density by `1/a` leaves every
//! trapezoid area, hence every band integral, unchanged. Points are stored in ascending SI
//! order whatever the order of the file.
//!
//! Architecture invariant: the reader turns text into a validated [`Spectrum`] or a
//! [`TableError`] whose message names no option or control (the hint says which setting would
//! fix the file); it rescales units only, so every band integral of the file is conserved.

use super::table::{check_distinct, check_value_column, quoted, scan_table, Hint, TableError, TableKind, TablePoints};
use super::units::{axis_unit_from_name, value_unit_from_name, AxisUnit, ValueUnit, VALUE_UNITS_HELP};
use crate::physics::spectrum::{Axis, Spectrum, SpectrumError};

/// Units and column chosen by the caller; each `Some` overrides the header.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct ColumnHints {
    /// Unit of the axis column (column 0).
    pub axis: Option<AxisUnit>,
    /// Unit of the value column.
    pub value: Option<ValueUnit>,
    /// The value column, counting the axis column as 0; default 1.
    pub column: Option<usize>,
}

/// The hint for a spectrum's axis unit: every axis unit is accepted.
const AXIS_HINT: Hint = Hint::AxisUnit { accepted: &AxisUnit::ALL };

/// Read a spectrum table (see the module documentation for the layout). `name` is the
/// spectrum's name and appears in its provenance.
pub fn parse_spectrum_csv(text: &str, hints: &ColumnHints, name: &str) -> Result<Spectrum, TableError> {
    let value_col = hints.column.unwrap_or(1);
    check_value_column(value_col)?;
    let scan = scan_table(text)?;

    // Units: explicit hints first, then the header.
    let from_header = hints.axis.is_none() || hints.value.is_none();
    scan.check_header_width(from_header)?;
    let names = &scan.names;
    let ncols = scan.ncols;
    let header_line = scan.header_line;
    let value_name = names.get(value_col).map(String::as_str);
    let axis_unit = match hints.axis {
        Some(u) => u,
        None => match names.first().and_then(|n| axis_unit_from_name(n)) {
            Some(u) => u,
            None => return Err(missing_axis_unit(header_line, names.first().map(String::as_str))),
        },
    };
    let value_unit = match hints.value {
        Some(u) => u,
        None => match value_name.and_then(value_unit_from_name) {
            Some(u) => u,
            None => return Err(missing_value_unit(header_line, value_col, value_name)),
        },
    };
    if axis_unit.axis() != value_unit.per().axis() {
        let msg = format!(
            "the values are per {} but the axis is in {}: a density per {} cannot be put on a {} \
             axis by rescaling; give values per {} (or an axis in {})",
            value_unit.per().label(),
            axis_unit.label(),
            axis_kind(value_unit.per().axis()),
            axis_kind(axis_unit.axis()),
            units_of_kind(axis_unit.axis()),
            units_of_kind(value_unit.per().axis()),
        );
        return Err(TableError::maybe_at(header_line.filter(|_| from_header), msg).with_hint(Hint::Units));
    }

    // Pass 2: numbers, in file order.
    let TablePoints { mut xs, mut ys, line_of } = scan.read_points(value_col, TableKind::Spectrum)?;

    // Into SI.
    for ((x, y), &line) in xs.iter_mut().zip(ys.iter_mut()).zip(&line_of) {
        *x = axis_unit.coordinate_to_si(*x);
        *y = value_unit.value_to_si(*y);
        if !(x.is_finite() && *x > 0.0) {
            return Err(TableError::at(
                line,
                format!(
                    "the axis value is out of the representable range once converted from {} to SI; \
                     check the axis unit",
                    axis_unit.label()
                ),
            )
            .with_hint(AXIS_HINT));
        }
        if !y.is_finite() {
            return Err(TableError::at(
                line,
                format!("the value overflows once converted from {} to SI; check the value unit", value_unit.label()),
            )
            .with_hint(Hint::ValueUnit));
        }
    }
    check_distinct(&xs, &line_of)?;

    let n = xs.len();
    let mut provenance =
        format!("user file '{name}', {n} points, axis {}, values {}", axis_unit.label(), value_unit.label());
    if ncols > 2 || hints.column.is_some() {
        provenance.push_str(&format!(", column {value_col}"));
        if let Some(v) = value_name {
            provenance.push_str(&format!(" {}", quoted(v)));
        }
    }
    let spectrum = Spectrum::new(name, provenance, axis_unit.axis(), value_unit.quantity(), xs, ys)
        .map_err(|e| spectrum_error(&e, &line_of))?;
    if !(spectrum.total_power().is_finite() && spectrum.total_photon_flux().is_finite()) {
        return Err(TableError::general(format!(
            "the values are too large: their integral overflows; check the value unit (now {})",
            value_unit.label()
        ))
        .with_hint(Hint::ValueUnit));
    }
    Ok(spectrum)
}

fn spectrum_error(e: &SpectrumError, line_of: &[usize]) -> TableError {
    let index = match e {
        SpectrumError::NotFinite { index }
        | SpectrumError::NotAscending { index }
        | SpectrumError::Negative { index }
        | SpectrumError::NonPositiveAxis { index } => Some(*index),
        _ => None,
    };
    TableError::maybe_at(index.and_then(|i| line_of.get(i)).copied(), format!("the table is not a valid spectrum: {e}"))
}

fn axis_kind(a: Axis) -> &'static str {
    match a {
        Axis::Wavelength => "wavelength",
        Axis::PhotonEnergy => "photon energy",
        Axis::Wavenumber => "wavenumber",
    }
}

fn units_of_kind(a: Axis) -> &'static str {
    match a {
        Axis::Wavelength => "nm or um",
        Axis::PhotonEnergy => "eV",
        Axis::Wavenumber => "cm-1",
    }
}

/// Why a file has no usable unit for `what` (column `col` named `name`, header on
/// `header_line`).
fn missing_unit(what: &str, header_line: Option<usize>, col: usize, name: Option<&str>) -> TableError {
    let why = match (header_line, name) {
        (Some(_), Some(n)) => format!("column {col} is named {} with no recognised unit", quoted(n)),
        (Some(_), None) if col == 0 => "the header names no columns".to_string(),
        (Some(_), None) => format!("the header names no column {col}"),
        _ => "the file has no header line (a header must not start with '#', '%' or '//', which mark comments)"
            .to_string(),
    };
    TableError::maybe_at(header_line, format!("the unit of {what} is missing: {why}"))
}

fn missing_axis_unit(header_line: Option<usize>, name: Option<&str>) -> TableError {
    missing_unit("the spectral axis", header_line, 0, name).with_hint(AXIS_HINT)
}

fn missing_value_unit(header_line: Option<usize>, col: usize, name: Option<&str>) -> TableError {
    let mut e = missing_unit("the values", header_line, col, name);
    if name.is_some() {
        e.message.push_str(&format!("; accepted units: {VALUE_UNITS_HELP}"));
    }
    e.with_hint(Hint::ValueUnit)
}

// ---------------------------------------------------------------------------------------------

// ---------------------------------------------------------------------------------------------

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::constants::{CHARGE, HC};
    use crate::physics::spectrum::Quantity;

    fn parse(text: &str) -> Result<Spectrum, TableError> {
        parse_spectrum_csv(text, &ColumnHints::default(), "test")
    }

    fn err(text: &str) -> TableError {
        match parse(text) {
            Ok(s) => panic!("expected an error, got a spectrum of {} points", s.len()),
            Err(e) => e,
        }
    }

    fn rel(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    // ---- headers and layouts ----

    #[test]
    fn header_forms_from_the_layout_description() {
        let s = parse("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,1\n").unwrap();
        assert_eq!(s.axis(), Axis::Wavelength);
        assert_eq!(s.quantity(), Quantity::Irradiance);
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        assert_eq!(s.provenance, "user file 'test', 2 points, axis nm, values W m^-2 nm^-1");

        let s = parse("Wavelength (nm), Irradiance (W m-2 nm-1)\n400, 1\n500, 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);

        let s = parse("energy_eV,photon_flux_per_m2_s_eV\n1,1e21\n2,1e21\n").unwrap();
        assert_eq!(s.axis(), Axis::PhotonEnergy);
        assert_eq!(s.quantity(), Quantity::PhotonFlux);
        assert!(rel(s.total_photon_flux(), 1e21) < 1e-12);

        let s = parse("wavenumber (cm-1), W/m2/cm-1\n10000,0.5\n20000,0.5\n").unwrap();
        assert_eq!(s.axis(), Axis::Wavenumber);
        assert!(rel(s.total_power(), 5000.0) < 1e-12);

        let s = parse("lambda [um]; E [W/m^2/um]\n0.4;1000\n0.8;1000\n").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);

        // whitespace-separated header with bracketed units
        let s = parse("Wavelength (nm)  Irradiance (W m-2 nm-1)\n400 1\n500 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        // quoted spreadsheet export, header separated differently from the data
        let s = parse("\"wavelength_nm\",\"irradiance_W_m2_nm\"\n400 1\n500 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
    }

    #[test]
    fn four_column_header_with_column_choice() {
        let text = "wavelength_nm,extraterrestrial,global,direct\n\
                    400,2,1,0.5\n500,2,1,0.5\n600,2,1,0.5\n";
        let axis = Some(AxisUnit::Nanometre);
        let value = Some(ValueUnit::irradiance(AxisUnit::Nanometre));
        // default: the first value column
        let s = parse_spectrum_csv(text, &ColumnHints { axis, value, column: None }, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
        for (col, want, label) in [(1, 400.0, "'extraterrestrial'"), (2, 200.0, "'global'"), (3, 100.0, "'direct'")] {
            let s = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(col) }, "x").unwrap();
            assert!(rel(s.total_power(), want) < 1e-12, "column {col}");
            assert!(s.provenance.ends_with(&format!("column {col} {label}")), "{}", s.provenance);
        }
        // the header gives no value unit: the error says so and names the option
        let e = parse_spectrum_csv(text, &ColumnHints { column: Some(2), ..Default::default() }, "x").unwrap_err();
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("'global'"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueUnit));
        // per-column units in the header
        let text2 = "Wavelength (nm), ETR (W m-2 nm-1), Global (W m-2 nm-1)\n400,2,1\n500,2,1\n";
        let s = parse_spectrum_csv(text2, &ColumnHints { column: Some(2), ..Default::default() }, "x").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        // column out of range, column 0
        let e = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(4) }, "x").unwrap_err();
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("column 4"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueColumn));
        let e = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(0) }, "x").unwrap_err();
        assert_eq!(e.line, None);
        assert_eq!(e.hint, Some(Hint::ValueColumn));
    }

    #[test]
    fn explicit_hints_override_the_header_and_serve_headerless_files() {
        let text = "wavelength_nm,irradiance_W_m2_nm\n0.4,1000\n0.8,1000\n";
        let hints = ColumnHints {
            axis: Some(AxisUnit::Micrometre),
            value: Some(ValueUnit::irradiance(AxisUnit::Micrometre)),
            column: None,
        };
        let s = parse_spectrum_csv(text, &hints, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
        assert!(s.provenance.contains("axis um, values W m^-2 um^-1"), "{}", s.provenance);
        let s = parse_spectrum_csv("0.4 1000\n0.8 1000\n", &hints, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
    }

    #[test]
    fn missing_units_are_explained() {
        let e = err("400,1\n500,1\n");
        assert_eq!(e.line, None);
        assert!(e.message.contains("spectral axis") && e.message.contains("no header line"), "{e}");
        assert_eq!(e.hint, Some(Hint::AxisUnit { accepted: &AxisUnit::ALL }));
        let hints = ColumnHints { axis: Some(AxisUnit::Nanometre), ..Default::default() };
        let e = parse_spectrum_csv("400,1\n500,1\n", &hints, "x").unwrap_err();
        assert!(e.message.contains("values"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueUnit));
        let e = err("# wavelength_nm, irradiance_W_m2_nm\nwavelength,irradiance_W_m2_nm\n400,1\n500,1\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("'wavelength'"), "{e}");
        assert!(matches!(e.hint, Some(Hint::AxisUnit { .. })));
        let e = err("wavelength_nm,irradiance\n400,1\n500,1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("'irradiance'") && e.message.contains("W/m2/nm"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueUnit));
        // a header that does not line up with the data
        let e = err("Wavelength nm Irradiance W/m2/nm\n400 1\n500 1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("4 columns"), "{e}");
        assert_eq!(e.hint, Some(Hint::Units));
    }

    #[test]
    fn messages_name_no_option() {
        // the front ends word the hint as their own control; the message is for both
        for text in ["400,1\n500,1\n", "wavelength,W/m2/nm\n1,1\n2,1\n", "wavelength_nm,W/m2/eV\n400,1\n500,1\n"] {
            let e = err(text);
            assert!(e.hint.is_some() && !e.message.contains("--"), "{text:?}: {e}");
        }
    }

    #[test]
    fn axis_and_value_kinds_must_agree() {
        let e = err("wavelength_nm,W/m2/eV\n400,1\n500,1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("per eV") && e.message.contains("nm or um"), "{e}");
        assert_eq!(e.hint, Some(Hint::Units));
        // nm axis with per-um values is plain rescaling
        let s = parse("wavelength_nm,W/m2/um\n400,1000\n800,1000\n").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
    }

    // ---- data rules ----

    #[test]
    fn descending_wavenumber_file_is_reordered() {
        let text = "wavenumber (cm-1), W/m2/cm-1\n25000, 0.01\n20000, 0.02\n15000, 0.03\n12500, 0.04\n";
        let s = parse(text).unwrap();
        assert_eq!(s.axis(), Axis::Wavenumber);
        let x = s.coordinates();
        assert_eq!(x.len(), 4);
        assert!(x.windows(2).all(|w| w[0] < w[1]));
        assert_eq!(x[0], 12500.0 * 100.0);
        assert_eq!(s.values()[0], 0.04 / 100.0);
        // trapezoids in cm^-1: 2500*0.035 + 5000*0.025 + 5000*0.015 = 287.5 W/m^2
        assert!(rel(s.total_power(), 287.5) < 1e-12, "{}", s.total_power());
    }

    #[test]
    fn per_square_centimetre_is_converted() {
        let s = parse("wavelength_nm,ph/cm2/s/nm\n400,1e14\n500,1e14\n").unwrap();
        assert!(rel(s.total_photon_flux(), 1e14 * 1e4 * 100.0) < 1e-12);
        assert!(s.provenance.contains("photons s^-1 cm^-2 nm^-1"), "{}", s.provenance);
    }

    // ---- integrals ----

    #[test]
    fn flat_spectrum_integral_is_conserved_per_nm_and_per_um() {
        let per_nm: String = std::iter::once("wavelength_nm,irradiance_W_m2_nm\n".to_string())
            .chain((0..=40).map(|i| format!("{},1\n", 400 + 10 * i)))
            .collect();
        let per_um: String = std::iter::once("wavelength (um), irradiance (W m-2 um-1)\n".to_string())
            .chain((0..=40).map(|i| format!("{},1000\n", 0.4 + 0.01 * i as f64)))
            .collect();
        // the same data, in nm but with per-um values, and descending
        let mixed: String = std::iter::once("wavelength_nm;W/m2/um\n".to_string())
            .chain((0..=40).rev().map(|i| format!("{};1000\n", 400 + 10 * i)))
            .collect();
        for text in [&per_nm, &per_um, &mixed] {
            let s = parse(text).unwrap();
            assert_eq!(s.len(), 41);
            assert!(rel(s.total_power(), 400.0) < 1e-9, "{}", s.total_power());
        }
    }

    #[test]
    fn energy_file_matches_wavelength_file() {
        // constant photon flux per nm, 300..1000 nm every 1 nm; the energy file holds the same
        // points with the Jacobian |d lambda / dE| = lambda^2 / hc applied
        let f_nm = 2e18; // photons s^-1 m^-2 nm^-1
        let hc_ev_nm = HC / CHARGE * 1e9;
        let mut by_wavelength = String::from("wavelength_nm, photons/m2/s/nm\n");
        let mut by_energy = String::from("energy_eV, photon_flux_per_m2_s_eV\n");
        for l in 300..=1000 {
            let l = l as f64;
            by_wavelength.push_str(&format!("{l}, {f_nm:e}\n"));
            by_energy.push_str(&format!("{:e}, {:e}\n", hc_ev_nm / l, f_nm * l * l / hc_ev_nm));
        }
        let a = parse(&by_wavelength).unwrap();
        let b = parse(&by_energy).unwrap();
        assert_eq!(b.axis(), Axis::PhotonEnergy);
        let e2 = 2.0 * CHARGE;
        let (fa, fb) = (a.photon_flux_above(e2), b.photon_flux_above(e2));
        // photons above 2 eV: wavelengths 300 nm .. hc/2eV
        let exact = f_nm * (hc_ev_nm / 2.0 - 300.0);
        assert!(rel(fa, exact) < 1e-9, "{fa} {exact}");
        // 1e-3 allows for the trapezoid rule interpolating linearly in energy in one file and
        // in wavelength in the other (the actual difference here is far smaller)
        assert!(rel(fb, fa) < 1e-3, "{fa} {fb}");
        assert!(rel(b.total_photon_flux(), a.total_photon_flux()) < 1e-3);
    }

    // ---- robustness ----

    #[test]
    fn odd_inputs_do_not_panic() {
        let hints = [
            ColumnHints::default(),
            ColumnHints {
                axis: Some(AxisUnit::Electronvolt),
                value: Some(ValueUnit::photon_flux(AxisUnit::Electronvolt)),
                column: Some(3),
            },
        ];
        let inputs = [
            "",
            "\n\n\n",
            "#",
            "%%%",
            "//",
            ",,,,",
            ";;;",
            "\t\t",
            "\"",
            "\"\"\n\"",
            "(((",
            ")))",
            "[nm]",
            "wavelength (nm\n1,2\n3,4",
            "é,ü\n1,2\n",
            "µm,W/m²/µm\n1,1\n2,2\n",
            "1e308,1e308\n1.7e308,1e308\n",
            "1e-320 1\n2e-320 1\n",
            "\u{feff}",
            "1",
            "1,",
            ",1",
            "1 2 3 4 5 6 7 8\n",
            "x\ny\nz",
            "\u{0}\u{1}",
            "wavelength_nm,W/m2/nm\n1e-300,1e300\n2e-300,1e300\n",
            "wavelength_nm,W/m2/nm\n1,1e300\n1e300,1e300\n",
        ];
        for h in &hints {
            for t in inputs {
                let _ = parse_spectrum_csv(t, h, "x");
            }
        }
    }

    #[test]
    fn overflowing_integrals_are_reported() {
        let e = err("wavelength_nm,W/m2/nm\n1,1e299\n1e300,1e299\n");
        assert!(e.message.contains("too large") || e.message.contains("overflows"), "{e}");
    }

    mod props {
        use super::super::*;
        use proptest::prelude::*;

        proptest! {
            #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

            #[test]
            fn never_panics(text in "[0-9a-zA-Z#%/;,\\t .eE+\\-\\n\\r()\\[\\]^_\"µ²]{0,120}") {
                let _ = parse_spectrum_csv(&text, &ColumnHints::default(), "p");
            }

            #[test]
            fn ascending_and_descending_files_agree(values in proptest::collection::vec(0.0f64..10.0, 2..30)) {
                let rows: Vec<String> = values.iter().enumerate().map(|(i, v)| format!("{},{v}", 400 + 5 * i)).collect();
                let up = format!("wavelength_nm,irradiance_W_m2_nm\n{}\n", rows.join("\n"));
                let rev: Vec<String> = rows.iter().rev().cloned().collect();
                let down = format!("wavelength_nm,irradiance_W_m2_nm\n{}\n", rev.join("\n"));
                let a = parse_spectrum_csv(&up, &ColumnHints::default(), "p").unwrap();
                let b = parse_spectrum_csv(&down, &ColumnHints::default(), "p").unwrap();
                prop_assert_eq!(a.coordinates(), b.coordinates());
                prop_assert_eq!(a.values(), b.values());
            }
        }
    }
}
