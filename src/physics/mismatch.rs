//! The spectral mismatch factor between a test device and a reference device, as defined for
//! calibrating a test cell against a reference cell under a simulator (IEC 60904-7; ASTM
//! E973):
//!
//!   M = [ integral E_test SR_dut dl  *  integral E_ref SR_refdev dl ]
//!     / [ integral E_ref SR_dut dl   *  integral E_test SR_refdev dl ]
//!
//! with E_test the spectrum the measurement is made under, E_ref the reference spectrum
//! (usually AM1.5G), SR_dut and SR_refdev the spectral responses of the device under test and
//! of the reference device. M = 1 when the two devices respond alike or the spectra agree;
//! the calibrated current is the measured one divided by M.
//!
//! Each integral of a spectral irradiance E(lambda) [W m^-2 m^-1] times a spectral response
//! SR(lambda) [A/W] is the short-circuit current density the device would give under that
//! spectrum, and SR = q lambda EQE / (h c), so
//! integral E SR dlambda = q integral EQE Phi dE with Phi the photon flux: the factor is
//! computed from EQEs and photon fluxes with the integrals of [`absorber::photocurrent`](super::absorber::photocurrent)
//! (exact on a common axis). Scaling either spectrum or either response leaves M unchanged.

use super::absorber::{photocurrent, Absorptance};
use super::constants::{CHARGE, HC};
use super::junction::Illumination;
use super::sources::Source;

/// Spectral response [A/W] of a device with external quantum efficiency `eqe` (fraction) at
/// wavelength `wavelength_m` [m]: SR = q lambda EQE / (h c).
pub fn sr_from_eqe(eqe: f64, wavelength_m: f64) -> f64 {
    CHARGE * wavelength_m * eqe / HC
}

/// External quantum efficiency (fraction) of a device with spectral response `sr` [A/W] at
/// wavelength `wavelength_m` [m]: EQE = h c SR / (q lambda). 0 for a non-positive wavelength.
pub fn eqe_from_sr(sr: f64, wavelength_m: f64) -> f64 {
    if wavelength_m > 0.0 {
        HC * sr / (CHARGE * wavelength_m)
    } else {
        0.0
    }
}

/// The mismatch factor and the four short-circuit currents [A m^-2] it is built from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Mismatch {
    /// M of IEC 60904-7 (dimensionless)
    pub factor: f64,
    /// device under test, test spectrum
    pub test_device_test_spectrum: f64,
    /// device under test, reference spectrum
    pub test_device_reference_spectrum: f64,
    /// reference device, test spectrum
    pub reference_device_test_spectrum: f64,
    /// reference device, reference spectrum
    pub reference_device_reference_spectrum: f64,
}

/// Compute the mismatch factor M (dimensionless; IEC 60904-7, module docs) from the EQEs of
/// the two devices (fractions) and the two spectra. Fails, with a message, when a device
/// gives no current under a spectrum (the factor would be 0/0 or infinite).
pub fn mismatch_factor(
    test_device: &Absorptance,
    reference_device: &Absorptance,
    test_spectrum: &Source,
    reference_spectrum: &Source,
) -> Result<Mismatch, String> {
    let current = |a: &Absorptance, s: &Source| photocurrent(&Illumination::one_sun(s.clone()), a);
    let tt = current(test_device, test_spectrum);
    let tr = current(test_device, reference_spectrum);
    let rt = current(reference_device, test_spectrum);
    let rr = current(reference_device, reference_spectrum);
    for (v, what) in [
        (tt, "the device under test gives no current under the test spectrum"),
        (tr, "the device under test gives no current under the reference spectrum"),
        (rt, "the reference device gives no current under the test spectrum"),
        (rr, "the reference device gives no current under the reference spectrum"),
    ] {
        if !(v > 0.0 && v.is_finite()) {
            return Err(format!("{what}: their spectral ranges do not overlap, so no mismatch factor can be formed"));
        }
    }
    let factor = (tt / tr) * (rr / rt);
    if !factor.is_finite() {
        return Err(
            "the mismatch factor is out of the representable range; check the units of the responses and spectra"
                .into(),
        );
    }
    Ok(Mismatch {
        factor,
        test_device_test_spectrum: tt,
        test_device_reference_spectrum: tr,
        reference_device_test_spectrum: rt,
        reference_device_reference_spectrum: rr,
    })
}
