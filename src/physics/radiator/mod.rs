//! Radiators and radiative cooling: the power balance of an opaque surface that faces the
//! sky, under the sun or at night.
//!
//! * [`emissivity`]: spectral emissivity profiles (grey, selective window with sharp or
//!   logistic edges, control points on a log axis, measured tables) and the emitter with
//!   its optional solar-band profile;
//! * [`angular`]: directional behaviour (Lambertian, angular cut-off);
//! * [`layered`]: layer stacks, whose emissivity depends on wavelength and direction
//!   together (a table from the transfer-matrix method);
//! * [`sky`]: box sky, space, imported zenith transmittance, and the angular law
//!   eps_sky = 1 - t^(1/cos theta); [`clear_sky`]: the spectral clear-sky model;
//! * [`solar`]: absorbed sunlight; [`balance`]: P_net(T), its parts, the steady temperature;
//! * [`merit`]: solar reflectance, thermal emittance, 8-13 um window emissivity;
//! * [`spectral`], [`quadrature`]: the integration machinery (exact Planck band integrals,
//!   fine wavelength grid, Gauss-Legendre rules).
//!
//! All inputs and outputs are SI (m, K, rad, W m^-2); emissivities are fractions 0-1.
//! No function panics or returns NaN for finite inputs.

pub mod angular;
pub mod balance;
pub mod clear_sky;
pub mod design;
pub mod emissivity;
pub mod layered;
pub mod merit;
pub mod quadrature;
pub mod sky;
pub mod solar;
pub mod spectral;

pub use angular::AngularModel;
pub use balance::{Balance, Method, Parts, Steady, Surroundings, STEADY_SEARCH_K};
pub use emissivity::{Emitter, Profile, SolarBand};
pub use merit::Figures;
pub use sky::{Sky, SkyPath, Transmittance};
pub use solar::Sun;

/// Everything the balance says about one emitter in one setting.
#[derive(Debug, Clone)]
pub struct Evaluation {
    /// the terms at the surface temperature asked for
    pub at_surface: Parts,
    pub steady: Steady,
    /// broadband sky emissivity, downwelling flux / (sigma T_a^4) (dimensionless)
    pub sky_emissivity: f64,
    /// figures of merit, blackbody weighting at the surface temperature
    pub figures: Figures,
    pub method: Method,
    /// ambient air temperature [K]
    pub ambient_k: f64,
    /// the prepared balance, for P_net(T) at other temperatures (curves)
    pub balance: Balance,
}

/// Evaluate `emitter` in `surroundings` with its surface at `surface_k` [K].
pub fn evaluate(emitter: &Emitter, surroundings: &Surroundings, surface_k: f64) -> Evaluation {
    let balance = Balance::new(emitter, surroundings);
    Evaluation {
        at_surface: balance.parts(surface_k),
        steady: balance.steady(),
        sky_emissivity: balance.sky_emissivity(),
        figures: merit::figures(emitter, surface_k),
        method: balance.method(),
        ambient_k: balance.ambient_k(),
        balance,
    }
}
